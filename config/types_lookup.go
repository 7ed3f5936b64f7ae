package config

// Site returns the site with the given id.
func (c *Config) Site(id string) (Site, bool) {
	for _, s := range c.Sites {
		if s.ID == id {
			return s, true
		}
	}
	return Site{}, false
}

// Feed returns the feed with the given id.
func (c *Config) Feed(id string) (Feed, bool) {
	for _, f := range c.Feeds {
		if f.ID == id {
			return f, true
		}
	}
	return Feed{}, false
}
