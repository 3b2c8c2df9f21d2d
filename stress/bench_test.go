package stress

import (
	"fmt"
	"math"
	"math/cmplx"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"sync"
	"sync/atomic"
	"syscall"
	"testing"
	"time"

	"rfstress/circuits"
)

// benchSource is the demo station's 80 m lowpass (toroid cores) when present, else the
// test lowpass, so the benchmarks measure a realistic filter.
func benchSource(b *testing.B) string {
	// found from this file's directory, so a test binary run from any
	// directory measures the same network (a silent fallback to another
	// filter once made such runs look 40 % faster)
	_, here, _, _ := runtime.Caller(0)
	src, err := os.ReadFile(filepath.Join(filepath.Dir(here), "..", "testdata", "station", "lpf-80m.net"))
	if err != nil {
		b.Fatalf("the benchmark's filter: %v", err)
	}
	return string(src)
}

// default audit settings of the issue: 7 carriers × 72 phases, harmonics
// to the 9th, open and short faults.
var benchDefault = []string{"band=3.5M:3.8M", "points=7", "swr=3", "phases=72", "faults=open,short", "harmonics=push-pull", "harmonic-max=9"}

func BenchmarkSolveOneFrequency(b *testing.B) {
	fx := build(b, benchSource(b), benchDefault...)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := fx.c.Solve(3.6e6, 100, circuits.Load{Z: 50}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkFactor times one factorisation of the network matrix; compare
// with BenchmarkScalarRate and the flop count (8/3)·n³ of a complex LU
// (n³/3 complex multiply-adds of 8 real flops each).
func BenchmarkFactor(b *testing.B) {
	fx := build(b, benchSource(b), benchDefault...)
	fz, err := fx.c.Factor(3.6e6, nil)
	if err != nil {
		b.Fatal(err)
	}
	n := fz.N()
	for b.Loop() {
		if err := fz.Refactor(3.6e6); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(8*math.Pow(float64(n), 3)/3, "flops/op")
	b.ReportMetric(float64(n), "unknowns")
}

// BenchmarkScalarRate measures the machine's scalar floating-point rate:
// four independent multiply-add chains, 8 flops per iteration.
func BenchmarkScalarRate(b *testing.B) {
	a0, a1, a2, a3 := 1.0, 1.1, 1.2, 1.3
	const m, c = 0.999999, 1e-7
	for b.Loop() {
		a0 = a0*m + c
		a1 = a1*m + c
		a2 = a2*m + c
		a3 = a3*m + c
	}
	b.ReportMetric(8, "flops/op")
	if a0+a1+a2+a3 == 0 {
		b.Fatal("unreachable")
	}
}

func benchAudit(b *testing.B, settings ...string) { benchAuditSrc(b, benchSource(b), settings...) }

func benchAuditSrc(b *testing.B, src string, settings ...string) {
	fx := build(b, src, settings...)
	w := fx.eng.newWorkspace(fx.c)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := fx.eng.run(w); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(fx.eng.NumCases()), "cases")
}

func BenchmarkAuditDefault(b *testing.B) { benchAudit(b, benchDefault...) }

func BenchmarkAuditPhases36(b *testing.B) {
	benchAudit(b, append(append([]string{}, benchDefault...), "phases=36")...)
}

func BenchmarkAuditPhases3600(b *testing.B) {
	benchAudit(b, append(append([]string{}, benchDefault...), "phases=3600")...)
}

// BenchmarkAuditHeavy is the heavy audit of BenchmarkAuditHeavyFlopBound
// alone, without the rate measurements beside it: a fixed amount of work,
// for comparing builds by instruction count as well as time.
func BenchmarkAuditHeavy(b *testing.B) {
	fx := build(b, benchSource(b), benchHeavy...)
	b.ReportAllocs()
	for b.Loop() {
		auditAsCaller(b, fx)
	}
}

// auditAsCaller runs the whole audit as a caller has it: limits asked of
// the ratings layer (NewEngine), every case, the verdicts.
func auditAsCaller(b *testing.B, fx *fixture) {
	e, err := NewEngine(fx.c, fx.rs, fx.cond)
	if err != nil {
		b.Fatal(err)
	}
	if _, err := e.Audit(); err != nil {
		b.Fatal(err)
	}
}

// BenchmarkAuditNaive is the path the engine avoids, kept here only to
// show the ratio: a full solve per case at the carrier, and at every
// harmonic a full solve per load of the sampled circle.
func BenchmarkAuditNaive(b *testing.B) {
	fx := build(b, benchSource(b), benchDefault...)
	e := fx.eng
	n := len(fx.c.Elements)
	worst := make([]float64, n)
	for b.Loop() {
		for fi, f := range e.carriers {
			for h, lvl := range e.levels {
				if lvl == 0 {
					continue
				}
				for k := 0; k < e.nPhase; k++ {
					l := e.circleLoad(fx.c.Zout, k)
					r, err := fx.c.Solve(float64(h+2)*f, 100*lvl, l)
					if err != nil {
						b.Fatal(err)
					}
					for k, ps := range r.Parts {
						worst[k] = math.Max(worst[k], cmplx.Abs(ps.V))
					}
				}
			}
			for j := 0; j < e.perCarrier; j++ {
				cs := e.Case(fi*e.perCarrier + j)
				r, err := fx.c.Solve(cs.F, 100, cs.Load)
				if err != nil {
					b.Fatal(err)
				}
				for k, ps := range r.Parts {
					worst[k] = math.Max(worst[k], cmplx.Abs(ps.V))
				}
			}
		}
	}
}

func benchTolerance(b *testing.B, trials, workers int) {
	fx := build(b, benchSource(b), benchDefault...)
	for b.Loop() {
		if _, err := fx.eng.Tolerance(TolOptions{Trials: trials, Seed: 1, Dist: "normal", Workers: workers}); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkTolerance1000Workers1(b *testing.B) { benchTolerance(b, 1000, 1) }
func BenchmarkTolerance1000Workers2(b *testing.B) { benchTolerance(b, 1000, 2) }

// peakHeap runs f while sampling the live heap every 2 ms and returns the
// largest HeapAlloc seen (runtime.MemStats) above the heap before f, and
// the bytes f allocated in all.
func peakHeap(f func()) (peak, total uint64) {
	runtime.GC()
	var ms runtime.MemStats
	runtime.ReadMemStats(&ms)
	base, alloc0 := ms.HeapAlloc, ms.TotalAlloc
	var max atomic.Uint64
	done := make(chan struct{})
	var wg sync.WaitGroup
	wg.Add(1)
	go func() {
		defer wg.Done()
		t := time.NewTicker(2 * time.Millisecond)
		defer t.Stop()
		var m runtime.MemStats
		for {
			select {
			case <-done:
				return
			case <-t.C:
				runtime.ReadMemStats(&m)
				if m.HeapAlloc > max.Load() {
					max.Store(m.HeapAlloc)
				}
			}
		}
	}()
	f()
	close(done)
	wg.Wait()
	runtime.ReadMemStats(&ms)
	if ms.HeapAlloc > max.Load() {
		max.Store(ms.HeapAlloc)
	}
	p := max.Load()
	if p < base {
		p = base
	}
	return p - base, ms.TotalAlloc - alloc0
}

// benchTrialSettings is a light audit (one carrier, the matched load, no
// harmonics) so a million trials take seconds: what grows with the number
// of trials is the subject here, not the audit.
var benchTrialSettings = []string{"points=1", "swr=1", "faults=none", "harmonics=none"}

// BenchmarkTrialsMemory runs 100 000 and 1 000 000 trials in one go and
// reports the peak live heap of each (runtime.MemStats, sampled) and
// their ratio, and the bytes allocated per trial: with streaming
// statistics and per-worker storage the peak must not grow with the
// trials (target: 1M trials within 64 MiB). Run with -benchtime 1x.
func BenchmarkTrialsMemory(b *testing.B) {
	fx := build(b, benchSource(b), benchTrialSettings...)
	var p1, p2, a2 uint64
	for b.Loop() {
		for _, n := range []int{100_000, 1_000_000} {
			peak, total := peakHeap(func() {
				if _, err := fx.eng.Tolerance(TolOptions{Trials: n, Seed: 1, Dist: "normal", Workers: 2}); err != nil {
					b.Fatal(err)
				}
			})
			if n == 100_000 {
				p1 = peak
			} else {
				p2, a2 = peak, total
			}
		}
	}
	b.ReportMetric(float64(p1)/(1<<20), "MiB-peak-100k")
	b.ReportMetric(float64(p2)/(1<<20), "MiB-peak-1M")
	b.ReportMetric(float64(p2)/float64(p1), "peak-ratio")
	b.ReportMetric(float64(a2)/1e6, "B-alloc/trial")
}

// BenchmarkTrialsWorkers runs the same 2000 trials of the default audit
// on one and on two workers and reports the wall-time speed-up and the
// CPU time per trial of each: on a quiet 2-core machine the speed-up is
// near 2 and the CPU per trial the same for both; on a busy one the
// speed-up falls but the CPU per trial still shows whether the work per
// trial grew.
func BenchmarkTrialsWorkers(b *testing.B) {
	fx := build(b, benchSource(b), benchDefault...)
	const trials = 2000
	var wall, cpu [3]time.Duration
	for b.Loop() {
		for _, wk := range []int{1, 2} {
			c0, t0 := cpuTime(), time.Now()
			if _, err := fx.eng.Tolerance(TolOptions{Trials: trials, Seed: 1, Dist: "normal", Workers: wk}); err != nil {
				b.Fatal(err)
			}
			wall[wk] += time.Since(t0)
			cpu[wk] += cpuTime() - c0
		}
	}
	n := float64(b.N) * trials
	b.ReportMetric(wall[1].Seconds()/wall[2].Seconds(), "speedup-1to2")
	b.ReportMetric(cpu[1].Seconds()*1e6/n, "cpu-µs/trial-1w")
	b.ReportMetric(cpu[2].Seconds()*1e6/n, "cpu-µs/trial-2w")
	b.ReportMetric(wall[1].Seconds()*1e6/n, "wall-µs/trial-1w")
	b.ReportMetric(wall[2].Seconds()*1e6/n, "wall-µs/trial-2w")
}

// ladderSource is a long lowpass ladder of the given number of parts:
// alternately a shunt capacitor and a series coil, near the constant-k
// values for 50 Ω and a 12 MHz cutoff, each rated, so the audit does all
// its work on every part.
func ladderSource(parts int) string {
	const r0, fc = 50.0, 12e6
	l, c := r0/(math.Pi*fc), 1/(math.Pi*fc*r0)
	var b strings.Builder
	b.WriteString("title long ladder\nport in n0 z=50\n")
	node := 0
	for k := 0; k < parts; k++ {
		if k%2 == 0 {
			fmt.Fprintf(&b, "capacitor C%d n%d gnd %.6g dielectric=mica q=1500 vpk=1k irms=5\n", k, node, c*(1+0.01*float64(k%7)))
		} else {
			fmt.Fprintf(&b, "inductor L%d n%d n%d %.6g q=150 irms=5\n", k, node, node+1, l*(1+0.01*float64(k%5)))
			node++
		}
	}
	fmt.Fprintf(&b, "port out n%d z=50\n", node)
	return b.String()
}

// benchLadderAudit times the whole default audit of a ladder (Engine
// built, every case run, judged, the section assembled) as a library
// caller gets it.
func benchLadderAudit(b *testing.B, parts int) {
	fx := build(b, ladderSource(parts), benchDefault...)
	b.ReportAllocs()
	cpu0 := cpuTime()
	for b.Loop() {
		if _, err := fx.eng.Audit(); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(parts), "parts")
	b.ReportMetric((cpuTime()-cpu0).Seconds()*1e3/float64(b.N), "cpu-ms/op")
}

func BenchmarkLadderAudit100(b *testing.B)  { benchLadderAudit(b, 100) }
func BenchmarkLadderAudit1000(b *testing.B) { benchLadderAudit(b, 1000) }
func BenchmarkLadderAudit5000(b *testing.B) { benchLadderAudit(b, 5000) }

// heavy audit of the issue: 201 carriers, 3600 phases, push-pull
// harmonics to the 9th, open and short.
var benchHeavy = append(append([]string{}, benchDefault...), "points=201", "phases=3600")

// cpuTime is the CPU time the process has used (user and system, every
// thread: the garbage collector's work counts against the audit).
func cpuTime() time.Duration {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}

// scalarRate measures the machine's scalar floating-point rate in flop/s
// with the loop of BenchmarkScalarRate, in CPU time and as the best of
// five, so a benchmark can state its flop bound from the same run and a
// busy machine does not flatter it.
func scalarRate() float64 {
	const iters = 10_000_000
	best := 0.0
	for r := 0; r < 5; r++ {
		a0, a1, a2, a3 := 1.0, 1.1, 1.2, 1.3
		const m, c = 0.999999, 1e-7
		start := cpuTime()
		for i := 0; i < iters; i++ {
			a0 = a0*m + c
			a1 = a1*m + c
			a2 = a2*m + c
			a3 = a3*m + c
		}
		d := cpuTime() - start
		if a0+a1+a2+a3 == 0 {
			panic("unreachable")
		}
		if d > 0 {
			best = math.Max(best, 8*iters/d.Seconds())
		}
	}
	return best
}

// rateSink holds scalarRateMemory's accumulators: in memory, as the
// accumulators of BenchmarkScalarRate's loop are kept across b.Loop.
var rateSink [4]float64

// scalarRateMemory is the scalar rate of BenchmarkScalarRate's loop as
// that benchmark runs it, each multiply-add reading and writing its
// accumulator in memory: the rate the 2.0 ms bound was worked at.
// Best of five, CPU time.
func scalarRateMemory() float64 {
	const iters = 10_000_000
	best := 0.0
	p := &rateSink
	for r := 0; r < 5; r++ {
		p[0], p[1], p[2], p[3] = 1.0, 1.1, 1.2, 1.3
		const m, c = 0.999999, 1e-7
		start := cpuTime()
		for i := 0; i < iters; i++ {
			p[0] = p[0]*m + c
			p[1] = p[1]*m + c
			p[2] = p[2]*m + c
			p[3] = p[3]*m + c
		}
		if d := cpuTime() - start; d > 0 {
			best = math.Max(best, 8*iters/d.Seconds())
		}
	}
	return best
}

// BenchmarkAuditHeavyFlopBound runs the heavy audit and reports, beside
// its time, the time the solver's own arithmetic would take at the
// scalar rate measured in the same run, with the accumulators in
// registers (x-bound) and in memory (x-bound-mem, the rate of
// BenchmarkScalarRate): per carrier and per harmonic one
// factorisation and two solves (Factorization.Flops). The ratio x-bound
// compares CPU times, which a busy machine disturbs far less than wall
// time.
func BenchmarkAuditHeavyFlopBound(b *testing.B) {
	heavyFlopBound(b, build(b, benchSource(b), benchHeavy...))
}

// BenchmarkAuditHeavyFlopBoundEach is the same heavy audit (201 carriers
// over each file's own band, 3600 phases, push-pull harmonics to the 9th,
// open and short) of other networks of the example station, each against
// its own flop bound: larger networks carry more LU work per part, a
// tuner's T network less.
func BenchmarkAuditHeavyFlopBoundEach(b *testing.B) {
	for _, f := range []string{"lpf-160m.net", "lpf-30m.net", "lpf-40m.net", "rx-bpf-40m.net", "tuner-80m-vertical.net", "tuner-40m-balanced.net", "pa-pi-40m.net"} {
		b.Run(strings.TrimSuffix(f, ".net"), func(b *testing.B) {
			_, here, _, _ := runtime.Caller(0)
			heavyFlopBound(b, buildFile(b, filepath.Join(filepath.Dir(here), "..", "testdata", "station", f),
				"points=201", "phases=3600", "swr=3", "faults=open,short", "harmonics=push-pull", "harmonic-max=9"))
		})
	}
}

// heavyFlopBound measures an audit against its flop bound (see
// BenchmarkAuditHeavyFlopBound).
func heavyFlopBound(b *testing.B, fx *fixture) {
	if len(fx.eng.carriers) == 0 {
		b.Fatal("no carriers")
	}
	fz, err := fx.c.Factor(fx.eng.carriers[0], nil)
	if err != nil {
		b.Fatal(err)
	}
	ff, fs := fz.Flops()
	fills := 0
	for range fx.eng.carriers {
		fills++
		for _, l := range fx.eng.levels {
			if l > 0 {
				fills++
			}
		}
	}
	rate, rateMem := scalarRate(), scalarRateMemory()
	bound := float64(fills) * (ff + 2*fs) / rate
	boundMem := float64(fills) * (ff + 2*fs) / rateMem
	b.ReportAllocs()
	cpu0 := cpuTime()
	for b.Loop() {
		auditAsCaller(b, fx)
	}
	per := (cpuTime() - cpu0).Seconds() / float64(b.N)
	b.ReportMetric(bound*1e3, "bound-ms")
	b.ReportMetric(per*1e3, "cpu-ms/op")
	b.ReportMetric(per/bound, "x-bound")
	b.ReportMetric(rate/1e9, "Gflop/s")
	// the same against the rate with the accumulators in memory
	b.ReportMetric(boundMem*1e3, "bound-mem-ms")
	b.ReportMetric(per/boundMem, "x-bound-mem")
}

// BenchmarkPartFaultsEach is the default audit of the 80 m lowpass once per
// single-part fault: its 7 parts shorted, then opened, 14 audits.
func BenchmarkPartFaultsEach(b *testing.B) {
	fx := build(b, benchSource(b), append(benchDefault, "part-faults=each")...)
	list, err := fx.eng.PartFaultList()
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		if _, err := fx.eng.RunPartFaults(list); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkAuditWithSupply is the default audit of the 80 m lowpass with a
// supply and a draw fed through a choke: the DC solution's cost per audit.
func BenchmarkAuditWithSupply(b *testing.B) {
	src := benchSource(b) + "\nsupply B1 bplus 48V\ninductor RFC bplus n1 100u q=50 rdc=0.2 tol=10%\ndraw D1 n1 2A\n"
	benchAuditSrc(b, src, benchDefault...)
}
