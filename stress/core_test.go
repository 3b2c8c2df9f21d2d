package stress

import (
	"fmt"
	"math"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"rfstress/ratings"
)

// lpf20 is what a newcomer builds: a 5-pole 0.1 dB Chebyshev lowpass for
// 20 m, cutoff 17.5 MHz, values from the Matthaei–Young–Jones prototype
// (C = g/(ωc·R0), L = g·R0/ωc), the coils wound on ordinary powdered-iron
// rings of 18 × 10 × 6 mm, µ 10 (AL = µ0·µ·h·ln(OD/ID)/(2π) = 7.05 nH, so
// 9 turns), mica capacitors.
func lpf20(extra string) string {
	g := chebyshevG(5, 0.1)
	wc := 2 * math.Pi * 17.5e6
	var b strings.Builder
	b.WriteString("title 20 m lowpass\nport in n1 z=50\nport out n3 z=50\n")
	b.WriteString("material iron-mu10-ours class=iron mu=10\ncore K od=18mm id=10mm h=6mm material=iron-mu10-ours\n")
	fmt.Fprintf(&b, "capacitor C1 n1 gnd %.6g dielectric=mica q=1500 vpk=500 irms=3\n", g[0]/(wc*50))
	fmt.Fprintf(&b, "inductor L2 n1 n2 %.6g q=200@14M core=K turns=9 wire=1mm\n", g[1]*50/wc)
	fmt.Fprintf(&b, "capacitor C3 n2 gnd %.6g dielectric=mica q=1500 vpk=500 irms=3\n", g[2]/(wc*50))
	fmt.Fprintf(&b, "inductor L4 n2 n3 %.6g q=200@14M core=K turns=9 wire=1mm\n", g[3]*50/wc)
	fmt.Fprintf(&b, "capacitor C5 n3 gnd %.6g dielectric=mica q=1500 vpk=500 irms=3\n", g[4]/(wc*50))
	b.WriteString(extra)
	return b.String()
}

// Filters of this size run at 100 W CW in countless stations (common
// practice). With its estimated core temperature below tmax the audit must
// not fail it; the flux at average power above the heating guide is
// advice: marginal at worst, with the finding that says why.
func TestLowpass20mIronRingsNotFail(t *testing.T) {
	fx := build(t, lpf20(""), "band=14M:14.35M", "power=100", "mode=cw")
	sec, err := fx.eng.Audit()
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range sec.Parts {
		if !p.Has(ratings.Temp) {
			continue
		}
		temp := p.Stress[ratings.Temp]
		t.Logf("%s: %.1f °C (tmax %g), saturation use %.3f, guide use %.2f, verdict %v", p.Name, temp.Value, temp.Limit.Abs,
			p.Stress[ratings.Bpk].Util, p.Stress[ratings.Bavg].Util, p.Verdict)
		if !(temp.Value < temp.Limit.Abs) {
			t.Fatalf("%s estimated at %.1f °C, not below tmax: the premise fails", p.Name, temp.Value)
		}
		if p.Verdict == ratings.Fail {
			t.Errorf("%s fails below tmax", p.Name)
		}
		if g := p.Stress[ratings.Bavg]; g.Util > 1 {
			if g.Verdict != ratings.Marginal {
				t.Errorf("%s guide exceeded: verdict %v, want marginal", p.Name, g.Verdict)
			}
			found := false
			for _, f := range p.Findings {
				found = found || strings.Contains(f.Text, "heating guide") && strings.Contains(f.Text, "warm")
			}
			if !found {
				t.Errorf("%s: no heating-guide finding in %+v", p.Name, p.Findings)
			}
		}
	}
	if sec.Verdict == ratings.Fail || sec.LimitQ == ratings.Bavg {
		t.Errorf("verdict %v, safe power set by %s %s", sec.Verdict, sec.LimitPart, sec.LimitQ)
	}
	// the guide finding must be present for this build: its flux at
	// average power is above the powdered-iron guide at 14 MHz
	if sec.Parts[1].Stress[ratings.Bavg].Util <= 1 {
		t.Errorf("guide not exceeded (%.2f): the check of its finding is void", sec.Parts[1].Stress[ratings.Bavg].Util)
	}
}

// chokeNet is a NiZn ferrite choke (class bsat 0.25 T, from memory) across
// the line at 7 MHz: 40 turns on Ae 16 mm², le 40 mm, µ 125, so
// AL = µ0·µ·Ae/le = 62.8 nH and 100 µH, X = 4.4 kΩ ≫ 50 Ω. Its Q is set
// high so that the core stays cool, and its material's own guide high, so
// that saturation is the limit under test.
const chokeNet = `port in n1 z=50
port out n2 z=50
material nizn-mu125-ours class=nizn mu=125 guide=1T
core F ae=16mm2 le=40mm material=nizn-mu125-ours
inductor L1 n1 gnd 100u q=1e6 core=F turns=40 irms=2
resistor R1 n1 n2 1m
`

// Saturation is a rating: a ferrite choke driven to 1.2 × bsat fails; at
// 0.5 × bsat with a cool core it is ok. The flux follows the EMF equation
// B = V/(4.44·f·N·Ae) from the voltage across the choke (tolerance 0.1 %:
// 4.44 is 2π/√2 rounded).
func TestSaturationFerriteChoke(t *testing.T) {
	const bsat = 0.25
	at := func(power float64) *PartResult {
		fx := build(t, chokeNet, "freq=7M", "harmonics=none", "mode=carrier", "power="+formatG(power))
		sec, err := fx.eng.Audit()
		if err != nil {
			t.Fatal(err)
		}
		return sec.Parts[0]
	}
	p := at(1)
	b1 := p.Stress[ratings.Bpk].Value
	emf := p.Stress[ratings.Vrms].Value / (4.44 * 7e6 * 40 * 16e-6)
	if math.Abs(b1/emf-1) > 1e-3 {
		t.Fatalf("B %.5g T at 1 W, EMF equation %.5g T", b1, emf)
	}
	for _, c := range []struct {
		share float64
		want  ratings.Verdict
	}{{1.2, ratings.Fail}, {0.5, ratings.OK}} {
		power := math.Pow(c.share*bsat/b1, 2) // flux grows with √P
		p := at(power)
		st := p.Stress[ratings.Bpk]
		if math.Abs(st.Value/(c.share*bsat)-1) > 1e-9 || st.Verdict != c.want || p.Verdict != c.want {
			t.Errorf("%.1f × bsat (%.4g W): B %.4g T, saturation %v, part %v; want %v", c.share, power, st.Value, st.Verdict, p.Verdict, c.want)
		}
		if tp := p.Stress[ratings.Temp]; c.want == ratings.OK && tp.Verdict != ratings.OK {
			t.Errorf("0.5 × bsat: the core is not cool (%.1f °C)", tp.Value)
		}
		if c.want != ratings.Fail {
			continue
		}
		// the saturation remedies, applied, pass
		text := st.BuyText
		t.Logf("saturation remedy: %s", text)
		fixes := map[string]string{}
		if m := reAeLe.FindStringSubmatch(text); m != nil {
			k, _ := strconv.ParseFloat(m[2], 64)
			fixes["larger core"] = fmt.Sprintf("core F ae=%.9gmm2 le=%.9gmm material=nizn-mu125-ours area=10cm2|turns=%s", 16*k, 40*k, m[1])
		}
		if m := reArea2.FindStringSubmatch(text); m != nil {
			k, _ := strconv.ParseFloat(m[1], 64)
			fixes["fewer turns on more core"] = fmt.Sprintf("core F ae=%.9gmm2 le=40mm material=nizn-mu125-ours area=10cm2|turns=%s", 16*k, m[2])
		}
		if m := reStack.FindStringSubmatch(text); m != nil {
			k, _ := strconv.Atoi(m[1])
			fixes["stacked"] = fmt.Sprintf("core F ae=%dmm2 le=40mm material=nizn-mu125-ours area=10cm2|turns=%s", 16*k, m[2])
		}
		if m := reMu.FindStringSubmatch(text); m != nil {
			fixes["lower permeability"] = "core F ae=16mm2 le=40mm material=nizn mu=" + m[1] + " area=10cm2|turns=" + m[2]
		}
		if len(fixes) < 4 {
			t.Errorf("saturation remedies missing from %q", text)
		}
		for what, fix := range fixes {
			coreLine, turns, _ := strings.Cut(fix, "|")
			src := strings.Replace(chokeNet, "core F ae=16mm2 le=40mm material=nizn-mu125-ours", coreLine, 1)
			src = strings.Replace(src, "turns=40", turns, 1)
			fx := build(t, src, "freq=7M", "harmonics=none", "mode=carrier", "power="+formatG(power))
			sec, err := fx.eng.Audit()
			if err != nil {
				t.Fatalf("%s: %v", what, err)
			}
			if u := sec.Parts[0].Stress[ratings.Bpk].Util; u > 1+1e-9 {
				t.Errorf("%s: saturation still at %.4f of its derated limit", what, u)
			}
		}
	}
}

// Re-auditing at the reported safe power puts the limiting part at 1.000
// of its limit, also when temperature after a key-down time limits (the
// thermal model inverted by bisection; tolerance 1e-9).
func TestSafePowerReauditTemperature(t *testing.T) {
	// strong capacitors and a core with little cooling surface, so that a
	// core's temperature limits
	src := strings.ReplaceAll(lpf20(""), "vpk=500 irms=3", "vpk=5k irms=30")
	src = strings.Replace(src, "material=iron-mu10-ours\n", "material=iron-mu10-ours area=1.5cm2\n", 1)
	set := []string{"band=14M:14.35M", "mode=carrier", "key-down=3m", "swr=2", "faults=open,short"}
	sec, _ := build(t, src, append(set, "power=100")...).eng.Audit()
	if sec.LimitQ != ratings.Temp {
		t.Fatalf("safe power set by %s %s, want a temperature", sec.LimitPart, sec.LimitQ)
	}
	s2, _ := build(t, src, append(set, "power="+formatG(sec.SafeW))...).eng.Audit()
	for _, p := range s2.Parts {
		if p.Name == sec.LimitPart {
			u := p.Stress[ratings.Temp].Util
			t.Logf("safe power %.1f W set by %s temperature after 3 min; re-audit use %.12f (%.1f °C)", sec.SafeW, p.Name, u, p.Stress[ratings.Temp].Value)
			if math.Abs(u-1) > 1e-9 {
				t.Errorf("re-audit use %.12f, want 1", u)
			}
		}
	}
}

// Time at power: the judged temperature grows with the key-down time
// toward steady state; the tune preset judges after its 30 s on-period;
// the 15 s-in-30 s data preset judges at half power with its ripple on
// top, so it lies between the steady rise at half and at full power.
func TestKeyDownAndDutyPresets(t *testing.T) {
	temp := func(set ...string) (float64, *Heat) {
		sec, err := build(t, lpf20(""), append([]string{"band=14M:14.35M", "power=100"}, set...)...).eng.Audit()
		if err != nil {
			t.Fatal(err)
		}
		p := sec.Parts[1]
		return p.Stress[ratings.Temp].Value, p.Heat
	}
	after30s, heat30s := temp("mode=carrier", "key-down=30s")
	after5min, _ := temp("mode=carrier", "key-down=5m")
	tss, hss := temp("mode=carrier")
	if !(after30s < after5min && after5min < tss) || !math.IsInf(hss.KeyDown, 1) || heat30s.KeyDown != 30 {
		t.Errorf("30 s %.2f °C, 5 min %.2f °C, steady %.2f °C", after30s, after5min, tss)
	}
	// first order: the rise after 30 s is (1 − e^(−30/τ)) of the steady one
	if want := 25 + (heat30s.Steady-25)*(1-math.Exp(-30/heat30s.Tau)); math.Abs(after30s-want) > 1e-9 {
		t.Errorf("30 s: %.6f °C, first order %.6f °C", after30s, want)
	}
	if tune, _ := temp("mode=tune"); math.Abs(tune-after30s) > 1e-9 {
		t.Errorf("tune preset %.4f °C, carrier after 30 s %.4f °C", tune, after30s)
	}
	data, _ := temp("mode=data-15s")
	half, _ := temp("avg-ratio=0.5")
	if !(data > half && data < tss) {
		t.Errorf("data-15s %.3f °C outside (%.3f, %.3f)", data, half, tss)
	}
}

var (
	reAeLe  = regexp.MustCompile(`(\d+) turns if Ae and le both grow ×([0-9.]+)`)
	reArea2 = regexp.MustCompile(`Ae ≥ ([0-9.]+)× this one's at the same le with (\d+) turns`)
	reStack = regexp.MustCompile(`(\d+) of these cores stacked with (\d+) turns`)
	reMu    = regexp.MustCompile(`permeability ≤ ([0-9.]+) with (\d+) turns`)
	reArea  = regexp.MustCompile(`cooling surface ≥ ([0-9.]+) cm²`)
	reWire  = regexp.MustCompile(`wire ≥ ([0-9.]+) mm`)
)

// Every printed remedy, applied to the netlist, brings its quantity within
// the derated limit: a larger core (Ae and le grown as printed), the same
// core stacked, a lower permeability with more turns, a larger cooling
// surface, thicker wire. A small ring pushed hard fails them all first.
func TestRemediesApplied(t *testing.T) {
	core := "core K od=18mm id=10mm h=6mm material=iron-mu10-ours"
	var base string
	var set []string
	var p *PartResult
	setup := func(src string, s ...string) {
		base, set = src, s
		sec, err := build(t, base, set...).eng.Audit()
		if err != nil {
			t.Fatal(err)
		}
		for _, x := range sec.Parts {
			if x.Name == "L4" {
				p = x
			}
		}
	}
	// the flux remedies: the 100 W CW build over its heating guide
	setup(lpf20(""), "band=14M:14.35M", "mode=cw", "power=100")
	remedy := func(q ratings.Quantity) string {
		st := p.Stress[q]
		if st.Verdict == ratings.OK {
			t.Fatalf("%s within its limit at %.3f: no remedy to test", q, st.Util)
		}
		return st.BuyText
	}
	reaudit := func(what, src string, q ratings.Quantity) {
		t.Helper()
		s2, err := build(t, src, set...).eng.Audit()
		if err != nil {
			t.Fatalf("%s: %v", what, err)
		}
		for _, x := range s2.Parts {
			if x.Name == "L4" {
				if u := x.Stress[q].Util; u > 1+1e-9 {
					t.Errorf("%s: %s still at %.4f of its derated limit", what, q, u)
				} else {
					t.Logf("%s: %s at %.3f", what, q, u)
				}
			}
		}
	}
	num := func(s string) float64 { v, _ := strconv.ParseFloat(s, 64); return v }
	// the flux remedies, against the heating guide here (its figures are
	// those a saturation remedy prints); the stressed coil gets its own core
	l4 := func(src, coreLine, attrs string) string {
		src = strings.Replace(src, core, core+"\n"+coreLine, 1)
		lines := strings.Split(src, "\n")
		for i, l := range lines {
			if strings.HasPrefix(l, "inductor L4 ") {
				lines[i] = regexp.MustCompile(`core=K turns=\d+`).ReplaceAllString(l, attrs)
			}
		}
		return strings.Join(lines, "\n")
	}
	text := remedy(ratings.Bavg)
	t.Logf("flux remedy: %s", text)
	ae, le := ratings.ToroidAeLe(18e-3, 10e-3, 6e-3)
	if m := reAeLe.FindStringSubmatch(text); m != nil {
		k := num(m[2])
		reaudit("larger core", l4(base, fmt.Sprintf("core K2 ae=%.9gmm2 le=%.9gmm material=iron-mu10-ours area=%.9gmm2", ae*k*1e6, le*k*1e3, p.Rating.Area*1e6), "core=K2 turns="+m[1]), ratings.Bavg)
	} else {
		t.Errorf("no larger-core remedy in %q", text)
	}
	if m := reArea2.FindStringSubmatch(text); m != nil {
		reaudit("fewer turns on more area", l4(base, fmt.Sprintf("core K2 ae=%.9gmm2 le=%.9gmm material=iron-mu10-ours area=%.9gmm2", ae*num(m[1])*1e6, le*1e3, p.Rating.Area*1e6), "core=K2 turns="+m[2]), ratings.Bavg)
	} else {
		t.Errorf("no fewer-turns remedy in %q", text)
	}
	if m := reStack.FindStringSubmatch(text); m != nil {
		reaudit("stacked cores", l4(base, fmt.Sprintf("core K2 od=18mm id=10mm h=%gmm material=iron-mu10-ours", 6*num(m[1])), "core=K2 turns="+m[2]), ratings.Bavg)
	} else {
		t.Errorf("no stacking remedy in %q", text)
	}
	if m := reMu.FindStringSubmatch(text); m != nil {
		reaudit("lower permeability", l4(base, "core K2 od=18mm id=10mm h=6mm material=iron mu="+m[1], "core=K2 turns="+m[2]), ratings.Bavg)
	} else {
		t.Errorf("no permeability remedy in %q", text)
	}
	// temperature and wire: thin wire and 1.5 kW key-down
	setup(strings.Replace(lpf20(""), "wire=1mm", "wire=0.3mm", -1), "band=14M:14.35M", "mode=carrier", "power=1500", "swr=2", "key-down=2m")
	text = remedy(ratings.Temp)
	t.Logf("temperature remedy: %s", text)
	if m := reArea.FindStringSubmatch(text); m != nil {
		reaudit("cooling surface", l4(base, "core K2 od=18mm id=10mm h=6mm material=iron-mu10-ours area="+m[1]+"cm2", "core=K2 turns=9"), ratings.Temp)
	} else {
		t.Errorf("no cooling-surface remedy in %q", text)
	}
	text = remedy(ratings.Jrms)
	if m := reWire.FindStringSubmatch(text); m != nil {
		src := strings.Replace(base, "inductor L4 n2 n3", "inductor L4 n2 n3", 1)
		lines := strings.Split(src, "\n")
		for i, l := range lines {
			if strings.HasPrefix(l, "inductor L4 ") {
				lines[i] = strings.Replace(l, "wire=0.3mm", "wire="+m[1]+"mm", 1)
			}
		}
		reaudit("thicker wire", strings.Join(lines, "\n"), ratings.Jrms)
	} else {
		t.Errorf("no wire remedy in %q", text)
	}
}

// Below µ = 1 no core will do: the remedy is an air-wound coil of the
// same inductance. Its size checks against Wheeler's formula
// L[µH] = D²n²/(18D + 40ℓ), inches (Wheeler 1928), within 0.1 % (the
// formula itself, recomputed), and its wire carries the current within
// the density limit.
func TestAirCoilRemedy(t *testing.T) {
	fx := build(t, lpf20(""), "freq=14.2M")
	rp := fx.rs.Parts["L2"]
	fix := rp.FluxFix(20, 3, 14.2e6) // µ 10/400 < 1
	a := fix.Air
	if fix.Mu != 0 || a == nil {
		t.Fatalf("no air coil for r = 20: %+v", fix)
	}
	d, l := a.Dia/0.0254, a.Len/0.0254
	lw := d * d * a.Turns * a.Turns / (18*d + 40*l) * 1e-6
	if math.Abs(lw/rp.Value-1) > 1e-3 {
		t.Errorf("Wheeler gives %.4g H for %.3g mm × %.3g mm, %.1f turns; want %.4g H", lw, a.Dia*1e3, a.Len*1e3, a.Turns, rp.Value)
	}
	if j := 3 / ratings.ConductingArea(14.2e6, a.Wire, ratings.Rho20Copper); j > ratings.DensityLimit(14.2e6, a.Wire, ratings.Rho20Copper) {
		t.Errorf("%.2f mm wire: %.3g A/mm² over its limit", a.Wire*1e3, j*1e-6)
	}
	if s := fix.String(rp); !strings.Contains(s, "air-wound coil of the same inductance") {
		t.Errorf("text %q", s)
	}
}
