package main

import (
	"encoding/json"
	"math"
	"strings"
	"testing"

	"rfstress/circuits"
	"rfstress/ratings"
)

// A connector at the antenna end of a lossless 50 Ω coax, 100 W available
// from a 50 Ω transmitter, antenna anywhere on the SWR 3 circle. The
// matched source launches a forward wave of E/2 = 70.7 V RMS whatever the
// load; the reflection adds |Γ| = 0.5 of it in phase at the worst load, so
// the connector stands √2·70.7·1.5 = 150 V peak to ground and carries
// (70.7/50)·1.5 = 2.12 A RMS at the worst load of the other phase (line
// theory, Pozar ch. 2: V = V⁺(1 + Γ)). That is why connectors are the weak
// point at high SWR: both figures grow with 1 + |Γ|.
const connectorNet = `title connector at the end of a mismatched line
port in  n1  z=50
port out ant z=50
line      W1 n1 n2 z0=50 len=7.3m vf=0.66
connector J2 n2 ant vpk=500 irms=5
clearance K1 n2 gnd gap=0.5mm medium=air
audit freq=14.2M harmonics=none power=100 swr=3
`

func TestConnectorAtHighSWRAndAltitude(t *testing.T) {
	f := writeFile(t, "j.net", connectorNet)
	var got [2]map[string]any
	for k, alt := range []string{"0m", "3km"} {
		code, out, errs := runCLI(t, "audit", f, "--altitude", alt, "--fail-on", "never", "--json", "-")
		if code != 0 {
			t.Fatalf("exit %d: %s", code, errs)
		}
		var doc map[string]any
		if err := json.Unmarshal([]byte(out), &doc); err != nil {
			t.Fatal(err)
		}
		got[k] = doc
	}
	comp := func(doc map[string]any, name string) map[string]any {
		for _, c := range doc["components"].([]any) {
			if m := c.(map[string]any); m["name"] == name {
				return m
			}
		}
		t.Fatalf("no component %s", name)
		return nil
	}
	j := comp(got[0], "J2")["worst"].(map[string]any)
	e2 := math.Sqrt(100 * 50.0) // E/2, V RMS
	// exact line and circle worst: rounding only, 1e-6
	if v := j["vpk"].(float64); math.Abs(v-math.Sqrt2*e2*1.5) > 1e-6*v {
		t.Errorf("J2 peak %.4f V, hand %.4f V", v, math.Sqrt2*e2*1.5)
	}
	if i := j["irms"].(float64); math.Abs(i-e2/50*1.5) > 1e-6*i {
		t.Errorf("J2 current %.5f A, hand %.5f A", i, e2/50*1.5)
	}
	// the clearance K1 on the same node sees the same 150 V; at 3000 m
	// the air is thinner (ISO 2533: 70.1 kPa) and the gap arcs lower
	sec0, sec1 := got[0]["sections"].([]any)[0].(map[string]any), got[1]["sections"].([]any)[0].(map[string]any)
	if sec0["altitude_m"].(float64) != 0 || sec1["altitude_m"].(float64) != 3000 {
		t.Errorf("altitudes %v and %v, want 0 and 3000", sec0["altitude_m"], sec1["altitude_m"])
	}
	if p := sec1["air_pressure_pa"].(float64); math.Abs(p-70108) > 1 {
		t.Errorf("air pressure at 3000 m %.0f Pa, want 70108 (ISO 2533)", p)
	}
	c0 := comp(got[0], "K1")["clearance"].(map[string]any)
	c1 := comp(got[1], "K1")["clearance"].(map[string]any)
	if v := c0["vpk_v"].(float64); math.Abs(v-math.Sqrt2*e2*1.5) > 1e-6*v {
		t.Errorf("K1 peak %.4f V, hand %.4f V", v, math.Sqrt2*e2*1.5)
	}
	if !(c1["arc_v"].(float64) < c0["arc_v"].(float64) && c1["gap_needed_m"].(float64) > c0["gap_needed_m"].(float64)) {
		t.Errorf("at 3000 m the gap should arc lower and need more room: %v vs %v", c1, c0)
	}
	// usage errors: an altitude needs a unit and stays in the troposphere
	for _, bad := range []string{"1500", "12km"} {
		code, _, errs := runCLI(t, "audit", f, "--altitude", bad)
		if code != 2 || !strings.Contains(errs, "altitude") {
			t.Errorf("--altitude %s: exit %d, %q", bad, code, errs)
		}
	}
}

// TestTemplateTunerPlateGaps: the tuner template sizes its air variables'
// plate gaps with the rest of the ratings: each is the smallest spacing
// step whose derated arcing voltage holds the capacitor's worst peak, so
// it is at least the gap solved by hand from that peak with Kuffel's
// formula (24.22·δd + 6.08·√(δd) kV; ×0.8 RF, ×0.75 edges, ×0.7 standard
// derating; δ = 293.15/298.15 for 25 °C air at sea level), and the next
// smaller step is below it.
func TestTemplateTunerPlateGaps(t *testing.T) {
	nl := templateParts(t, "tuner", "--freq", "7.1M", "--power", "400")
	_, src, _ := runCLI(t, "template", "tuner", "--freq", "7.1M", "--power", "400")
	sec, err := auditSource("t.net", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	n := 0
	for i, c := range nl.Components {
		if w, _ := c.Attrs.Word("dielectric"); c.Kind != circuits.Capacitor || w != "air" {
			continue
		}
		n++
		gap, ok := c.Attrs.Num("gap")
		if !ok {
			t.Fatalf("%s: air variable without gap=", c.Name)
		}
		vpk := sec.Parts[i].Stress[ratings.Arc].Value
		vkv := vpk / (0.8 * 0.75 * 0.7) / 1e3
		sq := (-6.08 + math.Sqrt(6.08*6.08+4*24.22*vkv)) / (2 * 24.22)
		need := sq * sq / (293.15 / 298.15) / 100
		prev := 0.0
		for _, g := range gapSteps {
			if g < gap*(1-1e-9) {
				prev = g
			}
		}
		// the step is the least that holds the peak (1e-6 for rounding)
		if gap < need*(1-1e-6) || (prev > 0 && prev >= need*(1+1e-6)) {
			t.Errorf("%s: gap %.2f mm for %.0f V peak; hand %.3f mm, smaller step %.2f mm", c.Name, gap*1e3, vpk, need*1e3, prev*1e3)
		}
	}
	if n != 2 {
		t.Errorf("%d air variables, want the tuner's two", n)
	}
}
