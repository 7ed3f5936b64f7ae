package main

import (
	"fmt"

	"heliocal/config"
	"heliocal/feed"
	"heliocal/feed/publish"
	"heliocal/feed/serve"
)

// pageInfo is what the served page says for cfg: its page section, and its
// sites with their feeds in configuration order.
func pageInfo(cfg *config.Config) serve.PageInfo {
	p := serve.PageInfo{Title: cfg.Page.Title, Intro: cfg.Page.Intro, Contact: cfg.Page.Contact, Caution: cfg.Page.Caution,
		NoBuilder: !cfg.Page.ShowBuilder()}
	for _, s := range cfg.Sites {
		ps := serve.PageSite{Name: s.Name, Place: placeWords(s)}
		for _, f := range cfg.Feeds {
			if f.Site != s.ID {
				continue
			}
			ps.Feeds = append(ps.Feeds, serve.PageFeed{ID: f.ID, Title: f.Title, Description: f.Description})
			for _, k := range f.Kinds {
				if serve.LegalKind(k.Kind.Name) {
					p.Legal = true
				}
			}
		}
		if len(ps.Feeds) > 0 {
			p.Sites = append(p.Sites, ps)
		}
	}
	return p
}

// pageText is the page section for the index of publish.
func pageText(cfg *config.Config) *publish.PageText {
	info := pageInfo(cfg)
	p := &publish.PageText{Intro: info.Intro, Contact: info.Contact, Caution: cfg.Page.Caution, Legal: info.Legal,
		Descriptions: map[string]string{}}
	for _, f := range cfg.Feeds {
		p.Order = append(p.Order, f.ID)
		p.Descriptions[f.ID] = f.Description
	}
	return p
}

// placeWords writes where a site is: "47.8100° N, 13.0600° E, 430 m,
// Europe/Vienna", with its horizon and air when they are not a flat horizon
// and the standard refraction, as the index's place lines name them: "…,
// 430 m, horizon 2°, Europe/Vienna".
func placeWords(s config.Site) string {
	var cond string
	if c := feed.SiteOf(&s).Conditions(); c != "" {
		cond = ", " + c
	}
	return fmt.Sprintf("%s, %.0f m%s, %s", feed.Coords(s.Latitude, s.Longitude, 4), s.Elevation, cond, s.TimeZone.Name())
}
