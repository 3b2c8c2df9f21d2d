package circuits

import "fmt"

// FaultShortR is the resistance of a shorted part: a dead short that
// keeps the system regular when it closes a loop of other ideal branches.
const FaultShortR = 1e-6

// FaultOpenG is the conductance left across an opened part at RF (1 GΩ):
// too small to carry a current that matters, enough that a node left
// hanging by the fault follows its neighbour instead of making the system
// singular. At DC an opened part conducts nothing.
const FaultOpenG = 1e-9

// PartFault is one part failed: shorted or open.
type PartFault struct {
	Part  string
	Short bool
}

func (f PartFault) String() string {
	if f.Short {
		return f.Part + " shorted"
	}
	return f.Part + " open"
}

type shortModel struct{}

func (*shortModel) Branches(*Element) int { return 1 }
func (*shortModel) Stamp(e *Element, s *System, f float64) {
	s.Branch(e.A, e.B, e.Branch, FaultShortR)
}
func (*shortModel) State(e *Element, s *System, x []complex128, f float64, st *PartState) {
	*st = PartState{V: nodeV(x, e.A) - nodeV(x, e.B), I: x[e.Branch]}
}
func (*shortModel) LossR(*Element, float64) float64 { return 0 }

type openModel struct{}

func (*openModel) Branches(*Element) int { return 0 }
func (*openModel) Stamp(e *Element, s *System, f float64) {
	if f > 0 {
		s.Admit(e.A, e.B, FaultOpenG)
	}
}
func (*openModel) State(e *Element, s *System, x []complex128, f float64, st *PartState) {
	v := nodeV(x, e.A) - nodeV(x, e.B)
	if f == 0 {
		*st = PartState{V: v}
		return
	}
	*st = PartState{V: v, I: v * FaultOpenG}
}
func (*openModel) LossR(*Element, float64) float64 { return 0 }

// Index returns the element index of the part called name (−1 if none).
func (c *Circuit) Index(name string) int {
	if i, ok := c.byName[name]; ok {
		return i
	}
	return -1
}

// WithFault returns a copy of c with one part shorted (between its first
// two terminals) or open. Couplings to a failed inductor are dropped.
func (c *Circuit) WithFault(pf PartFault) (*Circuit, error) {
	i := c.Index(pf.Part)
	if i < 0 {
		return nil, fmt.Errorf("no part %s to fail", pf.Part)
	}
	d := c.copyElements()
	if pf.Short {
		d.Elements[i].Model = &shortModel{}
	} else {
		d.Elements[i].Model = &openModel{}
	}
	d.mutuals = nil
	for _, mu := range c.mutuals {
		if mu.i != i && mu.j != i {
			d.mutuals = append(d.mutuals, mu)
		}
	}
	d.renumber()
	return d, nil
}

// WithSwitches returns a copy of c with the named switches closed and
// every other switch open: one position of a switched bank.
func (c *Circuit) WithSwitches(closed []string) *Circuit {
	d := c.copyElements()
	on := map[string]bool{}
	for _, n := range closed {
		on[n] = true
	}
	for i := range d.Elements {
		if e := &d.Elements[i]; e.Kind == Switch {
			e.sw.open = !on[e.Name]
		}
	}
	d.renumber()
	return d
}

func (c *Circuit) copyElements() *Circuit {
	d := *c
	d.Elements = make([]Element, len(c.Elements))
	copy(d.Elements, c.Elements)
	return &d
}

// renumber hands out branch unknowns again after models or states
// changed.
func (c *Circuit) renumber() {
	next := len(c.Nodes)
	for i := range c.Elements {
		e := &c.Elements[i]
		e.Branch = -1
		if nb := e.Model.Branches(e); nb > 0 {
			e.Branch = next
			next += nb
		}
	}
	c.nBranch = next - len(c.Nodes)
}
