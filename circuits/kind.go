package circuits

import (
	"math"
	"sort"
)

// Model is how one kind of element enters the network: how it stamps the
// MNA system and how its state is read back from a solution. Each kind has
// one implementation in a file of its own (capacitor.go, inductor.go,
// resistor.go, …), the way go/ast keeps one type per node kind, so a new
// kind is a new file and a Register call, not a case in every switch.
//
// Models are stateless: everything per part lives on the Element, so a
// tolerance trial can copy Elements and scale them freely.
type Model interface {
	// Branches is the number of current unknowns the element adds to the
	// MNA system (0 for a plain admittance). Build hands out their indices
	// in Element.Branch, Element.Branch+1, ….
	Branches(e *Element) int
	// Stamp adds the element to the system at f; f = 0 is the DC solution.
	Stamp(e *Element, s *System, f float64)
	// State reads the element's linear state (voltage, current, flux
	// linkage; second-port values for two-port kinds) from solution x of
	// system s into st, overwriting every field (st is not cleared
	// before); s gives the frequency's loss table (System.LossR).
	// Every field it fills must be linear in x, so superposed solutions
	// (Split) give superposed states.
	State(e *Element, s *System, x []complex128, f float64, st *PartState)
	// LossR is the series-equivalent loss resistance at f: the element
	// dissipates |I|²·LossR with I its State current.
	LossR(e *Element, f float64) float64
}

// Dissipator is implemented by kinds whose loss is not |I|²·LossR (a
// measured block, a line): the dissipation follows from the whole state.
type Dissipator interface {
	Dissipation(e *Element, st *PartState, f float64) float64
}

// PairReader is implemented by kinds that read both of a split's
// solutions in one call: the split reads every element twice at every
// frequency, and one call shares the lookups (nodes, the kept admittance)
// that two would repeat. StatePair must give what State gives for each
// (TestReadPairAsRead).
type PairReader interface {
	StatePair(e *Element, s *System, x0, x1 []complex128, f float64, st0, st1 *PartState)
}

// Ratios are the fixed ratios of a part's state at one frequency, 0 where
// the state holds none: |I|/|V| (I = Y·V), |V|/|I| (V = Z·I) and |λ|/|I|
// (λ = L·I). A kind whose state is one phasor times fixed factors (a
// capacitor's State sets I = Y·V; a lone inductor's branch equation makes
// V = Z·I and its State sets λ = L·I) records them from its Stamp, where
// its admittance or impedance is at hand (System.Fixed). A caller then
// takes one magnitude and scales it (|I| = |Y|·|V|), and the worst load of
// one is the worst load of the other: the harmonic worst-case sums and the
// SWR circle's worst loads need one square root and one evaluation where
// they took two or three.
type Ratios struct {
	IPerV, VPerI, LamPerI float64
}

// KindSpec is everything package circuits knows about one kind: its
// statement syntax and its solver model.
type KindSpec struct {
	Kind Kind
	// Syntax of the statement; Fields name the positional fields, "node"
	// fields are node names and a "value" field is read in Unit.
	Syntax Keyword
	// Layouts, when set, are further positional layouts the statement may
	// take, told apart by their field count (a line with two or four
	// nodes). Syntax.Fields is the first.
	Layouts [][]string
	Unit    string // unit of the value field: "F", "H", "ohm"
	Example string // an example value for messages, e.g. "300p"
	Model   Model
	// Prepare, when set, reads the kind's solver attributes into the
	// element when the circuit is built.
	Prepare func(e *Element)
	// Check, when set, reports kind-specific input errors of a parsed
	// statement (ranges, node rules) through errf.
	Check func(c *Component, errf func(pos Pos, want, format string, args ...any))
	// Observes marks a kind that joins nothing (a clearance): its nodes
	// must be nodes other statements connect, it adds no node to the
	// circuit and no path to ground.
	Observes bool
	// Source marks a DC source (supply, draw): not a part that can fail,
	// so single-part faults leave it alone.
	Source bool
}

var kindSpecs = map[Kind]*KindSpec{}

// Register adds a kind of element: its keyword joins the netlist language
// and its model the solver. Kinds register themselves from init.
func Register(k *KindSpec) {
	if _, dup := kindSpecs[k.Kind]; dup {
		panic("circuits: kind registered twice: " + string(k.Kind))
	}
	kindSpecs[k.Kind] = k
	Keywords[string(k.Kind)] = k.Syntax
}

// SpecOf returns the registered description of a kind (nil if unknown).
func SpecOf(k Kind) *KindSpec { return kindSpecs[k] }

// Kinds lists the registered kinds in name order.
func Kinds() []Kind {
	out := make([]Kind, 0, len(kindSpecs))
	for k := range kindSpecs {
		out = append(out, k)
	}
	sort.Slice(out, func(i, j int) bool { return out[i] < out[j] })
	return out
}

// System is the MNA system being assembled: the matrix and, for the DC
// solution, the right-hand side. Index −1 is ground and is dropped, so a
// model stamps without caring which of its nodes is grounded. Models see
// only Add, Admit, Branch and Source, so the storage underneath can be a
// dense row-major matrix (M) or, for the solver of a large network, a
// band with the unknowns renumbered (see Factorization).
type System struct {
	N   int
	M   []complex128 // row-major N×N (dense storage)
	RHS []complex128 // nil when the caller supplies excitations itself

	perm    []int    // unknown renumbering for band storage: perm[old] = new
	band    *BandLU  // band storage, when set, instead of M
	rec     *pattern // when set, Add records positions and stores nothing
	outside bool     // an Add fell outside the band
	// visit, when set, receives every entry instead of storing it (the
	// residual and the diagnosis of a singular matrix, balance.go)
	visit func(r, c int, v complex128)
	// loss is every element's LossR at lossF, asked once per frequency
	// (Factorization.Refactor): a part's stamp, its state read twice and
	// the split's dissipation would each evaluate its Q curve again
	loss    []float64
	lossF   float64
	hasLoss bool
	// kept is one value per element that a kind's Stamp may keep for its
	// State at the same frequency (a capacitor's admittance: computed
	// once, not again for each solution read)
	kept []complex128
	// fixed is each element's fixed ratios at this frequency, as its
	// Stamp records them (Fixed; zero for a kind that records none)
	fixed []Ratios
}

// Keep stores v for element e at this system's frequency (see Kept).
func (s *System) Keep(e *Element, v complex128) {
	if s.kept != nil && e.Index < len(s.kept) {
		s.kept[e.Index] = v
	}
}

// Fixed records e's fixed ratios at this system's frequency (see Ratios).
func (s *System) Fixed(e *Element, r Ratios) {
	if s.fixed != nil && e.Index < len(s.fixed) {
		s.fixed[e.Index] = r
	}
}

// Kept returns what e's Stamp kept at frequency f, if the system keeps
// values and is at f.
func (s *System) Kept(e *Element, f float64) (complex128, bool) {
	if s == nil || s.kept == nil || !s.hasLoss || f != s.lossF || e.Index >= len(s.kept) {
		return 0, false
	}
	return s.kept[e.Index], true
}

// LossR is element e's loss resistance at f (Model.LossR), from the
// table of this frequency when the system has one.
func (s *System) LossR(e *Element, f float64) float64 {
	if s != nil && s.hasLoss && f == s.lossF && e.Index < len(s.loss) {
		return s.loss[e.Index]
	}
	return e.Model.LossR(e, f)
}

// Add adds v at row r, column c.
func (s *System) Add(r, c int, v complex128) {
	if r < 0 || c < 0 {
		return
	}
	switch {
	case s.visit != nil:
		s.visit(r, c, v)
	case s.band != nil:
		if !s.band.Add(s.perm[r], s.perm[c], v) {
			s.outside = true
		}
	case s.rec != nil:
		s.rec.add(r, c)
	default:
		s.M[r*s.N+c] += v
	}
}

// Admit stamps an admittance y between nodes a and b.
func (s *System) Admit(a, b int, y complex128) {
	if s.dense() {
		// the same four entries as the Adds below, straight into M
		m, n := s.M, s.N
		if a >= 0 {
			m[a*n+a] += y
		}
		if b >= 0 {
			m[b*n+b] += y
		}
		if a >= 0 && b >= 0 {
			m[a*n+b] -= y
			m[b*n+a] -= y
		}
		return
	}
	s.Add(a, a, y)
	s.Add(b, b, y)
	s.Add(a, b, -y)
	s.Add(b, a, -y)
}

// Branch stamps a branch unknown k carrying current from a to b whose
// branch equation is V(a) − V(b) − z·I = rhs (rhs only at DC).
func (s *System) Branch(a, b, k int, z complex128) {
	if s.dense() && k >= 0 {
		m, n := s.M, s.N
		if a >= 0 {
			m[a*n+k] += 1
			m[k*n+a] += 1
		}
		if b >= 0 {
			m[b*n+k] -= 1
			m[k*n+b] -= 1
		}
		m[k*n+k] -= z
		return
	}
	s.Add(a, k, 1)
	s.Add(b, k, -1)
	s.Add(k, a, 1)
	s.Add(k, b, -1)
	s.Add(k, k, -z)
}

// dense reports whether entries go straight into M (no band, no pattern
// being recorded, no visitor): Admit and Branch then skip Add's checks.
func (s *System) dense() bool {
	return s.visit == nil && s.band == nil && s.rec == nil && s.M != nil
}

// Source adds v to the right-hand side at row r (ignored without one).
func (s *System) Source(r int, v complex128) {
	if r >= 0 && s.RHS != nil {
		s.RHS[r] += v
	}
}

func (s *System) clear() {
	clear(s.M)
	clear(s.RHS)
	if s.band != nil {
		s.band.Clear()
	}
}

// Impedancer is implemented by kinds that are a plain two-terminal
// impedance, so closed-form checks and two-port helpers can ask for it.
type Impedancer interface {
	Impedance(e *Element, f float64) complex128
}

// Impedance of a two-terminal element at f, loss included (NaN for kinds
// that are not a plain impedance).
func (e *Element) Impedance(f float64) complex128 {
	if z, ok := e.Model.(Impedancer); ok {
		return z.Impedance(e, f)
	}
	return complex(math.NaN(), math.NaN())
}

// fieldsFor returns the positional layout of kind k with n fields, if any.
func fieldsFor(k *KindSpec, n int) ([]string, bool) {
	if len(k.Syntax.Fields) == n {
		return k.Syntax.Fields, true
	}
	for _, l := range k.Layouts {
		if len(l) == n {
			return l, true
		}
	}
	return k.Syntax.Fields, false
}
