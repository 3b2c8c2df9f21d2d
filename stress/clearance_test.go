package stress

import (
	"math"
	"math/cmplx"
	"strings"
	"testing"

	"rfstress/circuits"
	"rfstress/ratings"
)

// tTuner is a high-pass T tuner matching 50 Ω into a short 80 m vertical
// (13−j490 Ω at 3.65 MHz), as in the example station: series C1 on the
// transmitter side, shunt roller L1, series C2 on the antenna side. C1's
// plates are 1 mm apart, too close for 100 W at SWR 2.
const tTuner = `
port in  n1 z=50
port out n3 z=13-j490
capacitor C1 n1 n2  40p  dielectric=air vpk=3000 gap=1mm
inductor  L1 n2 gnd 18.0u q=200@3.5M,250@7M
capacitor C2 n2 n3  250p dielectric=air vpk=1500 gap=1mm
clearance K1 n2 gnd gap=6mm
audit power=100 freq=3.65M swr=2 phases=72 harmonics=none
`

func partByName(t *testing.T, s *Section, name string) *PartResult {
	t.Helper()
	for _, p := range s.Parts {
		if p.Name == name {
			return p
		}
	}
	t.Fatalf("no part %s", name)
	return nil
}

// TestTunerPlateGap: the T tuner at 100 W into the short vertical, SWR 2.
// The series capacitor C1's peak voltage is checked by hand and by brute
// force, and the plate gap the audit asks for against the gap solved by
// hand from that peak voltage.
func TestTunerPlateGap(t *testing.T) {
	fx := build(t, tTuner)
	s, err := fx.eng.Audit()
	if err != nil {
		t.Fatal(err)
	}
	c1 := partByName(t, s, "C1")
	// Hand check, matched: the tuner presents about 50 Ω, so the
	// source's 141 V EMF drives |I| = 141/|50 + Zin| ≈ 1.42 A through C1,
	// whose reactance is 1/(2π·3.65 MHz·40 pF) = 1090 Ω: 1.55 kV RMS,
	// 2.19 kV peak. 2 % for the imperfect match (Zin ≈ 49.3−j2.9 Ω) and
	// the plates' small loss.
	matched := -1.0
	for _, k := range c1.ByKind {
		if k.Kind == Matched {
			matched = k.Value[ratings.Vpk]
		}
	}
	xc := 1 / (2 * math.Pi * 3.65e6 * 40e-12)
	hand := math.Sqrt2 * xc * math.Sqrt(100.0/50)
	if relErr(matched, hand) > 0.02 {
		t.Errorf("C1 matched peak %.0f V, hand %.0f V", matched, hand)
	}
	// Brute force over the SWR 2 circle with full solves (no split, no
	// closed-form worst phase): the audit finds the continuous circle's
	// worst, which 3600 phases (0.1° apart) approach from below to within
	// 1 − cos 0.05° ≈ 4e-7; 1e-5 allowed.
	worst := func(n int) float64 {
		var m float64
		for k := 0; k < n; k++ {
			l := circuits.LoadOnCircle(fx.c.Zout, 2, 2*math.Pi*float64(k)/float64(n))
			r, err := fx.c.Solve(3.65e6, 100, l)
			if err != nil {
				t.Fatal(err)
			}
			for i, el := range fx.c.Elements {
				if el.Name == "C1" {
					m = math.Max(m, math.Sqrt2*cmplx.Abs(r.Parts[i].V))
				}
			}
		}
		return m
	}
	arc := c1.Stress[ratings.Arc]
	if arc == nil {
		t.Fatal("C1 declares gap= but has no clearance stress")
	}
	if w := worst(3600); arc.Value < w*(1-1e-9) || arc.Value > w*(1+1e-5) {
		t.Errorf("C1 peak across its plates %.3f V, brute force over 3600 phases %.3f V", arc.Value, w)
	}
	// Hand calculation of the gap: the derated limit is the breakdown of
	// the uniform gap × 0.8 (RF) × 0.75 (edges) × 0.7 (standard profile
	// for air gaps), so the uniform-field breakdown needed is
	// V/(0.8·0.75·0.7). Kuffel's formula V[kV] = 24.22·δd + 6.08·√(δd) is
	// a quadratic in √(δd); δ = 293.15/298.15 for 25 °C air at sea level.
	vkv := arc.Value / (0.8 * 0.75 * 0.7) / 1e3
	sq := (-6.08 + math.Sqrt(6.08*6.08+4*24.22*vkv)) / (2 * 24.22)
	delta := 293.15 / 298.15
	gapHand := sq * sq / delta / 100 // m
	cl := c1.Clearance
	if cl == nil {
		t.Fatal("C1 has no clearance result")
	}
	// bisection against the closed form: 1e-6
	if relErr(cl.Needed, gapHand) > 1e-6 {
		t.Errorf("C1 needs a %.4f mm gap, hand %.4f mm", cl.Needed*1e3, gapHand*1e3)
	}
	// and the figures a bench engineer expects: about 2.7 kV peak, which
	// arcs a 1 mm gap (about 2.6 kV at RF) and wants about 1.7 mm
	if arc.Value < 2.5e3 || arc.Value > 2.9e3 || gapHand < 1.4e-3 || gapHand > 2e-3 {
		t.Errorf("C1 %.0f V needs %.2f mm: outside the expected 2.5–2.9 kV, 1.4–2.0 mm", arc.Value, gapHand*1e3)
	}
	if arc.Verdict != ratings.Fail {
		t.Errorf("C1's 1 mm gap at %.0f V peak: verdict %s, want fail (it would arc at %.0f V)", arc.Value, arc.Verdict, cl.ArcV)
	}
	if !strings.Contains(arc.BuyText, "gap ≥ 1.7 mm") {
		t.Errorf("C1 remedy %q, want a gap of at least 1.7 mm", arc.BuyText)
	}
	// the clearance statement K1 across L1 sees exactly L1's peak voltage
	k1, l1 := partByName(t, s, "K1"), partByName(t, s, "L1")
	if relErr(k1.Stress[ratings.Arc].Value, l1.Stress[ratings.Vpk].Value) > 1e-12 {
		t.Errorf("K1 %.3f V, L1 across the same nodes %.3f V", k1.Stress[ratings.Arc].Value, l1.Stress[ratings.Vpk].Value)
	}
	if k1.Has(ratings.Irms) || k1.Has(ratings.Vpk) || k1.Has(ratings.Pdiss) {
		t.Error("a clearance carries no current, dissipation or part voltage rating")
	}
}

// TestClearanceHarmonicsAddAsPeaks: a clearance across a matched 50 Ω
// load, carrier plus a 2nd harmonic at −10 dBc. The load voltage is E/2
// at each frequency, so its peak is √2·(E/2)·(1 + √0.1) with E = 2√(P·50)
// (peaks add: the worst instant has both in phase).
func TestClearanceHarmonicsAddAsPeaks(t *testing.T) {
	src := `
port in  n1 z=50
port out n2 z=50
resistor R1 n1 n2 1m
clearance K1 n2 gnd gap=0.5mm medium=board
audit power=100 freq=7M harmonics=-10 harmonic-max=2
`
	s, err := build(t, src).eng.Audit()
	if err != nil {
		t.Fatal(err)
	}
	e := 2 * math.Sqrt(100*50.0)
	// R1 of 1 mΩ lowers the load voltage by 1e-5: tolerance 2e-5
	want := math.Sqrt2 * e / 2 * (1 + math.Sqrt(0.1))
	k := partByName(t, s, "K1")
	if got := k.Stress[ratings.Arc].Value; relErr(got, want) > 2e-5 {
		t.Errorf("K1 peak %.3f V, hand %.3f V", got, want)
	}
	// 0.5 mm of bare board holds 70 V by the working guide, and the same
	// gap through air would arc near 1.5 kV: 131 V is beyond the guide
	// (advice) but far from arcing, so marginal, not fail
	if k.Verdict != ratings.Marginal || k.Clearance.Limit != ratings.BoardVpkPerMM*0.5 || k.Clearance.Derated != ratings.BoardVpkPerMM*0.5 {
		t.Errorf("K1 verdict %s against %.1f V (derated %.1f V), want marginal against the %.1f V guide",
			k.Verdict, k.Clearance.Limit, k.Clearance.Derated, ratings.BoardVpkPerMM*0.5)
	}
}

// TestConnectorHandCheck: a connector in series at the antenna port of a
// 50 Ω source, 100 W available. Matched: the load takes E/2 = 70.7 V RMS,
// 100 V peak, and 1.414 A RMS; open: the connector's centre stands the
// full EMF, 141 V RMS, 200 V peak, and carries nothing.
func TestConnectorHandCheck(t *testing.T) {
	src := `
port in  n1 z=50
port out n2 z=50
connector J1 n1 n2 vpk=500 irms=5
audit power=100 freq=14.2M harmonics=none faults=open
`
	s, err := build(t, src).eng.Audit()
	if err != nil {
		t.Fatal(err)
	}
	j := partByName(t, s, "J1")
	for _, k := range j.ByKind {
		var wantV, wantI float64
		switch k.Kind {
		case Matched:
			wantV, wantI = 100, math.Sqrt2
		case FaultOpen:
			wantV, wantI = 200, 0
		default:
			continue
		}
		// exact circuit, rounding only: 1e-9 (absolute 1e-9 A for zero)
		if relErr(k.Value[ratings.Vpk], wantV) > 1e-9 || math.Abs(k.Value[ratings.Irms]-wantI) > 1e-9*math.Max(wantI, 1) {
			t.Errorf("%s: J1 %.6f V peak, %.6f A RMS; hand %.6f V, %.6f A", k.Kind, k.Value[ratings.Vpk], k.Value[ratings.Irms], wantV, wantI)
		}
	}
	if j.Has(ratings.Pdiss) || j.Has(ratings.Vrms) {
		t.Error("a connector shows no dissipation or RMS voltage")
	}
	if st := j.Stress[ratings.Vpk]; st.Limit.Abs != 500 || st.Verdict != ratings.OK {
		t.Errorf("J1 vpk limit %g, verdict %s; want rated 500 V and ok", st.Limit.Abs, st.Verdict)
	}
}

// TestUndeclaredClearanceFinding: the tuner without its declared gaps
// gets a finding for the hot node n2 (to ground) and for C1 (across its
// plates), both above the ≈2.6 kV at which 1 mm of air arcs at RF; C2's
// 0.7 kV does not. Declaring the gaps silences them.
func TestUndeclaredClearanceFinding(t *testing.T) {
	bare := strings.NewReplacer(" gap=1mm", "", "clearance K1 n2 gnd gap=6mm", "").Replace(tTuner)
	s, err := build(t, bare).eng.Audit()
	if err != nil {
		t.Fatal(err)
	}
	var node, c1, other int
	for _, f := range s.Findings {
		if strings.HasPrefix(f.Text, "node n2 ") {
			node++
		} else if strings.Contains(f.Text, "would arc") {
			other++
		}
	}
	for _, p := range s.Parts {
		for _, f := range p.Findings {
			switch {
			case p.Name == "C1" && strings.Contains(f.Text, "would arc"):
				c1++
			case strings.Contains(f.Text, "would arc"):
				other++ // L1 is the pair n2–gnd, already named once
			}
		}
	}
	if node != 1 || c1 != 1 || other != 0 {
		t.Errorf("findings: node n2 %d, C1 %d, others %d; want 1, 1, 0", node, c1, other)
	}
	if s.ArcCheckV < 2.4e3 || s.ArcCheckV > 2.8e3 {
		t.Errorf("1 mm check voltage %.0f V, want about 2.6 kV", s.ArcCheckV)
	}
	s, err = build(t, tTuner).eng.Audit()
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range s.Findings {
		if strings.Contains(f.Text, "would arc") {
			t.Errorf("declared clearances, still: %s", f.Text)
		}
	}
}

// TestAltitudeLowersTheLimit: the same gap at 3000 m holds about a
// quarter less (ISO 2533 pressure 70.1 kPa); the audit's altitude
// setting reaches the clearance's limit.
func TestAltitudeLowersTheLimit(t *testing.T) {
	sea, err := build(t, tTuner).eng.Audit()
	if err != nil {
		t.Fatal(err)
	}
	high, err := build(t, tTuner, "altitude=3000m").eng.Audit()
	if err != nil {
		t.Fatal(err)
	}
	a, b := partByName(t, sea, "C2").Clearance, partByName(t, high, "C2").Clearance
	// Kuffel's formula by hand at 1 mm, δ = p/p0·293.15/298.15
	k := func(dd float64) float64 { return 24.22*dd + 6.08*math.Sqrt(dd) }
	d0 := 293.15 / 298.15 * 0.1
	want := k(d0*70108/101325) / k(d0)
	if relErr(b.ArcV/a.ArcV, want) > 1e-4 {
		t.Errorf("arc voltage ratio 3000 m / sea level %.5f, hand %.5f", b.ArcV/a.ArcV, want)
	}
	if math.Abs(high.AirPressure-70108) > 1 {
		t.Errorf("air pressure at 3000 m %.0f Pa, want 70108", high.AirPressure)
	}
	for _, bad := range []string{"altitude=3000", "altitude=20km", "altitude=high"} {
		c := Defaults()
		k, v, _ := strings.Cut(bad, "=")
		if err := c.Apply([]Setting{{Key: k, Value: v, Flag: true}}); err == nil {
			t.Errorf("%s accepted", bad)
		}
	}
}

// TestRetuneKeepsClearances: with the tuner retuned per load, the merged
// section still judges declared gaps and still names undeclared hot
// nodes. The worked L network of ../shared/REFERENCES.md puts about
// 1.23 kV peak across its shunt capacitor at 1500 W, matched; at 10 kW
// that is 1.23·√(10000/1500) = 3.18 kV, above the ≈2.57 kV at which 1 mm
// of air arcs (2 % for the sheet's rounding; no faults, so the matched
// load is the only case).
func TestRetuneKeepsClearances(t *testing.T) {
	src := strings.NewReplacer("dielectric=vacuum", "dielectric=air", "power=1500", "power=10000", " faults=open", "").Replace(worked160)
	s, _ := retuneFixture(t, src, complex(321, 255))
	found := false
	for _, f := range s.Findings {
		found = found || strings.HasPrefix(f.Text, "node n2 ")
	}
	if !found {
		t.Errorf("retuned, no finding for the undeclared hot node n2: %v", s.Findings)
	}
	s, _ = retuneFixture(t, strings.Replace(src, "dielectric=air", "dielectric=air gap=3mm", 1), complex(321, 255))
	var c1 *PartResult
	for _, p := range s.Parts {
		if p.Name == "C1" {
			c1 = p
		}
	}
	want := 1.23e3 * math.Sqrt(10000.0/1500)
	if c1 == nil || c1.Clearance == nil || relErr(c1.Clearance.Vpk, want) > 0.02 {
		t.Fatalf("retuned C1 clearance %+v, want about %.0f V peak", c1.Clearance, want)
	}
	for _, f := range s.Findings {
		if strings.Contains(f.Text, "would arc") {
			t.Errorf("gap declared, still: %s", f.Text)
		}
	}
}

// TestClearanceAddsDC: a 100 V supply fed through an RF choke onto a
// matched 50 Ω line at 100 W. The line node carries E/2 = 70.7 V RMS,
// 100 V peak of RF on top of the 100 V DC, so a gap from it to ground sees
// 200 V peak (peaks add; 2 % for the choke's and the blocking capacitor's
// small reactances); the supply node, an RF short, sees its 100 V DC
// alone.
func TestClearanceAddsDC(t *testing.T) {
	src := `
port in  n1 z=50
port out n2 z=50
supply HV bplus 100V
inductor  RFC n1 bplus 100u q=60
capacitor Cb  n1 n2 10n q=2000
clearance K1 n1 gnd gap=1mm
clearance K2 bplus gnd gap=1mm medium=board
audit power=100 freq=14.2M harmonics=none
`
	s, err := build(t, src).eng.Audit()
	if err != nil {
		t.Fatal(err)
	}
	if v := partByName(t, s, "K1").Clearance.Vpk; relErr(v, 200) > 0.02 {
		t.Errorf("K1 %.2f V peak, hand 100 V DC + 100 V RF", v)
	}
	if v := partByName(t, s, "K2").Clearance.Vpk; relErr(v, 100) > 1e-6 {
		t.Errorf("K2 %.4f V peak, hand 100 V DC", v)
	}
}
