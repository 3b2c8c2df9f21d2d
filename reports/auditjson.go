package reports

import (
	"encoding/csv"
	"io"
	"math"
	"strconv"

	"rfstress/ratings"
	"rfstress/stress"
)

// jsonNum keeps JSON free of NaN and Inf: non-finite values become null.
func jsonNum(v float64) *float64 {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return nil
	}
	return &v
}

// PerQuantity holds one T per quantity, in a fixed key order, leaving out
// the quantities a part does not have.
type PerQuantity[T comparable] struct {
	Vpk   T `json:"vpk,omitempty"`
	Vrms  T `json:"vrms,omitempty"`
	Irms  T `json:"irms,omitempty"`
	Pdiss T `json:"pdiss,omitempty"`
	Bpk   T `json:"bpk,omitempty"`
	Bavg  T `json:"bavg,omitempty"`
	Temp  T `json:"temp_c,omitempty"`
	Jrms  T `json:"jrms,omitempty"`
	Pm    T `json:"pm_w_per_m,omitempty"`
	Arc   T `json:"arc,omitempty"`
}

func (s *PerQuantity[T]) set(q ratings.Quantity, v T) {
	switch q {
	case ratings.Vpk:
		s.Vpk = v
	case ratings.Vrms:
		s.Vrms = v
	case ratings.Irms:
		s.Irms = v
	case ratings.Pdiss:
		s.Pdiss = v
	case ratings.Bpk:
		s.Bpk = v
	case ratings.Bavg:
		s.Bavg = v
	case ratings.Temp:
		s.Temp = v
	case ratings.Jrms:
		s.Jrms = v
	case ratings.Pm:
		s.Pm = v
	case ratings.Arc:
		s.Arc = v
	}
}

// QuantSet holds one value per quantity (null-free: absent means the part
// has no such stress).
type QuantSet = PerQuantity[*float64]

// CaseSet holds one case description per quantity.
type CaseSet = PerQuantity[string]

// JSONLimit is one rated quantity of a part.
type JSONLimit struct {
	Quantity    string   `json:"quantity"`
	Rating      *float64 `json:"rating"`
	Derated     *float64 `json:"derated"`
	Basis       string   `json:"basis"`
	Utilization *float64 `json:"utilization"`
	Verdict     string   `json:"verdict"`
	Advice      bool     `json:"advice,omitempty"`
	SafePowerW  *float64 `json:"safe_power_w"`
	Buy         *float64 `json:"buy,omitempty"`
	BuyText     string   `json:"buy_text,omitempty"`
}

// JSONComponent is one part of the audit.
type JSONComponent struct {
	File        string      `json:"file"`
	Position    string      `json:"position,omitempty"`
	WrongFor    string      `json:"wrong_band_for,omitempty"`
	Name        string      `json:"name"`
	Kind        string      `json:"kind"`
	Value       float64     `json:"value"`
	Worst       QuantSet    `json:"worst"`
	Cases       CaseSet     `json:"cases"`
	Verdict     string      `json:"verdict"`
	Utilization *float64    `json:"utilization"`
	SafePowerW  *float64    `json:"safe_power_w"`
	Limits      []JSONLimit `json:"limits"`
	// Binding is the rated quantity that binds; CoreBinding says which
	// core limit binds in words
	Binding     string         `json:"binding,omitempty"`
	CoreBinding string         `json:"core_binding,omitempty"`
	Heat        *JSONHeat      `json:"heat,omitempty"`
	Clearance   *JSONClearance `json:"clearance,omitempty"`
	Findings    []string       `json:"findings,omitempty"`
}

// JSONHeat is a wound core's first-order thermal state at its hottest case.
type JSONHeat struct {
	AvgDissipationW *float64 `json:"avg_dissipation_w"`
	TauS            *float64 `json:"tau_s"`      // null: no heat capacity known
	KeyDownS        *float64 `json:"key_down_s"` // null: steady state
	SteadyC         *float64 `json:"steady_c"`
	JudgedC         *float64 `json:"judged_c"`
}

// JSONClearance is a part's declared clearance judged against breakdown.
type JSONClearance struct {
	GapM       float64  `json:"gap_m"`
	Medium     string   `json:"medium"`
	VpkV       *float64 `json:"vpk_v"`
	ArcV       *float64 `json:"arc_v"`   // in air the gap would arc at this peak voltage
	LimitV     *float64 `json:"limit_v"` // judged against, before derating
	DeratedV   *float64 `json:"derated_v"`
	GapNeededM *float64 `json:"gap_needed_m"` // for the derated limit
}

// JSONLimiting names what sets the safe power.
type JSONLimiting struct {
	File      string `json:"file,omitempty"`
	Component string `json:"component,omitempty"`
	Quantity  string `json:"quantity,omitempty"`
}

// JSONSection summarises one netlist.
type JSONSection struct {
	File          string          `json:"file"`
	Title         string          `json:"title"`
	SHA256        string          `json:"sha256"`
	AntennaData   string          `json:"antenna_measured,omitempty"`
	Verdict       string          `json:"verdict"`
	SafePowerW    *float64        `json:"safe_power_w"`
	Limiting      JSONLimiting    `json:"limiting"`
	Cases         int             `json:"cases"`
	PowerW        float64         `json:"power_w"`
	Mode          string          `json:"mode"`
	AvgRatio      float64         `json:"avg_ratio"`
	Drive         string          `json:"drive"`
	Derate        string          `json:"derate"`
	AmbientC      float64         `json:"ambient_c"`
	Faults        []string        `json:"faults"`
	CarrierAlsoHz []float64       `json:"carrier_also_hz"`
	BandLoHz      float64         `json:"band_lo_hz"`
	BandHiHz      float64         `json:"band_hi_hz"`
	SWR           float64         `json:"swr"`
	Harmonics     string          `json:"harmonics"`
	MaxNodeVpk    float64         `json:"max_node_vpk"`
	AltitudeM     float64         `json:"altitude_m"`
	AirPressurePa float64         `json:"air_pressure_pa"`
	ArcCheckV     *float64        `json:"arc_check_1mm_v"`
	MaxNodeVdc    float64         `json:"max_node_vdc"`
	MaxDCV        float64         `json:"max_dc_v"`
	MaxDCNode     string          `json:"max_dc_node,omitempty"`
	Position      string          `json:"position,omitempty"`
	WrongFor      string          `json:"wrong_band_for,omitempty"`
	PartFaults    *JSONPartFaults `json:"part_faults,omitempty"`
	// what the transmitter sees, worst over every case
	TxSWRWorst *float64 `json:"tx_swr_worst"`
	TxZinWorst *JSONZ   `json:"tx_zin_worst"`
	TxCase     string   `json:"tx_case"`
	TxReflW    *float64 `json:"tx_reflected_w"`
	TxSWRMax   *float64 `json:"tx_swr_max"`
	TxVerdict  string   `json:"tx_verdict"`
	// the lowest SWR the transmitter sees over the band, antenna matched;
	// does_not_pass_band when it is above stress.NoPassSWR
	TxSWRInBandBest *float64       `json:"tx_swr_in_band_best,omitempty"`
	NoPass          bool           `json:"does_not_pass_band,omitempty"`
	Findings        []string       `json:"findings,omitempty"`
	Tolerance       *JSONTolerance `json:"tolerance,omitempty"`
	Tuning          *JSONTune      `json:"tuning,omitempty"`
}

// JSONZ is an impedance in ohms (null parts when not finite).
type JSONZ struct {
	Re *float64 `json:"re"`
	Im *float64 `json:"im"`
}

// JSONAudit is the whole audit document.
type JSONAudit struct {
	PowerW   float64 `json:"power_w"`
	Mode     string  `json:"mode"`
	AvgRatio float64 `json:"avg_ratio"`
	Verdict  string  `json:"verdict"`
	// AdviceOnly: the verdict is marginal only through a guide (the
	// heating guide): no derated limit or rating is exceeded
	AdviceOnly bool `json:"verdict_advice_only,omitempty"`
	// Rated is the verdict of the rated quantities alone (guides left
	// out): what the exit status judges unless --fail-on advice
	Rated      string          `json:"verdict_rated"`
	SafePowerW *float64        `json:"safe_power_w"`
	Limiting   JSONLimiting    `json:"limiting"`
	Cases      int             `json:"cases"`
	Sections   []JSONSection   `json:"sections"`
	Components []JSONComponent `json:"components"`
}

// AuditJSON builds the JSON document of a bank.
func AuditJSON(b *stress.Bank) *JSONAudit {
	doc := &JSONAudit{Verdict: b.Verdict.String(), SafePowerW: jsonNum(b.SafeW),
		Limiting: JSONLimiting{File: b.LimitFile, Component: b.LimitPart, Quantity: string(b.LimitQ)}}
	doc.AdviceOnly, doc.Rated = b.AdviceOnly(), b.Rated.String()
	for i, s := range b.Sections {
		if i == 0 {
			doc.PowerW, doc.Mode, doc.AvgRatio = s.Conditions.PowerW, s.Conditions.Mode, s.Conditions.AvgRatio
		}
		doc.Cases += s.NumCases
		js := JSONSection{File: s.File, Title: s.Title, SHA256: s.SHA256, AntennaData: s.AntennaMeasured, Verdict: s.Verdict.String(),
			SafePowerW: jsonNum(s.SafeW), Limiting: JSONLimiting{Component: s.LimitPart, Quantity: string(s.LimitQ)},
			Cases: s.NumCases, PowerW: s.Conditions.PowerW, Mode: s.Conditions.Mode, AvgRatio: s.Conditions.AvgRatio,
			Drive: s.Conditions.Drive, Derate: s.Conditions.Derate, AmbientC: s.Conditions.Ambient,
			Faults: append([]string{}, s.Conditions.Faults...), CarrierAlsoHz: append([]float64{}, s.Conditions.CarrierAlso...),
			BandLoHz: s.Conditions.BandLo, BandHiHz: s.Conditions.BandHi, SWR: s.Conditions.SWR,
			Harmonics: s.Conditions.Harmonics, MaxNodeVpk: s.MaxNodeVpk,
			AltitudeM: s.Conditions.Altitude, AirPressurePa: s.AirPressure, ArcCheckV: jsonNum(s.ArcCheckV),
			MaxNodeVdc: s.MaxNodeVdc, MaxDCV: s.MaxDCV, MaxDCNode: s.MaxDCAt, Position: s.Position}
		if s.Wrong {
			js.WrongFor = s.For
		}
		js.PartFaults = partFaultsJSON(s)
		if b := s.Tx.InBandBest; b.Case >= 0 {
			js.TxSWRInBandBest, js.NoPass = jsonNum(b.SWR), s.NoPass
		}
		for _, f := range s.Findings {
			js.Findings = append(js.Findings, f.Part+": "+f.Text)
		}
		if t := s.Tx; t.Worst.Case >= 0 {
			js.TxSWRWorst, js.TxReflW = jsonNum(t.Worst.SWR), jsonNum(t.Worst.ReflW)
			js.TxZinWorst = &JSONZ{Re: jsonNum(real(t.Worst.Zin)), Im: jsonNum(imag(t.Worst.Zin))}
			js.TxCase = s.Case(t.Worst.Case).Describe()
			js.TxVerdict = "not judged"
			if t.Limit > 0 {
				js.TxSWRMax, js.TxVerdict = jsonNum(t.Limit), t.Verdict.String()
			}
		}
		js.Tolerance = tolJSON(s)
		if s.Retune != nil {
			t := TuneJSON(RetuneView(s))
			js.Tuning = &t
		}
		doc.Sections = append(doc.Sections, js)
		for _, p := range s.Parts {
			jc := JSONComponent{File: s.File, Position: js.Position, WrongFor: js.WrongFor, Name: p.Name, Kind: string(p.Kind), Value: p.Value, Verdict: p.Verdict.String(),
				Utilization: jsonNum(p.Util), SafePowerW: jsonNum(p.SafeW), Limits: []JSONLimit{}, Binding: string(p.Binding)}
			if p.Has(ratings.Bpk) || p.Has(ratings.Temp) {
				jc.CoreBinding = CoreBinding(p)
			}
			if h := p.Heat; h != nil {
				jc.Heat = &JSONHeat{AvgDissipationW: jsonNum(h.Pavg), KeyDownS: jsonNum(h.KeyDown), SteadyC: jsonNum(h.Steady), JudgedC: jsonNum(h.Judged)}
				if h.Tau > 0 {
					jc.Heat.TauS = jsonNum(h.Tau)
				}
			}
			for _, q := range stress.Quantities {
				st, ok := p.Stress[q]
				if !ok {
					continue
				}
				jc.Worst.set(q, jsonNum(st.Value))
				jc.Cases.set(q, s.Case(st.Case).Describe())
				if st.Limit.Quantity == "" {
					continue
				}
				jl := JSONLimit{Quantity: string(q), Rating: jsonNum(st.Limit.Abs), Derated: jsonNum(st.Limit.Derated),
					Basis: st.Limit.Basis, Utilization: jsonNum(st.Util), Verdict: st.Verdict.String(), Advice: st.Limit.Advice, SafePowerW: jsonNum(st.SafeW), BuyText: st.BuyText}
				if st.Limit.Abs <= 0 {
					jl.Rating, jl.Derated, jl.Utilization = nil, nil, nil
				}
				if st.Buy > 0 {
					jl.Buy = jsonNum(st.Buy)
				}
				jc.Limits = append(jc.Limits, jl)
			}
			if c := p.Clearance; c != nil {
				jc.Clearance = &JSONClearance{GapM: c.Gap, Medium: c.Medium, VpkV: jsonNum(c.Vpk), ArcV: jsonNum(c.ArcV),
					LimitV: jsonNum(c.Limit), DeratedV: jsonNum(c.Derated), GapNeededM: jsonNum(c.Needed)}
			}
			for _, f := range p.Findings {
				jc.Findings = append(jc.Findings, f.Severity+": "+f.Text)
			}
			doc.Components = append(doc.Components, jc)
		}
	}
	return doc
}

// WriteAuditJSON writes the audit document.
func WriteAuditJSON(w io.Writer, doc *JSONAudit) error { return writeJSON(w, doc) }

// WriteAuditCSV writes one row per part and kind of case, SI units in the
// header.
func WriteAuditCSV(w io.Writer, b *stress.Bank) error {
	cw := csv.NewWriter(w)
	cw.Write([]string{"file", "part", "kind", "case_kind", "vpk_v", "vrms_v", "irms_a", "pdiss_w", "bpk_t", "bavg_t", "temp_c", "jrms_a_per_m2", "pm_w_per_m", "arc_v", "vpk_case", "irms_case", "part_verdict", "part_utilization", "tx_swr", "tx_zin_re_ohm", "tx_zin_im_ohm", "tx_reflected_w", "section"})
	for _, s := range b.Sections {
		for _, p := range s.Parts {
			for _, k := range p.ByKind {
				row := []string{s.File, p.Name, string(p.Kind), k.Kind.String()}
				for _, q := range stress.Quantities {
					if v, ok := k.Value[q]; ok {
						row = append(row, csvNum(v))
					} else {
						row = append(row, "")
					}
				}
				row = append(row, s.Case(k.Case[ratings.Vpk]).Describe(), s.Case(k.Case[ratings.Irms]).Describe(), p.Verdict.String(), csvNum(p.Util))
				// the transmitter's worst over the same kind of case
				if t := s.Tx.ByKind[k.Kind]; t.Case >= 0 {
					row = append(row, csvNum(t.SWR), csvNum(real(t.Zin)), csvNum(imag(t.Zin)), csvNum(t.ReflW))
				} else {
					row = append(row, "", "", "", "")
				}
				// a select position or its wrong-band fault ("" otherwise)
				row = append(row, sectionLabel(s))
				cw.Write(csvSafeRow(row))
			}
			writeTolCSV(cw, s, p)
		}
	}
	cw.Flush()
	return cw.Error()
}

func csvNum(v float64) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return ""
	}
	return strconv.FormatFloat(v, 'g', 6, 64)
}

// JSONTolerance is filled by the tolerance analysis.
type JSONTolerance struct {
	Trials       int                `json:"trials"`
	Seed         uint64             `json:"seed"`
	Distribution string             `json:"distribution"`
	SafePowerP01 *float64           `json:"safe_power_w_99pct_of_trials"`
	SafePowerMed *float64           `json:"safe_power_w_median"`
	Components   []JSONTolComponent `json:"components"`
}

func tolJSON(s *stress.Section) *JSONTolerance {
	t := s.Tolerance
	if t == nil {
		return nil
	}
	jt := &JSONTolerance{Trials: t.Trials, Seed: t.Seed, Distribution: t.Dist,
		SafePowerP01: jsonNum(t.SafeP01), SafePowerMed: jsonNum(t.SafeMed)}
	for _, p := range t.Parts {
		jc := JSONTolComponent{File: s.File, Name: p.Name}
		for _, q := range p.Q {
			jq := JSONTolQuantity{Quantity: string(q.Quantity), Median: jsonNum(q.Median), P99: jsonNum(q.P99), Max: jsonNum(q.Max)}
			if q.Rated {
				jq.OverDerated, jq.OverRating = jsonNum(q.OverDerated), jsonNum(q.OverRating)
			}
			jc.Quantities = append(jc.Quantities, jq)
		}
		jt.Components = append(jt.Components, jc)
	}
	return jt
}

// JSONTolComponent is one part's tolerance spread.
type JSONTolComponent struct {
	File       string            `json:"file"`
	Name       string            `json:"name"`
	Quantities []JSONTolQuantity `json:"quantities"`
}

// JSONTolQuantity is the spread of one stress over the trials.
type JSONTolQuantity struct {
	Quantity    string   `json:"quantity"`
	Median      *float64 `json:"median"`
	P99         *float64 `json:"p99"`
	Max         *float64 `json:"max"`
	OverDerated *float64 `json:"share_over_derated"`
	OverRating  *float64 `json:"share_over_rating"`
}

// writeTolCSV adds the tolerance rows of a part: one row each for the
// median, 99th percentile and maximum over the trials, and for the share of
// trials above the derated limit and above the rating, in the quantity
// columns.
func writeTolCSV(cw *csv.Writer, s *stress.Section, p *stress.PartResult) {
	if s.Tolerance == nil {
		return
	}
	for _, tp := range s.Tolerance.Parts {
		if tp.Name != p.Name {
			continue
		}
		rows := []struct {
			kind string
			get  func(stress.TolQuantity) (float64, bool)
		}{
			{"trials-median", func(q stress.TolQuantity) (float64, bool) { return q.Median, true }},
			{"trials-p99", func(q stress.TolQuantity) (float64, bool) { return q.P99, true }},
			{"trials-max", func(q stress.TolQuantity) (float64, bool) { return q.Max, true }},
			{"trials-share-over-derated", func(q stress.TolQuantity) (float64, bool) { return q.OverDerated, q.Rated }},
			{"trials-share-over-rating", func(q stress.TolQuantity) (float64, bool) { return q.OverRating, q.Rated }},
		}
		for _, r := range rows {
			row := []string{s.File, p.Name, string(p.Kind), r.kind}
			for _, q := range stress.Quantities {
				cell := ""
				for _, tq := range tp.Q {
					if tq.Quantity == q {
						if v, ok := r.get(tq); ok {
							cell = csvNum(v)
						}
					}
				}
				row = append(row, cell)
			}
			row = append(row, "", "", p.Verdict.String(), csvNum(p.Util), "", "", "", "", sectionLabel(s))
			cw.Write(csvSafeRow(row))
		}
	}
}
