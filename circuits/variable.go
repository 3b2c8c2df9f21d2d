package circuits

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"
	"unicode/utf8"
)

// Adjust is the range of settings of a variable part (a tuning capacitor,
// a roller or tapped coil): `range=LO:HI` makes it adjustable anywhere in
// [Lo, Hi]; `steps=N` (evenly spaced over the range) or `steps=v1,v2,…`
// makes it discrete. The part's written value is its nominal setting.
type Adjust struct {
	Lo, Hi float64
	Steps  []float64 // nil: continuous; else the allowed settings, rising
	Pos    Pos       // where range= (or steps=) is written
}

// Discrete reports whether only the listed steps may be set.
func (a *Adjust) Discrete() bool { return len(a.Steps) > 0 }

// Clamp keeps v within the range (continuous parts only).
func (a *Adjust) Clamp(v float64) float64 { return math.Min(a.Hi, math.Max(a.Lo, v)) }

// maxSteps bounds a discrete part's settings: more would be a continuous
// part written the long way, and enumeration costs the product of counts.
const maxSteps = 4096

// adjust reads range= and steps= of a capacitor or inductor, if written.
// Errors are reported at the attribute's value.
func (p *parser) adjust(kind Kind, name string, value float64, valueOK bool, attrs Attrs) *Adjust {
	ra, hasR := attrs["range"]
	sa, hasS := attrs["steps"]
	if !hasR && !hasS {
		return nil
	}
	unit := map[Kind]string{Capacitor: "F", Inductor: "H"}[kind]
	ex := map[Kind]string{Capacitor: "20p:400p", Inductor: "1u:25u"}[kind]
	a := &Adjust{}
	ok := true
	if hasR {
		a.Pos = ra.Pos
		lo, hi, cut := strings.Cut(ra.Raw, ":")
		l, err1 := ParseValue(lo, unit)
		h, err2 := ParseValue(hi, unit)
		switch {
		case !cut:
			p.errorf(ra.ValPos, "lo:hi such as "+ex, "range %s needs two values joined by a colon", ra.Raw)
			ok = false
		case err1 != nil:
			p.errorf(ra.ValPos, "lo:hi such as "+ex, "bad range low end: %v", err1)
			ok = false
		case err2 != nil:
			p.errorf(ra.ValPos, "lo:hi such as "+ex, "bad range high end: %v", err2)
			ok = false
		case !(l > 0) || !(h > l):
			p.errorf(ra.ValPos, "0 < lo < hi, such as "+ex, "range %s is empty or not above zero", ra.Raw)
			ok = false
		default:
			a.Lo, a.Hi = l, h
		}
	}
	if hasS {
		if !hasR {
			a.Pos = sa.Pos
		}
		at := sa.ValPos
		if n, err := strconv.Atoi(sa.Raw); err == nil {
			switch {
			case !hasR:
				p.errorf(at, "a range= to space "+sa.Raw+" steps over, or the values: steps=10p,20p,40p", "steps=%s needs range=", sa.Raw)
				ok = false
			case n < 2 || n > maxSteps:
				p.errorf(at, fmt.Sprintf("a whole number of settings from 2 to %d", maxSteps), "steps=%s is out of range", sa.Raw)
				ok = false
			case ok:
				for i := 0; i < n; i++ {
					a.Steps = append(a.Steps, a.Lo+(a.Hi-a.Lo)*float64(i)/float64(n-1))
				}
			}
		} else {
			parts := strings.Split(sa.Raw, ",")
			col := at.Col
			for i, s := range parts {
				pos := Pos{at.File, at.Line, col}
				col += utf8.RuneCountInString(s) + 1
				v, err := ParseValue(s, unit)
				if err != nil {
					p.errorf(pos, "a number of settings, or values such as steps=10p,20p,40p", "bad step: %v", err)
					ok = false
					break
				}
				if !(v > 0) {
					p.errorf(pos, "values above zero", "step %s is not above zero", s)
					ok = false
					break
				}
				if i > 0 && v <= a.Steps[i-1] {
					p.errorf(pos, "steps that rise from one to the next", "step %s is not above the one before", s)
					ok = false
					break
				}
				a.Steps = append(a.Steps, v)
			}
			if ok && len(a.Steps) > maxSteps {
				p.errorf(at, fmt.Sprintf("at most %d settings", maxSteps), "%d steps", len(a.Steps))
				ok = false
			}
			if ok && len(a.Steps) < 2 {
				p.errorf(at, "two settings or more (a part with one setting is fixed: leave steps= out)", "one step only")
				ok = false
			}
			if ok && hasR && (a.Steps[0] < a.Lo*(1-1e-12) || a.Steps[len(a.Steps)-1] > a.Hi*(1+1e-12)) {
				p.errorf(at, "steps within range="+ra.Raw, "a step lies outside the range")
				ok = false
			}
			if ok && !hasR {
				a.Lo, a.Hi = a.Steps[0], a.Steps[len(a.Steps)-1]
			}
		}
	}
	if !ok {
		return nil
	}
	if valueOK && (value < a.Lo*(1-1e-9) || value > a.Hi*(1+1e-9)) {
		pos := a.Pos
		p.errorf(pos, "a nominal value within the range", "%s %s value %s lies outside its range %s…%s", kind, name,
			FormatSI(value, unit), FormatSI(a.Lo, unit), FormatSI(a.Hi, unit))
		return nil
	}
	return a
}

// NearestStep returns the index of the step closest to v (log distance,
// as steps of a switched bank are usually spaced by ratio).
func (a *Adjust) NearestStep(v float64) int {
	i := sort.SearchFloat64s(a.Steps, v)
	if i == 0 {
		return 0
	}
	if i >= len(a.Steps) {
		return len(a.Steps) - 1
	}
	if math.Log(v/a.Steps[i-1]) <= math.Log(a.Steps[i]/v) {
		return i - 1
	}
	return i
}

// WithAntenna returns a copy of c whose antenna port is the fixed load z,
// without any measured data: a network retuned for one load is audited
// into that load, not into the port's sweep.
func (c *Circuit) WithAntenna(z complex128) *Circuit {
	d := *c
	d.Zout, d.outMeas = z, nil
	return &d
}
