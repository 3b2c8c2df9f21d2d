package ratings

import (
	"reflect"
	"testing"
)

// A part that says its limits ignore the frequency (FrequencyFree) must
// give the same limit numbers at every frequency, or an audit that asks
// them once would judge a carrier on another's limits. The parts of a
// test filter with every kind of rating: those that say so are checked at
// five frequencies from 1.8 to 54 MHz; those that do not must really
// change (a capacitor's irms=4@10M scales with f, a coil's current
// density follows the skin depth).
func TestFrequencyFreeLimits(t *testing.T) {
	src := goodNet + "capacitor C4 n1 gnd 47p vpk=2kV irms=3 pmax=1W\nswitch K1 n1 n3 state=closed irms=5 vpk=1kV\n"
	s := mustPrepare(t, src, nil)
	fs := []float64{1.8e6, 7e6, 14e6, 29e6, 54e6}
	want := map[string]bool{"C1": false, "C2": true, "C3": true, "C4": true, "L1": false, "L2": false, "L3": false, "L4": false, "R1": true, "K1": true}
	for name, free := range want {
		p := s.Parts[name]
		if p == nil {
			t.Fatalf("%s: no part", name)
		}
		if got := p.FrequencyFree(); got != free {
			t.Errorf("%s: FrequencyFree %v, want %v", name, got, free)
			continue
		}
		first := p.AppendLimitValues(nil, fs[0])
		same := true
		for _, f := range fs[1:] {
			if !reflect.DeepEqual(first, p.AppendLimitValues(nil, f)) || p.CopperR(f) != 0 {
				same = false
			}
		}
		if free && !same {
			t.Errorf("%s says its limits ignore the frequency, but they change", name)
		}
		if !free && same && p.Wire > 0 {
			t.Errorf("%s: a wound part whose limits do not change with frequency", name)
		}
	}
	if !reflect.DeepEqual(s.Parts["C1"].AppendLimitValues(nil, 7e6), s.Parts["C1"].AppendLimitValues(nil, 29e6)) {
		return // irms=4@10M follows the frequency, as FrequencyFree says
	}
	t.Error("C1's irms=4@10M gave the same limit at 7 and 29 MHz")
}

// Part.Limit formats only the asked quantity's text; number and text must
// be those Limits gives, for every part of the test filter (every kind of
// rating, a capacitor, coils with cores and wire, a switch, a resistor)
// and every quantity, at frequencies below, inside and above the rated
// points.
func TestLimitAsLimits(t *testing.T) {
	src := goodNet + "capacitor C4 n1 gnd 47p vpk=2kV irms=3 pmax=1W gap=1mm\nswitch K1 n1 n3 state=closed irms=5 vpk=1kV\n"
	s := mustPrepare(t, src, nil)
	n := 0
	for name, p := range s.Parts {
		for _, f := range []float64{1.8e6, 10e6, 54e6} {
			all := p.Limits(f)
			for _, want := range all {
				got, ok := p.Limit(want.Quantity, f)
				if !ok || !reflect.DeepEqual(got, want) {
					t.Errorf("%s %s at %g Hz: Limit %+v, Limits %+v", name, want.Quantity, f, got, want)
				}
				n++
			}
			if _, ok := p.Limit(Pm, f); ok && p.Kind != "line" {
				t.Errorf("%s: a line's limit on a %s", name, p.Kind)
			}
		}
	}
	if n < 40 {
		t.Fatalf("only %d limits compared", n)
	}
}
