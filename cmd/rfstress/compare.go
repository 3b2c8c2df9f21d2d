package main

import (
	"fmt"
	"io"
	"strings"
	"time"

	"rfstress/circuits"
	"rfstress/reports"
	"rfstress/stress"
)

func init() {
	register(command{name: "compare", summary: "the model's response against a measured two-port; heat in the built filter; Q fitted to the bench", run: runCompare})
}

func runCompare(args []string, stdout, stderr io.Writer) (int, error) {
	fs := newFlags("compare", "compare FILE MEASURED.s2p [--band LO:HI|--freq F] [--power W] [--fit q|q-class [--fit-band LO:HI] [--out FILE]] [--json PATH|-] [--report PDF]",
		"Sets the netlist's two-port response against a measured sweep of the built filter\n"+
			"(Touchstone 1.x or 2.0): the largest differences in the band and at the harmonics,\n"+
			"and the share of the power the built filter turns into heat at each carrier. With\n"+
			"--fit it fits the inductors' Q to the measurement and can write a calibrated netlist.", stdout)
	band := fs.String("band", "", "carrier band `lo:hi` (default: the netlist's audit line)")
	freq := fs.String("freq", "", "a single carrier `frequency`")
	points := fs.String("points", "", "`number` of carriers across the band")
	power := fs.String("power", "", "power in `watts` at which heat is stated (default: the audit line's, else 100)")
	hmax := fs.String("harmonic-max", "", "highest harmonic `order` compared (default 9)")
	fit := fs.String("fit", "", "fit inductor Q to the measurement: q (a factor per inductor) or q-class (one for all)")
	fitBand := fs.String("fit-band", "", "frequencies `lo:hi` the fit uses (default: the carrier band)")
	outPath := fs.String("out", "", "write the calibrated netlist to `FILE` (with --fit; never over an input)")
	jsonPath := fs.String("json", "", "write JSON to `PATH`, or - for stdout")
	reportPath := fs.String("report", "", "write a PDF page overlaying model and measurement to `PATH`")
	if help, err := parseFlags(fs, args); help || err != nil {
		return exitOK, err
	}
	if fs.NArg() != 2 {
		return exitUsage, usagef("compare needs a netlist and a measured two-port file (see rfstress compare --help)")
	}
	if *fit != "" && *fit != "q" && *fit != "q-class" {
		return exitUsage, usagef("--fit %s: unknown fit (q or q-class)", *fit)
	}
	if *outPath != "" && *fit == "" {
		return exitUsage, usagef("--out writes the calibrated netlist, which needs --fit q or --fit q-class")
	}
	file, measPath := fs.Arg(0), fs.Arg(1)
	inputs := []string{file, measPath}
	// all outputs checked together, before any work: no two on one path
	if _, err := planOutputs([][2]string{{"--out", *outPath}, {"--json", *jsonPath}, {"--report", *reportPath}}, inputs); err != nil {
		return exitUsage, err
	}
	var date time.Time
	if *reportPath != "" {
		var err error
		if date, err = reportDate(); err != nil {
			return exitUsage, err
		}
	}
	nl, c, err := loadNetlist(file)
	if err != nil {
		return exitUsage, err
	}
	for _, r := range nl.MeasuredRefs() {
		inputs = append(inputs, r.Path)
	}
	src, err := readMeasured(measPath)
	if err != nil {
		return exitUsage, usagef("cannot read %s: %v", measPath, err)
	}
	ts, err := circuits.ParseTouchstone(measPath, src)
	if err != nil {
		return exitUsage, usageError{err}
	}
	cond := stress.Defaults()
	var settings []stress.Setting
	for k, v := range map[string]*string{"band": band, "freq": freq, "points": points, "power": power, "harmonic-max": hmax} {
		if *v != "" {
			settings = append(settings, stress.Setting{Key: k, Value: *v, Flag: true})
		}
	}
	// flag order does not matter here, but messages should not depend on map order
	sortSettings(settings)
	if err := cond.Apply(append(stress.FileSettings(nl), settings...)); err != nil {
		return exitUsage, err
	}
	if err := cond.Check(); err != nil {
		return exitUsage, usagef("%s: %v", file, err)
	}
	carriers := cond.Carriers()
	cmp, err := stress.Compare(c, ts, carriers, len(carriers)-len(cond.CarrierAlso), cond.HarmonicMax, cond.PowerW)
	if err != nil {
		return exitUsage, usagef("%s: %v", file, err)
	}
	v := &reports.CompareView{File: file, Title: nl.Title, Measured: measPath, Points: len(ts.F), Ref: ts.Ref, Cmp: cmp, FitBy: *fit}
	if *fit != "" {
		lo, hi := cond.BandLo, cond.BandHi
		if *fitBand != "" {
			l, h, ok := strings.Cut(*fitBand, ":")
			if !ok {
				return exitUsage, usagef("--fit-band %s: expected lo:hi, e.g. 6.5M:7.8M", *fitBand)
			}
			if lo, err = parseFreq("fit-band", l); err != nil {
				return exitUsage, err
			}
			if hi, err = parseFreq("fit-band", h); err != nil {
				return exitUsage, err
			}
			if hi < lo {
				return exitUsage, usagef("--fit-band %s: hi is below lo", *fitBand)
			}
		}
		fr, err := stress.FitQ(c, ts, lo, hi, *fit == "q")
		if err != nil {
			return exitUsage, usagef("%s: %v", file, err)
		}
		v.Fit = fr
		if *outPath != "" {
			scales := map[string]float64{}
			header := []string{fmt.Sprintf("calibrated by rfstress compare --fit %s against %s", *fit, circuits.Escape(measPath))}
			for _, g := range fr.Groups {
				if g.AtBound || !(g.Sigma < 1e6) {
					// a factor the fit could not determine is not written:
					// a Q raised ×50 on no evidence would hide a coil's heat
					header = append(header, fmt.Sprintf("  %s: Q as written (the fit gave × %.3f but could not determine it: not applied)", strings.Join(g.Parts, ","), g.Scale))
					continue
				}
				for _, p := range g.Parts {
					scales[p] = g.Scale
				}
				header = append(header, fmt.Sprintf("  %s: Q × %.3f ± %.3f", strings.Join(g.Parts, ","), g.Scale, g.Sigma))
			}
			out := nl.WithQScales(scales, header)
			if err := writeTo(*outPath, stdout, inputs, func(w io.Writer) error { _, err := w.Write(out); return err }); err != nil {
				return exitUsage, usageError{err}
			}
			v.Calibrated = *outPath
		}
	}
	if *reportPath != "" {
		if err := writeTo(*reportPath, stdout, inputs, func(w io.Writer) error {
			return reports.WriteComparePDF(w, v, "rfstress "+Version, date)
		}); err != nil {
			return exitUsage, usageError{err}
		}
	}
	if *jsonPath != "" {
		if err := writeTo(*jsonPath, stdout, inputs, func(w io.Writer) error { return reports.WriteCompareJSON(w, v) }); err != nil {
			return exitUsage, usageError{err}
		}
		if *jsonPath == "-" {
			return exitOK, nil
		}
	}
	return exitOK, reports.WriteCompareText(stdout, v)
}

func sortSettings(s []stress.Setting) {
	for i := 1; i < len(s); i++ {
		for j := i; j > 0 && s[j].Key < s[j-1].Key; j-- {
			s[j], s[j-1] = s[j-1], s[j]
		}
	}
}
