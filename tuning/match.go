// Package tuning finds the settings of a network's variable parts (range=,
// steps=) that match a load to the transmitter, and picks one setting from
// the family of matches by a stated policy. It works on the circuits
// layer's solver through retuned copies of the circuit (Circuit.Scaled, as
// tolerance trials do) and knows nothing of ratings.
package tuning

import (
	"fmt"
	"math"
	"math/cmplx"
	"sort"
	"strings"

	"gonum.org/v1/gonum/optimize"

	"rfstress/circuits"
)

// Policy chooses one setting among several that match.
type Policy int

// The policies. LeastLoss is the default.
const (
	LeastLoss Policy = iota
	LeastVoltage
	LargestC
)

var policyNames = [...]string{"least-loss", "least-voltage", "largest-c"}

func (p Policy) String() string { return policyNames[p] }

// PolicyByName reads a --tune-policy value.
func PolicyByName(s string) (Policy, error) {
	for i, n := range policyNames {
		if n == s {
			return Policy(i), nil
		}
	}
	return 0, fmt.Errorf("unknown tuning policy %s (least-loss, least-voltage or largest-c)", circuits.Quote(s))
}

// Describe says in words what the policy chose.
func (p Policy) Describe() string {
	switch p {
	case LeastVoltage:
		return "least-voltage: of the settings that match, the one with the lowest peak voltage on any part"
	case LargestC:
		return "largest-c: of the settings that match, the one with the most capacitance in the variable capacitors (common practice for T networks)"
	}
	return "least-loss: of the settings that match, the one that loses least power in the network"
}

// DefaultSWR is the SWR a match must reach unless told otherwise.
const DefaultSWR = 1.2

// Var is one variable part.
type Var struct {
	Index   int // element index in the circuit
	Name    string
	Kind    circuits.Kind
	Nominal float64
	Adj     *circuits.Adjust
}

// Unit is the part's value unit, F or H.
func (v Var) Unit() string {
	if v.Kind == circuits.Inductor {
		return "H"
	}
	return "F"
}

// Vars lists the circuit's variable parts in netlist order.
func Vars(c *circuits.Circuit) []Var {
	var out []Var
	for i, e := range c.Elements {
		if e.Comp != nil && e.Comp.Adjust != nil {
			out = append(out, Var{Index: i, Name: e.Name, Kind: e.Kind, Nominal: e.Value, Adj: e.Comp.Adjust})
		}
	}
	return out
}

// maxCombos bounds the enumeration of discrete parts' settings.
const maxCombos = 200000

// Matcher tunes one circuit; it is read-only once made, so workers may
// share it.
type Matcher struct {
	C         *circuits.Circuit
	Vars      []Var
	TargetSWR float64
	Policy    Policy
	cont      []int // indices into Vars of continuous parts
	disc      []int // of discrete parts
	combos    int
}

// NewMatcher prepares tuning of c. It fails when c has no variable part
// or the discrete parts have too many combinations to enumerate.
func NewMatcher(c *circuits.Circuit, target float64, p Policy) (*Matcher, error) {
	m := &Matcher{C: c, Vars: Vars(c), TargetSWR: target, Policy: p, combos: 1}
	if len(m.Vars) == 0 {
		return nil, fmt.Errorf("%s has no variable part to tune (give a capacitor or inductor range=lo:hi)", c.NL.File)
	}
	if !(target >= 1) {
		return nil, fmt.Errorf("match SWR %g is below 1", target)
	}
	for i, v := range m.Vars {
		if v.Adj.Discrete() {
			m.disc = append(m.disc, i)
			m.combos *= len(v.Adj.Steps)
			if m.combos > maxCombos {
				return nil, fmt.Errorf("%s: the switched parts have more than %d combinations of settings to try; give fewer steps", c.NL.File, maxCombos)
			}
		} else {
			m.cont = append(m.cont, i)
		}
	}
	return m, nil
}

// Eval is the network at one setting, driven by 1 W available from the
// transmitter; voltages scale with √P and powers with P.
type Eval struct {
	Values    []float64 // per variable part
	Zin       complex128
	GammaC    complex128 // Γ at the transmitter, power-wave form against port in's z
	Gamma     float64    // |Γ|
	SWR       float64
	LossFrac  float64 // network loss over power delivered into it
	Eff       float64 // power into the load over power into the network
	VpkPerRtW float64 // largest part peak voltage per √W of available power
	SumC      float64 // total of the variable capacitors
}

// Retuned returns a copy of the circuit with the variable parts at values.
func (m *Matcher) Retuned(values []float64) *circuits.Circuit {
	f := make([]float64, len(m.C.Elements))
	for i := range f {
		f[i] = 1
	}
	for k, v := range m.Vars {
		f[v.Index] = values[k] / m.C.Elements[v.Index].Value
	}
	return m.C.Scaled(f, nil)
}

// Evaluate solves the network at f into load z with the given settings.
func (m *Matcher) Evaluate(f float64, z complex128, values []float64) (Eval, error) {
	c := m.Retuned(values)
	r, err := c.Solve(f, 1, circuits.Load{Z: z})
	if err != nil {
		return Eval{}, err
	}
	ev := Eval{Values: append([]float64(nil), values...), Zin: r.Zin}
	zs := c.Zin
	ev.GammaC = (r.Zin - zs) / (r.Zin + cmplx.Conj(zs))
	g := cmplx.Abs(ev.GammaC)
	if math.IsNaN(g) || g > 1 {
		g = 1
	}
	ev.Gamma = g
	ev.SWR = swrOf(g)
	if r.Pin > 0 {
		ev.LossFrac = r.Ploss / r.Pin
		ev.Eff = r.Pout / r.Pin
	}
	for _, ps := range r.Parts {
		if v := math.Sqrt2 * cmplx.Abs(ps.V); v > ev.VpkPerRtW {
			ev.VpkPerRtW = v
		}
	}
	for k, v := range m.Vars {
		if v.Kind == circuits.Capacitor {
			ev.SumC += values[k]
		}
	}
	return ev, nil
}

func swrOf(g float64) float64 {
	if g >= 1 {
		return math.Inf(1)
	}
	return (1 + g) / (1 - g)
}

func gammaOf(swr float64) float64 { return (swr - 1) / (swr + 1) }

// Result is the tuning of one load.
type Result struct {
	F       float64
	Load    complex128
	Matched bool
	Best    Eval   // the chosen setting (the best SWR reached when unmatched)
	Policy  Policy // which policy chose
	Limit   string // unmatched: what stopped the match
	Family  int    // number of distinct matching settings the search found
	Solves  int    // network solves the search took
}

// family is how close to the best match a setting must come for a policy
// to choose it: with switched parts SWR 1.02 or 5 % of the best |Γ|, with
// continuous parts only an exact match (|Γ| ≤ 1e-6) or 5 % of the best,
// never beyond the target.
// A policy never trades match for lower stress: a mistuned network
// delivers less power and would look kinder to its parts than it is.
func (m *Matcher) family(best float64) float64 {
	if len(m.disc) == 0 {
		// continuous parts reach an exact match where any does: the
		// family is the matches proper, to numerical precision
		return math.Min(math.Max(1e-6, best*1.05), gammaOf(m.TargetSWR))
	}
	g := math.Max(gammaOf(1.02), best*1.05)
	return math.Min(g, gammaOf(m.TargetSWR))
}

// Tune finds the settings that match load z at f.
func (m *Matcher) Tune(f float64, z complex128) (Result, error) {
	res := Result{F: f, Load: z, Policy: m.Policy}
	t, err := m.newTuner(f, z)
	if err != nil {
		return res, err
	}
	var cands []Eval
	combos := m.combosList()
	for _, dv := range combos {
		cs, err := t.stage1(dv, len(combos) > 1)
		if err != nil {
			return res, err
		}
		cands = append(cands, cs...)
	}
	if len(cands) == 0 {
		return res, fmt.Errorf("at %s the network could not be solved at any setting", circuits.FormatHz(f))
	}
	best := cands[0]
	for _, c := range cands[1:] {
		if c.Gamma < best.Gamma {
			best = c
		}
	}
	if best.SWR > m.TargetSWR*(1+1e-9) {
		res.Best, res.Solves = best, t.evals
		res.Limit = m.limitText(best.Values)
		return res, nil
	}
	res.Matched = true
	gc := m.family(best.Gamma)
	var fam []Eval
	for _, c := range cands {
		if c.Gamma <= gc && !near(fam, c.Values) {
			fam = append(fam, c)
		}
	}
	chosen := fam[0]
	for _, c := range fam[1:] {
		if m.better(c, chosen) {
			chosen = c
		}
	}
	if len(m.cont) > 0 && best.Gamma < 1e-6 {
		// refine from the few best matches by the policy's measure
		sort.SliceStable(fam, func(i, j int) bool { return m.better(fam[i], fam[j]) })
		if len(fam) > 1 {
			fam = fam[:1]
		}
		for _, c := range fam {
			if e, ok := t.stage2(c, gc); ok && m.better(e, chosen) {
				chosen = e
			}
		}
	}
	res.Best, res.Family, res.Solves = chosen, len(fam), t.evals
	return res, nil
}

// metric is what the policy minimises.
func (m *Matcher) metric(e Eval) float64 {
	switch m.Policy {
	case LeastVoltage:
		return e.VpkPerRtW
	case LargestC:
		return -e.SumC
	}
	return e.LossFrac
}

func (m *Matcher) better(a, b Eval) bool {
	ma, mb := m.metric(a), m.metric(b)
	if ma != mb {
		return ma < mb
	}
	return a.Gamma < b.Gamma
}

func near(fam []Eval, v []float64) bool {
	for _, e := range fam {
		same := true
		for i := range v {
			if math.Abs(math.Log(v[i]/e.Values[i])) > 1e-3 {
				same = false
				break
			}
		}
		if same {
			return true
		}
	}
	return false
}

// combosList enumerates the discrete parts' settings (one empty combo
// when there are none), first part varying slowest.
func (m *Matcher) combosList() [][]float64 {
	out := [][]float64{nil}
	for _, k := range m.disc {
		var next [][]float64
		for _, c := range out {
			for _, s := range m.Vars[k].Adj.Steps {
				next = append(next, append(append([]float64(nil), c...), s))
			}
		}
		out = next
	}
	return out
}

// values assembles a full setting from continuous coordinates u (sine
// transform: any real u maps into the range, so the optimiser needs no
// bounds) and discrete settings dv.
func (m *Matcher) values(u, dv []float64) []float64 {
	v := make([]float64, len(m.Vars))
	for j, k := range m.cont {
		a := m.Vars[k].Adj
		t := (1 + math.Sin(u[j])) / 2
		v[k] = a.Lo * math.Pow(a.Hi/a.Lo, t)
	}
	for j, k := range m.disc {
		v[k] = dv[j]
	}
	return v
}

// coord is the inverse transform of a continuous part's value.
func coord(a *circuits.Adjust, v float64) float64 {
	t := math.Log(a.Clamp(v)/a.Lo) / math.Log(a.Hi/a.Lo)
	return math.Asin(math.Max(-1, math.Min(1, 2*t-1)))
}

// starts are the optimiser's starting points in the range (as fractions of
// the log range): the nominal setting, then a Halton sequence, which
// covers the box evenly and is the same on every run.
func (m *Matcher) starts(few bool) [][]float64 {
	n := len(m.cont)
	k := 4 + 2*n
	if few {
		k = 2 + n
	}
	var out [][]float64
	nom := make([]float64, n)
	for j, ix := range m.cont {
		nom[j] = coord(m.Vars[ix].Adj, m.Vars[ix].Nominal)
	}
	out = append(out, nom)
	primes := []int{2, 3, 5, 7, 11, 13, 17, 19, 23, 29, 31, 37}
	for i := 1; len(out) < k; i++ {
		u := make([]float64, n)
		for j := range u {
			t := halton(i, primes[j%len(primes)])
			u[j] = math.Asin(2*t - 1)
		}
		out = append(out, u)
	}
	return out
}

func halton(i, b int) float64 {
	f, r := 1.0, 0.0
	for i > 0 {
		f /= float64(b)
		r += f * float64(i%b)
		i /= b
	}
	return r
}

// stage1 minimises |Γ|² from several starts; with only discrete parts it
// evaluates the one setting.
func (t *tuner) stage1(dv []float64, few bool) ([]Eval, error) {
	m := t.m
	if len(m.cont) == 0 {
		e, err := t.eval(m.values(nil, dv))
		if err != nil {
			return nil, nil
		}
		return []Eval{e}, nil
	}
	var out []Eval
	matched := 0
	fn := func(u []float64) float64 {
		g := t.gamma(m.values(u, dv))
		return real(g)*real(g) + imag(g)*imag(g)
	}
	for _, u0 := range m.starts(few) {
		u, _ := minimize(fn, u0, 1e-20)
		e, err := t.eval(m.values(u, dv))
		if err != nil {
			continue
		}
		out = append(out, e)
		if e.Gamma < 1e-8 {
			matched++
		}
		if len(m.cont) >= 3 && matched >= 3 {
			// a family of matches: stage 2 follows it from here
			break
		}
	}
	return out, nil
}

// stage2 moves along the family of matches from a matching setting to
// improve the policy's measure. Two continuous parts (the pair) are
// solved for the match by Newton's method at every setting of the others
// (the free parts), so every setting visited is a match and the policy
// only ever chooses between matches; the free parts are scanned and then
// refined by Nelder–Mead. It returns the best setting visited.
func (t *tuner) stage2(from Eval, gc float64) (Eval, bool) {
	m := t.m
	if len(m.cont) < 3 {
		return from, false // one or two continuous parts: the matches are points
	}
	best, found := from, false
	// a part on its range limit can only be free, never one of the pair,
	// so every pair that controls the match is tried
	for _, pr := range t.pairs(from.Values) {
		if e, ok := t.walk(from, gc, pr[0], pr[1]); ok && m.better(e, best) {
			best, found = e, true
		}
	}
	return best, found
}

// walk follows the family with parts pi and pj solved for the match.
func (t *tuner) walk(from Eval, gc float64, pi, pj int) (Eval, bool) {
	m := t.m
	var free []int
	for _, k := range m.cont {
		if k != pi && k != pj {
			free = append(free, k)
		}
	}
	best, found := from, false
	seed := append([]float64(nil), from.Values...)
	try := func(u []float64) (Eval, bool) {
		v := append([]float64(nil), seed...)
		for j, k := range free {
			a := m.Vars[k].Adj
			v[k] = a.Lo * math.Pow(a.Hi/a.Lo, (1+math.Sin(u[j]))/2)
		}
		e, ok := t.solvePair(v, pi, pj, gc)
		if ok && m.better(e, best) {
			best, found = e, true
		}
		return e, ok
	}
	ref := math.Abs(m.metric(from))
	if ref == 0 {
		ref = 1
	}
	fn := func(u []float64) float64 {
		e, ok := try(u)
		if !ok {
			return 1e3 * (1 + e.Gamma)
		}
		return m.metric(e) / ref
	}
	u0 := make([]float64, len(free))
	for j, k := range free {
		u0[j] = coord(m.Vars[k].Adj, from.Values[k])
	}
	if len(free) == 1 {
		// scan the free part over its range, continuing the pair's solution
		// from one point to the next, and refine from the best point found
		const n = 20
		bu, bm := u0[0], fn(u0)
		for dir := -1; dir <= 1; dir += 2 {
			seed = append(seed[:0], from.Values...)
			for i := 1; i <= n; i++ {
				tt := (1+math.Sin(u0[0]))/2 + float64(dir*i)/n
				if tt < 0 || tt > 1 {
					break
				}
				u := []float64{math.Asin(2*tt - 1)}
				e, ok := try(u)
				if !ok {
					break
				}
				copy(seed, e.Values)
				if mv := m.metric(e) / ref; mv < bm {
					bu, bm = u[0], mv
				}
			}
		}
		u0[0] = bu
		seed = append(seed[:0], best.Values...)
	}
	minimizeN(fn, u0, math.Inf(-1), 60*len(free))
	return best, found
}

// pairs lists the pairs of continuous parts that control the match at v,
// best conditioned first: the Jacobian of Γ against their log values is
// far from singular.
func (t *tuner) pairs(v []float64) [][2]int {
	m := t.m
	g0 := t.gamma(v)
	d := make([]complex128, len(m.Vars))
	for _, k := range m.cont {
		w := append([]float64(nil), v...)
		w[k] *= math.Exp(1e-6)
		d[k] = (t.gamma(w) - g0) / 1e-6
	}
	type pq struct {
		p [2]int
		q float64
	}
	var out []pq
	for a := 0; a < len(m.cont); a++ {
		for b := a + 1; b < len(m.cont); b++ {
			x, y := d[m.cont[a]], d[m.cont[b]]
			det := math.Abs(real(x)*imag(y) - imag(x)*real(y))
			q := det / (cmplx.Abs(x)*cmplx.Abs(y) + 1e-300)
			if q > 1e-3 {
				out = append(out, pq{[2]int{m.cont[a], m.cont[b]}, q})
			}
		}
	}
	sort.SliceStable(out, func(i, j int) bool { return out[i].q > out[j].q })
	var ps [][2]int
	for _, x := range out {
		ps = append(ps, x.p)
	}
	return ps
}

// tuner is the work of one Tune call: a private retuned copy of the
// circuit whose variable parts are set in place, and its factorisation,
// reused for every trial setting so the search allocates little.
type tuner struct {
	m    *Matcher
	f    float64
	z    complex128
	c    *circuits.Circuit
	load circuits.Load
	fz   *circuits.Factorization
	x    []complex128
	// evals counts network solves, the cost of a tuning
	evals int
}

func (m *Matcher) newTuner(f float64, z complex128) (*tuner, error) {
	t := &tuner{m: m, f: f, z: z, c: m.C.Scaled(nil, nil), load: circuits.Load{Z: z}}
	fz, err := t.c.Factor(f, &t.load)
	if err != nil {
		return nil, err
	}
	t.fz, t.x = fz, make([]complex128, fz.N())
	return t, nil
}

// eval is Matcher.Evaluate, counted.
func (t *tuner) eval(v []float64) (Eval, error) {
	t.evals++
	return t.m.Evaluate(t.f, t.z, v)
}

// gamma is the power-wave reflection at the transmitter (complex) at
// setting v; 1 when the network cannot be solved there.
func (t *tuner) gamma(v []float64) complex128 {
	t.evals++
	for k, p := range t.m.Vars {
		t.c.Elements[p.Index].Value = v[k]
	}
	if err := t.fz.Refactor(t.f); err != nil {
		return 1
	}
	t.c.SourceRHS(t.x, 1)
	t.fz.Solve(t.x)
	vin := t.x[t.c.In]
	iin := (1 - vin) / t.c.Zs // solved behind the true source impedance
	if iin == 0 {
		return 1
	}
	zin := vin / iin
	g := (zin - t.c.Zin) / (zin + cmplx.Conj(t.c.Zin))
	if cmplx.IsNaN(g) || cmplx.IsInf(g) {
		return 1
	}
	return g
}

// solvePair sets parts pi and pj so that Γ = 0 (Newton's method on their
// log values, staying within their ranges); it reports whether the result
// matches within gc.
func (t *tuner) solvePair(v []float64, pi, pj int, gc float64) (Eval, bool) {
	m := t.m
	ai, aj := m.Vars[pi].Adj, m.Vars[pj].Adj
	g := t.gamma(v)
	for it := 0; it < 30 && cmplx.Abs(g) > 1e-11; it++ {
		const h = 1e-7
		w := append([]float64(nil), v...)
		w[pi] *= math.Exp(h)
		gi := (t.gamma(w) - g) / h
		w[pi] = v[pi]
		w[pj] *= math.Exp(h)
		gj := (t.gamma(w) - g) / h
		det := real(gi)*imag(gj) - imag(gi)*real(gj)
		if det == 0 || math.IsNaN(det) {
			break
		}
		// solve [gi gj]·[dx dy] = −g in real and imaginary parts
		dx := -(real(g)*imag(gj) - imag(g)*real(gj)) / det
		dy := -(real(gi)*imag(g) - imag(gi)*real(g)) / det
		if s := math.Max(math.Abs(dx), math.Abs(dy)); s > 0.5 {
			dx, dy = dx*0.5/s, dy*0.5/s
		}
		// backtrack until |Γ| falls; none falling means a range limit
		// holds one of the pair (or the family ends here)
		improved := false
		for k := 0; k < 12; k++ {
			w[pi] = ai.Clamp(v[pi] * math.Exp(dx))
			w[pj] = aj.Clamp(v[pj] * math.Exp(dy))
			if gw := t.gamma(w); cmplx.Abs(gw) < cmplx.Abs(g) {
				copy(v, w)
				g, improved = gw, true
				break
			}
			dx, dy = dx/2, dy/2
		}
		if !improved {
			break
		}
	}
	e, err := t.eval(v)
	if err != nil {
		return Eval{Gamma: 1}, false
	}
	return e, e.Gamma <= gc
}

// minimize runs Nelder–Mead (gonum/optimize) serially, so the result is
// the same on every run and with any number of workers around it.
func minimize(fn func([]float64) float64, u0 []float64, threshold float64) ([]float64, float64) {
	return minimizeN(fn, u0, threshold, 3000)
}

func minimizeN(fn func([]float64) float64, u0 []float64, threshold float64, evals int) ([]float64, float64) {
	p := optimize.Problem{Func: fn}
	s := &optimize.Settings{
		FuncEvaluations: evals,
		Converger:       &converger{fc: optimize.FunctionConverge{Absolute: 1e-24, Relative: 1e-12, Iterations: 60}, threshold: threshold},
	}
	r, err := optimize.Minimize(p, u0, s, &optimize.NelderMead{SimplexSize: 0.3})
	if r == nil || (err != nil && r.X == nil) {
		return u0, fn(u0)
	}
	return r.X, r.F
}

// limitText names the range limits the best setting sits on: what stopped
// the match.
func (m *Matcher) limitText(values []float64) string {
	var at []string
	for k, v := range m.Vars {
		a := v.Adj
		lr := math.Log(a.Hi / a.Lo)
		switch {
		case math.Log(values[k]/a.Lo) < 1e-3*lr:
			at = append(at, fmt.Sprintf("%s at its lowest setting %s", v.Name, circuits.FormatSI(a.Lo, v.Unit())))
		case math.Log(a.Hi/values[k]) < 1e-3*lr:
			at = append(at, fmt.Sprintf("%s at its highest setting %s", v.Name, circuits.FormatSI(a.Hi, v.Unit())))
		}
	}
	if len(at) == 0 {
		return "no range limit reached: the network's form cannot match this load"
	}
	return strings.Join(at, ", ")
}

// converger stops at a function value below threshold (a match needs no
// polishing past numerical zero) or when the value stops improving.
type converger struct {
	fc        optimize.FunctionConverge
	threshold float64
}

func (c *converger) Init(dim int) { c.fc.Init(dim) }

func (c *converger) Converged(l *optimize.Location) optimize.Status {
	if l.F < c.threshold {
		return optimize.FunctionThreshold
	}
	return c.fc.Converged(l)
}
