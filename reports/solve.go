// Package reports renders results that other layers computed: text tables,
// JSON, CSV, Touchstone and PDF. It computes nothing of its own.
package reports

import (
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strings"

	"rfstress/circuits"
)

// SolvePart is one part's state in a single solve, SI units.
type SolvePart struct {
	Name  string  `json:"name"`
	Kind  string  `json:"kind"`
	Vrms  float64 `json:"vrms"`
	Vpk   float64 `json:"vpk"`
	Irms  float64 `json:"irms"`
	Pdiss float64 `json:"pdiss"`
	// Note says more where the row's figures need it: a line's crest
	// along it and its far end, a coil's terminal current.
	Note string `json:"note,omitempty"`
	// DC across and through the part when the netlist has a supply or a
	// draw (absent otherwise)
	Vdc *float64 `json:"vdc,omitempty"`
	Idc *float64 `json:"idc,omitempty"`
}

// SolveView is everything the solve command shows.
type SolveView struct {
	File        string   `json:"file"`
	Title       string   `json:"title"`
	FrequencyHz float64  `json:"frequency_hz"`
	PowerW      float64  `json:"power_w"`
	Load        string   `json:"load"`
	PinW        float64  `json:"p_in_w"`
	PoutW       float64  `json:"p_out_w"`
	PlossW      float64  `json:"p_loss_w"`
	ZinRe       *float64 `json:"zin_re_ohm"` // null when the solve cannot be trusted
	ZinIm       *float64 `json:"zin_im_ohm"`
	S11dB       float64  `json:"s11_db"`
	S11deg      float64  `json:"s11_deg"`
	S21dB       float64  `json:"s21_db"`
	S21deg      float64  `json:"s21_deg"`
	// what the transmitter sees, referred to port in z
	TxSWR   float64 `json:"tx_swr"`
	TxReflW float64 `json:"tx_reflected_w"`
	// a balanced antenna port with cm=: the common-mode current and power
	IcmA       *float64    `json:"icm_a,omitempty"`
	PcmW       *float64    `json:"p_cm_w,omitempty"`
	Components []SolvePart `json:"components"`
	// Findings are sentences about the solve itself (a power balance that
	// does not close).
	Findings []string `json:"findings,omitempty"`
	// Cautions are the safety sentences of the text (SolveCautions);
	// WriteSolveJSON fills them.
	Cautions []string `json:"cautions,omitempty"`
}

// WriteSolveJSON writes the view as indented JSON with stable key order.
func WriteSolveJSON(w io.Writer, v *SolveView) error {
	c := *v
	c.Cautions = SolveCautions(v)
	return writeJSON(w, &c)
}

func writeJSON(w io.Writer, v any) error {
	b, err := json.MarshalIndent(v, "", "  ")
	if err != nil {
		return err
	}
	b = append(b, '\n')
	_, err = w.Write(b)
	return err
}

// WriteSolveText writes the solve as a plain table.
func WriteSolveText(w io.Writer, v *SolveView) error {
	si := circuits.FormatSI
	fmt.Fprintf(w, "%s\n", heading(v.File, v.Title))
	fmt.Fprintf(w, "  carrier %s, %s available from the transmitter, antenna port load %s\n\n",
		circuits.FormatHz(v.FrequencyHz), si(v.PowerW, "W"), v.Load)
	t := newTable("part", "kind", "V rms", "V peak", "I rms", "dissipation")
	for _, p := range v.Components {
		t.row(p.Name, p.Kind, si(p.Vrms, "V"), si(p.Vpk, "V"), si(p.Irms, "A"), si(p.Pdiss, "W"))
	}
	t.write(w)
	if len(v.Components) > 0 && v.Components[0].Vdc != nil {
		fmt.Fprintf(w, "\n  DC (supplies and draws; capacitors open, windings at rdc= or their wire):\n")
		d := newTable("part", "kind", "V dc", "I dc")
		for _, p := range v.Components {
			if p.Vdc != nil && p.Idc != nil {
				d.row(p.Name, p.Kind, si(*p.Vdc, "V"), si(*p.Idc, "A"))
			}
		}
		d.write(w)
	}
	for _, p := range v.Components {
		if p.Note != "" {
			fmt.Fprintf(w, "  %s: %s\n", p.Name, p.Note)
		}
	}
	fmt.Fprintf(w, "\n  into the network  %s\n", si(v.PinW, "W"))
	fmt.Fprintf(w, "  into the load     %s\n", si(v.PoutW, "W"))
	if v.PcmW != nil && v.IcmA != nil {
		fmt.Fprintf(w, "  common mode       %s (%s into the load's centre impedance)\n", si(*v.PcmW, "W"), si(*v.IcmA, "A"))
	}
	fmt.Fprintf(w, "  lost in parts     %s\n", si(v.PlossW, "W"))
	fmt.Fprintf(w, "  transmitter sees  SWR %s, %s reflected\n", FormatSWR(v.TxSWR), si(v.TxReflW, "W"))
	if v.ZinRe != nil && v.ZinIm != nil {
		fmt.Fprintf(w, "  input impedance   %s\n", circuits.FormatComplex(complex(*v.ZinRe, *v.ZinIm)))
	} else {
		fmt.Fprintf(w, "  input impedance   — (not shown: see the finding below)\n")
	}
	fmt.Fprintf(w, "  S11 %s dB ∠%s°   S21 %s dB ∠%s°\n", num(v.S11dB, 2), num(v.S11deg, 1), num(v.S21dB, 3), num(v.S21deg, 1))
	for _, f := range v.Findings {
		fmt.Fprintf(w, "  FINDING: %s\n", f)
	}
	for _, c := range SolveCautions(v) {
		fmt.Fprintf(w, "\n  CAUTION: %s\n", c)
	}
	return nil
}

// SolveCautionV is the peak voltage across a part from which solve warns:
// the audit's default --caution-volts.
const SolveCautionV = 300

// SolveCautions are the safety sentences a solve calls for: RF of
// SolveCautionV or more across a part, and DC at or above LethalDC.
func SolveCautions(v *SolveView) []string {
	var out []string
	var hot, dc *SolvePart
	for i := range v.Components {
		p := &v.Components[i]
		if p.Vpk >= SolveCautionV && (hot == nil || p.Vpk > hot.Vpk) {
			hot = p
		}
		if p.Vdc != nil && math.Abs(*p.Vdc) >= LethalDC && (dc == nil || math.Abs(*p.Vdc) > math.Abs(*dc.Vdc)) {
			dc = p
		}
	}
	if hot != nil {
		out = append(out, fmt.Sprintf("%s RF peak across %s at %s — RF burns and arcing; never touch or adjust while transmitting (SAFETY.md)",
			circuits.FormatSI(hot.Vpk, "V"), hot.Name, circuits.FormatSI(v.PowerW, "W")))
	}
	if dc != nil {
		out = append(out, fmt.Sprintf("LETHAL DC: %s across %s; switch off, wait for the bleeder, and ground every high-voltage point with a grounding stick before touching (SAFETY.md)",
			circuits.FormatSI(math.Abs(*dc.Vdc), "V"), dc.Name))
	}
	return out
}

func heading(file, title string) string {
	if title == "" {
		return Headline(file)
	}
	return Headline(file) + " — " + Headline(title)
}

// num formats a plain number with fixed decimals; non-finite values show a dash.
func num(v float64, dec int) string {
	if v != v || v > 1e300 || v < -1e300 {
		return "—"
	}
	return fmt.Sprintf("%.*f", dec, v)
}

// table is a minimal aligned text table; widths count runes so µ and Ω line up.
type table struct {
	head []string
	rows [][]string
	// right-align every column but the first two
	leftCols int
	// maxWidth > 0 fits the table to that many columns by wrapping its
	// last column, or moving it under each row when too little is left
	maxWidth int
	sub      []string // a second heading line, e.g. what a column is taken at
	leftLast bool     // the last column is text: left-aligned
}

func newTable(head ...string) *table { return &table{head: head, leftCols: 2} }

func (t *table) row(cells ...string) { t.rows = append(t.rows, cells) }

func (t *table) write(w io.Writer) {
	if t.maxWidth > 0 && len(t.head) > 1 && t.fitted(w) {
		return
	}
	width := make([]int, len(t.head))
	for i, h := range t.head {
		width[i] = runeLen(h)
	}
	for _, r := range t.rows {
		for i, c := range r {
			if i < len(width) && runeLen(c) > width[i] {
				width[i] = runeLen(c)
			}
		}
	}
	line := func(cells []string) {
		var b strings.Builder
		b.WriteString("  ")
		for i, c := range cells {
			pad := strings.Repeat(" ", width[i]-runeLen(c))
			if i < t.leftCols || t.leftLast && i == len(t.head)-1 {
				b.WriteString(c + pad)
			} else {
				b.WriteString(pad + c)
			}
			if i < len(cells)-1 {
				b.WriteString("  ")
			}
		}
		fmt.Fprintln(w, strings.TrimRight(b.String(), " "))
	}
	line(t.head)
	if t.sub != nil {
		sub := make([]string, len(t.head))
		copy(sub, t.sub)
		line(sub)
	}
	var rule []string
	for _, n := range width {
		rule = append(rule, strings.Repeat("─", n))
	}
	line(rule)
	for _, r := range t.rows {
		line(r)
	}
}

func runeLen(s string) int { return len([]rune(s)) }

// fitted writes the table with its last column wrapped to fit maxWidth;
// false when it fits as it is.
func (t *table) fitted(w io.Writer) bool {
	n := len(t.head)
	width := make([]int, n)
	for i, h := range t.head {
		width[i] = runeLen(h)
	}
	for _, r := range t.rows {
		for i, c := range r {
			if i < n && runeLen(c) > width[i] {
				width[i] = runeLen(c)
			}
		}
	}
	total := 2 + 2*(n-1)
	for _, x := range width {
		total += x
	}
	if total <= t.maxWidth {
		return false
	}
	left := total - width[n-1]    // where the last column starts
	room := t.maxWidth - left - 1 // keep off the last column of the screen
	under := room < 24
	head := t.head
	if under {
		head = t.head[:n-1] // the last column goes on lines of its own
		room = t.maxWidth - 7
		if room < 20 {
			room = 20
		}
	}
	inner := &table{head: head, leftCols: t.leftCols, leftLast: !under && t.leftLast}
	if t.sub != nil {
		inner.sub = t.sub[:min(len(t.sub), len(head))]
	}
	lines := make([][]string, len(t.rows))
	for i, r := range t.rows {
		last := ""
		if len(r) == n {
			last = r[n-1]
		}
		lines[i] = wrapWords(last, room)
		if under {
			inner.row(r[:min(len(r), n-1)]...)
		} else {
			first := ""
			if len(lines[i]) > 0 {
				first = lines[i][0]
			}
			inner.row(append(append([]string{}, r[:min(len(r), n-1)]...), first)...)
		}
	}
	var buf strings.Builder
	inner.write(&buf)
	out := strings.SplitAfter(buf.String(), "\n")
	// header and rule, then each row with its continuation lines
	top := 2
	if t.sub != nil {
		top = 3
	}
	if under {
		// the moved column's title, on its own heading line
		fmt.Fprint(w, strings.Join(out[:top-1], ""))
		fmt.Fprintln(w, "      "+t.head[n-1])
		fmt.Fprint(w, out[top-1])
	} else {
		fmt.Fprint(w, strings.Join(out[:top], ""))
	}
	for i := range t.rows {
		fmt.Fprint(w, out[top+i])
		rest := lines[i]
		indent := strings.Repeat(" ", left)
		if under {
			indent = strings.Repeat(" ", 6)
		} else if len(rest) > 0 {
			rest = rest[1:]
		}
		for _, l := range rest {
			fmt.Fprintln(w, indent+l)
		}
	}
	return true
}

// wrapWords breaks s into lines of at most n runes at spaces (a longer
// word gets a line of its own).
func wrapWords(s string, n int) []string {
	var lines []string
	cur := ""
	for _, word := range strings.Fields(s) {
		switch {
		case cur == "":
			cur = word
		case runeLen(cur)+1+runeLen(word) <= n:
			cur += " " + word
		default:
			lines = append(lines, cur)
			cur = word
		}
	}
	if cur != "" {
		lines = append(lines, cur)
	}
	return lines
}

// wrapLine writes s wrapped to width (0: unlimited) with the given first
// prefix and a hanging indent for the lines after.
func wrapLine(w io.Writer, width int, prefix, hang, s string) {
	if width <= 0 || runeLen(prefix)+runeLen(s) < width {
		fmt.Fprintln(w, prefix+s)
		return
	}
	room := width - 1 - runeLen(hang)
	if room < 20 {
		room = 20
	}
	first := width - 1 - runeLen(prefix)
	if first < 20 {
		first = 20
	}
	lines := wrapWords(s, first)
	if len(lines) == 0 {
		fmt.Fprintln(w, prefix)
		return
	}
	fmt.Fprintln(w, prefix+lines[0])
	rest := strings.Join(lines[1:], " ")
	for _, l := range wrapWords(rest, room) {
		fmt.Fprintln(w, hang+l)
	}
}
