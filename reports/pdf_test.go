package reports

import (
	"bytes"
	"fmt"
	"image"
	"image/png"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"sort"
	"strings"
	"testing"
	"time"

	"rfstress/circuits"
	"rfstress/ratings"
	"rfstress/stress"
)

// inlineNet stands in when the example station files are absent: a small
// 5-pole lowpass with ratings, a cored inductor and an unrated capacitor.
const inlineNet = `# inline test lowpass
title  Test lowpass 40 m
port in  a z=50
port out c z=50
core T1 od=20mm id=11mm h=6mm material=iron mu=10
capacitor C1 a gnd 470p dielectric=mica q=1500 vpk=500
inductor  L2 a b 1.2u q=150 core=T1 turns=13 wire=0.8mm
capacitor C3 b gnd 820p dielectric=mica q=1500 vpk=300
inductor  L4 b c 1.2u q=150 core=T1 turns=13 wire=0.8mm
capacitor C5 c gnd 470p dielectric=mica q=1500
audit power=100 band=7M:7.3M swr=2.5 faults=open harmonics=push-pull
`

// testDate stands for SOURCE_DATE_EPOCH=1700000000.
var testDate = time.Unix(1700000000, 0).UTC()

type netSrc struct {
	name string
	src  []byte
}

func demoSources(t *testing.T) []netSrc {
	t.Helper()
	files, _ := filepath.Glob(filepath.Join("..", "testdata", "station", "*.net"))
	sort.Strings(files)
	var out []netSrc
	for _, f := range files {
		b, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		out = append(out, netSrc{filepath.Base(f), b})
	}
	if len(out) == 0 {
		out = append(out, netSrc{"inline-40m.net", []byte(inlineNet)})
	}
	return out
}

// demoDoc runs the real pipeline over the example files, with a small
// tolerance run, the way the audit command builds its report.
func demoDoc(t *testing.T, srcs []netSrc, trials int) *ReportDoc {
	t.Helper()
	doc := &ReportDoc{Tool: "rfstress test", Date: testDate, CautionV: 300}
	var secs []*stress.Section
	for _, ns := range srcs {
		nl, err := circuits.Parse(ns.name, ns.src)
		if err != nil {
			t.Fatalf("%s: %v", ns.name, err)
		}
		// the station's measured files sit beside its netlists
		if err := circuits.LoadMeasured(nl, func(p string) ([]byte, error) {
			return os.ReadFile(filepath.Join("..", "testdata", "station", filepath.Base(p)))
		}); err != nil {
			t.Fatalf("%s: %v", ns.name, err)
		}
		c, err := circuits.Build(nl)
		if err != nil {
			t.Fatalf("%s: %v", ns.name, err)
		}
		cond := stress.Defaults()
		if err := cond.Apply(stress.FileSettings(nl)); err != nil {
			t.Fatalf("%s: %v", ns.name, err)
		}
		prof, err := ratings.LoadProfile(cond.Derate, os.ReadFile)
		if err != nil {
			t.Fatal(err)
		}
		rs, err := ratings.Prepare(nl, ratings.Builtin(), prof)
		if err != nil {
			t.Fatalf("%s: %v", ns.name, err)
		}
		ss, engs, err := stress.AuditNetlist(c, rs, cond, false)
		if err != nil {
			t.Fatalf("%s: %v", ns.name, err)
		}
		for i, sec := range ss {
			eng := engs[i]
			if trials > 0 {
				tol, err := eng.Tolerance(stress.TolOptions{Trials: trials, Seed: 7, Dist: "normal", Workers: 2})
				if err != nil {
					t.Fatal(err)
				}
				sec.Tolerance = tol
			}
			sec.Harmonics = eng.HarmonicLines()
			secs = append(secs, sec)
			use, err := eng.BandUse(11)
			if err != nil {
				t.Fatal(err)
			}
			doc.Filters = append(doc.Filters, FilterPlot{Sweep: eng.Sweep(200), BandLo: eng.Cond.BandLo, BandHi: eng.Cond.BandHi,
				Harmonics: sec.Harmonics, Extra: eng.Cond.CarrierAlso, Use: use, Loads: eng.LoadSet(), R0: real(eng.C.Zin)})
		}
	}
	doc.Bank = stress.NewBank(secs)
	return doc
}

func render(t *testing.T, doc *ReportDoc) []byte {
	t.Helper()
	var buf bytes.Buffer
	if err := WritePDF(&buf, doc); err != nil {
		t.Fatal(err)
	}
	if !bytes.HasPrefix(buf.Bytes(), []byte("%PDF-")) {
		t.Fatal("output is not a PDF")
	}
	return buf.Bytes()
}

func writeTemp(t *testing.T, b []byte) string {
	t.Helper()
	path := filepath.Join(t.TempDir(), "report.pdf")
	if err := os.WriteFile(path, b, 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

func need(t *testing.T, tool string) {
	t.Helper()
	if _, err := exec.LookPath(tool); err != nil {
		t.Skipf("%s not installed (poppler-utils)", tool)
	}
}

func pdfText(t *testing.T, pdf []byte) string {
	t.Helper()
	need(t, "pdftotext")
	out, err := exec.Command("pdftotext", "-enc", "UTF-8", writeTemp(t, pdf), "-").Output()
	if err != nil {
		t.Fatalf("pdftotext: %v", err)
	}
	return string(out)
}

func TestPDFTextContent(t *testing.T) {
	doc := demoDoc(t, demoSources(t), 40)
	txt := pdfText(t, render(t, doc))
	want := []string{
		"RF stress report", "OVERALL VERDICT", "Maximum safe power", "CAUTION",
		"kilovolts", "Never touch", "SAFETY.md", "Margin chart", "Method and assumptions",
		"IEC 60205", "Matthaei", "Kurokawa", "Ho, A. E. Ruehli", "SOURCE_DATE_EPOCH",
		"Ω", "µH", "°C", "Γ∠", "−S21", "2023-11-14", "rfstress test",
	}
	for _, s := range doc.Bank.Sections {
		want = append(want, s.File, s.SHA256[:16])
		for _, p := range s.Parts {
			want = append(want, p.Name)
		}
	}
	norm := strings.Join(strings.Fields(txt), " ")
	for _, w := range want {
		if !strings.Contains(txt, w) && !strings.Contains(norm, w) {
			t.Errorf("report text lacks %q", w)
		}
	}
	// the caution must be on page 1
	page1 := strings.SplitN(txt, "\f", 2)[0]
	for _, w := range []string{"CAUTION", "kilovolts", "SAFETY.md"} {
		if !strings.Contains(page1, w) {
			t.Errorf("page 1 lacks the caution's %q", w)
		}
	}
	for _, bad := range []string{"NaN", "+Inf", "-Inf", "%!"} {
		if strings.Contains(txt, bad) {
			t.Errorf("report text contains %q", bad)
		}
	}
	// the page total is filled in everywhere (pdftotext ends each page
	// with a form feed)
	if strings.Contains(txt, "{nb}") {
		t.Error("page total placeholder left in the text")
	}
	pages := strings.Count(txt, "\f")
	if w := fmt.Sprintf("page %d of %d", pages, pages); !strings.Contains(txt, w) {
		t.Errorf("footer lacks %q", w)
	}
}

func TestPDFFirstPageNotBlank(t *testing.T) {
	need(t, "pdftoppm")
	pdf := render(t, demoDoc(t, demoSources(t), 0))
	dir := t.TempDir()
	in := filepath.Join(dir, "r.pdf")
	if err := os.WriteFile(in, pdf, 0o644); err != nil {
		t.Fatal(err)
	}
	if out, err := exec.Command("pdftoppm", "-r", "40", "-png", "-f", "1", "-l", "1", in, filepath.Join(dir, "p")).CombinedOutput(); err != nil {
		t.Fatalf("pdftoppm: %v %s", err, out)
	}
	pngs, _ := filepath.Glob(filepath.Join(dir, "p*.png"))
	if len(pngs) != 1 {
		t.Fatalf("want one page image, got %v", pngs)
	}
	fh, err := os.Open(pngs[0])
	if err != nil {
		t.Fatal(err)
	}
	defer fh.Close()
	img, err := png.Decode(fh)
	if err != nil {
		t.Fatal(err)
	}
	if share := inked(img); share < 0.01 {
		t.Errorf("page 1 is nearly blank: %.2f %% non-white", 100*share)
	}
}

// inked is the share of pixels that are not near white.
func inked(img image.Image) float64 {
	b := img.Bounds()
	var n, all int
	for y := b.Min.Y; y < b.Max.Y; y++ {
		for x := b.Min.X; x < b.Max.X; x++ {
			r, g, bl, _ := img.At(x, y).RGBA()
			all++
			if r < 0xF000 || g < 0xF000 || bl < 0xF000 {
				n++
			}
		}
	}
	return float64(n) / float64(all)
}

func TestPDFDeterministic(t *testing.T) {
	srcs := demoSources(t)
	a := render(t, demoDoc(t, srcs, 30))
	b := render(t, demoDoc(t, srcs, 30)) // a fresh pipeline run, not only a fresh render
	if !bytes.Equal(a, b) {
		t.Fatalf("two reports of the same inputs differ (%d and %d bytes)", len(a), len(b))
	}
	for i := 0; i < 3; i++ {
		if c := render(t, demoDoc(t, srcs, 30)); !bytes.Equal(a, c) {
			t.Fatal("report bytes vary between runs")
		}
	}
	if !bytes.Contains(a, []byte("D:20231114221320")) {
		t.Error("creation date is not the document date")
	}
	// another date gives another file
	doc := demoDoc(t, srcs, 0)
	doc.Date = testDate.Add(24 * time.Hour)
	if bytes.Equal(a, render(t, doc)) {
		t.Error("date does not reach the output")
	}
}

// TestPDFHandBuilt draws a bank made by hand, without an engine: unlimited
// safe power, a broken utilisation, an unrated stress and an empty sweep
// must all render without NaN, Inf or a panic.
func TestPDFHandBuilt(t *testing.T) {
	lim := ratings.Limit{Quantity: ratings.Vpk, Abs: 500, Derated: 300, Factor: 0.6, Basis: "vpk=500 in netlist"}
	parts := []*stress.PartResult{
		{Name: "C1", Kind: circuits.Capacitor, Value: 1e-9, Verdict: ratings.Fail, Util: math.NaN(), SafeW: math.Inf(1),
			Stress: map[ratings.Quantity]*stress.Stress{
				ratings.Vpk:  {Quantity: ratings.Vpk, Value: 2000, Util: 6.7, Limit: lim, Verdict: ratings.Fail, Buy: 4000, BuyText: "rated ≥ 4 kV peak"},
				ratings.Irms: {Quantity: ratings.Irms, Value: math.NaN(), Util: math.NaN(), Limit: ratings.Limit{Quantity: ratings.Irms, Basis: "not rated: no irms= in netlist"}, Verdict: ratings.Fail},
			}},
		{Name: "R9", Kind: circuits.Resistor, Value: 50, Verdict: ratings.Unrated, SafeW: math.Inf(1),
			Stress: map[ratings.Quantity]*stress.Stress{
				ratings.Pdiss: {Quantity: ratings.Pdiss, Value: 3, Limit: ratings.Limit{Quantity: ratings.Pdiss, Basis: "not rated: no pmax= in netlist"}, Verdict: ratings.Unrated, Buy: 7, BuyText: "rated ≥ 7 W"},
			}},
	}
	sec := &stress.Section{File: "hand.net", Title: "hand made \U0001F4FB", SHA256: strings.Repeat("ab", 32), Parts: parts,
		Verdict: ratings.Fail, SafeW: math.Inf(1), MaxNodeVpk: 2000, MaxNodeAt: "n1",
		Netlist:    &circuits.Netlist{Source: []byte("title hand made \U0001F4FB\x1b\n\tcapacitor C1 n1 gnd 1n vpk=500\n" + strings.Repeat("x", 300) + "\n")},
		Conditions: stress.Defaults()}
	sec.Conditions.BandLo, sec.Conditions.BandHi = 7e6, 7.3e6
	doc := &ReportDoc{Tool: "rfstress test", Date: testDate, Bank: stress.NewBank([]*stress.Section{sec}), CautionV: 300,
		Filters: []FilterPlot{{Sweep: []stress.SweepPoint{{F: 1e6, S21dB: math.Inf(-1), S11dB: math.NaN()}, {F: 3e7, S21dB: -200, S11dB: 0}},
			BandLo: 7e6, BandHi: 7.3e6, Harmonics: []stress.HarmonicLine{{N: 2, F: 14.3e6, LevelDBc: math.Inf(-1), S21dB: math.NaN()}, {N: 3, F: 21.4e6, LevelDBc: -12, S21dB: -150}}}}}
	pdf := render(t, doc)
	txt := pdfText(t, pdf)
	for _, w := range []string{"hand.net", "C1", "R9", "not limited by any rating", "2.00 kV peak at node n1", "4 kV"} {
		if !strings.Contains(strings.Join(strings.Fields(txt), " "), w) {
			t.Errorf("text lacks %q", w)
		}
	}
	for _, bad := range []string{"NaN", "Inf"} {
		if strings.Contains(txt, bad) {
			t.Errorf("text contains %q", bad)
		}
	}
}

func TestPDFRefusesEmpty(t *testing.T) {
	if err := WritePDF(&bytes.Buffer{}, &ReportDoc{}); err == nil {
		t.Error("no error for a report without a bank")
	}
}

// TestPDFWriteDemo writes the example report for looking at:
// RFSTRESS_DEMO_PDF=/tmp/demo.pdf go test ./reports -run WriteDemo
func TestPDFWriteDemo(t *testing.T) {
	out := os.Getenv("RFSTRESS_DEMO_PDF")
	if out == "" {
		t.Skip("set RFSTRESS_DEMO_PDF to write the example report")
	}
	if err := os.WriteFile(out, render(t, demoDoc(t, demoSources(t), 200)), 0o644); err != nil {
		t.Fatal(err)
	}
}
