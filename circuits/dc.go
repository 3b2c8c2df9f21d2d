package circuits

import (
	"fmt"
	"math"
	"sort"
	"strings"
)

// DC is the DC solution of a network: every kind stamped at f = 0
// (capacitors open, windings as their DC resistance, resistors as
// themselves, supplies and draws as sources), ports open. A node with no
// DC path to gnd or a supply is at 0 V.
type DC struct {
	Any   bool        // false: the network has no DC source, everything is 0
	Nodes []float64   // node voltages, V
	Parts []PartState // per element: V across, I through, flux linkage (real)
	P     []float64   // power each element absorbs, W (negative for a source delivering)
	// Unfed lists nodes where a draw takes current but no DC path leads
	// to a supply or gnd; those draws are left out (a part failed open
	// can cut a valve's supply). For an intact netlist it is an error.
	Unfed []string
}

// UnfedError is the input error for DC.Unfed.
func (d *DC) UnfedError() error {
	if len(d.Unfed) == 0 {
		return nil
	}
	return fmt.Errorf("DC current drawn at node %s, which has no DC path to a supply or gnd (a draw needs a supply through a choke or resistor)", strings.Join(d.Unfed, ", "))
}

// SolveDC solves the network at DC. rdc, when not nil, gives per element
// a DC resistance for windings whose netlist states none (the winding's
// wire resistance, known to the ratings layer).
func (c *Circuit) SolveDC(rdc []float64) (*DC, error) {
	nn, ne := len(c.Nodes), len(c.Elements)
	out := &DC{Nodes: make([]float64, nn), Parts: make([]PartState, ne), P: make([]float64, ne)}
	els := c.Elements
	if rdc != nil {
		els = make([]Element, ne)
		copy(els, c.Elements)
		for i := range els {
			if els[i].Rdc == 0 && i < len(rdc) && rdc[i] > 0 {
				els[i].Rdc = rdc[i]
			}
		}
	}
	n := c.Size()
	s := &System{N: n, M: make([]complex128, n*n), RHS: make([]complex128, n)}
	for i := range els {
		els[i].Model.Stamp(&els[i], s, 0)
	}
	for _, v := range s.RHS {
		if v != 0 {
			out.Any = true
		}
	}
	if !out.Any {
		return out, nil
	}
	out.Unfed = c.pinFloating(s)
	lu := NewLU(n)
	if err := lu.Factor(s.M); err != nil {
		return nil, fmt.Errorf("DC solution: %w", err)
	}
	x := s.RHS
	lu.Solve(x)
	for i := 0; i < nn; i++ {
		out.Nodes[i] = real(x[i])
	}
	for i := range els {
		e := &els[i]
		st := &out.Parts[i]
		e.Model.State(e, s, x, 0, st)
		st.V, st.I = complex(real(st.V), 0), complex(real(st.I), 0)
		out.P[i] = real(st.V) * real(st.I)
	}
	for _, mu := range c.mutuals {
		m := complex(mu.k*math.Sqrt(els[mu.i].Value*els[mu.j].Value), 0)
		out.Parts[mu.i].Lambda += m * out.Parts[mu.j].I
		out.Parts[mu.j].Lambda += m * out.Parts[mu.i].I
	}
	return out, nil
}

// pinFloating finds the unknowns with no DC path to gnd (read from the
// matrix's pattern, so no kind needs to say how it conducts DC) and fixes
// them at 0. It returns the nodes where a draw sits in such a section:
// its current has nowhere to go, so it is dropped.
func (c *Circuit) pinFloating(s *System) []string {
	n, nn := s.N, len(c.Nodes)
	parent := make([]int, n+1) // n is gnd
	for i := range parent {
		parent[i] = i
	}
	var find func(int) int
	find = func(i int) int {
		for parent[i] != i {
			parent[i] = parent[parent[i]]
			i = parent[i]
		}
		return i
	}
	union := func(a, b int) { parent[find(a)] = find(b) }
	for r := 0; r < n; r++ {
		row := s.M[r*n : r*n+n]
		var sum complex128
		var big float64
		for col, v := range row {
			if v == 0 {
				continue
			}
			if col != r {
				union(r, col)
			}
			if col < nn {
				sum += v
				big = math.Max(big, abs1(v))
			}
		}
		// a row whose node columns do not cancel is tied to gnd: an
		// admittance or a branch to gnd
		if big > 0 && abs1(sum) > 1e-9*big {
			union(r, n)
		}
	}
	var bad []string
	for r := 0; r < n; r++ {
		if find(r) == find(n) {
			continue
		}
		if s.RHS[r] != 0 && r < nn {
			bad = append(bad, c.Nodes[r])
		}
		row := s.M[r*n : r*n+n]
		clear(row)
		row[r] = 1
		s.RHS[r] = 0
	}
	sort.Strings(bad)
	return bad
}
