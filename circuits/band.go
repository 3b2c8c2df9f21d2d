package circuits

import (
	"math"
	"math/cmplx"
)

// BandLU is a complex band LU factorisation with partial pivoting, the
// scheme of LAPACK's zgbtrf: the matrix has kl sub- and ku
// super-diagonals; choosing each pivot among the kl rows below the
// diagonal widens U to kl+ku super-diagonals and nothing else, so the
// work is n·kl·(kl+ku) multiply-adds instead of n³/3 and the pivoting is
// exactly that of a dense elimination (every entry outside the band is
// zero). Row i is stored row-major over columns i−kl … i+kl+ku; the
// multipliers of step k stay in column k of their rows and the row
// interchanges are applied to the right-hand side in the same order.
type BandLU struct {
	n, kl, ku, w int
	a            []complex128
	piv          []int
	inv          []complex128 // 1/U[k][k]
}

// NewBandLU allocates room for an n×n matrix with kl sub- and ku
// super-diagonals.
func NewBandLU(n, kl, ku int) *BandLU {
	w := 2*kl + ku + 1
	return &BandLU{n: n, kl: kl, ku: ku, w: w, a: make([]complex128, n*w), piv: make([]int, n), inv: make([]complex128, n)}
}

// Size is the number of unknowns.
func (b *BandLU) Size() int { return b.n }

// Clear zeroes the matrix for a new assembly.
func (b *BandLU) Clear() { clear(b.a) }

// Add adds v at row i, column j; it reports false, adding nothing, when
// the position lies outside the band.
func (b *BandLU) Add(i, j int, v complex128) bool {
	d := j - i
	if d < -b.kl || d > b.ku {
		return false
	}
	b.a[i*b.w+d+b.kl] += v
	return true
}

// Factor factorises the assembled matrix in place.
func (b *BandLU) Factor() error {
	n, kl, ku, w, a := b.n, b.kl, b.ku, b.w, b.a
	tiny, err := pivotFloor(a)
	if err != nil {
		return err
	}
	for k := 0; k < n; k++ {
		last := min(k+kl, n-1)
		p, best := k, abs1(a[k*w+kl])
		for i := k + 1; i <= last; i++ {
			if v := abs1(a[i*w+k-i+kl]); v > best {
				best, p = v, i
			}
		}
		b.piv[k] = p
		if best <= tiny {
			return ErrSingular
		}
		jmax := min(k+kl+ku, n-1)
		m := jmax - k + 1
		rk := a[k*w+kl : k*w+kl+m]
		if p != k {
			rp := a[p*w+k-p+kl : p*w+k-p+kl+m]
			for j := range rk {
				rk[j], rp[j] = rp[j], rk[j]
			}
		}
		// U's row k ends at its last nonzero, which shortens the updates
		for m > 1 && rk[m-1] == 0 {
			m--
		}
		rk = rk[:m]
		inv := recip(rk[0])
		b.inv[k] = inv
		for i := k + 1; i <= last; i++ {
			off := i*w + k - i + kl
			ri := a[off : off+m]
			if ri[0] == 0 {
				continue
			}
			l := ri[0] * inv
			ri[0] = l
			for j := 1; j < m; j++ {
				ri[j] -= l * rk[j]
			}
		}
	}
	return nil
}

// Solve overwrites x with the solution of A·x = x. It allocates nothing.
func (b *BandLU) Solve(x []complex128) {
	n, kl, ku, w, a := b.n, b.kl, b.ku, b.w, b.a
	for k := 0; k < n; k++ {
		if p := b.piv[k]; p != k {
			x[k], x[p] = x[p], x[k]
		}
		xk := x[k]
		if xk == 0 {
			continue
		}
		last := min(k+kl, n-1)
		for i := k + 1; i <= last; i++ {
			x[i] -= a[i*w+k-i+kl] * xk
		}
	}
	for i := n - 1; i >= 0; i-- {
		jmax := min(i+kl+ku, n-1)
		row := a[i*w+kl : i*w+kl+jmax-i+1]
		s := x[i]
		for j := 1; j < len(row); j++ {
			s -= row[j] * x[i+j]
		}
		x[i] = s * b.inv[i]
	}
}

// abs2 is |z|².
func abs2(z complex128) float64 { return real(z)*real(z) + imag(z)*imag(z) }

// modulus is |z|, as √(re²+im²) where the squares can neither overflow
// nor underflow, else by hypot: the square root alone costs less.
func modulus(z complex128) float64 {
	if s := abs2(z); s > 1e-290 && s < 1e290 {
		return math.Sqrt(s)
	}
	return cmplx.Abs(z)
}
