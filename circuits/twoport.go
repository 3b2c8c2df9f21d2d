package circuits

import (
	"math"
	"math/cmplx"
)

// SParams are the two-port scattering parameters at one frequency, with
// power waves referred to each port's impedance (Kurokawa 1965; for real
// port impedances these are the usual S-parameters).
type SParams struct {
	F                  float64
	S11, S21, S12, S22 complex128
	Zin                complex128 // input impedance with the output port terminated
}

// TwoPort solves the network at f with both ports terminated in their own
// impedances: one factorisation, two excitations.
func (c *Circuit) TwoPort(f float64) (SParams, error) {
	return NewTwoPortWork(c).At(f)
}

// TwoPortWork keeps the storage of two-port solves (the ordering of the
// unknowns, the factorisation, the excitation vector), so a sweep or a
// table of harmonics plans and allocates once.
type TwoPortWork struct {
	c    *Circuit
	load Load
	fz   *Factorization
	x    []complex128
}

// NewTwoPortWork prepares two-port solves of c.
func NewTwoPortWork(c *Circuit) *TwoPortWork {
	// S-parameters terminate port 1 in its reference z, not the
	// transmitter's own source impedance
	ref := *c
	ref.Zs = c.Zin
	c = &ref
	w := &TwoPortWork{c: c, load: Load{Z: c.Zout}}
	w.fz = c.newFactorization(&w.load)
	w.x = make([]complex128, w.fz.N())
	return w
}

// At solves the network at f with both ports terminated.
func (w *TwoPortWork) At(f float64) (SParams, error) {
	c, fz := w.c, w.fz
	if err := fz.Refactor(f); err != nil {
		return SParams{F: f}, err
	}
	r1, r2 := math.Sqrt(real(c.Zin)), math.Sqrt(real(c.Zout))
	z1c, z2c := conj(c.Zin), conj(c.Zout)
	x := w.x
	clear(x)
	sp := SParams{F: f}

	// drive port 1 with E = 1: a1 = 1/(2√R1)
	x[c.In] = 1 / c.Zin
	fz.Solve(x)
	v1, v2 := x[c.In], c.VOut(x)
	i1 := (1 - v1) / c.Zin // into the network
	i2 := -x[c.Size()]     // into the network at port 2
	a1 := 1 / (2 * complex(r1, 0))
	sp.S11 = (v1 - z1c*i1) / complex(2*r1, 0) / a1
	sp.S21 = (v2 - z2c*i2) / complex(2*r2, 0) / a1
	if i1 != 0 {
		sp.Zin = v1 / i1
	}

	// drive port 2 with E = 1 in series with Z2 (the load branch row)
	for i := range x {
		x[i] = 0
	}
	x[c.Size()] = 1
	fz.Solve(x)
	v1, v2 = x[c.In], c.VOut(x)
	i1 = -v1 / c.Zin
	i2 = -x[c.Size()]
	a2 := 1 / (2 * complex(r2, 0))
	sp.S12 = (v1 - z1c*i1) / complex(2*r1, 0) / a2
	sp.S22 = (v2 - z2c*i2) / complex(2*r2, 0) / a2
	return sp, nil
}

// DB returns 20·log10|z|, floored at −400 dB so that zero never becomes −Inf.
func DB(z complex128) float64 {
	a := cmplx.Abs(z)
	if a < 1e-20 {
		return -400
	}
	return 20 * math.Log10(a)
}

// PhaseDeg returns the angle of z in degrees.
func PhaseDeg(z complex128) float64 { return cmplx.Phase(z) * 180 / math.Pi }

// DissipatedShare is the share of the power incident at port 1 that a
// two-port turns into heat with port 2 matched: 1 − |S11|² − |S21|²
// (power waves: what is neither reflected nor passed on is absorbed).
func DissipatedShare(s11, s21 complex128) float64 {
	a, b := cmplx.Abs(s11), cmplx.Abs(s21)
	return 1 - a*a - b*b
}
