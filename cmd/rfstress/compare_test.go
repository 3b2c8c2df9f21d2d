package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// A 5-pole lowpass whose "built" twin has coils of lower Q: the bench
// sweep is made with the tool's own response export of the twin, so the
// fit has a known answer (Q × 0.5), and the calibrated netlist written by
// --out must give the twin's loss back.
const cmpModel = `title compare check
port in n1 z=50
port out n4 z=50
capacitor C1 n1 gnd 470p q=1500 vpk=500
inductor  L2 n1 n2 1.2u q=200
capacitor C3 n2 gnd 820p q=1500 vpk=500
inductor  L4 n2 n4 1.2u q=200
capacitor C5 n4 gnd 470p q=1500 vpk=500
audit power=100 band=7M:7.2M points=3
`

func TestCompareCommand(t *testing.T) {
	dir := t.TempDir()
	model := filepath.Join(dir, "lpf.net")
	built := filepath.Join(dir, "built.net")
	if err := os.WriteFile(model, []byte(cmpModel), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(built, []byte(strings.ReplaceAll(cmpModel, "q=200", "q=100")), 0o644); err != nil {
		t.Fatal(err)
	}
	sweep := filepath.Join(dir, "built.s2p")
	if code, _, errs := runCLI(t, "response", built, "--from", "1M", "--to", "70M", "--points", "300", "--touchstone", sweep); code != 0 {
		t.Fatalf("response: %d %s", code, errs)
	}
	cal := filepath.Join(dir, "cal.net")
	code, out, errs := runCLI(t, "compare", model, sweep, "--fit", "q-class", "--fit-band", "1M:7.2M", "--out", cal, "--json", "-")
	if code != 0 {
		t.Fatalf("compare: %d %s", code, errs)
	}
	var j struct {
		Fit struct {
			Groups []struct {
				Scale float64 `json:"q_scale"`
			} `json:"groups"`
		} `json:"fit"`
		Carriers []struct {
			ModelW float64 `json:"model_heat_w"`
			MeasW  float64 `json:"measured_heat_w"`
		} `json:"carriers"`
	}
	if err := json.Unmarshal([]byte(out), &j); err != nil {
		t.Fatalf("%v\n%s", err, out)
	}
	if len(j.Fit.Groups) != 1 || j.Fit.Groups[0].Scale < 0.49 || j.Fit.Groups[0].Scale > 0.51 {
		t.Errorf("fitted Q scale %+v, want 0.5 (the built twin's coils have half the Q)", j.Fit.Groups)
	}
	// halving coil Q roughly doubles the coils' share of the heat
	for _, c := range j.Carriers {
		if !(c.MeasW > 1.5*c.ModelW) {
			t.Errorf("built filter heat %g W against model %g W: the lossier twin must run hotter", c.MeasW, c.ModelW)
		}
	}
	// the calibrated netlist is the built twin: its sweep matches the bench
	code, txt, errs := runCLI(t, "compare", cal, sweep)
	if code != 0 {
		t.Fatalf("compare calibrated: %d %s", code, errs)
	}
	if !strings.Contains(txt, "in band") {
		t.Errorf("no summary:\n%s", txt)
	}
	calSrc, _ := os.ReadFile(cal)
	if !strings.Contains(string(calSrc), "q=100") || !strings.HasPrefix(string(calSrc), "# calibrated by rfstress compare --fit q-class") {
		t.Errorf("calibrated netlist:\n%s", calSrc)
	}
	// never over an input
	if code, _, errs := runCLI(t, "compare", model, sweep, "--fit", "q", "--fit-band", "1M:7.2M", "--out", model); code != 2 || !strings.Contains(errs, "input") {
		t.Errorf("--out over the netlist: exit %d, %s", code, errs)
	}
	if code, _, errs := runCLI(t, "compare", model, sweep, "--out", cal); code != 2 || !strings.Contains(errs, "--fit") {
		t.Errorf("--out without --fit: exit %d, %s", code, errs)
	}
	// the PDF page
	pdf := filepath.Join(dir, "cmp.pdf")
	if code, _, errs := runCLI(t, "compare", model, sweep, "--report", pdf); code != 0 {
		t.Fatalf("compare --report: %d %s", code, errs)
	}
	if b, err := os.ReadFile(pdf); err != nil || !strings.HasPrefix(string(b), "%PDF-") {
		t.Errorf("no PDF written: %v", err)
	}
}
