package stress

import (
	"fmt"
	"math"
)

// SketchAlpha is the relative accuracy of the tolerance statistics: a
// reported median or 99th percentile is within 0.5 % of the true order
// statistic. Part tolerances are a few percent and ratings are read to two
// or three figures, so 0.5 % is below anything the verdicts can resolve.
const SketchAlpha = 0.005

// sketchMaxBins caps the buckets of one sketch: with γ = 1.01 they span a
// ratio of γ^4096 ≈ 5e17 between the smallest and the largest value kept
// at full accuracy, far beyond the spread of any tolerance analysis.
const sketchMaxBins = 4096

// Sketch is a fixed-memory quantile estimator with a relative-error
// guarantee: DDSketch (Masson, Rim & Lee, "DDSketch: a fast and
// fully-mergeable quantile sketch with relative-error guarantees", PVLDB
// 12(12), 2019). Values are counted in logarithmic buckets
// (γ^(i−1), γ^i], γ = (1+α)/(1−α); the estimate 2γ^i/(γ+1) of a bucket is
// within α of every value in it. So Quantile(q) is within α (relative) of
// the order statistic of rank ⌊q·(n−1)⌋ (0-based) of the values added,
// whatever their number, in at most sketchMaxBins buckets. Should the
// values ever span more than the cap, the lowest buckets merge (the
// paper's collapsing variant); upper quantiles keep their guarantee.
// Counts are integers, so merging the sketches of several workers gives
// the same result in any order: the analysis stays deterministic.
type Sketch struct {
	lnGamma float64
	offset  int     // bucket index of bins[0]
	bins    []int64 // counts per bucket
	zero    int64   // values ≤ minPositive (zero stress)
	inf     int64   // +Inf (no limit binds)
	n       int64
	min     float64
	max     float64
}

// minPositive is treated as zero: no stress is that small.
const minPositive = 1e-300

// NewSketch makes an empty sketch of relative accuracy SketchAlpha.
func NewSketch() *Sketch {
	g := (1 + SketchAlpha) / (1 - SketchAlpha)
	return &Sketch{lnGamma: math.Log(g), min: math.Inf(1), max: math.Inf(-1)}
}

// Add counts one value; NaN is counted as zero (never a stress).
func (s *Sketch) Add(v float64) {
	s.n++
	if v > s.max {
		s.max = v
	}
	if v < s.min {
		s.min = v
	}
	switch {
	case math.IsInf(v, 1):
		s.inf++
		return
	case !(v > minPositive):
		s.zero++
		return
	}
	s.addBin(int(math.Ceil(math.Log(v)/s.lnGamma)), 1)
}

func (s *Sketch) addBin(i int, c int64) {
	if len(s.bins) == 0 {
		s.offset = i
		s.bins = append(s.bins, c)
		return
	}
	if i < s.offset {
		grow := s.offset - i
		if len(s.bins)+grow > sketchMaxBins {
			s.bins[0] += c // below the kept span: collapse into the lowest bucket
			return
		}
		nb := make([]int64, len(s.bins)+grow)
		copy(nb[grow:], s.bins)
		s.bins, s.offset = nb, i
	} else if i-s.offset >= len(s.bins) {
		if lo := i - sketchMaxBins + 1; lo > s.offset {
			// collapse the lowest buckets into bucket lo to make room
			nb := make([]int64, i-lo+1)
			for j, b := range s.bins {
				k := s.offset + j - lo
				if k < 0 {
					k = 0
				}
				nb[k] += b
			}
			s.bins, s.offset = nb, lo
		}
		for len(s.bins) <= i-s.offset {
			s.bins = append(s.bins, 0)
		}
	}
	s.bins[i-s.offset] += c
}

// Merge adds the counts of o to s.
func (s *Sketch) Merge(o *Sketch) {
	s.n += o.n
	s.zero += o.zero
	s.inf += o.inf
	if o.max > s.max {
		s.max = o.max
	}
	if o.min < s.min {
		s.min = o.min
	}
	for j, c := range o.bins {
		if c != 0 {
			s.addBin(o.offset+j, c)
		}
	}
}

// N is the number of values added.
func (s *Sketch) N() int64 { return s.n }

// Max is the largest value added, exactly.
func (s *Sketch) Max() float64 { return s.max }

// Quantile estimates the q-quantile (0 ≤ q ≤ 1); NaN when empty. The
// estimate is held within the exact minimum and maximum: a bucket's
// representative may lie up to α beyond them, and a median shown above
// the maximum would be read as an error.
func (s *Sketch) Quantile(q float64) float64 {
	v := s.quantile(q)
	if v == v && !math.IsInf(s.min, 0) {
		v = math.Max(s.min, math.Min(s.max, v))
	}
	return v
}

func (s *Sketch) quantile(q float64) float64 {
	if s.n == 0 {
		return math.NaN()
	}
	rank := int64(q * float64(s.n-1))
	if rank < s.zero {
		return 0
	}
	seen := s.zero
	for j, c := range s.bins {
		seen += c
		if seen > rank {
			i := s.offset + j
			return 2 * math.Exp(float64(i)*s.lnGamma) / (1 + math.Exp(s.lnGamma))
		}
	}
	return math.Inf(1)
}

// InternalError is a failure that is no fault of the input (a panic in a
// worker); the command exits 3 and asks for a report.
type InternalError struct{ What any }

func (e *InternalError) Error() string { return fmt.Sprintf("internal error: %v", e.What) }
