package circuits

import (
	"fmt"
	"math"
	"math/cmplx"
	"sort"
	"strconv"
	"strings"
	"unicode/utf8"
)

// Touchstone is measured network data read from a Touchstone file (IBIS
// Open Forum, Touchstone File Format Specification, versions 1.1 and 2.0):
// one- or two-port, converted on reading to S-parameters referred to each
// port's real reference resistance.
type Touchstone struct {
	File    string
	Version string    // "1" or "2.0"
	Ports   int       // 1 or 2
	Param   string    // as written: S, Y or Z
	Format  string    // RI, MA or DB
	Ref     []float64 // reference resistance per port, Ω
	F       []float64 // Hz, strictly rising
	S       [][]complex128
	// rows of S per frequency, row-major: S11 (one-port); S11 S12 S21 S22
}

// MaxTouchstonePoints bounds the frequencies read from one file, so a
// hostile file cannot exhaust memory; real sweeps have a few thousand.
const MaxTouchstonePoints = 1_000_000

// tsReader keeps the position for messages.
type tsReader struct {
	file string
	errs ErrorList
}

func (r *tsReader) errorf(line, col int, want, format string, args ...any) {
	if len(r.errs) < 50 {
		r.errs = append(r.errs, &Error{Pos: Pos{r.file, line, col}, Msg: fmt.Sprintf(format, args...), Want: want})
	}
}

type tsToken struct {
	Field
	line int
}

// ParseTouchstone reads a version 1.x or 2.0 Touchstone file of one or two
// ports. Every error carries file:line:col. Version 1 files take their
// port count from the name's .s1p/.s2p ending (the format's own rule);
// version 2.0 files say it with [Number of Ports].
func ParseTouchstone(file string, src []byte) (*Touchstone, error) {
	r := &tsReader{file: file}
	if !utf8.Valid(src) {
		r.errorf(1, 1, "an ASCII text file", "file is not text")
		return nil, r.errs
	}
	text := strings.TrimPrefix(string(src), "\uFEFF")
	lines := strings.Split(strings.ReplaceAll(text, "\r\n", "\n"), "\n")
	ts := &Touchstone{File: file, Version: "1", Param: "S", Format: "MA"}
	unit := 1e9 // GHz is the format's default
	ref := 50.0
	var refs []float64
	optionSeen := false
	nFreq := -1
	order := ""
	matrix := "full"
	inData := false
	ended := false
	inInfo := false
	var toks []tsToken
	v1Rows := [][]tsToken{}
	ports := 0
	lower := strings.ToLower(file)
	switch {
	case strings.HasSuffix(lower, ".s1p"):
		ports = 1
	case strings.HasSuffix(lower, ".s2p"):
		ports = 2
	}
	readingRef := false
	for i, raw := range lines {
		ln := i + 1
		body := raw
		if k := strings.IndexByte(body, '!'); k >= 0 {
			body = body[:k]
		}
		for _, c := range body {
			if c < 0x20 && c != '\t' || c == 0x7f {
				r.errorf(ln, 1, "printable ASCII", "control character %q in the file", c)
				return nil, r.errs
			}
		}
		fs := Fields(body)
		if len(fs) == 0 {
			continue
		}
		if ended {
			r.errorf(ln, fs[0].Col, "nothing after [End]", "text after [End]")
			break
		}
		first := strings.ToLower(fs[0].Text)
		if strings.HasPrefix(first, "[") {
			readingRef = false
			kw, rest := keywordOf(body, fs)
			switch kw {
			case "[version]":
				if len(rest) != 1 || rest[0].Text != "2.0" && rest[0].Text != "2.1" {
					r.errorf(ln, fs[0].Col, "[Version] 2.0", "unsupported version")
					return nil, r.errs
				}
				if optionSeen {
					r.errorf(ln, fs[0].Col, "[Version] before the option line", "[Version] after the option line")
				}
				ts.Version = "2.0"
			case "[number of ports]":
				n, ok := tsInt(rest)
				if !ok || n < 1 {
					r.errorf(ln, fs[0].Col, "[Number of Ports] 1 or 2", "bad port count")
					return nil, r.errs
				}
				if n > 2 {
					r.errorf(ln, rest[0].Col, "a one- or two-port file", "%d ports: rfstress reads one- and two-port data", n)
					return nil, r.errs
				}
				ports = n
			case "[two-port data order]":
				if len(rest) != 1 || (rest[0].Text != "12_21" && rest[0].Text != "21_12") {
					r.errorf(ln, fs[0].Col, "12_21 or 21_12", "bad [Two-Port Data Order]")
					return nil, r.errs
				}
				order = rest[0].Text
			case "[number of frequencies]":
				n, ok := tsInt(rest)
				if !ok || n < 1 || n > MaxTouchstonePoints {
					r.errorf(ln, fs[0].Col, fmt.Sprintf("a whole number from 1 to %d", MaxTouchstonePoints), "bad [Number of Frequencies]")
					return nil, r.errs
				}
				nFreq = n
			case "[reference]":
				readingRef = true
				for _, t := range rest {
					v, err := tsFloat(t.Text)
					if err != nil || v <= 0 {
						r.errorf(ln, t.Col, "a positive resistance in Ω", "bad reference %q", Clip(t.Text))
						return nil, r.errs
					}
					refs = append(refs, v)
				}
			case "[matrix format]":
				if len(rest) != 1 {
					r.errorf(ln, fs[0].Col, "Full, Lower or Upper", "bad [Matrix Format]")
					return nil, r.errs
				}
				matrix = strings.ToLower(rest[0].Text)
				if matrix != "full" && matrix != "lower" && matrix != "upper" {
					r.errorf(ln, rest[0].Col, "Full, Lower or Upper", "bad [Matrix Format] %q", Clip(rest[0].Text))
					return nil, r.errs
				}
			case "[network data]":
				if ts.Version != "2.0" {
					r.errorf(ln, fs[0].Col, "[Version] 2.0 first", "[Network Data] in a version 1 file")
					return nil, r.errs
				}
				inData = true
			case "[noise data]":
				inData = false
			case "[end]":
				ended = true
				inData = false
			case "[begin information]":
				inInfo = true
			case "[end information]":
				inInfo = false
			case "[number of noise frequencies]", "[mixed-mode order]":
				if kw == "[mixed-mode order]" {
					r.errorf(ln, fs[0].Col, "single-ended data", "mixed-mode data is not read")
					return nil, r.errs
				}
			default:
				r.errorf(ln, fs[0].Col, "a Touchstone 2.0 keyword", "unknown keyword %s", Clip(fs[0].Text))
				return nil, r.errs
			}
			continue
		}
		if inInfo {
			continue
		}
		if strings.HasPrefix(first, "#") {
			if optionSeen {
				continue // the format ignores later option lines
			}
			optionSeen = true
			opts := fs
			if first == "#" {
				opts = fs[1:]
			} else {
				opts = append([]Field{{Text: fs[0].Text[1:], Col: fs[0].Col + 1}}, fs[1:]...)
			}
			for k := 0; k < len(opts); k++ {
				t := opts[k]
				switch w := strings.ToLower(t.Text); w {
				case "hz":
					unit = 1
				case "khz":
					unit = 1e3
				case "mhz":
					unit = 1e6
				case "ghz":
					unit = 1e9
				case "s", "y", "z":
					ts.Param = strings.ToUpper(w)
				case "g", "h":
					r.errorf(ln, t.Col, "S, Y or Z parameters", "%s parameters are not read", strings.ToUpper(w))
					return nil, r.errs
				case "ri", "ma", "db":
					ts.Format = strings.ToUpper(w)
				case "r":
					if k+1 >= len(opts) {
						r.errorf(ln, t.Col, "R followed by the reference resistance, e.g. R 50", "R without a value")
						return nil, r.errs
					}
					v, err := tsFloat(opts[k+1].Text)
					if err != nil || v <= 0 {
						r.errorf(ln, opts[k+1].Col, "a positive resistance, e.g. R 50", "bad reference resistance %q", Clip(opts[k+1].Text))
						return nil, r.errs
					}
					ref = v
					k++
				case "":
				default:
					r.errorf(ln, t.Col, "Hz|kHz|MHz|GHz, S|Y|Z, RI|MA|DB, R value", "unknown option %q", Clip(t.Text))
					return nil, r.errs
				}
			}
			continue
		}
		if readingRef {
			ok := true
			for _, t := range fs {
				v, err := tsFloat(t.Text)
				if err != nil || v <= 0 {
					ok = false
					break
				}
				refs = append(refs, v)
			}
			if ok {
				continue
			}
			readingRef = false
		}
		if !optionSeen {
			r.errorf(ln, fs[0].Col, "an option line such as: # MHz S RI R 50", "data before the option line")
			return nil, r.errs
		}
		if ts.Version == "2.0" {
			if !inData {
				r.errorf(ln, fs[0].Col, "data between [Network Data] and [End]", "data outside [Network Data]")
				return nil, r.errs
			}
			for _, f := range fs {
				toks = append(toks, tsToken{f, ln})
			}
		} else {
			row := make([]tsToken, len(fs))
			for k, f := range fs {
				row[k] = tsToken{f, ln}
			}
			v1Rows = append(v1Rows, row)
		}
	}
	if len(r.errs) > 0 {
		return nil, r.errs
	}
	last := len(lines)
	if ts.Version == "2.0" {
		if ports == 0 {
			r.errorf(1, 1, "[Number of Ports] 1 or 2", "no [Number of Ports]")
			return nil, r.errs
		}
		if ports == 2 && order == "" {
			r.errorf(1, 1, "[Two-Port Data Order] 12_21 or 21_12", "a two-port file needs [Two-Port Data Order]")
			return nil, r.errs
		}
		if nFreq < 0 {
			r.errorf(1, 1, "[Number of Frequencies] N", "no [Number of Frequencies]")
			return nil, r.errs
		}
		if !ended {
			r.errorf(last, 1, "[End] after the data", "no [End]")
			return nil, r.errs
		}
	} else {
		if ports == 0 {
			r.errorf(1, 1, "a file named .s1p or .s2p, or a version 2.0 file with [Number of Ports]", "cannot tell the port count of a version 1 file")
			return nil, r.errs
		}
		order = "21_12" // version 1 two-ports: N11 N21 N12 N22
	}
	ts.Ports = ports
	if len(refs) == 0 {
		for k := 0; k < ports; k++ {
			refs = append(refs, ref)
		}
	}
	if len(refs) != ports {
		r.errorf(1, 1, fmt.Sprintf("%d reference values", ports), "[Reference] gives %d values for %d ports", len(refs), ports)
		return nil, r.errs
	}
	ts.Ref = refs
	per := ports * ports
	if ports == 2 && matrix != "full" {
		per = 3
	}
	// group the numbers into frequency points
	var groups [][]tsToken
	if ts.Version == "2.0" {
		if len(toks)%(1+2*per) != 0 {
			t := toks[len(toks)-1]
			r.errorf(t.line, t.Col, fmt.Sprintf("1 frequency and %d numbers per point", 2*per), "the data do not divide into whole points")
			return nil, r.errs
		}
		for k := 0; k < len(toks); k += 1 + 2*per {
			groups = append(groups, toks[k:k+1+2*per])
		}
		if len(groups) != nFreq {
			r.errorf(last, 1, fmt.Sprintf("%d points as [Number of Frequencies] says", nFreq), "found %d points", len(groups))
			return nil, r.errs
		}
	} else {
		for k, row := range v1Rows {
			if len(row) != 1+2*per {
				// version 1 two-ports may end with noise data (five numbers a
				// line, frequency falling back): it is not network data
				if ports == 2 && len(row) == 5 && k > 0 {
					if f, err := tsFloat(row[0].Text); err == nil && len(groups) > 0 {
						if pf, _ := tsFloat(groups[len(groups)-1][0].Text); f <= pf {
							break
						}
					}
				}
				r.errorf(row[0].line, row[0].Col, fmt.Sprintf("a frequency and %d numbers on each line", 2*per), "found %d numbers", len(row))
				return nil, r.errs
			}
			groups = append(groups, row)
		}
	}
	if len(groups) == 0 {
		r.errorf(last, 1, "at least one data line", "no network data")
		return nil, r.errs
	}
	if len(groups) > MaxTouchstonePoints {
		r.errorf(groups[0][0].line, 1, fmt.Sprintf("at most %d points", MaxTouchstonePoints), "too many points")
		return nil, r.errs
	}
	for _, g := range groups {
		nums := make([]float64, len(g))
		for k, t := range g {
			v, err := tsFloat(t.Text)
			if err != nil {
				r.errorf(t.line, t.Col, "a number", "bad number %q", Clip(t.Text))
				return nil, r.errs
			}
			nums[k] = v
		}
		f := nums[0] * unit
		if f <= 0 {
			r.errorf(g[0].line, g[0].Col, "a frequency above zero", "frequency %s is not above zero", Clip(g[0].Text))
			return nil, r.errs
		}
		if n := len(ts.F); n > 0 && f <= ts.F[n-1] {
			r.errorf(g[0].line, g[0].Col, "frequencies strictly rising", "frequency %s does not rise above the one before", Clip(g[0].Text))
			return nil, r.errs
		}
		vals := make([]complex128, per)
		for k := 0; k < per; k++ {
			a, b := nums[1+2*k], nums[2+2*k]
			switch ts.Format {
			case "RI":
				vals[k] = complex(a, b)
			case "MA":
				vals[k] = cmplx.Rect(a, b*math.Pi/180)
			case "DB":
				vals[k] = cmplx.Rect(math.Pow(10, a/20), b*math.Pi/180)
			}
			if cmplx.IsInf(vals[k]) || cmplx.IsNaN(vals[k]) {
				t := g[1+2*k]
				r.errorf(t.line, t.Col, "a value whose magnitude is finite (in dB, below about 6000)", "value %s is out of range", Clip(t.Text))
				return nil, r.errs
			}
		}
		m := make([]complex128, ports*ports) // row-major N11 N12 N21 N22
		if ports == 1 {
			m[0] = vals[0]
		} else {
			switch {
			case matrix == "lower": // N11 N21 N22
				m[0], m[2], m[1], m[3] = vals[0], vals[1], vals[1], vals[2]
			case matrix == "upper": // N11 N12 N22
				m[0], m[1], m[2], m[3] = vals[0], vals[1], vals[1], vals[2]
			case order == "12_21": // N11 N12 N21 N22
				copy(m, vals)
			default: // 21_12: N11 N21 N12 N22
				m[0], m[2], m[1], m[3] = vals[0], vals[1], vals[2], vals[3]
			}
		}
		s, err := toS(ts.Param, ts.Version, m, ts.Ref)
		if err != nil {
			r.errorf(g[0].line, g[0].Col, "passive network data", "%v", err)
			return nil, r.errs
		}
		ts.F = append(ts.F, f)
		ts.S = append(ts.S, s)
	}
	return ts, nil
}

func keywordOf(body string, fs []Field) (string, []Field) {
	// keywords hold spaces: "[Number of Ports] 2"
	end := strings.IndexByte(body, ']')
	if end < 0 {
		return strings.ToLower(fs[0].Text), fs[1:]
	}
	kw := strings.ToLower(strings.Join(strings.Fields(body[:end+1]), " "))
	var rest []Field
	off := utf8.RuneCountInString(body[:end+1])
	for _, f := range fs {
		if f.Col > off {
			rest = append(rest, f)
		}
	}
	return kw, rest
}

func tsInt(rest []Field) (int, bool) {
	if len(rest) != 1 {
		return 0, false
	}
	n, err := strconv.Atoi(rest[0].Text)
	return n, err == nil
}

// tsFloat reads a finite number.
func tsFloat(s string) (float64, error) {
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		return 0, err
	}
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, fmt.Errorf("not finite")
	}
	return v, nil
}

// toS converts a one- or two-port matrix to S referred to refs. Version 1
// files give Y and Z normalised to the reference; version 2.0 files give
// them in ohms and siemens (Touchstone 2.0, option line; from memory of
// the specification's wording, and the two agree for a 1 Ω reference).
func toS(param, version string, m []complex128, refs []float64) ([]complex128, error) {
	n := len(refs)
	if param == "S" {
		return m, nil
	}
	z := make([]complex128, n*n)
	switch param {
	case "Z":
		copy(z, m)
		if version == "1" {
			for i := range z {
				z[i] *= complex(refs[0], 0)
			}
		}
	case "Y":
		y := make([]complex128, n*n)
		copy(y, m)
		if version == "1" {
			for i := range y {
				y[i] /= complex(refs[0], 0)
			}
		}
		inv, ok := inverse(y)
		if !ok {
			return nil, fmt.Errorf("Y matrix is singular: no impedance form")
		}
		z = inv
	}
	return zToS(z, refs)
}

// zToS: S = F (Z − R)(Z + R)⁻¹ F⁻¹ with R = diag(refs), F = diag(1/(2√R))
// (Kurokawa 1965, power waves with real references).
func zToS(z []complex128, refs []float64) ([]complex128, error) {
	n := len(refs)
	a := make([]complex128, n*n)
	b := make([]complex128, n*n)
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			a[i*n+j] = z[i*n+j]
			b[i*n+j] = z[i*n+j]
		}
		a[i*n+i] -= complex(refs[i], 0)
		b[i*n+i] += complex(refs[i], 0)
	}
	bi, ok := inverse(b)
	if !ok {
		return nil, fmt.Errorf("Z + R is singular")
	}
	p := matMul(a, bi, n)
	s := make([]complex128, n*n)
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			s[i*n+j] = p[i*n+j] * complex(math.Sqrt(refs[j]/refs[i]), 0)
		}
	}
	for _, v := range s {
		if cmplx.IsNaN(v) || cmplx.IsInf(v) {
			return nil, fmt.Errorf("data give no finite S-parameters")
		}
	}
	return s, nil
}

func matMul(a, b []complex128, n int) []complex128 {
	out := make([]complex128, n*n)
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			var s complex128
			for k := 0; k < n; k++ {
				s += a[i*n+k] * b[k*n+j]
			}
			out[i*n+j] = s
		}
	}
	return out
}

// inverse of a 1×1 or 2×2 matrix.
func inverse(m []complex128) ([]complex128, bool) {
	switch len(m) {
	case 1:
		if m[0] == 0 {
			return nil, false
		}
		return []complex128{1 / m[0]}, true
	case 4:
		d := m[0]*m[3] - m[1]*m[2]
		if cmplx.Abs(d) < 1e-300 {
			return nil, false
		}
		return []complex128{m[3] / d, -m[1] / d, -m[2] / d, m[0] / d}, true
	}
	return nil, false
}

// Range is the measured frequency span.
func (t *Touchstone) Range() (lo, hi float64) { return t.F[0], t.F[len(t.F)-1] }

// SAt returns the S-matrix at f. Between measured points the magnitude and
// the unwrapped phase of each entry are interpolated linearly in f (a
// delay's phase is linear in f, so a line or a filter's passband is not
// smeared); outside the span the end point is held (the caller decides
// whether that is allowed). At a measured frequency it is the data.
func (t *Touchstone) SAt(f float64) []complex128 {
	n := len(t.F)
	k := sort.SearchFloat64s(t.F, f)
	switch {
	case k < n && t.F[k] == f:
		return t.S[k]
	case k == 0:
		return t.S[0]
	case k >= n:
		return t.S[n-1]
	}
	u := (f - t.F[k-1]) / (t.F[k] - t.F[k-1])
	a, b := t.S[k-1], t.S[k]
	out := make([]complex128, len(a))
	for i := range a {
		ma, mb := cmplx.Abs(a[i]), cmplx.Abs(b[i])
		pa, pb := cmplx.Phase(a[i]), cmplx.Phase(b[i])
		for pb-pa > math.Pi {
			pb -= 2 * math.Pi
		}
		for pb-pa < -math.Pi {
			pb += 2 * math.Pi
		}
		out[i] = cmplx.Rect(ma+u*(mb-ma), pa+u*(pb-pa))
	}
	return out
}

// ZAt returns a one-port's impedance at f. Between measured points its
// real and imaginary parts are interpolated linearly against log f; at a
// measured frequency it is the data exactly.
func (t *Touchstone) ZAt(f float64) complex128 {
	n := len(t.F)
	z := func(i int) complex128 { return sToZ1(t.S[i][0], t.Ref[0]) }
	k := sort.SearchFloat64s(t.F, f)
	switch {
	case k < n && t.F[k] == f:
		return z(k)
	case k == 0:
		return z(0)
	case k >= n:
		return z(n - 1)
	}
	u := math.Log(f/t.F[k-1]) / math.Log(t.F[k]/t.F[k-1])
	za, zb := z(k-1), z(k)
	return za + complex(u, 0)*(zb-za)
}

// sToZ1 is a one-port's impedance from its reflection: R(1+S)/(1−S).
func sToZ1(s complex128, r float64) complex128 {
	d := 1 - s
	if cmplx.Abs(d) < 1e-15 {
		d = 1e-15 // an ideal open: very large, still finite
	}
	return complex(r, 0) * (1 + s) / d
}
