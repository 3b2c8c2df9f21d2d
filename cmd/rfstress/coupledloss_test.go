package main

import (
	"encoding/json"
	"math"
	"testing"
)

// TestCoupledWindingLoss: a 1:2-turns transformer, 10 µH primary with
// q=100 at 7.1 MHz, into 200 Ω, 100 W PEP SSB (20 % average). The load's
// ampere-turns cancel in the core (transformer theory, any
// electrical-machines text), so the core loss is that of the magnetising
// current: V²/(Q·ωL) = 70.7²/(100·446 Ω) = 0.112 W at PEP, 0.0224 W at
// average power, with V = √(100 W·50 Ω). The lone-coil figure
// |I|²·ωL/Q with the whole 1.41 A would be 8.9 W at PEP — forty times too
// much, and a false fail on an ordinary transformer. Each winding is
// judged on its core's loss from its own flux linkage, so both windings
// show about 0.022 W; an uncoupled coil keeps R·|I|². 10 %: the coupling
// is 0.99, so leakage adds a little.
func TestCoupledWindingLoss(t *testing.T) {
	net := writeFile(t, "xfmr.net", `title 1:2 transformer
port in n1 z=50
port out n2 z=200
inductor L1 n1 gnd 10u q=100
inductor L2 n2 gnd 40u q=100
coupling K1 L1 L2 k=0.99
inductor L9 n2 gnd 100u q=100
audit power=100 mode=ssb freq=7.1M swr=1 harmonics=none
`)
	j := auditWorst(t, net)
	const want = 0.2 * 70.71 * 70.71 / (100 * 2 * math.Pi * 7.1e6 * 10e-6)
	for _, c := range j.Components {
		switch c.Name {
		case "L1", "L2":
			if p := c.Worst["pdiss"]; math.Abs(p-want) > 0.1*want {
				t.Errorf("%s: %.4g W at average power, core loss by hand %.4g W", c.Name, p, want)
			}
		case "L9":
			// uncoupled: R·|I|² with its own current, V/(ωL) at 141 V rms
			w := 2 * math.Pi * 7.1e6
			i := 141.4 / (w * 100e-6)
			if p, hand := c.Worst["pdiss"], 0.2*i*i*w*100e-6/100; math.Abs(p-hand) > 0.1*hand {
				t.Errorf("L9: %.4g W, hand %.4g W", p, hand)
			}
		}
	}
}

// auditComponents is the components of an audit's JSON, each with its
// worst value per quantity.
type auditComponents struct {
	Components []struct {
		Name  string             `json:"name"`
		Worst map[string]float64 `json:"worst"`
	} `json:"components"`
}

// auditWorst audits net with no faults and returns its JSON components.
func auditWorst(t *testing.T, net string) auditComponents {
	t.Helper()
	code, out, errText := runCLI(t, "audit", net, "--faults", "none", "--json", "-")
	if code == 2 {
		t.Fatalf("exit 2: %s", errText)
	}
	var j auditComponents
	if err := json.Unmarshal([]byte(out), &j); err != nil {
		t.Fatalf("%v\n%s", err, out)
	}
	return j
}
