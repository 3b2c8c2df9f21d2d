package main

import (
	"strings"
	"testing"
)

// TestSolveCautions: a series capacitor of 30 pF carrying the current of
// 100 W into 50 Ω at 3.6 MHz has X = 1/(2π·3.6 MHz·30 pF) ≈ 1474 Ω and
// I = √(P/R) ≈ 1.41 A rms, so V = I·X ≈ 2.1 kV rms, about 2.9 kV peak
// (tuner practice: kilovolts on the capacitors even at 100 W). solve must
// caution about it, in text and JSON; at 1 W (≈ 290 V peak, below the
// audit's default 300 V caution) it stays quiet. A 2 kV plate supply is
// lethal DC (above the 60 V of safety extra-low voltage, IEC 62368-1, from
// memory) and draws its own caution.
func TestSolveCautions(t *testing.T) {
	net := writeFile(t, "series.net", `title series capacitor, resonated
port in a z=50
port out c z=50
capacitor C1 a b 30p dielectric=air vpk=5k
inductor L1 b c 65.15u q=1e6
`)
	// L1 resonates C1 at 3.6 MHz: ω²LC = 1, so the port sees 50 Ω
	_, text, errText := runCLI(t, "solve", net, "--freq", "3.6M", "--power", "100")
	if !strings.Contains(text, "CAUTION") || !strings.Contains(text, "kV RF peak across") {
		t.Errorf("no RF caution at about 2.9 kV peak:\n%s%s", text, errText)
	}
	_, js, _ := runCLI(t, "solve", net, "--freq", "3.6M", "--power", "100", "--json", "-")
	if !strings.Contains(js, `"cautions"`) {
		t.Errorf("JSON has no cautions:\n%s", js)
	}
	_, text, _ = runCLI(t, "solve", net, "--freq", "3.6M", "--power", "1")
	if strings.Contains(text, "CAUTION") {
		t.Errorf("a caution at about 290 V peak, below 300 V:\n%s", text)
	}
	dc := writeFile(t, "plate.net", `title plate feed
port in p z=2500
port out o z=50
supply HV hv 2k
draw V1 p 0.2A
inductor RFC p hv 200u q=50
capacitor CB p o 10n dielectric=porcelain vpk=6k
`)
	_, text, errText = runCLI(t, "solve", dc, "--freq", "3.6M", "--power", "10")
	if !strings.Contains(text, "LETHAL DC") {
		t.Errorf("no lethal DC caution with a 2 kV supply:\n%s%s", text, errText)
	}
}
