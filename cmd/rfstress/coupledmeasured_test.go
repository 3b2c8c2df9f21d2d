package main

import (
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// A coupled winding with measured= is judged on R·|λ/L|² with L its
// measured inductance at the frequency (Im Z/ω), the L its flux linkage
// λ was computed with. For a loose coupling (k = 0.01) that is the lone
// coil's R·|I|² (Joule's law with the measured series resistance) to
// about 1 % (the mutual flux); dividing by the nominal value instead
// (here 0.8 of the measured L) would overstate it by 1/0.8² = 1.56.
// Single case: one frequency, matched load, no harmonics, carrier mode,
// so the worst current and the worst loss are the same case. 3 %.
func TestMeasuredCoupledWindingLoss(t *testing.T) {
	dir := t.TempDir()
	const lMeas, r = 1.25e-6, 0.5 // the coil as measured: 1.25 µH, 0.5 Ω
	var s1p strings.Builder
	// version 1 Z data are normalised to R: with R 1 they are ohms
	s1p.WriteString("# MHz Z RI R 1\n")
	for _, f := range []float64{1, 3, 7, 7.1, 7.2, 10, 30} {
		fmt.Fprintf(&s1p, "%g %g %.10g\n", f, r, 2*math.Pi*f*1e6*lMeas)
	}
	if err := os.WriteFile(filepath.Join(dir, "l1.s1p"), []byte(s1p.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	net := filepath.Join(dir, "loose.net")
	src := `title loose coupling of a measured coil
port in n1 z=50
port out n2 z=50
inductor L1 n1 n2 1u measured=l1.s1p
inductor L2 n2 gnd 1u q=100
coupling K1 L1 L2 k=0.01
audit power=100 mode=carrier freq=7.1M swr=1 harmonics=none
`
	if err := os.WriteFile(net, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	j := auditWorst(t, net)
	found := false
	for _, c := range j.Components {
		if c.Name != "L1" {
			continue
		}
		found = true
		i, p := c.Worst["irms"], c.Worst["pdiss"]
		if want := r * i * i; !(i > 0) || math.Abs(p-want) > 0.03*want {
			t.Errorf("L1: %.4g W at %.4g A rms; R·I² = %.4g W", p, i, want)
		}
	}
	if !found {
		t.Fatalf("no L1 in the audit")
	}
}
