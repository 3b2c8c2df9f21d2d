package circuits

import (
	"math"
	"math/cmplx"
)

// Split is the network at one frequency seen from the antenna port, with
// the load taken away: the response to a 1 V rms EMF at the input port
// (index 0) and the response to 1 A injected into the antenna node
// (index 1). By superposition the state under any load Z is
//
//	x = x0 + α·x1,  α = −I_L,  I_L = Voc/(Zth + Z)
//
// so a load costs a few complex multiply-adds per part, not a new solve.
type Split struct {
	F        float64
	Voc, Zth complex128 // Thevenin equivalent at the antenna port
	// P holds each element's state for each excitation: V, I and flux
	// linkage, the second port's V2, I2 for two-port kinds, the terminal
	// current It where it differs from I, a coupled winding's loss
	// voltage Vloss (Ploss is not set)
	P [2][]PartState
	R []float64 // loss resistance per element at F
	// Ports marks elements whose loss is the power into their two ports
	// (lines), not R·|I|².
	Ports []bool
	// Coupled marks windings of a coupling: their loss is Re(Vloss·I*),
	// with PartState.Vloss linear in the state like V.
	Coupled []bool
	Node    [2][]complex128
	// Ratio is each element's fixed ratios at F where its kind records
	// them (Ratios), else zero: a caller scales one magnitude instead of
	// taking another root.
	Ratio []Ratios
	Vin   [2]complex128
	Zs    complex128
	// Cm is each excitation's common-mode current into a balanced load's
	// centre impedance Zcm (zero without cm=).
	Cm  [2]complex128
	Zcm complex128
}

// NewSplit allocates a split for c.
func NewSplit(c *Circuit) *Split {
	n, nn := len(c.Elements), len(c.Nodes)
	s := &Split{R: make([]float64, n), Ports: make([]bool, n), Coupled: make([]bool, n),
		Ratio: make([]Ratios, n)}
	for i := range c.Elements {
		_, s.Ports[i] = c.Elements[i].Model.(Dissipator)
		s.Coupled[i] = c.Coupled(i)
	}
	for k := 0; k < 2; k++ {
		s.P[k] = make([]PartState, n)
		s.Node[k] = make([]complex128, nn)
	}
	return s
}

// SplitWork holds the reusable storage for filling splits.
type SplitWork struct {
	fz    *Factorization
	x, x1 []complex128
}

// NewSplitWork prepares storage for c.
func NewSplitWork(c *Circuit) *SplitWork {
	return &SplitWork{
		fz: c.newFactorization(nil),
		x:  make([]complex128, c.Size()),
		x1: make([]complex128, c.Size()),
	}
}

// Rebind points the storage at another circuit of the same shape (a
// tolerance trial of the same netlist).
func (w *SplitWork) Rebind(c *Circuit) { w.fz.C = c }

// Fill factorises the open-port network at f once and solves both
// excitations into s.
func (w *SplitWork) Fill(s *Split, f float64) error {
	c := w.fz.C
	if err := w.fz.Refactor(f); err != nil {
		return err
	}
	s.F, s.Zs, s.Zcm = f, c.Zs, c.ZCM
	// both excitations solved together (Solve2), then read
	w.excite(w.x, 0)
	w.excite(w.x1, 1)
	w.fz.Solve2(w.x, w.x1)
	w.readPair(s, f)
	copy(s.R, w.fz.loss) // each element's LossR at f, asked once in Refactor
	w.ratios(s, f)
	return nil
}

// solveInto solves excitation k (0: 1 V of EMF at the input; 1: 1 A into
// the antenna port) with the current factorisation and stores the states
// in s; refine adds one step of iterative refinement (FillChecked).
func (w *SplitWork) solveInto(s *Split, f float64, k int, refine bool) {
	x := w.x
	w.excite(x, k)
	var b []complex128
	if refine {
		b = append([]complex128(nil), x...)
	}
	w.fz.Solve(x)
	if refine {
		w.fz.refine(b, x)
	}
	w.read(s, f, k, x)
}

// excite writes excitation k's right-hand side into x.
func (w *SplitWork) excite(x []complex128, k int) {
	c := w.fz.C
	clear(x)
	if k == 0 {
		x[c.In] = 1 / c.Zs
	} else {
		// 1 A into the load's terminals, out of OutB when balanced
		x[c.Out] = 1
		if c.OutB >= 0 {
			x[c.OutB] = -1
		}
	}
}

// readPair stores the states of both solutions (w.x, w.x1) in s, as
// read(0) and read(1) would, reading each element once where its kind can
// (PairReader).
func (w *SplitWork) readPair(s *Split, f float64) {
	c := w.fz.C
	sys := &w.fz.sys
	x0, x1 := w.x, w.x1
	P0, P1 := s.P[0], s.P[1]
	for i := range c.Elements {
		e := &c.Elements[i]
		if pr, ok := e.Model.(PairReader); ok {
			pr.StatePair(e, sys, x0, x1, f, &P0[i], &P1[i])
		} else {
			e.Model.State(e, sys, x0, f, &P0[i])
			e.Model.State(e, sys, x1, f, &P1[i])
		}
	}
	c.coupledStates(sys, f, P0, false)
	c.coupledStates(sys, f, P1, false)
	for k, x := range [2][]complex128{x0, x1} {
		copy(s.Node[k], x[:len(c.Nodes)])
		s.Vin[k] = x[c.In]
		s.Cm[k] = c.CommonModeI(x)
	}
	s.Voc, s.Zth = c.VOut(x0), c.VOut(x1)
}

// read stores the states of solution x of excitation k in s.
func (w *SplitWork) read(s *Split, f float64, k int, x []complex128) {
	c := w.fz.C
	c.partStates(&w.fz.sys, x, f, s.P[k], false) // straight into the split
	copy(s.Node[k], x[:len(c.Nodes)])
	s.Vin[k] = x[c.In]
	s.Cm[k] = c.CommonModeI(x)
	if k == 0 {
		s.Voc = c.VOut(x)
	} else {
		s.Zth = c.VOut(x)
	}
}

// ratios sets the split's fixed ratios at f (the same for both
// excitations) from those the kinds' stamps recorded (System.Fixed). A
// coupled winding's branch holds its neighbours' mutual voltage and its
// flux linkage their flux, so it has none; a ratio that is not a finite
// positive number is left out as well, and the caller takes the
// magnitude itself.
func (w *SplitWork) ratios(s *Split, f float64) {
	for i, r := range w.fz.fixed {
		if f <= 0 || s.Coupled[i] {
			r = Ratios{}
		}
		s.Ratio[i] = Ratios{IPerV: finitePositive(r.IPerV), VPerI: finitePositive(r.VPerI), LamPerI: finitePositive(r.LamPerI)}
	}
}

// finitePositive is x when it is a finite positive number, else 0.
func finitePositive(x float64) float64 {
	if x > 0 && x <= math.MaxFloat64 {
		return x
	}
	return 0
}

// Alpha is the weight of the unit-injection response for a load; for 1 V
// of EMF. An open port gives 0.
func (s *Split) Alpha(l Load) complex128 {
	if l.Open {
		return 0
	}
	d := s.Zth + l.Z
	// |d| < 1e-12·|Zth| compared in squares (impedances are far inside
	// the range where squaring is exact enough); d = 0 covers Zth = 0
	if d == 0 || abs2(d) < 1e-24*abs2(s.Zth) {
		// a lossless network resonated by a lossless load: keep it finite
		d = complex(1e-12*cmplx.Abs(s.Zth)+1e-18, 0)
	}
	// −Voc·d̄/|d|²: the runtime's complex division guards a range that
	// an impedance never leaves, at several times the cost
	return -s.Voc * conj(d) * complex(1/abs2(d), 0)
}

// Part returns the state of element i for weight α and EMF e (rms).
func (s *Split) Part(i int, alpha, e complex128) PartState {
	v := (s.P[0][i].V + alpha*s.P[1][i].V) * e
	cur := (s.P[0][i].I + alpha*s.P[1][i].I) * e
	lam := (s.P[0][i].Lambda + alpha*s.P[1][i].Lambda) * e
	v2 := (s.P[0][i].V2 + alpha*s.P[1][i].V2) * e
	i2 := (s.P[0][i].I2 + alpha*s.P[1][i].I2) * e
	it := (s.P[0][i].It + alpha*s.P[1][i].It) * e
	st := PartState{V: v, I: cur, Lambda: lam, V2: v2, I2: i2, It: it, Ploss: s.R[i] * (real(cur)*real(cur) + imag(cur)*imag(cur))}
	if s.Ports[i] {
		st.Ploss = real(v*conj(cur)) + real(v2*conj(i2))
	}
	if s.Coupled[i] {
		st.Vloss = (s.P[0][i].Vloss + alpha*s.P[1][i].Vloss) * e
		st.Ploss = real(st.Vloss * conj(cur))
	}
	return st
}

// InputPower is the power the source delivers into the network (load
// included) for weight α and a 1 V EMF.
func (s *Split) InputPower(alpha complex128) float64 {
	vin := s.Vin[0] + alpha*s.Vin[1]
	iin := (1 - vin) / s.Zs
	return real(vin * conj(iin))
}

// LoadPower is the power into load l for weight α and a 1 V EMF.
func (s *Split) LoadPower(l Load, alpha complex128) float64 {
	il := -alpha
	return real(l.Z) * (real(il)*real(il) + imag(il)*imag(il))
}

// MaxNodeV is the largest node voltage magnitude (rms) for weight α, EMF e.
func (s *Split) MaxNodeV(alpha complex128, e float64) float64 {
	var m float64
	for i := range s.Node[0] {
		if v := cmplx.Abs(s.Node[0][i]+alpha*s.Node[1][i]) * e; v > m {
			m = v
		}
	}
	return m
}

// LoadOnCircle is the load on the circle of the given SWR around z0 at
// angle θ of Γ = (Z − z0)/(Z + z0*), so Z = (z0 + Γ·z0*)/(1 − Γ). This Γ is
// Kurokawa's power-wave reflection coefficient (1965) taken with reference
// z0*: it vanishes at Z = z0, the circle is centred on the antenna's own
// impedance, and |Γ| < 1 exactly when Re Z > 0, so for a complex z0 every
// load on the circle stays passive. For a real z0 it is the familiar
// Z = z0·(1+Γ)/(1−Γ).
func LoadOnCircle(z0 complex128, swr, theta float64) Load {
	g := (swr - 1) / (swr + 1)
	sin, cos := math.Sincos(theta)
	return LoadForGamma(z0, complex(g*cos, g*sin))
}

// LoadForGamma is the load whose power-wave reflection coefficient against
// z0 is gam (see LoadOnCircle): Z = (z0 + Γ·z0*)/(1 − Γ), |Γ| < 1.
func LoadForGamma(z0, gam complex128) Load {
	return Load{Z: (z0 + gam*conj(z0)) * recip(1-gam)}
}

// ReflectionAngle is the angle θ in [0, 2π) of the power-wave reflection
// coefficient of z against z0: the inverse of LoadOnCircle's angle.
func ReflectionAngle(z0, z complex128) float64 {
	// arg((z−z0)/(z+z0*)) without the division: arg(a·b̄) = arg a − arg b
	g := (z - z0) * conj(z+conj(z0))
	th := cmplx.Phase(g)
	if th < 0 {
		th += 2 * math.Pi
	}
	return th
}
