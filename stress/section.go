package stress

import (
	"fmt"
	"math"
	"sort"
	"strconv"

	"rfstress/circuits"
	"rfstress/ratings"
)

// Audit runs every case of the engine on its own circuit and judges the
// result.
func (e *Engine) Audit() (*Section, error) {
	w := e.newWorkspace(e.C)
	w.record = true
	nw, err := e.run(w)
	if err != nil {
		return nil, err
	}
	acc := w.acc
	nl := e.C.NL
	s := &Section{File: nl.File, Title: nl.Title, SHA256: nl.SHA256(), Netlist: nl, Conditions: e.Cond, AntennaMeasured: antennaData(nl),
		Engine: e, NumCases: e.NumCases(), Extra: w.extra, MaxNodeVpk: nw.vpk, MaxNodeCase: nw.at, SafeW: math.Inf(1),
		Air: e.Air(), AirPressure: e.Air().Pressure()}
	for ni, n := range e.C.Nodes {
		s.Nodes = append(s.Nodes, NodePeak{Node: n, Vpk: w.nodePk[ni], Case: w.nodePkCase[ni]})
	}
	if len(e.C.Nodes) > 0 {
		s.MaxNodeAt = e.C.Nodes[nw.node]
	}
	s.MaxNodeVdc = nw.dc
	if nw.dcNode >= 0 {
		s.MaxDCV, s.MaxDCAt = nw.dcMax, e.C.Nodes[nw.dcNode]
	}
	if e.R != nil {
		s.Findings = e.R.Findings
		s.Profile = e.R.Profile
	}
	if w.bal.err > 0 {
		s.Findings = append(append([]ratings.Finding(nil), s.Findings...), w.bal.finding())
	}
	for i, el := range e.C.Elements {
		s.Parts = append(s.Parts, e.judge(s, el, e.rparts[i], &acc[i]))
	}
	s.Tx = w.tx
	e.judgeTx(&s.Tx)
	passFinding(s)
	if s.Tx.Verdict > s.Verdict {
		s.Verdict = s.Tx.Verdict
	}
	s.Rated = s.Verdict
	clearanceFindings(s, e.C, e.R, e.Air())
	for _, p := range s.Parts {
		if p.Verdict > s.Verdict && !(p.Verdict == ratings.Unrated && e.AllowUnrated) {
			s.Verdict = p.Verdict
		}
		if p.Rated > s.Rated && !(p.Rated == ratings.Unrated && e.AllowUnrated) {
			s.Rated = p.Rated
		}
		if p.SafeW < s.SafeW {
			s.SafeW, s.LimitPart, s.LimitQ = p.SafeW, p.Name, p.Limiting
		}
	}
	return s, nil
}

// judge turns one part's accumulated worst values into stresses, verdicts,
// safe power and ratings to buy.
func (e *Engine) judge(s *Section, el circuits.Element, rp *ratings.Part, a *accum) *PartResult {
	p := &PartResult{Name: el.Name, Kind: el.Kind, Value: el.Value, Stress: map[ratings.Quantity]*Stress{}, SafeW: math.Inf(1), Rating: rp}
	if rp != nil {
		p.Findings = rp.Findings
	}
	if l := el.Line(); l != nil {
		p.Value = l.Len // a line's value is its length
	}
	if extra := e.parasiticFindings(el, a); len(extra) > 0 {
		p.Findings = append(append([]ratings.Finding{}, p.Findings...), extra...)
	}
	for k := CaseKind(0); k < nKind; k++ {
		if !a.kindSeen[k] {
			continue
		}
		kw := KindWorst{Kind: k, Value: map[ratings.Quantity]float64{}, Case: map[ratings.Quantity]int{}}
		for qi, q := range Quantities {
			if a.has[qi] && a.kindCase[k][qi] >= 0 {
				kw.Value[q], kw.Case[q] = a.kind[k][qi], a.kindCase[k][qi]
			}
		}
		p.ByKind = append(p.ByKind, kw)
	}
	if a.has[qTemp] && rp != nil {
		// steady state under the same duty, and the state judged
		p.Heat = &Heat{Pavg: a.pavg, Tau: a.heat.Tau, KeyDown: e.heatT,
			Steady: e.Cond.Ambient + rp.Heating(a.pavg, math.Inf(1), e.Cond.Duty).Rise,
			Judged: e.Cond.Ambient + a.heat.Rise}
	}
	for qi, q := range Quantities {
		if !a.has[qi] {
			continue
		}
		st := &Stress{Quantity: q, Value: a.val[qi], Case: a.valCase[qi], Util: a.util[qi], UtilCase: a.utilCase[qi], SafeW: math.Inf(1)}
		p.Stress[q] = st
		if rp == nil {
			continue
		}
		lim, ok := limitFor(rp, q, s.Case(st.UtilCase).F)
		if !ok {
			continue // nobody rates this quantity for this kind: shown, not judged
		}
		if lim.Abs <= 0 {
			// unrated: judge at the largest value, at that case's frequency
			lim, _ = limitFor(rp, q, s.Case(st.Case).F)
			st.Limit = lim
			st.Verdict = ratings.Judge(st.Value, lim)
		} else {
			st.Limit = lim
			at := e.stressAt(q, st.Util, lim.Derated)
			st.Verdict = ratings.Judge(at, lim)
			st.SafeW = e.safePower(rp, qi, st.Util, a.pavg, a.utilDC[qi], a.pdc, lim.Derated)
		}
		if st.Verdict != ratings.OK {
			factor := st.Limit.Factor
			if factor <= 0 {
				factor = 1
			}
			st.Buy, st.BuyText = ratings.BuyRating(q, st.Value, factor)
			if q == ratings.Bpk || q == ratings.Bavg || q == ratings.Temp || q == ratings.Jrms || q == ratings.Arc || q == ratings.Pm {
				// physical figures: core size, cooling surface, wire diameter
				// at the case of the largest use: the limit may vary with f
				c, at := s.Case(st.Case), st.Value
				if st.Limit.Abs > 0 {
					c = s.Case(st.UtilCase)
				}
				lim, _ := limitFor(rp, q, c.F)
				if lim.Abs > 0 {
					at = e.stressAt(q, st.Util, lim.Derated)
				}
				ctx := ratings.RemedyContext{F: c.F, Ambient: e.Cond.Ambient, Irms: a.val[qIrms],
					Pavg: a.pavg, KeyDown: e.heatT, Duty: e.Cond.Duty}
				if r := rp.Remedy(lim, at, ctx); r != "" {
					st.BuyText = r
				}
			}
			if q == ratings.Bavg {
				p.Findings = append(append([]ratings.Finding(nil), p.Findings...), ratings.Finding{Part: p.Name, Pos: rp.Pos, Severity: "note",
					Text: fmt.Sprintf("flux at average power %s is above the heating guide %s: advice, not a rating. The Q measured at small signal understates the core loss at this flux; run at low power for a while and check that the winding is only warm",
						circuits.FormatSI(st.Value, "T"), circuits.FormatSI(lim.Derated, "T"))})
			}
		}
		if q == ratings.Arc && rp.Gap != nil {
			p.Clearance = &ClearanceResult{Gap: rp.Gap.Gap, Medium: rp.Gap.Medium,
				ArcV: ratings.ArcVoltage(rp.Gap.Gap, rp.Atmosphere()), Limit: ratings.ClearanceLimit(rp.Gap.Medium, rp.Gap.Gap, rp.Atmosphere()), Derated: st.Limit.Derated,
				Vpk: st.Value, Needed: rp.GapNeeded(st.Value)}
		}
		if st.Verdict > p.Verdict {
			p.Verdict = st.Verdict
		}
		if st.Verdict > p.Rated && !st.Limit.Advice {
			p.Rated = st.Verdict
		}
		if st.Limit.Advice {
			continue // a guide never sets the part's use or its safe power
		}
		if st.Util > p.Util {
			p.Util = st.Util
		}
		if st.SafeW < p.SafeW {
			p.SafeW, p.Limiting = st.SafeW, q
		}
	}
	if rp != nil && a.has[qPdiss] {
		if fnd, ok := rp.UnratedHeat(a.val[qPdiss]); ok {
			p.Findings = append(append([]ratings.Finding(nil), p.Findings...), fnd)
		}
	}
	p.Binding = p.Limiting
	if p.Binding == "" {
		p.Binding = bindingRating(p)
	}
	return p
}

// bindingRating is the rated quantity nearest its limit when none limits
// the safe power.
func bindingRating(p *PartResult) ratings.Quantity {
	var best ratings.Quantity
	u := 0.0
	for _, q := range Quantities {
		if st, ok := p.Stress[q]; ok && !st.Limit.Advice && st.Limit.Abs > 0 && st.Util > u {
			best, u = q, st.Util
		}
	}
	return best
}

// Heat is a wound part's thermal figures at its hottest case.
type Heat struct {
	Pavg    float64 // average dissipation, W
	Tau     float64 // thermal time constant, s (0: no heat capacity known)
	KeyDown float64 // key-down time judged, s (+Inf steady)
	Steady  float64 // steady-state temperature, °C
	Judged  float64 // temperature after KeyDown, °C (the one judged)
}

// limitFor is the part's limit of q at f with its text (only that text
// is formatted: ratings.Part.Limit).
func limitFor(rp *ratings.Part, q ratings.Quantity, f float64) (ratings.Limit, bool) {
	return rp.Limit(q, f)
}

// safePower is the PEP at which quantity qi of a part reaches its derated
// limit, for utilisation util at the audited PEP. The network is linear:
// voltages, currents and flux grow with √P, dissipation with P; the
// temperature rise follows the thermal model (Part.Heating) of the
// dissipation, which grows with P, so a bisection finds it.
//
// A DC share dc of the stress (and pdc of pavg) does not grow with the
// drive: only the RF share scales, combined as the stress is (peaks add,
// RMS values add in squares, heat adds). Where the DC alone reaches the
// derated limit no drive is safe (0). With no DC this is the plain rule.
func (e *Engine) safePower(rp *ratings.Part, qi int, util, pavg, dc, pdc, derated float64) float64 {
	pep := e.Cond.PowerW
	if util <= 0 {
		return math.Inf(1)
	}
	if qi != qTemp && dc > 0 {
		at := util * derated
		switch qi {
		case qVrms, qIrms, qJrms:
			rf2 := at*at - dc*dc
			if derated <= dc {
				return 0
			}
			if rf2 <= 0 {
				return math.Inf(1)
			}
			return pep * (derated*derated - dc*dc) / rf2
		case qPdiss, qPm:
			if derated <= dc {
				return 0
			}
			if at-dc <= 0 {
				return math.Inf(1)
			}
			return pep * (derated - dc) / (at - dc)
		}
		// peaks: Vpk, Bpk
		if derated <= dc {
			return 0
		}
		if at-dc <= 0 {
			return math.Inf(1)
		}
		r := (derated - dc) / (at - dc)
		return pep * r * r
	}
	switch qi {
	case qPdiss, qPm:
		return pep / util
	case qTemp:
		if rp == nil || !(pavg > 0) {
			return math.Inf(1)
		}
		prf := pavg - pdc // the share that grows with drive
		heat := func(s float64) float64 { return rp.Heating(pdc+s*prf, e.heatT, e.Cond.Duty).Rise }
		rise := heat(1)
		if rise <= 0 {
			return math.Inf(1)
		}
		allowed := rise / util
		if heat(0) >= allowed {
			return 0 // the DC heat alone reaches the limit
		}
		if prf <= 0 {
			return math.Inf(1)
		}
		// rise(pdc + s·prf) = allowed; the rise grows with s
		lo, hi := 0.0, 1.0
		for heat(hi) < allowed {
			lo, hi = hi, hi*2
			if hi > 1e12 {
				return math.Inf(1)
			}
		}
		for n := 0; n < 200 && hi-lo > 1e-13*hi; n++ {
			mid := (lo + hi) / 2
			if heat(mid) < allowed {
				lo = mid
			} else {
				hi = mid
			}
		}
		return pep * lo
	}
	return pep / (util * util)
}

// HarmonicLines gives the filter's matched response at the harmonics of
// the band centre. Only the PDF shows it, so it is computed when a report
// asks, not in every audit.
func (e *Engine) HarmonicLines() []HarmonicLine {
	fc := (e.Cond.BandLo + e.Cond.BandHi) / 2
	tw := circuits.NewTwoPortWork(e.C)
	var out []HarmonicLine
	for n := 1; n <= e.Cond.HarmonicMax; n++ {
		lvl := 0.0
		if n > 1 {
			lvl = math.Inf(-1)
			if i := n - 2; i < len(e.Cond.HarmonicDBc) {
				lvl = e.Cond.HarmonicDBc[i]
			}
		}
		sp, err := tw.At(float64(n) * fc)
		if err != nil {
			continue
		}
		out = append(out, HarmonicLine{N: n, F: float64(n) * fc, LevelDBc: lvl, S21dB: circuits.DB(sp.S21)})
	}
	return out
}

// SweepPoint is one frequency of a response plot.
type SweepPoint struct {
	F     float64
	S21dB float64
	S11dB float64
}

// Sweep gives the matched response from below the band to above the
// highest harmonic audited, logarithmically spaced, for the report's plot.
func (e *Engine) Sweep(n int) []SweepPoint {
	lo := e.Cond.BandLo / 2
	hi := e.Cond.BandHi * float64(e.Cond.HarmonicMax) * 1.15
	for _, f := range e.Cond.CarrierAlso {
		if f*float64(e.Cond.HarmonicMax)*1.15 > hi {
			hi = f * float64(e.Cond.HarmonicMax) * 1.15
		}
		if f/2 < lo {
			lo = f / 2
		}
	}
	tw := circuits.NewTwoPortWork(e.C)
	var out []SweepPoint
	for i := 0; i < n; i++ {
		f := lo * math.Pow(hi/lo, float64(i)/float64(n-1))
		sp, err := tw.At(f)
		if err != nil {
			continue
		}
		out = append(out, SweepPoint{F: f, S21dB: circuits.DB(sp.S21), S11dB: circuits.DB(sp.S11)})
	}
	return out
}

// Bank is several netlists audited together, one verdict for all.
type Bank struct {
	Sections  []*Section
	Verdict   ratings.Verdict
	Rated     ratings.Verdict // the verdict with guides left out (Section.Rated)
	SafeW     float64
	LimitFile string
	LimitPart string
	LimitQ    ratings.Quantity
}

// NewBank gathers sections and finds the overall verdict and safe power.
func NewBank(sections []*Section) *Bank {
	b := &Bank{Sections: sections, SafeW: math.Inf(1)}
	for _, s := range sections {
		if s.Verdict > b.Verdict {
			b.Verdict = s.Verdict
		}
		if s.Rated > b.Rated {
			b.Rated = s.Rated
		}
		if s.SafeW < b.SafeW {
			b.SafeW, b.LimitFile, b.LimitPart, b.LimitQ = s.SafeW, s.File, s.LimitPart, s.LimitQ
		}
	}
	return b
}

// AdviceOnly reports whether the bank is marginal only through guides
// (advice): no rated quantity is beyond its derated limit.
func (b *Bank) AdviceOnly() bool { return b.Verdict == ratings.Marginal && b.Rated < ratings.Marginal }

// AdviceOnly reports whether the part is marginal only through a guide.
func (p *PartResult) AdviceOnly() bool {
	return p.Verdict == ratings.Marginal && p.Rated < ratings.Marginal
}

// Upgrades lists every part and quantity that is not ok, worst first.
func (s *Section) Upgrades() []Upgrade {
	var out []Upgrade
	for _, p := range s.Parts {
		for _, q := range Quantities {
			st, ok := p.Stress[q]
			if !ok || st.Verdict == ratings.OK {
				continue
			}
			out = append(out, Upgrade{Part: p.Name, Kind: p.Kind, Stress: st})
		}
	}
	sort.SliceStable(out, func(i, j int) bool { return out[i].Stress.Verdict > out[j].Stress.Verdict })
	return out
}

// KindWorst is a part's worst values within one kind of case.
type KindWorst struct {
	Kind  CaseKind
	Value map[ratings.Quantity]float64
	Case  map[ratings.Quantity]int
}

// Upgrade is one rating to raise.
type Upgrade struct {
	Part   string
	Kind   circuits.Kind
	Stress *Stress
}

// Section is the audit of one netlist.
type Section struct {
	File       string
	Title      string
	SHA256     string
	Netlist    *circuits.Netlist
	Conditions Conditions
	Engine     *Engine
	NumCases   int
	Parts      []*PartResult
	Verdict    ratings.Verdict
	// Rated is the verdict with guides left out (PartResult.Rated): what
	// the exit status judges unless asked to count advice
	Rated     ratings.Verdict
	SafeW     float64
	LimitPart string
	LimitQ    ratings.Quantity
	// AntennaMeasured names the antenna's measured data as written
	// (empty: the port's z is the antenna)
	AntennaMeasured string
	MaxNodeVpk      float64 // largest node-to-ground peak voltage
	MaxNodeAt       string  // node name
	MaxNodeCase     int
	MaxNodeVdc      float64 // the DC share of MaxNodeVpk
	MaxDCV          float64 // highest DC node voltage (0: no DC)
	MaxDCAt         string
	// Position names the select position audited ("" without select
	// lines); Wrong is set when that position is audited at another
	// position's carriers (the fault "wrong band selected"), which For
	// names.
	Position string
	Wrong    bool
	For      string
	// NoPass is set when the network does not pass its own band (a
	// warning finding says so; Tx.InBandBest has the figures).
	NoPass bool
	// PartFaults is the single-part fault analysis, when asked for.
	PartFaults *PartFaults
	Findings   []ratings.Finding
	// Harmonics is left empty by Audit: only the PDF shows it, and the
	// caller that writes one fills it from Engine.HarmonicLines.
	Harmonics []HarmonicLine
	Profile   *ratings.Profile
	Tolerance *Tolerance
	// Extra are the exact worst loads found on the SWR circle, cases
	// NumCases … NumCases+len(Extra)−1.
	Extra []ExactCase
	// Retune is set when the variable parts were retuned per load
	// (retune.go).
	Retune *Retune
	// Tx is what the transmitter sees: its worst SWR, input impedance and
	// reflected power over every case, judged against tx-swr-max.
	Tx TxResult
	// Air is the atmosphere clearances were judged in, AirPressure its
	// pressure in Pa; Nodes each node's worst peak to ground.
	Air         ratings.Atmosphere
	AirPressure float64
	Nodes       []NodePeak
	// ArcCheckV is the peak voltage at which a typical small air
	// clearance (ArcCheckGap) would arc here: node pairs above it with no
	// clearance declared get a finding.
	ArcCheckV float64
}

// NodePeak is a node's worst peak voltage to ground and its case.
type NodePeak struct {
	Node string
	Vpk  float64
	Case int
}

// ArcCheckGap is the clearance assumed where none is declared: about the
// spacing of leads, pads and wiring in small-signal construction (common
// practice).
const ArcCheckGap = 1e-3

// clearanceFindings adds a finding for every audited node pair (each node
// to ground, each part's terminals) whose worst peak voltage would arc
// across a typical 1 mm air clearance when no clearance is declared
// between those two nodes (gap= on a part, or a clearance statement).
func clearanceFindings(s *Section, c *circuits.Circuit, rs *ratings.Set, air ratings.Atmosphere) {
	rpart := func(i int) *ratings.Part {
		if rs == nil {
			return nil
		}
		return rs.Parts[c.Elements[i].Name]
	}
	thr := ratings.ArcVoltage(ArcCheckGap, air)
	s.ArcCheckV = thr
	type pair struct{ a, b string }
	key := func(a, b string) pair {
		if a > b {
			a, b = b, a
		}
		return pair{a, b}
	}
	declared := map[pair]bool{}
	for i, el := range c.Elements {
		if rp := rpart(i); rp != nil && rp.Gap != nil {
			declared[key(el.Comp.A, el.Comp.B)] = true
		}
	}
	where := fmt.Sprintf("a %s air gap would arc at %s here (%.0f m, %.1f kPa)", mmLabel(ArcCheckGap), circuits.FormatSI(thr, "V"), air.Altitude, air.Pressure()/1e3)
	for _, n := range s.Nodes {
		if n.Vpk > thr && !declared[key(n.Node, circuits.Ground)] {
			declared[key(n.Node, circuits.Ground)] = true // said once, here
			s.Findings = append(s.Findings, ratings.Finding{Pos: circuits.Pos{File: s.File, Line: 1, Col: 1}, Severity: "warning",
				Text: fmt.Sprintf("node %s reaches %s peak to ground at %s; %s: check its spacing to the chassis and declare it (clearance NAME %s %s gap=… medium=air|board|coated)",
					n.Node, circuits.FormatSI(n.Vpk, "V"), s.Case(n.Case).Describe(), where, n.Node, circuits.Ground)})
		}
	}
	for i, p := range s.Parts {
		rp := rpart(i)
		st, ok := p.Stress[ratings.Vpk]
		if rp == nil || !ok || st.Value <= thr {
			continue
		}
		a, b, across := rp.AcrossNodes(c.Elements[i].Comp)
		if !across || declared[key(a, b)] {
			continue
		}
		declared[key(a, b)] = true
		p.Findings = append(append([]ratings.Finding(nil), p.Findings...), ratings.Finding{Part: p.Name, Pos: rp.Pos, Severity: "warning",
			Text: fmt.Sprintf("%s peak across its terminals (%s to %s) at %s; %s: declare its lead or plate spacing with gap= (and medium=)",
				circuits.FormatSI(st.Value, "V"), a, b, s.Case(st.Case).Describe(), where)})
	}
}

func mmLabel(d float64) string { return strconv.FormatFloat(d*1e3, 'g', 3, 64) + " mm" }

// Case returns case i of the section.
func (s *Section) Case(i int) Case {
	if n := s.Engine.NumCases(); i >= n && i-n < len(s.Extra) {
		return s.Engine.exactCase(s.Extra[i-n])
	}
	return s.Engine.Case(i)
}

// Has reports whether the part has a stress of quantity q.
func (p *PartResult) Has(q ratings.Quantity) bool { _, ok := p.Stress[q]; return ok }

// HarmonicLine is the filter's attenuation at one harmonic of the band centre.
type HarmonicLine struct {
	N        int
	F        float64
	LevelDBc float64 // the amplifier's level (−Inf when absent)
	S21dB    float64 // matched insertion gain of the filter at that frequency
}

// antennaData is the antenna port's measured= file as written, if any.
func antennaData(nl *circuits.Netlist) string {
	if nl == nil || nl.Out == nil {
		return ""
	}
	if a, ok := nl.Out.Attrs["measured"]; ok {
		return a.Raw
	}
	return ""
}
