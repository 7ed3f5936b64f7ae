package serve

import (
	"encoding/json"
	"fmt"
	"net"
	"net/http"
	"net/netip"
	"net/url"
	"strings"
	"sync/atomic"

	"heliocal/config"
)

// public is how the server names itself in links: the configured base URL,
// or else the address each request was made to.
type public struct {
	base    string         // validated, ends in "/"; empty: from the request
	trusted []netip.Prefix // proxies whose X-Forwarded-Host/-Proto are believed
}

// SetPublic sets the public base URL ("" to take it from each request's
// Host) and the proxies whose X-Forwarded-Host and X-Forwarded-Proto
// headers are believed (IP addresses or CIDR prefixes; see
// config.ParseTrustedProxies). It may be called while the server runs, as
// after a reload.
func (s *Server) SetPublic(base string, trusted []string) error {
	p := &public{}
	if base != "" {
		if err := config.CheckBaseURL(base); err != nil {
			return fmt.Errorf("serve: base URL: %w", err)
		}
		p.base = strings.TrimSuffix(base, "/") + "/"
	}
	var err error
	if p.trusted, err = config.ParseTrustedProxies(trusted); err != nil {
		return fmt.Errorf("serve: %w", err)
	}
	s.public.Store(p)
	return nil
}

// publicHolder is embedded in Server.
type publicHolder = atomic.Pointer[public]

// baseFor returns the absolute base URL, ending in "/", that links in the
// response to r start with: the configured base URL; else the scheme and
// Host of the request, or the X-Forwarded-Proto and X-Forwarded-Host a
// trusted proxy set. A Host that is not a plain host[:port] falls back to
// "localhost".
func (s *Server) baseFor(r *http.Request) string {
	p := s.public.Load()
	if p != nil && p.base != "" {
		return p.base
	}
	scheme, host := "http", r.Host
	if r.TLS != nil {
		scheme = "https"
	}
	if p != nil && len(p.trusted) > 0 && fromTrusted(r.RemoteAddr, p.trusted) {
		if v := firstValue(r.Header.Get("X-Forwarded-Proto")); v == "http" || v == "https" {
			scheme = v
		}
		if v := firstValue(r.Header.Get("X-Forwarded-Host")); v != "" {
			host = v
		}
	}
	if !plainHost(host) {
		host = "localhost"
	}
	return scheme + "://" + host + "/"
}

func firstValue(h string) string {
	v, _, _ := strings.Cut(h, ",")
	return strings.ToLower(strings.TrimSpace(v))
}

func fromTrusted(remote string, trusted []netip.Prefix) bool {
	host, _, err := net.SplitHostPort(remote)
	if err != nil {
		host = remote
	}
	ip, err := netip.ParseAddr(host)
	if err != nil {
		return false
	}
	ip = ip.Unmap()
	for _, p := range trusted {
		if p.Contains(ip) {
			return true
		}
	}
	return false
}

// plainHost reports whether h is a host name or IP address with an optional
// port, and nothing else (no user, path, spaces or quotes).
func plainHost(h string) bool {
	if h == "" || len(h) > 255 {
		return false
	}
	u, err := url.Parse("http://" + h + "/")
	if err != nil || u.Host != h || u.User != nil || u.Path != "/" {
		return false
	}
	for _, r := range h {
		if !(r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' || strings.ContainsRune(".-:[]_", r)) {
			return false
		}
	}
	return true
}

// feedAddress is the address the pages and feeds.json give a feed's file:
// beside index.html, as publish lays the files out and as the feeds' own
// SOURCE says (base_url and the file), so that one address works whether
// the directory is published or served. /feeds/<file> answers too, for
// the links given before.
func feedAddress(base, file string) string {
	return base + url.PathEscape(file)
}

// webcal turns an http(s) URL into its webcal:// form.
func webcal(u string) string {
	_, rest, ok := strings.Cut(u, "://")
	if !ok {
		return u
	}
	return "webcal://" + rest
}

// serveFeedsJSON serves feeds.json; when the bundle's lacks the feeds'
// absolute URLs (no base URL configured), they are added from the request's
// address.
func (s *Server) serveFeedsJSON(w http.ResponseWriter, r *http.Request) {
	snap := s.snap.Load()
	if snap == nil || snap.files["feeds.json"] == nil {
		s.serveBundleFile(w, r, "feeds.json")
		return
	}
	a := snap.files["feeds.json"]
	if p := s.public.Load(); p != nil && p.base != "" {
		s.serveAsset(w, r, a) // built with the base URL: its urls are absolute
		return
	}
	data, changed := withURLs(a.data, s.baseFor(r))
	if !changed {
		s.serveAsset(w, r, a)
		return
	}
	b := newAsset("feeds.json", "", data, a.modTime, nil)
	w.Header().Add("Vary", "Host, X-Forwarded-Host, X-Forwarded-Proto")
	s.serveAsset(w, r, b)
}

// withURLs fills the "url" of every feed in a feeds.json document (an
// object with "feeds", or a bare list) that has none, from base and the
// feed's file (else its id and ".ics"). It reports whether anything changed.
func withURLs(doc []byte, base string) ([]byte, bool) {
	var obj map[string]json.RawMessage
	var list []map[string]any
	isObj := json.Unmarshal(doc, &obj) == nil
	raw := json.RawMessage(doc)
	if isObj {
		raw = obj["feeds"]
	}
	if json.Unmarshal(raw, &list) != nil {
		return doc, false
	}
	changed := false
	for _, f := range list {
		file, _ := f["file"].(string)
		if id, _ := f["id"].(string); file == "" && id != "" {
			file = id + ".ics"
		}
		if u, _ := f["url"].(string); u == "" && file != "" {
			f["url"] = feedAddress(base, file)
			changed = true
		}
	}
	if !changed {
		return doc, false
	}
	var out []byte
	var err error
	if isObj {
		feeds, _ := json.Marshal(list)
		obj["feeds"] = feeds
		out, err = json.MarshalIndent(obj, "", "  ")
	} else {
		out, err = json.MarshalIndent(list, "", "  ")
	}
	if err != nil {
		return doc, false
	}
	return append(out, '\n'), true
}
