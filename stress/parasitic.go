package stress

import (
	"fmt"
	"math"

	"rfstress/circuits"
	"rfstress/ratings"
)

// SRFBand is how close, as a share of the self-resonant frequency, a
// carrier or audited harmonic may come to a part's self-resonance before
// it is worth a finding: near resonance a coil passes harmonics and rings
// up voltage, a capacitor stops being one (common practice: keep parts
// well clear of their self-resonance).
const SRFBand = 0.15

// parasiticFindings tells about a part's self-resonance near a carrier or
// an audited harmonic, and about an inductor whose terminal current
// differs from its winding current by more than 1 %.
func (e *Engine) parasiticFindings(el circuits.Element, a *accum) []ratings.Finding {
	var out []ratings.Finding
	add := func(sev, format string, args ...any) {
		out = append(out, ratings.Finding{Part: el.Name, Pos: el.Comp.Pos, Severity: sev, Text: fmt.Sprintf(format, args...)})
	}
	if srf := el.SelfResonance(); srf > 0 {
		best, bn, bf := math.Inf(1), 0, 0.0
		for _, f := range e.carriers {
			for n := 1; n <= e.Cond.HarmonicMax; n++ {
				if n > 1 && (n-2 >= len(e.levels) || e.levels[n-2] == 0) {
					continue // not audited
				}
				if d := math.Abs(float64(n)*f-srf) / srf; d < best {
					best, bn, bf = d, n, f
				}
			}
		}
		if best <= SRFBand {
			what := "the carrier"
			if bn > 1 {
				what = fmt.Sprintf("harmonic %d", bn)
			}
			why := "a coil near its self-resonance passes harmonics and rings up voltage"
			if el.Kind == circuits.Capacitor {
				why = "a capacitor near its series resonance is no longer a capacitance: past it, it is an inductor"
			}
			add("warning", "self-resonance %s is within %.0f %% of %s of %s (%s): %s",
				circuits.FormatHz(srf), best*100, what, circuits.FormatHz(bf), circuits.FormatHz(float64(bn)*bf), why)
		}
	}
	if a.iwMax > 0 && math.Abs(a.itMax-a.iwMax) > 0.01*a.iwMax {
		add("note", "winding current %s, terminal current %s at the carrier (largest over the cases evaluated): the self-capacitance carries the difference; flux and winding heat use the winding current",
			circuits.FormatSI(a.iwMax, "A"), circuits.FormatSI(a.itMax, "A"))
	}
	return out
}

// coupledLossFinding says how a coupled winding's loss is modelled. The
// solver puts ωL/Q in series with the winding, carried by its whole
// current. In a transformer or a choke balun with k near 1 the load's
// ampere-turns cancel in the core, so the core loss follows the winding
// voltage (the magnetising current), not the load current: a q= measured
// on the lone winding then overstates the heat, by (load current /
// magnetising current)², often tenfold or more.
func coupledLossFinding(s *Section, el circuits.Element, a *accum) (ratings.Finding, bool) {
	if el.Kind != circuits.Inductor || s.Netlist == nil || el.Comp.Attrs == nil {
		return ratings.Finding{}, false
	}
	if _, measured := el.Comp.Attrs["measured"]; measured {
		return ratings.Finding{}, false
	}
	for _, k := range s.Netlist.Couplings {
		if k.L1 != el.Name && k.L2 != el.Name {
			continue
		}
		return ratings.Finding{Part: el.Name, Pos: el.Comp.Pos, Severity: "note",
			Text: fmt.Sprintf("coupled winding (%s): its loss is modelled as ωL/Q in series, carried by the whole winding current, load current included (up to %s at average power here); "+
				"in a transformer or choke balun the load's ampere-turns cancel in the core, so with the Q of the lone winding this overstates the heat and the temperature: "+
				"give q= as the winding measures in circuit, or read its dissipation and temperature as an upper bound", k.Name, circuits.FormatSI(a.val[qPdiss], "W"))}, true
	}
	return ratings.Finding{}, false
}
