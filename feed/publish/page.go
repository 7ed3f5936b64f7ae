package publish

import "slices"

// PageText is what the configuration's page section says on the index: the
// same texts as the served page, without its live parts.
type PageText struct {
	Intro, Contact string
	// Caution replaces PublicCaution; Legal adds LegalCaution (some feed has
	// kinds people use under rules).
	Caution string
	Legal   bool
	// Order lists the feed ids in configuration order: sites follow their
	// first feed, feeds this order. Descriptions are the feeds' own.
	Order        []string
	Descriptions map[string]string
}

// DefaultPageTitle heads the index that publish writes and the page that
// serve answers at / when the configuration's page.title is empty.
const DefaultPageTitle = "Sun and Moon calendars"

// The cautions of the public pages: one for everyone, one where times may
// be used under rules.
const (
	PublicCaution = "These times are computed for the places given, not observed: hills, buildings, weather and the air " +
		"shift them by minutes. Never look at the Sun, with or without binoculars or a telescope."
	LegalCaution = "Where a rule depends on these times (hunting hours, aviation night, lighting-up times for vehicles), " +
		"follow your local regulations and the official tables."
)

// caution is the index's caution text.
func (p *PageText) caution() string {
	c := p.Caution
	if c == "" {
		c = PublicCaution
	}
	if p.Legal {
		c += " " + LegalCaution
	}
	return c
}

// rank is a feed's place in the configuration (unknown ids last).
func (p *PageText) rank(id string) int {
	if i := slices.Index(p.Order, id); i >= 0 {
		return i
	}
	return len(p.Order)
}
