package ratings

import (
	"math"
	"strings"
	"testing"
)

// TestLineHeatLimit: a line's pmax= is a heating limit: matched, the rated
// power P heats the input metre by 2α·P (Pozar sec. 2.7, −dP/dz = 2αP),
// α = dB/100 m ÷ 100 ÷ 8.686 (1 Np = 8.686 dB). Hand figures: at 10 MHz
// 1.5 dB/100 m and 1.2 kW give 2 × 1.727e-3 × 1200 = 4.145 W/m; halfway
// (log scale) to 100 MHz both the loss and the rating are geometric
// means, √(1.5·4.9) dB/100 m and √(1200·500) W. The standard profile's
// factor for lines is 0.8. Exact formulas: 1e-12 relative.
func TestLineHeatLimit(t *testing.T) {
	s := mustPrepare(t, `
port in a z=50
port out b z=50
line W a b z0=50 len=20m vf=0.66 loss=1.5@10M,4.9@100M vpk=5k pmax=1.2k@10M,500@100M
`, BuiltinProfile("standard"))
	p := s.Parts["W"]
	np := 20 * math.Log10(math.E)
	for _, c := range []struct{ f, db, w float64 }{
		{10e6, 1.5, 1200},
		{math.Sqrt(10e6 * 100e6), math.Sqrt(1.5 * 4.9), math.Sqrt(1200 * 500)},
		{3.6e6, 1.5, 1200}, // below the points: held
	} {
		var got Limit
		for _, l := range p.Limits(c.f) {
			if l.Quantity == Pm {
				got = l
			}
		}
		want := 2 * c.db / 100 / np * c.w
		if math.Abs(got.Abs-want) > 1e-12*want || math.Abs(got.Derated-0.8*want) > 1e-12*want {
			t.Errorf("at %g Hz: heating limit %g (derated %g), want %g", c.f, got.Abs, got.Derated, want)
		}
	}
	if l := p.Limits(10e6)[0]; l.Quantity != Vpk || l.Abs != 5000 || l.Derated != 3000 {
		t.Errorf("dielectric limit %+v, want vpk 5 kV derated by 0.6", l)
	}
	// twice the absolute limit at 10 MHz needs a line rated 2 × 1.2 kW,
	// over the 0.8 factor: 3 kW
	var l10 Limit
	for _, l := range p.Limits(10e6) {
		if l.Quantity == Pm {
			l10 = l
		}
	}
	if r := p.Remedy(l10, 2*l10.Abs, RemedyContext{F: 10e6}); !strings.Contains(r, "3.00 kW") {
		t.Errorf("remedy %q, want a 3 kW matched rating", r)
	}
	// without loss= the heating is not judged, with a note
	s = mustPrepare(t, "port in a z=50\nport out b z=50\nline W a b z0=50 len=20m vf=0.66 pmax=1k\n", BuiltinProfile("standard"))
	p = s.Parts["W"]
	for _, l := range p.Limits(7e6) {
		if l.Quantity == Pm && l.Abs != 0 {
			t.Errorf("lossless line judged for heating: %+v", l)
		}
	}
	if len(p.Findings) == 0 {
		t.Error("no note that a lossless line's heating is not judged")
	}
}
