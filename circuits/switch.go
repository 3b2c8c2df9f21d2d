package circuits

import "math"

// Switch: a relay or switch contact. Closed it is its contact resistance
// plus its lead inductance in series (a branch unknown carries the
// current); open it is the capacitance across the open contact. The
// state is written in the netlist and changed by `select` positions.
const Switch Kind = "switch"

func init() {
	Register(&KindSpec{
		Kind: Switch, Model: &switchModel{},
		Syntax:  Keyword{Fields: []string{"name", "node", "node"}, Attrs: switchAttrs, Required: []string{"state"}},
		Prepare: prepareSwitch,
		Check:   checkSwitch,
	})
}

type switchState struct {
	open           bool
	ron, lon, coff float64
}

func prepareSwitch(e *Element) {
	a := e.Comp.Attrs
	w, _ := a.Word("state")
	e.sw.open = w == "open"
	e.sw.ron, _ = a.Num("ron")
	e.sw.lon, _ = a.Num("lon")
	e.sw.coff, _ = a.Num("coff")
}

func checkSwitch(c *Component, errf func(pos Pos, want, format string, args ...any)) {
	if a, ok := c.Attrs["state"]; ok && len(a.Words) == 1 && a.Words[0] != "open" && a.Words[0] != "closed" {
		errf(a.ValPos, "closed or open", "switch %s: unknown state %q", c.Name, a.Raw)
	}
}

// Open reports whether a switch element is open (false for other kinds).
func (e *Element) Open() bool { return e.Kind == Switch && e.sw.open }

type switchModel struct{}

func (*switchModel) Branches(e *Element) int {
	if e.sw.open {
		return 0
	}
	return 1
}

func (*switchModel) Stamp(e *Element, s *System, f float64) {
	if e.sw.open {
		if f > 0 && e.sw.coff > 0 {
			s.Admit(e.A, e.B, complex(0, 2*math.Pi*f*e.sw.coff))
		}
		return
	}
	s.Branch(e.A, e.B, e.Branch, complex(math.Max(e.sw.ron, MinDCR), 2*math.Pi*f*e.sw.lon))
}

func (*switchModel) State(e *Element, s *System, x []complex128, f float64, st *PartState) {
	v := nodeV(x, e.A) - nodeV(x, e.B)
	if e.sw.open {
		*st = PartState{V: v, I: v * complex(0, 2*math.Pi*f*e.sw.coff)}
		return
	}
	*st = PartState{V: v, I: x[e.Branch]}
}

func (*switchModel) LossR(e *Element, f float64) float64 {
	if e.sw.open {
		return 0
	}
	return e.sw.ron
}

var switchAttrs = map[string]AttrSpec{
	"state": {Type: TWord, Help: "closed or open"},
	"ron":   {Type: TPositive, Units: []string{"ohm"}, Help: "closed contact resistance in Ω, e.g. 20m"},
	"lon":   {Type: TPositive, Units: []string{"H"}, Help: "lead and contact inductance when closed, e.g. 5n"},
	"coff":  {Type: TPositive, Units: []string{"F"}, Help: "capacitance across the open contact, e.g. 1.5p"},
	"irms":  {Type: TPoints, Units: []string{"A"}, Help: "rated RF current of the closed contact and its leads in A"},
	"vpk":   {Type: TPositive, Units: []string{"V"}, Help: "rated peak voltage across the open contact in V"},
}
