package circuits

// Supply: a DC voltage source from its node to gnd (a valve's plate
// supply, a transistor's collector supply). At RF it is a short to gnd:
// a supply is bypassed, and its bypass capacitors are taken as ideal.
const Supply Kind = "supply"

func init() {
	Register(&KindSpec{
		Kind: Supply, Unit: "V", Example: "3kV", Model: &supplyModel{}, Source: true,
		Syntax: Keyword{Fields: []string{"name", "node", "value"}, Attrs: map[string]AttrSpec{}},
	})
}

type supplyModel struct{}

// Branches: the source current is its own unknown.
func (*supplyModel) Branches(*Element) int { return 1 }

// Stamp writes V(node) = Vdc at DC and V(node) = 0 at RF.
func (*supplyModel) Stamp(e *Element, s *System, f float64) {
	s.Branch(e.A, e.B, e.Branch, 0)
	if f == 0 {
		s.Source(e.Branch, complex(e.Value, 0))
	}
}

// State: I is the current from the node into the supply (negative while
// it delivers power).
func (*supplyModel) State(e *Element, s *System, x []complex128, f float64, st *PartState) {
	*st = PartState{V: nodeV(x, e.A) - nodeV(x, e.B), I: x[e.Branch]}
}

func (*supplyModel) LossR(*Element, float64) float64 { return 0 }
