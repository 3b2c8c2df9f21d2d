package circuits

import (
	"fmt"
	"math"
	"math/cmplx"
)

// Line: a uniform transmission line as the exact telegrapher two-port
// (Pozar, Microwave Engineering, ch. 2 and 4). Unbalanced (coax) it joins
// two nodes with the shield on gnd; balanced (open-wire, twin line) it
// joins two node pairs and carries the differential mode.
//
// The line is stamped with branch unknowns in ABCD form,
//
//	V1 = cosh(γl)·V2 − Z0·sinh(γl)·i2
//	Z0·i1 = sinh(γl)·V2 − Z0·cosh(γl)·i2
//
// with i1, i2 the currents into each end, so a line of zero length (V1 = V2,
// i1 = −i2) and a lossless half-wave line (sinh γl = 0) stay regular where
// the admittance form would not.
//
// Z0 is taken real and γ = α + jβ with α from the matched loss: the
// distortionless line, whose loss per metre is α·(|V|²/Z0 + Z0·|I|²).
//
// Common mode on a balanced line: the pair is taken as one conductor of
// negligible length and loss for common-mode current (a third branch
// unknown ties the mean voltages of the two ends and carries the common
// current through), so a network that feeds it unbalanced still solves and
// shows the common-mode current at the far end. A real feeder radiates
// and loses in common mode; read common-mode figures as an indication.
const Line Kind = "line"

// SpeedOfLight in vacuum, m/s (SI, exact).
const SpeedOfLight = 299792458

// nepersPerDB converts a loss in dB to nepers: 1 Np = 20·log10(e) dB.
var nepersPerDB = 1 / (20 * math.Log10(math.E))

func init() {
	Register(&KindSpec{
		Kind: Line, Model: &lineModel{},
		Syntax: Keyword{Fields: []string{"name", "node", "node"}, Attrs: lineAttrs,
			Required: []string{"z0", "len", "vf"}},
		Layouts: [][]string{{"name", "node", "node", "node", "node"}},
		Prepare: prepareLine,
		Check:   checkLine,
	})
}

var lineAttrs = map[string]AttrSpec{
	"z0":   {Type: TPositive, Units: []string{"ohm"}, Help: "characteristic impedance in Ω, e.g. 50 or 450"},
	"len":  {Type: TPositive, Units: []string{"m"}, NeedUnit: true, Help: "length with a unit (m, cm, mm, ft), e.g. 12m"},
	"vf":   {Type: TPositive, Help: "velocity factor, 0 < vf ≤ 1, e.g. 0.66"},
	"loss": {Type: TPoints, Help: "matched loss in dB per 100 m, or dB@frequency points such as 1.5@10M,4.9@100M"},
	"vpk":  {Type: TPositive, Units: []string{"V"}, Help: "rated peak voltage (dielectric) in V"},
	"pmax": {Type: TPoints, Units: []string{"W"}, Help: "rated matched average power in W, or W@frequency points such as 1.2k@10M,500@100M"},
}

func checkLine(c *Component, errf func(pos Pos, want, format string, args ...any)) {
	if a, ok := c.Attrs["vf"]; ok && a.Num > 1 {
		errf(a.ValPos, "0 < vf ≤ 1, e.g. 0.66 for solid polyethylene coax", "line %s: velocity factor %s is above 1", c.Name, a.Raw)
	}
	if len(c.Nodes) == 4 {
		for i, n := range c.Nodes {
			if n == Ground {
				errf(c.Pos, "four nodes other than gnd for a balanced line, or two nodes for coax with the shield on gnd",
					"balanced line %s has terminal %d on gnd", c.Name, i+1)
				break
			}
		}
	}
}

// LineSpec is a line's electrical description.
type LineSpec struct {
	Z0       float64 // Ω, real
	Len      float64 // m
	VF       float64
	Loss     []Point // dB per 100 m, matched, against frequency; nil: lossless
	Balanced bool
}

func prepareLine(e *Element) {
	a := e.Comp.Attrs
	l := &LineSpec{Balanced: len(e.Nodes) == 4}
	l.Z0, _ = a.Num("z0")
	l.Len, _ = a.Num("len")
	l.VF, _ = a.Num("vf")
	if x, ok := a["loss"]; ok {
		l.Loss = x.Points
	}
	e.line = l
}

// Line returns the element's line description (nil when it is not a line).
func (e *Element) Line() *LineSpec { return e.line }

// Alpha is the attenuation constant in Np/m at f: the matched loss
// interpolated log-log against frequency, like q.
func (l *LineSpec) Alpha(f float64) float64 {
	if len(l.Loss) == 0 || f <= 0 {
		return 0
	}
	return interpLogLog(l.Loss, f) / 100 * nepersPerDB
}

// Gamma is the propagation constant α + jβ at f, β = 2πf/(vf·c).
func (l *LineSpec) Gamma(f float64) complex128 {
	if f <= 0 {
		return 0
	}
	return complex(l.Alpha(f), 2*math.Pi*f/(l.VF*SpeedOfLight))
}

// Wavelength on the line at f, m.
func (l *LineSpec) Wavelength(f float64) float64 { return l.VF * SpeedOfLight / f }

// At returns the voltage and current (towards end 2) at distance z from
// end 1, given end 1's voltage and the current into end 1 at f:
// V(z) = V1·cosh γz − Z0·I1·sinh γz, I(z) = I1·cosh γz − V1/Z0·sinh γz.
func (l *LineSpec) At(v1, i1 complex128, f, z float64) (complex128, complex128) {
	g := l.Gamma(f) * complex(z, 0)
	ch, sh := cmplx.Cosh(g), cmplx.Sinh(g)
	z0 := complex(l.Z0, 0)
	return v1*ch - z0*i1*sh, i1*ch - v1/z0*sh
}

// Waves splits a voltage or current along the line into its forward and
// backward parts at end 1: X(z) = F·e^{−γz} + B·e^{γz}. For the voltage
// F = (V1 + Z0·I1)/2, B = (V1 − Z0·I1)/2; for the current
// F = (I1 + V1/Z0)/2, B = (I1 − V1/Z0)/2.
func (l *LineSpec) Waves(v1, i1 complex128) (fv, bv, fi, bi complex128) {
	z0 := complex(l.Z0, 0)
	fv, bv = (v1+z0*i1)/2, (v1-z0*i1)/2
	fi, bi = (i1+v1/z0)/2, (i1-v1/z0)/2
	return
}

type lineModel struct{}

func (*lineModel) Branches(e *Element) int {
	if e.line != nil && e.line.Balanced {
		return 3
	}
	return 2
}

// ends returns the four terminal nodes: hot and return at end 1, then at
// end 2 (returns are ground for coax).
func lineEnds(e *Element) (a1, b1, a2, b2 int) {
	if len(e.Nodes) == 4 {
		return e.Nodes[0], e.Nodes[1], e.Nodes[2], e.Nodes[3]
	}
	return e.Nodes[0], -1, e.Nodes[1], -1
}

func (*lineModel) Stamp(e *Element, s *System, f float64) {
	l := e.line
	a1, b1, a2, b2 := lineEnds(e)
	k1, k2 := e.Branch, e.Branch+1
	g := l.Gamma(f) * complex(l.Len, 0)
	ch, sh := cmplx.Cosh(g), cmplx.Sinh(g)
	z0 := complex(l.Z0, 0)
	// terminal currents: i1 leaves a1 into the line and returns by b1
	s.Add(a1, k1, 1)
	s.Add(b1, k1, -1)
	s.Add(a2, k2, 1)
	s.Add(b2, k2, -1)
	// V1 − cosh·V2 + Z0·sinh·i2 = 0
	s.Add(k1, a1, 1)
	s.Add(k1, b1, -1)
	s.Add(k1, a2, -ch)
	s.Add(k1, b2, ch)
	s.Add(k1, k2, z0*sh)
	// Z0·i1 − sinh·V2 + Z0·cosh·i2 = 0
	s.Add(k2, k1, z0)
	s.Add(k2, a2, -sh)
	s.Add(k2, b2, sh)
	s.Add(k2, k2, z0*ch)
	if l.Balanced {
		// common mode: half of ic on each wire, mean voltages tied
		k3 := e.Branch + 2
		s.Add(a1, k3, 0.5)
		s.Add(b1, k3, 0.5)
		s.Add(a2, k3, -0.5)
		s.Add(b2, k3, -0.5)
		s.Add(k3, a1, 0.5)
		s.Add(k3, b1, 0.5)
		s.Add(k3, a2, -0.5)
		s.Add(k3, b2, -0.5)
	}
}

// State: V, I are the differential voltage at end 1 and the current into
// it; V2, I2 the same at end 2.
func (*lineModel) State(e *Element, s *System, x []complex128, f float64, st *PartState) {
	a1, b1, a2, b2 := lineEnds(e)
	*st = PartState{V: nodeV(x, a1) - nodeV(x, b1), I: x[e.Branch],
		V2: nodeV(x, a2) - nodeV(x, b2), I2: x[e.Branch+1]}
}

// LossR is zero: a line's loss is not that of one current (see Dissipation).
func (*lineModel) LossR(e *Element, f float64) float64 { return 0 }

// Dissipation is the power into both ends, P_in − P_out.
func (*lineModel) Dissipation(e *Element, st *PartState, f float64) float64 {
	return real(st.V*conj(st.I)) + real(st.V2*conj(st.I2))
}

// CommonModeCurrent is the common-mode current a balanced line carries
// (0 for coax, whose shield current is not modelled apart).
func (e *Element) CommonModeCurrent(x []complex128) complex128 {
	if e.line == nil || !e.line.Balanced {
		return 0
	}
	return x[e.Branch+2]
}

// Describe renders a line's figures for people.
func (l *LineSpec) Describe() string {
	s := fmt.Sprintf("Z0 %s, %s, vf %.3g", FormatSI(l.Z0, "Ω"), FormatSI(l.Len, "m"), l.VF)
	if l.Balanced {
		s = "balanced, " + s
	}
	return s
}
