package stress

import (
	"math"
	"math/cmplx"

	"rfstress/circuits"
)

// A measured block (a two-port whose loss is the net power into its
// ports, circuits.Dissipator) is judged on the larger of its two port
// voltages and currents and on its dissipation P_in − P_out. All four port
// phasors are linear in the load weight α, so on the SWR circle each port
// magnitude's worst is |X0 + c·X1| + r·|X1| and the dissipation's worst is
// the closed form of lineDiss: the continuous maximum, credited to the
// sampled phase nearest the load that reaches it.

// isBlock says whether element i is judged as a two-port by its ports.
func isBlock(c *circuits.Circuit, i int) bool {
	el := &c.Elements[i]
	if el.Line() != nil {
		return false
	}
	_, ok := el.Model.(circuits.Dissipator)
	return ok
}

// circleMax is the largest |x0 + α·x1| for α on the circle (c, r).
func circleMax(x0, x1, c complex128, r float64) float64 {
	return cmplx.Abs(x0+c*x1) + r*cmplx.Abs(x1)
}

// blockQ computes a block's quantities for the weight circle (c, r).
func (e *Engine) blockQ(w *workspace, i, cls int, c complex128, r, scale, k float64) (q [nQ]float64, has [nQ]bool, av, ai, ap complex128) {
	s := w.carr
	v1 := circleMax(s.P[0][i].V, s.P[1][i].V, c, r)
	v2 := circleMax(s.P[0][i].V2, s.P[1][i].V2, c, r)
	i1 := circleMax(s.P[0][i].I, s.P[1][i].I, c, r)
	i2 := circleMax(s.P[0][i].I2, s.P[1][i].I2, c, r)
	av = crestAlpha(s.P[0][i].V, s.P[1][i].V, c, r)
	if v2 > v1 {
		av = crestAlpha(s.P[0][i].V2, s.P[1][i].V2, c, r)
	}
	ai = crestAlpha(s.P[0][i].I, s.P[1][i].I, c, r)
	if i2 > i1 {
		ai = crestAlpha(s.P[0][i].I2, s.P[1][i].I2, c, r)
	}
	pd, ap := lineDiss(s, i, c, r)
	vm, im := math.Max(v1, v2)*scale, math.Max(i1, i2)*scale
	avg := e.Cond.AvgRatio
	q[qVpk] = math.Sqrt2 * (vm + k*w.hs[i][cls].pkV)
	q[qVrms] = math.Sqrt(vm*vm + k*k*w.hs[i][cls].sqV)
	q[qIrms] = math.Sqrt((im*im + k*k*w.hs[i][cls].sqI) * avg)
	q[qPdiss] = (math.Max(pd, 0)*scale*scale + k*k*w.hs[i][cls].sumP) * avg
	has[qVpk], has[qVrms], has[qIrms], has[qPdiss] = true, true, true, true
	return
}

// evalBlock keeps a block's quantities at one load (weight α).
func (e *Engine) evalBlock(w *workspace, i, ci int, kind CaseKind, cls int, alpha complex128, scale, k float64) {
	q, has, _, _, _ := e.blockQ(w, i, cls, alpha, 0, scale, k)
	e.keep(w, i, ci, kind, &q, &has)
}

// blockCircle keeps a block's worst over the continuous SWR circle.
func (e *Engine) blockCircle(w *workspace, i, first int, ca complex128, ra, scale, k float64) {
	q, has, av, ai, ap := e.blockQ(w, i, hNormal, ca, ra, scale, k)
	for _, grp := range []struct {
		alpha complex128
		qs    []int
	}{{av, []int{qVpk, qVrms}}, {ai, []int{qIrms}}, {ap, []int{qPdiss}}} {
		var h [nQ]bool
		for _, qi := range grp.qs {
			h[qi] = has[qi]
		}
		e.keep(w, i, first+e.phaseOfAlpha(w, grp.alpha), Circle, &q, &h)
	}
}

// blockHarmonic adds one harmonic's worst block stresses for case class
// cls into the workspace sums.
func (e *Engine) blockHarmonic(s *circuits.Split, w *workspace, i, cls int, cs []weightCircle, eh float64) {
	var vm, im, pd float64
	for _, x := range cs {
		vm = math.Max(vm, math.Max(circleMax(s.P[0][i].V, s.P[1][i].V, x.c, x.r), circleMax(s.P[0][i].V2, s.P[1][i].V2, x.c, x.r)))
		im = math.Max(im, math.Max(circleMax(s.P[0][i].I, s.P[1][i].I, x.c, x.r), circleMax(s.P[0][i].I2, s.P[1][i].I2, x.c, x.r)))
		p, _ := lineDiss(s, i, x.c, x.r)
		pd = math.Max(pd, p)
	}
	w.addHarmonic(cls, i, vm*eh, im*eh, pd*eh*eh)
}

// addHarmonic adds one harmonic's worst peak voltage, current and
// dissipation of a two-port part (line or block) into the class sums by
// the combination rules: peaks add, RMS values add in squares, heat adds.
func (w *workspace) addHarmonic(cls, i int, vm, im, pd float64) {
	w.hs[i][cls].pkV += vm
	w.hs[i][cls].sqV += vm * vm
	w.hs[i][cls].sqI += im * im
	w.hs[i][cls].sqIJ += im * im
	w.hs[i][cls].sumP += pd
}

// weightCircle is a set of loads as a circle of weights (r = 0: one load).
type weightCircle struct {
	c complex128
	r float64
}

// harmonicCircles is the weight set of harmonic class cls at split s.
func (e *Engine) harmonicCircles(w *workspace, s *circuits.Split, h, cls int) []weightCircle {
	switch {
	case cls == hOpen:
		return []weightCircle{{0, 0}}
	case cls == hShort:
		return []weightCircle{{s.Alpha(circuits.Short), 0}}
	case e.nPhase == 0:
		return []weightCircle{{s.Alpha(circuits.Load{Z: w.hz[h]}), 0}}
	}
	if ca, ra, ok := e.alphaCircle(s, w.hz[h]); ok {
		return []weightCircle{{ca, ra}}
	}
	var cs []weightCircle
	for k := 0; k < e.nPhase; k++ {
		cs = append(cs, weightCircle{s.Alpha(e.circleLoad(w.hz[h], k)), 0})
	}
	return cs
}
