package circuits

import (
	"fmt"
	"math"
	"math/cmplx"
)

// Element is a component prepared for the solver.
type Element struct {
	Comp   *Component
	Kind   Kind
	Model  Model
	Name   string
	A, B   int     // node indices of the first two terminals; -1 is ground
	Nodes  []int   // every terminal's node index, in statement order
	Value  float64 // F, H or Ω
	Branch int     // first branch-current unknown (−1 when it has none)
	Index  int     // position in Circuit.Elements
	// Rdc is the series resistance at DC of kinds that conduct DC
	// through a winding (an inductor's rdc=); 0 when not given, and the
	// stress layer may supply the winding's wire resistance instead.
	Rdc    float64
	q      []Point // Q against frequency (constant when one point)
	qScale float64
	qLn    []float64 // ln f, ln Q of each q point, taken once
	esr    float64
	df     float64
	meas   *measuredData // measured impedance (parts) or S-parameters (blocks)
	line   *LineSpec     // lines only; shared by scaled copies, never changed
	cp     float64       // inductor self-capacitance, F (cp= or srf=)
	esl    float64       // capacitor series inductance, H (esl= or srf=)
	sw     switchState
}

type mutual struct {
	i, j int // element indices of the two inductors
	k    float64
}

// Circuit is the solver's view of a netlist: indexed nodes and elements.
type Circuit struct {
	NL       *Netlist
	Nodes    []string
	Elements []Element
	mutuals  []mutual
	In, Out  int // node indices of the ports
	// OutB is the second node of a balanced antenna port (−1: the port is
	// from Out to gnd); the load sits between Out and OutB.
	OutB int
	Zin  complex128 // reference impedance of the transmitter port
	// Zs is the transmitter's own output impedance (source=), which the
	// network is solved with; Zin when the netlist gives none.
	Zs        complex128
	HasSource bool
	Zout      complex128
	// ZCM is the common-mode impedance from a balanced load's centre to
	// gnd (cm=); HasCM false leaves the centre unconnected.
	ZCM      complex128
	HasCM    bool
	cmBranch int
	outMeas  *measuredData // measured antenna impedance
	measured []int         // the elements with measured data (CheckFrequency)
	nBranch  int
	byName   map[string]int
}

// Build prepares a parsed netlist for solving.
func Build(nl *Netlist) (*Circuit, error) {
	if nl == nil || nl.In == nil || nl.Out == nil {
		return nil, fmt.Errorf("netlist has no ports")
	}
	c := &Circuit{NL: nl, Nodes: nl.Nodes}
	idx := map[string]int{Ground: -1}
	for i, n := range nl.Nodes {
		idx[n] = i
	}
	c.In, c.Out = idx[nl.In.Node], idx[nl.Out.Node]
	c.Zin, c.Zout = nl.In.Z, nl.Out.Z
	c.Zs, c.OutB, c.cmBranch = c.Zin, -1, -1
	if nl.In.HasSource {
		c.Zs, c.HasSource = nl.In.Source, true
	}
	if nl.Out.Node2 != "" {
		c.OutB = idx[nl.Out.Node2]
	}
	byName := map[string]int{}
	next := len(nl.Nodes) // branch unknowns follow the node voltages
	for _, comp := range nl.Components {
		spec := SpecOf(comp.Kind)
		if spec == nil {
			return nil, fmt.Errorf("%s: no solver model for %s", comp.Pos, comp.Kind)
		}
		e := Element{Comp: comp, Kind: comp.Kind, Model: spec.Model, Name: comp.Name, Value: comp.Value, Branch: -1, qScale: 1}
		for _, n := range comp.Terminals() {
			e.Nodes = append(e.Nodes, idx[n])
		}
		e.A, e.B = e.Nodes[0], e.Nodes[1]
		if spec.Prepare != nil {
			spec.Prepare(&e)
		}
		m, err := nl.measuredFor(comp.Attrs)
		if err != nil {
			return nil, err
		}
		e.meas = m
		if nb := spec.Model.Branches(&e); nb > 0 {
			e.Branch = next
			next += nb
		}
		byName[comp.Name] = len(c.Elements)
		if m != nil {
			c.measured = append(c.measured, len(c.Elements))
		}
		e.Index = len(c.Elements)
		c.Elements = append(c.Elements, e)
	}
	if nl.Out.HasCM && c.OutB >= 0 {
		c.ZCM, c.HasCM, c.cmBranch = nl.Out.CM, true, next
		next++
	}
	c.nBranch = next - len(nl.Nodes)
	if nl.Out.Attrs != nil {
		m, err := nl.measuredFor(nl.Out.Attrs)
		if err != nil {
			return nil, err
		}
		c.outMeas = m
	}
	c.byName = byName
	for _, k := range nl.Couplings {
		i, ok1 := byName[k.L1]
		j, ok2 := byName[k.L2]
		if !ok1 || !ok2 {
			return nil, fmt.Errorf("%s: coupling %s names an unknown inductor", k.Pos, k.Name)
		}
		c.mutuals = append(c.mutuals, mutual{i, j, k.K})
	}
	return c, nil
}

// Size is the number of MNA unknowns without a load branch.
func (c *Circuit) Size() int { return len(c.Nodes) + c.nBranch }

// Q returns the element's Q at f: log Q interpolated against log f between
// the given points, held at the end values outside them.
func (e *Element) Q(f float64) float64 {
	pts := e.q
	n := len(pts)
	if n < 2 || len(e.qLn) != 2*n {
		return interpLogLog(pts, f) * e.qScale
	}
	if f <= pts[0].F {
		return pts[0].V * e.qScale
	}
	if f >= pts[n-1].F {
		return pts[n-1].V * e.qScale
	}
	// the same straight line on log-log axes as interpLogLog, with the
	// points' logarithms taken once at Build: one log and one exp a call
	ln := e.qLn
	for i := 1; i < n; i++ {
		if f <= pts[i].F {
			lf0, lq0, lf1, lq1 := ln[2*i-2], ln[2*i-1], ln[2*i], ln[2*i+1]
			return math.Exp(lq0+(lq1-lq0)/(lf1-lf0)*(math.Log(f)-lf0)) * e.qScale
		}
	}
	return pts[n-1].V * e.qScale
}

func interpLogLog(pts []Point, f float64) float64 {
	if len(pts) == 0 {
		return math.Inf(1)
	}
	if len(pts) == 1 || f <= pts[0].F {
		return pts[0].V
	}
	last := pts[len(pts)-1]
	if f >= last.F {
		return last.V
	}
	for i := 1; i < len(pts); i++ {
		if f <= pts[i].F {
			a, b := pts[i-1], pts[i]
			t := math.Log(f/a.F) / math.Log(b.F/a.F)
			return math.Exp(math.Log(a.V) + t*(math.Log(b.V)-math.Log(a.V)))
		}
	}
	return last.V
}

// InterpLogLog exposes the Q-style interpolation for other layers (flux
// guides, current ratings) so every frequency table reads the same way.
func InterpLogLog(pts []Point, f float64) float64 { return interpLogLog(pts, f) }

// LossR is the series-equivalent loss resistance at f (see Model.LossR).
func (e *Element) LossR(f float64) float64 { return e.Model.LossR(e, f) }

// prepareLoss reads the loss figures of a capacitor or inductor: q= (or a
// default by kind and dielectric), esr=, df=.
func prepareLoss(e *Element) {
	comp := e.Comp
	if a, ok := comp.Attrs["q"]; ok {
		e.q = a.Points
	}
	if v, ok := comp.Attrs.Num("esr"); ok {
		e.esr = v
	}
	if v, ok := comp.Attrs.Num("df"); ok {
		e.df = v
	}
	if len(e.q) > 1 {
		e.qLn = make([]float64, 0, 2*len(e.q))
		for _, p := range e.q {
			e.qLn = append(e.qLn, math.Log(p.F), math.Log(p.V))
		}
	}
	if e.q != nil || e.esr != 0 || e.df != 0 {
		return
	}
	switch comp.Kind {
	case Inductor:
		e.q = []Point{{V: DefaultInductorQ}}
	case Capacitor:
		d, _ := comp.Attrs.Word("dielectric")
		e.q = []Point{{V: DefaultCapacitorQ(d)}}
	}
}

// Mutual returns M between inductor elements i and j (0 if uncoupled).
func (c *Circuit) Mutual(i, j int) float64 {
	var m float64
	for _, mu := range c.mutuals {
		if (mu.i == i && mu.j == j) || (mu.i == j && mu.j == i) {
			m += mu.k * math.Sqrt(c.Elements[mu.i].Value*c.Elements[mu.j].Value)
		}
	}
	return m
}

// Scaled returns a copy whose element values and Q are multiplied by the
// given factors (nil means 1); used for tolerance trials.
func (c *Circuit) Scaled(value, q []float64) *Circuit {
	return c.ScaleInto(&Circuit{}, value, q)
}

// ScaleInto is Scaled writing into dst, whose element storage is reused
// when it has the room: a tolerance worker runs any number of trials
// without allocating a circuit per trial. It returns dst.
func (c *Circuit) ScaleInto(dst *Circuit, value, q []float64) *Circuit {
	els := dst.Elements
	*dst = *c
	if cap(els) < len(c.Elements) {
		els = make([]Element, len(c.Elements))
	}
	dst.Elements = els[:len(c.Elements)]
	copy(dst.Elements, c.Elements)
	for i := range dst.Elements {
		if value != nil {
			dst.Elements[i].Value *= value[i]
		}
		if q != nil && dst.Elements[i].Kind != Resistor {
			dst.Elements[i].qScale *= q[i]
		}
	}
	return dst
}

// Load terminates the antenna port.
type Load struct {
	Z    complex128
	Open bool // no load at all (antenna disconnected)
}

// Short is a dead short at the antenna port.
var Short = Load{Z: 0}

// OpenLoad is the antenna disconnected.
var OpenLoad = Load{Open: true}

// stamp fills the MNA system at f. With a load (not open) one more unknown
// carries the load current, so a short (Z = 0) needs no special case.
func (c *Circuit) stamp(s *System, f float64, load *Load) {
	s.clear()
	w := 2 * math.Pi * f
	for i := range c.Elements {
		e := &c.Elements[i]
		e.Model.Stamp(e, s, f)
	}
	for _, mu := range c.mutuals {
		// complex permeability: the core's loss follows the flux, so
		// the mutual term carries ωM/Q as the self term carries ωL/Q
		// (see mutualR); a transformer's load ampere-turns then cancel
		// in its loss as they do in its core
		zm := complex(c.mutualR(s, mu, f), w*mu.k*math.Sqrt(c.Elements[mu.i].Value*c.Elements[mu.j].Value))
		bi, bj := c.Elements[mu.i].Branch, c.Elements[mu.j].Branch
		s.Add(bi, bj, -zm)
		s.Add(bj, bi, -zm)
	}
	s.Admit(c.In, -1, 1/c.Zs)
	if c.cmBranch >= 0 {
		// common mode of a balanced load: half the current ic into each
		// terminal, (V(Out) + V(OutB))/2 = ZCM·ic
		k := c.cmBranch
		s.Add(c.Out, k, 0.5)
		s.Add(c.OutB, k, 0.5)
		s.Add(k, c.Out, 0.5)
		s.Add(k, c.OutB, 0.5)
		s.Add(k, k, -c.ZCM)
	}
	if load != nil && !load.Open {
		// the load branch: V(Out) − V(OutB) = Z·I, I from Out to OutB
		k := c.Size()
		s.Add(c.Out, k, 1)
		s.Add(c.OutB, k, -1)
		s.Add(k, c.Out, 1)
		s.Add(k, c.OutB, -1)
		s.Add(k, k, -load.Z)
	}
}

// Factorization is the network matrix at one frequency, factorised once and
// reusable for any excitation.
//
// The first factorisation records which positions the stamps touch and
// orders the unknowns by reverse Cuthill–McKee (order.go), which keeps the
// matrix banded for any topology and puts each branch unknown beside its
// nodes; when the band is narrow against the size the matrix is stored
// and factorised as a band (band.go), else densely (lu.go). Either way
// the pivoting is partial, over every candidate row. A stamp that lands
// outside the recorded band (a kind whose pattern changes with frequency)
// widens the pattern and orders again, so nothing is ever dropped.
type Factorization struct {
	C     *Circuit
	F     float64
	Load  *Load
	n     int
	pat   *pattern // positions seen so far (nil until the first factorisation)
	perm  []int    // perm[old] = new, band storage only
	band  *BandLU
	lu    *LU
	mat   []complex128 // the dense LU's own storage: assembled where it is factorised
	y     []complex128 // permuted right-hand side
	sys   System
	loss  []float64    // each element's LossR at F (System.LossR)
	kept  []complex128 // what the kinds' stamps keep at F (System.Keep)
	fixed []Ratios     // the kinds' fixed ratios at F (System.Fixed)
}

// Factor assembles and factorises the network at f with the given load
// (nil: the antenna port left out, for superposition).
func (c *Circuit) Factor(f float64, load *Load) (*Factorization, error) {
	fz := c.newFactorization(load)
	if err := fz.Refactor(f); err != nil {
		return nil, err
	}
	return fz, nil
}

func (c *Circuit) newFactorization(load *Load) *Factorization {
	n := c.Size()
	if load != nil && !load.Open {
		n++
	}
	return &Factorization{C: c, Load: load, n: n}
}

// bandBelow: a band solver is used when its row width 2·kl+ku+1 is below
// this fraction of the size; wider bands go to the dense LU, whose loops
// are simpler and whose storage is then no larger. (A variable so the
// checks can send every network through the band solver.)
var bandBelow = 0.5

// plan records the stamp pattern at f (merged with what was seen before),
// orders the unknowns and allocates the storage.
func (fz *Factorization) plan(f float64) {
	if fz.pat == nil {
		fz.pat = &pattern{n: fz.n}
	}
	fz.C.stamp(&System{N: fz.n, rec: fz.pat}, f, fz.Load)
	perm := rcmOrder(fz.pat.adjacency())
	kl, ku := fz.pat.bands(perm)
	if float64(2*kl+ku+1) < bandBelow*float64(fz.n) {
		fz.perm, fz.band, fz.lu, fz.mat = perm, NewBandLU(fz.n, kl, ku), nil, nil
		fz.y = make([]complex128, fz.n)
		return
	}
	fz.perm, fz.band = nil, nil
	fz.lu = NewLU(fz.n)
	fz.mat = fz.lu.Storage() // assembled where it is factorised: no copy
}

// Refactor reuses the storage for a new frequency.
func (fz *Factorization) Refactor(f float64) error {
	fz.F = f
	if err := fz.C.CheckFrequency(f); err != nil {
		return err
	}
	if fz.pat == nil {
		fz.plan(f)
	}
	var err error
	// the System lives in the Factorization: handed to the kinds' Stamp
	// methods it would otherwise be moved to the heap on every call
	s := &fz.sys
	if len(fz.loss) != len(fz.C.Elements) {
		fz.loss = make([]float64, len(fz.C.Elements))
		fz.kept = make([]complex128, len(fz.C.Elements))
		fz.fixed = make([]Ratios, len(fz.C.Elements))
	}
	clear(fz.fixed)
	for i := range fz.C.Elements {
		e := &fz.C.Elements[i]
		fz.loss[i] = e.Model.LossR(e, f)
	}
	if fz.band != nil {
		*s = System{N: fz.n, perm: fz.perm, band: fz.band}
		s.loss, s.lossF, s.hasLoss, s.kept, s.fixed = fz.loss, f, true, fz.kept, fz.fixed
		fz.C.stamp(s, f, fz.Load)
		if s.outside {
			fz.plan(f)
			return fz.Refactor(f)
		}
		err = fz.band.Factor()
	} else {
		*s = System{N: fz.n, M: fz.mat, loss: fz.loss, lossF: f, hasLoss: true, kept: fz.kept, fixed: fz.fixed}
		fz.C.stamp(s, f, fz.Load)
		err = fz.lu.FactorStored()
	}
	if err != nil {
		return fmt.Errorf("at %s: %w", FormatSI(f, "Hz"), fz.explainSingular(f, err))
	}
	return nil
}

// Solve solves in place for the right-hand side b (length Size, or Size+1
// with a load). It allocates nothing.
func (fz *Factorization) Solve(b []complex128) {
	if fz.band == nil {
		fz.lu.Solve(b)
		return
	}
	y := fz.y
	for old, nw := range fz.perm {
		y[nw] = b[old]
	}
	fz.band.Solve(y)
	for old, nw := range fz.perm {
		b[old] = y[nw]
	}
}

// Solve2 solves in place for two right-hand sides.
func (fz *Factorization) Solve2(b, c []complex128) {
	if fz.band == nil {
		fz.lu.Solve2(b, c)
		return
	}
	fz.Solve(b)
	fz.Solve(c)
}

// N is the number of unknowns.
func (fz *Factorization) N() int { return fz.n }

// Banded reports the band storage in use: its lower and upper bandwidth
// (ok false when the matrix is factorised densely).
func (fz *Factorization) Banded() (kl, ku int, ok bool) {
	if fz.band == nil {
		return 0, 0, false
	}
	return fz.band.kl, fz.band.ku, true
}

// dense assembles the matrix at fz.F densely, in the original unknown
// order, for checks against other solvers.
func (fz *Factorization) dense() []complex128 {
	m := make([]complex128, fz.n*fz.n)
	fz.C.stamp(&System{N: fz.n, M: m}, fz.F, fz.Load)
	return m
}

// SourceRHS writes the excitation of an EMF e (rms) behind the input port's
// impedance (Norton form) into b.
func (c *Circuit) SourceRHS(b []complex128, e complex128) {
	for i := range b {
		b[i] = 0
	}
	b[c.In] = e / c.Zs
}

// EMFForPower is the rms open-circuit EMF of the transmitter at power p:
// without source= the EMF whose available power is p, |E|²/(4·Re Z) = p;
// with source=, the EMF that puts p into a load equal to the port's z
// behind the true source impedance (a transmitter rated p into z):
// |E|·√(Re z)/|Zs + z| = √p.
func (c *Circuit) EMFForPower(p float64) float64 {
	if c.HasSource {
		return cmplx.Abs(c.Zs+c.Zin) * math.Sqrt(p/real(c.Zin))
	}
	return 2 * math.Sqrt(p*real(c.Zin))
}

// VOut is the antenna port's voltage in solution x (differential for a
// balanced port).
func (c *Circuit) VOut(x []complex128) complex128 { return nodeV(x, c.Out) - nodeV(x, c.OutB) }

// CommonModeI is the common-mode current into a balanced load's centre
// impedance in solution x (0 without cm=).
func (c *Circuit) CommonModeI(x []complex128) complex128 {
	if c.cmBranch < 0 {
		return 0
	}
	return x[c.cmBranch]
}

// PartState is one element's solved state (rms phasors).
type PartState struct {
	V, I   complex128 // across (A minus B) and through (A to B)
	Lambda complex128 // flux linkage L·I + ΣM·I (inductors only)
	// V2, I2 are the second port's voltage and the current into it, for
	// two-port kinds (lines, measured blocks); zero for two-terminal parts.
	V2, I2 complex128
	// It is the terminal current where it differs from I: an inductor
	// with self-capacitance carries I in its winding (flux, heat) and It
	// at its terminals. Zero when they are the same.
	It complex128
	// Vloss is a coupled winding's loss voltage, Σ_j R_ij·I_j with the
	// coupling's ωM/Q (Circuit.mutualR): it dissipates Re(Vloss·I*).
	// Zero for parts that dissipate |I|²·R_loss.
	Vloss complex128
	Ploss float64 // dissipation
}

func nodeV(x []complex128, i int) complex128 {
	if i < 0 {
		return 0
	}
	return x[i]
}

// PartStates reads element states out of a solution vector x at f.
func (c *Circuit) PartStates(x []complex128, f float64, out []PartState) {
	c.partStates(nil, x, f, out, true)
}

// partStates is PartStates, with the dissipation left out when withLoss is
// false (Split keeps the loss resistance per element instead).
func (c *Circuit) partStates(s *System, x []complex128, f float64, out []PartState, withLoss bool) {
	for i := range c.Elements {
		e := &c.Elements[i]
		// the state is written in place: returned by value it was copied
		// twice per part per solve, a fifth of a small network's fill
		st := &out[i]
		e.Model.State(e, s, x, f, st)
		if !withLoss {
			continue
		}
		if d, ok := e.Model.(Dissipator); ok {
			st.Ploss = d.Dissipation(e, st, f)
		} else {
			r := s.LossR(e, f)
			st.Ploss = r * (real(st.I)*real(st.I) + imag(st.I)*imag(st.I))
		}
	}
	c.coupledStates(s, f, out, withLoss)
}

// coupledStates adds what couplings put into the states read element by
// element: each winding's flux linkage from its neighbours' currents and
// its loss voltage (and, withLoss, its dissipation).
func (c *Circuit) coupledStates(s *System, f float64, out []PartState, withLoss bool) {
	for _, mu := range c.mutuals {
		M := complex(mu.k*math.Sqrt(c.Elements[mu.i].Value*c.Elements[mu.j].Value), 0)
		out[mu.i].Lambda += M * out[mu.j].I
		out[mu.j].Lambda += M * out[mu.i].I
	}
	if len(c.mutuals) == 0 || f == 0 {
		return
	}
	// a coupled winding's loss voltage: its own ωL/Q·I plus ωM/Q·I of
	// every winding coupled to it; it dissipates Re(Vloss·I*), and the
	// windings of one core together dissipate (ω/Q)·Re(Iᴴ·L·I)
	for _, mu := range c.mutuals {
		for _, i := range [2]int{mu.i, mu.j} {
			if out[i].Vloss == 0 {
				out[i].Vloss = complex(s.LossR(&c.Elements[i], f), 0) * out[i].I
			}
		}
	}
	for _, mu := range c.mutuals {
		r := complex(c.mutualR(s, mu, f), 0)
		out[mu.i].Vloss += r * out[mu.j].I
		out[mu.j].Vloss += r * out[mu.i].I
	}
	if withLoss {
		for _, mu := range c.mutuals {
			for _, i := range [2]int{mu.i, mu.j} {
				out[i].Ploss = real(out[i].Vloss * conj(out[i].I))
			}
		}
	}
}

// mutualR is the loss resistance of a coupling at f: ωM/Q with Q the
// geometric mean of the two windings' Q there (ωL/R of each), the
// complex-permeability model of a lossy core (µ = µ′ − jµ″, Q = µ′/µ″).
// With equal Q the matrix of loss resistances is (ω/Q)·L, positive
// semidefinite like L, so no set of currents dissipates less than zero.
func (c *Circuit) mutualR(s *System, mu mutual, f float64) float64 {
	a, b := &c.Elements[mu.i], &c.Elements[mu.j]
	ra, rb := s.LossR(a, f), s.LossR(b, f)
	if !(ra > 0) || !(rb > 0) || f <= 0 {
		return 0
	}
	// ωM/√(Qa·Qb) with Q = ωL/R is k·√(La·Lb)·ω·√(Ra·Rb)/(ω·√(La·Lb))
	return mu.k * math.Sqrt(ra*rb)
}

// Coupled reports whether element i is a winding of some coupling.
func (c *Circuit) Coupled(i int) bool {
	for _, mu := range c.mutuals {
		if mu.i == i || mu.j == i {
			return true
		}
	}
	return false
}

// Result is a full solve at one frequency with one load.
type Result struct {
	F        float64
	EMF      float64
	Parts    []PartState
	Nodes    []complex128
	Vin, Iin complex128 // at the input port; Iin flows into the network
	Vout     complex128
	Iout     complex128 // into the load
	Pavail   float64
	Pin      float64 // delivered into the network by the source
	Pout     float64 // into the load
	Ploss    float64 // Σ part dissipation
	Zin      complex128
	Icm      complex128 // common-mode current of a balanced load (cm=)
	Pcm      float64    // power into the balanced load's common-mode impedance
}

// Solve drives the input port with available power p at f into load.
func (c *Circuit) Solve(f, p float64, load Load) (*Result, error) {
	fz, err := c.Factor(f, &load)
	if err != nil {
		return nil, err
	}
	e := c.EMFForPower(p)
	x := make([]complex128, fz.N())
	c.SourceRHS(x, complex(e, 0))
	fz.Solve(x)
	return c.readout(f, p, e, load, x), nil
}

func conj(z complex128) complex128 { return complex(real(z), -imag(z)) }

// Flops is the real floating-point operation count of one factorisation
// and of one solve as stored (dense or band): a complex multiply-add is
// 8 real flops. A dense LU does about n³/3 multiply-adds and a solve n²;
// a band LU n·kl·(kl+ku) and a solve n·(2·kl+ku).
func (fz *Factorization) Flops() (factor, solve float64) {
	n := float64(fz.n)
	if fz.band != nil {
		kl, ku := float64(fz.band.kl), float64(fz.band.ku)
		return 8 * n * kl * (kl + ku), 8 * n * (2*kl + ku)
	}
	return 8 * n * n * n / 3, 8 * n * n
}
