package ratings

import (
	"math"
	"testing"
)

func TestToroidThinRingLimit(t *testing.T) {
	// IEC 60205 toroid formulas tend to the thin-ring values Ae = h·(OD−ID)/2
	// and le = π·(OD+ID)/2 as OD/ID → 1, the error shrinking with the wall.
	id, h := 10e-3, 5e-3
	prev := math.Inf(1)
	for _, ratio := range []float64{1.5, 1.2, 1.1, 1.01, 1.001} {
		od := id * ratio
		ae, le := ToroidAeLe(od, id, h)
		aeRing, leRing := h*(od-id)/2, math.Pi*(od+id)/2
		e := math.Max(math.Abs(ae/aeRing-1), math.Abs(le/leRing-1))
		if e >= prev {
			t.Errorf("OD/ID=%g: error %.3g did not shrink (was %.3g)", ratio, e, prev)
		}
		prev = e
		if ratio == 1.01 && e > 1e-3 {
			t.Errorf("OD/ID=1.01: relative error %.3g, want < 1e-3", e)
		}
	}
}

func TestInductanceFromGeometry(t *testing.T) {
	// Any magnetics handbook: a toroid of rectangular section has
	// L = µ0·µr·N²·h·ln(OD/ID)/(2π). AL·N² from the IEC 60205 Ae and le
	// must give the same.
	for _, c := range []struct{ od, id, h, mu float64 }{
		{13e-3, 7e-3, 5e-3, 10}, {25e-3, 15e-3, 10e-3, 125}, {6e-3, 3e-3, 2e-3, 7},
	} {
		ae, le := ToroidAeLe(c.od, c.id, c.h)
		n := 17.0
		got := ALFromGeometry(c.mu, ae, le) * n * n
		want := Mu0 * c.mu * n * n * c.h * math.Log(c.od/c.id) / (2 * math.Pi)
		if math.Abs(got/want-1) > 1e-12 {
			t.Errorf("%+v: AL·N² = %.15g H, geometry %.15g H", c, got, want)
		}
	}
}

func TestToroidAreaDisc(t *testing.T) {
	// With no hole the toroid surface is a solid cylinder's, 2πr·h + 2πr²
	// (school geometry).
	od, h := 20e-3, 5e-3
	r := od / 2
	if got, want := ToroidArea(od, 0, h), 2*math.Pi*r*h+2*math.Pi*r*r; math.Abs(got/want-1) > 1e-12 {
		t.Errorf("disc area %.6g, want %.6g", got, want)
	}
}

func TestOneLayerTurns(t *testing.T) {
	// Exact packing of n equal circles of diameter d touching in a ring of
	// centre radius R: sin(π/n) = d/(2R) (geometry). Our arc-length count
	// π·(ID−d)/d may be at most one turn above it.
	for _, c := range []struct{ id, d float64 }{{7e-3, 1e-3}, {7e-3, 0.5e-3}, {15e-3, 1.2e-3}, {3e-3, 0.3e-3}} {
		r := (c.id - c.d) / 2
		exact := int(math.Floor(math.Pi / math.Asin(c.d/(2*r))))
		got := OneLayerTurns(c.id, c.d)
		if got < exact || got > exact+1 {
			t.Errorf("ID=%g d=%g: %d turns, exact packing %d", c.id, c.d, got, exact)
		}
	}
	if OneLayerTurns(1e-3, 2e-3) != 0 {
		t.Error("wire thicker than the hole should fit 0 turns")
	}
}
