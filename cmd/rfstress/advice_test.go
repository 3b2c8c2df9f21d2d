package main

import (
	"os"
	"strings"
	"testing"
)

// TestHeatingGuideOnlyIsSaidToBeAdvice: a 40 m lowpass coil of 16 turns on
// an iron ring (µ≈10, 13×8×5 mm, so Ae ≈ 2.5 mm × 5 mm = 12.5 mm²)
// carries about 87 V rms at 7.1 MHz at 100 W. The transformer EMF equation
// B = V/(4.44·f·N·Ae) gives 87/(4.44·7.1e6·16·12.5e-6) ≈ 14 mT at PEP, far
// below an iron core's saturation (about 1 T, common practice) but above a
// heating guide of a few mT. The part is marginal on advice only: the
// overall line must not claim that a derated limit is exceeded, and the
// part's row must say the heating guide, not the rated quantity it names,
// is what marks it.
func TestHeatingGuideOnlyIsSaidToBeAdvice(t *testing.T) {
	t.Setenv("COLUMNS", "")
	net := writeFile(t, "lpf40.net", `title 40 m lowpass on iron rings
port in n1 z=50
port out n3 z=50
core T1 od=13mm id=8mm h=5mm material=iron mu=10
capacitor C1 n1 gnd 390p dielectric=mica vpk=500 irms=3
inductor L2 n1 n2 1.2u q=150 core=T1 turns=16 wire=0.8mm
capacitor C3 n2 gnd 680p dielectric=mica vpk=500 irms=4
inductor L4 n2 n3 1.2u q=150 core=T1 turns=16 wire=0.8mm
capacitor C5 n3 gnd 390p dielectric=mica vpk=500 irms=3
audit power=100 mode=cw freq=7.1M swr=1 harmonics=none
`)
	code, text, errText := runCLI(t, "audit", net)
	// a guide is advice: by default it does not fail a build's check;
	// --fail-on advice asks that it does
	if code != 0 {
		t.Errorf("advice-only marginal: exit %d, want 0 under the default --fail-on", code)
	}
	for _, fo := range []struct {
		level string
		want  int
	}{{"advice", 1}, {"unrated", 0}, {"marginal", 0}, {"fail", 0}, {"never", 0}} {
		if c, _, e := runCLI(t, "audit", net, "--fail-on", fo.level); c != fo.want {
			t.Errorf("--fail-on %s: exit %d, want %d (%s)", fo.level, c, fo.want, e)
		}
	}
	if !strings.Contains(text, "MARGINAL") {
		t.Fatalf("expected the heating guide to mark the coils marginal:\n%s%s", text, errText)
	}
	if strings.Contains(text, "exceed their derated limits") {
		t.Errorf("overall line claims a derated limit is exceeded, but only the heating guide (advice) is:\n%s", text)
	}
	if !strings.Contains(text, "advice only") || !strings.Contains(text, "marginal only by the heating guide (advice)") {
		t.Errorf("text does not say the marginal verdict is advice only:\n%s", text)
	}
	js := writeFile(t, "out.json", "")
	if _, _, e := runCLI(t, "audit", net, "--json", js); e != "" && !strings.Contains(e, "CAUTION") {
		t.Logf("stderr: %s", e)
	}
	if b, err := os.ReadFile(js); err != nil || !strings.Contains(string(b), `"verdict_advice_only": true`) {
		t.Errorf("JSON does not mark the verdict advice only: %s", b)
	}
	// A rated limit still reads as before: C3's irms=0.5 A against ≈2.3 A
	// (I = V/Xc, Xc = 1/(2π·7.1 MHz·680 pF) ≈ 33 Ω, V ≈ 75 V rms) fails.
	src, err := os.ReadFile(net)
	if err != nil {
		t.Fatal(err)
	}
	net2 := writeFile(t, "lpf40b.net", strings.Replace(string(src), "680p dielectric=mica vpk=500 irms=4", "680p dielectric=mica vpk=500 irms=0.5", 1))
	code, text, _ = runCLI(t, "audit", net2)
	if strings.Contains(text, "advice only") {
		t.Errorf("a failing rated part is called advice only:\n%s", text)
	}
	if code != 1 {
		t.Errorf("a failing rated part: exit %d, want 1", code)
	}
}
