package circuits

// The example station in testdata/station is an invented 100 W PEP HF
// transmitter shipped as the demo: a bank of 7-pole Chebyshev harmonic
// lowpass filters, a receive preselector and a T-network tuner. These
// tests keep the netlists honest. Each lowpass file states its design in
// a comment line such as
//
//	# design: chebyshev n=7 ripple=0.1dB fc=4.8M r0=50
//
// and the tests check that its parts are the published prototype values
// for that design, rounded as a builder would (within 6 %), and that the
// filter does what a harmonic filter is for.

import (
	"fmt"
	"math"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"testing"
)

const stationDir = "../testdata/station"

// stationRounding is how far a part may sit from its prototype value:
// capacitors rounded to E12/E24 values or parallel pairs, coils to whole
// turns.
const stationRounding = 0.06

// stationDesign is what a "# design:" line states.
type stationDesign struct {
	n                int
	rippleDB, fc, r0 float64
}

// readStationDesign finds the "# design: chebyshev …" comment line.
func readStationDesign(src []byte) (stationDesign, error) {
	var d stationDesign
	for _, line := range strings.Split(string(src), "\n") {
		body, ok := strings.CutPrefix(strings.TrimSpace(line), "#")
		if !ok {
			continue
		}
		rest, ok := strings.CutPrefix(strings.TrimSpace(body), "design:")
		if !ok {
			continue
		}
		fs := strings.Fields(rest)
		if len(fs) == 0 || fs[0] != "chebyshev" {
			return d, fmt.Errorf("design line %q is not a chebyshev lowpass", line)
		}
		for _, kv := range fs[1:] {
			k, v, ok := strings.Cut(kv, "=")
			if !ok {
				return d, fmt.Errorf("design line: %q is not key=value", kv)
			}
			var err error
			switch k {
			case "n":
				d.n, err = strconv.Atoi(v)
			case "ripple":
				d.rippleDB, err = ParseValue(strings.TrimSuffix(v, "dB"))
			case "fc":
				d.fc, err = ParseValue(v, "Hz")
			case "r0":
				d.r0, err = ParseValue(v, "ohm")
			default:
				err = fmt.Errorf("unknown key")
			}
			if err != nil {
				return d, fmt.Errorf("design line: %s: %v", kv, err)
			}
		}
		if d.n < 1 || !(d.rippleDB > 0) || !(d.fc > 0) || !(d.r0 > 0) {
			return d, fmt.Errorf("design line %q needs n, ripple, fc and r0", line)
		}
		return d, nil
	}
	return d, fmt.Errorf("no '# design: chebyshev …' line")
}

// stationLadder reads a shunt-C-first lowpass ladder from the netlist by
// its topology, walking from port in to port out: at each node the
// capacitors to ground add up (parallel pairs are one element), then one
// inductor leads to the next node. It returns the element values in
// ladder order, C1, L2, C3, …, and an error for anything else.
func stationLadder(nl *Netlist) ([]float64, error) {
	used := map[*Component]bool{}
	var vals []float64
	node := nl.In.Node
	seen := map[string]bool{node: true}
	for {
		var c float64
		for _, p := range nl.Components {
			if p.Kind == Capacitor && (p.A == node && p.B == Ground || p.B == node && p.A == Ground) {
				c += p.Value
				used[p] = true
			}
		}
		if c == 0 {
			return nil, fmt.Errorf("node %s has no shunt capacitor", node)
		}
		vals = append(vals, c)
		if node == nl.Out.Node {
			break
		}
		var next string
		var l *Component
		for _, p := range nl.Components {
			if p.Kind != Inductor || used[p] {
				continue
			}
			other := ""
			switch node {
			case p.A:
				other = p.B
			case p.B:
				other = p.A
			}
			if other == "" || other == Ground || seen[other] {
				continue
			}
			if l != nil {
				return nil, fmt.Errorf("node %s has two series inductors, %s and %s", node, l.Name, p.Name)
			}
			l, next = p, other
		}
		if l == nil {
			return nil, fmt.Errorf("no series inductor leads on from node %s", node)
		}
		used[l] = true
		vals = append(vals, l.Value)
		node = next
		seen[node] = true
	}
	for _, p := range nl.Components {
		if !used[p] {
			return nil, fmt.Errorf("%s %s is not part of a shunt-C-first ladder", p.Kind, p.Name)
		}
	}
	return vals, nil
}

// stationFiles lists the files of the station matching pattern.
func stationFiles(t *testing.T, pattern string) []string {
	t.Helper()
	files, err := filepath.Glob(filepath.Join(stationDir, pattern))
	if err != nil {
		t.Fatal(err)
	}
	sort.Strings(files)
	if len(files) == 0 {
		t.Fatalf("no %s files in %s", pattern, stationDir)
	}
	return files
}

func loadStation(t *testing.T, file string) ([]byte, *Netlist, *Circuit) {
	t.Helper()
	src, err := os.ReadFile(file)
	if err != nil {
		t.Fatal(err)
	}
	nl, err := Parse(file, src)
	if err != nil {
		t.Fatalf("parse: %v", err)
	}
	if err := LoadMeasured(nl, os.ReadFile); err != nil {
		t.Fatalf("measured data: %v", err)
	}
	c, err := Build(nl)
	if err != nil {
		t.Fatalf("build: %v", err)
	}
	return src, nl, c
}

// stationBand is the carrier band of the file's audit lines.
func stationBand(t *testing.T, nl *Netlist) (lo, hi float64) {
	t.Helper()
	for _, d := range nl.Audit {
		if a, ok := d.Attrs["band"]; ok {
			return a.Lo, a.Hi
		}
	}
	t.Fatal("no audit band=")
	return 0, 0
}

func TestStationFilesParse(t *testing.T) {
	files := stationFiles(t, "*.net")
	if len(files) < 6 {
		t.Errorf("the station has %d netlists, want the lowpass bank, the preselector and the tuner", len(files))
	}
	for _, f := range files {
		t.Run(filepath.Base(f), func(t *testing.T) {
			src, nl, _ := loadStation(t, f)
			if len(nl.Audit) == 0 {
				t.Error("no audit line")
			}
			if !strings.Contains(string(src), "CAUTION") {
				t.Error("no caution line in the header")
			}
			for _, c := range nl.Components {
				// every kind with a value tolerance states it (resistors
				// are taken as exact; sources and contacts have none)
				if _, has := SpecOf(c.Kind).Syntax.Attrs["tol"]; has && c.Kind != Resistor && c.Value != 0 && c.Attrs["tol"] == nil {
					t.Errorf("%s has no tol=", c.Name)
				}
			}
		})
	}
}

// TestStationLowpassPrototype checks every lowpass against the
// prototype its design line states.
func TestStationLowpassPrototype(t *testing.T) {
	for _, f := range stationFiles(t, "lpf-*.net") {
		t.Run(filepath.Base(f), func(t *testing.T) {
			src, nl, _ := loadStation(t, f)
			d, err := readStationDesign(src)
			if err != nil {
				t.Fatal(err)
			}
			got, err := stationLadder(nl)
			if err != nil {
				t.Fatal(err)
			}
			if len(got) != d.n {
				t.Fatalf("ladder has %d elements, the design line says n=%d", len(got), d.n)
			}
			g := chebyshevG(d.n, d.rippleDB)[1:] // g1…gn (Matthaei, Young & Jones 1964, sec. 4.05)
			w := 2 * math.Pi * d.fc
			for k, gk := range g {
				want, what := gk/(w*d.r0), "C" // odd positions (1, 3, …): shunt C
				if k%2 == 1 {
					want, what = gk*d.r0/w, "L"
				}
				if e := got[k]/want - 1; math.Abs(e) > stationRounding {
					t.Errorf("%s%d = %.4g, prototype g%d = %.4f gives %.4g (%+.1f %%, limit ±%.0f %%)",
						what, k+1, got[k], k+1, gk, want, 100*e, 100*stationRounding)
				}
			}
		})
	}
}

// TestStationLowpassResponse checks what a 7-pole harmonic lowpass with
// its cutoff near 1.25 × the band top should do (common practice: the
// 3rd harmonic down by well over 40 dB): in band, loss under 0.3 dB and
// return loss over 15 dB; the 2nd harmonic of the band top down by more
// than 25 dB and the 3rd by more than 40 dB.
func TestStationLowpassResponse(t *testing.T) {
	for _, f := range stationFiles(t, "lpf-*.net") {
		t.Run(filepath.Base(f), func(t *testing.T) {
			_, nl, c := loadStation(t, f)
			lo, hi := stationBand(t, nl)
			const n = 21
			for i := 0; i <= n; i++ {
				fr := lo + (hi-lo)*float64(i)/n
				sp, err := c.TwoPort(fr)
				if err != nil {
					t.Fatal(err)
				}
				if il := -DB(sp.S21); il > 0.3 {
					t.Errorf("insertion loss %.2f dB at %s, want < 0.3 dB", il, FormatSI(fr, "Hz"))
				}
				if rl := -DB(sp.S11); rl < 15 {
					t.Errorf("return loss %.1f dB at %s, want > 15 dB", rl, FormatSI(fr, "Hz"))
				}
			}
			for _, h := range []struct {
				n   int
				min float64
			}{{2, 25}, {3, 40}} {
				fr := float64(h.n) * hi
				sp, err := c.TwoPort(fr)
				if err != nil {
					t.Fatal(err)
				}
				if a := -DB(sp.S21); a < h.min {
					t.Errorf("harmonic %d of the band top (%s): attenuation %.1f dB, want > %.0f dB",
						h.n, FormatSI(fr, "Hz"), a, h.min)
				}
			}
		})
	}
}

// TestStationTunerMatch checks that the tuner settings match the
// estimated antenna impedance to 50 Ω at its carrier.
func TestStationTunerMatch(t *testing.T) {
	for _, f := range stationFiles(t, "tuner-*.net") {
		t.Run(filepath.Base(f), func(t *testing.T) {
			_, nl, c := loadStation(t, f)
			lo, hi := stationBand(t, nl)
			sp, err := c.TwoPort((lo + hi) / 2)
			if err != nil {
				t.Fatal(err)
			}
			if rl := -DB(sp.S11); rl < 15 {
				t.Errorf("input return loss %.1f dB (Zin %s), want > 15 dB", rl, FormatComplex(sp.Zin))
			}
		})
	}
}

// TestStationPreselectorPassband checks that the receive bandpass passes
// its band: the audit of the relay fault only means something if the
// transmit power actually goes through it.
func TestStationPreselectorPassband(t *testing.T) {
	for _, f := range stationFiles(t, "rx-bpf-*.net") {
		t.Run(filepath.Base(f), func(t *testing.T) {
			_, nl, c := loadStation(t, f)
			lo, hi := stationBand(t, nl)
			for _, fr := range []float64{lo, (lo + hi) / 2, hi} {
				sp, err := c.TwoPort(fr)
				if err != nil {
					t.Fatal(err)
				}
				if il := -DB(sp.S21); il > 4 {
					t.Errorf("insertion loss %.2f dB at %s, want < 4 dB in the passband", il, FormatSI(fr, "Hz"))
				}
			}
			for _, fr := range []float64{lo / 1.15, hi * 1.15} {
				sp, err := c.TwoPort(fr)
				if err != nil {
					t.Fatal(err)
				}
				if il := -DB(sp.S21); il < 15 {
					t.Errorf("insertion loss %.2f dB at %s, want > 15 dB outside the band", il, FormatSI(fr, "Hz"))
				}
			}
		})
	}
}
