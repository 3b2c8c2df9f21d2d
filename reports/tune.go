package reports

import (
	"encoding/csv"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"rfstress/circuits"
	"rfstress/ratings"
	"rfstress/stress"
	"rfstress/tuning"
)

// TuneView is a tuning chart: the settings of a network's variable parts
// for each load, as computed by package tuning (and, in an audit with
// --retune, judged by stress). It is rendered as text, CSV, JSON and a PDF
// page.
type TuneView struct {
	File       string
	Title      string
	Policy     string
	PolicyNote string
	TargetSWR  float64
	PowerW     float64
	LoadSource string
	PortZ      complex128 // the antenna port's z (centre of an SWR region)
	Zs         complex128 // the transmitter port's z
	Parts      []TunePart
	Rows       []TuneRow
}

// TunePart is one variable part.
type TunePart struct {
	Name    string
	Kind    circuits.Kind
	Unit    string
	Lo, Hi  float64
	Steps   int // 0: continuous
	Nominal float64
}

// TuneRow is one load and the settings that match it.
type TuneRow struct {
	FrequencyHz float64
	Load        complex128
	Ring        float64 // SWR ring of a region load (0 for a measured load)
	Matched     bool
	Settings    []float64
	SWR         float64
	Zin         complex128
	LossFrac    float64
	Eff         float64
	VpkW        float64 // largest part peak voltage at PowerW
	Limit       string  // unmatchable: what stopped the match
	Judged      bool    // an audit judged the parts at these settings
	Verdict     ratings.Verdict
	Worst       string // the part and quantity closest to its limit
}

// Unmatched counts the loads no setting matches.
func (v *TuneView) Unmatched() int {
	n := 0
	for _, r := range v.Rows {
		if !r.Matched {
			n++
		}
	}
	return n
}

// RowVerdictText names a row's outcome in words.
func RowVerdictText(r TuneRow) string {
	switch {
	case !r.Matched:
		return "unmatchable"
	case r.Judged:
		return r.Verdict.String()
	}
	return "matched"
}

func (v *TuneView) partsText() string {
	var s []string
	for _, p := range v.Parts {
		kind := "continuous"
		if p.Steps > 0 {
			kind = fmt.Sprintf("%d steps", p.Steps)
		}
		s = append(s, fmt.Sprintf("%s %s…%s (%s)", p.Name, circuits.FormatSI(p.Lo, p.Unit), circuits.FormatSI(p.Hi, p.Unit), kind))
	}
	return strings.Join(s, ", ")
}

// WriteTuneText writes the tuning chart as a text table.
func WriteTuneText(w io.Writer, v *TuneView) error {
	fmt.Fprintf(w, "%s\n", Headline(heading(v.File, v.Title)))
	fmt.Fprintf(w, "  tuning chart: loads from %s, matched to SWR %s or better at port in (%s)\n", esc(v.LoadSource), num(v.TargetSWR, 2), circuits.FormatComplex(v.Zs))
	fmt.Fprintf(w, "  chosen by policy %s\n", v.PolicyNote)
	fmt.Fprintf(w, "  variable parts: %s\n", v.partsText())
	fmt.Fprintf(w, "  peak voltages at %s available from the transmitter\n\n", circuits.FormatSI(v.PowerW, "W"))
	head := []string{"frequency", "load"}
	for _, p := range v.Parts {
		head = append(head, p.Name)
	}
	head = append(head, "SWR", "loss", "V peak", "outcome")
	t := newTable(head...)
	for _, r := range v.Rows {
		cells := []string{circuits.FormatHz(r.FrequencyHz), circuits.FormatComplex(r.Load)}
		for k, p := range v.Parts {
			cells = append(cells, circuits.FormatSI(r.Settings[k], p.Unit))
		}
		out := RowVerdictText(r)
		if !r.Matched {
			out += ": " + r.Limit
		} else if r.Worst != "" {
			out += " (" + r.Worst + ")"
		}
		cells = append(cells, FormatSWR(r.SWR), pct1(r.LossFrac), circuits.FormatSI(r.VpkW, "V"), out)
		t.row(cells...)
	}
	t.write(w)
	if n := v.Unmatched(); n > 0 {
		fmt.Fprintf(w, "\n  %d of %d loads cannot be matched within the parts' ranges: best SWR and the limit that stopped it are shown;\n  they are not audited, and transmitting into them is outside this check\n", n, len(v.Rows))
	}
	fmt.Fprintf(w, "\n  CAUTION: %s\n", TuneCaution(v))
	return nil
}

// WriteTuneCSV writes one row per load.
func WriteTuneCSV(w io.Writer, v *TuneView) error {
	cw := csv.NewWriter(w)
	head := []string{"file", "frequency_hz", "load_r_ohm", "load_x_ohm", "matched"}
	for _, p := range v.Parts {
		head = append(head, p.Name+"_"+p.Unit)
	}
	head = append(head, "swr", "zin_r_ohm", "zin_x_ohm", "loss_pct", "efficiency_pct", "vpk_v", "policy", "verdict", "limit")
	if err := cw.Write(csvSafeRow(head)); err != nil {
		return err
	}
	for _, r := range v.Rows {
		rec := []string{v.File, g(r.FrequencyHz), g(real(r.Load)), g(imag(r.Load)), strconv.FormatBool(r.Matched)}
		for _, s := range r.Settings {
			rec = append(rec, g(s))
		}
		rec = append(rec, csvFull(r.SWR), csvFull(real(r.Zin)), csvFull(imag(r.Zin)), csvFull(100*r.LossFrac), csvFull(100*r.Eff), csvFull(r.VpkW),
			v.Policy, RowVerdictText(r), r.Limit)
		if err := cw.Write(csvSafeRow(rec)); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
}

// csvFull leaves a non-finite value empty and keeps every digit else.
func csvFull(x float64) string {
	if p := jsonNum(x); p != nil {
		return g(*p)
	}
	return ""
}

// esc shows text from files and the command line with control
// characters escaped.
func esc(s string) string { return circuits.Escape(s) }

// JSONTune is a tuning chart in JSON.
type JSONTune struct {
	File       string         `json:"file"`
	Title      string         `json:"title"`
	Policy     string         `json:"policy"`
	PolicyNote string         `json:"policy_note"`
	MatchSWR   float64        `json:"match_swr"`
	PowerW     float64        `json:"power_w"`
	Loads      string         `json:"loads"`
	Parts      []JSONTunePart `json:"parts"`
	Rows       []JSONTuneRow  `json:"rows"`
}

// JSONTunePart is one variable part.
type JSONTunePart struct {
	Name    string  `json:"name"`
	Kind    string  `json:"kind"`
	Unit    string  `json:"unit"`
	Lo      float64 `json:"lo"`
	Hi      float64 `json:"hi"`
	Steps   int     `json:"steps"`
	Nominal float64 `json:"nominal"`
}

// JSONTuneRow is one load.
type JSONTuneRow struct {
	FrequencyHz float64            `json:"frequency_hz"`
	LoadR       float64            `json:"load_r_ohm"`
	LoadX       float64            `json:"load_x_ohm"`
	Matched     bool               `json:"matched"`
	Settings    map[string]float64 `json:"settings"`
	SWR         *float64           `json:"swr"`
	ZinR        *float64           `json:"zin_r_ohm"`
	ZinX        *float64           `json:"zin_x_ohm"`
	LossPct     *float64           `json:"loss_pct"`
	EffPct      *float64           `json:"efficiency_pct"`
	VpkV        *float64           `json:"vpk_v"`
	Outcome     string             `json:"outcome"`
	Worst       string             `json:"worst,omitempty"`
	Limit       string             `json:"limit,omitempty"`
}

// TuneJSON converts a chart for JSON (encoding/json sorts map keys, so the
// settings keep a stable order).
func TuneJSON(v *TuneView) JSONTune {
	j := JSONTune{File: v.File, Title: v.Title, Policy: v.Policy, PolicyNote: v.PolicyNote, MatchSWR: v.TargetSWR, PowerW: v.PowerW, Loads: v.LoadSource,
		Parts: []JSONTunePart{}, Rows: []JSONTuneRow{}}
	for _, p := range v.Parts {
		j.Parts = append(j.Parts, JSONTunePart{Name: p.Name, Kind: string(p.Kind), Unit: p.Unit, Lo: p.Lo, Hi: p.Hi, Steps: p.Steps, Nominal: p.Nominal})
	}
	for _, r := range v.Rows {
		row := JSONTuneRow{FrequencyHz: r.FrequencyHz, LoadR: real(r.Load), LoadX: imag(r.Load), Matched: r.Matched, Settings: map[string]float64{},
			SWR: jsonNum(r.SWR), ZinR: jsonNum(real(r.Zin)), ZinX: jsonNum(imag(r.Zin)), LossPct: jsonNum(100 * r.LossFrac), EffPct: jsonNum(100 * r.Eff),
			VpkV: jsonNum(r.VpkW), Outcome: RowVerdictText(r), Worst: r.Worst, Limit: r.Limit}
		for k, p := range v.Parts {
			row.Settings[p.Name] = r.Settings[k]
		}
		j.Rows = append(j.Rows, row)
	}
	return j
}

// WriteTuneJSON writes charts as indented JSON.
func WriteTuneJSON(w io.Writer, views []*TuneView) error {
	var out []JSONTune
	for _, v := range views {
		out = append(out, TuneJSON(v))
	}
	return writeJSON(w, map[string]any{"tuning": out})
}

// TuneChart gathers a tuning chart from the tuning of each case.
func TuneChart(nl *circuits.Netlist, m *tuning.Matcher, ls *tuning.LoadSet, cases []tuning.Case, res []tuning.Result, power float64) *TuneView {
	v := &TuneView{File: nl.File, Title: nl.Title, Policy: m.Policy.String(), PolicyNote: m.Policy.Describe(),
		TargetSWR: m.TargetSWR, PowerW: power, LoadSource: loadSource(ls, m.C.Zout), PortZ: m.C.Zout, Zs: m.C.Zin, Parts: tuneParts(m.Vars)}
	for i, r := range res {
		v.Rows = append(v.Rows, tuneRow(cases[i], r, power))
	}
	return v
}

// RetuneView is the tuning chart of a retuned audit, each load with the
// verdict of the audit at its settings.
func RetuneView(s *stress.Section) *TuneView {
	rt := s.Retune
	var zin complex128
	var c0 complex128
	if s.Engine != nil && s.Engine.C != nil {
		zin, c0 = s.Engine.C.Zin, s.Engine.C.Zout
	}
	v := &TuneView{File: s.File, Title: s.Title, Policy: rt.Policy.String(), PolicyNote: rt.Policy.Describe(),
		TargetSWR: rt.TargetSWR, PowerW: s.Conditions.PowerW, LoadSource: loadSource(rt.Loads, c0), PortZ: c0, Zs: zin, Parts: tuneParts(rt.Vars)}
	for _, la := range rt.PerLoad {
		row := tuneRow(la.Case, la.Tune, s.Conditions.PowerW)
		if la.Section != nil {
			row.Judged, row.Verdict, row.Worst = true, la.Verdict, la.Worst
		}
		v.Rows = append(v.Rows, row)
	}
	return v
}

func loadSource(ls *tuning.LoadSet, z0 complex128) string {
	if ls.File || ls.SWR <= 1 {
		return ls.Source
	}
	return fmt.Sprintf("the region within SWR %g of port out's %s (%d loads per carrier)", ls.SWR, circuits.FormatComplex(z0), len(ls.Points))
}

func tuneParts(vars []tuning.Var) []TunePart {
	var out []TunePart
	for _, p := range vars {
		n := 0
		if p.Adj.Discrete() {
			n = len(p.Adj.Steps)
		}
		out = append(out, TunePart{Name: p.Name, Kind: p.Kind, Unit: p.Unit(), Lo: p.Adj.Lo, Hi: p.Adj.Hi, Steps: n, Nominal: p.Nominal})
	}
	return out
}

func tuneRow(c tuning.Case, r tuning.Result, power float64) TuneRow {
	return TuneRow{FrequencyHz: r.F, Load: r.Load, Ring: c.Load.Ring, Matched: r.Matched,
		Settings: r.Best.Values, SWR: r.Best.SWR, Zin: r.Best.Zin, LossFrac: r.Best.LossFrac, Eff: r.Best.Eff,
		VpkW: r.Best.VpkPerRtW * math.Sqrt(power), Limit: r.Limit}
}

// TuneCaution names the highest peak voltage of the chart: a tuner's parts
// carry it while transmitting, and far more when it is adjusted off match.
func TuneCaution(v *TuneView) string {
	top := 0.0
	for _, r := range v.Rows {
		if r.VpkW > top {
			top = r.VpkW
		}
	}
	if !(top > 0) {
		return "tuner parts can carry kilovolts; never adjust while transmitting (SAFETY.md)."
	}
	return fmt.Sprintf("up to %s peak on the tuner's parts in this chart at %s; more off match. RF burns and arcing: never touch or adjust while transmitting (SAFETY.md).",
		circuits.FormatSI(top, "V"), circuits.FormatSI(v.PowerW, "W"))
}
