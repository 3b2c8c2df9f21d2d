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

	"rfstress/circuits"
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
	fs.IntVar(&t.workers, "workers", 0, "parallel `workers` for the trials and for the files of a bank (default: all cores); results do not depend on it")
	fs.BoolVar(&t.quiet, "quiet", false, "no progress bar")
	return t
}

// isTerminal reports whether f is a character device (a terminal), so the
// progress bar never lands in a redirected file or a pipe.
func isTerminal(f *os.File) bool {
	st, err := f.Stat()
	return err == nil && st.Mode()&os.ModeCharDevice != 0
}

// check validates the tolerance flags before any work is done.
func (t *tolFlags) check() error {
	if t.trials < 0 || t.trials > 10_000_000 {
		return usagef("--trials must be between 1 and 10000000")
	}
	if d := strings.ToLower(t.dist); d == "normal" || d == "uniform" {
		t.dist = d
	}
	if t.dist != "normal" && t.dist != "uniform" {
		return usagef("--dist %s: expected normal or uniform", circuits.Clip(t.dist))
	}
	if t.workers < 0 || t.workers > 1024 {
		return usagef("--workers must be between 0 (all cores) and 1024")
	}
	return nil
}

// progressDelay is how long work runs before a progress bar appears: a
// quick run stays quiet.
const progressDelay = time.Second

// withProgress runs work while a bar on a terminal stderr shows done out
// of total once work has run for progressDelay; never on a pipe or file.
func withProgress(quiet bool, stderr io.Writer, name, unit string, total int, done *atomic.Int64, work func() error) error {
	f, isFile := stderr.(*os.File)
	if quiet || !isFile || !isTerminal(f) || total <= 0 {
		return work()
	}
	stop := make(chan struct{})
	finished := make(chan struct{})
	go func() {
		defer close(finished)
		start := time.Now()
		tick := time.NewTicker(100 * time.Millisecond)
		defer tick.Stop()
		shown := false
		for {
			select {
			case <-stop:
				if shown {
					progress(stderr, name, unit, total, total)
					fmt.Fprintln(stderr)
				}
				return
			case <-tick.C:
				if time.Since(start) >= progressDelay {
					shown = true
					progress(stderr, name, unit, int(done.Load()), total)
				}
			}
		}
	}()
	err := work()
	close(stop)
	<-finished
	return err
}

func runTolerance(eng *stress.Engine, sec *stress.Section, t *tolFlags, stderr io.Writer) (*stress.Tolerance, error) {
	var done atomic.Int64
	opt := stress.TolOptions{Trials: t.trials, Seed: t.seed, Dist: t.dist, Workers: t.workers, Done: &done}
	var res *stress.Tolerance
	err := withProgress(t.quiet, stderr, sec.File, "trials", t.trials, &done, func() error {
		var err error
		res, err = eng.Tolerance(opt)
		return err
	})
	if err != nil {
		return nil, fmt.Errorf("%s: %v", circuits.Escape(sec.File), err)
	}
	return res, nil
}

// auditWithProgress runs the audit of one file, with a bar counting
// carriers when it takes more than about a second on a terminal.
func auditWithProgress(eng *stress.Engine, quiet bool, stderr io.Writer) (*stress.Section, error) {
	var done atomic.Int64
	eng.Progress = &done
	defer func() { eng.Progress = nil }()
	var sec *stress.Section
	err := withProgress(quiet, stderr, eng.C.NL.File, "carriers", len(eng.Cond.Carriers()), &done, func() error {
		var err error
		sec, err = eng.Audit()
		return err
	})
	return sec, err
}

func progress(w io.Writer, name, unit string, done, total int) {
	const width = 30
	if done > total {
		done = total
	}
	n := width * done / total
	fmt.Fprintf(w, "\r%s [%s%s] %d/%d %s", circuits.Clip(name), strings.Repeat("#", n), strings.Repeat(".", width-n), done, total, unit)
}

// reportDate honours SOURCE_DATE_EPOCH (reproducible-builds.org) so the
// same inputs give the same report bytes. The specification asks for a
// whole, non-negative number of seconds since 1970; anything else is an
// error rather than a silent "now", which would break reproducibility
// without a word. Years past 9999 are refused too: no date format shows them.
func reportDate() (time.Time, error) {
	s, set := os.LookupEnv("SOURCE_DATE_EPOCH")
	if !set {
		return time.Now().UTC(), nil
	}
	n, err := strconv.ParseInt(s, 10, 64)
	if err != nil || n < 0 || n > 253402300799 || strings.TrimSpace(s) != s {
		return time.Time{}, usagef("SOURCE_DATE_EPOCH=%s is not a whole number of seconds since 1970-01-01 UTC up to year 9999 (reproducible-builds.org); unset it or fix it", circuits.Clip(s))
	}
	return time.Unix(n, 0).UTC(), nil
}

// chartR0 is the resistance the antenna-port load chart is drawn for: the
// antenna port's own, so its matched load sits at the centre (a valve's
// 2500 Ω plate would push every 50 Ω load to the rim); the transmitter
// port's when the antenna port's has no positive resistance.
func chartR0(c *circuits.Circuit) float64 {
	if r := real(c.Zout); r > 0 {
		return r
	}
	return real(c.Zin)
}
