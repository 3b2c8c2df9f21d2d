package circuits

import (
	"fmt"
	"path/filepath"
	"strconv"
	"strings"
)

// Measured data enter a netlist through a `measured=FILE` attribute on a
// part, a block or the antenna port. The parser keeps the path; the
// command reads the files with LoadMeasured (relative paths are taken from
// the netlist's own folder) before Build.

// measuredAttrs are the attributes every statement that takes measured
// data accepts.
var measuredAttrs = map[string]AttrSpec{
	"measured": {Type: TText, Help: "a Touchstone file of the measured part (.s1p, or .s2p for a block), relative to this netlist"},
	"outside":  {Type: TWord, Help: "what to do at frequencies outside the measured span: error (default) or hold (keep the end value)"},
}

// withMeasured returns attrs plus the measured-data attributes.
func withMeasured(attrs map[string]AttrSpec) map[string]AttrSpec {
	out := make(map[string]AttrSpec, len(attrs)+len(measuredAttrs))
	for k, v := range attrs {
		out[k] = v
	}
	for k, v := range measuredAttrs {
		out[k] = v
	}
	return out
}

// MeasuredRef is one measured file a netlist names.
type MeasuredRef struct {
	Attr  *Attr  // the measured= attribute
	Owner string // the part name, or "port out"
	Ports int    // 1 or 2: what the statement needs
	Path  string // resolved against the netlist's folder
	Hold  bool   // outside=hold
}

// MeasuredRefs lists the measured files of a parsed netlist, in file order.
func (n *Netlist) MeasuredRefs() []MeasuredRef {
	var out []MeasuredRef
	add := func(owner string, attrs Attrs, ports int) {
		a, ok := attrs["measured"]
		if !ok {
			return
		}
		p := a.Raw
		if !filepath.IsAbs(p) {
			p = filepath.Join(filepath.Dir(n.File), p)
		}
		hold := false
		if w, ok := attrs.Word("outside"); ok && w == "hold" {
			hold = true
		}
		out = append(out, MeasuredRef{Attr: a, Owner: owner, Ports: ports, Path: p, Hold: hold})
	}
	for _, c := range n.Components {
		ports := 1
		if c.Kind == Block {
			ports = 2
		}
		add(c.Name, c.Attrs, ports)
	}
	if n.Out != nil {
		add("port out", n.Out.Attrs, 1)
	}
	return out
}

// MaxMeasuredBytes bounds one measured file.
const MaxMeasuredBytes = 16 << 20

// LoadMeasured reads every measured file the netlist names with read and
// keeps the data for Build. Errors name the attribute's position, or the
// data file's own file:line:col.
func LoadMeasured(n *Netlist, read func(path string) ([]byte, error)) error {
	var errs ErrorList
	for _, r := range n.MeasuredRefs() {
		src, err := read(r.Path)
		if err != nil {
			errs = append(errs, &Error{Pos: r.Attr.ValPos, Msg: fmt.Sprintf("cannot read measured data %s: %v", Clip(r.Attr.Raw), err), Want: "a readable Touchstone file, relative to the netlist"})
			continue
		}
		ts, err := ParseTouchstone(r.Path, src)
		if err != nil {
			if el, ok := err.(ErrorList); ok {
				errs = append(errs, el...)
			} else {
				errs = append(errs, &Error{Pos: r.Attr.ValPos, Msg: err.Error()})
			}
			continue
		}
		if ts.Ports != r.Ports {
			errs = append(errs, &Error{Pos: r.Attr.ValPos, Msg: fmt.Sprintf("%s holds %d-port data; %s needs %d-port data", Clip(r.Attr.Raw), ts.Ports, r.Owner, r.Ports),
				Want: map[int]string{1: "a one-port file (.s1p)", 2: "a two-port file (.s2p)"}[r.Ports]})
			continue
		}
		if n.measured == nil {
			n.measured = map[*Attr]*Touchstone{}
		}
		n.measured[r.Attr] = ts
	}
	if len(errs) > 0 {
		return errs
	}
	return nil
}

// measuredData is what an element or port keeps of its measurement.
type measuredData struct {
	ts   *Touchstone
	hold bool
	pos  Pos    // of the measured= value, for range errors
	raw  string // the path as written
}

// measuredFor returns the loaded data of attrs' measured= (nil when none).
func (n *Netlist) measuredFor(attrs Attrs) (*measuredData, error) {
	a, ok := attrs["measured"]
	if !ok {
		return nil, nil
	}
	ts := n.measured[a]
	if ts == nil {
		return nil, &Error{Pos: a.ValPos, Msg: "measured data " + Clip(a.Raw) + " were not loaded", Want: "run through the rfstress command, which reads them"}
	}
	hold := false
	if w, ok := attrs.Word("outside"); ok && w == "hold" {
		hold = true
	}
	return &measuredData{ts: ts, hold: hold, pos: a.ValPos, raw: a.Raw}, nil
}

// check says whether f lies within the measured span (or may be held).
func (m *measuredData) check(f float64, owner string) error {
	if m == nil || m.hold {
		return nil
	}
	lo, hi := m.ts.Range()
	// a part-per-billion allowance: band edges written with other digits
	if f < lo*(1-1e-9) || f > hi*(1+1e-9) {
		return &Error{Pos: m.pos,
			Msg:  fmt.Sprintf("%s: %s is measured from %s to %s, and %s is needed", owner, Clip(m.raw), FormatHz(lo), FormatHz(hi), FormatHz(f)),
			Want: "measure over every carrier and audited harmonic, lower --harmonic-max, or add outside=hold to keep the end value"}
	}
	return nil
}

// measuredZ is the measured impedance of a one-port part at f.
func (e *Element) measuredZ(f float64) (complex128, bool) {
	if e.meas == nil {
		return 0, false
	}
	return e.meas.ts.ZAt(f), true
}

// CheckFrequency reports the first measured part of c that does not cover
// f. Every factorisation asks, so no solve silently extrapolates. (The
// antenna is not part of a factorisation: AntennaAt says what it is.)
func (c *Circuit) CheckFrequency(f float64) error {
	// only the elements Build found with measured data: the check runs at
	// every frequency solved
	for _, i := range c.measured {
		e := &c.Elements[i]
		if err := e.meas.check(f, e.Name); err != nil {
			return err
		}
	}
	return nil
}

// AntennaZ is the antenna port's load at f: the measured impedance when
// the port has measured=, else its z.
func (c *Circuit) AntennaZ(f float64) complex128 {
	if c.outMeas != nil {
		return c.outMeas.ts.ZAt(f)
	}
	return c.Zout
}

// AntennaAt is the antenna load at f for the audit: the measured
// impedance where the sweep reaches (or outside=hold keeps its end), with
// measured true; else the port's z. err names the span when a measured
// antenna does not reach f; callers auditing a carrier must refuse then,
// callers at a harmonic take z (docs/measured.md).
func (c *Circuit) AntennaAt(f float64) (z complex128, measured bool, err error) {
	if c.outMeas == nil {
		return c.Zout, false, nil
	}
	if err := c.outMeas.check(f, "port out"); err != nil {
		return c.Zout, false, err
	}
	return c.outMeas.ts.ZAt(f), true, nil
}

// HasMeasuredAntenna says whether the antenna load varies with frequency.
func (c *Circuit) HasMeasuredAntenna() bool { return c.outMeas != nil }

// outsideWord validates outside= values during parsing.
func outsideOK(attrs Attrs) (Pos, bool) {
	a, ok := attrs["outside"]
	if !ok {
		return Pos{}, true
	}
	w := strings.ToLower(a.Words[0])
	return a.ValPos, w == "hold" || w == "error"
}

// WithQScales returns the netlist's text with the q= of each named
// inductor multiplied by its factor (a q= is added, from the default Q,
// where none was written), and header lines put first as comments. The
// rest of the text is kept byte for byte.
func (n *Netlist) WithQScales(scales map[string]float64, header []string) []byte {
	lines := strings.Split(string(n.Source), "\n")
	for _, c := range n.Components {
		s, ok := scales[c.Name]
		if !ok || c.Pos.Line < 1 || c.Pos.Line > len(lines) {
			continue
		}
		ln := lines[c.Pos.Line-1]
		if a, ok := c.Attrs["q"]; ok {
			var parts []string
			for _, p := range strings.Split(a.Raw, ",") {
				v, f, hasF := strings.Cut(p, "@")
				x, err := ParseValue(v)
				if err != nil {
					parts = append(parts, p)
					continue
				}
				q := strconvG(x * s)
				if hasF {
					q += "@" + f
				}
				parts = append(parts, q)
			}
			// the attribute's text starts at its key's column (runes)
			r := []rune(ln)
			start := a.Pos.Col - 1
			end := start + len([]rune("q="+a.Raw))
			if start >= 0 && end <= len(r) && string(r[start:end]) == "q="+a.Raw {
				ln = string(r[:start]) + "q=" + strings.Join(parts, ",") + string(r[end:])
			}
		} else {
			body, comment, hasC := strings.Cut(ln, "#")
			ln = strings.TrimRight(body, " \t") + " q=" + strconvG(DefaultInductorQ*s)
			if hasC {
				ln += " #" + comment
			}
		}
		lines[c.Pos.Line-1] = ln
	}
	var b strings.Builder
	for _, h := range header {
		b.WriteString("# " + h + "\n")
	}
	b.WriteString(strings.Join(lines, "\n"))
	return []byte(b.String())
}

func strconvG(v float64) string { return strconv.FormatFloat(v, 'g', 4, 64) }
