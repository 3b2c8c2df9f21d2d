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
		Kind: Inductor, Unit: "H", Example: "0.91u", Model: &inductorModel{},
		Syntax:  Keyword{Fields: []string{"name", "node", "node", "value"}, Attrs: withMeasured(inductorAttrs)},
		Prepare: prepareInductor,
		Check:   checkSelfResonance("cp"),
	})
}

func prepareInductor(e *Element) {
	prepareLoss(e)
	a := e.Comp.Attrs
	if v, ok := a.Num("rdc"); ok {
		e.Rdc = v
	}
	if v, ok := a.Num("cp"); ok {
		e.cp = v
	} else if srf, ok := a.Num("srf"); ok && e.Value > 0 {
		w := 2 * math.Pi * srf
		e.cp = 1 / (w * w * e.Value)
	}
}

// MinDCR is the resistance given at DC to a branch with none stated (an
// inductor without rdc= or a known winding, a closed contact without
// ron=, a shorted part): small enough to change no figure that matters,
// large enough that parallel ideal windings do not make the DC system
// singular.
const MinDCR = 1e-6

// SelfResonance is a part's self-resonant frequency from its parasitic
// (an inductor's cp, a capacitor's esl); 0 when none is given.
func (e *Element) SelfResonance() float64 {
	var lc float64
	switch {
	case e.cp > 0:
		lc = e.Value * e.cp
	case e.esl > 0:
		lc = e.Value * e.esl
	default:
		return 0
	}
	return 1 / (2 * math.Pi * math.Sqrt(lc))
}

// SelfCapacitance is an inductor's cp (0 when none).
func (e *Element) SelfCapacitance() float64 { return e.cp }

// SeriesInductance is a capacitor's esl (0 when none).
func (e *Element) SeriesInductance() float64 { return e.esl }

// checkSelfResonance refuses both a parasitic and srf= on one part.
func checkSelfResonance(key string) func(c *Component, errf func(pos Pos, want, format string, args ...any)) {
	return func(c *Component, errf func(pos Pos, want, format string, args ...any)) {
		if a, ok := c.Attrs["srf"]; ok {
			if _, both := c.Attrs[key]; both {
				errf(a.Pos, "one of "+key+"= or srf=", "%s %s gives both %s= and srf=", c.Kind, c.Name, key)
			}
		}
	}
}

type inductorModel struct{}

func (*inductorModel) Branches(*Element) int { return 1 }

func (m *inductorModel) Stamp(e *Element, s *System, f float64) {
	if f == 0 {
		// at DC the coil is its winding resistance
		s.Branch(e.A, e.B, e.Branch, complex(math.Max(e.Rdc, MinDCR), 0))
		return
	}
	// at DC the branch equation V = 0·I makes the coil a short; its
	// winding resistance is read by the DC layer when it exists
	z := m.winding(e, s, f)
	s.Branch(e.A, e.B, e.Branch, z)
	// the branch equation makes V = Z·I (a self-capacitance sits across
	// the terminals, outside the branch), and State sets λ = L(f)·I; a
	// coupled winding's mutual terms break both, and the split drops
	// them for it
	s.Fixed(e, Ratios{VPerI: modulus(z), LamPerI: math.Abs(e.Inductance(f))})
	if e.cp > 0 && f > 0 {
		// (L + R) ∥ Cp: the self-capacitance across the terminals
		s.Admit(e.A, e.B, complex(0, 2*math.Pi*f*e.cp))
	}
}

// State: I is the winding's current (flux, heat), It the terminal current
// when self-capacitance makes them differ.
func (*inductorModel) State(e *Element, s *System, x []complex128, f float64, st *PartState) {
	cur := x[e.Branch]
	v := nodeV(x, e.A) - nodeV(x, e.B)
	*st = PartState{V: v, I: cur, Lambda: complex(e.Inductance(f), 0) * cur}
	if e.cp > 0 {
		st.It = cur + complex(0, 2*math.Pi*f*e.cp)*v
	}
}

// StatePair is State for two solutions.
func (*inductorModel) StatePair(e *Element, s *System, x0, x1 []complex128, f float64, st0, st1 *PartState) {
	l := complex(e.Inductance(f), 0)
	c0, c1 := x0[e.Branch], x1[e.Branch]
	v0, v1 := nodeV(x0, e.A)-nodeV(x0, e.B), nodeV(x1, e.A)-nodeV(x1, e.B)
	*st0 = PartState{V: v0, I: c0, Lambda: l * c0}
	*st1 = PartState{V: v1, I: c1, Lambda: l * c1}
	if e.cp > 0 {
		jwc := complex(0, 2*math.Pi*f*e.cp)
		st0.It = c0 + jwc*v0
		st1.It = c1 + jwc*v1
	}
}

// winding is the inductive branch R + jωL (or the measured impedance).
func (m *inductorModel) winding(e *Element, s *System, f float64) complex128 {
	if z, ok := e.measuredZ(f); ok && f > 0 {
		return z
	}
	return complex(s.LossR(e, f), 2*math.Pi*f*e.Value)
}

func (m *inductorModel) LossR(e *Element, f float64) float64 {
	if f == 0 {
		return math.Max(e.Rdc, MinDCR)
	}
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
	"cp":     {Type: TPositive, Units: []string{"F"}, Help: "self-capacitance across the winding, e.g. 3p"},
	"srf":    {Type: TPositive, Units: []string{"Hz"}, Help: "self-resonant frequency (gives the self-capacitance), e.g. 45M"},
	"range":  {Type: TText, Help: "settings of a variable inductor lo:hi, such as 1u:25u"},
	"steps":  {Type: TText, Help: "a number of evenly spaced settings (taps), or the settings: 12 or 2u,4u,8u"},
	"gap":    gapAttr,
	"medium": mediumAttr,
	"rdc":    {Type: TPositive, Units: []string{"ohm"}, Help: "DC resistance of the winding in Ω, e.g. 0.8 (default: from wire= and turns=)"},
	"vpk":    {Type: TPositive, Units: []string{"V"}, Help: "rated peak voltage of the winding's insulation to its surroundings in V, e.g. 5k for a plate choke"},
}

// Impedance at the terminals: (R + jωL) ∥ 1/(jωCp).
func (m *inductorModel) Impedance(e *Element, f float64) complex128 {
	z := m.winding(e, nil, f)
	if e.cp > 0 && f > 0 {
		return 1 / (1/z + complex(0, 2*math.Pi*f*e.cp))
	}
	return z
}
