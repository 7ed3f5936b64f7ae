package publish

import (
	"bufio"
	"context"
	"fmt"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"
	"time"

	"heliocal/config"
	"heliocal/feed"
	"heliocal/internal/fleet"
)

// fleetConfig parses the configuration of n invented sites (internal/fleet)
// spread around ten regions, each with one feed of the daily kinds over 400
// days (30 back, 369 ahead).
func fleetConfig(tb testing.TB, n int) *config.Config {
	tb.Helper()
	cfg, err := config.Parse(strings.NewReader(fleet.YAML(n)), "yaml")
	if err != nil {
		tb.Fatal(err)
	}
	return cfg
}

// peakRSS is the process's peak resident set (VmHWM), in bytes; 0 where
// /proc is not there.
func peakRSS() int64 {
	f, err := os.Open("/proc/self/status")
	if err != nil {
		return 0
	}
	defer f.Close()
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		if v, ok := strings.CutPrefix(sc.Text(), "VmHWM:"); ok {
			kb, _ := strconv.ParseInt(strings.TrimSpace(strings.TrimSuffix(strings.TrimSpace(v), "kB")), 10, 64)
			return kb * 1024
		}
	}
	return 0
}

// BenchmarkPublishFleet publishes n site-feeds × 400 days × the daily kinds
// (sunrise, sunset, civil dawn and dusk, golden hour) to disk, from the
// parsed configuration to the last file: catalogue, encoder, atomic writes,
// feeds.json and index.html (without charts, as for any configuration over
// MaxCharts sites). Target for n=1000 on a 2-core machine: ≤ 10 s and
// ≤ 300 MB peak memory. Run one size alone so the peak is its own:
//
//	go test ./feed/publish -run '^$' -bench 'PublishFleet/feeds=1000' -benchtime 1x
func BenchmarkPublishFleet(b *testing.B) {
	for _, n := range []int{50, 1000} {
		b.Run(fmt.Sprintf("feeds=%d", n), func(b *testing.B) {
			cfg := fleetConfig(b, n)
			now := time.Date(2027, 3, 20, 12, 0, 0, 0, time.UTC)
			b.ReportAllocs()
			var st Stats
			for b.Loop() {
				cat, err := feed.NewCatalogue(cfg, feed.Options{Now: now, Refresh: 24 * time.Hour})
				if err != nil {
					b.Fatal(err)
				}
				srcs := make([]Source, len(cfg.Feeds))
				for i := range cfg.Feeds {
					f := &cfg.Feeds[i]
					srcs[i] = Source{ID: f.ID, Build: func(ctx context.Context) (*feed.Calendar, error) { return cat.Calendar(ctx, f) }, Release: true}
				}
				opts := RenderOptions{BaseURL: demoBase, Generated: now.Truncate(24 * time.Hour), MaxFeedBytes: -1}
				st, err = Publish(context.Background(), srcs, opts, &Writer{Dir: b.TempDir()})
				if err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric(float64(st.Events), "events")
			b.ReportMetric(float64(st.Bytes)/1e6, "MB-written")
			b.ReportMetric(float64(peakRSS())/1e6, "peak-RSS-MB")
		})
	}
}

// BenchmarkWriteBundle measures the writer alone: 50 feeds of 1.7 MB (the
// size of a 400-day feed of the daily kinds) written to a fresh directory
// ("new": temporary file, write, fsync, rename, directory fsync), then
// the same bundle again ("unchanged": read and compare only).
func BenchmarkWriteBundle(b *testing.B) {
	const n, size = 50, 1_700_000
	bundle := &Bundle{}
	for i := range n {
		data := make([]byte, size)
		for j := range data {
			data[j] = byte('A' + (i+j)%26)
		}
		bundle.Files = append(bundle.Files, File{Name: fmt.Sprintf("site-%04d-daily.ics", i), Data: data})
	}
	b.Run("new", func(b *testing.B) {
		b.SetBytes(n * size)
		for b.Loop() {
			if _, err := (&Writer{Dir: b.TempDir()}).WriteBundle(context.Background(), bundle); err != nil {
				b.Fatal(err)
			}
		}
	})
	b.Run("unchanged", func(b *testing.B) {
		w := &Writer{Dir: b.TempDir()}
		if _, err := w.WriteBundle(context.Background(), bundle); err != nil {
			b.Fatal(err)
		}
		b.SetBytes(n * size)
		for b.Loop() {
			st, err := w.WriteBundle(context.Background(), bundle)
			if err != nil || st.FilesWritten != 0 {
				b.Fatal(st, err)
			}
		}
	})
}

// BenchmarkChart turns a site's year into what the index page draws, in the
// wide and the phone geometry: 365 days at Vienna's clock with sunrise and
// sunset, the four seasons as marks, a new or full Moon every 14.77 days,
// two photoperiod levels and today in March. The day lengths are a smooth
// invented year, not computed: only the drawing is measured.
//
//	go test ./feed/publish -run '^$' -bench 'Chart$' -benchmem
func BenchmarkChart(b *testing.B) {
	vienna, err := time.LoadLocation("Europe/Vienna")
	if err != nil {
		b.Fatal(err)
	}
	first := time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC)
	c := &SiteChart{Location: vienna, Today: time.Date(2027, 3, 20, 0, 0, 0, 0, time.UTC)}
	for i := range 365 {
		day := time.Duration((12 + 4*math.Sin(2*math.Pi*float64(i-80)/365)) * float64(time.Hour))
		noon := 12*time.Hour + 5*time.Minute
		c.Days = append(c.Days, ChartDay{
			Date: first.AddDate(0, 0, i), Daylight: day, Civil: day + time.Hour, Nautical: day + 2*time.Hour,
			Astronomical: day + 3*time.Hour, Rise: noon - day/2, Set: noon + day/2, HasRise: true, HasSet: true,
		})
	}
	for i, name := range []string{"March equinox", "June solstice", "September equinox", "December solstice"} {
		c.Marks = append(c.Marks, Mark{At: time.Date(2027, time.Month(3+3*i), 21, 10, 0, 0, 0, time.UTC), Label: name})
	}
	for at, full := time.Date(2027, 1, 7, 20, 24, 0, 0, time.UTC), false; at.Year() == 2027; at, full = at.Add(1275700*time.Second), !full {
		c.Phases = append(c.Phases, Phase{At: at, Full: full})
	}
	c.Levels = []Level{{Length: 12 * time.Hour}, {Length: 14*time.Hour + 30*time.Minute, Label: "seedlings"}}
	b.ReportAllocs()
	for b.Loop() {
		if chart("fernhollow", "Fernhollow Farm", c) == nil {
			b.Fatal("no chart")
		}
	}
}
