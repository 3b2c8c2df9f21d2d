package circuits

import (
	"math"
	"strings"
	"testing"
)

// SI prefixes and units (BIPM, The International System of Units, 9th
// edition, 2019, table 7 for prefixes): f 1e-15, p 1e-12, n 1e-9,
// µ 1e-6 (u where the keyboard has no µ), m 1e-3, k 1e3, M 1e6, G 1e9;
// M is mega and m is milli.

func TestParseValue(t *testing.T) {
	cases := []struct {
		in   string
		want []string
		v    float64
	}{
		{"300p", []string{"F"}, 300e-12},
		{"300pF", []string{"F"}, 300e-12},
		{"1.5f", nil, 1.5e-15},
		{"4.7nF", []string{"F"}, 4.7e-9},
		{"0.91u", []string{"H"}, 0.91e-6},
		{"0.91uH", []string{"H"}, 0.91e-6},
		{"10µH", []string{"H"}, 10e-6},
		{"10μH", []string{"H"}, 10e-6}, // Greek small mu, U+03BC
		{"100mH", []string{"H"}, 0.1},
		{"2.2k", []string{"ohm"}, 2200},
		{"2.2K", []string{"ohm"}, 2200},
		{"2.2kohm", []string{"ohm"}, 2200},
		{"2.2kΩ", []string{"ohm"}, 2200},
		{"50Ohm", []string{"ohm"}, 50},
		{"50Ω", []string{"ohm"}, 50},
		{"50mohm", []string{"ohm"}, 0.05},
		{"1M", nil, 1e6},
		{"1m", nil, 1e-3}, // milli when no unit is asked for
		{"10.1MHz", []string{"Hz"}, 10.1e6},
		{"1.2GHz", []string{"Hz"}, 1.2e9},
		{"137kHz", []string{"Hz"}, 137e3},
		{"500V", []string{"V"}, 500},
		{"3.5kV", []string{"V"}, 3500},
		{"4A", []string{"A"}, 4},
		{"250mA", []string{"A"}, 0.25},
		{"100W", []string{"W"}, 100},
		{"1.5kW", []string{"W"}, 1500},
		{"15mT", []string{"T"}, 0.015},
		{"0.8mm", []string{"m"}, 0.8e-3},
		{"2m", []string{"m"}, 2}, // metres when metres are asked for
		{"42mm", []string{"m"}, 0.042},
		{"15.5mm2", []string{"mm2"}, 15.5e-6},
		{"15.5mm²", []string{"mm2"}, 15.5e-6},
		{"9cm2", []string{"mm2"}, 9e-4},
		{"9cm²", []string{"mm2"}, 9e-4},
		{"5%", []string{"%"}, 0.05},
		{"0.1%", []string{"%"}, 0.001},
		{"40°C", []string{"C"}, 40},
		{"-20°C", []string{"C"}, -20},
		{"125C", []string{"C"}, 125},
		{"1e3", nil, 1000},
		{"1E-3", nil, 1e-3},
		{"2.5e-3k", nil, 2.5},
		{".5p", nil, 0.5e-12},
		{"+7", nil, 7},
		{"-3.3", nil, -3.3},
		{"0", nil, 0},
	}
	for _, tc := range cases {
		got, err := ParseValue(tc.in, tc.want...)
		if err != nil {
			t.Errorf("ParseValue(%q, %v): %v", tc.in, tc.want, err)
			continue
		}
		if math.Abs(got-tc.v) > 1e-14*math.Abs(tc.v) {
			t.Errorf("ParseValue(%q, %v) = %g, want %g", tc.in, tc.want, got, tc.v)
		}
	}
}

func TestParseValueErrors(t *testing.T) {
	cases := []struct {
		in   string
		want []string
		msg  string
	}{
		{"", nil, "empty value"},
		{"abc", nil, `"abc" is not a number`},
		{"NaN", nil, `"NaN" is not a number`},
		{"Inf", nil, `"Inf" is not a number`},
		{"1e999", nil, `"1e999" is not a finite number`},
		{"1.2.3", nil, `"1.2.3" is not a finite number`},
		{"100x", nil, `"100x" has an unknown prefix or unit "x" (SI prefixes f p n u µ m k M G, then a unit)`},
		{"3T", []string{"F"}, "unit T (a flux density) does not fit here (unit F, a capacitance)"},
		{"10pH", []string{"F"}, "unit H (an inductance) does not fit here (unit F, a capacitance)"},
		{"4.7uF", []string{"H"}, "unit F (a capacitance) does not fit here (unit H, an inductance)"},
		{"1kHz", []string{"ohm"}, "unit Hz (a frequency) does not fit here (unit ohm, a resistance)"},
		{"5%", []string{"F"}, "unit % (a share) does not fit here (unit F, a capacitance)"},
		{"15mm2", []string{"m"}, "unit mm2 (an area) does not fit here (unit m, a length)"},
		{"9cm2", []string{"H"}, "unit cm2 (an area) does not fit here (unit H, an inductance)"},
		{"1cm", []string{"F"}, `"1cm" has an unknown prefix or unit "cm" (SI prefixes f p n u µ m k M G, then a unit)`},
		{"10MEG", nil, `"10MEG": MEG is how circuit simulators spell mega; here write M for mega (m is milli), e.g. 10M`},
		{"1meg", []string{"ohm"}, `"1meg": MEG is how circuit simulators spell mega; here write M for mega (m is milli), e.g. 1M`},
		{"7.1Mhz", []string{"Hz"}, `"7.1Mhz" has an unknown unit "hz" (units are case-sensitive: write Hz, e.g. 7.1MHz)`},
		{"7.1mhz", []string{"Hz"}, `"7.1mhz" has an unknown unit "hz" (m is milli: for megahertz write 7.1MHz (units are case-sensitive))`},
		{"1uH", []string{"F"}, "unit H (an inductance) does not fit here (unit F, a capacitance)"},
		{"3pX", []string{"F"}, `"3pX" has an unknown unit "X" (expected unit F)`},
	}
	for _, tc := range cases {
		_, err := ParseValue(tc.in, tc.want...)
		if err == nil {
			t.Errorf("ParseValue(%q, %v): no error, want %q", tc.in, tc.want, tc.msg)
			continue
		}
		if err.Error() != tc.msg {
			t.Errorf("ParseValue(%q, %v): error %q, want %q", tc.in, tc.want, err, tc.msg)
		}
	}
}

func TestParseComplex(t *testing.T) {
	cases := []struct {
		in string
		z  complex128
	}{
		{"50", 50},
		{"50ohm", 50},
		{"50Ω", 50},
		{"12.5-j180", complex(12.5, -180)},
		{"12.5+j180", complex(12.5, 180)},
		{"12.5+j1.2k", complex(12.5, 1200)},
		{"1k-j1k", complex(1000, -1000)},
		{"-j50", complex(0, -50)},
		{"j25ohm", complex(0, 25)},
		{"+j25", complex(0, 25)},
		{"0.5-j0.1", complex(0.5, -0.1)},
		{"500m", 0.5}, // milli-ohms, not metres
		{"20m+j300m", complex(0.02, 0.3)},
		{"2.2k", 2200},
		{"1e3-j2e2", complex(1000, -200)},
	}
	for _, tc := range cases {
		got, err := ParseComplex(tc.in)
		if err != nil {
			t.Errorf("ParseComplex(%q): %v", tc.in, err)
			continue
		}
		if relErr(got, tc.z) > 1e-14 {
			t.Errorf("ParseComplex(%q) = %v, want %v", tc.in, got, tc.z)
		}
	}
	for _, bad := range []struct{ in, msg string }{
		{"", "empty impedance"},
		{"ohm", "empty impedance"},
		{"12.5-j", `"12.5-j": expected a number after j, as in 12.5-j180`},
		{"12.5+j-3", `"12.5+j-3": expected a number after j, as in 12.5-j180`},
		{"12.5-jx", `"x" is not a number`},
		{"j", `"j": expected a number after j, as in 12.5-j180`},
		{"50V", "unit V (a voltage) does not fit here (unit ohm, a resistance)"},
		{"50pF", "unit F (a capacitance) does not fit here (unit ohm, a resistance)"},
		{"5%", "unit % (a share) does not fit here (unit ohm, a resistance)"},
		{"NaN", `"NaN" is not a number`},
	} {
		_, err := ParseComplex(bad.in)
		if err == nil || err.Error() != bad.msg {
			t.Errorf("ParseComplex(%q): error %v, want %q", bad.in, err, bad.msg)
		}
	}
}

func TestFormatSI(t *testing.T) {
	cases := []struct {
		v    float64
		unit string
		want string
	}{
		{1234, "V", "1.23 kV"},
		{70.71068, "V", "70.7 V"},
		{100, "V", "100 V"},
		{1e-6, "F", "1.00 µF"},
		{4.7e-6, "H", "4.70 µH"},
		{330e-12, "F", "330 pF"},
		{50, "Ω", "50.0 Ω"},
		{2200, "Ω", "2.20 kΩ"},
		{0.05, "Ω", "50.0 mΩ"},
		{10.1e6, "Hz", "10.1 MHz"},
		{1.2e9, "Hz", "1.20 GHz"},
		{999.96, "V", "1.00 kV"}, // rounds up into the next prefix
		{0.99996, "A", "1.00 A"},
		{9.996, "W", "10.0 W"},
		{99.96, "W", "100 W"},
		{-3.3e-3, "A", "-3.30 mA"},
		{0, "W", "0 W"},
		{2e-15, "F", "2.00 fF"},
	}
	for _, tc := range cases {
		if got := FormatSI(tc.v, tc.unit); got != tc.want {
			t.Errorf("FormatSI(%g, %q) = %q, want %q", tc.v, tc.unit, got, tc.want)
		}
	}
	// never NaN or Inf in what a user reads
	for _, v := range []float64{math.NaN(), math.Inf(1), math.Inf(-1), 1e300, -1e300, 1e-300, 5e-324, math.MaxFloat64} {
		s := FormatSI(v, "V")
		if strings.Contains(s, "NaN") || strings.Contains(s, "Inf") || s == "" {
			t.Errorf("FormatSI(%g) = %q", v, s)
		}
	}
	if got := FormatSI(math.NaN(), "V"); got != "—" {
		t.Errorf("FormatSI(NaN) = %q, want —", got)
	}
	for _, z := range []complex128{complex(12.5, -180), complex(math.NaN(), 1), complex(math.Inf(1), math.Inf(-1))} {
		s := FormatComplex(z)
		if strings.Contains(s, "NaN") || strings.Contains(s, "Inf") || !strings.HasSuffix(s, " Ω") {
			t.Errorf("FormatComplex(%v) = %q", z, s)
		}
	}
	if got := FormatComplex(complex(12.5, -180)); got != "12.5-j180 Ω" {
		t.Errorf("FormatComplex(12.5-j180) = %q", got)
	}
}

// TestInterpLogLog: straight lines on log-log axes, held at the ends.
func TestInterpLogLog(t *testing.T) {
	pts := []Point{{V: 100, F: 1e6}, {V: 400, F: 4e6}, {V: 200, F: 16e6}}
	ref := lossModel{qf: [][2]float64{{100, 1e6}, {400, 4e6}, {200, 16e6}}}
	for _, f := range []float64{1e5, 1e6, 1.5e6, 2e6, 3.9e6, 4e6, 8e6, 15e6, 16e6, 1e8} {
		got, want := InterpLogLog(pts, f), ref.qAt(f)
		if math.Abs(got-want) > 1e-12*want {
			t.Errorf("InterpLogLog at %g Hz = %g, want %g", f, got, want)
		}
	}
	if got := InterpLogLog(pts, 2e6); math.Abs(got-200) > 1e-9 {
		t.Errorf("halfway in log f between 100@1M and 400@4M: %g, want 200", got)
	}
	if got := InterpLogLog([]Point{{V: 42}}, 1e9); got != 42 {
		t.Errorf("a constant reads %g, want 42", got)
	}
}

// TestAWGDiameter checks the gauge rule against the bare-wire diameters
// tabulated in ASTM B258 (from memory, inches to four decimals: 0000
// 0.4600, 10 0.1019, 18 0.0403, 24 0.0201, 36 0.0050). Tolerance half the
// table's last digit, 0.00005 in.
func TestAWGDiameter(t *testing.T) {
	for _, c := range []struct {
		n      int
		inches float64
	}{{-3, 0.4600}, {10, 0.1019}, {18, 0.0403}, {24, 0.0201}, {36, 0.0050}} {
		if d := AWGDiameter(c.n) / 25.4e-3; math.Abs(d-c.inches) > 0.00005 {
			t.Errorf("AWG %d: %.5f in, want %.4f in (ASTM B258)", c.n, d, c.inches)
		}
	}
	for _, s := range []string{"18awg", "18AWG", "AWG18", "awg 18"} {
		if n, ok := parseAWG(s); !ok || n != 18 {
			t.Errorf("parseAWG(%q) = %d, %v; want 18", s, n, ok)
		}
	}
	for _, s := range []string{"awg", "99awg", "-1awg", "x18awg"} {
		if _, ok := parseAWG(s); ok {
			t.Errorf("parseAWG(%q) accepted", s)
		}
	}
}

// TestWireGaugeAndCentimetres: wire=18awg reads as 1.024 mm (ASTM B258:
// 0.0403 in), and lengths may be written in centimetres.
func TestWireGaugeAndCentimetres(t *testing.T) {
	src := "title t\nport in a z=50\nport out b z=50\ncore K od=2.5cm id=1.4cm h=1cm material=iron mu=10\n" +
		"inductor L1 a b 1u core=K turns=8 wire=18awg\ncapacitor C1 b gnd 100p\n"
	nl, err := Parse("t.net", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	w, _ := nl.Components[0].Attrs.Num("wire")
	if math.Abs(w-0.0403*25.4e-3) > 0.00005*25.4e-3 {
		t.Errorf("wire=18awg read as %g m, want 1.024 mm", w)
	}
	od, _ := nl.Cores[0].Attrs.Num("od")
	if math.Abs(od-0.025) > 1e-12 {
		t.Errorf("od=2.5cm read as %g m, want 0.025", od)
	}
}
