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
// own index's result, so the outcome does not depend on the workers.
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
	for range workers {
		wg.Go(func() {
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
}

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
	for g := range ready {
		ready[g] = make(chan struct{})
	}
	gather := func(g int) {
		defer close(ready[g])
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
	go forEach(len(groups), max(1, workers-1), gather, func(int) bool { return false })
	doc.FilterAt = func(i int) *reports.FilterPlot {
		if i >= n {
			return nil
		}
		<-ready[group[i]]
		s := b.Sections[i]
		if s.Harmonics == nil {
			s.Harmonics = plots[i].Harmonics
		}
		return &plots[i]
	}
	return doc
}
