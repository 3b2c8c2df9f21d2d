package circuits

// Draw: a DC current drawn from its node to gnd (the valve's or the
// transistor's DC current). It is open at RF: the device's RF current is
// the drive at the input port.
const Draw Kind = "draw"

func init() {
	Register(&KindSpec{
		Kind: Draw, Unit: "A", Example: "0.8A", Model: &drawModel{}, Source: true,
		Syntax: Keyword{Fields: []string{"name", "node", "value"}, Attrs: map[string]AttrSpec{}},
	})
}

type drawModel struct{}

func (*drawModel) Branches(*Element) int { return 0 }

// Stamp takes the current out of the node at DC; nothing at RF.
func (*drawModel) Stamp(e *Element, s *System, f float64) {
	if f == 0 {
		s.Source(e.A, complex(-e.Value, 0))
		s.Source(e.B, complex(e.Value, 0))
	}
}

// State: the drawn current flows from the node to gnd at DC; at RF the
// element carries nothing (linear in x: zero).
func (*drawModel) State(e *Element, s *System, x []complex128, f float64, st *PartState) {
	*st = PartState{V: nodeV(x, e.A) - nodeV(x, e.B)}
	if f == 0 {
		st.I = complex(e.Value, 0)
	}
}

func (*drawModel) LossR(*Element, float64) float64 { return 0 }
