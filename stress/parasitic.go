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
