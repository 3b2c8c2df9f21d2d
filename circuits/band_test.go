package circuits

import (
	"fmt"
	"math"
	"math/cmplx"
	"math/rand/v2"
	"sort"
	"strings"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// gonumSolve solves the dense complex system a·x = b (row-major n×n) with
// gonum's real LU (LAPACK-style dgetrf, partial pivoting) on the real
// 2n×2n embedding [[Re A, −Im A], [Im A, Re A]]: a solver written and
// tested outside this project.
func gonumSolve(t testing.TB, n int, a, b []complex128) []complex128 {
	t.Helper()
	x, err := gonumTry(n, a, b)
	if err != nil {
		t.Fatalf("gonum: %v", err)
	}
	return x
}

// gonumTry is gonumSolve reporting a singular matrix instead of failing.
func gonumTry(n int, a, b []complex128) ([]complex128, error) {
	emb := mat.NewDense(2*n, 2*n, nil)
	rb := mat.NewVecDense(2*n, nil)
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			z := a[i*n+j]
			emb.Set(i, j, real(z))
			emb.Set(i, j+n, -imag(z))
			emb.Set(i+n, j, imag(z))
			emb.Set(i+n, j+n, real(z))
		}
		rb.SetVec(i, real(b[i]))
		rb.SetVec(i+n, imag(b[i]))
	}
	var lu mat.LU
	lu.Factorize(emb)
	var rx mat.VecDense
	if err := lu.SolveVecTo(&rx, false, rb); err != nil {
		return nil, err
	}
	x := make([]complex128, n)
	for i := range x {
		x[i] = complex(rx.AtVec(i), rx.AtVec(i+n))
	}
	return x, nil
}

// maxDiff is the largest |x − ref| and the largest |ref|.
func maxDiff(x, ref []complex128) (diff, norm float64) {
	for i := range x {
		norm = math.Max(norm, cmplx.Abs(ref[i]))
		diff = math.Max(diff, cmplx.Abs(x[i]-ref[i]))
	}
	return diff, norm
}

// TestBandLUAgreesWithGonum: the band LU against gonum's dense LU on
// random band matrices of every shape from tridiagonal to wide, including
// ones with a zero or tiny diagonal so that row interchanges are needed,
// each with three right-hand sides on one factorisation. Tolerance 1e-9
// of the solution's scale: both are backward-stable eliminations with
// partial pivoting on systems kept well conditioned, so they agree to
// within a few hundred roundings.
func TestBandLUAgreesWithGonum(t *testing.T) {
	rng := rand.New(rand.NewPCG(16, 1))
	var worst float64
	pivoted := 0
	for trial := 0; trial < 300; trial++ {
		n := 1 + rng.IntN(60)
		kl, ku := rng.IntN(6), rng.IntN(6)
		a := make([]complex128, n*n)
		b := NewBandLU(n, kl, ku)
		for i := 0; i < n; i++ {
			for j := max(0, i-kl); j <= min(n-1, i+ku); j++ {
				v := complex(rng.NormFloat64(), rng.NormFloat64())
				if i == j {
					switch trial % 3 {
					case 0: // dominant diagonal: no interchange needed
						v += complex(float64(kl+ku+2)*2, 0)
					case 1: // zero diagonal: interchanges are forced
						if kl > 0 {
							v = 0
						}
					}
				}
				a[i*n+j] = v
				if !b.Add(i, j, v) {
					t.Fatalf("(%d,%d) inside kl=%d ku=%d refused", i, j, kl, ku)
				}
			}
		}
		if err := b.Factor(); err != nil {
			continue // a random draw may be singular; gonum is not asked then
		}
		for k := range b.piv {
			if b.piv[k] != k {
				pivoted++
				break
			}
		}
		for k := 0; k < 3; k++ {
			rhs := make([]complex128, n)
			for i := range rhs {
				rhs[i] = complex(rng.NormFloat64(), rng.NormFloat64())
			}
			// keep to systems whose condition lets the comparison mean
			// something: gonum finds them regular and the solution is no
			// larger than 1e6 of the data
			ref, err := gonumTry(n, a, rhs)
			if err != nil {
				continue
			}
			x := append([]complex128(nil), rhs...)
			b.Solve(x)
			diff, norm := maxDiff(x, ref)
			if norm > 1e6 {
				continue
			}
			worst = math.Max(worst, diff/norm)
			if diff > 1e-9*norm {
				t.Errorf("trial %d n=%d kl=%d ku=%d rhs %d: max difference %.3g against gonum (scale %.3g)", trial, n, kl, ku, k, diff, norm)
			}
		}
	}
	if pivoted < 50 {
		t.Errorf("only %d factorisations interchanged rows; the check must exercise pivoting", pivoted)
	}
	t.Logf("band LU vs gonum: largest relative difference %.3g; %d factorisations interchanged rows", worst, pivoted)
}

// ladderNet writes a lowpass ladder of the given number of sections, each
// a series coil and a shunt capacitor near the constant-k values for
// 50 Ω and a 60 MHz cutoff (L = R0/(πfc), C = 1/(πfc·R0); Zverev 1967,
// image-parameter filters), drawn ±10 % so no two sections are alike, with
// random Q. It returns the text and the arms for the ABCD reference.
func ladderNet(r *rand.Rand, sections int) (string, []refArm) {
	const r0, fc = 50.0, 60e6
	lk, ck := r0/(math.Pi*fc), 1/(math.Pi*fc*r0)
	var b strings.Builder
	b.WriteString("title long ladder\nport in n0 z=50\n")
	var arms []refArm
	for s := 1; s <= sections; s++ {
		l := sig6(lk * 1e6 * (0.9 + 0.2*r.Float64()))
		c := sig6(ck * 1e12 * (0.9 + 0.2*r.Float64()))
		ql := sig6(80 + 200*r.Float64())
		qc := sig6(300 + 1500*r.Float64())
		fmt.Fprintf(&b, "inductor L%d n%d n%d %.6gu q=%.6g\n", s, s-1, s, l, ql)
		fmt.Fprintf(&b, "capacitor C%d n%d gnd %.6gp q=%.6g\n", s, s, c, qc)
		arms = append(arms,
			refArm{shape: armSingle, parts: []refElem{{kind: Inductor, value: l * 1e-6, loss: lossModel{q: ql}}}},
			refArm{shunt: true, shape: armSingle, parts: []refElem{{kind: Capacitor, value: c * 1e-12, loss: lossModel{q: qc}}}})
	}
	fmt.Fprintf(&b, "port out n%d z=50\n", sections)
	return b.String(), arms
}

// TestLadderOrderedAsBand: reverse Cuthill–McKee finds the ladder's
// structure. The MNA graph of a series-L, shunt-C ladder with its load
// branch is a path (node, coil branch, node, …, load branch), and a path
// has bandwidth 1 (graph theory: consecutive numbering along it), so the
// band solver must see one sub- and one super-diagonal however long the
// ladder is, whatever order the netlist lists the parts in.
func TestLadderOrderedAsBand(t *testing.T) {
	r := rand.New(rand.NewPCG(16, 2))
	for _, sections := range []int{20, 200, 2000} {
		text, _ := ladderNet(r, sections)
		lines := strings.Split(text, "\n")
		body := lines[2 : len(lines)-2]
		r.Shuffle(len(body), func(i, j int) { body[i], body[j] = body[j], body[i] })
		_, c := mustParse(t, "ladder.net", strings.Join(lines, "\n"))
		fz, err := c.Factor(7e6, &Load{Z: 50})
		if err != nil {
			t.Fatal(err)
		}
		kl, ku, ok := fz.Banded()
		if !ok || kl != 1 || ku != 1 {
			t.Errorf("%d sections: band %d/%d (banded %v), want 1/1", sections, kl, ku, ok)
		}
	}
}

// TestLongLadderAgainstABCD: a 300-section ladder (601 unknowns) solved
// by the band solver against the ABCD cascade computed in the test
// (Pozar, Microwave Engineering, ch. 4), in the passband where its
// response is of order one: load current, input impedance and Voc through
// Split for several loads, and S21 from one reused two-port work.
// Tolerance 1e-8 relative: both are exact
// methods; 600 cascaded roundings in the reference and the elimination
// leave well under that.
func TestLongLadderAgainstABCD(t *testing.T) {
	r := rand.New(rand.NewPCG(16, 3))
	text, arms := ladderNet(r, 300)
	_, c := mustParse(t, "ladder.net", text)
	const pAvail = 100.0
	e := complex(2*math.Sqrt(pAvail*50), 0)
	var worst float64
	tw := NewTwoPortWork(c) // reused across frequencies, as a sweep does
	for _, f := range []float64{1e6, 7.1e6, 28e6} {
		m := chain(arms, f)
		sp, err := tw.At(f)
		if err != nil {
			t.Fatal(err)
		}
		if d := relErr(sp.S21, m.s21Pozar(50)); !(d <= 1e-8) {
			t.Errorf("f=%g: S21 %v, ABCD %v (relative %.2g)", f, sp.S21, m.s21Pozar(50), d)
		}
		for _, ld := range []Load{{Z: 50}, {Z: complex(12.5, -40)}, {Z: 200}} {
			res, err := c.Solve(f, pAvail, ld)
			if err != nil {
				t.Fatal(err)
			}
			il := m.loadCurrent(e, 50, ld.Z)
			for _, ck := range []cmpCheck{{"Iout", res.Iout, il, nil}, {"Zin", res.Zin, m.zin(ld.Z), nil}} {
				d := relErr(ck.got, ck.want)
				worst = math.Max(worst, d)
				if !(d <= 1e-8) {
					t.Errorf("f=%g load %v: %s = %v, ABCD %v (relative %.2g)", f, ld.Z, ck.what, ck.got, ck.want, d)
				}
			}
		}
		s, w := NewSplit(c), NewSplitWork(c)
		if err := w.Fill(s, f); err != nil {
			t.Fatal(err)
		}
		if _, _, ok := w.fz.Banded(); !ok {
			t.Errorf("the split of a 300-section ladder should use the band solver")
		}
		if d := relErr(s.Voc, m.openVoltage(1, 50)); !(d <= 1e-8) {
			t.Errorf("f=%g: Voc %v, ABCD %v", f, s.Voc, m.openVoltage(1, 50))
		}
	}
	t.Logf("300-section ladder vs ABCD cascade: largest relative error %.3g", worst)
}

// TestBandFactorizationAgreesWithGonum: every test netlist, a long
// ladder and random ladders, sent through the band path (forced even
// where the dense LU would be chosen), against gonum's dense LU of the
// same matrix assembled in the original order. Tolerance as in
// TestLUAgreesWithGonum (1e-9 of the scale).
func TestBandFactorizationAgreesWithGonum(t *testing.T) {
	defer func(v float64) { bandBelow = v }(bandBelow)
	bandBelow = math.Inf(1)
	rng := rand.New(rand.NewPCG(16, 4))
	nets := goodNetlists(t)
	names := sortedKeys(nets)
	long, _ := ladderNet(rng, 60)
	nets["long"] = long
	names = append(names, "long")
	for i := 0; i < 20; i++ {
		text, _ := randLadderN(rng, "50", 10+rng.IntN(30))
		name := fmt.Sprintf("random%d", i)
		nets[name] = text
		names = append(names, name)
	}
	var worst float64
	for _, name := range names {
		_, c := mustParse(t, name, nets[name])
		for _, f := range []float64{1e6, 7.1e6, 30e6} {
			for _, load := range []*Load{nil, {Z: 50}, {Z: complex(3, 40)}, &Short} {
				fz, err := c.Factor(f, load)
				if err != nil {
					t.Fatalf("%s: %v", name, err)
				}
				if _, _, ok := fz.Banded(); !ok {
					t.Fatalf("%s: band path not taken", name)
				}
				a := fz.dense()
				for k := 0; k < 2; k++ {
					b := make([]complex128, fz.N())
					for i := range b {
						b[i] = complex(rng.NormFloat64(), rng.NormFloat64())
					}
					ref := gonumSolve(t, fz.N(), a, b)
					fz.Solve(b)
					diff, norm := maxDiff(b, ref)
					worst = math.Max(worst, diff/norm)
					if diff > 1e-9*norm {
						t.Errorf("%s f=%g load %v: max difference %.3g against gonum (scale %.3g)", name, f, load, diff, norm)
					}
				}
			}
		}
	}
	t.Logf("band factorisation vs gonum on %d netlists: largest relative difference %.3g", len(names), worst)
}

// freqKind is a test-only kind whose pattern changes with frequency: above
// 10 MHz it couples its two nodes, below it stamps only to ground. A
// factorisation planned at a low frequency must notice the new positions
// and order again rather than drop them.
type freqKind struct{}

func (freqKind) Branches(*Element) int { return 0 }
func (freqKind) Stamp(e *Element, s *System, f float64) {
	y := complex(1/e.Value, 0)
	if f > 10e6 {
		s.Admit(e.A, e.B, y)
		return
	}
	s.Admit(e.A, -1, y)
	s.Admit(e.B, -1, y)
}
func (freqKind) State(e *Element, s *System, x []complex128, f float64, st *PartState) {
	*st = PartState{}
}
func (freqKind) LossR(e *Element, f float64) float64 { return 0 }

func TestBandWidensForNewPositions(t *testing.T) {
	Register(&KindSpec{Kind: "testfreqkind", Unit: "ohm", Example: "50", Model: freqKind{},
		Syntax: Keyword{Fields: []string{"name", "node", "node", "value"}, Attrs: resistorAttrs}})
	defer func() { delete(kindSpecs, "testfreqkind"); delete(Keywords, "testfreqkind") }()
	r := rand.New(rand.NewPCG(16, 5))
	text, _ := ladderNet(r, 100)
	// a bridge from the input to the far end, through the test kind
	text += "testfreqkind X1 n0 n100 1k\n"
	_, c := mustParse(t, "bridge.net", text)
	fz, err := c.Factor(1e6, &Load{Z: 50})
	if err != nil {
		t.Fatal(err)
	}
	if err := fz.Refactor(20e6); err != nil {
		t.Fatal(err)
	}
	b := make([]complex128, fz.N())
	b[c.In] = 1
	ref := gonumSolve(t, fz.N(), fz.dense(), b)
	fz.Solve(b)
	if diff, norm := maxDiff(b, ref); diff > 1e-9*norm {
		t.Errorf("after widening: max difference %.3g against gonum (scale %.3g)", diff, norm)
	}
}

// TestRCMIsPermutation: the ordering numbers every unknown once, for
// graphs with several components and isolated vertices.
func TestRCMIsPermutation(t *testing.T) {
	rng := rand.New(rand.NewPCG(16, 6))
	for trial := 0; trial < 50; trial++ {
		n := 1 + rng.IntN(40)
		p := &pattern{n: n}
		for k := rng.IntN(3 * n); k > 0; k-- {
			p.add(rng.IntN(n), rng.IntN(n))
		}
		perm := rcmOrder(p.adjacency())
		got := append([]int(nil), perm...)
		sort.Ints(got)
		for i, v := range got {
			if v != i {
				t.Fatalf("trial %d: not a permutation: %v", trial, perm)
			}
		}
	}
}

// TestRecip: Smith's reciprocal against the runtime's complex division,
// to rounding (1e-15 relative, a few ulp), over magnitudes from 1e-150 to 1e150 and every
// quadrant, and exact on the axes.
func TestRecip(t *testing.T) {
	rng := rand.New(rand.NewPCG(16, 7))
	for k := 0; k < 10000; k++ {
		m := math.Pow(10, -150+300*rng.Float64())
		th := 2 * math.Pi * rng.Float64()
		z := complex(m*math.Cos(th), m*math.Sin(th))
		want := 1 / z
		if d := cmplx.Abs(recip(z)-want) / cmplx.Abs(want); d > 1e-15 {
			t.Fatalf("1/%v: %v, runtime %v", z, recip(z), want)
		}
	}
	for _, z := range []complex128{2, -4, 0.5i, -8i} {
		if recip(z) != 1/z {
			t.Errorf("1/%v: %v, want %v", z, recip(z), 1/z)
		}
	}
}
