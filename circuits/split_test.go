package circuits

import (
	"math"
	"math/cmplx"
	"testing"
)

// TestSplitEqualsSolve: the superposition fast path (Thevenin equivalent at
// the antenna port plus the response to a unit current injected there;
// superposition and Thevenin's theorem, common practice) must give every
// part's V, I, flux linkage and dissipation, and the input and load power,
// equal to a full solve with the load in the matrix, to 1e-9 relative.
//
// Relative error is measured against the largest value of the same kind
// at that solve when a value is smaller than 1e-4 of it: such values come
// from x0 + α·x1 with terms far larger than their sum, where rounding
// error is relative to the terms (Higham, Accuracy and Stability of
// Numerical Algorithms, 2002, ch. 4).
func TestSplitEqualsSolve(t *testing.T) {
	const pAvail = 100.0
	var worstV, worstI, worstL, worstP float64
	var worstPlainV float64
	for _, file := range sortedKeys(goodNetlists(t)) {
		_, c := mustParse(t, file, goodNetlists(t)[file])
		work := NewSplitWork(c)
		s := NewSplit(c)
		loads := testLoads(c)
		for _, swr := range []float64{1, 1.5, 2, 5, 50} {
			for i := 0; i < 12; i++ {
				loads = append(loads, LoadOnCircle(c.Zout, swr, 2*math.Pi*float64(i)/12+0.1))
			}
		}
		for _, f := range testFreqs {
			if err := work.Fill(s, f); err != nil {
				t.Fatalf("%s at %g Hz: %v", file, f, err)
			}
			e := c.EMFForPower(pAvail)
			for _, ld := range loads {
				r, err := c.Solve(f, pAvail, ld)
				if err != nil {
					t.Fatal(err)
				}
				alpha := s.Alpha(ld)
				var maxV, maxI, maxL, maxP float64
				for _, ps := range r.Parts {
					maxV = math.Max(maxV, cmplx.Abs(ps.V))
					maxI = math.Max(maxI, cmplx.Abs(ps.I))
					maxL = math.Max(maxL, cmplx.Abs(ps.Lambda))
					maxP = math.Max(maxP, ps.Ploss)
				}
				for i, want := range r.Parts {
					got := s.Part(i, alpha, complex(e, 0))
					ev := scaledErr(got.V, want.V, 1e-4*maxV)
					ei := scaledErr(got.I, want.I, 1e-4*maxI)
					el := 0.0
					if c.Elements[i].Kind == Inductor {
						el = scaledErr(got.Lambda, want.Lambda, 1e-4*maxL)
					} else if got.Lambda != 0 || want.Lambda != 0 {
						t.Errorf("%s: %s has a flux linkage", file, c.Elements[i].Name)
					}
					ep := math.Abs(got.Ploss-want.Ploss) / math.Max(want.Ploss, 1e-4*maxP)
					worstV, worstI = math.Max(worstV, ev), math.Max(worstI, ei)
					worstL, worstP = math.Max(worstL, el), math.Max(worstP, ep)
					if cmplx.Abs(want.V) >= 1e-4*maxV {
						worstPlainV = math.Max(worstPlainV, relErr(got.V, want.V))
					}
					if !(ev <= 1e-9 && ei <= 1e-9 && el <= 1e-9 && ep <= 1e-9) {
						t.Errorf("%s at %g Hz, load %s, %s: split %+v, full solve %+v (errors V %.2g I %.2g Λ %.2g P %.2g)",
							file, f, loadName(ld), c.Elements[i].Name, got, want, ev, ei, el, ep)
					}
				}
				// input power, load power and the largest node voltage; the
				// absolute 1e-12·Pavail allows for a short's rounding-level
				// Vout in the full solve
				pin := s.InputPower(alpha) * e * e
				pout := s.LoadPower(ld, alpha) * e * e
				if ld.Open {
					pout = 0
				}
				if d := math.Abs(pin - r.Pin); !(d <= 1e-9*r.Pin+1e-12*pAvail) {
					t.Errorf("%s at %g Hz, load %s: split Pin %g W, full solve %g W", file, f, loadName(ld), pin, r.Pin)
				}
				if d := math.Abs(pout - r.Pout); !(d <= 1e-9*math.Abs(r.Pout)+1e-12*pAvail) {
					t.Errorf("%s at %g Hz, load %s: split Pout %g W, full solve %g W", file, f, loadName(ld), pout, r.Pout)
				}
				var maxNode float64
				for _, v := range r.Nodes {
					maxNode = math.Max(maxNode, cmplx.Abs(v))
				}
				if got := s.MaxNodeV(alpha, e); !(math.Abs(got-maxNode) <= 1e-9*maxNode) {
					t.Errorf("%s at %g Hz, load %s: split largest node voltage %g V, full solve %g V", file, f, loadName(ld), got, maxNode)
				}
			}
		}
	}
	t.Logf("Split against Solve: largest error V %.3g, I %.3g, Λ %.3g, Ploss %.3g (plain relative error of V where |V| ≥ 1e-4·max: %.3g)",
		worstV, worstI, worstL, worstP, worstPlainV)
}

// TestLoadOnCircle: every load LoadOnCircle gives has the asked SWR about
// z0, from Γ = (Z − Z0)/(Z + Z0) and SWR = (1 + |Γ|)/(1 − |Γ|) (Pozar,
// Microwave Engineering, ch. 2), and θ is the angle of Γ.
func TestLoadOnCircle(t *testing.T) {
	for _, swr := range []float64{1, 1.2, 2, 3, 10, 100} {
		for i := 0; i < 16; i++ {
			theta := 2*math.Pi*float64(i)/16 - math.Pi + 0.05
			l := LoadOnCircle(50, swr, theta)
			g := (l.Z - 50) / (l.Z + 50)
			got := (1 + cmplx.Abs(g)) / (1 - cmplx.Abs(g))
			if math.Abs(got-swr) > 1e-9*swr {
				t.Errorf("SWR %g θ=%.2f: load %v has SWR %g", swr, theta, l.Z, got)
			}
			if swr > 1 && math.Abs(math.Remainder(cmplx.Phase(g)-theta, 2*math.Pi)) > 1e-9 {
				t.Errorf("SWR %g: angle of Γ is %g, asked %g", swr, cmplx.Phase(g), theta)
			}
			if real(l.Z) < 0 {
				t.Errorf("SWR %g: load %v is not passive", swr, l.Z)
			}
		}
	}
	// A complex centre (an antenna port's own impedance): the package reads
	// Γ as (Z − z0)/(Z + z0*), which is 0 at Z = z0 and, for |Γ| < 1, puts
	// every load in the right half-plane (|Z − z0| < |Z + z0*| is
	// Re Z·Re z0 > 0), so the circle is centred on z0 and passive.
	for _, z0 := range []complex128{complex(12.5, -180), complex(50, 30), complex(3, 0)} {
		if z := LoadOnCircle(z0, 1, 0.7).Z; cmplx.Abs(z-z0) > 1e-12*cmplx.Abs(z0) {
			t.Errorf("SWR 1 around %v gives %v", z0, z)
		}
		for _, swr := range []float64{1.5, 3, 20} {
			for i := 0; i < 16; i++ {
				theta := 2 * math.Pi * float64(i) / 16
				z := LoadOnCircle(z0, swr, theta).Z
				if real(z) <= 0 {
					t.Errorf("SWR %g around %v at θ=%.2f: load %v is not passive", swr, z0, theta, z)
				}
				g := (z - z0) / (z + cmplx.Conj(z0))
				if got := (1 + cmplx.Abs(g)) / (1 - cmplx.Abs(g)); math.Abs(got-swr) > 1e-9*swr {
					t.Errorf("SWR %g around %v: load %v reads SWR %g", swr, z0, z, got)
				}
			}
		}
	}
	// SWR 3 at Γ = +|Γ| and −|Γ|: 150 Ω and 16.7 Ω (common practice)
	if z := LoadOnCircle(50, 3, 0).Z; cmplx.Abs(z-150) > 1e-9 {
		t.Errorf("SWR 3, θ=0: %v, want 150 Ω", z)
	}
	if z := LoadOnCircle(50, 3, math.Pi).Z; cmplx.Abs(z-50.0/3) > 1e-9 {
		t.Errorf("SWR 3, θ=π: %v, want 16.67 Ω", z)
	}
}
