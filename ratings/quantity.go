// Package ratings holds the physics of limits: what each part of a filter
// may carry at a frequency, derated by a profile, and how a stress compares
// with it. It reads the rating attributes of a parsed netlist (vpk=, irms=,
// core=, turns=, wire= …), core geometry and core materials.
//
// Every table of numbers here (material guide flux, derating factors, wire
// heat flux) is ours: common practice recalled from memory, in the spirit of
// NASA EEE-INST-002 and ECSS-Q-ST-30-11 but not copied from them. See
// docs/ratings.md.
package ratings

import (
	"math"
	"strconv"
	"strings"

	"rfstress/circuits"
)

// Quantity names one kind of stress.
type Quantity string

// The stresses a part may be judged on.
const (
	Vpk   Quantity = "vpk"   // peak voltage across the part, V
	Vrms  Quantity = "vrms"  // RMS voltage across the part, V
	Irms  Quantity = "irms"  // RMS current through the part, A
	Pdiss Quantity = "pdiss" // dissipation, W
	Bpk   Quantity = "bpk"   // peak flux density in the core at PEP, T: against saturation
	Bavg  Quantity = "bavg"  // peak flux density at average power, T: against the heating guide (advice)
	Temp  Quantity = "temp"  // absolute temperature of the wound core, °C
	Jrms  Quantity = "jrms"  // RMS current density on the wire's conducting area, A/m²
	// Pm is a line's dissipation per metre at its hottest point, W/m.
	Pm  Quantity = "pm"
	Arc Quantity = "arc" // peak voltage across a clearance (gap=, clearance statement), V
)

// Quantities lists every quantity in report order.
var Quantities = []Quantity{Vpk, Vrms, Irms, Pdiss, Bpk, Bavg, Temp, Jrms, Pm, Arc}

const nQuantities = 10

// index is q's position in Quantities (−1: not a quantity).
func (q Quantity) index() int {
	switch q {
	case Vpk:
		return 0
	case Vrms:
		return 1
	case Irms:
		return 2
	case Pdiss:
		return 3
	case Bpk:
		return 4
	case Bavg:
		return 5
	case Temp:
		return 6
	case Jrms:
		return 7
	case Pm:
		return 8
	case Arc:
		return 9
	}
	return -1
}

// Unit is the SI unit a quantity is measured in.
func (q Quantity) Unit() string {
	switch q {
	case Vpk, Vrms, Arc:
		return "V"
	case Irms:
		return "A"
	case Pdiss:
		return "W"
	case Bpk, Bavg:
		return "T"
	case Temp:
		return "°C"
	case Jrms:
		return "A/m²"
	case Pm:
		return "W/m"
	}
	return ""
}

// Limit is the rating of one quantity of one part at one frequency.
type Limit struct {
	Quantity Quantity
	Abs      float64 // absolute rating in SI (0: unrated)
	Derated  float64 // Abs × Factor; for Temp the derated temperature Tmax − margin, °C
	Factor   float64 // the derating factor used; for Temp Derated/Abs, for reading only
	Basis    string  // where the limit comes from, for people
	// Advice marks a guide rather than a rating: exceeding it is at most
	// marginal, and it never sets the safe power.
	Advice bool
}

// Verdict is the outcome of judging a stress against a limit. The order is
// the severity order, so the worst of several is their maximum.
type Verdict int

// Verdicts from best to worst.
const (
	OK Verdict = iota
	Unrated
	Marginal
	Fail
)

func (v Verdict) String() string {
	switch v {
	case OK:
		return "ok"
	case Unrated:
		return "unrated"
	case Marginal:
		return "marginal"
	case Fail:
		return "fail"
	}
	return "verdict(" + strconv.Itoa(int(v)) + ")"
}

// Judge compares a stress with a limit: ok up to the derated value,
// marginal up to the absolute rating, fail above it; a guide (Advice) is
// marginal at worst. A part with no rating
// (Abs 0) that carries any stress is unrated. A stress that is not a number
// fails, so a broken computation is never passed as safe.
func Judge(stress float64, l Limit) Verdict {
	if math.IsNaN(stress) {
		return Fail
	}
	if l.Abs <= 0 || math.IsNaN(l.Abs) {
		if stress > 0 {
			return Unrated
		}
		return OK
	}
	switch {
	case stress <= l.Derated:
		return OK
	case stress <= l.Abs || l.Advice:
		return Marginal
	}
	return Fail
}

// Rating steps to buy to. Voltages are the usual capacitor working-voltage
// series (common practice). Currents are the R10 preferred numbers of ISO 3,
// the series IEC 60059 uses for rated currents. Powers are the usual resistor
// wattages (common practice).
var (
	voltSteps  = []float64{1, 1.6, 2.5, 4, 6.3, 10, 16, 25, 35, 50, 63, 100, 160, 200, 250, 300, 400, 500, 630}
	voltDecade = []float64{1000, 1500, 2000, 2500, 3000, 4000, 5000, 6000, 7500} // repeats ×10
	ampDecade  = []float64{1, 1.25, 1.6, 2, 2.5, 3.15, 4, 5, 6.3, 8}             // R10, any decade
	wattSteps  = []float64{0.05, 0.063, 0.1, 0.125, 0.25, 0.5, 0.75, 1, 2, 3, 5, 7, 10, 15, 20, 25, 50}
	wattDecade = []float64{100, 150, 200, 250, 500} // repeats ×10
)

// stepUp returns the smallest step ≥ x from a list that continues with a
// decade pattern repeated ×10 without end.
func stepUp(x float64, low, decade []float64) float64 {
	for _, s := range low {
		if s >= x {
			return s
		}
	}
	for scale := 1.0; scale < 1e300; scale *= 10 {
		for _, s := range decade {
			if s*scale >= x {
				return s * scale
			}
		}
	}
	return math.Inf(1)
}

// ampStep rounds a current up to the R10 series in whatever decade it falls.
func ampStep(x float64) float64 {
	if x <= 0 {
		return ampDecade[0]
	}
	scale := math.Pow(10, math.Floor(math.Log10(x)))
	for _, k := range []float64{1, 10} {
		for _, s := range ampDecade {
			// a small tolerance keeps 2.0000000001 from jumping to 2.5
			if s*scale*k >= x*(1-1e-12) {
				return s * scale * k
			}
		}
	}
	return 10 * scale
}

// BuyRating is the part rating to buy so that stress stays within the
// derating factor: stress/factor rounded up to the next common rating step.
// It never returns less than stress/factor. For flux, temperature and
// current density there is nothing to buy; the value is 0 and the text
// says what must change (Part.Remedy gives figures for a given part).
func BuyRating(q Quantity, stress, factor float64) (value float64, text string) {
	if math.IsNaN(stress) || math.IsInf(stress, 0) || stress < 0 {
		return 0, "—"
	}
	if !(factor > 0 && factor <= 1) {
		factor = 1
	}
	need := stress / factor
	switch q {
	case Vpk:
		value = stepUp(need, voltSteps, voltDecade)
		return value, "rated ≥ " + formatStep(value, "V") + " peak"
	case Vrms:
		value = stepUp(need, voltSteps, voltDecade)
		return value, "rated ≥ " + formatStep(value, "V") + " RMS"
	case Irms:
		value = ampStep(need)
		return value, "rated ≥ " + formatStep(value, "A") + " RMS"
	case Pdiss:
		value = stepUp(need, wattSteps, wattDecade)
		return value, "rated ≥ " + formatStep(value, "W")
	case Bpk:
		return 0, "peak flux " + circuits.FormatSI(stress, "T") + ": a larger core (Ae·le) or lower permeability at the same inductance"
	case Bavg:
		return 0, "flux at average power " + circuits.FormatSI(stress, "T") + " above the heating guide: a larger core, or check the winding warm after a low-power run"
	case Temp:
		return 0, "core at " + strconv.FormatFloat(stress, 'f', 0, 64) + " °C: more cooling surface, less loss, or a material rated hotter"
	case Jrms:
		return 0, "current density " + formatDensity(stress) + ": thicker wire (or stranded/strip conductor)"
	case Pm:
		return 0, "hottest metre dissipates " + circuits.FormatSI(stress, "W/m") + ": a line of lower loss or higher power rating, or a lower SWR on it"
	case Arc:
		return 0, "peak " + circuits.FormatSI(stress, "V") + " across the gap: a wider gap (Part.Remedy gives the figure)"
	}
	return 0, "—"
}

// formatStep writes a rating with an SI prefix and no padding zeros:
// 2500 V → "2.5 kV", 0.125 W → "125 mW".
func formatStep(v float64, unit string) string {
	type pf struct {
		f float64
		p string
	}
	for _, t := range []pf{{1e9, "G"}, {1e6, "M"}, {1e3, "k"}, {1, ""}, {1e-3, "m"}, {1e-6, "µ"}} {
		if v >= t.f*(1-1e-12) {
			return strconv.FormatFloat(roundSig(v/t.f, 6), 'f', -1, 64) + " " + t.p + unit
		}
	}
	return strconv.FormatFloat(v, 'g', 3, 64) + " " + unit
}

func roundSig(x float64, n int) float64 {
	if x == 0 || math.IsInf(x, 0) || math.IsNaN(x) {
		return x
	}
	p := math.Pow(10, float64(n)-math.Ceil(math.Log10(math.Abs(x))))
	return math.Round(x*p) / p
}

// formatDensity writes a current density in the trade's A/mm².
func formatDensity(j float64) string {
	return strings.TrimSpace(strconv.FormatFloat(roundSig(j*1e-6, 3), 'f', -1, 64)) + " A/mm²"
}
