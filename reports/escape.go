package reports

import (
	"fmt"
	"strings"
	"unicode"
)

// Escape makes text read from files safe to echo: control characters (C0,
// C1, DEL) and bidirectional-format controls become visible escapes such
// as \x1b or \u202e, so a file name or title cannot move the cursor,
// rewrite a line or reorder what a reader sees.
func Escape(s string) string {
	var b strings.Builder
	for _, r := range s {
		switch {
		case r == '\t':
			b.WriteString(`\t`)
		case r < 0x20 || r == 0x7f || (r >= 0x80 && r < 0xa0):
			fmt.Fprintf(&b, `\x%02x`, r)
		case unicode.Is(unicode.Bidi_Control, r) || r == '\ufeff' || r == unicode.ReplacementChar:
			fmt.Fprintf(&b, `\u%04x`, r)
		default:
			b.WriteRune(r)
		}
	}
	return b.String()
}
