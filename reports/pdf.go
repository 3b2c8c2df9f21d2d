package reports

import (
	"bytes"
	_ "embed"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"sync/atomic"
	"time"
	"unicode/utf8"

	"github.com/jung-kurt/gofpdf"

	"rfstress/circuits"
	"rfstress/ratings"
	"rfstress/stress"
)

// The fonts are embedded so the report renders Ω, µ, °, Γ, ∠, ² and − the
// same on every machine; the PDF carries only the glyphs it uses. See
// fonts/LICENSE-DejaVu.txt.
var (
	//go:embed fonts/DejaVuSansCondensed.ttf
	fontRegular []byte
	//go:embed fonts/DejaVuSansCondensed-Bold.ttf
	fontBold []byte
	//go:embed fonts/DejaVuSansMono.ttf
	fontMono []byte
)

const (
	fontSans = "dvsans"
	fontCode = "dvmono"
)

// rgb is a colour of our own palette.
type rgb struct{ r, g, b int }

// The palette. Verdicts are always spelled out as words next to their
// colour, so nothing depends on telling the colours apart.
var (
	colInk      = rgb{28, 32, 40}
	colMuted    = rgb{98, 104, 116}
	colRule     = rgb{186, 192, 202}
	colFaint    = rgb{236, 239, 243}
	colAccent   = rgb{24, 74, 104}   // headings, insertion loss
	colSecond   = rgb{196, 104, 36}  // return loss
	colBand     = rgb{222, 234, 244} // carrier band shading
	colCaution  = rgb{255, 245, 220}
	colCautionB = rgb{168, 58, 18}
	colOK       = rgb{38, 128, 108}
	colUnrated  = rgb{122, 114, 148}
	colMarginal = rgb{214, 142, 20}
	colFail     = rgb{186, 36, 66}
	colWhite    = rgb{255, 255, 255}
)

func verdictColor(v ratings.Verdict) rgb {
	switch v {
	case ratings.OK:
		return colOK
	case ratings.Unrated:
		return colUnrated
	case ratings.Marginal:
		return colMarginal
	}
	return colFail
}

// Page geometry, mm (A4 portrait).
const (
	pageW     = 210.0
	pageH     = 297.0
	marginL   = 16.0
	marginR   = 16.0
	marginTop = 20.0
	marginBot = 18.0
	bodyW     = pageW - marginL - marginR
)

// pdfw draws one report.
type pdfw struct {
	f   *gofpdf.Fpdf
	doc *ReportDoc
	cur fontState // the font last set through font/mono
	// units are the advance widths, in glyph units, of the runes below
	// unitRunes in each face, read before the first page (where setting a
	// font writes nothing): text is measured with them without setting
	// its font, which would write a font operator into the page each time
	units [nFaces][]int
	k     float64 // points per mm: a font's size in mm is its size / k
}

// The report's faces, as the unit tables index them.
const (
	faceRegular = iota
	faceBold
	faceMono
	nFaces
)

// unitRunes bounds the unit tables: Latin, Greek (µ, Ω) and the signs
// most text is made of; other runes are measured in their font.
const unitRunes = 0x400

var faceFonts = [nFaces][2]string{{fontSans, ""}, {fontSans, "B"}, {fontCode, ""}}

// readUnits reads the unit tables of a document's faces; it must run
// before the first page.
func readUnits(f *gofpdf.Fpdf) (units [nFaces][]int) {
	for face, ff := range faceFonts {
		f.SetFont(ff[0], ff[1], 10)
		t := make([]int, unitRunes)
		for r := rune(0x20); r < unitRunes; r++ {
			if r >= 0x7F && r < 0xA0 {
				t[r] = -1 // control characters: clean escapes them
				continue
			}
			t[r] = f.GetStringSymbolWidth(string(r))
		}
		units[face] = t
	}
	return units
}

// textUnits is the width of s in glyph units in face, as
// GetStringSymbolWidth gives it (a sum over the runes); false when a rune
// is not in the table.
func (p *pdfw) textUnits(face int, s string) (int, bool) {
	t := p.units[face]
	u := 0
	for _, r := range s {
		if r < 0x20 || r >= unitRunes || t[r] < 0 {
			return 0, false
		}
		u += t[r]
	}
	return u, true
}

// setFace sets a face at a size (through setFont: only when it changes).
func (p *pdfw) setFace(face int, size float64) {
	p.setFont(faceFonts[face][0], faceFonts[face][1], size)
}

// widthIn is the width of s in face at size, as the face's GetStringWidth
// gives it, set only when a rune is not in the unit table.
func (p *pdfw) widthIn(face int, size float64, s string) float64 {
	s = clean(s)
	if u, ok := p.textUnits(face, s); ok {
		return float64(u) * (size / p.k) / 1000
	}
	p.setFace(face, size)
	return p.f.GetStringWidth(s)
}

// splitIn is split in face at size, setting the face only when the text
// does not simply fit on one line (see oneLine).
func (p *pdfw) splitIn(face int, size float64, s string, w float64) []string {
	c := clean(s)
	if c != "" && printableASCII(c) {
		if u, ok := p.textUnits(face, c); ok {
			fs := size / p.k
			// split's own tests: no path breaking (a space, or it fits),
			// and SplitText's sum against the width rounded up
			if (strings.Contains(c, " ") || float64(u)*fs/1000 <= w) && u <= int(math.Ceil(w*1000/fs)) {
				return []string{c}
			}
		}
	}
	p.setFace(face, size)
	return p.split(s, w)
}

func printableASCII(s string) bool {
	for i := 0; i < len(s); i++ {
		if s[i] < 0x20 || s[i] >= 0x7F {
			return false
		}
	}
	return true
}

// fontState is a font as set through font/mono; ok false when gofpdf may
// have changed it behind our back (it restores fonts round a page break).
type fontState struct {
	family, style string
	size          float64
	ok            bool
}

// WritePDF lays out doc as the PDF stress report and writes it to w. The
// output depends only on doc: doc.Date (set by the caller, from
// SOURCE_DATE_EPOCH when given) is the printed date and the PDF's creation
// and modification dates, so the same inputs give the same bytes.
func WritePDF(w io.Writer, doc *ReportDoc) error {
	if doc == nil || doc.Bank == nil {
		return fmt.Errorf("report: nothing to report")
	}
	b, err := renderPDF(doc, true)
	if err != nil {
		return err
	}
	_, err = w.Write(b)
	return err
}

// renderPDF lays out the report; with ownDeflate the page streams are
// compressed by deflatePages instead of by gofpdf, and the page total
// filled in there too (same bytes, less work).
func renderPDF(doc *ReportDoc, ownDeflate bool) ([]byte, error) {
	var p *pdfw
	if ownDeflate { // the start has no page-total alias: deflatePages fills it in
		if fd := doc.Start.take(); fd != nil {
			p = setupPDF(fd, doc)
		}
	}
	if p == nil {
		p = newPDF(doc, !ownDeflate)
	}
	f := p.f
	if ownDeflate {
		f.SetCompression(false)
	}
	p.summary()
	p.marginChart()
	for i, s := range doc.Bank.Sections {
		p.sectionPages(s, doc.filter(i))
		if s.Retune != nil {
			p.tunePage(RetuneView(s))
		}
	}
	p.method()
	p.listings()

	pages := f.PageNo()
	var out grab
	if err := f.Output(&out); err != nil {
		return nil, fmt.Errorf("report: %w", err)
	}
	if ownDeflate {
		total := [2][]byte{utf16BE(pageTotal), utf16BE(strconv.Itoa(pages))}
		if b, ok := deflatePages(out.b, total); ok {
			return b, nil
		}
		return renderPDF(doc, false) // a layout deflatePages cannot read
	}
	return out.b, nil
}

// pageTotal stands for the number of pages in the footers until the end.
const pageTotal = "{nb}"

// utf16BE is s as gofpdf writes text in a UTF-8 font's page stream:
// UTF-16BE code units (BMP only: see clean), each byte \, (, ) or CR
// escaped.
func utf16BE(s string) []byte {
	var b []byte
	for _, r := range s {
		for _, c := range []byte{byte(r >> 8), byte(r)} {
			switch c {
			case '\\', '(', ')':
				b = append(b, '\\')
			case '\r':
				b, c = append(b, '\\'), 'r'
			}
			b = append(b, c)
		}
	}
	return b
}

// grab keeps the document gofpdf's Output hands over instead of copying
// it (a few MB): Output writes its finished buffer once and the Fpdf is
// not used again.
type grab struct{ b []byte }

func (g *grab) Write(p []byte) (int, error) {
	if g.b == nil {
		g.b = p
	} else {
		g.b = append(g.b, p...)
	}
	return len(p), nil
}

// newPDF sets up an empty report document: fonts, dates, page furniture.
func newPDF(doc *ReportDoc, alias bool) *pdfw {
	return setupPDF(newFontDoc(alias), doc)
}

// fontDoc is an empty gofpdf document with the report's fonts added and
// their unit tables read: the part of a report that needs no data.
type fontDoc struct {
	f     *gofpdf.Fpdf
	units [nFaces][]int
}

func newFontDoc(alias bool) *fontDoc {
	f := gofpdf.New("P", "mm", "A4", "")
	// fonts before AliasNbPages: gofpdf then keeps the digits in every
	// font subset, which the page total is written with at the end
	// gofpdf writes into the font bytes it is given while it subsets them
	// (a glyph's metrics past the font's last full metric land in the
	// array: the mono font), so each document gets copies and every
	// report of a process comes out as the first
	f.AddUTF8FontFromBytes(fontSans, "", bytes.Clone(fontRegular))
	f.AddUTF8FontFromBytes(fontSans, "B", bytes.Clone(fontBold))
	f.AddUTF8FontFromBytes(fontCode, "", bytes.Clone(fontMono))
	if alias {
		f.AliasNbPages(pageTotal) // else deflatePages fills it in
	}
	return &fontDoc{f: f, units: readUnits(f)}
}

// PDFStart is a report document begun ahead of its data: gofpdf reads
// the embedded fonts (a few milliseconds of the report) in the background
// while the caller is still auditing. A start serves one report.
type PDFStart struct {
	done  chan struct{}
	fd    *fontDoc
	fault *struct{ v any } // a panic while starting, raised again in take
	used  atomic.Bool
}

// StartPDF begins a report document in the background; give it to the
// report as ReportDoc.Start.
func StartPDF() *PDFStart {
	s := &PDFStart{done: make(chan struct{})}
	go func() {
		defer close(s.done)
		defer func() {
			if r := recover(); r != nil {
				s.fault = &struct{ v any }{r}
			}
		}()
		s.fd = newFontDoc(false)
	}()
	return s
}

// take is the document begun ahead, once; nil after.
func (s *PDFStart) take() *fontDoc {
	if s == nil || s.used.Swap(true) {
		return nil
	}
	<-s.done
	if s.fault != nil {
		// raised again on the report's goroutine, where the caller's
		// recover sees it; in the background it would end the process
		panic(s.fault.v)
	}
	return s.fd
}

// setupPDF sets a document's dates, metadata and page furniture.
func setupPDF(fd *fontDoc, doc *ReportDoc) *pdfw {
	f := fd.f
	date := doc.Date.UTC()
	if doc.Date.IsZero() {
		date = time.Unix(0, 0).UTC() // never let gofpdf fall back to the clock
	}
	f.SetCreationDate(date)
	f.SetModificationDate(date)
	f.SetCatalogSort(true)
	f.SetCompression(true)
	f.SetProducer(doc.Tool, true)
	f.SetCreator(doc.Tool, true)
	f.SetTitle("RF stress report", true)
	f.SetSubject(reportSubject(doc.Bank), true)
	f.SetMargins(marginL, marginTop, marginR)
	f.SetCellMargin(0) // text sits where it is placed; tables pad themselves
	f.SetAutoPageBreak(true, marginBot)
	p := &pdfw{f: f, doc: doc, k: f.GetConversionRatio(), units: fd.units}
	f.SetHeaderFuncMode(p.header, false)
	f.SetFooterFunc(p.footer)
	return p
}

func reportSubject(b *stress.Bank) string {
	if b == nil {
		return ""
	}
	var files []string
	for _, s := range b.Sections {
		files = append(files, Headline(s.File))
	}
	return "stress audit of " + strings.Join(files, ", ")
}

// printedDate is the report's date as people read it.
func (p *pdfw) printedDate() string {
	if p.doc.Date.IsZero() {
		return "date not set"
	}
	return p.doc.Date.UTC().Format("2006-01-02")
}

func (p *pdfw) header() {
	// gofpdf sets the page's font again after the header and the footer
	defer func() { p.cur.ok = false }()
	f := p.f
	p.draw(colRule)
	f.SetLineWidth(0.2)
	f.Line(marginL, 14, pageW-marginR, 14)
	if f.PageNo() > 1 { // page 1 carries the title itself
		p.font("", 7.5)
		p.text(colMuted)
		p.cellAt(marginL, 9, bodyW/2, 4, "RF stress report", "L")
		right := reportSubject(p.doc.Bank)
		if p.doc.Subject != "" {
			right = p.doc.Subject
		} else if len(p.doc.Bank.Sections) > 2 {
			right = fmt.Sprintf("stress audit of %d netlists", len(p.doc.Bank.Sections))
		}
		p.cellAt(marginL+bodyW/2, 9, bodyW/2, 4, p.fit(right, bodyW/2), "R")
	}
	f.SetXY(marginL, marginTop)
}

func (p *pdfw) footer() {
	defer func() { p.cur.ok = false }()
	f := p.f
	p.draw(colRule)
	f.SetLineWidth(0.2)
	f.Line(marginL, pageH-13, pageW-marginR, pageH-13)
	p.font("", 7.5)
	p.text(colMuted)
	// the page total is filled in at the end: left-aligned, so its
	// placeholder's width never shifts anything
	p.cellAt(marginL, pageH-12, 40, 4, fmt.Sprintf("page %d of %s", f.PageNo(), pageTotal), "L")
	p.cellAt(marginL+40, pageH-12, bodyW-80, 4, p.doc.Tool, "C")
	p.cellAt(pageW-marginR-40, pageH-12, 40, 4, p.printedDate(), "R")
}

// --- drawing helpers ---

// clean makes text safe for gofpdf: its width tables and font subsets
// cover the Basic Multilingual Plane only (a rune beyond it would index
// past the table), and control characters have no glyph.
func clean(s string) string {
	ok := true
	for _, r := range s {
		if r >= 0x20 && r < 0x7F {
			continue // printable ASCII: nothing to escape, in every font
		}
		if r > 0xFFFF || r == utf8.RuneError || (r < 0x20 && r != '\n') || (r >= 0x7F && r < 0xA0) || circuits.Escape(string(r)) != string(r) {
			ok = false
			break
		}
	}
	if ok {
		return s
	}
	// control characters (C0, C1, bidi) become visible escapes, as in
	// the text output; the fonts have no glyphs above the BMP
	lines := strings.Split(s, "\n")
	for i, l := range lines {
		var b strings.Builder
		for _, r := range circuits.Escape(l) {
			if r > 0xFFFF {
				r = '\uFFFD'
			}
			b.WriteRune(r)
		}
		lines[i] = b.String()
	}
	return strings.Join(lines, "\n")
}

// cell writes one line of text in a box w wide; ln as in CellFormat.
func (p *pdfw) cell(w, h float64, s string, ln int, align string) {
	p.textFill()
	p.f.CellFormat(w, h, clean(s), "", ln, align, false, 0, "")
}

// textFill makes the fill colour the text colour before text is drawn.
// PDF paints text in the fill colour; while the two differ gofpdf wraps
// every text in q … Q with the text colour, an operator and a formatted
// colour per cell, where one colour change serves a whole run of cells.
// Not to be called inside a saved state (q … Q): gofpdf would take the
// colour as current after the Q.
func (p *pdfw) textFill() {
	tr, tg, tb := p.f.GetTextColor()
	if fr, fg, fb := p.f.GetFillColor(); fr != tr || fg != tg || fb != tb {
		p.f.SetFillColor(tr, tg, tb)
	}
}

// cellAt is cell at (x, y).
func (p *pdfw) cellAt(x, y, w, h float64, s, align string) {
	p.f.SetXY(x, y)
	p.cell(w, h, s, 0, align)
}

// multi writes wrapped text from the current position.
func (p *pdfw) multi(w, h float64, s string) {
	p.textFill()
	p.f.MultiCell(w, h, clean(s), "", "L", false)
}

// split wraps text to lines w wide in the current font.
func (p *pdfw) split(s string, w float64) []string {
	s = clean(s)
	if !strings.ContainsAny(s, " \n") && p.f.GetStringWidth(s) > w {
		return p.splitPath(s, w)
	}
	if p.oneLine(s, w) {
		return []string{s}
	}
	return p.f.SplitText(s, w)
}

// oneLine reports whether SplitText would return s whole: most table
// cells fit, and SplitText allocates runes and lines to say so. Its test
// is the sum of the glyphs' widths against the width in glyph units,
// rounded up; for printable ASCII, which every font has with ordinary
// widths, GetStringSymbolWidth is that same sum.
func (p *pdfw) oneLine(s string, w float64) bool {
	if s == "" || !printableASCII(s) {
		return false
	}
	_, size := p.f.GetFontSize()
	return p.f.GetStringSymbolWidth(s) <= int(math.Ceil(w*1000/size))
}

// splitPath breaks a word with no spaces, such as a file path, after a
// '/', '-', '_' or '.' (not before a short extension) where one falls on
// the line, so that
// "testdata/station/lpf-20m.net" wraps as "testdata/station/" and
// "lpf-20m.net" rather than inside "20m"; a stretch with no such mark is
// broken where the line ends.
func (p *pdfw) splitPath(s string, w float64) []string {
	var out []string
	rs := []rune(s)
	for len(rs) > 0 {
		n, brk := 0, 0
		for n < len(rs) && p.f.GetStringWidth(string(rs[:n+1])) <= w {
			n++
			if strings.ContainsRune("/-_", rs[n-1]) || rs[n-1] == '.' && len(rs)-n > 4 {
				brk = n
			}
		}
		switch {
		case n == len(rs):
			brk = n
		case n == 0:
			brk = 1 // a glyph wider than the line: one per line
		case brk == 0:
			brk = n
		}
		out = append(out, string(rs[:brk]))
		rs = rs[brk:]
	}
	return out
}

// width is the width of s in the current font.
func (p *pdfw) width(s string) float64 { return p.f.GetStringWidth(clean(s)) }

func (p *pdfw) font(style string, size float64) { p.setFont(fontSans, style, size) }
func (p *pdfw) mono(size float64)               { p.setFont(fontCode, "", size) }

// setFont sets a font unless it is the current one: gofpdf writes a font
// operator on every call, and tables set the same font cell after cell.
func (p *pdfw) setFont(family, style string, size float64) {
	want := fontState{family, style, size, true}
	if p.cur == want {
		return
	}
	p.f.SetFont(family, style, size)
	p.cur = want
}

// text, fill and draw set a colour unless it is already the current one:
// gofpdf formats the colour operator on every call, and tables set the
// same colour cell after cell.
func (p *pdfw) text(c rgb) {
	if r, g, b := p.f.GetTextColor(); r != c.r || g != c.g || b != c.b {
		p.f.SetTextColor(c.r, c.g, c.b)
	}
}

func (p *pdfw) fill(c rgb) {
	if r, g, b := p.f.GetFillColor(); r != c.r || g != c.g || b != c.b {
		p.f.SetFillColor(c.r, c.g, c.b)
	}
}

func (p *pdfw) draw(c rgb) {
	if r, g, b := p.f.GetDrawColor(); r != c.r || g != c.g || b != c.b {
		p.f.SetDrawColor(c.r, c.g, c.b)
	}
}

// room starts a new page unless h mm are left above the footer.
func (p *pdfw) room(h float64) {
	if p.f.GetY()+h > pageH-marginBot {
		p.f.AddPage()
	}
}

// newPage starts a page with a heading.
func (p *pdfw) newPage(title string) {
	p.f.AddPage()
	p.heading(title)
}

// heading is a page or section title with a rule under it.
func (p *pdfw) heading(title string) {
	f := p.f
	p.room(18)
	p.font("B", 15)
	p.text(colAccent)
	f.SetX(marginL)
	p.multi(bodyW, 7, title)
	y := f.GetY() + 0.8
	p.draw(colAccent)
	f.SetLineWidth(0.6)
	f.Line(marginL, y, marginL+28, y)
	f.SetLineWidth(0.2)
	p.draw(colRule)
	f.Line(marginL+28, y, pageW-marginR, y)
	f.SetY(y + 3)
	p.text(colInk)
}

// sub is a smaller heading inside a page, kept on one page with the
// first keep mm of what follows it.
func (p *pdfw) sub(title string, keep float64) {
	p.room(9 + keep)
	p.f.Ln(1.5)
	p.font("B", 10.5)
	p.text(colAccent)
	p.f.SetX(marginL)
	p.multi(bodyW, 5.2, title)
	p.f.Ln(0.8)
	p.text(colInk)
}

// para writes wrapped text across the body.
func (p *pdfw) para(size float64, s string) {
	p.font("", size)
	p.f.SetX(marginL)
	p.multi(bodyW, size*0.46, s)
}

// paraHeight is the height para would take.
func (p *pdfw) paraHeight(size float64, s string) float64 {
	p.font("", size)
	return float64(len(p.split(s, bodyW))) * size * 0.46
}

// bullet writes one wrapped item with a small square mark.
func (p *pdfw) bullet(size float64, s string) {
	f := p.f
	lh := size * 0.46
	p.font("", size)
	lines := p.split(s, bodyW-5)
	p.room(lh * float64(len(lines)))
	y := f.GetY()
	p.fill(colAccent)
	f.Rect(marginL+1, y+lh/2-0.6, 1.2, 1.2, "F")
	f.SetX(marginL + 5)
	p.multi(bodyW-5, lh, s)
}

// fit shortens s with an ellipsis until it fits w mm in the current font.
func (p *pdfw) fit(s string, w float64) string {
	s = clean(s)
	if p.width(s) <= w {
		return s
	}
	r := []rune(s)
	for len(r) > 1 {
		r = r[:len(r)-1]
		if t := string(r) + "…"; p.width(t) <= w {
			return t
		}
	}
	return "…"
}

// pill draws a verdict tag: the word in white on the verdict's colour.
func (p *pdfw) pill(x, y, h float64, v ratings.Verdict) float64 {
	word := strings.ToUpper(v.String())
	p.font("B", h*2.1)
	w := p.width(word) + h*0.9
	p.fill(verdictColor(v))
	p.roundedFill(x, y, w, h, h*0.3)
	p.text(colWhite)
	p.cellAt(x, y, w, h, word, "C")
	p.text(colInk)
	return w
}

// roundedFill fills a rectangle with rounded corners of radius r in the
// fill colour: gofpdf's RoundedRect draws the same outline but opens a
// graphics state (q) it never closes, one more level per tag on a page.
func (p *pdfw) roundedFill(x, y, w, h, r float64) {
	f := p.f
	c := r * (4.0 / 3.0) * (math.Sqrt2 - 1.0) // a quarter circle's Bézier handle
	f.MoveTo(x+r, y)
	f.LineTo(x+w-r, y)
	f.CurveBezierCubicTo(x+w-r+c, y, x+w, y+r-c, x+w, y+r)
	f.LineTo(x+w, y+h-r)
	f.CurveBezierCubicTo(x+w, y+h-r+c, x+w-r+c, y+h, x+w-r, y+h)
	f.LineTo(x+r, y+h)
	f.CurveBezierCubicTo(x+r-c, y+h, x, y+h-r+c, x, y+h-r)
	f.LineTo(x, y+r)
	f.CurveBezierCubicTo(x, y+r-c, x+r-c, y, x+r, y)
	f.ClosePath()
	f.DrawPath("F")
}

// pillFit draws a verdict tag no wider than maxW, shrinking its text when
// the column is narrow.
func (p *pdfw) pillFit(x, y, h float64, v ratings.Verdict, maxW float64) float64 {
	word := strings.ToUpper(v.String())
	size := h * 2.1
	p.font("B", size)
	// a text's width is its glyph units times the size (as gofpdf's
	// GetStringWidth): the size that fits is found without setting each
	// size tried, which would write a font operator for every step
	units, k := float64(p.f.GetStringSymbolWidth(word)), p.f.GetConversionRatio()
	for units*(size/k)/1000+h*0.9 > maxW && size > 4 {
		size -= 0.25
	}
	p.font("B", size)
	w := math.Min(p.width(word)+h*0.9, maxW)
	p.fill(verdictColor(v))
	p.roundedFill(x, y, w, h, h*0.3)
	p.text(colWhite)
	p.cellAt(x, y, w, h, word, "C")
	p.text(colInk)
	return w
}

// minus writes a number's sign as a typographic minus.
func minus(s string) string {
	if strings.HasPrefix(s, "-") {
		return "−" + s[1:]
	}
	return s
}

// caseText describes case i of a section; empty when the section carries
// no engine (a report built by hand).
func caseText(s *stress.Section, i int) string {
	if s.Engine == nil || i < 0 {
		return ""
	}
	return s.Case(i).Describe()
}

// finite reports whether v can be drawn.
func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
