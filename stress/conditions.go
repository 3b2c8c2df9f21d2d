// Package stress runs the audit: it turns transmit conditions into cases
// (carriers, harmonics, loads, faults), solves each through the circuits
// layer, combines harmonics, keeps the worst stress of every part and asks
// the ratings layer for limits, verdicts and the safe power.
package stress

import (
	"fmt"
	"math"
	"math/cmplx"
	"sort"
	"strconv"
	"strings"
	"time"

	"rfstress/circuits"
	"rfstress/ratings"
)

// Mode is a transmit mode preset: the ratio of average to PEP power and,
// for heating, how it keys: continuously, a single on-period (a tune-up
// carrier held for a set time), or on for On seconds of every Period.
type Mode struct {
	Name     string
	AvgRatio float64
	Note     string
	On       float64 // s; 0: continuous
	Period   float64 // s; 0: a single on-period of On (or continuous)
}

// Modes are the presets. Voltage-type stress is taken at PEP, heating-type
// stress at PEP × AvgRatio. Values are common practice, from memory, except
// AM, which follows from the AM power relations.
var Modes = []Mode{
	{Name: "carrier", AvgRatio: 1.0, Note: "key-down carrier: average equals PEP"},
	{Name: "data", AvgRatio: 1.0, Note: "constant-envelope data modes (FSK and the like) sent continuously: average equals PEP"},
	{Name: "fm", AvgRatio: 1.0, Note: "FM: constant envelope, average equals PEP"},
	{Name: "cw", AvgRatio: 0.5, Note: "CW keying: about half the time key-down (common practice, from memory)"},
	{Name: "am", AvgRatio: 0.375, Note: "AM with 100 % sine modulation: Pavg = Pc·(1+m²/2), PEP = Pc·(1+m)², ratio 3/8"},
	{Name: "ssb", AvgRatio: 0.2, Note: "SSB voice without heavy processing: average about 1/5 of PEP (common practice, from memory; 0.1 to 0.3)"},
	{Name: "data-15s", AvgRatio: 0.5, On: 15, Period: 30,
		Note: "constant-envelope data mode sending 15 s in every 30 s: average half of PEP, heating ripple of the 30 s cycle on top (common practice)"},
	{Name: "tune", AvgRatio: 1, On: 30,
		Note: "tune-up carrier held for 30 s, then off: average equals PEP, temperature after 30 s (common practice: a tune-up takes seconds, rarely over half a minute)"},
}

// ModeByName finds a preset.
func ModeByName(name string) (Mode, bool) {
	for _, m := range Modes {
		if m.Name == strings.ToLower(name) {
			return m, true
		}
	}
	return Mode{}, false
}

func modeNames() string {
	var n []string
	for _, m := range Modes {
		n = append(n, m.Name)
	}
	return strings.Join(n, ", ")
}

// HarmonicPreset is a set of harmonic levels, dBc for the 2nd, 3rd, ….
type HarmonicPreset struct {
	Name string
	DBc  []float64 // index 0 is the 2nd harmonic; NaN-free; -Inf never used, absent means none
	Note string
}

// squareDBc is an ideal square wave: odd harmonics at 1/n amplitude, even
// harmonics absent (Fourier series of a square wave); dBc = −20·log10 n.
func squareDBc(max int) []float64 {
	var d []float64
	for n := 2; n <= max; n++ {
		if n%2 == 0 {
			d = append(d, math.Inf(-1))
		} else {
			d = append(d, -20*math.Log10(float64(n)))
		}
	}
	return d
}

// HarmonicPresets. push-pull and single-ended are typical levels at the
// output of a broadband HF amplifier before its lowpass filter (common
// practice, from memory): push-pull cancels even orders, so the 3rd
// dominates; a single-ended stage has a strong 2nd.
var HarmonicPresets = []HarmonicPreset{
	{"none", nil, "carrier only"},
	{"push-pull", []float64{-30, -12, -35, -18, -40, -22, -45, -25}, "odd harmonics dominant: 3rd −12 dBc, 5th −18, 7th −22, 9th −25; even −30 to −45 dBc (common practice, from memory)"},
	{"single-ended", []float64{-12, -18, -22, -25, -28, -30, -32, -35}, "even harmonics dominant: 2nd −12 dBc, 3rd −18, falling to −35 dBc at the 9th (common practice, from memory)"},
	{"square", squareDBc(9), "ideal square wave: odd harmonics at 1/n amplitude (Fourier series), even absent"},
}

// DefaultHarmonics is the preset used when none is given: a push-pull
// solid-state amplifier is the common HF case.
const DefaultHarmonics = "push-pull"

func harmonicByName(name string) (HarmonicPreset, bool) {
	for _, h := range HarmonicPresets {
		if h.Name == strings.ToLower(name) {
			return h, true
		}
	}
	return HarmonicPreset{}, false
}

// Conditions are the transmit conditions of an audit.
type Conditions struct {
	PowerW      float64
	Mode        string
	AvgRatio    float64
	Drive       string // "available" or "delivered"
	Harmonics   string // preset name or "custom"
	HarmonicDBc []float64
	HarmonicMax int
	BandLo      float64
	BandHi      float64
	Points      int
	SWR         float64
	Phases      int
	Loads       []complex128
	Faults      []string
	CarrierAlso []float64
	Derate      string
	// DerateAt is where a file's derate= names its profile (zero for the
	// flag), so an unreadable profile is reported there.
	DerateAt circuits.Pos
	Ambient  float64
	// TxSWRMax is the highest SWR the transmitter may see (0: not judged).
	TxSWRMax float64
	// KeyDown is the time at the mode's average power before the
	// temperature is judged, s: 0 not set (the mode's own on-period, else
	// steady state), +Inf steady state asked for.
	KeyDown float64
	Duty    ratings.Duty // from the mode preset
	// Altitude is the station's height above sea level, m: the air
	// pressure for clearances (ISO 2533).
	Altitude float64
	// PartFaults: "" (none), "each", or a list such as C9:short,L3:open
	PartFaults string
}

// HeatTime is the key-down time the temperature is judged at (s; +Inf
// for steady state): the one given, else a single-shot mode's on-period,
// else steady state, the conservative default.
func (c *Conditions) HeatTime() float64 {
	switch {
	case c.KeyDown > 0:
		return c.KeyDown
	case c.Duty.Period == 0 && c.Duty.On > 0:
		return c.Duty.On
	}
	return math.Inf(1)
}

// ParseKeyDown reads a key-down time: a Go duration such as 90s, 5m or
// 1h30m (m is minutes here), or "steady".
func ParseKeyDown(v string) (float64, error) {
	if strings.EqualFold(v, "steady") {
		return math.Inf(1), nil
	}
	d, err := time.ParseDuration(v)
	if err != nil || d <= 0 {
		return 0, fmt.Errorf("bad key-down time %s", circuits.Quote(v))
	}
	return d.Seconds(), nil
}

// Defaults are the conditions before the file and the command line speak.
func Defaults() Conditions {
	h, _ := harmonicByName(DefaultHarmonics)
	return Conditions{
		PowerW: 100, Mode: "carrier", AvgRatio: 1, Drive: "available",
		Harmonics: h.Name, HarmonicDBc: h.DBc, HarmonicMax: 9,
		Points: 7, SWR: 1, Phases: 72, Derate: "standard", Ambient: 25,
	}
}

// Setting is one condition as text, from a file's audit line or a flag.
type Setting struct {
	Key   string
	Value string
	Pos   circuits.Pos // zero for command-line flags
	Flag  bool
}

func (s Setting) where() string {
	if s.Flag {
		return "--" + s.Key
	}
	return s.Pos.String() + ": audit " + s.Key + "="
}

// settingError carries the position of a bad setting.
func settingError(s Setting, want, format string, args ...any) error {
	msg := fmt.Sprintf(format, args...)
	if s.Flag {
		return fmt.Errorf("--%s %s: %s (%s)", s.Key, circuits.Clip(s.Value), circuits.Escape(msg), want)
	}
	return &circuits.Error{Pos: s.Pos, Msg: "audit " + s.Key + "=" + circuits.Clip(s.Value) + ": " + msg, Want: want}
}

// Accepted ranges of the settings that reach the solver. Beyond them the
// numbers overflow or lose meaning (1e308 W, 1e308 Hz); every real
// station sits far inside.
var (
	PowerRange = circuits.Range{Lo: 1e-3, Hi: 10e6, Unit: "W"}
	LoadRange  = circuits.Range{Lo: 0, Hi: 1e9, Unit: "Ω"}
)

// inRange is the error for a setting outside r, or nil.
func inRange(s Setting, what string, v float64, r circuits.Range) error {
	if r.Holds(v) {
		return nil
	}
	return settingError(s, "accepted range "+r.Text(), "%s is outside the range a solve can trust", what)
}

// FileSettings returns the audit settings written in a netlist, in order.
func FileSettings(nl *circuits.Netlist) []Setting {
	var out []Setting
	for _, d := range nl.Audit {
		for _, k := range d.Order {
			a := d.Attrs[k]
			out = append(out, Setting{Key: k, Value: a.Raw, Pos: a.ValPos})
		}
	}
	return out
}

// Apply reads settings in order over c; a later setting wins, except for
// list settings (load, carrier-also), where the file's lists add up and a
// command-line list replaces them. Every bad setting is reported.
func (c *Conditions) Apply(settings []Setting) error {
	fileErrs, flagErrs := c.ApplyAll(settings)
	var errs []string
	for _, e := range fileErrs {
		errs = append(errs, e.Error())
	}
	errs = append(errs, flagErrs...)
	if len(errs) > 0 {
		return fmt.Errorf("%s", strings.Join(errs, "\n"))
	}
	return nil
}

// ApplyAll is Apply with the errors kept apart: those of a file's audit
// lines, sorted by position (to merge with the file's other errors), and
// those of flags, in order.
func (c *Conditions) ApplyAll(settings []Setting) (circuits.ErrorList, []string) {
	var errs []string
	var cerrs circuits.ErrorList
	flagSeen := map[string]bool{}
	for _, s := range settings {
		if err := c.apply(s, flagSeen); err != nil {
			if ce, ok := err.(*circuits.Error); ok {
				cerrs = append(cerrs, ce)
			} else {
				errs = append(errs, err.Error())
			}
		}
	}
	if c.Mode != "custom" {
		if m, ok := ModeByName(c.Mode); ok && !c.avgSet() {
			c.AvgRatio = m.AvgRatio
		}
	}
	// the square wave's series has a level at every odd order: cover
	// every order audited, not only the 2nd to 9th
	if c.Harmonics == "square" {
		c.HarmonicDBc = squareDBc(max(9, c.HarmonicMax))
	}
	cerrs.Sort()
	return cerrs, errs
}

// avgExplicit records that avg-ratio was set directly and wins over mode.
func (c *Conditions) avgSet() bool { return c.Mode == "custom" }

func (c *Conditions) apply(s Setting, flagSeen map[string]bool) error {
	v := s.Value
	num := func(units ...string) (float64, error) {
		x, err := circuits.ParseValue(v, units...)
		if err != nil {
			return 0, settingError(s, "a number", "%v", err)
		}
		return x, nil
	}
	switch s.Key {
	case "power":
		x, err := num("W")
		if err != nil {
			return err
		}
		if !(x > 0) {
			return settingError(s, "PEP in watts above zero", "power must be above zero")
		}
		if err := inRange(s, "power", x, PowerRange); err != nil {
			return err
		}
		c.PowerW = x
	case "mode":
		m, ok := ModeByName(v)
		if !ok {
			return settingError(s, "one of "+modeNames(), "unknown mode %s", circuits.Quote(v))
		}
		c.Mode, c.AvgRatio = m.Name, m.AvgRatio
		c.Duty = ratings.Duty{On: m.On, Period: m.Period}
	case "key-down":
		t, err := ParseKeyDown(v)
		if err != nil {
			return settingError(s, "a time such as 90s, 5m or 1h30m, or steady", "%v", err)
		}
		c.KeyDown = t
	case "avg-ratio":
		x, err := num()
		if err != nil {
			return err
		}
		if !(x > 0 && x <= 1) {
			return settingError(s, "0 < ratio ≤ 1", "average-to-PEP ratio out of range")
		}
		c.AvgRatio, c.Mode, c.Duty = x, "custom", ratings.Duty{}
	case "drive":
		d := strings.ToLower(v)
		if d != "available" && d != "delivered" {
			return settingError(s, "available or delivered", "unknown drive %s", circuits.Quote(v))
		}
		c.Drive = d
	case "harmonics":
		if h, ok := harmonicByName(v); ok {
			c.Harmonics, c.HarmonicDBc = h.Name, h.DBc
			return nil
		}
		var d []float64
		for _, part := range strings.Split(v, ",") {
			x, err := strconv.ParseFloat(strings.TrimSuffix(strings.TrimSpace(part), "dBc"), 64)
			if err != nil || math.IsNaN(x) || math.IsInf(x, 0) || x > 0 {
				return settingError(s, "a preset (none, push-pull, single-ended, square) or dBc levels ≤ 0 for the 2nd, 3rd, … such as -30,-12,-40", "bad harmonic level %s", circuits.Quote(part))
			}
			d = append(d, x)
		}
		c.Harmonics, c.HarmonicDBc = "custom", d
	case "harmonic-max":
		n, err := strconv.Atoi(v)
		if err != nil || n < 1 || n > 50 {
			return settingError(s, "a whole number from 1 (carrier only) to 50", "bad highest harmonic %s", circuits.Quote(v))
		}
		c.HarmonicMax = n
	case "band":
		lo, hi, ok := strings.Cut(v, ":")
		if !ok {
			lo, hi = v, v
		}
		l, err1 := circuits.ParseValue(lo, "Hz")
		h, err2 := circuits.ParseValue(hi, "Hz")
		if err1 != nil || err2 != nil || !(l > 0) || h < l {
			return settingError(s, "a band lo:hi with 0 < lo ≤ hi, such as 10.1M:10.15M", "bad band")
		}
		if err := inRange(s, "band edge", l, circuits.FreqRange); err != nil {
			return err
		}
		if err := inRange(s, "band edge", h, circuits.FreqRange); err != nil {
			return err
		}
		c.BandLo, c.BandHi = l, h
	case "freq":
		f, err := num("Hz")
		if err != nil {
			return err
		}
		if !(f > 0) {
			return settingError(s, "a frequency above zero", "bad frequency")
		}
		if err := inRange(s, "frequency", f, circuits.FreqRange); err != nil {
			return err
		}
		c.BandLo, c.BandHi, c.Points = f, f, 1
	case "points":
		n, err := strconv.Atoi(v)
		if err != nil || n < 1 || n > 100000 {
			return settingError(s, "a whole number from 1 to 100000", "bad number of carrier points %s", circuits.Quote(v))
		}
		c.Points = n
	case "swr":
		x, err := num()
		if err != nil {
			return err
		}
		if !(x >= 1) || x > 1000 {
			return settingError(s, "SWR from 1 to 1000", "bad SWR %s", circuits.Quote(v))
		}
		c.SWR = x
	case "phases":
		n, err := strconv.Atoi(v)
		if err != nil || n < 1 || n > 1000000 {
			return settingError(s, "a whole number from 1 to 1000000", "bad number of phases %s", circuits.Quote(v))
		}
		c.Phases = n
	case "load":
		if s.Flag && !flagSeen["load"] {
			c.Loads = nil
			flagSeen["load"] = true
		}
		for _, part := range strings.Split(v, ",") {
			z, err := circuits.ParseComplex(part)
			if err != nil || real(z) < 0 {
				return settingError(s, "a passive impedance such as 12.5-j180", "bad load %s", circuits.Quote(part))
			}
			if err := inRange(s, "load magnitude", cmplx.Abs(z), LoadRange); err != nil {
				return err
			}
			c.Loads = append(c.Loads, z)
		}
	case "faults":
		var fl []string
		for _, part := range strings.Split(v, ",") {
			p := strings.ToLower(strings.TrimSpace(part))
			switch p {
			case "open", "short":
				fl = append(fl, p)
			case "none", "":
			default:
				return settingError(s, "open, short, open,short or none", "unknown fault %s", circuits.Quote(part))
			}
		}
		sort.Strings(fl)
		c.Faults = dedupe(fl)
	case "carrier-also":
		if s.Flag && !flagSeen["carrier-also"] {
			c.CarrierAlso = nil
			flagSeen["carrier-also"] = true
		}
		for _, part := range strings.Split(v, ",") {
			f, err := circuits.ParseValue(part, "Hz")
			if err != nil || !(f > 0) {
				return settingError(s, "frequencies such as 14.2M", "bad frequency %s", circuits.Quote(part))
			}
			if err := inRange(s, "frequency", f, circuits.FreqRange); err != nil {
				return err
			}
			c.CarrierAlso = append(c.CarrierAlso, f)
		}
	case "tx-swr-max":
		x, err := num()
		if err != nil {
			return err
		}
		if !(x >= 1) || x > 1000 {
			return settingError(s, "an SWR from 1 to 1000, e.g. 2", "bad transmitter SWR limit %q", v)
		}
		c.TxSWRMax = x
	case "derate":
		if v == "" {
			return settingError(s, "standard, strict, none or a profile file", "no profile named")
		}
		c.Derate, c.DerateAt = v, s.Pos
	case "altitude":
		if _, err := strconv.ParseFloat(v, 64); err == nil {
			return settingError(s, "an altitude with a unit, e.g. 1500m or 1.5km", "altitude %s has no unit", v)
		}
		x, err := num("m")
		if err != nil {
			return err
		}
		if x < -500 || x > 11000 {
			return settingError(s, "−500 m to 11 km, the standard atmosphere's troposphere", "altitude out of range")
		}
		c.Altitude = x
	case "ambient":
		x, err := num("C")
		if err != nil {
			return err
		}
		if x < -60 || x > 200 {
			return settingError(s, "an ambient temperature from −60 to 200 °C", "ambient out of range")
		}
		c.Ambient = x
	case "part-faults":
		if _, _, err := ParsePartFaults(v); err != nil {
			return settingError(s, "each, none, or parts with short or open such as C9:short,L3:open", "%v", err)
		}
		c.PartFaults = v
		if strings.EqualFold(v, "none") {
			c.PartFaults = ""
		}
	default:
		return settingError(s, "a known audit setting", "unknown setting %s", circuits.Quote(s.Key))
	}
	return nil
}

func dedupe(s []string) []string {
	var out []string
	for i, x := range s {
		if i == 0 || x != s[i-1] {
			out = append(out, x)
		}
	}
	return out
}

// Check says what is missing before an audit can run.
func (c *Conditions) Check() error {
	if c.BandLo <= 0 {
		return fmt.Errorf("no carrier band: give --band lo:hi (or --freq) or an `audit band=` line in the file")
	}
	return nil
}

// Carriers returns the carrier frequencies: the band points, then the
// extra carriers. One point across a band is the band's centre.
func (c *Conditions) Carriers() []float64 {
	var fs []float64
	n := c.Points
	if c.BandHi == c.BandLo {
		n = 1
	}
	for i := 0; i < n; i++ {
		f := (c.BandLo + c.BandHi) / 2
		if n > 1 {
			f = c.BandLo + (c.BandHi-c.BandLo)*float64(i)/float64(n-1)
		}
		fs = append(fs, f)
	}
	return append(fs, c.CarrierAlso...)
}

// HarmonicLevels returns, for n = 2…HarmonicMax, the available power of
// harmonic n as a fraction of the carrier's (0 when absent).
func (c *Conditions) HarmonicLevels() []float64 {
	var out []float64
	for n := 2; n <= c.HarmonicMax; n++ {
		i := n - 2
		if i < len(c.HarmonicDBc) && !math.IsInf(c.HarmonicDBc[i], -1) {
			out = append(out, math.Pow(10, c.HarmonicDBc[i]/10))
		} else {
			out = append(out, 0)
		}
	}
	return out
}

// ModeNote returns the documented meaning of a mode preset.
func ModeNote(name string) string {
	if m, ok := ModeByName(name); ok {
		return m.Note
	}
	return "average-to-PEP ratio set directly"
}

// HarmonicNote returns the documented meaning of a harmonic preset.
func HarmonicNote(name string) string {
	if h, ok := harmonicByName(name); ok {
		return h.Note
	}
	return "levels given on the command line or in the file"
}
