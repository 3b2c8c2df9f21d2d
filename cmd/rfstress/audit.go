package main

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"runtime/debug"
	"strings"
	"time"

	"github.com/spf13/pflag"

	"rfstress/circuits"
	"rfstress/ratings"
	"rfstress/reports"
	"rfstress/stress"
	"rfstress/tuning"
)

func init() {
	register(command{name: "audit", summary: "stress audit: every part's worst voltage, current, dissipation, flux and temperature against its derated rating; safe power; PDF report", run: runAudit})
}

// conditionFlags are the flags that map one-to-one onto audit settings, so
// a file's `audit` lines and the command line share one reader.
var conditionFlags = []struct{ name, def, help string }{
	{"power", "", "PEP in `watts` (default 100)"},
	{"mode", "", "transmit `mode`: carrier, data, fm, cw, am, ssb, data-15s (15 s of every 30 s) or tune (30 s carrier); sets the average-to-PEP ratio and the keying (default carrier)"},
	{"key-down", "", "time at the mode's average power before the core temperature is judged: a `duration` such as 90s, 5m or 1h30m, or steady (default steady state, or the mode's own on-period)"},
	{"avg-ratio", "", "average-to-PEP power `ratio`, 0 < r ≤ 1 (overrides --mode)"},
	{"drive", "", "drive `type`: available (power is the source's available power) or delivered (network absorbs it)"},
	{"harmonics", "", "harmonic `levels`: none, push-pull, single-ended, square, or dBc for 2nd,3rd,… e.g. -30,-12,-40 (default push-pull)"},
	{"harmonic-max", "", "highest harmonic `order` audited (default 9)"},
	{"band", "", "carrier band `lo:hi`, e.g. 10.1M:10.15M"},
	{"freq", "", "a single carrier `frequency` instead of a band"},
	{"points", "", "`number` of carrier frequencies across the band (default 7)"},
	{"swr", "", "`SWR` of the load circle around the antenna port's z (default 1: matched only)"},
	{"phases", "", "`number` of loads around the SWR circle (default 72)"},
	{"faults", "", "antenna `faults`: open, short, open,short or none"},
	{"derate", "", "derating `profile`: standard, strict, none, or a profile file (default standard)"},
	{"ambient", "", "ambient temperature in `°C` (default 25)"},
	{"tx-swr-max", "", "highest `SWR` the transmitter may see at its port (transmitter protection; default: shown, not judged)"},
	{"altitude", "", "station `altitude` above sea level with a unit, e.g. 1500m: air pressure for clearances (default sea level)"},
	{"part-faults", "", "single-part `faults`: each (every part shorted, then opened), or a list such as C9:short,L3:open; reported, not part of the verdict"},
}

func runAudit(args []string, stdout, stderr io.Writer) (int, error) {
	fs := newFlags("audit", "audit FILE... [conditions] [--json PATH|-] [--csv PATH|-] [--report PDF]",
		"Audits each netlist (several files form a bank, one overall verdict) under the transmit\n"+
			"conditions written in its `audit` lines, overridden by the options below. Exit status:\n"+
			"0 within limits, 1 a part beyond what --fail-on counts, 2 usage or input error.", stdout)
	vals := map[string]*string{}
	for _, f := range conditionFlags {
		vals[f.name] = fs.String(f.name, f.def, f.help)
	}
	loads := fs.StringArray("load", nil, "explicit antenna `load`, complex allowed (repeatable): 12.5-j180")
	also := fs.StringArray("carrier-also", nil, "extra carrier `frequency` outside the band, e.g. a wrong filter selected (repeatable)")
	materials := fs.String("materials", "", "`file` of extra core materials (material lines)")
	allowUnrated := fs.Bool("allow-unrated", false, "let unrated parts pass the overall verdict")
	failOn := fs.String("fail-on", "unrated", "lowest `verdict` that makes the exit status 1: advice, unrated, marginal, fail or never (a guide, advice, counts only with advice)")
	caution := fs.Float64("caution-volts", 300, "print a caution when any node exceeds this peak `volts`")
	jsonPath := fs.String("json", "", "write JSON to `PATH`, or - for stdout")
	csvPath := fs.String("csv", "", "write the part table as CSV to `PATH`, or - for stdout")
	reportPath := fs.String("report", "", "write the PDF stress report to `PATH`")
	schemPath := fs.String("schematic", "", "write each file's schematic, coloured by verdict, as SVG to `PATH`")
	tol := addTolFlags(fs)
	retune := fs.Bool("retune", false, "retune the variable parts (range=, steps=) for every load of --loads (default: the file's SWR circle and loads) and audit each match at its own settings")
	tf := addTuneFlags(fs)
	if help, err := parseFlags(fs, args); help || err != nil {
		return exitOK, err
	}
	files := fs.Args()
	if len(files) == 0 {
		return exitUsage, usagef("audit needs at least one netlist file, or - for stdin (see rfstress audit --help)")
	}
	dash := 0
	for _, f := range files {
		if f == "-" {
			dash++
		}
	}
	if dash > 1 {
		return exitUsage, usagef("- (stdin) can be read only once")
	}
	policy, err := tf.check()
	if err != nil {
		return exitUsage, err
	}
	if !*retune && (fs.Changed("loads") || fs.Changed("match-swr") || fs.Changed("tune-policy")) {
		return exitUsage, usagef("--loads, --match-swr and --tune-policy go with --retune")
	}
	if *retune && tol.trials != 0 {
		return exitUsage, usagef("--retune and --trials are not combined yet: run the tolerance analysis at the nominal settings without --retune")
	}
	threshold, err := failLevel(*failOn)
	if err != nil {
		return exitUsage, err
	}
	if err := checkNumber("caution-volts", *caution, cautionRange); err != nil {
		return exitUsage, err
	}
	if err := tol.check(); err != nil {
		return exitUsage, err
	}
	for _, o := range [][2]string{{"--report", *reportPath}, {"--schematic", *schemPath}} {
		if o[1] == "-" {
			return exitUsage, usagef("%s needs a file path", o[0])
		}
	}
	var date time.Time
	if *reportPath != "" {
		if date, err = reportDate(); err != nil {
			return exitUsage, err
		}
	}
	if *jsonPath == "-" && *csvPath == "-" {
		return exitUsage, usagef("--json - and --csv - cannot both write to stdout (send one of them to a file)")
	}
	outs := [][2]string{{"--json", *jsonPath}, {"--csv", *csvPath}, {"--report", *reportPath}, {"--schematic", *schemPath}}
	if _, err := planOutputs(outs, nil); err != nil {
		return exitUsage, err // two outputs on one path: refused before any work
	}
	var flagSettings []stress.Setting
	fs.Visit(func(f *pflag.Flag) {
		if _, ok := vals[f.Name]; ok {
			flagSettings = append(flagSettings, stress.Setting{Key: f.Name, Value: f.Value.String(), Flag: true})
		}
	})
	for _, l := range *loads {
		flagSettings = append(flagSettings, stress.Setting{Key: "load", Value: l, Flag: true})
	}
	for _, f := range *also {
		flagSettings = append(flagSettings, stress.Setting{Key: "carrier-also", Value: f, Flag: true})
	}
	// flags are read once, so a bad flag is reported once, not per file
	probe := stress.Defaults()
	if _, ferrs := probe.ApplyAll(flagSettings); len(ferrs) > 0 {
		return exitUsage, usagef("%s", strings.Join(ferrs, "\n"))
	}
	// every file read is an input the outputs must never overwrite
	var inputs []string
	for _, f := range files {
		if f != "-" {
			inputs = append(inputs, f)
		}
	}
	if *retune && *tf.loads != "" && !strings.HasPrefix(*tf.loads, "swr=") {
		inputs = append(inputs, *tf.loads)
	}
	mats := ratings.Builtin()
	if *materials != "" {
		inputs = append(inputs, *materials)
		src, err := readText("materials")(*materials)
		if err != nil {
			return exitUsage, err
		}
		extra, err := ratings.LoadMaterials(*materials, src)
		if err != nil {
			return exitUsage, usageError{err}
		}
		for k, m := range extra {
			mats[k] = m
		}
	}

	var jobs []*auditJob
	var inputErrs []string
	for _, file := range files {
		job, read, errs := prepareAudit(file, flagSettings, mats)
		inputs = append(inputs, read...)
		if len(errs) > 0 {
			inputErrs = append(inputErrs, errs...)
			continue
		}
		job.eng.AllowUnrated = *allowUnrated
		jobs = append(jobs, job)
	}
	if len(inputErrs) > 0 {
		return exitUsage, usageError{fmt.Errorf("%s", strings.Join(inputErrs, "\n"))}
	}
	targets, err := planOutputs(outs, inputs)
	if err != nil {
		return exitUsage, err
	}

	var start *reports.PDFStart
	if *reportPath != "" {
		start = reports.StartPDF() // the report's fonts are read meanwhile
	}
	// each file is audited on its own: with no progress bar to show (and
	// no trials or retuning, which have workers of their own) the files
	// run on parallel workers, each result kept in its file's place
	results := make([]auditResult, len(jobs))
	auditOne := func(i int) {
		job := jobs[i]
		if *retune && len(tuning.Vars(job.c)) > 0 {
			sec, err := retuneFile(job.c, job.rs, job.cond, *allowUnrated, tf, policy)
			if err != nil {
				results[i].err = usagef("%s: %v", circuits.Escape(job.name), err)
				return
			}
			results[i] = auditResult{secs: []*stress.Section{sec}, engs: []*stress.Engine{sec.Engine}, retuned: true}
			return
		}
		if len(job.c.NL.Selects) > 0 || job.cond.PartFaults != "" {
			// select positions and single-part faults: several audits
			secs, engs, err := stress.AuditNetlist(job.c, job.rs, job.cond, *allowUnrated)
			if err != nil {
				results[i].err = usagef("%s: %v", circuits.Escape(job.name), err)
				return
			}
			results[i] = auditResult{secs: secs, engs: engs}
			return
		}
		sec, err := auditWithProgress(job.eng, tol.quiet, stderr)
		if err != nil {
			results[i].err = usagef("%s: %v", circuits.Escape(job.name), err)
			return
		}
		results[i] = auditResult{secs: []*stress.Section{sec}, engs: []*stress.Engine{job.eng}}
	}
	auditTol := func(i int) {
		auditOne(i)
		r := &results[i]
		for k, sec := range r.secs {
			if r.err != nil || tol.trials == 0 {
				return
			}
			tr, err := runTolerance(r.engs[k], sec, tol, stderr)
			if err != nil {
				r.err = err
				return
			}
			sec.Tolerance = tr
		}
	}
	workers := 1
	if !*retune && tol.trials == 0 && !showsProgress(tol.quiet, stderr) {
		workers = poolSize(tol.workers, len(jobs))
	}
	forEach(len(jobs), workers, auditTol, func(i int) bool { return results[i].err != nil })

	var sections []*stress.Section
	var engines []*stress.Engine
	retuned := 0
	for i := range jobs {
		r := results[i]
		if r.err != nil {
			return exitUsage, r.err
		}
		if r.retuned {
			retuned++
		}
		sections = append(sections, r.secs...)
		engines = append(engines, r.engs...)
	}
	if *retune && retuned == 0 {
		return exitUsage, usagef("--retune: no file has a variable part (give a capacitor or inductor range=lo:hi)")
	}
	bank := stress.NewBank(sections)

	// while a report is drawn the text is formatted beside it (it only
	// reads the bank), and printed after the report as before
	text := func(w io.Writer) error { return reports.WriteAuditTextWidth(w, bank, *caution, textWidth(stdout)) }
	toStdout := false
	for _, t := range targets {
		toStdout = toStdout || t.path == "-"
	}
	if *reportPath != "" && !toStdout {
		var buf bytes.Buffer
		done := make(chan error, 1)
		var fault *panicked
		format := text
		go func() {
			defer func() {
				if r := recover(); r != nil {
					fault = &panicked{r} // raised again below, as exit 3
					done <- nil
				}
			}()
			done <- format(&buf)
		}()
		text = func(w io.Writer) error {
			err := <-done
			if fault != nil {
				panic(fault.v)
			}
			if err != nil {
				return err
			}
			_, err = buf.WriteTo(w)
			return err
		}
	}

	wroteStdout := false
	for _, t := range targets {
		var fn func(io.Writer) error
		switch t.flag {
		case "--json":
			fn = func(w io.Writer) error { return reports.WriteAuditJSON(w, reports.AuditJSON(bank)) }
		case "--csv":
			fn = func(w io.Writer) error { return reports.WriteAuditCSV(w, bank) }
		case "--report":
			doc := startReportDoc(bank, engines, *caution, date, poolSize(tol.workers, len(engines)))
			doc.Start = start
			fn = func(w io.Writer) error {
				defer reportGC()()
				return writePDF(w, doc)
			}
		case "--schematic":
			fn = func(w io.Writer) error { return reports.WriteSchematicSVG(w, bank) }
		}
		if err := t.write(stdout, fn); err != nil {
			return exitUsage, err
		}
		wroteStdout = wroteStdout || t.path == "-"
	}
	if !wroteStdout {
		if err := text(stdout); err != nil {
			return exitUsage, err
		}
		for _, s := range bank.Sections {
			if s.Retune != nil {
				fmt.Fprintln(stdout)
				if err := reports.WriteTuneText(stdout, reports.RetuneView(s)); err != nil {
					return exitUsage, err
				}
			}
		}
		if *reportPath != "" {
			fmt.Fprintf(stdout, "  report written to %s\n", circuits.Escape(*reportPath))
		}
	} else {
		for _, s := range bank.Sections {
			if s.MaxNodeVpk >= *caution {
				dc := ""
				if s.MaxNodeVdc > 0 {
					dc = fmt.Sprintf(" (%s of it DC)", circuits.FormatSI(s.MaxNodeVdc, "V"))
				}
				fmt.Fprintf(stderr, "rfstress: CAUTION: %s peak at %s node %s%s; never touch or adjust while transmitting (SAFETY.md)\n",
					circuits.FormatSI(s.MaxNodeVpk, "V"), circuits.Escape(s.File), s.MaxNodeAt, dc)
			}
		}
		if dc := reports.DCCaution(bank); dc != "" {
			fmt.Fprintf(stderr, "rfstress: CAUTION: %s\n", dc)
		}
	}
	// a part marginal only through a guide (advice, not a rating) does
	// not fail a build unless --fail-on advice asks for it
	v := bank.Rated
	if threshold == failAdvice {
		v, threshold = bank.Verdict, int(ratings.Unrated)
	}
	if threshold >= 0 && v >= ratings.Verdict(threshold) && v != ratings.OK {
		return exitOver, nil
	}
	return exitOK, nil
}

// reportGCPercent is the collector's GOGC while the PDF is drawn. The
// report allocates some 70 MB (gofpdf formats every operator into new
// strings and copies its buffers) over a live heap of 6–15 MB, so at the
// default 100 the collector ran about ten times for one report, a tenth
// of the run's wall time; at 400 it runs two or three times and the heap
// peaks a few tens of MB higher. Restored when the report is written.
const reportGCPercent = 400

// reportGC raises GOGC to reportGCPercent (never lowers it, nor turns a
// GOGC=off collector on) and returns what restores it.
func reportGC() (restore func()) {
	old := debug.SetGCPercent(reportGCPercent)
	if old < 0 || old > reportGCPercent {
		debug.SetGCPercent(old) // the user's GOGC already collects less
	}
	return func() { debug.SetGCPercent(old) }
}

// cautionRange bounds --caution-volts: a NaN would silence the caution.
var cautionRange = circuits.Range{Lo: 0, Hi: 100e6, Unit: "V"}

// prepareAudit reads one netlist with its conditions, profile and
// ratings. It returns every input error of the file together: the
// parser's and those of its audit lines, merged in line order, and it
// lists the files it read besides the netlist (measured data, a profile).
func prepareAudit(file string, flagSettings []stress.Setting, mats map[string]*ratings.Material) (*auditJob, []string, []string) {
	name, src, err := readNetlistSource(file)
	if err != nil {
		return nil, nil, []string{err.Error()}
	}
	nl, perr := circuits.Parse(name, src)
	var errs circuits.ErrorList
	if perr != nil {
		el, ok := perr.(circuits.ErrorList)
		if !ok || nl == nil {
			return nil, nil, []string{perr.Error()}
		}
		errs = el
	}
	cond := stress.Defaults()
	ferrs, _ := cond.ApplyAll(append(stress.FileSettings(nl), flagSettings...))
	errs = append(errs, ferrs...)
	if len(errs) > 0 {
		errs.Sort()
		return nil, nil, []string{errs.Error()}
	}
	read := measuredFiles(nl)
	if err := circuits.LoadMeasured(nl, readMeasured); err != nil {
		return nil, read, []string{err.Error()}
	}
	c, err := circuits.Build(nl)
	if err != nil {
		return nil, read, []string{err.Error()}
	}
	if len(nl.Selects) > 0 {
		// each select position brings its own band (stress.Variants)
		cond.BandLo, cond.BandHi = nl.Selects[0].Lo, nl.Selects[0].Hi
	}
	if err := cond.Check(); err != nil {
		return nil, read, []string{circuits.Escape(name) + ": " + err.Error()}
	}
	if ratings.BuiltinProfile(cond.Derate) == nil {
		read = append(read, cond.Derate)
	}
	prof, err := ratings.LoadProfile(cond.Derate, readText("derating profile"))
	if err != nil {
		if _, isList := err.(circuits.ErrorList); !isList {
			msg := fmt.Sprintf("derating profile %s is neither built in (%s) nor a readable file: %v",
				circuits.Quote(cond.Derate), strings.Join(ratings.ProfileNames, ", "), errors.Unwrap(err))
			if cond.DerateAt.File != "" {
				return nil, read, []string{(&circuits.Error{Pos: cond.DerateAt, Msg: "derate=" + circuits.Clip(cond.Derate) + ": " + msg}).Error()}
			}
			return nil, read, []string{"--derate: " + msg}
		}
		return nil, read, []string{err.Error()}
	}
	rs, err := ratings.Prepare(nl, mats, prof)
	if err != nil {
		return nil, read, []string{err.Error()}
	}
	eng, err := stress.NewEngine(c, rs, cond)
	if err != nil {
		return nil, read, []string{circuits.Escape(name) + ": " + err.Error()}
	}
	return &auditJob{name: name, c: c, rs: rs, cond: cond, eng: eng}, read, nil
}

// auditResult is one file's audit: its sections (several for select
// positions or part faults) and their engines.
type auditResult struct {
	secs    []*stress.Section
	engs    []*stress.Engine
	retuned bool
	err     error
}

// auditJob is one file read and checked, ready to audit.
type auditJob struct {
	name string
	c    *circuits.Circuit
	rs   *ratings.Set
	cond stress.Conditions
	eng  *stress.Engine
}

// failAdvice is --fail-on advice: the full verdict, guides counted, from
// unrated up.
const failAdvice = -2

func failLevel(s string) (int, error) {
	switch strings.ToLower(s) {
	case "advice":
		return failAdvice, nil
	case "unrated":
		return int(ratings.Unrated), nil
	case "marginal":
		return int(ratings.Marginal), nil
	case "fail":
		return int(ratings.Fail), nil
	case "never":
		return -1, nil
	}
	return 0, usagef("--fail-on %s: expected advice, unrated, marginal, fail or never", s)
}

// retuneFile tunes a file's variable parts for every load and audits each
// match. The load set is --loads, else a measured antenna port's data at
// the band carriers, else the file's own SWR circle (as a region: centre
// and rings) and explicit loads.
func retuneFile(c *circuits.Circuit, rs *ratings.Set, cond stress.Conditions, allowUnrated bool, tf *tuneFlags, policy tuning.Policy) (*stress.Section, error) {
	m, err := tuning.NewMatcher(c, *tf.swr, policy)
	if err != nil {
		return nil, err
	}
	var ls *tuning.LoadSet
	if *tf.loads != "" {
		if ls, err = tuning.ParseLoads(*tf.loads, c.Zout, readText("load file")); err != nil {
			return nil, err
		}
		if c.HasMeasuredAntenna() {
			// an SWR region centres on the measured antenna at each carrier,
			// as the audit's own SWR circle does
			carriers := cond.Carriers()
			ls = ls.About(c.AntennaZ, carriers[:len(carriers)-len(cond.CarrierAlso)])
		}
	} else if c.HasMeasuredAntenna() {
		// the antenna's own measured impedance at each band carrier
		ls = &tuning.LoadSet{Source: "port out's measured impedance", File: true}
		carriers := cond.Carriers()
		for _, f := range carriers[:len(carriers)-len(cond.CarrierAlso)] {
			ls.Points = append(ls.Points, tuning.LoadPoint{F: f, Z: c.AntennaZ(f)})
		}
	} else {
		ls = tuning.Region(c.Zout, cond.SWR)
		ls.Source = fmt.Sprintf("port out's z, the file's SWR %g region and loads", cond.SWR)
		for _, z := range cond.Loads {
			ls.Points = append(ls.Points, tuning.LoadPoint{Z: z})
		}
	}
	return stress.RetuneAudit(c, rs, cond, allowUnrated, ls, m, *tf.workers)
}
