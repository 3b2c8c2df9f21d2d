package main

import (
	"encoding/json"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
)

const lpf40 = `title 40 m lowpass
port in n1 z=50
port out n3 z=50
capacitor C1 n1 gnd 390p dielectric=mica vpk=500 irms=3
inductor L2 n1 n2 1.2u q=150 wire=1mm
capacitor C3 n2 gnd 680p dielectric=mica vpk=500 irms=4
inductor L4 n2 n3 1.2u q=150 wire=1mm
capacitor C5 n3 gnd 390p dielectric=mica vpk=500 irms=3
audit power=100 mode=cw freq=7.1M swr=1 harmonics=none
`

// TestUnitSlipDoesNotPassQuietly: C1 written 390n instead of 390p puts
// 1/(2π·7.1 MHz·390 nF) = 0.057 Ω across the transmitter: every part is
// then far within its rating (nothing reaches them), so the verdict alone
// would read OK. The transmitter sees SWR = 50/0.057 ≈ 870 or more
// (Γ = (Z − 50)/(Z + 50), any transmission-line text); the tool must say
// the network does not pass its own band. The same filter as written
// (390p) passes 7.1 MHz with an SWR near 1 and draws no such warning, and
// the 80 m lowpass of the example station at 14.2 MHz (carrier-also: a
// wrong filter, meant not to pass) draws none either.
func TestUnitSlipDoesNotPassQuietly(t *testing.T) {
	t.Setenv("COLUMNS", "")
	good := writeFile(t, "good.net", lpf40)
	_, text, errText := runCLI(t, "audit", good)
	if strings.Contains(text, "does not pass") {
		t.Errorf("a correct 40 m lowpass is said not to pass 7.1 MHz:\n%s%s", text, errText)
	}
	slip := writeFile(t, "slip.net", strings.Replace(lpf40, "390p", "390n", 1))
	js := filepath.Join(t.TempDir(), "a.json")
	_, text, errText = runCLI(t, "audit", slip, "--json", js)
	if !strings.Contains(text, "does not pass its own band") || !strings.Contains(text, "CHECK") {
		t.Errorf("390n for 390p is not flagged:\n%s%s", text, errText)
	}
	if !strings.Contains(text, "SWR above 100") {
		t.Errorf("an SWR near 870 should read \"above 100\":\n%s", text)
	}
	b, err := os.ReadFile(js)
	if err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Sections []struct {
			Best   *float64 `json:"tx_swr_in_band_best"`
			NoPass bool     `json:"does_not_pass_band"`
		} `json:"sections"`
	}
	if err := json.Unmarshal(b, &doc); err != nil {
		t.Fatal(err)
	}
	if len(doc.Sections) != 1 || !doc.Sections[0].NoPass || doc.Sections[0].Best == nil || *doc.Sections[0].Best < 870 {
		t.Errorf("JSON does not carry the in-band SWR (want ≥ 870) and does_not_pass_band: %s", b)
	}

	// the PDF's file table says it too, beside the file's verdict
	pdf := filepath.Join(t.TempDir(), "slip.pdf")
	if code, _, e := runCLI(t, "audit", slip, "--report", pdf); code == 2 {
		t.Fatalf("report: %s", e)
	}
	if _, err := exec.LookPath("pdftotext"); err == nil {
		out, err := exec.Command("pdftotext", pdf, "-").Output()
		if err != nil {
			t.Fatal(err)
		}
		if !strings.Contains(strings.Join(strings.Fields(string(out)), " "), "CHECK: does not pass its own band") {
			t.Errorf("the PDF's file table does not flag the file")
		}
	}

	net := filepath.Join("..", "..", "testdata", "station", "lpf-80m.net")
	if _, err := os.Stat(net); err != nil {
		return
	}
	_, text, _ = runCLI(t, "audit", net, "--carrier-also", "14.2M", "--faults", "none", "--swr", "1")
	if strings.Contains(text, "does not pass") {
		t.Errorf("a carrier outside the band is flagged as the band not passing:\n%s", text)
	}
}
