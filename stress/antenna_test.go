package stress

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"rfstress/circuits"
	"rfstress/ratings"
)

const antFilter = `capacitor C1 n1 gnd 470p q=800 vpk=500
inductor  L2 n1 n2 1.2u q=150
capacitor C3 n2 gnd 820p q=800 vpk=500
inductor  L4 n2 n4 1.2u q=150
capacitor C5 n4 gnd 470p q=800 vpk=500
port in n1 z=50
`

// antennaFile writes a one-port Z file (version 2.0, ohms) of z(f).
func antennaFile(fs []float64, z func(f float64) complex128) []byte {
	var b strings.Builder
	fmt.Fprintf(&b, "[Version] 2.0\n# Hz Z RI R 50\n[Number of Ports] 1\n[Number of Frequencies] %d\n[Network Data]\n", len(fs))
	for _, f := range fs {
		v := z(f)
		fmt.Fprintf(&b, "%.17g %.17g %.17g\n", f, real(v), imag(v))
	}
	b.WriteString("[End]\n")
	return []byte(b.String())
}

func sameStresses(t *testing.T, what string, a, b *Section) {
	t.Helper()
	for i, pa := range a.Parts {
		pb := b.Parts[i]
		for q, sa := range pa.Stress {
			sb := pb.Stress[q]
			if sb == nil || math.Abs(sa.Value-sb.Value) > 1e-9*math.Max(math.Abs(sb.Value), 1e-9) {
				t.Errorf("%s: %s %s: %v against %v", what, pa.Name, q, sa.Value, sb)
			}
		}
	}
}

// TestMeasuredAntennaIsTheLoad: an antenna measured as a constant
// 30+j20 Ω over 1–100 MHz audits exactly as a port written z=30+j20, at
// carriers, harmonics, on its SWR circle and under faults: the measured
// impedance is the load and the circle's centre at every frequency.
func TestMeasuredAntennaIsTheLoad(t *testing.T) {
	const z = complex(30, 20)
	data := antennaFile([]float64{1e6, 10e6, 100e6}, func(float64) complex128 { return z })
	set := []string{"band=7M:7.2M", "points=3", "swr=2", "phases=36", "harmonics=push-pull", "faults=open,short", "power=100"}
	meas, _ := engineFor(t, antFilter+"port out n4 z=50 measured=ant.ts\n", data, set...)
	ref, _ := engineFor(t, antFilter+"port out n4 z=30+j20\n", nil, set...)
	a, err := meas.Audit()
	if err != nil {
		t.Fatal(err)
	}
	b, err := ref.Audit()
	if err != nil {
		t.Fatal(err)
	}
	sameStresses(t, "constant antenna", a, b)
}

// TestMeasuredAntennaPerCarrier: an antenna whose impedance changes
// across the band is, at each carrier, that carrier's measured load: the
// worst over the band is the larger of single-carrier audits with the port
// written as each carrier's impedance (no harmonics, so only carriers).
func TestMeasuredAntennaPerCarrier(t *testing.T) {
	zOf := func(f float64) complex128 { return complex(40+20*(f-7e6)/1e6, 150*(f-7.1e6)/1e6) }
	fs := []float64{6.9e6, 7e6, 7.1e6, 7.2e6, 7.3e6}
	data := antennaFile(fs, zOf)
	set := []string{"swr=1.5", "phases=36", "harmonics=none", "faults=open", "power=100"}
	meas, _ := engineFor(t, antFilter+"port out n4 z=50 measured=ant.ts\n", data, append(set, "band=7M:7.2M", "points=2")...)
	a, err := meas.Audit()
	if err != nil {
		t.Fatal(err)
	}
	var singles []*Section
	for _, f := range []float64{7e6, 7.2e6} {
		z := zOf(f)
		sign := "+"
		if imag(z) < 0 {
			sign = "-"
		}
		port := fmt.Sprintf("port out n4 z=%.17g%sj%.17g\n", real(z), sign, math.Abs(imag(z)))
		ref, _ := engineFor(t, antFilter+port, nil, append(set, fmt.Sprintf("freq=%g", f))...)
		s, err := ref.Audit()
		if err != nil {
			t.Fatal(err)
		}
		singles = append(singles, s)
	}
	for i, p := range a.Parts {
		for _, q := range []ratings.Quantity{ratings.Vpk, ratings.Irms, ratings.Pdiss} {
			want := math.Max(singles[0].Parts[i].Stress[q].Value, singles[1].Parts[i].Stress[q].Value)
			if got := p.Stress[q].Value; math.Abs(got-want) > 1e-9*want {
				t.Errorf("%s %s: %g, single-carrier worst %g", p.Name, q, got, want)
			}
		}
	}
	// a carrier the sweep does not reach is refused, naming the span
	nl, _ := circuits.Parse("b.net", []byte(antFilter+"port out n4 z=50 measured=ant.ts\n"))
	_ = circuits.LoadMeasured(nl, func(string) ([]byte, error) { return data, nil })
	c, _ := circuits.Build(nl)
	cond := Defaults()
	if err := cond.Apply([]Setting{{Key: "freq", Value: "7.5M", Flag: true}}); err != nil {
		t.Fatal(err)
	}
	if _, err := NewEngine(c, nil, cond); err == nil || !strings.Contains(err.Error(), "port out: ant.ts is measured from 6.9 MHz to 7.3 MHz, and 7.5 MHz is needed") {
		t.Errorf("carrier outside the sweep: %v", err)
	}
}
