package main

import (
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// groundLike matches a node field spelt like ground in a component line.
var groundLike = regexp.MustCompile(`(?m)^\s*(capacitor|inductor|resistor)\s+\S+\s+(\S+\s+)?(GND|Gnd|gND|GnD|gNd|GNd|gnD|ground|Ground|GROUND|0)(\s|$)`)

// FuzzAuditCLI runs the whole command on fuzzed netlists: it never panics
// (exit 3), never prints NaN or Inf in text, JSON or CSV, and never
// passes (exit 0 or 1) a netlist with a node spelt like ground; every
// error is one line per problem with control characters escaped.
//
//	go test ./cmd/rfstress -run '^$' -fuzz FuzzAuditCLI -fuzztime 3m
func FuzzAuditCLI(f *testing.F) {
	f.Add(verdictNet)
	f.Add(strings.Replace(verdictNet, "a gnd", "a GND", 1))
	f.Add(strings.Replace(verdictNet, "title verdict check", "title \x1b[2J\u202e evil", 1))
	f.Add(verdictNet + "audit power=1e308 freq=1e308 swr=NaN\n")
	f.Add(verdictNet + "inductor L1 a gnd 1u\ninductor L2 a2 gnd 1u\ninductor L3 a gnd 1u\ncoupling K1 L1 L2 k=0.8\ncoupling K2 L1 L3 k=0.8\n")
	f.Add("\ufeff" + verdictNet)
	files, _ := filepath.Glob("../../testdata/station/*.net")
	for _, p := range files {
		if b, err := os.ReadFile(p); err == nil && !strings.Contains(string(b), "measured=") {
			f.Add(string(b))
		}
	}
	dir := f.TempDir()
	f.Fuzz(func(t *testing.T, src string) {
		p := filepath.Join(dir, "f.net")
		if err := os.WriteFile(p, []byte(src), 0o644); err != nil {
			t.Skip()
		}
		if strings.Contains(src, "measured=") || strings.Contains(src, "derate=") {
			t.Skip() // names other files: out of this target's scope
		}
		// keep each run quick: the carrier grid is bounded by the ranges,
		// but a fuzzed points=100000 phases=1000000 is slow, not wrong
		if strings.Contains(src, "points=") || strings.Contains(src, "phases=") || strings.Contains(src, "harmonic-max=") {
			t.Skip()
		}
		for _, args := range [][]string{{"audit", p, "--freq", "7M"}, {"audit", p, "--freq", "7M", "--json", "-"}, {"audit", p, "--freq", "7M", "--csv", "-"}} {
			code, out, errs := runCLI(t, args...)
			if code == 3 {
				t.Fatalf("%v: internal error: %s", args, errs)
			}
			for _, bad := range []string{"NaN", "+Inf", "-Inf", "Infinity"} {
				// text from the file is echoed as it is written
				if strings.Contains(out, bad) && !strings.Contains(strings.ToLower(src), strings.ToLower(strings.Trim(bad, "+-"))) {
					t.Fatalf("%v: %s in the output:\n%s", args, bad, out)
				}
			}
			if (code == 0 || code == 1) && groundLike.MatchString(src) {
				t.Fatalf("%v: exit %d with a node spelt like ground", args, code)
			}
			if code == 2 && strings.ContainsAny(errs, "\x1b\r\x00\u202e") {
				t.Fatalf("%v: raw control character in the message %q", args, errs)
			}
		}
	})
}
