package circuits

import (
	"errors"
	"math"
	"strings"
	"testing"
)

// near is a network with a 1 nΩ series resistor beside 50 Ω ports: it
// solves, but the matrix spans eleven decades and loses digits.
const near = "port in a z=50\nport out c z=50\nresistor R1 a b 1n\ninductor L1 b c 1u q=100\ncapacitor C1 c gnd 100p q=500\ncapacitor C2 a gnd 100p q=500\n"

// TestBalanceSound: ordinary networks balance to rounding, so the check
// never fires on them (Tellegen's theorem: the source's power equals what
// the parts and the load take; tolerance 1e-12 of the power offered,
// about 10⁴ ulps for these few unknowns).
func TestBalanceSound(t *testing.T) {
	for name, src := range goodNetlists(t) {
		_, c := mustParse(t, name, src)
		for _, f := range []float64{1.8e6, 7.1e6, 28.5e6} {
			for _, ld := range []Load{{Z: c.Zout}, Short, OpenLoad} {
				_, ck, err := c.SolveChecked(f, 100, ld)
				if err != nil {
					t.Fatalf("%s: %v", name, err)
				}
				if ck.Balance > 1e-12 || ck.Refined {
					t.Errorf("%s at %g Hz: balance %.3g, refined %v", name, f, ck.Balance, ck.Refined)
				}
			}
		}
	}
}

// TestRefinementRepairs: the 1 nΩ network misses the balance by about
// 4e-7 when solved plainly; one step of iterative refinement brings it
// below BalanceTol, and the refined input impedance agrees with the ABCD
// cascade of the same parts (Pozar, ch. 4) to 1e-9 relative.
func TestRefinementRepairs(t *testing.T) {
	_, c := mustParse(t, "near.net", near)
	const f = 7e6
	plain, err := c.Solve(f, 100, Load{Z: 50})
	if err != nil {
		t.Fatal(err)
	}
	if plain.balance() <= BalanceTol {
		t.Skipf("this LU balances the plain solve already (%.2g): nothing to repair", plain.balance())
	}
	r, ck, err := c.SolveChecked(f, 100, Load{Z: 50})
	if err != nil {
		t.Fatal(err)
	}
	if !ck.Refined || !ck.OK() {
		t.Fatalf("balance %.3g after refinement (refined %v)", ck.Balance, ck.Refined)
	}
	q500 := lossModel{q: 500}
	w := 2 * math.Pi * f
	ref := shuntY(1 / refCapacitorZ(100e-12, q500, f)).
		then(seriesZ(1e-9)).
		then(seriesZ(complex(w*1e-6/100, w*1e-6))).
		then(shuntY(1 / refCapacitorZ(100e-12, q500, f))).zin(50)
	if e := relErr(r.Zin, ref); e > 1e-9 {
		t.Errorf("Zin %v, ABCD %v: relative error %.2g", r.Zin, ref, e)
	}
}

// TestBalanceFinding: a near-short (1 nΩ) into a node held only by a
// near-open (1 TΩ) stays off balance after refinement; the check says so
// and names the two parts with their lines.
func TestBalanceFinding(t *testing.T) {
	src := near + "resistor R2 c d 1n\nresistor R3 d gnd 1e12\n"
	_, c := mustParse(t, "bad.net", src)
	_, ck, err := c.SolveChecked(7e6, 100, Load{Z: 50})
	if err != nil {
		t.Fatal(err)
	}
	if ck.OK() {
		t.Skipf("balance %.2g: this LU keeps the digits", ck.Balance)
	}
	got := strings.Join(ck.Suspects, ", ")
	if !strings.Contains(got, "R2 (line 7)") || !strings.Contains(got, "R3 (line 8)") {
		t.Errorf("suspects %q, want R2 (line 7) and R3 (line 8)", got)
	}
	want := "the solve at 7 MHz does not balance: source power and the power taken by parts and load differ by "
	if f := ck.Finding(7e6); !strings.HasPrefix(f, want) || !strings.Contains(f, "cannot be trusted; parts far stiffer or weaker than the rest: "+got) {
		t.Errorf("finding: %s", f)
	}
}

// TestSingularNamesPlace: a lossless tank (L ‖ C to ground, Q = 1e18)
// hanging on its own node is singular exactly at its resonance,
// f = 1/(2π√(LC)) = 15.915 MHz for 1 µH and 100 pF (Thomson's formula):
// nothing fixes its voltage. The error names where the pivot was lost.
func TestSingularNamesPlace(t *testing.T) {
	src := "port in a z=50\nport out b z=50\nresistor R a b 10\ncapacitor C0 b gnd 10p\n" +
		"inductor L9 t gnd 1u q=1e18\ncapacitor C9 t gnd 100p q=1e18\n"
	_, c := mustParse(t, "tank.net", src)
	f0 := 1 / (2 * math.Pi * math.Sqrt(1e-6*100e-12))
	_, err := c.Solve(f0, 100, Load{Z: 50})
	if !errors.Is(err, ErrSingular) {
		t.Fatalf("at resonance: %v, want a singular matrix", err)
	}
	want := "no voltage or current is fixed at "
	if !strings.Contains(err.Error(), want+"inductor L9 (line 5)") && !strings.Contains(err.Error(), want+"node t (first named at line 5)") {
		t.Errorf("message does not name the tank: %v", err)
	}
	// a little off resonance it solves
	if _, err := c.Solve(f0*1.01, 100, Load{Z: 50}); err != nil {
		t.Errorf("1 %% off resonance: %v", err)
	}
}
