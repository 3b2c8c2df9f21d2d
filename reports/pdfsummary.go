package reports

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"rfstress/circuits"
	"rfstress/stress"
)

// summary is page 1: what was audited, the verdict, the safe power, the
// caution and what to change.
func (p *pdfw) summary() {
	f := p.f
	b := p.doc.Bank
	f.AddPage()
	p.font("B", 22)
	p.text(colAccent)
	f.SetX(marginL)
	p.cell(bodyW, 10, "RF stress report", 1, "L")
	p.font("", 9)
	p.text(colMuted)
	what := "one netlist"
	if n := len(b.Sections); n != 1 {
		what = fmt.Sprintf("%d netlists judged as one bank", n)
	}
	f.SetX(marginL)
	p.cell(bodyW, 5, fmt.Sprintf("Part stress audit of %s · %s · %s", what, p.printedDate(), p.doc.Tool), 1, "L")
	f.Ln(3)
	p.verdictBox()
	f.Ln(3)
	p.caution()
	f.Ln(2)
	p.audited()
	p.conditions()
	p.upgrades()
}

// verdictBox shows the overall verdict and the maximum safe power.
func (p *pdfw) verdictBox() {
	f := p.f
	b := p.doc.Bank
	safe := "Maximum safe power: " + FormatPower(b.SafeW)
	if math.IsInf(b.SafeW, 1) {
		safe += " — no rated limit binds; add ratings to the netlist to find one"
	} else {
		safe += ", set by the " + QuantityLabel(b.LimitQ) + " of " + b.LimitPart + " in " + b.LimitFile
	}
	if pw := auditedPower(b); pw != "" {
		safe += " (audited at " + pw + ")"
	}
	// what the transmitter sees: the worst SWR over the bank
	var tx *stress.Section
	for _, s := range b.Sections {
		if s.Tx.Worst.Case >= 0 && (tx == nil || s.Tx.Verdict > tx.Tx.Verdict || s.Tx.Verdict == tx.Tx.Verdict && s.Tx.Worst.SWR > tx.Tx.Worst.SWR) {
			tx = s
		}
	}
	if tx != nil {
		safe += ". Transmitter: worst SWR " + FormatSWR(tx.Tx.Worst.SWR) + " at " + caseText(tx, tx.Tx.Worst.Case) + " in " + tx.File
		if tx.Tx.Limit > 0 {
			safe += " (tx-swr-max " + strconv.FormatFloat(tx.Tx.Limit, 'g', -1, 64) + ": " + tx.Tx.Verdict.String() + ")"
		}
	}
	p.font("", 9.5)
	safeLines := p.split(safe, bodyW-12)
	p.font("B", 12.5)
	words := BankVerdictWords(b)
	wordLines := p.split(words, bodyW-12)
	h := 6 + float64(len(wordLines))*5.6 + float64(len(safeLines))*4.4 + 3
	y := f.GetY()
	p.fill(colFaint)
	f.Rect(marginL, y, bodyW, h, "F")
	p.fill(verdictColor(b.Verdict))
	f.Rect(marginL, y, 3.5, h, "F")
	p.font("B", 7.5)
	p.text(colMuted)
	p.cellAt(marginL+8, y+2, 60, 3.5, "OVERALL VERDICT", "L")
	p.font("B", 12.5)
	p.text(colInk)
	f.SetXY(marginL+8, y+6)
	p.multi(bodyW-12, 5.6, words)
	p.font("", 9.5)
	f.SetX(marginL + 8)
	p.multi(bodyW-12, 4.4, safe)
	f.SetY(y + h)
}

// auditedPower is the PEP the sections were audited at, when they agree.
func auditedPower(b *stress.Bank) string {
	var w string
	for i, s := range b.Sections {
		x := circuits.FormatSI(s.Conditions.PowerW, "W") + " PEP"
		if i > 0 && x != w {
			return ""
		}
		w = x
	}
	return w
}

// caution is the safety box; it states the hottest node when one reaches
// the caution voltage.
func (p *pdfw) caution() {
	f := p.f
	body := "RF voltages at resonant tanks, trimmers and tuner capacitors can reach kilovolts, even at 100 W. " +
		"They cause deep, painful RF burns and can arc over, char a board or start a fire. " +
		"Never touch or adjust anything in the RF path while transmitting. Key up first at low power into a dummy load, " +
		"and raise power in steps. The figures in this report are engineering estimates from a circuit model, " +
		"not a guarantee of safety. Follow local codes and licensed practice. See SAFETY.md."
	title := "CAUTION — high RF voltage"
	if dc := DCCaution(p.doc.Bank); dc != "" {
		body = dc + " " + body
		title = "CAUTION — high RF voltage and DC"
	}
	// the box must stay on page 1: name a few hot files, count the rest
	const maxHot = 4
	var hot []string
	more := 0
	for _, s := range p.doc.Bank.Sections {
		if s.MaxNodeVpk < p.doc.CautionV || !(s.MaxNodeVpk > 0) {
			continue
		}
		if len(hot) == maxHot {
			more++
			continue
		}
		h := fmt.Sprintf("%s peak at node %s of %s", circuits.FormatSI(s.MaxNodeVpk, "V"), s.MaxNodeAt, Headline(s.File))
		if s.MaxNodeVdc > 0 {
			h += fmt.Sprintf(", %s of it DC", circuits.FormatSI(s.MaxNodeVdc, "V"))
		}
		if c := caseText(s, s.MaxNodeCase); c != "" {
			h += " (" + c + ")"
		}
		hot = append(hot, h)
	}
	hotText := ""
	if len(hot) > 0 {
		hotText = "In this audit: " + strings.Join(hot, "; ")
		if more > 0 {
			hotText += fmt.Sprintf("; and %d more files (see their sections)", more)
		}
		if p.doc.CautionV > 0 {
			hotText += " — at or above the caution level of " + circuits.FormatSI(p.doc.CautionV, "V") + " peak"
		}
		hotText += "."
	}
	const inset = 20.0
	tw := bodyW - inset - 4
	p.font("", 9)
	lines := len(p.split(body, tw))
	p.font("B", 9)
	hotLines := 0
	if hotText != "" {
		hotLines = len(p.split(hotText, tw))
	}
	h := 4 + 5.5 + float64(lines)*4.1 + 3
	if hotLines > 0 {
		h += float64(hotLines)*4.1 + 1.5
	}
	y := f.GetY()
	p.fill(colCaution)
	p.draw(colCautionB)
	f.SetLineWidth(0.8)
	f.Rect(marginL, y, bodyW, h, "DF")
	p.warningMark(marginL+4, y+4, 12)
	p.font("B", 11)
	p.text(colCautionB)
	p.cellAt(marginL+inset, y+3, tw, 5.5, title, "L")
	f.SetY(y + 8.5)
	p.text(colInk)
	if hotText != "" {
		p.font("B", 9)
		f.SetX(marginL + inset)
		p.multi(tw, 4.1, hotText)
		f.Ln(1.5)
	}
	p.font("", 9)
	f.SetX(marginL + inset)
	p.multi(tw, 4.1, body)
	f.SetLineWidth(0.2)
	f.SetY(y + h)
}

// warningMark is our caution sign: a lightning stroke in a disc.
func (p *pdfw) warningMark(x, y, d float64) {
	f := p.f
	p.fill(colCautionB)
	f.Circle(x+d/2, y+d/2, d/2, "F")
	p.fill(colCaution)
	u := d / 12
	f.Polygon([]gofpdfPoint{
		pt(x+7*u, y+1.8*u), pt(x+3.6*u, y+6.6*u), pt(x+5.9*u, y+6.6*u),
		pt(x+4.6*u, y+10.2*u), pt(x+8.4*u, y+5.2*u), pt(x+6.1*u, y+5.2*u),
	}, "F")
}

// fileColumn is a width, in the body's relative units, that holds the
// longest file name unbroken (within reason).
func (p *pdfw) fileColumn(total float64) float64 {
	p.font("B", 8.5)
	w := 18.0
	for _, s := range p.doc.Bank.Sections {
		w = math.Max(w, p.width(Headline(s.File))+2*cellPad+1)
	}
	w = math.Min(w, bodyW*0.32)
	return total * w / (bodyW - w)
}

// audited lists each file with its title, digest, verdict and safe power.
func (p *pdfw) audited() {
	p.sub("What was audited", 24)
	rel := []float64{44, 13, 17, 24}
	rel = append([]float64{p.fileColumn(98)}, rel...)
	cols := widths([]string{"file", "title", "verdict", "safe power", "limited by"}, rel, "LLLRL")
	var rows []trow
	for _, s := range p.doc.Bank.Sections {
		lim := "—"
		if !math.IsInf(s.SafeW, 1) {
			lim = s.LimitPart + " " + QuantityLabel(s.LimitQ)
		}
		title := joinNonEmpty(" — ", Headline(s.Title), circuits.Escape(sectionLabel(s)))
		if s.NoPass {
			title += " — CHECK: does not pass its own band (transmitter SWR " + FormatSWR(s.Tx.InBandBest.SWR) + ", antenna matched)"
		}
		rows = append(rows, trow{
			cells:      []tcell{{s: Headline(s.File), bold: true}, tc(title), tv(s.Verdict), tc(FormatPower(s.SafeW)), tc(lim)},
			detail:     []string{"SHA-256 " + s.SHA256},
			detailMono: true,
		})
	}
	p.table(cols, rows, 8.5)
}

// conditions prints what every file shares once, then what differs, then
// what the presets used mean.
func (p *pdfw) conditions() {
	secs := p.doc.Bank.Sections
	if len(secs) == 0 {
		return
	}
	per := make([][]string, len(secs))
	for i, s := range secs {
		per[i] = SectionConditions(s)
	}
	var common []string
	for _, l := range per[0] {
		inAll := true
		for _, other := range per[1:] {
			if !contains(other, l) {
				inAll = false
				break
			}
		}
		if inAll {
			common = append(common, l)
		}
	}
	if len(secs) == 1 {
		p.sub("Conditions", 10)
		for _, l := range common {
			p.bullet(8.5, l)
		}
		p.bullet(8.5, casesText(secs[0].NumCases)+" (carrier × antenna-port load)")
	} else {
		if len(common) > 0 {
			p.sub("Conditions shared by every file", 10)
			for _, l := range common {
				p.bullet(8.5, l)
			}
			p.f.Ln(1)
		}
		var rows []trow
		for i, s := range secs {
			var own []string
			for _, l := range per[i] {
				if !contains(common, l) {
					own = append(own, l)
				}
			}
			own = append(own, casesText(s.NumCases)+" (carrier × antenna-port load)")
			if l := sectionLabel(s); l != "" { // a bank's positions share one file name
				own = append([]string{circuits.Escape(l)}, own...)
			}
			rows = append(rows, trow{cells: []tcell{{s: Headline(s.File), bold: true}, tc(strings.Join(own, "\n"))}})
		}
		p.sub("Conditions of each file", 24)
		p.table(widths([]string{"file", "conditions"}, []float64{p.fileColumn(80), 80}, "LL"), rows, 8)
	}
	var notes []string
	for _, s := range secs {
		c := s.Conditions
		notes = appendNew(notes, "mode "+c.Mode+": "+stress.ModeNote(c.Mode))
		if c.HarmonicMax > 1 && c.Harmonics != "none" {
			notes = appendNew(notes, "harmonics "+c.Harmonics+": "+stress.HarmonicNote(c.Harmonics))
		}
		prof := c.Derate
		if s.Profile != nil {
			prof = s.Profile.Name
		}
		notes = appendNew(notes, "derating "+prof+": its factors are on the method page")
	}
	p.sub("What the presets mean", 10)
	for _, n := range notes {
		p.bullet(8.5, n)
	}
}

func appendNew(list []string, s string) []string {
	if contains(list, s) {
		return list
	}
	return append(list, s)
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

// upgrades lists every part and quantity that is not ok and what to buy.
func (p *pdfw) upgrades() {
	multi := len(p.doc.Bank.Sections) > 1
	var rows []trow
	for _, s := range p.doc.Bank.Sections {
		for i, u := range s.Upgrades() {
			st := u.Stress
			var cells []tcell
			if multi {
				file := tcell{}
				if i == 0 { // a file's rows form one group under its name
					file = tc(sectionHead(s))
				}
				cells = append(cells, file)
			}
			cells = append(cells, tcell{s: u.Part, bold: true}, tc(QuantityLabel(st.Quantity)),
				tc(FormatQ(st.Quantity, st.Value)), tv(st.Verdict), tc(UpgradeText(u)))
			rows = append(rows, trow{cells: cells, cont: multi && i > 0})
		}
	}
	intro := "Each part and quantity that is not ok, worst first within each file, with the rating to buy so that the stress stays within the derating profile."
	if len(rows) == 0 {
		p.sub("Parts to change", 6)
		p.para(9, "None: every rated part stays within its derated limits under the audited conditions.")
		return
	}
	p.sub("Parts to change", p.paraHeight(8.5, intro)+22)
	p.para(8.5, intro)
	p.f.Ln(1)
	titles := []string{"part", "quantity", "worst stress", "verdict", "rating to buy or change to make"}
	rel := []float64{9, 16, 15, 14, 46}
	align := "LLRLL"
	if multi {
		titles = append([]string{"file"}, titles...)
		rel = append([]float64{p.fileColumn(100)}, rel...)
		align = "L" + align
	}
	p.table(widths(titles, rel, align), rows, 8)
}
