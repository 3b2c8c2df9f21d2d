package circuits

import (
	"fmt"
	"math"
)

// DefaultInductorQ is the Q assumed for an inductor with no q= given: a
// middling figure for a wound toroid at HF (common practice, from memory:
// such coils measure roughly 100 to 250).
const DefaultInductorQ = 100

// defaultCapQ is the Q assumed for a capacitor with no q=, esr= or df=, by
// dielectric class. Figures are typical HF values from memory (common
// practice), chosen on the low side so losses are not understated.
var defaultCapQ = map[string]float64{
	"c0g": 1000, "np0": 1000, "mica": 1000, "porcelain": 2000, "film": 500,
	"glass": 1500, "air": 5000, "vacuum": 5000,
	"x7r": 40, "x5r": 40, "y5v": 15, "z5u": 15,
}

// genericCapQ applies when no dielectric is named.
const genericCapQ = 500

// DefaultCapacitorQ returns the Q assumed for a capacitor of the given
// dielectric class ("" for unknown) when the netlist gives no loss figure.
func DefaultCapacitorQ(dielectric string) float64 {
	if q, ok := defaultCapQ[dielectric]; ok {
		return q
	}
	return genericCapQ
}

// Element is a component prepared for the solver.
type Element struct {
	Comp   *Component
	Kind   Kind
	Name   string
	A, B   int     // node indices; -1 is ground
	Value  float64 // F, H or Ω
	Branch int     // inductors: index of the branch-current unknown
	q      []Point // Q against frequency (constant when one point)
	qScale float64
	esr    float64
	df     float64
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
	Zin      complex128
	Zout     complex128
	nInd     int
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
	byName := map[string]int{}
	for _, comp := range nl.Components {
		e := Element{Comp: comp, Kind: comp.Kind, Name: comp.Name, A: idx[comp.A], B: idx[comp.B], Value: comp.Value, Branch: -1, qScale: 1}
		if a, ok := comp.Attrs["q"]; ok {
			e.q = a.Points
		}
		if v, ok := comp.Attrs.Num("esr"); ok {
			e.esr = v
		}
		if v, ok := comp.Attrs.Num("df"); ok {
			e.df = v
		}
		switch comp.Kind {
		case Inductor:
			if e.q == nil {
				e.q = []Point{{V: DefaultInductorQ}}
			}
			e.Branch = len(nl.Nodes) + c.nInd
			c.nInd++
		case Capacitor:
			if e.q == nil && e.esr == 0 && e.df == 0 {
				d, _ := comp.Attrs.Word("dielectric")
				e.q = []Point{{V: DefaultCapacitorQ(d)}}
			}
		}
		byName[comp.Name] = len(c.Elements)
		c.Elements = append(c.Elements, e)
	}
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
func (c *Circuit) Size() int { return len(c.Nodes) + c.nInd }

// Q returns the element's Q at f: log Q interpolated against log f between
// the given points, held at the end values outside them.
func (e *Element) Q(f float64) float64 {
	return interpLogLog(e.q, f) * e.qScale
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

// LossR is the series loss resistance at f: ωL/Q for an inductor,
// 1/(ωCQ) (or esr, or tanδ/(ωC)) for a capacitor, R for a resistor.
func (e *Element) LossR(f float64) float64 {
	w := 2 * math.Pi * f
	switch e.Kind {
	case Inductor:
		return w * e.Value / e.Q(f)
	case Capacitor:
		switch {
		case e.esr > 0:
			return e.esr / e.qScale
		case e.df > 0:
			return e.df / (w * e.Value) / e.qScale
		default:
			return 1 / (w * e.Value * e.Q(f))
		}
	}
	return e.Value
}

// Impedance of a two-terminal element at f, loss included.
func (e *Element) Impedance(f float64) complex128 {
	w := 2 * math.Pi * f
	switch e.Kind {
	case Inductor:
		return complex(e.LossR(f), w*e.Value)
	case Capacitor:
		return complex(e.LossR(f), -1/(w*e.Value))
	}
	return complex(e.Value, 0)
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
	d := *c
	d.Elements = make([]Element, len(c.Elements))
	copy(d.Elements, c.Elements)
	for i := range d.Elements {
		if value != nil {
			d.Elements[i].Value *= value[i]
		}
		if q != nil && d.Elements[i].Kind != Resistor {
			d.Elements[i].qScale *= q[i]
		}
	}
	return &d
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

// stamp fills the MNA matrix at f. With a load (not open) one more unknown
// carries the load current, so a short (Z = 0) needs no special case.
func (c *Circuit) stamp(m []complex128, n int, f float64, load *Load) {
	for i := range m {
		m[i] = 0
	}
	w := 2 * math.Pi * f
	add := func(r, col int, v complex128) {
		if r >= 0 && col >= 0 {
			m[r*n+col] += v
		}
	}
	admit := func(a, b int, y complex128) {
		add(a, a, y)
		add(b, b, y)
		add(a, b, -y)
		add(b, a, -y)
	}
	for i := range c.Elements {
		e := &c.Elements[i]
		switch e.Kind {
		case Inductor:
			k := e.Branch
			add(e.A, k, 1)
			add(e.B, k, -1)
			add(k, e.A, 1)
			add(k, e.B, -1)
			add(k, k, -complex(e.LossR(f), w*e.Value))
		default:
			admit(e.A, e.B, 1/e.Impedance(f))
		}
	}
	for _, mu := range c.mutuals {
		M := mu.k * math.Sqrt(c.Elements[mu.i].Value*c.Elements[mu.j].Value)
		bi, bj := c.Elements[mu.i].Branch, c.Elements[mu.j].Branch
		add(bi, bj, complex(0, -w*M))
		add(bj, bi, complex(0, -w*M))
	}
	admit(c.In, -1, 1/c.Zin)
	if load != nil && !load.Open {
		k := c.Size()
		add(c.Out, k, 1)
		add(k, c.Out, 1)
		add(k, k, -load.Z)
	}
}

// Factorization is the network matrix at one frequency, factorised once and
// reusable for any excitation.
type Factorization struct {
	C    *Circuit
	F    float64
	Load *Load
	lu   *LU
	mat  []complex128
}

// Factor assembles and factorises the network at f with the given load
// (nil: the antenna port left out, for superposition).
func (c *Circuit) Factor(f float64, load *Load) (*Factorization, error) {
	n := c.Size()
	if load != nil && !load.Open {
		n++
	}
	fz := &Factorization{C: c, F: f, Load: load, lu: NewLU(n), mat: make([]complex128, n*n)}
	if err := fz.Refactor(f); err != nil {
		return nil, err
	}
	return fz, nil
}

// Refactor reuses the storage for a new frequency.
func (fz *Factorization) Refactor(f float64) error {
	fz.F = f
	n := fz.lu.Size()
	fz.C.stamp(fz.mat, n, f, fz.Load)
	if err := fz.lu.Factor(fz.mat); err != nil {
		return fmt.Errorf("at %s: %w", FormatSI(f, "Hz"), err)
	}
	return nil
}

// Solve solves in place for the right-hand side b (length Size, or Size+1
// with a load). It allocates nothing.
func (fz *Factorization) Solve(b []complex128) { fz.lu.Solve(b) }

// N is the number of unknowns.
func (fz *Factorization) N() int { return fz.lu.Size() }

// SourceRHS writes the excitation of an EMF e (rms) behind the input port's
// impedance (Norton form) into b.
func (c *Circuit) SourceRHS(b []complex128, e complex128) {
	for i := range b {
		b[i] = 0
	}
	b[c.In] = e / c.Zin
}

// EMFForPower is the rms open-circuit EMF whose available power into the
// input port impedance is p: |E|²/(4·Re Z) = p.
func (c *Circuit) EMFForPower(p float64) float64 {
	return 2 * math.Sqrt(p*real(c.Zin))
}

// PartState is one element's solved state (rms phasors).
type PartState struct {
	V, I   complex128 // across (A minus B) and through (A to B)
	Lambda complex128 // flux linkage L·I + ΣM·I (inductors only)
	Ploss  float64    // |I|²·R_loss
}

func nodeV(x []complex128, i int) complex128 {
	if i < 0 {
		return 0
	}
	return x[i]
}

// PartStates reads element states out of a solution vector x at f.
func (c *Circuit) PartStates(x []complex128, f float64, out []PartState) {
	w := 2 * math.Pi * f
	for i := range c.Elements {
		e := &c.Elements[i]
		v := nodeV(x, e.A) - nodeV(x, e.B)
		var cur complex128
		var lam complex128
		switch e.Kind {
		case Inductor:
			cur = x[e.Branch]
			lam = complex(e.Value, 0) * cur
		default:
			cur = v / e.Impedance(f)
		}
		r := e.LossR(f)
		out[i] = PartState{V: v, I: cur, Lambda: lam, Ploss: r * (real(cur)*real(cur) + imag(cur)*imag(cur))}
	}
	_ = w
	for _, mu := range c.mutuals {
		M := complex(mu.k*math.Sqrt(c.Elements[mu.i].Value*c.Elements[mu.j].Value), 0)
		out[mu.i].Lambda += M * out[mu.j].I
		out[mu.j].Lambda += M * out[mu.i].I
	}
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
	r := &Result{F: f, EMF: e, Parts: make([]PartState, len(c.Elements)), Pavail: p}
	c.PartStates(x, f, r.Parts)
	r.Nodes = append([]complex128(nil), x[:len(c.Nodes)]...)
	r.Vin = x[c.In]
	r.Iin = (complex(e, 0) - r.Vin) / c.Zin
	r.Vout = x[c.Out]
	if !load.Open {
		r.Iout = x[c.Size()]
	}
	r.Pin = real(r.Vin * conj(r.Iin))
	r.Pout = real(r.Vout * conj(r.Iout))
	for _, ps := range r.Parts {
		r.Ploss += ps.Ploss
	}
	if r.Iin != 0 {
		r.Zin = r.Vin / r.Iin
	}
	return r, nil
}

func conj(z complex128) complex128 { return complex(real(z), -imag(z)) }
