package circuits

import "math"

// Inductor: a branch unknown carries its current, so coupling statements
// can stamp −jωM between branch rows and flux linkage is read directly.
const Inductor Kind = "inductor"

// DefaultInductorQ is the Q assumed for an inductor with no q= given: a
// middling figure for a wound toroid at HF (common practice, from memory:
// such coils measure roughly 100 to 250).
const DefaultInductorQ = 100

func init() {
	Register(&KindSpec{
		Kind: Inductor, Unit: "H", Example: "0.91u", Model: inductorModel{},
		Syntax:  Keyword{Fields: []string{"name", "node", "node", "value"}, Attrs: withMeasured(inductorAttrs)},
		Prepare: prepareLoss,
	})
}

type inductorModel struct{}

func (inductorModel) Branches(*Element) int { return 1 }

func (m inductorModel) Stamp(e *Element, s *System, f float64) {
	// at DC the branch equation V = 0·I makes the coil a short; its
	// winding resistance is read by the DC layer when it exists
	s.Branch(e.A, e.B, e.Branch, m.Impedance(e, f))
}

func (inductorModel) State(e *Element, x []complex128, f float64) PartState {
	cur := x[e.Branch]
	return PartState{V: nodeV(x, e.A) - nodeV(x, e.B), I: cur, Lambda: complex(e.Inductance(f), 0) * cur}
}

func (m inductorModel) LossR(e *Element, f float64) float64 {
	if z, ok := e.measuredZ(f); ok {
		return real(z)
	}
	return 2 * math.Pi * f * e.Value / e.Q(f)
}

// Inductance is the coil's inductance at f: its value, or for a measured
// coil Im Z/ω, so flux follows what was measured.
func (e *Element) Inductance(f float64) float64 {
	if z, ok := e.measuredZ(f); ok && f > 0 {
		return imag(z) / (2 * math.Pi * f)
	}
	return e.Value
}

var inductorAttrs = map[string]AttrSpec{
	"q":      {Type: TPoints, Help: "Q, or Q@frequency points such as 90@3.5M,180@10M"},
	"core":   {Type: TWord, Help: "the name of a core statement"},
	"turns":  {Type: TInt, Help: "number of turns, a whole number"},
	"wire":   {Type: TPositive, Units: lengthUnit, NeedUnit: true, Gauge: true, Help: "wire diameter with a unit, e.g. 0.8mm, or a gauge, e.g. 18awg"},
	"irms":   {Type: TPoints, Units: []string{"A"}, Help: "rated RMS current in A"},
	"tol":    {Type: TPercent, Help: "value tolerance such as 5%"},
	"qtol":   {Type: TPercent, Help: "Q tolerance such as 20%"},
	"range":  {Type: TText, Help: "settings of a variable inductor lo:hi, such as 1u:25u"},
	"steps":  {Type: TText, Help: "a number of evenly spaced settings (taps), or the settings: 12 or 2u,4u,8u"},
	"gap":    gapAttr,
	"medium": mediumAttr,
}

func (m inductorModel) Impedance(e *Element, f float64) complex128 {
	if z, ok := e.measuredZ(f); ok && f > 0 {
		return z
	}
	return complex(m.LossR(e, f), 2*math.Pi*f*e.Value)
}
