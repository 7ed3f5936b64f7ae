package config

import (
	"net/netip"
	"strings"
	"testing"
)

func TestTrustedProxies(t *testing.T) {
	const site = "sites:\n  - {id: a, name: A, latitude: 47, longitude: 13, timezone: Europe/Vienna}\nfeeds:\n  - {id: f, title: F, site: a, kinds: [sunrise]}\n"
	c, err := Parse(strings.NewReader("service:\n  trusted_proxies: [\"127.0.0.1\", \"::1\", \"10.0.0.0/8\"]\n"+site), "yaml")
	if err != nil {
		t.Fatal(err)
	}
	ps, err := ParseTrustedProxies(c.Service.TrustedProxies)
	if err != nil || len(ps) != 3 || !ps[2].Contains(mustAddr(t, "10.9.8.7")) || ps[0].Bits() != 32 {
		t.Fatalf("prefixes %v, %v", ps, err)
	}
	_, err = Parse(strings.NewReader("service:\n  trusted_proxies: [\"127.0.0.1\", \"proxy.lan\"]\n"+site), "yaml")
	if err == nil || !strings.Contains(err.Error(), "service.trusted_proxies[1]") || !strings.Contains(err.Error(), "proxy.lan") {
		t.Errorf("a host name among the proxies: %v, want an error naming service.trusted_proxies[1] and the value", err)
	}
}

func mustAddr(t *testing.T, s string) netip.Addr {
	t.Helper()
	a, err := netip.ParseAddr(s)
	if err != nil {
		t.Fatal(err)
	}
	return a
}

func TestPageSection(t *testing.T) {
	const site = "sites:\n  - {id: a, name: A, latitude: 47, longitude: 13, timezone: Europe/Vienna}\nfeeds:\n  - {id: f, title: F, site: a, kinds: [sunrise]}\n"
	c, err := Parse(strings.NewReader("page:\n  title: Kestrel Ridge sky\n  builder: false\n"+site), "yaml")
	if err != nil {
		t.Fatal(err)
	}
	if c.Page.Title != "Kestrel Ridge sky" || c.Page.ShowBuilder() {
		t.Errorf("page %+v: want the title and no builder", c.Page)
	}
	if c, _ := Parse(strings.NewReader(site), "yaml"); !c.Page.ShowBuilder() {
		t.Error("without page.builder the builder is not shown")
	}
	_, err = Parse(strings.NewReader("page:\n  title: \""+strings.Repeat("x", 121)+"\"\n"+site), "yaml")
	if err == nil || !strings.Contains(err.Error(), "page.title") || !strings.Contains(err.Error(), "has 121 characters, more than 120 (keep it short") {
		t.Errorf("a 121-character title: %v", err)
	}
	_, err = Parse(strings.NewReader("page:\n  tilte: x\n"+site), "yaml")
	if err == nil || !strings.Contains(err.Error(), "page.tilte") {
		t.Errorf("a misspelt page key: %v", err)
	}
}
