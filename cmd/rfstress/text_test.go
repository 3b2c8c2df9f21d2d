package main

import (
	"path/filepath"
	"strings"
	"testing"
	"unicode/utf8"
)

func stationFiles(t *testing.T) []string {
	t.Helper()
	files, _ := filepath.Glob(filepath.Join("..", "..", "testdata", "station", "*.net"))
	if len(files) == 0 {
		t.Skip("example station files absent")
	}
	return files
}

// TestTextFitsColumns: with COLUMNS=80 no line of the audit text is
// wider than 80 columns (common practice: the classic terminal width),
// and nothing is lost: every part name still appears.
func TestTextFitsColumns(t *testing.T) {
	t.Setenv("COLUMNS", "80")
	files := stationFiles(t)
	_, out, _ := runCLI(t, append([]string{"audit"}, files...)...)
	for i, l := range strings.Split(out, "\n") {
		if n := utf8.RuneCountInString(l); n > 80 {
			t.Errorf("line %d is %d columns: %q", i+1, n, l)
		}
	}
	for _, want := range []string{"C12", "L2", "binding quantity and case", "peak voltage: "} {
		if !strings.Contains(out, want) {
			t.Errorf("80-column text lacks %q", want)
		}
	}
}

// TestTextFullWidthOffTerminal: a pipe (here a buffer) with no COLUMNS
// gets full lines: the case column stays on the part's own line.
func TestTextFullWidthOffTerminal(t *testing.T) {
	t.Setenv("COLUMNS", "")
	f := writeFile(t, "v.net", verdictNet)
	_, out, _ := runCLI(t, "audit", f)
	for _, l := range strings.Split(out, "\n") {
		if strings.HasPrefix(l, "  C3  ") && strings.Contains(l, "pF") && !strings.Contains(l, "1 MHz") {
			t.Errorf("case column not on the part's line off a terminal: %q", l)
		}
	}
}

// TestBankHeadlineListsEachFile: the headline names each file's safe
// power, not only the limiting file's.
func TestBankHeadlineListsEachFile(t *testing.T) {
	t.Setenv("COLUMNS", "")
	files := stationFiles(t)
	_, out, _ := runCLI(t, append([]string{"audit"}, files...)...)
	tail := out[strings.LastIndex(out, "OVERALL"):]
	for _, f := range files {
		if strings.Count(tail, f) < 1 {
			t.Errorf("headline lacks %s", f)
		}
	}
	if !strings.Contains(tail, "each file:") {
		t.Error("headline lacks the per-file list")
	}
}

// TestAverageColumnsSaySo: RMS current, dissipation and temperature are
// taken at average power; the table heading says so.
func TestAverageColumnsSaySo(t *testing.T) {
	t.Setenv("COLUMNS", "")
	f := writeFile(t, "v.net", verdictNet)
	_, out, _ := runCLI(t, "audit", f)
	lines := strings.Split(out, "\n")
	for i, l := range lines {
		if strings.Contains(l, "RMS I") && strings.Contains(l, "dissip.") {
			sub := lines[i+1]
			if strings.Count(sub, "avg") != 3 {
				t.Errorf("sub-heading %q does not mark the three average columns", sub)
			}
			return
		}
	}
	t.Error("no part table heading")
}

func TestJSONAndCSVBothToStdout(t *testing.T) {
	f := writeFile(t, "v.net", verdictNet)
	code, out, errs := runCLI(t, "audit", f, "--json", "-", "--csv", "-")
	if code != 2 || out != "" || !strings.Contains(errs, "stdout") {
		t.Errorf("exit %d, stdout %q, stderr %q; want a usage error before any output", code, out, errs)
	}
}
