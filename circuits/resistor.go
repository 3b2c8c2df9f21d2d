package circuits

// Resistor: a plain conductance, its own loss.
const Resistor Kind = "resistor"

func init() {
	Register(&KindSpec{
		Kind: Resistor, Unit: "ohm", Example: "2.2k", Model: resistorModel{},
		Syntax: Keyword{Fields: []string{"name", "node", "node", "value"}, Attrs: resistorAttrs},
	})
}

type resistorModel struct{}

func (resistorModel) Branches(*Element) int { return 0 }

func (resistorModel) Stamp(e *Element, s *System, f float64) {
	s.Admit(e.A, e.B, complex(1/e.Value, 0))
}

func (resistorModel) State(e *Element, x []complex128, f float64) PartState {
	v := nodeV(x, e.A) - nodeV(x, e.B)
	return PartState{V: v, I: v / complex(e.Value, 0)}
}

func (resistorModel) LossR(e *Element, f float64) float64 { return e.Value }

var resistorAttrs = map[string]AttrSpec{
	"pmax": {Type: TPositive, Units: []string{"W"}, Help: "rated dissipation in W"},
	"vpk":  {Type: TPositive, Units: []string{"V"}, Help: "maximum working peak voltage in V"},
	"tol":  {Type: TPercent, Help: "value tolerance such as 5%"},
}

func (resistorModel) Impedance(e *Element, f float64) complex128 { return complex(e.Value, 0) }
