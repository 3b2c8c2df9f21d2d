package circuits

import (
	"math"
	"math/cmplx"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"
)

// This file holds the independent references the tests compare against:
// an ABCD (chain-matrix) cascade, element impedances computed from the
// loss definitions, and small helpers. Nothing here calls the solver.

// abcd is a two-port chain matrix (Pozar, Microwave Engineering, ch. 4).
type abcd struct{ A, B, C, D complex128 }

// identity is the chain matrix of a plain through connection.
var identity = abcd{1, 0, 0, 1}

// seriesZ is the chain matrix of a series impedance: [[1, Z], [0, 1]]
// (Pozar, ch. 4, ABCD table).
func seriesZ(z complex128) abcd { return abcd{1, z, 0, 1} }

// shuntY is the chain matrix of a shunt admittance: [[1, 0], [Y, 1]]
// (Pozar, ch. 4, ABCD table).
func shuntY(y complex128) abcd { return abcd{1, 0, y, 1} }

// then cascades m followed by n (matrix product m·n).
func (m abcd) then(n abcd) abcd {
	return abcd{
		A: m.A*n.A + m.B*n.C, B: m.A*n.B + m.B*n.D,
		C: m.C*n.A + m.D*n.C, D: m.C*n.B + m.D*n.D,
	}
}

// zin is the input impedance with load zl: (A·ZL + B)/(C·ZL + D).
func (m abcd) zin(zl complex128) complex128 { return (m.A*zl + m.B) / (m.C*zl + m.D) }

// loadCurrent is the current into load zl for an EMF e behind zs:
// from V1 = A·V2 + B·I2, I1 = C·V2 + D·I2, V2 = ZL·I2, E = Zs·I1 + V1.
func (m abcd) loadCurrent(e, zs, zl complex128) complex128 {
	return e / (m.A*zl + m.B + zs*(m.C*zl+m.D))
}

// openVoltage is V2 with no load (I2 = 0): E/(A + Zs·C).
func (m abcd) openVoltage(e, zs complex128) complex128 { return e / (m.A + zs*m.C) }

// s21Pozar is S21 for equal real reference impedances z0:
// 2/(A + B/Z0 + C·Z0 + D) (Pozar, ch. 4).
func (m abcd) s21Pozar(z0 float64) complex128 {
	z := complex(z0, 0)
	return 2 / (m.A + m.B/z + m.C*z + m.D)
}

// s21Power is S21 for power waves (Kurokawa 1965) referred to z1 and z2,
// derived from a1 = E/(2√R1) and b2 = √R2·I_L with port 2 loaded by z2:
// S21 = 2√(R1·R2)/(A·Z2 + B + C·Z1·Z2 + D·Z1).
func (m abcd) s21Power(z1, z2 complex128) complex128 {
	return complex(2*math.Sqrt(real(z1)*real(z2)), 0) / (m.A*z2 + m.B + m.C*z1*z2 + m.D*z1)
}

// gammaPower is the power-wave reflection (Z − Z0*)/(Z + Z0) (Kurokawa 1965).
func gammaPower(z, z0 complex128) complex128 { return (z - cmplx.Conj(z0)) / (z + z0) }

// zout is the impedance seen back into port 2 with port 1 terminated in z1:
// the reversed chain of a reciprocal two-port is [[D, B], [C, A]].
func (m abcd) zout(z1 complex128) complex128 { return (m.D*z1 + m.B) / (m.C*z1 + m.A) }

// lossModel is how a test states a part's loss, written out independently
// of the package: a constant Q, Q points, an ESR or a dissipation factor.
type lossModel struct {
	q      float64
	qf     [][2]float64 // (Q, f) points, rising f
	esr    float64
	df     float64
	noLoss bool // resistor
}

// qAt is the Q at f for Q points read as straight lines between points on
// log-log axes, held at the end values: Q = Qa·(f/fa)^(ln(Qb/Qa)/ln(fb/fa)).
func (l lossModel) qAt(f float64) float64 {
	if len(l.qf) == 0 {
		return l.q
	}
	if f <= l.qf[0][1] {
		return l.qf[0][0]
	}
	for i := 1; i < len(l.qf); i++ {
		a, b := l.qf[i-1], l.qf[i]
		if f <= b[1] {
			slope := math.Log(b[0]/a[0]) / math.Log(b[1]/a[1])
			return a[0] * math.Pow(f/a[1], slope)
		}
	}
	return l.qf[len(l.qf)-1][0]
}

// refInductorZ is R_s + jωL with R_s = ωL/Q (common practice: Q = X/R).
func refInductorZ(l float64, loss lossModel, f float64) complex128 {
	w := 2 * math.Pi * f
	return complex(w*l/loss.qAt(f), w*l)
}

// refCapacitorZ is ESR − j/(ωC) with ESR = 1/(ωCQ), or the given esr, or
// tan δ/(ωC) (common practice: Q = X/R = 1/tan δ).
func refCapacitorZ(c float64, loss lossModel, f float64) complex128 {
	w := 2 * math.Pi * f
	x := 1 / (w * c)
	var r float64
	switch {
	case loss.esr > 0:
		r = loss.esr
	case loss.df > 0:
		r = loss.df * x
	default:
		r = x / loss.qAt(f)
	}
	return complex(r, -x)
}

// relErr is |a − b| / |b|, or |a − b| when b is 0.
func relErr(a, b complex128) float64 {
	d := cmplx.Abs(a - b)
	if m := cmplx.Abs(b); m > 0 {
		return d / m
	}
	return d
}

// scaledErr is |a − b| / max(|b|, floor): relative, but measured against a
// floor for quantities far below the largest of their kind.
func scaledErr(a, b complex128, floor float64) float64 {
	return cmplx.Abs(a-b) / math.Max(cmplx.Abs(b), floor)
}

// mustParse parses and builds a netlist text, failing the test on error.
func mustParse(t testing.TB, name, text string) (*Netlist, *Circuit) {
	t.Helper()
	nl, err := Parse(name, []byte(text))
	if err != nil {
		t.Fatalf("parse %s: %v\n%s", name, err, text)
	}
	c, err := Build(nl)
	if err != nil {
		t.Fatalf("build %s: %v", name, err)
	}
	return nl, c
}

// goodNetlists returns the valid test netlists in testdata (bad_* files
// are meant to fail), sorted by name.
func goodNetlists(t testing.TB) map[string]string {
	t.Helper()
	files, err := filepath.Glob(filepath.Join("testdata", "*.net"))
	if err != nil {
		t.Fatal(err)
	}
	out := map[string]string{}
	for _, f := range files {
		if strings.HasPrefix(filepath.Base(f), "bad_") {
			continue
		}
		b, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		out[f] = string(b)
	}
	if len(out) < 5 {
		t.Fatalf("expected at least 5 test netlists in testdata, found %d", len(out))
	}
	return out
}

func sortedKeys(m map[string]string) []string {
	ks := make([]string, 0, len(m))
	for k := range m {
		ks = append(ks, k)
	}
	sort.Strings(ks)
	return ks
}

// testFreqs are carriers across the HF amateur bands and the 6 m band,
// with some harmonics (common practice: band edges from memory; any
// spread of frequencies serves these checks).
var testFreqs = []float64{1.85e6, 3.6e6, 7.1e6, 10.12e6, 14.2e6, 21.2e6, 28.5e6, 42.6e6, 50.1e6, 85.2e6}
