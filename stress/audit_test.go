package stress

import (
	"math"
	"math/cmplx"
	"strconv"
	"testing"

	"rfstress/circuits"
	"rfstress/ratings"
)

const coreLine = "core K1 od=16mm id=8mm h=6mm material=iron mu=10\n"

// the 7-pole 0.1 dB Chebyshev lowpass used by several checks, cutoff 9 MHz
func testLowpass(extra string) string {
	return lowpassNetlist(chebyshevG(7, 0.1), 9e6, 50, 250, "vpk=1k", "core=K1 turns=14", coreLine+extra)
}

// caseQuantities solves case cs by a full, independent MNA solve (with the
// load in the matrix) and returns each part's peak voltage, RMS current,
// dissipation and peak flux linkage for the carrier alone.
func fullSolve(t *testing.T, c *circuits.Circuit, f, p float64, l circuits.Load) *circuits.Result {
	t.Helper()
	r, err := c.Solve(f, p, l)
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// The worst case over the SWR circle, the faults and explicit loads equals
// a brute-force scan of full solves, case by case (issue check: worst case
// over the SWR circle equals a brute-force scan of full solves).
func TestWorstEqualsBruteForce(t *testing.T) {
	fx := build(t, testLowpass(""), "band=6.9M:7.4M", "points=5", "swr=3", "phases=72",
		"faults=open,short", "load=12.5-j180", "harmonics=none", "mode=carrier", "carrier-also=14.1M")
	sec, err := fx.eng.Audit()
	if err != nil {
		t.Fatal(err)
	}
	n := len(fx.c.Elements)
	worstV, worstI, worstP, worstB := make([]float64, n), make([]float64, n), make([]float64, n), make([]float64, n)
	// every case, the exact worst loads of the SWR circle included: each
	// case's load, solved in full, must reproduce the engine's figures
	for i := 0; i < fx.eng.NumCases()+len(sec.Extra); i++ {
		cs := sec.Case(i)
		r := fullSolve(t, fx.c, cs.F, 100, cs.Load)
		for k, ps := range r.Parts {
			worstV[k] = math.Max(worstV[k], math.Sqrt2*cmplx.Abs(ps.V))
			worstI[k] = math.Max(worstI[k], cmplx.Abs(ps.I))
			worstP[k] = math.Max(worstP[k], ps.Ploss)
			if rp := fx.rs.Parts[fx.c.Elements[k].Name]; rp.Core != nil {
				worstB[k] = math.Max(worstB[k], math.Sqrt2*cmplx.Abs(ps.Lambda)/(float64(rp.Turns)*rp.Core.Ae))
			}
		}
	}
	var worstErr float64
	defer func() {
		t.Logf("largest relative difference from brute force: %.2g over %d cases", worstErr, fx.eng.NumCases())
	}()
	for k, p := range sec.Parts {
		check := func(q ratings.Quantity, want float64) {
			got := p.Stress[q].Value
			worstErr = math.Max(worstErr, relErr(got, want))
			if e := relErr(got, want); e > 1e-9 {
				t.Errorf("%s %s: fast %g, brute force %g (rel %.2g)", p.Name, q, got, want, e)
			}
		}
		check(ratings.Vpk, worstV[k])
		check(ratings.Irms, worstI[k])
		if p.Kind != circuits.Inductor {
			check(ratings.Pdiss, worstP[k])
		}
		if p.Has(ratings.Bpk) {
			check(ratings.Bpk, worstB[k])
		}
	}
	if sec.NumCases != 6*(1+72+1+2) {
		t.Errorf("cases %d, want %d", sec.NumCases, 6*(1+72+1+2))
	}
}

// At a harmonic the load is the worst over the whole SWR circle, taken per
// harmonic; peaks add, RMS values add in squares. A dense scan of full
// solves approaches the analytic circle maximum from below.
func TestHarmonicCircleWorst(t *testing.T) {
	fx := build(t, testLowpass(""), "freq=7.1M", "swr=2.5", "phases=72", "harmonics=-10,-6", "harmonic-max=3", "mode=carrier")
	sec, err := fx.eng.Audit()
	if err != nil {
		t.Fatal(err)
	}
	const p = 100.0
	n := len(fx.c.Elements)
	// carrier: every case, the exact worst loads of the circle included
	carV := make([]float64, n)
	carI2 := make([]float64, n)
	for i := 0; i < fx.eng.NumCases()+len(sec.Extra); i++ {
		cs := sec.Case(i)
		r := fullSolve(t, fx.c, cs.F, p, cs.Load)
		for k, ps := range r.Parts {
			carV[k] = math.Max(carV[k], cmplx.Abs(ps.V))
			carI2[k] = math.Max(carI2[k], cmplx.Abs(ps.I))
		}
	}
	// harmonics: dense scan of the circle, each with its own worst load
	const dense = 20000
	harmV := make([]float64, n)
	harmI2 := make([]float64, n)
	for h, dbc := range []float64{-10, -6} {
		ph := p * math.Pow(10, dbc/10)
		mv, mi := make([]float64, n), make([]float64, n)
		for j := 0; j < dense; j++ {
			l := circuits.LoadOnCircle(fx.c.Zout, 2.5, 2*math.Pi*float64(j)/dense)
			r := fullSolve(t, fx.c, float64(h+2)*7.1e6, ph, l)
			for k, ps := range r.Parts {
				mv[k] = math.Max(mv[k], cmplx.Abs(ps.V))
				mi[k] = math.Max(mi[k], cmplx.Abs(ps.I))
			}
		}
		for k := range mv {
			harmV[k] += mv[k]
			harmI2[k] += mi[k] * mi[k]
		}
	}
	for k, part := range sec.Parts {
		// the worst carrier phase and the harmonic worst combine; the
		// engine's value may exceed the dense scan by the scan's gap only
		wantV := math.Sqrt2 * (carV[k] + harmV[k])
		got := part.Stress[ratings.Vpk].Value
		if got < wantV*(1-1e-9) || relErr(got, wantV) > 2e-6 {
			t.Errorf("%s vpk: engine %g, dense scan %g", part.Name, got, wantV)
		}
		wantI := math.Sqrt(carI2[k]*carI2[k] + harmI2[k])
		gotI := part.Stress[ratings.Irms].Value
		if gotI < wantI*(1-1e-9) || relErr(gotI, wantI) > 2e-6 {
			t.Errorf("%s irms: engine %g, dense scan %g", part.Name, gotI, wantI)
		}
	}
}

// The fast path (one factorisation, two excitations, superposition per
// load) equals a full solve with the load in the matrix, per load and part.
func TestFastPathEqualsFullSolve(t *testing.T) {
	fx := build(t, testLowpass(""), "freq=7.1M", "harmonics=none")
	s := circuits.NewSplit(fx.c)
	if err := circuits.NewSplitWork(fx.c).Fill(s, 7.1e6); err != nil {
		t.Fatal(err)
	}
	e := fx.c.EMFForPower(100)
	loads := []circuits.Load{circuits.Short, circuits.OpenLoad, {Z: 50}, {Z: 12.5 - 180i}, {Z: 3 + 40i}}
	for th := 0.0; th < 2*math.Pi; th += 0.3 {
		loads = append(loads, circuits.LoadOnCircle(fx.c.Zout, 5, th))
	}
	for _, l := range loads {
		r := fullSolve(t, fx.c, 7.1e6, 100, l)
		a := s.Alpha(l)
		for i := range fx.c.Elements {
			ps := s.Part(i, a, complex(e, 0))
			// superposition cancels terms where the full solve gives 0 (a
			// shorted port): the floor is rounding of the terms' size
			terms := func(x0, x1 complex128) float64 {
				return e * (cmplx.Abs(x0) + cmplx.Abs(a)*cmplx.Abs(x1))
			}
			p0, p1 := s.P[0][i], s.P[1][i]
			for _, pair := range [][3]complex128{{ps.V, r.Parts[i].V, complex(terms(p0.V, p1.V), 0)}, {ps.I, r.Parts[i].I, complex(terms(p0.I, p1.I), 0)}, {ps.Lambda, r.Parts[i].Lambda, complex(terms(p0.Lambda, p1.Lambda), 0)}} {
				if d := cmplx.Abs(pair[0] - pair[1]); d > 1e-9*cmplx.Abs(pair[1])+1e-13*real(pair[2])+1e-15 {
					t.Fatalf("load %v part %d: fast %v full %v", l, i, pair[0], pair[1])
				}
			}
		}
	}
}

// Square preset: an ideal square wave has only odd harmonics, each at 1/n
// of the fundamental's amplitude (Fourier series of a square wave). The
// reference integrates the series coefficients numerically.
func TestSquarePresetIsFourierSeries(t *testing.T) {
	const samples = 200000
	coef := func(n int) float64 {
		var s float64
		for i := 0; i < samples; i++ {
			x := 2 * math.Pi * (float64(i) + 0.5) / samples
			v := 1.0
			if x >= math.Pi {
				v = -1
			}
			s += v * math.Sin(float64(n)*x)
		}
		return 2 * s / samples
	}
	b1 := coef(1)
	if math.Abs(b1-4/math.Pi) > 1e-6 {
		t.Fatalf("b1 = %g, want 4/π", b1)
	}
	h, _ := harmonicByName("square")
	for n := 2; n <= 9; n++ {
		bn := coef(n)
		got := h.DBc[n-2]
		if n%2 == 0 {
			if math.Abs(bn) > 1e-6 || !math.IsInf(got, -1) {
				t.Errorf("harmonic %d: series %g, preset %g dBc (want absent)", n, bn, got)
			}
			continue
		}
		want := 20 * math.Log10(math.Abs(bn)/b1)
		if math.Abs(got-want) > 1e-3 {
			t.Errorf("harmonic %d: preset %.4f dBc, series %.4f dBc", n, got, want)
		}
	}
}

// The network is linear: 4× the power gives 2× voltage, current and flux
// and 4× dissipation (common practice; Ohm's law).
func TestPowerScaling(t *testing.T) {
	a := build(t, testLowpass(""), "freq=7.1M", "swr=2", "power=100", "faults=open,short")
	b := build(t, testLowpass(""), "freq=7.1M", "swr=2", "power=400", "faults=open,short")
	sa, _ := a.eng.Audit()
	sb, _ := b.eng.Audit()
	for i, p := range sa.Parts {
		q := sb.Parts[i]
		for _, c := range []struct {
			q ratings.Quantity
			f float64
		}{{ratings.Vpk, 2}, {ratings.Irms, 2}, {ratings.Pdiss, 4}, {ratings.Bpk, 2}} {
			if !p.Has(c.q) {
				continue
			}
			if e := relErr(q.Stress[c.q].Value, c.f*p.Stress[c.q].Value); e > 1e-9 {
				t.Errorf("%s %s: ×4 power gives ×%g, want ×%g", p.Name, c.q, q.Stress[c.q].Value/p.Stress[c.q].Value, c.f)
			}
		}
	}
}

// Re-auditing at the safe power puts the limiting quantity exactly at its
// derated limit (linear scaling, common practice).
func TestSafePowerReaudit(t *testing.T) {
	src := testLowpass("")
	fx := build(t, src, "freq=7.1M", "swr=3", "faults=open", "power=100")
	sec, _ := fx.eng.Audit()
	if math.IsInf(sec.SafeW, 1) || sec.SafeW <= 0 {
		t.Fatalf("no safe power: %g", sec.SafeW)
	}
	again := build(t, src, "freq=7.1M", "swr=3", "faults=open", "power="+ftoa(sec.SafeW))
	s2, _ := again.eng.Audit()
	var part *PartResult
	for _, p := range s2.Parts {
		if p.Name == sec.LimitPart {
			part = p
		}
	}
	u := part.Stress[sec.LimitQ].Util
	t.Logf("safe power %.2f W set by %s %s; re-audit utilisation %.12f", sec.SafeW, sec.LimitPart, sec.LimitQ, u)
	if math.Abs(u-1) > 1e-9 {
		t.Errorf("at safe power %g W, %s %s uses %.12f of its derated limit, want 1", sec.SafeW, sec.LimitPart, sec.LimitQ, u)
	}
	if math.Abs(s2.SafeW/sec.SafeW-1) > 1e-9 {
		t.Errorf("safe power moved on re-audit: %g then %g", sec.SafeW, s2.SafeW)
	}
}

func ftoa(v float64) string { return formatG(v) }

func formatG(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

// Common practice: a 7-pole 0.1 dB Chebyshev lowpass with its cutoff about
// 1.25× the carrier attenuates the 3rd harmonic by well over 40 dB.
func TestChebyshevThirdHarmonic(t *testing.T) {
	const carrier = 7.1e6
	src := lowpassNetlist(chebyshevG(7, 0.1), 1.25*carrier, 50, 250, "", "", "")
	fx := build(t, src, "freq=7.1M")
	var h3 float64
	for _, h := range fx.eng.HarmonicLines() {
		if h.N == 3 {
			h3 = h.S21dB
		}
	}
	t.Logf("3rd harmonic attenuation %.1f dB", -h3)
	if !(h3 < -40) {
		t.Errorf("3rd harmonic attenuation %.1f dB, want well over 40 dB", -h3)
	}
}

// Common practice: with a 3:1 SWR the worst peak voltage on a lowpass's
// output capacitor exceeds the matched value by about 1+|Γ| (|Γ| = 0.5).
func TestMismatchRaisesOutputVoltage(t *testing.T) {
	src := testLowpass("")
	matched := build(t, src, "freq=7.1M", "harmonics=none")
	mis := build(t, src, "freq=7.1M", "harmonics=none", "swr=3", "phases=360")
	sm, _ := matched.eng.Audit()
	ss, _ := mis.eng.Audit()
	last := len(sm.Parts) - 1 // C7, the shunt capacitor at the antenna port
	r := ss.Parts[last].Stress[ratings.Vpk].Value / sm.Parts[last].Stress[ratings.Vpk].Value
	t.Logf("output capacitor: matched %.1f V peak, SWR 3 worst %.1f V peak, ratio %.3f", sm.Parts[last].Stress[ratings.Vpk].Value, ss.Parts[last].Stress[ratings.Vpk].Value, r)
	if r < 1.45 {
		t.Errorf("output capacitor voltage rises ×%.3f with SWR 3, want about 1.5 or more", r)
	}
}

// Common practice: a narrow two-resonator bandpass passing 100 W develops
// several hundred volts across its tank capacitors, several times the
// 100 V peak of the 50 Ω line.
func TestNarrowBandpassTankVoltage(t *testing.T) {
	// two parallel tanks, top-coupled, end-coupled by series capacitors:
	// passband near 6.5 MHz, a few per cent wide (values found by hand;
	// the test finds the peak by sweeping)
	src := `title two-resonator bandpass
port in a z=50
port out d z=50
capacitor C1 a b 120p q=2000
capacitor CT1 b gnd 290p q=2000
inductor L1 b gnd 1.4u q=200
capacitor C12 b c 24p q=2000
capacitor CT2 c gnd 290p q=2000
inductor L2 c gnd 1.4u q=200
capacitor C2 c d 120p q=2000
`
	nl, err := circuits.Parse("bp.net", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	c, _ := circuits.Build(nl)
	// the carrier is where the passband peaks
	best, bestF := -1e9, 0.0
	for f := 5e6; f < 9e6; f += 2e3 {
		sp, _ := c.TwoPort(f)
		if db := circuits.DB(sp.S21); db > best {
			best, bestF = db, f
		}
	}
	if best < -3 {
		t.Fatalf("bandpass passes only %.1f dB at best (%g Hz)", best, bestF)
	}
	fx := build(t, src, "freq="+formatG(bestF), "harmonics=none")
	sec, _ := fx.eng.Audit()
	for _, p := range sec.Parts {
		if p.Name == "CT1" || p.Name == "CT2" {
			v := p.Stress[ratings.Vpk].Value
			t.Logf("%s: %.0f V peak at %.4g MHz (insertion loss %.2f dB)", p.Name, v, bestF/1e6, -best)
			if v < 300 || v < 3*100 {
				t.Errorf("%s tank voltage %.0f V peak, want several hundred volts", p.Name, v)
			}
		}
	}
}

// The inner loop allocates nothing (issue check: testing.AllocsPerRun).
func TestCaseLoopAllocatesNothing(t *testing.T) {
	fx := build(t, testLowpass(""), "band=7M:7.3M", "swr=3", "faults=open,short", "load=20+j5")
	w := fx.eng.newWorkspace(fx.c)
	var nw nodeWorst
	if _, err := fx.eng.run(w); err != nil {
		t.Fatal(err)
	}
	allocs := testing.AllocsPerRun(200, func() {
		fx.eng.evalCase(w, 0, Matched, circuits.Load{Z: 50}, 7.1e6, &nw)
		fx.eng.circleCases(w, 1, 7.1e6, &nw)
	})
	if allocs != 0 {
		t.Errorf("case loop allocates %.1f times per run", allocs)
	}
}

// Tolerance trials give the same result whatever the number of workers.
func TestToleranceDeterministic(t *testing.T) {
	src := lowpassNetlist(chebyshevG(7, 0.1), 9e6, 50, 250, "vpk=1k tol=5% qtol=20%", "core=K1 turns=14 tol=5%", coreLine)
	fx := build(t, src, "freq=7.1M", "swr=2")
	a, err := fx.eng.Tolerance(TolOptions{Trials: 200, Seed: 7, Dist: "normal", Workers: 1})
	if err != nil {
		t.Fatal(err)
	}
	b, _ := fx.eng.Tolerance(TolOptions{Trials: 200, Seed: 7, Dist: "normal", Workers: 2})
	if a.SafeP01 != b.SafeP01 || a.SafeMed != b.SafeMed {
		t.Errorf("safe power differs with workers: %g/%g vs %g/%g", a.SafeP01, a.SafeMed, b.SafeP01, b.SafeMed)
	}
	for i := range a.Parts {
		for j := range a.Parts[i].Q {
			if a.Parts[i].Q[j] != b.Parts[i].Q[j] {
				t.Fatalf("part %s differs with workers", a.Parts[i].Name)
			}
		}
	}
	// the spread is real: the maximum exceeds the median
	if q := a.Parts[0].Q[0]; !(q.Max > q.Median) {
		t.Errorf("no spread in %s: median %g max %g", a.Parts[0].Name, q.Median, q.Max)
	}
}

// Delivered drive scales each case so that the network takes exactly the
// given power (Tellegen: source power = load power + dissipation), whatever
// the load; with a matched, nearly lossless filter it is the same as
// available drive.
func TestDeliveredDrive(t *testing.T) {
	src := testLowpass("")
	fx := build(t, src, "freq=7.1M", "harmonics=none", "drive=delivered", "swr=3", "phases=24", "mode=carrier")
	w := fx.eng.newWorkspace(fx.c)
	if err := w.sw.Fill(w.carr, 7.1e6); err != nil {
		t.Fatal(err)
	}
	for k := 0; k < 24; k++ {
		l := circuits.LoadOnCircle(fx.c.Zout, 3, 2*math.Pi*float64(k)/24)
		a := w.carr.Alpha(l)
		scale, _ := fx.eng.drive(w, a)
		r := fullSolve(t, fx.c, 7.1e6, 1, l) // 1 W available, then scale
		emf1 := fx.c.EMFForPower(1)
		pin := r.Pin * (scale / emf1) * (scale / emf1)
		if math.Abs(pin-100) > 1e-6 {
			t.Errorf("phase %d: network takes %.6f W, want 100 W", k, pin)
		}
	}
	avail := build(t, src, "freq=7.1M", "harmonics=none", "mode=carrier")
	deliv := build(t, src, "freq=7.1M", "harmonics=none", "mode=carrier", "drive=delivered")
	sa, _ := avail.eng.Audit()
	sd, _ := deliv.eng.Audit()
	for i := range sa.Parts {
		r := sd.Parts[i].Stress[ratings.Vpk].Value / sa.Parts[i].Stress[ratings.Vpk].Value
		if r < 1 || r > 1.01 {
			t.Errorf("%s: delivered/available voltage ratio %.4f into a matched load, want just above 1", sa.Parts[i].Name, r)
		}
	}
}
