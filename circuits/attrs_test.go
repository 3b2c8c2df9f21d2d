package circuits

import (
	"math"
	"math/cmplx"
	"os"
	"path/filepath"
	"testing"
)

// TestAttributesReadInSI: every attribute type of a full example netlist
// reads into SI base units (m, m², H, V, A, T, Hz, °C, fractions for %).
func TestAttributesReadInSI(t *testing.T) {
	path := filepath.Join("testdata", "lpf40m.net")
	src, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	nl, err := Parse(path, src)
	if err != nil {
		t.Fatal(err)
	}
	near := func(what string, got, want float64) {
		t.Helper()
		if math.Abs(got-want) > 1e-12*math.Abs(want) {
			t.Errorf("%s = %g, want %g", what, got, want)
		}
	}
	if nl.Title != "40 m lowpass, 0.1 dB Chebyshev, fc 8.5 MHz" {
		t.Errorf("title %q", nl.Title)
	}
	core := nl.Core("ring13")
	if core == nil {
		t.Fatal("no core ring13")
	}
	for key, want := range map[string]float64{"od": 13e-3, "id": 7e-3, "h": 5e-3, "al": 5e-9, "area": 9e-4} {
		v, ok := core.Attrs.Num(key)
		if !ok {
			t.Errorf("core %s= missing", key)
		}
		near("core "+key, v, want)
	}
	if w, _ := core.Attrs.Word("material"); w != "iron-mu10-ours" {
		t.Errorf("core material %q", w)
	}
	mat := nl.Materials[0]
	tmax, _ := mat.Attrs.Num("tmax")
	near("tmax", tmax, 125)
	flux := mat.Attrs["guide"].Points
	if len(flux) != 2 {
		t.Fatalf("flux points %v", flux)
	}
	near("flux V0", flux[0].V, 0.015)
	near("flux F0", flux[0].F, 1e6)
	near("flux V1", flux[1].V, 0.003)
	near("flux F1", flux[1].F, 28e6)

	l2 := nl.Component("L2")
	turns, _ := l2.Attrs.Num("turns")
	wire, _ := l2.Attrs.Num("wire")
	near("turns", turns, 16)
	near("wire", wire, 0.8e-3)
	near("L2", l2.Value, 1.28e-6)
	irms := l2.Attrs["irms"].Points
	near("L2 irms", irms[0].V, 4)
	if irms[0].F != 0 {
		t.Errorf("a constant point has frequency %g", irms[0].F)
	}
	// a wound toroid's inductance is AL·N² (common practice): 5 nH × 16²
	// = 1.28 µH, within the 5 % a hand-wound coil is adjusted to of the
	// 1.28 µH the design asks for
	al, _ := core.Attrs.Num("al")
	if lw := al * turns * turns; math.Abs(lw/l2.Value-1) > 0.05 {
		t.Errorf("AL·N² = %g H, far from the written %g H", lw, l2.Value)
	}
	c1 := nl.Component("C1")
	near("C1 irms", c1.Attrs["irms"].Points[0].V, 3)
	near("C1 irms f", c1.Attrs["irms"].Points[0].F, 10e6)
	vpk, _ := c1.Attrs.Num("vpk")
	near("vpk", vpk, 500)
	tol, _ := nl.Component("C3").Attrs.Num("tol")
	near("tol", tol, 0.05)
	esr, _ := nl.Component("C5").Attrs.Num("esr")
	near("esr", esr, 0.05)

	if len(nl.Audit) != 2 {
		t.Fatalf("%d audit lines, want 2", len(nl.Audit))
	}
	a := nl.Audit[0]
	p, _ := a.Attrs.Num("power")
	near("power", p, 100)
	near("band lo", a.Attrs["band"].Lo, 7e6)
	near("band hi", a.Attrs["band"].Hi, 7.3e6)
	if w := a.Attrs["faults"].Words; len(w) != 2 || w[0] != "open" || w[1] != "short" {
		t.Errorf("faults %v", w)
	}
	if a.Attrs["harmonics"].Raw != "single-ended" {
		t.Errorf("harmonics %q", a.Attrs["harmonics"].Raw)
	}
	want := []string{"power", "mode", "band", "swr", "phases", "faults", "harmonics"}
	if len(a.Order) != len(want) {
		t.Fatalf("order %v", a.Order)
	}
	for i := range want {
		if a.Order[i] != want[i] {
			t.Errorf("order %v, want %v", a.Order, want)
			break
		}
	}
	amb, _ := nl.Audit[1].Attrs.Num("ambient")
	near("ambient", amb, 40)

	tuner, err := Parse("t.net", []byte("port in a z=50\nport out b z=50\nresistor R a b 1\naudit load=12.5-j180,30+j40 carrier-also=14.2M,21.2MHz\n"))
	if err != nil {
		t.Fatal(err)
	}
	zs := tuner.Audit[0].Attrs["load"].Zs
	if len(zs) != 2 || zs[0] != complex(12.5, -180) || zs[1] != complex(30, 40) {
		t.Errorf("loads %v", zs)
	}
	nums := tuner.Audit[0].Attrs["carrier-also"].Nums
	if len(nums) != 2 || nums[0] != 14.2e6 || math.Abs(nums[1]-21.2e6) > 1e-3 {
		t.Errorf("carrier-also %v", nums)
	}
}

// TestNodesAndOrientation: nodes are listed in order of first use without
// gnd, and each element keeps the ends as written.
func TestNodesAndOrientation(t *testing.T) {
	nl, c := mustParse(t, "o.net", "port in x z=50\nport out y z=50\ninductor L1 y x 1u q=100\ncapacitor C1 x gnd 100p\nresistor R1 gnd y 50\n")
	if len(nl.Nodes) != 2 || nl.Nodes[0] != "y" || nl.Nodes[1] != "x" {
		t.Errorf("nodes %v, want [y x]", nl.Nodes)
	}
	e := c.Elements[0]
	if c.Nodes[e.A] != "y" || c.Nodes[e.B] != "x" {
		t.Errorf("L1 ends %d %d", e.A, e.B)
	}
	if r := c.Elements[2]; r.A != -1 {
		t.Errorf("R1 first end is ground, index %d", r.A)
	}
	// the current of L1 flows from y to x: with the source at x, V(y) − V(x)
	// and I have the sign of a current flowing x → y reversed
	res, err := c.Solve(1e6, 1, Load{Z: 50})
	if err != nil {
		t.Fatal(err)
	}
	vx, vy := res.Nodes[1], res.Nodes[0]
	ps := res.Parts[0]
	if relErr(ps.V, vy-vx) > 1e-12 {
		t.Errorf("L1 V = %v, want V(y) − V(x) = %v", ps.V, vy-vx)
	}
	// real power flows from the source at x towards the load at y, against
	// L1's written direction y → x, so the power carried by −I at x is
	// positive
	if real(vx*cmplx.Conj(-ps.I)) <= 0 {
		t.Errorf("L1 current %v does not carry power from x to y as −I", ps.I)
	}
}
