package circuits

import (
	"fmt"
	"math"
	"math/cmplx"
	"math/rand"
	"strings"
	"testing"
)

// lineNet is a line from the transmitter port to the antenna port.
func lineNet(attrs string) string {
	return "port in n1 z=50\nport out n2 z=50\nline T1 n1 n2 " + attrs + "\n"
}

// TestLineInputImpedance: the input impedance of a terminated lossy line,
// Zin = Z0·(ZL + Z0·tanh γl)/(Z0 + ZL·tanh γl) (Pozar, Microwave
// Engineering, 4th ed., eq. 2.91), on random loads and frequencies, for
// coax and for a balanced line fed between two node pairs. Two exact
// evaluations of the same formula: agreement to 1e-9 relative.
func TestLineInputImpedance(t *testing.T) {
	rng := rand.New(rand.NewSource(11))
	nets := map[string]string{
		"coax": lineNet("z0=75 len=23.7m vf=0.66 loss=1.5@10M,4.9@100M"),
		"twin": "port in a1 z=50\nport out a2 z=50\nline T1 a1 b1 a2 b2 z0=450 len=65ft vf=0.9 loss=0.3@10M,1@100M\nresistor R1 b1 gnd 1m\nresistor R2 b2 gnd 1m\n",
	}
	for name, text := range nets {
		_, c := mustParse(t, name+".net", text)
		l := c.Elements[0].Line()
		for n := 0; n < 40; n++ {
			f := 1e6 * math.Exp(rng.Float64()*math.Log(60))
			zl := complex(rng.Float64()*500+0.5, (rng.Float64()-0.5)*1000)
			r, err := c.Solve(f, 100, Load{Z: zl})
			if err != nil {
				t.Fatal(err)
			}
			st := r.Parts[0]
			zin := st.V / st.I
			th := cmplx.Tanh(l.Gamma(f) * complex(l.Len, 0))
			z0 := complex(l.Z0, 0)
			if name == "twin" {
				// the 1 mΩ returns to gnd are in series with the load's
				// return: the differential end-2 load is what the line sees
				zl = -st.V2 / st.I2
			}
			want := z0 * (zl + z0*th) / (z0 + zl*th)
			if d := cmplx.Abs(zin-want) / cmplx.Abs(want); d > 1e-9 {
				t.Errorf("%s f=%g ZL=%v: Zin %v, Pozar %v", name, f, zl, zin, want)
			}
		}
	}
}

// TestQuarterWaveStub: a shorted stub a quarter wave long is an open
// circuit at f0 and a short at 2f0 (Pozar sec. 2.3, common practice for
// harmonic traps). Lossless: the stub vanishes at f0 and shorts the port at
// 2f0 to rounding.
func TestQuarterWaveStub(t *testing.T) {
	const f0 = 7.1e6
	const vf = 0.66
	lq := vf * SpeedOfLight / f0 / 4
	text := fmt.Sprintf("port in n1 z=50\nport out n2 z=50\nline S n1 gnd z0=50 len=%.12gm vf=%g\nresistor R1 n1 n2 50\n", lq, vf)
	_, c := mustParse(t, "stub.net", text)
	r, err := c.Solve(f0, 100, Load{Z: 50})
	if err != nil {
		t.Fatal(err)
	}
	if d := cmplx.Abs(r.Zin - 100); d > 1e-6 {
		t.Errorf("f0: Zin %v, want 100 Ω (stub open)", r.Zin)
	}
	r, err = c.Solve(2*f0, 100, Load{Z: 50})
	if err != nil {
		t.Fatal(err)
	}
	if cmplx.Abs(r.Zin) > 1e-6 {
		t.Errorf("2f0: Zin %v, want a short", r.Zin)
	}
}

// TestLineSWRMaxima: a lossless line delivering P into a load of SWR S has
// V_max,rms = √(P·Z0·S) and I_max,rms = √(P·S/Z0) on any stretch of at
// least half a wavelength (8.45 m here) (Pozar
// sec. 2.3: |V|max = |V+|(1+|Γ|), P = |V+|²(1−|Γ|²)/Z0). The crest is found
// by MaxAlong from the end-1 state; 1e-9 relative (exact formula against a
// refined search).
func TestLineSWRMaxima(t *testing.T) {
	for _, length := range []string{"8.5m", "17m", "31.7m"} {
		_, c := mustParse(t, "swr.net", lineNet("z0=50 len="+length+" vf=0.8"))
		l := c.Elements[0].Line()
		for _, swr := range []float64{1.5, 3, 10} {
			for k := 0; k < 12; k++ {
				ld := LoadOnCircle(50, swr, 2*math.Pi*float64(k)/12)
				const f = 14.2e6
				r, err := c.Solve(f, 100, ld)
				if err != nil {
					t.Fatal(err)
				}
				st := r.Parts[0]
				p := r.Pout
				vw, iw := l.VoltageWaves(st.V, st.I)
				vmax, _ := l.MaxAlong(f, vw, Wave{}, 0)
				imax, _ := l.MaxAlong(f, iw, Wave{}, 0)
				if want := math.Sqrt(p * 50 * swr); math.Abs(vmax-want) > 1e-9*want {
					t.Errorf("len %s SWR %g θ#%d: Vmax %g, want √(P·Z0·S) = %g", length, swr, k, vmax, want)
				}
				if want := math.Sqrt(p * swr / 50); math.Abs(imax-want) > 1e-9*want {
					t.Errorf("len %s SWR %g θ#%d: Imax %g, want √(P·S/Z0) = %g", length, swr, k, imax, want)
				}
			}
		}
	}
}

// TestMaxAlongDenseScan: on lossy lines with random end states and circle
// radii, the refined maximum is never below a dense scan of 200 000 points
// and exceeds it by no more than the scan's own step can hide (the scan
// under-reads a crest by at most Lipschitz·step/2).
func TestMaxAlongDenseScan(t *testing.T) {
	rng := rand.New(rand.NewSource(3))
	rc := func() complex128 { return complex(rng.NormFloat64(), rng.NormFloat64()) }
	for n := 0; n < 30; n++ {
		l := &LineSpec{Z0: 50 + 400*rng.Float64(), Len: 0.5 + 60*rng.Float64(), VF: 0.6 + 0.4*rng.Float64(),
			Loss: []Point{{V: 0.5 + 20*rng.Float64(), F: 10e6}, {V: 30 + 20*rng.Float64(), F: 100e6}}}
		f := 1e6 * math.Exp(rng.Float64()*math.Log(100))
		w0, w1 := Wave{rc(), rc()}, Wave{rc(), rc()}
		r := 0.0
		if n%2 == 1 {
			r = rng.Float64() * 2
		}
		got, at := l.MaxAlong(f, w0, w1, r)
		g := l.Gamma(f)
		const m = 200000
		var scan float64
		for k := 0; k <= m; k++ {
			z := l.Len * float64(k) / m
			if v := cmplx.Abs(w0.At(g, z)) + r*cmplx.Abs(w1.At(g, z)); v > scan {
				scan = v
			}
		}
		if got < scan*(1-1e-12) {
			t.Errorf("case %d: MaxAlong %g below the dense scan %g", n, got, scan)
		}
		step := l.Len / m
		bound := cmplx.Abs(g) * (cmplx.Abs(w0.F) + cmplx.Abs(w0.B)*math.Exp(real(g)*l.Len) +
			r*(cmplx.Abs(w1.F)+cmplx.Abs(w1.B)*math.Exp(real(g)*l.Len))) * step / 2
		if got > scan+bound {
			t.Errorf("case %d: MaxAlong %g above the dense scan %g by more than %g", n, got, scan, bound)
		}
		if at < 0 || at > l.Len {
			t.Errorf("case %d: crest at %g outside the line", n, at)
		}
	}
}

// TestZeroLengthLine: a line of zero length is transparent, whatever its
// Z0 and loss (the ABCD matrix of l = 0 is the identity, Pozar table 4.1).
// The network with the line set to zero length must solve exactly as the
// same network with the two nodes joined: 1e-12 relative.
func TestZeroLengthLine(t *testing.T) {
	body := "port in n1 z=50\nport out n3 z=50\ninductor L1 n1 n2 1u\n%s\ncapacitor C1 n3 gnd 220p\n"
	_, a := mustParse(t, "a.net", fmt.Sprintf(body, "line T n2 n3 z0=300 len=1m vf=0.7 loss=3"))
	a.Elements[1].line.Len = 0
	_, b := mustParse(t, "b.net", "port in n1 z=50\nport out n3 z=50\ninductor L1 n1 n3 1u\ncapacitor C1 n3 gnd 220p\n")
	for _, f := range []float64{1.8e6, 14.2e6, 50e6} {
		for _, ld := range []Load{{Z: 50}, {Z: complex(5, -90)}, Short, OpenLoad} {
			ra, err := a.Solve(f, 100, ld)
			if err != nil {
				t.Fatal(err)
			}
			rb, err := b.Solve(f, 100, ld)
			if err != nil {
				t.Fatal(err)
			}
			if d := cmplx.Abs(ra.Zin-rb.Zin) / cmplx.Abs(rb.Zin); d > 1e-12 {
				t.Errorf("f=%g load %s: Zin %v with a zero-length line, %v without", f, loadName(ld), ra.Zin, rb.Zin)
			}
			if st := ra.Parts[1]; cmplx.Abs(st.V-st.V2) > 1e-12*cmplx.Abs(st.V)+1e-15 || cmplx.Abs(st.I+st.I2) > 1e-12*cmplx.Abs(st.I)+1e-15 {
				t.Errorf("f=%g: ends differ: V %v/%v I %v/%v", f, st.V, st.V2, st.I, st.I2)
			}
		}
	}
}

// TestLineMatchedLoss: a matched lossy line delivers e^{−2αl} of its input
// power (the definition of matched loss in dB, Pozar sec. 2.7), and the
// dissipation per metre at its input is 2α·P_in. 10 dB/100 m over 30 m is
// 3 dB: half the power arrives. 1e-9 relative.
func TestLineMatchedLoss(t *testing.T) {
	_, c := mustParse(t, "m.net", lineNet("z0=50 len=30m vf=0.66 loss=10"))
	r, err := c.Solve(7e6, 100, Load{Z: 50})
	if err != nil {
		t.Fatal(err)
	}
	ratio := r.Pout / r.Pin
	if want := math.Pow(10, -0.3); math.Abs(ratio-want) > 1e-9 {
		t.Errorf("Pout/Pin %g, want 10^(−3/10) = %g", ratio, want)
	}
	if d := r.Parts[0].Ploss - (r.Pin - r.Pout); math.Abs(d) > 1e-9*r.Pin {
		t.Errorf("line loss %g, Pin − Pout %g", r.Parts[0].Ploss, r.Pin-r.Pout)
	}
}

// TestLineUnits: len= needs a unit and reads m, cm, mm and ft (1 ft =
// 0.3048 m exactly, international foot); vf above 1 and a balanced line
// on gnd are refused with a position.
func TestLineUnits(t *testing.T) {
	for raw, want := range map[string]float64{"12m": 12, "250cm": 2.5, "800mm": 0.8, "100ft": 30.48} {
		_, c := mustParse(t, "u.net", lineNet("z0=50 vf=0.66 len="+raw))
		if got := c.Elements[0].Line().Len; math.Abs(got-want) > 1e-12 {
			t.Errorf("len=%s read as %g m, want %g", raw, got, want)
		}
	}
	for _, bad := range []string{
		lineNet("z0=50 vf=0.66 len=12"),
		lineNet("z0=50 vf=1.2 len=12m"),
		lineNet("z0=50 len=12m"),
		"port in a1 z=50\nport out a2 z=50\nline T a1 gnd a2 b2 z0=450 len=3m vf=0.9\nresistor R b2 gnd 1\n",
	} {
		_, err := Parse("bad.net", []byte(bad))
		if err == nil || !strings.Contains(err.Error(), "bad.net:3:") {
			t.Errorf("want an error at line 3 for\n%s\ngot %v", bad, err)
		}
	}
}

// TestMaxAlongEnvelope: on an electrically very long line (a harmonic far
// up a long run) the maximum is the envelope |F|·e^{−αz} + |B|·e^{αz} at
// an end: never below a dense scan of 2 000 000 points, and within 1 % of
// it (the crests reach the envelope to within its change over one half
// wavelength).
func TestMaxAlongEnvelope(t *testing.T) {
	l := &LineSpec{Z0: 50, Len: 1000, VF: 0.66, Loss: []Point{{V: 0.05}}}
	const f = 100e6 // 1000 m: 1010 half wavelengths at 100 MHz (scanned), 20 200 at 2 GHz (envelope)
	w0 := Wave{complex(1, 0.3), complex(0.4, -0.2)}
	for _, fr := range []float64{f, 20 * f} {
		got, _ := l.MaxAlong(fr, w0, Wave{}, 0)
		g := l.Gamma(fr)
		const m = 2000000
		var scan float64
		for k := 0; k <= m; k++ {
			if v := cmplx.Abs(w0.At(g, l.Len*float64(k)/m)); v > scan {
				scan = v
			}
		}
		if got < scan*(1-1e-12) || got > scan*1.01 {
			t.Errorf("f=%g: MaxAlong %g, dense scan %g", fr, got, scan)
		}
	}
}
