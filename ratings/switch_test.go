package ratings

import (
	"math"
	"strings"
	"testing"
)

// A relay contact is rated by its RF current through the closed contact
// and its peak voltage across the open one, derated by the switch class
// (standard: 0.7 and 0.6, our table); a choke's vpk= rates its insulation
// (inductor class, 0.8); the winding's DC resistance is annealed copper
// over its length (IEC 60028: ρ = 1/58 Ω·mm²/m); supplies and draws are
// not judged; the contact note is given once per netlist.
func TestSwitchAndChokeLimits(t *testing.T) {
	const net = `port in a z=50
port out b z=50
switch S1 a m state=closed ron=20m lon=5n coff=1.5p irms=5 vpk=1.5k
switch S2 a m state=open coff=1.5p
core K1 ae=40mm2 le=60mm mu=1 material=air
inductor RFC m h 200u turns=50 wire=0.5mm core=K1 vpk=8k
supply HV h 3kV
draw D1 m 0.1A
resistor R m b 50
`
	s := mustPrepare(t, net, nil)
	s1 := s.Parts["S1"]
	if l := limitOf(t, s1, 7e6, Irms); l.Abs != 5 || math.Abs(l.Derated-3.5) > 1e-12 {
		t.Errorf("S1 irms: %+v", l)
	}
	if l := limitOf(t, s1, 7e6, Vpk); l.Abs != 1500 || math.Abs(l.Derated-900) > 1e-9 {
		t.Errorf("S1 vpk: %+v", l)
	}
	if l := limitOf(t, s.Parts["S2"], 7e6, Vpk); l.Abs != 0 || Judge(10, l) != Unrated {
		t.Errorf("S2 without vpk= should be unrated: %+v", l)
	}
	if l := limitOf(t, s.Parts["RFC"], 7e6, Vpk); l.Abs != 8000 || math.Abs(l.Derated-6400) > 1e-9 {
		t.Errorf("choke vpk: %+v", l)
	}
	rfc := s.Parts["RFC"]
	want := rfc.WireLength / 58 / (math.Pi * 0.25 * 0.25) // Ω: length in m, area in mm²
	if got := rfc.WindingRdc(); math.Abs(got-want) > 1e-6*want || !(got > 0) {
		t.Errorf("winding DC resistance %g Ω, ρ·l/A = %g Ω", got, want)
	}
	for _, n := range []string{"HV", "D1"} {
		if ls := s.Parts[n].Limits(7e6); len(ls) != 0 {
			t.Errorf("%s is a source, not judged: %+v", n, ls)
		}
	}
	notes := 0
	for _, f := range s.AllFindings() {
		if strings.Contains(f.Text, "hot switching burns contacts") {
			notes++
		}
	}
	if notes != 1 {
		t.Errorf("contact note given %d times, want once", notes)
	}
}
