package stress

import (
	"fmt"
	"math"
	"math/cmplx"
	"strconv"
	"strings"

	"rfstress/circuits"
	"rfstress/ratings"
)

// What the transmitter sees: for every case the impedance at its port,
// the reflection against the port's reference z (Kurokawa power waves with
// reference z*, as for the load circle: Γ = (Zin − z)/(Zin + z*), which
// vanishes when the transmitter sees z), the SWR, and the power a
// directional wattmeter calibrated for z reads as reflected,
// |V − z·I|²/(4·Re z). A lowpass for the wrong band, or an open antenna
// behind a lossless tuner, shows here as a high SWR.

// txSWRCap keeps the SWR of a total reflection finite for outputs.
const txSWRCap = 1e6

// TxView is the transmitter port in one case.
type TxView struct {
	Zin   complex128
	Gamma float64 // |Γ|
	SWR   float64
	ReflW float64 // reflected power by a wattmeter calibrated for z
	FwdW  float64
	Case  int
}

// TxResult is the worst the transmitter sees over every case.
type TxResult struct {
	Worst  TxView
	ByKind [nKind]TxView // worst per kind of case; Case −1 when none
	// InBandBest is the lowest SWR the transmitter sees over the band's own
	// carriers with the antenna port matched (Case −1 when none): a filter
	// or matched tuner passes its band, so a high figure here means the
	// network as written does not, as after a unit slip (390n for 390p).
	InBandBest TxView
	Limit      float64 // tx-swr-max; 0 when not set
	// Verdict against Limit (ok or fail; ok when no limit is set): the
	// limit is the transmitter's own protection threshold, used as is.
	Verdict ratings.Verdict
}

// SWRFromGamma is (1 + |Γ|)/(1 − |Γ|), capped for a total reflection.
func SWRFromGamma(g float64) float64 {
	if !(g < 1) {
		return txSWRCap
	}
	return math.Min((1+g)/(1-g), txSWRCap)
}

// txAt is the transmitter's view for weight α and EMF scale (rms volts).
func (e *Engine) txAt(s *circuits.Split, alpha complex128, scale float64) TxView {
	vin := (s.Vin[0] + alpha*s.Vin[1]) * complex(scale, 0)
	iin := (complex(scale, 0) - vin) / s.Zs
	z := e.C.Zin
	den := vin + cmplx.Conj(z)*iin
	var v TxView
	if iin != 0 {
		v.Zin = vin / iin
	} else {
		v.Zin = complex(math.Inf(1), 0)
	}
	if d := absExact(den); d > 0 {
		v.Gamma = absExact(vin-z*iin) / d
	} else {
		v.Gamma = 1
	}
	v.SWR = SWRFromGamma(v.Gamma)
	rz := 4 * real(z)
	b, a := vin-z*iin, vin+cmplx.Conj(z)*iin
	v.ReflW = (real(b)*real(b) + imag(b)*imag(b)) / rz
	v.FwdW = (real(a)*real(a) + imag(a)*imag(a)) / rz
	return v
}

func (w *workspace) keepTx(v TxView, kind CaseKind) {
	if v.SWR > w.tx.Worst.SWR || w.tx.Worst.Case < 0 {
		w.tx.Worst = v
	}
	if k := &w.tx.ByKind[kind]; v.SWR > k.SWR || k.Case < 0 {
		*k = v
	}
}

func (w *workspace) resetTx() {
	w.tx = TxResult{}
	w.tx.Worst.Case = -1
	w.tx.InBandBest.Case = -1
	for k := range w.tx.ByKind {
		w.tx.ByKind[k].Case = -1
	}
}

// txCase records the transmitter's view of one case.
func (e *Engine) txCase(w *workspace, ci int, kind CaseKind, alpha complex128) {
	scale, _ := e.drive(w, alpha)
	v := e.txAt(w.carr, alpha, scale)
	v.Case = ci
	w.keepTx(v, kind)
	if kind == Matched && !e.Case(ci).OffBand {
		if b := &w.tx.InBandBest; b.Case < 0 || v.SWR < b.SWR {
			*b = v
		}
	}
}

// NoPassSWR is the lowest SWR over the band, antenna matched, above which
// a network is said not to pass its own carrier: SWR 3 reflects a quarter
// of the power, more than any usual filter ripple (a 1 dB Chebyshev
// reaches 2.66 at worst, common practice) or tuner match leaves.
const NoPassSWR = 3

// passFinding warns when the network does not pass its own band.
func passFinding(s *Section) {
	b := s.Tx.InBandBest
	if s.Wrong || b.Case < 0 || !(b.SWR > NoPassSWR) {
		return
	}
	s.NoPass = true
	s.Findings = append(append([]ratings.Finding(nil), s.Findings...), ratings.Finding{Pos: circuits.Pos{File: s.File, Line: 1, Col: 1}, Severity: "warning",
		Text: fmt.Sprintf(noPassText+": with the antenna port matched the transmitter sees SWR %s at best (%s), %.0f %% of the forward power reflected; check the values and their units (n for p, u for n), the nodes, and a tuner's settings",
			swrWords(b.SWR), s.Case(b.Case).Describe(), 100*b.Gamma*b.Gamma)})
}

// dropPassFinding withdraws passFinding's warning.
func dropPassFinding(s *Section) {
	if !s.NoPass {
		return
	}
	s.NoPass = false
	var keep []ratings.Finding
	for _, f := range s.Findings {
		if !strings.HasPrefix(f.Text, noPassText) {
			keep = append(keep, f)
		}
	}
	s.Findings = keep
}

const noPassText = "the network does not pass its own band"

// swrWords is an SWR for a sentence: beyond 100:1 the digits mean nothing.
func swrWords(v float64) string {
	if v > 100 {
		return "above 100"
	}
	return strconv.FormatFloat(v, 'f', 2, 64)
}

// txCircle records the worst the transmitter sees over the SWR circle:
// the continuous circle's crest and the sampled phases beside it. Γ at the transmitter is
// a bilinear (Möbius) function of the weight α, which runs on a circle,
// so |Γ| has one crest on it, found in closed form (txCrest), or else as
// the best of 72 points along the α circle refined by golden-section
// search; the worst reported is never below any sampled load.
func (e *Engine) txCircle(w *workspace, first int) {
	s := w.carr
	ca, ra, ok := w.ca, w.ra, w.caOK
	const n = 72
	if !ok || ra == 0 {
		// no α circle to follow: every sampled phase
		for j := 0; j < e.nPhase; j++ {
			e.txCase(w, first+j, Circle, s.Alpha(e.circleLoad(w.zc, j)))
		}
		return
	}
	a, ok := e.txCrest(w, ca, ra)
	if !ok {
		at := func(phi float64) complex128 { return ca + complex(ra*math.Cos(phi), ra*math.Sin(phi)) }
		gam := func(phi float64) float64 {
			a := at(phi)
			scale, _ := e.drive(w, a)
			return e.txAt(s, a, scale).Gamma
		}
		best, bj := -1.0, 0
		for j := 0; j < n; j++ {
			if g := gam(2 * math.Pi * float64(j) / n); g > best {
				best, bj = g, j
			}
		}
		step := 2 * math.Pi / n
		phi, _ := circuits.GoldenMax(gam, float64(bj)*step-step, float64(bj)*step+step, 1e-8) // 1e-8 rad: the crest is flat to 1e-16 there
		a = at(phi)
	}
	scale, _ := e.drive(w, a)
	v := e.txAt(s, a, scale)
	j := e.phaseOfAlpha(w, a)
	v.Case = first + j
	if m := e.nPhase; m > 0 {
		// |Γ| has one crest on the circle, so no sampled phase beats the
		// continuous worst; the phases beside it are recorded (they can
		// only tie) instead of a scan of every phase, which would cost
		// what the rest of the audit does not: per phase, not per crest
		for d := -1; d <= 1; d++ {
			jj := ((j+d)%m + m) % m
			e.txCase(w, first+jj, Circle, s.Alpha(e.circleLoad(w.zc, jj)))
		}
	}
	if v.SWR > w.tx.Worst.SWR && w.record && ca != 0 {
		// the new worst: an exact case of its own, as for the parts
		v.Case = e.circleIndex(w, first, a, false)
		e.record(w, first, s.F, a)
	}
	w.keepTx(v, Circle)
}

// txCrest finds the weight α on the α circle (centre ca, radius ra) where
// the transmitter's |Γ| is largest, in closed form. Γ = num/den with num
// = vin − z·iin and den = vin + z*·iin, both affine in α (the drive scale
// cancels), so Γ is a Möbius function of α and the α circle maps to a
// circle in the Γ plane, fitted through three of its points; its point
// farthest from the origin is the crest, and inverting the map gives its
// α. It reports false when the fit fails (the image is nearly a line) or
// the crest does not beat the three points, and the caller searches.
func (e *Engine) txCrest(w *workspace, ca complex128, ra float64) (complex128, bool) {
	s := w.carr
	z := e.C.Zin
	lin := func(alpha complex128) (num, den complex128) {
		vin := s.Vin[0] + alpha*s.Vin[1]
		iin := (1 - vin) / s.Zs
		return vin - z*iin, vin + cmplx.Conj(z)*iin
	}
	n0, d0 := lin(0)
	n1, d1 := lin(1)
	a1, b1 := n1-n0, d1-d0
	var g [3]complex128
	most := 0.0
	for k := range g {
		phi := 2 * math.Pi * float64(k) / 3
		al := ca + complex(ra*math.Cos(phi), ra*math.Sin(phi))
		den := d0 + b1*al
		if den == 0 {
			return 0, false
		}
		g[k] = (n0 + a1*al) / den
		most = math.Max(most, cmplx.Abs(g[k]))
	}
	c, r, ok := circleThrough(g[0], g[1], g[2])
	if !ok {
		return 0, false
	}
	crest := complex(r, 0)
	if m := cmplx.Abs(c); m > 0 {
		crest = c * complex(1+r/m, 0)
	}
	// Γ = (n0 + a1·α)/(d0 + b1·α)  ⇒  α = (n0 − d0·Γ)/(b1·Γ − a1)
	q := b1*crest - a1
	if q == 0 {
		return 0, false
	}
	alpha := (n0 - d0*crest) / q
	scale, _ := e.drive(w, alpha)
	if g := e.txAt(s, alpha, scale).Gamma; !(g >= most*(1-1e-12)) {
		return 0, false
	}
	return alpha, true
}

// judgeTx sets the transmitter verdict against tx-swr-max.
func (e *Engine) judgeTx(t *TxResult) {
	t.Limit = e.Cond.TxSWRMax
	if t.Limit > 0 && t.Worst.SWR > t.Limit {
		t.Verdict = ratings.Fail
	}
}
