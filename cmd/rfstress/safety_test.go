package main

import (
	"bufio"
	"bytes"
	"encoding/json"
	"errors"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"

	"rfstress/stress"
)

// TestFlagAndEnvErrors: every non-finite or meaningless number in a flag,
// and a malformed SOURCE_DATE_EPOCH, is a usage error (exit 2) with one
// exact message; nothing is computed.
func TestFlagAndEnvErrors(t *testing.T) {
	f := writeFile(t, "v.net", verdictNet)
	pdf := filepath.Join(t.TempDir(), "r.pdf")
	cases := []struct {
		env  string
		args []string
		want string
	}{
		{"", []string{"audit", f, "--caution-volts", "NaN"}, "--caution-volts NaN: outside the accepted range 0 V to 100 MV"},
		{"", []string{"audit", f, "--caution-volts", "Inf"}, "--caution-volts +Inf: outside the accepted range 0 V to 100 MV"},
		{"", []string{"audit", f, "--caution-volts", "-5"}, "--caution-volts -5: outside the accepted range 0 V to 100 MV"},
		{"", []string{"audit", f, "--power", "1e308"}, "--power 1e308: power is outside the range a solve can trust (accepted range 1 mW to 10 MW)"},
		{"", []string{"audit", f, "--power", "NaN"}, `--power NaN: "NaN" is not a number (a number)`},
		{"", []string{"audit", f, "--freq", "1e308"}, "--freq 1e308: frequency is outside the range a solve can trust (accepted range 1 Hz to 100 GHz)"},
		{"", []string{"audit", f, "--load", "1e300"}, "--load 1e300: load magnitude is outside the range a solve can trust (accepted range 0 Ω to 1 GΩ)"},
		{"", []string{"solve", f, "--freq", "1e308"}, "--freq 1e308: outside the range a solve can trust (accepted range 1 Hz to 100 GHz)"},
		{"", []string{"solve", f, "--freq", "1M", "--power", "1e308"}, "--power 1e+308: outside the accepted range 1 mW to 10 MW"},
		{"", []string{"solve", f, "--freq", "1M", "--power", "NaN"}, "--power NaN: outside the accepted range 1 mW to 10 MW"},
		{"", []string{"solve", f, "--freq", "1M", "--load", "1e300"}, "--load 1e300: outside the accepted range |z| 0 Ω to 1 GΩ"},
		{"", []string{"response", f, "--to", "1e308"}, "--to 1e308: outside the range a solve can trust (accepted range 1 Hz to 100 GHz)"},
		{"abc", []string{"audit", f, "--report", pdf}, "rfstress: SOURCE_DATE_EPOCH=abc is not a whole number of seconds since 1970-01-01 UTC up to year 9999 (reproducible-builds.org); unset it or fix it"},
		{"-1", []string{"audit", f, "--report", pdf}, "rfstress: SOURCE_DATE_EPOCH=-1 is not a whole number of seconds since 1970-01-01 UTC up to year 9999 (reproducible-builds.org); unset it or fix it"},
		{"1.5e9", []string{"audit", f, "--report", pdf}, "rfstress: SOURCE_DATE_EPOCH=1.5e9 is not a whole number of seconds since 1970-01-01 UTC up to year 9999 (reproducible-builds.org); unset it or fix it"},
		{"", []string{"audit", f, "--trials", "10", "--dist", "cauchy\x1b[2J"}, `--dist cauchy\x1b[2J: expected normal or uniform`},
	}
	for _, c := range cases {
		if c.env != "" {
			t.Setenv("SOURCE_DATE_EPOCH", c.env)
		} else {
			os.Unsetenv("SOURCE_DATE_EPOCH")
		}
		code, out, errs := runCLI(t, c.args...)
		if code != 2 || errs != c.want+"\n" || out != "" {
			t.Errorf("%v: exit %d\n got: %q\nwant: %q", c.args, code, errs, c.want)
		}
	}
	if _, err := os.Stat(pdf); err == nil {
		t.Error("a report was written despite the error")
	}
}

// TestFileErrorsTogether: the errors of a file's audit lines come with its
// other errors, in line order; a profile that cannot be read is reported
// at the derate= that names it.
func TestFileErrorsTogether(t *testing.T) {
	dir := t.TempDir()
	bad := filepath.Join(dir, "b.net")
	os.WriteFile(bad, []byte(strings.Replace(verdictNet, "audit freq=1M harmonics=none power=100",
		"audit power=abc mode=xyz band=foo swr=0", 1)+"capacitor C9 a GND 1p\n"), 0o644)
	code, _, errs := runCLI(t, "audit", bad)
	want := bad + `:9:13: audit power=abc: "abc" is not a number (a number)` + "\n" +
		bad + `:9:22: audit mode=xyz: unknown mode "xyz" (one of ` + modeList() + ")\n" +
		bad + `:9:31: audit band=foo: bad band (a band lo:hi with 0 < lo ≤ hi, such as 10.1M:10.15M)` + "\n" +
		bad + `:9:39: audit swr=0: bad SWR "0" (SWR from 1 to 1000)` + "\n" +
		bad + `:10:16: node GND looks like ground but is not the ground node (ground is written gnd, in lower case; give another name to a node that is not ground)` + "\n"
	if code != 2 || errs != want {
		t.Errorf("exit %d\n got: %s\nwant: %s", code, errs, want)
	}
	prof := filepath.Join(dir, "missing.prof")
	p := writeFile(t, "p.net", verdictNet+"audit derate="+prof+"\n")
	code, _, errs = runCLI(t, "audit", p)
	want = p + ":10:14: derate=" + prof + `: derating profile "` + prof + `" is neither built in (standard, strict, none) nor a readable file: cannot read derating profile: open ` + prof + ": no such file or directory\n"
	if len(prof) > 60 {
		t.Skip("temporary path too long for the exact message")
	}
	if code != 2 || errs != want {
		t.Errorf("exit %d\n got: %s\nwant: %s", code, errs, want)
	}
}

// noTemps fails if a temporary output file is left in dir.
func noTemps(t *testing.T, dir string) {
	t.Helper()
	left, _ := filepath.Glob(filepath.Join(dir, ".rfstress-*"))
	if len(left) > 0 {
		t.Errorf("temporary files left: %v", left)
	}
}

// TestOutputsNeverHarm: outputs never land on an input however it is
// reached, never replace anything but a regular file, are all checked
// before any is written, and two outputs on one path are refused.
func TestOutputsNeverHarm(t *testing.T) {
	dir := t.TempDir()
	in := filepath.Join(dir, "in.net")
	prof := filepath.Join(dir, "shop.prof")
	mats := filepath.Join(dir, "m.txt")
	os.WriteFile(prof, []byte("base strict\n"), 0o644)
	os.WriteFile(mats, []byte("\ufeffmaterial my-iron class=iron mu=10\n"), 0o644) // BOM skipped
	src := verdictNet + "audit derate=" + prof + "\n"
	os.WriteFile(in, []byte(src), 0o644)
	link := filepath.Join(dir, "link.json")
	os.Symlink(in, link)
	hard := filepath.Join(dir, "hard.json")
	os.Link(in, hard)
	sub := filepath.Join(dir, "sub")
	os.Mkdir(sub, 0o755)
	ok := filepath.Join(dir, "ok.json")
	cases := []struct {
		args []string
		want string
	}{
		{[]string{"--json", link}, "rfstress: refusing to overwrite input file " + link + " with --json"},
		{[]string{"--csv", hard}, "rfstress: refusing to overwrite input file " + hard + " with --csv"},
		{[]string{"--json", prof}, "rfstress: refusing to overwrite input file " + prof + " with --json"},
		{[]string{"--report", mats}, "rfstress: refusing to overwrite input file " + mats + " with --report"},
		{[]string{"--json", sub}, "rfstress: --json " + sub + " is a directory (give a file name)"},
		{[]string{"--json", ok, "--csv", ok}, "rfstress: --json and --csv both write to " + ok + " (give each output its own path)"},
		{[]string{"--json", "-", "--csv", "-"}, "rfstress: --json - and --csv - cannot both write to stdout (send one of them to a file)"},
		{[]string{"--json", ok, "--csv", filepath.Join(dir, "nodir", "x.csv")}, "--csv " + filepath.Join(dir, "nodir", "x.csv") + ": directory " + filepath.Join(dir, "nodir") + " does not exist"},
	}
	if len(dir) > 40 {
		t.Skip("temporary path too long for exact messages")
	}
	for _, c := range cases {
		args := append([]string{"audit", in, "--materials", mats}, c.args...)
		code, _, errs := runCLI(t, args...)
		if code != 2 || errs != c.want+"\n" {
			t.Errorf("%v: exit %d\n got: %q\nwant: %q", c.args, code, errs, c.want)
		}
		if b, _ := os.ReadFile(in); string(b) != src {
			t.Fatalf("%v: the input was changed", c.args)
		}
		if _, err := os.Stat(ok); err == nil {
			t.Errorf("%v: %s written although the run failed", c.args, ok)
		}
	}
	if st, _ := os.Lstat(link); st.Mode()&os.ModeSymlink == 0 {
		t.Error("the symlink was replaced")
	}
	noTemps(t, dir)

	// a symlink to an ordinary output file is written through; the link stays
	target := filepath.Join(dir, "real.json")
	os.WriteFile(target, []byte("old"), 0o644)
	ol := filepath.Join(dir, "out-link.json")
	os.Symlink(target, ol)
	if code, _, errs := runCLI(t, "audit", in, "--json", ol); code == 2 {
		t.Fatalf("through a symlink: %s", errs)
	}
	if st, _ := os.Lstat(ol); st.Mode()&os.ModeSymlink == 0 {
		t.Error("the output symlink was replaced by a file")
	}
	if b, _ := os.ReadFile(target); !json.Valid(b) {
		t.Error("the symlink's target was not written")
	}
	noTemps(t, dir)
}

// TestOutputToFIFO: a FIFO (like a device) is written in place, never
// renamed over: after the run it is still a FIFO and the reader got the
// whole JSON document.
func TestOutputToFIFO(t *testing.T) {
	dir := t.TempDir()
	in := writeFile(t, "v.net", verdictNet)
	fifo := filepath.Join(dir, "pipe")
	if err := syscall.Mkfifo(fifo, 0o600); err != nil {
		t.Skip("no FIFOs here:", err)
	}
	got := make(chan []byte)
	go func() {
		f, err := os.Open(fifo)
		if err != nil {
			got <- nil
			return
		}
		b, _ := io.ReadAll(f)
		f.Close()
		got <- b
	}()
	code, _, errs := runCLI(t, "audit", in, "--json", fifo)
	if code == 2 {
		t.Fatalf("exit 2: %s", errs)
	}
	select {
	case b := <-got:
		if !json.Valid(b) {
			t.Errorf("reader got %d bytes of invalid JSON", len(b))
		}
	case <-time.After(10 * time.Second):
		t.Fatal("reader got nothing")
	}
	if st, err := os.Lstat(fifo); err != nil || st.Mode()&os.ModeNamedPipe == 0 {
		t.Error("the FIFO was replaced")
	}
	noTemps(t, dir)
}

// failWriter fails every write as a full disk does.
type failWriter struct{}

func (failWriter) Write(p []byte) (int, error) { return 0, errors.New("no space left on device") }

// TestStdoutWriteError: output that cannot be written is an error (exit 2
// with a message), not success with the text lost (as `>/dev/full`).
func TestStdoutWriteError(t *testing.T) {
	f := writeFile(t, "v.net", verdictNet)
	for _, args := range [][]string{{"audit", f}, {"audit", f, "--json", "-"}, {"solve", f, "--freq", "1M"}, {"response", f, "--points", "3"}} {
		var e bytes.Buffer
		code := runChecked(args, failWriter{}, &e)
		want := "rfstress: cannot write standard output: no space left on device\n"
		if code != 2 || !strings.HasSuffix(e.String(), want) {
			t.Errorf("%v: exit %d, stderr %q; want 2 and %q", args, code, e.String(), want)
		}
	}
	// the real device: every write fails with ENOSPC
	if full, err := os.OpenFile("/dev/full", os.O_WRONLY, 0); err == nil {
		defer full.Close()
		var e bytes.Buffer
		code := runChecked([]string{"audit", f}, full, &e)
		if code != 2 || !strings.Contains(e.String(), "rfstress: cannot write standard output: write /dev/full: no space left on device") {
			t.Errorf("to /dev/full: exit %d, %q", code, e.String())
		}
	}
}

// TestHostileText: control characters from file names and titles are
// escaped in text output; a name with a newline cannot forge a line; CSV
// cells cannot start a formula; a long title is shortened in text and kept
// whole in JSON.
func TestHostileText(t *testing.T) {
	t.Chdir(t.TempDir())
	name := "=HYPERLINK(x)\x1b[32m\nOVERALL  OK.net"
	title := "evil \x1b]0;pwned\x07 \r OK \u202eKO"
	src := strings.Replace(verdictNet, "title verdict check", "title "+title, 1)
	if err := os.WriteFile(name, []byte(src), 0o644); err != nil {
		t.Skip("file system refuses the name:", err)
	}
	_, out, _ := runCLI(t, "audit", name)
	if strings.ContainsAny(out, "\x1b\r\x07\u202e") {
		t.Errorf("raw control characters in the text output:\n%q", out)
	}
	for _, l := range strings.Split(out, "\n") {
		if strings.HasPrefix(l, "OVERALL  OK") {
			t.Errorf("forged line: %q", l)
		}
	}
	if !strings.Contains(out, `evil \x1b]0;pwned\x07 \r OK \u202eKO`) || !strings.Contains(out, `\x1b[32m\nOVERALL  OK.net`) {
		t.Errorf("escapes not shown:\n%s", out)
	}
	_, js, _ := runCLI(t, "audit", name, "--json", "-")
	var doc struct {
		Sections []struct {
			File  string `json:"file"`
			Title string `json:"title"`
		} `json:"sections"`
	}
	if err := json.Unmarshal([]byte(js), &doc); err != nil || len(doc.Sections) != 1 || doc.Sections[0].Title != title || doc.Sections[0].File != name {
		t.Errorf("JSON does not keep the title and file name as written: %v %+v", err, doc)
	}
	_, csv, _ := runCLI(t, "audit", name, "--csv", "-")
	sc := bufio.NewScanner(strings.NewReader(csv))
	sc.Scan() // header
	for sc.Scan() {
		if l := sc.Text(); !strings.HasPrefix(l, `"'=HYPERLINK`) && !strings.HasPrefix(l, `'=HYPERLINK`) && !strings.HasPrefix(l, "OVERALL") {
			if strings.HasPrefix(l, "=") {
				t.Errorf("CSV row starts a formula: %q", l)
			}
		}
	}
	if !strings.Contains(csv, `'=HYPERLINK(x)`) {
		t.Errorf("CSV file cell not guarded:\n%s", csv)
	}

	// a 100 kB title: a short heading in text, whole in JSON
	long := strings.Repeat("x", 100_000)
	lf := writeFile(t, "long.net", strings.Replace(verdictNet, "title verdict check", "title "+long, 1))
	_, out, _ = runCLI(t, "audit", lf)
	for _, l := range strings.Split(out, "\n") {
		if len(l) > 400 {
			t.Errorf("text line of %d bytes", len(l))
		}
	}
	if !strings.Contains(out, strings.Repeat("x", 50)+"…") {
		t.Error("long title not shortened with an ellipsis")
	}
	_, js, _ = runCLI(t, "audit", lf, "--json", "-")
	if !strings.Contains(js, long) {
		t.Error("JSON lost the full title")
	}
}

// TestPDFLongTitle: a 100 kB title and a 100 kB netlist line keep the
// report to a handful of pages (it once ran to nearly two thousand).
func TestPDFLongTitle(t *testing.T) {
	t.Setenv("SOURCE_DATE_EPOCH", "1700000000")
	dir := t.TempDir()
	short := writeFile(t, "s.net", verdictNet)
	long := writeFile(t, "l.net", strings.Replace(verdictNet, "title verdict check", "title "+strings.Repeat("\x1bW", 50_000), 1))
	pages := func(p string) int {
		out := filepath.Join(dir, filepath.Base(p)+".pdf")
		if code, _, errs := runCLI(t, "audit", p, "--report", out); code == 2 {
			t.Fatalf("%s", errs)
		}
		b, _ := os.ReadFile(out)
		return bytes.Count(b, []byte("/Type /Page\n"))
	}
	ps, pl := pages(short), pages(long)
	if ps == 0 || pl > ps+2 {
		t.Errorf("pages: %d with a short title, %d with a 100 kB title", ps, pl)
	}
	// the escapes are visible in the PDF's text, the ESC itself absent
	if _, err := exec.LookPath("pdftotext"); err == nil {
		txt, err := exec.Command("pdftotext", filepath.Join(dir, "l.net.pdf"), "-").Output()
		if err != nil {
			t.Fatal(err)
		}
		if !strings.Contains(string(txt), `\x1bW\x1bW`) || strings.ContainsRune(string(txt), 0x1b) {
			t.Errorf("PDF text does not show the escapes or holds a raw ESC")
		}
	}
}

// TestInputLimits: files over 16 MiB are refused without being read
// whole (/dev/zero would never end); a directory is not a netlist.
func TestInputLimits(t *testing.T) {
	dir := t.TempDir()
	big := filepath.Join(dir, "big.net")
	f, _ := os.Create(big)
	f.Truncate(MaxInput + 1) // sparse: no disk used
	f.Close()
	cases := []struct{ path, want string }{
		{big, "rfstress: netlist " + big + " is larger than 16 MiB (input files are limited to 16 MiB; is it the right file?)"},
		{dir, "cannot read netlist " + dir + ": it is a directory"},
	}
	if _, err := os.Stat("/dev/zero"); err == nil {
		cases = append(cases, struct{ path, want string }{"/dev/zero", "rfstress: netlist /dev/zero is larger than 16 MiB (input files are limited to 16 MiB; is it the right file?)"})
	}
	for _, c := range cases {
		code, _, errs := runCLI(t, "audit", c.path)
		if code != 2 || errs != c.want+"\n" {
			t.Errorf("%s: exit %d\n got: %q\nwant: %q", c.path, code, errs, c.want)
		}
	}
	code, _, errs := runCLI(t, "audit", writeFile(t, "v.net", verdictNet), "--materials", big)
	if want := "rfstress: materials " + big + " is larger than 16 MiB (input files are limited to 16 MiB; is it the right file?)\n"; code != 2 || errs != want {
		t.Errorf("materials: exit %d %q", code, errs)
	}
}

// TestInternalErrorExit3: a bug (here a panic) exits 3 and asks for a
// report; it never looks like an input error.
func TestInternalErrorExit3(t *testing.T) {
	register(command{name: "test-panic", run: func([]string, io.Writer, io.Writer) (int, error) { panic("index out of range") }})
	defer delete(commands, "test-panic")
	code, _, errs := runCLI(t, "test-panic")
	want := "rfstress: internal error: index out of range; this is a bug in rfstress, not in your input: please report it with the command line and the input files\n"
	if code != 3 || errs != want {
		t.Errorf("exit %d, %q", code, errs)
	}
}

// TestSignalRemovesTemps: SIGTERM during a write removes the temporary
// file and exits 143 (128 + 15). The test runs itself as the child.
func TestSignalRemovesTemps(t *testing.T) {
	if os.Getenv("RFSTRESS_SIGNAL_CHILD") != "" {
		installCleanup()
		tmp, err := os.CreateTemp(os.Getenv("RFSTRESS_SIGNAL_CHILD"), ".rfstress-*")
		if err != nil {
			os.Exit(9)
		}
		trackTemp(tmp.Name(), true)
		os.Stdout.WriteString(tmp.Name() + "\n")
		time.Sleep(30 * time.Second)
		os.Exit(8)
	}
	dir := t.TempDir()
	cmd := exec.Command(os.Args[0], "-test.run=^TestSignalRemovesTemps$")
	cmd.Env = append(os.Environ(), "RFSTRESS_SIGNAL_CHILD="+dir)
	out, _ := cmd.StdoutPipe()
	if err := cmd.Start(); err != nil {
		t.Skip(err)
	}
	name, _ := bufio.NewReader(out).ReadString('\n')
	name = strings.TrimSpace(name)
	if _, err := os.Stat(name); err != nil {
		t.Fatalf("child made no temporary file: %q", name)
	}
	cmd.Process.Signal(syscall.SIGTERM)
	err := cmd.Wait()
	var ee *exec.ExitError
	if !errors.As(err, &ee) || ee.ExitCode() != 143 {
		t.Errorf("child exit: %v, want 143", err)
	}
	if _, err := os.Stat(name); err == nil {
		t.Error("temporary file left after SIGTERM")
	}
}

// modeList is the list of mode presets as messages give it.
func modeList() string {
	var n []string
	for _, m := range stress.Modes {
		n = append(n, m.Name)
	}
	return strings.Join(n, ", ")
}

// TestUntrustedSolveIsAFinding: a network whose solve does not balance
// even after one step of iterative refinement (a 1 nΩ near-short into a
// node held by 1 TΩ) shows no input impedance and says why, naming the
// parts with their lines; the audit carries the same warning.
func TestUntrustedSolveIsAFinding(t *testing.T) {
	src := "port in a z=50\nport out c z=50\nresistor R1 a b 1n\ninductor L1 b c 1u q=100\ncapacitor C1 c gnd 100p q=500\n" +
		"capacitor C2 a gnd 100p q=500\nresistor R2 c d 1n\nresistor R3 d gnd 1e12\naudit freq=7M harmonics=none\n"
	f := writeFile(t, "bal.net", src)
	_, out, _ := runCLI(t, "solve", f, "--freq", "7M")
	if !strings.Contains(out, "input impedance   — (not shown: see the finding below)") ||
		!strings.Contains(out, "FINDING: the solve at 7 MHz does not balance") || !strings.Contains(out, "R2 (line 7), R3 (line 8)") {
		t.Errorf("solve text:\n%s", out)
	}
	_, js, _ := runCLI(t, "solve", f, "--freq", "7M", "--json", "-")
	var doc struct {
		ZinRe    *float64 `json:"zin_re_ohm"`
		Findings []string `json:"findings"`
	}
	if err := json.Unmarshal([]byte(js), &doc); err != nil || doc.ZinRe != nil || len(doc.Findings) != 1 {
		t.Errorf("solve JSON: %v %+v", err, doc)
	}
	_, out, _ = runCLI(t, "audit", f)
	if !strings.Contains(out, "warning  the network solve at 7 MHz does not balance") {
		t.Errorf("audit text lacks the balance warning:\n%s", out)
	}
	// the same filter without the near-short and near-open solves cleanly;
	// 62.31+j23.79 Ω is its ABCD cascade (circuits TestRefinementRepairs)
	good := writeFile(t, "good.net", strings.Replace(src, "resistor R2 c d 1n\nresistor R3 d gnd 1e12\n", "", 1))
	if _, out, _ := runCLI(t, "solve", good, "--freq", "7M"); strings.Contains(out, "FINDING") || !strings.Contains(out, "input impedance   62.31+j23.79 Ω") {
		t.Errorf("sound solve:\n%s", out)
	}
}
