package feed

import (
	"strings"
	"testing"
)

// A grazing eclipse is never rounded up to a figure it does not reach: the
// penumbral lunar eclipse of 18 July 2027 has a penumbral magnitude of about
// 0.001 (F. Espenak & J. Meeus, Five Millennium Canon of Lunar Eclipses,
// NASA/TP-2009-214172: 0.0014, value from memory), a tenth of a per cent of
// the Moon's diameter, not "1 %".
func TestGrazingEclipseShare(t *testing.T) {
	es := eclipseEntries(t, site(t, "wellington", -41.3, 174.8, "Pacific/Auckland"), "2027-07-18", "2027-07-19", "lunar-eclipse")
	if len(es) != 1 {
		t.Fatalf("%d entries, want the penumbral eclipse of 18 July 2027", len(es))
	}
	if d := es[0].Description; !strings.Contains(d, "less than 1 % of the Moon's diameter") || strings.Contains(d, ": 1 % of") {
		t.Errorf("description does not say less than 1 %%:\n%s", d)
	}
	for f, want := range map[float64]string{0: "0 %", 0.001: "less than 1 %", 0.389: "39 %", 0.997: "more than 99 %", 1: "100 %"} {
		if got := share(f); got != want {
			t.Errorf("share(%v) = %q, want %q", f, got, want)
		}
	}
}
