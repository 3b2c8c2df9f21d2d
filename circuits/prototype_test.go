package circuits

import (
	"fmt"
	"math"
	"strings"
	"testing"
)

// Lowpass prototype element values (Matthaei, Young & Jones 1964,
// sec. 4.05; Zverev 1967), g[0] = 1 is the source conductance and g[1..n]
// the reactive elements.

// butterworthG returns g_k = 2·sin((2k−1)π/(2n)), k = 1…n.
func butterworthG(n int) []float64 {
	g := make([]float64, n+1)
	g[0] = 1
	for k := 1; k <= n; k++ {
		g[k] = 2 * math.Sin(float64(2*k-1)*math.Pi/float64(2*n))
	}
	return g
}

// chebyshevG returns the equal-ripple prototype for ripple lar dB:
// β = ln(coth(L_Ar/17.37)), γ = sinh(β/(2n)), a_k = sin((2k−1)π/(2n)),
// b_k = γ² + sin²(kπ/n), g_1 = 2a_1/γ, g_k = 4a_{k−1}a_k/(b_{k−1}g_{k−1}).
// The published 17.37 is 40/ln 10 rounded; the exact constant is used so
// that the design ripple and ε² = 10^{L_Ar/10} − 1 agree to full precision.
// For odd n the load conductance g_{n+1} is 1.
func chebyshevG(n int, lar float64) []float64 {
	beta := math.Log(1 / math.Tanh(lar/(40/math.Ln10)))
	gamma := math.Sinh(beta / float64(2*n))
	a := func(k int) float64 { return math.Sin(float64(2*k-1) * math.Pi / float64(2*n)) }
	b := func(k int) float64 {
		s := math.Sin(float64(k) * math.Pi / float64(n))
		return gamma*gamma + s*s
	}
	g := make([]float64, n+1)
	g[0] = 1
	g[1] = 2 * a(1) / gamma
	for k := 2; k <= n; k++ {
		g[k] = 4 * a(k-1) * a(k) / (b(k-1) * g[k-1])
	}
	return g
}

// chebyshevT is the Chebyshev polynomial T_n(x) for any real x.
func chebyshevT(n int, x float64) float64 {
	switch {
	case math.Abs(x) <= 1:
		return math.Cos(float64(n) * math.Acos(x))
	case x > 1:
		return math.Cosh(float64(n) * math.Acosh(x))
	}
	s := 1.0
	if n%2 == 1 {
		s = -1
	}
	return s * math.Cosh(float64(n)*math.Acosh(-x))
}

// ladderText writes a lowpass ladder scaled to r0 and cutoff fc:
// C = g/(ωc·R0), L = g·R0/ωc (Matthaei, Young & Jones 1964, sec. 4.04).
// shuntFirst puts g_1 in a shunt capacitor; otherwise g_1 is a series
// inductor (the dual form). Every part carries q=1e12: the package assumes
// a default Q when none is given, and these checks want lossless parts.
func ladderText(g []float64, r0, fc float64, shuntFirst bool) string {
	wc := 2 * math.Pi * fc
	var b strings.Builder
	n := len(g) - 1
	node := 1
	fmt.Fprintf(&b, "title lowpass prototype, n=%d\nport in n1 z=%g\n", n, r0)
	for k := 1; k <= n; k++ {
		shunt := (k%2 == 1) == shuntFirst
		if shunt {
			fmt.Fprintf(&b, "capacitor C%d n%d gnd %.17g q=1e12\n", k, node, g[k]/(wc*r0))
		} else {
			fmt.Fprintf(&b, "inductor L%d n%d n%d %.17g q=1e12\n", k, node, node+1, g[k]*r0/wc)
			node++
		}
	}
	fmt.Fprintf(&b, "port out n%d z=%g\n", node, r0)
	return b.String()
}

// insertionLossDB is −20·log10|S21| from the package's two-port solve.
func insertionLossDB(t *testing.T, c *Circuit, f float64) float64 {
	t.Helper()
	sp, err := c.TwoPort(f)
	if err != nil {
		t.Fatalf("TwoPort at %g Hz: %v", f, err)
	}
	return -DB(sp.S21)
}

// protoRatios are ω/ωc points from deep passband to deep stopband.
var protoRatios = []float64{0.01, 0.1, 0.3, 0.5, 0.7, 0.8, 0.9, 0.95, 0.99, 1, 1.01, 1.05, 1.1, 1.2, 1.5, 2, 3, 5, 10}

// TestButterworthPrototype: maximally flat response
// |S21|² = 1/(1 + (ω/ωc)^{2n}) (Matthaei, Young & Jones 1964, sec. 4.03 and
// 4.05), 3.01 dB at cutoff (10·log10 2, from the same formula).
func TestButterworthPrototype(t *testing.T) {
	const r0, fc = 50.0, 10e6
	var worst float64
	for _, n := range []int{1, 2, 3, 4, 5, 7, 9} {
		for _, shuntFirst := range []bool{true, false} {
			if n == 1 && shuntFirst {
				continue // one shunt part: both ports on one node, which the format rejects
			}
			_, c := mustParse(t, "butterworth.net", ladderText(butterworthG(n), r0, fc, shuntFirst))
			for _, x := range protoRatios {
				got := insertionLossDB(t, c, x*fc)
				want := 10 * math.Log10(1+math.Pow(x, float64(2*n)))
				e := math.Abs(got - want)
				worst = math.Max(worst, e)
				if e > 1e-6 {
					t.Errorf("Butterworth n=%d shuntFirst=%v at %.2f·fc: IL %.9f dB, closed form %.9f dB", n, shuntFirst, x, got, want)
				}
			}
			if il := insertionLossDB(t, c, fc); math.Abs(il-3.0103) > 1e-4 {
				t.Errorf("Butterworth n=%d: %.6f dB at cutoff, want 3.0103 dB", n, il)
			}
		}
	}
	t.Logf("Butterworth: largest insertion-loss error %.3g dB", worst)
}

// TestChebyshevPrototype: equal-ripple response
// |S21|² = 1/(1 + ε²·T_n²(ω/ωc)), ε² = 10^{L_Ar/10} − 1 (Matthaei, Young &
// Jones 1964, sec. 4.03 and 4.05). Odd n only: g_{n+1} = 1, so both ends
// are R0. The ripple peaks (|T_n| = 1 at ω/ωc = cos(kπ/n)) must reach the
// design ripple and the zeros of T_n must pass with no loss.
func TestChebyshevPrototype(t *testing.T) {
	const r0, fc = 50.0, 10e6
	var worst float64
	for _, n := range []int{3, 5, 7, 9} {
		for _, lar := range []float64{0.01, 0.1, 0.5, 1} {
			eps2 := math.Pow(10, lar/10) - 1
			closed := func(x float64) float64 {
				tn := chebyshevT(n, x)
				return 10 * math.Log10(1+eps2*tn*tn)
			}
			g := chebyshevG(n, lar)
			for _, shuntFirst := range []bool{true, false} {
				_, c := mustParse(t, "chebyshev.net", ladderText(g, r0, fc, shuntFirst))
				xs := append([]float64(nil), protoRatios...)
				var peaks, zeros []float64
				for k := 0; k < n; k++ {
					peaks = append(peaks, math.Cos(float64(k)*math.Pi/float64(n)))
					zeros = append(zeros, math.Cos(float64(2*k+1)*math.Pi/float64(2*n)))
				}
				xs = append(append(xs, peaks...), zeros...)
				for _, x := range xs {
					if x <= 0 {
						continue
					}
					got := insertionLossDB(t, c, x*fc)
					want := closed(x)
					e := math.Abs(got - want)
					worst = math.Max(worst, e)
					if e > 1e-6 {
						t.Errorf("Chebyshev n=%d %.2f dB shuntFirst=%v at %.4f·fc: IL %.9f dB, closed form %.9f dB", n, lar, shuntFirst, x, got, want)
					}
				}
				for _, x := range peaks {
					if x <= 0 {
						continue
					}
					if il := insertionLossDB(t, c, x*fc); math.Abs(il-lar) > 1e-6 {
						t.Errorf("Chebyshev n=%d: ripple peak at %.4f·fc is %.7f dB, design ripple %.2f dB", n, x, il, lar)
					}
				}
				for _, x := range zeros {
					if il := insertionLossDB(t, c, x*fc); math.Abs(il) > 1e-6 {
						t.Errorf("Chebyshev n=%d: %.7f dB at the transmission zero of T_n, %.4f·fc", n, il, x)
					}
				}
			}
		}
	}
	t.Logf("Chebyshev: largest insertion-loss error %.3g dB", worst)
}

// TestChebyshevTableValues checks the recurrence against two rows of the
// published element-value table (Matthaei, Young & Jones 1964, table
// 4.05-2(a), values from memory to four places): 0.1 dB, n=5:
// 1.1468 1.3712 1.9750; 0.5 dB, n=3: 1.5963 1.0967.
func TestChebyshevTableValues(t *testing.T) {
	check := func(g []float64, want []float64) {
		for i, w := range want {
			if math.Abs(g[i+1]-w) > 6e-5 {
				t.Errorf("g%d = %.5f, table %.4f", i+1, g[i+1], w)
			}
		}
	}
	check(chebyshevG(5, 0.1), []float64{1.1468, 1.3712, 1.9750, 1.3712, 1.1468})
	check(chebyshevG(3, 0.5), []float64{1.5963, 1.0967, 1.5963})
	check(butterworthG(3), []float64{1, 2, 1})
}
