package circuits

import (
	"path/filepath"
	"reflect"
	"testing"
)

// A split reads both solutions in one pass (readPair, PairReader); that
// must give, to the bit, what reading each solution alone gives (read),
// for every kind in the example station and the test networks: coupled
// windings, lines, measured blocks, switches, coils with self-capacitance.
func TestReadPairAsRead(t *testing.T) {
	files, _ := filepath.Glob(stationDir + "/*.net")
	more, _ := filepath.Glob("testdata/*.net")
	files = append(files, more...)
	n := 0
	for _, file := range files {
		if filepath.Base(file) == "bad_several.net" {
			continue
		}
		_, _, c := loadStation(t, file)
		w := NewSplitWork(c)
		a, b := NewSplit(c), NewSplit(c)
		for _, f := range []float64{1.9e6, 7.1e6, 14.2e6, 28.5e6} {
			if c.CheckFrequency(f) != nil {
				continue
			}
			if err := w.Fill(a, f); err != nil {
				t.Fatalf("%s: %v", file, err)
			}
			// the same solutions read one at a time
			w.read(b, f, 0, w.x)
			w.read(b, f, 1, w.x1)
			copy(b.R, w.fz.loss)
			w.ratios(b, f)
			b.F, b.Zs, b.Zcm = a.F, a.Zs, a.Zcm
			if !reflect.DeepEqual(a, b) {
				for i := range c.Elements {
					for k := 0; k < 2; k++ {
						if a.P[k][i] != b.P[k][i] {
							t.Errorf("%s at %g Hz: %s, excitation %d: pair %+v, alone %+v", file, f, c.Elements[i].Name, k, a.P[k][i], b.P[k][i])
						}
					}
				}
				t.Errorf("%s at %g Hz: the pair read differs from two reads", file, f)
			}
			n++
		}
	}
	if n < 20 {
		t.Fatalf("only %d networks and frequencies compared", n)
	}
}
