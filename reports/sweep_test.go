package reports

import (
	"bytes"
	"math"
	"strconv"
	"strings"
	"testing"

	"rfstress/circuits"
)

// A series 50 Ω resistor between 50 Ω ports: S11 = S22 = Z/(2·Z0+Z) = 1/3 and
// S21 = S12 = 2·Z0/(2·Z0+Z) = 2/3 (Pozar, Microwave Engineering, ch. 4, series
// impedance two-port). The Touchstone file read back must say so, with the
// keywords of the Touchstone 2.0 specification in their order.
func TestTouchstoneSeriesResistor(t *testing.T) {
	nl, err := circuits.Parse("r.net", []byte("title series R — 50 Ω\nport in a z=50\nport out b z=50\nresistor R a b 50\n"))
	if err != nil {
		t.Fatal(err)
	}
	c, _ := circuits.Build(nl)
	v := &SweepView{Title: nl.Title, Z1: c.Zin, Z2: c.Zout}
	for _, f := range []float64{1e6, 10e6, 30e6} {
		sp, err := c.TwoPort(f)
		if err != nil {
			t.Fatal(err)
		}
		v.Points = append(v.Points, sp)
	}
	var b bytes.Buffer
	if err := WriteTouchstone(&b, v); err != nil {
		t.Fatal(err)
	}
	text := b.String()
	for _, r := range text {
		if r > 0x7e || (r < 0x20 && r != '\n') {
			t.Fatalf("non-ASCII character %q in a Touchstone file", r)
		}
	}
	order := []string{"[Version] 2.0", "# Hz S RI R 50", "[Number of Ports] 2", "[Two-Port Data Order] 21_12", "[Number of Frequencies] 3", "[Network Data]", "[End]"}
	at := 0
	for _, k := range order {
		i := strings.Index(text[at:], k)
		if i < 0 {
			t.Fatalf("missing or out of order: %q\n%s", k, text)
		}
		at += i
	}
	data := text[strings.Index(text, "[Network Data]")+len("[Network Data]") : strings.Index(text, "[End]")]
	rows := strings.Split(strings.TrimSpace(data), "\n")
	if len(rows) != 3 {
		t.Fatalf("%d data rows, want 3", len(rows))
	}
	want := []float64{1.0 / 3, 0, 2.0 / 3, 0, 2.0 / 3, 0, 1.0 / 3, 0} // S11 S21 S12 S22 as re, im
	for _, row := range rows {
		f := strings.Fields(row)
		if len(f) != 9 {
			t.Fatalf("row has %d fields: %q", len(f), row)
		}
		for i, w := range want {
			x, err := strconv.ParseFloat(f[i+1], 64)
			if err != nil || math.Abs(x-w) > 1e-9 {
				t.Errorf("row %q field %d = %s, want %g", f[0], i+1, f[i+1], w)
			}
		}
	}
}

// A complex port impedance has no Touchstone reference; the writer says so
// instead of writing a wrong file.
func TestTouchstoneRefusesComplexReference(t *testing.T) {
	v := &SweepView{Z1: 50, Z2: complex(12.5, -180)}
	var b bytes.Buffer
	if err := WriteTouchstone(&b, v); err == nil {
		t.Error("a complex reference impedance was accepted")
	}
}
