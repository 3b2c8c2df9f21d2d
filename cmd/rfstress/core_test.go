package main

import (
	"encoding/json"
	"math"
	"strings"
	"testing"
)

// A 20 m lowpass on powdered-iron rings (values of a 5-pole 0.1 dB
// Chebyshev, cutoff 17.5 MHz; Matthaei, Young & Jones 1964).
const coreNet = `title 20 m lowpass on powdered-iron rings
port in  n1 z=50
port out n3 z=50
material iron-mu10-ours class=iron mu=10
core K od=18mm id=10mm h=6mm material=iron-mu10-ours
capacitor C1 n1 gnd 209p dielectric=mica q=1500 vpk=500 irms=3
inductor  L2 n1 n2  0.624u q=200@14M core=K turns=9 wire=1mm
capacitor C3 n2 gnd 359p dielectric=mica q=1500 vpk=500 irms=3
inductor  L4 n2 n3  0.624u q=200@14M core=K turns=9 wire=1mm
capacitor C5 n3 gnd 209p dielectric=mica q=1500 vpk=500 irms=3
audit power=100 mode=cw band=14M:14.35M
`

// The three core limits reach every output: the text shows them apart
// with the binding one, the JSON carries the guide as advice and each
// wound part's τ and both temperatures; --key-down moves the judged
// temperature below the steady one by the first-order law.
func TestCoreLimitsInOutputs(t *testing.T) {
	f := writeFile(t, "lpf.net", coreNet)
	code, out, errs := runCLI(t, "audit", f, "--key-down", "2m", "--json", "-")
	if code == 2 {
		t.Fatalf("exit 2: %s", errs)
	}
	var doc struct {
		Verdict    string `json:"verdict"`
		Components []struct {
			Name        string `json:"name"`
			CoreBinding string `json:"core_binding"`
			Heat        *struct {
				TauS     *float64 `json:"tau_s"`
				KeyDownS *float64 `json:"key_down_s"`
				SteadyC  *float64 `json:"steady_c"`
				JudgedC  *float64 `json:"judged_c"`
			} `json:"heat"`
			Limits []struct {
				Quantity string `json:"quantity"`
				Verdict  string `json:"verdict"`
				Advice   bool   `json:"advice"`
			} `json:"limits"`
		} `json:"components"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatalf("%v\n%s", err, out)
	}
	if doc.Verdict == "fail" {
		t.Errorf("verdict fail")
	}
	seen := 0
	for _, c := range doc.Components {
		if c.Heat == nil {
			continue
		}
		seen++
		h := c.Heat
		if h.TauS == nil || h.KeyDownS == nil || *h.KeyDownS != 120 || h.SteadyC == nil || h.JudgedC == nil {
			t.Fatalf("%s heat %+v", c.Name, h)
		}
		want := 25 + (*h.SteadyC-25)*(1-math.Exp(-120 / *h.TauS))
		if math.Abs(*h.JudgedC-want) > 1e-9 || !(*h.JudgedC < *h.SteadyC) {
			t.Errorf("%s: judged %.4f °C, first order %.4f °C, steady %.4f °C", c.Name, *h.JudgedC, want, *h.SteadyC)
		}
		var kinds []string
		for _, l := range c.Limits {
			kinds = append(kinds, l.Quantity)
			if l.Quantity == "bavg" && (!l.Advice || l.Verdict == "fail") {
				t.Errorf("%s guide: %+v", c.Name, l)
			}
		}
		if got := strings.Join(kinds, " "); !strings.Contains(got, "bpk bavg temp") {
			t.Errorf("%s limits %s", c.Name, got)
		}
		if !strings.HasPrefix(c.CoreBinding, "temperature") {
			t.Errorf("%s core binding %q", c.Name, c.CoreBinding)
		}
	}
	if seen != 2 {
		t.Errorf("%d wound parts with heat, want 2", seen)
	}
	t.Setenv("COLUMNS", "")
	_, out, _ = runCLI(t, "audit", f)
	for _, want := range []string{"core limits:", "saturation", "heating guide", "temperature", "steady"} {
		if !strings.Contains(out, want) {
			t.Errorf("text lacks %q", want)
		}
	}
}

// A core naming a magnetic class without mu= or al= is an input error
// with the hint; a bad key-down time is a usage error. Both exit 2.
func TestCoreInputErrors(t *testing.T) {
	f := writeFile(t, "k.net", strings.Replace(coreNet, "material=iron-mu10-ours\n", "material=iron\n", 1))
	code, _, errs := runCLI(t, "audit", f)
	if code != 2 || !strings.Contains(errs, "k.net:5:6: core K (used by L2): material iron is a class") || !strings.Contains(errs, "mu=") {
		t.Errorf("exit %d, %q", code, errs)
	}
	f = writeFile(t, "lpf.net", coreNet)
	if code, _, errs := runCLI(t, "audit", f, "--key-down", "5 minutes"); code != 2 || !strings.Contains(errs, "key-down") {
		t.Errorf("bad key-down: exit %d, %q", code, errs)
	}
}
