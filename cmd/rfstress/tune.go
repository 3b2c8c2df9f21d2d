package main

import (
	"io"

	"rfstress/reports"
	"rfstress/stress"
	"rfstress/tuning"
)

func init() {
	register(command{name: "tune", summary: "find the settings of a tuner's variable parts (range=, steps=) for each load: a tuning chart", run: runTune})
}

// tuneFlags are shared by tune and audit --retune.
type tuneFlags struct {
	loads   *string
	swr     *float64
	policy  *string
	workers *int
}

func addTuneFlags(fs interface {
	String(string, string, string) *string
	Float64(string, float64, string) *float64
	Int(string, int, string) *int
}) *tuneFlags {
	return &tuneFlags{
		loads:   fs.String("loads", "", "load `set`: a CSV file (header frequency,R,X), a one-port Touchstone .s1p file, or swr=S (the region within SWR S around port out's z)"),
		swr:     fs.Float64("match-swr", tuning.DefaultSWR, "`SWR` at the transmitter a setting must reach to count as a match"),
		policy:  fs.String("tune-policy", "least-loss", "which match to choose when several do: `policy` least-loss, least-voltage or largest-c"),
		workers: fs.Int("tune-workers", 0, "`number` of loads tuned at once (0: one per CPU); results do not depend on it"),
	}
}

func (t *tuneFlags) check() (tuning.Policy, error) {
	p, err := tuning.PolicyByName(*t.policy)
	if err != nil {
		return 0, usagef("--tune-policy: %v", err)
	}
	if !(*t.swr >= 1) || *t.swr > 100 {
		return 0, usagef("--match-swr %g: expected an SWR from 1 to 100, e.g. 1.2", *t.swr)
	}
	if *t.workers < 0 || *t.workers > 1024 {
		return 0, usagef("--tune-workers must be from 0 to 1024")
	}
	return p, nil
}

func runTune(args []string, stdout, stderr io.Writer) (int, error) {
	fs := newFlags("tune", "tune FILE [--freq F] (--load Z… | --loads FILE|swr=S) [--match-swr 1.2] [--tune-policy P] [--power W] [--json PATH|-] [--csv PATH|-]",
		"Finds, for each load, the settings of the netlist's variable parts (range=, steps=) that\n"+
			"match the load to the transmitter, and prints them as a tuning chart to keep with the\n"+
			"station. Continuous parts are set by Nelder–Mead from several starts, switched parts by\n"+
			"trying every combination. A load no setting matches is marked unmatchable, with the best\n"+
			"SWR reached and the range limit that stopped it.", stdout)
	freq := fs.String("freq", "", "carrier `frequency` (required with --load and --loads swr=; with a load file, the load is interpolated there)")
	loads := fs.StringArray("load", nil, "antenna-port `load` to tune for, complex allowed (repeatable): 12.5-j180")
	power := fs.Float64("power", 100, "available power in `watts` for the peak voltages shown")
	jsonPath := fs.String("json", "", "write JSON to `PATH`, or - for stdout")
	csvPath := fs.String("csv", "", "write CSV to `PATH`, or - for stdout")
	tf := addTuneFlags(fs)
	if help, err := parseFlags(fs, args); help || err != nil {
		return exitOK, err
	}
	if fs.NArg() != 1 {
		return exitUsage, usagef("tune needs exactly one netlist file (see rfstress tune --help)")
	}
	policy, err := tf.check()
	if err != nil {
		return exitUsage, err
	}
	if err := checkNumber("power", *power, stress.PowerRange); err != nil {
		return exitUsage, err
	}
	if (len(*loads) == 0) == (*tf.loads == "") {
		return exitUsage, usagef("tune needs either --load Z (repeatable) or --loads FILE|swr=S")
	}
	file := fs.Arg(0)
	inputs := []string{file}
	nl, c, err := loadNetlist(file)
	if err != nil {
		return exitUsage, err
	}
	var f float64
	if *freq != "" {
		if f, err = parseFreq("freq", *freq); err != nil {
			return exitUsage, err
		}
	}
	var ls *tuning.LoadSet
	if *tf.loads != "" {
		ls, err = tuning.ParseLoads(*tf.loads, c.Zout, readText("load file"))
		if err != nil {
			return exitUsage, usageError{err}
		}
		if ls.File {
			inputs = append(inputs, *tf.loads)
		} else if c.HasMeasuredAntenna() && f > 0 {
			ls = ls.About(c.AntennaZ, []float64{f})
		}
	} else {
		ls = &tuning.LoadSet{Source: "--load"}
		for _, s := range *loads {
			ld, _, err := parseLoad(s)
			if err != nil {
				return exitUsage, err
			}
			if ld.Open {
				return exitUsage, usagef("--load open: an open antenna cannot be matched; give an impedance")
			}
			ls.Points = append(ls.Points, tuning.LoadPoint{Z: ld.Z})
		}
	}
	var cases []tuning.Case
	switch {
	case ls.File && f == 0:
		for _, p := range ls.Points {
			cases = append(cases, tuning.Case{F: p.F, Load: p})
		}
	case f == 0:
		return exitUsage, usagef("tune needs --freq with --load or --loads swr=")
	default:
		if cases, err = ls.Cases([]float64{f}, f, f); err != nil {
			return exitUsage, usageError{err}
		}
	}
	// every output checked before the work and before any is written
	targets, err := planOutputs([][2]string{{"--json", *jsonPath}, {"--csv", *csvPath}}, append(inputs, measuredFiles(nl)...))
	if err != nil {
		return exitUsage, err
	}
	m, err := tuning.NewMatcher(c, *tf.swr, policy)
	if err != nil {
		return exitUsage, usageError{err}
	}
	res, err := m.TuneAll(cases, *tf.workers)
	if err != nil {
		return exitUsage, usagef("%s: %v", file, err)
	}
	v := reports.TuneChart(nl, m, ls, cases, res, *power)
	wroteStdout := false
	for _, t := range targets {
		fn := func(w io.Writer) error { return reports.WriteTuneJSON(w, []*reports.TuneView{v}) }
		if t.flag == "--csv" {
			fn = func(w io.Writer) error { return reports.WriteTuneCSV(w, v) }
		}
		if err := t.write(stdout, fn); err != nil {
			return exitUsage, err
		}
		wroteStdout = wroteStdout || t.path == "-"
	}
	if !wroteStdout {
		if err := reports.WriteTuneText(stdout, v); err != nil {
			return exitUsage, err
		}
	}
	return exitOK, nil
}
