package stress

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"rfstress/circuits"
	"rfstress/ratings"
)

const blockFilter = `port in n1 z=50
port out n4 z=50
capacitor C1 n1 gnd 270p q=800
inductor  L2 n1 n2 0.84u q=120
capacitor C3 n2 gnd 470p q=800
inductor  L4 n2 n4 0.84u q=120
capacitor C5 n4 gnd 270p q=800
`

// measuredFilter writes the filter's own S-parameters at fs as a
// Touchstone file (RI, every digit), the way a bench sweep would give them.
func measuredFilter(t *testing.T, c *circuits.Circuit, fs []float64) []byte {
	t.Helper()
	var b strings.Builder
	b.WriteString("# Hz S RI R 50\n")
	for _, f := range fs {
		sp, err := c.TwoPort(f)
		if err != nil {
			t.Fatal(err)
		}
		fmt.Fprintf(&b, "%.17g", f)
		for _, z := range []complex128{sp.S11, sp.S21, sp.S12, sp.S22} {
			fmt.Fprintf(&b, " %.17g %.17g", real(z), imag(z))
		}
		b.WriteString("\n")
	}
	return []byte(b.String())
}

func engineFor(t *testing.T, src string, data []byte, settings ...string) (*Engine, *circuits.Circuit) {
	t.Helper()
	nl, err := circuits.Parse("b.net", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	if err := circuits.LoadMeasured(nl, func(string) ([]byte, error) { return data, nil }); err != nil {
		t.Fatal(err)
	}
	c, err := circuits.Build(nl)
	if err != nil {
		t.Fatal(err)
	}
	prof, _ := ratings.LoadProfile("standard", nil)
	rs, err := ratings.Prepare(nl, ratings.Builtin(), prof)
	if err != nil {
		t.Fatal(err)
	}
	cond := Defaults()
	var ss []Setting
	for _, s := range settings {
		k, v, _ := strings.Cut(s, "=")
		ss = append(ss, Setting{Key: k, Value: v, Flag: true})
	}
	if err := cond.Apply(ss); err != nil {
		t.Fatal(err)
	}
	eng, err := NewEngine(c, rs, cond)
	if err != nil {
		t.Fatal(err)
	}
	return eng, c
}

// TestBlockDissipationIsFilterLoss: a filter measured as a block and
// audited in the filter's place dissipates, in each case, what the
// filter's parts dissipate together (Tellegen's theorem: the net power
// into the ports is the parts' loss). On the SWR circle the block's worst
// is the continuous maximum: never below a 20 000-phase scan of full
// solves, and within 1e-6 of it.
func TestBlockDissipationIsFilterLoss(t *testing.T) {
	nl, err := circuits.Parse("f.net", []byte(blockFilter))
	if err != nil {
		t.Fatal(err)
	}
	fc, _ := circuits.Build(nl)
	const f0 = 7.1e6
	data := measuredFilter(t, fc, []float64{f0})
	src := "port in a z=50\nport out b z=50\nblock F a b measured=f.s2p pmax=20 outside=hold\n"

	// matched only, one carrier, no harmonics: one case
	eng, _ := engineFor(t, src, data, "freq=7.1M", "harmonics=none", "power=100", "mode=carrier")
	sec, err := eng.Audit()
	if err != nil {
		t.Fatal(err)
	}
	r, err := fc.Solve(f0, 100, circuits.Load{Z: 50})
	if err != nil {
		t.Fatal(err)
	}
	got := sec.Parts[0].Stress[ratings.Pdiss].Value
	if math.Abs(got-r.Ploss) > 1e-9*r.Pin {
		t.Errorf("matched: block dissipates %.9g W, filter parts %.9g W", got, r.Ploss)
	}

	// the SWR-3 circle: continuous worst against a dense scan
	eng, _ = engineFor(t, src, data, "freq=7.1M", "harmonics=none", "power=100", "mode=carrier", "swr=3", "phases=72")
	sec, err = eng.Audit()
	if err != nil {
		t.Fatal(err)
	}
	got = sec.Parts[0].Stress[ratings.Pdiss].Value
	var scan float64
	const n = 20000
	for k := 0; k < n; k++ {
		l := circuits.LoadOnCircle(50, 3, 2*math.Pi*float64(k)/n)
		r, err := fc.Solve(f0, 100, l)
		if err != nil {
			t.Fatal(err)
		}
		scan = math.Max(scan, r.Ploss)
	}
	if got < scan*(1-1e-9) || got > scan*(1+1e-6) {
		t.Errorf("SWR 3: block worst %.9g W, dense scan of the filter %.9g W", got, scan)
	}
	if v := sec.Parts[0].Verdict; v == ratings.Unrated {
		t.Errorf("a block with pmax= is judged, got %v", v)
	}
}
