package stress

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"rfstress/ratings"
)

// piDesign returns a pi network matching a plate load r1 to r2 at f with
// loaded Q q, from the textbook pi-network design equations (e.g. the
// ARRL Handbook's amplifier chapter, common practice):
//
//	Xc1 = R1/Q, Xc2 = R2·√((R1/R2)/(Q²+1 − R1/R2)), XL = (Q·R1 + R1·R2/Xc2)/(Q²+1)
//
// For 1 kΩ to 50 Ω at Q = 12: Xc1 = 83.3 Ω, Xc2 = 20 Ω, XL = 100 Ω.
func piDesign(r1, r2, q, f float64) (c1, l, c2 float64) {
	w := 2 * math.Pi * f
	xc1 := r1 / q
	xc2 := r2 * math.Sqrt((r1/r2)/(q*q+1-r1/r2))
	xl := (q*r1 + r1*r2/xc2) / (q*q + 1)
	return 1 / (w * xc1), xl / w, 1 / (w * xc2)
}

const piF = 7.15e6

// piNetlist is a valve amplifier's output network: the plate (port in,
// 1 kΩ plate load) fed from a 3 kV supply through a plate choke, a
// blocking capacitor, then the pi network into 50 Ω. With dc false the
// choke goes to gnd and there is no supply or draw: the same network at
// RF, written by hand.
func piNetlist(dc bool, cbAttrs string) string {
	c1, l, c2 := piDesign(1000, 50, 12, piF)
	var b strings.Builder
	b.WriteString("port in plate z=1k\nport out ant z=50\n")
	feed := "gnd"
	if dc {
		feed = "bplus"
		b.WriteString("supply B1 bplus 3kV\ndraw D1 plate 0.8A\n")
	}
	fmt.Fprintf(&b, "core K1 ae=40mm2 le=60mm mu=1 material=air\n")
	fmt.Fprintf(&b, "inductor RFC plate %s 200u q=60 rdc=2 core=K1 turns=100 vpk=6k irms=1.5\n", feed)
	fmt.Fprintf(&b, "capacitor Cb plate tune 2n q=2000 %s\n", cbAttrs)
	fmt.Fprintf(&b, "capacitor Ct tune gnd %.6g q=2000 vpk=5k irms=20\n", c1)
	fmt.Fprintf(&b, "inductor Lt tune ant %.6g q=1000 irms=20\n", l)
	fmt.Fprintf(&b, "capacitor Cl ant gnd %.6g q=2000 vpk=2k irms=20\n", c2)
	b.WriteString("audit power=1500 freq=7.15M harmonics=none mode=carrier\n")
	return b.String()
}

func partOf(t *testing.T, s *Section, name string) *PartResult {
	t.Helper()
	for _, p := range s.Parts {
		if p.Name == name {
			return p
		}
	}
	t.Fatalf("no part %s", name)
	return nil
}

func TestPiNetworkPlateVoltage(t *testing.T) {
	fx := build(t, piNetlist(true, "vpk=10k irms=10"))
	sec, err := fx.eng.Audit()
	if err != nil {
		t.Fatal(err)
	}
	ref, err := build(t, piNetlist(false, "vpk=10k irms=10")).eng.Audit()
	if err != nil {
		t.Fatal(err)
	}
	// Peak RF at the plate ≈ √(2·P·R) = √(2·1500·1000) = 1732 V for 1500 W
	// into a 1 kΩ plate load (common practice). The tune capacitor sits on
	// the plate through the blocking capacitor (2 nF: 11 Ω against 1 kΩ).
	// 3 %: the tank coil's loss (Q 1000: 0.1 Ω against the 6.9 Ω series
	// leg lowers the plate load by about 1.5 %) and the choke's 9 kΩ across
	// the plate load move the match by about that much.
	want := math.Sqrt(2 * 1500 * 1000)
	if plate := ref.MaxNodeVpk; ref.MaxNodeAt != "plate" || relErr(plate, want) > 0.03 {
		t.Errorf("RF at the plate %.0f V peak (node %s), √(2PR) = %.0f V", plate, ref.MaxNodeAt, want)
	}
	t.Logf("plate %.1f V peak RF, tune capacitor %.1f V peak, √(2PR) %.1f V", ref.MaxNodeVpk, partOf(t, sec, "Ct").Stress[ratings.Vpk].Value, want)
	// DC does not reach the tune capacitor: its stresses are those of the
	// RF-only network written by hand (same network at RF: to rounding)
	for _, q := range []ratings.Quantity{ratings.Vpk, ratings.Vrms, ratings.Irms} {
		a, b := partOf(t, sec, "Ct").Stress[q].Value, partOf(t, ref, "Ct").Stress[q].Value
		if relErr(a, b) > 1e-9 {
			t.Errorf("Ct %s: %g with the supply, %g without", q, a, b)
		}
	}
	// The blocking capacitor holds the supply less the choke's drop:
	// Vdc = 3000 − 0.8·2 = 2998.4 V (Ohm's law); its peak is Vdc plus its
	// RF peak and its RMS √(Vdc² + Vrf²) (common practice)
	vdc := 3000 - 0.8*2
	cbA, cbR := partOf(t, sec, "Cb"), partOf(t, ref, "Cb")
	if d := cbA.Stress[ratings.Vpk].Value - cbR.Stress[ratings.Vpk].Value; math.Abs(d-vdc) > 1e-6 {
		t.Errorf("blocking capacitor DC share %g V, Ohm's law %g V", d, vdc)
	}
	vr := cbR.Stress[ratings.Vrms].Value
	if got := cbA.Stress[ratings.Vrms].Value; relErr(got, math.Sqrt(vdc*vdc+vr*vr)) > 1e-9 {
		t.Errorf("blocking capacitor RMS %g, √(Vdc²+Vrf²) %g", got, math.Sqrt(vdc*vdc+vr*vr))
	}
	if v := cbA.Stress[ratings.Vpk].Value; v < 2990 || v > 3100 {
		t.Errorf("blocking capacitor %g V peak: about 3 kV expected", v)
	}
	// The choke: RMS current √(Idc² + Irf²), winding heat with Idc, and
	// peak flux with the DC flux L·Idc/(N·Ae) added
	chA, chR := partOf(t, sec, "RFC"), partOf(t, ref, "RFC")
	irf := chR.Stress[ratings.Irms].Value
	if got := chA.Stress[ratings.Irms].Value; relErr(got, math.Sqrt(0.64+irf*irf)) > 1e-9 {
		t.Errorf("choke RMS current %g, √(Idc²+Irf²) %g", got, math.Sqrt(0.64+irf*irf))
	}
	if d := chA.Stress[ratings.Pdiss].Value - chR.Stress[ratings.Pdiss].Value; math.Abs(d-0.64*2) > 1e-9 {
		t.Errorf("choke DC heat %g W, Idc²·Rdc = %g W", d, 0.64*2)
	}
	bdc := 200e-6 * 0.8 / (100 * 40e-6)
	if d := chA.Stress[ratings.Bpk].Value - chR.Stress[ratings.Bpk].Value; relErr(d, bdc) > 1e-9 {
		t.Errorf("choke DC flux %g T, L·Idc/(N·Ae) = %g T", d, bdc)
	}
	// its insulation sees the plate's DC and RF: vpk= is judged
	if st := chA.Stress[ratings.Vpk]; st.Limit.Abs != 6000 {
		t.Errorf("choke vpk= not judged: %+v", st.Limit)
	}
	// the highest node is the plate: DC plus RF; the DC node report
	// names the supply
	if sec.MaxNodeAt != "plate" || math.Abs(sec.MaxNodeVdc-vdc) > 1e-6 || sec.MaxDCV != 3000 || sec.MaxDCAt != "bplus" {
		t.Errorf("highest node %s %g V (DC %g), highest DC %g at %s", sec.MaxNodeAt, sec.MaxNodeVpk, sec.MaxNodeVdc, sec.MaxDCV, sec.MaxDCAt)
	}
	if d := sec.MaxNodeVpk - ref.MaxNodeVpk; math.Abs(d-vdc) > 1e-6 {
		t.Errorf("highest node DC share %g", d)
	}
}

// Safe power with DC: only the RF share scales with drive. Re-auditing at
// the safe power puts the limiting quantity at its derated limit; where
// the DC alone is over the derated limit no power is safe.
func TestSafePowerWithDC(t *testing.T) {
	fx := build(t, piNetlist(true, "vpk=4.5k irms=10 dielectric=vacuum"))
	sec, err := fx.eng.Audit()
	if err != nil {
		t.Fatal(err)
	}
	cb := partOf(t, sec, "Cb").Stress[ratings.Vpk]
	p := cb.SafeW
	if !(p > 0) || math.IsInf(p, 1) {
		t.Fatalf("safe power %g", p)
	}
	again, err := build(t, piNetlist(true, "vpk=4.5k irms=10 dielectric=vacuum"), fmt.Sprintf("power=%.17g", p)).eng.Audit()
	if err != nil {
		t.Fatal(err)
	}
	// derated vpk of a vacuum capacitor: 0.7 × 4.5 kV (standard profile)
	if got := partOf(t, again, "Cb").Stress[ratings.Vpk].Value; relErr(got, 0.7*4500) > 1e-9 {
		t.Errorf("at the safe power %g W the blocking capacitor sees %g V, limit %g V", p, got, 0.7*4500)
	}
	low, err := build(t, piNetlist(true, "vpk=4k irms=10 dielectric=vacuum")).eng.Audit()
	if err != nil {
		t.Fatal(err)
	}
	if st := partOf(t, low, "Cb").Stress[ratings.Vpk]; st.SafeW != 0 || st.Verdict != ratings.Marginal {
		t.Errorf("3 kV DC on a 4 kV capacitor derated to 2.8 kV: safe power %g, verdict %v", st.SafeW, st.Verdict)
	}
}
