package ratings

import (
	"strings"
	"testing"

	"rfstress/circuits"
)

// checkErrors asserts that an error from a loader is an ErrorList whose
// positions lie inside the file (the loaders' contract).
func checkErrors(t *testing.T, file string, src []byte, err error) {
	if err == nil {
		return
	}
	el, ok := err.(circuits.ErrorList)
	if !ok {
		t.Fatalf("error is %T, want circuits.ErrorList: %v", err, err)
	}
	lines := strings.Count(strings.ReplaceAll(string(src), "\r\n", "\n"), "\n") + 1
	for _, e := range el {
		if e.Pos.File != file || e.Pos.Line < 1 || e.Pos.Line > lines || e.Pos.Col < 1 {
			t.Fatalf("error position %s outside the file (%d lines): %v", e.Pos, lines, e)
		}
	}
}

func FuzzLoadProfile(f *testing.F) {
	for _, s := range []string{
		"", "# nothing\n", "name x\nbase strict\ntemp-margin 20C\ncapacitor-class1 vpk 0.5\n",
		"inductor jrms 80%\ncore bpk 0.7\r\nresistor vpk 1\n", "base none\nbase none\n",
		"capacitor vpk\n", "widget 1 2 3\n", "temp-margin 1e309\n", "resistor pdiss 0\n",
		"\xff\xfe", "capacitor-air irms 1e-400\n", "core bpk NaN\n", "core\tbpk\t.5 # tab\n",
	} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		src := []byte(s)
		p, err := LoadProfile("f.prof", func(string) ([]byte, error) { return src, nil })
		checkErrors(t, "f.prof", src, err)
		if err == nil {
			for c, m := range p.Factors {
				for q, v := range m {
					if !(v > 0 && v <= 1) {
						t.Fatalf("accepted factor %s %s = %g", c, q, v)
					}
				}
			}
		}
	})
}

func FuzzLoadMaterials(f *testing.F) {
	for _, s := range []string{
		"", "material a class=iron mu=10 tmax=125C guide=15mT@1M,3mT@28M bsat=1T note=x\n",
		"material b class=air\nmaterial b class=air\n", "port in a z=50\n", "material\n",
		"material c class=mnzn guide=3mT@28M,15mT@1M\n", "title x\nmaterial d class=nizn mu=1e400\n",
		"\xff", "material e class=iron guide=1e-320\n", "material f class=iron tmax=1e3C\r\n",
		"material rfstress-mat-a class=iron\n", "resistor rfstress-mat-r a b 1\n",
	} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		src := []byte(s)
		mats, err := LoadMaterials("f.mat", src)
		checkErrors(t, "f.mat", src, err)
		for _, m := range mats {
			m.GuideFlux(7e6) // must not panic on whatever was accepted
		}
	})
}

// FuzzPrepare feeds whatever the netlist reader accepts through Prepare
// and every limit, which must never panic or yield a NaN limit.
func FuzzPrepare(f *testing.F) {
	f.Add(goodNet)
	f.Add("port in a z=50\nport out b z=50\ncore c od=10mm id=10mm h=1mm mu=5\ninductor L a b 1u core=c turns=3 wire=20mm\n")
	f.Add("port in a z=50\nport out b z=50\ncore c ae=1mm2 le=1mm al=1\ninductor L a b 1p core=c turns=100000 wire=1e-9m irms=1@1,2@2\n")
	f.Fuzz(func(t *testing.T, s string) {
		nl, err := circuits.Parse("f.net", []byte(s))
		if err != nil {
			return
		}
		set, err := Prepare(nl, nil, nil)
		checkErrors(t, "f.net", []byte(s), err)
		if err != nil {
			return
		}
		for _, n := range set.Order {
			p := set.Parts[n]
			for _, fr := range []float64{1e3, 7e6, 1e9} {
				for _, l := range p.Limits(fr) {
					if l.Abs != l.Abs || l.Derated != l.Derated {
						t.Fatalf("%s %s at %g: NaN limit %+v", n, l.Quantity, fr, l)
					}
					p.Remedy(l, 2*l.Abs+1, RemedyContext{F: fr, Ambient: 25, Irms: 1, Pavg: 1, KeyDown: 60})
					p.Heating(1, 60, Duty{On: 15, Period: 30})
				}
				p.CopperR(fr)
				p.TempRise(1)
				p.HeatingDensity(fr, []float64{1, 2}, []float64{fr, 2 * fr})
			}
		}
	})
}
