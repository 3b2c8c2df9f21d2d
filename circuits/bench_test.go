package circuits

import (
	"math"
	"os"
	"path/filepath"
	"testing"
)

func benchCircuit(b *testing.B) *Circuit {
	src, err := os.ReadFile(filepath.Join("testdata", "lpf7_coupled.net"))
	if err != nil {
		b.Fatal(err)
	}
	_, c := mustParse(b, "lpf7_coupled.net", string(src))
	return c
}

// BenchmarkSolve: one full solve (factorise and solve) per load.
func BenchmarkSolve(b *testing.B) {
	c := benchCircuit(b)
	for i := 0; b.Loop(); i++ {
		if _, err := c.Solve(14.2e6, 100, LoadOnCircle(50, 3, float64(i%72)*math.Pi/36)); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkSplitLoad: the superposition fast path, per load, after one
// factorisation per frequency.
func BenchmarkSplitLoad(b *testing.B) {
	c := benchCircuit(b)
	s, w := NewSplit(c), NewSplitWork(c)
	if err := w.Fill(s, 14.2e6); err != nil {
		b.Fatal(err)
	}
	e := complex(c.EMFForPower(100), 0)
	var sink float64
	for i := 0; b.Loop(); i++ {
		a := s.Alpha(LoadOnCircle(50, 3, float64(i%72)*math.Pi/36))
		for k := range c.Elements {
			sink += s.Part(k, a, e).Ploss
		}
	}
	_ = sink
}

// BenchmarkParse: reading a netlist.
func BenchmarkParse(b *testing.B) {
	src, err := os.ReadFile(filepath.Join("testdata", "lpf40m.net"))
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		if _, err := Parse("lpf40m.net", src); err != nil {
			b.Fatal(err)
		}
	}
}
