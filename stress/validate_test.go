package stress

import (
	"math"
	"math/rand/v2"
	"sort"
	"strconv"
	"strings"
	"testing"

	"rfstress/circuits"
)

// TestAuditLineErrorsTogether: every bad setting of an audit line is
// reported at once with its file:line:col, not the first only; values
// that would make the solve meaningless are refused with the accepted
// range, from the file and from flags alike.
func TestAuditLineErrorsTogether(t *testing.T) {
	cases := []struct {
		name, line string
		flags      []Setting
		want       string
	}{
		{"four bad settings", "audit power=abc mode=xyz band=foo swr=0", nil,
			`t.net:8:13: audit power=abc: "abc" is not a number (a number)` + "\n" +
				`t.net:8:22: audit mode=xyz: unknown mode "xyz" (one of ` + modeNames() + ")\n" +
				`t.net:8:31: audit band=foo: bad band (a band lo:hi with 0 < lo ≤ hi, such as 10.1M:10.15M)` + "\n" +
				`t.net:8:39: audit swr=0: bad SWR "0" (SWR from 1 to 1000)`},
		{"band upside down", "audit band=7.3M:7M", nil,
			"t.net:8:12: audit band=7.3M:7M: bad band (a band lo:hi with 0 < lo ≤ hi, such as 10.1M:10.15M)"},
		{"power 1e308", "audit power=1e308 freq=7M", nil,
			"t.net:8:13: audit power=1e308: power is outside the range a solve can trust (accepted range 1 mW to 10 MW)"},
		{"freq 1e308", "audit freq=1e308", nil,
			"t.net:8:12: audit freq=1e308: frequency is outside the range a solve can trust (accepted range 1 Hz to 100 GHz)"},
		{"load 1e300", "audit freq=7M load=1e300", nil,
			"t.net:8:20: audit load=1e300: load magnitude is outside the range a solve can trust (accepted range 0 Ω to 1 GΩ)"},
		{"NaN power", "audit power=NaN", nil,
			`t.net:8:13: audit power=NaN: "NaN" is not a number (a number)`},
		{"Inf carrier", "audit carrier-also=Inf", nil,
			`t.net:8:20: audit carrier-also=Inf: bad frequency "Inf" (frequencies such as 14.2M)`},
		{"flag power 1e308", "", []Setting{{Key: "power", Value: "1e308", Flag: true}},
			"--power 1e308: power is outside the range a solve can trust (accepted range 1 mW to 10 MW)"},
		{"flag freq 1e308", "", []Setting{{Key: "freq", Value: "1e308", Flag: true}},
			"--freq 1e308: frequency is outside the range a solve can trust (accepted range 1 Hz to 100 GHz)"},
		{"flag harmonics NaN", "", []Setting{{Key: "harmonics", Value: "NaN", Flag: true}},
			`--harmonics NaN: bad harmonic level "NaN" (a preset (none, push-pull, single-ended, square) or dBc levels ≤ 0 for the 2nd, 3rd, … such as -30,-12,-40)`},
	}
	for _, tc := range cases {
		src := testLowpass(tc.line)
		// the audit line is the last line of the file
		ln := strings.Count(src[:strings.LastIndex(src, tc.line+"\n")], "\n") + 1
		tc.want = strings.ReplaceAll(tc.want, "t.net:8:", "t.net:"+strconv.Itoa(ln)+":")
		nl, err := circuits.Parse("t.net", []byte(src))
		if err != nil {
			t.Fatalf("%s: parse: %v", tc.name, err)
		}
		c := Defaults()
		err = c.Apply(append(FileSettings(nl), tc.flags...))
		if err == nil {
			t.Errorf("%s: no error, want %q", tc.name, tc.want)
			continue
		}
		if err.Error() != tc.want {
			t.Errorf("%s:\n got: %s\nwant: %s", tc.name, err, tc.want)
		}
	}
}

// TestSketchBound checks the fixed-memory quantile estimator against exact
// sorting: for every sample and quantile, the estimate is within
// SketchAlpha (relative) of the order statistic of rank ⌊q·(n−1)⌋, the
// bound DDSketch guarantees (Masson, Rim & Lee 2019, Theorem 2). The
// samples span log-normal stresses, values with zeros and infinities (no
// limit binds), and a range wide enough to force collapsing.
func TestSketchBound(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	samples := map[string][]float64{}
	var ln, wide, huge, mixed []float64
	for i := 0; i < 20000; i++ {
		ln = append(ln, 100*math.Exp(0.05*rng.NormFloat64()))
		wide = append(wide, math.Exp(rng.Float64()*36-18))
		huge = append(huge, math.Exp(rng.Float64()*200-100))
		v := 3 * rng.Float64()
		switch i % 10 {
		case 0:
			v = 0
		case 1:
			v = math.Inf(1)
		}
		mixed = append(mixed, v)
	}
	samples["log-normal"], samples["1e-8…1e8"], samples["zeros and +Inf"] = ln, wide, mixed
	// e^±100 spans more than the buckets hold: the lowest collapse, and
	// only the upper quantiles (the ones reported besides the median of
	// ordinary spreads) keep the bound
	samples["collapsed e^±100"] = huge
	for name, data := range samples {
		s := NewSketch()
		// split across three "workers" and merge, as the trials do
		parts := []*Sketch{NewSketch(), NewSketch(), NewSketch()}
		for i, v := range data {
			parts[i%3].Add(v)
		}
		for _, p := range parts {
			s.Merge(p)
		}
		sorted := append([]float64(nil), data...)
		sort.Float64s(sorted)
		qs := []float64{0.01, 0.5, 0.9, 0.99, 1}
		if name == "collapsed e^±100" {
			qs = []float64{0.9, 0.99, 1}
		}
		for _, q := range qs {
			exact := sorted[int(q*float64(len(sorted)-1))]
			got := s.Quantile(q)
			switch {
			case math.IsInf(exact, 1) || exact == 0:
				if got != exact {
					t.Errorf("%s q=%g: got %g, exact %g", name, q, got, exact)
				}
			case math.Abs(got-exact) > SketchAlpha*exact*(1+1e-12):
				t.Errorf("%s q=%g: got %g, exact %g: error %.3g%% > %.2g%%", name, q, got, exact, 100*math.Abs(got-exact)/exact, 100*SketchAlpha)
			}
		}
		if s.Max() != sorted[len(sorted)-1] || s.N() != int64(len(data)) {
			t.Errorf("%s: max %g n %d", name, s.Max(), s.N())
		}
	}
}

// TestSketchMemoryFixed: a million values in a narrow and in a wide
// spread never take more than sketchMaxBins buckets.
func TestSketchMemoryFixed(t *testing.T) {
	s := NewSketch()
	rng := rand.New(rand.NewPCG(3, 4))
	for i := 0; i < 1_000_000; i++ {
		s.Add(math.Exp(rng.Float64()*1400 - 700))
	}
	if len(s.bins) > sketchMaxBins {
		t.Errorf("%d buckets, cap %d", len(s.bins), sketchMaxBins)
	}
}

// TestToleranceMatchesExact: tolerance statistics from the sketches agree
// with exact sorting of the same trials to within SketchAlpha.
func TestToleranceMatchesExact(t *testing.T) {
	fx := build(t, testLowpass(""), "freq=7.1M", "harmonics=none")
	for i := range fx.c.Elements {
		fx.c.Elements[i].Comp.Attrs["tol"] = &circuits.Attr{Key: "tol", Num: 0.1}
	}
	res, err := fx.eng.Tolerance(TolOptions{Trials: 400, Seed: 5, Dist: "uniform", Workers: 2})
	if err != nil {
		t.Fatal(err)
	}
	// redo the trials one by one and sort exactly
	n := len(fx.c.Elements)
	col := make([][]float64, n)
	w := fx.eng.newWorkspace(fx.c)
	for tr := 0; tr < 400; tr++ {
		rng := rand.New(rand.NewPCG(5, uint64(tr)))
		vf, qf := make([]float64, n), make([]float64, n)
		for i := range vf {
			vf[i] = draw(rng, "uniform", 0.1)
			qf[i] = draw(rng, "uniform", 0)
		}
		w.rebind(fx.c.Scaled(vf, qf))
		if _, err := fx.eng.run(w); err != nil {
			t.Fatal(err)
		}
		for i := range w.acc {
			col[i] = append(col[i], w.acc[i].val[0]) // vpk
		}
	}
	for i, p := range res.Parts {
		sort.Float64s(col[i])
		exact := col[i][199] // rank ⌊0.5·(400−1)⌋
		got := p.Q[0].Median
		if math.Abs(got-exact) > SketchAlpha*exact*(1+1e-12) {
			t.Errorf("%s vpk median %g, exact %g", p.Name, got, exact)
		}
		if p.Q[0].Max != col[i][399] {
			t.Errorf("%s vpk max %g, exact %g", p.Name, p.Q[0].Max, col[i][399])
		}
	}
}
