package ratings

import (
	"strings"
	"testing"

	"rfstress/circuits"
)

// A capacitor's current rating caps its RF voltage at V = I·Xc
// (capacitive reactance Xc = 1/(ωC); common practice): 8 A RMS through
// 100 pF at 29.7 MHz is 8/(2π·29.7e6·100e-12) = 428.7 V RMS, 606 V peak.
func TestCurrentRatingLimitsVoltage(t *testing.T) {
	src := "port in a z=50\nport out b z=50\nresistor R a b 1\ncapacitor C1 a gnd 100p irms=8 vpk=1k dielectric=mica\n"
	nl, err := circuits.Parse("x.net", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	set, err := Prepare(nl, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, l := range set.Parts["C1"].Limits(29.7e6) {
		if l.Quantity == Irms && !strings.Contains(l.Basis, "606 V peak") {
			t.Errorf("current-limited voltage missing or wrong: %q", l.Basis)
		}
	}
}
