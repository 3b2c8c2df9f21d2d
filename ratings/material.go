package ratings

import (
	"fmt"
	"sort"
	"strings"
	"unicode"
	"unicode/utf8"

	"rfstress/circuits"
)

// Material is a core material: permeability, the hottest the core may run
// and a guide peak flux density against frequency.
type Material struct {
	Name  string
	Class string // iron, nizn, mnzn or air
	Note  string // short description for reports
	Mu    float64
	Tmax  float64          // °C; 0: no temperature limit known
	Flux  []circuits.Point // guide peak flux density (T) against f; nil: no flux limit
	// FluxFromClass is set when a user material gave no flux= and took the
	// guide of its class's built-in material.
	FluxFromClass bool
	Builtin       bool
	Pos           circuits.Pos // where it is defined; zero for built-in ones
}

// Describe is the material as reports name it: its note, else its name.
func (m *Material) Describe() string {
	if m.Note != "" {
		return m.Note
	}
	return m.Name
}

// GuideFlux is the guide peak flux density at f, interpolated log-log
// between the points and held at the end values outside them; 0 when the
// material has no flux limit.
func (m *Material) GuideFlux(f float64) float64 {
	if m == nil || len(m.Flux) == 0 {
		return 0
	}
	return circuits.InterpLogLog(m.Flux, f)
}

func pts(s ...float64) []circuits.Point {
	var p []circuits.Point
	for i := 0; i+1 < len(s); i += 2 {
		p = append(p, circuits.Point{V: s[i], F: s[i+1]})
	}
	return p
}

// builtins are generic materials, described by class and permeability,
// not by any maker's grade. All figures are ours: common practice, from
// memory. Iron powder is limited by ageing of its organic binder, which
// sets in above about 125 °C; ferrites by loss growth well before their
// Curie temperature. Guide flux for powdered iron is roughly 15 mT near
// 1 MHz falling to 3 mT near 28 MHz; the higher-permeability grades and
// the ferrites are lossier at HF and get lower guides.
var builtins = []Material{
	{Name: "iron-mu7", Class: "iron", Note: "carbonyl iron, µi≈7", Mu: 7, Tmax: 125,
		Flux: pts(15e-3, 1e6, 10e-3, 3.5e6, 6e-3, 7e6, 4.5e-3, 14e6, 3e-3, 28e6)},
	{Name: "iron-mu10", Class: "iron", Note: "carbonyl iron, µi≈10", Mu: 10, Tmax: 125,
		Flux: pts(15e-3, 1e6, 10e-3, 3.5e6, 6e-3, 7e6, 4.5e-3, 14e6, 3e-3, 28e6)},
	{Name: "iron-mu20", Class: "iron", Note: "carbonyl iron, µi≈20", Mu: 20, Tmax: 125,
		Flux: pts(12e-3, 1e6, 8e-3, 3.5e6, 5e-3, 7e6, 3.5e-3, 14e6, 2.5e-3, 28e6)},
	{Name: "iron-mu35", Class: "iron", Note: "hydrogen-reduced iron, µi≈35", Mu: 35, Tmax: 125,
		Flux: pts(12e-3, 1e6, 7e-3, 3.5e6, 4e-3, 7e6, 2.5e-3, 14e6, 1.5e-3, 28e6)},
	{Name: "nizn-mu40", Class: "nizn", Note: "NiZn ferrite, µi≈40", Mu: 40, Tmax: 125,
		Flux: pts(8e-3, 1e6, 5e-3, 3.5e6, 3.5e-3, 7e6, 2.5e-3, 14e6, 1.5e-3, 28e6)},
	{Name: "nizn-mu125", Class: "nizn", Note: "NiZn ferrite, µi≈125", Mu: 125, Tmax: 125,
		Flux: pts(6e-3, 1e6, 3.5e-3, 3.5e6, 2.5e-3, 7e6, 1.5e-3, 14e6, 1e-3, 28e6)},
	{Name: "mnzn-mu850", Class: "mnzn", Note: "MnZn ferrite, µi≈850", Mu: 850, Tmax: 100,
		Flux: pts(5e-3, 1e6, 2e-3, 3.5e6, 1e-3, 7e6, 0.6e-3, 14e6, 0.4e-3, 28e6)},
	{Name: "mnzn-mu2000", Class: "mnzn", Note: "MnZn ferrite, µi≈2000", Mu: 2000, Tmax: 100,
		Flux: pts(3e-3, 1e6, 1.2e-3, 3.5e6, 0.6e-3, 7e6, 0.3e-3, 14e6, 0.2e-3, 28e6)},
	{Name: "air", Class: "air", Note: "air or non-magnetic former", Mu: 1},
}

// classDefault is the built-in material whose guide and temperature a user
// material of the class takes when it gives none: the most conservative of
// the class.
var classDefault = map[string]string{"iron": "iron-mu10", "nizn": "nizn-mu125", "mnzn": "mnzn-mu2000", "air": "air"}

var classes = []string{"iron", "nizn", "mnzn", "air"}

// Builtin returns a fresh copy of the built-in materials by name.
func Builtin() map[string]*Material {
	out := make(map[string]*Material, len(builtins))
	for _, m := range builtins {
		c := m
		c.Flux = append([]circuits.Point(nil), m.Flux...)
		c.Builtin = true
		out[c.Name] = &c
	}
	return out
}

// MergeMaterials returns base with over laid on top (over wins by name).
func MergeMaterials(base, over map[string]*Material) map[string]*Material {
	out := make(map[string]*Material, len(base)+len(over))
	for k, v := range base {
		out[k] = v
	}
	for k, v := range over {
		out[k] = v
	}
	return out
}

// lookupMaterial finds a material by exact name, then ignoring case.
func lookupMaterial(mats map[string]*Material, name string) *Material {
	if m, ok := mats[name]; ok {
		return m
	}
	for k, m := range mats {
		if strings.EqualFold(k, name) {
			return m
		}
	}
	return nil
}

func materialNames(mats map[string]*Material) string {
	ns := make([]string, 0, len(mats))
	for k := range mats {
		ns = append(ns, k)
	}
	sort.Strings(ns)
	return strings.Join(ns, ", ")
}

// maxFlux catches unit slips: no core material runs near 2 T, let alone at
// RF, so "flux=15" (tesla) was surely meant as 15 mT.
const maxFlux = 2.0

// materialFrom reads the meaning of one material statement, adding an
// error for each attribute that is wrong. It returns nil when the
// statement cannot be used.
func materialFrom(s *circuits.Material, errs *circuits.ErrorList) *Material {
	add := func(pos circuits.Pos, want, format string, args ...any) {
		*errs = append(*errs, &circuits.Error{Pos: pos, Msg: fmt.Sprintf(format, args...), Want: want})
	}
	m := &Material{Name: s.Name, Pos: s.Pos}
	ok := true
	ca, has := s.Attrs["class"]
	if !has || len(ca.Words) == 0 {
		return nil // the parser has already said class= is required
	}
	m.Class = strings.ToLower(ca.Words[0])
	if _, known := classDefault[m.Class]; !known {
		add(ca.ValPos, "one of "+strings.Join(classes, ", "), "unknown material class %q", ca.Words[0])
		return nil
	}
	def := builtinByName(classDefault[m.Class])
	if a, has := s.Attrs["mu"]; has {
		m.Mu = a.Num
	} else if m.Class == "air" {
		m.Mu = 1
	}
	if a, has := s.Attrs["tmax"]; has {
		if !(a.Num > 0 && a.Num <= 1000) {
			add(a.ValPos, "a temperature above 0 °C and at most 1000 °C, e.g. 125C", "tmax=%s is out of range", a.Raw)
			ok = false
		}
		m.Tmax = a.Num
	} else {
		m.Tmax = def.Tmax
	}
	if a, has := s.Attrs["flux"]; has {
		if m.Class == "air" {
			add(a.ValPos, "no flux= on class air (it has no flux limit), or another class", "flux= given for an air material")
			ok = false
		}
		for _, p := range a.Points {
			if p.V > maxFlux {
				add(a.ValPos, "a peak flux density such as 15mT or 15mT@1M,3mT@28M", "flux %s T is far above any core material (unit slip? write mT)", trimNum(p.V))
				ok = false
				break
			}
		}
		m.Flux = append([]circuits.Point(nil), a.Points...)
	} else if len(def.Flux) > 0 {
		m.Flux = append([]circuits.Point(nil), def.Flux...)
		m.FluxFromClass = true
	}
	if a, has := s.Attrs["note"]; has {
		// the netlist splits on spaces, so a note is one token; _ reads as a space
		m.Note = strings.ReplaceAll(a.Raw, "_", " ")
	}
	if !ok {
		return nil
	}
	return m
}

func builtinByName(name string) *Material {
	for i := range builtins {
		if builtins[i].Name == name {
			return &builtins[i]
		}
	}
	return &Material{}
}

func trimNum(v float64) string { return fmt.Sprintf("%.4g", v) }

// Names for the two synthetic ports that let circuits.Parse read a
// materials file; they only need to not clash with a material name space,
// and material names live in their own.
const matSuffix = "\nport in rfstress-mat-a z=50\nport out rfstress-mat-b z=50\nresistor rfstress-mat-r rfstress-mat-a rfstress-mat-b 50\n"

// LoadMaterials reads a materials file: `material` lines exactly as in a
// netlist, comments after #, blank lines. It returns the file's materials
// only (the caller merges them over Builtin()), or every error found as a
// circuits.ErrorList with positions in the file.
func LoadMaterials(path string, src []byte) (map[string]*Material, error) {
	var errs circuits.ErrorList
	if !utf8.Valid(src) {
		errs = append(errs, &circuits.Error{Pos: circuits.Pos{File: path, Line: 1, Col: 1}, Msg: "file is not valid UTF-8", Want: "a UTF-8 text file"})
		return nil, errs
	}
	// The netlist reader does the syntax. Lines other than material lines
	// are reported here and blanked, keeping line numbers; a pair of ports
	// is appended so the file reads as a complete netlist.
	lines := strings.Split(strings.ReplaceAll(string(src), "\r\n", "\n"), "\n")
	for i, raw := range lines {
		body := raw
		if j := strings.IndexByte(body, '#'); j >= 0 {
			body = body[:j]
		}
		word, col := firstField(body)
		if word == "" || word == "material" {
			continue
		}
		errs = append(errs, &circuits.Error{
			Pos:  circuits.Pos{File: path, Line: i + 1, Col: col},
			Msg:  fmt.Sprintf("%q has no place in a materials file", word),
			Want: "material lines only: material NAME class=iron|nizn|mnzn|air mu=… tmax=… flux=…",
		})
		lines[i] = ""
	}
	fake := strings.Join(lines, "\n") + matSuffix
	nl, err := circuits.Parse(path, []byte(fake))
	if el, isList := err.(circuits.ErrorList); isList {
		for _, e := range el {
			// the appended lines cannot be at fault; keep only the file's own
			if e.Pos.File == path && e.Pos.Line >= 1 && e.Pos.Line <= len(lines) {
				errs = append(errs, e)
			}
		}
	} else if err != nil {
		errs = append(errs, &circuits.Error{Pos: circuits.Pos{File: path, Line: 1, Col: 1}, Msg: err.Error()})
	}
	out := map[string]*Material{}
	if nl != nil {
		for _, s := range nl.Materials {
			if m := materialFrom(s, &errs); m != nil {
				out[m.Name] = m
			}
		}
	}
	if len(errs) > 0 {
		errs.Sort()
		return nil, errs
	}
	return out, nil
}

// firstField returns the first whitespace-separated field of s and its
// column counted in characters from 1, as the netlist reader counts.
func firstField(s string) (string, int) {
	col := 1
	start, startCol := -1, 0
	for i, r := range s {
		if unicode.IsSpace(r) {
			if start >= 0 {
				return s[start:i], startCol
			}
		} else if start < 0 {
			start, startCol = i, col
		}
		col++
	}
	if start >= 0 {
		return s[start:], startCol
	}
	return "", 0
}
