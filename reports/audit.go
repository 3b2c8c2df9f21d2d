package reports

import (
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"rfstress/circuits"
	"rfstress/ratings"
	"rfstress/stress"
)

// unitOf is the display unit of each quantity.
func unitOf(q ratings.Quantity) string {
	switch q {
	case ratings.Vpk, ratings.Vrms:
		return "V"
	case ratings.Irms:
		return "A"
	case ratings.Pdiss:
		return "W"
	case ratings.Bpk, ratings.Bavg:
		return "T"
	case ratings.Temp:
		return "°C"
	case ratings.Jrms:
		return "A/mm²"
	case ratings.Pm:
		return "W/m"
	case ratings.Arc:
		return "V"
	}
	return ""
}

// QuantityLabel names a quantity for people.
func QuantityLabel(q ratings.Quantity) string {
	switch q {
	case ratings.Vpk:
		return "peak voltage"
	case ratings.Vrms:
		return "RMS voltage"
	case ratings.Irms:
		return "RMS current"
	case ratings.Pdiss:
		return "dissipation"
	case ratings.Bpk:
		return "peak flux (saturation)"
	case ratings.Bavg:
		return "flux at average power (heating guide)"
	case ratings.Temp:
		return "temperature"
	case ratings.Jrms:
		return "current density"
	case ratings.Pm:
		return "hottest metre"
	case ratings.Arc:
		return "clearance voltage"
	}
	return string(q)
}

// FormatQ renders a stress value in its unit.
func FormatQ(q ratings.Quantity, v float64) string {
	switch q {
	case ratings.Temp:
		return num(v, 0) + " °C"
	case ratings.Bpk, ratings.Bavg:
		return circuits.FormatSI(v, "T")
	case ratings.Jrms:
		return num(v/1e6, 1) + " A/mm²"
	}
	return circuits.FormatSI(v, unitOf(q))
}

// FormatPower renders a safe power; +Inf means no rated limit binds.
func FormatPower(w float64) string {
	if math.IsInf(w, 1) {
		return "not limited by any rating"
	}
	return circuits.FormatSI(w, "W") + " PEP"
}

func pct(u float64) string {
	if u <= 0 || math.IsNaN(u) || math.IsInf(u, 0) {
		return "—"
	}
	return strconv.FormatFloat(100*u, 'f', 0, 64) + " %"
}

// ValueText renders a part's value with its unit ("" for kinds that have
// no value, such as connectors and clearances).
func ValueText(k circuits.Kind, v float64) string {
	switch k {
	case circuits.Capacitor:
		return circuits.FormatSI(v, "F")
	case circuits.Inductor:
		return circuits.FormatSI(v, "H")
	case circuits.Line:
		return circuits.FormatSI(v, "m") // a line's value is its length
	case circuits.Resistor:
		return circuits.FormatSI(v, "Ω")
	case circuits.Supply:
		return circuits.FormatSI(v, "V") + " DC"
	case circuits.Draw:
		return circuits.FormatSI(v, "A") + " DC"
	case circuits.Switch:
		return "contact"
	}
	if v == 0 {
		return ""
	}
	return circuits.FormatSI(v, "")
}

// hasGaps says whether any part of the section declares a clearance.
func hasGaps(s *stress.Section) bool {
	for _, p := range s.Parts {
		if p.Clearance != nil {
			return true
		}
	}
	return false
}

// GapText renders a part's declared clearance: "2 mm air" ("" if none).
func GapText(p *stress.PartResult) string {
	c := p.Clearance
	if c == nil {
		return ""
	}
	return strconv.FormatFloat(c.Gap*1e3, 'g', 3, 64) + " mm " + c.Medium
}

// peakText is the part's worst peak voltage: across it, or for a
// clearance across the gap.
func peakText(p *stress.PartResult) string {
	for _, q := range []ratings.Quantity{ratings.Vpk, ratings.Arc} {
		if st, ok := p.Stress[q]; ok {
			return FormatQ(q, st.Value)
		}
	}
	return ""
}

// SectionConditions is ConditionsText for a section, naming a measured
// antenna where the section has one.
func SectionConditions(s *stress.Section) []string {
	lines := ConditionsText(s.Conditions)
	if s.AntennaMeasured == "" {
		return lines
	}
	for i, l := range lines {
		if rest, ok := strings.CutPrefix(l, "antenna port matched"); ok {
			lines[i] = "antenna port: the measured antenna (" + circuits.Escape(s.AntennaMeasured) + ") at each carrier" + rest
		}
	}
	return lines
}

// ConditionsText summarises the conditions of a section in lines.
func ConditionsText(c stress.Conditions) []string {
	si := circuits.FormatSI
	var lines []string
	mode := c.Mode
	if mode == "custom" {
		mode = "set directly"
	}
	lines = append(lines, fmt.Sprintf("power %s PEP, mode %s (average %s of PEP), drive %s",
		strings.TrimSuffix(si(c.PowerW, "W"), ""), mode, pct(c.AvgRatio), c.Drive))
	band := circuits.FormatHz(c.BandLo)
	if c.BandHi > c.BandLo {
		band = fmt.Sprintf("%s to %s, %d carriers", circuits.FormatHz(c.BandLo), circuits.FormatHz(c.BandHi), c.Points)
	}
	if len(c.CarrierAlso) > 0 {
		var also []string
		for _, f := range c.CarrierAlso {
			also = append(also, circuits.FormatHz(f))
		}
		band += "; also " + strings.Join(also, ", ") + " (outside the band)"
	}
	lines = append(lines, "carriers "+band)
	loads := "matched"
	if c.SWR > 1 {
		loads += fmt.Sprintf(", SWR %s:1 circle at %d phases", num(c.SWR, 2), c.Phases)
	}
	for _, z := range c.Loads {
		loads += ", " + circuits.FormatComplex(z)
	}
	if len(c.Faults) > 0 {
		loads += ", faults " + strings.Join(c.Faults, " and ")
	}
	lines = append(lines, "antenna port "+loads)
	h := "none"
	if c.HarmonicMax > 1 && c.Harmonics != "none" {
		var lv []string
		for i, d := range c.HarmonicDBc {
			if i+2 > c.HarmonicMax {
				break
			}
			if math.IsInf(d, -1) {
				continue
			}
			lv = append(lv, fmt.Sprintf("%d:%s", i+2, num(d, 1)))
		}
		h = c.Harmonics + " (dBc " + strings.Join(lv, " ") + ")"
	}
	lines = append(lines, "harmonics "+h)
	lines = append(lines, fmt.Sprintf("derating %s, ambient %s °C, altitude %s m", c.Derate, num(c.Ambient, 0), num(c.Altitude, 0)))
	heat := "core temperature at steady state"
	if t := c.HeatTime(); !math.IsInf(t, 1) {
		heat = "core temperature after " + DurationText(t) + " at average power"
	}
	if c.Duty.Period > 0 {
		heat += fmt.Sprintf(", keyed %s on in every %s", DurationText(c.Duty.On), DurationText(c.Duty.Period))
	}
	lines = append(lines, heat)
	return lines
}

// WriteAuditText writes the bank as text tables at full width.
func WriteAuditText(w io.Writer, b *stress.Bank, cautionV float64) error {
	return WriteAuditTextWidth(w, b, cautionV, 0)
}

// WriteAuditTextWidth writes the bank as text tables fitted to width
// columns (0: no limit): long lines wrap with a hanging indent and the
// part table's case column wraps or moves under each row.
func WriteAuditTextWidth(w io.Writer, b *stress.Bank, cautionV float64, width int) error {
	w = &escapeWriter{w: w}
	n := len(b.Sections)
	plural := "netlist"
	if n != 1 {
		plural = "netlists"
	}
	fmt.Fprintf(w, "rfstress audit of %d %s\n", n, plural)
	for _, s := range b.Sections {
		writeSectionText(w, s, width)
	}
	fmt.Fprintln(w)
	wrapLine(w, width, "OVERALL  ", "         ", BankVerdictWords(b))
	if math.IsInf(b.SafeW, 1) {
		wrapLine(w, width, "  ", "    ", "maximum safe power: no rated limit binds (add ratings)")
	} else {
		wrapLine(w, width, "  ", "    ", fmt.Sprintf("maximum safe power %s, set by %s %s in %s", FormatPower(b.SafeW), b.LimitPart, QuantityLabel(b.LimitQ), Headline(b.LimitFile)))
	}
	if len(b.Sections) > 1 {
		// each file's own safe power, so one deliberate fault scenario
		// does not hide the rest of the bank
		fmt.Fprintln(w, "  each file:")
		pw := 0
		for _, s := range b.Sections {
			pw = max(pw, runeLen(FormatPower(s.SafeW)))
		}
		for _, s := range b.Sections {
			p := FormatPower(s.SafeW)
			lead := fmt.Sprintf("    %-8s %s%s  ", s.Verdict, strings.Repeat(" ", pw-runeLen(p)), p)
			line := Headline(s.File)
			if l := sectionLabel(s); l != "" {
				line += " [" + l + "]"
			}
			if !math.IsInf(s.SafeW, 1) {
				line += fmt.Sprintf(" (%s %s)", s.LimitPart, QuantityLabel(s.LimitQ))
			}
			wrapLine(w, width, lead, strings.Repeat(" ", runeLen(lead)+2), line)
		}
	}
	for _, s := range b.Sections {
		if s.Tx.Verdict == ratings.Fail {
			wrapLine(w, width, "  ", "    ", fmt.Sprintf("TRANSMITTER PROTECTION: the amplifier sees SWR %s at %s in %s (tx-swr-max %s)",
				FormatSWR(s.Tx.Worst.SWR), circuits.FormatHz(s.Case(s.Tx.Worst.Case).F), s.File, strconv.FormatFloat(s.Tx.Limit, 'g', -1, 64)))
		}
	}
	var hot []string
	for _, s := range b.Sections {
		if s.MaxNodeVpk >= cautionV {
			hot = append(hot, hotNode(s))
		}
	}
	if len(hot) > 0 {
		what := "RF"
		if DCCaution(b) != "" {
			what = "RF with DC"
		}
		wrapLine(w, width, "  ", "    ", fmt.Sprintf("CAUTION: %s above %s peak at %s — RF burns and arcing; never touch or adjust while transmitting (SAFETY.md)",
			what, circuits.FormatSI(cautionV, "V"), strings.Join(hot, ", ")))
	}
	if dc := DCCaution(b); dc != "" {
		wrapLine(w, width, "  ", "    ", "CAUTION: "+dc)
	}
	return nil
}

// BankVerdictWords is the bank's verdict in a sentence; a failure that
// comes only from transmitter protection says so rather than blaming
// parts.
func BankVerdictWords(b *stress.Bank) string {
	words := bankVerdictWords(b)
	for _, s := range b.Sections {
		if s.NoPass {
			words += "; CHECK " + Headline(s.File) + ": it does not pass its own band (transmitter SWR " + FormatSWR(s.Tx.InBandBest.SWR) + " with the antenna matched), a slip in a value or a node?"
		}
	}
	return words
}

func bankVerdictWords(b *stress.Bank) string {
	if b.AdviceOnly() {
		return "MARGINAL — advice only: a core's flux at average power is above its heating guide; no part exceeds a derated limit or a rating"
	}
	if b.Verdict != ratings.Fail {
		return VerdictWords(b.Verdict)
	}
	tx := false
	for _, s := range b.Sections {
		for _, p := range s.Parts {
			if p.Verdict == ratings.Fail {
				return VerdictWords(b.Verdict)
			}
		}
		tx = tx || s.Tx.Verdict == ratings.Fail
	}
	if tx {
		return "FAIL — transmitter protection: the transmitter sees an SWR above tx-swr-max (no part exceeds its rating)"
	}
	return VerdictWords(b.Verdict)
}

// VerdictWords is the overall verdict in a sentence.
func VerdictWords(v ratings.Verdict) string {
	switch v {
	case ratings.OK:
		return "OK — every part within its derated limits"
	case ratings.Unrated:
		return "INCOMPLETE — some stressed parts have no rating"
	case ratings.Marginal:
		return "MARGINAL — some parts exceed their derated limits but not their ratings"
	}
	return "FAIL — some parts exceed their ratings"
}

var shown = []ratings.Quantity{ratings.Irms, ratings.Pdiss, ratings.Bpk, ratings.Temp}

func writeSectionText(w io.Writer, s *stress.Section, width int) {
	fmt.Fprintln(w)
	wrapLine(w, width, "== ", "   ", joinNonEmpty(" — ", heading(s.File, s.Title), sectionLabel(s)))
	for _, l := range SectionConditions(s) {
		wrapLine(w, width, "   ", "     ", l)
	}
	fmt.Fprintf(w, "   %s\n\n", casesText(s.NumCases))
	// RMS current, dissipation and temperature are taken at average power
	t := newTable("part", "value", "peak V", "RMS I", "dissip.", "flux", "temp.", "use", "verdict", "binding quantity and case")
	t.sub = []string{"", "", "", "avg", "avg", "", "avg"}
	t.leftCols = 2
	t.leftLast = true
	t.maxWidth = width
	for _, p := range s.Parts {
		value := ValueText(p.Kind, p.Value)
		if value == "" {
			value = GapText(p) // a clearance: its gap is its value
		}
		cells := []string{p.Name, value}
		cells = append(cells, peakText(p))
		for _, q := range shown {
			if st, ok := p.Stress[q]; ok {
				cells = append(cells, FormatQ(q, st.Value))
			} else {
				cells = append(cells, "")
			}
		}
		cells = append(cells, pct(p.Util), p.Verdict.String(), bindingText(s, p))
		t.row(cells...)
	}
	t.write(w)
	writeCoresText(w, s, width)
	if up := s.Upgrades(); len(up) > 0 {
		fmt.Fprintln(w, "\n   to change:")
		for _, u := range up {
			wrapLine(w, width, fmt.Sprintf("   %-8s %-8s ", u.Part, u.Stress.Verdict), "        ",
				fmt.Sprintf("%s %s — %s", QuantityLabel(u.Stress.Quantity), FormatQ(u.Stress.Quantity, u.Stress.Value), UpgradeText(u)))
		}
	}
	if fs := AllFindings(s); len(fs) > 0 {
		fmt.Fprintln(w, "\n   findings:")
		for _, f := range fs {
			name := f.Part
			if name == "" {
				name = "netlist"
			}
			wrapLine(w, width, fmt.Sprintf("   %-8s %-8s ", name, f.Severity), "        ", f.Text)
		}
	}
	writeClearanceText(w, s, width)
	writeTolText(w, s)
	safe := "safe power " + FormatPower(s.SafeW)
	if !math.IsInf(s.SafeW, 1) {
		safe += fmt.Sprintf(" (%s %s)", s.LimitPart, QuantityLabel(s.LimitQ))
	}
	safe += fmt.Sprintf("; highest node voltage %s peak at %s (%s)", circuits.FormatSI(s.MaxNodeVpk, "V"), s.MaxNodeAt, s.Case(s.MaxNodeCase).Describe())
	if s.MaxNodeVdc > 0 {
		safe += fmt.Sprintf(", %s of it DC", circuits.FormatSI(s.MaxNodeVdc, "V"))
	}
	if s.MaxDCV > 0 {
		safe += fmt.Sprintf("; highest DC %s at %s", circuits.FormatSI(s.MaxDCV, "V"), s.MaxDCAt)
	}
	fmt.Fprintln(w)
	wrapLine(w, width, "   ", "     ", safe)
	if t := TxText(s); t != "" {
		wrapLine(w, width, "   ", "     ", t)
	}
	writePartFaultsText(w, s, width)
}

// FormatSWR renders an SWR. Beyond 100:1 (|Γ| > 0.98, over 96 % of the
// power reflected) the figure only says "nearly total reflection", and its
// digits hang on the last tenth of an ohm of a model: it shows as "above 100".
func FormatSWR(v float64) string {
	switch {
	case v != v || v < 1:
		return "—"
	case v > 100:
		return "above 100"
	}
	return strconv.FormatFloat(v, 'f', 2, 64)
}

// TxText says what the transmitter sees at worst, and its verdict against
// tx-swr-max.
func TxText(s *stress.Section) string {
	t := s.Tx
	if t.Worst.Case < 0 || s.Engine == nil {
		return ""
	}
	v := t.Worst
	text := fmt.Sprintf("the transmitter sees SWR %s at worst (%s): input impedance %s, %s reflected of %s forward (wattmeter referred to port in %s)",
		FormatSWR(v.SWR), s.Case(v.Case).Describe(), circuits.FormatComplex(v.Zin),
		circuits.FormatSI(v.ReflW, "W"), circuits.FormatSI(v.FwdW, "W"), circuits.FormatComplex(s.Engine.C.Zin))
	if t.Limit > 0 {
		text += fmt.Sprintf("; transmitter protection tx-swr-max %s: %s", strconv.FormatFloat(t.Limit, 'g', -1, 64), t.Verdict)
	} else {
		text += "; not judged (no tx-swr-max)"
	}
	return text
}

// writeClearanceText is the table of declared clearances: gap, worst peak
// voltage across it, the voltage at which it would arc in air, the derated
// limit, its use, the gap that limit needs, and the verdict.
func writeClearanceText(w io.Writer, s *stress.Section, width int) {
	if !hasGaps(s) {
		return
	}
	fmt.Fprintln(w)
	wrapLine(w, width, "   ", "     ", fmt.Sprintf("clearances (air at %s m, %s kPa, %s °C):", num(s.Air.Altitude, 0), num(s.AirPressure/1e3, 1), num(s.Air.Ambient, 0)))
	t := newTable("part", "gap", "peak V", "arcs at", "derated", "use", "gap needed", "verdict")
	t.maxWidth = width
	for _, p := range s.Parts {
		c := p.Clearance
		if c == nil {
			continue
		}
		st := p.Stress[ratings.Arc]
		t.row(p.Name, GapText(p), circuits.FormatSI(c.Vpk, "V"), circuits.FormatSI(c.ArcV, "V"),
			circuits.FormatSI(c.Derated, "V"), pct(st.Util), mmText(c.Needed), st.Verdict.String())
	}
	t.write(w)
}

// mmText renders a gap in millimetres, to 0.01 mm.
func mmText(d float64) string {
	if !finite(d) {
		return "—"
	}
	return strconv.FormatFloat(d*1e3, 'f', 2, 64) + " mm"
}

// writePartFaultsText lists, per part, its worst stress under the other
// parts' faults and which fault caused it, then every fault that takes a
// part beyond its derated limit.
func writePartFaultsText(w io.Writer, s *stress.Section, width int) {
	pf := s.PartFaults
	if pf == nil {
		return
	}
	fmt.Fprintln(w)
	wrapLine(w, width, "   ", "     ", fmt.Sprintf("single-part faults: %d (each part failed in turn, judged under the same conditions; the failed part is not judged; not part of the verdict)", len(pf.Runs)))
	t := newTable("part", "peak V", "caused by", "RMS I", "caused by", "dissip.", "caused by", "worst verdict")
	t.leftCols = 1
	t.maxWidth = width
	for _, p := range pf.Parts {
		cells := []string{p.Name}
		for _, q := range []ratings.Quantity{ratings.Vpk, ratings.Irms, ratings.Pdiss} {
			v, by := "", ""
			for _, x := range p.Worst {
				if x.Quantity == q {
					v, by = FormatQ(q, x.Value), x.Fault.String()
				}
			}
			cells = append(cells, v, by)
		}
		cells = append(cells, p.Verdict.String())
		t.row(cells...)
	}
	t.write(w)
	for _, r := range pf.Runs {
		if r.Err != "" {
			wrapLine(w, width, "   ", "     ", fmt.Sprintf("%s: not solved (%s)", r.Fault, r.Err))
		}
		if r.ShortedSupply != "" {
			wrapLine(w, width, "   ", "     ", ShortedSupplyText(r))
		}
	}
	if len(pf.Consequences) == 0 {
		fmt.Fprintln(w, "\n   no single-part fault takes another part beyond its derated limit")
		return
	}
	fmt.Fprintln(w, "\n   faults that take a part beyond its derated limit:")
	for _, c := range pf.Consequences {
		wrapLine(w, width, "   ", "     ", ConsequenceText(c))
	}
}

// AllFindings lists the section's findings and then each part's, in
// netlist order.
func AllFindings(s *stress.Section) []ratings.Finding {
	out := append([]ratings.Finding(nil), s.Findings...)
	for _, p := range s.Parts {
		out = append(out, p.Findings...)
	}
	return out
}

// bindingText names the rated quantity closest to its limit and the case;
// a guide (advice) is named only when no rating applies.
func bindingText(s *stress.Section, p *stress.PartResult) string {
	var best *stress.Stress
	for _, q := range stress.Quantities {
		st, ok := p.Stress[q]
		if !ok || st.Limit.Quantity == "" || st.Limit.Advice {
			continue
		}
		if best == nil || st.Verdict > best.Verdict || st.Verdict == best.Verdict && st.Util > best.Util {
			best = st
		}
	}
	if best == nil {
		return "no ratings apply"
	}
	c := best.UtilCase
	if best.Limit.Abs <= 0 {
		c = best.Case
	}
	out := QuantityLabel(best.Quantity) + ": " + s.Case(c).Describe()
	if p.AdviceOnly() {
		out += "; marginal only by the heating guide (advice)"
	}
	return out
}

// UpgradeText says what rating to buy.
func UpgradeText(u stress.Upgrade) string {
	st := u.Stress
	if st.BuyText != "" {
		return st.BuyText
	}
	if st.Buy > 0 {
		return "rate for at least " + FormatQ(st.Quantity, st.Buy)
	}
	return "reduce the stress"
}

func writeTolText(w io.Writer, s *stress.Section) {
	t := s.Tolerance
	if t == nil {
		return
	}
	fmt.Fprintf(w, "\n   tolerance: %d trials, %s distribution, seed %d\n", t.Trials, t.Dist, t.Seed)
	tb := newTable("part", "quantity", "median", "99th pct", "max", "> derated", "> rating")
	for _, p := range t.Parts {
		for _, q := range p.Q {
			if !q.Rated || q.Advice {
				continue // the text keeps to rated stresses; JSON and CSV have all
			}
			over, overR := "", ""
			if q.Rated {
				over, overR = pct1(q.OverDerated), pct1(q.OverRating)
			}
			tb.row(p.Name, QuantityLabel(q.Quantity), FormatQ(q.Quantity, q.Median), FormatQ(q.Quantity, q.P99), FormatQ(q.Quantity, q.Max), over, overR)
		}
	}
	tb.write(w)
	fmt.Fprintf(w, "   safe power met by 99 %% of trials %s (median %s)\n", FormatPower(t.SafeP01), FormatPower(t.SafeMed))
}

// pct1 renders a share with one decimal, so a rare excess shows.
func pct1(v float64) string {
	return strconv.FormatFloat(100*v, 'f', 1, 64) + " %"
}

// writeCoresText shows each cored part's three core limits side by side,
// each as its worst value and use: saturation and temperature are
// ratings, the heating guide is advice; the last column names the rating
// that binds. It fits width columns (0: no limit).
func writeCoresText(w io.Writer, s *stress.Section, width int) {
	t := newTable("core", "saturation", "heating guide", "temperature", "τ, judged", "binds")
	t.sub = []string{"", "PEP", "avg., advice", "rise use", "", ""}
	t.leftCols = 1
	t.leftLast = true
	t.maxWidth = width
	for _, p := range s.Parts {
		if !p.Has(ratings.Bpk) && !p.Has(ratings.Temp) {
			continue
		}
		cells := []string{p.Name}
		for _, q := range []ratings.Quantity{ratings.Bpk, ratings.Bavg, ratings.Temp} {
			st, ok := p.Stress[q]
			if !ok || st.Limit.Quantity == "" {
				cells = append(cells, "—")
				continue
			}
			cells = append(cells, FormatQ(q, st.Value)+" "+pct(st.Util))
		}
		cells = append(cells, HeatTimeText(p.Heat), coreBindingWord(p))
		t.row(cells...)
	}
	if len(t.rows) == 0 {
		return
	}
	fmt.Fprintln(w)
	wrapLine(w, width, "   ", "   ", "core limits: saturation and temperature are ratings; the heating guide is advice, never a fail")
	t.write(w)
}

// HeatTimeText is a part's thermal time constant and the time its
// temperature is judged at.
func HeatTimeText(h *stress.Heat) string {
	if h == nil {
		return ""
	}
	tau := "—"
	if h.Tau > 0 {
		tau = DurationText(h.Tau)
	}
	if math.IsInf(h.KeyDown, 1) {
		return tau + ", steady"
	}
	return tau + ", after " + DurationText(h.KeyDown)
}

// DurationText renders seconds as s, min or h.
func DurationText(sec float64) string {
	switch {
	case math.IsInf(sec, 0) || math.IsNaN(sec):
		return "—"
	case sec < 120:
		return num(sec, 0) + " s"
	case sec < 7200:
		return num(sec/60, 1) + " min"
	}
	return num(sec/3600, 1) + " h"
}

// coreBindingWord names the core rating with the highest use.
func coreBindingWord(p *stress.PartResult) string {
	var best ratings.Quantity
	u := -1.0
	for _, q := range []ratings.Quantity{ratings.Bpk, ratings.Temp} {
		if st, ok := p.Stress[q]; ok && st.Limit.Abs > 0 && st.Util > u {
			best, u = q, st.Util
		}
	}
	switch best {
	case ratings.Bpk:
		return "saturation"
	case ratings.Temp:
		return "temperature"
	}
	return "no core rating"
}

// CoreBinding names which of a part's core limits binds: the rating with
// the highest use, with a note when the guide is exceeded.
func CoreBinding(p *stress.PartResult) string {
	out := coreBindingWord(p)
	if st, ok := p.Stress[ratings.Bavg]; ok && st.Verdict != ratings.OK {
		out += " (guide exceeded: advice)"
	}
	return out
}
