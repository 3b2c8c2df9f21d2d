package stress

import (
	"math"
	"os"
	"path/filepath"
	"testing"

	"rfstress/circuits"
	"rfstress/ratings"
)

// FuzzAudit: whatever netlist parses, the audit never panics and never
// produces a NaN stress or a NaN safe power.
func FuzzAudit(f *testing.F) {
	files, _ := filepath.Glob("../testdata/station/*.net")
	for _, p := range files {
		if b, err := os.ReadFile(p); err == nil {
			f.Add(string(b))
		}
	}
	f.Add(testLowpass("audit freq=7.1M swr=3 faults=open,short"))
	f.Add(lpf20("audit band=14M:14.35M mode=data-15s key-down=90s swr=2\n"))
	f.Add(chokeNet + "audit freq=7M mode=tune power=1M harmonics=none\n")
	f.Add("port in a z=50\nport out b z=1e-9+j1e9\ncapacitor C a b 1f q=1e12\naudit band=1k:1G points=3 swr=999 phases=5 drive=delivered\n")
	f.Add("port in a z=50\nport out b z=50\ninductor L a b 1u q=1e12\ncapacitor C b gnd 1n q=1e12\naudit freq=5.03292M faults=open swr=1000\n")
	f.Fuzz(func(t *testing.T, src string) {
		nl, err := circuits.Parse("f.net", []byte(src))
		if err != nil {
			return
		}
		c, err := circuits.Build(nl)
		if err != nil {
			return
		}
		rs, err := ratings.Prepare(nl, ratings.Builtin(), nil)
		if err != nil {
			return
		}
		cond := Defaults()
		if cond.Apply(FileSettings(nl)) != nil || cond.Check() != nil {
			return
		}
		if len(cond.Carriers())*(cond.Phases+4) > 20000 {
			return // keep each input quick
		}
		e, err := NewEngine(c, rs, cond)
		if err != nil {
			return
		}
		s, err := e.Audit()
		if err != nil {
			return
		}
		if math.IsNaN(s.SafeW) {
			t.Fatalf("NaN safe power")
		}
		for _, p := range s.Parts {
			for q, st := range p.Stress {
				if math.IsNaN(st.Value) || math.IsNaN(st.Util) {
					t.Fatalf("%s %s is NaN", p.Name, q)
				}
			}
		}
	})
}
