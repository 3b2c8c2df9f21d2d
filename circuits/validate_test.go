package circuits

import (
	"math"
	"strings"
	"testing"
)

// TestSlipsAreErrors: slips that used to change the circuit silently are
// input errors at the offending text, each with the exact message. Every
// case starts from base (a valid pi lowpass) and makes one slip.
func TestSlipsAreErrors(t *testing.T) {
	const gh = " (ground is written gnd, in lower case; give another name to a node that is not ground)"
	cases := []struct {
		name, text, want string
	}{
		// ground spelt otherwise: read as an ordinary node it floats the
		// shunt parts, and the filter passes where it fails
		{"GND", strings.Replace(base, "C1 n1 gnd", "C1 n1 GND", 1), "t.net:4:17: node GND looks like ground but is not the ground node" + gh},
		{"Gnd", strings.Replace(base, "C2 n2 gnd", "C2 n2 Gnd", 1), "t.net:6:17: node Gnd looks like ground but is not the ground node" + gh},
		{"0", strings.Replace(base, "C1 n1 gnd", "C1 n1 0", 1), "t.net:4:17: node 0 looks like ground but is not the ground node" + gh},
		{"ground", strings.Replace(base, "C1 n1 gnd", "C1 n1 ground", 1), "t.net:4:17: node ground looks like ground but is not the ground node" + gh},
		{"GROUND first", strings.Replace(base, "C1 n1 gnd", "C1 GROUND n1", 1), "t.net:4:14: node GROUND looks like ground but is not the ground node" + gh},
		{"port on GND", strings.Replace(base, "port out n2", "port out GND", 1), "t.net:3:10: port out on the ground node (a node other than gnd)"},
		// a node only one part touches: a misspelt node name
		{"typo node", strings.Replace(base, "L1 n1 n2", "L1 n1 N2", 1), "t.net:5:16: node N2 is touched only by inductor L1 (a node joins two or more parts, or a part and a port; check the spelling)"},
		{"stray part end", base + "capacitor C3 n2 n7 100p\n", "t.net:7:17: node n7 is touched only by capacitor C3 (a node joins two or more parts, or a part and a port; check the spelling)"},
		// couplings no windings can have
		{"same pair twice", base + "inductor L2 n2 gnd 1u\ncoupling K1 L1 L2 k=0.6\ncoupling K2 L2 L1 k=0.6\n",
			"t.net:9:10: coupling K2 couples L2 and L1 again (coupling K1 at line 8) (one coupling line per pair of inductors)"},
		{"matrix not definite", base + "inductor L2 n2 gnd 1u\ninductor L3 n1 gnd 1u\ncoupling K1 L1 L2 k=0.8\ncoupling K2 L1 L3 k=0.8\n",
			"t.net:10:10: couplings K1 (line 9), K2 (line 10) are not physically realisable together: their inductance matrix is not positive definite (smaller k: coupled windings store positive energy for any currents, so the matrix of k (1 on the diagonal) must be positive definite)"},
		// values that make the solve meaningless
		{"C 1e-320", strings.Replace(base, "300p q=1000\ninductor", "1e-320 q=1000\ninductor", 1), "t.net:4:21: capacitor value 1e-320 is outside the range a solve can trust (accepted range 1 fF to 1 F)"},
		{"L 1e30", strings.Replace(base, "n2 1u", "n2 1e30", 1), "t.net:5:19: inductor value 1e30 is outside the range a solve can trust (accepted range 1 pH to 1 H)"},
		{"R 1e-300", base + "resistor R1 n2 gnd 1e-300\n", "t.net:7:20: resistor value 1e-300 is outside the range a solve can trust (accepted range 1 nΩ to 1000 GΩ)"},
		{"q 1e-300", strings.Replace(base, "q=200", "q=1e-300", 1), "t.net:5:24: q=1e-300: 1e-300 is outside the range a solve can trust (accepted range 0.1 to 1e+18)"},
		{"z 1e300", strings.Replace(base, "port out n2 z=50", "port out n2 z=1e300", 1), "t.net:3:15: z=1e300: |z| 1e+300 Ω is outside the range a solve can trust (accepted range 1 mΩ to 1 GΩ)"},
		{"wire 1e-300mm", strings.Replace(base, "q=200", "q=200 wire=1e-300mm", 1), "t.net:5:33: wire=1e-300mm: 1e-303 m is outside the range a solve can trust (accepted range 1 µm to 10 m)"},
		{"q at 1e308 Hz", strings.Replace(base, "q=200", "q=200@1e308", 1), "t.net:5:24: q=200@1e308: frequency 1e+308 Hz is outside the range a solve can trust (accepted range 1 Hz to 100 GHz)"},
		{"NaN k", base + "inductor L2 n2 gnd 1u\ncoupling K1 L1 L2 k=NaN\n", `t.net:8:21: bad k=: "NaN" is not a number (coupling coefficient between 0 and 1)`},
		{"Inf q", strings.Replace(base, "q=200", "q=Inf", 1), `t.net:5:24: bad q=: "Inf" is not a number (Q, or Q@frequency points such as 90@3.5M,180@10M)`},
		// an echoed value is cut to about 60 characters
		{"long value", strings.Replace(base, "q=200", "q="+strings.Repeat("9x", 5000), 1),
			`t.net:5:24: bad q=: "` + strings.Repeat("9x", 29) + `9…" has an unknown prefix or unit "` + strings.Repeat("x9", 29) + `x…" (SI prefixes f p n u µ m k M G, then a unit) (Q, or Q@frequency points such as 90@3.5M,180@10M)`},
		// control characters are shown as escapes, never sent as they are
		{"escape in keyword", base + "\x1b[2Jcapacitor C3 n2 gnd 1p\n", `t.net:7:1: unknown keyword "\x1b[2Jcapacitor" (one of ` + keywordList() + ")"},
		{"bidi in value", strings.Replace(base, "q=200", "q=2\u202e00", 1), `t.net:5:24: bad q=: "2\u202e00" has an unknown prefix or unit "\u202e00" (SI prefixes f p n u µ m k M G, then a unit) (Q, or Q@frequency points such as 90@3.5M,180@10M)`},
	}
	for _, tc := range cases {
		_, err := Parse("t.net", []byte(tc.text))
		if err == nil {
			t.Errorf("%s: no error, want %q", tc.name, tc.want)
			continue
		}
		if got := err.Error(); got != tc.want {
			t.Errorf("%s:\n got: %s\nwant: %s", tc.name, got, tc.want)
		}
	}
}

// TestLegitimateNetlistsStillParse: what the new checks must let through.
func TestLegitimateNetlistsStillParse(t *testing.T) {
	cases := map[string]string{
		// a port node with a single part: the port is the other connection
		"series part at a port": "port in a z=50\nport out b z=50\nresistor R a b 10\ncapacitor C b gnd 100p\n",
		// a realisable three-winding set: 1 − 0.36 − 0.36 > 0 (positive definite)
		"three windings": base + "inductor L2 n2 gnd 1u\ninductor L3 n1 gnd 1u\ncoupling K1 L1 L2 k=0.6\ncoupling K2 L1 L3 k=0.6\n",
		// names that merely contain gnd or 0 are ordinary nodes
		"gnd-like names": "port in n0 z=50\nport out gnd2 z=50\nresistor R n0 gnd2 10\ncapacitor C gnd2 gnd 10p\ncapacitor D n0 gnd 10p\n",
		// a byte-order mark from an editor is skipped
		"BOM": "\ufeff" + base,
	}
	for name, src := range cases {
		if _, err := Parse("t.net", []byte(src)); err != nil {
			t.Errorf("%s: %v", name, err)
		}
	}
	// the mark takes no column: an error on line 1 is still at column 1
	_, err := Parse("t.net", []byte("\ufefftitl x\n"+base))
	if err == nil || !strings.HasPrefix(err.Error(), "t.net:1:1: unknown keyword \"titl\"") {
		t.Errorf("after a byte-order mark: %v", err)
	}
}

// TestCholesky against the worked example of a 3×3 positive definite
// matrix whose factor is [[2,0,0],[6,1,0],[−8,5,3]] (the standard textbook
// example, e.g. Wikipedia "Cholesky decomposition"; checkable by hand:
// L·Lᵀ gives back the matrix). Exact in floating point.
func TestCholesky(t *testing.T) {
	a := []float64{4, 12, -16, 12, 37, -43, -16, -43, 98}
	if !Cholesky(a, 3) {
		t.Fatal("positive definite matrix refused")
	}
	want := map[[2]int]float64{{0, 0}: 2, {1, 0}: 6, {1, 1}: 1, {2, 0}: -8, {2, 1}: 5, {2, 2}: 3}
	for ij, v := range want {
		if got := a[ij[0]*3+ij[1]]; got != v {
			t.Errorf("L[%d][%d] = %g, want %g", ij[0], ij[1], got, v)
		}
	}
	// k12 = k13 = 0.8 with L2, L3 uncoupled: det = 1 − 0.64 − 0.64 < 0
	if Cholesky([]float64{1, 0.8, 0.8, 0.8, 1, 0, 0.8, 0, 1}, 3) {
		t.Error("indefinite coupling matrix accepted")
	}
	// k = 1 − 1e-14: a pivot of 2e-14, within rounding of k = 1: refused
	k := 1 - 1e-14
	if Cholesky([]float64{1, k, k, 1}, 2) {
		t.Error("coupling within rounding of k = 1 accepted")
	}
}

// TestEscape: every control character that can rewrite a terminal line
// or reorder text becomes a visible escape; ordinary text (µ, Ω, °) is kept.
func TestEscape(t *testing.T) {
	cases := map[string]string{
		"plain µH Ω °C":    "plain µH Ω °C",
		"a\x1b[31mred":     `a\x1b[31mred`,
		"over\rwrite":      `over\rwrite`,
		"nul\x00":          `nul\x00`,
		"line\nbreak":      `line\nbreak`,
		"c1\u0085x":        `c1\u0085x`,
		"bidi\u202eevil":   `bidi\u202eevil`,
		"iso\u2066x\u2069": `iso\u2066x\u2069`,
		"bad\xffbyte":      `bad\xffbyte`,
	}
	for in, want := range cases {
		if got := Escape(in); got != want {
			t.Errorf("Escape(%q) = %q, want %q", in, got, want)
		}
	}
	if got := Shorten(strings.Repeat("é", 100), 60); len([]rune(got)) != 60 || !strings.HasSuffix(got, "…") {
		t.Errorf("Shorten: %q", got)
	}
	// the file name of a position is escaped too: no forged line
	e := &Error{Pos: Pos{"a\nOVERALL OK.net", 1, 1}, Msg: "x"}
	if strings.Contains(e.Error(), "\n") {
		t.Errorf("newline from a file name reached the message: %q", e.Error())
	}
}

// TestRangesHoldRealParts: the accepted ranges sit well outside real HF
// parts (common practice: HF filter capacitors 1 pF to 100 nF, inductors
// 10 nH to 100 µH, and a resonance anywhere in 1 Hz…100 GHz keeps the
// matrix entries within 1e30 of one another).
func TestRangesHoldRealParts(t *testing.T) {
	for _, c := range []float64{1e-12, 100e-9} {
		if !valueRanges[Capacitor].Holds(c) {
			t.Errorf("capacitor %g refused", c)
		}
	}
	for _, l := range []float64{10e-9, 100e-6} {
		if !valueRanges[Inductor].Holds(l) {
			t.Errorf("inductor %g refused", l)
		}
	}
	// worst spread of |Z| over the accepted values and frequencies
	w := []float64{2 * math.Pi * FreqRange.Lo, 2 * math.Pi * FreqRange.Hi}
	zmax := w[1] * valueRanges[Inductor].Hi
	zmin := w[0] * valueRanges[Inductor].Lo
	if r := zmax / zmin; r > 1e40 {
		t.Errorf("inductor impedance spread %g", r)
	}
}
