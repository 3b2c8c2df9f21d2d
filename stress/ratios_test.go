package stress

import (
	"fmt"
	"math"
	"math/cmplx"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"rfstress/circuits"
)

// The split's fixed ratios are Ohm's law for the kinds that have them: a
// capacitor's |I|/|V| is |Y| = 1/|R + 1/(jωC)| (ωC for a lossless one),
// a lone coil's |V|/|I| is |R + jωL| and its |λ|/|I| is L. Checked here
// against the magnitudes taken from the solved phasors of both
// excitations, over the example station, to 1e-13 where the state sets
// one from the other and to 1e-12 for a coil's V (read from its node
// voltages, while Z·I comes from its branch current: the two agree to the
// solve's rounding).
func TestSplitRatiosAsPhasors(t *testing.T) {
	for _, f := range []string{"lpf-80m.net", "pa-pi-40m.net", "tuner-80m-vertical.net", "rx-bpf-40m.net"} {
		src, err := os.ReadFile("../testdata/station/" + f)
		if err != nil {
			t.Fatal(err)
		}
		fx := build(t, string(src))
		c := fx.c
		w := circuits.NewSplitWork(c)
		s := circuits.NewSplit(c)
		seen := 0
		for _, hz := range []float64{1e6, 3.6e6, 7.1e6, 29e6} {
			if err := w.Fill(s, hz); err != nil {
				t.Fatal(err)
			}
			for i := range c.Elements {
				for k := 0; k < 2; k++ {
					p := s.P[k][i]
					if r := s.Ratio[i].IPerV; r > 0 && p.V != 0 {
						seen++
						if e := relErr(cmplx.Abs(p.I), r*cmplx.Abs(p.V)); e > 1e-13 {
							t.Errorf("%s %s at %g Hz: |I| %g, |Y|·|V| %g", f, c.Elements[i].Name, hz, cmplx.Abs(p.I), r*cmplx.Abs(p.V))
						}
					}
					if r := s.Ratio[i].VPerI; r > 0 && p.I != 0 {
						seen++
						if e := relErr(cmplx.Abs(p.V), r*cmplx.Abs(p.I)); e > 1e-12 {
							t.Errorf("%s %s at %g Hz: |V| %g, |Z|·|I| %g", f, c.Elements[i].Name, hz, cmplx.Abs(p.V), r*cmplx.Abs(p.I))
						}
					}
					if r := s.Ratio[i].LamPerI; r > 0 && p.I != 0 {
						seen++
						if e := relErr(cmplx.Abs(p.Lambda), r*cmplx.Abs(p.I)); e > 1e-12 {
							t.Errorf("%s %s at %g Hz: |λ| %g, L·|I| %g", f, c.Elements[i].Name, hz, cmplx.Abs(p.Lambda), r*cmplx.Abs(p.I))
						}
					}
				}
			}
		}
		if seen == 0 {
			t.Errorf("%s: no fixed ratio found", f)
		}
	}
}

// By hand on a 5-pole lowpass of our own with Q = 200 everywhere: a
// capacitor's |I|/|V| is 1/|R − j/(ωC)| with R = 1/(ωCQ), a coil's |V|/|I|
// is |R + jωL| with R = ωL/Q and its |λ|/|I| is L.
func TestSplitRatiosByHand(t *testing.T) {
	g := chebyshevG(5, 0.1)
	fx := build(t, lowpassNetlist(g, 10e6, 50, 200, "", "", ""), "band=7M:7.3M")
	c := fx.c
	w, s := circuits.NewSplitWork(c), circuits.NewSplit(c)
	const hz = 7e6
	if err := w.Fill(s, hz); err != nil {
		t.Fatal(err)
	}
	for i, el := range c.Elements {
		w := 2 * math.Pi * hz
		r := s.Ratio[i]
		switch el.Kind {
		case circuits.Capacitor:
			wc := w * el.Value
			want := 1 / cmplx.Abs(complex(1/(wc*200), -1/wc))
			if relErr(r.IPerV, want) > 1e-12 || r.VPerI != 0 || r.LamPerI != 0 {
				t.Errorf("%s: |I|/|V| %g, by hand %g (%+v)", el.Name, r.IPerV, want, r)
			}
		case circuits.Inductor:
			wl := w * el.Value
			want := cmplx.Abs(complex(wl/200, wl))
			if relErr(r.LamPerI, el.Value) > 1e-12 || relErr(r.VPerI, want) > 1e-12 || r.IPerV != 0 {
				t.Errorf("%s: |λ|/|I| %g against L %g, |V|/|I| %g against |R + jωL| %g", el.Name, r.LamPerI, el.Value, r.VPerI, want)
			}
		}
	}
}

// Scaling one magnitude by a fixed ratio instead of taking the other
// changes no verdict and no worst value beyond rounding: whole audits of
// six station files under four settings, with and without the ratios.
// (The worst loads on the circle of V and I of a capacitor are the same
// load in exact arithmetic; in floating point they may differ in the last
// bits, so values are compared to 1e-9, verdicts exactly.)
func TestRatiosChangeNothing(t *testing.T) {
	files := []string{"lpf-80m.net", "lpf-160m.net", "lpf-30m.net", "pa-pi-40m.net", "tuner-80m-vertical.net", "lpf-17m-15m.net"}
	settings := [][]string{nil, {"mode=data-15s"}, {"harmonics=push-pull", "faults=open,short"}, {"mode=tune", "swr=5"}}
	for _, f := range files {
		src, err := os.ReadFile("../testdata/station/" + f)
		if err != nil {
			t.Fatal(err)
		}
		for _, set := range settings {
			with := build(t, string(src), set...)
			without := build(t, string(src), set...)
			without.eng.noRatios = true
			a, err := with.eng.Audit()
			if err != nil {
				t.Fatalf("%s %v: %v", f, set, err)
			}
			b, err := without.eng.Audit()
			if err != nil {
				t.Fatal(err)
			}
			cmp := &closeCmp{tol: 1e-9, floor: 1e-12, a: a, b: b}
			for k := range a.Parts {
				if d := cmp.deep(reflect.ValueOf(a.Parts[k]), reflect.ValueOf(b.Parts[k]), a.Parts[k].Name, false); d != "" {
					t.Errorf("%s %v: %s", f, set, d)
				}
			}
		}
	}
}

// closeCmp compares two audits' values field by field, floats to a
// relative tolerance over an absolute floor, everything else exactly. A case index (a field
// named Case) is compared by the case it names: exact worst loads are
// numbered in the order they are recorded, so one audit that records
// fewer of them numbers the same load differently.
type closeCmp struct {
	tol   float64
	floor float64 // an absolute floor (SI units) under which values are rounding
	a, b  *Section
}

func (c *closeCmp) deep(a, b reflect.Value, path string, isCase bool) string {
	if a.Kind() != b.Kind() {
		return path + ": kinds differ"
	}
	switch a.Kind() {
	case reflect.Int:
		if isCase {
			return c.deep(reflect.ValueOf(c.a.Case(int(a.Int()))), reflect.ValueOf(c.b.Case(int(b.Int()))), path, false)
		}
		if a.Int() != b.Int() {
			return fmt.Sprintf("%s: %d against %d", path, a.Int(), b.Int())
		}
	case reflect.Float32, reflect.Float64:
		x, y := a.Float(), b.Float()
		if x == y || (math.IsNaN(x) && math.IsNaN(y)) {
			return ""
		}
		if math.Abs(x-y) > c.tol*math.Max(math.Abs(x), math.Abs(y))+c.floor {
			return fmt.Sprintf("%s: %g against %g", path, x, y)
		}
	case reflect.Complex64, reflect.Complex128:
		x, y := a.Complex(), b.Complex()
		if cmplx.Abs(x-y) > c.tol*math.Max(cmplx.Abs(x), cmplx.Abs(y)) {
			return fmt.Sprintf("%s: %v against %v", path, x, y)
		}
	case reflect.Struct:
		// the case of a value at rounding level (a shorted part's
		// current) is wherever the rounding put it: compared only for
		// values above the floor
		if kw, ok := a.Interface().(KindWorst); ok {
			kb := b.Interface().(KindWorst)
			for q, v := range kw.Value {
				if d := c.deep(reflect.ValueOf(v), reflect.ValueOf(kb.Value[q]), fmt.Sprintf("%s.Value[%s]", path, q), false); d != "" {
					return d
				}
				// a temperature whose dissipation is rounding (a shorted
				// winding) is the ambient at every case: no case is worse
				noise := q == "temp" && math.Abs(kw.Value["pdiss"]) <= c.floor
				if math.Abs(v) > c.floor && !noise {
					if d := c.deep(reflect.ValueOf(kw.Case[q]), reflect.ValueOf(kb.Case[q]), fmt.Sprintf("%s.Case[%s]", path, q), true); d != "" {
						return d
					}
				}
			}
			return ""
		}
		for i := 0; i < a.NumField(); i++ {
			f := a.Type().Field(i)
			if !f.IsExported() {
				continue
			}
			isCase := strings.HasSuffix(f.Name, "Case")
			if st, ok := a.Interface().(Stress); ok && isCase && math.Abs(st.Value) <= c.floor {
				continue
			}
			if d := c.deep(a.Field(i), b.Field(i), path+"."+f.Name, isCase); d != "" {
				return d
			}
		}
	case reflect.Slice, reflect.Array:
		if a.Len() != b.Len() {
			return path + ": lengths differ"
		}
		for i := 0; i < a.Len(); i++ {
			if d := c.deep(a.Index(i), b.Index(i), fmt.Sprintf("%s[%d]", path, i), isCase); d != "" {
				return d
			}
		}
	case reflect.Pointer, reflect.Interface:
		if a.IsNil() || b.IsNil() {
			if a.IsNil() != b.IsNil() {
				return path + ": nil against non-nil"
			}
			return ""
		}
		return c.deep(a.Elem(), b.Elem(), path, isCase)
	case reflect.Map:
		if a.Len() != b.Len() {
			return path + ": sizes differ"
		}
		for _, k := range a.MapKeys() {
			if d := c.deep(a.MapIndex(k), b.MapIndex(k), fmt.Sprintf("%s[%v]", path, k), isCase); d != "" {
				return d
			}
		}
	default:
		if !reflect.DeepEqual(a.Interface(), b.Interface()) {
			return fmt.Sprintf("%s: %v against %v", path, a.Interface(), b.Interface())
		}
	}
	return ""
}

// A coil with self-capacitance carries its winding current and, at its
// terminals, that plus the current through the capacitance; the audit's
// note quotes the terminal current's largest value on the SWR circle. The
// terminal current is a fixed multiple of the winding's, It = (1 +
// jωCp·Z)·I, so its worst load is the winding current's, which the circle
// evaluates exactly: never below the largest of 3600 sampled phases, and
// above it by no more than the sampling can miss (a phase step of 0.1°
// leaves at most 1 − cos(0.05°) ≈ 4e-7 of a circle's radius).
func TestTerminalCurrentOnCircle(t *testing.T) {
	g := chebyshevG(5, 0.1)
	src := lowpassNetlist(g, 10e6, 50, 200, "", "cp=6p", "")
	itMax := func(scan bool) []float64 {
		fx := build(t, src, "band=7M:7.3M", "points=3", "swr=3", "phases=3600", "faults=none", "harmonics=none")
		fx.eng.forceScan = scan
		w := fx.eng.newWorkspace(fx.c)
		if _, err := fx.eng.run(w); err != nil {
			t.Fatal(err)
		}
		var out []float64
		for i := range w.acc {
			if fx.eng.selfC[i] {
				out = append(out, w.acc[i].itMax)
			}
		}
		return out
	}
	exact, scanned := itMax(false), itMax(true)
	if len(exact) != 2 || len(scanned) != 2 {
		t.Fatalf("coils with self-capacitance: %d and %d", len(exact), len(scanned))
	}
	for k := range exact {
		if exact[k] < scanned[k]*(1-1e-12) || exact[k] > scanned[k]*(1+1e-6) {
			t.Errorf("coil %d: terminal current %.9g exact, %.9g over 3600 phases", k, exact[k], scanned[k])
		}
	}
}

// Every shortcut this engine takes in the case loop (fixed ratios, the
// heat judged after the sweep, limits asked once for parts rated by given
// values) against an audit that takes none, over every network the
// project ships: the station and the solver's test networks (coupled
// windings, coils with self-capacitance, traps, lines, a balanced feed,
// measured parts and antennas), with a 20 m band where a file gives none.
// Values to 1e-9, verdicts exactly.
func TestShortcutsChangeNothing(t *testing.T) {
	files, _ := filepath.Glob("../testdata/station/*.net")
	more, _ := filepath.Glob("../circuits/testdata/*.net")
	for _, f := range more {
		if filepath.Base(f) != "bad_several.net" {
			files = append(files, f)
		}
	}
	n := 0
	for _, file := range files {
		src, err := os.ReadFile(file)
		if err != nil {
			t.Fatal(err)
		}
		var set []string
		if !strings.Contains(string(src), "band=") {
			set = append(set, "band=14M:14.35M")
		}
		for _, extra := range [][]string{{"points=5"}, {"points=5", "swr=4", "faults=open,short", "mode=data-15s"}} {
			args := append(append([]string{}, set...), extra...)
			fast := buildFile(t, file, args...)
			slow := buildFile(t, file, args...)
			slow.eng.noRatios, slow.eng.everyHeat, slow.eng.freeLim = true, true, nil
			a, err := fast.eng.Audit()
			if err != nil {
				t.Fatalf("%s %v: %v", file, args, err)
			}
			b, err := slow.eng.Audit()
			if err != nil {
				t.Fatal(err)
			}
			cmp := &closeCmp{tol: 1e-9, floor: 1e-12, a: a, b: b}
			for k := range a.Parts {
				if d := cmp.deep(reflect.ValueOf(a.Parts[k]), reflect.ValueOf(b.Parts[k]), a.Parts[k].Name, false); d != "" {
					t.Errorf("%s %v: %s", filepath.Base(file), args, d)
				}
				n++
			}
		}
	}
	if n < 100 {
		t.Fatalf("only %d parts compared", n)
	}
}
