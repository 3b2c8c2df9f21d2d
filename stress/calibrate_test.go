package stress

import (
	"math"
	"math/cmplx"
	"math/rand/v2"
	"testing"

	"rfstress/circuits"
)

const bpf = `port in  a z=50
port out d z=50
capacitor Ce1 a b   33p q=1000
inductor  L1  b gnd 1u  q=180
capacitor Ct1 b gnd 91p q=1000
capacitor Cc  b c   4.7p q=1000
inductor  L2  c gnd 1u  q=150
capacitor Ct2 c gnd 91p q=1000
capacitor Ce2 c d   33p q=1000
`

func buildText(t *testing.T, text string) *circuits.Circuit {
	t.Helper()
	nl, err := circuits.Parse("t.net", []byte(text))
	if err != nil {
		t.Fatal(err)
	}
	c, err := circuits.Build(nl)
	if err != nil {
		t.Fatal(err)
	}
	return c
}

// synthetic measures c with its inductors' Q scaled by qs, adding seeded
// Gaussian noise of sigmaDB to |S21| and |S11| in dB.
func synthetic(t *testing.T, c *circuits.Circuit, qs float64, fs []float64, sigmaDB float64, seed uint64) *circuits.Touchstone {
	t.Helper()
	q := make([]float64, len(c.Elements))
	for i, e := range c.Elements {
		q[i] = 1
		if e.Kind == circuits.Inductor {
			q[i] = qs
		}
	}
	sc := c.Scaled(nil, q)
	rng := rand.New(rand.NewPCG(seed, 1))
	ts := &circuits.Touchstone{File: "synthetic.s2p", Version: "1", Ports: 2, Param: "S", Format: "RI", Ref: []float64{50, 50}}
	for _, f := range fs {
		sp, err := sc.TwoPort(f)
		if err != nil {
			t.Fatal(err)
		}
		noisy := func(s complex128) complex128 {
			return s * complex(math.Pow(10, rng.NormFloat64()*sigmaDB/20), 0)
		}
		ts.F = append(ts.F, f)
		ts.S = append(ts.S, []complex128{noisy(sp.S11), noisy(sp.S12), noisy(sp.S21), noisy(sp.S22)})
	}
	return ts
}

// TestFitQRecoversScale: measurements made from the model with its
// inductor Q scaled by 0.6, with 0.05 dB of seeded noise, are fitted back
// to 0.6 within 2 % (the acceptance figure), and the stated
// uncertainty covers the error.
func TestFitQRecoversScale(t *testing.T) {
	c := buildText(t, bpf)
	var fs []float64
	for f := 13.5e6; f <= 14.9e6; f += 20e3 {
		fs = append(fs, f)
	}
	ts := synthetic(t, c, 0.6, fs, 0.05, 7)
	for _, perPart := range []bool{false, true} {
		fit, err := FitQ(c, ts, 13.5e6, 14.9e6, perPart)
		if err != nil {
			t.Fatal(err)
		}
		for _, g := range fit.Groups {
			if math.Abs(g.Scale-0.6) > 0.02*0.6 {
				t.Errorf("perPart=%v %s: scale %.4f ± %.4f, want 0.6 within 2 %%", perPart, g.Name, g.Scale, g.Sigma)
			}
			if !(g.Sigma > 0) || math.Abs(g.Scale-0.6) > 4*g.Sigma+1e-3 {
				t.Errorf("perPart=%v %s: error %.4f not covered by σ %.4f", perPart, g.Name, g.Scale-0.6, g.Sigma)
			}
		}
		if fit.RMSAfter >= fit.RMSBefore {
			t.Errorf("fit did not reduce the residual: %g → %g", fit.RMSBefore, fit.RMSAfter)
		}
		t.Logf("perPart=%v: %+v (RMS %.3g → %.3g, %d iterations)", perPart, fit.Groups, fit.RMSBefore, fit.RMSAfter, fit.Iterations)
	}
}

// TestCompareDissipatedShare: the share 1 − |S11|² − |S21|² of a measured
// two-port equals the power its parts dissipate over the incident power
// (Tellegen: a matched source's available power is the incident power),
// checked on the model itself used as the measurement.
func TestCompareDissipatedShare(t *testing.T) {
	c := buildText(t, bpf)
	ts := synthetic(t, c, 1, []float64{13e6, 14e6, 14.2e6, 15e6, 28.4e6, 42.6e6}, 0, 1)
	cmp, err := Compare(c, ts, []float64{14.2e6}, 1, 3, 100)
	if err != nil {
		t.Fatal(err)
	}
	r, err := c.Solve(14.2e6, 100, circuits.Load{Z: 50})
	if err != nil {
		t.Fatal(err)
	}
	h := cmp.Carriers[0]
	if math.Abs(h.MeasW-r.Ploss) > 1e-9*100 || math.Abs(h.ModelW-r.Ploss) > 1e-9*100 {
		t.Errorf("heat at 100 W: measured share %g W, model %g W, parts dissipate %g W", h.MeasW, h.ModelW, r.Ploss)
	}
	if cmp.BandS21.Seen && math.Abs(cmp.BandS21.DB) > 1e-9 {
		t.Errorf("the model against itself differs by %g dB", cmp.BandS21.DB)
	}
	if !cmp.HarmS21.Seen {
		t.Errorf("harmonics inside the span not compared")
	}
}

// TestRenormalize: a 100 Ω shunt resistor's S with references 50/75 from
// the ABCD table (Pozar ch. 4) equals its 50/50 S re-referred.
func TestRenormalize(t *testing.T) {
	sFor := func(r1, r2 float64) [4]complex128 {
		A, B, C, D := 1.0, 0.0, 1/100.0, 1.0
		den := A*r2 + B + C*r1*r2 + D*r1
		s11 := (A*r2 + B - C*r1*r2 - D*r1) / den
		s22 := (-A*r2 + B - C*r1*r2 + D*r1) / den
		s21 := 2 * math.Sqrt(r1*r2) / den
		return [4]complex128{complex(s11, 0), complex(s21, 0), complex(s21, 0), complex(s22, 0)}
	}
	got, err := renormalize(sFor(50, 50), []float64{50, 50}, []float64{50, 75})
	if err != nil {
		t.Fatal(err)
	}
	want := sFor(50, 75)
	for i := range got {
		if cmplx.Abs(got[i]-want[i]) > 1e-12 {
			t.Errorf("S[%d] = %v, want %v", i, got[i], want[i])
		}
	}
}
