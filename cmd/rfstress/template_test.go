package main

import (
	"math"
	"strings"
	"testing"

	"rfstress/circuits"
)

// TestTemplatesAuditClean: every shape, written as is, audits ok (exit 0)
// at a few frequencies and powers.
func TestTemplatesAuditClean(t *testing.T) {
	for _, shape := range []string{"lowpass", "bandpass", "tuner", "pi"} {
		for _, c := range []struct{ freq, power string }{{"3.6M", "100"}, {"14.2M", "400"}, {"28.5M", "50"}} {
			code, src, errs := runCLI(t, "template", shape, "--freq", c.freq, "--power", c.power)
			if code != 0 {
				t.Fatalf("%s %s: exit %d: %s", shape, c.freq, code, errs)
			}
			f := writeFile(t, shape+".net", src)
			code, out, errs := runCLI(t, "audit", f)
			if code != 0 || !strings.Contains(out, "OVERALL  OK") {
				t.Errorf("%s at %s, %s W: audit exit %d, want 0 (clean as written)\n%s%s", shape, c.freq, c.power, code, out, errs)
			}
			if !strings.Contains(src, "CAUTION") {
				t.Errorf("%s: template lacks the caution", shape)
			}
		}
	}
}

// templateParts parses a template's output.
func templateParts(t *testing.T, args ...string) *circuits.Netlist {
	t.Helper()
	code, src, errs := runCLI(t, append([]string{"template"}, args...)...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	nl, err := circuits.Parse("t.net", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	return nl
}

// TestLowpassTemplateGValues: the lowpass values are the prototype
// g-values scaled as C = g/(2π·fc·R), L = g·R/(2π·fc), checked against the
// tabulated values of Matthaei, Young & Jones 1964, Tables 4.05-1 and
// 4.05-2(a) (from memory: n=5 Butterworth 0.6180 1.6180 2.0000; n=5 0.1 dB
// Chebyshev 1.1468 1.3712 1.9750; n=3 0.1 dB Chebyshev 1.0316 1.1474).
// Tolerance 1e-3 relative: the table has four decimals and the netlist
// writes four significant figures.
func TestLowpassTemplateGValues(t *testing.T) {
	cases := []struct {
		args []string
		g    []float64
	}{
		{[]string{"--response", "butterworth", "--poles", "5"}, []float64{0.6180, 1.6180, 2.0000, 1.6180, 0.6180}},
		{[]string{"--poles", "5", "--ripple", "0.1"}, []float64{1.1468, 1.3712, 1.9750, 1.3712, 1.1468}},
		{[]string{"--poles", "3", "--ripple", "0.1"}, []float64{1.0316, 1.1474, 1.0316}},
	}
	const r, fc = 50.0, 10e6
	wc := 2 * math.Pi * fc
	for _, c := range cases {
		nl := templateParts(t, append([]string{"lowpass", "--freq", "7M", "--cutoff", "10M"}, c.args...)...)
		if len(nl.Components) != len(c.g) {
			t.Fatalf("%v: %d parts, want %d", c.args, len(nl.Components), len(c.g))
		}
		for k, p := range nl.Components {
			want := c.g[k] / (wc * r)
			if p.Kind == circuits.Inductor {
				want = c.g[k] * r / wc
			}
			if math.Abs(p.Value/want-1) > 1e-3 {
				t.Errorf("%v %s = %g, want %g (g%d = %.4f)", c.args, p.Name, p.Value, want, k+1, c.g[k])
			}
			if shunt := p.B == circuits.Ground; shunt != (k%2 == 0) {
				t.Errorf("%v: %s should be %s", c.args, p.Name, map[bool]string{true: "shunt", false: "series"}[k%2 == 0])
			}
		}
	}
}

// TestTunerTemplateMatches: the T-network's lossless values match 50 Ω to
// the load: the input impedance computed by hand from the written values
// (series C1, shunt L1, series C2 into ZL) is 50 Ω within 1 % (the values
// are written to four significant figures).
func TestTunerTemplateMatches(t *testing.T) {
	nl := templateParts(t, "tuner", "--freq", "7.1M", "--load", "12.5-j180")
	w := 2 * math.Pi * 7.1e6
	v := map[string]float64{}
	for _, p := range nl.Components {
		v[p.Name] = p.Value
	}
	zl := complex(12.5, -180)
	z := zl + complex(0, -1/(w*v["C2"]))
	zL := complex(0, w*v["L1"])
	z = z * zL / (z + zL)
	z += complex(0, -1/(w*v["C1"]))
	if math.Abs(real(z)-50) > 0.5 || math.Abs(imag(z)) > 0.5 {
		t.Errorf("input impedance %v, want 50 Ω", z)
	}
}

// TestPiTemplateMatches: the pi network's values match 50 Ω to 50 Ω with
// the loaded Q asked, by the same hand calculation.
func TestPiTemplateMatches(t *testing.T) {
	nl := templateParts(t, "pi", "--freq", "3.6M", "--z", "200", "--load", "50", "--q", "4")
	w := 2 * math.Pi * 3.6e6
	v := map[string]float64{}
	for _, p := range nl.Components {
		v[p.Name] = p.Value
	}
	z := complex(50, 0)
	yc2 := complex(0, w*v["C2"])
	z = 1 / (1/z + yc2)
	z += complex(0, w*v["L1"])
	z = 1 / (1/z + complex(0, w*v["C1"]))
	if math.Abs(real(z)-200)/200 > 0.01 || math.Abs(imag(z)) > 2 {
		t.Errorf("input impedance %v, want 200 Ω", z)
	}
}

func TestTemplateUsage(t *testing.T) {
	for _, args := range [][]string{
		{"template"}, {"template", "notch", "--freq", "7M"}, {"template", "lowpass"},
		{"template", "lowpass", "--freq", "7M", "--poles", "4"}, {"template", "lowpass", "--freq", "7M", "--cutoff", "5M"},
		{"template", "pi", "--freq", "7M", "--load", "50+j10"},
	} {
		if code, _, errs := runCLI(t, args...); code != 2 || errs == "" {
			t.Errorf("%v: exit %d, want 2 with a message", args, code)
		}
	}
}

// TestStdinNetlist: "-" reads the netlist from stdin; errors name it.
func TestStdinNetlist(t *testing.T) {
	_, src, _ := runCLI(t, "template", "pi", "--freq", "7M")
	old := stdin
	defer func() { stdin = old }()
	stdin = strings.NewReader(src)
	if code, out, errs := runCLI(t, "audit", "-"); code != 0 || !strings.Contains(out, "== stdin") {
		t.Errorf("audit -: exit %d\n%s%s", code, out, errs)
	}
	stdin = strings.NewReader("capacitor C1 a gnd 1q\n")
	if code, _, errs := runCLI(t, "audit", "-"); code != 2 || !strings.Contains(errs, "stdin:1:") {
		t.Errorf("bad stdin netlist: exit %d, stderr %q; want 2 and stdin:line:col", code, errs)
	}
	if code, _, _ := runCLI(t, "audit", "-", "-"); code != 2 {
		t.Errorf("stdin twice: exit %d, want 2", code)
	}
}
