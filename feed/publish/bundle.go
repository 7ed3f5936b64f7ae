// Package publish renders every configured feed into an in-memory Bundle
// (the .ics files, feeds.json and index.html) and writes it to a directory
// atomically. feed/serve serves the same Bundle over HTTP.
package publish

import "time"

// File is one published file, fully rendered.
type File struct {
	Name        string // path relative to the output directory, e.g. "farm-sun.ics"
	ContentType string // e.g. "text/calendar; charset=utf-8"
	Data        []byte
	Checksum    string // lower-case hex SHA-256 of Data
	ModTime     time.Time
	// Gzip is the file's gzip form when the bundle holds the file in that
	// form alone (RenderOptions.Gzip), which it does for feeds only: Data
	// is nil then, Checksum still describes the bytes Gzip decompresses
	// to, and the feed's FeedInfo.Bytes is their length.
	Gzip []byte
}

// FeedInfo describes one feed in feeds.json and on the index page.
type FeedInfo struct {
	ID       string `json:"id"`
	Title    string `json:"title"`
	Site     string `json:"site"`
	File     string `json:"file"`
	URL      string `json:"url,omitempty"`
	Events   int    `json:"events"`
	Bytes    int    `json:"bytes"`
	Checksum string `json:"sha256"`
}

// Bundle is everything one build produced. It is immutable once built, so a
// server can hold it behind an atomic pointer and swap it whole.
type Bundle struct {
	Built time.Time
	Feeds []FeedInfo
	Files []File // sorted by Name
	// Trimmed lists the feeds shortened to fit RenderOptions.MaxFeedBytes
	// (RenderOptions.Oversize = OversizeTrim), in the order of Feeds.
	Trimmed []Trimmed
}

// File returns the named file, or nil.
func (b *Bundle) File(name string) *File {
	for i := range b.Files {
		if b.Files[i].Name == name {
			return &b.Files[i]
		}
	}
	return nil
}
