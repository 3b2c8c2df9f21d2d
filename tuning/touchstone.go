package tuning

import (
	"fmt"
	"math"
	"math/cmplx"
	"strconv"
	"strings"
	"unicode/utf8"

	"rfstress/circuits"
)

// ReadTouchstone1 reads a one-port Touchstone version 1 file (.s1p) of a
// measured load: an option line `# <unit> <parameter> <format> R <ref>`
// (unit Hz, kHz, MHz or GHz; parameter S or Z; format RI, MA or DB;
// defaults GHz S MA R 50, as the format defines), `!` comments, and one
// data line per frequency: frequency and the parameter as a pair of
// numbers. Z data are normalised to the reference resistance, as in
// version 1. The reader is strict: every departure is an error at
// file:line:col, and all of them are reported.
func ReadTouchstone1(file string, src []byte) ([]LoadPoint, error) {
	var errs circuits.ErrorList
	add := func(line, col int, want, format string, args ...any) {
		errs = append(errs, &circuits.Error{Pos: circuits.Pos{File: file, Line: line, Col: col}, Msg: fmt.Sprintf(format, args...), Want: want})
	}
	if !utf8.Valid(src) {
		add(1, 1, "a text file", "file is not valid UTF-8")
		return nil, errs
	}
	unit, param, format, ref := 1e9, "S", "MA", 50.0
	optSeen := false
	var pts []LoadPoint
	lines := strings.Split(strings.ReplaceAll(string(src), "\r\n", "\n"), "\n")
	for i, raw := range lines {
		ln := i + 1
		body := raw
		if k := strings.IndexByte(body, '!'); k >= 0 {
			body = body[:k]
		}
		toks := circuits.Fields(body)
		if len(toks) == 0 {
			continue
		}
		if strings.HasPrefix(toks[0].Text, "[") {
			add(ln, toks[0].Col, "a version 1 file: an option line and data lines", "keyword %s belongs to Touchstone 2.0, which this reader does not take", quote(toks[0].Text))
			continue
		}
		if strings.HasPrefix(toks[0].Text, "#") {
			if optSeen {
				add(ln, toks[0].Col, "one option line (the format ignores later ones, so one is a slip)", "second option line")
				continue
			}
			if len(pts) > 0 {
				add(ln, toks[0].Col, "the option line before the data", "option line after data")
			}
			optSeen = true
			opts := toks
			if toks[0].Text == "#" {
				opts = toks[1:]
			} else {
				opts[0] = circuits.Field{Text: toks[0].Text[1:], Col: toks[0].Col + 1}
			}
			for k := 0; k < len(opts); k++ {
				t := opts[k]
				switch w := strings.ToUpper(t.Text); w {
				case "HZ":
					unit = 1
				case "KHZ":
					unit = 1e3
				case "MHZ":
					unit = 1e6
				case "GHZ":
					unit = 1e9
				case "S", "Z":
					param = w
				case "Y", "H", "G":
					add(ln, t.Col, "S or Z", "%s parameters are not read for a load", w)
				case "RI", "MA", "DB":
					format = w
				case "R":
					if k+1 >= len(opts) {
						add(ln, t.Col, "R and a resistance, e.g. R 50", "R without a reference resistance")
						continue
					}
					k++
					v, err := strconv.ParseFloat(opts[k].Text, 64)
					if err != nil || !(v > 0) || math.IsInf(v, 0) {
						add(ln, opts[k].Col, "a reference resistance above zero, e.g. 50", "bad reference resistance %s", quote(opts[k].Text))
						continue
					}
					ref = v
				default:
					add(ln, t.Col, "Hz, kHz, MHz or GHz; S or Z; RI, MA or DB; R and a resistance", "unknown option %s", quote(t.Text))
				}
			}
			continue
		}
		if len(toks) != 3 {
			at := toks[0].Col
			if len(toks) > 3 {
				at = toks[3].Col
			}
			add(ln, at, "three numbers: frequency and the one-port parameter as a pair", "a one-port data line has 3 numbers, found %d", len(toks))
			continue
		}
		var x [3]float64
		bad := false
		for k := 0; k < 3; k++ {
			v, err := strconv.ParseFloat(toks[k].Text, 64)
			if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
				add(ln, toks[k].Col, "a finite number", "bad number %s", quote(toks[k].Text))
				bad = true
			}
			x[k] = v
		}
		if bad {
			continue
		}
		f := x[0] * unit
		if !(f > 0) {
			add(ln, toks[0].Col, "a frequency above zero", "frequency %s is not above zero", toks[0].Text)
			continue
		}
		if n := len(pts); n > 0 && f <= pts[n-1].F {
			add(ln, toks[0].Col, "frequencies that rise from line to line", "frequency %s does not rise", toks[0].Text)
			continue
		}
		var p complex128
		switch format {
		case "RI":
			p = complex(x[1], x[2])
		case "MA":
			p = cmplx.Rect(x[1], x[2]*math.Pi/180)
		case "DB":
			p = cmplx.Rect(math.Pow(10, x[1]/20), x[2]*math.Pi/180)
		}
		var z complex128
		if param == "S" {
			if cmplx.Abs(p) > 1+1e-9 {
				add(ln, toks[1].Col, "|S11| ≤ 1 for a passive antenna", "|S11| = %.4g is above 1", cmplx.Abs(p))
				continue
			}
			if cmplx.Abs(1-p) < 1e-12 {
				add(ln, toks[1].Col, "S11 away from 1 (an open circuit has no finite impedance)", "S11 = 1")
				continue
			}
			z = complex(ref, 0) * (1 + p) / (1 - p)
		} else {
			z = complex(ref, 0) * p
		}
		if real(z) < 0 {
			if real(z) > -1e-9*cmplx.Abs(z) {
				z = complex(0, imag(z))
			} else {
				add(ln, toks[1].Col, "a passive load (resistance ≥ 0)", "the load has negative resistance %s", circuits.FormatSI(real(z), "Ω"))
				continue
			}
		}
		pts = append(pts, LoadPoint{F: f, Z: z, Pos: circuits.Pos{File: file, Line: ln, Col: toks[0].Col}})
	}
	if !optSeen && len(errs) == 0 {
		add(1, 1, "an option line such as # MHz S RI R 50 before the data", "no option line")
	}
	if len(pts) == 0 && len(errs) == 0 {
		add(1, 1, "data lines: frequency and S11 or Z11", "no data in the file")
	}
	if len(errs) > 0 {
		errs.Sort()
		return nil, errs
	}
	return pts, nil
}

// quote renders text from a file safely: control characters escaped.
func quote(s string) string { return strconv.Quote(s) }
