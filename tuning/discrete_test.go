package tuning

import (
	"math"
	"math/cmplx"
	"testing"

	"rfstress/circuits"
)

// Switched parts are tried in every combination: the chosen setting must
// be the one a brute-force scan of all combinations (solved here directly
// through circuits, Γ = (Zin − 50)/(Zin + 50)) finds best by the policy
// among those that match as well as the best does.
func TestDiscreteEnumeration(t *testing.T) {
	c := build(t, `port in n1 z=50
port out n2 z=200
inductor  L1 n1 n2 2u q=150 range=0.5u:6u steps=12
capacitor C1 n2 gnd 200p q=1000 range=20p:400p steps=20
`)
	f, z := 7e6, complex(200, -30)
	r := tune(t, c, LeastLoss, f, z)
	vars := Vars(c)
	type combo struct{ g, loss, l, c float64 }
	var all []combo
	best := 1.0
	for _, l := range vars[0].Adj.Steps {
		for _, cv := range vars[1].Adj.Steps {
			fac := []float64{l / vars[0].Nominal, cv / vars[1].Nominal}
			res, err := c.Scaled(fac, nil).Solve(f, 1, circuits.Load{Z: z})
			if err != nil {
				t.Fatal(err)
			}
			g := cmplx.Abs((res.Zin - 50) / (res.Zin + 50))
			all = append(all, combo{g, res.Ploss / res.Pin, l, cv})
			best = math.Min(best, g)
		}
	}
	if want := (1 + best) / (1 - best); (want <= DefaultSWR) != r.Matched {
		t.Fatalf("brute-force best SWR %.4f, tool matched=%v", want, r.Matched)
	}
	// the family a policy may choose from (see Matcher.family)
	gc := math.Min(math.Max(gammaOf(1.02), best*1.05), gammaOf(DefaultSWR))
	least := math.Inf(1)
	for _, cb := range all {
		if cb.g <= gc && cb.loss < least {
			least = cb.loss
		}
	}
	// 1e-9: the same solves, repeated
	if math.Abs(r.Best.LossFrac-least) > 1e-9 || r.Best.Gamma > gc+1e-12 {
		t.Errorf("chose loss %.6f Γ %.5f; brute force least loss %.6f within Γ ≤ %.5f", r.Best.LossFrac, r.Best.Gamma, least, gc)
	}
	onStep := func(v float64, steps []float64) bool {
		for _, s := range steps {
			if v == s {
				return true
			}
		}
		return false
	}
	if !onStep(r.Best.Values[0], vars[0].Adj.Steps) || !onStep(r.Best.Values[1], vars[1].Adj.Steps) {
		t.Errorf("settings %v are not steps", r.Best.Values)
	}
}

// A switched capacitor bank with a continuous roller coil: the bank is
// enumerated, the coil optimised for each step; the result sits on a step
// and matches.
func TestMixedDiscreteContinuous(t *testing.T) {
	c := build(t, `port in n1 z=50
port out n2 z=200
inductor  L1 n1 n2 2u q=150 range=0.5u:6u
capacitor C1 n2 gnd 200p q=1000 steps=47p,68p,100p,150p,220p,330p
`)
	r := tune(t, c, LeastLoss, 7e6, complex(200, 0))
	if !r.Matched {
		t.Fatalf("not matched: SWR %.3f %s", r.Best.SWR, r.Limit)
	}
	found := false
	for _, s := range Vars(c)[1].Adj.Steps {
		found = found || r.Best.Values[1] == s
	}
	if !found {
		t.Errorf("C1 %.4g is not one of its steps", r.Best.Values[1])
	}
}

func BenchmarkTuneTNetwork(b *testing.B) {
	c := build(b, `port in n1 z=50
port out n3 z=13-j490
capacitor C1 n1 n2 40p dielectric=air range=10p:60p
inductor  L1 n2 gnd 18u q=200 range=1u:25u
capacitor C2 n2 n3 250p dielectric=air range=25p:400p
`)
	m, err := NewMatcher(c, DefaultSWR, LeastLoss)
	if err != nil {
		b.Fatal(err)
	}
	solves := 0
	for i := 0; i < b.N; i++ {
		r, err := m.Tune(3.65e6, complex(13, -490))
		if err != nil {
			b.Fatal(err)
		}
		solves += r.Solves
	}
	b.ReportMetric(float64(solves)/float64(b.N), "solves/op")
}
