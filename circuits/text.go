package circuits

import (
	"fmt"
	"strings"
	"unicode/utf8"
)

// EchoMax is how many characters of an input value a message echoes;
// longer values are cut with an ellipsis so one bad 100 kB token cannot
// bury the message.
const EchoMax = 60

// isHostile reports runes that must never reach a terminal, a log or a PDF
// as themselves: C0 and C1 controls (ESC starts terminal sequences, CR
// overwrites a line, NUL truncates in C tools), DEL, the line and
// paragraph separators and the bidirectional controls that reorder what a
// reader sees (Unicode TR #9; the "Trojan Source" class of attack).
func isHostile(r rune) bool {
	switch {
	case r < 0x20, r == 0x7f, r >= 0x80 && r < 0xa0:
		return true
	case r == 0x061c, r == 0x200e, r == 0x200f, r == 0x2028, r == 0x2029:
		return true
	case r >= 0x202a && r <= 0x202e, r >= 0x2066 && r <= 0x2069:
		return true
	case r == 0xfeff: // a byte-order mark inside text is invisible
		return true
	}
	return false
}

// Escape renders text from a file or the command line so that it can be
// echoed safely: every control character becomes a visible escape
// (\n, \r, \t, \x1b, \u202e …); everything else is kept. Invalid UTF-8
// bytes become \xNN.
func Escape(s string) string {
	clean := true
	for _, r := range s {
		if r == utf8.RuneError || isHostile(r) {
			clean = false
			break
		}
	}
	if clean {
		return s
	}
	var b strings.Builder
	for i := 0; i < len(s); {
		r, size := utf8.DecodeRuneInString(s[i:])
		switch {
		case r == utf8.RuneError && size <= 1:
			fmt.Fprintf(&b, `\x%02x`, s[i])
		case r == '\n':
			b.WriteString(`\n`)
		case r == '\r':
			b.WriteString(`\r`)
		case r == '\t':
			b.WriteString(`\t`)
		case r < 0x80 && isHostile(r):
			fmt.Fprintf(&b, `\x%02x`, r)
		case isHostile(r):
			fmt.Fprintf(&b, `\u%04x`, r)
		default:
			b.WriteString(s[i : i+size])
		}
		i += size
	}
	return b.String()
}

// Shorten cuts s to at most max characters, ending in "…" when cut.
func Shorten(s string, max int) string {
	if max < 1 || utf8.RuneCountInString(s) <= max {
		return s
	}
	n := 0
	for i := range s {
		if n == max-1 {
			return s[:i] + "…"
		}
		n++
	}
	return s
}

// Clip is an input value as a message echoes it: escaped and cut to
// about EchoMax characters.
func Clip(s string) string { return Shorten(Escape(s), EchoMax) }

// Quote is Clip in double quotes, for messages that quote a value.
func Quote(s string) string { return `"` + Clip(s) + `"` }
