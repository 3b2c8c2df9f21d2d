package main

import (
	"bytes"
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func runCLI(t *testing.T, args ...string) (code int, stdout, stderr string) {
	t.Helper()
	var o, e bytes.Buffer
	code = run(args, &o, &e)
	return code, o.String(), e.String()
}

func writeFile(t *testing.T, name, src string) string {
	t.Helper()
	p := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(p, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

// Four capacitors shunted across a matched 50 Ω line. At 1 MHz their
// 4 pF barely load it, so each sees the line voltage: 100 W into 50 Ω is
// 70.7 V rms, 100 V peak (common practice: V = sqrt(P·R)).
const verdictNet = `title verdict check
port in a z=50
port out a2 z=50
resistor Rline a a2 1m
capacitor C1 a gnd 1p dielectric=x7r vpk=1000 irms=10
capacitor C2 a gnd 1p dielectric=mica irms=10
capacitor C3 a gnd 1p dielectric=mica vpk=80 irms=10
capacitor C4 a gnd 1p dielectric=mica vpk=150 irms=10
audit freq=1M harmonics=none power=100
`

func TestVerdictsAndRatingToBuy(t *testing.T) {
	f := writeFile(t, "v.net", verdictNet)
	code, out, errs := runCLI(t, "audit", f, "--json", "-")
	if code != 1 {
		t.Fatalf("exit %d, want 1 (a part fails); stderr %s", code, errs)
	}
	var doc struct {
		Verdict    string `json:"verdict"`
		Components []struct {
			Name    string   `json:"name"`
			Verdict string   `json:"verdict"`
			Finds   []string `json:"findings"`
			Worst   struct {
				Vpk float64 `json:"vpk"`
			} `json:"worst"`
			Limits []struct {
				Quantity string   `json:"quantity"`
				Verdict  string   `json:"verdict"`
				Buy      *float64 `json:"buy"`
			} `json:"limits"`
		} `json:"components"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatalf("bad JSON: %v\n%s", err, out)
	}
	want := map[string]string{"C1": "ok", "C2": "unrated", "C3": "fail", "C4": "marginal"}
	// rating to buy: peak voltage / derating factor, up to the next common
	// voltage step (steps of 50, 63, 100, 160, 200, 250 V… common practice).
	// Standard profile: mica 0.6, so 100/0.6 = 167 V → 200 V.
	buy := map[string]float64{"C2": 200, "C3": 200, "C4": 200}
	for _, c := range doc.Components {
		if c.Name == "Rline" {
			continue
		}
		if math.Abs(c.Worst.Vpk-100) > 0.01 {
			t.Errorf("%s peak voltage %.3f V, want 100 V", c.Name, c.Worst.Vpk)
		}
		if c.Verdict != want[c.Name] {
			t.Errorf("%s verdict %s, want %s", c.Name, c.Verdict, want[c.Name])
		}
		for _, l := range c.Limits {
			if l.Quantity != "vpk" {
				continue
			}
			if b, ok := buy[c.Name]; ok {
				if l.Buy == nil || *l.Buy != b {
					t.Errorf("%s rating to buy %v, want %g V", c.Name, l.Buy, b)
				}
			}
		}
		if c.Name == "C1" && !strings.Contains(strings.Join(c.Finds, " "), "class II") {
			t.Errorf("C1 (x7r) has no class II finding: %v", c.Finds)
		}
	}
	if doc.Verdict != "fail" {
		t.Errorf("overall verdict %s, want fail", doc.Verdict)
	}
}

// Unrated parts keep the overall verdict from ok unless --allow-unrated.
func TestUnratedBlocksOK(t *testing.T) {
	src := strings.Replace(verdictNet, "vpk=80", "vpk=1000", 1)
	src = strings.Replace(src, "vpk=150", "vpk=1000", 1)
	f := writeFile(t, "u.net", src)
	if code, out, _ := runCLI(t, "audit", f); code != 1 || !strings.Contains(out, "INCOMPLETE") {
		t.Errorf("with an unrated part: exit %d, want 1 and INCOMPLETE\n%s", code, out)
	}
	if code, _, _ := runCLI(t, "audit", f, "--allow-unrated"); code != 0 {
		t.Errorf("with --allow-unrated: exit %d, want 0", code)
	}
	if code, _, _ := runCLI(t, "audit", f, "--fail-on", "fail"); code != 0 {
		t.Errorf("with --fail-on fail: exit %d, want 0", code)
	}
}

func TestUsageAndInputErrors(t *testing.T) {
	bad := writeFile(t, "bad.net", "port in a z=50\nport out b z=50\ncapacitor C1 a gnd 10q\nresistor R1 a b 50\n")
	cases := []struct {
		args []string
		want string
	}{
		{[]string{"audit"}, "needs at least one netlist"},
		{[]string{"frobnicate"}, "unknown command"},
		{[]string{"solve", bad, "--freq", "1M"}, "bad.net:3:20"},
		{[]string{"audit", bad, "--band", "1M:2M"}, "bad.net:3:20"},
		{[]string{"solve", "--freq", "1M", "/nonexistent.net"}, "cannot read"},
		{[]string{"audit", "--bogus"}, "unknown flag"},
	}
	for _, c := range cases {
		code, _, errs := runCLI(t, c.args...)
		if code != 2 || !strings.Contains(errs, c.want) {
			t.Errorf("%v: exit %d, stderr %q; want 2 and %q", c.args, code, errs, c.want)
		}
		if strings.Contains(errs, "NaN") || strings.Contains(errs, "Inf") {
			t.Errorf("%v printed a non-finite number: %s", c.args, errs)
		}
	}
	for _, cmd := range []string{"solve", "response", "audit"} {
		if code, out, _ := runCLI(t, cmd, "--help"); code != 0 || !strings.Contains(out, "Usage: rfstress "+cmd) {
			t.Errorf("%s --help: exit %d\n%s", cmd, code, out)
		}
	}
}

// Same inputs give byte-identical JSON, CSV and text.
func TestDeterministicOutputs(t *testing.T) {
	f := writeFile(t, "v.net", verdictNet+"audit swr=2.5 faults=open,short\n")
	for _, args := range [][]string{
		{"audit", f, "--json", "-"},
		{"audit", f, "--csv", "-"},
		{"audit", f, "--trials", "50", "--json", "-"},
		{"audit", f},
		{"solve", f, "--freq", "3.5M", "--json", "-"},
	} {
		_, a, _ := runCLI(t, args...)
		_, b, _ := runCLI(t, args...)
		if a != b || a == "" {
			t.Errorf("%v: outputs differ between runs", args)
		}
		if strings.Contains(a, "NaN") || strings.Contains(a, "+Inf") {
			t.Errorf("%v: non-finite number in output", args)
		}
	}
}

// solve: 100 W available from a 50 Ω source into a matched 50 Ω load is
// delivered whole: 70.7 V rms, 100 V peak (common practice).
func TestSolveMatchedLine(t *testing.T) {
	f := writeFile(t, "line.net", "port in a z=50\nport out b z=50\nresistor R a b 1u\n")
	code, out, errs := runCLI(t, "solve", f, "--freq", "7M", "--power", "100", "--json", "-")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var doc struct {
		Pin  float64 `json:"p_in_w"`
		Pout float64 `json:"p_out_w"`
		S21  float64 `json:"s21_db"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	if math.Abs(doc.Pout-100) > 1e-4 || math.Abs(doc.S21) > 1e-6 {
		t.Errorf("matched line: p_out %g W, S21 %g dB; want 100 W, 0 dB", doc.Pout, doc.S21)
	}
}

// The audit refuses to overwrite its own input.
func TestRefusesToOverwriteInput(t *testing.T) {
	f := writeFile(t, "v.net", verdictNet)
	code, _, errs := runCLI(t, "audit", f, "--json", f)
	if code != 2 || !strings.Contains(errs, "refusing to overwrite") {
		t.Errorf("exit %d, %s", code, errs)
	}
	if b, _ := os.ReadFile(f); string(b) != verdictNet {
		t.Error("input file was changed")
	}
}

// The progress bar is for terminals only: redirected stderr stays clean,
// and the tolerance table reaches every output.
func TestToleranceOutputs(t *testing.T) {
	src := strings.ReplaceAll(verdictNet, "irms=10", "irms=10 tol=5%")
	f := writeFile(t, "t.net", src)
	code, out, errs := runCLI(t, "audit", f, "--trials", "200", "--seed", "3")
	if errs != "" {
		t.Errorf("stderr not empty when not a terminal: %q", errs)
	}
	if code != 1 || !strings.Contains(out, "tolerance: 200 trials") || !strings.Contains(out, "99 % of trials") {
		t.Errorf("exit %d; text lacks the tolerance table:\n%s", code, out)
	}
	_, js, _ := runCLI(t, "audit", f, "--trials", "200", "--json", "-")
	if !strings.Contains(js, `"safe_power_w_99pct_of_trials"`) || !strings.Contains(js, `"p99"`) {
		t.Error("JSON lacks the tolerance section")
	}
	_, csv, _ := runCLI(t, "audit", f, "--trials", "200", "--csv", "-")
	if !strings.Contains(csv, "trials-p99") || !strings.Contains(csv, "trials-share-over-rating") {
		t.Error("CSV lacks the tolerance rows")
	}
}
