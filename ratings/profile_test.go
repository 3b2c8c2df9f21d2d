package ratings

import (
	"errors"
	"math"
	"math/rand"
	"strings"
	"testing"

	"rfstress/circuits"
)

func TestProfilesBuiltin(t *testing.T) {
	none := BuiltinProfile("none")
	std := BuiltinProfile("standard")
	strict := BuiltinProfile("strict")
	for class, qs := range classQuantities {
		for _, q := range qs {
			// "none" means no derating at all (definition).
			if f := none.Factor(class, q); f != 1 {
				t.Errorf("none %s %s = %g", class, q, f)
			}
			// Every entry is set in both built-in tables, 0 < f ≤ 1.
			for _, p := range []*Profile{std, strict} {
				f, ok := p.Factors[class][q]
				if !ok || !(f > 0 && f <= 1) {
					t.Errorf("%s %s %s = %g (set %v)", p.Name, class, q, f, ok)
				}
			}
			// Strict is never looser than standard (our design rule).
			if strict.Factor(class, q) > std.Factor(class, q) {
				t.Errorf("strict %s %s %g > standard %g", class, q, strict.Factor(class, q), std.Factor(class, q))
			}
		}
	}
	if none.TempMargin != 0 || std.TempMargin != 15 || strict.TempMargin != 25 {
		t.Errorf("temperature margins none %g standard %g strict %g", none.TempMargin, std.TempMargin, strict.TempMargin)
	}
	// Built-ins are copies: changing one does not change the next.
	std.Factors[ClassResistor][Pdiss] = 0.99
	if BuiltinProfile("standard").Factor(ClassResistor, Pdiss) == 0.99 {
		t.Error("BuiltinProfile hands out a shared table")
	}
}

func fakeFS(files map[string]string) func(string) ([]byte, error) {
	return func(p string) ([]byte, error) {
		if s, ok := files[p]; ok {
			return []byte(s), nil
		}
		return nil, errors.New("no such file")
	}
}

func TestLoadProfileFile(t *testing.T) {
	fs := fakeFS(map[string]string{"shop.derate": `# our shop
name shop
base strict
temp-margin 20C
capacitor-class1 vpk 0.45   # a little tighter
resistor pdiss 30%
`})
	p, err := LoadProfile("shop.derate", fs)
	if err != nil {
		t.Fatal(err)
	}
	if p.Name != "shop" || p.TempMargin != 20 {
		t.Errorf("name %q margin %g", p.Name, p.TempMargin)
	}
	if p.Factor(ClassCapacitor1, Vpk) != 0.45 || math.Abs(p.Factor(ClassResistor, Pdiss)-0.3) > 1e-12 {
		t.Errorf("overrides not applied: %v", p.Factors)
	}
	// Untouched entries come from the base profile.
	if p.Factor(ClassCore, Bpk) != BuiltinProfile("strict").Factor(ClassCore, Bpk) {
		t.Error("base strict not used")
	}
	if _, err := LoadProfile("nothere", fs); err == nil || !strings.Contains(err.Error(), "standard, strict, none") {
		t.Errorf("missing file error: %v", err)
	}
	for _, n := range ProfileNames {
		if p, err := LoadProfile(n, nil); err != nil || p.Name != n {
			t.Errorf("built-in %s: %v", n, err)
		}
	}
}

func TestLoadProfileErrors(t *testing.T) {
	src := "capacitor-class1 vpk 0.5\n" +
		"capacitor-class1 bpk 0.5\n" +
		"inductor irms 1.5\n" +
		"  widget vpk 0.5\n" +
		"core bpk\n" +
		"base strict\n" +
		"temp-margin hot\n" +
		"capacitor-class1 vpk 0.4\n" +
		"resistor  pdiss  half\n"
	_, err := LoadProfile("p.txt", fakeFS(map[string]string{"p.txt": src}))
	el, ok := err.(circuits.ErrorList)
	if !ok {
		t.Fatalf("want ErrorList, got %T: %v", err, err)
	}
	// line:col counted by hand in src above
	want := []string{
		"p.txt:2:18: quantity \"bpk\" has no factor for capacitor-class1",
		"p.txt:3:15: factor 1.5 is out of range",
		"p.txt:4:3: unknown profile statement \"widget\"",
		"p.txt:5:6: a factor line takes",
		"p.txt:6:1: base comes after factors",
		"p.txt:7:13: bad temp-margin",
		"p.txt:8:1: capacitor-class1 vpk is already set at line 1",
		"p.txt:9:18: bad factor",
	}
	got := el.Error()
	for _, w := range want {
		if !strings.Contains(got, w) {
			t.Errorf("missing %q in:\n%s", w, got)
		}
	}
	if len(el) != len(want) {
		t.Errorf("%d errors, want %d:\n%s", len(el), len(want), got)
	}
}

func TestVerdictOrderAndJudge(t *testing.T) {
	if !(OK < Unrated && Unrated < Marginal && Marginal < Fail) {
		t.Fatal("verdicts out of severity order")
	}
	for v, s := range map[Verdict]string{OK: "ok", Unrated: "unrated", Marginal: "marginal", Fail: "fail"} {
		if v.String() != s {
			t.Errorf("%d.String() = %q", v, v.String())
		}
	}
	l := Limit{Quantity: Vpk, Abs: 1000, Derated: 600, Factor: 0.6}
	// The thresholds as defined: ok ≤ derated < marginal ≤ abs < fail.
	for _, c := range []struct {
		s    float64
		want Verdict
	}{{0, OK}, {600, OK}, {600.001, Marginal}, {1000, Marginal}, {1000.001, Fail}, {math.NaN(), Fail}} {
		if got := Judge(c.s, l); got != c.want {
			t.Errorf("Judge(%g) = %s, want %s", c.s, got, c.want)
		}
	}
	un := Limit{Quantity: Vpk}
	if Judge(1, un) != Unrated || Judge(0, un) != OK {
		t.Error("unrated limit judged wrongly")
	}
	// Temperature: stress is the absolute temperature.
	tl := Limit{Quantity: Temp, Abs: 125, Derated: 110}
	if Judge(105, tl) != OK || Judge(115, tl) != Marginal || Judge(130, tl) != Fail {
		t.Error("temperature judged wrongly")
	}
}

func TestBuyRating(t *testing.T) {
	// 1,130 V peak at factor 0.5 needs 2,260 V: the next common step is
	// 2.5 kV (common practice voltage series).
	if v, text := BuyRating(Vpk, 1130, 0.5); v != 2500 || text != "rated ≥ 2.5 kV peak" {
		t.Errorf("BuyRating(1130 V, 0.5) = %g %q", v, text)
	}
	// Exactly on a step stays there.
	if v, _ := BuyRating(Vpk, 300, 0.6); v != 500 {
		t.Errorf("300 V/0.6 = 500 V → %g", v)
	}
	// Currents on the R10 preferred numbers (ISO 3): 1.7 A/0.7 = 2.43 → 2.5 A;
	// 7 A/0.8 = 8.75 → 10 A; 0.1 A/0.5 = 0.2 A.
	for _, c := range []struct{ s, f, want float64 }{{1.7, 0.7, 2.5}, {7, 0.8, 10}, {0.1, 0.5, 0.2}} {
		if v, _ := BuyRating(Irms, c.s, c.f); math.Abs(v-c.want) > 1e-12 {
			t.Errorf("BuyRating(%g A, %g) = %g, want %g", c.s, c.f, v, c.want)
		}
	}
	// Resistor wattages (common practice): 0.3 W/0.5 → 0.75 W.
	if v, _ := BuyRating(Pdiss, 0.3, 0.5); v != 0.75 {
		t.Errorf("0.3 W/0.5 → %g", v)
	}
	// Never below stress/factor, over many values and decades.
	r := rand.New(rand.NewSource(1))
	for i := 0; i < 5000; i++ {
		s := math.Pow(10, r.Float64()*8-3)
		f := 0.3 + 0.7*r.Float64()
		for _, q := range []Quantity{Vpk, Vrms, Irms, Pdiss} {
			v, _ := BuyRating(q, s, f)
			if v < s/f*(1-1e-12) || math.IsInf(v, 0) {
				t.Fatalf("BuyRating(%s, %g, %g) = %g below %g", q, s, f, v, s/f)
			}
		}
	}
	for _, q := range []Quantity{Bpk, Temp, Jrms} {
		if v, text := BuyRating(q, 1, 0.8); v != 0 || text == "" {
			t.Errorf("%s: %g %q", q, v, text)
		}
	}
}

// A part's derating factors asked once at Prepare are the profile's, for
// every quantity of its class and for its core and winding.
func TestPartFactorsAsProfile(t *testing.T) {
	if len(Quantities) != nQuantities {
		t.Fatalf("%d quantities, nQuantities %d", len(Quantities), nQuantities)
	}
	for i, q := range Quantities {
		if q.index() != i {
			t.Errorf("%s: index %d, want %d", q, q.index(), i)
		}
	}
	for _, name := range []string{"standard", "strict"} {
		prof := BuiltinProfile(name)
		src := "port in a z=50\nport out b z=50\ncore K od=18mm id=10mm h=6mm material=iron mu=10\n" +
			"inductor L a b 0.6u core=K turns=9 wire=1mm\ncapacitor C1 a gnd 100p dielectric=x7r\ncapacitor C2 b gnd 100p dielectric=air\nresistor R b gnd 50\n"
		set := mustPrepare(t, src, prof)
		for _, p := range set.Parts {
			for _, class := range []string{p.Class, ClassCore, ClassInductor, ClassGapAir} {
				for _, q := range Quantities {
					if got, want := p.factor(class, q), prof.Factor(class, q); got != want {
						t.Errorf("%s %s %s %s: %g, profile %g", name, p.Name, class, q, got, want)
					}
				}
			}
		}
	}
}
