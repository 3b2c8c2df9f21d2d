package stress

import (
	"fmt"
	"math"
	"math/cmplx"
	"sort"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/optimize"

	"rfstress/circuits"
)

// A measured two-port (a built filter's sweep) against the model of the
// same filter: where they differ, how much of the power the built filter
// turns into heat, and Q scale factors that bring the model to the bench.

// ComparePoint is the model and the measurement at one frequency.
type ComparePoint struct {
	F           float64
	Model, Meas [4]complex128 // S11 S12 S21 S22, referred to the measurement's references
	Where       string        // "band", "off-band", "harmonic" or "sweep"
	Order       int           // harmonic order (1 for carriers and the sweep)
}

// CarrierHeat is the dissipated share at one carrier.
type CarrierHeat struct {
	F                       float64
	OffBand                 bool    // a carrier-also frequency
	ModelShare, MeasShare   float64 // 1 − |S11|² − |S21|²
	ModelW, MeasW           float64 // watts at the audited power
	ModelLossDB, MeasLossDB float64 // insertion loss −20·log|S21|
}

// Worst is the largest difference of one response within a group.
type Worst struct {
	DB   float64 // |model| − |measured| in dB (signed, the largest in size)
	F    float64
	Seen bool
}

// Comparison is the whole comparison.
type Comparison struct {
	File, Measured   string
	Lo, Hi           float64 // measured span
	PowerW           float64
	Points           []ComparePoint
	Carriers         []CarrierHeat
	BandS21, BandS11 Worst
	HarmS21, HarmS11 Worst
	Skipped          []float64 // harmonics outside the measured span
}

// modelS returns the model's S-matrix at f referred to refs (real).
func modelS(c *circuits.Circuit, f float64, refs []float64) ([4]complex128, error) {
	sp, err := c.TwoPort(f)
	if err != nil {
		return [4]complex128{}, err
	}
	s := [4]complex128{sp.S11, sp.S12, sp.S21, sp.S22}
	z1, z2 := real(c.Zin), real(c.Zout)
	if z1 == refs[0] && z2 == refs[1] {
		return s, nil
	}
	return renormalize(s, []float64{z1, z2}, refs)
}

// renormalize re-refers a two-port's S from references r0 to r1 by way of
// its impedance matrix (Kurokawa 1965, real references).
func renormalize(s [4]complex128, r0, r1 []float64) ([4]complex128, error) {
	// Z = √R0 (I − S)⁻¹ (I + S) √R0
	im := [4]complex128{1 - s[0], -s[1], -s[2], 1 - s[3]}
	ip := [4]complex128{1 + s[0], s[1], s[2], 1 + s[3]}
	d := im[0]*im[3] - im[1]*im[2]
	if cmplx.Abs(d) < 1e-300 {
		return s, fmt.Errorf("cannot re-refer S: I − S is singular")
	}
	inv := [4]complex128{im[3] / d, -im[1] / d, -im[2] / d, im[0] / d}
	m := [4]complex128{
		inv[0]*ip[0] + inv[1]*ip[2], inv[0]*ip[1] + inv[1]*ip[3],
		inv[2]*ip[0] + inv[3]*ip[2], inv[2]*ip[1] + inv[3]*ip[3],
	}
	sq := []float64{math.Sqrt(r0[0]), math.Sqrt(r0[1])}
	z := [4]complex128{m[0] * complex(sq[0]*sq[0], 0), m[1] * complex(sq[0]*sq[1], 0), m[2] * complex(sq[1]*sq[0], 0), m[3] * complex(sq[1]*sq[1], 0)}
	// S' = (Z − R1)(Z + R1)⁻¹ scaled by √(R1j/R1i)
	a := [4]complex128{z[0] - complex(r1[0], 0), z[1], z[2], z[3] - complex(r1[1], 0)}
	b := [4]complex128{z[0] + complex(r1[0], 0), z[1], z[2], z[3] + complex(r1[1], 0)}
	db := b[0]*b[3] - b[1]*b[2]
	bi := [4]complex128{b[3] / db, -b[1] / db, -b[2] / db, b[0] / db}
	p := [4]complex128{a[0]*bi[0] + a[1]*bi[2], a[0]*bi[1] + a[1]*bi[3], a[2]*bi[0] + a[3]*bi[2], a[2]*bi[1] + a[3]*bi[3]}
	return [4]complex128{p[0], p[1] * complex(math.Sqrt(r1[1]/r1[0]), 0), p[2] * complex(math.Sqrt(r1[0]/r1[1]), 0), p[3]}, nil
}

// measS is the measurement at f as S11 S12 S21 S22.
func measS(t *circuits.Touchstone, f float64) [4]complex128 {
	s := t.SAt(f)
	return [4]complex128{s[0], s[1], s[2], s[3]}
}

func inSpan(t *circuits.Touchstone, f float64) bool {
	lo, hi := t.Range()
	return f >= lo*(1-1e-9) && f <= hi*(1+1e-9)
}

// Compare sets the model c against measurement t at the carriers, their
// harmonics up to hmax, and every measured frequency. The first nBand
// carriers are the band; the rest are off-band carriers (a wrong filter
// selected), compared and given their heat but not counted as the band.
func Compare(c *circuits.Circuit, t *circuits.Touchstone, carriers []float64, nBand, hmax int, powerW float64) (*Comparison, error) {
	if t.Ports != 2 {
		return nil, fmt.Errorf("%s holds %d-port data; compare needs a two-port (.s2p)", t.File, t.Ports)
	}
	if imag(c.Zin) != 0 || imag(c.Zout) != 0 {
		return nil, fmt.Errorf("compare needs real port impedances; the netlist's are %s and %s",
			circuits.FormatComplex(c.Zin), circuits.FormatComplex(c.Zout))
	}
	cmp := &Comparison{File: c.NL.File, Measured: t.File, PowerW: powerW}
	cmp.Lo, cmp.Hi = t.Range()
	add := func(f float64, where string, order int) error {
		ms, err := modelS(c, f, t.Ref)
		if err != nil {
			return err
		}
		cmp.Points = append(cmp.Points, ComparePoint{F: f, Model: ms, Meas: measS(t, f), Where: where, Order: order})
		return nil
	}
	for _, f := range t.F {
		if err := add(f, "sweep", 1); err != nil {
			return nil, err
		}
	}
	bandLo, bandHi := math.Inf(1), 0.0
	for fi, f := range carriers {
		where := "band"
		if fi < nBand {
			bandLo, bandHi = math.Min(bandLo, f), math.Max(bandHi, f)
		} else {
			where = "off-band"
		}
		if !inSpan(t, f) {
			return nil, fmt.Errorf("carrier %s lies outside the measurement (%s to %s)", circuits.FormatHz(f), circuits.FormatHz(cmp.Lo), circuits.FormatHz(cmp.Hi))
		}
		if err := add(f, where, 1); err != nil {
			return nil, err
		}
		p := cmp.Points[len(cmp.Points)-1]
		h := CarrierHeat{F: f, OffBand: fi >= nBand,
			ModelShare: circuits.DissipatedShare(p.Model[0], p.Model[2]), MeasShare: circuits.DissipatedShare(p.Meas[0], p.Meas[2]),
			ModelLossDB: -circuits.DB(p.Model[2]), MeasLossDB: -circuits.DB(p.Meas[2])}
		// with the source matched to port 1 the incident power is the available power
		h.ModelW, h.MeasW = h.ModelShare*powerW, h.MeasShare*powerW
		cmp.Carriers = append(cmp.Carriers, h)
		for n := 2; n <= hmax; n++ {
			fh := float64(n) * f
			if !inSpan(t, fh) {
				cmp.Skipped = append(cmp.Skipped, fh)
				continue
			}
			if err := add(fh, "harmonic", n); err != nil {
				return nil, err
			}
		}
	}
	// measured points inside the band count as band points too
	for i := range cmp.Points {
		p := &cmp.Points[i]
		if p.Where == "sweep" && p.F >= bandLo*(1-1e-9) && p.F <= bandHi*(1+1e-9) {
			p.Where = "band"
		}
	}
	for _, p := range cmp.Points {
		d21 := circuits.DB(p.Model[2]) - circuits.DB(p.Meas[2])
		d11 := circuits.DB(p.Model[0]) - circuits.DB(p.Meas[0])
		switch p.Where {
		case "band":
			worse(&cmp.BandS21, d21, p.F)
			worse(&cmp.BandS11, d11, p.F)
		case "harmonic":
			worse(&cmp.HarmS21, d21, p.F)
			worse(&cmp.HarmS11, d11, p.F)
		}
	}
	sort.SliceStable(cmp.Points, func(i, j int) bool { return cmp.Points[i].F < cmp.Points[j].F })
	return cmp, nil
}

func worse(w *Worst, d, f float64) {
	if !w.Seen || math.Abs(d) > math.Abs(w.DB) {
		*w = Worst{DB: d, F: f, Seen: true}
	}
}

// FitGroup is one fitted Q scale factor and the parts it applies to.
type FitGroup struct {
	Name  string   // the inductor's name, or "inductors" for the class
	Parts []string // inductor names
	Scale float64  // Q multiplier
	// Q is each part's fitted Q at FitAt (model Q there × Scale)
	Q     []float64
	Sigma float64 // one standard deviation of Scale (from the fit's curvature)
	// AtBound: the search stopped at the edge of its range (Q × 1/50 or
	// × 50): the measurement differs from the model in more than Q
	AtBound bool
}

// qSearchLog bounds the Q factors searched: ×1/50 to ×50.
var qSearchLog = math.Log(50)

func clampLog(x float64) float64 { return math.Max(-qSearchLog, math.Min(qSearchLog, x)) }

// Fit is a least-squares calibration of the model's inductor Q.
type Fit struct {
	Groups     []FitGroup
	Points     int     // measured frequencies used
	RMSBefore  float64 // RMS complex S residual before and after
	RMSAfter   float64
	Lo, Hi     float64
	FitAt      float64 // where the fitted Q values are stated: the fit band's geometric centre
	Iterations int
}

// FitQ fits Q scale factors of the model's inductors to the measured S21
// and S11 at the measured frequencies within [lo, hi]: one factor per
// inductor (perPart) or one for all of them. Residuals are, per point, the
// differences of |S21|, of |S11| and of the dissipated share
// 1 − |S11|² − |S21|²: magnitudes, because a fixture's phase offset is not
// the filter's, and the share, because it is what Q decides and it barely
// moves when a capacitor is a little off value. The factors are searched
// in log scale, within ×1/50 to ×50, with
// gonum's Nelder–Mead, and their uncertainty is the usual linearised
// estimate σ² = s²·(JᵀJ)⁻¹ with s² the residual variance (Gauss–Newton
// covariance; e.g. Press et al., Numerical Recipes, ch. 15).
func FitQ(c *circuits.Circuit, t *circuits.Touchstone, lo, hi float64, perPart bool) (*Fit, error) {
	var fs []float64
	for _, f := range t.F {
		if f >= lo*(1-1e-9) && f <= hi*(1+1e-9) {
			fs = append(fs, f)
		}
	}
	var groups []FitGroup
	var members [][]int
	for i, e := range c.Elements {
		if e.Kind != circuits.Inductor || e.Comp.Attrs["measured"] != nil {
			continue
		}
		if perPart || len(groups) == 0 {
			name := e.Name
			if !perPart {
				name = "inductors"
			}
			groups = append(groups, FitGroup{Name: name})
			members = append(members, nil)
		}
		g := len(groups) - 1
		groups[g].Parts = append(groups[g].Parts, e.Name)
		members[g] = append(members[g], i)
	}
	if len(groups) == 0 {
		return nil, fmt.Errorf("the netlist has no modelled inductor whose Q could be fitted")
	}
	if len(fs)*3 <= len(groups) {
		return nil, fmt.Errorf("the measurement has %d points between %s and %s, too few to fit %d factors (widen the fit band)",
			len(fs), circuits.FormatHz(lo), circuits.FormatHz(hi), len(groups))
	}
	meas := make([][4]complex128, len(fs))
	for i, f := range fs {
		meas[i] = measS(t, f)
	}
	qf := make([]float64, len(c.Elements))
	var solveErr error
	residuals := func(x []float64, out []float64) []float64 {
		for i := range qf {
			qf[i] = 1
		}
		for g, m := range members {
			for _, i := range m {
				qf[i] = math.Exp(clampLog(x[g]))
			}
		}
		sc := c.Scaled(nil, qf)
		out = out[:0]
		for i, f := range fs {
			ms, err := modelS(sc, f, t.Ref)
			if err != nil {
				solveErr = err
				ms = [4]complex128{}
			}
			me := meas[i]
			out = append(out,
				cmplx.Abs(ms[2])-cmplx.Abs(me[2]),
				cmplx.Abs(ms[0])-cmplx.Abs(me[0]),
				circuits.DissipatedShare(ms[0], ms[2])-circuits.DissipatedShare(me[0], me[2]))
		}
		return out
	}
	buf := make([]float64, 0, 3*len(fs))
	ssq := func(x []float64) float64 {
		var s float64
		for _, r := range residuals(x, buf) {
			s += r * r
		}
		return s
	}
	x0 := make([]float64, len(groups))
	before := ssq(x0)
	res, err := optimize.Minimize(optimize.Problem{Func: ssq}, x0,
		&optimize.Settings{Converger: &optimize.FunctionConverge{Absolute: 1e-16, Relative: 1e-12, Iterations: 200}, MajorIterations: 4000},
		&optimize.NelderMead{})
	if err != nil && res == nil {
		return nil, fmt.Errorf("fit did not run: %v", err)
	}
	if solveErr != nil {
		return nil, solveErr
	}
	x := res.X
	after := ssq(x)
	// Jacobian by central differences in log scale
	m, p := 3*len(fs), len(x)
	jac := mat.NewDense(m, p, nil)
	const h = 1e-5
	for j := 0; j < p; j++ {
		xp := append([]float64(nil), x...)
		xm := append([]float64(nil), x...)
		xp[j] += h
		xm[j] -= h
		rp := append([]float64(nil), residuals(xp, buf)...)
		rm := residuals(xm, buf)
		for i := 0; i < m; i++ {
			jac.Set(i, j, (rp[i]-rm[i])/(2*h))
		}
	}
	var jtj mat.Dense
	jtj.Mul(jac.T(), jac)
	var cov mat.Dense
	dof := float64(m - p)
	invOK := cov.Inverse(&jtj) == nil
	fit := &Fit{Points: len(fs), Lo: lo, Hi: hi, Iterations: res.Stats.MajorIterations,
		RMSBefore: math.Sqrt(before / float64(m)), RMSAfter: math.Sqrt(after / float64(m))}
	for g := range groups {
		groups[g].Scale = math.Exp(clampLog(x[g]))
		groups[g].AtBound = math.Abs(clampLog(x[g])-x[g]) > 0 || math.Abs(math.Abs(x[g])-qSearchLog) < 1e-6
		groups[g].Sigma = math.Inf(1)
		if invOK && dof > 0 {
			if v := cov.At(g, g) * after / dof; v >= 0 {
				// σ of log scale is the relative σ of the scale
				groups[g].Sigma = math.Sqrt(v) * groups[g].Scale
			}
		}
	}
	fit.FitAt = math.Sqrt(lo * hi)
	for g := range groups {
		for _, i := range members[g] {
			groups[g].Q = append(groups[g].Q, c.Elements[i].Q(fit.FitAt)*groups[g].Scale)
		}
	}
	fit.Groups = groups
	return fit, nil
}
