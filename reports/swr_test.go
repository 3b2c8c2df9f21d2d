package reports

import (
	"math"
	"math/cmplx"
	"testing"
)

// swrOf is the textbook SWR of a load on a line: Γ = (Z−Z0)/(Z+Z0),
// SWR = (1+|Γ|)/(1−|Γ|) (any transmission-line text).
func swrOf(z complex128, z0 float64) float64 {
	g := cmplx.Abs((z - complex(z0, 0)) / (z + complex(z0, 0)))
	return (1 + g) / (1 - g)
}

// A huge SWR says only "nearly total reflection": its digits are not
// shown, so no one reads 27474:1 as a measured figure.
func TestFormatSWRCapsHugeFigures(t *testing.T) {
	cases := []struct {
		z    complex128
		want string
	}{
		{complex(150, 0), "3.00"},             // 150 Ω on 50 Ω: SWR = 150/50 = 3
		{complex(0.5, 0), "100.00"},           // 0.5 Ω on 50 Ω: SWR = 50/0.5 = 100, still shown
		{complex(0.25, 0), "above 100"},       // SWR 200
		{complex(0.0018, -47.8), "above 100"}, // a nearly lossless reactance: SWR in the tens of thousands
	}
	for _, c := range cases {
		if got := FormatSWR(swrOf(c.z, 50)); got != c.want {
			t.Errorf("load %v on 50 Ω: SWR %.4g shown as %q, want %q", c.z, swrOf(c.z, 50), got, c.want)
		}
	}
	for _, v := range []float64{math.Inf(1), math.NaN()} {
		if got := FormatSWR(v); got != "above 100" && got != "—" {
			t.Errorf("FormatSWR(%v) = %q, want a dash or \"above 100\"", v, got)
		}
	}
}

// One audited case reads "1 case" (English grammar), more read "N cases".
func TestCasesText(t *testing.T) {
	for n, want := range map[int]string{1: "1 case", 75: "75 cases", 0: "0 cases"} {
		if got := casesText(n); got != want {
			t.Errorf("casesText(%d) = %q, want %q", n, got, want)
		}
	}
}
