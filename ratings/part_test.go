package ratings

import (
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"rfstress/circuits"
)

const goodNet = `title test filter
port in n1 z=50
port out n3 z=50
material shopiron class=iron mu=9 tmax=130C bsat=0.9T guide=14mT@1M,3mT@30M note=shop_iron
core KA od=13mm id=7mm h=5mm material=iron mu=10
core KB od=18mm id=10mm h=5mm material=shopiron area=10cm2
core box ae=20mm2 le=40mm al=4nH
capacitor C1 n1 gnd 300p vpk=1kV irms=4@10M dielectric=mica
capacitor C2 n2 gnd 560p dielectric=X7R
capacitor C3 n3 gnd 100p
inductor L1 n1 n2 0.91u core=KA turns=12 wire=0.8mm
inductor L2 n2 n3 0.91u core=KB turns=12 wire=1mm q=400@7M
inductor L3 n2 n3 0.5u
inductor L4 n1 n3 1u core=box turns=30 wire=0.5mm irms=2@7M
resistor R1 n3 gnd 10k pmax=2W
`

func mustPrepare(t *testing.T, src string, prof *Profile) *Set {
	t.Helper()
	nl, err := circuits.Parse("t.net", []byte(src))
	if err != nil {
		t.Fatalf("parse: %v", err)
	}
	s, err := Prepare(nl, nil, prof)
	if err != nil {
		t.Fatalf("prepare: %v", err)
	}
	return s
}

func limitOf(t *testing.T, p *Part, f float64, q Quantity) Limit {
	t.Helper()
	for _, l := range p.Limits(f) {
		if l.Quantity == q {
			return l
		}
	}
	t.Fatalf("%s has no %s limit at %g Hz", p.Name, q, f)
	return Limit{}
}

func hasLimit(p *Part, f float64, q Quantity) bool {
	for _, l := range p.Limits(f) {
		if l.Quantity == q {
			return true
		}
	}
	return false
}

func TestPrepareErrors(t *testing.T) {
	src := `port in n1 z=50
port out n2 z=50
material wax class=plastic mu=1
core t1 material=unobtainium od=10mm id=5mm h=4mm
core t2 ae=10mm2 mu=10
capacitor C1 n1 gnd 300p
inductor L1 n1 n2 1u core=t1 turns=10
inductor L2 n2 gnd 1u core=t2 turns=10
`
	nl, err := circuits.Parse("bad.net", []byte(src))
	if err != nil {
		t.Fatalf("parse: %v", err)
	}
	_, err = Prepare(nl, nil, nil)
	el, ok := err.(circuits.ErrorList)
	if !ok {
		t.Fatalf("want an ErrorList, got %T %v", err, err)
	}
	// Positions counted by hand in the source above.
	want := []string{
		"bad.net:3:20: unknown material class \"plastic\"",
		"bad.net:4:18: core t1: unknown material \"unobtainium\"",
		"bad.net:5:6: core t2 (used by L2) has too little geometry (only ae=)",
	}
	got := el.Error()
	for _, w := range want {
		if !strings.Contains(got, w) {
			t.Errorf("missing error %q in:\n%s", w, got)
		}
	}
	if len(el) != len(want) {
		t.Errorf("%d errors, want %d:\n%s", len(el), len(want), got)
	}
}

func TestDielectricCaseInsensitive(t *testing.T) {
	s := mustPrepare(t, goodNet, nil)
	if c := s.Parts["C2"]; c.Dielectric != "x7r" || c.Class != ClassCapacitor2 {
		t.Errorf("C2: dielectric %q class %q", c.Dielectric, c.Class)
	}
}

func findingWith(p *Part, sev, text string) bool {
	for _, f := range p.Findings {
		if f.Severity == sev && strings.Contains(f.Text, text) {
			return true
		}
	}
	return false
}

func TestFindings(t *testing.T) {
	s := mustPrepare(t, goodNet, nil)
	// Class II dielectrics are lossy and drift (common practice; EIA classes).
	if !findingWith(s.Parts["C2"], "warning", "class II") {
		t.Errorf("C2 x7r: no class II warning: %+v", s.Parts["C2"].Findings)
	}
	if len(s.Parts["C1"].Findings) != 0 {
		t.Errorf("C1 mica: unexpected findings %+v", s.Parts["C1"].Findings)
	}
	// L1: AL = µ0·10·h·ln(OD/ID)/(2π) of the 13/7/5 mm toroid ≈ 6.19 nH, so
	// 12 turns give 0.89 µH, within 10 % of 0.91 µH: no warning.
	if len(s.Parts["L1"].Findings) != 0 {
		t.Errorf("L1: unexpected findings %+v", s.Parts["L1"].Findings)
	}
	// L4: AL 4 nH, 30 turns → 3.6 µH against 1 µH; √(1 µH/4 nH) = 15.8 → 16 turns.
	if !findingWith(s.Parts["L4"], "warning", "16 turns would give") {
		t.Errorf("L4: no AL·N² warning naming 16 turns: %+v", s.Parts["L4"].Findings)
	}
	// L2 q=400@7M: 12 turns of 1 mm on the 18/10/5 mm core. Copper-only
	// Q = ωL/R_ac, R_ac = R_dc·(d/(4δ) + ¼) (high-frequency limit of the
	// Bessel solution, Ramo, Whinnery & Van Duzer), turn length the section
	// perimeter grown by the wire: the note must appear exactly when 400
	// exceeds it.
	d := 1e-3
	length := 12 * ((18e-3 - 10e-3) + 2*5e-3 + 4*d)
	rac := Rho20Copper * length / (math.Pi * d * d / 4) * (d/(4*SkinDepth(7e6, Rho20Copper)) + 0.25)
	qcu := 2 * math.Pi * 7e6 * 0.91e-6 / rac
	if got := findingWith(s.Parts["L2"], "note", "copper alone"); got != (400 > qcu) {
		t.Errorf("L2: copper-Q note %v, copper Q %.0f vs 400", got, qcu)
	}
}

func TestWindingFit(t *testing.T) {
	src := strings.Replace(goodNet, "turns=12 wire=0.8mm", "turns=12 wire=1.5mm", 1)
	s := mustPrepare(t, src, nil)
	// One layer on ID 7 mm with 1.5 mm wire: π·(7−1.5)/1.5 = 11.5 → 11
	// turns (geometry; exact packing sin(π/n) = d/(2R) gives 11.4 → 11 too).
	if !findingWith(s.Parts["L1"], "warning", "one layer holds 11") {
		t.Errorf("L1: no one-layer warning: %+v", s.Parts["L1"].Findings)
	}
}

func TestCapacitorLimits(t *testing.T) {
	s := mustPrepare(t, goodNet, nil)
	c1 := s.Parts["C1"]
	l := limitOf(t, c1, 10e6, Vpk)
	// standard profile, class I: 0.6 (our table, common practice)
	if l.Abs != 1000 || math.Abs(l.Derated-600) > 1e-9 {
		t.Errorf("C1 vpk: %+v", l)
	}
	if hasLimit(c1, 10e6, Vrms) || hasLimit(c1, 10e6, Pdiss) {
		t.Error("C1: vrms/pdiss limits without a rating")
	}
	if l := limitOf(t, c1, 10e6, Irms); math.Abs(l.Abs-4) > 1e-12 {
		t.Errorf("C1 irms at the rated 10 MHz: %g A", l.Abs)
	}
	// Below the rated frequency the heating I²·ESR must not exceed the
	// rated one with ESR = tan δ/(ωC) (constant tan δ, REFERENCES: ESR).
	tand, C := 1e-3, 300e-12
	esr := func(f float64) float64 { return tand / (2 * math.Pi * f * C) }
	i := limitOf(t, c1, 2.5e6, Irms).Abs
	if h, h0 := i*i*esr(2.5e6), 16*esr(10e6); math.Abs(h/h0-1) > 1e-9 {
		t.Errorf("C1 at 2.5 MHz: heating %.4g W vs rated %.4g W", h, h0)
	}
	// Above it the electrode skin loss ESR ∝ √f (skin effect) sets it.
	i = limitOf(t, c1, 40e6, Irms).Abs
	if h, h0 := i*i*math.Sqrt(40e6), 16*math.Sqrt(10e6); math.Abs(h/h0-1) > 1e-9 {
		t.Errorf("C1 at 40 MHz: heating ratio %.6g", h/h0)
	}
	// C3 has no ratings: vpk and irms unrated.
	c3 := s.Parts["C3"]
	if l := limitOf(t, c3, 7e6, Vpk); l.Abs != 0 || Judge(100, l) != Unrated {
		t.Errorf("C3 vpk should be unrated: %+v", l)
	}
	if l := limitOf(t, c3, 7e6, Irms); l.Abs != 0 || Judge(0.1, l) != Unrated {
		t.Errorf("C3 irms should be unrated: %+v", l)
	}
}

func TestInductorLimits(t *testing.T) {
	s := mustPrepare(t, goodNet, nil)
	l1 := s.Parts["L1"]
	// Saturation is a rating: powdered iron about 1 T (REFERENCES, from
	// memory), derated by the standard core factor 0.8, the same at every
	// frequency.
	for _, f := range []float64{1e6, 28e6} {
		l := limitOf(t, l1, f, Bpk)
		if l.Abs != 1 || math.Abs(l.Derated-0.8) > 1e-12 || l.Advice {
			t.Errorf("L1 bpk at %g Hz: %+v", f, l)
		}
	}
	// The heating guide is advice: B₁·√(1 MHz/f) with B₁ = 15 mT for
	// powdered iron (REFERENCES: loss ∝ f·B² held constant; 10–20 mT at
	// 1 MHz, from memory): 15 mT at 1 MHz, 15/√28 = 2.835 mT at 28 MHz, not
	// derated.
	for _, c := range []struct{ f, b float64 }{{1e6, 15e-3}, {28e6, 15e-3 / math.Sqrt(28)}} {
		l := limitOf(t, l1, c.f, Bavg)
		if math.Abs(l.Abs-c.b) > 1e-15 || l.Derated != l.Abs || !l.Advice {
			t.Errorf("L1 guide at %g Hz: %+v", c.f, l)
		}
		if Judge(100*l.Abs, l) != Marginal {
			t.Errorf("a guide exceeded 100× must be marginal, not %v", Judge(100*l.Abs, l))
		}
	}
	// Iron powder tmax 125 °C (binder ageing, common practice) less the
	// standard 15 °C margin.
	if l := limitOf(t, l1, 7e6, Temp); l.Abs != 125 || l.Derated != 110 {
		t.Errorf("L1 temp: %+v", l)
	}
	if hasLimit(l1, 7e6, Irms) {
		t.Error("L1 has wire= and no irms=: the current is judged by density, not irms")
	}
	if l := limitOf(t, l1, 7e6, Jrms); !(l.Abs > 0) {
		t.Errorf("L1 jrms: %+v", l)
	}
	// L3: air coil, no wire, no irms: irms unrated.
	l3 := s.Parts["L3"]
	if l := limitOf(t, l3, 7e6, Irms); l.Abs != 0 || Judge(1, l) != Unrated {
		t.Errorf("L3 irms: %+v", l)
	}
	if hasLimit(l3, 7e6, Bpk) || hasLimit(l3, 7e6, Bavg) || hasLimit(l3, 7e6, Temp) {
		t.Error("L3 without core has flux or temperature limits")
	}
	// L4: irms=2@7M, constant Q above the rated frequency: loss R ∝ f, so
	// equal heating I²·f at 28 MHz.
	l4 := s.Parts["L4"]
	i := limitOf(t, l4, 28e6, Irms).Abs
	if h := i * i * 28e6 / (4 * 7e6); math.Abs(h-1) > 1e-9 {
		t.Errorf("L4 irms at 28 MHz %.4g A: heating ratio %.6g", i, h)
	}
	if l := limitOf(t, l4, 7e6, Bpk); l.Abs != 0 {
		t.Errorf("L4 core without material: bpk should be unrated: %+v", l)
	}
	// User material from the netlist: its own bsat, guide points and tmax.
	l2 := s.Parts["L2"]
	if l := limitOf(t, l2, 1e6, Bavg); math.Abs(l.Abs-14e-3) > 1e-12 {
		t.Errorf("L2 guide at 1 MHz: %+v", l)
	}
	if l := limitOf(t, l2, 1e6, Bpk); l.Abs != 0.9 {
		t.Errorf("L2 bsat: %+v", l)
	}
	if l := limitOf(t, l2, 1e6, Temp); l.Abs != 130 {
		t.Errorf("L2 temp: %+v", l)
	}
}

func TestResistorLimits(t *testing.T) {
	s := mustPrepare(t, goodNet, BuiltinProfile("strict"))
	r := s.Parts["R1"]
	if l := limitOf(t, r, 7e6, Pdiss); l.Abs != 2 || math.Abs(l.Derated-0.8) > 1e-12 {
		t.Errorf("R1 pdiss strict: %+v", l)
	}
	if l := limitOf(t, r, 7e6, Vpk); l.Abs != 0 {
		t.Errorf("R1 vpk should be unrated: %+v", l)
	}
}

func TestTempRise(t *testing.T) {
	// ΔT ≈ (P[mW]/A[cm²])^0.833 (common practice, formula): 100 mW on 10 cm²
	// → 10^0.833 ≈ 6.8 °C.
	p := &Part{Area: 10e-4}
	if got := p.TempRise(0.1); math.Abs(got-6.8) > 0.05 {
		t.Errorf("ΔT = %.3f °C, want ≈ 6.8", got)
	}
	s := mustPrepare(t, goodNet, nil)
	// L2's core gives area=10cm2 directly.
	if got := s.Parts["L2"].TempRise(0.1); math.Abs(got-6.8) > 0.05 {
		t.Errorf("L2 ΔT = %.3f °C, want ≈ 6.8", got)
	}
	if (&Part{}).TempRise(1) != 0 {
		t.Error("a part with no surface has no temperature rise")
	}
}

func TestFluxPeakEMF(t *testing.T) {
	// Transformer EMF equation (McLyman): B_pk = V_rms/(4.44·f·N·Ae). For the
	// inductor's own voltage V = ωL·I, λ_pk = L·√2·I.
	s := mustPrepare(t, goodNet, nil)
	p := s.Parts["L1"]
	f, irms := 7e6, 1.5
	vrms := 2 * math.Pi * f * p.Value * irms
	want := vrms / (4.44 * f * float64(p.Turns) * p.Core.Ae)
	got := p.FluxPeak(p.Value * math.Sqrt2 * irms)
	if math.Abs(got/want-1) > 1e-3 { // 4.44 is 2π/√2 rounded
		t.Errorf("B = %.4g T, EMF equation %.4g T", got, want)
	}
}

func TestCopperRDC(t *testing.T) {
	// 10 turns of 1 mm wire on a 20/10/5 mm toroid: each turn's centre line
	// runs round a (5+1) mm × (5+1) mm rectangle, 24 mm; 0.24 m in all.
	// IEC 60028: 17.241 mΩ·mm²/m → 0.24·17.241/0.7854 mΩ = 5.268 mΩ.
	src := `port in a z=50
port out b z=50
core c od=20mm id=10mm h=5mm mu=10
inductor L a b 1u core=c turns=10 wire=1mm
`
	s := mustPrepare(t, src, nil)
	p := s.Parts["L"]
	if got := p.CopperR(1); math.Abs(got-5.268e-3) > 0.002e-3 {
		t.Errorf("R_dc = %.4f mΩ, want 5.268 mΩ", got*1e3)
	}
	// At 14 MHz the usual rule R_ac ≈ R_dc·d/(4δ) (d ≫ δ) holds within a few %.
	d := 1e-3
	rule := 5.268e-3 * d / (4 * SkinDepth(14e6, Rho20Copper))
	if got := p.CopperR(14e6); math.Abs(got/rule-1) > 0.03 {
		t.Errorf("R_ac(14 MHz) = %.4g Ω, rule %.4g Ω", got, rule)
	}
}

func TestRemedyWire(t *testing.T) {
	s := mustPrepare(t, goodNet, nil)
	p := s.Parts["L1"]
	f := 28e6
	l := limitOf(t, p, f, Jrms)
	irms := 5.0
	j := p.CurrentDensity(irms, f)
	text := p.Remedy(l, j, RemedyContext{F: f, Ambient: 25})
	var d float64
	if _, err := fmt.Sscanf(text, "wire ≥ %f mm", &d); err != nil {
		t.Fatalf("remedy %q: %v", text, err)
	}
	// The suggested wire must carry the current within the derated
	// surface-loss limit (definition of the limit).
	dm := d * 1e-3
	if carry := l.Factor * DensityLimit(f, dm, Rho20Copper) * ConductingArea(f, dm, Rho20Copper); carry < irms {
		t.Errorf("%s carries %.3g A, need %.3g A", text, carry, irms)
	}
	if p.Remedy(l, l.Derated/2, RemedyContext{F: f, Ambient: 25}) != "" {
		t.Error("remedy for a stress within the limit should be empty")
	}
}

func TestHeatingDensity(t *testing.T) {
	// One current at f0 is its own heating density.
	s := mustPrepare(t, goodNet, nil)
	p := s.Parts["L1"]
	if a, b := p.HeatingDensity(7e6, []float64{2}, []float64{7e6}), p.CurrentDensity(2, 7e6); math.Abs(a/b-1) > 1e-12 {
		t.Errorf("%g vs %g", a, b)
	}
	// Heating adds as I²·R: two equal currents at f0 heat like √2 times one.
	if a, b := p.HeatingDensity(7e6, []float64{2, 2}, []float64{7e6, 7e6}), p.CurrentDensity(2*math.Sqrt2, 7e6); math.Abs(a/b-1) > 1e-12 {
		t.Errorf("%g vs %g", a, b)
	}
}

func TestAirCoreNoFluxOrTemp(t *testing.T) {
	// Air has no saturation or loss limit on flux (common practice); the
	// built-in air material has no tmax either.
	src := `port in a z=50
port out b z=50
core former od=20mm id=10mm h=8mm material=air
inductor L a b 0.3u core=former turns=12 wire=1mm
`
	s := mustPrepare(t, src, nil)
	p := s.Parts["L"]
	if hasLimit(p, 7e6, Bpk) || hasLimit(p, 7e6, Bavg) || hasLimit(p, 7e6, Temp) {
		t.Errorf("air former: %+v", p.Limits(7e6))
	}
	if !hasLimit(p, 7e6, Jrms) {
		t.Error("the wire is still judged")
	}
}

// TestLimitValuesMatchLimits: the audit's text-free limits carry exactly
// the numbers of the full limits, for every part of the test filter and
// of every example station netlist, inside, between and outside rated
// frequency points. (The two share one code path; the text is the only
// thing left out; an unrated limit may keep its fixed wording.)
func TestLimitValuesMatchLimits(t *testing.T) {
	sets := []*Set{mustPrepare(t, goodNet, BuiltinProfile("standard"))}
	files, _ := filepath.Glob("../testdata/station/*.net")
	for _, f := range files {
		src, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		sets = append(sets, mustPrepare(t, string(src), BuiltinProfile("standard")))
	}
	var buf []Limit
	n := 0
	for _, s := range sets {
		for _, p := range s.Parts {
			for _, f := range []float64{0.5e6, 1.8e6, 7e6, 7.1e6, 14.2e6, 30e6, 120e6} {
				full := p.Limits(f)
				buf = p.AppendLimitValues(buf[:0], f)
				if len(buf) != len(full) {
					t.Fatalf("%s at %g Hz: %d limits without text, %d with", p.Name, f, len(buf), len(full))
				}
				for i, l := range full {
					v := buf[i]
					if v.Quantity != l.Quantity || v.Abs != l.Abs || v.Derated != l.Derated || v.Factor != l.Factor || (v.Basis != "" && l.Abs > 0) {
						t.Errorf("%s at %g Hz: %+v without text, %+v with", p.Name, f, v, l)
					}
					n++
				}
			}
		}
	}
	if n < 100 {
		t.Errorf("only %d limits compared", n)
	}
}
