package ratings

import (
	"strings"
	"testing"

	"rfstress/circuits"
)

const gapBase = `port in n1 z=50
port out n2 z=50
inductor L1 n1 n2 1u
`

// TestGapAttributes: gap= and medium= on parts and clearance statements
// are read into the part's clearance; mistakes are input errors with
// their position.
func TestGapAttributes(t *testing.T) {
	prep := func(src string) (*Set, error) {
		nl, err := circuits.Parse("g.net", []byte(gapBase+src))
		if err != nil {
			t.Fatalf("parse: %v", err)
		}
		return Prepare(nl, nil, nil)
	}
	s, err := prep("capacitor C1 n2 gnd 100p dielectric=air gap=1.5mm\nclearance K1 n1 gnd gap=3mm medium=coated\n")
	if err != nil {
		t.Fatal(err)
	}
	if g := s.Parts["C1"].Gap; g == nil || g.Gap != 1.5e-3 || g.Medium != MediumAir {
		t.Errorf("C1 gap %+v, want 1.5 mm air", g)
	}
	if g := s.Parts["K1"].Gap; g == nil || g.Gap != 3e-3 || g.Medium != MediumCoated {
		t.Errorf("K1 gap %+v, want 3 mm coated", g)
	}
	// a clearance is judged on its gap alone; C1 on its ratings and its gap
	k1 := s.Parts["K1"]
	for _, q := range Quantities {
		if k1.Shows(q) != (q == Arc) {
			t.Errorf("clearance shows %s: %v", q, k1.Shows(q))
		}
	}
	// a coated board: ok up to the working guide (3 mm × 500 V/mm, the
	// standard profile uses it as it is), rated at the voltage at which
	// the same gap through air would arc
	lims := k1.Limits(7e6)
	if len(lims) != 1 || lims[0].Quantity != Arc || lims[0].Derated != CoatedVpkPerMM*3 || lims[0].Abs != ArcVoltage(3e-3, SeaLevel) {
		t.Errorf("K1 limits %+v, want ok to %g V, rated %g V", lims, CoatedVpkPerMM*3, ArcVoltage(3e-3, SeaLevel))
	}
	for _, c := range []struct{ src, want string }{
		{"clearance K1 n1 gnd gap=1mm medium=glass\n", `g.net:4:36: clearance K1: unknown medium "glass" (one of air, board, coated)`},
		{"capacitor C1 n2 gnd 100p medium=board\n", "g.net:4:26: capacitor C1: medium= without gap= (gap= with medium=, e.g. gap=1.5mm medium=board)"},
		{"capacitor C1 n2 gnd 100p dielectric=vacuum gap=1mm\n", "g.net:4:44: capacitor C1: gap= judges an air gap, but its plates are in vacuum (no gap= on a vacuum capacitor: its vpk= rating covers its plates)"},
	} {
		_, err := prep(c.src)
		if err == nil || err.Error() != c.want {
			t.Errorf("%q:\n got: %v\nwant: %s", strings.TrimSpace(c.src), err, c.want)
		}
	}
}

// TestConnectorLimits: a connector is judged on the peak voltage and RMS
// current it is rated for, derated by its class.
func TestConnectorLimits(t *testing.T) {
	nl, err := circuits.Parse("j.net", []byte("port in n0 z=50\nport out n2 z=50\nconnector J1 n0 n2 vpk=1.5k irms=4\n"))
	if err != nil {
		t.Fatal(err)
	}
	s, err := Prepare(nl, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	j := s.Parts["J1"]
	got := map[Quantity]Limit{}
	for _, l := range j.Limits(14e6) {
		got[l.Quantity] = l
	}
	if len(got) != 2 || got[Vpk].Abs != 1500 || got[Irms].Abs != 4 {
		t.Errorf("J1 limits %+v, want vpk 1.5 kV and irms 4 A", got)
	}
	f := s.Profile.Factor(ClassConnector, Vpk)
	if got[Vpk].Derated != 1500*f {
		t.Errorf("J1 derated vpk %g, want %g", got[Vpk].Derated, 1500*f)
	}
	if j.Shows(Pdiss) || j.Shows(Vrms) || !j.Shows(Vpk) || !j.Shows(Irms) {
		t.Error("a connector shows its peak voltage and current only")
	}
	if _, _, ok := j.AcrossNodes(nl.Components[0]); ok {
		t.Error("a connector's peak voltage is to ground, not across it")
	}
}
