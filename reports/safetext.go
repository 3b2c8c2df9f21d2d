package reports

import (
	"io"
	"strconv"
	"strings"
	"unicode/utf8"

	"rfstress/circuits"
)

// TitleMax is the longest title shown in text and PDF headings; JSON keeps
// the title whole. A title is one line of a netlist, and a heading longer
// than a line only pushes the content away (a 100 kB title once made a
// report of nearly two thousand pages).
const TitleMax = 100

// Headline is a title or file name as headings show it: control
// characters escaped, cut to TitleMax characters with an ellipsis.
func Headline(s string) string { return circuits.Shorten(circuits.Escape(s), TitleMax) }

// csvSafe guards a CSV cell against formula injection (OWASP, "CSV
// Injection"): a cell that begins with =, +, -, @, a tab or a carriage
// return is prefixed with a single quote so a spreadsheet shows it as
// text. Plain numbers ("-1.5e3") are left alone, so numeric columns stay
// numeric.
func csvSafe(s string) string {
	if s == "" {
		return s
	}
	switch s[0] {
	case '=', '+', '-', '@', '\t', '\r':
		if _, err := strconv.ParseFloat(s, 64); err == nil {
			return s
		}
		return "'" + s
	}
	return s
}

// csvSafeRow applies csvSafe to every cell.
func csvSafeRow(row []string) []string {
	for i, c := range row {
		row[i] = csvSafe(c)
	}
	return row
}

// escapeWriter escapes control characters other than newline on their way
// to a terminal or file, so a crafted note or name from a netlist cannot
// move the cursor, recolour or rewrite earlier lines. Text that the
// writers build themselves has no such characters.
type escapeWriter struct {
	w       io.Writer
	pending []byte // an incomplete UTF-8 sequence carried to the next write
}

func (e *escapeWriter) Write(p []byte) (int, error) {
	buf := append(e.pending, p...)
	e.pending = nil
	// keep a trailing partial rune for the next write
	cut := len(buf)
	for i := len(buf) - 1; i >= 0 && i >= len(buf)-utf8.UTFMax; i-- {
		if utf8.RuneStart(buf[i]) {
			if !utf8.FullRune(buf[i:]) {
				cut = i
			}
			break
		}
	}
	e.pending = append([]byte(nil), buf[cut:]...)
	lines := strings.Split(string(buf[:cut]), "\n")
	for i, l := range lines {
		lines[i] = circuits.Escape(l)
	}
	if _, err := io.WriteString(e.w, strings.Join(lines, "\n")); err != nil {
		return 0, err
	}
	return len(p), nil
}
