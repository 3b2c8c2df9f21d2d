package circuits

// Connector: a coaxial (or any) connector in series with the line, a part
// of zero length with ratings of its own. It joins its two nodes with a
// zero-impedance branch, V(A) − V(B) = 0, whose unknown is the current
// through it. Its shell is taken to be at ground, so the voltage its
// insulation stands is that of its centre to ground: State reports that
// voltage as V (not the voltage across, which is zero) and the current
// through it as I. It dissipates nothing in this model (LossR 0), so
// V·I* is not a branch power for this kind.
const Connector Kind = "connector"

func init() {
	Register(&KindSpec{
		Kind: Connector, Model: &connectorModel{},
		Syntax: Keyword{Fields: []string{"name", "node", "node"}, Attrs: map[string]AttrSpec{
			"vpk":  {Type: TPositive, Units: []string{"V"}, Help: "rated peak voltage, centre to shell, in V"},
			"irms": {Type: TPositive, Units: []string{"A"}, Help: "rated RMS current in A at the frequencies used"},
		}},
	})
}

type connectorModel struct{}

func (*connectorModel) Branches(*Element) int { return 1 }

func (*connectorModel) Stamp(e *Element, s *System, f float64) {
	s.Branch(e.A, e.B, e.Branch, 0)
}

func (*connectorModel) State(e *Element, s *System, x []complex128, f float64, st *PartState) {
	*st = PartState{V: nodeV(x, e.A), I: x[e.Branch]}
}

func (*connectorModel) LossR(*Element, float64) float64 { return 0 }
