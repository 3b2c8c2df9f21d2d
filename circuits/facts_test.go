package circuits

import (
	"fmt"
	"math"
	"math/cmplx"
	"testing"
)

// TestHundredWattsIntoFifty: 100 W into 50 Ω is 70.7 V rms and 100 V peak,
// 1.41 A rms (P = V²/R; peak = √2·rms for a sine; common practice). The
// transmitter (50 Ω source, 100 W available) feeds a matched 50 Ω load
// through a 1 µΩ series resistor, which costs 2e-8 of the power: the
// figures hold to 1e-6 relative. (A much smaller resistor makes the nodal
// matrix ill-conditioned, condition number about 50 Ω/R: a 1 nΩ resistor
// costs six digits.)
func TestHundredWattsIntoFifty(t *testing.T) {
	_, c := mustParse(t, "through.net", "title through line\nport in a z=50\nport out b z=50\nresistor Rthru a b 1u\n")
	for _, f := range []float64{1.8e6, 14.2e6, 50e6} {
		r, err := c.Solve(f, 100, Load{Z: 50})
		if err != nil {
			t.Fatal(err)
		}
		vrms := cmplx.Abs(r.Vout)
		if math.Abs(vrms/70.71068-1) > 1e-6 {
			t.Errorf("100 W into 50 Ω: %.5f V rms, want 70.711 V", vrms)
		}
		if pk := math.Sqrt2 * vrms; math.Abs(pk/100-1) > 1e-6 {
			t.Errorf("100 W into 50 Ω: %.5f V peak, want 100 V", pk)
		}
		if irms := cmplx.Abs(r.Iout); math.Abs(irms/1.414214-1) > 1e-6 {
			t.Errorf("100 W into 50 Ω: %.5f A rms, want 1.414 A", irms)
		}
		if math.Abs(r.Pout/100-1) > 1e-6 || math.Abs(r.Pin/100-1) > 1e-6 {
			t.Errorf("matched load takes %g W of %g W delivered, want all 100 W", r.Pout, r.Pin)
		}
		// EMF of a 50 Ω source with 100 W available: 2·√(P·R) = 141.4 V rms
		if math.Abs(r.EMF-141.421) > 1e-3 {
			t.Errorf("EMF %g V, want 141.4 V", r.EMF)
		}
	}
}

// TestQIsXOverR: a lossy part's Q is X/R (common practice): LossR must be
// ωL/Q for a coil and 1/(ωCQ) for a capacitor, tan δ/(ωC) for a stated
// dissipation factor, the esr itself when given, and a resistor's loss
// resistance is its value. Q points are read on log-log axes: halfway
// between two points in log f, Q is their geometric mean; outside the
// points Q holds the end values.
func TestQIsXOverR(t *testing.T) {
	text := `port in a z=50
port out b z=50
inductor  L1 a b 2.7u q=180
capacitor C1 a gnd 470p q=90@3.5M,360@14M
capacitor C2 b gnd 100p esr=0.08
capacitor C3 b gnd 220p df=0.2%
resistor  R1 a gnd 4.7k
inductor  L2 b gnd 10u
capacitor C4 a gnd 47p dielectric=x7r
capacitor C5 a gnd 47p
`
	_, c := mustParse(t, "q.net", text)
	el := map[string]*Element{}
	for i := range c.Elements {
		el[c.Elements[i].Name] = &c.Elements[i]
	}
	for _, f := range []float64{1e6, 3.5e6, 7e6, 10e6, 14e6, 30e6} {
		w := 2 * math.Pi * f
		gm := math.Sqrt(3.5e6 * 14e6) // 7 MHz: halfway in log f
		var qC1 float64
		switch {
		case f <= 3.5e6:
			qC1 = 90
		case f >= 14e6:
			qC1 = 360
		case f == gm:
			qC1 = math.Sqrt(90 * 360)
		default:
			// straight line in log Q against log f: slope ln4/ln4 = 1
			qC1 = 90 * f / 3.5e6
		}
		for _, tc := range []struct {
			name string
			x    float64 // reactance magnitude
			q    float64 // 0: check r directly
			r    float64
		}{
			{"L1", w * 2.7e-6, 180, 0},
			{"C1", 1 / (w * 470e-12), qC1, 0},
			{"C2", 0, 0, 0.08},
			{"C3", 0, 0, 0.002 / (w * 220e-12)},
			{"R1", 0, 0, 4700},
			{"L2", w * 10e-6, DefaultInductorQ, 0},
			{"C4", 1 / (w * 47e-12), 40, 0},  // class II dielectric: from memory
			{"C5", 1 / (w * 47e-12), 500, 0}, // no dielectric named
		} {
			want := tc.r
			if tc.q > 0 {
				want = tc.x / tc.q
			}
			e := el[tc.name]
			if got := e.LossR(f); math.Abs(got-want) > 1e-12*want {
				t.Errorf("%s at %g Hz: LossR %g Ω, want %g Ω", tc.name, f, got, want)
			}
			if tc.x > 0 {
				z := e.Impedance(f)
				if q := math.Abs(imag(z)) / real(z); math.Abs(q-tc.q) > 1e-9*tc.q {
					t.Errorf("%s at %g Hz: X/R = %g, want Q %g", tc.name, f, q, tc.q)
				}
			}
		}
	}
	// at the geometric mean of the two points, Q is the geometric mean
	if q := el["C1"].Q(math.Sqrt(3.5e6 * 14e6)); math.Abs(q-180) > 1e-9 {
		t.Errorf("C1: Q at √(3.5M·14M) = %g, want √(90·360) = 180", q)
	}
}

// bandpassText writes a two-resonator capacitively coupled bandpass: two
// shunt parallel LC tanks (1 µH, Q 200) coupled by cc, end-coupled to 50 Ω
// by 33 pF series capacitors. The end coupling gives each tank an external
// Q of roughly Rp/X ≈ 28 near 14 MHz (Rp ≈ X_Ce²/50), so critical coupling
// (k·Qe = 1) needs k ≈ 0.035, i.e. cc ≈ 0.035 × 127 pF ≈ 4.5 pF (coupled
// resonators: Matthaei, Young & Jones 1964, sec. 8.02; values worked here).
func bandpassText(cc float64) string {
	return fmt.Sprintf(`title coupled-resonator bandpass
port in a z=50
port out d z=50
capacitor Ce1 a b 33p q=2000
inductor L1 b gnd 1u q=200
capacitor Ct1 b gnd 91p q=2000
capacitor Cc b c %.6gp q=2000
inductor L2 c gnd 1u q=200
capacitor Ct2 c gnd 91p q=2000
capacitor Ce2 c d 33p q=2000
`, cc*1e12)
}

type passband struct {
	maxima   int     // local maxima of |S21|
	dip      float64 // dB: worst loss between the outermost maxima above the best
	minIL    float64 // dB
	bw3      float64 // Hz, 3 dB below the best point
	centreHz float64
}

// sweepPassband sweeps |S21| finely and reads the passband shape.
func sweepPassband(t *testing.T, c *Circuit) passband {
	t.Helper()
	const lo, hi, n = 9e6, 19e6, 20001
	il := make([]float64, n)
	fs := make([]float64, n)
	best := 0
	for i := range il {
		fs[i] = lo + (hi-lo)*float64(i)/(n-1)
		sp, err := c.TwoPort(fs[i])
		if err != nil {
			t.Fatal(err)
		}
		il[i] = -DB(sp.S21)
		if il[i] < il[best] {
			best = i
		}
	}
	pb := passband{minIL: il[best], centreHz: fs[best]}
	first, last := -1, -1
	for i := 1; i < n-1; i++ {
		if il[i] < il[i-1] && il[i] < il[i+1] {
			pb.maxima++
			if first < 0 {
				first = i
			}
			last = i
		}
	}
	for i := first; i >= 0 && i <= last; i++ {
		pb.dip = math.Max(pb.dip, il[i]-il[best])
	}
	a, b := best, best
	for a > 0 && il[a] < il[best]+3 {
		a--
	}
	for b < n-1 && il[b] < il[best]+3 {
		b++
	}
	if a == 0 || b == n-1 {
		t.Fatalf("3 dB points outside the sweep")
	}
	pb.bw3 = fs[b] - fs[a]
	return pb
}

// TestCoupledResonatorBandpass: two coupled resonators show a
// double-humped response when overcoupled (k·Q > 1) and a single peak with
// more loss and a narrower passband when undercoupled (k·Q < 1) (coupled
// resonator theory, Matthaei, Young & Jones 1964, sec. 8.02; common
// practice in filter tuning).
func TestCoupledResonatorBandpass(t *testing.T) {
	results := map[string]passband{}
	for _, tc := range []struct {
		name string
		cc   float64
	}{{"under", 1.5e-12}, {"critical", 4.5e-12}, {"over", 8e-12}} {
		_, c := mustParse(t, tc.name+".net", bandpassText(tc.cc))
		pb := sweepPassband(t, c)
		results[tc.name] = pb
		t.Logf("%-8s Cc=%4.1f pF: %d maxima, dip %.2f dB, least loss %.2f dB at %.3f MHz, 3 dB bandwidth %.0f kHz",
			tc.name, tc.cc*1e12, pb.maxima, pb.dip, pb.minIL, pb.centreHz/1e6, pb.bw3/1e3)
	}
	under, crit, over := results["under"], results["critical"], results["over"]
	if over.maxima != 2 {
		t.Errorf("overcoupled: %d maxima of |S21|, want 2 (double hump)", over.maxima)
	}
	if under.maxima != 1 || crit.maxima != 1 {
		t.Errorf("undercoupled and critical: %d and %d maxima, want 1 each", under.maxima, crit.maxima)
	}
	if !(under.minIL > crit.minIL+1) {
		t.Errorf("undercoupled least loss %.2f dB should exceed critical %.2f dB by over 1 dB", under.minIL, crit.minIL)
	}
	if !(under.minIL > over.minIL+1) {
		t.Errorf("undercoupled least loss %.2f dB should exceed overcoupled %.2f dB by over 1 dB", under.minIL, over.minIL)
	}
	if !(under.bw3 < crit.bw3 && crit.bw3 < over.bw3) {
		t.Errorf("3 dB bandwidths under %.0f, critical %.0f, over %.0f kHz should rise with coupling", under.bw3/1e3, crit.bw3/1e3, over.bw3/1e3)
	}
}
