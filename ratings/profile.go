package ratings

import (
	"fmt"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"unicode/utf8"

	"rfstress/circuits"
)

// Derating classes of parts.
const (
	ClassCapacitor1   = "capacitor-class1" // c0g, np0, mica, porcelain, glass, film
	ClassCapacitor2   = "capacitor-class2" // x7r, x5r, y5v, z5u
	ClassCapacitorAir = "capacitor-air"    // air, vacuum
	ClassCapacitor    = "capacitor"        // dielectric not given
	ClassInductor     = "inductor"         // the winding
	ClassCore         = "core"             // the magnetic core
	ClassResistor     = "resistor"
	ClassLine         = "line"  // transmission line: dielectric and heating
	ClassBlock        = "block" // measured two-port: its ports' voltage and its dissipation
	ClassConnector    = "connector"
	ClassGapAir       = "gap-air"   // an air clearance, against the voltage that would arc
	ClassGapBoard     = "gap-board" // a board-surface clearance, against a working-voltage guide
	ClassSwitch       = "switch"    // relay and switch contacts
)

// classQuantities says which quantities each derating class may carry a
// factor for. Temperature is derated by Profile.TempMargin instead.
var classQuantities = map[string][]Quantity{
	ClassCapacitor1:   {Vpk, Vrms, Irms, Pdiss},
	ClassCapacitor2:   {Vpk, Vrms, Irms, Pdiss},
	ClassCapacitorAir: {Vpk, Vrms, Irms, Pdiss},
	ClassCapacitor:    {Vpk, Vrms, Irms, Pdiss},
	ClassInductor:     {Irms, Jrms, Vpk},
	ClassCore:         {Bpk},
	ClassResistor:     {Pdiss, Vpk},
	ClassLine:         {Vpk, Pm},
	ClassBlock:        {Vpk, Pdiss},
	ClassConnector:    {Vpk, Irms},
	ClassGapAir:       {Arc},
	ClassGapBoard:     {Arc},
	ClassSwitch:       {Irms, Vpk},
}

// Profile is a set of derating factors: the share of each absolute rating a
// design may use, by part class and quantity, and the margin kept below a
// core material's highest temperature.
type Profile struct {
	Name       string
	Factors    map[string]map[Quantity]float64
	TempMargin float64 // °C below the material's tmax
}

// Factor is the derating factor for class and quantity; 1 when the profile
// has none.
func (p *Profile) Factor(class string, q Quantity) float64 {
	if p == nil {
		return 1
	}
	if f, ok := p.Factors[class][q]; ok && f > 0 {
		return f
	}
	return 1
}

// Built-in profiles. The numbers are ours (common practice, from memory),
// in the spirit of NASA EEE-INST-002 and ECSS-Q-ST-30-11, not copied from
// them: class I and air dielectrics are trusted more than class II ones,
// resistors run at half their power, and "strict" is never looser than
// "standard" anywhere. An air gap keeps 30 % below the voltage that would
// arc (humidity, dust, an edge sharper than assumed); a board surface's
// working-voltage guide already holds its margin, so standard uses it as
// it is. Connectors' ratings are working values; 0.8 leaves room for
// wear and contamination of the contacts.
var builtinProfiles = map[string]*Profile{
	"standard": {Name: "standard", TempMargin: 15, Factors: map[string]map[Quantity]float64{
		ClassCapacitor1:   {Vpk: 0.6, Vrms: 0.6, Irms: 0.7, Pdiss: 0.6},
		ClassCapacitor2:   {Vpk: 0.5, Vrms: 0.5, Irms: 0.6, Pdiss: 0.5},
		ClassCapacitorAir: {Vpk: 0.7, Vrms: 0.7, Irms: 0.8, Pdiss: 0.7},
		ClassCapacitor:    {Vpk: 0.5, Vrms: 0.5, Irms: 0.6, Pdiss: 0.5},
		ClassInductor:     {Irms: 0.8, Jrms: 0.8, Vpk: 0.8},
		ClassCore:         {Bpk: 0.8},
		ClassResistor:     {Pdiss: 0.5, Vpk: 0.8},
		ClassLine:         {Vpk: 0.6, Pm: 0.8},
		ClassBlock:        {Vpk: 0.6, Pdiss: 0.6},
		ClassConnector:    {Vpk: 0.8, Irms: 0.8},
		ClassGapAir:       {Arc: 0.7},
		ClassGapBoard:     {Arc: 1},
		ClassSwitch:       {Irms: 0.7, Vpk: 0.6},
	}},
	"strict": {Name: "strict", TempMargin: 25, Factors: map[string]map[Quantity]float64{
		ClassCapacitor1:   {Vpk: 0.5, Vrms: 0.5, Irms: 0.6, Pdiss: 0.5},
		ClassCapacitor2:   {Vpk: 0.4, Vrms: 0.4, Irms: 0.5, Pdiss: 0.4},
		ClassCapacitorAir: {Vpk: 0.6, Vrms: 0.6, Irms: 0.7, Pdiss: 0.6},
		ClassCapacitor:    {Vpk: 0.4, Vrms: 0.4, Irms: 0.5, Pdiss: 0.4},
		ClassInductor:     {Irms: 0.7, Jrms: 0.7, Vpk: 0.7},
		ClassCore:         {Bpk: 0.7},
		ClassResistor:     {Pdiss: 0.4, Vpk: 0.7},
		ClassLine:         {Vpk: 0.5, Pm: 0.7},
		ClassBlock:        {Vpk: 0.5, Pdiss: 0.5},
		ClassConnector:    {Vpk: 0.7, Irms: 0.7},
		ClassGapAir:       {Arc: 0.6},
		ClassGapBoard:     {Arc: 0.8},
		ClassSwitch:       {Irms: 0.6, Vpk: 0.5},
	}},
}

func noneProfile() *Profile {
	p := &Profile{Name: "none", Factors: map[string]map[Quantity]float64{}}
	for c, qs := range classQuantities {
		p.Factors[c] = map[Quantity]float64{}
		for _, q := range qs {
			p.Factors[c][q] = 1
		}
	}
	return p
}

// ProfileNames lists the built-in profiles.
var ProfileNames = []string{"standard", "strict", "none"}

// BuiltinProfile returns a fresh copy of a built-in profile, or nil.
func BuiltinProfile(name string) *Profile {
	if name == "none" {
		return noneProfile()
	}
	b, ok := builtinProfiles[name]
	if !ok {
		return nil
	}
	return b.clone()
}

func (p *Profile) clone() *Profile {
	c := &Profile{Name: p.Name, TempMargin: p.TempMargin, Factors: map[string]map[Quantity]float64{}}
	for cl, m := range p.Factors {
		c.Factors[cl] = map[Quantity]float64{}
		for q, f := range m {
			c.Factors[cl][q] = f
		}
	}
	return c
}

// Classes lists the derating classes in a fixed order.
func Classes() []string {
	return []string{ClassCapacitor1, ClassCapacitor2, ClassCapacitorAir, ClassCapacitor, ClassInductor, ClassCore, ClassResistor, ClassLine, ClassBlock, ClassConnector, ClassGapAir, ClassGapBoard, ClassSwitch}
}

// LoadProfile returns a built-in profile by name (standard, strict, none)
// or reads a profile file. readFile defaults to os.ReadFile. The file
// syntax, one statement per line, # starts a comment:
//
//	name shop-2025           optional; default: the file's base name
//	base strict              optional, before any factor; default standard
//	temp-margin 20C          °C kept below each core material's tmax
//	capacitor-class1 vpk 0.5 class, quantity, factor 0 < f ≤ 1 (or 50%)
//
// Factors not given come from the base profile. Errors are a
// circuits.ErrorList with the file's line:col.
func LoadProfile(nameOrPath string, readFile func(string) ([]byte, error)) (*Profile, error) {
	if p := BuiltinProfile(nameOrPath); p != nil {
		return p, nil
	}
	if readFile == nil {
		readFile = os.ReadFile
	}
	src, err := readFile(nameOrPath)
	if err != nil {
		return nil, fmt.Errorf("derating profile %s is neither built in (%s) nor a readable file: %w",
			circuits.Quote(nameOrPath), strings.Join(ProfileNames, ", "), err)
	}
	return parseProfile(nameOrPath, src)
}

func parseProfile(path string, src []byte) (*Profile, error) {
	var errs circuits.ErrorList
	at := func(line, col int) circuits.Pos { return circuits.Pos{File: path, Line: line, Col: col} }
	add := func(pos circuits.Pos, want, format string, args ...any) {
		errs = append(errs, &circuits.Error{Pos: pos, Msg: fmt.Sprintf(format, args...), Want: want})
	}
	if !utf8.Valid(src) {
		add(at(1, 1), "a UTF-8 text file", "file is not valid UTF-8")
		return nil, errs
	}
	name := strings.TrimSuffix(filepath.Base(path), filepath.Ext(path))
	base := builtinProfiles["standard"].clone()
	var margin *float64
	set := map[string]map[Quantity]float64{}
	seen := map[string]int{} // statement key → line first given
	factorsBegun := false
	lines := strings.Split(strings.ReplaceAll(string(src), "\r\n", "\n"), "\n")
	for i, raw := range lines {
		ln := i + 1
		body := raw
		if j := strings.IndexByte(body, '#'); j >= 0 {
			body = body[:j]
		}
		fs := circuits.Fields(body)
		if len(fs) == 0 {
			continue
		}
		key := fs[0].Text
		once := func(k string) bool {
			if first, dup := seen[k]; dup {
				add(at(ln, fs[0].Col), "each setting once", "%s is already set at line %d", k, first)
				return false
			}
			seen[k] = ln
			return true
		}
		switch key {
		case "name", "base", "temp-margin":
			if len(fs) != 2 {
				c := fs[0].Col
				if len(fs) > 2 {
					c = fs[2].Col
				}
				add(at(ln, c), key+" and one value", "%s takes one value, found %d", key, len(fs)-1)
				continue
			}
			if !once(key) {
				continue
			}
			v := fs[1]
			switch key {
			case "name":
				name = v.Text
			case "base":
				if factorsBegun {
					add(at(ln, fs[0].Col), "base before the first factor line", "base comes after factors and would undo them")
					continue
				}
				if v.Text == "none" {
					base = noneProfile()
				} else if b, ok := builtinProfiles[v.Text]; ok {
					base = b.clone()
				} else {
					add(at(ln, v.Col), "one of "+strings.Join(ProfileNames, ", "), "unknown base profile %s", circuits.Quote(v.Text))
				}
			case "temp-margin":
				m, err := circuits.ParseValue(v.Text, "C")
				if err != nil {
					add(at(ln, v.Col), "a temperature margin in °C such as 15 or 15C", "bad temp-margin: %v", err)
				} else if m < 0 || m > 200 {
					add(at(ln, v.Col), "0 to 200 °C", "temp-margin %s is out of range", v.Text)
				} else {
					margin = &m
				}
			}
			continue
		}
		qs, isClass := classQuantities[key]
		if !isClass {
			add(at(ln, fs[0].Col), "name, base, temp-margin or a part class: "+strings.Join(Classes(), ", "), "unknown profile statement %s", circuits.Quote(key))
			continue
		}
		factorsBegun = true
		if len(fs) != 3 {
			c := fs[len(fs)-1].Col
			if len(fs) > 3 {
				c = fs[3].Col
			}
			add(at(ln, c), key+" QUANTITY FACTOR, e.g. "+key+" "+string(qs[0])+" 0.5", "a factor line takes a class, a quantity and a factor, found %d fields", len(fs))
			continue
		}
		q := Quantity(fs[1].Text)
		if !hasQuantity(qs, q) {
			add(at(ln, fs[1].Col), "for "+key+": "+quantityList(qs), "quantity %s has no factor for %s", circuits.Quote(fs[1].Text), key)
			continue
		}
		f, err := circuits.ParseValue(fs[2].Text, "%")
		if err != nil {
			add(at(ln, fs[2].Col), "a factor 0 < f ≤ 1 such as 0.5 or 50%", "bad factor: %v", err)
			continue
		}
		if !(f > 0 && f <= 1) {
			add(at(ln, fs[2].Col), "a factor 0 < f ≤ 1 such as 0.5 or 50%", "factor %s is out of range", fs[2].Text)
			continue
		}
		if !once(key + " " + string(q)) {
			continue
		}
		if set[key] == nil {
			set[key] = map[Quantity]float64{}
		}
		set[key][q] = f
	}
	if len(errs) > 0 {
		errs.Sort()
		return nil, errs
	}
	p := base
	p.Name = name
	if margin != nil {
		p.TempMargin = *margin
	}
	for c, m := range set {
		if p.Factors[c] == nil {
			p.Factors[c] = map[Quantity]float64{}
		}
		for q, f := range m {
			p.Factors[c][q] = f
		}
	}
	return p, nil
}

func hasQuantity(qs []Quantity, q Quantity) bool {
	for _, x := range qs {
		if x == q {
			return true
		}
	}
	return false
}

func quantityList(qs []Quantity) string {
	s := make([]string, len(qs))
	for i, q := range qs {
		s[i] = string(q)
	}
	sort.Strings(s)
	return strings.Join(s, ", ")
}
