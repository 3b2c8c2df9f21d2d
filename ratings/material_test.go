package ratings

import (
	"math"
	"strings"
	"testing"

	"rfstress/circuits"
)

func TestBuiltinMaterials(t *testing.T) {
	b := Builtin()
	for _, name := range []string{"iron-mu7", "iron-mu10", "iron-mu20", "iron-mu35", "nizn-mu40", "nizn-mu125", "mnzn-mu850", "mnzn-mu2000", "air"} {
		m, ok := b[name]
		if !ok {
			t.Fatalf("no built-in %s", name)
		}
		if !m.Builtin || m.Note == "" {
			t.Errorf("%s: builtin %v note %q", name, m.Builtin, m.Note)
		}
		if m.Class == "air" {
			if len(m.Flux) != 0 || m.Mu != 1 {
				t.Errorf("air has a flux limit or µ ≠ 1")
			}
			continue
		}
		// Guide flux falls with frequency for every magnetic material
		// (core loss rises with f: Steinmetz P ∝ f^α·B^β, α > 1).
		prev := math.Inf(1)
		for _, f := range []float64{1e6, 3.5e6, 7e6, 14e6, 28e6} {
			g := m.GuideFlux(f)
			if !(g > 0 && g <= prev) {
				t.Errorf("%s: guide %g T at %g Hz after %g", name, g, f, prev)
			}
			prev = g
		}
		if m.Tmax <= 0 {
			t.Errorf("%s: no tmax", name)
		}
	}
	// Powdered iron guide (REFERENCES, common practice, from memory): roughly
	// 15 mT near 1 MHz, 3 mT near 28 MHz.
	if g := b["iron-mu10"].GuideFlux(1e6); g != 15e-3 {
		t.Errorf("iron-mu10 at 1 MHz: %g", g)
	}
	if g := b["iron-mu10"].GuideFlux(28e6); math.Abs(g-3e-3) > 1e-15 {
		t.Errorf("iron-mu10 at 28 MHz: %g", g)
	}
	// Copies: changing one does not change the next.
	b["iron-mu10"].Flux[0].V = 1
	if Builtin()["iron-mu10"].Flux[0].V == 1 {
		t.Error("Builtin hands out shared points")
	}
}

func TestLoadMaterials(t *testing.T) {
	src := `# shop materials
material red class=iron mu=9 tmax=120C flux=12mT@1M,2.5mT@30M note=red_iron  # ours
material Blue class=NiZn mu=100

material x class=iron flux=5mT
`
	mats, err := LoadMaterials("shop.mat", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	if len(mats) != 3 {
		t.Fatalf("%d materials", len(mats))
	}
	red := mats["red"]
	if red.Class != "iron" || red.Mu != 9 || red.Tmax != 120 || red.Note != "red iron" || red.Builtin {
		t.Errorf("red: %+v", red)
	}
	if red.Pos.String() != "shop.mat:2:10" {
		t.Errorf("red defined at %s", red.Pos)
	}
	blue := mats["Blue"]
	// Class words are case-insensitive; a missing guide and tmax come from
	// the class's built-in material.
	if blue.Class != "nizn" || !blue.FluxFromClass || blue.Tmax != Builtin()["nizn-mu125"].Tmax {
		t.Errorf("Blue: %+v", blue)
	}
	if x := mats["x"]; x.GuideFlux(1e6) != 5e-3 || x.GuideFlux(30e6) != 5e-3 {
		t.Error("a single flux value should hold at every frequency")
	}
	// The caller merges over the built-ins; a netlist core finds them.
	all := MergeMaterials(Builtin(), mats)
	net := `port in a z=50
port out b z=50
core c od=12.7mm id=7.7mm h=4.8mm material=blue
inductor L a b 1u core=c turns=8
`
	nl, err := circuits.Parse("n.net", []byte(net))
	if err != nil {
		t.Fatal(err)
	}
	s, err := Prepare(nl, all, nil)
	if err != nil {
		t.Fatal(err)
	}
	if s.Parts["L"].Core.Material != blue || s.Parts["L"].Core.Mu != 100 {
		t.Errorf("core material %+v", s.Parts["L"].Core.Material)
	}
}

func TestLoadMaterialsErrors(t *testing.T) {
	src := "material a class=wood\n" +
		"port in n1 z=50\n" +
		"material b class=iron flux=15@1M\n" +
		"material c class=air flux=1mT\n" +
		"material d class=iron tmax=-5C\n" +
		"material e klass=iron\n" +
		"material a class=iron\n"
	_, err := LoadMaterials("m.txt", []byte(src))
	el, ok := err.(circuits.ErrorList)
	if !ok {
		t.Fatalf("want ErrorList, got %T %v", err, err)
	}
	// line:col counted by hand in src above
	want := []string{
		"m.txt:1:18: unknown material class \"wood\"",
		"m.txt:2:1: \"port\" has no place in a materials file",
		"m.txt:3:28: flux 15 T is far above",
		"m.txt:4:27: flux= given for an air material",
		"m.txt:5:28: tmax=-5C is out of range",
		"m.txt:6:12: unknown attribute \"klass\"",
		"m.txt:7:10: material a is already defined at line 1",
	}
	got := el.Error()
	for _, w := range want {
		if !strings.Contains(got, w) {
			t.Errorf("missing %q in:\n%s", w, got)
		}
	}
	for _, e := range el {
		if e.Pos.File != "m.txt" || e.Pos.Line < 1 || e.Pos.Line > 7 {
			t.Errorf("error outside the file: %v", e)
		}
	}
}

func TestNetlistMaterialOverridesBuiltin(t *testing.T) {
	net := `port in a z=50
port out b z=50
material iron-mu10 class=iron mu=10 tmax=100C
core c od=12.7mm id=7.7mm h=4.8mm material=iron-mu10
inductor L a b 1u core=c turns=14
`
	nl, err := circuits.Parse("n.net", []byte(net))
	if err != nil {
		t.Fatal(err)
	}
	s, err := Prepare(nl, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	if s.Parts["L"].Core.Material.Tmax != 100 || len(s.Findings) != 1 || !strings.Contains(s.Findings[0].Text, "replaces the built-in") {
		t.Errorf("override: tmax %g findings %+v", s.Parts["L"].Core.Material.Tmax, s.Findings)
	}
}
