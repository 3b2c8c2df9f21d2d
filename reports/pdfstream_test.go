package reports

import (
	"bytes"
	"testing"
)

// TestDeflatePagesAsGofpdf: compressing the page streams after the fact
// gives the very bytes gofpdf writes when it compresses them itself (same
// zlib level, same data, the cross-reference offsets recomputed), so the
// report is unchanged and gofpdf is the reference. Checked on the whole
// example bank, and the fallback keeps a document it cannot read.
func TestDeflatePagesAsGofpdf(t *testing.T) {
	doc := demoDoc(t, demoSources(t), 0)
	own, err := renderPDF(doc, true)
	if err != nil {
		t.Fatal(err)
	}
	ref, err := renderPDF(doc, false)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(own, ref) {
		t.Fatalf("page streams compressed here differ from gofpdf's own (%d and %d bytes)", len(own), len(ref))
	}
	if _, ok := deflatePages([]byte("%PDF-1.3\nnot a document\n"), [2][]byte{}); ok {
		t.Error("a text that is no gofpdf document was rewritten")
	}
	if _, ok := deflatePages(ref, [2][]byte{}); ok {
		// already compressed: its contents carry /Filter, so the layout
		// check must refuse rather than compress twice
		t.Error("an already compressed document was rewritten")
	}
}

// TestFontsUnchangedByRender: gofpdf writes into the font bytes it is
// handed while it subsets a font whose later glyphs share one advance
// width (the mono font), which once made every report after a process's
// first carry another font subset. Each document gets copies, so the
// embedded fonts stay as built and renders of one doc are byte-identical.
func TestFontsUnchangedByRender(t *testing.T) {
	sums := func() [3]string {
		return [3]string{string(fontRegular), string(fontBold), string(fontMono)}
	}
	before := sums()
	doc := demoDoc(t, demoSources(t), 0)
	a, err := renderPDF(doc, true)
	if err != nil {
		t.Fatal(err)
	}
	if sums() != before {
		t.Fatal("rendering changed the embedded font bytes")
	}
	b, err := renderPDF(doc, true)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(a, b) {
		t.Errorf("two renders of one doc differ (%d and %d bytes)", len(a), len(b))
	}
}
