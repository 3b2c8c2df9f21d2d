package stress

import (
	"math"
	"math/cmplx"

	"rfstress/circuits"
)

// A transmission line's stresses are not those of its terminals: the
// standing wave puts the peak voltage and the largest current somewhere
// along it, and its loss is the power into both ends. The engine asks its
// four port phasors (V, I at end 1; V2, I2 at end 2), which are linear in
// the load weight α like every part's state, and finds:
//
//	vpk, vrms, irms  the crest of the standing wave over the whole length
//	                 (circuits.LineSpec.MaxAlong, refined, never below a
//	                 scan), harmonics added by the usual combination rules
//	                 with each harmonic's own crest;
//	pdiss            P_in − P_out, Re(V·I*) + Re(V2·I2*);
//	pm               the dissipation per metre at the hottest point,
//	                 2α·max(Z0·|I|², |V|²/Z0) at the crests: all the loss
//	                 put in the conductor where the current peaks, or in the
//	                 dielectric where the voltage does, whichever is larger,
//	                 so it is never below the distortionless model's own
//	                 α·(|V|²/Z0 + Z0·|I|²).
//
// On the SWR circle the weight α runs on a circle (centre c, radius r) and
// the largest |X0 + α·X1| over the circle is |X0 + c·X1| + r·|X1| at every
// point of the line, so the worst over the continuous circle and the whole
// length is one MaxAlong; the dissipation over the circle has the closed
// form of a quadratic form on a circle (lineDiss).

// allQ marks every quantity.
var allQ = func() (m [nQ]bool) {
	for i := range m {
		m[i] = true
	}
	return
}()

// lineQ computes a line's quantities for the weight circle (c, r) at the
// carrier (r = 0: one load, α = c). It returns where the voltage and the
// current crest are and the weights that reach them.
func (e *Engine) lineQ(w *workspace, l *circuits.LineSpec, i, cls int, c complex128, r, scale, k, f float64) (q [nQ]float64, has [nQ]bool, av, ai, ap complex128) {
	s := w.carr
	v0, i0 := l.VoltageWaves(s.P[0][i].V, s.P[0][i].I)
	v1, i1 := l.VoltageWaves(s.P[1][i].V, s.P[1][i].I)
	vm, zv := l.MaxAlong(f, circuits.Lin(v0, v1, c), v1, r)
	im, zi := l.MaxAlong(f, circuits.Lin(i0, i1, c), i1, r)
	pd, ap := lineDiss(s, i, c, r)
	g := l.Gamma(f)
	av = crestAlpha(v0.At(g, zv), v1.At(g, zv), c, r)
	ai = crestAlpha(i0.At(g, zi), i1.At(g, zi), c, r)
	vm *= scale
	im *= scale
	pd *= scale * scale
	avg := e.Cond.AvgRatio
	pm := 2 * l.Alpha(f) * math.Max(l.Z0*im*im, vm*vm/l.Z0)
	// DC passes a line unchanged (an ideal line at f = 0): its voltage
	// between the conductors adds to the RF crest everywhere along it, its
	// current to the RMS current (a remote tuner fed over the coax; a pi
	// network's missing blocking capacitor)
	vdc, idc := math.Abs(w.dcV[i]), math.Abs(w.dcI[i])
	q[qVpk] = vdc + math.Sqrt2*(vm+k*w.hs[i][cls].pkV)
	q[qVrms] = math.Sqrt(vdc*vdc + vm*vm + k*k*w.hs[i][cls].sqV)
	q[qIrms] = math.Sqrt(idc*idc + (im*im+k*k*w.hs[i][cls].sqI)*avg)
	q[qPdiss] = (pd + k*k*w.hs[i][cls].sumP) * avg
	q[qPm] = (pm + k*k*w.hs[i][cls].pmH) * avg
	has[qVpk], has[qVrms], has[qIrms], has[qPdiss], has[qPm] = true, true, true, true, true
	return
}

// lineDC sets the DC share of line i's stresses for keep (safe power
// scales only the RF share).
func (e *Engine) lineDC(w *workspace, i int) {
	vdc, idc := math.Abs(w.dcV[i]), math.Abs(w.dcI[i])
	w.dcq[qVpk], w.dcq[qVrms], w.dcq[qIrms] = vdc, vdc, idc
}

// evalLine keeps a line's quantities at one case (weight circle (c, r);
// r = 0 for a single load).
func (e *Engine) evalLine(w *workspace, l *circuits.LineSpec, i, ci int, kind CaseKind, cls int, c complex128, r, scale, k, f float64, mask [nQ]bool) {
	q, has, _, _, _ := e.lineQ(w, l, i, cls, c, r, scale, k, f)
	for qi := range has {
		has[qi] = has[qi] && mask[qi]
	}
	e.lineDC(w, i)
	e.keep(w, i, ci, kind, &q, &has)
}

// lineCircle keeps a line's worst over the continuous SWR circle, each
// quantity credited to the load that reaches it: an exact case of its own
// in the nominal audit (as for the lumped parts), else the nearest
// sampled phase.
func (e *Engine) lineCircle(w *workspace, l *circuits.LineSpec, i, first int, ca complex128, ra, scale, k, f float64) {
	q, has, av, ai, ap := e.lineQ(w, l, i, hNormal, ca, ra, scale, k, f)
	disc := ca == 0 // an underflowed α circle bounded by a disc: no load to name
	for _, grp := range []struct {
		alpha complex128
		qs    []int
	}{{av, []int{qVpk, qVrms}}, {ai, []int{qIrms, qPm}}, {ap, []int{qPdiss}}} {
		var h [nQ]bool
		for _, qi := range grp.qs {
			h[qi] = has[qi]
		}
		ci := e.circleIndex(w, first, grp.alpha, disc)
		e.lineDC(w, i)
		e.keep(w, i, ci, Circle, &q, &h)
		if ci >= e.NumCases() && w.acc[i].uses(ci) {
			e.record(w, first, f, grp.alpha)
		}
	}
}

// lineHarmonic adds one harmonic's worst line stresses for case class cls
// (open, short, or the normal load set) into the workspace sums.
func (e *Engine) lineHarmonic(w *workspace, l *circuits.LineSpec, s *circuits.Split, i, h, cls int, eh float64) {
	f := s.F
	cs := e.harmonicCircles(w, s, h, cls)
	v0, i0 := l.VoltageWaves(s.P[0][i].V, s.P[0][i].I)
	v1, i1 := l.VoltageWaves(s.P[1][i].V, s.P[1][i].I)
	var vm, im, pd float64
	for _, x := range cs {
		a, _ := l.MaxAlong(f, circuits.Lin(v0, v1, x.c), v1, x.r)
		b, _ := l.MaxAlong(f, circuits.Lin(i0, i1, x.c), i1, x.r)
		p, _ := lineDiss(s, i, x.c, x.r)
		vm, im, pd = math.Max(vm, a), math.Max(im, b), math.Max(pd, p)
	}
	vm, im, pd = vm*eh, im*eh, pd*eh*eh
	w.addHarmonic(cls, i, vm, im, pd)
	w.hs[i][cls].pmH += 2 * l.Alpha(f) * math.Max(l.Z0*im*im, vm*vm/l.Z0)
}

// lineDiss is the largest line dissipation, for a 1 V EMF, over the weight
// circle α = c + r·u, |u| = 1, and the weight that reaches it. With a, b
// the end-1 voltage and current and c2, d the end-2 ones, all linear in α,
//
//	D(α) = Re(a·b*) + Re(c2·d*) = M + Re(α·N) + |α|²·K
//
// and on the circle D = const + r·Re(u·(N + 2K·c̄)), largest where u lines
// up with the conjugate of N + 2K·c̄.
func lineDiss(s *circuits.Split, i int, c complex128, r float64) (float64, complex128) {
	a0, a1 := s.P[0][i].V, s.P[1][i].V
	b0, b1 := s.P[0][i].I, s.P[1][i].I
	c0, c1 := s.P[0][i].V2, s.P[1][i].V2
	d0, d1 := s.P[0][i].I2, s.P[1][i].I2
	M := real(a0*cmplx.Conj(b0)) + real(c0*cmplx.Conj(d0))
	N := a1*cmplx.Conj(b0) + cmplx.Conj(a0)*b1 + c1*cmplx.Conj(d0) + cmplx.Conj(c0)*d1
	K := real(a1*cmplx.Conj(b1)) + real(c1*cmplx.Conj(d1))
	cc := real(c)*real(c) + imag(c)*imag(c)
	base := M + real(c*N) + K*(cc+r*r)
	z := N + complex(2*K, 0)*cmplx.Conj(c)
	if r == 0 || cmplx.Abs(z) == 0 {
		return base, c
	}
	u := cmplx.Conj(z) / complex(cmplx.Abs(z), 0)
	return base + r*cmplx.Abs(z), c + complex(r, 0)*u
}

// crestAlpha is the weight on the circle (c, r) that makes |x0 + α·x1|
// largest: α = c + r·u with r·u·x1 along x0 + c·x1.
func crestAlpha(x0, x1, c complex128, r float64) complex128 {
	if r == 0 || x1 == 0 {
		return c
	}
	m := x0 + c*x1
	if cmplx.Abs(m) == 0 {
		return c + complex(r, 0)
	}
	d := m / x1
	return c + complex(r, 0)*d/complex(cmplx.Abs(d), 0)
}

// phaseOfAlpha is the sampled SWR-circle phase nearest the load that gives
// weight α.
func (e *Engine) phaseOfAlpha(w *workspace, alpha complex128) int {
	s := w.carr
	n := e.nPhase
	if alpha == 0 || n == 0 {
		return 0
	}
	z := -s.Voc/alpha - s.Zth
	th := circuits.ReflectionAngle(w.zc, z)
	return int(math.Round(th/(2*math.Pi)*float64(n))) % n
}
