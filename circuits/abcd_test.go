package circuits

import (
	"fmt"
	"math"
	"math/cmplx"
	"math/rand/v2"
	"strings"
	"testing"
)

// A randomly drawn ladder: its netlist text and, beside it, a description
// from which the test computes the chain matrix on its own.

type refElem struct {
	kind  Kind
	value float64
	loss  lossModel
}

// z is the element's impedance at f, computed in the test (see
// refInductorZ and refCapacitorZ for the loss definitions).
func (e refElem) z(f float64) complex128 {
	switch e.kind {
	case Inductor:
		return refInductorZ(e.value, e.loss, f)
	case Capacitor:
		return refCapacitorZ(e.value, e.loss, f)
	}
	return complex(e.value, 0)
}

// arm shapes: one part, an L and C in series, an L and C in parallel.
const (
	armSingle = iota
	armSeriesLC
	armParallelLC
)

type refArm struct {
	shunt bool
	shape int
	parts []refElem
}

// z is the arm's impedance: one part, the sum (series LC) or the parallel
// combination (parallel LC).
func (a refArm) z(f float64) complex128 {
	switch a.shape {
	case armSeriesLC:
		return a.parts[0].z(f) + a.parts[1].z(f)
	case armParallelLC:
		z1, z2 := a.parts[0].z(f), a.parts[1].z(f)
		return z1 * z2 / (z1 + z2)
	}
	return a.parts[0].z(f)
}

// chain is the ladder's chain matrix: series arms [[1, Z], [0, 1]], shunt
// arms [[1, 0], [1/Z, 1]], cascaded in order (Pozar, ch. 4).
func chain(arms []refArm, f float64) abcd {
	m := identity
	for _, a := range arms {
		if a.shunt {
			m = m.then(shuntY(1 / a.z(f)))
		} else {
			m = m.then(seriesZ(a.z(f)))
		}
	}
	return m
}

// sig6 rounds x to the six significant digits the netlist text carries.
func sig6(x float64) float64 { return parseRef(fmt.Sprintf("%.6g", x)) }

// randLoss draws one of the ways a netlist states loss, and returns the
// attribute text for it.
func randLoss(r *rand.Rand, kind Kind) (lossModel, string) {
	switch kind {
	case Resistor:
		return lossModel{noLoss: true}, ""
	case Inductor:
		if r.IntN(2) == 0 {
			q := sig6(20 + 480*r.Float64())
			return lossModel{q: q}, fmt.Sprintf(" q=%.6g", q)
		}
	case Capacitor:
		switch r.IntN(4) {
		case 0:
			q := sig6(50 + 2000*r.Float64())
			return lossModel{q: q}, fmt.Sprintf(" q=%.6g", q)
		case 1:
			esr := sig6(0.005 + 0.5*r.Float64())
			return lossModel{esr: esr}, fmt.Sprintf(" esr=%.6gohm", esr)
		case 2:
			df := sig6(1e-4 + 0.02*r.Float64())
			return lossModel{df: df}, fmt.Sprintf(" df=%.6g", df)
		}
	}
	// Q points: three points at 2, 9 and 40 MHz, so the checks at 1 and
	// 60 MHz exercise the held ends and the others the interpolation.
	l := lossModel{}
	var parts []string
	for _, f := range []float64{2e6, 9e6, 40e6} {
		q := sig6(30 + 800*r.Float64())
		l.qf = append(l.qf, [2]float64{q, f})
		parts = append(parts, fmt.Sprintf("%.6g@%gM", q, f/1e6))
	}
	return l, " q=" + strings.Join(parts, ",")
}

// randPart draws a part value of the given kind: 0.05–20 µH, 5–3000 pF,
// 0.5–5000 Ω, spread evenly on a log scale.
func randPart(r *rand.Rand, kind Kind) (refElem, string) {
	logU := func(lo, hi float64) float64 {
		v := math.Exp(math.Log(lo) + r.Float64()*math.Log(hi/lo))
		return v
	}
	var v float64
	var text string
	switch kind {
	case Inductor:
		v = logU(0.05, 20)
		text = fmt.Sprintf("%.6gu", v)
		v *= 1e-6
	case Capacitor:
		v = logU(5, 3000)
		text = fmt.Sprintf("%.6gp", v)
		v *= 1e-12
	default:
		v = logU(0.5, 5000)
		text = fmt.Sprintf("%.6g", v)
	}
	// the test's value is the decimal written, read once
	loss, attr := randLoss(r, kind)
	return refElem{kind: kind, value: parseRef(text), loss: loss}, text + attr
}

// parseRef reads the test's own value text: a mantissa and an optional
// u or p, without the package's parser.
func parseRef(s string) float64 {
	mult := 1.0
	switch {
	case strings.HasSuffix(s, "u"):
		mult, s = 1e-6, strings.TrimSuffix(s, "u")
	case strings.HasSuffix(s, "p"):
		mult, s = 1e-12, strings.TrimSuffix(s, "p")
	}
	var v float64
	if _, err := fmt.Sscanf(s, "%g", &v); err != nil {
		panic(err)
	}
	return v * mult
}

// randLadder draws a ladder of 2 to 8 arms and writes its netlist. Part
// ends are written in random order (a two-terminal part has no polarity).
func randLadder(r *rand.Rand, outZ string) (string, []refArm) {
	return randLadderN(r, outZ, 2+r.IntN(7))
}

// randLadderN draws a ladder of nArms arms.
func randLadderN(r *rand.Rand, outZ string, nArms int) (string, []refArm) {
	var b strings.Builder
	b.WriteString("title random ladder\nport in n0 z=50\n")
	node, extra, idx := 0, 0, 0
	var arms []refArm
	kinds := []Kind{Inductor, Capacitor, Resistor}
	part := func(kind Kind, a, bn string) refElem {
		idx++
		e, text := randPart(r, kind)
		if r.IntN(2) == 0 {
			a, bn = bn, a
		}
		fmt.Fprintf(&b, "%s P%d %s %s %s\n", kind, idx, a, bn, text)
		return e
	}
	series := false
	for i := 0; i < nArms; i++ {
		// mostly alternate, sometimes two of a kind in a row
		if i > 0 && r.IntN(4) != 0 {
			series = !series
		} else if i == 0 {
			series = r.IntN(2) == 0
		}
		arm := refArm{shunt: !series, shape: r.IntN(3)}
		from := fmt.Sprintf("n%d", node)
		to := "gnd"
		if series {
			node++
			to = fmt.Sprintf("n%d", node)
		}
		switch arm.shape {
		case armSingle:
			arm.parts = []refElem{part(kinds[r.IntN(3)], from, to)}
		case armSeriesLC:
			extra++
			mid := fmt.Sprintf("m%d", extra)
			if r.IntN(2) == 0 {
				arm.parts = []refElem{part(Inductor, from, mid), part(Capacitor, mid, to)}
			} else {
				arm.parts = []refElem{part(Capacitor, from, mid), part(Inductor, mid, to)}
			}
		case armParallelLC:
			arm.parts = []refElem{part(Inductor, from, to), part(Capacitor, from, to)}
		}
		arms = append(arms, arm)
	}
	if node == 0 {
		// only shunt arms so far: close with a series arm to reach port out
		arm := refArm{shape: armSingle}
		arm.parts = []refElem{part(kinds[r.IntN(3)], "n0", "n1")}
		arms = append(arms, arm)
		node = 1
	}
	fmt.Fprintf(&b, "port out n%d z=%s\n", node, outZ)
	return b.String(), arms
}

// cmpCheck is one quantity from the package against its reference.
type cmpCheck struct {
	what      string
	got, want complex128
	worst     *float64 // the largest error seen for this kind of quantity
}

// TestLadderAgainstABCD: for random lossy ladders of series and shunt
// arms (single parts, series LC, parallel LC; Q, Q points, esr and df
// losses), the MNA solution must equal an ABCD cascade computed in the
// test (Pozar, Microwave Engineering, ch. 4, ABCD table) to 1e-9
// relative: S21 and S11 (Pozar for 50 Ω ports; Kurokawa 1965 power waves
// for a complex port), S12 = S21 (reciprocity: AD − BC = 1), S22, the
// input impedance, and a full Solve's load current and voltages for
// several loads.
func TestLadderAgainstABCD(t *testing.T) {
	r := rand.New(rand.NewPCG(2024, 7))
	outZs := []string{"50", "50", "12.5-j180", "200+j75", "3+j0"}
	loads := []Load{{Z: 50}, {Z: complex(12.5, -180)}, {Z: complex(1000, 500)}, {Z: complex(0.5, 0)}, Short, OpenLoad}
	freqs := []float64{1e6, 3.7e6, 10e6, 28e6, 60e6}
	var worstS, worstZ, worstI float64
	const tol = 1e-9
	const pAvail = 100.0
	for trial := 0; trial < 200; trial++ {
		outZ := outZs[trial%len(outZs)]
		text, arms := randLadder(r, outZ)
		name := fmt.Sprintf("ladder%d.net", trial)
		nl, c := mustParse(t, name, text)
		z1, z2 := nl.In.Z, nl.Out.Z
		for _, f := range freqs {
			m := chain(arms, f)
			sp, err := c.TwoPort(f)
			if err != nil {
				t.Fatalf("%s at %g Hz: %v", name, f, err)
			}
			var wantS21 complex128
			if z2 == 50 {
				wantS21 = m.s21Pozar(50)
			} else {
				wantS21 = m.s21Power(z1, z2)
			}
			checks := []cmpCheck{
				{"S21", sp.S21, wantS21, &worstS},
				{"S12", sp.S12, wantS21, &worstS},
				{"S11", sp.S11, gammaPower(m.zin(z2), z1), &worstS},
				{"S22", sp.S22, gammaPower(m.zout(z1), z2), &worstS},
				{"Zin", sp.Zin, m.zin(z2), &worstZ},
			}
			for _, ld := range loads {
				res, err := c.Solve(f, pAvail, ld)
				if err != nil {
					t.Fatalf("%s at %g Hz: %v", name, f, err)
				}
				// EMF for the available power: |E|²/(4·Re Zs) = P
				e := complex(2*math.Sqrt(pAvail*real(z1)), 0)
				label := fmt.Sprintf("load %v", ld)
				if ld.Open {
					checks = append(checks, cmpCheck{label + " Vout", res.Vout, m.openVoltage(e, z1), &worstI})
					if m.C == 0 {
						continue // only series arms: no current flows, Zin is unbounded
					}
					zinOpen := m.A / m.C
					checks = append(checks, cmpCheck{label + " Zin", res.Zin, zinOpen, &worstZ})
					continue
				}
				il := m.loadCurrent(e, z1, ld.Z)
				zin := m.zin(ld.Z)
				checks = append(checks, []cmpCheck{
					{label + " Iout", res.Iout, il, &worstI},
					{label + " Vout", res.Vout, ld.Z * il, &worstI},
					{label + " Zin", res.Zin, zin, &worstZ},
					{label + " Vin", res.Vin, e * zin / (zin + z1), &worstI},
				}...)
			}
			for _, ck := range checks {
				if ck.want == 0 {
					continue // a short's Vout: zero both ways
				}
				e := relErr(ck.got, ck.want)
				*ck.worst = math.Max(*ck.worst, e)
				if !(e <= tol) || cmplx.IsNaN(ck.want) {
					t.Errorf("%s at %g Hz: %s = %v, ABCD cascade %v (relative error %.2g)\n%s", name, f, ck.what, ck.got, ck.want, e, text)
				}
			}
		}
	}
	t.Logf("ABCD cascade: largest relative error S-parameters %.3g, impedances %.3g, load current and voltages %.3g", worstS, worstZ, worstI)
}
