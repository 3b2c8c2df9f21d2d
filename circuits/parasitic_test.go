package circuits

import (
	"fmt"
	"math"
	"math/cmplx"
	"strings"
	"testing"
)

// zThrough solves a single part between the ports with the antenna port
// shorted: the transmitter then sees exactly the part's impedance.
func zThrough(t *testing.T, part string, f float64) complex128 {
	t.Helper()
	_, c := mustParse(t, "p.net", "port in n1 z=50\nport out n2 z=50\n"+part+"\n")
	r, err := c.Solve(f, 1, Short)
	if err != nil {
		t.Fatal(err)
	}
	return r.Zin
}

// TestParasiticImpedance: the closed forms of the part models (common
// practice): an inductor with self-capacitance is (R + jωL) ∥ 1/(jωCp),
// R = ωL/Q; a capacitor with lead inductance is ESR + jωL − j/(ωC);
// srf= gives Cp = 1/(ω0²L) and ESL = 1/(ω0²C). Exact: 1e-12 relative.
func TestParasiticImpedance(t *testing.T) {
	for _, f := range []float64{1.8e6, 7.1e6, 21e6, 45e6, 90e6} {
		w := 2 * math.Pi * f
		rl := w * 2e-6 / 150
		zl := complex(rl, w*2e-6)
		for _, p := range []struct {
			text string
			cp   float64
		}{{"inductor L n1 n2 2u q=150 cp=5p", 5e-12}, {"inductor L n1 n2 2u q=150 srf=40M", 1 / (math.Pow(2*math.Pi*40e6, 2) * 2e-6)}} {
			want := 1 / (1/zl + complex(0, w*p.cp))
			if got := zThrough(t, p.text, f); cmplx.Abs(got-want) > 1e-12*cmplx.Abs(want) {
				t.Errorf("%s at %g Hz: %v, closed form %v", p.text, f, got, want)
			}
		}
		for _, p := range []struct {
			text string
			esl  float64
		}{{"capacitor C n1 n2 100p esr=0.05 esl=8n", 8e-9}, {"capacitor C n1 n2 100p esr=0.05 srf=120M", 1 / (math.Pow(2*math.Pi*120e6, 2) * 100e-12)}} {
			want := complex(0.05, w*p.esl-1/(w*100e-12))
			if got := zThrough(t, p.text, f); cmplx.Abs(got-want) > 1e-12*cmplx.Abs(want) {
				t.Errorf("%s at %g Hz: %v, closed form %v", p.text, f, got, want)
			}
		}
	}
}

// TestCapacitorPastResonance: a capacitor past its own series resonance
// behaves as an inductor (common practice: above its SRF a bypass
// capacitor is its lead inductance): reactance negative below the SRF,
// zero at it (the impedance is the ESR alone), positive above it.
func TestCapacitorPastResonance(t *testing.T) {
	const srf = 120e6
	part := fmt.Sprintf("capacitor C n1 n2 100p esr=0.05 srf=%g", srf)
	if x := imag(zThrough(t, part, srf/2)); x >= 0 {
		t.Errorf("below the SRF: reactance %g Ω, want capacitive", x)
	}
	if z := zThrough(t, part, srf); math.Abs(imag(z)) > 1e-9 || math.Abs(real(z)-0.05) > 1e-12 {
		t.Errorf("at the SRF: %v, want the ESR alone", z)
	}
	if x := imag(zThrough(t, part, 2*srf)); x <= 0 {
		t.Errorf("above the SRF: reactance %g Ω, want inductive", x)
	}
}

// TestWindingAndTerminalCurrent: with self-capacitance the winding carries
// I = V/(R + jωL) and the terminals It = I + jωCp·V (Kirchhoff at the
// terminals of (L + R) ∥ Cp); flux linkage is L times the winding current.
func TestWindingAndTerminalCurrent(t *testing.T) {
	_, c := mustParse(t, "w.net", "port in n1 z=50\nport out n2 z=50\ninductor L n1 n2 2u q=150 cp=5p\n")
	const f = 30e6
	r, err := c.Solve(f, 100, Load{Z: complex(20, -40)})
	if err != nil {
		t.Fatal(err)
	}
	st := r.Parts[0]
	w := 2 * math.Pi * f
	iw := st.V / complex(w*2e-6/150, w*2e-6)
	it := iw + complex(0, w*5e-12)*st.V
	if cmplx.Abs(st.I-iw) > 1e-12*cmplx.Abs(iw) || cmplx.Abs(st.It-it) > 1e-12*cmplx.Abs(it) {
		t.Errorf("winding %v (want %v), terminal %v (want %v)", st.I, iw, st.It, it)
	}
	if cmplx.Abs(st.Lambda-complex(2e-6, 0)*iw) > 1e-12*cmplx.Abs(st.Lambda) {
		t.Errorf("flux linkage %v, want L·I_winding", st.Lambda)
	}
	if cmplx.Abs(r.Iout-st.It) > 1e-12*cmplx.Abs(it) {
		t.Errorf("load current %v, terminal current %v", r.Iout, st.It)
	}
}

// TestSelfResonantLowpass: a 7-pole Chebyshev lowpass (fc 8.5 MHz, 50 Ω)
// whose coils resonate with their self-capacitance at the 3rd harmonic of
// 7.1 MHz. Its S21 against an ABCD cascade written here with
// parallel-resonant series arms ((R + jωL) ∥ Cp, Pozar, Microwave
// Engineering, ch. 4: series Z [1 Z; 0 1], shunt Y [1 0; Y 1],
// S21 = 2/(A + B/Z0 + C·Z0 + D)) to 1e-9; then the physics: at 21.3 MHz
// the resonant coils trap (more attenuation than ideal coils), and well
// above resonance (45 MHz) the coils are capacitive and the stopband
// attenuation is lost (less than ideal coils).
func TestSelfResonantLowpass(t *testing.T) {
	g := []float64{1.1812, 1.4228, 2.0967, 1.5734, 2.0967, 1.4228, 1.1812} // MYJ 4.05, 0.1 dB ripple
	const fc, r0, f3 = 8.5e6, 50.0, 21.3e6
	wc := 2 * math.Pi * fc
	build := func(cpOn bool) (string, []float64, []float64) {
		var b strings.Builder
		b.WriteString("port in n1 z=50\nport out n4 z=50\n")
		var caps, inds []float64
		node := 1
		for k, gk := range g {
			if k%2 == 0 {
				c := gk / (wc * r0)
				caps = append(caps, c)
				fmt.Fprintf(&b, "capacitor C%d n%d gnd %.12g q=1000\n", k+1, node, c)
			} else {
				l := gk * r0 / wc
				inds = append(inds, l)
				extra := ""
				if cpOn {
					extra = fmt.Sprintf(" srf=%g", f3)
				}
				fmt.Fprintf(&b, "inductor L%d n%d n%d %.12g q=150%s\n", k+1, node, node+1, l, extra)
				node++
			}
		}
		return b.String(), caps, inds
	}
	s21 := func(cpOn bool, f float64) (float64, float64) {
		text, caps, inds := build(cpOn)
		_, c := mustParse(t, "sr.net", text)
		sp, err := c.TwoPort(f)
		if err != nil {
			t.Fatal(err)
		}
		w := 2 * math.Pi * f
		m := abcd{1, 0, 0, 1}
		for k := range g {
			if k%2 == 0 {
				cv := caps[k/2]
				m = m.then(shuntY(1 / complex(1/(w*cv*1000), -1/(w*cv))))
			} else {
				l := inds[k/2]
				z := complex(w*l/150, w*l)
				if cpOn {
					cp := 1 / (math.Pow(2*math.Pi*f3, 2) * l)
					z = 1 / (1/z + complex(0, w*cp))
				}
				m = m.then(seriesZ(z))
			}
		}
		return DB(sp.S21), DB(m.s21Pozar(r0))
	}
	for _, f := range []float64{7.1e6, 14.2e6, f3, 28.4e6, 45e6} {
		for _, on := range []bool{false, true} {
			got, want := s21(on, f)
			if math.Abs(got-want) > 1e-7 {
				t.Errorf("f=%g cp=%v: S21 %.9f dB, ABCD %.9f dB", f, on, got, want)
			}
		}
	}
	ideal3, _ := s21(false, f3)
	trap3, _ := s21(true, f3)
	if !(trap3 < ideal3-20) {
		t.Errorf("at the coils' resonance %g Hz: S21 %.1f dB with cp, %.1f dB ideal; want a trap", f3, trap3, ideal3)
	}
	ideal5, _ := s21(false, 45e6)
	lost5, _ := s21(true, 45e6)
	if !(lost5 > ideal5+10) {
		t.Errorf("above resonance (45 MHz): S21 %.1f dB with cp, %.1f dB ideal; want stopband lost", lost5, ideal5)
	}
	t.Logf("S21 at 21.3 MHz: %.1f dB ideal, %.1f dB self-resonant; at 45 MHz: %.1f dB ideal, %.1f dB self-resonant", ideal3, trap3, ideal5, lost5)
}

// TestParasiticErrors: both a parasitic and srf= on one part is refused.
func TestParasiticErrors(t *testing.T) {
	for _, bad := range []string{
		"inductor L n1 n2 1u cp=3p srf=40M",
		"capacitor C n1 n2 100p esl=5n srf=100M",
		"resistor R n1 n2 50 cp=3p",
	} {
		_, err := Parse("bad.net", []byte("port in n1 z=50\nport out n2 z=50\n"+bad+"\n"))
		if err == nil || !strings.Contains(err.Error(), "bad.net:3:") {
			t.Errorf("%s: want an error on line 3, got %v", bad, err)
		}
	}
}
