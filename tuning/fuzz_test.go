package tuning

import (
	"math"
	"math/cmplx"
	"testing"
)

// FuzzLoadFiles: no input panics the load readers, and every load read is
// finite and passive (go test ./tuning -fuzz FuzzLoadFiles).
func FuzzLoadFiles(f *testing.F) {
	f.Add([]byte("frequency,R,X\n3.5M,14,-520\n3.6M,13,-495\n"))
	f.Add([]byte("# MHz S RI R 50\n3.6 0.6 0\n3.7 0.5 -0.2\n"))
	f.Add([]byte("frequency,R,X\n1e400,NaN,Inf\n"))
	f.Add([]byte("# Hz Z MA R 75\n1 1 90\n"))
	f.Fuzz(func(t *testing.T, src []byte) {
		for _, name := range []string{"f.csv", "f.s1p"} {
			ls, err := ParseLoads(name, 50, func(string) ([]byte, error) { return src, nil })
			if err != nil {
				continue
			}
			for _, p := range ls.Points {
				if cmplx.IsNaN(p.Z) || cmplx.IsInf(p.Z) || real(p.Z) < 0 || math.IsNaN(p.F) || !(p.F > 0) {
					t.Fatalf("%s: bad load %v at %v", name, p.Z, p.F)
				}
			}
		}
	})
}
