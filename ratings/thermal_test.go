package ratings

import (
	"fmt"
	"math"
	"strings"
	"testing"
)

// EMF equation (any magnetics handbook, e.g. McLyman): B = V/(4.44·f·N·Ae).
// 25 V RMS across 15 turns on Ae = 0.15 cm² at 7 MHz gives 3.575 mT. Our
// flux is λ_pk/(N·Ae) with λ_pk = √2·V/ω for a sine; 4.44 is 2π/√2 =
// 4.4429 rounded, so the two agree to 0.07 %: tolerance 0.1 %.
func TestFluxEMFEquationWorkedValue(t *testing.T) {
	p := &Part{Turns: 15, Core: &CoreInfo{Ae: 0.15e-4}}
	v, f := 25.0, 7e6
	got := p.FluxPeak(math.Sqrt2 * v / (2 * math.Pi * f))
	if math.Abs(got/3.575e-3-1) > 1e-3 {
		t.Errorf("B = %.5g mT, EMF equation 3.575 mT", got*1e3)
	}
}

// thermalPart is an 18/10/6 mm powdered-iron ring wound with 9 turns of
// 1 mm wire, as Prepare reads it.
func thermalPart(t *testing.T) *Part {
	src := "port in a z=50\nport out b z=50\ncore K od=18mm id=10mm h=6mm material=iron mu=10\ninductor L a b 0.6u core=K turns=9 wire=1mm\n"
	return mustPrepare(t, src, nil).Parts["L"]
}

// First-order step response (any heat-transfer text): ΔT(t) =
// ΔT_final·(1 − e^(−t/τ)), τ = R_th·C_th. The heat capacity is worked by
// hand here from the class figures (iron 5 g/cm³, 0.45 J/(g·K); copper
// 8.96 g/cm³, 0.385 J/(g·K): from memory) and the steady rise from the
// still-air rule (P[mW]/A[cm²])^0.833 (common practice). Tolerance 1e-9:
// the same closed forms.
func TestThermalStepResponse(t *testing.T) {
	p := thermalPart(t)
	core := math.Pi / 4 * (18e-3*18e-3 - 10e-3*10e-3) * 6e-3 * 5000 * 450
	turn := (18e-3 - 10e-3) + 2*6e-3 + 4*1e-3 // section perimeter grown by the wire
	copper := 9 * turn * math.Pi * 1e-6 / 4 * 8960 * 385
	cth := core + copper
	if math.Abs(p.HeatCapacity()/cth-1) > 1e-12 {
		t.Fatalf("C_th %.6g J/K, by hand %.6g J/K", p.HeatCapacity(), cth)
	}
	const pw = 0.4
	final := math.Pow(pw*1e3/(p.Area*1e4), 0.833)
	tau := final / pw * cth
	for _, tt := range []float64{1, tau / 2, tau, 3 * tau, 20 * tau} {
		h := p.Heating(pw, tt, Duty{})
		want := final * (1 - math.Exp(-tt/tau))
		if math.Abs(h.Rise/want-1) > 1e-9 || math.Abs(h.Tau/tau-1) > 1e-12 || math.Abs(h.Final/final-1) > 1e-12 {
			t.Errorf("t = %.4g s: rise %.6g K, closed form %.6g K (τ %.4g s, want %.4g s)", tt, h.Rise, want, h.Tau, tau)
		}
	}
	t.Logf("18/10/6 mm ring, 9 turns of 1 mm, %.1f W: C_th %.3f J/K, ΔT_final %.2f K, τ %.0f s", pw, cth, final, tau)
	// Early on nothing has left yet: the heat stored equals the heat put
	// in, P·t ≈ C_th·ΔT (energy balance). At t = τ/1000 the first-order
	// curve is below its tangent by t/(2τ) = 0.05 %: tolerance 0.1 %.
	tt := tau / 1000
	if h := p.Heating(pw, tt, Duty{}); math.Abs(pw*tt/(cth*h.Rise)-1) > 1e-3 {
		t.Errorf("t ≪ τ: P·t = %.4g J, C·ΔT = %.4g J", pw*tt, cth*h.Rise)
	}
	// Steady state asked for (t = +Inf, or 0) is the final rise.
	for _, tt := range []float64{0, math.Inf(1)} {
		if h := p.Heating(pw, tt, Duty{}); h.Rise != h.Final {
			t.Errorf("t = %g: rise %g, final %g", tt, h.Rise, h.Final)
		}
	}
}

// A keyed duty (on On of every Period) at the same average power: the
// periodic steady state of a first-order system peaks above the average
// rise and tends to it as Period/τ → 0, and to the on-power's own rise
// P_on·R_th as the period grows long against τ (first-order systems,
// any control text).
func TestThermalDutyRipple(t *testing.T) {
	p := thermalPart(t)
	const pw = 0.4
	steady := p.Heating(pw, 0, Duty{})
	short := p.Heating(pw, 0, Duty{On: 0.05, Period: 0.1}) // ripple ≈ (1−d)·On/(2τ) ≈ 1e-4 of the rise
	if !(short.Rise >= steady.Rise) || short.Rise/steady.Rise-1 > 1e-3 {
		t.Errorf("period ≪ τ: peak %.6g K vs average rise %.6g K", short.Rise, steady.Rise)
	}
	long := p.Heating(pw, 0, Duty{On: 1e6, Period: 2e6})
	if math.Abs(long.Rise/(2*steady.Rise)-1) > 1e-6 {
		t.Errorf("period ≫ τ: peak %.6g K, want P_on·R_th = %.6g K", long.Rise, 2*steady.Rise)
	}
	mid := p.Heating(pw, 0, Duty{On: 15, Period: 30})
	if !(mid.Rise > steady.Rise && mid.Rise < 2*steady.Rise) {
		t.Errorf("15 s of 30 s: peak %.4g K outside (%.4g, %.4g)", mid.Rise, steady.Rise, 2*steady.Rise)
	}
}

// The cooling surface AreaFor returns holds the rise to what is allowed,
// and no less: the rise falls as the surface grows.
func TestAreaFor(t *testing.T) {
	p := thermalPart(t)
	const pw, allowed, tt = 3.0, 40.0, 300.0
	a := p.AreaFor(allowed, pw, tt, Duty{})
	if got := p.heating(a, pw, tt, Duty{}).Rise; got > allowed || got < allowed*(1-1e-9) {
		t.Errorf("area %.4g cm²: rise %.6g K, allowed %g K", a*1e4, got, allowed)
	}
}

// More heat never gives a smaller rise: the steady rise grows as P^0.833,
// the time constant R_th·C_th shrinks (so the rise after a key-down time
// comes closer to it), and a duty's ripple factor grows as τ shrinks. The
// audit relies on it to skip the power law for cases that dissipate no
// more than one already judged (stress: Engine.heats). Checked on a grid
// of dissipations, key-down times and duties, steady state included.
func TestHeatingRisesWithDissipation(t *testing.T) {
	p := thermalPart(t)
	duties := []Duty{{}, {On: 15, Period: 30}, {On: 1, Period: 60}, {On: 50, Period: 60}, {On: 120}}
	for _, d := range duties {
		for _, tt := range []float64{0, 1, 30, 300, 3000, math.Inf(1)} {
			prev := 0.0
			for k := 0; k <= 400; k++ {
				pw := 1e-4 * math.Pow(10, float64(k)/50) // 0.1 mW to 10 kW
				r := p.Heating(pw, tt, d).Rise
				if r < prev {
					t.Fatalf("duty %+v, t %g s: %.6g W gives %.9g K, less than %.9g K at %.6g W", d, tt, pw, r, prev, pw/math.Pow(10, 0.02))
				}
				prev = r
			}
		}
	}
}

// A capacitor without pmax= that dissipates enough to heat a small body
// gets a warning with the rise of a 10 mm disc 4 mm thick (surface
// 2·π·5² + π·10·4 = 282.7 mm², worked here) by the still-air rule
// (P[mW]/A[cm²])^0.833 (common practice): 0.706 W gives
// (706/2.827)^0.833 ≈ 99.5 K. At 0.2 W the disc rises 35 K, under the
// 40 K that warns; a pmax= rating, an air variable, or a class I part
// with a current rating (its maker's irms= bounds its self-heating) says
// nothing; an unrated mica does.
func TestUnratedCapacitorHeat(t *testing.T) {
	area := 2*math.Pi*5*5 + math.Pi*10*4 // mm²
	if math.Abs(SmallBodyArea/(area*1e-6)-1) > 0.01 {
		t.Fatalf("body surface %.4g m², by hand %.4g m²", SmallBodyArea, area*1e-6)
	}
	src := "port in a z=50\nport out b z=50\ncapacitor C1 a gnd 470p dielectric=x7r vpk=1k irms=1\n" +
		"capacitor C2 a gnd 470p dielectric=x7r vpk=1k irms=1 pmax=1\n" +
		"capacitor C3 a gnd 100p dielectric=air vpk=3k irms=5\nresistor R b gnd 50\ninductor L a b 1u q=100\n" +
		"capacitor C4 b gnd 1n dielectric=mica vpk=500 irms=10\ncapacitor C5 b gnd 1n dielectric=mica vpk=500\n"
	set := mustPrepare(t, src, nil)
	f, ok := set.Parts["C1"].UnratedHeat(0.706)
	want := math.Pow(706/(area/100), 0.833)
	if got := SmallBodyRise(0.706); math.Abs(got/want-1) > 1e-9 {
		t.Errorf("0.706 W: rise %.6g K, by hand %.6g K", got, want)
	}
	if !ok || !strings.Contains(f.Text, fmt.Sprintf("about %.0f K", SmallBodyRise(0.706))) || !strings.Contains(f.Text, "706 mW") {
		t.Errorf("0.706 W: %v %q, want a warning with about %.1f K", ok, f.Text, want)
	}
	if _, ok := set.Parts["C1"].UnratedHeat(0.2); ok {
		t.Errorf("0.2 W (%.0f K on the disc) warns", math.Pow(200/(area/100), 0.833))
	}
	if _, ok := set.Parts["C2"].UnratedHeat(0.706); ok {
		t.Error("a part with pmax= is judged on it, not warned about")
	}
	if _, ok := set.Parts["C3"].UnratedHeat(5); ok {
		t.Error("an air variable is no small body")
	}
	if _, ok := set.Parts["C4"].UnratedHeat(0.706); ok {
		t.Error("a mica with irms= is bounded by its current rating")
	}
	if _, ok := set.Parts["C5"].UnratedHeat(0.706); !ok {
		t.Error("a mica with no rating of current or dissipation draws no warning")
	}
}
