package reports

import (
	"bytes"
	"encoding/xml"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"rfstress/circuits"
	"rfstress/stress"
)

// bboxWord is one word as pdftotext -bbox reports it (points, y down).
type bboxWord struct {
	page                   int
	text                   string
	xMin, yMin, xMax, yMax float64
}

// bboxWords runs pdftotext -bbox over a PDF and returns its words.
func bboxWords(t *testing.T, pdf []byte) []bboxWord {
	t.Helper()
	need(t, "pdftotext")
	out, err := exec.Command("pdftotext", "-bbox", "-enc", "UTF-8", writeTemp(t, pdf), "-").Output()
	if err != nil {
		t.Fatalf("pdftotext -bbox: %v", err)
	}
	dec := xml.NewDecoder(bytes.NewReader(out))
	dec.Strict = false
	dec.AutoClose = xml.HTMLAutoClose
	dec.Entity = xml.HTMLEntity
	var words []bboxWord
	page := 0
	var cur *bboxWord
	for {
		tok, err := dec.Token()
		if err != nil {
			break
		}
		switch e := tok.(type) {
		case xml.StartElement:
			switch e.Name.Local {
			case "page":
				page++
			case "word":
				w := bboxWord{page: page}
				for _, a := range e.Attr {
					v, _ := strconv.ParseFloat(a.Value, 64)
					switch a.Name.Local {
					case "xMin":
						w.xMin = v
					case "yMin":
						w.yMin = v
					case "xMax":
						w.xMax = v
					case "yMax":
						w.yMax = v
					}
				}
				cur = &w
			}
		case xml.CharData:
			if cur != nil {
				cur.text += string(e)
			}
		case xml.EndElement:
			if e.Name.Local == "word" && cur != nil {
				words = append(words, *cur)
				cur = nil
			}
		}
	}
	return words
}

// overlaps lists pairs of words on one page whose boxes overlap by more
// than slack points both ways. Words of the same line touch at their ends
// by design, so a small slack absorbs rounding in the font metrics.
func overlaps(words []bboxWord, slack float64) []string {
	var out []string
	for i := range words {
		a := words[i]
		for j := i + 1; j < len(words); j++ {
			b := words[j]
			if a.page != b.page {
				continue
			}
			ox := minf(a.xMax, b.xMax) - maxf(a.xMin, b.xMin)
			oy := minf(a.yMax, b.yMax) - maxf(a.yMin, b.yMin)
			if ox > slack && oy > slack {
				out = append(out, a.text+" / "+b.text)
			}
		}
	}
	return out
}

func minf(a, b float64) float64 {
	if a < b {
		return a
	}
	return b
}

func maxf(a, b float64) float64 {
	if a > b {
		return a
	}
	return b
}

// schematicPDF renders only the schematics of a bank, one page each.
func schematicPDF(t *testing.T, doc *ReportDoc) []byte {
	t.Helper()
	p := newPDF(doc, true)
	for _, s := range doc.Bank.Sections {
		p.f.AddPage()
		p.schematic(s)
	}
	var buf bytes.Buffer
	if err := p.f.Output(&buf); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

// extraNets are topologies beyond the plain ladder: traps (a branch to
// ground and a parallel pair in series), a coupled transformer and a
// ladder with coupled coils.
var extraNets = []netSrc{
	{"traps.net", []byte(`title traps
port in  in1 z=50
port out out1 z=50
capacitor C1  in1 gnd 390p vpk=500
inductor  L1  in1 a   1.2u q=160
inductor  Lt2 a   t2  0.47u q=150
capacitor Ct2 t2  gnd 270p vpk=500
inductor  Lt3 a   b   0.39u q=150
capacitor Ct3 a   b   143p vpk=500
capacitor C2  b   gnd 680p vpk=500
inductor  L3  b   out1 1.2u q=160
capacitor C3  out1 gnd 390p vpk=500
audit power=100 freq=7.1M
`)},
	{"xfmr.net", []byte(`title transformer
core ring20 od=20mm id=10mm h=8mm material=iron mu=10
port in  p z=50
port out s z=12.5
inductor Lp p gnd 20u q=120 core=ring20 turns=10
inductor Ls s gnd 5u  q=120 core=ring20 turns=5
coupling K1 Lp Ls k=0.995
capacitor Cs s gnd 10p vpk=500
audit power=100 freq=7.1M
`)},
	{"coupled.net", []byte(`title coupled ladder
port in  n1 z=50
port out n4 z=50
capacitor C1 n1 gnd 270p q=800 vpk=500
inductor  L2 n1 n2  0.82u q=180
capacitor C3 n2 gnd 470p q=800 vpk=500
inductor  L4 n3 n2  0.91u q=180
capacitor C5 n3 gnd 470p esr=0.03 vpk=500
inductor  L6 n3 n4  0.82u q=180
capacitor C7 n4 gnd 270p q=800 vpk=500
resistor  Rsense n4 gnd 4.7k pmax=1
coupling K24 L2 L4 k=0.03
coupling K46 L4 L6 k=0.02
audit power=100 freq=14.1M
`)},
}

// TestSchematicLabels checks, on the rendered PDF, that every part's name
// appears exactly once on its schematic and that no two words of the
// drawing overlap.
func TestSchematicLabels(t *testing.T) {
	srcs := append(demoSources(t), extraNets...)
	// lines, a balanced feeder and a balun from the parser's examples
	for _, name := range []string{"coax_tuner.net", "balanced_feed.net"} {
		if b, err := os.ReadFile(filepath.Join("..", "circuits", "testdata", name)); err == nil {
			srcs = append(srcs, netSrc{name, append(b, []byte("\naudit freq=7.1M\n")...)})
		}
	}
	doc := demoDoc(t, srcs, 0)
	pdf := schematicPDF(t, doc)
	words := bboxWords(t, pdf)
	if len(words) < 10*len(doc.Bank.Sections) {
		t.Fatalf("pdftotext found only %d words", len(words))
	}
	for i, s := range doc.Bank.Sections {
		count := map[string]int{}
		for _, w := range words {
			if w.page == i+1 {
				count[w.text]++
			}
		}
		for _, c := range s.Netlist.Components {
			if k := circuits.SpecOf(c.Kind); k != nil && k.Observes {
				// a clearance joins nothing and is not drawn
				if count[c.Name] != 0 {
					t.Errorf("%s: clearance %s drawn on the schematic", s.File, c.Name)
				}
				continue
			}
			if count[c.Name] != 1 {
				t.Errorf("%s: part %s appears %d times on its schematic, want once", s.File, c.Name, count[c.Name])
			}
		}
		for _, k := range s.Netlist.Couplings {
			if count[k.Name] != 1 {
				t.Errorf("%s: coupling %s appears %d times, want once", s.File, k.Name, count[k.Name])
			}
		}
	}
	// 0.3 pt: far below a glyph, above the metrics' rounding
	if ov := overlaps(words, 0.3); len(ov) > 0 {
		t.Errorf("overlapping words on the schematics: %s", strings.Join(ov, "; "))
	}
}

// TestSchematicStressLabel checks the label of the binding stress against
// the audit's own figure for that part, and the colour against its verdict.
func TestSchematicStressLabel(t *testing.T) {
	doc := demoDoc(t, extraNets[:1], 0)
	s := doc.Bank.Sections[0]
	sc := LayoutSchematic(s, svgMeasure())
	labels := strings.Join(sc.Labels(), "\n")
	for _, pr := range s.Parts {
		st := bindingStress(pr)
		if st == nil {
			continue
		}
		want := FormatQ(st.Quantity, st.Value)
		if !strings.Contains(labels, want) {
			t.Errorf("%s: binding stress %s missing from the schematic", pr.Name, want)
		}
	}
	for _, sym := range sc.symbols {
		for _, pr := range s.Parts {
			if pr.Name == sym.name && sym.col != verdictColor(pr.Verdict) {
				t.Errorf("%s drawn in the wrong colour for %v", sym.name, pr.Verdict)
			}
		}
	}
	if len(sc.symbols) != len(s.Parts) {
		t.Errorf("%d symbols for %d parts", len(sc.symbols), len(s.Parts))
	}
}

// TestSchematicLadderShape checks the trade's ladder drawing: series parts
// on the top line left to right in signal order, shunt parts vertical.
func TestSchematicLadderShape(t *testing.T) {
	doc := demoDoc(t, []netSrc{{"inline-40m.net", []byte(inlineNet)}}, 0)
	sc := LayoutSchematic(doc.Bank.Sections[0], svgMeasure())
	pos := map[string]ssymbol{}
	for _, s := range sc.symbols {
		pos[s.name] = s
	}
	for _, n := range []string{"L2", "L4"} {
		if s := pos[n]; s.a.y != s.b.y {
			t.Errorf("series %s not horizontal", n)
		}
	}
	for _, n := range []string{"C1", "C3", "C5"} {
		if s := pos[n]; s.a.x != s.b.x {
			t.Errorf("shunt %s not vertical", n)
		}
	}
	if !(pos["C1"].a.x < pos["L2"].a.x && pos["L2"].a.x < pos["C3"].a.x && pos["C3"].a.x < pos["L4"].a.x && pos["L4"].a.x < pos["C5"].a.x) {
		t.Error("ladder parts not in signal order from input to output")
	}
	if pos["L2"].a.y >= pos["C1"].a.y {
		t.Error("series line not above the shunts")
	}
}

// TestSchematicSVG checks the SVG is well-formed XML and carries the labels.
func TestSchematicSVG(t *testing.T) {
	doc := demoDoc(t, extraNets, 0)
	var buf bytes.Buffer
	if err := WriteSchematicSVG(&buf, doc.Bank); err != nil {
		t.Fatal(err)
	}
	dec := xml.NewDecoder(bytes.NewReader(buf.Bytes()))
	for {
		_, err := dec.Token()
		if err != nil {
			if err.Error() != "EOF" {
				t.Fatalf("SVG is not well-formed: %v", err)
			}
			break
		}
	}
	for _, want := range []string{"Lt3 390 nH", "K1 k 0.995", "<svg", "µH"} {
		if !strings.Contains(buf.String(), want) {
			t.Errorf("SVG lacks %q", want)
		}
	}
	_ = stress.Quantities
}

// TestReportLayout renders the example station's report and checks its
// layout by the words' bounding boxes (pdftotext -bbox): no two words
// overlap on any page; every response plot labels the decades it spans
// ("10 MHz" and the like); verdict tags stay inside their column; no value
// in the margin chart is cut short.
func TestReportLayout(t *testing.T) {
	doc := demoDoc(t, demoSources(t), 30)
	words := bboxWords(t, render(t, doc))
	if len(words) < 1000 {
		t.Fatalf("pdftotext found only %d words", len(words))
	}
	if ov := overlaps(words, 0.3); len(ov) > 0 {
		t.Errorf("overlapping words: %s", strings.Join(ov, "; "))
	}
	pages := map[int][]bboxWord{}
	last := 0
	for _, w := range words {
		pages[w.page] = append(pages[w.page], w)
		last = max(last, w.page)
	}
	has := func(pg int, s string) bool {
		for _, w := range pages[pg] {
			if w.text == s {
				return true
			}
		}
		return false
	}
	// response plots: the pages with the axis title, in section order
	plot := 0
	for pg := 1; pg <= last; pg++ {
		if !has(pg, "(log") {
			continue
		}
		if plot >= len(doc.Filters) {
			break
		}
		fp := doc.Filters[plot]
		plot++
		lo, hi := fp.Sweep[0].F, fp.Sweep[len(fp.Sweep)-1].F
		for d := 1e3; d <= 1e10; d *= 10 {
			if d < lo || d > hi {
				continue
			}
			num, unit := strings.Fields(compactSI(d, "Hz"))[0], strings.Fields(compactSI(d, "Hz"))[1]
			found := false
			for i, w := range pages[pg] {
				if w.text == num && i+1 < len(pages[pg]) && pages[pg][i+1].text == unit {
					found = true
				}
			}
			if !found {
				t.Errorf("page %d: response plot lacks its %s %s axis label", pg, num, unit)
			}
		}
	}
	if plot != len(doc.Filters) {
		t.Errorf("found %d response plots, want %d", plot, len(doc.Filters))
	}
	// verdict tags inside the verdict column of "Parts to change"
	for pg := 1; pg <= last; pg++ {
		// the table's heading row: "verdict" and "rating" on one line
		var right float64
		for _, v := range pages[pg] {
			for _, w := range pages[pg] {
				if v.text == "verdict" && w.text == "rating" && math.Abs(v.yMin-w.yMin) < 0.5 && w.xMin > v.xMin && right == 0 {
					right = w.xMin
				}
			}
		}
		if !has(pg, "change") || right == 0 {
			continue
		}
		for _, w := range pages[pg] {
			if (w.text == "MARGINAL" || w.text == "UNRATED") && w.xMax > right {
				t.Errorf("page %d: %s tag runs into the next column (%.1f > %.1f pt)", pg, w.text, w.xMax, right)
			}
		}
	}
	// the margin chart's values are never cut short
	for pg := 1; pg <= last; pg++ {
		if !has(pg, "worst") || !has(pg, "limit") {
			continue
		}
		for _, w := range pages[pg] {
			if strings.HasSuffix(w.text, "…") && strings.Contains(w.text, "/") {
				t.Errorf("page %d: value cut short: %q", pg, w.text)
			}
		}
	}
}

// TestSchematicAnyTopology lays out random small networks (parallel parts,
// bridges, parts between one node and itself, islands joined only through
// ground, coupled coils anywhere): the layout never panics, every part gets
// a symbol, and every coordinate is finite.
func TestSchematicAnyTopology(t *testing.T) {
	rng := rand.New(rand.NewPCG(15, 1))
	nodes := []string{"a", "b", "c", "d", "e", "gnd"}
	kinds := []string{"capacitor", "inductor", "resistor"}
	vals := []string{"100p", "1u", "50"}
	measure := svgMeasure()
	drawn := 0
	for trial := 0; trial < 600; trial++ {
		var b strings.Builder
		b.WriteString("port in a z=50\nport out " + nodes[1+rng.IntN(4)] + " z=50\n")
		n := 1 + rng.IntN(8)
		var coils []string
		for i := 0; i < n; i++ {
			k := rng.IntN(3)
			x, y := nodes[rng.IntN(6)], nodes[rng.IntN(6)]
			if x == y {
				y = "a"
			}
			if x == y {
				x = "gnd"
			}
			name := fmt.Sprintf("%c%d", strings.ToUpper(kinds[k])[0], i)
			fmt.Fprintf(&b, "%s %s %s %s %s\n", kinds[k], name, x, y, vals[k])
			if k == 1 {
				coils = append(coils, name)
			}
		}
		if len(coils) >= 2 {
			fmt.Fprintf(&b, "coupling K1 %s %s k=0.5\n", coils[0], coils[1])
		}
		nl, err := circuits.Parse("r.net", []byte(b.String()))
		if err != nil {
			continue // the parser refuses it: nothing to draw
		}
		drawn++
		sec := &stress.Section{File: "r.net", Netlist: nl}
		sc := LayoutSchematic(sec, measure)
		if len(sc.symbols) != len(nl.Components) {
			t.Errorf("%d symbols for %d parts:\n%s", len(sc.symbols), len(nl.Components), b.String())
		}
		cv := &svgCanvas{}
		drawSchematic(cv, sc)
		if strings.Contains(cv.b.String(), "NaN") || strings.Contains(cv.b.String(), "Inf") || !(sc.W > 0 && sc.H > 0) {
			t.Errorf("non-finite drawing for:\n%s", b.String())
		}
	}
	if drawn < 50 {
		t.Errorf("only %d of the random networks parsed: the test checks too little", drawn)
	}
}
