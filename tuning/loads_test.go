package tuning

import (
	"math"
	"math/cmplx"
	"strings"
	"testing"

	"rfstress/circuits"
)

// One-port conversions (Pozar ch. 4): Z = R·(1+S)/(1−S); in a Touchstone
// version 1 file Z data are normalised to the reference resistance R
// (Touchstone File Format Specification, option line). S = 0.6 in a 50 Ω
// system is 200 Ω; 0.6 is −4.437 dB (20·log10 0.6).
func TestTouchstoneFormats(t *testing.T) {
	cases := []struct {
		name, src string
		want      complex128
	}{
		{"ri.s1p", "! measured\n# MHz S RI R 50\n3.6 0.6 0\n", 200},
		{"ma.s1p", "# Hz S MA R 50\n3600000 0.6 0 ! a comment\n", 200},
		{"db.s1p", "#khz s db r 50\n3600 -4.436975 0\n", 200},
		{"z.s1p", "# GHz Z RI R 50\n0.0036 4 -2\n", complex(200, -100)},
		{"ref75.s1p", "# MHz S RI R 75\n3.6 0 0\n", 75},
		{"angle.s1p", "# MHz S MA R 50\n3.6 1 90\n", complex(0, 50)},
	}
	for _, c := range cases {
		pts, err := ReadTouchstone1(c.name, []byte(c.src))
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		if len(pts) != 1 || math.Abs(pts[0].F-3.6e6) > 1e-3 {
			t.Fatalf("%s: points %+v", c.name, pts)
		}
		// 1e-6 relative: the dB figure is written to 7 digits
		if cmplx.Abs(pts[0].Z-c.want) > 1e-6*cmplx.Abs(c.want) {
			t.Errorf("%s: Z %v, want %v", c.name, pts[0].Z, c.want)
		}
	}
}

// Errors of the shared reader keep their file:line:col; a load file must
// also be one port and passive.
func TestTouchstoneErrors(t *testing.T) {
	cases := []struct{ src, want string }{
		{"3.6 0 0\n", "f.s1p:1:1: "},
		{"# MHz S RI R 50\n3.6 0\n", "f.s1p:2:1: "},
		{"# MHz S RI R 50\n3.6 x 0\n", "f.s1p:2:5: "},
		{"# MHz S RI R 50\n! c\n3.5 0 0\n3.6 1.2 0\n", "f.s1p:4:5: at 3.6 MHz |S11| = 1.2 is above 1"},
	}
	for _, c := range cases {
		_, err := ReadTouchstone1("f.s1p", []byte(c.src))
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%q: error %v, want %q", c.src, err, c.want)
		}
	}
	_, err := ParseLoads("two.s2p", 50, func(string) ([]byte, error) { return []byte("# MHz S RI R 50\n3.6 0 0 1 0 1 0 0 0\n"), nil })
	if err == nil || !strings.Contains(err.Error(), "one-port") {
		t.Errorf("two-port file: %v", err)
	}
}

func TestLoadCSV(t *testing.T) {
	pts, err := ReadLoadCSV("a.csv", []byte("frequency,R,X\n# comment\n3.5M,14,-520\n3.6MHz, 13.5 ,-495\n3700000,13,-470\n"))
	if err != nil {
		t.Fatal(err)
	}
	if len(pts) != 3 || pts[1].F != 3.6e6 || pts[1].Z != complex(13.5, -495) {
		t.Fatalf("points %+v", pts)
	}
	ls := &LoadSet{Source: "a.csv", Points: pts, File: true}
	// linear interpolation half way: (14+13.5)/2, (−520−495)/2
	z, err := ls.At(3.55e6)
	if err != nil || cmplx.Abs(z-complex(13.75, -507.5)) > 1e-9 {
		t.Errorf("At(3.55M) = %v, %v", z, err)
	}
	if _, err := ls.At(3.8e6); err == nil {
		t.Errorf("3.8 MHz outside the file gave no error")
	}
	cs, _ := ls.Cases([]float64{3.5e6, 3.6e6}, 3.5e6, 3.6e6)
	if len(cs) != 2 || cs[1].Load.Z != complex(13.5, -495) {
		t.Errorf("cases %+v", cs)
	}
	cs, _ = ls.Cases([]float64{3.65e6}, 3.65e6, 3.65e6)
	if len(cs) != 1 || cmplx.Abs(cs[0].Load.Z-complex(13.25, -482.5)) > 1e-9 {
		t.Errorf("interpolated case %+v", cs)
	}
	bad := []struct{ src, want string }{
		{"f,R,X\n3.5M,1,2\n", "a.csv:1:1: first line is not the header"},
		{"frequency,R,X\n3.5M,-1,2\n", "a.csv:2:6: bad resistance \"-1\""},
		{"frequency,R,X\n3.5M,1\n", "a.csv:2:1: 2 fields, expected 3"},
		{"frequency,R,X\n3.5M,1,2\n3.4M,1,2\n", "a.csv:3:1: frequency 3.4M does not rise"},
		{"frequency,R,X\n3.5M,1,2j\n", "a.csv:2:8: bad reactance \"2j\""},
		{"", "a.csv:1:1: empty load file"},
	}
	for _, c := range bad {
		_, err := ReadLoadCSV("a.csv", []byte(c.src))
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%q: error %v, want %q", c.src, err, c.want)
		}
	}
}

// The region within SWR S: every sampled load lies on its ring, |Γ| =
// (s−1)/(s+1) against the centre (the SWR definition), and the outer ring
// is at S.
func TestRegion(t *testing.T) {
	z0 := complex(13, -490)
	ls := Region(z0, 10)
	if len(ls.Points) != 1+regionRings*regionPhases {
		t.Fatalf("%d loads", len(ls.Points))
	}
	outer := 0
	for _, p := range ls.Points {
		g := cmplx.Abs((p.Z - z0) / (p.Z + cmplx.Conj(z0)))
		if want := (p.Ring - 1) / (p.Ring + 1); math.Abs(g-want) > 1e-9 {
			t.Errorf("load %v: |Γ| %.6f, ring %.3f wants %.6f", p.Z, g, p.Ring, want)
		}
		if real(p.Z) < 0 {
			t.Errorf("active load %v", p.Z)
		}
		if math.Abs(p.Ring-10) < 1e-9 {
			outer++
		}
	}
	if outer != regionPhases {
		t.Errorf("%d loads on the SWR 10 ring", outer)
	}
	_ = circuits.Pos{}
}

// A region re-centred per carrier keeps its shape about each centre.
func TestRegionAbout(t *testing.T) {
	centre := func(f float64) complex128 { return complex(f/1e5, -f/1e4) }
	ls := Region(50, 3).About(centre, []float64{3.5e6, 3.8e6})
	if !ls.File || len(ls.Points) != 2*(1+regionRings*regionPhases) {
		t.Fatalf("%d points", len(ls.Points))
	}
	for _, p := range ls.Points {
		z0 := centre(p.F)
		g := cmplx.Abs((p.Z - z0) / (p.Z + cmplx.Conj(z0)))
		if math.Abs(g-(p.Ring-1)/(p.Ring+1)) > 1e-9 {
			t.Errorf("load %v at %v: |Γ| %.6f off its ring %.3f", p.Z, p.F, g, p.Ring)
		}
	}
	cs, err := ls.Cases([]float64{3.5e6, 3.8e6}, 3.5e6, 3.8e6)
	if err != nil || len(cs) != len(ls.Points) {
		t.Errorf("cases %d, %v", len(cs), err)
	}
}
