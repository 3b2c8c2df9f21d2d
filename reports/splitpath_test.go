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

// TestOneLineAsSplitText: the shortcut that keeps a fitting cell whole
// says so only where gofpdf's SplitText (the reference) gives that one
// line, at widths on both sides of each text's own width and in every
// font the report uses.
func TestOneLineAsSplitText(t *testing.T) {
	p := newPDF(&ReportDoc{Bank: &stress.Bank{}}, true)
	p.f.AddPage()
	texts := []string{"C7a", "peak voltage", "322 V", "rated 630 V peak", "12.5-j180 Ω", "a b", " lead", "x", "iron powder, mu=10 (20 x 11 x 6 mm)"}
	for _, set := range []func(){func() { p.font("", 8) }, func() { p.font("B", 6.8) }, func() { p.mono(7.2) }} {
		set()
		for _, s := range texts {
			w0 := p.width(s)
			for _, k := range []float64{0.5, 0.9, 0.999, 1, 1.001, 1.2} {
				w := w0 * k
				if p.oneLine(s, w) {
					if got := p.f.SplitText(s, w); len(got) != 1 || got[0] != s {
						t.Errorf("%q at %.4f mm: shortcut keeps it whole, SplitText gives %q", s, w, got)
					}
				}
			}
		}
	}
}

// TestMeasureWithoutFont: measuring and wrapping from the unit tables,
// without setting the font, give what gofpdf's GetStringWidth and the
// report's split give with the font set (the reference), in each face.
func TestMeasureWithoutFont(t *testing.T) {
	p := newPDF(&ReportDoc{Bank: &stress.Bank{}}, true)
	p.f.AddPage()
	texts := []string{"C7a", "peak voltage 322 V", "12.5-j180 Ω", "1.2 µH", "testdata/station/lpf-20m.net", "a  b", "−3 dB ∠45°", "tab\there", ""}
	for face := 0; face < nFaces; face++ {
		for _, size := range []float64{5.5, 6.8, 8} {
			for _, s := range texts {
				p.setFace(face, size)
				want := p.f.GetStringWidth(clean(s))
				p.setFace((face+1)%nFaces, 7) // another font current
				if got := p.widthIn(face, size, s); got != want {
					t.Errorf("face %d %.1f: width of %q %g, GetStringWidth %g", face, size, s, got, want)
				}
				for _, k := range []float64{0.3, 0.7, 0.999, 1, 1.5} {
					w := want * k
					p.setFace(face, size)
					ref := p.split(s, w)
					p.setFace((face+1)%nFaces, 7)
					if got := p.splitIn(face, size, s, w); strings.Join(got, "|") != strings.Join(ref, "|") || len(got) != len(ref) {
						t.Errorf("face %d %.1f: %q at %.3f mm split as %q, with the font set %q", face, size, s, w, got, ref)
					}
				}
			}
		}
	}
}
