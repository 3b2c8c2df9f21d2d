package tuning

import (
	"math"
	"testing"
)

// A high-pass T (series C, shunt L, series C) matches any load over a
// family of settings: one part is free (common practice). Every policy
// must reach the target SWR, and each must be best by its own measure
// when the three chosen settings are evaluated alike.
func TestTNetworkPolicies(t *testing.T) {
	const src = `port in n1 z=50
port out n3 z=50
capacitor C1 n1 n2 100p q=3000 range=20p:500p
inductor  L1 n2 gnd 3u q=200 range=0.5u:20u
capacitor C2 n2 n3 100p q=3000 range=20p:500p
`
	f := 7.1e6
	c := build(t, src)
	var got [3]Eval
	for _, z := range []complex128{50, complex(15, -40), complex(300, 200)} {
		for p := LeastLoss; p <= LargestC; p++ {
			r := tune(t, c, p, f, z)
			if !r.Matched || r.Best.SWR > DefaultSWR {
				t.Fatalf("%v %v: not matched (SWR %.3g, %s)", z, p, r.Best.SWR, r.Limit)
			}
			if r.Policy != p {
				t.Errorf("result names policy %v, asked %v", r.Policy, p)
			}
			got[p] = r.Best
		}
		// 1e-3 relative: the searches stop on a function tolerance, while
		// the measures differ along the family by tens of per cent
		for p := range got {
			if got[LeastLoss].LossFrac > got[p].LossFrac*(1+1e-3) {
				t.Errorf("%v: least-loss loses %.4g %%, %v loses %.4g %%", z, 100*got[LeastLoss].LossFrac, Policy(p), 100*got[p].LossFrac)
			}
			if got[LeastVoltage].VpkPerRtW > got[p].VpkPerRtW*(1+1e-3) {
				t.Errorf("%v: least-voltage %.4g V/√W above %v's %.4g", z, got[LeastVoltage].VpkPerRtW, Policy(p), got[p].VpkPerRtW)
			}
			if got[LargestC].SumC < got[p].SumC*(1-1e-3) {
				t.Errorf("%v: largest-c %.4g F below %v's %.4g", z, got[LargestC].SumC, Policy(p), got[p].SumC)
			}
		}
		t.Logf("%v: loss %.2f/%.2f/%.2f %%, C %.0f/%.0f/%.0f pF", z, 100*got[0].LossFrac, 100*got[1].LossFrac, 100*got[2].LossFrac,
			got[0].SumC*1e12, got[1].SumC*1e12, got[2].SumC*1e12)
	}
}

// Pi network of a valve amplifier's output, Q-based design (common
// practice; the usual handbook formulas): plate load R1, output R2, loaded
// Q:
//
//	Xc1 = R1/Q,  Xc2 = R2·√((R1/R2)/(Q² + 1 − R1/R2)),
//	XL  = (Q·R1 + R1·R2/Xc2)/(Q² + 1).
//
// With the coil fixed at XL and near-lossless parts, the capacitors that
// match 50 Ω to 2 kΩ are the formula's, found to 1 %.
func TestPiNetworkQDesign(t *testing.T) {
	f, r1, r2, q := 3.8e6, 2000.0, 50.0, 12.0
	w := 2 * math.Pi * f
	xc1 := r1 / q
	xc2 := r2 * math.Sqrt((r1/r2)/(q*q+1-r1/r2))
	xl := (q*r1 + r1*r2/xc2) / (q*q + 1)
	L := xl / w
	src := "port in n1 z=2000\nport out n2 z=50\n" +
		"capacitor C1 n1 gnd 100p q=1e7 range=10p:1000p\n" +
		"inductor  L1 n1 n2 " + fmtG(L) + " q=1e7\n" +
		"capacitor C2 n2 gnd 1n q=1e7 range=100p:5000p\n"
	c := build(t, src)
	r := tune(t, c, LeastLoss, f, 50)
	if !r.Matched {
		t.Fatalf("not matched: %s", r.Limit)
	}
	if e := rel(value(r, c, "C1"), 1/(w*xc1)); e > 0.01 {
		t.Errorf("tune C %.4g pF, formula %.4g pF", value(r, c, "C1")*1e12, 1e12/(w*xc1))
	}
	if e := rel(value(r, c, "C2"), 1/(w*xc2)); e > 0.01 {
		t.Errorf("load C %.4g pF, formula %.4g pF", value(r, c, "C2")*1e12, 1e12/(w*xc2))
	}
}

func fmtG(v float64) string { return strconvG(v) }

// Same inputs, same settings to the last bit, with 1, 2 or 5 workers.
func TestTuneAllDeterministic(t *testing.T) {
	c := build(t, `port in n1 z=50
port out n3 z=13-j490
capacitor C1 n1 n2 40p dielectric=air range=10p:60p
inductor  L1 n2 gnd 18u q=200 range=1u:25u
capacitor C2 n2 n3 250p dielectric=air range=25p:400p
`)
	m, err := NewMatcher(c, DefaultSWR, LeastLoss)
	if err != nil {
		t.Fatal(err)
	}
	cases, _ := Region(c.Zout, 3).Cases([]float64{3.65e6}, 3.65e6, 3.65e6)
	cases = cases[:9]
	var ref []Result
	for _, w := range []int{1, 2, 5} {
		got, err := m.TuneAll(cases, w)
		if err != nil {
			t.Fatal(err)
		}
		if ref == nil {
			ref = got
			continue
		}
		for i := range got {
			for k := range got[i].Best.Values {
				if math.Float64bits(got[i].Best.Values[k]) != math.Float64bits(ref[i].Best.Values[k]) {
					t.Errorf("workers %d case %d part %d: %v vs %v", w, i, k, got[i].Best.Values[k], ref[i].Best.Values[k])
				}
			}
			if got[i].Matched != ref[i].Matched || got[i].Limit != ref[i].Limit {
				t.Errorf("workers %d case %d differs", w, i)
			}
		}
	}
}
