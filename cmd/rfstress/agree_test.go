package main

import (
	"strings"
	"testing"
)

const dielNet = `title dielectric case
port in a z=50
port out b z=50
resistor R1 a b 1m
capacitor C1 b gnd 1n dielectric=%s vpk=1000 irms=10
audit freq=1M harmonics=none power=100
`

// TestDielectricWordsAgree: solve and audit read dielectric= the same way,
// in any case (C0G is c0g: the same default Q, so the same dissipation),
// and an unknown dielectric is an input error in both.
func TestDielectricWordsAgree(t *testing.T) {
	lower := writeFile(t, "l.net", strings.Replace(dielNet, "%s", "c0g", 1))
	upper := writeFile(t, "u.net", strings.Replace(dielNet, "%s", "C0G", 1))
	for _, cmd := range [][]string{{"solve", "--freq", "1M"}, {"audit", "--json", "-"}} {
		_, a, _ := runCLI(t, append(cmd, lower)...)
		_, b, _ := runCLI(t, append(cmd, upper)...)
		a, b = withoutFileName(a, lower), withoutFileName(b, upper)
		if a != b || a == "" {
			t.Errorf("%s: dielectric=C0G and dielectric=c0g differ:\n%s\n%s", cmd[0], a, b)
		}
	}
	bad := writeFile(t, "b.net", strings.Replace(dielNet, "%s", "teflon", 1))
	for _, cmd := range [][]string{{"solve", "--freq", "1M"}, {"audit"}} {
		code, _, errs := runCLI(t, append(cmd, bad)...)
		if code != 2 || !strings.Contains(errs, `unknown dielectric "teflon"`) || !strings.Contains(errs, ":5:") {
			t.Errorf("%s: exit %d, stderr %q; want 2 and file:line:col naming the dielectric", cmd[0], code, errs)
		}
	}
}

// withoutFileName drops what names the file itself (its path and digest).
func withoutFileName(out, path string) string {
	var keep []string
	for _, l := range strings.Split(strings.ReplaceAll(out, path, "F"), "\n") {
		if !strings.Contains(l, "sha256") {
			keep = append(keep, l)
		}
	}
	return strings.Join(keep, "\n")
}
