package stress

import (
	"fmt"
	"math"
	"os"
	"strings"
	"testing"

	"rfstress/circuits"
	"rfstress/ratings"
)

// chebyshevG returns the lowpass prototype element values g1…gn of an
// n-pole Chebyshev response with ripple rippleDB (Matthaei, Young & Jones
// 1964, sec. 4.05, eq. 4.05-02).
func chebyshevG(n int, rippleDB float64) []float64 {
	beta := math.Log(1 / math.Tanh(rippleDB/17.37))
	gamma := math.Sinh(beta / (2 * float64(n)))
	a := make([]float64, n+1)
	b := make([]float64, n+1)
	for k := 1; k <= n; k++ {
		a[k] = math.Sin(float64(2*k-1) * math.Pi / (2 * float64(n)))
		s := math.Sin(float64(k) * math.Pi / float64(n))
		b[k] = gamma*gamma + s*s
	}
	g := make([]float64, n+1)
	g[1] = 2 * a[1] / gamma
	for k := 2; k <= n; k++ {
		g[k] = 4 * a[k-1] * a[k] / (b[k-1] * g[k-1])
	}
	return g[1:]
}

// lowpassNetlist builds a shunt-C-first ladder scaled to r0 and cutoff fc
// (C = g/(ωc·R0), L = g·R0/ωc, same source), with the given Q for every
// part and extra text appended to each capacitor and inductor line.
func lowpassNetlist(g []float64, fc, r0, q float64, capAttrs, indAttrs, extra string) string {
	wc := 2 * math.Pi * fc
	var b strings.Builder
	fmt.Fprintf(&b, "title test lowpass\nport in n1 z=%g\n", r0)
	node := 1
	for k, gk := range g {
		if k%2 == 0 {
			fmt.Fprintf(&b, "capacitor C%d n%d gnd %.9g q=%g %s\n", k+1, node, gk/(wc*r0), q, capAttrs)
		} else {
			fmt.Fprintf(&b, "inductor L%d n%d n%d %.9g q=%g %s\n", k+1, node, node+1, gk*r0/wc, q, indAttrs)
			node++
		}
	}
	fmt.Fprintf(&b, "port out n%d z=%g\n%s\n", node, r0, extra)
	return b.String()
}

type fixture struct {
	nl   *circuits.Netlist
	c    *circuits.Circuit
	rs   *ratings.Set
	cond Conditions
	eng  *Engine
}

// build parses src and prepares an engine with the file's audit settings
// followed by extra settings.
func build(t testing.TB, src string, settings ...string) *fixture {
	t.Helper()
	nl, err := circuits.Parse("test.net", []byte(src))
	if err != nil {
		t.Fatalf("parse: %v\n%s", err, src)
	}
	return buildNetlist(t, nl, settings...)
}

// buildFile is build for a netlist file, with its measured data read from
// beside it.
func buildFile(t testing.TB, path string, settings ...string) *fixture {
	t.Helper()
	src, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	nl, err := circuits.Parse(path, src)
	if err != nil {
		t.Fatalf("parse: %v", err)
	}
	if err := circuits.LoadMeasured(nl, os.ReadFile); err != nil { // paths beside the netlist
		t.Fatalf("measured data: %v", err)
	}
	return buildNetlist(t, nl, settings...)
}

// buildNetlist prepares an engine for a parsed netlist (see build).
func buildNetlist(t testing.TB, nl *circuits.Netlist, settings ...string) *fixture {
	t.Helper()
	c, err := circuits.Build(nl)
	if err != nil {
		t.Fatal(err)
	}
	prof, err := ratings.LoadProfile("standard", nil)
	if err != nil {
		t.Fatal(err)
	}
	rs, err := ratings.Prepare(nl, ratings.Builtin(), prof)
	if err != nil {
		t.Fatal(err)
	}
	cond := Defaults()
	var ss []Setting
	ss = append(ss, FileSettings(nl)...)
	for _, s := range settings {
		k, v, _ := strings.Cut(s, "=")
		ss = append(ss, Setting{Key: k, Value: v, Flag: true})
	}
	if err := cond.Apply(ss); err != nil {
		t.Fatal(err)
	}
	if len(nl.Selects) > 0 && cond.BandLo == 0 {
		// as the command does: the netlist as written at its first
		// position's band (AuditNetlist gives every position its own)
		cond.BandLo, cond.BandHi = nl.Selects[0].Lo, nl.Selects[0].Hi
	}
	eng, err := NewEngine(c, rs, cond)
	if err != nil {
		t.Fatal(err)
	}
	return &fixture{nl, c, rs, cond, eng}
}

func relErr(a, b float64) float64 {
	d := math.Abs(a - b)
	m := math.Max(math.Abs(a), math.Abs(b))
	if m == 0 {
		return 0
	}
	return d / m
}
