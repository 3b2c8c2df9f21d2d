package reports

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"rfstress/circuits"
	"rfstress/ratings"
	"rfstress/stress"
)

// tcol is a table column.
type tcol struct {
	title string
	w     float64 // mm
	align string  // "L" or "R"
}

// tcell is one table cell: text, or a verdict tag.
type tcell struct {
	s     string
	pill  bool
	v     ratings.Verdict
	bold  bool
	mono  bool
	muted bool
}

// trow is a table row with optional full-width detail lines under it.
type trow struct {
	cells      []tcell
	detail     []string
	detailMono bool // detail is a digest or code: monospace
	cont       bool // continues the previous row's group: same shading
	// grid is a small table under the row (gridCols wide), each line with
	// an optional note spanning the grid's width under it
	grid     []gridRow
	gridCols []tcol
}

// gridRow is one line of a row's small table.
type gridRow struct {
	cells []string
	note  string
	col   rgb // colour of the last cell (a verdict); zero: ink
}

func tc(s string) tcell { return tcell{s: s} }

func tv(v ratings.Verdict) tcell { return tcell{pill: true, v: v} }

const cellPad = 1.2

// rowLayout is a row wrapped to its columns.
type rowLayout struct {
	lines  [][]string
	n      int // text lines of the tallest cell
	dlines []string
	glines [][][]string // per grid row, per cell: lines
	gnote  [][]string   // per grid row: note lines
	gh     []float64    // per grid row: height
	ghead  float64      // grid heading height
	h      float64
}

// table draws rows under a header that is repeated after page breaks.
// Cells wrap; a row never splits across pages, and a group of rows (a row
// and the rows that continue it) starts on a new page rather than leave a
// short remnant, unless the group is too tall to keep together.
func (p *pdfw) table(cols []tcol, rows []trow, size float64) {
	f := p.f
	lh := size * 0.44
	detailSize := size - 1.2
	dlh := detailSize * 0.44
	tw := tableW(cols)
	detailFont := func(r trow) {
		if r.detailMono {
			p.mono(detailSize - 0.6)
		} else {
			p.font("", detailSize)
		}
	}
	// the layout measures in each text's face without setting it where
	// it can (splitIn): the drawing sets the fonts
	detailFace := func(r trow) (int, float64) {
		if r.detailMono {
			return faceMono, detailSize - 0.6
		}
		return faceRegular, detailSize
	}
	layout := func(r trow) rowLayout {
		l := rowLayout{lines: make([][]string, len(cols)), n: 1}
		for i, c := range r.cells {
			if i >= len(cols) || c.pill {
				continue
			}
			face, fs := cellFace(c, size)
			l.lines[i] = p.splitIn(face, fs, c.s, cols[i].w-2*cellPad)
			l.n = max(l.n, len(l.lines[i]))
		}
		dface, dsize := detailFace(r)
		for _, d := range r.detail {
			l.dlines = append(l.dlines, p.splitIn(dface, dsize, d, tw-6)...)
		}
		l.h = float64(l.n)*lh + 2*cellPad
		if len(l.dlines) > 0 {
			l.h += float64(len(l.dlines))*dlh + cellPad
		}
		if len(r.grid) > 0 {
			hn := 1
			for _, c := range r.gridCols {
				hn = max(hn, len(p.splitIn(faceBold, detailSize, c.title, c.w-1)))
			}
			l.ghead = float64(hn)*dlh + 0.6
			l.h += l.ghead
			for _, g := range r.grid {
				var cells [][]string
				n := 1
				for i, c := range g.cells {
					if i >= len(r.gridCols) {
						break
					}
					ls := p.splitIn(faceRegular, detailSize, c, r.gridCols[i].w-1)
					cells = append(cells, ls)
					n = max(n, len(ls))
				}
				var note []string
				if g.note != "" {
					note = p.splitIn(faceRegular, detailSize, g.note, tableW(r.gridCols)-6)
				}
				h := float64(n+len(note))*dlh + 0.5
				l.glines = append(l.glines, cells)
				l.gnote = append(l.gnote, note)
				l.gh = append(l.gh, h)
				l.h += h
			}
			l.h += cellPad
		}
		return l
	}
	lays := make([]rowLayout, len(rows))
	for i, r := range rows {
		lays[i] = layout(r)
	}
	header := func() {
		p.font("B", size)
		var maxLines int
		for _, c := range cols {
			maxLines = max(maxLines, len(p.split(c.title, c.w-2*cellPad)))
		}
		h := float64(maxLines)*lh + 2*cellPad
		y := f.GetY()
		p.fill(colFaint)
		f.Rect(marginL, y, tw, h, "F")
		p.text(colAccent)
		x := marginL
		for _, c := range cols {
			for i, l := range p.split(c.title, c.w-2*cellPad) {
				p.cellAt(x+cellPad, y+cellPad+float64(i)*lh, c.w-2*cellPad, lh, l, c.align)
			}
			x += c.w
		}
		p.draw(colAccent)
		f.SetLineWidth(0.3)
		f.Line(marginL, y+h, marginL+tw, y+h)
		f.SetY(y + h)
		p.text(colInk)
	}
	const keepGroup = 60.0 // mm: taller groups may split
	p.room(16)
	header()
	shade := true
	groupHead := ""
	for ri, r := range rows {
		lay := lays[ri]
		need := lay.h
		if !r.cont {
			shade = !shade
			group := lay.h
			for j := ri + 1; j < len(rows) && rows[j].cont; j++ {
				group += lays[j].h
			}
			if group <= keepGroup {
				need = group
			}
		}
		if f.GetY()+need > pageH-marginBot {
			f.AddPage()
			header()
			if r.cont && len(r.cells) > 0 && r.cells[0].s == "" && groupHead != "" {
				// a group carried over names itself again
				r.cells = append([]tcell{{s: groupHead + " (cont.)", muted: true}}, r.cells[1:]...)
				lay = layout(r)
			}
		}
		if !r.cont && len(r.cells) > 0 {
			groupHead = r.cells[0].s
		}
		y := f.GetY()
		if shade {
			p.fill(rgb{246, 247, 249})
			f.Rect(marginL, y, tw, lay.h, "F")
		}
		x := marginL
		for i, c := range r.cells {
			if i >= len(cols) {
				break
			}
			if c.pill {
				p.pillFit(x+cellPad, y+cellPad, lh, c.v, cols[i].w-2*cellPad)
			} else {
				p.cellFont(c, size)
				for j, l := range lay.lines[i] {
					p.cellAt(x+cellPad, y+cellPad+float64(j)*lh, cols[i].w-2*cellPad, lh, l, cols[i].align)
				}
				p.text(colInk)
			}
			x += cols[i].w
		}
		if len(lay.dlines) > 0 {
			detailFont(r)
			p.text(colMuted)
			dy := y + float64(lay.n)*lh + 2*cellPad
			for j, l := range lay.dlines {
				p.cellAt(marginL+4, dy+float64(j)*dlh, tw-6, dlh, l, "L")
			}
			p.text(colInk)
		}
		if len(r.grid) > 0 {
			gy := y + float64(lay.n)*lh + 2*cellPad
			gx := marginL + 4
			p.font("B", detailSize)
			p.text(colMuted)
			x := gx
			for _, c := range r.gridCols {
				for j, l := range p.split(c.title, c.w-1) {
					p.cellAt(x, gy+float64(j)*dlh, c.w-1, dlh, l, c.align)
				}
				x += c.w
			}
			gy += lay.ghead
			p.draw(colRule)
			f.SetLineWidth(0.1)
			f.Line(gx, gy-0.3, gx+tableW(r.gridCols), gy-0.3)
			p.font("", detailSize)
			for k, g := range r.grid {
				x := gx
				for i, ls := range lay.glines[k] {
					c := r.gridCols[i]
					p.text(colInk)
					if i == len(r.gridCols)-1 && g.col != (rgb{}) {
						p.text(g.col)
					}
					for j, l := range ls {
						p.cellAt(x, gy+float64(j)*dlh, c.w-1, dlh, l, c.align)
					}
					x += c.w
				}
				n := 1
				for _, ls := range lay.glines[k] {
					n = max(n, len(ls))
				}
				p.text(colMuted)
				for j, l := range lay.gnote[k] {
					p.cellAt(gx+6, gy+float64(n+j)*dlh, tableW(r.gridCols)-6, dlh, l, "L")
				}
				gy += lay.gh[k]
			}
			p.text(colInk)
		}
		if ri == len(rows)-1 || !rows[ri+1].cont { // rules between groups only
			p.draw(colRule)
			f.SetLineWidth(0.1)
			f.Line(marginL, y+lay.h, marginL+tw, y+lay.h)
		}
		f.SetY(y + lay.h)
	}
	f.Ln(2)
}

// cellFace is the face and size cellFont sets for c.
func cellFace(c tcell, size float64) (int, float64) {
	switch {
	case c.mono:
		return faceMono, size - 0.8
	case c.bold:
		return faceBold, size
	}
	return faceRegular, size
}

func (p *pdfw) cellFont(c tcell, size float64) {
	switch {
	case c.mono:
		p.mono(size - 0.8)
	case c.bold:
		p.font("B", size)
	default:
		p.font("", size)
	}
	if c.muted {
		p.text(colMuted)
	} else {
		p.text(colInk)
	}
}

func tableW(cols []tcol) float64 {
	var w float64
	for _, c := range cols {
		w += c.w
	}
	return w
}

// widths scales relative column widths to the body width.
func widths(titles []string, rel []float64, align string) []tcol {
	var sum float64
	for _, r := range rel {
		sum += r
	}
	cols := make([]tcol, len(titles))
	for i, t := range titles {
		a := "L"
		if i < len(align) && align[i] == 'R' {
			a = "R"
		}
		cols[i] = tcol{title: t, w: bodyW * rel[i] / sum, align: a}
	}
	return cols
}

// partTable is the per-section table: one row per part with its worst
// stresses, and under it every quantity with the case that produced it,
// its rating and basis, use of the derated limit and verdict.
func (p *pdfw) partTable(s *stress.Section) {
	shownQ := []ratings.Quantity{ratings.Irms, ratings.Pdiss, ratings.Bpk, ratings.Temp}
	gaps := hasGaps(s)
	titles := []string{"part", "value", "gap", "peak V", "RMS I (avg)", "dissipation (avg)", "flux", "temp. (avg)", "use", "verdict"}
	rel, align := []float64{12, 14, 14, 14, 13, 15, 13, 11, 11, 17}, "LLLRRRRRRL"
	if !gaps {
		titles = append(titles[:2:2], titles[3:]...)
		rel, align = []float64{13, 15, 15, 14, 15, 14, 12, 12, 17}, "LLRRRRRRL"
	}
	cols := widths(titles, rel, align)
	var rows []trow
	for _, pr := range s.Parts {
		r := trow{cells: []tcell{{s: pr.Name, bold: true}, tc(ValueText(pr.Kind, pr.Value))}}
		if gaps {
			r.cells = append(r.cells, tc(GapText(pr)))
		}
		r.cells = append(r.cells, tc(peakText(pr)))
		for _, q := range shownQ {
			if st, ok := pr.Stress[q]; ok {
				r.cells = append(r.cells, tc(FormatQ(q, st.Value)))
			} else {
				r.cells = append(r.cells, tcell{s: "", muted: true})
			}
		}
		r.cells = append(r.cells, tc(pct(pr.Util)), tv(pr.Verdict))
		r.gridCols = detailCols
		for _, q := range stress.Quantities {
			if st, ok := pr.Stress[q]; ok {
				r.grid = append(r.grid, stressRow(s, st))
			}
		}
		rows = append(rows, r)
	}
	p.table(cols, rows, 8)
}

// detailCols are the columns of a part's small table of stresses.
var detailCols = []tcol{
	{"quantity", 20, "L"}, {"worst", 17, "R"}, {"at (the worst case)", 40, "L"}, {"rating, from", 52, "L"},
	{"derated", 15, "R"}, {"use", 11, "R"}, {"verdict", 16, "L"},
}

// stressRow is one quantity of one part as a row of the part's small
// table; what to buy, and a use reached at another case, go in its note.
func stressRow(s *stress.Section, st *stress.Stress) gridRow {
	q := st.Quantity
	lim := st.Limit
	g := gridRow{cells: []string{QuantityLabel(q), FormatQ(q, st.Value), caseText(s, st.Case)}}
	switch {
	case lim.Quantity == "":
		g.cells = append(g.cells, "not judged", "", "", "")
		return g
	case lim.Abs <= 0:
		g.cells = append(g.cells, lim.Basis, "", "", st.Verdict.String())
	default:
		g.cells = append(g.cells, FormatQ(q, lim.Abs)+", "+lim.Basis, FormatQ(q, lim.Derated), pct(st.Util), st.Verdict.String())
		if st.UtilCase != st.Case {
			if c := caseText(s, st.UtilCase); c != "" {
				g.note = "highest use at " + c
			}
		}
	}
	g.col = verdictColor(st.Verdict)
	if st.Verdict != ratings.OK {
		buy := UpgradeText(stress.Upgrade{Stress: st})
		if g.note != "" {
			g.note += "; "
		}
		g.note += "to change: " + buy
	}
	return g
}

// findings lists the section's and its parts' findings.
func (p *pdfw) findings(s *stress.Section) {
	type item struct{ who, sev, text string }
	var all []item
	for _, f := range s.Findings {
		who := f.Part
		if who == "" {
			who = "netlist"
		}
		all = append(all, item{who, f.Severity, f.Text})
	}
	for _, pr := range s.Parts {
		for _, f := range pr.Findings {
			all = append(all, item{pr.Name, f.Severity, f.Text})
		}
	}
	if len(all) == 0 {
		return
	}
	p.sub("Findings", 8)
	for _, it := range all {
		p.bullet(8, it.who+" — "+it.sev+": "+it.text)
	}
}

// tolerance draws the Monte Carlo spread of a section.
func (p *pdfw) tolerance(s *stress.Section) {
	t := s.Tolerance
	if t == nil {
		return
	}
	intro := fmt.Sprintf("%d trials drawn from a %s distribution of part values and Q (seed %d). "+
		"Safe power met by 99 %% of trials (1st percentile): %s; median trial: %s.",
		t.Trials, t.Dist, t.Seed, FormatPower(t.SafeP01), FormatPower(t.SafeMed))
	p.sub("Part tolerances (Monte Carlo)", p.paraHeight(8.5, intro)+20)
	p.para(8.5, intro)
	p.f.Ln(1.5)
	cols := widths([]string{"part", "quantity", "median", "99th percentile", "maximum", "trials over derated limit", "trials over rating"},
		[]float64{12, 20, 15, 15, 15, 17, 15}, "LLRRRRR")
	var rows []trow
	for _, tp := range t.Parts {
		for i, tq := range tp.Q {
			name := tcell{s: tp.Name, bold: true}
			if i > 0 {
				name = tcell{}
			}
			over, overR := "—", "—"
			if tq.Rated {
				over, overR = share(tq.OverDerated), share(tq.OverRating)
			}
			rows = append(rows, trow{cont: i > 0, cells: []tcell{name, tc(QuantityLabel(tq.Quantity)),
				tc(FormatQ(tq.Quantity, tq.Median)), tc(FormatQ(tq.Quantity, tq.P99)), tc(FormatQ(tq.Quantity, tq.Max)),
				tc(over), tc(overR)}})
		}
	}
	p.table(cols, rows, 7.5)
}

// share renders a fraction of trials as a percentage, keeping small
// non-zero shares visible.
func share(x float64) string {
	switch {
	case !finite(x) || x < 0:
		return "—"
	case x == 0:
		return "0 %"
	case x < 0.001:
		return "< 0.1 %"
	case x < 0.1:
		return strconv.FormatFloat(100*x, 'f', 1, 64) + " %"
	}
	return strconv.FormatFloat(100*x, 'f', 0, 64) + " %"
}

// sectionPages is a netlist's response plot, part table, findings and
// tolerance spread.
func (p *pdfw) sectionPages(s *stress.Section, fp *FilterPlot) {
	title := joinNonEmpty(" — ", heading(s.File, s.Title), sectionLabel(s))
	p.newPage(title)
	p.text(colMuted)
	for _, l := range SectionConditions(s) {
		p.para(8.5, l)
	}
	nodeLine := fmt.Sprintf("%s audited; highest node voltage %s peak at node %s (%s)",
		casesText(s.NumCases), circuits.FormatSI(s.MaxNodeVpk, "V"), s.MaxNodeAt, caseText(s, s.MaxNodeCase))
	if s.MaxNodeVdc > 0 {
		nodeLine += fmt.Sprintf(", %s of it DC; highest DC %s at node %s",
			circuits.FormatSI(s.MaxNodeVdc, "V"), circuits.FormatSI(s.MaxDCV, "V"), s.MaxDCAt)
		if s.MaxDCV >= LethalDC {
			nodeLine += " (lethal: see the caution)"
		}
	}
	p.para(8.5, nodeLine)
	if t := TxText(s); t != "" {
		t = strings.ToUpper(t[:1]) + t[1:] + "."
		if s.Tx.Verdict == ratings.Fail {
			p.text(colInk)
			p.para(8.5, t)
			p.text(colMuted)
		} else {
			p.para(8.5, t)
		}
	}
	p.text(colInk)
	p.schematic(s)
	if fp != nil && len(fp.Sweep) > 1 {
		p.sub("Frequency response (matched)", plotTopSp+plotH+30)
		p.responsePlot(fp)
	}
	p.stressPlots(s, fp)
	intro := "Worst value of each quantity over every case; under each part, every quantity with the case that produced it, " +
		"its rating and where the rating comes from, the derated limit, the share of the derated limit used and the verdict."
	p.sub("Parts", p.paraHeight(8, intro)+24)
	p.para(8, intro)
	p.f.Ln(1)
	p.partTable(s)
	p.coreTable(s)
	safe := "Safe power for this netlist: " + FormatPower(s.SafeW)
	if !math.IsInf(s.SafeW, 1) {
		safe += ", set by the " + QuantityLabel(s.LimitQ) + " of " + s.LimitPart
	}
	p.font("B", 9)
	p.room(5)
	p.f.SetX(marginL)
	p.multi(bodyW, 4.4, safe)
	p.clearances(s)
	p.findings(s)
	p.partFaults(s)
	p.tolerance(s)
}

// coreTable shows each cored part's three core limits apart: saturation
// and temperature are ratings, the heating guide is advice, and the last
// column names the rating that binds.
func (p *pdfw) coreTable(s *stress.Section) {
	var rows []trow
	for _, pr := range s.Parts {
		if !pr.Has(ratings.Bpk) && !pr.Has(ratings.Temp) {
			continue
		}
		r := trow{cells: []tcell{{s: pr.Name, bold: true}}}
		for _, q := range []ratings.Quantity{ratings.Bpk, ratings.Bavg, ratings.Temp} {
			st, ok := pr.Stress[q]
			if !ok || st.Limit.Quantity == "" {
				r.cells = append(r.cells, tcell{s: "—", muted: true}, tcell{s: "", muted: true})
				continue
			}
			v := FormatQ(q, st.Value)
			if st.Limit.Abs > 0 {
				v += " / " + FormatQ(q, st.Limit.Derated)
			}
			use := pct(st.Util)
			if st.Limit.Advice && st.Verdict != ratings.OK {
				use += " advice"
			}
			r.cells = append(r.cells, tc(v), tc(use))
		}
		r.cells = append(r.cells, tc(HeatTimeText(pr.Heat)), tc(CoreBinding(pr)))
		rows = append(rows, r)
	}
	if len(rows) == 0 {
		return
	}
	intro := "Core limits, each judged apart. Saturation: peak flux at PEP against the material's saturation flux density (a rating). " +
		"Heating guide: flux at average power against the guide (advice: at most marginal, never a failure). " +
		"Temperature: ambient plus the rise from the average dissipation, judged as rise over allowed rise (a rating); τ is the thermal time constant."
	p.sub("Core limits", p.paraHeight(8, intro)+20)
	p.para(8, intro)
	p.f.Ln(1)
	titles := []string{"part", "saturation (PEP)", "use", "heating guide (avg.)", "use", "temperature", "use", "τ, judged", "binds"}
	p.table(widths(titles, []float64{9, 20, 8, 20, 13, 18, 8, 17, 26}, "LRRRRRRLL"), rows, 7.5)
}

// partFaults lists the single-part fault analysis: per part its worst
// stress under the others' faults and the fault that caused it, and the
// faults that take a part beyond its derated limit.
func (p *pdfw) partFaults(s *stress.Section) {
	pf := s.PartFaults
	if pf == nil {
		return
	}
	intro := fmt.Sprintf("%d single-part faults: each part shorted and opened in turn, every other part judged under the same conditions "+
		"(the failed part is not judged). These consequences are reported; they are not part of the verdict.", len(pf.Runs))
	p.sub("Single-part faults", p.paraHeight(8, intro)+24)
	p.para(8, intro)
	for _, pw := range pf.Parts {
		var parts []string
		for _, x := range pw.Worst {
			if x.Quantity == ratings.Vpk || x.Quantity == ratings.Irms || x.Quantity == ratings.Pdiss {
				parts = append(parts, fmt.Sprintf("%s %s (%s)", QuantityLabel(x.Quantity), FormatQ(x.Quantity, x.Value), x.Fault))
			}
		}
		p.para(8, fmt.Sprintf("%s — worst %s; %s", pw.Name, pw.Verdict, strings.Join(parts, "; ")))
	}
	for _, r := range pf.Runs {
		if r.ShortedSupply != "" {
			p.para(8, ShortedSupplyText(r))
		}
	}
	if len(pf.Consequences) == 0 {
		p.para(8.5, "No single-part fault takes another part beyond its derated limit.")
		return
	}
	p.font("B", 9)
	p.room(5)
	p.f.SetX(marginL)
	p.multi(bodyW, 4.4, "Faults that take a part beyond its derated limit:")
	for _, c := range pf.Consequences {
		p.para(8.5, ConsequenceText(c))
	}
}

// clearances is the table of a section's declared gaps: the worst peak
// voltage across each, the voltage at which it would arc in air, the
// derated limit, its use, the gap that limit needs, and the verdict.
func (p *pdfw) clearances(s *stress.Section) {
	if !hasGaps(s) {
		return
	}
	intro := fmt.Sprintf("Each declared gap against the worst peak voltage between its nodes, in air at %s m above sea level "+
		"(%s kPa, ISO 2533) and %s °C: the voltage at which it would arc in air, the derated limit it is judged against "+
		"(for a board surface, the working-voltage guide), and the gap that limit needs.",
		num(s.Air.Altitude, 0), num(s.AirPressure/1e3, 1), num(s.Air.Ambient, 0))
	p.sub("Clearances", p.paraHeight(8, intro)+16)
	p.para(8, intro)
	p.f.Ln(1)
	cols := widths([]string{"part", "gap", "peak V", "would arc at", "derated limit", "use", "gap needed", "verdict"},
		[]float64{12, 16, 13, 14, 14, 10, 13, 15}, "LLRRRRRL")
	var rows []trow
	for _, pr := range s.Parts {
		c := pr.Clearance
		st := pr.Stress[ratings.Arc]
		if c == nil || st == nil {
			continue
		}
		rows = append(rows, trow{cells: []tcell{{s: pr.Name, bold: true}, tc(GapText(pr)), tc(circuits.FormatSI(c.Vpk, "V")),
			tc(circuits.FormatSI(c.ArcV, "V")), tc(circuits.FormatSI(c.Derated, "V")), tc(pct(st.Util)), tc(mmText(c.Needed)), tv(st.Verdict)}})
	}
	p.table(cols, rows, 8)
}
