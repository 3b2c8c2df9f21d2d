package ratings

import (
	"fmt"
	"math"

	"rfstress/circuits"
)

// Duty is how a mode keys the transmitter, for heating: continuous (both
// zero), a single on-period On (Period 0, e.g. a tune-up carrier held for
// a set time), or On seconds in every Period (a data mode sending in fixed
// slots).
type Duty struct {
	On, Period float64 // s
}

// Heat is the first-order thermal state of a wound core.
type Heat struct {
	Final float64 // steady rise at the average dissipation, K
	Rise  float64 // the rise judged: after the key-down time, a periodic duty's ripple on top
	Tau   float64 // thermal time constant R_th·C_th, s; 0 when no heat capacity is known
}

// HeatCapacity is the wound part's heat capacity in J/K: the core body
// (volume × class density × specific heat) plus the winding's copper
// (length × section × 8960 kg/m³ × 385 J/(kg·K)). Densities and specific
// heats are from memory. 0 when nothing is known, which makes the model
// jump to steady state: the conservative side.
func (p *Part) HeatCapacity() float64 {
	if p.Core == nil {
		return 0
	}
	c := p.Core.HeatCapacity()
	if p.WireLength > 0 && p.Wire > 0 {
		c += p.WireLength * math.Pi * p.Wire * p.Wire / 4 * CopperDensity * CopperSpecHeat
	}
	return c
}

// Heating is the temperature rise of the wound core at average
// dissipation pavg (W) after t seconds key-down (t ≤ 0 or +Inf: steady
// state), under duty d. The steady rise is the still-air rule
// ΔT_final = (P[mW]/A[cm²])^0.833 (common practice); the response in time
// is first order: ΔT(t) = ΔT_final·(1 − e^(−t/τ)), τ = R_th·C_th with
// R_th = ΔT_final/P taken at this dissipation. A periodic duty adds the
// ripple of the periodic steady state of a first-order system driven at
// P/duty for On of every Period: peak = P_on·R_th·(1 − e^(−On/τ))/(1 − e^(−Period/τ)),
// which tends to the average-power rise when Period ≪ τ. The ripple is
// added in full from the start, so the figure never falls short.
func (p *Part) Heating(pavg, t float64, d Duty) Heat {
	return p.heating(p.Area, pavg, t, d)
}

func (p *Part) heating(area, pavg, t float64, d Duty) Heat {
	if area <= 0 || !(pavg > 0) {
		return Heat{}
	}
	final := math.Pow(pavg*1e3/(area*1e4), TempExponent)
	h := Heat{Final: final, Rise: final}
	c := p.HeatCapacity()
	if !(c > 0) {
		return h
	}
	h.Tau = final / pavg * c
	peak := final
	if d.Period > 0 && d.On > 0 && d.On < d.Period {
		// P_on·R_th = final/duty
		peak = final * d.Period / d.On * -math.Expm1(-d.On/h.Tau) / -math.Expm1(-d.Period/h.Tau)
		peak = math.Max(peak, final)
	}
	h.Rise = peak
	if t > 0 && !math.IsInf(t, 1) {
		h.Rise = peak - final*math.Exp(-t/h.Tau)
	}
	return h
}

// AreaFor is the cooling surface (m²) that holds the rise at pavg, t and
// d to allowed (K): the rise falls as the surface grows, so a bisection on
// the surface finds it. 0 when no surface would do or nothing is known.
func (p *Part) AreaFor(allowed, pavg, t float64, d Duty) float64 {
	if !(allowed > 0 && pavg > 0 && p.Area > 0) {
		return 0
	}
	lo, hi := p.Area*1e-3, p.Area
	for p.heating(hi, pavg, t, d).Rise > allowed {
		hi *= 2
		if hi > 1e6*p.Area {
			return 0
		}
	}
	for n := 0; n < 100 && hi-lo > 1e-12*hi; n++ {
		mid := (lo + hi) / 2
		if p.heating(mid, pavg, t, d).Rise > allowed {
			lo = mid
		} else {
			hi = mid
		}
	}
	return hi
}

// SmallBodyArea is the cooling surface assumed for a capacitor whose
// dissipation is not rated: a disc 10 mm across and 4 mm thick,
// 2·π·(5 mm)² + π·10 mm·4 mm ≈ 2.8 cm² (a round size of our own).
const SmallBodyArea = 2*math.Pi*5e-3*5e-3 + math.Pi*10e-3*4e-3

// SmallBodyRise is the still-air rise of that body at dissipation pavg (W).
func SmallBodyRise(pavg float64) float64 {
	return math.Pow(pavg*1e3/(SmallBodyArea*1e4), TempExponent)
}

// SmallBodyWarnRise is the rise of that body above which an unrated
// capacitor's dissipation is worth a warning.
const SmallBodyWarnRise = 40.0

// UnratedHeat is the finding for a capacitor that has no pmax= yet
// dissipates pavg (W, at average power) enough that a small body would
// run hot: by the still-air rule (P[mW]/A[cm²])^0.833 a 10 mm disc rises
// more than SmallBodyWarnRise (about 0.24 W). ok false when there is
// nothing to say. The rating of a capacitor is usually its current; this
// asks for the dissipation when the dielectric makes it large (a class
// II disc, a lossy part at a high current). An air or vacuum capacitor
// is no small body (its loss spreads over plates and frame): left out.
// A class I part with a current rating is left out too: its maker's irms=
// already bounds its self-heating at the loss such a dielectric has (a
// transmitting mica carrying 12 A dissipates half a watt by design); a
// class II part's loss at RF is more than a current rating allows for.
func (p *Part) UnratedHeat(pavg float64) (Finding, bool) {
	if p.Kind != circuits.Capacitor || p.pmax != nil || !(pavg > 0) || p.Dielectric == "air" || p.Dielectric == "vacuum" {
		return Finding{}, false
	}
	if p.irms != nil && p.Class != ClassCapacitor2 {
		return Finding{}, false
	}
	rise := SmallBodyRise(pavg)
	if rise <= SmallBodyWarnRise {
		return Finding{}, false
	}
	return Finding{Part: p.Name, Pos: p.Pos, Severity: "warning",
		Text: fmt.Sprintf("dissipates %s at average power and has no dissipation rating (pmax=): by the still-air rule (P[mW]/A[cm²])^0.833 a 10 mm disc would rise about %.0f K; give pmax= from its data, or use a lower-loss dielectric",
			circuits.FormatSI(pavg, "W"), rise)}, true
}
