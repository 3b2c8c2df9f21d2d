package main

import (
	"bytes"
	"os"
	"path/filepath"
	"runtime/debug"
	"testing"
)

// TestBankWorkersSameBytes: the files of a bank are audited, and their
// report data gathered, on parallel workers; the outputs must not depend
// on how many (the project's rule: same inputs, same bytes). The bank is
// the example station, which has select positions and part faults too;
// the PDF's date comes from SOURCE_DATE_EPOCH.
func TestBankWorkersSameBytes(t *testing.T) {
	files, err := filepath.Glob("../../testdata/station/*.net")
	if err != nil || len(files) < 2 {
		t.Skip("no example station")
	}
	t.Setenv("SOURCE_DATE_EPOCH", "1700000000")
	dir := t.TempDir()
	outputs := func(workers string) (pdf, js, text []byte) {
		p, j := filepath.Join(dir, "w"+workers+".pdf"), filepath.Join(dir, "w"+workers+".json")
		args := append([]string{"audit", "--workers", workers, "--report", p, "--json", j}, files...)
		code, _, errs := runCLI(t, args...)
		if code > 1 {
			t.Fatalf("--workers %s: exit %d: %s", workers, code, errs)
		}
		args = append([]string{"audit", "--workers", workers}, files...)
		_, out, _ := runCLI(t, args...)
		pdf, _ = os.ReadFile(p)
		js, _ = os.ReadFile(j)
		return pdf, js, []byte(out)
	}
	p1, j1, t1 := outputs("1")
	if len(p1) == 0 || len(j1) == 0 || len(t1) == 0 {
		t.Fatal("an output is empty")
	}
	for _, w := range []string{"1", "4", "0", "4"} {
		p, j, tx := outputs(w)
		if !bytes.Equal(p, p1) {
			t.Errorf("--workers %s: the PDF differs from --workers 1", w)
		}
		if !bytes.Equal(j, j1) {
			t.Errorf("--workers %s: the JSON differs from --workers 1", w)
		}
		if !bytes.Equal(tx, t1) {
			t.Errorf("--workers %s: the text differs from --workers 1", w)
		}
	}
}

// TestReportGCRestores: the collector setting the report raises is put
// back afterwards, and a GOGC that already collects less (or not at all)
// is left alone.
func TestReportGCRestores(t *testing.T) {
	defer debug.SetGCPercent(debug.SetGCPercent(100))
	for _, start := range []int{100, 800, -1} {
		debug.SetGCPercent(start)
		restore := reportGC()
		during := debug.SetGCPercent(-1)
		debug.SetGCPercent(during)
		restore()
		after := debug.SetGCPercent(start)
		want := reportGCPercent
		if start < 0 || start > reportGCPercent {
			want = start
		}
		if during != want || after != start {
			t.Errorf("GOGC %d: %d while the report is drawn (want %d), %d after (want %d)", start, during, want, after, start)
		}
	}
}
