package stress

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"rfstress/circuits"
	"rfstress/ratings"
)

// bankNet is a two-filter bank, each 5-pole Chebyshev lowpass (0.1 dB,
// Matthaei, Young & Jones 1964, sec. 4.05) between two relays; states
// gives S1…S4's written states, sel adds select lines.
func bankNet(states [4]string, coff string, tail string) string {
	g := chebyshevG(5, 0.1)
	var b strings.Builder
	b.WriteString("port in pa z=50\nport out ant z=50\n")
	for k, fc := range []float64{9e6, 18e6} {
		wc := 2 * math.Pi * fc
		x := string(rune('a' + k))
		s1, s2 := 2*k+1, 2*k+2
		fmt.Fprintf(&b, "switch S%d pa %s1 state=%s ron=20m lon=5n %s irms=5 vpk=1.5k\n", s1, x, states[2*k], coff)
		fmt.Fprintf(&b, "capacitor C1%s %s1 gnd %.9g q=1500 vpk=500 irms=3\n", x, x, g[0]/(wc*50))
		fmt.Fprintf(&b, "inductor L2%s %s1 %s2 %.9g q=250 irms=5\n", x, x, x, g[1]*50/wc)
		fmt.Fprintf(&b, "capacitor C3%s %s2 gnd %.9g q=1500 vpk=1k irms=5\n", x, x, g[2]/(wc*50))
		fmt.Fprintf(&b, "inductor L4%s %s2 %s3 %.9g q=250 irms=5\n", x, x, x, g[3]*50/wc)
		fmt.Fprintf(&b, "capacitor C5%s %s3 gnd %.9g q=1500 vpk=500 irms=3\n", x, x, g[4]/(wc*50))
		fmt.Fprintf(&b, "switch S%d %s3 ant state=%s ron=20m lon=5n %s irms=5 vpk=1.5k\n", s2, x, states[2*k+1], coff)
	}
	b.WriteString("audit power=100 mode=ssb points=3 swr=2 phases=36 harmonics=push-pull\n")
	b.WriteString(tail)
	return b.String()
}

func auditAll(t *testing.T, src string) []*Section {
	t.Helper()
	fx := build(t, src)
	secs, _, err := AuditNetlist(fx.c, fx.rs, fx.cond, false)
	if err != nil {
		t.Fatal(err)
	}
	return secs
}

// Each position of a switched bank, and each wrong-band fault, audits
// exactly as the netlist written by hand in that position does.
func TestBankPositionsEqualHandBuilt(t *testing.T) {
	// the file's own band (1–2 MHz) is replaced by the positions' bands
	sel := "select B40 closed=S1,S2 band=7M:7.2M\nselect B20 closed=S3,S4 band=14M:14.35M\naudit band=1M:2M\n"
	bank := auditAll(t, bankNet([4]string{"closed", "closed", "open", "open"}, "coff=1.5p", sel))
	if len(bank) != 4 {
		t.Fatalf("%d sections, want 2 positions + 2 wrong-band faults", len(bank))
	}
	p40 := [4]string{"closed", "closed", "open", "open"}
	p20 := [4]string{"open", "open", "closed", "closed"}
	want := []struct {
		pos, forPos string
		wrong       bool
		states      [4]string
		band        string
	}{
		{"B40", "", false, p40, "band=7M:7.2M"},
		{"B20", "B40", true, p20, "band=7M:7.2M"},
		{"B20", "", false, p20, "band=14M:14.35M"},
		{"B40", "B20", true, p40, "band=14M:14.35M"},
	}
	for i, w := range want {
		s := bank[i]
		if s.Position != w.pos || s.Wrong != w.wrong || s.For != w.forPos {
			t.Fatalf("section %d is %s/%v/%s, want %s/%v/%s", i, s.Position, s.Wrong, s.For, w.pos, w.wrong, w.forPos)
		}
		hand := auditAll(t, bankNet(w.states, "coff=1.5p", "audit "+w.band+"\n"))[0]
		for j, p := range s.Parts {
			h := hand.Parts[j]
			for _, q := range Quantities {
				a, ok1 := p.Stress[q]
				b, ok2 := h.Stress[q]
				if ok1 != ok2 {
					t.Fatalf("%s %s %s: present %v vs %v", s.Position, p.Name, q, ok1, ok2)
				}
				// the same network and conditions: equal to rounding
				if ok1 && relErr(a.Value, b.Value) > 1e-9 {
					t.Errorf("section %d %s %s: %g, hand-built %g", i, p.Name, q, a.Value, b.Value)
				}
			}
		}
	}
}

// The unselected filter leaks through the open contacts' capacitance: its
// parts carry RF in position B40, none without coff, and the leaked
// voltage follows the open contact's reactance, which dominates the
// divider (1.5 pF is about 15 kΩ at 7 MHz against the filter's 100 Ω), at
// the carrier alone:
// twice the capacitance, about twice the voltage (within 2 %).
func TestOpenContactLeakage(t *testing.T) {
	sel := "select B40 closed=S1,S2 band=7.1M\nselect B20 closed=S3,S4 band=14.2M\naudit band=1M harmonics=none\n"
	vOf := func(coff string) float64 {
		s := auditAll(t, bankNet([4]string{"closed", "closed", "open", "open"}, coff, sel))[0]
		return partOf(t, s, "C1b").Stress[ratings.Vpk].Value
	}
	v1, v2, v0 := vOf("coff=1.5p"), vOf("coff=3p"), vOf("")
	if !(v1 > 0.1) {
		t.Errorf("leak into the unselected filter not visible: C1b %g V peak", v1)
	}
	if v0 > 1e-6*v1 {
		t.Errorf("ideal open contacts leak %g V", v0)
	}
	if r := v2 / v1; math.Abs(r-2) > 0.04 {
		t.Errorf("doubling coff multiplies the leak by %g, want about 2", r)
	}
	t.Logf("C1b of the unselected filter: %.3g V peak through 1.5 pF, %.3g V through 3 pF", v1, v2)
}

// The open contact's voltage is the difference of its node voltages: S3
// open in position B40 at a single load, against a full solve.
func TestOpenContactVoltage(t *testing.T) {
	src := bankNet([4]string{"closed", "closed", "open", "open"}, "coff=1.5p", "")
	_, c := mustBuild(t, src)
	r, err := c.Solve(7.1e6, 100, circuits.Load{Z: 50})
	if err != nil {
		t.Fatal(err)
	}
	idx := func(n string) int {
		for i, m := range c.Nodes {
			if m == n {
				return i
			}
		}
		t.Fatalf("no node %s", n)
		return -1
	}
	v := r.Parts[c.Index("S3")].V
	want := r.Nodes[idx("pa")] - r.Nodes[idx("b1")]
	if d := v - want; math.Hypot(real(d), imag(d)) > 1e-12*math.Hypot(real(want), imag(want)) {
		t.Errorf("open contact %v, V(pa) − V(b1) %v", v, want)
	}
}

func mustBuild(t *testing.T, src string) (*circuits.Netlist, *circuits.Circuit) {
	t.Helper()
	nl, err := circuits.Parse("t.net", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	c, err := circuits.Build(nl)
	if err != nil {
		t.Fatal(err)
	}
	return nl, c
}

// A shorted blocking capacitor puts the supply on the tune capacitor: its
// peak is |Vdc| + Vrf,pk, equal to the netlist written by hand with the
// plate and the tune node joined (Cb gone), and its DC share is the plate's
// DC, 3000 − 0.8·2 V (Ohm's law).
func TestBlockingCapacitorShort(t *testing.T) {
	src := piNetlist(true, "vpk=10k irms=10")
	fx := build(t, src)
	list, err := ParseFaultList(t, "Cb:short")
	if err != nil {
		t.Fatal(err)
	}
	pf, err := fx.eng.RunPartFaults(list)
	if err != nil {
		t.Fatal(err)
	}
	run := pf.Runs[0]
	if run.Err != "" || run.Parts[fx.c.Index("Cb")] != nil {
		t.Fatalf("fault run: err %q, failed part judged %v", run.Err, run.Parts[fx.c.Index("Cb")] != nil)
	}
	ct := run.Parts[fx.c.Index("Ct")].Stress[ratings.Vpk].Value
	joined := strings.Replace(strings.Replace(src, "capacitor Cb plate tune", "# ", 1), " tune ", " plate ", -1)
	hand, err := build(t, joined).eng.Audit()
	if err != nil {
		t.Fatal(err)
	}
	hv := partOf(t, hand, "Ct").Stress[ratings.Vpk].Value
	// 1 µΩ of short against none: 1e-6 relative covers it
	if relErr(ct, hv) > 1e-6 {
		t.Errorf("Ct with Cb shorted %g V peak, hand-built %g V", ct, hv)
	}
	rfOnly, err := build(t, strings.Replace(strings.Replace(piNetlist(false, "vpk=10k irms=10"), "capacitor Cb plate tune", "# ", 1), " tune ", " plate ", -1)).eng.Audit()
	if err != nil {
		t.Fatal(err)
	}
	if d := ct - partOf(t, rfOnly, "Ct").Stress[ratings.Vpk].Value; math.Abs(d-(3000-0.8*2)) > 1e-3 {
		t.Errorf("Ct's DC share with Cb shorted %g V, want 2998.4 V", d)
	}
	found := false
	for _, c := range pf.Consequences {
		if c.Part == "Ct" && c.Quantity == ratings.Vpk && c.Verdict >= ratings.Marginal {
			found = true
		}
	}
	if !found {
		t.Errorf("no consequence 'if Cb shorts, Ct is over its derated vpk' among %+v", pf.Consequences)
	}
}

// ParseFaultList reads a fault list for a test.
func ParseFaultList(t *testing.T, v string) ([]circuits.PartFault, error) {
	_, list, err := ParsePartFaults(v)
	return list, err
}

// A fault that shorts the supply is named as such: shorting a capacitor
// from the supply node to gnd draws 3 kV through 1 µΩ.
func TestFaultShortsSupply(t *testing.T) {
	src := strings.Replace(piNetlist(true, "vpk=10k irms=10"), "supply B1 bplus 3kV\n", "supply B1 bplus 3kV\ncapacitor Cbp bplus gnd 10n q=1000\n", 1)
	fx := build(t, src)
	_, list, err := ParsePartFaults("Cbp:short,Ct:short")
	if err != nil {
		t.Fatal(err)
	}
	pf, err := fx.eng.RunPartFaults(list)
	if err != nil {
		t.Fatal(err)
	}
	if pf.Runs[0].ShortedSupply != "B1" || pf.Runs[1].ShortedSupply != "" {
		t.Errorf("shorted supply: %q for Cbp, %q for Ct", pf.Runs[0].ShortedSupply, pf.Runs[1].ShortedSupply)
	}
}
