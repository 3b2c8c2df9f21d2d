package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

const dcNet = `port in plate z=1k
port out ant z=50
supply HV bplus 3kV
draw V1 plate 0.8A
inductor RFC plate bplus 200u q=60 rdc=2 vpk=8k irms=1.2
capacitor Cb plate tune 2n q=2000 vpk=10k irms=6
capacitor Ct tune gnd 269p q=5000 vpk=4.5k irms=20
inductor Lt tune ant 2.24u q=400 irms=25
capacitor Cl ant gnd 1.12n q=5000 vpk=1.5k irms=25
audit power=1500 freq=7.1M harmonics=none
`

// The command names lethal DC in its caution, lists single-part faults
// asked for on the command line, and refuses a draw with no supply and a
// fault on a part that does not exist (input errors, exit 2).
func TestAuditDCAndPartFaults(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "pa.net")
	if err := os.WriteFile(path, []byte(dcNet), 0o644); err != nil {
		t.Fatal(err)
	}
	code, out, errs := runCLI(t, "audit", path, "--part-faults", "Cb:short")
	if code == 2 {
		t.Fatalf("exit 2: %s", errs)
	}
	for _, want := range []string{"LETHAL DC", "of it DC", "if Cb shorts, Ct sees", "single-part faults: 1"} {
		if !strings.Contains(out, want) {
			t.Errorf("output lacks %q:\n%s", want, out)
		}
	}
	// solve shows the DC solution: the choke drops 0.8 A × 2 Ω = 1.6 V
	// (Ohm's law), the blocking capacitor holds the rest of the 3 kV
	code, out, errs = runCLI(t, "solve", path, "--freq", "7.1M", "--power", "1500")
	if code != 0 || !strings.Contains(out, "V dc") || !strings.Contains(out, "-1.60 V") || !strings.Contains(out, "3.00 kV") {
		t.Errorf("solve with a supply: exit %d %s\n%s", code, errs, out)
	}
	code, _, errs = runCLI(t, "audit", path, "--part-faults", "C99:short")
	if code != 2 || !strings.Contains(errs, "C99") {
		t.Errorf("unknown part in --part-faults: exit %d, %s", code, errs)
	}
	code, _, errs = runCLI(t, "audit", path, "--part-faults", "Cb:melt")
	if code != 2 || !strings.Contains(errs, "short or open") {
		t.Errorf("bad fault kind: exit %d, %s", code, errs)
	}
	unfed := strings.Replace(dcNet, "supply HV bplus 3kV\n", "capacitor Cx bplus gnd 1n\n", 1)
	if err := os.WriteFile(path, []byte(unfed), 0o644); err != nil {
		t.Fatal(err)
	}
	code, _, errs = runCLI(t, "audit", path)
	if code != 2 || !strings.Contains(errs, "no DC path to a supply") {
		t.Errorf("draw without a supply: exit %d, %s", code, errs)
	}
}
