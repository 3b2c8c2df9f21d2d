package main

import (
	"math/cmplx"
	"testing"

	"rfstress/circuits"
)

// TestLoadChartReference: the load chart shows the antenna port's loads,
// so it is drawn for the antenna port's resistance. A pi network from a
// 2500 Ω plate into 50 Ω: on a chart for 50 Ω the matched antenna sits at
// the centre, Γ = (Z − R0)/(Z + R0) = 0 (the Smith chart's definition);
// on one for the plate's 2500 Ω it would sit near the rim at |Γ| = 0.96,
// with every load of an SWR-2 circle crowded beside it.
func TestLoadChartReference(t *testing.T) {
	nl, err := circuits.Parse("pi.net", []byte(`title pi
port in plate z=2500
port out ant z=50
capacitor C1 plate gnd 212p
inductor L1 plate ant 10.2u
capacitor C2 ant gnd 1218p
`))
	if err != nil {
		t.Fatal(err)
	}
	c, err := circuits.Build(nl)
	if err != nil {
		t.Fatal(err)
	}
	r0 := chartR0(c)
	if g := cmplx.Abs((c.Zout - complex(r0, 0)) / (c.Zout + complex(r0, 0))); g > 1e-12 {
		t.Errorf("chart for %g Ω puts the matched 50 Ω antenna at |Γ| = %.3f, want the centre", r0, g)
	}
}
