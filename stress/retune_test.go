package stress

import (
	"math"
	"math/cmplx"
	"strings"
	"testing"

	"rfstress/circuits"
	"rfstress/ratings"
	"rfstress/tuning"
)

// The worked check of ../shared/REFERENCES.md as an audit: 1500 W carrier
// at 1.825 MHz into 321+j255 Ω through a series coil (Q 100) and a shunt
// capacitor across the load (Q 1000), retuned by the tool. Recomputed by
// hand: line current √(1500/50) = 5.477 A, coil loss I²·ωL/Q ≈ 45.4 W
// ("about 45.6 W" on the sheet), capacitor ≈ 1.23 kV peak, efficiency
// ≈ 96.6 %.
const worked160 = `title worked check
port in n1 z=50
port out n2 z=321+j255
inductor  L1 n1 n2 10u q=100 range=2u:30u irms=10
capacitor C1 n2 gnd 500p q=1000 range=50p:2000p vpk=5000 irms=10 dielectric=vacuum
audit power=1500 mode=carrier freq=1.825M harmonics=none faults=open
`

func retuneFixture(t *testing.T, src string, loads ...complex128) (*Section, *fixture) {
	t.Helper()
	fx := build(t, src)
	m, err := tuning.NewMatcher(fx.c, tuning.DefaultSWR, tuning.LeastLoss)
	if err != nil {
		t.Fatal(err)
	}
	ls := &tuning.LoadSet{Source: "test"}
	for _, z := range loads {
		ls.Points = append(ls.Points, tuning.LoadPoint{Z: z})
	}
	s, err := RetuneAudit(fx.c, fx.rs, fx.cond, false, ls, m, 2)
	if err != nil {
		t.Fatal(err)
	}
	return s, fx
}

func TestRetuneWorkedCheck(t *testing.T) {
	s, _ := retuneFixture(t, worked160, complex(321, 255))
	la := s.Retune.PerLoad[0]
	if !la.Tune.Matched || la.Section == nil {
		t.Fatalf("not matched: %s", la.Tune.Limit)
	}
	f, p := 1.825e6, 1500.0
	L := la.Tune.Best.Values[0]
	hand := p / 50 * 2 * math.Pi * f * L / 100
	var l1 float64
	for _, kw := range la.Section.Parts[0].ByKind {
		if kw.Kind == Matched {
			l1 = kw.Value[ratings.Pdiss]
		}
	}
	// 0.5 %: the hand figure takes the match as exact (SWR 1.000)
	if relErr(l1, hand) > 5e-3 || relErr(l1, 45.6) > 0.01 {
		t.Errorf("coil dissipation %.2f W, hand %.2f W, sheet about 45.6 W", l1, hand)
	}
	// the open-antenna fault is the worse case here (series resonance
	// across the source), so read the matched case from the load's audit
	var vpk float64
	for _, kw := range la.Section.Parts[1].ByKind {
		if kw.Kind == Matched {
			vpk = kw.Value[ratings.Vpk]
		}
	}
	if relErr(vpk, 1230) > 0.005 {
		t.Errorf("capacitor %.0f V peak when matched, sheet about 1.23 kV", vpk)
	}
	if e := la.Tune.Best.Eff; math.Abs(e-0.966) > 0.001 {
		t.Errorf("efficiency %.4f, sheet about 96.6 %%", e)
	}
}

// Faults are judged at the settings of the load they interrupt: with the
// antenna open, what is left is the tuned coil in series with the tuned
// capacitor across the 50 Ω source. By hand (Ohm's law): EMF
// E = 2·√(P·50) rms, I = E/(50 + Z_L + Z_C), V_C = I·|Z_C|.
func TestRetuneFaultAtItsLoadsSettings(t *testing.T) {
	loads := []complex128{complex(321, 255), complex(200, 0), complex(800, -300)}
	s, _ := retuneFixture(t, worked160, loads...)
	f, p := 1.825e6, 1500.0
	w := 2 * math.Pi * f
	worst := 0.0
	for i, la := range s.Retune.PerLoad {
		if la.Section == nil {
			t.Fatalf("load %v not matched: %s", loads[i], la.Tune.Limit)
		}
		L, C := la.Tune.Best.Values[0], la.Tune.Best.Values[1]
		zl := complex(w*L/100, w*L)
		zc := complex(1/(w*C*1000), -1/(w*C))
		e := 2 * math.Sqrt(p*50)
		vc := math.Sqrt2 * e / cmplx.Abs(50+zl+zc) * cmplx.Abs(zc)
		var got float64
		for _, kw := range la.Section.Parts[1].ByKind {
			if kw.Kind == FaultOpen {
				got = kw.Value[ratings.Vpk]
			}
		}
		if relErr(got, vc) > 1e-6 {
			t.Errorf("load %v open: C1 %.1f V peak, hand %.1f V", loads[i], got, vc)
		}
		if vc > worst {
			worst = vc
		}
	}
	st := s.Parts[1].Stress[ratings.Vpk]
	if st.Value < worst*(1-1e-6) {
		t.Errorf("section's worst C1 peak %.1f V below the worst fault %.1f V", st.Value, worst)
	}
	d := s.Case(st.Case).Describe()
	if !strings.Contains(d, "antenna open") || !strings.Contains(d, "tuned L1") {
		t.Errorf("worst case %q does not name the fault and the settings", d)
	}
}

// A load the network cannot match is counted and left out of the
// per-part worst (no setting exists to audit it at).
func TestRetuneUnmatchable(t *testing.T) {
	s, _ := retuneFixture(t, worked160, complex(321, 255), complex(10, 0))
	if s.Retune.Unmatched != 1 || s.Retune.PerLoad[1].Section != nil || s.Retune.PerLoad[1].Tune.Limit == "" {
		t.Fatalf("unmatched %d, load 2 %+v", s.Retune.Unmatched, s.Retune.PerLoad[1].Tune)
	}
	if s.NumCases != 2 {
		t.Errorf("%d cases, want 2 (matched and open for the one matched load)", s.NumCases)
	}
}

// A port with a measured antenna retuned for other loads: each load's
// audit is into the load it was tuned for, not into the port's sweep. By
// hand, at the match the line current is √(P/50) and the coil (Q 100)
// loses I²·ωL/Q.
func TestRetuneIgnoresMeasuredSweep(t *testing.T) {
	src := strings.Replace(worked160, "port out n2 z=321+j255", "port out n2 z=321+j255 measured=ant.s1p", 1)
	nl, err := circuits.Parse("test.net", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	// a sweep far from the loads tuned for: 5 Ω resistive
	s1p := "# MHz Z RI R 50\n1.8 0.1 0\n1.85 0.1 0\n"
	if err := circuits.LoadMeasured(nl, func(string) ([]byte, error) { return []byte(s1p), nil }); err != nil {
		t.Fatal(err)
	}
	c, err := circuits.Build(nl)
	if err != nil {
		t.Fatal(err)
	}
	fx := build(t, worked160)
	m, err := tuning.NewMatcher(c, tuning.DefaultSWR, tuning.LeastLoss)
	if err != nil {
		t.Fatal(err)
	}
	ls := &tuning.LoadSet{Source: "test", Points: []tuning.LoadPoint{{Z: complex(321, 255)}}}
	s, err := RetuneAudit(c, fx.rs, fx.cond, false, ls, m, 1)
	if err != nil {
		t.Fatal(err)
	}
	la := s.Retune.PerLoad[0]
	L := la.Tune.Best.Values[0]
	hand := 1500.0 / 50 * 2 * math.Pi * 1.825e6 * L / 100
	var got float64
	for _, kw := range la.Section.Parts[0].ByKind {
		if kw.Kind == Matched {
			got = kw.Value[ratings.Pdiss]
		}
	}
	if relErr(got, hand) > 5e-3 {
		t.Errorf("coil dissipation %.2f W at the tuned load, hand %.2f W (the sweep's 5 Ω would give another)", got, hand)
	}
}
