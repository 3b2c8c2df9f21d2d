package ratings

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"

	"rfstress/circuits"
)

// TempExponent is the exponent of the still-air temperature-rise rule for
// small wound cores, ΔT[°C] ≈ (P[mW]/A[cm²])^0.833 (common practice in
// magnetic-component literature).
const TempExponent = 0.833

// ALTolerance is how far AL·N² may stray from the netlist inductance
// before it is worth a warning: wider than core AL tolerances of a few
// percent plus winding spread (common practice).
const ALTolerance = 0.10

// Finding is something worth telling about a part (or the set) that is
// not a limit: a doubtful choice or an inconsistent figure.
type Finding struct {
	Part     string // "" for findings about the netlist as a whole
	Pos      circuits.Pos
	Severity string // "warning" or "note"
	Text     string
}

// Part is one component with its ratings read from the netlist.
type Part struct {
	Name       string
	Kind       circuits.Kind
	Pos        circuits.Pos
	Value      float64 // F, H or Ω
	Class      string  // derating class (ClassCapacitor1 …)
	Dielectric string  // capacitors: lower-case dielectric word, "" if not given
	Core       *CoreInfo
	Turns      int
	Wire       float64 // diameter, m; 0 if not given
	Area       float64 // cooling surface of the wound part, m²; 0 if unknown
	WireLength float64 // m; 0 if unknown
	// Gap is the clearance between the part's terminals judged against
	// breakdown (gap= on a part, or a clearance statement); nil if none.
	Gap      *Clearance
	Findings []Finding

	vpk, vrms, pmax *circuits.Attr
	irms            *circuits.Attr
	prof            *Profile
	// facs are the profile's factors for the part's own class, by
	// quantity (Quantities order), and those of its core and winding:
	// asked once at Prepare, not through two map lookups per limit per
	// carrier
	facs             [nQuantities]float64
	facCore, facWire float64
	facsSet          bool
	line             *circuits.LineSpec // lines: loss against frequency, for the heating limit
	air              *Atmosphere        // shared with the Set: where gaps are judged
}

// Set is every part of a netlist prepared for judging.
type Set struct {
	Parts     map[string]*Part
	Order     []string // netlist order
	Profile   *Profile
	Materials map[string]*Material // built-in and file materials, netlist ones on top
	Findings  []Finding            // about the netlist as a whole; part findings are on the parts
	// Air is the atmosphere clearances are judged in (SeaLevel unless
	// the audit says otherwise: SetAir).
	Air *Atmosphere
}

// SetAir sets the atmosphere every clearance of the set is judged in.
func (s *Set) SetAir(a Atmosphere) { *s.Air = a }

var dielectricClass = map[string]string{
	"c0g": ClassCapacitor1, "np0": ClassCapacitor1, "mica": ClassCapacitor1, "porcelain": ClassCapacitor1,
	"glass": ClassCapacitor1, "film": ClassCapacitor1,
	"x7r": ClassCapacitor2, "x5r": ClassCapacitor2, "y5v": ClassCapacitor2, "z5u": ClassCapacitor2,
	"air": ClassCapacitorAir, "vacuum": ClassCapacitorAir,
}

const dielectricWant = "one of c0g, np0, mica, porcelain, film, glass, air, vacuum, x7r, x5r, y5v, z5u"

// Prepare reads the rating attributes of every part of nl. mats are the
// materials to resolve core material= against (nil: Builtin()); the
// netlist's own material statements are laid over them. prof nil means
// the standard profile. Errors are a circuits.ErrorList holding all of
// them, in file order; the Set is then nil.
func Prepare(nl *circuits.Netlist, mats map[string]*Material, prof *Profile) (*Set, error) {
	var errs circuits.ErrorList
	if nl == nil {
		return nil, circuits.ErrorList{{Msg: "no netlist to prepare", Want: "a parsed netlist"}}
	}
	if prof == nil {
		prof = BuiltinProfile("standard")
	}
	if mats == nil {
		mats = Builtin()
	}
	air := SeaLevel
	set := &Set{Parts: map[string]*Part{}, Profile: prof, Materials: map[string]*Material{}, Air: &air}
	for k, m := range mats {
		if m != nil {
			set.Materials[k] = m
		}
	}
	for _, s := range nl.Materials {
		m := materialFrom(s, &errs)
		if m == nil {
			// its error is reported; a stand-in keeps the cores that name
			// it from raising a second, cascaded "unknown material"
			set.Materials[s.Name] = &Material{Name: s.Name, Class: "air", Mu: 1, Pos: s.Pos}
			continue
		}
		if old := lookupMaterial(set.Materials, m.Name); old != nil {
			from := "file"
			if old.Builtin {
				from = "built-in"
			}
			set.Findings = append(set.Findings, Finding{Pos: s.Pos, Severity: "note",
				Text: fmt.Sprintf("material %s here replaces the %s material %s", m.Name, from, old.Name)})
			delete(set.Materials, old.Name)
		}
		set.Materials[m.Name] = m
	}
	usedBy := map[string]string{}
	for _, c := range nl.Components {
		if c.Kind != circuits.Inductor {
			continue
		}
		if w, ok := c.Attrs.Word("core"); ok {
			if _, seen := usedBy[w]; !seen {
				usedBy[w] = c.Name
			}
		}
	}
	cores := map[string]*CoreInfo{}
	for _, s := range nl.Cores {
		cores[s.Name] = buildCore(s, set.Materials, usedBy[s.Name], &errs)
	}
	switches := 0
	for _, c := range nl.Components {
		p := preparePart(c, cores, prof, &errs)
		p.air = set.Air
		set.Parts[c.Name] = p
		set.Order = append(set.Order, c.Name)
		if c.Kind == circuits.Switch {
			if switches == 0 {
				set.Findings = append(set.Findings, Finding{Pos: c.Pos, Severity: "note", Text: SwitchNote})
			}
			switches++
		}
	}
	if len(errs) > 0 {
		errs.Sort()
		return nil, errs
	}
	return set, nil
}

func preparePart(c *circuits.Component, cores map[string]*CoreInfo, prof *Profile, errs *circuits.ErrorList) *Part {
	p := &Part{Name: c.Name, Kind: c.Kind, Pos: c.Pos, Value: c.Value, prof: prof}
	p.vpk, p.vrms, p.pmax, p.irms = c.Attrs["vpk"], c.Attrs["vrms"], c.Attrs["pmax"], c.Attrs["irms"]
	switch c.Kind {
	case circuits.Capacitor:
		p.Class = ClassCapacitor
		if a, ok := c.Attrs["dielectric"]; ok && len(a.Words) > 0 {
			d := strings.ToLower(a.Words[0])
			cl, known := dielectricClass[d]
			if !known {
				*errs = append(*errs, &circuits.Error{Pos: a.ValPos, Want: dielectricWant,
					Msg: fmt.Sprintf("capacitor %s: unknown dielectric %q", c.Name, a.Words[0])})
				break
			}
			p.Dielectric, p.Class = d, cl
			if cl == ClassCapacitor2 {
				p.warn("warning", "dielectric %s is class II: lossy, and its value drifts with temperature and voltage; common practice in RF filters is C0G/NP0, mica or porcelain", d)
			}
		}
	case circuits.Inductor:
		p.Class = ClassInductor
		p.prepareWinding(c, cores)
	case circuits.Resistor:
		p.Class = ClassResistor
	case circuits.Line:
		p.Class = ClassLine
		p.prepareLine(c)
	case circuits.Block:
		p.Class = ClassBlock
	case circuits.Connector:
		p.Class = ClassConnector
	case circuits.Switch:
		p.Class = ClassSwitch
	}
	p.prepareGap(c, errs)
	for i, q := range Quantities {
		p.facs[i] = prof.Factor(p.Class, q)
	}
	p.facCore, p.facWire, p.facsSet = prof.Factor(ClassCore, Bpk), prof.Factor(ClassInductor, Jrms), true
	return p
}

// factor is the profile's derating factor for quantity q of class.
func (p *Part) factor(class string, q Quantity) float64 {
	if p.facsSet {
		switch {
		case class == p.Class:
			if i := q.index(); i >= 0 {
				return p.facs[i]
			}
		case class == ClassCore && q == Bpk:
			return p.facCore
		case class == ClassInductor && q == Jrms:
			return p.facWire
		}
	}
	return p.prof.Factor(class, q)
}

// prepareGap reads gap= and medium= (a part's plate or lead spacing, or a
// clearance statement).
func (p *Part) prepareGap(c *circuits.Component, errs *circuits.ErrorList) {
	g, ok := c.Attrs["gap"]
	med := MediumAir
	if a, has := c.Attrs["medium"]; has {
		med = strings.ToLower(a.Words[0])
		known := false
		for _, m := range Media {
			known = known || m == med
		}
		if !known {
			*errs = append(*errs, &circuits.Error{Pos: a.ValPos, Want: "one of " + strings.Join(Media, ", "),
				Msg: fmt.Sprintf("%s %s: unknown medium %q", c.Kind, c.Name, a.Words[0])})
			return
		}
		if !ok {
			*errs = append(*errs, &circuits.Error{Pos: a.Pos, Want: "gap= with medium=, e.g. gap=1.5mm medium=" + med,
				Msg: fmt.Sprintf("%s %s: medium= without gap=", c.Kind, c.Name)})
			return
		}
	}
	if !ok {
		return
	}
	if p.Dielectric == "vacuum" && med == MediumAir {
		*errs = append(*errs, &circuits.Error{Pos: g.Pos, Want: "no gap= on a vacuum capacitor: its vpk= rating covers its plates",
			Msg: fmt.Sprintf("capacitor %s: gap= judges an air gap, but its plates are in vacuum", c.Name)})
		return
	}
	p.Gap = &Clearance{Gap: g.Num, Medium: med}
}

// SwitchNote is said once for a netlist with relays or switches.
const SwitchNote = "relay and switch contacts: a DC current rating overstates what a contact carries at RF (skin effect in the contacts, heating of the flexible leads), so rate irms= by RF current; and never switch while transmitting: hot switching burns contacts (common practice)"

func (p *Part) warn(sev, format string, args ...any) {
	p.Findings = append(p.Findings, Finding{Part: p.Name, Pos: p.Pos, Severity: sev, Text: fmt.Sprintf(format, args...)})
}

func (p *Part) prepareWinding(c *circuits.Component, cores map[string]*CoreInfo) {
	if n, ok := c.Attrs.Num("turns"); ok {
		p.Turns = int(n)
	}
	if d, ok := c.Attrs.Num("wire"); ok {
		p.Wire = d
	}
	if w, ok := c.Attrs.Word("core"); ok {
		p.Core = cores[w] // an unknown name is the parser's error
	}
	if p.Core == nil {
		return
	}
	k := p.Core
	p.Area = k.WoundArea(p.Wire, !k.AreaEst && k.Area > 0)
	if p.Turns > 0 && p.Wire > 0 {
		p.WireLength = float64(p.Turns) * k.TurnLength(p.Wire)
	}
	if k.AL > 0 {
		nFit := int(math.Max(1, math.Round(math.Sqrt(p.Value/k.AL))))
		if p.Turns == 0 {
			p.warn("note", "no turns= given: flux density is not checked; AL of core %s suggests %d turns for %s",
				k.Name, nFit, circuits.FormatSI(p.Value, "H"))
		} else {
			lal := k.AL * float64(p.Turns*p.Turns)
			if off := math.Abs(lal-p.Value) / p.Value; off > ALTolerance {
				p.warn("warning", "AL·N² = %s with %d turns on core %s, but the netlist says %s (%.0f %% off); %d turns would give %s",
					circuits.FormatSI(lal, "H"), p.Turns, k.Name, circuits.FormatSI(p.Value, "H"), off*100,
					nFit, circuits.FormatSI(k.AL*float64(nFit*nFit), "H"))
			}
		}
	}
	if p.Wire > 0 && p.Turns > 0 && k.ID > 0 {
		switch fit := OneLayerTurns(k.ID, p.Wire); {
		case fit == 0:
			p.warn("warning", "wire %s does not pass through the %s hole of core %s", mm(p.Wire), mm(k.ID), k.Name)
		case p.Turns > fit:
			p.warn("warning", "%d turns of %s wire need more than one layer on core %s (one layer holds %d): self-capacitance rises and the loss and heating figures are optimistic",
				p.Turns, mm(p.Wire), k.Name, fit)
		}
	}
	if a, ok := c.Attrs["q"]; ok && p.WireLength > 0 {
		for _, pt := range a.Points {
			if pt.F <= 0 {
				continue
			}
			if qcu := p.CopperQ(pt.F); pt.V > qcu {
				p.warn("note", "q=%s at %s is above what the copper alone allows (Q ≈ %.0f for %d turns of %s wire); the copper loss sets the floor",
					trimNum(pt.V), circuits.FormatSI(pt.F, "Hz"), qcu, p.Turns, mm(p.Wire))
				break
			}
		}
	}
}

func mm(v float64) string { return fmt.Sprintf("%.3g mm", v*1e3) }

// Limits gives the limit of every quantity that applies to the part at
// carrier frequency f, Abs 0 for a stress that applies but has no rating:
//
//	capacitor: vpk, irms always; vrms and pdiss when rated
//	inductor:  irms when rated or when no wire= is given; jrms with wire=;
//	           bpk with a core, turns= and Ae, unless its material has no
//	           flux limit (air); temp with a core of known surface, unless
//	           its material is known and has no tmax (air)
//	resistor:  pdiss, vpk
func (p *Part) Limits(f float64) []Limit { return p.limits(nil, f, allText) }

// AppendLimitValues appends the limits of Limits to dst with the numbers
// only, no Basis text: the audit asks for every part at every carrier and
// formats the text only for the case that binds (Limits).
func (p *Part) AppendLimitValues(dst []Limit, f float64) []Limit { return p.limits(dst, f, noText) }

// Limit is the part's limit of quantity q at f with its Basis text, as
// Limits gives it; ok false when the part has no limit of q. Only q's
// text is formatted: a verdict quotes one limit per quantity.
func (p *Part) Limit(q Quantity, f float64) (Limit, bool) {
	var buf [12]Limit
	for _, l := range p.limits(buf[:0], f, q) {
		if l.Quantity == q {
			return l, true
		}
	}
	return Limit{}, false
}

// allText and noText ask limits for the Basis text of every limit or of
// none.
const (
	allText Quantity = "\x00all"
	noText  Quantity = "\x00none"
)

func (p *Part) limits(out []Limit, f float64, textFor Quantity) []Limit {
	// the Basis text of quantity q is formatted when textFor is q or
	// allText
	tx := func(q Quantity) bool { return textFor == allText || textFor == q }
	given := func(q Quantity, a *circuits.Attr, class string) {
		fac := p.factor(class, q)
		text := tx(q)
		if a == nil {
			l := Limit{Quantity: q, Factor: fac}
			if text {
				l.Basis = fmt.Sprintf("not rated: no %s= in netlist", attrName(q))
			}
			out = append(out, l)
			return
		}
		l := Limit{Quantity: q, Abs: a.Num, Derated: a.Num * fac, Factor: fac}
		if text {
			l.Basis = fmt.Sprintf("%s=%s in netlist", a.Key, a.Raw)
		}
		out = append(out, l)
	}
	switch p.Kind {
	case circuits.Capacitor:
		given(Vpk, p.vpk, p.Class)
		if p.vrms != nil {
			given(Vrms, p.vrms, p.Class)
		}
		out = append(out, p.currentLimit(f, true, tx(Irms)))
		if p.pmax != nil {
			given(Pdiss, p.pmax, p.Class)
		}
	case circuits.Inductor:
		if p.irms != nil || p.Wire == 0 {
			out = append(out, p.currentLimit(f, false, tx(Irms)))
		}
		// Three core limits, judged apart: saturation (a rating), the
		// heating guide (advice) and temperature (a rating). A
		// non-magnetic former has neither saturation nor guide, and no
		// temperature limit unless its material gives tmax=.
		m := (*Material)(nil)
		if p.Core != nil {
			m = p.Core.Material
		}
		if p.Core != nil && p.Turns > 0 && p.Core.Ae > 0 {
			if m == nil || m.Bsat > 0 {
				out = append(out, p.satLimit(tx(Bpk)))
			}
			if m.GuideFlux(f) > 0 {
				out = append(out, p.guideLimit(f, tx(Bavg)))
			}
		}
		if p.Core != nil && p.Area > 0 && (m == nil || m.Tmax > 0) {
			out = append(out, p.tempLimit(tx(Temp)))
		}
		if p.Wire > 0 {
			out = append(out, p.densityLimit(f, tx(Jrms)))
		}
		if p.vpk != nil {
			given(Vpk, p.vpk, p.Class) // a choke's insulation
		}
	case circuits.Resistor:
		given(Pdiss, p.pmax, p.Class)
		given(Vpk, p.vpk, p.Class)
	case circuits.Line:
		given(Vpk, p.vpk, p.Class)
		out = append(out, p.lineHeatLimit(f, tx(Pm)))
	case circuits.Block:
		// a measured filter is rated by the heat it can shed; a port
		// voltage rating is optional (its connectors, its parts inside)
		given(Pdiss, p.pmax, p.Class)
		if p.vpk != nil {
			given(Vpk, p.vpk, p.Class)
		}
	case circuits.Connector:
		given(Vpk, p.vpk, p.Class)
		given(Irms, p.irms, p.Class)
	case circuits.Switch:
		// RF current through the closed contact and its leads; peak
		// voltage across the open contact. Both are judged in every
		// state: a closed contact sees little voltage, an open one
		// little current.
		out = append(out, p.currentLimit(f, false, tx(Irms)))
		given(Vpk, p.vpk, p.Class)
	}
	if p.Gap != nil {
		out = append(out, p.arcLimit(tx(Arc)))
	}
	return out
}

// Shows says whether the part carries stress of quantity q at all, so
// that a connector shows no dissipation and a clearance only the voltage
// across its gap.
func (p *Part) Shows(q Quantity) bool {
	switch {
	case q == Arc:
		return p.Gap != nil
	case p.Kind == circuits.Clearance:
		return false
	case p.Kind == circuits.Connector:
		return q == Vpk || q == Irms
	}
	return true
}

// AcrossNodes names the two nodes whose voltage difference the part's Vpk
// is (its terminals), or ok false when Vpk is something else (a
// connector's is centre to ground).
func (p *Part) AcrossNodes(c *circuits.Component) (a, b string, ok bool) {
	if p.Kind == circuits.Connector || c == nil || len(c.Terminals()) != 2 {
		return "", "", false // a line's crest is along it, not across two nodes
	}
	return c.A, c.B, true
}

// Atmosphere is the air the part's clearance is judged in.
func (p *Part) Atmosphere() Atmosphere {
	if p.air == nil {
		return SeaLevel
	}
	return *p.air
}

// arcLimit is the limit of the voltage across the part's clearance. For
// air: the voltage that would arc is the rating, derated by the profile's
// gap-air factor. For a board surface: the working-voltage guide (times
// the profile's gap-board factor) is the limit for ok, and the voltage at
// which the same gap through air would arc is the rating, since the
// surface flashes over at or below it; between the two the verdict is
// marginal, so a guide, which is advice, never fails a design alone.
func (p *Part) arcLimit(text bool) Limit {
	g := p.Gap
	a := p.Atmosphere()
	fac := p.prof.Factor(g.Class(), Arc)
	arc := ArcVoltage(g.Gap, a)
	l := Limit{Quantity: Arc, Abs: arc, Derated: arc * fac, Factor: fac}
	if g.Medium != MediumAir {
		guide := ClearanceLimit(g.Medium, g.Gap, a) * fac
		l.Derated = math.Min(guide, arc)
		l.Factor = l.Derated / arc
	}
	if !text {
		return l
	}
	switch g.Medium {
	case MediumAir:
		l.Basis = fmt.Sprintf("air gap %s would arc at %s peak: Paschen breakdown %s (uniform field, p·d %.3g Torr·cm at %s) × %.2g for RF × %.2g for edges",
			mmText(g.Gap), circuits.FormatSI(arc, "V"), circuits.FormatSI(AirUniformBreakdown(a.PdTorrCm(g.Gap)), "V"),
			a.PdTorrCm(g.Gap), a.Describe(), RFFactor, FieldFactor)
	default:
		per := BoardVpkPerMM
		what := "a clean uncoated board surface"
		if g.Medium == MediumCoated {
			per, what = CoatedVpkPerMM, "a conformally coated board surface"
		}
		l.Basis = fmt.Sprintf("working-voltage guide %.0f V peak per mm along %s over %s (creepage-style, common practice; IEC 60664-1 family; advice: beyond it marginal); the same gap in air would arc at %s, which the surface does not exceed",
			per, what, mmText(g.Gap), circuits.FormatSI(arc, "V"))
	}
	return l
}

// WindingRdc is the DC resistance of the winding from its wire: annealed
// copper at 20 °C (IEC 60028) over WireLength; 0 when unknown.
func (p *Part) WindingRdc() float64 {
	if p.WireLength <= 0 || p.Wire <= 0 {
		return 0
	}
	return Rho20Copper * p.WireLength / (math.Pi * p.Wire * p.Wire / 4)
}

func attrName(q Quantity) string {
	if q == Pdiss {
		return "pmax"
	}
	return string(q)
}

// currentLimit reads irms= at f. A plain figure holds at every frequency.
// Between rated points it is interpolated log-log. Outside them the rating
// is carried by the loss mechanism that is worse in that direction, since
// the heating I²·R is what the rating protects:
//
//	capacitor below the lowest point: dielectric loss with constant tan δ,
//	  ESR ∝ 1/f, so I ∝ √(f/f0);
//	capacitor above the highest point: electrode skin loss, ESR ∝ √f,
//	  so I ∝ (f0/f)^¼;
//	inductor below: loss only falls toward DC, rating held;
//	inductor above: constant Q, R = ωL/Q ∝ f, so I ∝ √(f0/f).
func (p *Part) currentLimit(f float64, capacitor, text bool) Limit {
	fac := p.factor(p.Class, Irms)
	l := Limit{Quantity: Irms, Factor: fac}
	a := p.irms
	if a == nil || len(a.Points) == 0 {
		l.Basis = "not rated: no irms= in netlist"
		return l
	}
	pts := a.Points
	first, last := pts[0], pts[len(pts)-1]
	var v float64
	var how string
	switch {
	case len(pts) == 1 && first.F == 0:
		v, how = first.V, "no frequency given, held at every frequency"
	case f < first.F && capacitor:
		v = first.V * math.Sqrt(f/first.F)
		how = "below the rated frequency, scaled √(f/f0) for dielectric loss"
	case f < first.F:
		v, how = first.V, "below the rated frequency, held"
	case f > last.F && capacitor:
		v = last.V * math.Sqrt(math.Sqrt(last.F/f)) // (f0/f)^¼
		how = "above the rated frequency, scaled (f0/f)^¼ for skin loss"
	case f > last.F:
		v = last.V * math.Sqrt(last.F/f)
		how = "above the rated frequency, scaled √(f0/f) for constant Q"
	default:
		v, how = circuits.InterpLogLog(pts, f), "interpolated"
	}
	l.Abs, l.Derated = v, v*fac
	if !text {
		return l
	}
	l.Basis = fmt.Sprintf("irms=%s in netlist; at %s %s", a.Raw, circuits.FormatHz(f), how)
	if capacitor && p.Value > 0 && f > 0 {
		// the current rating caps the RF voltage at V = I·Xc: at high
		// frequency this binds before the voltage rating does
		vpk := math.Sqrt2 * v / (2 * math.Pi * f * p.Value)
		l.Basis += fmt.Sprintf("; limits the voltage to %s peak (I·Xc)", circuits.FormatSI(vpk, "V"))
	}
	return l
}

// satLimit is the saturation rating: the material's bsat, derated by the
// profile's core factor.
func (p *Part) satLimit(text bool) Limit {
	fac := p.factor(ClassCore, Bpk)
	l := Limit{Quantity: Bpk, Factor: fac}
	m := p.Core.Material
	if m == nil || m.Bsat <= 0 {
		if text {
			l.Basis = fmt.Sprintf("not rated: core %s names no material= with a saturation flux density", p.Core.Name)
		}
		return l
	}
	l.Abs, l.Derated = m.Bsat, m.Bsat*fac
	if !text {
		return l
	}
	l.Basis = fmt.Sprintf("saturation %s of %s (peak flux at PEP, harmonics added)", circuits.FormatSI(m.Bsat, "T"), m.Describe())
	if !m.BsatGiven {
		l.Basis += fmt.Sprintf(", the %s class figure (from memory)", m.Class)
	}
	return l
}

// guideLimit is the heating guide at f: advice, never a rating. Its
// stress is the peak flux at average power.
func (p *Part) guideLimit(f float64, text bool) Limit {
	m := p.Core.Material
	g := m.GuideFlux(f)
	l := Limit{Quantity: Bavg, Abs: g, Derated: g, Factor: 1, Advice: true}
	if !text {
		return l
	}
	if len(m.Guide) > 0 {
		l.Basis = fmt.Sprintf("heating guide of %s at %s (its own points); advice, not a rating", m.Describe(), circuits.FormatHz(f))
	} else {
		l.Basis = fmt.Sprintf("heating guide of the %s class, %s·√(1 MHz/f) = %s at %s (loss ∝ f·B², our formulation); advice, not a rating",
			m.Class, circuits.FormatSI(m.GuideAnchor, "T"), circuits.FormatSI(g, "T"), circuits.FormatHz(f))
	}
	return l
}

func (p *Part) tempLimit(text bool) Limit {
	l := Limit{Quantity: Temp}
	m := p.Core.Material
	if m == nil || m.Tmax <= 0 {
		if text {
			l.Basis = fmt.Sprintf("not rated: core %s has no material with tmax", p.Core.Name)
		}
		return l
	}
	margin, name := 0.0, "no"
	if p.prof != nil {
		margin, name = p.prof.TempMargin, p.prof.Name
	}
	l.Abs, l.Derated = m.Tmax, m.Tmax-margin
	l.Factor = l.Derated / l.Abs
	if !text {
		return l
	}
	l.Basis = fmt.Sprintf("tmax %.0f °C of %s, less %.0f °C margin (%s profile)", m.Tmax, m.Describe(), margin, name)
	return l
}

func (p *Part) densityLimit(f float64, text bool) Limit {
	fac := p.factor(ClassInductor, Jrms)
	j := DensityLimit(f, p.Wire, Rho20Copper)
	if !text {
		return Limit{Quantity: Jrms, Abs: j, Derated: j * fac, Factor: fac}
	}
	return Limit{Quantity: Jrms, Abs: j, Derated: j * fac, Factor: fac,
		Basis: fmt.Sprintf("wire surface loss %.2g W/cm² in still air (from memory): %s wire at %s conducts on %.3g mm²",
			WireHeatFlux*1e-4, mm(p.Wire), circuits.FormatSI(f, "Hz"), ConductingArea(f, p.Wire, Rho20Copper)*1e6)}
}

// TempRise is the temperature rise in °C of the wound core dissipating
// pdiss watts in still air: ΔT ≈ (P[mW]/A[cm²])^0.833 (common practice).
// 0 when the part has no core or no known surface. The Temp stress to
// judge is ambient + TempRise(total dissipation).
func (p *Part) TempRise(pdiss float64) float64 {
	if p.Area <= 0 || !(pdiss > 0) {
		return 0
	}
	return math.Pow(pdiss*1e3/(p.Area*1e4), TempExponent)
}

// FrequencyFree reports whether every limit the part's Limits give is the
// same at every frequency and it has no winding whose copper loss and
// conducting area change with frequency: a sweep may then ask its limits
// once. Only kinds rated by given values say so (a capacitor or switch
// whose irms= has no frequency, a resistor, a connector, a block); a
// coil's guide and current density, a line's heating and a rating at a
// frequency follow the carrier.
func (p *Part) FrequencyFree() bool {
	if p.Wire > 0 || p.WireLength > 0 {
		return false
	}
	switch p.Kind {
	case circuits.Capacitor, circuits.Switch:
		a := p.irms
		return a == nil || len(a.Points) == 0 || (len(a.Points) == 1 && a.Points[0].F == 0)
	case circuits.Resistor, circuits.Connector, circuits.Block:
		return true
	}
	return false
}

// CopperR is the AC resistance of the winding at f: annealed copper at
// 20 °C (IEC 60028) over WireLength, times the IEC 60287 skin factor. It
// is a floor for the winding's loss resistance (hot copper and proximity
// only add). 0 when wire, turns or core geometry is unknown.
func (p *Part) CopperR(f float64) float64 {
	if p.WireLength <= 0 || p.Wire <= 0 {
		return 0
	}
	return p.WindingRdc() * SkinFactor(f, p.Wire, Rho20Copper)
}

// CopperQ is the highest Q the winding's copper allows at f, ωL/CopperR;
// +Inf when CopperR is unknown.
func (p *Part) CopperQ(f float64) float64 {
	r := p.CopperR(f)
	if r <= 0 {
		return math.Inf(1)
	}
	return 2 * math.Pi * f * p.Value / r
}

// FluxPeak is the peak flux density in T for a peak flux linkage lambdaPk
// (V·s, i.e. √2·|λ| of an RMS phasor, harmonics added by the caller):
// B = λ/(N·Ae). 0 without turns or Ae.
func (p *Part) FluxPeak(lambdaPk float64) float64 {
	if p.Core == nil || p.Turns <= 0 || p.Core.Ae <= 0 {
		return 0
	}
	return lambdaPk / (float64(p.Turns) * p.Core.Ae)
}

// CurrentDensity is the RMS current density on the wire's conducting area
// at f, A/m²; 0 without wire=.
func (p *Part) CurrentDensity(irms, f float64) float64 {
	a := ConductingArea(f, p.Wire, Rho20Copper)
	if a <= 0 {
		return 0
	}
	return irms / a
}

// HeatingDensity folds currents at several frequencies into the density
// at f0 that heats the wire as much: Σ I_k²·ρ/A(f_k) = J²·A(f0)·ρ, so
// J = sqrt(Σ I_k²/A(f_k) / A(f0)). Compare it with the Jrms limit at f0.
func (p *Part) HeatingDensity(f0 float64, irms, freqs []float64) float64 {
	a0 := ConductingArea(f0, p.Wire, Rho20Copper)
	if a0 <= 0 {
		return 0
	}
	var s float64
	for i := range irms {
		if i >= len(freqs) {
			break
		}
		if a := ConductingArea(freqs[i], p.Wire, Rho20Copper); a > 0 {
			s += irms[i] * irms[i] / a
		}
	}
	return math.Sqrt(s / a0)
}

// RemedyContext is what a remedy needs besides the limit and the stress:
// the carrier, the ambient, the part's worst RMS current and, for
// temperature, the average dissipation and the heating time and duty the
// audit judged.
type RemedyContext struct {
	F       float64 // Hz
	Ambient float64 // °C
	Irms    float64 // A; 0 if unknown
	Pavg    float64 // W, average dissipation at the temperature's worst case
	KeyDown float64 // s; 0 or +Inf: steady state
	Duty    Duty
}

// Remedy says what would bring stress within the derated limit l (as
// returned by Limits at ctx.F): a rating to buy, or for flux, temperature
// and current density physical changes with figures. Each, applied to the
// netlist, passes (tests apply them). "" when the stress is already within
// the limit.
func (p *Part) Remedy(l Limit, stress float64, ctx RemedyContext) string {
	if l.Abs > 0 && stress <= l.Derated {
		return ""
	}
	switch l.Quantity {
	case Pm:
		return p.lineRemedy(l, stress, ctx.F)
	case Bpk, Bavg:
		if l.Derated <= 0 || p.Core == nil {
			break
		}
		s := p.FluxFix(stress/l.Derated, ctx.Irms, ctx.F).String(p)
		if l.Quantity == Bavg {
			s = "advice: " + s
		}
		return s
	case Temp:
		if l.Abs <= 0 {
			return "name a core material with tmax= to rate the temperature"
		}
		allowed := l.Derated - ctx.Ambient
		need := fmt.Sprintf("a material rated ≥ %.0f °C", math.Ceil(stress+(l.Abs-l.Derated)))
		a := p.AreaFor(allowed, ctx.Pavg, ctx.KeyDown, ctx.Duty)
		if a <= 0 {
			return "less loss, or " + need
		}
		return fmt.Sprintf("cooling surface ≥ %s cm² (now %.3g cm²; area= on the core), less loss, or %s", ceilText(a*1e4, 3), p.Area*1e4, need)
	case Jrms:
		if p.Wire <= 0 || l.Factor <= 0 {
			break
		}
		d := WireFor(stress*ConductingArea(ctx.F, p.Wire, Rho20Copper), ctx.F, l.Factor)
		if d <= 0 {
			return "more than 1 m of copper diameter: split the current"
		}
		return fmt.Sprintf("wire ≥ %.2f mm", d*1e3)
	case Arc:
		if p.Gap == nil {
			break
		}
		d := p.GapNeeded(stress)
		return fmt.Sprintf("gap ≥ %s %s (now %s) for the derated limit at %.0f m", mmUp(d), p.Gap.Medium, mmText(p.Gap.Gap), p.Atmosphere().Altitude)
	}
	_, text := BuyRating(l.Quantity, stress, l.Factor)
	return text
}

// WireFor is the copper wire diameter, rounded up to 0.05 mm, that carries
// i (A RMS) at f within factor × the density limit. 0 when over 1 m.
func WireFor(i, f, factor float64) float64 {
	carry := func(d float64) float64 {
		return factor * DensityLimit(f, d, Rho20Copper) * ConductingArea(f, d, Rho20Copper)
	}
	lo, hi := 0.05e-3, 0.05e-3
	for carry(hi) < i && hi < 1 {
		hi *= 2
	}
	if carry(hi) < i {
		return 0
	}
	for n := 0; n < 60; n++ {
		mid := (lo + hi) / 2
		if carry(mid) >= i {
			hi = mid
		} else {
			lo = mid
		}
	}
	return math.Ceil(hi*1e3/0.05-1e-9) * 0.05e-3
}

// FluxFix is what brings a core's flux down by Ratio at the same
// inductance and current. With L and I fixed, B = L·I/(N·Ae) and
// L = µ0·µ·N²·Ae/le, so B = I·√(L·µ0·µ/(Ae·le)): the flux falls as the
// square root of Ae·le/µ.
type FluxFix struct {
	Ratio float64 // stress over the derated limit
	// AeLe is the least Ae·le (m⁴) of a core of the same permeability;
	// with Ae and le both grown by Ratio the AL and the turns stay.
	AeLe float64
	// Fewer turns on more area: AreaTurns turns on a core whose Ae is
	// AreaFactor × this one's at the same le (AL grows with Ae, so the
	// inductance stays near L: AreaFactor·AreaTurns² ≈ N²).
	AreaFactor float64
	AreaTurns  int
	// Stack cores of this one, wound with StackTurns turns (0: more than 8
	// would be needed).
	Stack, StackTurns int
	// Mu is the highest permeability on this core, wound with MuTurns
	// turns; 0 when it would have to fall below 1, and Air says what to
	// wind instead.
	Mu      float64
	MuTurns int
	Air     *AirCoil
}

// AirCoil is a single-layer air-wound coil of the same inductance: length
// equal to its diameter, turns spaced one wire diameter apart (pitch 2d),
// sized by Wheeler's formula L[µH] = D²n²/(18D + 40ℓ) with D and ℓ in
// inches (Wheeler 1928).
type AirCoil struct {
	Dia, Len float64 // m, mean diameter and winding length
	Turns    float64
	Wire     float64 // m
}

// FluxFix works out the remedies for a flux ratio r > 1 at RMS current
// irms and frequency f.
func (p *Part) FluxFix(r, irms, f float64) FluxFix {
	k := p.Core
	fx := FluxFix{Ratio: r, AeLe: k.Ae * k.Le * r * r}
	n := float64(p.Turns)
	if nt := math.Round(n / r); nt >= 1 && nt < n {
		// B' = L·I/(N'·k·Ae) meets the limit when k ≥ r·N/N'
		fx.AreaTurns, fx.AreaFactor = int(nt), r*n/nt
	}
	for s := int(math.Ceil(r*r - 1e-9)); s <= 8 && p.Turns > 0; s++ {
		nt := math.Max(1, math.Round(n/math.Sqrt(float64(s))))
		if r*n/(nt*float64(s)) <= 1 {
			fx.Stack, fx.StackTurns = s, int(nt)
			break
		}
	}
	mu := k.Mu
	if mu <= 0 && k.AL > 0 && k.Ae > 0 {
		mu = k.AL * k.Le / (Mu0 * k.Ae)
	}
	if mu > 0 && mu/(r*r) >= 1 {
		fx.Mu = mu / (r * r)
		fx.MuTurns = int(math.Ceil(n*r - 1e-9))
	} else {
		fx.Air = airCoil(p.Value, irms, f, p.Wire)
	}
	return fx
}

// airCoil sizes the air-wound coil of inductance l for current irms at f:
// the wire from the density limit (at least the present wire), pitch 2d,
// length = diameter D, so n = D/p and L = D³/(58·p²) (inches, µH).
func airCoil(l, irms, f, wire float64) *AirCoil {
	w := wire
	if irms > 0 {
		w = math.Max(w, WireFor(irms, f, 1))
	}
	if w <= 0 {
		w = 1e-3
	}
	pin := 2 * w / 0.0254
	din := math.Cbrt(58 * l * 1e6 * pin * pin)
	return &AirCoil{Dia: din * 0.0254, Len: din * 0.0254, Turns: din / pin, Wire: w}
}

// String renders the fix for people.
func (fx FluxFix) String(p *Part) string {
	k := p.Core
	v := k.Ae * k.Le
	s := fmt.Sprintf("at the same inductance: a core with Ae·le ≥ %s (this one %s; %d turns if Ae and le both grow ×%s)",
		volumeUp(fx.AeLe), volume(v), p.Turns, ceilText(fx.Ratio, 4))
	if fx.AreaTurns > 0 {
		s += fmt.Sprintf(", or fewer turns on more core: Ae ≥ %s× this one's at the same le with %d turns", ceilText(fx.AreaFactor, 4), fx.AreaTurns)
	}
	if fx.Stack > 0 {
		s += fmt.Sprintf(", or %d of these cores stacked with %d turns", fx.Stack, fx.StackTurns)
	}
	if fx.Mu > 0 {
		s += fmt.Sprintf(", or permeability ≤ %s with %d turns", floorText(fx.Mu, 3), fx.MuTurns)
	} else if a := fx.Air; a != nil {
		s += fmt.Sprintf(", or (permeability would fall below 1) an air-wound coil of the same inductance: %.3g mm diameter, %.3g mm long, %.1f turns of %.2f mm wire (Wheeler)",
			a.Dia*1e3, a.Len*1e3, a.Turns, a.Wire*1e3)
	}
	return s
}

func ceilText(x float64, sig int) string {
	if !(x > 0) || math.IsInf(x, 0) {
		return "—"
	}
	p := math.Pow(10, float64(sig)-math.Ceil(math.Log10(x)))
	return strconv.FormatFloat(math.Ceil(x*p-1e-9)/p, 'f', -1, 64)
}

func floorText(x float64, sig int) string {
	if !(x > 0) || math.IsInf(x, 0) {
		return "—"
	}
	p := math.Pow(10, float64(sig)-math.Ceil(math.Log10(x)))
	return strconv.FormatFloat(math.Floor(x*p+1e-9)/p, 'f', -1, 64)
}

// GapNeeded is the clearance, in the part's medium, whose derated limit
// holds a peak voltage v (m); 0 without a gap.
func (p *Part) GapNeeded(v float64) float64 {
	if p.Gap == nil {
		return 0
	}
	return GapFor(p.Gap.Medium, v, p.prof.Factor(p.Gap.Class(), Arc), p.Atmosphere())
}

// mmUp renders a gap rounded up to the next 0.1 mm.
func mmUp(d float64) string {
	if math.IsInf(d, 1) {
		return "more than 10 m"
	}
	return fmt.Sprintf("%.1f mm", math.Ceil(d*1e4-1e-9)/10)
}

// AllFindings returns the findings of every part and of the netlist as a
// whole, in line order.
func (s *Set) AllFindings() []Finding {
	var out []Finding
	for _, n := range s.Order {
		out = append(out, s.Parts[n].Findings...)
	}
	out = append(out, s.Findings...)
	sort.SliceStable(out, func(i, j int) bool { return out[i].Pos.Line < out[j].Pos.Line })
	return out
}

// volume renders a core's Ae·le in mm³, or cm³ from 1000 mm³ up, without
// exponents.
func volume(v float64) string {
	mm3 := v * 1e9
	if mm3 >= 1000 {
		return strconv.FormatFloat(roundSig(mm3/1000, 3), 'f', -1, 64) + " cm³"
	}
	return strconv.FormatFloat(roundSig(mm3, 3), 'f', -1, 64) + " mm³"
}

// volumeUp is volume rounded up, so a core that meets the printed figure
// meets the need.
func volumeUp(v float64) string {
	mm3 := v * 1e9
	if mm3 >= 1000 {
		return ceilText(mm3/1000, 3) + " cm³"
	}
	return ceilText(mm3, 3) + " mm³"
}
