// Package reports renders results that other layers computed: text tables,
// JSON, CSV, Touchstone and PDF. It computes nothing of its own.
package reports

import (
	"encoding/json"
	"fmt"
	"io"
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
}

// SolveView is everything the solve command shows.
type SolveView struct {
	File        string      `json:"file"`
	Title       string      `json:"title"`
	FrequencyHz float64     `json:"frequency_hz"`
	PowerW      float64     `json:"power_w"`
	Load        string      `json:"load"`
	PinW        float64     `json:"p_in_w"`
	PoutW       float64     `json:"p_out_w"`
	PlossW      float64     `json:"p_loss_w"`
	ZinRe       float64     `json:"zin_re_ohm"`
	ZinIm       float64     `json:"zin_im_ohm"`
	S11dB       float64     `json:"s11_db"`
	S11deg      float64     `json:"s11_deg"`
	S21dB       float64     `json:"s21_db"`
	S21deg      float64     `json:"s21_deg"`
	Components  []SolvePart `json:"components"`
}

// WriteSolveJSON writes the view as indented JSON with stable key order.
func WriteSolveJSON(w io.Writer, v *SolveView) error {
	return writeJSON(w, v)
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
	fmt.Fprintf(w, "\n  into the network  %s\n", si(v.PinW, "W"))
	fmt.Fprintf(w, "  into the load     %s\n", si(v.PoutW, "W"))
	fmt.Fprintf(w, "  lost in parts     %s\n", si(v.PlossW, "W"))
	fmt.Fprintf(w, "  input impedance   %s\n", circuits.FormatComplex(complex(v.ZinRe, v.ZinIm)))
	fmt.Fprintf(w, "  S11 %s dB ∠%s°   S21 %s dB ∠%s°\n", num(v.S11dB, 2), num(v.S11deg, 1), num(v.S21dB, 3), num(v.S21deg, 1))
	return nil
}

func heading(file, title string) string {
	if title == "" {
		return file
	}
	return file + " — " + title
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
}

func newTable(head ...string) *table { return &table{head: head, leftCols: 2} }

func (t *table) row(cells ...string) { t.rows = append(t.rows, cells) }

func (t *table) write(w io.Writer) {
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
			if i < t.leftCols {
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
