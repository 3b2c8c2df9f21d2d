package reports

import (
	"bytes"
	"strings"
	"testing"
)

// TestCSVSafe follows the OWASP "CSV Injection" guidance: a cell that
// begins with =, +, -, @, tab or CR gets a leading single quote so a
// spreadsheet shows it as text; plain numbers keep their sign.
func TestCSVSafe(t *testing.T) {
	cases := map[string]string{
		"=1+2":        "'=1+2",
		"+cmd|' /C'":  "'+cmd|' /C'",
		"-2+3":        "'-2+3",
		"@SUM(A1)":    "'@SUM(A1)",
		"\t=x":        "'\t=x",
		"\r=x":        "'\r=x",
		"-1.5e3":      "-1.5e3",
		"+12":         "+12",
		"lpf.net":     "lpf.net",
		"":            "",
		"-":           "'-",
		"10 MHz, =x":  "10 MHz, =x",
		"-Inf":        "-Inf", // parses as a number; csvNum never writes it
		"-j50 ohm=1":  "'-j50 ohm=1",
		"@":           "'@",
		"=":           "'=",
		"3.3u":        "3.3u",
		"-0":          "-0",
		"+0.5":        "+0.5",
		"=HYPERLINK(": "'=HYPERLINK(",
	}
	for in, want := range cases {
		if got := csvSafe(in); got != want {
			t.Errorf("csvSafe(%q) = %q, want %q", in, got, want)
		}
	}
}

// TestEscapeWriter: control characters from input never reach the
// terminal as themselves, even when a write splits a multi-byte rune;
// newlines the writers put in stay.
func TestEscapeWriter(t *testing.T) {
	var b bytes.Buffer
	w := &escapeWriter{w: &b}
	in := "µH \x1b[2J Ω\r\nline\u202e2\n"
	raw := []byte(in)
	for i := range raw {
		w.Write(raw[i : i+1]) // byte by byte: runes split across writes
	}
	want := `µH \x1b[2J Ω\r` + "\n" + `line\u202e2` + "\n"
	if b.String() != want {
		t.Errorf("got %q, want %q", b.String(), want)
	}
	if h := Headline(strings.Repeat("é", 500)); len([]rune(h)) != TitleMax {
		t.Errorf("headline of %d characters", len([]rune(h)))
	}
}
