package stress

import (
	"fmt"
	"math"
	"math/cmplx"
	"sync"
	"sync/atomic"

	"rfstress/circuits"
	"rfstress/ratings"
)

// Quantities audited per part, in report order.
var Quantities = []ratings.Quantity{ratings.Vpk, ratings.Vrms, ratings.Irms, ratings.Pdiss, ratings.Bpk, ratings.Bavg, ratings.Temp, ratings.Jrms, ratings.Pm, ratings.Arc}

// CaseKind says what terminates the antenna port in a case.
type CaseKind int

// The kinds of case, in the order they are laid out per carrier.
const (
	Matched CaseKind = iota
	Circle
	Explicit
	FaultOpen
	FaultShort
	nKind
)

func (k CaseKind) String() string {
	return [...]string{"matched", "swr-circle", "load", "open", "short"}[k]
}

// Case is one carrier frequency with one antenna-port termination.
type Case struct {
	F       float64
	Kind    CaseKind
	Load    circuits.Load
	Theta   float64 // reflection angle on the SWR circle, degrees
	OffBand bool    // a carrier-also frequency (wrong filter selected)
	Exact   bool    // the continuous worst of the circle, not a sampled phase
	Note    string  // retuned cases: the settings the case was solved at
}

// ExactCase is an exact worst load of the SWR circle recorded by an
// audit, kept compact: one is recorded each time a part's worst moves to
// one, and most are overtaken by later carriers. Section.Case expands it.
type ExactCase struct {
	F       float64
	Theta   float64 // reflection angle, radians
	Carrier int     // index of the carrier (its antenna is the circle's centre)
}

// exactCase expands a recorded exact worst into a case.
func (e *Engine) exactCase(x ExactCase) Case {
	return Case{F: x.F, Kind: Circle, Load: e.circleLoadAt(e.centre[x.Carrier], x.Theta),
		Theta: x.Theta * 180 / math.Pi, OffBand: x.Carrier >= e.nBand, Exact: true}
}

// Describe renders the case for people.
func (c Case) Describe() string {
	if c.Note != "" {
		n := c
		n.Note = ""
		return n.Describe() + " " + c.Note
	}
	f := circuits.FormatHz(c.F)
	if c.OffBand {
		f += " (outside the band)"
	}
	switch c.Kind {
	case Matched:
		return f + ", matched load " + circuits.FormatComplex(c.Load.Z)
	case Circle:
		if c.Exact {
			return fmt.Sprintf("%s, worst of the SWR circle Γ∠%.2f° (%s)", f, c.Theta, circuits.FormatComplex(c.Load.Z))
		}
		return fmt.Sprintf("%s, mismatch Γ∠%.0f° (%s)", f, c.Theta, circuits.FormatComplex(c.Load.Z))
	case Explicit:
		return f + ", load " + circuits.FormatComplex(c.Load.Z)
	case FaultOpen:
		return f + ", antenna open"
	}
	return f + ", antenna shorted"
}

// Stress is the worst of one quantity of one part over all cases.
type Stress struct {
	Quantity ratings.Quantity
	Value    float64 // largest stress over all cases (SI; °C for temp)
	Case     int     // case index of Value
	Util     float64 // largest stress/derated-limit over all cases (0 when unrated)
	UtilCase int
	Limit    ratings.Limit // the limit at UtilCase
	Verdict  ratings.Verdict
	SafeW    float64 // PEP at which this quantity meets its derated limit (+Inf when unlimited)
	Buy      float64 // rating to buy (0 when none needed or not purchasable)
	BuyText  string
}

// PartResult is one part's audit.
type PartResult struct {
	Name    string
	Kind    circuits.Kind
	Value   float64
	Stress  map[ratings.Quantity]*Stress
	Verdict ratings.Verdict
	// Rated is the verdict of the rated quantities alone: a part marginal
	// only through a guide (advice) is OK here
	Rated    ratings.Verdict
	Util     float64 // worst utilisation of derated limits
	SafeW    float64
	Limiting ratings.Quantity
	Findings []ratings.Finding
	Rating   *ratings.Part
	ByKind   []KindWorst
	// Binding is the rated quantity that binds: the one setting the safe
	// power, else the one nearest its limit ("" when none is rated).
	Binding ratings.Quantity
	Heat    *Heat // thermal figures of a wound core; nil otherwise
	// Clearance is the part's gap judged against breakdown (nil if it
	// declares none), with the figures the reports show.
	Clearance *ClearanceResult
}

// ClearanceResult is a clearance's judgement in figures.
type ClearanceResult struct {
	Gap    float64 // m
	Medium string
	// ArcV is the peak voltage at which the gap would arc in air (for a
	// board surface: the same gap through air, which the surface does
	// not exceed; it is the rating either way); Limit the working value
	// before the profile's factor (ArcV for air, the working-voltage
	// guide for boards); Derated the limit for ok.
	ArcV    float64
	Limit   float64
	Derated float64
	Vpk     float64 // worst peak voltage across it
	Needed  float64 // gap for the derated limit at Vpk, m
}

// Engine holds what an audit reuses across tolerance trials: the circuit,
// its ratings and the case layout. Cases are not stored one by one: per
// carrier they are laid out as matched, the SWR circle's phases, explicit
// loads, then faults, and Case(i) decodes an index.
type Engine struct {
	// Progress, if set, counts carriers as the audit reaches them.
	Progress *atomic.Int64

	C            *circuits.Circuit
	R            *ratings.Set
	Cond         Conditions
	AllowUnrated bool
	levels       []float64
	carriers     []float64
	nBand        int
	nPhase       int // phases sampled on the SWR circle (0: no circle)
	// tri are three reflection coefficients on the SWR circle, 120° apart:
	// the loads alphaCircle fits the α circle through
	tri        [3]complex128
	rho        float64 // |Γ| of the SWR circle
	faults     []CaseKind
	perCarrier int
	rparts     []*ratings.Part
	freeLim    []*partLimits // limits asked once, for parts whose limits ignore the carrier (nil: none)
	forceScan  bool          // tests: scan the sampled phases instead of the exact worst
	everyHeat  bool          // tests: evaluate the thermal model at every case (see finishHeat)
	noRatios   bool          // tests: take every magnitude, ignoring the split's fixed ratios
	heatT      float64       // key-down time the temperature is judged at, s (+Inf steady)
	block      []bool        // judged as a two-port by its ports (stress/block.go)
	esl        []bool        // capacitors with series inductance: the dielectric sees I/(ωC)
	selfC      []bool        // inductors with self-capacitance: winding and terminal currents differ
	centre     []complex128  // per carrier: the antenna load, the SWR circle's centre
	// lims holds every carrier's limits for tolerance trials, asked once
	// and shared (cacheLimits); a single audit asks them per carrier into
	// its workspace instead, which costs no more and allocates nothing
	lims   *limitStore
	listed []Case    // retuned audits: the cases of every load, listed (retune.go)
	rdc    []float64 // per part: winding DC resistance from the ratings layer (0: none known)
	// faulted is set for runs on a circuit with a part failed: a draw cut
	// off from its supply is then dropped, not an input error
	faulted bool
	hasDC   bool // the circuit has a DC source (supply, draw)
}

// NewEngine prepares the case layout for c under cond.
func NewEngine(c *circuits.Circuit, rs *ratings.Set, cond Conditions) (*Engine, error) {
	return newEngine(c, rs, cond, false)
}

// newEngine is NewEngine; offBand makes every carrier an off-band one (a
// wrong filter selected), as BandUse audits carrier-also frequencies.
func newEngine(c *circuits.Circuit, rs *ratings.Set, cond Conditions, offBand bool) (*Engine, error) {
	if err := cond.Check(); err != nil {
		return nil, err
	}
	e := &Engine{C: c, R: rs, Cond: cond, levels: cond.HarmonicLevels(), heatT: cond.HeatTime(), lims: &limitStore{}}
	if cond.SWR > 1 {
		// the sampled loads are drawn when a case needs one (circleLoad):
		// the exact worst of the continuous circle visits none of them
		e.nPhase = cond.Phases
		g := (cond.SWR - 1) / (cond.SWR + 1)
		e.rho = g
		for k := range e.tri {
			sin, cos := math.Sincos(2 * math.Pi * float64(k) / 3)
			e.tri[k] = complex(g*cos, g*sin)
		}
	}
	band := cond.Carriers()
	e.nBand = len(band) - len(cond.CarrierAlso)
	if offBand {
		e.nBand = 0
	}
	e.carriers = band
	for _, fl := range cond.Faults {
		if fl == "open" {
			e.faults = append(e.faults, FaultOpen)
		} else {
			e.faults = append(e.faults, FaultShort)
		}
	}
	e.perCarrier = 1 + e.nPhase + len(cond.Loads) + len(e.faults)
	for fi, f := range e.carriers {
		z, _, err := c.AntennaAt(f)
		if err != nil && fi < e.nBand {
			return nil, err
		}
		// an off-band carrier (a wrong filter selected) the sweep does not
		// reach meets the port's z, as the harmonics do (docs/measured.md)
		e.centre = append(e.centre, z)
	}
	for i := range c.Elements {
		e.block = append(e.block, isBlock(c, i))
		e.esl = append(e.esl, c.Elements[i].Kind == circuits.Capacitor && c.Elements[i].SeriesInductance() > 0)
		e.selfC = append(e.selfC, c.Elements[i].Kind == circuits.Inductor && c.Elements[i].SelfCapacitance() > 0)
	}
	for _, el := range c.Elements {
		var rp *ratings.Part
		if rs != nil {
			rp = rs.Parts[el.Name]
		}
		e.rparts = append(e.rparts, rp)
	}
	if rs != nil && rs.Air != nil {
		rs.SetAir(e.Air())
	}
	for _, el := range c.Elements {
		if sp := circuits.SpecOf(el.Kind); sp != nil && sp.Source {
			e.hasDC = true
		}
	}
	e.rdc = make([]float64, len(c.Elements))
	for i, rp := range e.rparts {
		if rp != nil {
			e.rdc[i] = rp.WindingRdc()
		}
	}
	e.freeLimits()
	return e, nil
}

// Air is the atmosphere clearances are judged in: the altitude's standard
// pressure, the air at the ambient temperature.
func (e *Engine) Air() ratings.Atmosphere {
	return ratings.Atmosphere{Altitude: e.Cond.Altitude, Ambient: e.Cond.Ambient}
}

func (e *Engine) phaseAngle(k int) float64 {
	return 2 * math.Pi * float64(k) / float64(e.Cond.Phases)
}

// circleLoad is sampled phase k of the SWR circle round centre zc.
func (e *Engine) circleLoad(zc complex128, k int) circuits.Load {
	return e.circleLoadAt(zc, e.phaseAngle(k))
}

// circleLoadAt is the load at reflection angle th on the SWR circle.
func (e *Engine) circleLoadAt(zc complex128, th float64) circuits.Load {
	return circuits.LoadOnCircle(zc, e.Cond.SWR, th)
}

// NumCases is the number of cases audited.
func (e *Engine) NumCases() int {
	if e.listed != nil {
		return len(e.listed)
	}
	return len(e.carriers) * e.perCarrier
}

// Case decodes case index i.
func (e *Engine) Case(i int) Case {
	if e.listed != nil {
		return e.listed[i]
	}
	fi, j := i/e.perCarrier, i%e.perCarrier
	c := Case{F: e.carriers[fi], OffBand: fi >= e.nBand}
	switch {
	case j == 0:
		c.Kind, c.Load = Matched, circuits.Load{Z: e.centre[fi]}
	case j <= e.nPhase:
		c.Kind, c.Load, c.Theta = Circle, e.circleLoad(e.centre[fi], j-1), 360*float64(j-1)/float64(e.nPhase)
	case j <= e.nPhase+len(e.Cond.Loads):
		c.Kind, c.Load = Explicit, circuits.Load{Z: e.Cond.Loads[j-1-e.nPhase]}
	default:
		c.Kind = e.faults[j-1-e.nPhase-len(e.Cond.Loads)]
		c.Load = circuits.OpenLoad
		if c.Kind == FaultShort {
			c.Load = circuits.Short
		}
	}
	return c
}

// harmonic load classes: what terminates the antenna port at harmonics.
const (
	hNormal = iota // the SWR circle (or the matched load when SWR is 1)
	hOpen
	hShort
	nClass
)

func classOf(k CaseKind) int {
	switch k {
	case FaultOpen:
		return hOpen
	case FaultShort:
		return hShort
	}
	return hNormal
}

const nQ = 10

const (
	qVpk = iota
	qVrms
	qIrms
	qPdiss
	qBpk
	qBavg
	qTemp
	qJrms
	qPm
	qArc
)

// accum is the running worst of one part.
type accum struct {
	val      [nQ]float64
	valCase  [nQ]int
	util     [nQ]float64
	utilCase [nQ]int
	has      [nQ]bool
	kind     [nKind][nQ]float64
	kindCase [nKind][nQ]int
	kindSeen [nKind]bool
	// the thermal state at the hottest case: steady rise, time constant
	// and the average dissipation that drives them
	heat ratings.Heat
	pavg float64
	// an inductor with self-capacitance: the largest carrier current in
	// its winding and at its terminals, over the cases evaluated
	iwMax, itMax float64
	// the DC share of each stress at its utilCase (|Vdc|, Vdc, Idc, Pdc,
	// Bdc, Jdc), and of pavg: safe power scales only the RF share
	utilDC [nQ]float64
	pdc    float64
	// a wound core's heating is judged once, after the sweep (finishHeat):
	// its rise grows with the dissipation (TestHeatingRisesWithDissipation),
	// so the hottest case of each kind, and of all, is the one that
	// dissipates most. Kept here: those dissipations, their cases and the
	// DC share of the hottest (heatCase −1: no case seen)
	heatPd       float64
	heatPdc      float64
	heatCase     int
	heatKindPd   [nKind]float64
	heatKindCase [nKind]int
}

func (a *accum) reset() {
	*a = accum{heatCase: -1}
	for k := range a.kindCase {
		for q := range a.kindCase[k] {
			a.kindCase[k][q] = -1
		}
		a.heatKindCase[k] = -1
	}
}

// heatCandidate keeps a case's dissipation pd (its DC share pdc) if it is
// the largest of its kind or of all so far: the hottest case, judged by
// finishHeat. Ties keep the earlier case, as keep does.
func (a *accum) heatCandidate(kind CaseKind, ci int, pd, pdc float64) {
	if a.heatCase < 0 || pd > a.heatPd {
		a.heatPd, a.heatPdc, a.heatCase = pd, pdc, ci
	}
	if a.heatKindCase[kind] < 0 || pd > a.heatKindPd[kind] {
		a.heatKindPd[kind], a.heatKindCase[kind] = pd, ci
	}
}

// finishHeat judges each wound core's heating after the sweep, at the
// dissipation heatCandidate kept, folding the temperatures into the
// running worsts as keep would have at each case: the same values, cases
// and thermal state as evaluating the thermal model at every case
// (everyHeat; TestHeatSkipChangesNothing), for a power law per kind of
// case instead of one per case. The temperature limit does not follow the
// carrier (ratings: tempLimit), so the last carrier's limits judge it.
func (e *Engine) finishHeat(w *workspace) {
	amb := e.Cond.Ambient
	for i := range w.acc {
		a, lim := &w.acc[i], &w.lim[i]
		if a.heatCase < 0 || lim.hide[qTemp] {
			continue
		}
		rp := e.rparts[i]
		a.has[qTemp] = true
		heat := rp.Heating(a.heatPd, e.heatT, e.Cond.Duty)
		t := amb + heat.Rise
		// the hottest case, whatever its sign in °C (see keep)
		a.val[qTemp], a.valCase[qTemp] = t, a.heatCase
		a.heat, a.pavg, a.pdc = heat, a.heatPd, a.heatPdc
		for k, ci := range a.heatKindCase {
			if ci >= 0 {
				a.kind[k][qTemp], a.kindCase[k][qTemp] = amb+rp.Heating(a.heatKindPd[k], e.heatT, e.Cond.Duty).Rise, ci
			}
		}
		if d := lim.derated[qTemp]; d > 0 {
			if u := e.utilOf(qTemp, t, d); u > a.util[qTemp] {
				a.util[qTemp], a.utilCase[qTemp], a.utilDC[qTemp] = u, a.heatCase, 0
			}
		}
	}
}

// workspace holds per-run storage so the case loop allocates nothing.
type workspace struct {
	bal balanceNote // the worst power balance met (nominal audit only)

	c     *circuits.Circuit
	sw    *circuits.SplitWork
	carr  *circuits.Split
	harm  []*circuits.Split
	hEMF  []float64
	hs    [][nClass]harmSum // each part's harmonic terms per load class
	nodeH [][nClass]float64 // each node's Σ over harmonics of its worst voltage
	lim   []partLimits
	// ratios and limBuf back lim when the workspace asks the limits
	// itself (an audit without cached limits)
	ratios []float64
	limBuf []ratings.Limit
	// scanAlpha holds the sampled weights of a harmonic circle that could
	// not be fitted (harmonicSums)
	scanAlpha []complex128
	acc       []accum
	// worst peak of each node to ground over the run, and its case
	nodePk     []float64
	nodePkCase []int
	// record makes exact circle worst cases into cases of their own
	// (extra, indexed from NumCases()); only the nominal audit records
	record bool
	extra  []ExactCase
	heat   ratings.Heat // the thermal state of the part evalPart last judged
	tx     TxResult     // what the transmitter sees, worst over the run
	// the antenna at the current carrier (the SWR circle's centre), its
	// circle, and the antenna at each harmonic of that carrier
	zc complex128
	hz []complex128
	// the α circle of the carrier's SWR circle (alphaCircle; caOK false
	// when it could not be fitted)
	ca   complex128
	ra   float64
	caOK bool
	// limits per part at the current carrier
	dcq [nQ]float64 // the DC share of each stress evalPart last computed
	// the DC solution: per part V, I, flux linkage and heat; per node V
	dcV, dcI, dcL, dcP []float64
	dcNode             []float64
}

// partLimits caches one part's limits at the current carrier.
type partLimits struct {
	hide      [nQ]bool    // quantities the part does not carry (a connector's dissipation)
	derated   [nQ]float64 // 0: no limit
	absRatio  [nQ]float64 // rating / derated limit (1/factor); for temp, of the allowed rises
	advice    [nQ]bool    // a guide, not a rating
	copperR   float64
	perArea   float64   // 1 / the wire's conducting area at the carrier, 1/m² (0: no wire=)
	areaRatio []float64 // per harmonic: wire conducting area at the carrier over that at the harmonic
	dcArea    float64   // wire conducting area at the carrier over the whole section (DC)
}

func (e *Engine) newWorkspace(c *circuits.Circuit) *workspace {
	n := len(c.Elements)
	w := &workspace{c: c, sw: circuits.NewSplitWork(c), carr: circuits.NewSplit(c),
		hz:  make([]complex128, len(e.levels)),
		lim: make([]partLimits, n), ratios: make([]float64, n*len(e.levels)),
		acc: make([]accum, n), hEMF: make([]float64, len(e.levels)),
		dcV: make([]float64, n), dcI: make([]float64, n), dcL: make([]float64, n), dcP: make([]float64, n),
		dcNode: make([]float64, len(c.Nodes))}
	for range e.levels {
		w.harm = append(w.harm, circuits.NewSplit(c))
	}
	w.hs = make([][nClass]harmSum, n)
	w.nodeH = make([][nClass]float64, len(c.Nodes))
	w.nodePk = make([]float64, len(c.Nodes))
	w.nodePkCase = make([]int, len(c.Nodes))
	return w
}

// rebind points a workspace at a tolerance trial's circuit (same shape).
func (w *workspace) rebind(c *circuits.Circuit) {
	w.c = c
	w.sw.Rebind(c)
}

// nodeWorst is the worst node voltage of a run.
type nodeWorst struct {
	vpk  float64
	node int
	at   int
	dc   float64 // the DC share of vpk
	// the highest DC node voltage and its node (−1: none)
	dcMax  float64
	dcNode int
}

// solveDC fills the workspace's DC figures: the network at f = 0 with
// windings at their stated rdc= or their wire's resistance.
func (e *Engine) solveDC(w *workspace) error {
	if !e.hasDC {
		return nil // no supply or draw: every DC figure stays 0, nothing to solve
	}
	dc, err := w.c.SolveDC(e.rdc)
	if err != nil {
		return err
	}
	if !e.faulted {
		if err := dc.UnfedError(); err != nil {
			return err
		}
	}
	for i, ps := range dc.Parts {
		w.dcV[i], w.dcI[i], w.dcL[i] = real(ps.V), real(ps.I), real(ps.Lambda)
		w.dcP[i] = math.Max(dc.P[i], 0)
		if sp := circuits.SpecOf(w.c.Elements[i].Kind); sp != nil && sp.Source {
			// a source's power is the supply's output or the valve's
			// input, not heat in the network
			w.dcP[i] = 0
		}
	}
	copy(w.dcNode, dc.Nodes)
	return nil
}

// run audits the workspace's circuit over every case into w.acc.
func (e *Engine) run(w *workspace) (nodeWorst, error) {
	c := w.c
	if cap(w.extra) == 0 && e.nPhase > 0 {
		// about one exact worst per part and carrier is recorded (most
		// are overtaken later): room for that at once, not by doubling
		w.extra = make([]ExactCase, 0, len(e.carriers)*(len(c.Elements)+1))
	}
	w.extra = w.extra[:0]
	for i := range w.acc {
		w.acc[i].reset()
	}
	w.resetTx()
	clear(w.nodePk)
	clear(w.nodePkCase)
	nw := nodeWorst{dcNode: -1}
	if err := e.solveDC(w); err != nil {
		return nw, err
	}
	for ni, v := range w.dcNode {
		if math.Abs(v) > nw.dcMax {
			nw.dcMax, nw.dcNode = math.Abs(v), ni
		}
	}
	pep := e.Cond.PowerW
	emf := c.EMFForPower(pep)
	for i, l := range e.levels {
		w.hEMF[i] = emf * math.Sqrt(l)
	}
	for fi, f := range e.carriers {
		if e.Progress != nil {
			e.Progress.Add(1)
		}
		if err := e.fill(w, w.carr, f); err != nil {
			return nw, err
		}
		for h := range e.levels {
			if e.levels[h] == 0 {
				continue
			}
			if err := e.fill(w, w.harm[h], float64(h+2)*f); err != nil {
				return nw, err
			}
		}
		if lims := e.lims.get(); lims != nil {
			copy(w.lim, lims[fi])
		} else {
			e.limitsAt(f, w.lim, w.ratios, &w.limBuf)
		}
		e.setAntenna(w, fi, f)
		e.harmonicSums(w)
		base := fi * e.perCarrier
		// matched, explicit loads and faults: one evaluation each
		e.evalCase(w, base, Matched, circuits.Load{Z: w.zc}, f, &nw)
		for j, z := range e.Cond.Loads {
			e.evalCase(w, base+1+e.nPhase+j, Explicit, circuits.Load{Z: z}, f, &nw)
		}
		for j, k := range e.faults {
			l := circuits.OpenLoad
			if k == FaultShort {
				l = circuits.Short
			}
			e.evalCase(w, base+1+e.nPhase+len(e.Cond.Loads)+j, k, l, f, &nw)
		}
		if e.nPhase > 0 {
			w.ca, w.ra, w.caOK = e.alphaCircle(w.carr, w.zc)
			e.circleCases(w, base+1, f, &nw)
			e.txCircle(w, base+1)
		}
	}
	e.finishHeat(w)
	return nw, nil
}

// setAntenna points the workspace at carrier fi's antenna: the load the
// matched case uses and the SWR circle is drawn round, and the antenna at
// each harmonic (measured where the sweep reaches, else the port's z).
func (e *Engine) setAntenna(w *workspace, fi int, f float64) {
	w.zc = e.centre[fi]
	for h := range w.hz {
		w.hz[h] = e.C.Zout
		if z, measured, err := e.C.AntennaAt(float64(h+2) * f); err == nil && measured {
			w.hz[h] = z
		}
	}
}

// drive returns the carrier EMF and the factor on the harmonic sources
// for weight α: the given available power, or, with delivered drive,
// whatever EMF makes the network absorb the given power.
func (e *Engine) drive(w *workspace, alpha complex128) (scale, k float64) {
	emf := w.c.EMFForPower(e.Cond.PowerW)
	if e.Cond.Drive != "delivered" {
		return emf, 1
	}
	// never more than 1000× the available power: an open, lossless
	// network would otherwise demand an unbounded EMF
	maxScale := emf * math.Sqrt(1000)
	scale = maxScale
	if pin := w.carr.InputPower(alpha); pin > 0 {
		scale = math.Min(math.Sqrt(e.Cond.PowerW/pin), maxScale)
	}
	return scale, scale / emf
}

// evalCase evaluates every part (and node) at one case.
func (e *Engine) evalCase(w *workspace, ci int, kind CaseKind, l circuits.Load, f float64, nw *nodeWorst) {
	alpha := w.carr.Alpha(l)
	scale, k := e.drive(w, alpha)
	cls := classOf(kind)
	if kind != Circle {
		e.txCase(w, ci, kind, alpha) // txCircle covers the circle
	}
	for i := range w.c.Elements {
		e.evalPart(w, i, ci, kind, cls, alpha, scale, k, f)
	}
	e.evalNodes(w, ci, cls, alpha, scale, k, nw)
}

func (e *Engine) evalNodes(w *workspace, ci, cls int, alpha complex128, scale, k float64, nw *nodeWorst) {
	for ni := range w.carr.Node[0] {
		e.evalNode(w, ni, ci, cls, alpha, scale, k, nw)
	}
}

// evalNode keeps node ni's peak voltage at one case if it is the worst.
func (e *Engine) evalNode(w *workspace, ni, ci, cls int, alpha complex128, scale, k float64, nw *nodeWorst) {
	s := w.carr
	dc := e.nodeDC(w, ni)
	v := math.Sqrt2*(mag(s.Node[0][ni]+alpha*s.Node[1][ni])*scale+k*w.nodeH[ni][cls]) + dc
	if v > nw.vpk {
		nw.vpk, nw.node, nw.at, nw.dc = v, ni, ci, dc
	}
	if v > w.nodePk[ni] {
		w.nodePk[ni], w.nodePkCase[ni] = v, ci
	}
}

// nodeDC is the DC voltage of node ni (its magnitude), added to its RF
// peak: a supply through an RF choke puts its voltage on the tank and on
// every clearance to ground.
func (e *Engine) nodeDC(w *workspace, ni int) float64 { return math.Abs(w.dcNode[ni]) }

// evalPart computes part i's stresses at one case and keeps the worst.
// It allocates nothing: this is the inner loop of every audit and trial.
func (e *Engine) evalPart(w *workspace, i, ci int, kind CaseKind, cls int, alpha complex128, scale, k, f float64) {
	if l := w.c.Elements[i].Line(); l != nil {
		// a line's stresses lie along it: from its port phasors
		e.evalLine(w, l, i, ci, kind, cls, alpha, 0, scale, k, f, allQ)
		return
	}
	if e.block[i] {
		e.evalBlock(w, i, ci, kind, cls, alpha, scale, k)
		return
	}
	s := w.carr
	r := e.ratios(s, i)
	var v, cur float64
	switch {
	case r.IPerV > 0:
		v = mag(s.P[0][i].V+alpha*s.P[1][i].V) * scale
		cur = v * r.IPerV
	case r.VPerI > 0:
		cur = mag(s.P[0][i].I+alpha*s.P[1][i].I) * scale
		v = cur * r.VPerI
	default:
		v = mag(s.P[0][i].V+alpha*s.P[1][i].V) * scale
		cur = mag(s.P[0][i].I+alpha*s.P[1][i].I) * scale
	}
	if e.esl[i] {
		// series inductance: the dielectric sees I/(ωC), which near the
		// part's own resonance exceeds the terminal voltage
		if vc := cur / (2 * math.Pi * f * w.c.Elements[i].Value); vc > v {
			v = vc
		}
	}
	if e.selfC[i] {
		a := &w.acc[i]
		a.iwMax = math.Max(a.iwMax, cur)
		a.itMax = math.Max(a.itMax, mag(s.P[0][i].It+alpha*s.P[1][i].It)*scale)
	}
	avg := e.Cond.AvgRatio
	var q [nQ]float64
	var has [nQ]bool
	dcq := &w.dcq
	// DC adds to RF: peaks add, RMS values add in squares, heat adds. The
	// DC current flows whether keyed or not, so avg does not scale it.
	vdc, idc, pdc := w.dcV[i], w.dcI[i], w.dcP[i]
	q[qVpk] = math.Abs(vdc) + math.Sqrt2*(v+k*w.hs[i][cls].pkV)
	q[qVrms] = math.Sqrt(vdc*vdc + v*v + k*k*w.hs[i][cls].sqV)
	irf2 := (cur*cur + k*k*w.hs[i][cls].sqI) * avg
	q[qIrms] = math.Sqrt(idc*idc + irf2)
	prf := s.R[i] * cur * cur
	if s.Coupled[i] {
		// a coupled winding is judged on its core's loss from its own flux
		// linkage, (ω/Q)·|λ|²/L = R·|λ/L|²: for windings sharing one core
		// that is the core's whole loss (the load's ampere-turns cancel),
		// for a loose coupling it is the lone coil's R·|I|²
		im := mag(s.P[0][i].Lambda+alpha*s.P[1][i].Lambda) * scale / w.c.Elements[i].Inductance(f)
		prf = s.R[i] * im * im
	}
	q[qPdiss] = (prf+k*k*w.hs[i][cls].sumP)*avg + pdc
	*dcq = [nQ]float64{}
	dcq[qVpk], dcq[qVrms], dcq[qIrms], dcq[qPdiss] = math.Abs(vdc), math.Abs(vdc), math.Abs(idc), pdc
	has[qVpk], has[qVrms], has[qIrms], has[qPdiss] = true, true, true, true
	var heat ratings.Heat
	if rp := e.rparts[i]; rp != nil {
		if rp.Core != nil && rp.Turns > 0 && rp.Core.Ae > 0 {
			lam := cur * r.LamPerI
			if r.LamPerI == 0 {
				lam = mag(s.P[0][i].Lambda+alpha*s.P[1][i].Lambda) * scale
			}
			rf := rp.FluxPeak(math.Sqrt2 * (lam + k*w.hs[i][cls].pkL))
			// the DC bias flux L·Idc/(N·Ae) adds to the peak judged
			// against saturation; the heating guide looks at the RF
			// swing of the average power (core loss follows the swing)
			dcq[qBpk] = rp.FluxPeak(math.Abs(w.dcL[i]))
			q[qBpk] = dcq[qBpk] + rf
			q[qBavg] = rf * math.Sqrt(avg)
			has[qBpk], has[qBavg] = true, true
		}
		// the winding's copper loss is a floor under the loss from Q
		if cu := w.lim[i].copperR; cu > 0 {
			if floor := irf2*cu + pdc; floor > q[qPdiss] {
				q[qPdiss] = floor
			}
		}
		if rp.Core != nil && rp.Area > 0 {
			if e.everyHeat {
				heat = rp.Heating(q[qPdiss], e.heatT, e.Cond.Duty)
				q[qTemp] = e.Cond.Ambient + heat.Rise
				has[qTemp] = true
			} else {
				w.acc[i].heatCandidate(kind, ci, q[qPdiss], pdc)
			}
		}
		// harmonic currents crowd into a thinner skin: weight each by the
		// ratio of conducting areas, so the density heats as the sum does;
		// DC spreads over the whole wire
		jdc2 := idc * idc * w.lim[i].dcArea
		// Part.CurrentDensity, I over the conducting area at the carrier,
		// with the area's inverse asked once per carrier (limitsAt)
		if ja := w.lim[i].perArea; ja > 0 {
			q[qJrms] = math.Sqrt((cur*cur+k*k*w.hs[i][cls].sqIJ)*avg+jdc2) * ja
			dcq[qJrms] = math.Sqrt(jdc2) * ja
			has[qJrms] = true
		}
	}
	w.heat = heat
	// the gap between the part's terminals (gap=, or a clearance
	// statement) sees the part's peak voltage: RF peaks with harmonics
	// added as peaks add, and any DC across the part the DC layer adds to
	// q[qVpk] above (set last, so it takes whatever went into the peak)
	q[qArc], dcq[qArc] = q[qVpk], dcq[qVpk]
	has[qArc] = true
	e.keep(w, i, ci, kind, &q, &has)
}

// keep folds one case's quantities of part i into its running worst.
func (e *Engine) keep(w *workspace, i, ci int, kind CaseKind, q *[nQ]float64, has *[nQ]bool) {
	a := &w.acc[i]
	a.kindSeen[kind] = true
	lim := &w.lim[i]
	kv, kc := &a.kind[kind], &a.kindCase[kind]
	for qi, v := range q {
		if !has[qi] || lim.hide[qi] {
			continue
		}
		had := a.has[qi]
		a.has[qi] = true
		// a temperature may be below 0 °C (a cold ambient): its first
		// case is kept whatever its value, not compared with the zero the
		// running worst starts from
		if v > a.val[qi] || (qi == qTemp && !had) {
			a.val[qi], a.valCase[qi] = v, ci
			if qi == qTemp {
				a.heat, a.pavg, a.pdc = w.heat, q[qPdiss], w.dcq[qPdiss]
			}
		}
		if kc[qi] < 0 || v > kv[qi] {
			kv[qi], kc[qi] = v, ci
		}
		if d := lim.derated[qi]; d > 0 {
			u := v / d // utilOf, but for temperature
			if qi == qTemp {
				u = e.utilOf(qi, v, d)
			}
			if u > a.util[qi] {
				a.util[qi], a.utilCase[qi], a.utilDC[qi] = u, ci, w.dcq[qi]
			}
		}
	}
	w.dcq = [nQ]float64{} // each caller sets the DC share of its own case
}

// circleCases finds each part's worst loads on the SWR circle exactly,
// not among the sampled phases. The load Z(θ) and the weight
// α = −Voc/(Zth+Z) are bilinear (Möbius) maps of Γ = |Γ|e^{jθ}, so as θ
// goes round, α runs once round a circle, and so does any part's phasor
// X0 + α·X1. Its magnitude |c + r·e^{jφ}| is largest where r·e^{jφ}·X1
// points along X0 + c·X1: one α in closed form, whose load angle θ follows
// by inverting the map. Each quantity of a part is a rising function of
// |V|, |I| or |λ| (harmonic terms are fixed per case class), so at most
// three evaluations per part give every worst value of the continuous
// circle, and one where V and λ are fixed multiples of I (circuits.Ratios).
// Delivered drive scales each case differently, and a circle that passes
// through the pole cannot be fitted: those scan the sampled phases.
func (e *Engine) circleCases(w *workspace, first int, f float64, nw *nodeWorst) {
	s := w.carr
	scan := func() {
		for j := 0; j < e.nPhase; j++ {
			e.evalCase(w, first+j, Circle, e.circleLoad(w.zc, j), f, nw)
		}
	}
	if e.Cond.Drive == "delivered" || e.forceScan {
		scan()
		return
	}
	ca, ra, ok := w.ca, w.ra, w.caOK
	if !ok {
		scan()
		return
	}
	scale, k := e.drive(w, 0)
	// deep in a stopband α may have underflowed to a bounding disc round
	// zero (alphaCircle): its worst is no load of the circle, so it is
	// filed under a sampled phase rather than given an angle
	disc := ca == 0
	for i := range w.c.Elements {
		if l := w.c.Elements[i].Line(); l != nil {
			e.lineCircle(w, l, i, first, ca, ra, scale, k, f)
			continue
		}
		if e.block[i] {
			e.blockCircle(w, i, first, ca, ra, scale, k)
			continue
		}
		// current first (its worst load usually dissipates most). A quantity
		// that is a fixed multiple of the current (a capacitor's V =
		// I/Y, a lone coil's V = Z·I and λ = L·I) has the current's
		// worst load: the direction of (x0 + c·x1)·x̄1 is the same for
		// both, so one evaluation there gives both worsts
		r := e.ratios(s, i)
		iOn := s.P[1][i].I != 0
		for qx, x := range [3][2]complex128{{s.P[0][i].I, s.P[1][i].I}, {s.P[0][i].V, s.P[1][i].V}, {s.P[0][i].Lambda, s.P[1][i].Lambda}} {
			if x[1] == 0 {
				continue // the load does not reach this quantity; other cases hold it
			}
			if iOn && ((qx == 1 && (r.IPerV > 0 || r.VPerI > 0)) || (qx == 2 && r.LamPerI > 0)) {
				continue // evaluated at the current's worst load above
			}
			a := exactWorst(x[0], x[1], ca, ra)
			ci := e.circleIndex(w, first, a, disc)
			e.evalPart(w, i, ci, Circle, hNormal, a, scale, k, f)
			if ci >= e.NumCases() && w.acc[i].uses(ci) {
				e.record(w, first, f, a)
			}
		}

	}
	for ni := range s.Node[0] {
		if s.Node[1][ni] == 0 {
			continue
		}
		a := exactWorst(s.Node[0][ni], s.Node[1][ni], ca, ra)
		ci := e.circleIndex(w, first, a, disc)
		e.evalNode(w, ni, ci, hNormal, a, scale, k, nw)
		if ci >= e.NumCases() && (nw.at == ci || w.nodePkCase[ni] == ci) {
			e.record(w, first, f, a)
		}
	}
}

// exactWorst returns the α on the circle (centre ca, radius ra) where
// |x0 + α·x1| is largest (thetaOf gives its load's reflection angle).
func exactWorst(x0, x1, ca complex128, ra float64) complex128 {
	m := x0 + ca*x1
	u := complex(1, 0)
	// the direction of m/x1 is that of m·x̄1, found without a division;
	// a product below the float range (deep in a stopband) divides
	r := m * cmplx.Conj(x1)
	if r == 0 && m != 0 {
		r = m / x1
	}
	if a := absExact(r); a > 0 {
		u = r * complex(1/a, 0)
	}
	return ca + complex(ra, 0)*u
}

// thetaOf is the reflection angle on the carrier's SWR circle of the load
// that gives weight α (0 for α = 0, the open port).
func (e *Engine) thetaOf(w *workspace, alpha complex128) float64 {
	if alpha == 0 {
		return 0
	}
	s := w.carr
	return circuits.ReflectionAngle(w.zc, -s.Voc/alpha-s.Zth)
}

// circleIndex is the case index an exact worst with weight α is filed
// under: when the workspace records (the nominal audit), the next exact
// case, kept only if it becomes someone's worst (its angle is found
// then, by record); otherwise (tolerance trials keep values only, or an
// underflowed disc) the nearest sampled phase.
func (e *Engine) circleIndex(w *workspace, first int, alpha complex128, disc bool) int {
	if w.record && !disc {
		return e.NumCases() + len(w.extra)
	}
	n := e.nPhase
	return first + int(math.Round(e.thetaOf(w, alpha)/(2*math.Pi)*float64(n)))%n
}

// record keeps the exact worst load with weight α as a case of its own.
func (e *Engine) record(w *workspace, first int, f float64, alpha complex128) {
	fi := (first - 1) / e.perCarrier
	w.extra = append(w.extra, ExactCase{F: f, Theta: e.thetaOf(w, alpha), Carrier: fi})
}

// uses reports whether case ci is any of the part's worst cases.
func (a *accum) uses(ci int) bool {
	for q := 0; q < nQ; q++ {
		if a.valCase[q] == ci || a.utilCase[q] == ci || a.kindCase[Circle][q] == ci {
			return true
		}
	}
	// the hottest case, judged after the sweep (finishHeat)
	return a.heatCase == ci || a.heatKindCase[Circle] == ci
}

// alphaCircle fits the circle traced by α over the SWR circle through three
// of its points.
func (e *Engine) alphaCircle(s *circuits.Split, z0 complex128) (complex128, float64, bool) {
	// α = −Voc/(Zth + Z(Γ)), Z = (z0 + Γ·z0*)/(1 − Γ), is the bilinear
	// map α = (aΓ + b)/(cΓ + d) with a = Voc, b = −Voc, c = z0* − Zth,
	// d = Zth + z0, and the image of the circle |Γ| = ρ under such a map
	// has centre (b·d̄ − a·c̄·ρ²)/(|d|² − ρ²|c|²) and radius
	// ρ·|ad − bc|/||d|² − ρ²|c|²|, with ad − bc = 2·Voc·Re z0 (any text
	// on bilinear maps): no load is drawn. Near a pole on the circle, or
	// with anything not finite, the circle is fitted through three loads.
	rho := e.rho
	c, d := cmplx.Conj(z0)-s.Zth, s.Zth+z0
	dd, cc := real(d)*real(d)+imag(d)*imag(d), rho*rho*(real(c)*real(c)+imag(c)*imag(c))
	if den := dd - cc; den > 1e-9*(dd+cc) {
		centre := -s.Voc * (cmplx.Conj(d) + complex(rho*rho, 0)*cmplx.Conj(c)) * complex(1/den, 0)
		radius := 2 * rho * absExact(s.Voc) * real(z0) / den
		if !cmplx.IsNaN(centre) && !cmplx.IsInf(centre) && radius >= 0 && !math.IsInf(radius, 0) {
			return centre, radius, true
		}
	}
	return e.alphaCircleFit(s, z0)
}

// alphaCircleFit fits the circle traced by α over the SWR circle through
// three of its points.
func (e *Engine) alphaCircleFit(s *circuits.Split, z0 complex128) (complex128, float64, bool) {
	var a [3]complex128
	for k := 0; k < 3; k++ {
		a[k] = s.Alpha(circuits.LoadForGamma(z0, e.tri[k]))
	}
	if c, r, ok := circleThrough(a[0], a[1], a[2]); ok {
		return c, r, true
	}
	// deep in a long filter's stopband Voc underflows and α is lost in
	// rounding (subnormal or zero); its part in any state is below 1e-250
	// of the drive, so a disc round zero of twice its size bounds it
	// rather than a scan of every phase for every part
	m := math.Max(cmplx.Abs(a[0]), math.Max(cmplx.Abs(a[1]), cmplx.Abs(a[2])))
	if m < 1e-250 {
		return 0, 2 * m, true
	}
	return 0, 0, false
}

// circleThrough returns the circle through three points (circumcircle in
// complex form: w = (z3−z1)/(z2−z1), c = (z2−z1)(w−|w|²)/(w−w̄) + z1).
func circleThrough(z1, z2, z3 complex128) (complex128, float64, bool) {
	d := z2 - z1
	if d == 0 {
		return 0, 0, false
	}
	wv := (z3 - z1) / d
	im := imag(wv)
	if math.Abs(im) < 1e-9*(absExact(wv)+1) {
		return 0, 0, false // collinear: the circle passes near the pole
	}
	ww := real(wv)*real(wv) + imag(wv)*imag(wv)
	c := d*(wv-complex(ww, 0))/complex(0, 2*im) + z1
	r := absExact(z1 - c)
	if math.IsNaN(r) || math.IsInf(r, 0) {
		return 0, 0, false
	}
	return c, r, true
}

// harmonicSums finds, per harmonic, part and quantity, the worst over the
// harmonic load set of each class, and adds them as the combination rules
// say: peaks add, RMS values add in squares, dissipation adds. On the SWR
// circle the worst is that of the continuous circle (|c|+r on the α
// circle), which no sampled phase exceeds.
func (e *Engine) harmonicSums(w *workspace) {
	c := w.c
	clear(w.hs)
	clear(w.nodeH)
	for h, lvl := range e.levels {
		if lvl == 0 {
			continue
		}
		s := w.harm[h]
		eh := w.hEMF[h]
		// the worst of |x0 + α·x1| over each class's loads: the open port
		// (α = 0), the short, the matched load, or the continuous SWR
		// circle (|x0 + c·x1| + r·|x1| on the α circle); a circle that
		// cannot be fitted scans the sampled phases
		var hws harmClasses
		hws[hShort].a = s.Alpha(circuits.Short)
		switch hw := &hws[hNormal]; {
		case e.nPhase == 0:
			hw.a = s.Alpha(circuits.Load{Z: w.hz[h]})
		default:
			if ca, ra, ok := e.alphaCircle(s, w.hz[h]); ok {
				hw.a, hw.r = ca, ra
			} else {
				hw.scan = w.scanAlpha[:0]
				for k := 0; k < e.nPhase; k++ {
					hw.scan = append(hw.scan, s.Alpha(e.circleLoad(w.hz[h], k)))
				}
				w.scanAlpha = hw.scan
			}
		}
		P0, P1 := s.P[0], s.P[1]
		for i := range c.Elements {
			if l := c.Elements[i].Line(); l != nil {
				for cls := 0; cls < nClass; cls++ {
					e.lineHarmonic(w, l, s, i, h, cls, eh)
				}
				continue
			}
			if e.block[i] {
				for cls := 0; cls < nClass; cls++ {
					e.blockHarmonic(s, w, i, cls, e.harmonicCircles(w, s, h, cls), eh)
				}
				continue
			}
			// one part's phasors, every class: read once
			p0, p1 := &P0[i], &P1[i]
			ar, r := w.lim[i].areaRatio[h], s.R[i]
			var vc, linv float64
			if e.esl[i] {
				vc = 1 / (2 * math.Pi * s.F * c.Elements[i].Value)
			}
			if s.Coupled[i] {
				linv = 1 / c.Elements[i].Inductance(s.F)
			}
			// a fixed ratio scales one worst into another: every class's
			// worst (a point, the circle's |c|+r, a scan's maximum) is
			// homogeneous in the phasor pair
			rt := e.ratios(s, i)
			var mv, mi, ml [nClass]float64
			switch {
			case rt.IPerV > 0:
				mv = hws.worst(p0.V, p1.V, eh)
				for cls := range mv {
					mi[cls] = mv[cls] * rt.IPerV
				}
			case rt.VPerI > 0:
				mi = hws.worst(p0.I, p1.I, eh)
				for cls := range mi {
					mv[cls] = mi[cls] * rt.VPerI
				}
			default:
				mv = hws.worst(p0.V, p1.V, eh)
				mi = hws.worst(p0.I, p1.I, eh)
			}
			switch {
			case rt.LamPerI > 0:
				for cls := range mi {
					ml[cls] = mi[cls] * rt.LamPerI
				}
			case p0.Lambda != 0 || p1.Lambda != 0: // no flux in a capacitor
				ml = hws.worst(p0.Lambda, p1.Lambda, eh)
			}
			hs := &w.hs[i]
			for cls := range hs {
				v, cur, lam := mv[cls], mi[cls], ml[cls]
				if vc > 0 {
					v = math.Max(v, cur*vc)
				}
				t := &hs[cls]
				t.pkV += v
				t.pkL += lam
				t.sqV += v * v
				t.sqI += cur * cur
				t.sqIJ += cur * cur * ar
				if linv > 0 {
					im := lam * linv
					t.sumP += r * im * im
				} else {
					t.sumP += r * cur * cur
				}
			}
		}
		N0, N1 := s.Node[0], s.Node[1]
		for ni := range c.Nodes {
			m := hws.worst(N0[ni], N1[ni], eh)
			nh := &w.nodeH[ni]
			for cls := range nh {
				nh[cls] += m[cls]
			}
		}
	}
}

// harmClasses is the weight set of every harmonic load class.
type harmClasses [nClass]harmWorst

// worst gives, per class, the worst of |x0 + α·x1|·eh over the class's
// weights. The open port's weight is 0: its worst is |x0|.
func (hws *harmClasses) worst(x0, x1 complex128, eh float64) (m [nClass]float64) {
	m[hOpen] = mag(x0) * eh
	m[hShort] = mag(x0+hws[hShort].a*x1) * eh
	m[hNormal] = hws[hNormal].of(x0, x1) * eh
	return m
}

// ratios gives part i's fixed ratios in split s (circuits.Ratios),
// zero where a magnitude must be taken.
func (e *Engine) ratios(s *circuits.Split, i int) circuits.Ratios {
	if e.noRatios || i >= len(s.Ratio) {
		return circuits.Ratios{}
	}
	return s.Ratio[i]
}

// harmSum is one part's harmonic terms in one load class, each a sum
// over the harmonics of that harmonic's worst over the class's loads.
type harmSum struct {
	pkV, pkL float64 // worst peak voltage and flux linkage (rms magnitude)
	sqV, sqI float64 // squares
	sqIJ     float64 // I² weighted by the wire's conducting area, carrier over harmonic
	sumP     float64 // dissipation
	pmH      float64 // lines: the hottest metre's dissipation
}

// harmWorst is a harmonic load class's weight set: one weight a, a
// circle of weights (centre a, radius r), or sampled weights (scan).
type harmWorst struct {
	a    complex128
	r    float64
	scan []complex128
}

// of is the largest |x0 + α·x1| over the set.
func (h *harmWorst) of(x0, x1 complex128) float64 {
	if h.scan != nil {
		var m float64
		for _, a := range h.scan {
			m = math.Max(m, mag(x0+a*x1))
		}
		return m
	}
	v := mag(x0 + h.a*x1)
	if h.r != 0 {
		v += h.r * mag(x1)
	}
	return v
}

// limitsAt asks the ratings layer for every part's derated limits at
// carrier f. Limits depend on the nominal parts only, so the engine asks
// once per carrier and every tolerance trial reuses the answer.
func (e *Engine) limitsAt(f float64, out []partLimits, ratios []float64, buf *[]ratings.Limit) []partLimits {
	for i := range ratios {
		ratios[i] = 1
	}
	nl := len(e.levels)
	for i := range e.C.Elements {
		pl := &out[i]
		if e.freeLim != nil && e.freeLim[i] != nil {
			// the same at every carrier (ratings.Part.FrequencyFree)
			*pl = *e.freeLim[i]
			pl.areaRatio = ratios[i*nl : (i+1)*nl]
			continue
		}
		e.partLimitsAt(i, f, pl, ratios[i*nl:(i+1)*nl], buf)
	}
	return out
}

// partLimitsAt asks part i's derated limits at carrier f into pl, with
// its harmonics' conducting-area ratios in areaRatio (all 1 on entry).
func (e *Engine) partLimitsAt(i int, f float64, pl *partLimits, areaRatio []float64, buf *[]ratings.Limit) {
	rp := e.rparts[i]
	// pl may be a workspace's, holding the previous carrier's: every
	// field starts afresh
	*pl = partLimits{areaRatio: areaRatio}
	if rp == nil {
		pl.hide[qArc] = true
		return
	}
	for qi, q := range Quantities {
		pl.hide[qi] = !rp.Shows(q)
	}
	// numbers only: the text of a limit is formatted when a verdict
	// needs it (judge), not for every part at every carrier
	*buf = rp.AppendLimitValues((*buf)[:0], f)
	for _, l := range *buf {
		if qi := qIndex(l.Quantity); qi >= 0 && l.Abs > 0 && l.Derated > 0 {
			pl.derated[qi] = l.Derated
			pl.absRatio[qi] = l.Abs / l.Derated
			pl.advice[qi] = l.Advice
			if qi == qTemp {
				amb := e.Cond.Ambient
				pl.absRatio[qi] = (l.Abs - amb) / math.Max(l.Derated-amb, 1e-9)
			}
		}
	}
	pl.copperR = rp.CopperR(f)
	if rp.Wire > 0 {
		pl.dcArea = ratings.ConductingArea(f, rp.Wire, ratings.Rho20Copper) / (math.Pi * rp.Wire * rp.Wire / 4)
	}
	if rp.Wire > 0 {
		a0 := ratings.ConductingArea(f, rp.Wire, ratings.Rho20Copper)
		if a0 > 0 {
			pl.perArea = 1 / a0
		}
		for h := range e.levels {
			ah := ratings.ConductingArea(float64(h+2)*f, rp.Wire, ratings.Rho20Copper)
			if a0 > 0 && ah > 0 {
				areaRatio[h] = a0 / ah
			}
		}
	}
}

// freeLimits asks once the limits of the parts whose limits are the same
// at every carrier (ratings.Part.FrequencyFree), for limitsAt to copy.
func (e *Engine) freeLimits() {
	var buf []ratings.Limit
	for i, rp := range e.rparts {
		if rp == nil || !rp.FrequencyFree() || len(e.carriers) == 0 {
			continue
		}
		if e.freeLim == nil {
			e.freeLim = make([]*partLimits, len(e.rparts))
		}
		ones := make([]float64, len(e.levels))
		for h := range ones {
			ones[h] = 1
		}
		pl := new(partLimits)
		e.partLimitsAt(i, e.carriers[0], pl, ones, &buf)
		e.freeLim[i] = pl
	}
}

// cacheLimits asks every carrier's limits once, in one block, for
// tolerance trials to share (read only) before they start.
func (e *Engine) cacheLimits() [][]partLimits {
	e.lims.once.Do(func() {
		n, nh := len(e.C.Elements), len(e.levels)
		slab := make([]partLimits, len(e.carriers)*n)
		ratios := make([]float64, len(e.carriers)*n*nh)
		var buf []ratings.Limit
		lims := make([][]partLimits, len(e.carriers))
		for fi, f := range e.carriers {
			lims[fi] = e.limitsAt(f, slab[fi*n:(fi+1)*n:(fi+1)*n], ratios[fi*n*nh:(fi+1)*n*nh:(fi+1)*n*nh], &buf)
		}
		e.lims.p.Store(&lims)
	})
	return e.lims.get()
}

// limitStore is an engine's cached limits, shared by copies of the engine
// (part-fault runs) so that one filling serves all.
type limitStore struct {
	once sync.Once
	p    atomic.Pointer[[][]partLimits]
}

func (s *limitStore) get() [][]partLimits {
	if s == nil {
		return nil // an engine made only to index cases (retune.go)
	}
	if l := s.p.Load(); l != nil {
		return *l
	}
	return nil
}

// utilOf is a stress over its derated limit; for temperature it is the
// rise over the allowed rise (derated tmax − ambient), not °C over °C.
func (e *Engine) utilOf(qi int, v, derated float64) float64 {
	if qi == qTemp {
		amb := e.Cond.Ambient
		if allowed := derated - amb; allowed > 0 {
			return math.Max(v-amb, 0) / allowed
		}
		return math.Max(v, amb) / derated // no rise allowed: over at once
	}
	return v / derated
}

// stressAt is the stress whose utilisation is u: the inverse of utilOf.
func (e *Engine) stressAt(q ratings.Quantity, u, derated float64) float64 {
	if q == ratings.Temp {
		amb := e.Cond.Ambient
		if allowed := derated - amb; allowed > 0 {
			return amb + u*allowed
		}
	}
	return u * derated
}

func qIndex(q ratings.Quantity) int {
	for i, x := range Quantities {
		if x == q {
			return i
		}
	}
	return -1
}

// mag is |z| as √(re²+im²), without the rescaling math.Hypot does to
// survive squares beyond the float range: the phasors here are volts,
// amperes and volt-seconds per volt of drive, far inside ±1e150, and a
// part's stress below 1e-150 that squares to zero is zero for any rating.
// It serves the per-case and per-harmonic magnitudes; the circle geometry
// keeps cmplx.Abs.
func mag(z complex128) float64 { return math.Sqrt(real(z)*real(z) + imag(z)*imag(z)) }

// absExact is |z| for the circle geometry, where magnitudes may lie
// anywhere in the float range (deep in a stopband): √(re²+im²) while the
// squares are normal numbers, math.Hypot's rescaling only outside.
func absExact(z complex128) float64 {
	if s := real(z)*real(z) + imag(z)*imag(z); s > 1e-290 && s < 1e290 {
		return math.Sqrt(s)
	}
	return cmplx.Abs(z)
}
