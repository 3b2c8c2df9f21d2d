package stress

import (
	"os"
	"reflect"
	"testing"
)

// Skipping the thermal model for cases that dissipate no more than one
// already judged (Engine.heats) changes nothing an audit reports: every
// part's stresses, worst cases, utilisations, safe power and findings are
// identical to an audit that evaluates it at every case, for the example
// station's wound filters and tuners under steady, duty and key-down
// heating.
func TestHeatSkipChangesNothing(t *testing.T) {
	files := []string{"lpf-80m.net", "lpf-160m.net", "lpf-30m.net", "pa-pi-40m.net", "tuner-80m-vertical.net", "lpf-17m-15m.net"}
	settings := [][]string{nil, {"mode=data-15s"}, {"key-down=90s"}, {"mode=tune", "swr=5"}}
	for _, f := range files {
		src, err := os.ReadFile("../testdata/station/" + f)
		if err != nil {
			t.Fatal(err)
		}
		for _, set := range settings {
			skip := build(t, string(src), set...)
			every := build(t, string(src), set...)
			every.eng.everyHeat = true
			a, err := skip.eng.Audit()
			if err != nil {
				t.Fatalf("%s %v: %v", f, set, err)
			}
			b, err := every.eng.Audit()
			if err != nil {
				t.Fatal(err)
			}
			if !reflect.DeepEqual(a.Parts, b.Parts) {
				for k := range a.Parts {
					if !reflect.DeepEqual(a.Parts[k], b.Parts[k]) {
						t.Errorf("%s %v: %s differs when the heat is evaluated at every case", f, set, a.Parts[k].Name)
					}
				}
			}
		}
	}
}
