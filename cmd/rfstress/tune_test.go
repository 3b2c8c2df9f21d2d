package main

import (
	"encoding/json"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
)

// An L network (series coil, shunt capacitor across the load) tuned for
// 200 Ω at 7 MHz: Bowick's closed form gives Q = √(200/50 − 1) = 1.732,
// XL = 86.6 Ω (1.969 µH), XC = 115.5 Ω (196.9 pF).
const lTuneNet = `title L network
port in n1 z=50
port out n2 z=200
inductor  L1 n1 n2 2u q=1e7 range=0.2u:20u
capacitor C1 n2 gnd 200p q=1e7 range=10p:2000p
`

func TestTuneCommand(t *testing.T) {
	f := writeFile(t, "l.net", lTuneNet)
	code, out, errs := runCLI(t, "tune", f, "--freq", "7M", "--load", "200", "--load", "10", "--json", "-")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var doc struct {
		Tuning []struct {
			Policy string `json:"policy"`
			Rows   []struct {
				Matched  bool               `json:"matched"`
				Settings map[string]float64 `json:"settings"`
				SWR      *float64           `json:"swr"`
				Limit    string             `json:"limit"`
			} `json:"rows"`
		} `json:"tuning"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatalf("%v\n%s", err, out)
	}
	rows := doc.Tuning[0].Rows
	if doc.Tuning[0].Policy != "least-loss" || len(rows) != 2 {
		t.Fatalf("doc %+v", doc)
	}
	w := 2 * math.Pi * 7e6
	q := math.Sqrt(3)
	if l := rows[0].Settings["L1"]; math.Abs(l/(q*50/w)-1) > 1e-4 {
		t.Errorf("L1 %.6g, closed form %.6g", l, q*50/w)
	}
	if c := rows[0].Settings["C1"]; math.Abs(c/(q/(w*200))-1) > 1e-4 {
		t.Errorf("C1 %.6g, closed form %.6g", c, q/(w*200))
	}
	// 10 Ω is on the side this L network cannot match
	if rows[1].Matched || rows[1].Limit == "" || rows[1].SWR == nil || *rows[1].SWR < 5 {
		t.Errorf("10 Ω row %+v: want unmatchable with SWR ≥ 5 and a limit", rows[1])
	}
	code, out, _ = runCLI(t, "tune", f, "--freq", "7M", "--loads", "swr=10", "--tune-policy", "largest-c")
	if code != 0 || !strings.Contains(out, "largest-c") || !strings.Contains(out, "unmatchable") {
		t.Errorf("exit %d, text:\n%s", code, out)
	}
	for _, bad := range [][]string{
		{"tune", f, "--load", "200"},
		{"tune", f, "--freq", "7M"},
		{"tune", f, "--freq", "7M", "--load", "200", "--tune-policy", "cheapest"},
		{"tune", f, "--freq", "7M", "--load", "200", "--match-swr", "0.5"},
		{"tune", f, "--freq", "7M", "--loads", "swr=x"},
	} {
		if code, _, _ := runCLI(t, bad...); code != 2 {
			t.Errorf("%v: exit %d, want 2", bad, code)
		}
	}
	csv := writeFile(t, "loads.csv", "frequency,R,X\n7M,200,0\n7.2M,-5,0\n")
	code, _, errs = runCLI(t, "tune", f, "--loads", csv)
	if code != 2 || !strings.Contains(errs, "loads.csv:3:6: bad resistance") {
		t.Errorf("exit %d, stderr %s", code, errs)
	}
	fixed := writeFile(t, "fixed.net", "port in n1 z=50\nport out n2 z=50\ninductor L1 n1 n2 1u\ncapacitor C1 n2 gnd 100p\n")
	if code, _, errs := runCLI(t, "tune", fixed, "--freq", "7M", "--load", "50"); code != 2 || !strings.Contains(errs, "no variable part") {
		t.Errorf("fixed network: exit %d, %s", code, errs)
	}
}

// The example station's T tuner retuned over the invented measured file
// and over the SWR 10 region: every load gets its own verdict, the JSON is
// the same whatever the number of workers, and the chart says which
// policy chose.
func TestAuditRetuneStation(t *testing.T) {
	net := "../../testdata/station/tuner-80m-vertical.net"
	s1p := "../../testdata/station/vertical-80m.s1p"
	code, out, errs := runCLI(t, "audit", net, "--retune", "--loads", s1p, "--band", "3.5M:3.8M")
	if code == 2 {
		t.Fatalf("exit 2: %s", errs)
	}
	if !strings.Contains(out, "tuning chart: loads from "+s1p) || !strings.Contains(out, "least-loss") || strings.Count(out, "\n  3.") < 13 {
		t.Errorf("chart missing:\n%s", out)
	}
	// (settings with any worker count: tuning.TestTuneAllDeterministic)
	code, j1, e := runCLI(t, "audit", net, "--retune", "--loads", "swr=10", "--tune-workers", "2", "--json", "-")
	if code != 1 {
		t.Fatalf("swr=10: exit %d (want 1: C1 beyond its rating at the region's edge): %s", code, e)
	}
	var doc struct {
		Sections []struct {
			Tuning struct {
				Policy string `json:"policy"`
				Rows   []struct {
					Outcome string `json:"outcome"`
				} `json:"rows"`
			} `json:"tuning"`
		} `json:"sections"`
	}
	if err := json.Unmarshal([]byte(j1), &doc); err != nil {
		t.Fatal(err)
	}
	rows := doc.Sections[0].Tuning.Rows
	if len(rows) != 49 {
		t.Fatalf("%d loads, want 49 (centre and 4 rings of 12)", len(rows))
	}
	seen := map[string]int{}
	for _, r := range rows {
		seen[r.Outcome]++
	}
	if seen["fail"] == 0 || seen["ok"] == 0 {
		t.Errorf("outcomes %v: want some ok and some fail", seen)
	}
	if code, _, _ := runCLI(t, "audit", net, "--loads", "swr=10"); code != 2 {
		t.Errorf("--loads without --retune: exit %d, want 2", code)
	}
}

// The PDF gives a retuned file its tuning page: the chart's legend counts
// the unmatchable load, and the table lists every load.
func TestAuditRetunePDF(t *testing.T) {
	if _, err := exec.LookPath("pdftotext"); err != nil {
		t.Skip("pdftotext not installed")
	}
	net := writeFile(t, "l.net", lTuneNet+"audit power=100 freq=7M harmonics=none faults=open\n")
	loads := writeFile(t, "loads.csv", "frequency,R,X\n7M,200,0\n7.05M,10,0\n7.1M,400,-100\n")
	pdf := filepath.Join(t.TempDir(), "r.pdf")
	t.Setenv("SOURCE_DATE_EPOCH", "0")
	code, _, errs := runCLI(t, "audit", net, "--retune", "--loads", loads, "--band", "7M:7.1M", "--allow-unrated", "--report", pdf)
	if code == 2 {
		t.Fatalf("exit 2: %s", errs)
	}
	txt, err := exec.Command("pdftotext", "-enc", "UTF-8", pdf, "-").Output()
	if err != nil {
		t.Fatal(err)
	}
	s := string(txt)
	for _, want := range []string{"Tuning chart:", "Settings per load", "unmatchable: 1", "least-loss", "L1 at its"} {
		if !strings.Contains(s, want) {
			t.Errorf("PDF text lacks %q", want)
		}
	}
}

// A netlist whose antenna port carries measured data is retuned, without
// --loads, at each band carrier for the measured impedance there.
func TestAuditRetuneMeasuredAntenna(t *testing.T) {
	dir := t.TempDir()
	s1p, err := os.ReadFile("../../testdata/station/vertical-80m.s1p")
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "ant.s1p"), s1p, 0o644); err != nil {
		t.Fatal(err)
	}
	net := filepath.Join(dir, "t.net")
	src := `port in n1 z=50
port out n3 z=13-j490 measured=ant.s1p
capacitor C1 n1 n2 40p range=10p:60p dielectric=air vpk=3000
inductor  L1 n2 gnd 18u range=0.5u:25u q=200
capacitor C2 n2 n3 250p range=25p:400p dielectric=air vpk=1500
audit power=100 band=3.5M:3.8M points=4 harmonics=none
`
	if err := os.WriteFile(net, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	code, out, errs := runCLI(t, "audit", net, "--retune", "--allow-unrated")
	if code == 2 {
		t.Fatalf("exit 2: %s", errs)
	}
	// the file's measured points at 3.5, 3.6, 3.7 and 3.8 MHz (vertical-80m.s1p)
	if !strings.Contains(out, "port out's measured impedance") {
		t.Errorf("output does not name the measured load set:\n%s", out)
	}
	for _, want := range [][2]string{{"3.5 MHz", "12.62-j513.1 Ω"}, {"3.8 MHz", "13.42-j462.4 Ω"}} {
		found := false
		for _, line := range strings.Split(out, "\n") {
			found = found || (strings.Contains(line, want[0]) && strings.Contains(line, want[1]))
		}
		if !found {
			t.Errorf("no row for %s with load %s:\n%s", want[0], want[1], out)
		}
	}
}
