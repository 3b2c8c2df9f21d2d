package stress

import (
	"math"
	"math/cmplx"
	"os"
	"testing"

	"rfstress/circuits"
	"rfstress/ratings"
)

func stationFile(t *testing.T, name string) string {
	t.Helper()
	b, err := os.ReadFile("../testdata/station/" + name)
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

// swrOf is the SWR of z against a real reference r0 (Pozar sec. 2.3:
// Γ = (Z − R0)/(Z + R0), SWR = (1 + |Γ|)/(1 − |Γ|)).
func swrOf(z complex128, r0 float64) float64 {
	g := cmplx.Abs((z - complex(r0, 0)) / (z + complex(r0, 0)))
	return (1 + g) / (1 - g)
}

// TestTxWrongBandFilter: the 80 m lowpass of the example station left
// selected at 14.2 MHz. Its input impedance, from the ladder's continued
// fraction written here (each shunt C and series L from the far end to the
// near end, 50 Ω load), is what the engine reports for the transmitter, to
// 1e-9; far in the stopband the lossless-ish ladder reflects nearly
// everything (common practice: a lowpass far above cutoff is close to a
// pure reactance), so the transmitter sees an SWR above 40, and with
// tx-swr-max=2 the audit fails on transmitter protection.
func TestTxWrongBandFilter(t *testing.T) {
	fx := build(t, stationFile(t, "lpf-80m.net"), "swr=1", "faults=none", "harmonics=none", "carrier-also=14.2M", "tx-swr-max=2")
	sec, err := fx.eng.Audit()
	if err != nil {
		t.Fatal(err)
	}
	tx := sec.Tx
	cs := fx.eng.Case(tx.Worst.Case)
	if cs.F != 14.2e6 {
		t.Fatalf("worst transmitter case at %g Hz, want 14.2 MHz", cs.F)
	}
	// the ladder from the load back: parallel C's add admittance, series L's add impedance
	const f = 14.2e6
	z := complex(50, 0)
	for i := len(fx.c.Elements) - 1; i >= 0; i-- {
		el := &fx.c.Elements[i]
		zi := el.Impedance(f)
		if el.Kind == circuits.Capacitor {
			z = 1 / (1/z + 1/zi)
		} else {
			z += zi
		}
	}
	if d := cmplx.Abs(tx.Worst.Zin-z) / cmplx.Abs(z); d > 1e-9 {
		t.Errorf("Zin %v, ladder %v", tx.Worst.Zin, z)
	}
	if want := swrOf(z, 50); math.Abs(tx.Worst.SWR-want) > 1e-6*want {
		t.Errorf("SWR %g, from the ladder %g", tx.Worst.SWR, want)
	}
	if tx.Worst.SWR < 40 {
		t.Errorf("SWR %g at 14.2 MHz through an 80 m lowpass: want a near-total reflection", tx.Worst.SWR)
	}
	rl := -20 * math.Log10(tx.Worst.Gamma)
	t.Logf("80 m lowpass at 14.2 MHz: Zin %v, SWR %.1f, return loss %.3f dB, reflected %.1f of %.1f W forward",
		tx.Worst.Zin, tx.Worst.SWR, rl, tx.Worst.ReflW, tx.Worst.FwdW)
	if tx.Verdict != ratings.Fail || sec.Verdict != ratings.Fail {
		t.Errorf("tx-swr-max=2: transmitter verdict %v, section %v; want fail", tx.Verdict, sec.Verdict)
	}
	// in band the filter is matched: its worst in-band SWR stays low
	if m := tx.ByKind[Matched]; m.Case < 0 {
		t.Error("no matched case recorded")
	}
}

// TestTxCircleWorst: on the SWR circle the transmitter's worst is that of
// the continuous circle, never below any sampled load's full solve and
// within the circle's chord sag of them (72 phases, 1 % allowed). The
// wattmeter's readings obey Kurokawa's power balance (1965):
// |a|² − |b|² = Re(V·I*), the power entering the network, to 1e-9.
func TestTxCircleWorst(t *testing.T) {
	fx := build(t, stationFile(t, "tuner-80m-vertical.net"), "swr=2", "faults=none")
	sec, err := fx.eng.Audit()
	if err != nil {
		t.Fatal(err)
	}
	var sampled float64
	for i := 0; i < fx.eng.NumCases(); i++ {
		cs := fx.eng.Case(i)
		r := fullSolve(t, fx.c, cs.F, fx.cond.PowerW, cs.Load)
		sampled = math.Max(sampled, swrOf(r.Zin, 50))
	}
	got := sec.Tx.Worst.SWR
	if got < sampled*(1-1e-9) || got > sampled*1.01 {
		t.Errorf("transmitter SWR %g, sampled full solves %g", got, sampled)
	}
	v := sec.Tx.Worst
	pin := v.FwdW - v.ReflW
	// the continuous worst sits between sampled phases: compare the
	// balance with a solve of its own impedance
	zin := v.Zin
	e := fx.c.EMFForPower(fx.cond.PowerW)
	i := complex(e, 0) / (fx.c.Zs + zin)
	if want := real(zin) * cmplx.Abs(i) * cmplx.Abs(i); math.Abs(pin-want) > 1e-9*want {
		t.Errorf("forward − reflected %g W, power into Zin %g W", pin, want)
	}
}

// TestTxLimitSetting: tx-swr-max is read from the audit line and the flag
// and refused below 1.
func TestTxLimitSetting(t *testing.T) {
	c := Defaults()
	if err := c.Apply([]Setting{{Key: "tx-swr-max", Value: "2", Flag: true}}); err != nil || c.TxSWRMax != 2 {
		t.Errorf("tx-swr-max=2: %v, %g", err, c.TxSWRMax)
	}
	if err := c.Apply([]Setting{{Key: "tx-swr-max", Value: "0.5", Flag: true}}); err == nil {
		t.Error("tx-swr-max=0.5 accepted")
	}
}

// TestTxCircleWorstFinePhases: with more phases than the crest search's
// 72 points the sampled phases are not all visited; the worst must still
// match full solves of every case (each case solved on its own) and never
// fall below any of them.
func TestTxCircleWorstFinePhases(t *testing.T) {
	fx := build(t, stationFile(t, "tuner-80m-vertical.net"), "swr=2", "faults=none", "phases=720", "harmonics=none")
	sec, err := fx.eng.Audit()
	if err != nil {
		t.Fatal(err)
	}
	var sampled float64
	for i := 0; i < fx.eng.NumCases(); i++ {
		cs := fx.eng.Case(i)
		r := fullSolve(t, fx.c, cs.F, fx.cond.PowerW, cs.Load)
		sampled = math.Max(sampled, swrOf(r.Zin, 50))
	}
	// between samples the crest falls by about c·δ², δ ≤ π/720 from the
	// nearest phase and c of order one for this tuner: 1e-4 above the
	// sampled worst bounds the continuous one
	got := sec.Tx.Worst.SWR
	if got < sampled*(1-1e-9) || got > sampled*(1+1e-4) {
		t.Errorf("transmitter SWR %g, sampled full solves %g", got, sampled)
	}
	cs := sec.Case(sec.Tx.Worst.Case)
	if cs.Kind != Circle {
		t.Errorf("worst transmitter case is %v, want a phase of the circle", cs.Kind)
	}
	// the worst is an exact case of its own: its load, solved in full,
	// gives the reported SWR (1e-6: the crest search stops at 1e-8 rad)
	if r := fullSolve(t, fx.c, cs.F, fx.cond.PowerW, cs.Load); relErr(swrOf(r.Zin, 50), got) > 1e-6 {
		t.Errorf("worst case's load %v gives SWR %g, reported %g", cs.Load.Z, swrOf(r.Zin, 50), got)
	}
}
