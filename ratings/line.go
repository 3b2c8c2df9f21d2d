package ratings

import (
	"fmt"

	"rfstress/circuits"
)

// prepareLine keeps the line's loss figures: its heating limit is the
// dissipation per metre that the rated power causes when matched.
func (p *Part) prepareLine(c *circuits.Component) {
	l := &circuits.LineSpec{}
	if a, ok := c.Attrs["loss"]; ok {
		l.Loss = a.Points
	}
	p.line = l
	if p.pmax != nil && len(l.Loss) == 0 {
		p.warn("note", "pmax= is given but no loss=: the line's heating is not judged (a lossless line dissipates nothing)")
	}
}

// MatchedPerMetre is the dissipation per metre, W/m, at the input of a
// matched line carrying p watts at f: −dP/dz = 2α·P (Pozar sec. 2.7, the
// loss of a line carrying a travelling wave).
func (p *Part) MatchedPerMetre(pw, f float64) float64 {
	if p.line == nil {
		return 0
	}
	return 2 * p.line.Alpha(f) * pw
}

// lineRemedy is what brings a line's hottest metre within its heating
// limit: the matched power rating that would (stress/(2α) over the
// derating factor), or loss figures to judge it at all.
func (p *Part) lineRemedy(l Limit, stress, f float64) string {
	a := 0.0
	if p.line != nil {
		a = p.line.Alpha(f)
	}
	switch {
	case a <= 0:
		return "give loss= to judge the line's heating"
	case p.pmax == nil:
		return "give pmax= (the line's matched power rating) to judge its heating"
	}
	fac := l.Factor
	if !(fac > 0) {
		fac = 1
	}
	need := stress / (2 * a) / fac
	return fmt.Sprintf("a line rated ≥ %s matched at %s, or one of lower loss, or a lower SWR on it", circuits.FormatSI(need, "W"), circuits.FormatHz(f))
}

// lineHeatLimit: a line's power rating (pmax= points, interpolated
// log-log like q) is a heating limit. Matched, the rated power P heats
// the line's input metre by 2α·P; the hottest metre under any load is
// judged against that. Between pmax points the rating is interpolated,
// outside them held at the end value.
func (p *Part) lineHeatLimit(f float64, text bool) Limit {
	fac := p.prof.Factor(ClassLine, Pm)
	l := Limit{Quantity: Pm, Factor: fac}
	switch {
	case p.pmax == nil:
		l.Basis = "not rated: no pmax= in netlist"
		return l
	case p.line == nil || p.line.Alpha(f) <= 0:
		l.Basis = "not rated: no loss= in netlist, so no heating to judge"
		return l
	}
	pw := circuits.InterpLogLog(p.pmax.Points, f)
	l.Abs = p.MatchedPerMetre(pw, f)
	l.Derated = l.Abs * fac
	if !text {
		return l
	}
	l.Basis = fmt.Sprintf("pmax=%s in netlist: %s matched at %s heats %s per metre (2α·P, loss %.3g dB/100 m); the connector may be the weaker part",
		p.pmax.Raw, circuits.FormatSI(pw, "W"), circuits.FormatHz(f), circuits.FormatSI(l.Abs, "W/m"), p.line.Alpha(f)*100/0.11512925464970229)
	return l
}
