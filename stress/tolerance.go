package stress

import (
	"fmt"
	"math"
	"math/rand/v2"
	"rfstress/circuits"
	"runtime"
	"sync"
	"sync/atomic"

	"rfstress/ratings"
)

// TolOptions set up a tolerance (Monte Carlo) analysis.
type TolOptions struct {
	Trials  int
	Seed    uint64
	Dist    string // "normal" or "uniform"
	Workers int    // 0: all cores
	// Done, if set, is incremented as trials finish (for a progress bar).
	Done *atomic.Int64
}

// Distributions. For "normal" a tolerance ±t is read as three standard
// deviations (99.7 % of parts inside ±t: common practice for how a
// tolerance band is specified); for "uniform" every value in ±t is equally
// likely, the pessimistic reading for parts sorted out of a wider batch.
var Distributions = []string{"normal", "uniform"}

// Tolerance is the spread of every stress over the trials.
type Tolerance struct {
	Trials  int
	Seed    uint64
	Dist    string
	Parts   []TolPart
	SafeP01 float64 // safe power met by 99 % of trials (1st percentile)
	SafeMed float64
}

// TolPart is one part's spread.
type TolPart struct {
	Name string
	Q    []TolQuantity
}

// TolQuantity is one stress's spread over the trials.
type TolQuantity struct {
	Quantity    ratings.Quantity
	Median      float64
	P99         float64
	Max         float64
	OverDerated float64 // share of trials above the derated limit
	OverRating  float64 // share of trials above the rating
	Rated       bool
	Advice      bool // the heating guide: its shares are advice, not a rating's
}

// Tolerance runs opt.Trials audits of the circuit with part values and Q
// drawn from their tolerances. Trial t always draws from its own stream
// (seed, t), so the result does not depend on the number of workers.
func (e *Engine) Tolerance(opt TolOptions) (*Tolerance, error) {
	if opt.Trials < 1 {
		return nil, fmt.Errorf("trials must be at least 1")
	}
	if opt.Dist != "normal" && opt.Dist != "uniform" {
		return nil, fmt.Errorf("unknown distribution %q (normal or uniform)", opt.Dist)
	}
	workers := opt.Workers
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	if workers > opt.Trials {
		workers = opt.Trials
	}
	lims := e.cacheLimits()
	n := len(e.C.Elements)
	tolV, tolQ := make([]float64, n), make([]float64, n)
	for i, el := range e.C.Elements {
		if v, ok := el.Comp.Attrs.Num("tol"); ok {
			tolV[i] = v
		}
		if v, ok := el.Comp.Attrs.Num("qtol"); ok {
			tolQ[i] = v
		}
	}
	// Statistics stream into fixed-memory sketches, one set per worker,
	// merged at the end: memory does not grow with the number of trials.
	type stats struct {
		vals         []*Sketch // per part and quantity
		overD, overR []int64
		safe         *Sketch
	}
	newStats := func() *stats {
		st := &stats{vals: make([]*Sketch, n*nQ), overD: make([]int64, n*nQ), overR: make([]int64, n*nQ), safe: NewSketch()}
		for i := range st.vals {
			st.vals[i] = NewSketch()
		}
		return st
	}
	perWorker := make([]*stats, workers)
	has := make([]bool, n*nQ)
	ratio := make([]float64, n*nQ)
	var next atomic.Int64
	var firstErr error
	var mu sync.Mutex
	var wg sync.WaitGroup
	fail := func(err error) {
		mu.Lock()
		if firstErr == nil {
			firstErr = err
		}
		mu.Unlock()
	}
	for wk := 0; wk < workers; wk++ {
		wg.Add(1)
		st := newStats()
		perWorker[wk] = st
		go func() {
			defer wg.Done()
			defer func() {
				if r := recover(); r != nil {
					fail(&InternalError{What: r})
				}
			}()
			w := e.newWorkspace(e.C)
			vf, qf := make([]float64, n), make([]float64, n)
			// one generator and one trial circuit per worker, reseeded and
			// rewritten per trial: nothing is allocated per trial
			pcg := rand.NewPCG(opt.Seed, 0)
			rng := rand.New(pcg)
			var trial circuits.Circuit
			for {
				t := int(next.Add(1) - 1)
				if t >= opt.Trials {
					return
				}
				pcg.Seed(opt.Seed, uint64(t))
				for i := range vf {
					vf[i] = draw(rng, opt.Dist, tolV[i])
					qf[i] = draw(rng, opt.Dist, tolQ[i])
				}
				w.rebind(e.C.ScaleInto(&trial, vf, qf))
				if _, err := e.run(w); err != nil {
					fail(err)
					return
				}
				st.safe.Add(e.trialSafe(w))
				for i := range w.acc {
					a := &w.acc[i]
					for q := 0; q < nQ; q++ {
						k := i*nQ + q
						st.vals[k].Add(a.val[q])
						u := a.util[q]
						if u > 1 {
							st.overD[k]++
						}
						if r := w.lim[i].absRatio[q]; r > 0 && u > r {
							st.overR[k]++
						}
					}
					if t == 0 {
						for q := 0; q < nQ; q++ {
							has[i*nQ+q] = a.has[q]
							ratio[i*nQ+q] = w.lim[i].absRatio[q]
						}
					}
				}
				if opt.Done != nil {
					opt.Done.Add(1)
				}
			}
		}()
	}
	wg.Wait()
	if firstErr != nil {
		return nil, firstErr
	}
	all := newStats()
	for _, st := range perWorker {
		all.safe.Merge(st.safe)
		for k := range all.vals {
			all.vals[k].Merge(st.vals[k])
			all.overD[k] += st.overD[k]
			all.overR[k] += st.overR[k]
		}
	}
	res := &Tolerance{Trials: opt.Trials, Seed: opt.Seed, Dist: opt.Dist}
	for i, el := range e.C.Elements {
		tp := TolPart{Name: el.Name}
		for q := 0; q < nQ; q++ {
			k := i*nQ + q
			if !has[k] {
				continue
			}
			sk := all.vals[k]
			tq := TolQuantity{Quantity: Quantities[q], Rated: ratio[k] > 0, Advice: len(lims) > 0 && lims[0][i].advice[q],
				Median: sk.Quantile(0.5), P99: sk.Quantile(0.99), Max: sk.Max(),
				OverDerated: float64(all.overD[k]) / float64(opt.Trials),
				OverRating:  float64(all.overR[k]) / float64(opt.Trials)}
			tp.Q = append(tp.Q, tq)
		}
		res.Parts = append(res.Parts, tp)
	}
	res.SafeP01, res.SafeMed = all.safe.Quantile(0.01), all.safe.Quantile(0.5)
	return res, nil
}

// draw returns a multiplier 1+δ for tolerance t.
func draw(rng *rand.Rand, dist string, t float64) float64 {
	if t <= 0 {
		return 1
	}
	var d float64
	if dist == "uniform" {
		d = t * (2*rng.Float64() - 1)
	} else {
		d = t / 3 * rng.NormFloat64()
	}
	if d < -0.9 {
		d = -0.9 // a part never goes to zero or negative
	}
	return 1 + d
}

// quantile of sorted data by linear interpolation between order
// statistics (the common "type 7" definition); the exact reference the
// sketch is tested against.
func quantile(s []float64, p float64) float64 {
	if len(s) == 0 {
		return math.NaN()
	}
	h := p * float64(len(s)-1)
	lo := int(math.Floor(h))
	if lo >= len(s)-1 {
		return s[len(s)-1]
	}
	return s[lo] + (h-float64(lo))*(s[lo+1]-s[lo])
}

// trialSafe is one trial's safe power: the least over parts and rated
// quantities, by the same scaling rules as the audit.
func (e *Engine) trialSafe(w *workspace) float64 {
	best := math.Inf(1)
	for i := range w.acc {
		a := &w.acc[i]
		for q := 0; q < nQ; q++ {
			d := w.lim[i].derated[q]
			if d <= 0 || a.util[q] <= 0 || w.lim[i].advice[q] {
				continue
			}
			p := e.safePower(e.rparts[i], q, a.util[q], a.pavg, a.utilDC[q], a.pdc, d)
			if p < best {
				best = p
			}
		}
	}
	return best
}
