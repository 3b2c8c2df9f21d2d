package reports

import (
	"fmt"
	"math"
	"math/cmplx"
	"sort"
	"strconv"

	"github.com/jung-kurt/gofpdf"

	"rfstress/circuits"
	"rfstress/stress"
)

// Geometry of the row under the response plot: stress against frequency
// on the left, the load chart on the right, mm.
const (
	usePlotW = 96.0
	usePlotH = 54.0
	chartR   = 27.0 // load chart radius
	plotsRow = usePlotH + 26
)

// useColours are the lines of the three most stressed parts.
var useColours = []rgb{colAccent, colSecond, {112, 86, 160}}

// stressPlots draws the stress-against-frequency plot and the load chart
// side by side.
func (p *pdfw) stressPlots(s *stress.Section, fp *FilterPlot) {
	if fp == nil || (fp.Use == nil && len(fp.Loads) == 0) {
		return
	}
	p.sub("Stress across the band, and the loads audited", plotsRow)
	top := p.f.GetY() + 2
	if fp.Use != nil {
		p.usePlot(s, fp.Use, top)
	}
	if len(fp.Loads) > 0 {
		p.loadChart(s, fp, top)
	}
	p.f.SetXY(marginL, top+plotsRow-2)
}

// usePlot: each of the three most stressed parts' worst use of a derated
// limit at each frequency, on a log scale with the derated limit at 100 %.
func (p *pdfw) usePlot(s *stress.Section, u *stress.BandUse, top float64) {
	f := p.f
	// the three parts using most of a derated limit anywhere
	var idx []int
	for i, pr := range s.Parts {
		if i < len(u.Use) && pr.Util > 0 && finite(pr.Util) {
			idx = append(idx, i)
		}
	}
	sort.SliceStable(idx, func(a, b int) bool { return s.Parts[idx[a]].Util > s.Parts[idx[b]].Util })
	if len(idx) > 3 {
		idx = idx[:3]
	}
	left := marginL + 12.0
	x0, y0 := left, top+4
	if len(idx) == 0 {
		p.font("", 8)
		p.text(colMuted)
		p.cellAt(x0, y0+usePlotH/2, usePlotW, 4, "No rated stress to plot: add ratings to the netlist.", "L")
		p.text(colInk)
		return
	}
	hi := 2.0
	for _, i := range idx {
		for _, v := range u.Use[i] {
			if finite(v) && v*1.25 > hi {
				hi = v * 1.25
			}
		}
	}
	// the bottom of the scale: a round share under the smallest use shown
	lo, least := 0.5, math.Inf(1)
	for _, i := range idx {
		for _, v := range u.Use[i] {
			if finite(v) && v > 0 {
				least = math.Min(least, v)
			}
		}
	}
	for _, step := range []float64{0.5, 0.2, 0.1, 0.05, 0.02, 0.01} {
		lo = step
		if step <= least/1.2 {
			break
		}
	}
	yOf := func(v float64) float64 {
		v = math.Max(v, lo)
		return y0 + usePlotH - math.Log(v/lo)/math.Log(hi/lo)*usePlotH
	}
	// frequency axis: the band, then a narrow panel per carrier-also
	var band, off []int
	for k, o := range u.OffBand {
		if o {
			off = append(off, k)
		} else {
			band = append(band, k)
		}
	}
	const offW = 11.0
	bandW := usePlotW - float64(len(off))*offW
	if len(off) > 0 {
		bandW -= 3
	}
	flo, fhi := u.F[band[0]], u.F[band[len(band)-1]]
	if fhi <= flo {
		flo, fhi = flo*0.98, fhi*1.02
	}
	xOf := func(k int) float64 {
		if u.OffBand[k] {
			for j, o := range off {
				if o == k {
					return x0 + bandW + 3 + offW*(float64(j)+0.5)
				}
			}
		}
		return x0 + (u.F[k]-flo)/(fhi-flo)*bandW
	}
	// frame, grid and the derated limit
	p.fill(colFaint)
	f.Rect(x0, y0, bandW, usePlotH, "F")
	for j := range off {
		f.Rect(x0+bandW+3+offW*float64(j), y0, offW-1, usePlotH, "F")
	}
	p.font("", 6.5)
	p.text(colMuted)
	f.SetLineWidth(0.15)
	p.draw(colRule)
	for _, t := range []float64{0.01, 0.02, 0.05, 0.1, 0.2, 0.5, 1, 2, 5, 10, 20, 50, 100, 200} {
		if t < lo || t > hi {
			continue
		}
		y := yOf(t)
		f.Line(x0, y, x0+bandW, y)
		p.cellAt(marginL, y-1.5, 11, 3, strconv.FormatFloat(100*t, 'f', 0, 64)+" %", "R")
	}
	p.draw(colFail)
	f.SetLineWidth(0.5)
	f.Line(x0, yOf(1), x0+bandW, yOf(1))
	for j := range off {
		xa := x0 + bandW + 3 + offW*float64(j)
		f.Line(xa, yOf(1), xa+offW-1, yOf(1))
	}
	// frequency labels: band ends (and centre), each carrier-also
	p.text(colMuted)
	p.font("", 6.5)
	ticks := []float64{flo, fhi}
	if len(band) == 1 {
		ticks = []float64{u.F[band[0]]}
	} else if bandW > 50 {
		ticks = []float64{flo, (flo + fhi) / 2, fhi}
	}
	for i, t := range ticks {
		x := x0 + (t-flo)/(fhi-flo)*bandW
		align, bx := "C", x-12
		if len(ticks) > 1 && i == 0 {
			align, bx = "L", x
		} else if len(ticks) > 1 && i == len(ticks)-1 {
			align, bx = "R", x-24
		}
		p.cellAt(bx, y0+usePlotH+0.8, 24, 3, circuits.FormatHz(t), align)
	}
	for j, k := range off {
		xa := x0 + bandW + 3 + offW*float64(j)
		p.cellAt(xa-1, y0+usePlotH+0.8, offW+1, 3, compactSI(u.F[k], "Hz"), "C")
	}
	if len(off) > 0 {
		p.cellAt(x0+bandW+2, y0-3.6, float64(len(off))*offW+1, 3, "outside", "C")
	}
	p.cellAt(x0, y0-3.6, bandW, 3, "use of the derated limit, worst case at each frequency", "L")
	// one line per part; points outside the band stand alone
	for n, i := range idx {
		c := useColours[n]
		p.draw(c)
		p.fill(c)
		f.SetLineWidth(0.55)
		var prev *gofpdf.PointType
		for k := range u.F {
			v := u.Use[i][k]
			if !finite(v) {
				prev = nil
				continue
			}
			pt := gofpdf.PointType{X: xOf(k), Y: yOf(v)}
			if u.OffBand[k] || len(band) == 1 {
				f.Circle(pt.X, pt.Y, 0.7, "F")
				continue
			}
			if prev != nil {
				f.Line(prev.X, prev.Y, pt.X, pt.Y)
			}
			prev = &pt
		}
	}
	// legend under the axis, flowing onto further lines within the plot's width
	p.font("", 7)
	y := y0 + usePlotH + 5
	x := x0
	entry := func(label string, c rgb, lw float64) {
		w := p.width(label) + 7
		if x > x0 && x+w > x0+usePlotW {
			x, y = x0, y+4
		}
		p.draw(c)
		f.SetLineWidth(lw)
		f.Line(x, y+1.5, x+4, y+1.5)
		p.cellAt(x+5, y, w-5, 3, label, "L")
		x += w + 2
	}
	p.text(colInk)
	for n, i := range idx {
		pr := s.Parts[i]
		label := pr.Name
		if st := bindingStress(pr); st != nil {
			label += " " + QuantityLabel(st.Quantity)
		}
		entry(label+" · "+pct(pr.Util), useColours[n], 0.8)
	}
	p.text(colMuted)
	entry("derated limit (100 %)", colFail, 0.5)
	p.text(colInk)
	f.SetLineWidth(0.2)
}

// gammaOf is a load's place on the chart: the reflection coefficient
// against the chart's reference resistance.
func gammaOf(z complex128, r0 float64) (complex128, bool) {
	if cmplx.IsInf(z) {
		return 1, true
	}
	if cmplx.IsNaN(z) {
		return 0, false
	}
	return (z - complex(r0, 0)) / (z + complex(r0, 0)), true
}

// loadChart draws an impedance chart (the Smith chart: circles of
// constant resistance and arcs of constant reactance) with the loads
// audited at the antenna port, and the case that bound the limiting part.
// gammaArc draws the arc of the circle round centre (Γ plane, radius
// rad mm on the page) that gamma traces for resistance 0 to 999 on a
// chart mapped by at: as an arc, a few Bézier segments where a polyline
// took dozens of points; it passes through resistance 1.
func (p *pdfw) gammaArc(at func(complex128) (float64, float64), centre complex128, rad float64, gamma func(r float64) complex128) {
	cx, cy := at(centre)
	deg := func(r float64) float64 {
		x, y := at(gamma(r))
		return math.Atan2(cy-y, x-cx) * 180 / math.Pi // counter-clockwise, as gofpdf's Arc
	}
	norm := func(d float64) float64 {
		for d <= -180 {
			d += 360
		}
		for d > 180 {
			d -= 360
		}
		return d
	}
	a0 := deg(0)
	d1, dm := norm(deg(999)-a0), norm(deg(1)-a0)
	if dm*d1 < 0 || math.Abs(dm) > math.Abs(d1) {
		d1 -= math.Copysign(360, d1) // the other way round
	}
	p.f.Arc(cx, cy, rad, rad, 0, a0, a0+d1, "D")
}

func (p *pdfw) loadChart(s *stress.Section, fp *FilterPlot, top float64) {
	f := p.f
	r0 := fp.R0
	if !(r0 > 0) {
		r0 = 50
	}
	cx, cy := pageW-marginR-chartR-6, top+4+chartR
	at := func(g complex128) (float64, float64) { return cx + real(g)*chartR, cy - imag(g)*chartR }
	p.fill(colFaint)
	f.Circle(cx, cy, chartR, "F")
	p.draw(colRule)
	f.SetLineWidth(0.15)
	for _, r := range []float64{0.2, 0.5, 1, 2, 5} {
		c := r / (1 + r)
		f.Circle(cx+c*chartR, cy, chartR/(1+r), "D")
	}
	for _, x := range []float64{0.2, 0.5, 1, 2, 5} {
		for _, sgn := range []float64{1, -1} {
			// resistance 0 to 999 at reactance ±x: an arc of the circle
			// round 1 + j/x of radius 1/x in the Γ plane, drawn as one
			p.gammaArc(at, complex(1, sgn/x), chartR/x, func(r float64) complex128 {
				return (complex(r, sgn*x) - 1) / (complex(r, sgn*x) + 1)
			})
		}
	}
	f.Line(cx-chartR, cy, cx+chartR, cy)
	p.draw(colMuted)
	f.SetLineWidth(0.3)
	f.Circle(cx, cy, chartR, "D")
	p.font("", 5.5)
	p.text(colMuted)
	for _, r := range []float64{0.2, 0.5, 1, 2} {
		x, _ := at(complex((r-1)/(r+1), 0))
		p.cellAt(x+0.3, cy+0.3, 6, 2.4, trimNum(r*r0)+"", "L")
	}
	p.font("", 6.5)
	p.cellAt(cx-chartR, cy-chartR-4, 2*chartR, 3, fmt.Sprintf("loads at the antenna port, chart for %s Ω", trimNum(r0)), "C")
	// the loads: the SWR circle as a line, single loads as points
	var circle []gofpdf.PointType
	for _, c := range fp.Loads {
		g, ok := gammaOf(c.Load.Z, r0)
		if !ok {
			continue
		}
		x, y := at(g)
		switch c.Kind {
		case stress.Circle:
			circle = append(circle, gofpdf.PointType{X: x, Y: y})
		case stress.FaultOpen, stress.FaultShort:
			p.draw(colInk)
			p.fill(colWhite)
			f.SetLineWidth(0.3)
			f.Circle(x, y, 1, "FD")
		default:
			p.fill(colAccent)
			f.Circle(x, y, 0.8, "F")
		}
	}
	if len(circle) > 1 {
		p.draw(colAccent)
		f.SetLineWidth(0.5)
		f.MoveTo(circle[0].X, circle[0].Y)
		for _, c := range circle[1:] {
			f.LineTo(c.X, c.Y)
		}
		f.ClosePath()
		f.DrawPath("D")
	}
	// fault labels outside the circle
	p.font("", 6)
	p.text(colInk)
	for _, c := range fp.Loads {
		switch c.Kind {
		case stress.FaultOpen:
			p.cellAt(cx+chartR-1, cy+2.2, 10, 3, "open", "L")
		case stress.FaultShort:
			p.cellAt(cx-chartR-9, cy+2.2, 10, 3, "short", "R")
		}
	}
	// the case that bound the limiting part, in its verdict's colour
	var lim *stress.PartResult
	for _, pr := range s.Parts {
		if pr.Name == s.LimitPart {
			lim = pr
		}
	}
	legend := "line: SWR circle · dots: explicit loads · rings: faults"
	if lim != nil && s.Engine != nil {
		if st, ok := lim.Stress[s.LimitQ]; ok {
			c := s.Case(st.UtilCase)
			if g, ok := gammaOf(c.Load.Z, r0); ok {
				x, y := at(g)
				col := verdictColor(lim.Verdict)
				p.draw(col)
				f.SetLineWidth(0.6)
				f.Line(x-1.8, y-1.8, x+1.8, y+1.8)
				f.Line(x-1.8, y+1.8, x+1.8, y-1.8)
				what := "matched"
				switch c.Kind {
				case stress.Circle:
					what = fmt.Sprintf("Γ∠%.0f°", c.Theta)
				case stress.Explicit:
					what = circuits.FormatComplex(c.Load.Z)
				case stress.FaultOpen:
					what = "antenna open"
				case stress.FaultShort:
					what = "antenna shorted"
				}
				p.font("B", 6.5)
				p.text(col)
				p.cellAt(cx-chartR-6, cy+chartR+1.5, 2*chartR+12, 3,
					p.fit(fmt.Sprintf("× worst for %s %s:", lim.Name, QuantityLabel(s.LimitQ)), 2*chartR+12), "C")
				p.cellAt(cx-chartR-6, cy+chartR+4.5, 2*chartR+12, 3,
					p.fit(what+", "+circuits.FormatHz(c.F), 2*chartR+12), "C")
			}
		}
	}
	p.font("", 6)
	p.text(colMuted)
	p.cellAt(cx-chartR-6, cy+chartR+8, 2*chartR+12, 3, p.fit(legend, 2*chartR+12), "C")
	p.text(colInk)
	f.SetLineWidth(0.2)
}

// trimNum renders a chart figure without trailing zeros.
func trimNum(v float64) string { return strconv.FormatFloat(v, 'g', 4, 64) }
