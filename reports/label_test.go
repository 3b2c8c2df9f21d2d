package reports

import (
	"strings"
	"testing"
)

// TestPositionLabelsNotCut: a switched bank's sections share one file name
// and one title; only the position label tells "position B20" from "wrong
// band selected: position B20 at the carriers of position B40". The file
// table and the conditions table must carry the whole label (a long title
// is shortened, never the label after it).
func TestPositionLabelsNotCut(t *testing.T) {
	var srcs []netSrc
	for _, s := range demoSources(t) {
		if strings.HasPrefix(s.name, "relay-bank") {
			srcs = append(srcs, s)
		}
	}
	if len(srcs) == 0 {
		t.Skip("example station absent")
	}
	pdf := pdfText(t, render(t, demoDoc(t, srcs, 0)))
	text := strings.Join(strings.Fields(pdf), " ")
	for _, want := range []string{
		"wrong band selected: position B20 at the carriers of position B40",
		"wrong band selected: position B40 at the carriers of position B20",
	} {
		// section page heading, file table, conditions table, margin chart
		if n := strings.Count(text, want); n < 4 {
			t.Errorf("%q shown whole %d times, want at least 4 (section page, file table, conditions table, margin chart)", want, n)
		}
	}
	// the four positions come from one netlist: it is listed once
	if n := strings.Count(text, "Netlists as audited"); n != 1 {
		t.Fatalf("%d listing headings", n)
	}
	listing := text[strings.Index(text, "Netlists as audited"):]
	if n := strings.Count(listing, "SHA-256"); n != 1 {
		t.Errorf("one netlist listed %d times", n)
	}
}
