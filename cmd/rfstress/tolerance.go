package main

import (
	"fmt"
	"io"
	"os"
	"strconv"
	"strings"
	"sync/atomic"
	"time"

	"github.com/spf13/pflag"

	"rfstress/reports"
	"rfstress/stress"
)

type tolFlags struct {
	trials  int
	seed    uint64
	dist    string
	workers int
	quiet   bool
}

func addTolFlags(fs *pflag.FlagSet) *tolFlags {
	t := &tolFlags{}
	fs.IntVar(&t.trials, "trials", 0, "tolerance analysis: `number` of Monte Carlo trials (parts' tol= and qtol=)")
	fs.Uint64Var(&t.seed, "seed", 1, "random `seed` of the tolerance trials")
	fs.StringVar(&t.dist, "dist", "normal", "tolerance `distribution`: normal (±tol is 3σ) or uniform (flat within ±tol)")
	fs.IntVar(&t.workers, "workers", 0, "parallel `workers` for the trials (default: all cores)")
	fs.BoolVar(&t.quiet, "quiet", false, "no progress bar")
	return t
}

// isTerminal reports whether f is a character device (a terminal), so the
// progress bar never lands in a redirected file or a pipe.
func isTerminal(f *os.File) bool {
	st, err := f.Stat()
	return err == nil && st.Mode()&os.ModeCharDevice != 0
}

func runTolerance(eng *stress.Engine, sec *stress.Section, t *tolFlags, stderr io.Writer) (*stress.Tolerance, error) {
	if t.trials < 0 || t.trials > 10_000_000 {
		return nil, usagef("--trials must be between 1 and 10000000")
	}
	if t.dist != "normal" && t.dist != "uniform" {
		return nil, usagef("--dist %s: expected normal or uniform", t.dist)
	}
	var done atomic.Int64
	opt := stress.TolOptions{Trials: t.trials, Seed: t.seed, Dist: t.dist, Workers: t.workers, Done: &done}
	f, isFile := stderr.(*os.File)
	show := !t.quiet && isFile && isTerminal(f)
	stop := make(chan struct{})
	finished := make(chan struct{})
	if show {
		go func() {
			defer close(finished)
			tick := time.NewTicker(100 * time.Millisecond)
			defer tick.Stop()
			for {
				select {
				case <-stop:
					progress(stderr, sec.File, t.trials, t.trials)
					fmt.Fprintln(stderr)
					return
				case <-tick.C:
					progress(stderr, sec.File, int(done.Load()), t.trials)
				}
			}
		}()
	} else {
		close(finished)
	}
	res, err := eng.Tolerance(opt)
	close(stop)
	<-finished
	if err != nil {
		return nil, fmt.Errorf("%s: %v", sec.File, err)
	}
	return res, nil
}

func progress(w io.Writer, name string, done, total int) {
	const width = 30
	n := width * done / total
	fmt.Fprintf(w, "\r%s [%s%s] %d/%d trials", name, strings.Repeat("#", n), strings.Repeat(".", width-n), done, total)
}

// buildReportDoc gathers what the PDF shows; the report draws only.
func buildReportDoc(b *stress.Bank, engines []*stress.Engine, cautionV float64) *reports.ReportDoc {
	doc := &reports.ReportDoc{Tool: "rfstress " + Version, Date: reportDate(), Bank: b, CautionV: cautionV}
	for i, e := range engines {
		s := b.Sections[i]
		if s.Harmonics == nil {
			s.Harmonics = e.HarmonicLines()
		}
		doc.Filters = append(doc.Filters, reports.FilterPlot{Sweep: e.Sweep(240), BandLo: s.Conditions.BandLo,
			BandHi: s.Conditions.BandHi, Harmonics: s.Harmonics, Extra: s.Conditions.CarrierAlso})
	}
	return doc
}

// reportDate honours SOURCE_DATE_EPOCH (reproducible-builds.org) so the
// same inputs give the same report bytes.
func reportDate() time.Time {
	if s := os.Getenv("SOURCE_DATE_EPOCH"); s != "" {
		if n, err := strconv.ParseInt(s, 10, 64); err == nil {
			return time.Unix(n, 0).UTC()
		}
	}
	return time.Now().UTC()
}
