package stress

import (
	"math"
	"math/cmplx"
	"os"
	"reflect"
	"testing"

	"rfstress/circuits"
)

// Judging the thermal model once after the sweep, at the largest
// dissipation of each kind of case (Engine.finishHeat), changes nothing an
// audit reports: every part's stresses, worst cases, utilisations, safe
// power and findings are identical to an audit that evaluates it at every
// case, for the example station's wound filters and tuners under steady,
// duty and key-down heating.
func TestHeatSkipChangesNothing(t *testing.T) {
	files := []string{"lpf-80m.net", "lpf-160m.net", "lpf-30m.net", "pa-pi-40m.net", "tuner-80m-vertical.net", "lpf-17m-15m.net"}
	settings := [][]string{nil, {"mode=data-15s"}, {"key-down=90s"}, {"mode=tune", "swr=5"}, {"ambient=-20", "mode=data-15s"}, {"ambient=55", "harmonics=single-ended"}}
	for _, f := range files {
		src, err := os.ReadFile("../testdata/station/" + f)
		if err != nil {
			t.Fatal(err)
		}
		for _, set := range settings {
			skip := build(t, string(src), set...)
			every := build(t, string(src), set...)
			every.eng.everyHeat = true
			a, err := skip.eng.Audit()
			if err != nil {
				t.Fatalf("%s %v: %v", f, set, err)
			}
			b, err := every.eng.Audit()
			if err != nil {
				t.Fatal(err)
			}
			if !reflect.DeepEqual(a.Parts, b.Parts) {
				for k := range a.Parts {
					if !reflect.DeepEqual(a.Parts[k], b.Parts[k]) {
						t.Errorf("%s %v: %s differs when the heat is evaluated at every case", f, set, a.Parts[k].Name)
					}
				}
			}
		}
	}
}

// A single audit asks each carrier's limits into its workspace, reusing
// the storage carrier after carrier; tolerance trials share limits asked
// once into fresh storage (cacheLimits). Both give the same audit, to the
// bit, for the example station's files over several carriers (a limit
// left over from the previous carrier would show here).
func TestLimitsPerCarrierAsCached(t *testing.T) {
	files := []string{"lpf-80m.net", "lpf-160m.net", "lpf-30m.net", "pa-pi-40m.net", "tuner-80m-vertical.net", "rx-bpf-40m.net"}
	for _, f := range files {
		src, err := os.ReadFile("../testdata/station/" + f)
		if err != nil {
			t.Fatal(err)
		}
		fresh := build(t, string(src), "points=9")
		cached := build(t, string(src), "points=9")
		cached.eng.cacheLimits()
		a, err := fresh.eng.Audit()
		if err != nil {
			t.Fatalf("%s: %v", f, err)
		}
		b, err := cached.eng.Audit()
		if err != nil {
			t.Fatal(err)
		}
		if len(a.Parts) == 0 || a.NumCases < 9 {
			t.Fatalf("%s: %d parts, %d cases", f, len(a.Parts), a.NumCases)
		}
		for k := range a.Parts {
			if !reflect.DeepEqual(a.Parts[k], b.Parts[k]) {
				t.Errorf("%s: %s differs between limits asked per carrier and cached", f, a.Parts[k].Name)
			}
		}
	}
}

// absExact agrees with math/cmplx.Abs (math.Hypot) to rounding (1e-15: a few ulp) over the
// whole float range, through both of its branches.
func TestAbsExact(t *testing.T) {
	for _, m := range []float64{1e-300, 1e-200, 1e-146, 1e-140, 1e-3, 1, 1e3, 1e140, 1e146, 1e200, 1e300} {
		for _, th := range []float64{0, 0.3, 1.2, 2.9, 4.4} {
			z := complex(m*math.Cos(th), m*math.Sin(th))
			if got, want := absExact(z), cmplx.Abs(z); math.Abs(got-want) > 1e-15*want {
				t.Errorf("|%v|: %v, Hypot %v", z, got, want)
			}
		}
	}
	if absExact(0) != 0 {
		t.Error("|0| is not 0")
	}
}

// The α circle in closed form (the image of |Γ| = ρ under the bilinear
// map of the load) is the circle through three of its loads (the fit it
// replaced) to 1e-9 of its size, over the 80 m lowpass from 1 to 60 MHz,
// real and complex antenna impedances and SWR 1.5 to 20.
func TestAlphaCircleClosedFormAsFit(t *testing.T) {
	src, err := os.ReadFile("../testdata/station/lpf-80m.net")
	if err != nil {
		t.Fatal(err)
	}
	for _, swr := range []string{"1.5", "3", "20"} {
		fx := build(t, string(src), "swr="+swr)
		s := circuits.NewSplit(fx.c)
		sw := circuits.NewSplitWork(fx.c)
		n := 0
		for f := 1e6; f < 60e6; f *= 1.07 {
			if err := sw.Fill(s, f); err != nil {
				t.Fatal(err)
			}
			for _, z0 := range []complex128{50, 25 + 30i, 200 - 150i, 8 + 1i} {
				c, r, ok := fx.eng.alphaCircle(s, z0)
				cf, rf, okf := fx.eng.alphaCircleFit(s, z0)
				if !ok || !okf {
					t.Fatalf("SWR %s, %g Hz, z0 %v: closed form %v, fit %v", swr, f, z0, ok, okf)
				}
				size := cmplx.Abs(cf) + rf
				if cmplx.Abs(c-cf) > 1e-9*size || math.Abs(r-rf) > 1e-9*size {
					t.Errorf("SWR %s, %g Hz, z0 %v: centre %v radius %g; fitted %v %g", swr, f, z0, c, r, cf, rf)
				}
				n++
			}
		}
		if n < 200 {
			t.Fatalf("only %d circles", n)
		}
	}
}

// Parts whose limits ignore the carrier (ratings.Part.FrequencyFree) are
// asked once per engine instead of at every carrier; whole audits of the
// station's files come out the same to the bit either way.
func TestFreeLimitsAsAsked(t *testing.T) {
	files := []string{"lpf-80m.net", "lpf-160m.net", "relay-bank-40m-20m.net", "pa-pi-40m.net", "tuner-40m-coax.net", "rx-bpf-40m.net"}
	free := 0
	for _, f := range files {
		src, err := os.ReadFile("../testdata/station/" + f)
		if err != nil {
			t.Fatal(err)
		}
		once := build(t, string(src), "points=9")
		each := build(t, string(src), "points=9")
		for _, pl := range once.eng.freeLim {
			if pl != nil {
				free++
			}
		}
		each.eng.freeLim = nil
		a, err := once.eng.Audit()
		if err != nil {
			t.Fatalf("%s: %v", f, err)
		}
		b, err := each.eng.Audit()
		if err != nil {
			t.Fatal(err)
		}
		for k := range a.Parts {
			if !reflect.DeepEqual(a.Parts[k], b.Parts[k]) {
				t.Errorf("%s: %s differs between limits asked once and at every carrier", f, a.Parts[k].Name)
			}
		}
	}
	if free == 0 {
		t.Fatal("no part with carrier-free limits in the files")
	}
}

// In a cold ambient a wound core's temperature stays below 0 °C at low
// power: the audit must report it as it is (ambient plus the rise of the
// still-air rule at the hottest case's dissipation), not the 0 °C a
// running maximum starts from, and carry that case's dissipation. The
// rule, worked here apart from the thermal model: ΔT[°C] ≈
// (P[mW]/A[cm²])^0.833 at steady state (common practice), 1e-9
// relative. Both ways of judging the heat agree (finishHeat and every
// case).
func TestColdAmbientTemperature(t *testing.T) {
	src, err := os.ReadFile("../testdata/station/lpf-80m.net")
	if err != nil {
		t.Fatal(err)
	}
	for _, every := range []bool{false, true} {
		fx := build(t, string(src), "ambient=-40", "power=5")
		fx.eng.everyHeat = every
		sec, err := fx.eng.Audit()
		if err != nil {
			t.Fatal(err)
		}
		n := 0
		for _, p := range sec.Parts {
			st, ok := p.Stress["temp"]
			if !ok || p.Heat == nil {
				continue
			}
			n++
			want := -40 + math.Pow(p.Heat.Pavg*1e3/(p.Rating.Area*1e4), 0.833)
			if !(p.Heat.Pavg > 0) || !(st.Value < 0 && st.Value > -40) || math.Abs(st.Value-want) > 1e-9*math.Abs(want) {
				t.Errorf("every=%v %s: %.4g °C at %.3g W, by the rule %.4g °C", every, p.Name, st.Value, p.Heat.Pavg, want)
			}
		}
		if n == 0 {
			t.Fatal("no wound core judged on temperature")
		}
	}
}
