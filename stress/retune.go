package stress

import (
	"fmt"
	"math"
	"strings"

	"rfstress/circuits"
	"rfstress/ratings"
	"rfstress/tuning"
)

// Retune is the audit of a network whose variable parts are retuned for
// every load of a load set: each load is matched (package tuning), and
// the network is audited at that load's own settings, faults included (an
// antenna failing open or shorted while tuned for that load). Per part,
// the section keeps the worst over every matched load.
type Retune struct {
	Policy    tuning.Policy
	TargetSWR float64
	Loads     *tuning.LoadSet
	Vars      []tuning.Var
	PerLoad   []LoadAudit
	Unmatched int
}

// LoadAudit is one load: its tuning and, when matched, its audit.
type LoadAudit struct {
	Case    tuning.Case
	Tune    tuning.Result
	Section *Section // nil when unmatched
	Verdict ratings.Verdict
	Worst   string // the part and quantity nearest its limit
	First   int    // index of this load's first case in the section's case list
}

// RetuneAudit tunes the engine's circuit for every load of ls at the
// carriers of the band and audits each match at its settings. The
// returned section has per part the worst over the matchable loads, its
// cases naming the load and settings that cause it; its Retune field keeps
// the tuning chart and each load's verdict.
func RetuneAudit(c *circuits.Circuit, rs *ratings.Set, cond Conditions, allowUnrated bool, ls *tuning.LoadSet, m *tuning.Matcher, workers int) (*Section, error) {
	if err := cond.Check(); err != nil {
		return nil, err
	}
	carriers := cond.Carriers()
	carriers = carriers[:len(carriers)-len(cond.CarrierAlso)]
	cases, err := ls.Cases(carriers, cond.BandLo, cond.BandHi)
	if err != nil {
		return nil, err
	}
	res, err := m.TuneAll(cases, workers)
	if err != nil {
		return nil, err
	}
	rt := &Retune{Policy: m.Policy, TargetSWR: m.TargetSWR, Loads: ls, Vars: m.Vars}
	// each load's own audit: one carrier, the load itself, the faults
	one := cond
	one.Points, one.SWR, one.Loads, one.CarrierAlso = 1, 1, nil, nil
	index := &Engine{C: c, R: rs, Cond: cond, AllowUnrated: allowUnrated}
	for i, r := range res {
		la := LoadAudit{Case: cases[i], Tune: r, First: len(index.listed)}
		if !r.Matched {
			rt.Unmatched++
			rt.PerLoad = append(rt.PerLoad, la)
			continue
		}
		// the copy's antenna is the load tuned for, never the port's
		// measured sweep (which the engine would otherwise prefer)
		tc := m.Retuned(r.Best.Values).WithAntenna(r.Load)
		one.BandLo, one.BandHi = r.F, r.F
		e, err := NewEngine(tc, rs, one)
		if err != nil {
			return nil, err
		}
		e.AllowUnrated = allowUnrated
		s, err := e.Audit()
		if err != nil {
			return nil, fmt.Errorf("load %s at %s: %w", circuits.FormatComplex(r.Load), circuits.FormatHz(r.F), err)
		}
		note := "(tuned " + SettingsText(m.Vars, r.Best.Values) + ")"
		// the load's cases in its section's numbering: the engine's, then
		// the exact circle worsts (none here: no circle), so one offset
		// maps them all
		for k := 0; k < e.NumCases()+len(s.Extra); k++ {
			cs := s.Case(k)
			if cs.Kind == Matched {
				cs.Kind = Explicit // the load tuned for, not the port's own z
			}
			cs.Note = note
			index.listed = append(index.listed, cs)
		}
		la.Section, la.Verdict = s, s.Verdict
		la.Worst = worstText(s)
		rt.PerLoad = append(rt.PerLoad, la)
	}
	nl := c.NL
	// the section's conditions say what each load's audit saw: the tuned
	// load itself (matched by the tuner) and the faults
	shown := cond
	shown.SWR, shown.Loads, shown.CarrierAlso = 1, nil, nil
	shown.Points = 0
	for i, cs := range cases {
		if i == 0 || cs.F != cases[i-1].F {
			shown.Points++
		}
	}
	air := ratings.Atmosphere{Altitude: cond.Altitude, Ambient: cond.Ambient}
	sec := &Section{File: nl.File, Title: nl.Title, SHA256: nl.SHA256(), Netlist: nl, Conditions: shown,
		Engine: index, NumCases: index.NumCases(), SafeW: math.Inf(1), Retune: rt,
		Air: air, AirPressure: air.Pressure()}
	// each node's worst peak over the matchable loads
	for ni, n := range c.Nodes {
		np := NodePeak{Node: n}
		for _, la := range rt.PerLoad {
			if la.Section != nil && ni < len(la.Section.Nodes) && la.Section.Nodes[ni].Vpk > np.Vpk {
				np.Vpk, np.Case = la.Section.Nodes[ni].Vpk, la.Section.Nodes[ni].Case+la.First
			}
		}
		sec.Nodes = append(sec.Nodes, np)
	}
	if rs != nil {
		sec.Findings, sec.Profile = rs.Findings, rs.Profile
	}
	for i, el := range c.Elements {
		p := &PartResult{Name: el.Name, Kind: el.Kind, Value: el.Value, Stress: map[ratings.Quantity]*Stress{}, SafeW: math.Inf(1)}
		if rs != nil {
			p.Rating = rs.Parts[el.Name]
			if p.Rating != nil {
				p.Findings = p.Rating.Findings
			}
		}
		for _, la := range rt.PerLoad {
			if la.Section == nil {
				continue
			}
			lp := la.Section.Parts[i]
			for q, st := range lp.Stress {
				cur, ok := p.Stress[q]
				if !ok || worseStress(st, cur) {
					x := *st
					x.Case += la.First
					x.UtilCase += la.First
					p.Stress[q] = &x
					if q == ratings.Arc {
						p.Clearance = lp.Clearance // the gap's figures at its worst load
					}
				}
			}
		}
		for _, st := range p.Stress {
			if st.Verdict > p.Verdict {
				p.Verdict = st.Verdict
			}
			if st.Limit.Advice {
				continue // a guide sets neither the use nor the rated verdict (judge)
			}
			if st.Verdict > p.Rated {
				p.Rated = st.Verdict
			}
			if st.Util > p.Util {
				p.Util = st.Util
			}
		}
		for _, q := range Quantities {
			if st, ok := p.Stress[q]; ok && st.SafeW < p.SafeW {
				p.SafeW, p.Limiting = st.SafeW, q
			}
		}
		sec.Parts = append(sec.Parts, p)
	}
	for _, la := range rt.PerLoad {
		if la.Section != nil && la.Section.MaxNodeVpk > sec.MaxNodeVpk {
			sec.MaxNodeVpk, sec.MaxNodeAt, sec.MaxNodeCase = la.Section.MaxNodeVpk, la.Section.MaxNodeAt, la.Section.MaxNodeCase+la.First
		}
	}
	clearanceFindings(sec, c, rs, air)
	for _, p := range sec.Parts {
		if p.Verdict > sec.Verdict && !(p.Verdict == ratings.Unrated && allowUnrated) {
			sec.Verdict = p.Verdict
		}
		if p.Rated > sec.Rated && !(p.Rated == ratings.Unrated && allowUnrated) {
			sec.Rated = p.Rated
		}
		if p.SafeW < sec.SafeW {
			sec.SafeW, sec.LimitPart, sec.LimitQ = p.SafeW, p.Name, p.Limiting
		}
	}
	return sec, nil
}

// worseStress orders two stresses of one quantity: the higher verdict, then the
// higher utilisation of the derated limit, then the larger value.
func worseStress(a, b *Stress) bool {
	if a.Verdict != b.Verdict {
		return a.Verdict > b.Verdict
	}
	if a.Util != b.Util {
		return a.Util > b.Util
	}
	return a.Value > b.Value
}

// worstText names the part and quantity nearest its limit in a section.
func worstText(s *Section) string {
	var best *Stress
	name := ""
	for _, p := range s.Parts {
		for _, q := range Quantities {
			if st, ok := p.Stress[q]; ok && st.Util > 0 && (best == nil || worseStress(st, best)) {
				best, name = st, p.Name
			}
		}
	}
	if best == nil {
		return ""
	}
	return fmt.Sprintf("%s %s %.0f %%", name, best.Quantity, 100*best.Util)
}

// SettingsText renders settings as "C1 43.5 pF, L1 16.4 µH".
func SettingsText(vars []tuning.Var, values []float64) string {
	var s []string
	for k, v := range vars {
		s = append(s, v.Name+" "+circuits.FormatSI(values[k], v.Unit()))
	}
	return strings.Join(s, ", ")
}
