package circuits

import (
	"math"
	"math/cmplx"
	"strings"
	"testing"
)

// TestSourceImpedanceDrive: with source= the EMF is the one that puts P
// into a load equal to the port's z behind the true source impedance
// (a transmitter rated P into 50 Ω). Through a matched 50 Ω line into
// 50 Ω the load takes exactly P whatever the source impedance, and the
// source impedance changes nothing else the port sees; without source=,
// and with source equal to z, the drive is the available power as before.
// Exact: 1e-12 relative.
func TestSourceImpedanceDrive(t *testing.T) {
	const body = "port out n2 z=50\nline T n1 n2 z0=50 len=7m vf=0.7\n"
	for _, src := range []string{"", " source=50", " source=3+j0", " source=12-j30"} {
		_, c := mustParse(t, "s.net", "port in n1 z=50"+src+"\n"+body)
		r, err := c.Solve(7.1e6, 100, Load{Z: 50})
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(r.Pout-100) > 1e-12*100 {
			t.Errorf("source%q: load takes %g W, want 100 W", src, r.Pout)
		}
		if cmplx.Abs(r.Zin-50) > 1e-9 {
			t.Errorf("source%q: Zin %v, want 50 Ω", src, r.Zin)
		}
	}
	// into a mismatched load the true source impedance matters: a 3 Ω
	// source into 12.5 Ω delivers |E|²·12.5/|15.5|² with |E| = 53·√(100/50)
	_, c := mustParse(t, "s.net", "port in n1 z=50 source=3\nport out n2 z=50\nline T n1 n2 z0=50 len=1mm vf=1\n")
	r, err := c.Solve(1e3, 100, Load{Z: 12.5})
	if err != nil {
		t.Fatal(err)
	}
	e := 53 * math.Sqrt(2)
	if want := e * e * 12.5 / (15.5 * 15.5); math.Abs(r.Pout-want) > 1e-6*want {
		t.Errorf("3 Ω source into 12.5 Ω: %g W, want %g W (Ohm's law)", r.Pout, want)
	}
}

// TestKurokawaComplexDifferential: S-parameters with a complex reference
// at port 1 and a balanced (differential) port 2 against Kurokawa's power
// waves (Kurokawa, "Power waves and the scattering matrix", IEEE Trans.
// MTT-13, 1965): S = F·(Z − R*)·(Z + R)⁻¹·F⁻¹, F = diag(1/(2√Re zi)),
// R = diag(z1, z2), from the Z-matrix of the network written by hand:
// L1 from n1 to a, C1 across a–b, R1 from b to gnd; port 2 across a–b:
// Z11 = ZL + ZC + ZR, Z12 = Z21 = Z22 = ZC. Two exact methods: 1e-9.
func TestKurokawaComplexDifferential(t *testing.T) {
	_, c := mustParse(t, "k.net", `
port in n1 z=30+j20
port out a b z=600-j100
inductor L1 n1 a 1u q=100
capacitor C1 a b 100p esr=0.2
resistor R1 b gnd 20
`)
	for _, f := range []float64{3.5e6, 7.1e6, 14.2e6, 28e6} {
		sp, err := c.TwoPort(f)
		if err != nil {
			t.Fatal(err)
		}
		zl := c.Elements[0].Impedance(f)
		zc := c.Elements[1].Impedance(f)
		z := [2][2]complex128{{zl + zc + 20, zc}, {zc, zc}}
		r := [2]complex128{complex(30, 20), complex(600, -100)}
		// (Z + R)⁻¹
		a := [2][2]complex128{{z[0][0] + r[0], z[0][1]}, {z[1][0], z[1][1] + r[1]}}
		det := a[0][0]*a[1][1] - a[0][1]*a[1][0]
		inv := [2][2]complex128{{a[1][1] / det, -a[0][1] / det}, {-a[1][0] / det, a[0][0] / det}}
		b := [2][2]complex128{{z[0][0] - cmplx.Conj(r[0]), z[0][1]}, {z[1][0], z[1][1] - cmplx.Conj(r[1])}}
		var m [2][2]complex128
		for i := 0; i < 2; i++ {
			for j := 0; j < 2; j++ {
				m[i][j] = b[i][0]*inv[0][j] + b[i][1]*inv[1][j]
			}
		}
		fw := [2]float64{1 / (2 * math.Sqrt(real(r[0]))), 1 / (2 * math.Sqrt(real(r[1])))}
		want := [2][2]complex128{}
		for i := 0; i < 2; i++ {
			for j := 0; j < 2; j++ {
				want[i][j] = m[i][j] * complex(fw[i]/fw[j], 0)
			}
		}
		got := [2][2]complex128{{sp.S11, sp.S12}, {sp.S21, sp.S22}}
		for i := 0; i < 2; i++ {
			for j := 0; j < 2; j++ {
				if d := cmplx.Abs(got[i][j] - want[i][j]); d > 1e-9 {
					t.Errorf("f=%g S%d%d = %v, Kurokawa %v", f, i+1, j+1, got[i][j], want[i][j])
				}
			}
		}
	}
}

// chokeBalun is a 1:1 current balun of two tightly coupled windings (dots
// at the transmitter end) into a balanced load.
const chokeBalun = `
port in m z=50
port out a b z=200%s
inductor B1 m a 20u q=150
inductor B2 gnd b 20u q=150
coupling K B1 B2 k=0.995
`

// TestChokeBalun: with no common-mode path (cm omitted) the choke's two
// windings carry equal and opposite currents: no common-mode current
// (1e-9 of the winding current, rounding). With cm=, the common-mode
// current is, from the two winding equations summed and the load's centre
// at the mean voltage (V_a + V_b)/2 = Zcm·Ic:
//
//	Ic = V_m / (2·Zcm + Z_L + Z_M),  Z_L = R + jωL, Z_M = k·Z_L
//
// (common practice for a choke balun: the choke's common-mode impedance
// Z_L + jωM opposes the common-mode voltage). 1e-9 relative.
func TestChokeBalun(t *testing.T) {
	_, c := mustParse(t, "b.net", strings.Replace(chokeBalun, "%s", "", 1))
	for _, f := range []float64{3.6e6, 14.2e6} {
		r, err := c.Solve(f, 100, Load{Z: 200})
		if err != nil {
			t.Fatal(err)
		}
		i1, i2 := r.Parts[0].I, r.Parts[1].I
		if cmplx.Abs(i1+i2) > 1e-9*cmplx.Abs(i1) {
			t.Errorf("f=%g: winding currents %v and %v are not opposite", f, i1, i2)
		}
	}
	for _, cm := range []string{"300", "50-j400", "0"} {
		_, c := mustParse(t, "b.net", strings.Replace(chokeBalun, "%s", " cm="+cm, 1))
		zcm, _ := ParseComplex(cm)
		for _, f := range []float64{3.6e6, 14.2e6} {
			for _, ld := range []Load{{Z: 200}, {Z: complex(30, 90)}, Short} {
				r, err := c.Solve(f, 100, ld)
				if err != nil {
					t.Fatal(err)
				}
				w := 2 * math.Pi * f
				zl := c.Elements[0].Impedance(f)
				// equal windings: Zm = k·Z_L (complex permeability,
				// coupled_test.go), so jωM carries its loss k·R too
				zm := complex(0.995, 0) * zl
				_ = w
				want := r.Nodes[0] / (2*zcm + zl + zm)
				if d := cmplx.Abs(r.Icm-want) / cmplx.Abs(want); d > 1e-9 {
					t.Errorf("cm=%s f=%g load %v: Icm %v, closed form %v", cm, f, ld.Z, r.Icm, want)
				}
				if d := cmplx.Abs(r.Parts[0].I+r.Parts[1].I-r.Icm) / cmplx.Abs(want); d > 1e-9 {
					t.Errorf("cm=%s: winding currents sum %v, common-mode current %v", cm, r.Parts[0].I+r.Parts[1].I, r.Icm)
				}
			}
		}
	}
}

// TestBalancedPortErrors: balanced ports and source= are checked where
// written.
func TestBalancedPortErrors(t *testing.T) {
	for _, bad := range []string{
		"port in n1 n3 z=50\nport out n2 z=50\nresistor R n1 n2 5\nresistor R3 n3 gnd 5\n",
		"port in n1 z=50\nport out n2 gnd z=50\nresistor R n1 n2 5\n",
		"port in n1 z=50\nport out n2 n2 z=50\nresistor R n1 n2 5\n",
		"port in n1 z=50\nport out n2 z=50 cm=100\nresistor R n1 n2 5\n",
		"port in n1 z=50 cm=100\nport out n2 z=50\nresistor R n1 n2 5\n",
		"port in n1 z=50\nport out n2 z=50 source=3\nresistor R n1 n2 5\n",
		"port in n1 z=50 source=-3\nport out n2 z=50\nresistor R n1 n2 5\n",
	} {
		_, err := Parse("bad.net", []byte(bad))
		if err == nil || !strings.Contains(err.Error(), "bad.net:") {
			t.Errorf("want a positioned error for\n%s\ngot %v", bad, err)
		}
	}
}
