package circuits

import (
	"fmt"
	"math/cmplx"
	"testing"
)

// branchResistor is a test-only kind: a resistor written as its own branch
// unknown (V − R·I = 0) instead of a conductance. Registered through the
// same door as every real kind, it must give exactly what the resistor
// kind gives: the registry, branch numbering, State read-back and Split
// all work for a kind the package has never seen.
type branchResistor struct{}

func (branchResistor) Branches(*Element) int { return 1 }
func (branchResistor) Stamp(e *Element, s *System, f float64) {
	s.Branch(e.A, e.B, e.Branch, complex(e.Value, 0))
}
func (branchResistor) State(e *Element, s *System, x []complex128, f float64, st *PartState) {
	*st = PartState{V: nodeV(x, e.A) - nodeV(x, e.B), I: x[e.Branch]}
}
func (branchResistor) LossR(e *Element, f float64) float64 { return e.Value }

func TestRegisteredKindMatchesBuiltIn(t *testing.T) {
	Register(&KindSpec{Kind: "testbranchres", Unit: "ohm", Example: "50", Model: branchResistor{},
		Syntax: Keyword{Fields: []string{"name", "node", "node", "value"}, Attrs: resistorAttrs}})
	defer func() { delete(kindSpecs, "testbranchres"); delete(Keywords, "testbranchres") }()
	const body = `
port in n1 z=50
port out n3 z=50
inductor L1 n1 n2 1u q=120
%s R1 n2 n3 33
capacitor C1 n3 gnd 220p q=800
`
	_, a := mustParse(t, "a.net", fmt.Sprintf(body, "resistor"))
	_, b := mustParse(t, "b.net", fmt.Sprintf(body, "testbranchres"))
	if b.Size() != a.Size()+1 {
		t.Fatalf("branch kind adds one unknown: sizes %d and %d", a.Size(), b.Size())
	}
	for _, f := range []float64{1e6, 7.1e6, 30e6} {
		for _, l := range []Load{{Z: 50}, {Z: complex(12, -80)}, OpenLoad, Short} {
			ra, err := a.Solve(f, 100, l)
			if err != nil {
				t.Fatal(err)
			}
			rb, err := b.Solve(f, 100, l)
			if err != nil {
				t.Fatal(err)
			}
			// two exact formulations of the same network: agree to rounding
			for i := range ra.Parts {
				if d := cmplx.Abs(ra.Parts[i].I-rb.Parts[i].I) / (cmplx.Abs(ra.Parts[i].I) + 1e-12); d > 1e-9 {
					t.Errorf("f=%g load=%v part %d: current %v vs %v", f, l, i, ra.Parts[i].I, rb.Parts[i].I)
				}
			}
			if d := cmplx.Abs(ra.Zin-rb.Zin) / cmplx.Abs(ra.Zin); d > 1e-9 {
				t.Errorf("f=%g: Zin %v vs %v", f, ra.Zin, rb.Zin)
			}
		}
	}
}

func TestKindsRegistered(t *testing.T) {
	for _, k := range []Kind{Capacitor, Inductor, Resistor} {
		s := SpecOf(k)
		if s == nil || s.Model == nil {
			t.Fatalf("%s not registered", k)
		}
		if _, ok := Keywords[string(k)]; !ok {
			t.Errorf("%s has no keyword", k)
		}
	}
}
