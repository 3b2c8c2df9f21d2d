package reports

import (
	"bytes"
	"math"
	"math/cmplx"
	"testing"

	"rfstress/circuits"
)

// TestTouchstoneRoundTripAsBlock: the tool's own Touchstone export of a
// filter, read back as a measured block between the same ports, is the
// same network at the exported frequencies: the same S-parameters, the
// same port voltages and currents for any load, and a block dissipation
// equal to the filter's summed part losses (Tellegen's theorem: what
// enters the ports is what the parts dissipate). Tolerance 1e-9: the
// export writes every digit that round-trips, so only rounding remains.
func TestTouchstoneRoundTripAsBlock(t *testing.T) {
	const filter = `port in n1 z=50
port out n4 z=50
capacitor C1 n1 gnd 270p q=800
inductor  L2 n1 n2 0.84u q=150@7M,220@21M
capacitor C3 n2 gnd 470p q=800
inductor  L4 n2 n4 0.84u q=150
capacitor C5 n4 gnd 270p esr=40m
`
	nl, err := circuits.Parse("lpf.net", []byte(filter))
	if err != nil {
		t.Fatal(err)
	}
	c, err := circuits.Build(nl)
	if err != nil {
		t.Fatal(err)
	}
	fs := []float64{3.5e6, 7e6, 10.1e6, 14.2e6, 20.2e6, 30.3e6}
	v := &SweepView{Z1: c.Zin, Z2: c.Zout}
	for _, f := range fs {
		sp, err := c.TwoPort(f)
		if err != nil {
			t.Fatal(err)
		}
		v.Points = append(v.Points, sp)
	}
	var file bytes.Buffer
	if err := WriteTouchstone(&file, v); err != nil {
		t.Fatal(err)
	}
	bnl, err := circuits.Parse("block.net", []byte("port in a z=50\nport out b z=50\nblock F a b measured=lpf.ts\n"))
	if err != nil {
		t.Fatal(err)
	}
	if err := circuits.LoadMeasured(bnl, func(string) ([]byte, error) { return file.Bytes(), nil }); err != nil {
		t.Fatal(err)
	}
	bc, err := circuits.Build(bnl)
	if err != nil {
		t.Fatal(err)
	}
	rel := func(a, b complex128) float64 { return cmplx.Abs(a-b) / math.Max(cmplx.Abs(b), 1e-12) }
	for i, f := range fs {
		sp, err := bc.TwoPort(f)
		if err != nil {
			t.Fatal(err)
		}
		w := v.Points[i]
		for k, pair := range [][2]complex128{{sp.S11, w.S11}, {sp.S21, w.S21}, {sp.S12, w.S12}, {sp.S22, w.S22}} {
			if cmplx.Abs(pair[0]-pair[1]) > 1e-9 {
				t.Errorf("f=%g S[%d]: block %v, filter %v", f, k, pair[0], pair[1])
			}
		}
		for _, l := range []circuits.Load{{Z: 50}, {Z: complex(12.5, -180)}, {Z: 300}, circuits.OpenLoad, circuits.Short} {
			a, err := c.Solve(f, 100, l)
			if err != nil {
				t.Fatal(err)
			}
			b, err := bc.Solve(f, 100, l)
			if err != nil {
				t.Fatal(err)
			}
			// a shorted port's voltage is zero: judge it against the drive
			vout := cmplx.Abs(b.Vout-a.Vout) / math.Max(cmplx.Abs(a.Vout), cmplx.Abs(a.Vin))
			if rel(b.Vin, a.Vin) > 1e-9 || rel(b.Iin, a.Iin) > 1e-9 || vout > 1e-9 || (!l.Open && rel(b.Iout, a.Iout) > 1e-9) {
				t.Errorf("f=%g load %v: ports differ: block Vin %v Iin %v Vout %v Iout %v; filter %v %v %v %v",
					f, l, b.Vin, b.Iin, b.Vout, b.Iout, a.Vin, a.Iin, a.Vout, a.Iout)
			}
			if d := math.Abs(b.Parts[0].Ploss - a.Ploss); d > 1e-9*math.Max(a.Pin, 1e-9) {
				t.Errorf("f=%g load %v: block dissipates %g W, filter parts %g W", f, l, b.Parts[0].Ploss, a.Ploss)
			}
		}
	}
}
