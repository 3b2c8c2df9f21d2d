package circuits

import (
	"math"
	"strings"
)

// Capacitor: a two-terminal admittance, C with its loss as a series
// resistance (from q=, esr= or df=, or a dielectric's typical Q).
const Capacitor Kind = "capacitor"

func init() {
	Register(&KindSpec{
		Kind: Capacitor, Unit: "F", Example: "300p", Model: &capacitorModel{},
		Syntax:  Keyword{Fields: []string{"name", "node", "node", "value"}, Attrs: withMeasured(capacitorAttrs)},
		Prepare: prepareCapacitor,
		Check:   checkSelfResonance("esl"),
	})
}

// defaultCapQ is the Q assumed for a capacitor with no q=, esr= or df=, by
// dielectric class. Figures are typical HF values from memory (common
// practice), chosen on the low side so losses are not understated.
var defaultCapQ = map[string]float64{
	"c0g": 1000, "np0": 1000, "mica": 1000, "porcelain": 2000, "film": 500,
	"glass": 1500, "air": 5000, "vacuum": 5000,
	"x7r": 40, "x5r": 40, "y5v": 15, "z5u": 15,
}

// Dielectrics are the dielectric words a capacitor's dielectric= takes,
// in any case.
var Dielectrics = []string{"c0g", "np0", "mica", "porcelain", "film", "glass", "air", "vacuum", "x7r", "x5r", "y5v", "z5u"}

// genericCapQ applies when no dielectric is named.
const genericCapQ = 500

// DefaultCapacitorQ returns the Q assumed for a capacitor of the given
// dielectric class ("" for unknown) when the netlist gives no loss figure.
func DefaultCapacitorQ(dielectric string) float64 {
	if q, ok := defaultCapQ[strings.ToLower(dielectric)]; ok {
		return q
	}
	return genericCapQ
}

func prepareCapacitor(e *Element) {
	prepareLoss(e)
	a := e.Comp.Attrs
	if v, ok := a.Num("esl"); ok {
		e.esl = v
	} else if srf, ok := a.Num("srf"); ok && e.Value > 0 {
		w := 2 * math.Pi * srf
		e.esl = 1 / (w * w * e.Value)
	}
}

type capacitorModel struct{}

func (*capacitorModel) Branches(*Element) int { return 0 }

func (m *capacitorModel) Stamp(e *Element, s *System, f float64) {
	if f == 0 {
		return // open at DC
	}
	y := recip(m.impedance(e, f, s.LossR(e, f)))
	s.Keep(e, y)
	s.Fixed(e, Ratios{IPerV: modulus(y)}) // State sets I = y·V
	s.Admit(e.A, e.B, y)
}

func (m *capacitorModel) State(e *Element, s *System, x []complex128, f float64, st *PartState) {
	v := nodeV(x, e.A) - nodeV(x, e.B)
	if f == 0 {
		*st = PartState{V: v}
		return
	}
	y, ok := s.Kept(e, f)
	if !ok {
		y = recip(m.impedance(e, f, s.LossR(e, f)))
	}
	*st = PartState{V: v, I: v * y}
}

// StatePair is State for two solutions.
func (m *capacitorModel) StatePair(e *Element, s *System, x0, x1 []complex128, f float64, st0, st1 *PartState) {
	if f == 0 {
		m.State(e, s, x0, f, st0)
		m.State(e, s, x1, f, st1)
		return
	}
	v0, v1 := nodeV(x0, e.A)-nodeV(x0, e.B), nodeV(x1, e.A)-nodeV(x1, e.B)
	y, ok := s.Kept(e, f)
	if !ok {
		y = recip(m.impedance(e, f, s.LossR(e, f)))
	}
	*st0 = PartState{V: v0, I: v0 * y}
	*st1 = PartState{V: v1, I: v1 * y}
}

func (*capacitorModel) LossR(e *Element, f float64) float64 {
	if z, ok := e.measuredZ(f); ok {
		return real(z)
	}
	w := 2 * math.Pi * f
	switch {
	case e.esr > 0:
		return e.esr / e.qScale
	case e.df > 0:
		return e.df / (w * e.Value) / e.qScale
	}
	return 1 / (w * e.Value * e.Q(f))
}

func (m *capacitorModel) Impedance(e *Element, f float64) complex128 {
	return m.impedance(e, f, m.LossR(e, f))
}

// impedance is ESR + ESL + C in series with the loss resistance r at f
// (the measured impedance for a measured part).
func (*capacitorModel) impedance(e *Element, f, r float64) complex128 {
	if z, ok := e.measuredZ(f); ok {
		return z
	}
	w := 2 * math.Pi * f
	return complex(r, w*e.esl-1/(w*e.Value))
}

// capacitorAttrs: loss and rating attributes; ratings are read by the
// ratings layer, the parser checks their syntax.
var capacitorAttrs = map[string]AttrSpec{
	"q":          {Type: TPoints, Help: "Q, or Q@frequency points such as 90@3.5M,180@10M"},
	"esr":        {Type: TPositive, Units: []string{"ohm"}, Help: "series resistance in Ω"},
	"df":         {Type: TPositive, Units: []string{"%"}, Help: "dissipation factor tan δ, e.g. 0.001 or 0.1%"},
	"vpk":        {Type: TPositive, Units: []string{"V"}, Help: "rated peak voltage in V"},
	"vrms":       {Type: TPositive, Units: []string{"V"}, Help: "rated RMS voltage in V"},
	"irms":       {Type: TPoints, Units: []string{"A"}, Help: "rated RMS current in A, optionally at a frequency: 4@10M"},
	"pmax":       {Type: TPositive, Units: []string{"W"}, Help: "rated dissipation in W"},
	"dielectric": {Type: TWord, Choices: Dielectrics, Help: "a dielectric class: c0g, np0, mica, porcelain, film, glass, air, vacuum, x7r, x5r, y5v, z5u"},
	"tol":        {Type: TPercent, Help: "value tolerance such as 5%"},
	"qtol":       {Type: TPercent, Help: "Q tolerance such as 20%"},
	"esl":        {Type: TPositive, Units: []string{"H"}, Help: "series inductance of leads and body, e.g. 5n"},
	"srf":        {Type: TPositive, Units: []string{"Hz"}, Help: "series self-resonant frequency (gives the series inductance), e.g. 120M"},
	"range":      {Type: TText, Help: "settings of a variable capacitor lo:hi, such as 20p:400p"},
	"steps":      {Type: TText, Help: "a number of evenly spaced settings, or the settings: 8 or 10p,22p,47p"},
	"gap":        gapAttr,
	"medium":     mediumAttr,
}
