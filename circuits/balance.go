package circuits

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"
	"sort"
	"strings"
)

// BalanceTol is the largest power-balance error, relative to the power
// offered, that a solve may show and still be trusted. A sound solve
// balances to about 1e-14 (rounding); an ill-conditioned one (a 1 nΩ part
// beside 50 Ω ones) drifts far above, and its figures, the input
// impedance first, can be wrong in the leading digits while looking
// perfectly ordinary.
const BalanceTol = 1e-9

// Check says how far a solve can be trusted.
type Check struct {
	// Balance is |P_in − P_out − P_loss| relative to the power offered:
	// by Tellegen's theorem (Tellegen 1952; Penfield, Spence & Duinker,
	// "Tellegen's theorem and electrical networks", 1970) the power the
	// source delivers equals the power the parts and the load take.
	Balance float64
	// Refined is set when one step of iterative refinement was taken
	// (Wilkinson 1963; Higham, Accuracy and Stability of Numerical
	// Algorithms, 2nd ed., ch. 12): r = b − A·x, A·d = r, x += d.
	Refined bool
	// Suspects name the parts whose stamps are extreme against the rest.
	Suspects []string
}

// OK tells whether the balance is within BalanceTol (NaN is not).
func (k Check) OK() bool { return k.Balance <= BalanceTol }

// Finding is the sentence an output shows when the check failed.
func (k Check) Finding(f float64) string {
	s := fmt.Sprintf("the solve at %s does not balance: source power and the power taken by parts and load differ by %.2g of the power offered, after one step of iterative refinement; its figures (input impedance first) cannot be trusted",
		FormatHz(f), k.Balance)
	if len(k.Suspects) > 0 {
		s += "; parts far stiffer or weaker than the rest: " + strings.Join(k.Suspects, ", ") + " (merge the nodes of a near-short, drop a near-open)"
	}
	return s
}

// balance is the relative power-balance error of a full solve.
func (r *Result) balance() float64 {
	return math.Abs(r.Pin-r.Pout-r.Pcm-r.Ploss) / r.Pavail
}

// SolveChecked is Solve with the power balance checked: when it is off by
// more than BalanceTol the solution gets one step of iterative refinement
// and is checked again. The Check says how it ended.
func (c *Circuit) SolveChecked(f, p float64, load Load) (*Result, Check, error) {
	fz, err := c.Factor(f, &load)
	if err != nil {
		return nil, Check{}, err
	}
	e := c.EMFForPower(p)
	b := make([]complex128, fz.N())
	c.SourceRHS(b, complex(e, 0))
	x := append([]complex128(nil), b...)
	fz.Solve(x)
	r := c.readout(f, p, e, load, x)
	ck := Check{Balance: r.balance()}
	if ck.OK() {
		return r, ck, nil
	}
	fz.refine(b, x)
	ck.Refined = true
	r = c.readout(f, p, e, load, x)
	ck.Balance = r.balance()
	if !ck.OK() {
		ck.Suspects = c.suspects(f)
	}
	return r, ck, nil
}

// readout fills a Result from solution x, as Solve does.
func (c *Circuit) readout(f, p, e float64, load Load, x []complex128) *Result {
	r := &Result{F: f, EMF: e, Parts: make([]PartState, len(c.Elements)), Pavail: p}
	c.PartStates(x, f, r.Parts)
	r.Nodes = append([]complex128(nil), x[:len(c.Nodes)]...)
	r.Vin = x[c.In]
	r.Iin = (complex(e, 0) - r.Vin) / c.Zs
	r.Vout = c.VOut(x)
	r.Icm = c.CommonModeI(x)
	r.Pcm = real(c.ZCM) * abs2(r.Icm)
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
	return r
}

// mul sets y = A·x for the matrix at fz.F.
func (fz *Factorization) mul(x, y []complex128) {
	clear(y)
	s := System{N: fz.n, visit: func(r, c int, v complex128) { y[r] += v * x[c] }}
	fz.C.stamp(&s, fz.F, fz.Load)
}

// refine takes one step of iterative refinement of x for A·x = b.
func (fz *Factorization) refine(b, x []complex128) {
	r := make([]complex128, len(x))
	fz.mul(x, r)
	for i := range r {
		r[i] = b[i] - r[i]
	}
	fz.Solve(r)
	for i := range x {
		x[i] += r[i]
	}
}

// stiffSpread is how far one part's largest stamp may stand from the
// median part's before it is named as a likely cause of ill-conditioning.
const stiffSpread = 1e6

// suspects names parts whose largest matrix entry at f stands more than
// stiffSpread from the median part's: a near-short or a near-open beside
// ordinary parts, the usual cause of a matrix that loses its digits.
func (c *Circuit) suspects(f float64) []string {
	mags := make([]float64, len(c.Elements))
	for i := range c.Elements {
		e := &c.Elements[i]
		m := 0.0
		s := System{N: c.Size() + 1, visit: func(r, col int, v complex128) {
			if a := cmplx.Abs(v); a != 1 && a > m { // ±1: incidence of a branch unknown
				m = a
			}
		}}
		e.Model.Stamp(e, &s, f)
		mags[i] = m
	}
	sorted := append([]float64(nil), mags...)
	sort.Float64s(sorted)
	med := sorted[len(sorted)/2]
	var out []string
	for i, m := range mags {
		if med > 0 && m > 0 && (m > stiffSpread*med || m < med/stiffSpread) {
			e := &c.Elements[i]
			out = append(out, fmt.Sprintf("%s (line %d)", e.Name, e.Comp.Pos.Line))
		}
	}
	return out
}

// SingularError says where a network matrix lost its pivot: the node or
// part whose unknown could not be fixed, and the parts that look like the
// cause. It wraps ErrSingular.
type SingularError struct {
	F      float64
	Where  string   // "node n5 (first named at line 7)" or "inductor L2 (line 9)"
	Causes []string // suspects, with their lines
}

func (e *SingularError) Error() string {
	s := "network matrix is singular: no voltage or current is fixed at " + e.Where +
		" (a section joined to the rest only through a lossless resonance, an ideal loop, or a part far larger or smaller than the rest)"
	if len(e.Causes) > 0 {
		s += "; parts far stiffer or weaker than the rest: " + strings.Join(e.Causes, ", ")
	}
	return s
}

func (e *SingularError) Unwrap() error { return ErrSingular }

// diagnoseMax is the largest system diagnosed densely (n² entries).
const diagnoseMax = 1500

// explainSingular turns ErrSingular into a SingularError that names the
// unknown left without a pivot, found by a dense elimination with the
// same pivot rule, and the suspect parts.
func (fz *Factorization) explainSingular(f float64, err error) error {
	if !errors.Is(err, ErrSingular) || fz.n > diagnoseMax {
		return err
	}
	n := fz.n
	a := make([]complex128, n*n)
	s := System{N: n, visit: func(r, c int, v complex128) { a[r*n+c] += v }}
	fz.C.stamp(&s, f, fz.Load)
	k := failedPivot(a, n)
	if k < 0 {
		return err
	}
	return &SingularError{F: f, Where: fz.C.unknownName(k), Causes: fz.C.suspects(f)}
}

// failedPivot runs Gaussian elimination with partial pivoting (the rule
// of LU.Factor: a pivot at most 1e-15 of the largest entry fails) and
// returns the column that found no pivot, or −1.
func failedPivot(a []complex128, n int) int {
	var scale float64
	for _, v := range a {
		scale = math.Max(scale, abs1(v))
	}
	if scale == 0 {
		return 0
	}
	tiny := scale * 1e-15
	for k := 0; k < n; k++ {
		p, best := k, abs1(a[k*n+k])
		for i := k + 1; i < n; i++ {
			if v := abs1(a[i*n+k]); v > best {
				p, best = i, v
			}
		}
		if best <= tiny {
			return k
		}
		if p != k {
			for j := 0; j < n; j++ {
				a[k*n+j], a[p*n+j] = a[p*n+j], a[k*n+j]
			}
		}
		for i := k + 1; i < n; i++ {
			l := a[i*n+k] / a[k*n+k]
			if l == 0 {
				continue
			}
			for j := k; j < n; j++ {
				a[i*n+j] -= l * a[k*n+j]
			}
		}
	}
	return -1
}

// unknownName names MNA unknown k: a node, or the part whose branch
// current it is.
func (c *Circuit) unknownName(k int) string {
	if k < len(c.Nodes) {
		n := c.Nodes[k]
		if p, ok := c.NL.NodePos[n]; ok {
			return fmt.Sprintf("node %s (first named at line %d)", n, p.Line)
		}
		return "node " + n
	}
	for i := range c.Elements {
		e := &c.Elements[i]
		if b := e.Model.Branches(e); b > 0 && k >= e.Branch && k < e.Branch+b {
			return fmt.Sprintf("%s %s (line %d)", e.Kind, e.Name, e.Comp.Pos.Line)
		}
	}
	if k == c.Size() {
		return "the antenna load"
	}
	return fmt.Sprintf("unknown %d", k)
}
