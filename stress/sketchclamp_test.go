package stress

import (
	"math/rand"
	"testing"
)

// TestSketchQuantileWithinRange: order statistics of a sample lie between
// its minimum and maximum, and a constant sample's are the constant (a
// fact of statistics). The logarithmic buckets return a representative up
// to α = 0.5 % off, which once showed a median of 909 mA beside a maximum
// of 907 mA for parts with no tolerance at all.
func TestSketchQuantileWithinRange(t *testing.T) {
	s := NewSketch()
	for i := 0; i < 200; i++ {
		s.Add(0.907)
	}
	for _, q := range []float64{0, 0.5, 0.99, 1} {
		if v := s.Quantile(q); v != 0.907 {
			t.Errorf("constant sample 0.907: quantile %.2f = %.6g", q, v)
		}
	}
	r := rand.New(rand.NewSource(3))
	s = NewSketch()
	lo, hi := 1e9, 0.0
	for i := 0; i < 1000; i++ {
		v := 1 + 0.01*r.NormFloat64()
		lo, hi = min(lo, v), max(hi, v)
		s.Add(v)
	}
	med, p99 := s.Quantile(0.5), s.Quantile(0.99)
	if !(lo <= med && med <= p99 && p99 <= hi && hi == s.Max()) {
		t.Errorf("min %.6g ≤ median %.6g ≤ p99 %.6g ≤ max %.6g (sketch max %.6g) does not hold", lo, med, p99, hi, s.Max())
	}
	// merging keeps the range
	a, b := NewSketch(), NewSketch()
	a.Add(2)
	b.Add(2)
	a.Merge(b)
	if v := a.Quantile(0.5); v != 2 {
		t.Errorf("merged constant sample 2: median %.6g", v)
	}
}
