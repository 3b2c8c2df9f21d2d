package tuning

import (
	"fmt"
	"math/cmplx"
	"strconv"
	"strings"

	"rfstress/circuits"
)

// ReadTouchstone1 reads a one-port Touchstone file (.s1p) of a measured
// load through the circuits layer's reader (circuits.ParseTouchstone:
// version 1.x or 2.0, S, Y or Z data, RI, MA or DB, any unit and reference;
// every error at file:line:col). A load must be one port and passive.
func ReadTouchstone1(file string, src []byte) ([]LoadPoint, error) {
	ts, err := circuits.ParseTouchstone(file, src)
	if err != nil {
		return nil, err
	}
	if ts.Ports != 1 {
		return nil, &circuits.Error{Pos: circuits.Pos{File: file, Line: 1, Col: 1}, Msg: fmt.Sprintf("a load file has one port, this one %d", ts.Ports), Want: "a one-port .s1p file"}
	}
	var pts []LoadPoint
	for i, f := range ts.F {
		s := ts.S[i][0]
		if cmplx.Abs(s) > 1+1e-9 {
			return nil, &circuits.Error{Pos: dataLine(file, src, i),
				Msg: fmt.Sprintf("at %s |S11| = %.4g is above 1: an active load", circuits.FormatHz(f), cmplx.Abs(s)), Want: "a passive antenna, |S11| ≤ 1"}
		}
		z := ts.ZAt(f)
		if real(z) < 0 {
			z = complex(0, imag(z)) // |S11| = 1 within rounding
		}
		pts = append(pts, LoadPoint{F: f, Z: z, Pos: circuits.Pos{File: file}})
	}
	return pts, nil
}

// dataLine finds where the i-th frequency of a one-port file is written:
// one data line per frequency, after comments (!), the option line (#)
// and keywords ([…]); the column is that of the parameter's first number.
func dataLine(file string, src []byte, i int) circuits.Pos {
	n := 0
	for ln, raw := range strings.Split(strings.ReplaceAll(string(src), "\r\n", "\n"), "\n") {
		body, _, _ := strings.Cut(raw, "!")
		fs := circuits.Fields(body)
		if len(fs) == 0 || strings.HasPrefix(fs[0].Text, "#") || strings.HasPrefix(fs[0].Text, "[") {
			continue
		}
		if n == i {
			col := fs[0].Col
			if len(fs) > 1 {
				col = fs[1].Col
			}
			return circuits.Pos{File: file, Line: ln + 1, Col: col}
		}
		n++
	}
	return circuits.Pos{File: file, Line: 1, Col: 1}
}

// quote renders text from a file safely: control characters escaped.
func quote(s string) string { return strconv.Quote(s) }
