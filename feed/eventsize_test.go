package feed

import (
	"context"
	"math"
	"testing"
	"unsafe"
)

// TestEventSize keeps an Event as small as docs/performance.md ("Fifteenth
// round: a smaller event") made it: a listing's chunk holds thousands of
// them, written for the first time, and the facts few kinds have are out
// of line (eventMore).
func TestEventSize(t *testing.T) {
	if n := unsafe.Sizeof(Event{}); n > 200 {
		t.Errorf("an Event takes %d bytes, over 200", n)
	}
}

// The facts kept out of line read as zero on the events of other kinds, and
// on those that have them as the kind's own: a lamp period's length is its
// span; the seasons last as Meeus gives them for 2000 (Astronomical
// Algorithms, 2nd ed., ch. 27: spring 92.76 days, summer 93.65, autumn
// 89.84, winter 88.99; within 0.05 days 27 years on); the Earth is
// 0.9833334635 au from the Sun at the perihelion of 2027 (JPL DE405,
// testdata/reference/apsides-de405.csv).
func TestEventFactsOutOfLine(t *testing.T) {
	sk := sky(t, "2027-01-01", "2027-12-31")
	s := site(t, "north", 60.17, 24.94, "Europe/Helsinki")
	kinds := mustKinds(t, "sunrise", "lighting:16h", "seasons", "perihelion")
	evs, _, err := sk.Events(context.Background(), PlaceOf(s), kinds, date("2027-01-01"), date("2027-12-31"))
	if err != nil {
		t.Fatal(err)
	}
	seen := map[string]int{}
	for _, e := range evs {
		seen[e.Kind.Name]++
		l, x, d, n := e.LampFacts(), e.EclipseFacts(), e.Distance(), e.SeasonLength()
		if x != nil {
			t.Errorf("%s %s: eclipse facts %+v", e.Kind, e.Date.Format("2006-01-02"), x)
		}
		switch e.Kind.Name {
		case "lighting":
			if l.Lamp <= 0 || l.Lamp != e.End.Sub(e.Start) || d != 0 || n != 0 {
				t.Errorf("lamps %s: %+v over %v, distance %v, season %v", e.Date.Format("2006-01-02"), l, e.End.Sub(e.Start), d, n)
			}
		case "march-equinox", "june-solstice", "september-equinox", "december-solstice":
			want := map[string]float64{"march-equinox": 92.76, "june-solstice": 93.65, "september-equinox": 89.84, "december-solstice": 88.99}[e.Kind.Name]
			if days := n.Hours() / 24; math.Abs(days-want) > 0.05 || l != (LampFacts{}) || d != 0 {
				t.Errorf("season from %s: %.2f days, want %.2f; lamps %+v, distance %v", e.Date.Format("2006-01-02"), days, want, l, d)
			}
		case "perihelion":
			if math.Abs(d-0.9833334635) > 1e-6 || l != (LampFacts{}) || n != 0 {
				t.Errorf("perihelion %s: %v au, lamps %+v, season %v", e.Date.Format("2006-01-02"), d, l, n)
			}
		default:
			if l != (LampFacts{}) || d != 0 || n != 0 {
				t.Errorf("%s %s: lamps %+v, distance %v, season %v", e.Kind, e.Date.Format("2006-01-02"), l, d, n)
			}
		}
	}
	if seen["sunrise"] < 300 || seen["lighting"] < 100 || seen["june-solstice"] != 1 || seen["perihelion"] != 1 {
		t.Errorf("events by kind %v", seen)
	}
}
