package tuning

import (
	"fmt"
	"math"
	"path/filepath"
	"strings"
	"unicode/utf8"

	"rfstress/circuits"
)

// LoadPoint is one load of a set: a measured point carries its frequency
// and where it was read; a point of an SWR region has F = 0.
type LoadPoint struct {
	F    float64
	Z    complex128
	Pos  circuits.Pos
	Ring float64 // SWR of the circle it lies on (region sets only; 1 for the centre)
}

// LoadSet is the loads the antenna port may present: measured points (a
// CSV or Touchstone file, each at its frequency) or a region of SWR
// around the port's z (the same at every carrier).
type LoadSet struct {
	Source string  // the file, or "swr=10"
	SWR    float64 // region sets: the outer SWR
	Points []LoadPoint
	File   bool // points carry frequencies
}

// Region rings and phases: the region within SWR S is sampled at its
// centre and on rings at S^(k/4), k = 1…4, twelve phases each (every
// 30°), so a part's worst is found near the edge and inside alike.
const (
	regionRings  = 4
	regionPhases = 12
)

// Region samples the loads within SWR s around z0.
func Region(z0 complex128, s float64) *LoadSet {
	ls := &LoadSet{Source: fmt.Sprintf("swr=%g", s), SWR: s}
	ls.Points = append(ls.Points, LoadPoint{Z: z0, Ring: 1})
	if s <= 1 {
		return ls
	}
	for k := 1; k <= regionRings; k++ {
		r := math.Pow(s, float64(k)/regionRings)
		for j := 0; j < regionPhases; j++ {
			th := 2 * math.Pi * float64(j) / regionPhases
			ls.Points = append(ls.Points, LoadPoint{Z: circuits.LoadOnCircle(z0, r, th).Z, Ring: r})
		}
	}
	return ls
}

// ParseLoads reads a --loads argument: swr=S for a region around z0, or a
// file (.s1p: Touchstone version 1; anything else: CSV with the header
// frequency,R,X).
func ParseLoads(arg string, z0 complex128, read func(string) ([]byte, error)) (*LoadSet, error) {
	if v, ok := strings.CutPrefix(arg, "swr="); ok {
		s, err := circuits.ParseValue(v)
		if err != nil || !(s >= 1) || s > 1000 {
			return nil, fmt.Errorf("--loads %s: expected swr=S with S from 1 to 1000, e.g. swr=10", arg)
		}
		return Region(z0, s), nil
	}
	src, err := read(arg)
	if err != nil {
		return nil, fmt.Errorf("cannot read load file: %v", err)
	}
	ext := strings.ToLower(filepath.Ext(arg))
	var pts []LoadPoint
	switch {
	case ext == ".s1p":
		pts, err = ReadTouchstone1(arg, src)
	case len(ext) >= 4 && ext[1] == 's' && strings.HasSuffix(ext, "p"):
		return nil, fmt.Errorf("%s: a load is a one-port: give a .s1p file, not %s", arg, ext)
	default:
		pts, err = ReadLoadCSV(arg, src)
	}
	if err != nil {
		return nil, err
	}
	return &LoadSet{Source: arg, Points: pts, File: true}, nil
}

// ReadLoadCSV reads loads as CSV: a header `frequency,R,X`, then one load
// per line (frequency with an optional SI prefix and Hz, R and X in Ω);
// blank lines and lines starting with # are skipped. Frequencies must rise.
func ReadLoadCSV(file string, src []byte) ([]LoadPoint, error) {
	var errs circuits.ErrorList
	add := func(line, col int, want, format string, args ...any) {
		errs = append(errs, &circuits.Error{Pos: circuits.Pos{File: file, Line: line, Col: col}, Msg: fmt.Sprintf(format, args...), Want: want})
	}
	if !utf8.Valid(src) {
		add(1, 1, "a UTF-8 text file", "file is not valid UTF-8")
		return nil, errs
	}
	var pts []LoadPoint
	header := false
	lines := strings.Split(strings.ReplaceAll(string(src), "\r\n", "\n"), "\n")
	for i, raw := range lines {
		ln := i + 1
		if t := strings.TrimSpace(raw); t == "" || strings.HasPrefix(t, "#") {
			continue
		}
		cells, cols := splitCSV(raw)
		if !header {
			header = true
			want := []string{"frequency", "r", "x"}
			ok := len(cells) == 3
			for k := 0; ok && k < 3; k++ {
				ok = strings.ToLower(strings.TrimSpace(cells[k])) == want[k]
			}
			if !ok {
				add(ln, 1, "the header frequency,R,X", "first line is not the header")
			}
			continue
		}
		if len(cells) != 3 {
			add(ln, 1, "frequency,R,X such as 3.65M,13,-490", "%d fields, expected 3", len(cells))
			continue
		}
		f, err := circuits.ParseValue(strings.TrimSpace(cells[0]), "Hz")
		if err != nil || !(f > 0) {
			add(ln, cols[0], "a frequency above zero such as 3.65M", "bad frequency %s", quote(cells[0]))
			continue
		}
		r, err := circuits.ParseValue(strings.TrimSpace(cells[1]), "ohm")
		if err != nil || r < 0 {
			add(ln, cols[1], "a resistance ≥ 0 in Ω", "bad resistance %s", quote(cells[1]))
			continue
		}
		x, err := circuits.ParseValue(strings.TrimSpace(cells[2]), "ohm")
		if err != nil {
			add(ln, cols[2], "a reactance in Ω, negative for capacitive", "bad reactance %s", quote(cells[2]))
			continue
		}
		if n := len(pts); n > 0 && f <= pts[n-1].F {
			add(ln, cols[0], "frequencies that rise from line to line", "frequency %s does not rise", strings.TrimSpace(cells[0]))
			continue
		}
		pts = append(pts, LoadPoint{F: f, Z: complex(r, x), Pos: circuits.Pos{File: file, Line: ln, Col: 1}})
	}
	if !header {
		add(1, 1, "the header frequency,R,X, then loads", "empty load file")
	} else if len(pts) == 0 && len(errs) == 0 {
		add(1, 1, "loads after the header", "no loads in the file")
	}
	if len(errs) > 0 {
		errs.Sort()
		return nil, errs
	}
	return pts, nil
}

// splitCSV splits a line on commas and gives each cell's column (from 1,
// in characters). Loads need no quoting.
func splitCSV(s string) ([]string, []int) {
	var cells []string
	var cols []int
	col := 1
	for _, c := range strings.Split(s, ",") {
		lead := len(c) - len(strings.TrimLeft(c, " \t"))
		cells = append(cells, c)
		cols = append(cols, col+utf8.RuneCountInString(c[:lead]))
		col += utf8.RuneCountInString(c) + 1
	}
	return cells, cols
}

// Case is one carrier with one load to tune for.
type Case struct {
	F    float64
	Load LoadPoint
}

// Cases pairs a load set with carriers. A region applies at every carrier.
// A file's points are taken at their own frequencies within [lo, hi]; when
// none falls there (a single frequency between two measured points), the
// load at each carrier is interpolated linearly in R and X. Carriers
// outside the file's span are an error.
func (ls *LoadSet) Cases(carriers []float64, lo, hi float64) ([]Case, error) {
	var out []Case
	if !ls.File {
		for _, f := range carriers {
			for _, p := range ls.Points {
				out = append(out, Case{F: f, Load: p})
			}
		}
		return out, nil
	}
	tol := 1e-9 * hi
	for _, p := range ls.Points {
		if p.F >= lo-tol && p.F <= hi+tol {
			out = append(out, Case{F: p.F, Load: p})
		}
	}
	if len(out) > 0 {
		return out, nil
	}
	for _, f := range carriers {
		z, err := ls.At(f)
		if err != nil {
			return nil, err
		}
		out = append(out, Case{F: f, Load: LoadPoint{F: f, Z: z}})
	}
	return out, nil
}

// At interpolates a file's load at f, linearly in R and X.
func (ls *LoadSet) At(f float64) (complex128, error) {
	p := ls.Points
	if len(p) == 0 {
		return 0, fmt.Errorf("%s: no loads", ls.Source)
	}
	first, last := p[0].F, p[len(p)-1].F
	if f < first*(1-1e-9) || f > last*(1+1e-9) {
		return 0, fmt.Errorf("%s: %s lies outside the file's frequencies %s to %s", ls.Source, circuits.FormatHz(f), circuits.FormatHz(first), circuits.FormatHz(last))
	}
	for i := 1; i < len(p); i++ {
		if f <= p[i].F {
			t := (f - p[i-1].F) / (p[i].F - p[i-1].F)
			return p[i-1].Z + complex(t, 0)*(p[i].Z-p[i-1].Z), nil
		}
	}
	return p[len(p)-1].Z, nil
}

// About re-centres a region at each carrier on centre(f) (a measured
// antenna's impedance there): the set becomes one region per carrier,
// each load carrying its frequency. Sets read from files are returned as
// they are.
func (ls *LoadSet) About(centre func(float64) complex128, carriers []float64) *LoadSet {
	if ls.File {
		return ls
	}
	out := &LoadSet{Source: ls.Source + " about the measured antenna at each carrier", SWR: ls.SWR, File: true}
	for _, f := range carriers {
		for _, p := range Region(centre(f), ls.SWR).Points {
			p.F = f
			out.Points = append(out.Points, p)
		}
	}
	return out
}
