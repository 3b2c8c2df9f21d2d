package stress

import (
	"math"
	"path/filepath"
	"strings"
	"testing"
)

// TestBandUseMatchesAudit: the band plot's per-part use, read from the
// accumulators, equals PartResult.Util of a full Audit at each of its
// frequencies (the way it was computed before), for every example
// station netlist. Same arithmetic, so to rounding (1e-12).
func TestBandUseMatchesAudit(t *testing.T) {
	files, _ := filepath.Glob("../testdata/station/*.net")
	if len(files) == 0 {
		t.Skip("no example station")
	}
	n := 0
	for _, f := range files {
		src := stationFile(t, filepath.Base(f))
		if strings.Contains(src, "measured=") {
			continue // measured data are loaded by the command, not here
		}
		fx := build(t, src)
		u, err := fx.eng.BandUse(4)
		if err != nil {
			t.Fatal(err)
		}
		for k, fr := range u.F {
			one := fx.eng.Cond
			one.BandLo, one.BandHi, one.Points, one.CarrierAlso = fr, fr, 1, nil
			sub, err := NewEngine(fx.c, fx.rs, one)
			if err != nil {
				t.Fatal(err)
			}
			sec, err := sub.Audit()
			if err != nil {
				t.Fatal(err)
			}
			for i, p := range sec.Parts {
				n++
				if got := u.Use[i][k]; math.Abs(got-p.Util) > 1e-12*math.Max(1, p.Util) {
					t.Errorf("%s %s at %g Hz: band use %g, audit %g", filepath.Base(f), p.Name, fr, got, p.Util)
				}
			}
		}
	}
	if n < 100 {
		t.Errorf("only %d parts compared", n)
	}
}
