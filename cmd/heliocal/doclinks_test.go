package main

import (
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// Every file the README, DEVELOPERS.md and docs/ link to or show (a page,
// a screenshot, a script's README) is in the repository: a renamed file or
// a screenshot never taken leaves no link that leads nowhere.
func TestDocsLinkedFilesExist(t *testing.T) {
	pages, err := filepath.Glob("../../docs/*.md")
	if err != nil {
		t.Fatal(err)
	}
	pages = append(pages, "../../README.md", "../../DEVELOPERS.md")
	link := regexp.MustCompile(`\]\(([^)\s]+)\)`)
	n := 0
	for _, page := range pages {
		b, err := os.ReadFile(page)
		if err != nil {
			t.Fatal(err)
		}
		for _, m := range link.FindAllStringSubmatch(string(b), -1) {
			target, _, _ := strings.Cut(m[1], "#")
			if target == "" || strings.Contains(target, "://") || strings.HasPrefix(target, "mailto:") {
				continue
			}
			n++
			if _, err := os.Stat(filepath.Join(filepath.Dir(page), target)); err != nil {
				t.Errorf("%s links to %s: %v", filepath.Base(page), m[1], err)
			}
		}
	}
	if n < 20 {
		t.Errorf("%d links to files found in %d pages: the pattern no longer reads them", n, len(pages))
	}
}
