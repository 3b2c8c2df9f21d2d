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

// TestTxCrestClosedForm: the closed-form crest of the transmitter's |Γ|
// on the α circle (a Möbius image of a circle is a circle; its farthest
// point from the origin is |c| + r) against a scan of 20 000 points of
// the α circle, on the tuner (a complex, strongly frequency-dependent
// input) and the 80 m lowpass at each carrier. It must be found (no
// fallback), lie at or above every scanned point, and above the scan's
// best by no more than the scan's spacing allows (1e-6).
func TestTxCrestClosedForm(t *testing.T) {
	for _, name := range []string{"tuner-80m-vertical.net", "lpf-80m.net"} {
		fx := build(t, stationFile(t, name), "swr=3", "harmonics=none")
		e := fx.eng
		w := e.newWorkspace(fx.c)
		for fi, f := range e.carriers {
			e.setAntenna(w, fi, f)
			if err := w.sw.Fill(w.carr, f); err != nil {
				t.Fatal(err)
			}
			ca, ra, ok := e.alphaCircle(w.carr, w.zc)
			if !ok || ra == 0 {
				continue
			}
			a, ok := e.txCrest(w, ca, ra)
			if !ok {
				t.Errorf("%s at %g Hz: closed form not found", name, f)
				continue
			}
			scale, _ := e.drive(w, a)
			got := e.txAt(w.carr, a, scale).Gamma
			best := 0.0
			const m = 20000
			for j := 0; j < m; j++ {
				phi := 2 * math.Pi * float64(j) / m
				al := ca + complex(ra*math.Cos(phi), ra*math.Sin(phi))
				sc, _ := e.drive(w, al)
				best = math.Max(best, e.txAt(w.carr, al, sc).Gamma)
			}
			if got < best*(1-1e-12) || got > best*(1+1e-6) {
				t.Errorf("%s at %g Hz: crest |Γ| %.12g, scan %.12g", name, f, got, best)
			}
		}
	}
}
