package feed

import (
	"context"
	"strings"
	"testing"

	"heliocal/config"
)

// A calendar's descriptions, titles and UIDs are substrings of memory that
// Release hands to the next calendar, cleared (slicePool.put): a string used
// after Release reads NUL bytes, here and in every other package's tests,
// instead of passing by chance while the memory waits unused.
func TestReleaseOverwritesText(t *testing.T) {
	s := site(t, "release", 48.2, 16.4, "Europe/Vienna")
	sk := sky(t, "2027-01-01", "2027-01-31")
	f := &config.Feed{ID: "release", Site: s.ID}
	for _, k := range mustKinds(t, "sunrise", "sunset") {
		f.Kinds = append(f.Kinds, config.KindSpec{Kind: k})
	}
	cal, err := sk.Calendar(context.Background(), s, f, date("2027-01-02"), date("2027-01-30"), Options{})
	if err != nil {
		t.Fatal(err)
	}
	desc, uid := cal.Entries[0].Description, cal.Entries[0].UID
	if !strings.HasPrefix(desc, "Sunrise at ") {
		t.Fatalf("first description = %q, want a sunrise", desc)
	}
	cal.Release()
	if strings.Trim(desc, "\x00") != "" || strings.Trim(uid, "\x00") != "" {
		t.Errorf("after Release the kept description reads %q and the UID %q: Release must clear the text it hands back", desc, uid)
	}
}
