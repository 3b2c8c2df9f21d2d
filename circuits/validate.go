package circuits

import (
	"fmt"
	"math"
	"math/cmplx"
	"strconv"
	"strings"
)

// groundHint is the advice given when a node is spelt like ground.
const groundHint = "ground is written gnd, in lower case; give another name to a node that is not ground"

// groundSpelling reports node names a reader would take for ground but the
// netlist would not: gnd in another case, ground, or 0 (the ground of many
// circuit languages). Read as an ordinary node they quietly lift part of
// the circuit off ground and the audit can pass a filter that fails.
func groundSpelling(s string) bool {
	if s == Ground {
		return false
	}
	switch strings.ToLower(s) {
	case "gnd", "ground":
		return true
	}
	return strings.Trim(s, "0") == "" // 0, 00, 000: ground in circuit-simulator netlists
}

// SkipBOM drops a UTF-8 byte-order mark that some editors put at the start
// of a text file.
func SkipBOM(b []byte) []byte {
	if len(b) >= 3 && b[0] == 0xef && b[1] == 0xbb && b[2] == 0xbf {
		return b[3:]
	}
	return b
}

// touch records that part name of kind touches node n.
func (p *parser) touch(n, part string, kind Kind) {
	p.touches[n] = append(p.touches[n], part)
	p.kinds[part] = kind
}

// checkTouches flags nodes that only one part touches: a misspelt node
// name (L4 n2 N3) leaves a part hanging by one end, which changes the
// circuit without any other error. A port counts as a connection, so the
// antenna or transmitter node may carry a single part.
func (p *parser) checkTouches() {
	ports := map[string]bool{}
	for _, pt := range []*Port{p.nl.In, p.nl.Out} {
		if pt != nil {
			ports[pt.Node] = true
			if pt.Node2 != "" {
				ports[pt.Node2] = true // a balanced port's second node
			}
		}
	}
	for n := range p.portNames {
		ports[n] = true
	}
	for _, n := range p.nl.Nodes {
		t := p.touches[n]
		if len(t) == 1 && !ports[n] {
			p.errorf(p.nodePos[n], "a node joins two or more parts, or a part and a port; check the spelling",
				"node %s is touched only by %s %s", n, p.kinds[t[0]], t[0])
		}
	}
}

// checkCouplings refuses coupling sets no windings can have: a second
// line for the same pair (which would add up silently), and any set whose
// inductance matrix is not positive definite (it would store negative
// energy for some currents, and k12 = k13 = 0.6 with L2, L3 uncoupled
// passes every single-line check).
func (p *parser) checkCouplings() {
	type pair struct{ a, b string }
	first := map[pair]*Coupling{}
	var good []*Coupling
	for _, k := range p.nl.Couplings {
		if k.L1 == k.L2 || !(k.K > 0 && k.K < 1) || p.partKind[k.L1] != Inductor || p.partKind[k.L2] != Inductor {
			continue // already reported
		}
		key := pair{k.L1, k.L2}
		if key.b < key.a {
			key.a, key.b = key.b, key.a
		}
		if f, dup := first[key]; dup {
			p.errorf(k.Pos, "one coupling line per pair of inductors", "coupling %s couples %s and %s again (coupling %s at line %d)",
				k.Name, k.L1, k.L2, f.Name, f.Pos.Line)
			continue
		}
		first[key] = k
		good = append(good, k)
	}
	// group the couplings by connected sets of inductors
	parent := map[string]string{}
	var find func(string) string
	find = func(x string) string {
		if parent[x] == "" || parent[x] == x {
			parent[x] = x
			return x
		}
		r := find(parent[x])
		parent[x] = r
		return r
	}
	for _, k := range good {
		parent[find(k.L1)] = find(k.L2)
	}
	groups := map[string][]*Coupling{}
	var roots []string
	for _, k := range good {
		r := find(k.L1)
		if groups[r] == nil {
			roots = append(roots, r)
		}
		groups[r] = append(groups[r], k)
	}
	for _, r := range roots {
		g := groups[r]
		if len(g) < 2 {
			continue // one line with 0 < k < 1 is always realisable
		}
		if !couplingsDefinite(g) {
			var names []string
			for _, k := range g {
				names = append(names, fmt.Sprintf("%s (line %d)", k.Name, k.Pos.Line))
			}
			last := g[len(g)-1]
			p.errorf(last.Pos, "smaller k: coupled windings store positive energy for any currents, so the matrix of k (1 on the diagonal) must be positive definite",
				"couplings %s are not physically realisable together: their inductance matrix is not positive definite", strings.Join(names, ", "))
		}
	}
}

// couplingsDefinite tells whether the inductance matrix of a set of
// couplings is positive definite. With M = k·√(L1·L2) the matrix is
// D·K·D, D = diag(√L), so it is definite exactly when K (ones on the
// diagonal, k off it) is; a Cholesky factorisation decides that (Golub &
// Van Loan, Matrix Computations, 4th ed., sec. 4.2).
func couplingsDefinite(g []*Coupling) bool {
	idx := map[string]int{}
	for _, k := range g {
		for _, l := range []string{k.L1, k.L2} {
			if _, ok := idx[l]; !ok {
				idx[l] = len(idx)
			}
		}
	}
	n := len(idx)
	a := make([]float64, n*n)
	for i := 0; i < n; i++ {
		a[i*n+i] = 1
	}
	for _, k := range g {
		i, j := idx[k.L1], idx[k.L2]
		a[i*n+j] = k.K
		a[j*n+i] = k.K
	}
	return Cholesky(a, n)
}

// Cholesky factorises the symmetric n×n matrix a (row-major) in place and
// reports whether it is positive definite, with a pivot margin of 1e-12
// (a pivot that small is a coupling within rounding of k = 1).
func Cholesky(a []float64, n int) bool {
	for j := 0; j < n; j++ {
		d := a[j*n+j]
		for k := 0; k < j; k++ {
			d -= a[j*n+k] * a[j*n+k]
		}
		if !(d > 1e-12) {
			return false
		}
		d = math.Sqrt(d)
		a[j*n+j] = d
		for i := j + 1; i < n; i++ {
			s := a[i*n+j]
			for k := 0; k < j; k++ {
				s -= a[i*n+k] * a[j*n+k]
			}
			a[i*n+j] = s / d
		}
	}
	return true
}

// Range is the span of values a solve can trust. Outside it the numbers
// either mean nothing physical (1e-320 F) or overflow and underflow in the
// network matrix (1e30 H at 30 MHz is 2e38 Ω).
type Range struct {
	Lo, Hi float64
	Unit   string
}

// Holds tells whether v lies in the range.
func (r Range) Holds(v float64) bool { return v >= r.Lo && v <= r.Hi }

// Text renders the range for messages: "1 fF to 1 F".
func (r Range) Text() string { return plainSI(r.Lo, r.Unit) + " to " + plainSI(r.Hi, r.Unit) }

// plainSI renders a range limit: 1e-15 "F" → "1 fF", 1e6 "" → "1e+06".
func plainSI(v float64, unit string) string {
	if unit == "" {
		return strconv.FormatFloat(v, 'g', -1, 64)
	}
	s := FormatSI(v, unit)
	s = strings.Replace(s, ".00 ", " ", 1)
	s = strings.Replace(s, ".0 ", " ", 1)
	return s
}

// Accepted ranges. They are wide: every real HF part sits well inside,
// and at their edges the network matrix still has entries within about
// 1e30 of one another at any frequency in FreqRange.
var (
	FreqRange   = Range{1, 100e9, "Hz"}
	valueRanges = map[Kind]Range{
		Capacitor: {1e-15, 1, "F"},
		Inductor:  {1e-12, 1, "H"},
		Resistor:  {1e-9, 1e12, "Ω"},
	}
	qRange      = Range{0.1, 1e18, ""}
	voltRange   = Range{1e-3, 100e6, "V"}
	ampRange    = Range{1e-6, 100e3, "A"}
	wattRange   = Range{1e-6, 10e6, "W"}
	lengthRange = Range{1e-6, 10, "m"}
	zRange      = Range{1e-3, 1e9, "Ω"}
	attrRanges  = map[string]map[string]Range{
		"capacitor": {"q": qRange, "esr": {1e-9, 1e6, "Ω"}, "df": {1e-9, 1, ""}, "vpk": voltRange, "vrms": voltRange, "irms": ampRange, "pmax": wattRange},
		"inductor":  {"q": qRange, "wire": lengthRange, "turns": {1, 1e5, ""}, "irms": ampRange},
		"resistor":  {"pmax": wattRange, "vpk": voltRange},
		"port":      {"z": zRange},
		"core": {"ae": {1e-12, 1, "m²"}, "le": lengthRange, "od": lengthRange, "id": lengthRange, "h": lengthRange,
			"al": {1e-12, 1e-2, "H"}, "mu": {1, 1e6, ""}, "area": {1e-10, 100, "m²"}},
	}
)

// checkRange tests an attribute read by readAttr against its range.
func checkRange(kw string, a *Attr) *Error {
	r, ok := attrRanges[kw][a.Key]
	bad := func(what string, rg Range) *Error {
		return &Error{Msg: fmt.Sprintf("%s=%s: %s is outside the range a solve can trust", a.Key, Clip(a.Raw), what), Want: "accepted range " + rg.Text()}
	}
	num := func(v float64) string {
		t := strconv.FormatFloat(v, 'g', 4, 64)
		if r.Unit != "" {
			t += " " + r.Unit
		}
		return t
	}
	for _, pt := range a.Points {
		if ok && !r.Holds(pt.V) {
			return bad(num(pt.V), r)
		}
		if pt.F != 0 && !FreqRange.Holds(pt.F) {
			return bad("frequency "+strconv.FormatFloat(pt.F, 'g', 4, 64)+" Hz", FreqRange)
		}
	}
	if !ok {
		return nil
	}
	for _, z := range a.Zs {
		if m := cmplx.Abs(z); !r.Holds(m) {
			return bad("|z| "+strconv.FormatFloat(m, 'g', 4, 64)+" Ω", r)
		}
	}
	if len(a.Points) == 0 && len(a.Zs) == 0 && !r.Holds(a.Num) {
		return bad(num(a.Num), r)
	}
	return nil
}
