package circuits

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// fuzzSeeds are small valid and broken netlists; every testdata file is
// added as well.
var fuzzSeeds = []string{
	base,
	"port in a z=50\nport out b z=50\nresistor R a b 1\n",
	"port in a z=50\nport out b z=12.5-j180\ncapacitor C a b 100p esr=0.1\ninductor L b gnd 1u q=90@3.5M,180@10M\n",
	"port in a z=50\nport out b z=50\ninductor L1 a gnd 1u\ninductor L2 b gnd 1u\ncoupling K L1 L2 k=0.99\n",
	"port in a z=50\nport out b z=50\ncapacitor C a b 1f df=0.1%\ncapacitor D b gnd 1G\n",
	"port in a z=1e-300\nport out b z=1e300\nresistor R a b 1e-300\nresistor S b gnd 1e300\n",
	"port in a z=50\nport out b z=50\ninductor L a b 1e30 q=1e-30\ncapacitor C b gnd 1e-30 q=1e30\n",
	"title only a title\n",
	"",
	"port\n",
	"port in\n",
	"port in a z=\n",
	"capacitor C1 a\n",
	"coupling K L1 L1 k=2\n",
	"core T od=1 id=x h=\n",
	"audit band=1:0 harmonics=-30,-12 load=,, faults=open,,short\n",
	"inductor L a b 1u q=1@1,2@1\n",
	"port in a z=50 z=60\nport in a z=70\n",
	"port in a z=j\nport out b z=+j-\n",
	"title \xff\xfe\n",
	"capacitor Cµ n1 gnd 10µ q=1e400\r\nport in n1 z=50\r\n",
	"port in a z=50 # comment\n#port out b\nresistor R a gnd 5 # x=y\n",
	"clearance K a gnd gap=1mm\nport in a z=50\nport out b z=50\nconnector J a b vpk=1k irms=5\nresistor R b gnd 50 gap=2mm medium=board\n",
	"clearance K a a gap=0mm medium=\nconnector J a\nclearance K2 x y gap=1\n",
	"port in p z=1k\nport out o z=50\nsupply B h 3kV\ndraw D p 0.8A\ninductor R p h 200u rdc=2 vpk=5k\ncapacitor Cb p t 2n\ncapacitor Ct t gnd 270p\ninductor L t o 2u\ncapacitor Cl o gnd 1n\n",
	"port in a z=50\nport out b z=50\nswitch S1 a m state=closed ron=20m lon=5n coff=1p\nswitch S2 a m state=open coff=1p\ncapacitor C m gnd 100p\nresistor R m b 1\nresistor T b gnd 50\nselect P1 closed=S1 band=7M:7.3M\nselect P2 closed=S2 band=14M\n",
	"supply B gnd 1\ndraw D\nswitch S a b state=half\nselect X closed=nope band=\nselect X closed=S band=1:0\n",
	"port in a z=50\nport out b z=50\ncapacitor C a b 1n\ncapacitor D b gnd 1n\ndraw I b 1A\n",
}

// FuzzParse: Parse must never panic on any input; whatever parses must
// build, and solving it (full solve with the port load, a short and an
// open, the two-port, and the superposition split) must not panic either.
// Errors are fine; numerically extreme values may give errors or
// non-finite numbers, but never a panic.
func FuzzParse(f *testing.F) {
	for _, s := range fuzzSeeds {
		f.Add([]byte(s))
	}
	files, _ := filepath.Glob(filepath.Join("testdata", "*.net"))
	for _, name := range files {
		if b, err := os.ReadFile(name); err == nil {
			f.Add(b)
		}
	}
	f.Fuzz(func(t *testing.T, src []byte) {
		nl, err := Parse("fuzz.net", src)
		if err != nil {
			if _, ok := err.(ErrorList); !ok {
				t.Fatalf("error of type %T, want ErrorList", err)
			}
			if err.Error() == "" {
				t.Fatal("empty error text")
			}
			// one error per line, every control character escaped
			for _, e := range err.(ErrorList) {
				if msg := e.Error(); strings.ContainsAny(msg, "\n\r\x1b\x00\u202e") {
					t.Fatalf("raw control character in %q", msg)
				}
			}
			return
		}
		checkAccepted(t, nl)
		c, err := Build(nl)
		if err != nil {
			return
		}
		// the DC solution, faulted copies and switch positions never panic
		_, _ = c.SolveDC(nil)
		for _, el := range c.Elements {
			for _, short := range []bool{true, false} {
				if fc, err := c.WithFault(PartFault{Part: el.Name, Short: short}); err == nil {
					_, _ = fc.SolveDC(nil)
					_, _ = fc.Solve(7e6, 100, Load{Z: fc.Zout})
				}
			}
		}
		for _, sel := range nl.Selects {
			pc := c.WithSwitches(sel.Closed)
			_, _ = pc.SolveDC(nil)
			_, _ = pc.Solve(sel.Lo, 100, Load{Z: pc.Zout})
		}
		for _, freq := range []float64{1e6, 14.2e6} {
			if _, ck, err := c.SolveChecked(freq, 100, Load{Z: c.Zout}); err == nil && ck.OK() && ck.Balance != ck.Balance {
				t.Fatal("NaN balance passed the check")
			}
		}
		for _, freq := range []float64{1e6, 14.2e6} {
			for _, ld := range []Load{{Z: c.Zout}, Short, OpenLoad} {
				_, _ = c.Solve(freq, 100, ld)
			}
			_, _ = c.TwoPort(freq)
			s := NewSplit(c)
			if err := NewSplitWork(c).Fill(s, freq); err == nil {
				a := s.Alpha(LoadOnCircle(c.Zout, 3, 1))
				for i := range c.Elements {
					_ = s.Part(i, a, 1)
				}
				_ = s.InputPower(a)
				_ = s.MaxNodeV(a, 1)
			}
		}
	})
}

// checkAccepted asserts what a netlist that parses must never contain:
// a node spelt like ground, a node only one part touches (ports count),
// a value outside its accepted range, a coupling set that is not
// positive definite.
func checkAccepted(t *testing.T, nl *Netlist) {
	t.Helper()
	touch := map[string]int{}
	for _, c := range nl.Components {
		for _, n := range c.Terminals() {
			if groundSpelling(n) {
				t.Fatalf("%s uses node %q, spelt like ground", c.Name, n)
			}
			touch[n]++
		}
		if r, ok := valueRanges[c.Kind]; ok && c.Value != 0 && !r.Holds(c.Value) {
			t.Fatalf("%s value %g outside %s", c.Name, c.Value, r.Text())
		}
	}
	for _, p := range []*Port{nl.In, nl.Out} {
		if p != nil {
			touch[p.Node]++
		}
	}
	for _, n := range nl.Nodes {
		if touch[n] < 2 {
			t.Fatalf("node %s touched %d times", n, touch[n])
		}
	}
	if len(nl.Couplings) > 1 && !couplingsDefinite(nl.Couplings) {
		// connected sets are checked one by one; the whole set of an
		// accepted file is block diagonal in them, so it is definite too
		t.Fatalf("accepted couplings are not positive definite")
	}
}
