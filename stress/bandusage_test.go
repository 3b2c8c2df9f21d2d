package stress

import (
	"math"
	"testing"
)

// A 1 pF capacitor across a matched 50 Ω line: at 100 W it sees the line
// voltage, 100 V peak (common practice: V = √(2·P·R) = √(2·100·50)), at
// every frequency of a 1–2 MHz band (its 80 kΩ reactance barely loads the
// line: the voltage moves by less than 0.1 %, the tolerance).
const shuntCapNet = `title shunt cap
port in a z=50
port out b z=50
resistor R1 a b 1m
capacitor C1 b gnd 1p dielectric=mica vpk=500 irms=10
`

func TestBandUseHandCheck(t *testing.T) {
	fx := build(t, shuntCapNet, "band=1M:2M", "points=3", "harmonics=none", "power=100", "carrier-also=3M")
	u, err := fx.eng.BandUse(5)
	if err != nil {
		t.Fatal(err)
	}
	if len(u.F) != 6 || !u.OffBand[5] || u.OffBand[4] || u.F[0] != 1e6 || u.F[4] != 2e6 || u.F[5] != 3e6 {
		t.Fatalf("frequencies %v off-band %v; want 5 across 1–2 MHz then 3 MHz", u.F, u.OffBand)
	}
	sec, err := fx.eng.Audit()
	if err != nil {
		t.Fatal(err)
	}
	derated := sec.Parts[1].Stress["vpk"].Limit.Derated
	for k, use := range u.Use[1] {
		if want := 100 / derated; math.Abs(use/want-1) > 1e-3 {
			t.Errorf("%g Hz: use %.4f, want 100 V / %.0f V = %.4f", u.F[k], use, derated, want)
		}
	}
}

// One carrier across a band is the band's centre.
func TestOnePointIsBandCentre(t *testing.T) {
	fx := build(t, shuntCapNet, "band=7M:7.2M", "points=1", "harmonics=none")
	if f := fx.cond.Carriers(); len(f) != 1 || f[0] != 7.1e6 {
		t.Errorf("carriers %v, want the centre 7.1 MHz", f)
	}
}

// The square preset follows the Fourier series of a square wave (odd
// harmonics at 1/n amplitude, −20·log10 n dBc; even absent) at every
// order audited, not only up to the 9th.
func TestSquarePresetBeyondNinth(t *testing.T) {
	fx := build(t, shuntCapNet, "freq=1M", "harmonics=square", "harmonic-max=15")
	lv := fx.cond.HarmonicLevels()
	if len(lv) != 14 {
		t.Fatalf("%d levels for orders 2…15", len(lv))
	}
	for n := 2; n <= 15; n++ {
		want := 0.0
		if n%2 == 1 {
			want = 1 / float64(n*n) // power ratio of amplitude 1/n
		}
		if math.Abs(lv[n-2]-want) > 1e-12 {
			t.Errorf("order %d: level %g, want %g", n, lv[n-2], want)
		}
	}
}

// Mode names are read in any case: SSB is ssb, average 1/5 of PEP
// (common practice, from memory).
func TestModeNameCase(t *testing.T) {
	fx := build(t, shuntCapNet, "freq=1M", "mode=SSB")
	if fx.cond.Mode != "ssb" || fx.cond.AvgRatio != 0.2 {
		t.Errorf("mode %q ratio %g, want ssb 0.2", fx.cond.Mode, fx.cond.AvgRatio)
	}
}
