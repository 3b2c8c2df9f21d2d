package reports

import (
	"math"
	"sort"
	"strconv"
	"strings"

	"github.com/jung-kurt/gofpdf"

	"rfstress/circuits"
	"rfstress/ratings"
	"rfstress/stress"
)

type gofpdfPoint = gofpdf.PointType

func pt(x, y float64) gofpdf.PointType { return gofpdf.PointType{X: x, Y: y} }

// --- margin chart ---

// chartClip is where bars are cut: far enough to show a part well over
// its rating, near enough that the 100 % line stays readable.
const chartClip = 2.5

const (
	chartLabelW = 36.0
	chartBarW   = 96.0
	chartRowH   = 4.8
	chartTrackH = 2.6
	chartValueX = marginL + chartLabelW + chartBarW + 6 // value column
)

// bar is one rated quantity of one part.
type bar struct {
	part string
	st   *stress.Stress
	gap  string // the clearance, for a clearance bar
}

// marginChart draws one bar per part and rated quantity: the worst stress
// as a share of its derated limit, with the derated limit at 100 % and the
// absolute rating marked on each bar. Stressed quantities that could be
// rated but are not are listed after the chart.
func (p *pdfw) marginChart() {
	p.newPage("Margin chart")
	p.para(8.5, "One bar per part and rated quantity: the worst stress over every case as a share of the derated limit "+
		"(the rating times the profile's derating factor). The solid line at 100 % is the derated limit; the dark mark across "+
		"each bar's track is that part's absolute rating (100 % ÷ derating factor). Up to 100 % is ok, between the "+
		"two marks marginal, past the rating a failure. Bars beyond 250 % are cut and carry their number. On the right: "+
		"the share, then the worst stress and the derated limit.")
	p.f.Ln(2)
	p.chartLegend()
	var unrated []string
	multi := len(p.doc.Bank.Sections) > 1
	anyBar := false
	for _, s := range p.doc.Bank.Sections {
		var bars []bar
		for _, pr := range s.Parts {
			for _, q := range stress.Quantities {
				st, ok := pr.Stress[q]
				if !ok || st.Limit.Quantity == "" || st.Limit.Advice {
					continue // the heating guide is advice: shown in the core table
				}
				if st.Limit.Abs > 0 {
					b := bar{part: pr.Name, st: st}
					if q == ratings.Arc {
						b.gap = GapText(pr)
					}
					bars = append(bars, b)
				} else if st.Verdict != ratings.OK {
					u := pr.Name + " " + QuantityLabel(q) + " " + FormatQ(q, st.Value) + " — no rating: needs " +
						strings.TrimPrefix(UpgradeText(stress.Upgrade{Stress: st}), "rated ") + " (" + st.Limit.Basis + ")"
					if multi {
						u = sectionHead(s) + ": " + u
					}
					unrated = append(unrated, u)
				}
			}
		}
		if len(bars) == 0 {
			continue
		}
		anyBar = true
		title := ""
		if multi {
			title = sectionHead(s)
		}
		p.barGroup(title, bars)
	}
	if !anyBar {
		p.para(9, "No part carries a rating for any quantity it is stressed in, so there is nothing to chart.")
	}
	if len(unrated) > 0 {
		intro := "These quantities carry stress but the netlist gives no rating for them, so they cannot be judged. " +
			"Each shows the least rating that would pass under the derating profile."
		p.sub("Stressed but not rated", p.paraHeight(8.5, intro)+8)
		p.para(8.5, intro)
		p.f.Ln(1)
		for _, u := range unrated {
			p.bullet(8, u)
		}
	}
}

func (p *pdfw) chartLegend() {
	f := p.f
	y := f.GetY()
	x := marginL
	p.font("", 8)
	p.text(colInk)
	for _, v := range []ratings.Verdict{ratings.OK, ratings.Marginal, ratings.Fail} {
		p.fill(verdictColor(v))
		f.Rect(x, y+1, 6, chartTrackH, "F")
		w := p.width(v.String()) + 2
		p.cellAt(x+7.5, y, w, 4.6, v.String(), "L")
		x += 7.5 + w + 5
	}
	p.draw(colInk)
	f.SetLineWidth(0.5)
	f.Line(x+1, y-0.2, x+1, y+4.8)
	t := "derated limit (100 %)"
	p.cellAt(x+3, y, p.width(t)+2, 4.6, t, "L")
	x += 3 + p.width(t) + 7
	p.fill(colFaint)
	f.Rect(x, y+1, 8, chartTrackH, "F")
	p.ratingMark(x+5, y+1)
	p.cellAt(x+10, y, 50, 4.6, "absolute rating", "L")
	f.SetY(y + 8)
}

// ratingMark is the short bar across a track at the part's rating.
func (p *pdfw) ratingMark(x, trackTop float64) {
	p.fill(colInk)
	p.f.Rect(x-0.45, trackTop-0.9, 0.9, chartTrackH+1.8, "F")
}

func barX(u float64) float64 {
	if u < 0 || math.IsNaN(u) {
		u = 0
	}
	return marginL + chartLabelW + math.Min(u, chartClip)/chartClip*chartBarW
}

// barScale writes the percentage scale over a group of bars.
func (p *pdfw) barScale() {
	f := p.f
	y := f.GetY()
	p.font("", 7)
	p.text(colMuted)
	for _, t := range []float64{0, 0.5, 1, 1.5, 2, 2.5} {
		x := barX(t)
		s := strconv.Itoa(int(math.Round(t*100))) + " %"
		w := p.width(s)
		p.cellAt(x-w/2-0.5, y, w+1, 3.5, s, "C")
	}
	p.font("B", 7)
	p.cellAt(chartValueX, y, pageW-marginR-chartValueX, 3.5, "use · worst / limit", "L")
	p.text(colInk)
	f.SetY(y + 4.2)
}

// barGroup draws one netlist's bars with their scale and grid.
func (p *pdfw) barGroup(title string, bars []bar) {
	f := p.f
	if title != "" {
		p.room(chartRowH*3 + 10)
		p.font("B", 9)
		f.SetX(marginL)
		p.cell(bodyW, 5, title, 1, "L")
	}
	p.room(chartRowH*2 + 6)
	p.barScale()
	top := f.GetY()
	grid := func(from, to float64) {
		p.draw(colRule)
		f.SetLineWidth(0.1)
		for _, t := range []float64{0, 0.5, 1.5, 2, 2.5} {
			f.Line(barX(t), from, barX(t), to)
		}
		p.draw(colInk)
		f.SetLineWidth(0.5)
		f.Line(barX(1), from-0.5, barX(1), to+0.5)
	}
	for i, b := range bars {
		if f.GetY()+chartRowH > pageH-marginBot {
			grid(top, f.GetY())
			f.AddPage()
			p.barScale()
			top = f.GetY()
		}
		y := f.GetY()
		if i%2 == 0 {
			p.fill(rgb{246, 247, 249})
			f.Rect(marginL, y, bodyW, chartRowH, "F")
		}
		p.barRow(y, b)
		f.SetY(y + chartRowH)
	}
	grid(top, f.GetY())
	f.Ln(4)
}

func (p *pdfw) barRow(y float64, b bar) {
	f := p.f
	st := b.st
	q := st.Quantity
	// label: part in bold, quantity after it
	p.font("B", 7.8)
	nw := p.width(b.part) + 1.5
	p.cellAt(marginL+1, y, nw, chartRowH, b.part, "L")
	p.font("", 7.2)
	p.text(colMuted)
	label := QuantityLabel(q)
	if b.gap != "" {
		label = "gap " + b.gap
	}
	p.cellAt(marginL+1+nw, y, chartLabelW-nw-2, chartRowH, p.fit(label, chartLabelW-nw-3), "L")
	p.text(colInk)
	trackTop := y + (chartRowH-chartTrackH)/2
	p.fill(colFaint)
	f.Rect(barX(0), trackTop, chartBarW, chartTrackH, "F")
	u := st.Util
	if !finite(u) || u < 0 {
		u = chartClip * 1.01 // a broken number is drawn as off the scale
	}
	p.fill(verdictColor(st.Verdict))
	if w := barX(u) - barX(0); w > 0 {
		f.Rect(barX(0), trackTop, w, chartTrackH, "F")
	}
	if u > chartClip {
		// a slanted gap says the bar goes on; the arrow points past the scale
		x := barX(chartClip)
		p.fill(colWhite)
		f.Polygon([]gofpdfPoint{pt(x-3.2, trackTop-0.1), pt(x-2.3, trackTop-0.1), pt(x-2.7, trackTop+chartTrackH+0.1), pt(x-3.6, trackTop+chartTrackH+0.1)}, "F")
		p.fill(verdictColor(st.Verdict))
		f.Polygon([]gofpdfPoint{pt(x, trackTop-0.7), pt(x+2, trackTop+chartTrackH/2), pt(x, trackTop+chartTrackH+0.7)}, "F")
	}
	if lim := st.Limit; lim.Derated > 0 && lim.Abs > 0 {
		if r := lim.Abs / lim.Derated; finite(r) && r <= chartClip {
			p.ratingMark(barX(r), trackTop)
		}
	}
	// value column: use of limit, then worst stress and derated limit
	p.font("B", 7.8)
	us := pct(st.Util)
	if st.Util == 0 {
		us = "0 %"
	}
	p.cellAt(chartValueX, y, 11, chartRowH, us, "R")
	p.font("", 6.8)
	p.text(colMuted)
	vw := pageW - marginR - chartValueX - 12
	vs := pairText(FormatQ(q, st.Value), FormatQ(q, st.Limit.Derated))
	for size := 6.8; p.width(vs) > vw && size > 5.4; size -= 0.2 {
		p.font("", size)
	}
	p.cellAt(chartValueX+12, y, vw, chartRowH, p.fit(vs, vw), "L")
	p.text(colInk)
}

// pairText writes "worst / limit", with the unit once when both share it:
// "40.4 / 42.6 A/mm²".
func pairText(a, b string) string {
	ia, ib := strings.Index(a, " "), strings.Index(b, " ")
	if ia > 0 && ib > 0 && a[ia:] == b[ib:] {
		return a[:ia] + " / " + b
	}
	return a + " / " + b
}

// --- frequency response ---

const (
	plotH     = 76.0
	plotLeft  = marginL + 11
	plotW     = bodyW - 13
	plotTopSp = 6.0 // room above the plot for harmonic numbers
)

// logAxis maps frequency to x on a log scale.
type logAxis struct{ lo, hi float64 }

func (a logAxis) x(f float64) float64 {
	return plotLeft + math.Log(f/a.lo)/math.Log(a.hi/a.lo)*plotW
}

// responsePlot draws insertion and return loss against log frequency with
// the band shaded and the harmonics and outside-band carriers marked.
func (p *pdfw) responsePlot(fp *FilterPlot) {
	f := p.f
	var pts []stress.SweepPoint
	for _, sp := range fp.Sweep {
		if sp.F > 0 && finite(sp.F) {
			pts = append(pts, sp)
		}
	}
	if len(pts) < 2 || !(pts[len(pts)-1].F > pts[0].F) {
		p.para(8.5, "No response data.")
		return
	}
	ax := logAxis{pts[0].F, pts[len(pts)-1].F}
	// the loss axis runs from 0 dB at the top down to a round figure past
	// the largest loss shown, at most 120 dB
	worst := 0.0
	for _, sp := range pts {
		for _, v := range []float64{-sp.S21dB, -sp.S11dB} {
			if finite(v) && v > worst {
				worst = v
			}
		}
	}
	for _, h := range fp.Harmonics {
		if h.N >= 2 && finite(h.S21dB) && -h.S21dB > worst {
			worst = -h.S21dB
		}
	}
	yMax, step := lossScale(worst)
	p.room(plotTopSp + plotH + 34)
	top := f.GetY() + plotTopSp
	bottom := top + plotH
	yOf := func(db float64) float64 { return top + db/yMax*plotH }
	inX := func(x float64) bool { return x >= plotLeft-0.01 && x <= plotLeft+plotW+0.01 }

	// band
	if fp.BandLo > 0 && fp.BandHi >= fp.BandLo {
		x0 := math.Max(ax.x(fp.BandLo), plotLeft)
		x1 := math.Min(ax.x(fp.BandHi), plotLeft+plotW)
		if x1-x0 < 0.8 {
			x0, x1 = x0-0.4, x1+0.4
		}
		if x1 > x0 {
			p.fill(colBand)
			f.Rect(x0, top, x1-x0, plotH, "F")
			p.font("", 6.5)
			p.text(colAccent)
			bw := p.width("band")
			p.cellAt((x0+x1)/2-bw/2-0.5, bottom-4, bw+1, 3.5, "band", "C")
		}
	}
	// grid and frequency ticks
	p.draw(colRule)
	f.SetLineWidth(0.1)
	for db := 0.0; db <= yMax+1e-9; db += step {
		f.Line(plotLeft, yOf(db), plotLeft+plotW, yOf(db))
	}
	p.font("", 7)
	p.text(colMuted)
	for db := 0.0; db <= yMax+1e-9; db += step {
		p.cellAt(marginL, yOf(db)-1.7, plotLeft-marginL-1.2, 3.4, strconv.Itoa(int(db)), "R")
	}
	p.freqTicks(ax, bottom)
	// curves, clipped to the plot area
	f.ClipRect(plotLeft, top, plotW, plotH, false)
	p.curve(pts, ax, yOf, func(sp stress.SweepPoint) float64 { return -sp.S11dB }, colSecond, 0.35, true)
	p.curve(pts, ax, yOf, func(sp stress.SweepPoint) float64 { return -sp.S21dB }, colAccent, 0.5, false)
	f.ClipEnd()
	// outside-band carriers: a dash-dot line; labelled after the harmonics
	// so a label can step aside from their marks
	extras := 0
	var extraX []float64
	for _, fx := range fp.Extra {
		x := ax.x(fx)
		if !(fx > 0) || !inX(x) {
			continue
		}
		extras++
		extraX = append(extraX, x)
		p.draw(colCautionB)
		f.SetLineWidth(0.3)
		f.SetDashPattern([]float64{2, 0.8, 0.4, 0.8}, 0)
		f.Line(x, top, x, bottom)
		f.SetDashPattern(nil, 0)
	}
	// what is printed inside the plot, to keep labels apart
	type box struct{ x0, y0, x1, y1 float64 }
	var taken []box
	clear := func(b box) bool {
		for _, t := range taken {
			if b.x0 < t.x1 && t.x0 < b.x1 && b.y0 < t.y1 && t.y0 < b.y1 {
				return false
			}
		}
		return true
	}
	const asc = 6.3 * 0.3528 * 0.8 // ascent of the 6.3 pt rotated labels
	// harmonics of the band centre
	lastX := -1e9
	for _, h := range fp.Harmonics {
		if h.N < 2 || !finite(h.S21dB) {
			continue
		}
		x := ax.x(h.F)
		if !inX(x) {
			continue
		}
		att := -h.S21dB
		yp := yOf(math.Min(math.Max(att, 0), yMax))
		p.draw(colMuted)
		f.SetLineWidth(0.2)
		f.SetDashPattern([]float64{0.5, 0.7}, 0)
		f.Line(x, top, x, yp)
		f.SetDashPattern(nil, 0)
		p.fill(colInk)
		f.Circle(x, yp, 0.7, "F")
		taken = append(taken, box{x - 0.9, top, x + 0.9, yp + 0.9})
		if x-lastX < 3.2 {
			continue // too close to the previous label to print
		}
		lastX = x
		p.font("B", 6.5)
		p.text(colInk)
		lbl := "H" + strconv.Itoa(h.N)
		w := p.width(lbl)
		p.cellAt(x-w/2-0.5, top-plotTopSp+1.5, w+1, 3.5, lbl, "C")
		p.font("", 6.3)
		txt := dbText(att)
		tw := p.width(txt)
		yb := yp - 1.2
		if yp-1.2-tw <= top+0.5 {
			yb = math.Min(yp+1.2+tw, bottom-0.5)
		}
		p.rotText(x+2.3, yb, txt, true)
		taken = append(taken, box{x + 2.3 - asc, yb - tw, x + 2.6, yb})
	}
	// carrier-also labels: beside their line, from the bottom or the top,
	// in full or as the bare frequency, wherever nothing else is printed
	p.font("", 6.3)
	p.text(colCautionB)
	for i, fx := range fp.Extra {
		if i >= len(extraX) {
			break
		}
		x := extraX[i]
		for _, txt := range []string{compactSI(fx, "Hz") + " outside the band", compactSI(fx, "Hz")} {
			w := p.width(txt)
			done := false
			for _, c := range []struct {
				x     float64
				fromT bool
			}{{x - 0.7, false}, {x + 0.7 + asc, false}, {x - 0.7, true}, {x + 0.7 + asc, true}} {
				yb := bottom - 1.5
				if c.fromT {
					yb = top + 1.5 + w
				}
				b := box{c.x - asc, yb - w, c.x + 0.4, yb}
				if !clear(b) {
					continue
				}
				p.rotText(c.x, yb, txt, true)
				taken = append(taken, b)
				done = true
				break
			}
			if done {
				break
			}
		}
	}
	p.lossFrame(top, bottom)
	p.responseLegend(extras > 0)
	p.harmonicTable(fp)
}

// curve draws one trace, broken where a value cannot be drawn.
func (p *pdfw) curve(pts []stress.SweepPoint, ax logAxis, yOf func(float64) float64, val func(stress.SweepPoint) float64, c rgb, lw float64, dashed bool) {
	f := p.f
	p.draw(c)
	f.SetLineWidth(lw)
	if dashed {
		f.SetDashPattern([]float64{1.6, 0.9}, 0)
	}
	open := false
	for _, sp := range pts {
		v := val(sp)
		if !finite(v) {
			if open {
				f.DrawPath("D")
				open = false
			}
			continue
		}
		// keep coordinates near the plot so clipping does the rest
		v = math.Max(-10, math.Min(v, 1000))
		x, y := ax.x(sp.F), yOf(v)
		if !open {
			f.MoveTo(x, y)
			open = true
		} else {
			f.LineTo(x, y)
		}
	}
	if open {
		f.DrawPath("D")
	}
	f.SetDashPattern(nil, 0)
}

// rotText writes text turned a quarter: reading upwards from (x, y) when
// up, else reading downwards from (x, y).
func (p *pdfw) rotText(x, y float64, s string, up bool) {
	f := p.f
	p.textFill()
	f.TransformBegin()
	if up {
		f.TransformRotate(90, x, y)
	} else {
		f.TransformRotate(-90, x, y)
	}
	f.Text(x, y, clean(s))
	f.TransformEnd()
}

// freqTicks writes the log-frequency ticks and labels under the plot.
func (p *pdfw) freqTicks(ax logAxis, bottom float64) {
	f := p.f
	perDecade := plotW / math.Log10(ax.hi/ax.lo)
	// which multiples of each decade get a label, by room per decade
	var labelled []int
	switch {
	case perDecade >= 90:
		labelled = []int{1, 2, 3, 4, 5, 6, 7, 8, 9}
	case perDecade >= 45:
		labelled = []int{1, 2, 3, 5, 7}
	case perDecade >= 22:
		labelled = []int{1, 2, 5}
	default:
		labelled = []int{1}
	}
	p.font("", 7)
	// labels are placed decades first, then 5, 2, 3, … so a decade's
	// label is never crowded out by the minor one before it
	type span struct{ l, r float64 }
	var placed []span
	free := func(l, r float64) bool {
		for _, s := range placed {
			if l < s.r+1.5 && s.l < r+1.5 {
				return false
			}
		}
		return true
	}
	var labels []struct {
		fr  float64
		pri int
	}
	for d := math.Floor(math.Log10(ax.lo)); d <= math.Ceil(math.Log10(ax.hi)); d++ {
		for m := 1; m <= 9; m++ {
			fr := float64(m) * math.Pow(10, d)
			if fr < ax.lo*(1-1e-9) || fr > ax.hi*(1+1e-9) {
				continue
			}
			x := ax.x(fr)
			p.draw(colRule)
			f.SetLineWidth(0.1)
			if m == 1 {
				f.SetLineWidth(0.25)
			}
			f.Line(x, bottom-plotH, x, bottom)
			p.draw(colInk)
			f.SetLineWidth(0.2)
			label := containsInt(labelled, m)
			tick := 1.0
			if label {
				tick = 1.8
			}
			f.Line(x, bottom, x, bottom+tick)
			if !label {
				continue
			}
			pri := [...]int{0, 0, 2, 3, 4, 1, 5, 6, 7, 8}[m]
			labels = append(labels, struct {
				fr  float64
				pri int
			}{fr, pri})
		}
	}
	sort.SliceStable(labels, func(i, j int) bool { return labels[i].pri < labels[j].pri })
	p.text(colMuted)
	for _, lb := range labels {
		x := ax.x(lb.fr)
		s := compactSI(lb.fr, "Hz")
		w := p.width(s)
		if !free(x-w/2, x+w/2) || x+w/2 > pageW-marginR+2 {
			continue
		}
		placed = append(placed, span{x - w/2, x + w/2})
		p.cellAt(x-w/2-0.5, bottom+1.8, w+1, 3.2, s, "C")
	}
	p.text(colInk)
}

func containsInt(list []int, v int) bool {
	for _, x := range list {
		if x == v {
			return true
		}
	}
	return false
}

// compactSI is FormatSI without trailing zeros: 2.00 MHz → 2 MHz.
func compactSI(v float64, unit string) string {
	s := circuits.FormatSI(v, unit)
	numPart, rest, ok := strings.Cut(s, " ")
	if !ok || !strings.Contains(numPart, ".") {
		return s
	}
	numPart = strings.TrimRight(strings.TrimRight(numPart, "0"), ".")
	return numPart + " " + rest
}

func (p *pdfw) responseLegend(extra bool) {
	f := p.f
	y := f.GetY()
	x := plotLeft
	p.font("", 7.5)
	item := func(draw func(x, y float64), label string) {
		w := p.width(label) + 1
		if x+9+w > pageW-marginR {
			x, y = plotLeft, y+4.5
		}
		draw(x, y+2)
		p.text(colInk)
		p.cellAt(x+9, y, w, 4, label, "L")
		x += 9 + w + 5
	}
	line := func(c rgb, lw float64, dash []float64) func(x, y float64) {
		return func(x, y float64) {
			p.draw(c)
			f.SetLineWidth(lw)
			f.SetDashPattern(dash, 0)
			f.Line(x, y, x+7, y)
			f.SetDashPattern(nil, 0)
		}
	}
	item(line(colAccent, 0.5, nil), "insertion loss (−S21)")
	item(line(colSecond, 0.35, []float64{1.6, 0.9}), "return loss (−S11)")
	item(func(x, y float64) {
		p.fill(colBand)
		f.Rect(x, y-1.6, 7, 3.2, "F")
	}, "carrier band")
	item(func(x, y float64) {
		line(colMuted, 0.2, []float64{0.5, 0.7})(x, y)
		p.fill(colInk)
		f.Circle(x+3.5, y, 0.7, "F")
	}, "harmonic of the band centre")
	if extra {
		item(line(colCautionB, 0.3, []float64{2, 0.8, 0.4, 0.8}), "carrier outside the band (wrong filter selected)")
	}
	f.SetY(y + 7)
}

// harmonicTable lists the harmonics with the filter's attenuation and the
// amplifier's level, ten to a block.
func (p *pdfw) harmonicTable(fp *FilterPlot) {
	var hs []stress.HarmonicLine
	for _, h := range fp.Harmonics {
		if h.N >= 2 {
			hs = append(hs, h)
		}
	}
	if len(hs) == 0 {
		return
	}
	f := p.f
	const labelW = 40.0
	const perBlock = 10
	lh := 3.9
	rows := []struct {
		label string
		cell  func(h stress.HarmonicLine) string
		bold  bool
	}{
		{"harmonic of the band centre", func(h stress.HarmonicLine) string { return "H" + strconv.Itoa(h.N) }, true},
		{"frequency", func(h stress.HarmonicLine) string { return compactSI(h.F, "Hz") }, false},
		{"filter attenuation", func(h stress.HarmonicLine) string { return dbText(-h.S21dB) }, true},
		{"amplifier level", func(h stress.HarmonicLine) string {
			if !finite(h.LevelDBc) {
				return "none"
			}
			return minus(num(h.LevelDBc, 0)) + " dBc"
		}, false},
	}
	for start := 0; start < len(hs); start += perBlock {
		block := hs[start:min(start+perBlock, len(hs))]
		cw := (bodyW - labelW) / perBlock
		p.room(4*lh + 3)
		y := f.GetY()
		p.fill(colFaint)
		f.Rect(marginL, y, bodyW, lh, "F")
		for i, r := range rows {
			p.font("", 7.2)
			p.text(colMuted)
			p.cellAt(marginL+1, y+float64(i)*lh, labelW-1, lh, r.label, "L")
			style := ""
			if r.bold {
				style = "B"
			}
			p.font(style, 7.2)
			p.text(colInk)
			for j, h := range block {
				p.cellAt(marginL+labelW+float64(j)*cw, y+float64(i)*lh, cw, lh, r.cell(h), "R")
			}
		}
		p.draw(colRule)
		f.SetLineWidth(0.1)
		f.Line(marginL, y+4*lh, marginL+bodyW, y+4*lh)
		f.SetY(y + 4*lh + 2)
	}
}

func dbText(v float64) string {
	if !finite(v) {
		return "—"
	}
	return minus(num(v, 1)) + " dB"
}

// lossScale is a loss axis from 0 dB down to a round figure past the
// largest loss shown (at most 120 dB), with its grid step.
func lossScale(worst float64) (yMax, step float64) {
	yMax = math.Max(20, math.Ceil(math.Min(worst, 120)/10)*10)
	step = 10
	if yMax > 60 {
		step = 20
	}
	return yMax, step
}

// lossFrame draws the frame of a loss-against-frequency plot and its axis
// titles, and leaves the cursor under it.
func (p *pdfw) lossFrame(top, bottom float64) {
	f := p.f
	p.draw(colInk)
	f.SetLineWidth(0.3)
	f.Rect(plotLeft, top, plotW, plotH, "D")
	p.font("", 7)
	p.text(colMuted)
	p.rotText(marginL+1.8, top+plotH/2+8, "loss, dB", true)
	p.cellAt(plotLeft, bottom+5, plotW, 3.5, "frequency (log scale)", "C")
	p.text(colInk)
	f.SetY(bottom + 10)
}
