package feed

import (
	"fmt"

	"heliocal/config"
)

// addMoon adds the Moon's kinds.
func (c *collector) addMoon(k config.Kind) error {
	return fmt.Errorf("kind %q is not computed yet", k.String())
}

// describeMoon gives the title and description of a Moon event.
func describeMoon(s *config.Site, e Event) (string, string) {
	return plainNames[e.Kind.Name], fmt.Sprintf("%s at %s.", plainNames[e.Kind.Name], where(s))
}

// describeMoonNote gives the all-day entry for a date without a Moon event.
func describeMoonNote(s *config.Site, n Note) (string, string) {
	return n.Kind.String(), where(s)
}
