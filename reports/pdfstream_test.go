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
	// the first report a process writes may carry a slightly different
	// font subset from later ones (gofpdf state, whichever way it is
	// compressed), so the comparison is between two later renders
	if _, err := renderPDF(doc, false); err != nil {
		t.Fatal(err)
	}
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
	if _, ok := deflatePages([]byte("%PDF-1.3\nnot a document\n")); ok {
		t.Error("a text that is no gofpdf document was rewritten")
	}
	if _, ok := deflatePages(ref); ok {
		// already compressed: its contents carry /Filter, so the layout
		// check must refuse rather than compress twice
		t.Error("an already compressed document was rewritten")
	}
}
