package reports

import (
	"fmt"
	"io"
	"strconv"
	"strings"

	"rfstress/circuits"
)

// SweepView is a frequency response: S-parameters per frequency.
type SweepView struct {
	File   string
	Title  string
	Z1, Z2 complex128 // port reference impedances
	Points []circuits.SParams
}

func g(v float64) string { return strconv.FormatFloat(v, 'g', 10, 64) }

// WriteSweepCSV writes one row per frequency, SI units in the header.
func WriteSweepCSV(w io.Writer, v *SweepView) error {
	fmt.Fprintln(w, "frequency_hz,s21_db,s21_deg,s11_db,s11_deg,s12_db,s12_deg,s22_db,s22_deg,insertion_loss_db,return_loss_db,zin_re_ohm,zin_im_ohm")
	for _, p := range v.Points {
		fmt.Fprintf(w, "%s,%s,%s,%s,%s,%s,%s,%s,%s,%s,%s,%s,%s\n", g(p.F),
			num(circuits.DB(p.S21), 4), num(circuits.PhaseDeg(p.S21), 3),
			num(circuits.DB(p.S11), 4), num(circuits.PhaseDeg(p.S11), 3),
			num(circuits.DB(p.S12), 4), num(circuits.PhaseDeg(p.S12), 3),
			num(circuits.DB(p.S22), 4), num(circuits.PhaseDeg(p.S22), 3),
			num(-circuits.DB(p.S21), 4), num(-circuits.DB(p.S11), 4),
			num(real(p.Zin), 4), num(imag(p.Zin), 4))
	}
	return nil
}

// WriteSweepText writes a short table of the sweep.
func WriteSweepText(w io.Writer, v *SweepView) error {
	fmt.Fprintln(w, heading(v.File, v.Title))
	fmt.Fprintf(w, "  port impedances: in %s, out %s\n\n", circuits.FormatComplex(v.Z1), circuits.FormatComplex(v.Z2))
	t := newTable("frequency", "insertion loss", "return loss", "S21 phase")
	t.leftCols = 1
	for _, p := range v.Points {
		t.row(circuits.FormatHz(p.F), num(-circuits.DB(p.S21), 2)+" dB", num(-circuits.DB(p.S11), 2)+" dB", num(circuits.PhaseDeg(p.S21), 1)+"°")
	}
	t.write(w)
	return nil
}

// WriteTouchstone writes a Touchstone 2.0 two-port file (IBIS Open Forum,
// Touchstone File Format Specification 2.0): [Version], the option line,
// [Number of Ports], [Two-Port Data Order] 21_12 (rows S11 S21 S12 S22, the
// version 1 order), [Reference], [Number of Frequencies], [Network Data] and
// [End]. Data are real/imaginary pairs; frequencies in Hz.
func WriteTouchstone(w io.Writer, v *SweepView) error {
	if imag(v.Z1) != 0 || imag(v.Z2) != 0 {
		return fmt.Errorf("Touchstone reference impedances must be real; port impedances are %s and %s (give real port z or use --z0)",
			circuits.FormatComplex(v.Z1), circuits.FormatComplex(v.Z2))
	}
	var b strings.Builder
	b.WriteString("! rfstress frequency response\n")
	if v.Title != "" {
		b.WriteString("! " + asciiOnly(v.Title) + "\n")
	}
	b.WriteString("[Version] 2.0\n")
	fmt.Fprintf(&b, "# Hz S RI R %s\n", g(real(v.Z1)))
	b.WriteString("[Number of Ports] 2\n")
	b.WriteString("[Two-Port Data Order] 21_12\n")
	fmt.Fprintf(&b, "[Number of Frequencies] %d\n", len(v.Points))
	fmt.Fprintf(&b, "[Reference] %s %s\n", g(real(v.Z1)), g(real(v.Z2)))
	b.WriteString("[Network Data]\n")
	// every digit that round-trips: the file can come back in as a block
	gx := func(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }
	for _, p := range v.Points {
		fmt.Fprintf(&b, "%s %s %s %s %s %s %s %s %s\n", g(p.F),
			gx(real(p.S11)), gx(imag(p.S11)), gx(real(p.S21)), gx(imag(p.S21)),
			gx(real(p.S12)), gx(imag(p.S12)), gx(real(p.S22)), gx(imag(p.S22)))
	}
	b.WriteString("[End]\n")
	_, err := io.WriteString(w, b.String())
	return err
}

// asciiOnly spells a comment in ASCII, as Touchstone files must be
// (Touchstone 2.0, general rules): µ becomes u, Ω ohm, other non-ASCII ?.
func asciiOnly(s string) string {
	var b strings.Builder
	for _, r := range s {
		switch {
		case r == '\n' || r == '\r':
			b.WriteByte(' ')
		case r == 'µ' || r == 'μ':
			b.WriteByte('u')
		case r == 'Ω':
			b.WriteString("ohm")
		case r == '—' || r == '–':
			b.WriteByte('-')
		case r == '°':
			b.WriteString("deg")
		case r < 0x20 || r > 0x7e:
			b.WriteByte('?')
		default:
			b.WriteRune(r)
		}
	}
	return b.String()
}
