package circuits

import (
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"testing"
	"time"
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

// BenchmarkLadderBandVsDense solves the same ladder, assembled and
// factorised at one frequency and solved for one excitation, with the
// Factorization (reverse Cuthill–McKee, band LU when the band is narrow)
// and with a dense LU of the same matrix, the way a dense script would,
// and reports both times and their ratio from the same run, for ladders
// of 2 to 512 sections: the dense solve must win at no size.
func BenchmarkLadderBandVsDense(b *testing.B) {
	for _, sections := range []int{2, 4, 8, 16, 32, 128, 512} {
		b.Run(fmt.Sprintf("sections=%d", sections), func(b *testing.B) {
			r := rand.New(rand.NewPCG(16, 9))
			text, _ := ladderNet(r, sections)
			_, c := mustParse(b, "ladder.net", text)
			load := Load{Z: 50}
			fz := c.newFactorization(&load)
			x := make([]complex128, fz.N())
			var band, dense time.Duration
			for b.Loop() {
				t0 := time.Now()
				if err := fz.Refactor(7.1e6); err != nil {
					b.Fatal(err)
				}
				clear(x)
				x[c.In] = 1
				fz.Solve(x)
				t1 := time.Now()
				m := fz.dense()
				lu := NewLU(fz.N())
				if err := lu.Factor(m); err != nil {
					b.Fatal(err)
				}
				clear(x)
				x[c.In] = 1
				lu.Solve(x)
				band += t1.Sub(t0)
				dense += time.Since(t1)
			}
			n := float64(b.N)
			b.ReportMetric(band.Seconds()*1e6/n, "band-µs")
			b.ReportMetric(dense.Seconds()*1e6/n, "dense-µs")
			b.ReportMetric(dense.Seconds()/band.Seconds(), "dense/band")
			b.ReportMetric(float64(fz.N()), "unknowns")
		})
	}
}
