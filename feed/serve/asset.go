package serve

import (
	"bytes"
	"compress/gzip"
	"crypto/sha256"
	"encoding/binary"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"net/http"
	"path"
	"runtime"
	"strconv"
	"strings"
	"sync"
	"time"

	"github.com/cespare/xxhash/v2"
	kgzip "github.com/klauspost/compress/gzip"

	"heliocal/feed/publish"
)

// asset is one servable representation set: the bytes, their gzip form when
// that is worth it, and the header values, all computed once at swap time so
// a hot request neither hashes nor compresses. A feed, configured or ad-hoc,
// is held in its gzip form alone when it has one (data nil): a client that
// does not take gzip gets it decompressed (see writeAsset).
type asset struct {
	name    string
	data    []byte // nil when a feed is held in its gzip form alone
	gz      []byte // nil when gzip would not help
	size    int    // the length of the bytes: len(data), or of gz decompressed
	sum     string // hex SHA-256 of the bytes (for an ad-hoc feed: see adhocSum)
	modTime time.Time

	// Header values, each a one-element slice with cap 1, shared read-only
	// by every response (an append by anyone copies).
	contentType []string
	etag        []string // strong: the quoted checksum
	gzETag      []string // the gzip variant's own strong ETag
	disposition []string // inline; filename=..., for .ics only
	// lastModified is modTime as http.ServeContent writes it; nil when
	// ServeContent leaves it out (zero or the Unix epoch).
	lastModified []string
	cors         bool
}

// minGzip is the smallest body worth compressing.
const minGzip = 512

func hdr(v string) []string { return []string{v} } // len 1, cap 1

// newAsset hashes and compresses data, modified at mod. If prev holds the
// same bytes its gzip form and its modification time are reused: the
// Last-Modified of a file is when it was first served with these bytes.
// Bytes that differ from prev's are modified after prev, by a second at
// least (the resolution of an HTTP date), so that a client sending prev's
// date in If-Modified-Since gets them.
func newAsset(name, contentType string, data []byte, mod time.Time, prev *asset) *asset {
	sum := sha256.Sum256(data)
	hexSum := hex.EncodeToString(sum[:])
	gz := gzipFor(data, hexSum, prev)
	return assetOf(name, contentType, data, len(data), modSince(prev, hexSum, mod), hexSum, gz)
}

// gzipFor is the gzip form of data, whose SHA-256 is sum, at the default
// level: prev's form (prev nil: none) when prev holds the same bytes, so
// that bytes served again are compressed once; nil when gzip would not
// help.
func gzipFor(data []byte, sum string, prev *asset) []byte {
	switch {
	case prev != nil && strings.EqualFold(prev.sum, sum):
		return prev.gz
	case len(data) >= minGzip:
		return gzipBytes(data)
	}
	return nil
}

// modSince is the modification time of bytes of SHA-256 sum that are
// served from mod on, replacing prev (nil: none), as newAsset states it.
func modSince(prev *asset, sum string, mod time.Time) time.Time {
	switch {
	case prev == nil:
		return mod
	case prev.sum == sum:
		return prev.modTime
	case !mod.IsZero() && !mod.After(prev.modTime):
		return prev.modTime.Add(time.Second)
	}
	return mod
}

// heldAsset is the asset of a bundle's feed that the build kept in its
// gzip form alone (publish.File.Gzip, made by a GzipFunc), of size bytes
// (its publish.FeedInfo.Bytes), modified at mod unless prev holds the same
// bytes (see newAsset). Its sum is the one the bundle states: the bytes are
// not at hand to hash again, and publish.Render stated the sum of the bytes
// it gave the GzipFunc. What the gzip form says of itself is checked: its
// header, and the length of its bytes its trailer ends with (RFC 1952,
// ISIZE: modulo 2³²), which a request inflating it relies on.
func heldAsset(f *publish.File, size int, mod time.Time, prev *asset) (*asset, error) {
	sum := strings.ToLower(f.Checksum)
	if len(sum) != 2*sha256.Size {
		return nil, fmt.Errorf("serve: bundle file %q: held in its gzip form with checksum %q, not a SHA-256", f.Name, f.Checksum)
	}
	if size <= 0 {
		return nil, fmt.Errorf("serve: bundle file %q: held in its gzip form with size %d (the bytes of its feed in Bundle.Feeds)", f.Name, size)
	}
	if n := len(f.Gzip); n < 18 || f.Gzip[0] != 0x1f || f.Gzip[1] != 0x8b || binary.LittleEndian.Uint32(f.Gzip[n-4:]) != uint32(size) {
		return nil, fmt.Errorf("serve: bundle file %q: held in a gzip form (%d bytes) that is not of its size, %d bytes", f.Name, len(f.Gzip), size)
	}
	return assetOf(f.Name, f.ContentType, nil, size, modSince(prev, sum, mod), sum, f.Gzip), nil
}

// feedGzip is publish.RenderOptions.Gzip for a build that replaces prev
// (nil: none): a feed's gzipFor, prev's form when prev serves the same
// bytes under the feed's name. It keeps a build from holding every feed's
// bytes at once: for the 1,000 feeds of 1.1 MB each of tools/fleet that
// took 1.1 GB, held until the snapshot was made, and held again beside
// the served snapshot during a reload.
func feedGzip(prev *snapshot) GzipFunc {
	return func(f *publish.File) []byte {
		var p *asset
		if prev != nil {
			p = prev.files[f.Name]
		}
		return gzipFor(f.Data, f.Checksum, p)
	}
}

// newAdhocAsset is newAsset for an ad-hoc feed, built for the request that
// asks for it: it is compressed at the fastest level (see gzipFast), and
// its ETags come from the 64-bit xxHash of that compressed form rather than
// from the SHA-256 of the bytes (see adhocSum). The compressed form names
// the bytes as well: the same bytes always compress to the same form, and a
// form decompresses to one set of bytes only. The asset keeps only the
// compressed form when there is one (a client that does not take gzip gets
// it decompressed, see serveAsset), a copy of data otherwise: data is the
// caller's to reuse.
func newAdhocAsset(name string, data []byte, mod time.Time) *asset {
	var gz []byte
	if len(data) >= minGzip {
		gz = gzipFast(data)
	}
	return adhocAssetOf(name, data, gz, len(data), mod)
}

// adhocAssetOf is the ad-hoc asset of gz, the compressed form of a feed of
// size bytes, or of a copy of data, the feed itself, when gz is nil (see
// newAdhocAsset).
func adhocAssetOf(name string, data, gz []byte, size int, mod time.Time) *asset {
	named, kept := gz, []byte(nil)
	if gz == nil {
		named, kept = data, bytes.Clone(data)
	}
	return assetOf(name, "", kept, size, mod, adhocSum(named), gz)
}

// adhocSum names an ad-hoc feed in its ETags: the 64-bit xxHash of b (its
// compressed form, or the feed itself when it is not compressed) in 16 hex
// digits. An ETag is an opaque validator (RFC 9110 §8.8.3): any value that
// changes with the bytes will do, and a configured feed's is the SHA-256
// its bundle states. Hashing the 71 kB of a one-year feed's compressed form
// took SHA-256 about 50 µs of each request, this about 6 µs; the same bytes
// have the same sum in every replica.
func adhocSum(b []byte) string {
	var sum [8]byte
	binary.BigEndian.PutUint64(sum[:], xxhash.Sum64(b))
	return hex.EncodeToString(sum[:])
}

// gunzipReader is the decompressed form of gz, size bytes long, for
// http.ServeContent: a conditional request that is not answered 304 (a
// calendar revalidating with an ETag from before a refresh) and a range.
// A seek only moves the offset, so a 304 or a HEAD (ServeContent seeks to
// the end and back for the size) never inflates gz. A read inflates from
// the start, or from where the last read ended, into the caller's buffer,
// passing over the bytes before the offset: the feed is never held whole,
// as the response to an unconditional request never holds it (gunzipTo).
// A read before where the inflating has reached (a multipart range whose
// parts go backwards) inflates the feed whole once, into whole, and reads
// from it from then on: no request inflates it more than twice.
type gunzipReader struct {
	gz    []byte
	size  int64
	off   int64         // the offset the next read starts at
	zr    *kgzip.Reader // nil until the first read; then inflated up to pos
	pos   int64
	whole []byte // the feed inflated whole, after a read backwards
}

func (g *gunzipReader) Read(p []byte) (int, error) {
	if g.off >= g.size {
		return 0, io.EOF
	}
	if g.whole == nil && g.zr != nil && g.off < g.pos {
		g.whole = gunzip(g.gz, int(g.size))
		g.release()
	}
	if g.whole != nil {
		n := copy(p, g.whole[g.off:])
		g.off += int64(n)
		return n, nil
	}
	if g.zr == nil {
		g.zr = gunzipReaders.Get().(*kgzip.Reader)
		if err := g.zr.Reset(bytes.NewReader(g.gz)); err != nil {
			panic(fmt.Sprintf("serve: decompressing a feed: %v", err)) // gz was compressed here
		}
	}
	if skip := g.off - g.pos; skip > 0 {
		if _, err := io.CopyN(io.Discard, g.zr, skip); err != nil {
			panic(fmt.Sprintf("serve: decompressing a feed: %v", err)) // gz holds size bytes
		}
		g.pos = g.off
	}
	n, err := g.zr.Read(p[:min(int64(len(p)), g.size-g.off)])
	g.pos += int64(n)
	g.off += int64(n)
	if err == io.EOF && g.off < g.size {
		err = io.ErrUnexpectedEOF
	}
	if err == io.EOF {
		err = nil // the next read, at size, says so
	}
	return n, err
}

func (g *gunzipReader) Seek(off int64, whence int) (int64, error) {
	switch whence {
	case io.SeekCurrent:
		off += g.off
	case io.SeekEnd:
		off += g.size
	}
	if off < 0 {
		return 0, errors.New("serve: seek before the start of a feed")
	}
	g.off = off
	return off, nil
}

// release gives the decompressor back for another request. Call it only
// once nothing reads g any more: http.ServeContent reads the parts of a
// multipart range from a goroutine that may outlive it.
func (g *gunzipReader) release() {
	if g.zr != nil {
		gunzipReaders.Put(g.zr)
		g.zr = nil
	}
}

// gunzip is the decompressed form of gz, compressed here, of size bytes
// (a guess: any size gives the bytes, the right one a single allocation).
func gunzip(gz []byte, size int) []byte {
	zr, err := kgzip.NewReader(bytes.NewReader(gz))
	var b bytes.Buffer
	if err == nil {
		b.Grow(size + bytes.MinRead) // ReadFrom grows the buffer unless MinRead bytes are free
		_, err = b.ReadFrom(zr)
	}
	if err != nil { // gz was compressed here: it cannot be corrupt
		panic(fmt.Sprintf("serve: decompressing a feed: %v", err))
	}
	return b.Bytes()
}

// gunzipTo writes the decompressed form of gz to w as it is inflated,
// without holding it whole.
func gunzipTo(w io.Writer, gz []byte) error {
	zr := gunzipReaders.Get().(*kgzip.Reader)
	defer gunzipReaders.Put(zr)
	if err := zr.Reset(bytes.NewReader(gz)); err != nil {
		panic(fmt.Sprintf("serve: decompressing a feed: %v", err)) // gz was compressed here
	}
	_, err := zr.WriteTo(w)
	return err
}

// gunzipReaders are reused: a decompressor holds tens of kilobytes of
// tables and window.
var gunzipReaders = sync.Pool{New: func() any { return new(kgzip.Reader) }}

// assetOf is the asset of bytes of length size, held as data or, when data
// is nil, as their gzip form gz (nil: none), and the hex sum that names
// them (their SHA-256, or adhocSum).
func assetOf(name, contentType string, data []byte, size int, mod time.Time, sum string, gz []byte) *asset {
	a := &asset{name: name, data: data, gz: gz, size: size, sum: sum, modTime: mod}
	a.contentType = hdr(contentTypeFor(name, contentType))
	a.etag = hdr(`"` + a.sum + `"`)
	a.gzETag = hdr(`"` + a.sum + `-gz"`)
	if !mod.IsZero() && !mod.Equal(time.Unix(0, 0)) {
		a.lastModified = hdr(mod.UTC().Format(http.TimeFormat))
	}
	ext := path.Ext(name)
	if ext == ".ics" {
		a.disposition = hdr(`inline; filename="` + path.Base(name) + `"`)
	}
	a.cors = ext == ".ics" || ext == ".json"
	return a
}

// gzipBytes compresses the files of a bundle, built once per refresh and
// served many times, at the default level.
func gzipBytes(data []byte) []byte {
	return compressWith(&gzipDefault, data)
}

// gzipFast compresses an ad-hoc feed at the fastest level of
// github.com/klauspost/compress: an ad-hoc feed is built for the request
// that asks for it, and at the default level of compress/gzip compressing
// a one-year feed (about 880 kB) cost more CPU (9 ms) than computing it;
// this costs about 2 ms for a result 18% larger (73 kB instead of 61 kB).
func gzipFast(data []byte) []byte {
	return compressWith(&gzipFastest, data)
}

// gzipWriter is what both compressors offer.
type gzipWriter interface {
	io.WriteCloser
	Reset(io.Writer)
}

// The compressors and their output buffers are reused: a compressor holds
// hundreds of kilobytes of tables.
var (
	gzipDefault = sync.Pool{New: func() any {
		zw, _ := gzip.NewWriterLevel(nil, gzip.DefaultCompression) // the level is valid: no error
		return zw
	}}
	gzipFastest = sync.Pool{New: func() any {
		zw, _ := kgzip.NewWriterLevel(nil, kgzip.BestSpeed) // the level is valid: no error
		return zw
	}}
	gzipBuffers = sync.Pool{New: func() any { return new(bytes.Buffer) }}
)

// compressWith gzips data with a compressor of pool; nil when that would
// not save a tenth of the size.
func compressWith(pool *sync.Pool, data []byte) []byte {
	zw := pool.Get().(gzipWriter)
	buf := gzipBuffers.Get().(*bytes.Buffer)
	defer func() {
		buf.Reset()
		gzipBuffers.Put(buf)
		pool.Put(zw)
	}()
	zw.Reset(buf)
	zw.Write(data) // a bytes.Buffer never fails
	zw.Close()
	if !gzipSaves(buf.Len(), len(data)) {
		return nil
	}
	return bytes.Clone(buf.Bytes())
}

// gzipSaves reports whether n bytes compressed to gz bytes are worth serving
// compressed: gzip saves at least a tenth.
func gzipSaves(gz, n int) bool { return gz < n*9/10 }

// contentTypeFor fixes the types heliocal serves whatever the bundle says,
// so a calendar client always gets text/calendar with its charset.
func contentTypeFor(name, given string) string {
	switch path.Ext(name) {
	case ".ics":
		return "text/calendar; charset=utf-8"
	case ".json":
		return "application/json"
	case ".html":
		return "text/html; charset=utf-8"
	}
	if given != "" {
		return given
	}
	return "application/octet-stream"
}

// snapshot is a prepared Bundle: what the handler serves, swapped whole.
type snapshot struct {
	built  time.Time
	files  map[string]*asset
	feeds  int
	events int
}

// prepare checks a bundle and builds its snapshot, reusing gzip bytes of
// files unchanged since prev. It refuses a bundle that could not be served
// faithfully (nil, unnamed or duplicate files, a checksum that does not match
// the bytes).
func prepare(b *publish.Bundle, prev *snapshot, now time.Time) (*snapshot, error) {
	if b == nil {
		return nil, errors.New("serve: build returned no bundle")
	}
	built := b.Built
	if built.IsZero() {
		built = now
	}
	s := &snapshot{built: built, files: make(map[string]*asset, len(b.Files)+1), feeds: len(b.Feeds)}
	// Last-Modified: now for bytes this process has not served before, not
	// the file's own ModTime (a feed's DTSTAMP, the start of its window,
	// the same after a reload that changes the feed: a client sending it
	// in If-Modified-Since would keep the old feed).
	mod := now.UTC().Truncate(time.Second)
	sizes := make(map[string]int, len(b.Feeds)) // of the feeds held in their gzip form
	for _, f := range b.Feeds {
		s.events += f.Events
		sizes[f.File] = f.Bytes
	}
	for i := range b.Files {
		f := &b.Files[i]
		if f.Name == "" || strings.HasPrefix(f.Name, "/") || strings.Contains(f.Name, "..") {
			return nil, fmt.Errorf("serve: bundle file %d: bad name %q", i, f.Name)
		}
		if _, dup := s.files[f.Name]; dup {
			return nil, fmt.Errorf("serve: bundle file %q: listed twice", f.Name)
		}
		s.files[f.Name] = nil
	}

	// Hash and compress in parallel: a large configuration has hundreds of
	// feeds of a few hundred kilobytes each.
	assets := make([]*asset, len(b.Files))
	errs := make([]error, len(b.Files))
	var wg sync.WaitGroup
	next := make(chan int)
	for range min(runtime.GOMAXPROCS(0), max(len(b.Files), 1)) {
		wg.Go(func() {
			for i := range next {
				f := &b.Files[i]
				var p *asset
				if prev != nil {
					p = prev.files[f.Name]
				}
				if f.Data == nil && f.Gzip != nil {
					assets[i], errs[i] = heldAsset(f, sizes[f.Name], mod, p)
					continue
				}
				a := newAsset(f.Name, f.ContentType, f.Data, mod, p)
				if f.Checksum != "" && !strings.EqualFold(f.Checksum, a.sum) {
					errs[i] = fmt.Errorf("serve: bundle file %q: checksum %s does not match its bytes (%s)", f.Name, f.Checksum, a.sum)
				}
				assets[i] = a
			}
		})
	}
	for i := range b.Files {
		next <- i
	}
	close(next)
	wg.Wait()
	if err := errors.Join(errs...); err != nil {
		return nil, err
	}
	for _, a := range assets {
		s.files[a.name] = a
	}
	if s.files["feeds.json"] == nil {
		// The bundle has no feeds.json of its own: describe its feeds.
		feeds := b.Feeds
		if feeds == nil {
			feeds = []publish.FeedInfo{}
		}
		data, err := json.MarshalIndent(feeds, "", "  ")
		if err != nil {
			return nil, fmt.Errorf("serve: feeds.json: %w", err)
		}
		var p *asset
		if prev != nil {
			p = prev.files["feeds.json"]
		}
		s.files["feeds.json"] = newAsset("feeds.json", "", append(data, '\n'), mod, p)
	}
	return s, nil
}

// acceptsGzip reports whether an Accept-Encoding header value allows gzip
// (RFC 9110 §12.5.3): listed as gzip or x-gzip, or covered by "*", with a
// non-zero weight.
func acceptsGzip(h string) bool {
	if h == "" {
		return false
	}
	star := -1.0
	for part := range strings.SplitSeq(h, ",") {
		name, params, _ := strings.Cut(part, ";")
		name = strings.ToLower(strings.TrimSpace(name))
		q := 1.0
		for p := range strings.SplitSeq(params, ";") {
			k, v, ok := strings.Cut(strings.TrimSpace(p), "=")
			if ok && strings.EqualFold(strings.TrimSpace(k), "q") {
				f, err := strconv.ParseFloat(strings.TrimSpace(v), 64)
				if err != nil || f < 0 || f > 1 {
					f = 0
				}
				q = f
			}
		}
		switch name {
		case "gzip", "x-gzip":
			return q > 0
		case "*":
			star = q
		}
	}
	return star > 0
}
