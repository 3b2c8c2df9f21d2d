package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestTxSWRMaxVerdict: the example station's 80 m lowpass left selected
// while the transmitter runs on 20 m (--carrier-also 14.2M) presents
// nearly a pure reactance far in its stopband (common practice: a
// lowpass far above cutoff reflects almost everything), so the amplifier
// sees a very high SWR. Without a limit it is shown and not judged; with
// --tx-swr-max 2 the audit fails on transmitter protection (exit 1), the
// text says so, and JSON carries tx_swr_worst, tx_zin_worst and tx_case.
func TestTxSWRMaxVerdict(t *testing.T) {
	t.Setenv("COLUMNS", "")
	net := filepath.Join("..", "..", "testdata", "station", "lpf-80m.net")
	if _, err := os.Stat(net); err != nil {
		t.Skip("example station absent")
	}
	out := filepath.Join(t.TempDir(), "a.json")
	code, text, errText := runCLI(t, "audit", net, "--carrier-also", "14.2M", "--faults", "none", "--swr", "1", "--json", out)
	if !strings.Contains(text, "the transmitter sees SWR") || !strings.Contains(text, "not judged") {
		t.Errorf("no transmitter line without a limit:\n%s%s", text, errText)
	}
	free := code
	code, text, _ = runCLI(t, "audit", net, "--carrier-also", "14.2M", "--faults", "none", "--swr", "1", "--tx-swr-max", "2", "--json", out)
	if code != 1 {
		t.Errorf("exit %d with --tx-swr-max 2, want 1 (without the limit: %d)", code, free)
	}
	if !strings.Contains(text, "TRANSMITTER PROTECTION") || !strings.Contains(text, "14.2 MHz") {
		t.Errorf("text does not name the transmitter protection failure:\n%s", text)
	}
	b, err := os.ReadFile(out)
	if err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Sections []struct {
			TxSWRWorst *float64 `json:"tx_swr_worst"`
			TxZinWorst *struct {
				Re, Im *float64
			} `json:"tx_zin_worst"`
			TxCase    string `json:"tx_case"`
			TxVerdict string `json:"tx_verdict"`
		} `json:"sections"`
	}
	if err := json.Unmarshal(b, &doc); err != nil {
		t.Fatal(err)
	}
	s := doc.Sections[0]
	if s.TxSWRWorst == nil || *s.TxSWRWorst < 40 || s.TxZinWorst == nil || s.TxZinWorst.Re == nil ||
		!strings.Contains(s.TxCase, "14.2 MHz") || s.TxVerdict != "fail" {
		t.Errorf("JSON transmitter fields: %s", b[:min(len(b), 2000)])
	}
}
