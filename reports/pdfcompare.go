package reports

import (
	"bytes"
	"fmt"
	"io"
	"math"
	"strings"
	"time"

	"rfstress/circuits"
	"rfstress/stress"
)

// WriteComparePDF writes the comparison of a model with its measurement:
// |S21| and |S11| of both overlaid, the heat table and the Q fit.
func WriteComparePDF(w io.Writer, v *CompareView, tool string, date time.Time) error {
	doc := &ReportDoc{Tool: tool, Date: date, Bank: &stress.Bank{}, Subject: "model against measurement: " + v.File}
	p := newPDF(doc, true)
	f := p.f
	f.SetTitle("Model against measurement", true)
	f.SetSubject(doc.Subject, true)
	p.newPage("Model against measurement")
	p.para(9, fmt.Sprintf("Model %s%s set against the measured two-port %s (%d points, %s to %s). "+
		"Solid lines are the model, dashed lines the measurement; both with each port terminated in its reference.",
		v.File, titleSuffix(v.Title), v.Measured, v.Points, circuits.FormatHz(v.Cmp.Lo), circuits.FormatHz(v.Cmp.Hi)))
	p.compareOverlay(v.Cmp)
	p.sub("Largest differences, model − measured", 20)
	p.mono(8)
	rows := [][2]string{
		{"in band, |S21|", worstText(v.Cmp.BandS21)}, {"in band, |S11|", worstText(v.Cmp.BandS11)},
		{"at harmonics, |S21|", worstText(v.Cmp.HarmS21)}, {"at harmonics, |S11|", worstText(v.Cmp.HarmS11)},
	}
	for _, r := range rows {
		f.SetX(marginL)
		p.cell(50, 4.2, r[0], 0, "L")
		p.cell(bodyW-50, 4.2, r[1], 1, "L")
	}
	p.sub(fmt.Sprintf("Heat in the filter at %s, source and load matched", circuits.FormatSI(v.Cmp.PowerW, "W")), 20)
	p.para(8.5, "The dissipated share 1 − |S11|² − |S21|² is the part of the incident power that is neither reflected nor passed on: the built filter turns it into heat.")
	p.mono(8)
	f.SetX(marginL)
	p.cell(bodyW, 4.2, fmt.Sprintf("%-12s %10s %10s %10s %10s %9s %9s", "carrier", "loss mod.", "loss meas.", "share mod.", "share meas.", "heat mod.", "heat meas."), 1, "L")
	for _, h := range v.Cmp.Carriers {
		f.SetX(marginL)
		name := circuits.FormatHz(h.F)
		if h.OffBand {
			name += "*"
		}
		p.cell(bodyW, 4.2, fmt.Sprintf("%-12s %10s %10s %10s %10s %9s %9s", name,
			num(h.ModelLossDB, 2)+" dB", num(h.MeasLossDB, 2)+" dB", num(100*h.ModelShare, 2)+" %", num(100*h.MeasShare, 2)+" %",
			circuits.FormatSI(h.ModelW, "W"), circuits.FormatSI(h.MeasW, "W")), 1, "L")
	}
	for _, h := range v.Cmp.Carriers {
		if h.OffBand {
			p.para(8, "* outside the band: a carrier-also frequency (a wrong filter selected).")
			break
		}
	}
	if fit := v.Fit; fit != nil {
		p.sub("Q fitted to the measurement", 20)
		p.para(8.5, fmt.Sprintf("Least-squares fit of Q scale factors (--fit %s) to S21 and S11 at %s from %s to %s; "+
			"uncertainty from the fit's curvature (one standard deviation). RMS residual %s before, %s after.",
			v.FitBy, pointsText(fit.Points), circuits.FormatHz(fit.Lo), circuits.FormatHz(fit.Hi), num(fit.RMSBefore, 4), num(fit.RMSAfter, 4)))
		p.mono(8)
		for _, g := range fit.Groups {
			f.SetX(marginL)
			p.cell(bodyW, 4.2, fmt.Sprintf("%-28s Q × %s ± %s", p.fit(g.Name+" ("+strings.Join(g.Parts, ", ")+")", 60), num(g.Scale, 3), sigmaText(g)), 1, "L")
			if g.AtBound {
				p.para(8, g.Name+": the fit ran to the edge of its search; the measurement differs from the model in more than Q. Do not use this factor.")
			}
		}
		if v.Calibrated != "" {
			p.para(8.5, "Calibrated netlist: "+v.Calibrated+".")
		}
	}
	var buf bytes.Buffer
	if err := f.Output(&buf); err != nil {
		return fmt.Errorf("report: %w", err)
	}
	_, err := io.Copy(w, &buf)
	return err
}

func titleSuffix(t string) string {
	if t == "" {
		return ""
	}
	return " (" + t + ")"
}

// compareOverlay plots model and measured |S21| and |S11| in dB against
// log frequency.
func (p *pdfw) compareOverlay(c *stress.Comparison) {
	f := p.f
	var model, meas []stress.SweepPoint
	for _, pt := range c.Points {
		model = append(model, stress.SweepPoint{F: pt.F, S21dB: circuits.DB(pt.Model[2]), S11dB: circuits.DB(pt.Model[0])})
		meas = append(meas, stress.SweepPoint{F: pt.F, S21dB: circuits.DB(pt.Meas[2]), S11dB: circuits.DB(pt.Meas[0])})
	}
	if len(model) < 2 || !(model[len(model)-1].F > model[0].F) {
		p.para(8.5, "Too few points to plot.")
		return
	}
	ax := logAxis{model[0].F, model[len(model)-1].F}
	worst := 0.0
	for _, s := range [][]stress.SweepPoint{model, meas} {
		for _, sp := range s {
			for _, v := range []float64{-sp.S21dB, -sp.S11dB} {
				if finite(v) && v > worst {
					worst = v
				}
			}
		}
	}
	yMax, step := lossScale(worst)
	p.room(plotTopSp + plotH + 24)
	top := f.GetY() + plotTopSp
	bottom := top + plotH
	yOf := func(db float64) float64 { return top + db/yMax*plotH }
	// carrier band
	lo, hi := math.Inf(1), 0.0
	for _, h := range c.Carriers {
		if !h.OffBand {
			lo, hi = math.Min(lo, h.F), math.Max(hi, h.F)
		}
	}
	if hi > 0 {
		x0, x1 := math.Max(ax.x(lo), plotLeft), math.Min(ax.x(hi), plotLeft+plotW)
		if x1-x0 < 0.8 {
			x0, x1 = x0-0.4, x1+0.4
		}
		p.fill(colBand)
		f.Rect(x0, top, x1-x0, plotH, "F")
	}
	p.draw(colRule)
	f.SetLineWidth(0.1)
	p.font("", 7)
	p.text(colMuted)
	for db := 0.0; db <= yMax+1e-9; db += step {
		f.Line(plotLeft, yOf(db), plotLeft+plotW, yOf(db))
		p.cellAt(marginL, yOf(db)-1.7, plotLeft-marginL-1.2, 3.4, fmt.Sprintf("%d", int(db)), "R")
	}
	p.freqTicks(ax, bottom)
	f.ClipRect(plotLeft, top, plotW, plotH, false)
	neg21 := func(sp stress.SweepPoint) float64 { return -sp.S21dB }
	neg11 := func(sp stress.SweepPoint) float64 { return -sp.S11dB }
	p.curve(model, ax, yOf, neg11, colSecond, 0.35, false)
	p.curve(meas, ax, yOf, neg11, colSecond, 0.35, true)
	p.curve(model, ax, yOf, neg21, colAccent, 0.5, false)
	p.curve(meas, ax, yOf, neg21, colAccent, 0.5, true)
	f.ClipEnd()
	p.lossFrame(top, bottom)
	// legend
	x, y := plotLeft, f.GetY()
	p.font("", 7.5)
	for _, it := range []struct {
		c     rgb
		dash  []float64
		label string
	}{
		{colAccent, nil, "−S21, model"}, {colAccent, []float64{1.6, 0.9}, "−S21, measured"},
		{colSecond, nil, "−S11, model"}, {colSecond, []float64{1.6, 0.9}, "−S11, measured"},
	} {
		p.draw(it.c)
		f.SetLineWidth(0.5)
		f.SetDashPattern(it.dash, 0)
		f.Line(x, y+2, x+7, y+2)
		f.SetDashPattern(nil, 0)
		p.text(colInk)
		w := p.width(it.label) + 1
		p.cellAt(x+9, y, w, 4, it.label, "L")
		x += 9 + w + 5
	}
	f.SetY(y + 7)
	p.text(colInk)
}
