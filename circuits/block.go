package circuits

import (
	"math"
	"math/cmplx"
)

// Block is a measured two-port whose insides are unknown (a bought or
// sealed filter): `block NAME N1 N2 measured=lpf.s2p`. Port 1 is N1 to
// ground, port 2 is N2 to ground. Its S-parameters are stamped directly:
// one current unknown per port (into the block) and one row per port,
// b = S·a with power waves referred to the file's real references
// (Kurokawa 1965). Unlike a Y or Z stamp this also holds for a bare
// through connection, which has neither.
const Block Kind = "block"

func init() {
	Register(&KindSpec{
		Kind: Block, Model: &blockModel{},
		Syntax: Keyword{Fields: []string{"name", "node", "node"}, Attrs: withMeasured(map[string]AttrSpec{
			"pmax": {Type: TPositive, Units: []string{"W"}, Help: "rated dissipation in W (average)"},
			"vpk":  {Type: TPositive, Units: []string{"V"}, Help: "rated peak voltage at its ports in V"},
		}), Required: []string{"measured"}},
	})
}

type blockModel struct{}

func (*blockModel) Branches(*Element) int { return 2 }

func (*blockModel) Stamp(e *Element, s *System, f float64) {
	k0 := e.Branch
	for k := 0; k < 2; k++ {
		s.Add(e.Nodes[k], k0+k, 1) // the port current leaves its node into the block
	}
	if f == 0 || e.meas == nil {
		// no data at DC: the block is taken as open there
		s.Add(k0, k0, 1)
		s.Add(k0+1, k0+1, 1)
		return
	}
	sm := e.meas.ts.SAt(f)
	ref := e.meas.ts.Ref
	// row k: V_k − R_k·I_k − Σ_j S_kj·√(R_k/R_j)·(V_j + R_j·I_j) = 0
	for k := 0; k < 2; k++ {
		row := k0 + k
		s.Add(row, e.Nodes[k], 1)
		s.Add(row, row, complex(-ref[k], 0))
		for j := 0; j < 2; j++ {
			skj := sm[k*2+j]
			s.Add(row, e.Nodes[j], -skj*complex(math.Sqrt(ref[k]/ref[j]), 0))
			s.Add(row, k0+j, -skj*complex(math.Sqrt(ref[k]*ref[j]), 0))
		}
	}
}

func (*blockModel) State(e *Element, s *System, x []complex128, f float64, st *PartState) {
	*st = PartState{V: nodeV(x, e.Nodes[0]), I: x[e.Branch], V2: nodeV(x, e.Nodes[1]), I2: x[e.Branch+1]}
}

// LossR is 0: a block's dissipation is the net power into its ports.
func (*blockModel) LossR(*Element, float64) float64 { return 0 }

// Dissipation is P_in − P_out = Re(V1·I1*) + Re(V2·I2*), both currents
// into the block (equal to Σ|a|² − |b|² in power waves).
func (*blockModel) Dissipation(e *Element, st *PartState, f float64) float64 {
	return real(st.V*cmplx.Conj(st.I)) + real(st.V2*cmplx.Conj(st.I2))
}
