package circuits

// Clearance: a gap between two nodes of the circuit judged against
// breakdown (a board or wiring clearance). It carries no current and
// stamps nothing; its state is the voltage between its nodes, so the audit
// finds that voltage's worst over every case the way it does a part's.
// Its nodes must be nodes other statements connect: it adds no node and
// no connection.
const Clearance Kind = "clearance"

func init() {
	Register(&KindSpec{
		Kind: Clearance, Model: &clearanceModel{}, Observes: true,
		Syntax: Keyword{Fields: []string{"name", "node", "node"}, Attrs: map[string]AttrSpec{
			"gap":    gapAttr,
			"medium": mediumAttr,
		}, Required: []string{"gap"}},
	})
}

// gapAttr and mediumAttr are shared by every kind that may declare the
// clearance between its terminals (a capacitor's plate spacing, a part's
// lead spacing); the ratings layer reads them.
var (
	gapAttr    = AttrSpec{Type: TPositive, Units: lengthUnit, NeedUnit: true, Help: "the clearance with a unit, e.g. 1.5mm: plate spacing of an air variable, lead or board spacing"}
	mediumAttr = AttrSpec{Type: TWord, Help: "what the gap runs through: air, board or coated (default air)"}
)

type clearanceModel struct{}

func (*clearanceModel) Branches(*Element) int            { return 0 }
func (*clearanceModel) Stamp(*Element, *System, float64) {}
func (*clearanceModel) LossR(*Element, float64) float64  { return 0 }
func (*clearanceModel) State(e *Element, s *System, x []complex128, f float64, st *PartState) {
	*st = PartState{V: nodeV(x, e.A) - nodeV(x, e.B)}
}
