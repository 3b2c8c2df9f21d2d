package ratings

import "math"

// Mu0 is the magnetic constant in H/m. The pre-2019 exact value 4π×10⁻⁷
// differs from CODATA 2018 by less than 1 part in 10⁹, far below anything
// a rating can resolve, and keeps IEC 60287's 10⁻⁷ factor exact.
const Mu0 = 4 * math.Pi * 1e-7

// Rho20Copper is the resistivity of annealed copper at 20 °C in Ω·m:
// 1/58 Ω·mm²/m (IEC 60028, International Annealed Copper Standard).
const Rho20Copper = 1.0 / 58 * 1e-6

// WireHeatFlux is the loss per unit of wire surface we accept for a wound
// conductor in still air, W/m² (0.1 W/cm²). From memory: natural convection
// plus radiation from a thin enamelled wire is some 20–30 W/m²·K, so this
// keeps the wire roughly 35–50 K above its surroundings. At DC it gives
// about 15 A/mm² in a 1 mm wire, near the usual chassis-wiring figures.
const WireHeatFlux = 1000.0

// SkinDepth is δ = sqrt(ρ/(π·f·µ0)) in m for a non-magnetic conductor of
// resistivity rho (Ω·m) at f (Hz) (any electromagnetics text, e.g. Ramo,
// Whinnery & Van Duzer). It is +Inf at or below 0 Hz.
func SkinDepth(f, rho float64) float64 {
	if !(f > 0) || !(rho > 0) {
		return math.Inf(1)
	}
	return math.Sqrt(rho / (math.Pi * f * Mu0))
}

// SkinFactor is R_ac/R_dc of a solid round wire of diameter d (m) and
// resistivity rho at f, by the skin-effect factor of IEC 60287-1-1 (2.1.2)
// with k_s = 1: x² = 8πf·10⁻⁷/R', R' the DC resistance per metre, and
//
//	y = x⁴/(192 + 0.8x⁴)                  x ≤ 2.8
//	y = −0.136 − 0.0177x + 0.0563x²       2.8 < x ≤ 3.8
//	y = 0.354x − 0.733                    x > 3.8
//
// R_ac/R_dc = 1 + y. It tends to 1 at low frequency and to d/(4δ) + ¼ at
// high frequency, as the exact Bessel-function solution does (x = d/(δ√2)).
// Proximity effect between turns is left out: windings on HF filter cores
// are mostly a single spaced layer.
func SkinFactor(f, d, rho float64) float64 {
	if !(f > 0) || !(d > 0) || !(rho > 0) {
		return 1
	}
	rdc := rho / (math.Pi * d * d / 4)
	x2 := 8 * math.Pi * f * 1e-7 / rdc
	x := math.Sqrt(x2)
	var y float64
	switch {
	case x <= 2.8:
		y = x2 * x2 / (192 + 0.8*x2*x2)
	case x <= 3.8:
		y = -0.136 - 0.0177*x + 0.0563*x2
	default:
		y = 0.354*x - 0.733
	}
	return 1 + y
}

// ConductingArea is the cross-section that carries the current at f: the
// wire area divided by the skin factor, so that ρ/area is the AC resistance
// per metre. At high frequency it tends to π·d·δ, the skin annulus.
func ConductingArea(f, d, rho float64) float64 {
	if !(d > 0) {
		return 0
	}
	return math.Pi * d * d / 4 / SkinFactor(f, d, rho)
}

// DensityLimit is the RMS current density (A/m² on ConductingArea) at which
// a wire of diameter d loses WireHeatFlux per unit of its surface at f:
// I²·ρ/A = q·π·d, so J = sqrt(q·π·d/(ρ·A)). It rises with frequency because
// the loss crowds into a thinner skin while the cooling surface stays.
func DensityLimit(f, d, rho float64) float64 {
	a := ConductingArea(f, d, rho)
	if !(a > 0) {
		return 0
	}
	return math.Sqrt(WireHeatFlux * math.Pi * d / (rho * a))
}
