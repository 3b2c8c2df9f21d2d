package main

import (
	"io"
	"os"
	"runtime"
	"sync"
	"sync/atomic"
	"time"

	"rfstress/reports"
	"rfstress/stress"
)

// poolSize is the number of workers for n independent jobs: --workers
// when given, else one per core, never more than the jobs.
func poolSize(workers, n int) int {
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	return max(1, min(workers, n))
}

// forEach runs fn(0) … fn(n-1) on the given number of workers, handing
// out indices in order; once stop(i) is true for a finished job no new
// job starts. With one worker it is a plain loop. Each fn writes only its
// own index's result, so the outcome does not depend on the workers. A
// panic in a job stops the others and is raised again in the caller's
// goroutine, where run turns it into exit 3: left in a worker it would end
// the process with the runtime's status 2, the status of an input error.
func forEach(n, workers int, fn func(i int), stop func(i int) bool) {
	if workers <= 1 {
		for i := 0; i < n; i++ {
			if fn(i); stop(i) {
				return
			}
		}
		return
	}
	var next atomic.Int64
	var stopped atomic.Bool
	var wg sync.WaitGroup
	var first atomic.Pointer[panicked]
	for range workers {
		wg.Go(func() {
			defer func() {
				if r := recover(); r != nil {
					first.CompareAndSwap(nil, &panicked{r})
					stopped.Store(true)
				}
			}()
			for !stopped.Load() {
				i := int(next.Add(1) - 1)
				if i >= n {
					return
				}
				if fn(i); stop(i) {
					stopped.Store(true)
				}
			}
		})
	}
	wg.Wait()
	if p := first.Load(); p != nil {
		panic(p.v)
	}
}

// panicked carries a panic's value from the goroutine it happened in to
// the one that waits for that goroutine's work.
type panicked struct{ v any }

// showsProgress reports whether withProgress would draw a bar: then the
// files are audited one at a time, each with its own bar.
func showsProgress(quiet bool, stderr io.Writer) bool {
	f, ok := stderr.(*os.File)
	return !quiet && ok && isTerminal(f)
}

// startReportDoc gathers what the PDF shows (the report draws only): each
// section's response sweep, harmonic lines, loads and use across the band,
// on background workers while the report draws the pages before it; the
// report waits for a section's data only when it reaches its pages. The
// workers take the sections in order, and the sections of one file (its
// select positions and part faults share one ratings set, which an engine
// writes its atmosphere into) on one worker one after the other, so the
// data come out the same whatever their number. One worker fewer than
// asked leaves a core to the drawing.
func startReportDoc(b *stress.Bank, engines []*stress.Engine, cautionV float64, date time.Time, workers int) *reports.ReportDoc {
	doc := &reports.ReportDoc{Tool: "rfstress " + Version, Date: date, Bank: b, CautionV: cautionV}
	n := len(engines)
	plots := make([]reports.FilterPlot, n)
	var groups [][2]int // [first, end) of engines sharing a ratings set
	group := make([]int, n)
	for i := 0; i < n; {
		j := i + 1
		for j < n && engines[j].R == engines[i].R {
			j++
		}
		for k := i; k < j; k++ {
			group[k] = len(groups)
		}
		groups = append(groups, [2]int{i, j})
		i = j
	}
	ready := make([]chan struct{}, len(groups))
	closeOnce := make([]sync.Once, len(groups))
	for g := range ready {
		ready[g] = make(chan struct{})
	}
	release := func(g int) { closeOnce[g].Do(func() { close(ready[g]) }) }
	var failed atomic.Pointer[panicked]
	gather := func(g int) {
		defer release(g)
		for i := groups[g][0]; i < groups[g][1]; i++ {
			e, s := engines[i], b.Sections[i]
			h := s.Harmonics
			if h == nil {
				h = e.HarmonicLines()
			}
			fp := reports.FilterPlot{Sweep: e.Sweep(240), BandLo: s.Conditions.BandLo,
				BandHi: s.Conditions.BandHi, Harmonics: h, Extra: s.Conditions.CarrierAlso,
				Loads: e.LoadSet(), R0: chartR0(e.C)}
			if u, err := e.BandUse(21); err == nil {
				fp.Use = u
			}
			plots[i] = fp
		}
	}
	go func() {
		// a panic while gathering is raised again where the report waits
		// for the data (FilterAt), on the drawing's goroutine
		defer func() {
			if r := recover(); r != nil {
				failed.Store(&panicked{r})
				for g := range ready {
					release(g)
				}
			}
		}()
		forEach(len(groups), max(1, workers-1), gather, func(int) bool { return false })
	}()
	doc.FilterAt = func(i int) *reports.FilterPlot {
		if i >= n {
			return nil
		}
		<-ready[group[i]]
		if p := failed.Load(); p != nil {
			panic(p.v)
		}
		s := b.Sections[i]
		if s.Harmonics == nil {
			s.Harmonics = plots[i].Harmonics
		}
		return &plots[i]
	}
	return doc
}
