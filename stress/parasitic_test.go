package stress

import (
	"fmt"
	"math"
	"math/cmplx"
	"strings"
	"testing"

	"rfstress/ratings"
)

// srfLowpass is a 40 m 5-pole lowpass whose coils resonate at srf.
func srfLowpass(srf string) string {
	return fmt.Sprintf(`
port in  n1 z=50
port out n3 z=50
capacitor C1 n1 gnd 470p q=1000
inductor  L2 n1 n2  1.1u q=180 %s
capacitor C3 n2 gnd 820p q=1000
inductor  L4 n2 n3  1.1u q=180 %s
capacitor C5 n3 gnd 470p q=1000
`, srf, srf)
}

func findingWith(p *PartResult, text string) bool {
	for _, f := range p.Findings {
		if strings.Contains(f.Text, text) {
			return true
		}
	}
	return false
}

// TestSelfResonanceFinding: a finding when a carrier or audited harmonic
// lies within ±15 % of a part's self-resonance, none outside. At 7.1 MHz
// the 3rd harmonic is 21.3 MHz: an SRF of 24.48 MHz is 13 % away, one of
// 17.5 MHz is 19 % from the 2nd and 22 % from the 3rd. With
// harmonics=none the 3rd is not audited.
func TestSelfResonanceFinding(t *testing.T) {
	for _, c := range []struct {
		srf, harm string
		want      bool
	}{
		{"srf=21.3M", "push-pull", true},
		{"srf=24.48M", "push-pull", true},
		{"srf=17.5M", "push-pull", false}, // 2nd 19 % below, 3rd 22 % above
		{"srf=24.48M", "none", false},
		{"srf=7.5M", "none", true}, // near the carrier itself
		{"", "push-pull", false},
	} {
		fx := build(t, srfLowpass(c.srf), "band=7.1M", "harmonics="+c.harm)
		sec, err := fx.eng.Audit()
		if err != nil {
			t.Fatal(err)
		}
		if got := findingWith(sec.Parts[1], "self-resonance"); got != c.want {
			t.Errorf("%s, harmonics %s: finding %v, want %v (%v)", c.srf, c.harm, got, c.want, sec.Parts[1].Findings)
		}
	}
}

// TestCapacitorDielectricVoltage: with series inductance the capacitance
// sees |I|/(ωC), which below the part's resonance exceeds the terminal
// voltage (the series L cancels part of it). The engine's peak voltage is
// the larger of the two over every case, to 1e-9 of a brute-force scan
// of full solves.
func TestCapacitorDielectricVoltage(t *testing.T) {
	src := `
port in  n1 z=50
port out n2 z=50
inductor  L1 n1 n2 1u q=200
capacitor C1 n2 gnd 1n q=1000 esl=20n vpk=1k
`
	fx := build(t, src, "band=7.1M", "swr=2", "phases=36", "faults=open,short", "harmonics=none")
	fx.eng.forceScan = true
	sec, err := fx.eng.Audit()
	if err != nil {
		t.Fatal(err)
	}
	var want, term float64
	for i := 0; i < fx.eng.NumCases(); i++ {
		cs := fx.eng.Case(i)
		r := fullSolve(t, fx.c, cs.F, 100, cs.Load)
		st := r.Parts[1]
		vc := cmplx.Abs(st.I) / (2 * math.Pi * cs.F * 1e-9)
		want = math.Max(want, math.Sqrt2*math.Max(vc, cmplx.Abs(st.V)))
		term = math.Max(term, math.Sqrt2*cmplx.Abs(st.V))
	}
	got := sec.Parts[1].Stress[ratings.Vpk].Value
	if relErr(got, want) > 1e-9 {
		t.Errorf("capacitor peak voltage %g, brute force %g", got, want)
	}
	if !(want > term) {
		t.Errorf("dielectric voltage %g not above the terminal voltage %g below resonance", want, term)
	}
}

// TestWindingTerminalFinding: a coil whose self-capacitance carries more
// than 1 % of its current gets a note naming both currents.
func TestWindingTerminalFinding(t *testing.T) {
	fx := build(t, srfLowpass("cp=20p"), "band=7.1M", "harmonics=none")
	sec, err := fx.eng.Audit()
	if err != nil {
		t.Fatal(err)
	}
	if !findingWith(sec.Parts[1], "winding current") {
		t.Errorf("no winding/terminal note: %v", sec.Parts[1].Findings)
	}
	fx = build(t, srfLowpass("cp=0.01p"), "band=7.1M", "harmonics=none")
	if sec, err = fx.eng.Audit(); err != nil {
		t.Fatal(err)
	}
	if findingWith(sec.Parts[1], "winding current") {
		t.Errorf("a 0.01 pF self-capacitance should not change the current by 1 %%: %v", sec.Parts[1].Findings)
	}
}
