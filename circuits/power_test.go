package circuits

import (
	"fmt"
	"math"
	"math/cmplx"
	"testing"
)

// testLoads are the loads the power checks use on each netlist: the port's
// own impedance, a short, an open, points on SWR 3 and SWR 10 circles and
// a few explicit complex loads (common practice: a transmitter filter must
// survive any antenna, including a fault).
func testLoads(c *Circuit) []Load {
	loads := []Load{{Z: c.Zout}, Short, OpenLoad,
		{Z: complex(12.5, -180)}, {Z: complex(1000, 500)}, {Z: complex(0.2, 40)}, {Z: complex(3, 0)}}
	for _, swr := range []float64{3, 10} {
		for i := 0; i < 8; i++ {
			loads = append(loads, LoadOnCircle(complex(50, 0), swr, 2*math.Pi*float64(i)/8))
		}
	}
	return loads
}

func loadName(l Load) string {
	if l.Open {
		return "open"
	}
	return fmt.Sprint(l.Z)
}

// TestPowerBalance: Tellegen's theorem (Tellegen 1952; Penfield, Spence &
// Duinker, "Tellegen's theorem and electrical networks", 1970): the complex
// powers into all branches sum to zero, so the complex power the source
// delivers, Vin·Iin*, equals the load's Vout·Iout* plus Σ V·I* over every
// part (coupled coils included, since each coil's V carries its mutual
// term). Its real part is the power balance Pin = Pout + Σ Ploss. Also,
// each uncoupled part's Ploss is Re(V·I*), and Pin never exceeds the available power (maximum power transfer theorem,
// common practice).
func TestPowerBalance(t *testing.T) {
	const pAvail = 100.0
	var worstP, worstS float64
	for _, file := range sortedKeys(goodNetlists(t)) {
		nl, c := mustParse(t, file, goodNetlists(t)[file])
		coupled := map[string]bool{}
		for _, k := range nl.Couplings {
			coupled[k.L1], coupled[k.L2] = true, true
		}
		for _, f := range testFreqs {
			for _, ld := range testLoads(c) {
				r, err := c.Solve(f, pAvail, ld)
				if err != nil {
					t.Fatalf("%s at %g Hz, load %s: %v", file, f, loadName(ld), err)
				}
				var sParts complex128
				var pParts float64
				for i, ps := range r.Parts {
					// a two-port part (line) takes power at both ends; a
					// part's terminal current is It where it differs from
					// its winding current I (self-capacitance)
					cur := ps.I
					if ps.It != 0 {
						cur = ps.It
					}
					s := ps.V*cmplx.Conj(cur) + ps.V2*cmplx.Conj(ps.I2)
					sParts += s
					pParts += ps.Ploss
					// Re(V·I*) of an uncoupled part is its dissipation; a
					// coupled coil also passes power to its partner
					if coupled[c.Elements[i].Name] {
						continue
					}
					if d := math.Abs(real(s) - ps.Ploss); d > 1e-9*math.Max(cmplx.Abs(s), 1e-12*pAvail) {
						t.Errorf("%s at %g Hz, %s: Re(V·I*) = %g W but Ploss = %g W", file, f, c.Elements[i].Name, real(s), ps.Ploss)
					}
				}
				if math.Abs(pParts-r.Ploss) > 1e-12*pAvail {
					t.Errorf("%s: Result.Ploss %g W, sum of parts %g W", file, r.Ploss, pParts)
				}
				sIn := r.Vin * cmplx.Conj(r.Iin)
				sOut := r.Vout * cmplx.Conj(r.Iout)
				if math.Abs(real(sIn)-r.Pin) > 1e-12*pAvail || math.Abs(real(sOut)-r.Pout) > 1e-12*pAvail {
					t.Errorf("%s: Pin or Pout disagree with V·I*", file)
				}
				// relative to Pin; a floor of 1e-9·Pavail keeps the
				// measure meaningful when almost nothing is accepted
				eP := math.Abs(r.Pin-r.Pout-r.Ploss) / math.Max(r.Pin, 1e-9*pAvail)
				eS := cmplx.Abs(sIn-sOut-sParts) / math.Max(cmplx.Abs(sIn), 1e-9*pAvail)
				worstP, worstS = math.Max(worstP, eP), math.Max(worstS, eS)
				if !(eP <= 1e-9) || !(eS <= 1e-9) {
					t.Errorf("%s at %g Hz, load %s: Pin %.12g W, Pout %.12g W, ΣPloss %.12g W (relative error %.2g; complex %.2g)",
						file, f, loadName(ld), r.Pin, r.Pout, r.Ploss, eP, eS)
				}
				if r.Pin > pAvail*(1+1e-12) {
					t.Errorf("%s at %g Hz: Pin %g W exceeds the available %g W", file, f, r.Pin, pAvail)
				}
				if r.Ploss < 0 || r.Pout < -1e-12*pAvail {
					t.Errorf("%s at %g Hz: negative dissipation or load power", file, f)
				}
				if ld.Open && r.Pout != 0 {
					t.Errorf("%s: open load takes %g W", file, r.Pout)
				}
			}
		}
	}
	t.Logf("Tellegen: largest relative error, real power %.3g, complex power %.3g", worstP, worstS)
}
