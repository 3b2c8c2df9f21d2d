package circuits

import (
	"fmt"
	"math"
	"math/cmplx"
	"strings"
	"testing"
)

// The syntax cases below are written from the Touchstone File Format
// Specification (IBIS Open Forum, version 2.0, 2009, and the version 1.1
// rules it restates): option line defaults (GHz, S, MA, R 50), the
// version 1 two-port order N11 N21 N12 N22, [Two-Port Data Order] in 2.0,
// per-port [Reference], [Matrix Format], comments after '!'.

func TestTouchstoneSyntax(t *testing.T) {
	// one reflection, written every way the format allows: 0.5∠30°
	want := cmplx.Rect(0.5, math.Pi/6)
	db := 20 * math.Log10(0.5)
	cases := []struct {
		name, file, text string
		f                float64
	}{
		{"defaults GHz S MA", "a.s1p", "! defaults\n#\n1.5 0.5 30\n", 1.5e9},
		{"MHz RI", "a.s1p", "# MHz S RI R 50\n7.1 " + fmt.Sprint(real(want)) + " " + fmt.Sprint(imag(want)) + "\n", 7.1e6},
		{"kHz DB", "a.s1p", "# kHz S DB R 50\n7100 " + fmt.Sprint(db) + " 30\n", 7.1e6},
		{"Hz MA, lower case", "a.S1P", "# hz s ma r 50\n7100000 0.5 30 ! trailing comment\n", 7.1e6},
		{"GHz explicit", "a.s1p", "# GHz S MA R 50\n0.0071 0.5 30\n", 7.1e6},
		{"version 2 one-port", "a.ts", "[Version] 2.0\n# MHz S MA R 50\n[Number of Ports] 1\n[Number of Frequencies] 1\n[Network Data]\n7.1 0.5 30\n[End]\n", 7.1e6},
	}
	for _, tc := range cases {
		ts, err := ParseTouchstone(tc.file, []byte(tc.text))
		if err != nil {
			t.Errorf("%s: %v", tc.name, err)
			continue
		}
		if ts.Ports != 1 || len(ts.F) != 1 || math.Abs(ts.F[0]-tc.f) > 1e-6*tc.f {
			t.Errorf("%s: ports %d, F %v", tc.name, ts.Ports, ts.F)
			continue
		}
		if d := cmplx.Abs(ts.S[0][0] - want); d > 1e-12 {
			t.Errorf("%s: S11 %v, want %v", tc.name, ts.S[0][0], want)
		}
	}
}

func TestTouchstoneTwoPortOrders(t *testing.T) {
	// distinct entries so any swap shows: S11=0.1, S12=0.2, S21=0.3, S22=0.4 (RI, real)
	v1 := "# MHz S RI R 50\n10 0.1 0 0.3 0 0.2 0 0.4 0\n" // N11 N21 N12 N22
	v2a := "[Version] 2.0\n# MHz S RI R 50\n[Number of Ports] 2\n[Two-Port Data Order] 12_21\n[Number of Frequencies] 1\n[Network Data]\n10 0.1 0 0.2 0 0.3 0 0.4 0\n[End]\n"
	v2b := "[Version] 2.0\n# MHz S RI R 50\n[Number of Ports] 2\n[Two-Port Data Order] 21_12\n[Number of Frequencies] 1\n[Network Data]\n10 0.1 0\n 0.3 0 0.2 0 0.4 0\n[End]\n"
	for name, text := range map[string]string{"v1": v1, "v2 12_21": v2a, "v2 21_12 wrapped": v2b} {
		file := "f.s2p"
		ts, err := ParseTouchstone(file, []byte(text))
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		got := ts.S[0]
		if got[0] != 0.1 || got[1] != 0.2 || got[2] != 0.3 || got[3] != 0.4 {
			t.Errorf("%s: S row-major %v, want 0.1 0.2 0.3 0.4", name, got)
		}
	}
}

// TestTouchstoneReferenceAndZ: per-port references and Z data. A series
// resistor R between the ports has Z = [[∞…]] — so use a shunt resistor R
// to ground, which as a two-port has Z11=Z12=Z21=Z22=R. Its S-parameters
// with references R1, R2 follow from the ABCD matrix [[1,0],[1/R,1]]
// (Pozar, ch. 4): S11 = (A·R2 + B − C·R1·R2 − D·R1)/Δ,
// S21 = 2√(R1·R2)/Δ, Δ = A·R2 + B + C·R1·R2 + D·R1.
func TestTouchstoneReferenceAndZ(t *testing.T) {
	const R, r1, r2 = 100.0, 50.0, 75.0
	text := "[Version] 2.0\n# MHz Z RI\n[Number of Ports] 2\n[Two-Port Data Order] 12_21\n[Number of Frequencies] 1\n[Reference] 50\n75\n[Network Data]\n" +
		"1 100 0 100 0 100 0 100 0\n[End]\n"
	ts, err := ParseTouchstone("z.ts", []byte(text))
	if err != nil {
		t.Fatal(err)
	}
	if ts.Ref[0] != r1 || ts.Ref[1] != r2 {
		t.Fatalf("references %v", ts.Ref)
	}
	A, B, C, D := 1.0, 0.0, 1/R, 1.0
	den := A*r2 + B + C*r1*r2 + D*r1
	s11 := (A*r2 + B - C*r1*r2 - D*r1) / den
	s21 := 2 * math.Sqrt(r1*r2) / den
	s22 := (-A*r2 + B - C*r1*r2 + D*r1) / den
	got := ts.S[0]
	for i, w := range []float64{s11, s21, s21, s22} {
		if d := cmplx.Abs(got[i] - complex(w, 0)); d > 1e-12 {
			t.Errorf("S[%d] = %v, want %g", i, got[i], w)
		}
	}
	// version 1 Z data are normalised to R: the same network, R 50 throughout
	v1 := "# MHz Z RI R 50\n1 2 0 2 0 2 0 2 0\n"
	ts1, err := ParseTouchstone("z.s2p", []byte(v1))
	if err != nil {
		t.Fatal(err)
	}
	den = 50 + 50.0*50/R + 50
	if d := cmplx.Abs(ts1.S[0][2] - complex(2*50/den, 0)); d > 1e-12 {
		t.Errorf("v1 normalised Z: S21 %v, want %g", ts1.S[0][2], 2*50/den)
	}
}

func TestTouchstoneErrors(t *testing.T) {
	cases := []struct{ name, file, text, want string }{
		{"falling frequency", "a.s1p", "# MHz S RI R 50\n7 0 0\n6 0 0\n", "a.s1p:3:1: frequency 6 does not rise above the one before (frequencies strictly rising)"},
		{"equal frequency", "a.s1p", "# MHz S RI R 50\n7 0 0\n7 0 0\n", "a.s1p:3:1: frequency 7 does not rise above the one before (frequencies strictly rising)"},
		{"NaN", "a.s1p", "# MHz S RI R 50\n7 NaN 0\n", `a.s1p:2:3: bad number "NaN" (a number)`},
		{"Inf", "a.s1p", "# MHz S RI R 50\n7 0 +Inf\n", `a.s1p:2:5: bad number "+Inf" (a number)`},
		{"word", "a.s1p", "# MHz S RI R 50\n7 zero 0\n", `a.s1p:2:3: bad number "zero" (a number)`},
		{"short line", "a.s2p", "# MHz S RI R 50\n7 0 0 1 0\n", "a.s2p:2:1: found 5 numbers (a frequency and 8 numbers on each line)"},
		{"no option line", "a.s1p", "7 0 0\n", "a.s1p:1:1: data before the option line (an option line such as: # MHz S RI R 50)"},
		{"unknown option", "a.s1p", "# MHz S XY R 50\n7 0 0\n", `a.s1p:1:9: unknown option "XY" (Hz|kHz|MHz|GHz, S|Y|Z, RI|MA|DB, R value)`},
		{"H parameters", "a.s2p", "# MHz H RI R 50\n7 0 0 0 0 0 0 0 0\n", "a.s2p:1:7: H parameters are not read (S, Y or Z parameters)"},
		{"bad reference", "a.s1p", "# MHz S RI R -5\n7 0 0\n", `a.s1p:1:14: bad reference resistance "-5" (a positive resistance, e.g. R 50)`},
		{"port count unknown", "a.txt", "# MHz S RI R 50\n7 0 0\n", "a.txt:1:1: cannot tell the port count of a version 1 file (a file named .s1p or .s2p, or a version 2.0 file with [Number of Ports])"},
		{"v2 no order", "a.ts", "[Version] 2.0\n# MHz S RI R 50\n[Number of Ports] 2\n[Number of Frequencies] 1\n[Network Data]\n7 0 0 1 0 1 0 0 0\n[End]\n", "a.ts:1:1: a two-port file needs [Two-Port Data Order] ([Two-Port Data Order] 12_21 or 21_12)"},
		{"v2 count", "a.ts", "[Version] 2.0\n# MHz S RI R 50\n[Number of Ports] 1\n[Number of Frequencies] 2\n[Network Data]\n7 0 0\n[End]\n", "a.ts:8:1: found 1 points (2 points as [Number of Frequencies] says)"},
		{"v2 no end", "a.ts", "[Version] 2.0\n# MHz S RI R 50\n[Number of Ports] 1\n[Number of Frequencies] 1\n[Network Data]\n7 0 0\n", "a.ts:7:1: no [End] ([End] after the data)"},
		{"three ports", "a.ts", "[Version] 2.0\n# MHz S RI R 50\n[Number of Ports] 3\n", "a.ts:3:19: 3 ports: rfstress reads one- and two-port data (a one- or two-port file)"},
		{"dB beyond range", "a.s2p", "# MHz S DB R 50\n1 0 0 0 0 0 0 7000 0\n", `a.s2p:2:15: value 7000 is out of range (a value whose magnitude is finite (in dB, below about 6000))`},
		{"zero frequency", "a.s1p", "# MHz S RI R 50\n0 0 0\n", "a.s1p:2:1: frequency 0 is not above zero (a frequency above zero)"},
		{"binary", "a.s1p", "# MHz S RI R 50\n7 0\x00 0\n", `a.s1p:2:1: control character '\x00' in the file (printable ASCII)`},
	}
	for _, tc := range cases {
		_, err := ParseTouchstone(tc.file, []byte(tc.text))
		if err == nil {
			t.Errorf("%s: no error, want %s", tc.name, tc.want)
			continue
		}
		if err.Error() != tc.want {
			t.Errorf("%s:\n got: %s\nwant: %s", tc.name, err, tc.want)
		}
	}
}

// TestTouchstoneNoiseBlockIgnored: a version 1 two-port may end with noise
// parameters (five numbers a line, frequency starting again low).
func TestTouchstoneNoiseBlockIgnored(t *testing.T) {
	text := "# MHz S RI R 50\n1 0 0 1 0 1 0 0 0\n2 0 0 1 0 1 0 0 0\n1 1.5 0.3 20 0.4\n"
	ts, err := ParseTouchstone("n.s2p", []byte(text))
	if err != nil {
		t.Fatal(err)
	}
	if len(ts.F) != 2 {
		t.Errorf("read %d points, want 2", len(ts.F))
	}
}

// seriesRLCFile writes a one-port of a series RLC, Z = R + jωL + 1/(jωC)
// (closed form), as S11 against 50 Ω in RI at the given frequencies.
func seriesRLCFile(r, l, c float64, fs []float64) string {
	var b strings.Builder
	b.WriteString("! series RLC, closed form\n# Hz S RI R 50\n")
	for _, f := range fs {
		w := 2 * math.Pi * f
		z := complex(r, w*l-1/(w*c))
		s := (z - 50) / (z + 50)
		fmt.Fprintf(&b, "%.17g %.17g %.17g\n", f, real(s), imag(s))
	}
	return b.String()
}

// TestMeasuredPartMatchesLumped: a coil "measured" as a one-port made from
// the closed form of its own series R + jωL gives the same solution as
// the lumped part at the measured frequencies (to 1e-6; the file carries
// 17 digits, so the difference is rounding).
func TestMeasuredPartMatchesLumped(t *testing.T) {
	fs := []float64{3.5e6, 7e6, 7.1e6, 7.2e6, 14.2e6, 21.3e6}
	const L, Q = 1.28e-6, 150.0
	var file strings.Builder
	file.WriteString("# Hz S RI R 50\n")
	for _, f := range fs {
		z := refInductorZ(L, lossModel{q: Q}, f)
		s := (z - 50) / (z + 50)
		fmt.Fprintf(&file, "%.17g %.17g %.17g\n", f, real(s), imag(s))
	}
	base := "port in n1 z=50\nport out n3 z=50\ncapacitor C1 n1 gnd 430p q=1000\ncapacitor C3 n2 gnd 740p q=1000\ncapacitor C5 n3 gnd 430p q=1000\ninductor L4 n2 n3 1.28u q=150\n"
	_, lumped := mustParse(t, "l.net", base+"inductor L2 n1 n2 1.28u q=150\n")
	nl, err := Parse("m.net", []byte(base+"inductor L2 n1 n2 1.28u measured=l2.s1p\n"))
	if err != nil {
		t.Fatal(err)
	}
	if err := LoadMeasured(nl, func(string) ([]byte, error) { return []byte(file.String()), nil }); err != nil {
		t.Fatal(err)
	}
	meas, err := Build(nl)
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range fs {
		for _, l := range []Load{{Z: 50}, {Z: complex(20, 35)}, OpenLoad, Short} {
			a, err := lumped.Solve(f, 100, l)
			if err != nil {
				t.Fatal(err)
			}
			b, err := meas.Solve(f, 100, l)
			if err != nil {
				t.Fatal(err)
			}
			for i := range a.Parts {
				pa, pb := a.Parts[i], b.Parts[i]
				if relErr(pb.V, pa.V) > 1e-6 || relErr(pb.I, pa.I) > 1e-6 || relErr(pb.Lambda, pa.Lambda) > 1e-6 ||
					math.Abs(pb.Ploss-pa.Ploss) > 1e-6*math.Max(pa.Ploss, 1e-9) {
					t.Errorf("f=%g load=%v part %s: measured %+v, lumped %+v", f, l, meas.Elements[i].Name, pb, pa)
				}
			}
		}
	}
	// outside the measured span the solve refuses, naming the span
	if _, err := meas.Solve(30e6, 100, Load{Z: 50}); err == nil || !strings.Contains(err.Error(), "m.net:7:34: L2: l2.s1p is measured from 3.5 MHz to 21.3 MHz, and 30 MHz is needed") {
		t.Errorf("outside the span: %v", err)
	}
}

// TestMeasuredSeriesRLC: a one-port from the closed form of a series RLC,
// as a resistor's measured=, gives the same stresses as R, L and C in
// series (to 1e-6 at the measured frequencies).
func TestMeasuredSeriesRLC(t *testing.T) {
	const R, L, C = 2.0, 2.2e-6, 180e-12
	fs := []float64{5e6, 7.1e6, 8e6, 14e6}
	src := seriesRLCFile(R, L, C, fs)
	nl, err := Parse("r.net", []byte("port in n1 z=50\nport out n2 z=50\ncapacitor C1 n1 gnd 100p q=1000\nresistor X n1 n2 1 measured=x.s1p\n"))
	if err != nil {
		t.Fatal(err)
	}
	if err := LoadMeasured(nl, func(string) ([]byte, error) { return []byte(src), nil }); err != nil {
		t.Fatal(err)
	}
	meas, err := Build(nl)
	if err != nil {
		t.Fatal(err)
	}
	_, lumped := mustParse(t, "s.net", "port in n1 z=50\nport out n2 z=50\ncapacitor C1 n1 gnd 100p q=1000\nresistor R n1 a 2\ninductor L a b 2.2u q=1e12\ncapacitor Cs b n2 180p q=1e15\n")
	for _, f := range fs {
		a, _ := lumped.Solve(f, 100, Load{Z: 50})
		b, err := meas.Solve(f, 100, Load{Z: 50})
		if err != nil {
			t.Fatal(err)
		}
		if relErr(b.Zin, a.Zin) > 1e-6 || relErr(b.Parts[1].I, a.Parts[1].I) > 1e-6 {
			t.Errorf("f=%g: Zin %v vs %v, I %v vs %v", f, b.Zin, a.Zin, b.Parts[1].I, a.Parts[1].I)
		}
		// dissipation in the measured part: |I|²·Re Z = |I|²·R
		if d := math.Abs(b.Parts[1].Ploss - a.Parts[1].Ploss); d > 1e-6*a.Parts[1].Ploss {
			t.Errorf("f=%g: P %g vs %g", f, b.Parts[1].Ploss, a.Parts[1].Ploss)
		}
	}
}

// TestLosslessShare: a lossless two-port (a reactive ladder, ABCD cascade
// of Pozar ch. 4, S from the ABCD-to-S table) absorbs nothing:
// 1 − |S11|² − |S21|² = 0 to 1e-12.
func TestLosslessShare(t *testing.T) {
	const z0 = 50.0
	for _, f := range []float64{1e6, 7.1e6, 13e6, 30e6} {
		w := 2 * math.Pi * f
		m := shuntY(complex(0, w*270e-12)).then(seriesZ(complex(0, w*0.84e-6))).then(shuntY(complex(0, w*470e-12))).
			then(seriesZ(complex(0, w*0.84e-6))).then(shuntY(complex(0, w*270e-12)))
		den := m.A + m.B/z0 + m.C*z0 + m.D
		s11 := (m.A + m.B/z0 - m.C*z0 - m.D) / den
		s21 := 2 / den
		if d := DissipatedShare(s11, s21); math.Abs(d) > 1e-12 {
			t.Errorf("f=%g: lossless ladder absorbs %g", f, d)
		}
	}
}

// TestWithQScales: the calibrated netlist scales each q= point and keeps
// everything else; it parses again with the scaled Q.
func TestWithQScales(t *testing.T) {
	src := "port in a z=50\nport out b z=50\ninductor L1 a b 1u q=150@7M,220@21M tol=5% # main coil\ninductor L2 b gnd 2u # no q given\ncapacitor C1 a gnd 100p\n"
	nl, err := Parse("c.net", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	out := nl.WithQScales(map[string]float64{"L1": 0.5, "L2": 0.8}, []string{"calibrated"})
	nl2, err := Parse("c2.net", out)
	if err != nil {
		t.Fatalf("%v\n%s", err, out)
	}
	q1 := nl2.Components[0].Attrs["q"].Points
	if q1[0].V != 75 || q1[1].V != 110 || q1[0].F != 7e6 || q1[1].F != 21e6 {
		t.Errorf("L1 q = %+v", q1)
	}
	if q2 := nl2.Components[1].Attrs["q"].Points; q2[0].V != DefaultInductorQ*0.8 {
		t.Errorf("L2 q = %+v", q2)
	}
	if !strings.Contains(string(out), "tol=5% # main coil") || !strings.HasPrefix(string(out), "# calibrated\n") {
		t.Errorf("text not kept:\n%s", out)
	}
}
