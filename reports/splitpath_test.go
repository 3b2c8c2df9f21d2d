package reports

import (
	"strings"
	"testing"

	"rfstress/stress"
)

// TestFileNamesWrapAtSeparators: a file name too long for its column
// wraps after a '/' or '-' (common typesetting practice for paths:
// never inside a name's word, never leaving a bare extension), and the
// pieces put back together give the name unchanged.
func TestFileNamesWrapAtSeparators(t *testing.T) {
	p := newPDF(&ReportDoc{Bank: &stress.Bank{}}, true)
	p.f.AddPage()
	p.font("B", 8)
	for _, name := range []string{"testdata/station/relay-bank-40m-20m.net", "testdata/station/tuner-40m-coax.net", "testdata/station/lpf-20m.net"} {
		w := p.width(name) * 0.6
		lines := p.split(name, w)
		if strings.Join(lines, "") != name {
			t.Fatalf("%q split into %q: pieces do not join back", name, lines)
		}
		for i, l := range lines {
			if p.width(l) > w+0.01 {
				t.Errorf("%q: line %q wider than %.1f mm", name, l, w)
			}
			if i < len(lines)-1 && !strings.ContainsAny(l[len(l)-1:], "/-_.") {
				t.Errorf("%q: line %q breaks inside a word (%q)", name, l, lines)
			}
			if l == "net" {
				t.Errorf("%q: bare extension on a line of its own (%q)", name, lines)
			}
		}
	}
}
