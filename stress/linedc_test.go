package stress

import (
	"math"
	"strings"
	"testing"

	"rfstress/ratings"
)

// DC fed over a coax (a remote tuner powered through its feed line; or a
// plate supply let through by a missing blocking capacitor) adds to the
// line's stresses as it does to a lumped part's: the DC voltage between
// the conductors to the RF crest (peaks add), the DC current to the RMS
// current in squares. An ideal line passes DC unchanged, so by Ohm's law
// the line sits at 1000 V − 0.1 A × 1 Ω = 999.9 V and carries 0.1 A. The
// same network at 1 µV of supply and 1 nA drawn is the RF-only reference: the peak grows
// by 999.9 V and the RMS current becomes √(I_rf² + 0.1²), to 1e-6.
func TestLineCarriesDC(t *testing.T) {
	src := func(volts, amps string) string {
		return strings.Join([]string{
			"port in a z=50",
			"port out b z=50",
			"line W1 a b z0=50 len=10m vf=0.66 loss=1.5@10M vpk=5k pmax=1k",
			"supply B1 bp " + volts,
			"inductor RFC1 bp a 100u q=50 rdc=1",
			"inductor RFC2 b c 100u q=50 rdc=1",
			"draw D1 c " + amps,
		}, "\n") + "\n"
	}
	set := []string{"freq=7.1M", "harmonics=none", "swr=1", "faults=none", "mode=carrier"}
	dc := build(t, src("1kV", "0.1A"), set...)
	rf := build(t, src("1u", "1n"), set...)
	a, err := dc.eng.Audit()
	if err != nil {
		t.Fatal(err)
	}
	b, err := rf.eng.Audit()
	if err != nil {
		t.Fatal(err)
	}
	var la, lb *PartResult
	for k, p := range a.Parts {
		if p.Name == "W1" {
			la, lb = p, b.Parts[k]
		}
	}
	if la == nil {
		t.Fatal("no W1")
	}
	gotV := la.Stress[ratings.Vpk].Value - lb.Stress[ratings.Vpk].Value
	if math.Abs(gotV-999.9) > 1e-6*999.9 {
		t.Errorf("line peak grows by %.9g V with the supply, want 999.9 V (the DC between its conductors)", gotV)
	}
	irf := lb.Stress[ratings.Irms].Value
	if want := math.Sqrt(irf*irf + 0.01); math.Abs(la.Stress[ratings.Irms].Value-want) > 1e-6*want {
		t.Errorf("line RMS current %.9g A, want √(%.6g² + 0.1²) = %.9g A", la.Stress[ratings.Irms].Value, irf, want)
	}
}
