package circuits

import (
	"math"
	"math/cmplx"
)

// Wave is a voltage or current along a line as forward and backward
// travelling parts referred to end 1: X(z) = F·e^{−γz} + B·e^{γz}.
type Wave struct{ F, B complex128 }

// At is the wave's phasor at distance z for propagation constant g.
func (w Wave) At(g complex128, z float64) complex128 {
	// e^{−γz} = 1/e^{γz}: one exponential and one sine–cosine pair
	e := cmplx.Exp(g * complex(z, 0))
	return w.F*recip(e) + w.B*e
}

// Lin returns w0 + a·w1: the wave of a superposed solution.
func Lin(w0, w1 Wave, a complex128) Wave {
	return Wave{w0.F + a*w1.F, w0.B + a*w1.B}
}

// VoltageWaves returns the voltage and current waves of a line whose end 1
// has voltage v1 and current i1 into it.
func (l *LineSpec) VoltageWaves(v1, i1 complex128) (v, i Wave) {
	fv, bv, fi, bi := l.Waves(v1, i1)
	return Wave{fv, bv}, Wave{fi, bi}
}

// samplesPerHalfWave sets the scan density of MaxAlong before refinement:
// the standing wave repeats every half wavelength, and |X0| + r·|X1| has at
// most a few crests per repeat.
const samplesPerHalfWave = 32

// MaxAlong returns the largest value over 0 ≤ z ≤ Len of
//
//	g(z) = |w0(z)| + r·|w1(z)|
//
// and where it occurs, at f. With r = 0 it is the crest of one standing
// wave; with w0 = X0 + c·X1, w1 = X1 and r the radius of the circle that
// the superposition weight α runs on (centre c), it is the largest |X0 + α·X1|
// over the whole circle and the whole line, which no sampled load exceeds.
//
// For a lossy line the crests have no closed form, so the wave is scanned
// at 32 points per half wavelength, every scanned crest that could hold the
// maximum (its sample plus a Lipschitz bound on g over half a step reaches
// the best value so far) is bracketed by its neighbours and refined by
// golden-section search, and the result is never below any sample. A line of more than
// 20 000 half wavelengths is judged by its envelope instead (envelopeMax),
// an upper bound.
func (l *LineSpec) MaxAlong(f float64, w0, w1 Wave, r float64) (max, at float64) {
	g := l.Gamma(f)
	L := l.Len
	eval := func(z float64) float64 {
		v := modulus(w0.At(g, z))
		if r > 0 {
			v += r * modulus(w1.At(g, z))
		}
		return v
	}
	if !(L > 0) {
		return eval(0), 0
	}
	n := 2
	if b := imag(g); b > 0 {
		hw := L / (math.Pi / b) // half wavelengths along the line
		if hw > maxHalfWaves {
			return envelopeMax(g, L, w0, w1, r)
		}
		n = int(math.Ceil(hw * samplesPerHalfWave))
	}
	if n < 2 {
		n = 2
	}
	h := L / float64(n)
	// Lipschitz bound: |X'(z)| = |γ|·|−F e^{−γz} + B e^{γz}| ≤ |γ|(|F| + |B|·e^{αL}) for α ≥ 0
	grow := math.Exp(real(g) * L)
	lip := cmplx.Abs(g) * (cmplx.Abs(w0.F) + cmplx.Abs(w0.B)*grow + r*(cmplx.Abs(w1.F)+cmplx.Abs(w1.B)*grow))
	z := func(k int) float64 {
		if k >= n {
			return L
		}
		return float64(k) * h
	}
	// pass 1: the best sample, and the crests of the samples (a sample
	// not below either neighbour), kept while they fit in crests
	var crests [64]struct {
		k int
		v float64
	}
	nc, overflow := 0, false
	prev2, prev := math.Inf(-1), eval(0)
	best, bestZ := prev, 0.0
	for k := 1; k <= n+1; k++ {
		next := math.Inf(-1)
		if k <= n {
			next = eval(z(k))
			if next > best {
				best, bestZ = next, z(k)
			}
		}
		if prev >= prev2 && prev >= next {
			if nc < len(crests) {
				crests[nc].k, crests[nc].v = k-1, prev
				nc++
			} else {
				overflow = true
			}
		}
		prev2, prev = prev, next
	}
	// pass 2: refine each crest that could beat the best so far. Every
	// point of a crest's bracket [z(k−1), z(k+1)] lies within h/2 of one
	// of its three samples, none above the crest's, so g there is at
	// most the crest's sample plus lip·h/2
	refine := func(k int, v float64) {
		if v+lip*h/2 < best {
			return
		}
		lo, hi := z(k-1), z(k+1)
		if k-1 < 0 {
			lo = 0
		}
		// to 1e-7 of the bracket, which spans λ/16 of the wave's period
		// λ/2 or less: within δ ≤ 1e-8·λ of the crest its value is off by
		// about (2π·δ/λ)² ≈ 4e-15, rounding; finer steps chase noise
		if zm, gv := GoldenMax(eval, lo, hi, 1e-7*(hi-lo)); gv > best {
			best, bestZ = gv, zm
		}
	}
	if !overflow {
		for _, c := range crests[:nc] {
			refine(c.k, c.v)
		}
		return best, bestZ
	}
	// a line of more crests than kept: walk the samples again
	prev2, prev = math.Inf(-1), eval(0)
	for k := 1; k <= n+1; k++ {
		next := math.Inf(-1)
		if k <= n {
			next = eval(z(k))
		}
		if prev >= prev2 && prev >= next {
			refine(k-1, prev)
		}
		prev2, prev = prev, next
	}
	return best, bestZ
}

// maxHalfWaves bounds the scan: a line longer than this many half
// wavelengths (a harmonic far up a long run) is judged by its envelope.
const maxHalfWaves = 20000

// envelopeMax is an upper bound of |w0(z)| + r·|w1(z)|: each wave is at
// most |F|·e^{−αz} + |B|·e^{αz}, a convex function of z, so the bound is
// largest at an end. Over many half wavelengths the standing wave's crests
// reach this envelope to within the change of the envelope over one half
// wave, so the bound is close as well as safe.
func envelopeMax(g complex128, L float64, w0, w1 Wave, r float64) (float64, float64) {
	env := func(z float64) float64 {
		d, u := math.Exp(-real(g)*z), math.Exp(real(g)*z)
		v := cmplx.Abs(w0.F)*d + cmplx.Abs(w0.B)*u
		if r > 0 {
			v += r * (cmplx.Abs(w1.F)*d + cmplx.Abs(w1.B)*u)
		}
		return v
	}
	if a, b := env(0), env(L); b > a {
		return b, L
	}
	return env(0), 0
}

// GoldenMax finds the maximum of a unimodal f on [a, b] by golden-section
// search, narrowing the bracket to tol, ends included; it returns where and
// how large. Lines use it for their standing-wave crest, the engine for the
// transmitter's worst on the SWR circle.
func GoldenMax(f func(float64) float64, a, b, tol float64) (float64, float64) {
	const invPhi = 0.6180339887498949
	bx, bv := a, f(a)
	if v := f(b); v > bv {
		bx, bv = b, v
	}
	c, d := b-invPhi*(b-a), a+invPhi*(b-a)
	fc, fd := f(c), f(d)
	for i := 0; i < 60 && b-a > tol; i++ {
		if fc >= fd {
			b, d, fd = d, c, fc
			c = b - invPhi*(b-a)
			fc = f(c)
		} else {
			a, c, fc = c, d, fd
			d = a + invPhi*(b-a)
			fd = f(d)
		}
	}
	if fc > bv {
		bx, bv = c, fc
	}
	if fd > bv {
		bx, bv = d, fd
	}
	return bx, bv
}
