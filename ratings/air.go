package ratings

import (
	"fmt"
	"math"
)

// Breakdown of clearances: air gaps (Paschen's law at the pressure of the
// altitude, reduced for RF and for non-uniform fields) and board surfaces
// (a creepage-style working voltage per millimetre). docs/ratings.md,
// "Clearances and arcing", gives the sources and the reasoning for every
// factor here.

// Media a clearance may be judged in.
const (
	MediumAir    = "air"    // an air gap: plates of an air variable, leads, wiring
	MediumBoard  = "board"  // along a clean, uncoated circuit-board surface
	MediumCoated = "coated" // along a board surface under conformal coating
)

// Media lists the media in a fixed order, for messages.
var Media = []string{MediumAir, MediumBoard, MediumCoated}

// Atmosphere is the air a clearance works in.
type Atmosphere struct {
	Altitude float64 // m above sea level
	Ambient  float64 // °C, the air inside the equipment
}

// SeaLevel is the default atmosphere: sea level at 25 °C.
var SeaLevel = Atmosphere{Altitude: 0, Ambient: 25}

// StandardPressure is the pressure in Pa of the ISO 2533 (ICAO) standard
// atmosphere at geopotential altitude h metres, in its troposphere (up to
// 11 km): p = 101325·(1 − 2.25577e-5·h)^5.25588. The constants follow from
// the standard's sea-level temperature 288.15 K and lapse rate 6.5 K/km:
// 2.25577e-5 = 0.0065/288.15 and 5.25588 = g0·M/(R·0.0065).
func StandardPressure(h float64) float64 {
	return 101325 * math.Pow(1-2.25577e-5*h, 5.25588)
}

// Pressure is the air pressure in Pa at the atmosphere's altitude.
func (a Atmosphere) Pressure() float64 { return StandardPressure(a.Altitude) }

// RelDensity is the air density relative to 101.325 kPa and 20 °C, the
// reference of the breakdown data: δ = (p/101325)·(293.15/T). The air in
// the equipment is at the audit's ambient temperature, not at the standard
// atmosphere's (colder) temperature, which would overstate its density.
func (a Atmosphere) RelDensity() float64 {
	return a.Pressure() / 101325 * 293.15 / (273.15 + a.Ambient)
}

// PdTorrCm is the reduced product p·d in Torr·cm (pressure scaled to the
// 20 °C reference density) of a gap d metres long in atmosphere a.
func (a Atmosphere) PdTorrCm(d float64) float64 { return a.RelDensity() * 760 * d * 100 }

// Townsend's constants for air in Paschen's law, as tabulated by Raizer,
// Gas Discharge Physics (Springer 1991), table 4.1 (from memory): A = 15
// ionisations per cm·Torr and B = 365 V/(cm·Torr), fitted for
// E/p = 100…800 V/(cm·Torr); γ = 0.01 is the secondary-emission
// coefficient the same textbook takes as typical of metal cathodes.
const (
	PaschenA     = 15.0  // 1/(cm·Torr)
	PaschenB     = 365.0 // V/(cm·Torr)
	PaschenGamma = 0.01
)

// PaschenTownsend is Paschen's law in Townsend's form for air: the DC
// breakdown voltage of a uniform-field gap at reduced p·d (Torr·cm),
//
//	V = B·pd / (ln(A·pd) − ln(ln(1 + 1/γ)))
//
// NaN below the left asymptote, where the gap does not break down at any
// voltage in this model.
func PaschenTownsend(pd float64) float64 {
	den := math.Log(PaschenA*pd) - math.Log(math.Log(1+1/PaschenGamma))
	if !(pd > 0) || den <= 0 {
		return math.NaN()
	}
	return PaschenB * pd / den
}

// PaschenMinimum is the minimum of PaschenTownsend: at pd = e·ln(1+1/γ)/A
// the voltage is B·pd. Returns pd (Torr·cm) and V.
func PaschenMinimum() (pd, v float64) {
	pd = math.E * math.Log(1+1/PaschenGamma) / PaschenA
	return pd, PaschenB * pd
}

// pdJoin is where the curve passes from Townsend's form to the empirical
// fit: the two come within a few volts of each other near 3 Torr·cm (a
// gap of 40 µm at sea level), and above it the Townsend form with constant
// A and B overstates the breakdown of real gaps (5.0 kV against a measured
// 4.3–4.5 kV at 1 mm and 1 atm), which would be a false pass.
const pdJoin = 3.0

// AirUniformBreakdown is the DC breakdown voltage (V) of a uniform-field
// gap in air at reduced pd (Torr·cm): Paschen's curve. Below pdJoin it is
// Townsend's form above; from pdJoin up it is the empirical fit to
// measured uniform-field breakdown of air at 20 °C (Schumann's form as
// given in Kuffel, Zaengl & Kuffel, High Voltage Engineering:
// Fundamentals, 2nd ed. 2000, ch. 5; from memory):
//
//	V[kV] = 24.22·(δ·d) + 6.08·√(δ·d),  δ·d in cm (δ relative air density)
//
// Both are functions of p·d alone, as Paschen's law says. Of the two the
// lower is taken near the join, so the curve never overstates either.
//
// Left of the Paschen minimum (gaps of a few micrometres at sea level)
// Townsend's form rises to an asymptote, but real micro-gaps break down by
// field emission at or below the minimum, so the curve is held at its
// minimum there: never above what such a gap stands.
func AirUniformBreakdown(pd float64) float64 {
	if !(pd > 0) {
		return math.NaN()
	}
	if pdMin, vMin := PaschenMinimum(); pd < pdMin {
		return vMin
	}
	vt := PaschenTownsend(pd)
	if pd < pdJoin {
		return vt
	}
	x := pd / 760 // δ·d in cm
	ve := 1e3 * (24.22*x + 6.08*math.Sqrt(x))
	if vt < ve {
		return vt
	}
	return ve
}

// RF and field-shape reductions of the uniform-field DC breakdown of an air
// gap (common practice, from memory; docs/ratings.md says why):
//
//   - RFFactor 0.8: at HF the ions left by each half cycle are not swept
//     out of a gap of a millimetre or so, and their space charge lowers the
//     breakdown of such gaps by some 10–20 % against DC (Meek & Craggs,
//     Electrical Breakdown of Gases, 1978, discuss high-frequency
//     breakdown); 0.8 takes the larger reduction.
//   - FieldFactor 0.75: capacitor plates, leads and wiring are not
//     infinite parallel plates; their edges, corners and burrs raise the
//     local field above V/d. A field-utilisation factor of 0.7–0.8 is usual
//     for rounded plate edges and smooth conductors; sharp edges and points
//     are worse still (then give a smaller gap=, or more margin).
const (
	RFFactor    = 0.8
	FieldFactor = 0.75
)

// Working-voltage guides along a board surface, peak volts per millimetre
// of creepage distance (common practice, from memory; our own round
// figures, in the spirit of the creepage tables of the IEC 60664-1 family,
// not copied from them): a clean uncoated laminate in an ordinary indoor
// station (dust and occasional condensation, the standard's "pollution
// degree 2") about 100 V RMS per mm at a few hundred volts, 140 V peak;
// under a sound conformal coating, treated like a clean sealed surface
// (the family's coating part, IEC 60664-3), about 500 V peak per mm.
// These are working voltages with a margin already in them, not the
// voltage at which the surface flashes over.
const (
	BoardVpkPerMM  = 140.0
	CoatedVpkPerMM = 500.0
)

// ArcVoltage is the peak RF voltage at which an air gap of d metres in
// atmosphere a would arc: the uniform-field Paschen breakdown at the
// gap's reduced p·d times RFFactor and FieldFactor. NaN for d ≤ 0.
func ArcVoltage(d float64, a Atmosphere) float64 {
	if !(d > 0) {
		return math.NaN()
	}
	return AirUniformBreakdown(a.PdTorrCm(d)) * RFFactor * FieldFactor
}

// ClearanceLimit is the voltage a clearance of medium and gap d may carry
// before it is judged beyond its limit, before derating: for air the
// voltage that would arc (ArcVoltage); for board surfaces the working
// voltage guide per millimetre times the gap.
func ClearanceLimit(medium string, d float64, a Atmosphere) float64 {
	switch medium {
	case MediumBoard:
		return BoardVpkPerMM * d * 1e3
	case MediumCoated:
		return CoatedVpkPerMM * d * 1e3
	}
	return ArcVoltage(d, a)
}

// GapFor is the smallest gap (m) of medium whose ClearanceLimit times
// factor reaches v: the gap needed for the derated limit. The limit rises
// with the gap, so bisection finds it; +Inf beyond 10 m.
func GapFor(medium string, v, factor float64, a Atmosphere) float64 {
	if !(v > 0) || !(factor > 0) {
		return 0
	}
	ok := func(d float64) bool { return ClearanceLimit(medium, d, a)*factor >= v }
	lo, hi := 0.0, 1e-4
	for !ok(hi) {
		lo, hi = hi, hi*2
		if hi > 10 {
			return math.Inf(1)
		}
	}
	for n := 0; n < 80; n++ {
		mid := (lo + hi) / 2
		if ok(mid) {
			hi = mid
		} else {
			lo = mid
		}
	}
	return hi
}

// Clearance is a gap judged against breakdown: a part's gap= (plate or lead
// spacing) or a clearance statement.
type Clearance struct {
	Gap    float64 // m
	Medium string  // MediumAir, MediumBoard or MediumCoated
}

// Class is the derating class of the clearance.
func (c *Clearance) Class() string {
	if c.Medium == MediumAir {
		return ClassGapAir
	}
	return ClassGapBoard
}

// Describe renders the clearance for people: "1.5 mm air".
func (c *Clearance) Describe() string {
	return fmt.Sprintf("%s %s", mmText(c.Gap), c.Medium)
}

// mmText renders a length in millimetres with up to three significant
// figures.
func mmText(d float64) string {
	return fmt.Sprintf("%.3g mm", d*1e3)
}

// Describe renders an atmosphere for people: altitude, pressure, air
// temperature.
func (a Atmosphere) Describe() string {
	return fmt.Sprintf("%.0f m above sea level (%.1f kPa), air at %.0f °C", a.Altitude, a.Pressure()/1e3, a.Ambient)
}
