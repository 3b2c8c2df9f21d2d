package circuits

import (
	"math"
	"math/cmplx"
	"strconv"
	"strings"
	"testing"
)

// A DC-only network solved by hand with Ohm's and Kirchhoff's laws:
//
//	supply 100 V at n1; R1 1 kΩ n1–n2; R2 3 kΩ n2–gnd; draw 10 mA at n2;
//	L1 (rdc 5 Ω) n2–n3 and R3 495 Ω n3–gnd, i.e. 500 Ω from n2 to gnd.
//
// Node n2: (100 − V2)/1000 = V2/3000 + V2/500 + 0.01, so
// 0.09 = V2·(1 + 0.333… + 2)/1000 → V2 = 27 V; I(L1) = 27/500 = 54 mA,
// V3 = 0.054·495 = 26.73 V. n4 hangs on C1 with R4 to gnd: 0 V. n5 sits
// between two capacitors: no DC path, 0 V.
const dcNet = `
port in n3 z=50
port out n4 z=50
supply B1 n1 100V
resistor R1 n1 n2 1k
resistor R2 n2 gnd 3k
draw D1 n2 10mA
inductor L1 n2 n3 10u rdc=5
resistor R3 n3 gnd 495
capacitor C1 n3 n4 1n
resistor R4 n4 gnd 100
capacitor C2 n3 n5 1n
capacitor C3 n5 gnd 1n
`

func TestDCOhmsLaw(t *testing.T) {
	_, c := mustParse(t, "dc.net", dcNet)
	dc, err := c.SolveDC(nil)
	if err != nil {
		t.Fatal(err)
	}
	if !dc.Any || len(dc.Unfed) != 0 {
		t.Fatalf("DC solution: any=%v unfed=%v", dc.Any, dc.Unfed)
	}
	node := func(n string) float64 {
		for i, m := range c.Nodes {
			if m == n {
				return dc.Nodes[i]
			}
		}
		t.Fatalf("no node %s", n)
		return 0
	}
	part := func(n string) PartState { return dc.Parts[c.Index(n)] }
	// exact hand values; 1e-9 relative covers rounding in the LU solve
	for _, ck := range []struct {
		what      string
		got, want float64
	}{
		{"V(n1)", node("n1"), 100},
		{"V(n2)", node("n2"), 27},
		{"V(n3)", node("n3"), 26.73},
		{"V(n4)", node("n4"), 0},
		{"V(n5)", node("n5"), 0},
		{"I(R1)", real(part("R1").I), 0.073},
		{"I(L1)", real(part("L1").I), 0.054},
		{"V(L1)", real(part("L1").V), 0.27},
		{"V(C1)", real(part("C1").V), 26.73},
		{"I(C1)", real(part("C1").I), 0},
		{"λ(L1)", real(part("L1").Lambda), 10e-6 * 0.054},
		{"P(R1)", dc.P[c.Index("R1")], 0.073 * 0.073 * 1000},
		{"P(L1)", dc.P[c.Index("L1")], 0.054 * 0.054 * 5},
		{"supply current", -real(part("B1").I), 0.073},
	} {
		if math.Abs(ck.got-ck.want) > 1e-9*math.Max(1, math.Abs(ck.want)) {
			t.Errorf("%s = %.12g, hand value %.12g", ck.what, ck.got, ck.want)
		}
	}
}

// The winding resistance handed in by the stress layer stands in when
// the netlist gives no rdc=: with 45 Ω more in the 500 Ω leg the leg is
// 545 Ω: 0.09 = V2·(1/3000 + 1/545) + V2/1000 … solved by hand below.
func TestDCWindingResistance(t *testing.T) {
	_, c := mustParse(t, "dc.net", strings.Replace(dcNet, "rdc=5", "", 1))
	rdc := make([]float64, len(c.Elements))
	rdc[c.Index("L1")] = 50
	dc, err := c.SolveDC(rdc)
	if err != nil {
		t.Fatal(err)
	}
	// leg 545 Ω: V2 = 0.09/(1/1000 + 1/3000 + 1/545)
	want := 0.09 / (1.0/1000 + 1.0/3000 + 1.0/545)
	if got := real(dc.Parts[c.Index("R2")].V); math.Abs(got-want) > 1e-9*want {
		t.Errorf("V(n2) = %.10g, want %.10g", got, want)
	}
}

// A draw with no DC path to a supply is reported, not solved into an
// absurd voltage.
func TestDCUnfedDraw(t *testing.T) {
	_, c := mustParse(t, "u.net", `
port in n1 z=50
port out n2 z=50
capacitor C1 n1 n2 1n
capacitor C2 n2 gnd 1n
draw D1 n2 1A
`)
	dc, err := c.SolveDC(nil)
	if err != nil {
		t.Fatal(err)
	}
	if len(dc.Unfed) != 1 || dc.Unfed[0] != "n2" || dc.UnfedError() == nil {
		t.Fatalf("unfed = %v", dc.Unfed)
	}
}

// At RF a supply is a short to gnd (bypassed) and a draw is open: the
// network with them solves like the same network with the supply node
// grounded through a dead short.
func TestSupplyIsRFShort(t *testing.T) {
	_, a := mustParse(t, "a.net", `
port in n1 z=50
port out n3 z=50
inductor L1 n1 n2 1u q=100
resistor R1 n2 n3 33
inductor L2 n2 nb 20u q=100
supply B1 nb 3kV
draw D1 n1 0.5A
capacitor C1 n3 gnd 220p q=800
`)
	_, b := mustParse(t, "b.net", `
port in n1 z=50
port out n3 z=50
inductor L1 n1 n2 1u q=100
resistor R1 n2 n3 33
inductor L2 n2 gnd 20u q=100
capacitor C1 n3 gnd 220p q=800
`)
	for _, f := range []float64{1.8e6, 7.1e6, 28e6} {
		ra, err := a.Solve(f, 100, Load{Z: 50})
		if err != nil {
			t.Fatal(err)
		}
		rb, err := b.Solve(f, 100, Load{Z: 50})
		if err != nil {
			t.Fatal(err)
		}
		for _, n := range []string{"L1", "R1", "L2", "C1"} {
			ia, ib := ra.Parts[a.Index(n)].I, rb.Parts[b.Index(n)].I
			// the same network twice: agree to rounding
			if cmplx.Abs(ia-ib) > 1e-9*cmplx.Abs(ib) {
				t.Errorf("%g Hz %s: %v vs %v", f, n, ia, ib)
			}
		}
		if v := ra.Nodes[3]; a.Nodes[3] != "nb" || cmplx.Abs(v) > 1e-12 {
			t.Errorf("supply node carries RF %v", v)
		}
		if i := ra.Parts[a.Index("D1")].I; i != 0 {
			t.Errorf("draw carries RF %v", i)
		}
	}
}

// A closed switch is ron + jω·lon in series, an open one jω·coff across
// the contact: the currents read back equal V/Z of those closed forms.
func TestSwitchStates(t *testing.T) {
	const body = `
port in n1 z=50
port out n2 z=50
switch S1 n1 n2 state=%s ron=20m lon=5n coff=1.5p
resistor R1 n2 gnd 50
`
	for _, st := range []string{"closed", "open"} {
		_, c := mustParse(t, st+".net", strings.Replace(body, "%s", st, 1))
		f := 14.2e6
		r, err := c.Solve(f, 100, Load{Z: 50})
		if err != nil {
			t.Fatal(err)
		}
		p := r.Parts[c.Index("S1")]
		w := 2 * math.Pi * f
		z := complex(0.02, w*5e-9)
		if st == "open" {
			z = 1 / complex(0, w*1.5e-12)
		}
		// the contact's voltage is the difference of its node voltages
		if d := cmplx.Abs(p.V - (r.Nodes[0] - r.Nodes[1])); d > 1e-12*cmplx.Abs(p.V) {
			t.Errorf("%s: V %v is not V(n1)−V(n2)", st, p.V)
		}
		if e := relErr(p.I, p.V/z); e > 1e-9 {
			t.Errorf("%s: I %v, V/Z %v", st, p.I, p.V/z)
		}
		if c.Elements[c.Index("S1")].Open() != (st == "open") {
			t.Errorf("%s: Open() wrong", st)
		}
	}
}

// A shorted part joins its nodes: a lowpass with its series coil shorted
// equals the netlist written with the coil's nodes merged.
func TestFaultShortMergesNodes(t *testing.T) {
	_, a := mustParse(t, "a.net", `
port in n1 z=50
port out n3 z=50
capacitor C1 n1 gnd 470p q=1000
inductor L1 n1 n3 1.2u q=150
capacitor C2 n3 gnd 470p q=1000
resistor R1 n3 gnd 1k
`)
	_, b := mustParse(t, "b.net", `
port in n1 z=50
port out n1b z=50
capacitor C1 n1 gnd 470p q=1000
resistor Rx n1 n1b 1u
capacitor C2 n1b gnd 470p q=1000
resistor R1 n1b gnd 1k
`)
	fa, err := a.WithFault(PartFault{Part: "L1", Short: true})
	if err != nil {
		t.Fatal(err)
	}
	f := 7.1e6
	ra, err := fa.Solve(f, 100, Load{Z: 50})
	if err != nil {
		t.Fatal(err)
	}
	rb, err := b.Solve(f, 100, Load{Z: 50})
	if err != nil {
		t.Fatal(err)
	}
	// 1 µΩ in both: the same network. 1e-7: the reference writes the
	// short as a 1 MS conductance beside admittances of about 0.02 S,
	// which costs the solve about eight digits of conditioning
	for _, n := range []string{"C1", "C2", "R1"} {
		if e := relErr(ra.Parts[fa.Index(n)].V, rb.Parts[b.Index(n)].V); e > 1e-7 {
			t.Errorf("%s: %v vs %v", n, ra.Parts[fa.Index(n)].V, rb.Parts[b.Index(n)].V)
		}
	}
	if _, err := a.WithFault(PartFault{Part: "nope"}); err == nil {
		t.Error("unknown part accepted")
	}
}

// An open shunt capacitor in a lowpass lets more of a harmonic through:
// the 5-pole 0.1 dB Chebyshev (Matthaei, Young & Jones 1964, sec. 4.05)
// with its middle capacitor open passes the 3rd harmonic as the ABCD
// cascade of the filter without that capacitor says (Pozar, Microwave
// Engineering, ch. 4), and more than the intact filter.
func TestOpenShuntCapacitorRaisesHarmonic(t *testing.T) {
	g := chebyshevG(5, 0.1)
	const fc, r0 = 9e6, 50.0
	wc := 2 * math.Pi * fc
	c1, l2, c3 := g[0]/(wc*r0), g[1]*r0/wc, g[2]/(wc*r0)
	src := "port in n1 z=50\nport out n3 z=50\n" +
		"capacitor C1 n1 gnd " + ftoa(c1) + " q=1000\n" +
		"inductor L2 n1 n2 " + ftoa(l2) + " q=200\n" +
		"capacitor C3 n2 gnd " + ftoa(c3) + " q=1000\n" +
		"inductor L4 n2 n3 " + ftoa(l2) + " q=200\n" +
		"capacitor C5 n3 gnd " + ftoa(c1) + " q=1000\n"
	_, c := mustParse(t, "lpf.net", src)
	open, err := c.WithFault(PartFault{Part: "C3"})
	if err != nil {
		t.Fatal(err)
	}
	f := 3 * 7.1e6
	shuntC := func(v float64) abcd { return shuntY(1 / refCapacitorZ(v, lossModel{q: 1000}, f)) }
	ind := func(v float64) abcd { return seriesZ(refInductorZ(v, lossModel{q: 200}, f)) }
	ref := shuntC(c1).then(ind(l2)).then(ind(l2)).then(shuntC(c1)).s21Pozar(r0)
	intact := shuntC(c1).then(ind(l2)).then(shuntC(c3)).then(ind(l2)).then(shuntC(c1)).s21Pozar(r0)
	sp, err := open.TwoPort(f)
	if err != nil {
		t.Fatal(err)
	}
	// 1e-6: the opened part keeps 1 GΩ across it, about 1e-7 of the
	// impedances around it
	if e := relErr(sp.S21, ref); e > 1e-6 {
		t.Errorf("S21 at the 3rd harmonic with C3 open %v, ABCD without C3 %v", sp.S21, ref)
	}
	if cmplx.Abs(sp.S21) <= 2*cmplx.Abs(intact) {
		t.Errorf("an open C3 should pass much more 3rd harmonic: |S21| %g open, %g intact", cmplx.Abs(sp.S21), cmplx.Abs(intact))
	}
	t.Logf("3rd harmonic |S21|: intact %.1f dB, C3 open %.1f dB", DB(intact), DB(sp.S21))
}

func ftoa(v float64) string { return strconv.FormatFloat(v, 'g', 12, 64) }
