package circuits

import (
	"math"
	"math/cmplx"
	"testing"
)

// FuzzTouchstone: no input makes the reader panic, and whatever it
// accepts has strictly rising positive frequencies, finite S-parameters,
// positive references and one matrix per frequency.
func FuzzTouchstone(f *testing.F) {
	for _, s := range []string{
		"# MHz S RI R 50\n7 0.1 0.2\n8 0.3 0.4\n",
		"# GHz S MA\n1 0.5 30\n",
		"# kHz Z DB R 75\n7100 -3 10 -1 5 -1 5 -3 10\n",
		"[Version] 2.0\n# MHz Y RI R 50\n[Number of Ports] 2\n[Two-Port Data Order] 12_21\n[Number of Frequencies] 1\n[Reference] 50 75\n[Network Data]\n1 0.01 0 -0.01 0 -0.01 0 0.01 0\n[End]\n",
		"[Version] 2.0\n# Hz S RI\n[Number of Ports] 2\n[Two-Port Data Order] 21_12\n[Matrix Format] Lower\n[Number of Frequencies] 1\n[Network Data]\n1e6 0 0 1 0 0 0\n[End]\n",
	} {
		f.Add("f.s2p", []byte(s))
		f.Add("f.s1p", []byte(s))
	}
	f.Fuzz(func(t *testing.T, name string, src []byte) {
		ts, err := ParseTouchstone(name, src)
		if err != nil {
			return
		}
		if len(ts.F) == 0 || len(ts.F) != len(ts.S) || len(ts.Ref) != ts.Ports {
			t.Fatalf("shape: %d F, %d S, %d refs, %d ports", len(ts.F), len(ts.S), len(ts.Ref), ts.Ports)
		}
		for i, fr := range ts.F {
			if !(fr > 0) || math.IsInf(fr, 0) || (i > 0 && fr <= ts.F[i-1]) {
				t.Fatalf("frequency %d = %g", i, fr)
			}
			if len(ts.S[i]) != ts.Ports*ts.Ports {
				t.Fatalf("matrix %d has %d entries", i, len(ts.S[i]))
			}
			for _, v := range ts.S[i] {
				if cmplx.IsNaN(v) || cmplx.IsInf(v) {
					t.Fatalf("non-finite S at %g: %v", fr, v)
				}
			}
		}
		for _, r := range ts.Ref {
			if !(r > 0) {
				t.Fatalf("reference %g", r)
			}
		}
	})
}
