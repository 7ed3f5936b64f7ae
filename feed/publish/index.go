package publish

import (
	"bytes"
	"context"
	"fmt"
	"html/template"
	"math"
	"net/url"
	"slices"
	"sort"
	"strconv"
	"strings"
	"sync"

	"heliocal/feed"
)

// Caution is the safety note on the index page. The times are computed; a
// user relying on one where a rule or their eyes are at stake must be told.
const Caution = "These times are computed from an astronomical model for the coordinates shown; " +
	"they are not official observations or rulings, and local terrain, weather and refraction shift them by minutes. " +
	"Where a rule depends on them (hunting hours, aviation night, lighting-up times for vehicles), " +
	"follow your local regulations and the official tables. " +
	"Never look at the Sun, with or without binoculars or a telescope."

type indexView struct {
	Title     string
	Intro     string
	Contact   string
	Generated string
	Feeds     int
	Events    string
	Size      string
	Caution   string
	Relative  bool
	NoCharts  string // why the charts are left out, if they are
	Sites     []siteView
}

type siteView struct {
	ID, Name, Coords, Elevation, Zone string
	Conditions                        string // the horizon and air, when not flat and standard (feed.Site.Conditions)
	Chart                             *chartView
	Feeds                             []feedView
}

type feedView struct {
	ID, Title, File string
	Description     string
	Events, Size    string
	HTTPS           string       // absolute or relative URL of the .ics
	Webcal          template.URL // webcal:// URL; empty without a base URL
}

// FormatBytes writes a size in SI units, with one decimal: "812 B",
// "41.2 kB", "974.6 kB", "5.2 MB"; every size heliocal reports is written
// this way (a size next to a limit it is compared with, FormatBytesOver,
// with more decimals where one does not tell them apart).
func FormatBytes(n int64) string {
	unit, div := byteUnit(n)
	if div == 1 {
		return strconv.FormatInt(n, 10) + " B"
	}
	return strconv.FormatFloat(float64(n)/div, 'f', 1, 64) + " " + unit
}

// byteUnit is the unit FormatBytes writes n in, and its size in bytes: the
// largest whose one-decimal value is under 1000 ("1.0 MB" for 999,960
// bytes, never "1000.0 kB").
func byteUnit(n int64) (unit string, div float64) {
	switch {
	case n < 1000:
		return "B", 1
	case n < 999_950:
		return "kB", 1e3
	case n < 999_950_000:
		return "MB", 1e6
	}
	return "GB", 1e9
}

// FormatBytesOver writes a size n and the limit it is compared with (a
// size over max_feed_bytes, or shortened to stay under it): the size as
// FormatBytes writes it, with as many more decimals (up to three) as tell
// it apart from the limit in that unit ("1.03 MB" over "1 MB", never
// "1.0 MB" over "1 MB"; "974.6 kB" under "1 MB"), the limit as FormatLimit
// writes it, exactly where three decimals can; when even three decimals
// cannot tell them apart, both are written in bytes ("1,000,400 B" over
// "1,000,000 B").
func FormatBytesOver(n, limit int64) (size, lim string) {
	lim = formatLimit(limit)
	unit, div := byteUnit(n)
	if div == 1 {
		return feed.FormatCount(int(n)) + " B", lim
	}
	for d := 1; d <= 3; d++ {
		a := strconv.FormatFloat(float64(n)/div, 'f', d, 64)
		if a != strconv.FormatFloat(float64(limit)/div, 'f', d, 64) {
			return a + " " + unit, lim
		}
	}
	return feed.FormatCount(int(n)) + " B", feed.FormatCount(int(limit)) + " B"
}

// formatLimit writes a size limit in its SI unit with no more decimals than
// it needs, three at most: "400 kB", "1 MB", "1.25 MB", "500 B".
func formatLimit(limit int64) string {
	unit, div := "B", 1.0
	switch {
	case limit >= 1_000_000_000:
		unit, div = "GB", 1e9
	case limit >= 1_000_000:
		unit, div = "MB", 1e6
	case limit >= 1000:
		unit, div = "kB", 1e3
	}
	if div == 1 {
		return feed.FormatCount(int(limit)) + " B"
	}
	return trimZeros(strconv.FormatFloat(float64(limit)/div, 'f', 3, 64)) + " " + unit
}

// trimZeros drops the zeros ending the decimals of x, and the point if
// nothing follows it: "1.000" is "1", "1.030" is "1.03".
func trimZeros(x string) string {
	if !strings.Contains(x, ".") {
		return x
	}
	return strings.TrimSuffix(strings.TrimRight(x, "0"), ".")
}

// webcalURL turns an http(s) URL into its webcal:// form (RFC-less but
// universal: calendar apps register the scheme and subscribe to the feed).
func webcalURL(u *url.URL) string {
	w := *u
	w.Scheme = "webcal"
	return w.String()
}

func renderIndex(ctx context.Context, l *listing, opts *RenderOptions) ([]byte, error) {
	base, err := opts.base()
	if err != nil {
		return nil, err
	}
	v := indexView{
		Title:    opts.Title,
		Caution:  Caution,
		Feeds:    len(l.feeds),
		Relative: base == nil,
	}
	if v.Title == "" {
		v.Title = DefaultPageTitle
	}
	if !l.generated.IsZero() {
		// a UTC date (RenderOptions.Generated), and the page says so: a
		// chart's today is its site's local date, which near midnight is
		// the day before or after
		v.Generated = l.generated.Format("2 Jan 2006") // as the charts write their dates
	}
	events, size := 0, int64(0)
	bySite := map[string][]feedView{}
	for _, f := range l.feeds {
		events += f.Events
		size += int64(f.Bytes)
		fv := feedView{ID: f.ID, Title: f.Title, File: f.File, Events: feed.FormatCount(f.Events), Size: FormatBytes(int64(f.Bytes))}
		if opts.Page != nil {
			fv.Description = opts.Page.Descriptions[f.ID]
		}
		if base != nil {
			u := base.JoinPath(f.File)
			fv.HTTPS = u.String()
			fv.Webcal = template.URL(webcalURL(u))
		} else {
			fv.HTTPS = (&url.URL{Path: f.File}).String()
		}
		bySite[f.Site] = append(bySite[f.Site], fv)
	}
	v.Events = feed.FormatCount(events)
	v.Size = FormatBytes(size)

	charts := opts.Charts
	if limit := opts.MaxCharts; charts != nil {
		if limit == 0 {
			limit = DefaultMaxCharts
		}
		if limit > 0 && len(l.sites) > limit {
			charts = nil
			v.NoCharts = fmt.Sprintf("The yearly charts are left out: %d sites are more than this page draws (%d).", len(l.sites), limit)
		}
	}
	sites := append([]feed.Site(nil), l.sites...)
	// by name, then id (a fleet's thousand sites: sort.SliceStable's
	// reflected swaps of the large Site took 10 ms)
	slices.SortStableFunc(sites, func(a, b feed.Site) int {
		if c := strings.Compare(a.Name, b.Name); c != 0 {
			return c
		}
		return strings.Compare(a.ID, b.ID)
	})
	if p := opts.Page; p != nil {
		v.Intro, v.Contact, v.Caution = p.Intro, p.Contact, p.caution()
		for id := range bySite {
			sort.SliceStable(bySite[id], func(i, j int) bool { return p.rank(bySite[id][i].ID) < p.rank(bySite[id][j].ID) })
		}
		first := func(s feed.Site) int {
			if f := bySite[s.ID]; len(f) > 0 {
				return p.rank(f[0].ID)
			}
			return len(p.Order)
		}
		sort.SliceStable(sites, func(i, j int) bool { return first(sites[i]) < first(sites[j]) })
	}
	for i, s := range sites {
		feeds := bySite[s.ID]
		if len(feeds) == 0 {
			continue
		}
		name := s.Name
		if name == "" {
			name = s.ID
		}
		zone := "UTC"
		if s.Location != nil {
			zone = s.Location.String()
		}
		sv := siteView{
			ID: s.ID, Name: name, Coords: feed.Coords(s.Latitude, s.Longitude, 4), // "52.5200° N, 13.4050° E"
			Elevation: strconv.FormatFloat(math.Round(s.Elevation), 'f', 0, 64) + " m",
			Zone:      zone, Conditions: s.Conditions(), Feeds: feeds,
		}
		if charts != nil {
			if err := ctx.Err(); err != nil {
				return nil, fmt.Errorf("publish: %w", err)
			}
			var trimmed []Trimmed
			for _, t := range l.trimmed {
				if t.Feed.Site == s.ID {
					trimmed = append(trimmed, t)
				}
			}
			c, err := charts(ctx, s, trimmed)
			if err != nil {
				return nil, fmt.Errorf("publish: chart of site %s: %w", s.ID, err)
			}
			sv.Chart = chart(strconv.Itoa(i), name, c)
		}
		v.Sites = append(v.Sites, sv)
	}
	var b bytes.Buffer
	if err := indexTemplate().Execute(&b, v); err != nil {
		return nil, fmt.Errorf("publish: index: %w", err)
	}
	return b.Bytes(), nil
}

// The page is plain HTML with inline CSS and SVG: no script, no external
// asset. It is also well-formed XML (void elements closed, no named
// entities), which keeps it easy to check and to post-process.
// indexTemplate is parsed on first use, not when any command starts.
var indexTemplate = sync.OnceValue(func() *template.Template {
	return template.Must(template.New("index").Funcs(template.FuncMap{"urlBreaks": URLBreaks, "units": KeepUnits}).Parse(`<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8"/>
<meta name="viewport" content="width=device-width, initial-scale=1"/>
<title>{{.Title}}</title>
<style>
body{font:16px/1.45 system-ui,sans-serif;margin:0 auto;max-width:52rem;padding:1rem;color:#1d2030;background:#fbfaf6;overflow-wrap:break-word}
h1{font-size:1.6rem;margin:.2rem 0}
h2{font-size:1.25rem;margin:2rem 0 .2rem;border-top:1px solid #ddd;padding-top:1rem}
.place{color:#555;margin:.2rem 0 .8rem}
.caution{border-left:4px solid #d08a00;background:#fff6e0;padding:.6rem .9rem;margin:1rem 0}
table{border-collapse:collapse;width:100%}
th,td{text-align:left;padding:.35rem .5rem;border-bottom:1px solid #e4e2dc;vertical-align:top;overflow-wrap:anywhere}
td.num,th.num{text-align:right;white-space:nowrap}
th:last-child{width:10em}
.unit{display:none}
code{font-size:.85em}
figure{margin:0 0 1rem}
figcaption{font-size:.9rem;color:#444}
svg{max-width:100%;height:auto;display:block}
svg.ph{display:none}
svg text{font:10px system-ui,sans-serif;fill:currentColor}
svg .yl{text-anchor:end}
.plot{fill:none;stroke:currentColor;stroke-opacity:.35;stroke-width:.8}
.grid{stroke:currentColor;stroke-opacity:.15;stroke-width:.5}
.tick{stroke:currentColor;stroke-width:.8}
.rise{fill:none;stroke:#c86a14;stroke-width:2}
.set{fill:none;stroke:#5b4bb7;stroke-width:2}
.lamp{fill:none;stroke:#1f9e89;stroke-opacity:.45}
path.dark{fill:none}.hatch rect{fill:#4a5a78;fill-opacity:.18}.hatch line{stroke:#4a5a78;stroke-width:2.2}
.thr{stroke:#287a36;stroke-width:1;stroke-dasharray:3 2}
svg .tl{fill:#287a36;stroke:#fbfaf6;stroke-width:3px;stroke-linejoin:round;paint-order:stroke}
.mark{stroke:#c0392b;stroke-width:1}
.today{stroke:currentColor;stroke-width:1.5}.past{fill:currentColor;fill-opacity:.08;stroke:none}
.moon{stroke:currentColor;stroke-width:1;fill:none}
.moon.full{fill:#e8c547}
.key{display:inline-block;width:1.4em;height:0;vertical-align:.3em;margin:0 .25em 0 .6em;border-top:3px solid}
.key.rise{border-color:#c86a14}.key.set{border-color:#5b4bb7}.key.lamp{border-top-width:.8em;vertical-align:-.1em;border-color:#1f9e8973}svg.swatch{display:inline-block;width:1.4em;height:.8em;vertical-align:-.1em;margin:0 .25em 0 .6em}svg.moonkey{width:.8em;margin-left:.3em}.key.thr{border-top:2px dashed #287a36}.key.mark{border-top:2px solid #c0392b}.key.today{border-top:2px solid currentColor}
@media (max-width:40rem){body{padding:.6rem}svg text{font-size:18px}svg .ml,svg .tl,svg .tdl,svg .short,svg .mm{display:none}svg .yl{dominant-baseline:central}svg .mo{transform:translateY(11px)}table,tbody,tr,td{display:block}thead{display:none}tr{border-bottom:1px solid #e4e2dc;padding:.4rem 0}td{border:0;padding:.1rem 0}td.num{display:inline-block;margin-right:1rem}.unit{display:inline}td a{display:inline-block;padding:.7rem 0;min-width:2.75rem}}
@media (max-width:28rem){svg.desk{display:none}svg.ph{display:block;width:100%}svg.ph text{font-size:12px}svg.ph .mo{transform:none}}
@media (max-width:22.5rem){svg.ph text{font-size:13px}svg.ph .alt{display:none}}
@media screen and (prefers-color-scheme:dark){body{color:#e6e4de;background:#16181f}.place{color:#b4b2ac}.caution{background:#2b2517}a{color:#8fb8ff}th,td,tr{border-bottom-color:#333846}figcaption{color:#c4c2bc}.rise,.key.rise{stroke:#f0a04b;border-color:#f0a04b}.set,.key.set{stroke:#a99bff;border-color:#a99bff}.thr{stroke:#6cc47a}.key.thr{border-top-color:#6cc47a}svg .tl{fill:#6cc47a;stroke:#16181f}.mark{stroke:#ff7a6b}.key.mark{border-top-color:#ff7a6b}.hatch rect{fill:#9fb0d0}.hatch line{stroke:#9fb0d0}}
@media print{h2,.place{break-after:avoid}figure,tr{break-inside:avoid}}
</style>
</head>
<body>
<header>
<h1>{{.Title}}</h1>
{{with .Intro}}<p class="intro">{{units .}}</p>{{end}}
<p>{{.Feeds}} calendar feed{{if ne .Feeds 1}}s{{end}}, {{.Events}} event{{if ne .Events "1"}}s{{end}}, {{.Size}}{{if .Generated}}, computed on {{.Generated}} (UTC){{end}}.
{{if .Relative}}Subscribe by adding a feed's address (the link below, made absolute with this page's address) to your calendar app as a subscription.{{else}}The webcal link subscribes in your calendar app; the https address can be pasted into any app's "subscribe by URL".{{end}}
Machine-readable list: <a href="feeds.json">feeds.json</a>.{{with .NoCharts}} {{units .}}{{end}}</p>
</header>
<main>
<aside class="caution" role="note"><strong>Caution.</strong> {{.Caution}}</aside>
{{range .Sites}}
<section id="site-{{.ID}}">
<h2>{{.Name}}</h2>
<p class="place">{{.Coords}}, elevation {{units .Elevation}}{{with .Conditions}}, {{units .}}{{end}}, time zone {{.Zone}}</p>
{{with .Chart}}<figure>
{{template "drawing" .Desk}}
{{template "drawing" .Phone}}
<figcaption>{{units .Summary}} Local clock time (hours down, months across) of
<span class="key rise"></span>sunrise and
<span class="key set"></span>sunset{{if .Lamps}},
<span class="key lamp"></span>lamp periods{{end}}{{if .Dark}},
<svg class="swatch" viewBox="0 0 22 12" width="22" height="12" aria-hidden="true"><rect class="dark" width="22" height="12" fill="url(#{{.ID}}-hatch)"/><defs><pattern id="{{.ID}}-hatch" class="hatch" width="6" height="6" patternUnits="userSpaceOnUse" patternTransform="rotate(45)"><rect width="6" height="6"/><line x1="3" y1="0" x2="3" y2="6"/></pattern></defs></svg>dark windows (hatched){{end}}{{if .Thresholds}},
<span class="key thr"></span>photoperiod threshold crossings{{end}}{{if .Today}},
<span class="key today"></span>today{{if ne .Today.PastW "0"}} (the weeks before it shaded){{end}}{{end}}; along the top,
<svg class="swatch moonkey" viewBox="0 0 10 10" width="10" height="10" aria-hidden="true"><circle class="moon" cx="5" cy="5" r="3.5"/></svg>new and
<svg class="swatch moonkey" viewBox="0 0 10 10" width="10" height="10" aria-hidden="true"><circle class="moon full" cx="5" cy="5" r="3.5"/></svg>full Moon.{{if .Marks}} <span class="key mark"></span>Red lines:{{range $i, $m := .Marks}}{{if $i}};{{end}} {{units $m.Label}} ({{units $m.Date}}){{end}}.{{end}}{{with .Held}} {{units .}}{{end}}</figcaption>
</figure>
{{end}}<table>
<thead><tr><th>Feed</th><th class="num">Events</th><th class="num">Size</th><th>Subscribe</th></tr></thead>
<tbody>
{{range .Feeds}}<tr id="feed-{{.ID}}"><td><strong>{{.Title}}</strong>{{with .Description}}<br/>{{units .}}{{end}}<br/><code>{{.ID}}</code></td><td class="num">{{.Events}}<span class="unit"> event{{if ne .Events "1"}}s{{end}}</span></td><td class="num">{{.Size}}</td><td>{{if .Webcal}}<a href="{{.Webcal}}">webcal</a> · {{end}}<a href="{{.HTTPS}}">{{if .Webcal}}https{{else}}{{.File}}{{end}}</a>{{if .Webcal}}<br/><code>{{urlBreaks .HTTPS}}</code>{{end}}</td></tr>
{{end}}</tbody>
</table>
</section>
{{end}}
</main>
<footer>{{with .Contact}}<p>{{.}}</p>{{end}}<p>Published by heliocal.</p></footer>
</body>
</html>
{{define "drawing"}}{{$step := .Step}}{{$id := .ID}}{{$d := .}}<svg class="{{.Class}}" xmlns="http://www.w3.org/2000/svg" viewBox="{{.ViewBox}}" width="{{.W}}" height="{{.H}}" role="img">
<title>{{.Title}}</title>
<rect class="plot" x="{{.Left}}" y="{{.Top}}" width="{{.PlotW}}" height="{{.PlotH}}"/>
{{with .Today}}{{if ne .PastW "0"}}<rect class="past" x="{{$d.Left}}" y="{{$d.Top}}" width="{{.PastW}}" height="{{$d.PlotH}}"><title>before today</title></rect>
{{end}}{{end}}{{with .Dark}}<path class="dark" stroke="url(#{{$id}}-hatch)" stroke-width="{{$step}}" d="{{.}}"><title>dark windows</title></path>
{{end}}{{with .Lamps}}<path class="lamp" stroke-width="{{$step}}" d="{{.}}"><title>lamp periods</title></path>
{{end}}{{range .Hours}}<line class="grid" x1="{{$d.Left}}" x2="{{$d.Right}}" y1="{{.Y}}" y2="{{.Y}}"/><text class="yl" x="{{.TX}}" y="{{.TY}}">{{.Label}}{{if not $d.Phone}}<tspan class="mm">:00</tspan>{{end}}</text>
{{end}}{{range .Months}}<line class="tick" x1="{{.X}}" x2="{{.X}}" y1="{{$d.Bottom}}" y2="{{$d.TickEnd}}"/>{{if .Label}}<text class="mo{{if .Short}} short{{end}}{{if .Alt}} alt{{end}}" x="{{.TX}}" y="{{.TY}}"{{if $d.Phone}} text-anchor="middle"{{end}}>{{.Label}}</text>{{end}}
{{end}}{{with .Rise}}<path class="rise" d="{{.}}"><title>sunrise</title></path>
{{end}}{{with .Set}}<path class="set" d="{{.}}"><title>sunset</title></path>
{{end}}{{range .Thresholds}}<line class="thr" x1="{{.X}}" x2="{{.X}}" y1="{{$d.Top}}" y2="{{$d.Bottom}}"><title>{{.Text}}</title></line>{{if not $d.Phone}}<text class="tl" x="{{.TX}}" y="{{.TY}}">{{.Label}}</text>{{end}}
{{end}}{{range .Marks}}<line class="mark" x1="{{.X}}" x2="{{.X}}" y1="{{.Y1}}" y2="{{.Y2}}"><title>{{.Label}}, {{.Date}}</title></line>{{if .Shown}}<text class="ml" x="{{.X}}" y="{{.TY}}" text-anchor="{{.Anchor}}">{{.Label}}</text>{{end}}
{{end}}{{range .Phases}}<circle class="moon{{if .Full}} full{{end}}" cx="{{.X}}" cy="{{.Y}}" r="3.5"><title>{{if .Full}}full Moon{{else}}new Moon{{end}}, {{.Date}}</title></circle>
{{end}}{{with .Today}}<line class="today" x1="{{.X}}" x2="{{.X}}" y1="{{$d.Top}}" y2="{{.Y2}}"><title>today, {{.Date}}</title></line>{{if not $d.Phone}}<text class="tdl" x="{{.TX}}" y="{{.TY}}">today</text>{{end}}
{{end}}</svg>{{end}}`))
})
