package ratings

import (
	"testing"

	"rfstress/circuits"
)

// TestNoCascadedMaterialError: a material statement with a bad value is
// reported once, where the value is written; the core that names it does
// not add "unknown material" on top.
func TestNoCascadedMaterialError(t *testing.T) {
	src := "port in n1 z=50\nport out n2 z=50\n" +
		"material M1 class=iron mu=10 tmax=-5C\n" +
		"core K1 od=20mm id=10mm h=6mm material=M1\n" +
		"capacitor C1 n1 gnd 300p\ninductor L1 n1 n2 1u core=K1 turns=10\ncapacitor C2 n2 gnd 300p\n"
	nl, err := circuits.Parse("m.net", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	_, err = Prepare(nl, Builtin(), nil)
	want := "m.net:3:35: tmax=-5C is out of range (a temperature above 0 °C and at most 1000 °C, e.g. 125C)"
	if err == nil || err.Error() != want {
		t.Errorf("got %v\nwant %s", err, want)
	}
}
