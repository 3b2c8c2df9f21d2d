package reports

import (
	"encoding/json"
	"fmt"
	"io"
	"strings"

	"rfstress/circuits"
	"rfstress/stress"
)

// CompareView is a model set against a measured two-port, with an
// optional Q fit; everything in it was computed by package stress.
type CompareView struct {
	File, Title string
	Measured    string
	Points      int // measured frequencies
	Ref         []float64
	Cmp         *stress.Comparison
	Fit         *stress.Fit
	FitBy       string // "q" or "q-class"
	Calibrated  string // path of the calibrated netlist written, if any
}

func signedDB(v float64) string {
	s := num(v, 2)
	if v > 0 && s != "0.00" {
		s = "+" + s
	}
	return s + " dB"
}

func worstText(w stress.Worst) string {
	if !w.Seen {
		return "—"
	}
	return signedDB(w.DB) + " at " + circuits.FormatHz(w.F)
}

// WriteCompareText writes the comparison for people.
func WriteCompareText(w io.Writer, v *CompareView) error {
	c := v.Cmp
	fmt.Fprintln(w, heading(v.File, v.Title))
	refs := make([]string, len(v.Ref))
	for i, r := range v.Ref {
		refs[i] = circuits.FormatSI(r, "Ω")
	}
	fmt.Fprintf(w, "  measured: %s, %d points, %s to %s, reference %s\n", circuits.Escape(v.Measured), v.Points,
		circuits.FormatHz(c.Lo), circuits.FormatHz(c.Hi), strings.Join(refs, " / "))
	if len(c.Skipped) > 0 {
		fmt.Fprintf(w, "  %d harmonic frequencies lie outside the measurement and are not compared\n", len(c.Skipped))
	}
	fmt.Fprintln(w, "\n  largest differences, model − measured")
	t := newTable("", "|S21|", "|S11|")
	t.leftCols = 1
	t.row("in band", worstText(c.BandS21), worstText(c.BandS11))
	t.row("at harmonics", worstText(c.HarmS21), worstText(c.HarmS11))
	t.write(w)
	fmt.Fprintf(w, "\n  heat in the filter at %s available power, source and load matched\n", circuits.FormatSI(c.PowerW, "W"))
	fmt.Fprintln(w, "  (dissipated share 1 − |S11|² − |S21|²: what is neither reflected nor passed on)")
	t = newTable("carrier", "loss, model", "loss, measured", "share, model", "share, measured", "heat, model", "heat, measured")
	t.leftCols = 1
	for _, h := range c.Carriers {
		name := circuits.FormatHz(h.F)
		if h.OffBand {
			name += " (outside the band)"
		}
		t.row(name, num(h.ModelLossDB, 2)+" dB", num(h.MeasLossDB, 2)+" dB",
			num(100*h.ModelShare, 2)+" %", num(100*h.MeasShare, 2)+" %",
			circuits.FormatSI(h.ModelW, "W"), circuits.FormatSI(h.MeasW, "W"))
	}
	t.write(w)
	if f := v.Fit; f != nil {
		fmt.Fprintf(w, "\n  Q fit (--fit %s) to S21 and S11 at %s, %s to %s\n", v.FitBy, pointsText(f.Points),
			circuits.FormatHz(f.Lo), circuits.FormatHz(f.Hi))
		t = newTable("coil(s)", "Q factor", "± 1σ", "fitted Q at "+circuits.FormatHz(f.FitAt))
		t.leftCols = 1
		for _, g := range f.Groups {
			name := g.Name
			if len(g.Parts) > 1 || name != g.Parts[0] {
				name += " (" + strings.Join(g.Parts, ", ") + ")"
			}
			var qs []string
			for k, q := range g.Q {
				if g.AtBound {
					qs = append(qs, g.Parts[k]+" —")
					continue
				}
				qs = append(qs, g.Parts[k]+" "+num(q, 0))
			}
			t.row(name, "× "+num(g.Scale, 3), sigmaText(g), strings.Join(qs, ", "))
		}
		t.write(w)
		for _, g := range f.Groups {
			if g.AtBound {
				fmt.Fprintf(w, "  %s: the fit ran to the edge of its search (Q × 1/50 or × 50): the measurement differs from the model in more than Q (values, layout, the fixture); do not use this factor\n", g.Name)
			}
		}
		fmt.Fprintf(w, "  RMS residual of S: %s before, %s after\n", num(f.RMSBefore, 4), num(f.RMSAfter, 4))
		if v.FitBy == "q" {
			for _, g := range f.Groups {
				if sigmaText(g) == "not determined" {
					fmt.Fprintln(w, "  coils that change the response together (the matching coils of a symmetric filter) cannot be told apart by a sweep: fit them as one with --fit q-class")
					break
				}
			}
		}
	}
	if v.Calibrated != "" {
		kept := 0
		if v.Fit != nil {
			for _, g := range v.Fit.Groups {
				if sigmaText(g) == "not determined" {
					kept++
				}
			}
		}
		fmt.Fprintf(w, "  calibrated netlist written to %s; audit it like any netlist\n", circuits.Escape(v.Calibrated))
		if kept > 0 {
			fmt.Fprintf(w, "  %d of its factors not determined: not applied, their coils keep the Q as written\n", kept)
		}
	}
	return nil
}

type jsonCompare struct {
	File       string         `json:"file"`
	Measured   string         `json:"measured"`
	SpanHz     [2]float64     `json:"measured_span_hz"`
	PowerW     float64        `json:"power_w"`
	Worst      jsonWorstGroup `json:"largest_difference_db"`
	Carriers   []jsonHeat     `json:"carriers"`
	Fit        *jsonFit       `json:"fit,omitempty"`
	Calibrated string         `json:"calibrated_netlist,omitempty"`
	Points     []jsonCmpPoint `json:"points"`
}

type jsonWorst struct {
	DB *float64 `json:"db"`
	Hz *float64 `json:"at_hz"`
}

type jsonWorstGroup struct {
	BandS21, BandS11, HarmS21, HarmS11 jsonWorst
}

type jsonHeat struct {
	Hz          float64  `json:"hz"`
	ModelLossDB *float64 `json:"model_loss_db"`
	MeasLossDB  *float64 `json:"measured_loss_db"`
	ModelShare  *float64 `json:"model_dissipated_share"`
	MeasShare   *float64 `json:"measured_dissipated_share"`
	ModelW      *float64 `json:"model_heat_w"`
	MeasW       *float64 `json:"measured_heat_w"`
}

type jsonFitGroup struct {
	Name    string    `json:"name"`
	Parts   []string  `json:"parts"`
	Scale   *float64  `json:"q_scale"`
	Sigma   *float64  `json:"sigma"`
	AtBound bool      `json:"at_search_bound"`
	Q       []float64 `json:"fitted_q"`
}

type jsonFit struct {
	By        string         `json:"by"`
	Points    int            `json:"points"`
	LoHz      float64        `json:"from_hz"`
	FitAtHz   float64        `json:"fitted_q_at_hz"`
	HiHz      float64        `json:"to_hz"`
	RMSBefore *float64       `json:"rms_before"`
	RMSAfter  *float64       `json:"rms_after"`
	Groups    []jsonFitGroup `json:"groups"`
}

type jsonCmpPoint struct {
	Hz       float64  `json:"hz"`
	Where    string   `json:"where"`
	ModelS21 *float64 `json:"model_s21_db"`
	MeasS21  *float64 `json:"measured_s21_db"`
	ModelS11 *float64 `json:"model_s11_db"`
	MeasS11  *float64 `json:"measured_s11_db"`
}

func jw(w stress.Worst) jsonWorst {
	if !w.Seen {
		return jsonWorst{}
	}
	return jsonWorst{DB: jsonNum(w.DB), Hz: jsonNum(w.F)}
}

// WriteCompareJSON writes the comparison as JSON (non-finite numbers as null).
func WriteCompareJSON(w io.Writer, v *CompareView) error {
	c := v.Cmp
	j := jsonCompare{File: v.File, Measured: v.Measured, SpanHz: [2]float64{c.Lo, c.Hi}, PowerW: c.PowerW,
		Worst:      jsonWorstGroup{jw(c.BandS21), jw(c.BandS11), jw(c.HarmS21), jw(c.HarmS11)},
		Calibrated: v.Calibrated, Carriers: []jsonHeat{}, Points: []jsonCmpPoint{}}
	for _, h := range c.Carriers {
		j.Carriers = append(j.Carriers, jsonHeat{Hz: h.F, ModelLossDB: jsonNum(h.ModelLossDB), MeasLossDB: jsonNum(h.MeasLossDB),
			ModelShare: jsonNum(h.ModelShare), MeasShare: jsonNum(h.MeasShare), ModelW: jsonNum(h.ModelW), MeasW: jsonNum(h.MeasW)})
	}
	if f := v.Fit; f != nil {
		jf := &jsonFit{By: v.FitBy, Points: f.Points, LoHz: f.Lo, FitAtHz: f.FitAt, HiHz: f.Hi, RMSBefore: jsonNum(f.RMSBefore), RMSAfter: jsonNum(f.RMSAfter)}
		for _, g := range f.Groups {
			jf.Groups = append(jf.Groups, jsonFitGroup{Name: g.Name, Parts: g.Parts, Scale: jsonNum(g.Scale), Sigma: jsonNum(g.Sigma), AtBound: g.AtBound, Q: g.Q})
		}
		j.Fit = jf
	}
	for _, p := range c.Points {
		j.Points = append(j.Points, jsonCmpPoint{Hz: p.F, Where: p.Where,
			ModelS21: jsonNum(circuits.DB(p.Model[2])), MeasS21: jsonNum(circuits.DB(p.Meas[2])),
			ModelS11: jsonNum(circuits.DB(p.Model[0])), MeasS11: jsonNum(circuits.DB(p.Meas[0]))})
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(j)
}

// sigmaText is a fitted factor's uncertainty for people.
func sigmaText(g stress.FitGroup) string {
	if g.AtBound || !(g.Sigma < 1e6) {
		return "not determined"
	}
	return num(g.Sigma, 3)
}

// pointsText counts measured frequencies: "1 measured point", "9 measured
// points".
func pointsText(n int) string {
	if n == 1 {
		return "1 measured point"
	}
	return fmt.Sprintf("%d measured points", n)
}
