package main

import (
	"fmt"
	"io"
	"math"
	"math/cmplx"

	"rfstress/circuits"
	"rfstress/ratings"
	"rfstress/reports"
	"rfstress/stress"
)

func init() {
	register(command{name: "solve", summary: "solve one netlist at one frequency and list every part's voltage, current and dissipation", run: runSolve})
	register(command{name: "response", summary: "frequency response (S-parameters) of a netlist, as a table, CSV or Touchstone 2.0", run: runResponse})
}

// parseLoad reads --load: an impedance, or the words open or short.
func parseLoad(s string) (circuits.Load, string, error) {
	switch s {
	case "open":
		return circuits.OpenLoad, "open (antenna disconnected)", nil
	case "short":
		return circuits.Short, "short", nil
	}
	z, err := circuits.ParseComplex(s)
	if err != nil {
		return circuits.Load{}, "", usagef("--load %s: %v (an impedance such as 50 or 12.5-j180, or open, or short)", circuits.Clip(s), err)
	}
	if real(z) < 0 {
		return circuits.Load{}, "", usagef("--load %s: a passive load has no negative resistance", circuits.Clip(s))
	}
	if !stress.LoadRange.Holds(cmplx.Abs(z)) {
		return circuits.Load{}, "", usagef("--load %s: outside the accepted range |z| %s", circuits.Clip(s), stress.LoadRange.Text())
	}
	return circuits.Load{Z: z}, circuits.FormatComplex(z), nil
}

func runSolve(args []string, stdout, stderr io.Writer) (int, error) {
	fs := newFlags("solve", "solve FILE --freq F [--power W] [--load Z] [--json PATH|-]",
		"Solves the netlist at one frequency with the transmitter at port in (its power given as\navailable power from a source of the port's impedance) and the antenna port loaded by\nits own z or by --load.", stdout)
	freq := fs.String("freq", "", "carrier `frequency`, e.g. 10.1M (required)")
	power := fs.Float64("power", 100, "available power from the transmitter in `watts`")
	load := fs.String("load", "", "antenna-port `load`: impedance (12.5-j180), open or short; default the port's z")
	jsonPath := fs.String("json", "", "write JSON to `PATH`, or - for stdout")
	if help, err := parseFlags(fs, args); help || err != nil {
		return exitOK, err
	}
	if fs.NArg() != 1 {
		return exitUsage, usagef("solve needs exactly one netlist file (see rfstress solve --help)")
	}
	if *freq == "" {
		return exitUsage, usagef("solve needs --freq, e.g. --freq 10.1M")
	}
	f, err := parseFreq("freq", *freq)
	if err != nil {
		return exitUsage, err
	}
	if err := checkNumber("power", *power, stress.PowerRange); err != nil {
		return exitUsage, err
	}
	file := fs.Arg(0)
	if _, err := planOutputs([][2]string{{"--json", *jsonPath}}, nil); err != nil {
		return exitUsage, err
	}
	nl, c, err := loadNetlist(file)
	if err != nil {
		return exitUsage, err
	}
	targets, err := planOutputs([][2]string{{"--json", *jsonPath}}, netlistInputs(file, nl))
	if err != nil {
		return exitUsage, err
	}
	ld := circuits.Load{Z: c.Zout}
	ldText := circuits.FormatComplex(c.Zout) + " (port z)"
	if *load != "" {
		if ld, ldText, err = parseLoad(*load); err != nil {
			return exitUsage, err
		}
	}
	r, check, err := c.SolveChecked(f, *power, ld)
	if err != nil {
		return exitUsage, usagef("%s: %v", file, err)
	}
	sp, err := c.TwoPort(f)
	if err != nil {
		return exitUsage, usagef("%s: %v", file, err)
	}
	v := &reports.SolveView{File: file, Title: nl.Title, FrequencyHz: f, PowerW: *power, Load: ldText,
		PinW: r.Pin, PoutW: r.Pout, PlossW: r.Ploss, ZinRe: finite(real(r.Zin)), ZinIm: finite(imag(r.Zin)),
		S11dB: circuits.DB(sp.S11), S11deg: circuits.PhaseDeg(sp.S11), S21dB: circuits.DB(sp.S21), S21deg: circuits.PhaseDeg(sp.S21)}
	if !check.OK() {
		// a wrong input impedance looks like any other: show none
		v.ZinRe, v.ZinIm = nil, nil
		v.Findings = append(v.Findings, check.Finding(f))
	}
	g, _, refl := c.Reflection(r.Vin, r.Iin)
	v.TxSWR, v.TxReflW = stress.SWRFromGamma(g), refl
	if c.HasCM {
		v.IcmA, v.PcmW = finite(cmplx.Abs(r.Icm)), finite(r.Pcm)
	}
	dc, err := solveDC(nl, c)
	if err != nil {
		return exitUsage, usagef("%s: %v", file, err)
	}
	for i, e := range c.Elements {
		ps := r.Parts[i]
		sp := reports.SolvePart{Name: e.Name, Kind: string(e.Kind),
			Vrms: cmplx.Abs(ps.V), Vpk: math.Sqrt2 * cmplx.Abs(ps.V), Irms: cmplx.Abs(ps.I), Pdiss: ps.Ploss}
		if l := e.Line(); l != nil {
			// a line's stress is its crest along it, not its end
			vw, iw := l.VoltageWaves(ps.V, ps.I)
			vm, zv := l.MaxAlong(f, vw, circuits.Wave{}, 0)
			im, zi := l.MaxAlong(f, iw, circuits.Wave{}, 0)
			sp.Vrms, sp.Vpk, sp.Irms = vm, math.Sqrt2*vm, im
			sp.Note = fmt.Sprintf("crests along the line: voltage at %s, current at %s from end 1; end 1 %s, %s; end 2 %s, %s",
				circuits.FormatSI(zv, "m"), circuits.FormatSI(zi, "m"), circuits.FormatSI(cmplx.Abs(ps.V), "V"), circuits.FormatSI(cmplx.Abs(ps.I), "A"),
				circuits.FormatSI(cmplx.Abs(ps.V2), "V"), circuits.FormatSI(cmplx.Abs(ps.I2), "A"))
		}
		if ps.It != 0 {
			sp.Note = fmt.Sprintf("winding current %s (shown), terminal current %s", circuits.FormatSI(cmplx.Abs(ps.I), "A"), circuits.FormatSI(cmplx.Abs(ps.It), "A"))
		}
		if dc != nil {
			sp.Vdc, sp.Idc = finite(real(dc.Parts[i].V)), finite(real(dc.Parts[i].I))
		}
		v.Components = append(v.Components, sp)
	}
	for _, t := range targets {
		if err := t.write(stdout, func(w io.Writer) error { return reports.WriteSolveJSON(w, v) }); err != nil {
			return exitUsage, err
		}
		if t.path == "-" {
			return exitOK, nil
		}
	}
	return exitOK, reports.WriteSolveText(stdout, v)
}

func runResponse(args []string, stdout, stderr io.Writer) (int, error) {
	fs := newFlags("response", "response FILE [--from F] [--to F] [--points N] [--log] [--csv PATH|-] [--touchstone PATH]",
		"Sweeps the netlist's two-port response between its ports, each port terminated in its\nown z. Touchstone output follows the Touchstone 2.0 specification (IBIS Open Forum).", stdout)
	from := fs.String("from", "1M", "start `frequency`")
	to := fs.String("to", "60M", "stop `frequency`")
	points := fs.Int("points", 401, "`number` of frequencies")
	logSweep := fs.Bool("log", false, "space frequencies logarithmically")
	csvPath := fs.String("csv", "", "write CSV to `PATH`, or - for stdout")
	tsPath := fs.String("touchstone", "", "write a Touchstone 2.0 file to `PATH`")
	if help, err := parseFlags(fs, args); help || err != nil {
		return exitOK, err
	}
	if fs.NArg() != 1 {
		return exitUsage, usagef("response needs exactly one netlist file (see rfstress response --help)")
	}
	f1, err := parseFreq("from", *from)
	if err != nil {
		return exitUsage, err
	}
	f2, err := parseFreq("to", *to)
	if err != nil {
		return exitUsage, err
	}
	if f2 < f1 {
		return exitUsage, usagef("--to %s is below --from %s", *to, *from)
	}
	if *points < 1 || *points > 1000000 {
		return exitUsage, usagef("--points must be between 1 and 1000000")
	}
	if *tsPath == "-" {
		return exitUsage, usagef("--touchstone needs a file path")
	}
	outs := [][2]string{{"--touchstone", *tsPath}, {"--csv", *csvPath}}
	if _, err := planOutputs(outs, nil); err != nil {
		return exitUsage, err
	}
	file := fs.Arg(0)
	nl, c, err := loadNetlist(file)
	if err != nil {
		return exitUsage, err
	}
	targets, err := planOutputs(outs, netlistInputs(file, nl))
	if err != nil {
		return exitUsage, err
	}
	v := &reports.SweepView{File: file, Title: nl.Title, Z1: c.Zin, Z2: c.Zout}
	for i := 0; i < *points; i++ {
		f := f1
		if *points > 1 {
			t := float64(i) / float64(*points-1)
			if *logSweep {
				f = f1 * math.Pow(f2/f1, t)
			} else {
				f = f1 + (f2-f1)*t
			}
		}
		sp, err := c.TwoPort(f)
		if err != nil {
			return exitUsage, usagef("%s: %v", file, err)
		}
		v.Points = append(v.Points, sp)
	}
	wrote, toStdout := false, false
	for _, t := range targets {
		fn := func(w io.Writer) error { return reports.WriteTouchstone(w, v) }
		if t.flag == "--csv" {
			fn = func(w io.Writer) error { return reports.WriteSweepCSV(w, v) }
		}
		if err := t.write(stdout, fn); err != nil {
			return exitUsage, err
		}
		wrote, toStdout = true, toStdout || t.path == "-"
	}
	if toStdout {
		return exitOK, nil
	}
	if wrote {
		fmt.Fprintf(stdout, "%s: %d frequencies from %s to %s written\n", circuits.Escape(file), len(v.Points), circuits.FormatHz(f1), circuits.FormatHz(f2))
		return exitOK, nil
	}
	return exitOK, reports.WriteSweepText(stdout, v)
}

// finite is v for JSON, or nil (null) when it is not a finite number.
func finite(v float64) *float64 {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return nil
	}
	return &v
}

// solveDC is the DC solution of a netlist with a supply or a draw (nil
// without one), windings at their rdc= or their wire's resistance as the
// audit takes them.
func solveDC(nl *circuits.Netlist, c *circuits.Circuit) (*circuits.DC, error) {
	rdc := make([]float64, len(c.Elements))
	if rs, err := ratings.Prepare(nl, nil, nil); err == nil {
		for i, e := range c.Elements {
			if p := rs.Parts[e.Name]; p != nil {
				rdc[i] = p.WindingRdc()
			}
		}
	}
	dc, err := c.SolveDC(rdc)
	if err != nil || !dc.Any {
		return nil, err
	}
	return dc, dc.UnfedError()
}
