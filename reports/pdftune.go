package reports

import (
	"fmt"
	"math"
	"math/cmplx"

	"rfstress/circuits"
	"rfstress/ratings"
)

// tunePage draws a retuned file's load set on an impedance (Smith) chart,
// each load coloured by the verdict of the audit at its settings and the
// unmatchable ones crossed, then the tuning chart as a table. The chart
// is the open bilinear map Γ = (Z − R0)/(Z + R0) drawn here from its
// circles of constant resistance and reactance (Smith 1939).
func (p *pdfw) tunePage(v *TuneView) {
	title := "Tuning chart: " + Headline(v.File)
	p.newPage(title)
	p.text(colMuted)
	p.para(8.5, fmt.Sprintf("Loads from %s. Each load is matched to SWR %s or better at the transmitter by setting %s; "+
		"the network is then audited at those settings, faults included. Chosen by policy %s.",
		esc(v.LoadSource), num(v.TargetSWR, 2), v.partsText(), v.PolicyNote))
	p.text(colInk)
	// reference: the antenna port's own z, so a region of SWR around it
	// shows as rings about the centre (power-wave Γ, Kurokawa 1965)
	z0 := v.PortZ
	if !(real(z0) > 0) {
		z0 = 50
	}
	const rc = 55.0 // chart radius, mm
	p.room(2*rc + 16)
	cx, cy := marginL+rc+4, p.f.GetY()+rc+4
	p.smithGrid(cx, cy, rc, z0)
	// loads
	for _, r := range v.Rows {
		g := (r.Load - z0) / (r.Load + cmplx.Conj(z0))
		if cmplx.IsNaN(g) || cmplx.Abs(g) > 1 {
			continue
		}
		x, y := cx+rc*real(g), cy-rc*imag(g)
		if !r.Matched {
			p.draw(colInk)
			p.f.SetLineWidth(0.35)
			p.f.Line(x-1.4, y-1.4, x+1.4, y+1.4)
			p.f.Line(x-1.4, y+1.4, x+1.4, y-1.4)
			continue
		}
		c := colAccent
		if r.Judged {
			c = verdictColor(r.Verdict)
		}
		p.fill(c)
		p.draw(colWhite)
		p.f.SetLineWidth(0.15)
		p.f.Circle(x, y, 1.1, "FD")
	}
	p.f.SetLineWidth(0.2)
	// legend beside the chart
	lx, ly := cx+rc+10, cy-rc+2
	p.font("B", 8.5)
	p.cellAt(lx, ly, 60, 4, "Loads", "L")
	p.font("", 8)
	ly += 6
	items := []struct {
		c    rgb
		text string
		n    int
	}{}
	count := func(pred func(TuneRow) bool) int {
		n := 0
		for _, r := range v.Rows {
			if pred(r) {
				n++
			}
		}
		return n
	}
	for _, vd := range []ratings.Verdict{ratings.OK, ratings.Unrated, ratings.Marginal, ratings.Fail} {
		vd := vd
		n := count(func(r TuneRow) bool { return r.Matched && r.Judged && r.Verdict == vd })
		if n > 0 {
			items = append(items, struct {
				c    rgb
				text string
				n    int
			}{verdictColor(vd), "matched, " + vd.String(), n})
		}
	}
	if n := count(func(r TuneRow) bool { return r.Matched && !r.Judged }); n > 0 {
		items = append(items, struct {
			c    rgb
			text string
			n    int
		}{colAccent, "matched", n})
	}
	for _, it := range items {
		p.fill(it.c)
		p.draw(colWhite)
		p.f.Circle(lx+1.5, ly+2, 1.1, "FD")
		p.cellAt(lx+5, ly, 55, 4, fmt.Sprintf("%s: %d", it.text, it.n), "L")
		ly += 5
	}
	if n := v.Unmatched(); n > 0 {
		p.draw(colInk)
		p.f.SetLineWidth(0.35)
		p.f.Line(lx+0.1, ly+0.6, lx+2.9, ly+3.4)
		p.f.Line(lx+0.1, ly+3.4, lx+2.9, ly+0.6)
		p.f.SetLineWidth(0.2)
		p.cellAt(lx+5, ly, 55, 4, fmt.Sprintf("unmatchable: %d", n), "L")
		ly += 5
	}
	p.text(colMuted)
	p.f.SetXY(lx, ly+3)
	p.multi(pageW-marginR-lx, 3.6, fmt.Sprintf("Impedance chart about the antenna port's z = %s: Γ = (Z − z)/(Z + z*), so the "+
		"centre is that load and a circle about it is one SWR. Resistance circles at 0.2, 0.5, 1, 2 and 5 × %s; "+
		"reactance arcs at %s ± the same multiples, more inductive above the axis.",
		circuits.FormatComplex(z0), circuits.FormatSI(real(z0), "Ω"), circuits.FormatSI(imag(z0), "Ω")))
	p.text(colInk)
	p.f.SetY(cy + rc + 6)
	p.tuneTable(v)
}

// smithGrid draws the unit circle, the real axis and the circles of
// constant normalised resistance r (centre r/(1+r), radius 1/(1+r)) and
// the arcs of constant reactance x (centre (1, 1/x), radius 1/|x|),
// clipped to the unit circle. With a complex reference z0 = R0 + jX0 the
// power-wave Γ of Z is the ordinary Γ of Z − jX0 against R0, so the same
// grid holds with resistance r·R0 and reactance X0 + x·R0.
func (p *pdfw) smithGrid(cx, cy, rc float64, z0 complex128) {
	r0, x0 := real(z0), imag(z0)
	f := p.f
	p.fill(colFaint)
	p.draw(colRule)
	f.SetLineWidth(0.3)
	f.Circle(cx, cy, rc, "FD")
	f.SetLineWidth(0.15)
	f.ClipCircle(cx, cy, rc, false)
	marks := []float64{0.2, 0.5, 1, 2, 5}
	for _, r := range marks {
		f.Circle(cx+rc*r/(1+r), cy, rc/(1+r), "D")
	}
	for _, x := range marks {
		for _, s := range []float64{1, -1} {
			f.Circle(cx+rc, cy-s*rc/x, rc/x, "D")
		}
	}
	f.ClipEnd()
	f.Line(cx-rc, cy, cx+rc, cy)
	p.font("", 6.5)
	p.text(colMuted)
	for _, r := range marks {
		x := cx + rc*(r-1)/(r+1)
		p.cellAt(x-5, cy+0.6, 10, 3, circuits.FormatSI(r*r0, "Ω"), "C")
	}
	for _, x := range []float64{0.5, 1, 2} {
		g := (complex(0, x) - 1) / (complex(0, x) + 1)
		px, py := cx+rc*real(g), cy-rc*imag(g)
		p.cellAt(px-8+2*real(g), py-4, 16, 3, reactText(x0+x*r0), "C")
		p.cellAt(px-8+2*real(g), cy+(cy-py)+1, 16, 3, reactText(x0-x*r0), "C")
	}
	p.text(colInk)
	f.SetLineWidth(0.2)
}

// tuneTable lists the tuning chart, one row per load.
func (p *pdfw) tuneTable(v *TuneView) {
	head := []string{"frequency", "load"}
	widths := []float64{18, 30}
	for _, pt := range v.Parts {
		head = append(head, pt.Name)
		widths = append(widths, 15)
	}
	head = append(head, "SWR", "loss", "V peak", "outcome")
	widths = append(widths, 10, 12, 14)
	used := 0.0
	for _, w := range widths {
		used += w
	}
	widths = append(widths, math.Max(20, bodyW-used))
	p.sub("Settings per load", 12)
	row := func(cells []string, bold bool, c rgb) {
		p.room(4.2)
		if bold {
			p.font("B", 7)
		} else {
			p.font("", 7)
		}
		p.f.SetX(marginL)
		for i, s := range cells {
			if i == len(cells)-1 {
				p.text(c)
				s = p.fit(s, widths[i])
			}
			align := "R"
			if i < 2 || i == len(cells)-1 {
				align = "L"
			}
			pad := 0.0
			if align == "R" {
				pad = 1.5
			}
			p.cell(widths[i]-pad, 4, s, 0, align)
			if pad > 0 {
				p.cell(pad, 4, "", 0, "L")
			}
		}
		p.text(colInk)
		p.f.Ln(4)
	}
	row(head, true, colInk)
	for _, r := range v.Rows {
		cells := []string{circuits.FormatHz(r.FrequencyHz), circuits.FormatComplex(r.Load)}
		for k, pt := range v.Parts {
			cells = append(cells, circuits.FormatSI(r.Settings[k], pt.Unit))
		}
		out := RowVerdictText(r)
		c := colAccent
		switch {
		case !r.Matched:
			out += ": " + r.Limit
			c = colInk
		case r.Judged:
			c = verdictColor(r.Verdict)
			if r.Worst != "" {
				out += " (" + r.Worst + ")"
			}
		}
		cells = append(cells, FormatSWR(r.SWR), pct1(r.LossFrac), circuits.FormatSI(r.VpkW, "V"), out)
		row(cells, false, c)
	}
	p.text(colMuted)
	p.para(7.5, fmt.Sprintf("Loss is the share of the power into the network lost in its parts; V peak is the largest part voltage at %s available, matched. "+
		"CAUTION: %s", circuits.FormatSI(v.PowerW, "W"), TuneCaution(v)))
	p.text(colInk)
}

// reactText labels a reactance arc: "+j25.0 Ω", "−j465 Ω".
func reactText(x float64) string {
	if x < 0 {
		return "−j" + circuits.FormatSI(-x, "Ω")
	}
	return "+j" + circuits.FormatSI(x, "Ω")
}
