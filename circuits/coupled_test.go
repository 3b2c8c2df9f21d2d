package circuits

import (
	"fmt"
	"math"
	"math/cmplx"
	"testing"
)

// Coupled coils obey V1 = Z1·I1 + Zm·I2, V2 = Zm·I1 + Z2·I2, currents
// entering the dotted ends (any circuit-analysis text, chapter on
// magnetically coupled circuits; common practice). For lossless coils
// Zm = jωM, M = k·√(L1·L2). The package models a lossy core by complex
// permeability, µ = µ′ − jµ″ with Q = µ′/µ″ (e.g. Snelling, Soft Ferrites,
// ch. 2; from memory): every inductance of the matrix carries the same
// loss angle, so for two windings of equal Q, Z = R + jωL with R = ωL/Q
// and Zm = k·√(Z1·Z2). The package dots each inductor's first-named node.

// coupledPairABCD is the chain matrix of two coupled coils sharing a ground
// return, from their Z-parameters z11 = Z1, z12 = z21 = ±jωM, z22 = Z2 and
// the Z-to-ABCD conversion A = z11/z21, B = (z11·z22 − z12·z21)/z21,
// C = 1/z21, D = z22/z21 (Pozar, Microwave Engineering, ch. 4, conversion
// table).
func coupledPairABCD(z1, z2 complex128, zm complex128) abcd {
	return abcd{A: z1 / zm, B: (z1*z2 - zm*zm) / zm, C: 1 / zm, D: z2 / zm}
}

// coupledPairT is the same pair as its T-equivalent: series Z1 − jωM,
// shunt jωM, series Z2 − jωM (textbook T-equivalent of coupled coils:
// L1 − M, M, L2 − M; from memory, verified here against the Z-parameter
// form).
func coupledPairT(z1, z2, zm complex128) abcd {
	return seriesZ(z1 - zm).then(shuntY(1 / zm)).then(seriesZ(z2 - zm))
}

// TestCoupledCoilsABCD: a lowpass-like network around a coupled pair; the
// solver must equal the chain-matrix cascade to 1e-9 relative, with the
// secondary written both ways round (which flips the sign of M).
func TestCoupledCoilsABCD(t *testing.T) {
	const (
		c1, c2, c3 = 220e-12, 330e-12, 150e-12
		l1, l2, l3 = 2.2e-6, 0.68e-6, 0.47e-6
		k          = 0.37
	)
	lossL := lossModel{q: 150}
	lossC := lossModel{q: 800}
	for _, reversed := range []bool{false, true} {
		ends := "b gnd"
		sign := complex(1, 0)
		if reversed {
			ends, sign = "gnd b", -1
		}
		text := fmt.Sprintf(`title coupled pair
port in a z=50
port out c z=50
capacitor C1 a gnd 220p q=800
inductor  L1 a gnd 2.2u q=150
inductor  L2 %s 0.68u q=150
coupling  K1 L1 L2 k=0.37
capacitor C2 b gnd 330p q=800
inductor  L3 b c 0.47u q=150
capacitor C3 c gnd 150p q=800
`, ends)
		_, c := mustParse(t, "coupled.net", text)
		var worst float64
		for _, f := range testFreqs {
			w := 2 * math.Pi * f
			z1, z2 := refInductorZ(l1, lossL, f), refInductorZ(l2, lossL, f)
			zm := sign * complex(k, 0) * cmplx.Sqrt(z1*z2)
			_ = w
			pair := coupledPairABCD(z1, z2, zm)
			tee := coupledPairT(z1, z2, zm)
			for _, x := range []complex128{pair.A - tee.A, pair.B - tee.B, pair.C - tee.C, pair.D - tee.D} {
				if cmplx.Abs(x) > 1e-9*(cmplx.Abs(pair.B)+1) {
					t.Fatalf("T-equivalent and Z-parameter chain matrices differ at %g Hz", f)
				}
			}
			m := shuntY(1 / refCapacitorZ(c1, lossC, f)).then(pair).
				then(shuntY(1 / refCapacitorZ(c2, lossC, f))).
				then(seriesZ(refInductorZ(l3, lossL, f))).
				then(shuntY(1 / refCapacitorZ(c3, lossC, f)))
			sp, err := c.TwoPort(f)
			if err != nil {
				t.Fatal(err)
			}
			for _, ck := range []cmpCheck{
				{what: "S21", got: sp.S21, want: m.s21Pozar(50)},
				{what: "S11", got: sp.S11, want: gammaPower(m.zin(50), 50)},
				{what: "Zin", got: sp.Zin, want: m.zin(50)},
			} {
				e := relErr(ck.got, ck.want)
				worst = math.Max(worst, e)
				if !(e <= 1e-9) {
					t.Errorf("reversed=%v at %g Hz: %s = %v, chain matrix %v (relative error %.2g)", reversed, f, ck.what, ck.got, ck.want, e)
				}
			}
			res, err := c.Solve(f, 100, Load{Z: complex(20, 35)})
			if err != nil {
				t.Fatal(err)
			}
			e := complex(2*math.Sqrt(100*50.0), 0)
			if got, want := res.Iout, m.loadCurrent(e, 50, complex(20, 35)); !(relErr(got, want) <= 1e-9) {
				t.Errorf("reversed=%v at %g Hz: load current %v, chain matrix %v", reversed, f, got, want)
			}
		}
		t.Logf("coupled pair (reversed=%v): largest relative error against the chain matrix %.3g", reversed, worst)
	}
}

// TestSeriesAidingOpposing: two coupled coils in series present
// L1 + L2 ± 2M, aiding when the current enters both dotted ends and
// opposing when one coil is turned round (common practice; follows from
// the coupled-coil equations with I1 = I2).
func TestSeriesAidingOpposing(t *testing.T) {
	const l1, l2, k, q, f = 1.5e-6, 0.6e-6, 0.4, 200.0, 7.1e6
	m := k * math.Sqrt(l1*l2)
	w := 2 * math.Pi * f
	for _, tc := range []struct {
		ends string
		leq  float64
	}{{"m out", l1 + l2 + 2*m}, {"out m", l1 + l2 - 2*m}} {
		text := "port in in z=50\nport out out z=50\ninductor L1 in m 1.5u q=200\ninductor L2 " + tc.ends +
			" 0.6u q=200\ncoupling K L1 L2 k=0.4\n"
		_, c := mustParse(t, "series.net", text)
		// equal Q: every term of the inductance matrix has loss ω·L/Q, so
		// the series pair is (L1 + L2 ± 2M)·ω·(1/Q + j)
		zser := complex(w*tc.leq/q, w*tc.leq)
		want := seriesZ(zser).s21Pozar(50)
		sp, err := c.TwoPort(f)
		if err != nil {
			t.Fatal(err)
		}
		if e := relErr(sp.S21, want); !(e <= 1e-9) {
			t.Errorf("L2 %s: S21 %v, series L1+L2±2M gives %v (relative error %.2g)", tc.ends, sp.S21, want, e)
		}
	}
}

// TestTransformerRatio: coils on one core with k close to 1 transform an
// impedance by (N1/N2)² = L1/L2, since L = AL·N² on a shared core (common
// practice). From the coupled-coil equations the exact input impedance is
// Zin = jωL1 + (ωM)²/(ZL + jωL2); writing a = ZL/(jωL2) it is
// n²ZL·k²/(1 + a) + jωL1(1 − k²), so the departure from n²ZL is, to first
// order, |a| (magnetising current) plus (1 − k²)·ωL2/|ZL| (leakage) plus
// (1 − k²). The test allows that sum with 10 % margin for the higher-order
// terms, and checks the exact formula to 1e-9.
func TestTransformerRatio(t *testing.T) {
	cases := []struct {
		l1, l2 float64 // H
		n1, n2 int     // turns on one core
		k, f   float64
		zl     complex128
	}{
		{80e-6, 20e-6, 10, 5, 0.9999, 10e6, 12.5},
		{20e-6, 5e-6, 10, 5, 0.999, 14e6, 12.5},
		{9e-6, 81e-6, 3, 9, 0.9995, 7e6, complex(450, 0)},
		{45e-6, 5e-6, 12, 4, 0.9998, 21e6, complex(5.6, 2)},
	}
	for _, tc := range cases {
		// the test's L1/L2 are AL·N² for one AL, so L1/L2 = (N1/N2)²
		n2ratio := float64(tc.n1*tc.n1) / float64(tc.n2*tc.n2)
		if math.Abs(tc.l1/tc.l2-n2ratio) > 1e-12 {
			t.Fatalf("case inconsistent: L1/L2 = %g, (N1/N2)² = %g", tc.l1/tc.l2, n2ratio)
		}
		text := fmt.Sprintf("port in p z=50\nport out s z=50\ninductor Lp p gnd %.17g q=1e12\ninductor Ls s gnd %.17g q=1e12\ncoupling K Lp Ls k=%g\n",
			tc.l1, tc.l2, tc.k)
		_, c := mustParse(t, "xfmr.net", text)
		res, err := c.Solve(tc.f, 10, Load{Z: tc.zl})
		if err != nil {
			t.Fatal(err)
		}
		w := 2 * math.Pi * tc.f
		mm := tc.k * math.Sqrt(tc.l1*tc.l2)
		exact := complex(0, w*tc.l1) + complex(w*mm*w*mm, 0)/(tc.zl+complex(0, w*tc.l2))
		if e := relErr(res.Zin, exact); !(e <= 1e-9) {
			t.Errorf("Zin %v, coupled-coil formula %v (relative error %.2g)", res.Zin, exact, e)
		}
		ideal := complex(n2ratio, 0) * tc.zl
		a := cmplx.Abs(tc.zl) / (w * tc.l2)
		leak := 1 - tc.k*tc.k
		tol := 1.1 * (a + leak*w*tc.l2/cmplx.Abs(tc.zl) + leak)
		e := relErr(res.Zin, ideal)
		if e > tol {
			t.Errorf("N1:N2 = %d:%d, k=%g: Zin %v, (N1/N2)²·ZL = %v, off by %.3g (allowed %.3g)", tc.n1, tc.n2, tc.k, res.Zin, ideal, e, tol)
		}
		// voltage ratio V2/V1 ≈ N2/N1 under the same approximation
		vr := cmplx.Abs(res.Vout / res.Vin)
		if want := float64(tc.n2) / float64(tc.n1); math.Abs(vr/want-1) > tol {
			t.Errorf("N1:N2 = %d:%d: |V2/V1| = %.5f, N2/N1 = %.5f", tc.n1, tc.n2, vr, want)
		}
		t.Logf("N1:N2 = %d:%d, k=%g: Zin off (N1/N2)²·ZL by %.3g (allowed %.3g)", tc.n1, tc.n2, tc.k, e, tol)
	}
}

// TestTransformerCoreLoss: a 1:2-turns transformer (10 µH and 40 µH,
// q=100, k=0.9999) into 200 Ω at 7.1 MHz. Its load ampere-turns cancel in
// the core, so the core loss is that of the magnetising current: the
// winding voltage over the shunt loss resistance Q·ωL1,
// P ≈ |V1|²/(Q·ωL1) (transformer theory, any electrical-machines text;
// the complex-permeability core gives exactly this plus a leakage term
// (1 − k²)·(ωL1/Q)·|I1|², here under 0.1 %). Not the |I1|²·ωL1/Q of a
// lone coil, which is (|I1|·ωL1/|V1|)² ≈ 40× larger here. 2 %.
func TestTransformerCoreLoss(t *testing.T) {
	_, c := mustParse(t, "x.net", "port in p z=50\nport out s z=200\ninductor L1 p gnd 10u q=100\ninductor L2 s gnd 40u q=100\ncoupling K L1 L2 k=0.9999\n")
	const f = 7.1e6
	r, err := c.Solve(f, 100, Load{Z: 200})
	if err != nil {
		t.Fatal(err)
	}
	w := 2 * math.Pi * f
	v1 := cmplx.Abs(r.Parts[0].V)
	want := v1 * v1 / (100 * w * 10e-6)
	got := r.Parts[0].Ploss + r.Parts[1].Ploss
	if math.Abs(got-want) > 0.02*want {
		t.Errorf("core loss %.4g W, magnetising-current figure %.4g W", got, want)
	}
	lone := cmplx.Abs(r.Parts[0].I) * cmplx.Abs(r.Parts[0].I) * w * 10e-6 / 100
	if lone < 10*want {
		t.Errorf("the lone-coil figure %.3g W should be far above the core loss %.3g W here", lone, want)
	}
	// Tellegen: the source's power is the load's plus the windings'
	if d := math.Abs(r.Pin - r.Pout - got); d > 1e-9*r.Pin {
		t.Errorf("power balance off by %g W", d)
	}
	t.Logf("core loss %.4g W (V1 %.4g V rms), lone-coil figure %.4g W", got, v1, lone)
}
