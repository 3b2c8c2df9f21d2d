package circuits

// Resistor: a plain conductance, its own loss.
const Resistor Kind = "resistor"

func init() {
	Register(&KindSpec{
		Kind: Resistor, Unit: "ohm", Example: "2.2k", Model: &resistorModel{},
		Syntax: Keyword{Fields: []string{"name", "node", "node", "value"}, Attrs: withMeasured(resistorAttrs)},
	})
}

type resistorModel struct{}

func (*resistorModel) Branches(*Element) int { return 0 }

func (m *resistorModel) Stamp(e *Element, s *System, f float64) {
	s.Admit(e.A, e.B, 1/m.Impedance(e, f))
}

func (m *resistorModel) State(e *Element, s *System, x []complex128, f float64, st *PartState) {
	v := nodeV(x, e.A) - nodeV(x, e.B)
	*st = PartState{V: v, I: v * recip(m.Impedance(e, f))}
}

func (m *resistorModel) LossR(e *Element, f float64) float64 { return real(m.Impedance(e, f)) }

var resistorAttrs = map[string]AttrSpec{
	"pmax":   {Type: TPositive, Units: []string{"W"}, Help: "rated dissipation in W"},
	"vpk":    {Type: TPositive, Units: []string{"V"}, Help: "maximum working peak voltage in V"},
	"tol":    {Type: TPercent, Help: "value tolerance such as 5%"},
	"gap":    gapAttr,
	"medium": mediumAttr,
}

func (*resistorModel) Impedance(e *Element, f float64) complex128 {
	if z, ok := e.measuredZ(f); ok && f > 0 {
		return z
	}
	return complex(e.Value, 0)
}
