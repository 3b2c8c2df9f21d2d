package circuits

import (
	"errors"
	"math"
)

// ErrSingular is returned when the network matrix has no usable pivot: a
// part of the circuit floats or a loop of ideal parts fixes no current.
var ErrSingular = errors.New("network matrix is singular (a floating section or an ideal loop)")

// LU is a dense complex LU factorisation with partial pivoting, kept so that
// one factorisation serves any number of right-hand sides. gonum has no
// complex LU, and the matrices here are small (tens of unknowns), so a plain
// row-major Doolittle elimination is the fastest thing that works.
type LU struct {
	n   int
	a   []complex128 // L below the diagonal (unit diagonal implied), U on and above
	inv []complex128 // 1/U[k][k]: the solves multiply, not divide
	piv []int
}

// NewLU allocates room for an n×n factorisation.
func NewLU(n int) *LU {
	return &LU{n: n, a: make([]complex128, n*n), inv: make([]complex128, n), piv: make([]int, n)}
}

// Factor copies m (row-major n×n) and factorises it in place.
func (f *LU) Factor(m []complex128) error {
	copy(f.a, m)
	return f.FactorStored()
}

// Storage is the LU's own n×n row-major storage: a matrix assembled there
// is factorised by FactorStored without a copy.
func (f *LU) Storage() []complex128 { return f.a }

// FactorStored factorises the matrix in Storage in place.
func (f *LU) FactorStored() error {
	n := f.n
	a := f.a
	tiny, err := pivotFloor(a)
	if err != nil {
		return err
	}
	for k := 0; k < n; k++ {
		p := k
		best := abs1(a[k*n+k])
		for i := k + 1; i < n; i++ {
			if v := abs1(a[i*n+k]); v > best {
				best, p = v, i
			}
		}
		f.piv[k] = p
		if best <= tiny {
			return ErrSingular
		}
		if p != k {
			rk, rp := a[k*n:k*n+n], a[p*n:p*n+n]
			for j := range rk {
				rk[j], rp[j] = rp[j], rk[j]
			}
		}
		inv := recip(a[k*n+k])
		f.inv[k] = inv
		rowk := a[k*n : k*n+n]
		for i := k + 1; i < n; i++ {
			ri := a[i*n : i*n+n]
			if ri[k] == 0 {
				continue
			}
			l := ri[k] * inv
			ri[k] = l
			for j := k + 1; j < n; j++ {
				ri[j] -= l * rowk[j]
			}
		}
	}
	return nil
}

// abs1 is |re|+|im|: cheaper than a modulus and good enough to pick pivots.
func abs1(z complex128) float64 {
	r, i := real(z), imag(z)
	if r < 0 {
		r = -r
	}
	if i < 0 {
		i = -i
	}
	return r + i
}

// Solve overwrites b with the solution of A·x = b. It allocates nothing.
func (f *LU) Solve(b []complex128) {
	n, a := f.n, f.a
	for k := 0; k < n; k++ {
		if p := f.piv[k]; p != k {
			b[k], b[p] = b[p], b[k]
		}
	}
	for i := 1; i < n; i++ {
		s := b[i]
		ri := a[i*n : i*n+i]
		for j, l := range ri {
			s -= l * b[j]
		}
		b[i] = s
	}
	for i := n - 1; i >= 0; i-- {
		s := b[i]
		ri := a[i*n : i*n+n]
		for j := i + 1; j < n; j++ {
			s -= ri[j] * b[j]
		}
		b[i] = s * f.inv[i]
	}
}

// Solve2 is Solve for two right-hand sides at once: the two dependent
// chains of each row's inner product interleave, so the pair costs little
// more than one.
func (f *LU) Solve2(b, c []complex128) {
	n, a := f.n, f.a
	b, c = b[:n], c[:n]
	for k := 0; k < n; k++ {
		if p := f.piv[k]; p != k {
			b[k], b[p] = b[p], b[k]
			c[k], c[p] = c[p], c[k]
		}
	}
	for i := 1; i < n; i++ {
		s, t := b[i], c[i]
		ri := a[i*n : i*n+i]
		for j, l := range ri {
			s -= l * b[j]
			t -= l * c[j]
		}
		b[i], c[i] = s, t
	}
	for i := n - 1; i >= 0; i-- {
		s, t := b[i], c[i]
		ri := a[i*n : i*n+n]
		for j := i + 1; j < n; j++ {
			s -= ri[j] * b[j]
			t -= ri[j] * c[j]
		}
		b[i], c[i] = s*f.inv[i], t*f.inv[i]
	}
}

// Size is the number of unknowns.
func (f *LU) Size() int { return f.n }

// recip is 1/z by Smith's scaling (Smith 1962, ACM Algorithm 116): two
// real divisions, no overflow for any pivot the singularity test lets
// through, and several times cheaper than the runtime's general complex
// division with its infinity and NaN cases.
func recip(z complex128) complex128 {
	a, b := real(z), imag(z)
	if math.Abs(a) >= math.Abs(b) {
		r := b / a
		d := a + b*r
		return complex(1/d, -r/d)
	}
	r := a / b
	d := a*r + b
	return complex(r/d, -1/d)
}

// pivotFloor is the singularity test shared by the dense and band LU: no
// pivot may fall below 1e-15 of the largest entry. The largest |entry| is
// found in squares (one square root, not one per entry).
func pivotFloor(a []complex128) (float64, error) {
	var scale float64
	for _, v := range a {
		if x := abs2(v); x > scale {
			scale = x
		}
	}
	if scale == 0 {
		return 0, ErrSingular
	}
	return math.Sqrt(scale) * 1e-15, nil
}
