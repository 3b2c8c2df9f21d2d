package ratings

import (
	"math"
	"testing"
)

// besselJ is J_n(z) for complex z by its power series
// Σ (−1)^k (z/2)^(2k+n) / (k!·(k+n)!) (Abramowitz & Stegun 9.1.10); fine
// in float64 for |z| up to about 20.
func besselJ(n int, z complex128) complex128 {
	h := z / 2
	term := complex(1, 0)
	for i := 1; i <= n; i++ {
		term *= h / complex(float64(i), 0)
	}
	var s complex128
	for k := 0; k < 300; k++ {
		s += term
		term *= -h * h / complex(float64((k+1)*(k+1+n)), 0)
	}
	return s
}

func TestSkinDepthCopper(t *testing.T) {
	// Published skin-depth tables for copper: about 66 µm at 1 MHz and
	// 21 µm at 10 MHz (e.g. any RF handbook's skin-depth table).
	for _, c := range []struct{ f, want float64 }{{1e6, 66e-6}, {10e6, 21e-6}} {
		got := SkinDepth(c.f, Rho20Copper)
		if math.Abs(got-c.want) > 1e-6 {
			t.Errorf("skin depth at %g Hz = %.2f µm, want %.0f µm ± 1 µm", c.f, got*1e6, c.want*1e6)
		}
	}
	if !math.IsInf(SkinDepth(0, Rho20Copper), 1) {
		t.Error("skin depth at DC should be infinite")
	}
}

func TestIEC60028Copper(t *testing.T) {
	// IEC 60028: 1 m of 1 mm² annealed copper at 20 °C is 17.241 mΩ.
	r := Rho20Copper * 1 / 1e-6
	if math.Abs(r-17.241e-3) > 0.0005e-3 {
		t.Errorf("R(1 m, 1 mm²) = %.4f mΩ, want 17.241 mΩ", r*1e3)
	}
}

func TestSkinFactorAgainstBessel(t *testing.T) {
	// Exact internal impedance of a round wire radius a (Ramo, Whinnery &
	// Van Duzer, Fields and Waves, sec. 5.12): Z/R_dc = (ka/2)·J0(ka)/J1(ka),
	// k = (1 − j)/δ. The IEC 60287 fit should follow it closely.
	d := 1e-3
	for _, x := range []float64{0.3, 1, 2, 2.8, 3.3, 3.8, 5, 8, 12, 20} {
		delta := d / (math.Sqrt2 * x) // IEC 60287's x = d/(δ√2) for a solid wire
		f := Rho20Copper / (math.Pi * Mu0 * delta * delta)
		z := complex(1, -1) / complex(delta, 0) * complex(d/2, 0)
		exact := real(z / 2 * besselJ(0, z) / besselJ(1, z))
		got := SkinFactor(f, d, Rho20Copper)
		if math.Abs(got/exact-1) > 0.01 {
			t.Errorf("x=%g: skin factor %.4f, exact %.4f", x, got, exact)
		}
	}
	// High-frequency asymptote d/(4δ) + 1/4 of the same solution; and R_ac
	// ≈ R_dc·d/(4δ) as the usual rule.
	f := 28e6
	delta := SkinDepth(f, Rho20Copper)
	want := d/(4*delta) + 0.25
	if got := SkinFactor(f, d, Rho20Copper); math.Abs(got/want-1) > 0.005 {
		t.Errorf("skin factor at 28 MHz = %.3f, asymptote %.3f", got, want)
	}
	// Conducting area tends to the skin annulus π·d·δ.
	if a := ConductingArea(f, d, Rho20Copper); math.Abs(a/(math.Pi*d*delta)-1) > 0.03 {
		t.Errorf("conducting area %.4g m², annulus π·d·δ %.4g m²", a, math.Pi*d*delta)
	}
	// DC: the whole section conducts.
	if got := SkinFactor(0, d, Rho20Copper); got != 1 {
		t.Errorf("skin factor at DC = %g, want 1", got)
	}
}

func TestDensityLimitIsHeatFlux(t *testing.T) {
	// Definition of the limit: at J = DensityLimit the wire's loss per metre
	// I²·R'_ac (R'_ac = ρ/A) equals WireHeatFlux times its surface per metre π·d.
	for _, f := range []float64{0, 1e6, 7e6, 30e6} {
		for _, d := range []float64{0.3e-3, 1e-3, 2e-3} {
			a := ConductingArea(f, d, Rho20Copper)
			i := DensityLimit(f, d, Rho20Copper) * a
			// R'_ac from the Bessel-free definition: R'_dc·SkinFactor
			rac := Rho20Copper / (math.Pi * d * d / 4) * SkinFactor(f, d, Rho20Copper)
			if q := i * i * rac / (math.Pi * d); math.Abs(q/WireHeatFlux-1) > 1e-9 {
				t.Errorf("f=%g d=%g: surface loss %.4g W/m², want %g", f, d, q, WireHeatFlux)
			}
		}
	}
	// The limit at DC for 1 mm wire should be in the range of chassis-wiring
	// figures, some 10–20 A/mm² (common practice, from memory).
	if j := DensityLimit(0, 1e-3, Rho20Copper); j < 10e6 || j > 20e6 {
		t.Errorf("DC density limit for 1 mm wire %.3g A/mm²", j*1e-6)
	}
}

func TestCmplxBesselSanity(t *testing.T) {
	// J0(1) = 0.7651976866, J1(1) = 0.4400505857 (Abramowitz & Stegun table 9.1).
	if math.Abs(real(besselJ(0, 1))-0.7651976866) > 1e-9 || math.Abs(real(besselJ(1, 1))-0.4400505857) > 1e-9 {
		t.Fatal("series Bessel function is wrong")
	}
}
