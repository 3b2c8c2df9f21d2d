package circuits

import (
	"math"
	"math/cmplx"
	"testing"
)

// TestClearanceErrors: a clearance names nodes of the circuit; it never
// creates one, never joins two, and needs its gap.
func TestClearanceErrors(t *testing.T) {
	cases := []struct{ name, text, want string }{
		{"clearance to a new node", base + "clearance K1 n2 n9 gap=2mm\n",
			`t.net:7:17: clearance K1 names node "n9", which no part connects to (a node of the circuit that a part connects to, or gnd)`},
		{"clearance without gap", base + "clearance K1 n1 n2 medium=board\n",
			"t.net:7:1: clearance needs gap= (the clearance with a unit, e.g. 1.5mm: plate spacing of an air variable, lead or board spacing)"},
		{"gap without a unit", base + "clearance K1 n1 gnd gap=2\n",
			`t.net:7:25: bad gap=: "2" has no unit (the clearance with a unit, e.g. 1.5mm: plate spacing of an air variable, lead or board spacing)`},
		{"clearance to itself", base + "clearance K1 n1 n1 gap=2mm\n",
			"t.net:7:17: clearance K1 is connected to itself (both ends on n1) (two different nodes)"},
		// a node reached only through a clearance has no path to ground:
		// the clearance joins nothing
		{"clearance joins nothing", base + "capacitor C3 n5 n6 10p\ncapacitor C4 n5 n6 22p\nclearance K1 n5 gnd gap=1mm\n",
			"t.net:7:14: node n5 has no path to ground (every node joined to gnd through parts or a port)\n" +
				"t.net:7:17: node n6 has no path to ground (every node joined to gnd through parts or a port)"},
		{"clearance to a ground spelling", base + "clearance K1 n1 GND gap=1mm\n",
			"t.net:7:17: node GND looks like ground but is not the ground node (ground is written gnd, in lower case; give another name to a node that is not ground)"},
		{"connector without nodes", base + "connector J1 n1 vpk=500\n",
			"t.net:7:14: connector takes 3 fields before its attributes, found 2 (connector name node node key=value…)"},
	}
	for _, tc := range cases {
		_, err := Parse("t.net", []byte(tc.text))
		if err == nil {
			t.Errorf("%s: no error, want %q", tc.name, tc.want)
			continue
		}
		if err.Error() != tc.want {
			t.Errorf("%s:\n got: %s\nwant: %s", tc.name, err, tc.want)
		}
	}
	// declared before the parts that connect its nodes: still fine
	mustParse(t, "t.net", "clearance K1 n1 n2 gap=2mm medium=coated\n"+base)
}

// TestClearanceAndConnectorInTheNetwork: a clearance changes nothing in
// the solution, and a connector is a zero-length through connection:
// with both added, every part's state and the input impedance are those
// of the plain network (two exact formulations: rounding only, 1e-9).
// The clearance reads the voltage between its nodes; the connector its
// centre's voltage to ground and the current through it.
func TestClearanceAndConnectorInTheNetwork(t *testing.T) {
	plain := base
	with := `title error test
port in n0 z=50
port out n2 z=50
connector J1 n0 n1 vpk=1k irms=5
capacitor C1 n1 gnd 300p q=1000
inductor L1 n1 n2 1u q=200
capacitor C2 n2 gnd 300p q=1000
clearance K1 n1 n2 gap=1mm
`
	_, a := mustParse(t, "a.net", plain)
	_, b := mustParse(t, "b.net", with)
	idx := func(c *Circuit, name string) int {
		for i, e := range c.Elements {
			if e.Name == name {
				return i
			}
		}
		t.Fatalf("no %s", name)
		return -1
	}
	for _, f := range []float64{3.5e6, 14e6, 28e6} {
		for _, l := range []Load{{Z: 50}, {Z: complex(10, 80)}, OpenLoad, Short} {
			ra, err := a.Solve(f, 100, l)
			if err != nil {
				t.Fatal(err)
			}
			rb, err := b.Solve(f, 100, l)
			if err != nil {
				t.Fatal(err)
			}
			if d := cmplx.Abs(ra.Zin-rb.Zin) / cmplx.Abs(ra.Zin); d > 1e-9 {
				t.Errorf("f=%g %v: Zin %v, with connector and clearance %v", f, l, ra.Zin, rb.Zin)
			}
			for _, n := range []string{"C1", "L1", "C2"} {
				pa, pb := ra.Parts[idx(a, n)], rb.Parts[idx(b, n)]
				if cmplx.Abs(pa.V-pb.V) > 1e-9*(cmplx.Abs(pa.V)+1e-12) {
					t.Errorf("f=%g %v: %s V %v vs %v", f, l, n, pa.V, pb.V)
				}
			}
			k := rb.Parts[idx(b, "K1")]
			if want := rb.Parts[idx(b, "L1")].V; cmplx.Abs(k.V-want) > 1e-12*(cmplx.Abs(want)+1e-12) || k.I != 0 || k.Ploss != 0 {
				t.Errorf("f=%g %v: clearance V %v I %v P %g, want V %v across L1 and nothing else", f, l, k.V, k.I, k.Ploss, want)
			}
			j := rb.Parts[idx(b, "J1")]
			// the connector carries the input current and stands the input voltage
			if cmplx.Abs(j.I-rb.Iin) > 1e-9*cmplx.Abs(rb.Iin) || cmplx.Abs(j.V-rb.Vin) > 1e-9*cmplx.Abs(rb.Vin) || j.Ploss != 0 {
				t.Errorf("f=%g %v: connector V %v I %v, want input %v, %v", f, l, j.V, j.I, rb.Vin, rb.Iin)
			}
		}
	}
	if !math.IsNaN(real(b.Elements[idx(b, "J1")].Impedance(1e6))) {
		t.Error("a connector is not a plain impedance")
	}
}
