package ratings

import (
	"math"
	"strings"
	"testing"

	"rfstress/circuits"
)

func TestBuiltinMaterials(t *testing.T) {
	b := Builtin()
	// Four classes, no grades: a list of grades by permeability would
	// mirror a maker's range.
	if len(b) != 4 {
		t.Fatalf("%d built-in materials, want the four classes", len(b))
	}
	for _, name := range []string{"iron", "nizn", "mnzn", "air"} {
		m, ok := b[name]
		if !ok {
			t.Fatalf("no built-in %s", name)
		}
		if !m.Builtin || m.Note == "" || m.Class != name {
			t.Errorf("%s: builtin %v note %q class %q", name, m.Builtin, m.Note, m.Class)
		}
		if m.Class == "air" {
			if m.GuideFlux(7e6) != 0 || m.Bsat != 0 || m.Mu != 1 || m.Tmax != 0 {
				t.Errorf("air has a guide, a saturation or a tmax, or µ ≠ 1: %+v", m)
			}
			continue
		}
		// A magnetic class has no permeability of its own: the core says.
		if m.Mu != 0 {
			t.Errorf("%s: class carries µ %g", name, m.Mu)
		}
		// Heating guide B₁·√(1 MHz/f): quadrupling f halves it (the f·B²
		// law of REFERENCES), exactly.
		if g1, g4 := m.GuideFlux(3e6), m.GuideFlux(12e6); math.Abs(g1/g4-2) > 1e-12 {
			t.Errorf("%s: guide %g T at 3 MHz, %g T at 12 MHz", name, g1, g4)
		}
		// Saturation far above any heating guide (from memory: tenths of a
		// tesla against millitesla), and a heat capacity to work with.
		if !(m.Bsat > 20*m.GuideFlux(1e6)) || m.Tmax <= 0 || m.Density <= 0 || m.SpecHeat <= 0 {
			t.Errorf("%s: %+v", name, m)
		}
	}
	// Powdered iron guide (REFERENCES, common practice, from memory): order
	// 10–20 mT near 1 MHz.
	if g := b["iron"].GuideFlux(1e6); g < 10e-3 || g > 20e-3 {
		t.Errorf("iron at 1 MHz: %g", g)
	}
	// Ferrite saturation ranges (REFERENCES, from memory): NiZn 0.25–0.35 T,
	// MnZn 0.35–0.5 T.
	if v := b["nizn"].Bsat; v < 0.25 || v > 0.35 {
		t.Errorf("nizn bsat %g", v)
	}
	if v := b["mnzn"].Bsat; v < 0.35 || v > 0.5 {
		t.Errorf("mnzn bsat %g", v)
	}
	// Copies: changing one does not change the next.
	b["iron"].Tmax = 1
	if Builtin()["iron"].Tmax == 1 {
		t.Error("Builtin hands out shared materials")
	}
}

// A core of a magnetic class with no permeability is an input error with a
// hint; with mu= on the core, al=, or a material statement with mu= it is
// fine.
func TestClassCoreNeedsPermeability(t *testing.T) {
	head := "port in a z=50\nport out b z=50\n"
	nl, err := circuits.Parse("k.net", []byte(head+"core c od=13mm id=7mm h=5mm material=iron\ninductor L a b 1u core=c turns=12\n"))
	if err != nil {
		t.Fatal(err)
	}
	_, err = Prepare(nl, nil, nil)
	if err == nil || !strings.Contains(err.Error(), "k.net:3:6: core c (used by L): material iron is a class") || !strings.Contains(err.Error(), "mu=") {
		t.Errorf("want a positioned error with a mu= hint, got %v", err)
	}
	for _, ok := range []string{
		"core c od=13mm id=7mm h=5mm material=iron mu=10\n",
		"core c od=13mm id=7mm h=5mm material=iron al=6nH\n",
		"material iron-mu10-ours class=iron mu=10\ncore c od=13mm id=7mm h=5mm material=iron-mu10-ours\n",
	} {
		nl, err := circuits.Parse("k.net", []byte(head+ok+"inductor L a b 1u core=c turns=12\n"))
		if err != nil {
			t.Fatal(err)
		}
		if _, err := Prepare(nl, nil, nil); err != nil {
			t.Errorf("%q: %v", ok, err)
		}
	}
}

func TestLoadMaterials(t *testing.T) {
	src := `# shop materials
material iron-mu9-ours class=iron mu=9 tmax=120C guide=12mT@1M,2.5mT@30M note=our_iron  # ours
material NiZn-mu100-ours class=NiZn mu=100

material x class=iron guide=5mT
`
	mats, err := LoadMaterials("shop.mat", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	if len(mats) != 3 {
		t.Fatalf("%d materials", len(mats))
	}
	red := mats["iron-mu9-ours"]
	if red.Class != "iron" || red.Mu != 9 || red.Tmax != 120 || red.Note != "our iron" || red.Builtin {
		t.Errorf("iron-mu9-ours: %+v", red)
	}
	if red.Pos.String() != "shop.mat:2:10" {
		t.Errorf("iron-mu9-ours defined at %s", red.Pos)
	}
	blue := mats["NiZn-mu100-ours"]
	// Class words are case-insensitive; a missing guide, bsat and tmax come
	// from the class.
	nz := Builtin()["nizn"]
	if blue.Class != "nizn" || len(blue.Guide) != 0 || blue.GuideFlux(5e6) != nz.GuideFlux(5e6) || blue.Tmax != nz.Tmax || blue.Bsat != nz.Bsat || blue.BsatGiven {
		t.Errorf("NiZn-mu100-ours: %+v", blue)
	}
	if x := mats["x"]; x.GuideFlux(1e6) != 5e-3 || x.GuideFlux(30e6) != 5e-3 {
		t.Error("a single guide value should hold at every frequency")
	}
	// The caller merges over the built-ins; a netlist core finds them.
	all := MergeMaterials(Builtin(), mats)
	net := `port in a z=50
port out b z=50
core c od=13mm id=7mm h=5mm material=nizn-mu100-ours
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
		"material b class=iron guide=15@1M\n" +
		"material c class=air guide=1mT\n" +
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
		"m.txt:3:29: guide 15 T is far above",
		"m.txt:4:28: guide= given for an air material",
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
material iron class=iron mu=10 tmax=100C
core c od=13mm id=7mm h=5mm material=iron
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
