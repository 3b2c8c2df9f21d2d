package reports

import (
	"strings"
	"testing"
)

// TestTuneCautionNamesItsVoltage: the caution names the chart's highest
// peak voltage instead of claiming kilovolts whatever the figures. A
// tuner matching 100 W into 50 Ω carries at least the line's own
// √(2·P·R) = √(2·100·50) = 100 V peak; one row here at 2.01 kV (a short
// vertical's match, common practice: kilovolts) must be the one named.
func TestTuneCautionNamesItsVoltage(t *testing.T) {
	v := &TuneView{PowerW: 100, Rows: []TuneRow{{VpkW: 100}, {VpkW: 2010}, {VpkW: 450}}}
	got := TuneCaution(v)
	if !strings.Contains(got, "2.01 kV") || !strings.Contains(got, "100 W") || !strings.Contains(got, "never touch or adjust while transmitting") {
		t.Errorf("caution %q does not name 2.01 kV at 100 W with the usual warning", got)
	}
	low := TuneCaution(&TuneView{PowerW: 5, Rows: []TuneRow{{VpkW: 22.4}}}) // 5 W: √(2·5·50) = 22.4 V
	if strings.Contains(low, "kilovolts") || !strings.Contains(low, "22.4 V") {
		t.Errorf("5 W caution %q claims kilovolts or hides its 22.4 V", low)
	}
}
