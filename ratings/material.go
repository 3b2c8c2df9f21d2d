package ratings

import (
	"fmt"
	"math"
	"sort"
	"strings"
	"unicode"
	"unicode/utf8"

	"rfstress/circuits"
)

// Material is a core material: its class, permeability and the three
// figures its core limits come from: saturation flux density (a rating),
// the hottest the core may run (a rating) and a heating guide for the flux
// at average power (advice only).
type Material struct {
	Name  string
	Class string  // iron, nizn, mnzn or air
	Note  string  // short description for reports
	Mu    float64 // initial relative permeability; 0: not given (a core must give mu= or al=)
	Tmax  float64 // °C; 0: no temperature limit known
	Bsat  float64 // saturation flux density, T; 0: none (air)
	// BsatGiven is set when bsat= was written rather than taken from the class.
	BsatGiven bool
	// Guide is the material's own heating-guide points (peak flux density
	// in T against f); nil: the class law GuideAnchor·√(1 MHz/f).
	Guide       []circuits.Point
	GuideAnchor float64 // class heating guide at 1 MHz, T; 0: none (air)
	Density     float64 // kg/m³ of the core body, for its heat capacity
	SpecHeat    float64 // J/(kg·K)
	Builtin     bool
	Pos         circuits.Pos // where it is defined; zero for built-in ones
}

// Describe is the material as reports name it: its note, else its name.
func (m *Material) Describe() string {
	if m.Note != "" {
		return m.Note
	}
	return m.Name
}

// Magnetic reports whether the material is of a magnetic class.
func (m *Material) Magnetic() bool { return m != nil && m.Class != "air" }

// GuideRef is the frequency the class heating guide is anchored at.
const GuideRef = 1e6

// GuideFlux is the heating-guide peak flux density at f: the material's
// own points when it has them (interpolated log-log, held at the end
// values outside them), else the class law B₁·√(1 MHz/f). The law is our
// own formulation: if the core's loss per cycle grows as B² (the low-flux,
// Rayleigh-like region), the loss density grows as f·B², and holding it
// at a constant allowed value gives B ∝ f^−½. 0 when the material has no
// guide (air).
func (m *Material) GuideFlux(f float64) float64 {
	if m == nil {
		return 0
	}
	if len(m.Guide) > 0 {
		return circuits.InterpLogLog(m.Guide, f)
	}
	if m.GuideAnchor <= 0 || !(f > 0) {
		return 0
	}
	return m.GuideAnchor * math.Sqrt(GuideRef/f)
}

// Copper figures for the winding's heat capacity: density of copper
// 8960 kg/m³ (handbook value) and specific heat 385 J/(kg·K) (from memory;
// handbooks give 0.385 J/(g·K) at room temperature).
const (
	CopperDensity  = 8960.0
	CopperSpecHeat = 385.0
)

// classes are the built-in materials: one per class, described by what it
// is, with no maker's grades. All figures are ours, common practice and
// from memory, chosen at the conservative end of the range we recall:
//
//   - tmax: powdered iron is limited by ageing of its organic binder above
//     about 125 °C; ferrites by loss growth well below their Curie
//     temperature (NiZn about 125 °C, MnZn about 100 °C usable).
//   - bsat: powdered iron saturates softly, bulk figures of about 1 T are
//     quoted; NiZn ferrite 0.25–0.35 T, MnZn 0.35–0.5 T (we take the low
//     ends).
//   - heating-guide anchor at 1 MHz: powdered iron 10–20 mT (we take 15);
//     ferrites are lossier at HF: NiZn 8 mT, MnZn 3 mT.
//   - density and specific heat for the core's heat capacity: powdered iron
//     in binder about 5 g/cm³ and 0.45 J/(g·K) (iron itself 0.45); ferrite
//     about 4.6–4.9 g/cm³ and 0.7–1.1 J/(g·K) (we take 0.7).
//
// Air has no saturation, no guide and no temperature limit, and its
// former is given no heat capacity.
var classes = []Material{
	{Name: "iron", Class: "iron", Note: "powdered iron", Tmax: 125, Bsat: 1.0, GuideAnchor: 15e-3, Density: 5000, SpecHeat: 450},
	{Name: "nizn", Class: "nizn", Note: "NiZn ferrite", Tmax: 125, Bsat: 0.25, GuideAnchor: 8e-3, Density: 4600, SpecHeat: 700},
	{Name: "mnzn", Class: "mnzn", Note: "MnZn ferrite", Tmax: 100, Bsat: 0.35, GuideAnchor: 3e-3, Density: 4800, SpecHeat: 700},
	{Name: "air", Class: "air", Note: "air or non-magnetic former", Mu: 1},
}

var classNames = []string{"iron", "nizn", "mnzn", "air"}

// Builtin returns a fresh copy of the built-in materials by name: the
// four classes.
func Builtin() map[string]*Material {
	out := make(map[string]*Material, len(classes))
	for _, m := range classes {
		c := m
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

// maxFlux catches unit slips: no core material saturates above 2 T, let
// alone runs near it at RF, so "guide=15" (tesla) was surely meant as 15 mT.
const maxFlux = 2.0

// materialFrom reads the meaning of one material statement, adding an
// error for each attribute that is wrong. It returns nil when the
// statement cannot be used. What the statement leaves out comes from its
// class.
func materialFrom(s *circuits.Material, errs *circuits.ErrorList) *Material {
	add := func(pos circuits.Pos, want, format string, args ...any) {
		*errs = append(*errs, &circuits.Error{Pos: pos, Msg: fmt.Sprintf(format, args...), Want: want})
	}
	ca, has := s.Attrs["class"]
	if !has || len(ca.Words) == 0 {
		return nil // the parser has already said class= is required
	}
	def := classByName(strings.ToLower(ca.Words[0]))
	if def == nil {
		add(ca.ValPos, "one of "+strings.Join(classNames, ", "), "unknown material class %s", circuits.Quote(ca.Words[0]))
		return nil
	}
	m := *def
	m.Name, m.Pos, m.Builtin, m.Note = s.Name, s.Pos, false, ""
	ok := true
	if a, has := s.Attrs["mu"]; has {
		m.Mu = a.Num
	}
	if a, has := s.Attrs["tmax"]; has {
		if !(a.Num > 0 && a.Num <= 1000) {
			add(a.ValPos, "a temperature above 0 °C and at most 1000 °C, e.g. 125C", "tmax=%s is out of range", a.Raw)
			ok = false
		}
		m.Tmax = a.Num
	}
	if a, has := s.Attrs["bsat"]; has {
		if m.Class == "air" {
			add(a.ValPos, "no bsat= on class air (it does not saturate), or another class", "bsat= given for an air material")
			ok = false
		} else if a.Num > maxFlux {
			add(a.ValPos, "a saturation flux density such as 0.3T or 300mT", "bsat %s T is above any core material (unit slip?)", trimNum(a.Num))
			ok = false
		}
		m.Bsat, m.BsatGiven = a.Num, true
	}
	if a, has := s.Attrs["guide"]; has {
		if m.Class == "air" {
			add(a.ValPos, "no guide= on class air (it has no core loss), or another class", "guide= given for an air material")
			ok = false
		}
		for _, p := range a.Points {
			if p.V > maxFlux {
				add(a.ValPos, "a peak flux density such as 15mT or 15mT@1M,3mT@28M", "guide %s T is far above any core material (unit slip? write mT)", trimNum(p.V))
				ok = false
				break
			}
		}
		m.Guide = append([]circuits.Point(nil), a.Points...)
	}
	if a, has := s.Attrs["note"]; has {
		// the netlist splits on spaces, so a note is one token; _ reads as a space
		m.Note = strings.ReplaceAll(a.Raw, "_", " ")
	}
	if !ok {
		return nil
	}
	return &m
}

func classByName(name string) *Material {
	for i := range classes {
		if classes[i].Name == name {
			return &classes[i]
		}
	}
	return nil
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
			Want: "material lines only: material NAME class=iron|nizn|mnzn|air mu=… tmax=… bsat=… guide=…",
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
