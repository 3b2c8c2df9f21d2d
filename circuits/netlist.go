package circuits

import (
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"
)

// Ground is the name of the reference node.
const Ground = "gnd"

// Pos is a place in a netlist file; Col counts characters from 1.
type Pos struct {
	File string
	Line int
	Col  int
}

func (p Pos) String() string { return fmt.Sprintf("%s:%d:%d", Escape(p.File), p.Line, p.Col) }

// Error is one input error: where, what is wrong, what would be right.
type Error struct {
	Pos  Pos
	Msg  string
	Want string
}

// Error renders the error on one line: every control character that came
// in with the input is escaped, so a crafted value cannot forge a line.
func (e *Error) Error() string {
	if e.Want == "" {
		return e.Pos.String() + ": " + Escape(e.Msg)
	}
	return e.Pos.String() + ": " + Escape(e.Msg) + " (" + Escape(e.Want) + ")"
}

// ErrorList holds every error of a file, in file order.
type ErrorList []*Error

func (l ErrorList) Error() string {
	s := make([]string, len(l))
	for i, e := range l {
		s[i] = e.Error()
	}
	return strings.Join(s, "\n")
}

// Sort puts errors in file, line, column order.
func (l ErrorList) Sort() {
	sort.SliceStable(l, func(i, j int) bool {
		a, b := l[i].Pos, l[j].Pos
		if a.File != b.File {
			return a.File < b.File
		}
		if a.Line != b.Line {
			return a.Line < b.Line
		}
		return a.Col < b.Col
	})
}

// Point is one value at a frequency; F is 0 for a constant.
type Point struct {
	V, F float64
}

// Attr is one key=value attribute as written and as read.
type Attr struct {
	Key    string
	Raw    string
	Pos    Pos // of the key
	ValPos Pos // of the value
	Num    float64
	Points []Point
	Zs     []complex128
	Words  []string
	Nums   []float64
	Lo, Hi float64
}

// Attrs are a statement's attributes by key.
type Attrs map[string]*Attr

// Num returns the numeric value of key, if present.
func (a Attrs) Num(key string) (float64, bool) {
	if x, ok := a[key]; ok {
		return x.Num, true
	}
	return 0, false
}

// Word returns the first word of key, if present.
func (a Attrs) Word(key string) (string, bool) {
	if x, ok := a[key]; ok && len(x.Words) > 0 {
		return x.Words[0], true
	}
	return "", false
}

// Kind names a component kind as written in the netlist.
type Kind string

// Component is one element statement: a part (the kinds are registered
// in kind.go, one file per kind).
type Component struct {
	Name  string
	Kind  Kind
	A, B  string   // the first two terminals' nodes
	Nodes []string // every terminal's node, in statement order
	Value float64  // 0 for kinds without a value field
	Pos   Pos
	Attrs Attrs
	// Adjust is set for a variable part (range=, steps=); see variable.go.
	Adjust *Adjust
}

// Terminals returns the component's nodes in statement order.
func (c *Component) Terminals() []string {
	if len(c.Nodes) > 0 {
		return c.Nodes
	}
	return []string{c.A, c.B}
}

// Port is the transmitter (in) or antenna (out) connection.
type Port struct {
	Side  string // "in" or "out"
	Node  string
	Node2 string // second node of a balanced port out ("" when unbalanced)
	Z     complex128
	Pos   Pos
	Attrs Attrs
	// Source is the transmitter's output impedance (port in, source=).
	Source    complex128
	HasSource bool
	// CM is a balanced load's common-mode impedance to gnd (port out, cm=).
	CM    complex128
	HasCM bool
}

// Core is a magnetic core; its meaning is read by the ratings layer.
type Core struct {
	Name  string
	Pos   Pos
	Attrs Attrs
}

// Coupling is mutual inductance between two inductors.
type Coupling struct {
	Name   string
	L1, L2 string
	K      float64
	Pos    Pos
	LPos   [2]Pos // where each inductor name is written
}

// Material is a user-defined core material statement.
type Material struct {
	Name  string
	Pos   Pos
	Attrs Attrs
}

// Directive is one `audit` statement: conditions the file asks for.
type Directive struct {
	Pos   Pos
	Attrs Attrs
	Order []string // keys in the order written
}

// Netlist is a parsed file.
type Netlist struct {
	measured   map[*Attr]*Touchstone // loaded by LoadMeasured
	File       string
	Source     []byte
	Title      string
	In, Out    *Port
	Components []*Component
	Cores      []*Core
	Couplings  []*Coupling
	Materials  []*Material
	Audit      []*Directive
	Selects    []*Select
	Nodes      []string       // non-ground nodes in order of first use
	NodePos    map[string]Pos // where each node is first named
}

// Select is one position of a switched bank: the switches it closes
// (every other switch is open) and the band it serves.
type Select struct {
	Name   string
	Closed []string
	Lo, Hi float64
	Pos    Pos
	CPos   Pos // of the closed= value
}

// SHA256 is the hex digest of the file as read.
func (n *Netlist) SHA256() string {
	h := sha256.Sum256(n.Source)
	return hex.EncodeToString(h[:])
}

// Component returns the component called name.
func (n *Netlist) Component(name string) *Component {
	for _, c := range n.Components {
		if c.Name == name {
			return c
		}
	}
	return nil
}

// Core returns the core called name.
func (n *Netlist) Core(name string) *Core {
	for _, c := range n.Cores {
		if c.Name == name {
			return c
		}
	}
	return nil
}

// Field is one whitespace-separated word of a line and the column, in
// characters from 1, where it starts.
type Field struct {
	Text string
	Col  int
}

// Fields splits a line into words with their columns. The netlist, the
// materials file and the derating profile file all read lines this way, so
// their error columns agree.
func Fields(line string) []Field {
	var toks []Field
	col := 1
	start, startCol := -1, 0
	for i, r := range line {
		if unicode.IsSpace(r) {
			if start >= 0 {
				toks = append(toks, Field{line[start:i], startCol})
				start = -1
			}
		} else if start < 0 {
			start, startCol = i, col
		}
		col++
	}
	if start >= 0 {
		toks = append(toks, Field{line[start:], startCol})
	}
	return toks
}

func stripComment(line string) string {
	if i := strings.IndexByte(line, '#'); i >= 0 {
		return line[:i]
	}
	return line
}

var namePattern = "a letter or digit, then letters, digits, _, - or ."

func validName(s string) bool {
	if s == "" {
		return false
	}
	for i, r := range s {
		if i == 0 && !unicode.IsLetter(r) && !unicode.IsDigit(r) {
			return false
		}
		if !unicode.IsLetter(r) && !unicode.IsDigit(r) && r != '_' && r != '-' && r != '.' {
			return false
		}
	}
	return true
}

type parser struct {
	file string
	nl   *Netlist
	errs ErrorList
	// first statement of each name, for duplicate messages
	names     map[string]Pos
	coreNames map[string]Pos
	matNames  map[string]Pos
	selNames  map[string]Pos
	nodeSeen  map[string]bool
	nodePos   map[string]Pos
	// port statements seen (even faulty ones) and where each names its node
	portSeen    map[string]bool
	portNodePos map[string]Pos
	// kind of every part whose name was declared, kept even when a bad
	// value left the part out, so a coupling to it raises no second error
	partKind map[string]Kind
	// parts touching each node, in file order, for the one-part check
	touches   map[string][]string
	kinds     map[string]Kind
	portNames map[string]bool // nodes named by port lines, even faulty ones
	// nodes named by kinds that join nothing (clearances), checked once
	// every connecting statement is read
	observed []observedNode
}

// observedNode is a node named by a kind that joins nothing.
type observedNode struct {
	part string
	kind Kind
	node string
	pos  Pos
}

func (p *parser) errorf(pos Pos, want, format string, args ...any) {
	p.errs = append(p.errs, &Error{Pos: pos, Msg: fmt.Sprintf(format, args...), Want: want})
}

// Parse reads a netlist. It returns every error found, as an ErrorList,
// and never panics on any input.
func Parse(file string, src []byte) (*Netlist, error) {
	p := &parser{
		file:  file,
		nl:    &Netlist{File: file, Source: src},
		names: map[string]Pos{}, coreNames: map[string]Pos{}, matNames: map[string]Pos{}, selNames: map[string]Pos{},
		nodeSeen: map[string]bool{}, nodePos: map[string]Pos{},
		portSeen: map[string]bool{}, portNodePos: map[string]Pos{},
		partKind: map[string]Kind{},
		touches:  map[string][]string{}, kinds: map[string]Kind{}, portNames: map[string]bool{},
	}
	if !utf8.Valid(src) {
		p.errorf(Pos{file, 1, 1}, "a UTF-8 text file", "file is not valid UTF-8")
		return nil, p.errs
	}
	lines := strings.Split(strings.ReplaceAll(string(SkipBOM(src)), "\r\n", "\n"), "\n")
	for i, raw := range lines {
		p.line(i+1, raw)
	}
	p.nl.NodePos = p.nodePos
	p.check()
	if len(p.errs) > 0 {
		p.errs.Sort()
		return p.nl, p.errs
	}
	return p.nl, nil
}

func (p *parser) pos(line, col int) Pos { return Pos{p.file, line, col} }

func (p *parser) line(ln int, raw string) {
	body := stripComment(raw)
	toks := Fields(body)
	if len(toks) == 0 {
		return
	}
	kw := toks[0]
	spec, ok := Keywords[kw.Text]
	if !ok {
		p.errorf(p.pos(ln, kw.Col), "one of "+keywordList(), "unknown keyword %s", Quote(kw.Text))
		return
	}
	if kw.Text == "title" {
		if p.nl.Title != "" {
			p.errorf(p.pos(ln, kw.Col), "one title per file", "second title")
		}
		p.nl.Title = strings.TrimSpace(body[strings.Index(body, "title")+len("title"):])
		return
	}
	// positional fields come first, then key=value attributes
	var fields []Field
	rest := toks[1:]
	for len(rest) > 0 && !strings.Contains(rest[0].Text, "=") {
		fields = append(fields, rest[0])
		rest = rest[1:]
	}
	if ks := SpecOf(Kind(kw.Text)); ks != nil {
		spec.Fields, _ = fieldsFor(ks, len(fields))
	}
	if kw.Text == "port" && len(fields) == 3 {
		spec.Fields = portBalanced // a balanced port out: two nodes
	}
	if len(fields) != len(spec.Fields) {
		at := kw.Col
		if len(fields) > len(spec.Fields) {
			at = fields[len(spec.Fields)].Col
		} else if len(fields) > 0 {
			at = fields[len(fields)-1].Col
		}
		p.errorf(p.pos(ln, at), kw.Text+" "+strings.Join(spec.Fields, " ")+" key=value…",
			"%s takes %d fields before its attributes, found %d", kw.Text, len(spec.Fields), len(fields))
		return
	}
	attrs, order, written := p.attrs(ln, kw.Text, spec, rest)
	if pos, ok := outsideOK(attrs); !ok {
		p.errorf(pos, "outside=error or outside=hold", "unknown outside= value")
	}
	for _, req := range spec.Required {
		if !written[req] { // a bad value is reported where it is written
			p.errorf(p.pos(ln, kw.Col), spec.Attrs[req].Help, "%s needs %s=", kw.Text, req)
		}
	}
	switch kw.Text {
	case "port":
		p.port(ln, fields, attrs)
	case "core":
		if p.declare(p.coreNames, "core", fields[0], ln) {
			p.nl.Cores = append(p.nl.Cores, &Core{Name: fields[0].Text, Pos: p.pos(ln, fields[0].Col), Attrs: attrs})
		}
	case "material":
		if p.declare(p.matNames, "material", fields[0], ln) {
			p.nl.Materials = append(p.nl.Materials, &Material{Name: fields[0].Text, Pos: p.pos(ln, fields[0].Col), Attrs: attrs})
		}
	case "coupling":
		p.coupling(ln, fields, attrs)
	case "select":
		if p.declare(p.selNames, "select position", fields[0], ln) {
			a, b := attrs["closed"], attrs["band"]
			if a != nil && b != nil {
				p.nl.Selects = append(p.nl.Selects, &Select{Name: fields[0].Text, Closed: a.Words, Lo: b.Lo, Hi: b.Hi,
					Pos: p.pos(ln, fields[0].Col), CPos: a.ValPos})
			}
		}
	case "audit":
		p.nl.Audit = append(p.nl.Audit, &Directive{Pos: p.pos(ln, kw.Col), Attrs: attrs, Order: order})
	default:
		p.component(ln, Kind(kw.Text), fields, attrs)
	}
}

func keywordList() string {
	ks := make([]string, 0, len(Keywords))
	for k := range Keywords {
		ks = append(ks, k)
	}
	sort.Strings(ks)
	return strings.Join(ks, ", ")
}

func (p *parser) declare(names map[string]Pos, what string, t Field, ln int) bool {
	if !validName(t.Text) {
		p.errorf(p.pos(ln, t.Col), namePattern, "bad %s name %s", what, Quote(t.Text))
		return false
	}
	if first, dup := names[t.Text]; dup {
		p.errorf(p.pos(ln, t.Col), "a name not used before", "%s %s is already defined at line %d", what, t.Text, first.Line)
		return false
	}
	names[t.Text] = p.pos(ln, t.Col)
	return true
}

func (p *parser) useNode(t Field, ln int) (string, bool) {
	if !validName(t.Text) {
		p.errorf(p.pos(ln, t.Col), "a node name: "+namePattern, "bad node name %s", Quote(t.Text))
		return "", false
	}
	if groundSpelling(t.Text) {
		p.errorf(p.pos(ln, t.Col), groundHint, "node %s looks like ground but is not the ground node", t.Text)
		return "", false
	}
	if t.Text != Ground && !p.nodeSeen[t.Text] {
		p.nodeSeen[t.Text] = true
		p.nodePos[t.Text] = p.pos(ln, t.Col)
		p.nl.Nodes = append(p.nl.Nodes, t.Text)
	}
	return t.Text, true
}

func (p *parser) port(ln int, f []Field, attrs Attrs) {
	side := f[0].Text
	if side != "in" && side != "out" {
		p.errorf(p.pos(ln, f[0].Col), "in (transmitter side) or out (antenna side)", "unknown port side %s", Quote(side))
		return
	}
	p.portSeen[side] = true
	pt := &Port{Side: side, Node: f[1].Text, Pos: p.pos(ln, f[0].Col), Attrs: attrs}
	if _, ok := attrs["measured"]; ok && side != "out" {
		p.errorf(attrs["measured"].Pos, "measured= on port out (the antenna)", "measured data on port in")
	}
	if f[1].Text == Ground || groundSpelling(f[1].Text) {
		p.errorf(p.pos(ln, f[1].Col), "a node other than gnd", "port %s on the ground node", side)
		return
	}
	if !validName(f[1].Text) {
		p.errorf(p.pos(ln, f[1].Col), "a node name: "+namePattern, "bad node name %s", Quote(f[1].Text))
		return
	}
	p.portNames[f[1].Text] = true
	if a, ok := attrs["z"]; ok {
		if len(a.Zs) != 1 {
			p.errorf(a.ValPos, "one impedance", "port z takes one impedance")
			return
		}
		pt.Z = a.Zs[0]
		if real(pt.Z) <= 0 {
			p.errorf(a.ValPos, "a resistive part above 0 Ω, e.g. 50 or 12.5-j180", "port impedance %s has no positive resistance", Clip(a.Raw))
			return
		}
	} else {
		return
	}
	if !p.portExtras(ln, pt, f, attrs) {
		return
	}
	if side == "in" {
		if p.nl.In != nil {
			p.errorf(pt.Pos, "one port in", "port in is already defined at line %d", p.nl.In.Pos.Line)
			return
		}
		p.nl.In = pt
		p.portNodePos[side] = p.pos(ln, f[1].Col)
	} else {
		if p.nl.Out != nil {
			p.errorf(pt.Pos, "one port out", "port out is already defined at line %d", p.nl.Out.Pos.Line)
			return
		}
		p.nl.Out = pt
		p.portNodePos[side] = p.pos(ln, f[1].Col)
	}
}

var portBalanced = []string{"out", "node", "node"}

// portExtras reads a balanced port out's second node and cm=, and port
// in's source=.
func (p *parser) portExtras(ln int, pt *Port, f []Field, attrs Attrs) bool {
	ok := true
	if len(f) == 3 {
		n2 := f[2]
		switch {
		case pt.Side != "out":
			p.errorf(p.pos(ln, n2.Col), "port in NODE z=…", "port in takes one node")
			ok = false
		case n2.Text == Ground:
			p.errorf(p.pos(ln, n2.Col), "two nodes other than gnd for a balanced port, or one node for a port to gnd", "balanced port out on the ground node")
			ok = false
		case !validName(n2.Text):
			p.errorf(p.pos(ln, n2.Col), "a node name: "+namePattern, "bad node name %q", n2.Text)
			ok = false
		case n2.Text == pt.Node:
			p.errorf(p.pos(ln, n2.Col), "two different nodes", "balanced port out has both ends on %s", n2.Text)
			ok = false
		default:
			pt.Node2 = n2.Text
		}
	}
	if a, has := attrs["source"]; has {
		switch {
		case pt.Side != "in":
			p.errorf(a.Pos, "source= on port in (the transmitter)", "source impedance on port out")
			ok = false
		case len(a.Zs) != 1:
			p.errorf(a.ValPos, "one impedance", "source takes one impedance")
			ok = false
		case real(a.Zs[0]) <= 0:
			p.errorf(a.ValPos, "a resistive part above 0 Ω, e.g. 3+j0", "source impedance %s has no positive resistance", a.Raw)
			ok = false
		default:
			pt.Source, pt.HasSource = a.Zs[0], true
		}
	}
	if a, has := attrs["cm"]; has {
		switch {
		case pt.Side != "out" || len(f) != 3:
			p.errorf(a.Pos, "cm= on a balanced port out A B", "common-mode impedance on a port that is not balanced")
			ok = false
		case len(a.Zs) != 1:
			p.errorf(a.ValPos, "one impedance", "cm takes one impedance")
			ok = false
		case real(a.Zs[0]) < 0:
			p.errorf(a.ValPos, "an impedance with a resistive part ≥ 0", "common-mode impedance %s is active", a.Raw)
			ok = false
		default:
			pt.CM, pt.HasCM = a.Zs[0], true
		}
	}
	if _, has := attrs["measured"]; has && pt.Node2 != "" {
		p.errorf(attrs["measured"].Pos, "measured= on a port to gnd", "measured data on a balanced port")
		ok = false
	}
	return ok
}

func (p *parser) coupling(ln int, f []Field, attrs Attrs) {
	if !p.declare(p.names, "part", f[0], ln) {
		return
	}
	c := &Coupling{Name: f[0].Text, L1: f[1].Text, L2: f[2].Text, Pos: p.pos(ln, f[0].Col),
		LPos: [2]Pos{p.pos(ln, f[1].Col), p.pos(ln, f[2].Col)}}
	if c.L1 == c.L2 {
		p.errorf(p.pos(ln, f[2].Col), "two different inductors", "coupling %s couples %s to itself", c.Name, c.L1)
	}
	if a, ok := attrs["k"]; ok {
		c.K = a.Num
		if !(a.Num > 0 && a.Num < 1) {
			p.errorf(a.ValPos, "0 < k < 1", "coupling coefficient k=%s is out of range", Clip(a.Raw))
		}
	}
	p.nl.Couplings = append(p.nl.Couplings, c)
	// inductor names are checked once the whole file is read
}

func (p *parser) component(ln int, kind Kind, f []Field, attrs Attrs) {
	spec := SpecOf(kind)
	okName := p.declare(p.names, "part", f[0], ln)
	if okName {
		p.partKind[f[0].Text] = kind
	}
	var nodes []string
	nodesOK := true
	var value *Field
	layout, _ := fieldsFor(spec, len(f))
	for i, name := range layout {
		switch name {
		case "node":
			if spec.Observes {
				// a clearance names nodes; it must not create them
				n, ok := f[i].Text, validName(f[i].Text)
				switch {
				case !ok:
					p.errorf(p.pos(ln, f[i].Col), "a node name: "+namePattern, "bad node name %s", Quote(f[i].Text))
				case groundSpelling(n):
					p.errorf(p.pos(ln, f[i].Col), groundHint, "node %s looks like ground but is not the ground node", n)
					ok = false
				default:
					p.observed = append(p.observed, observedNode{f[0].Text, kind, n, p.pos(ln, f[i].Col)})
				}
				for _, m := range nodes {
					if ok && m == n {
						p.errorf(p.pos(ln, f[i].Col), "two different nodes", "%s %s is connected to itself (both ends on %s)", kind, f[0].Text, n)
						ok = false
					}
				}
				nodesOK = nodesOK && ok
				nodes = append(nodes, n)
				continue
			}
			n, ok := p.useNode(f[i], ln)
			nodesOK = nodesOK && ok
			again := false
			for _, m := range nodes {
				if ok && m == n {
					p.errorf(p.pos(ln, f[i].Col), "two different nodes", "%s %s is connected to itself (both ends on %s)", kind, f[0].Text, n)
					nodesOK = false
					again = true
				}
			}
			if ok && !again {
				p.touch(n, f[0].Text, kind)
			}
			nodes = append(nodes, n)
		case "value":
			value = &f[i]
		}
	}
	if len(nodes) == 1 && nodesOK {
		// a one-node kind (supply, draw) is connected from its node to gnd
		if nodes[0] == Ground {
			p.errorf(p.pos(ln, f[1].Col), "a node other than gnd", "%s %s is on gnd (it connects its node to gnd)", kind, f[0].Text)
			nodesOK = false
		}
		nodes = append(nodes, Ground)
	}
	valueOK := true
	var v float64
	if value != nil {
		var err error
		v, err = ParseValue(value.Text, spec.Unit)
		if err != nil {
			p.errorf(p.pos(ln, value.Col), "a value such as "+spec.Example, "bad %s value: %v", kind, err)
			valueOK = false
		} else if v <= 0 {
			p.errorf(p.pos(ln, value.Col), "a value above zero, such as "+spec.Example, "%s value %s is not positive", kind, Clip(value.Text))
			valueOK = false
		} else if r, ok := valueRanges[kind]; ok && !r.Holds(v) {
			p.errorf(p.pos(ln, value.Col), "accepted range "+r.Text(), "%s value %s is outside the range a solve can trust", kind, Clip(value.Text))
			valueOK = false
		}
	}
	n := 0
	for _, k := range []string{"q", "esr", "df"} {
		if _, ok := attrs[k]; ok {
			n++
		}
	}
	if n > 1 {
		p.errorf(p.pos(ln, f[0].Col), "one of q=, esr=, df=", "%s %s gives more than one loss figure", kind, f[0].Text)
	}
	adj := p.adjust(kind, f[0].Text, v, valueOK, attrs)
	if okName && valueOK && nodesOK && len(nodes) >= 2 {
		c := &Component{
			Name: f[0].Text, Kind: kind, A: nodes[0], B: nodes[1], Nodes: nodes, Value: v, Pos: p.pos(ln, f[0].Col), Attrs: attrs, Adjust: adj,
		}
		nerr := len(p.errs)
		if spec.Check != nil {
			spec.Check(c, p.errorf)
		}
		if len(p.errs) == nerr {
			p.nl.Components = append(p.nl.Components, c)
		}
	}
}

// attrs reads key=value tokens against the keyword's table.
func (p *parser) attrs(ln int, kw string, spec Keyword, toks []Field) (Attrs, []string, map[string]bool) {
	out := Attrs{}
	written := map[string]bool{} // keys written, whether or not their values read
	var order []string
	for _, t := range toks {
		eq := strings.IndexByte(t.Text, '=')
		if eq < 0 {
			p.errorf(p.pos(ln, t.Col), "key=value", "%s after the attributes began", Quote(t.Text))
			continue
		}
		key, val := t.Text[:eq], t.Text[eq+1:]
		kpos := p.pos(ln, t.Col)
		vpos := p.pos(ln, t.Col+utf8.RuneCountInString(t.Text[:eq+1]))
		as, ok := spec.Attrs[key]
		if !ok {
			p.errorf(kpos, attrList(kw, spec), "unknown attribute %s for %s", Quote(key), kw)
			continue
		}
		if written[key] {
			p.errorf(kpos, "each attribute once", "attribute %s given twice", key)
			continue
		}
		written[key] = true
		if val == "" {
			p.errorf(vpos, as.Help, "attribute %s has no value", key)
			continue
		}
		a := &Attr{Key: key, Raw: val, Pos: kpos, ValPos: vpos}
		if kw == "audit" {
			// the stress layer reads audit settings, flags and file alike,
			// and reports every bad one of a line together; the values
			// read here serve only callers that look at a sound file
			_ = readAttr(a, as)
			out[key] = a
			order = append(order, key)
			continue
		}
		if err := readAttr(a, as); err != nil {
			p.errorf(vpos, as.Help, "bad %s=: %v", key, err)
			continue
		}
		if err := checkRange(kw, a); err != nil {
			p.errorf(vpos, err.Want, "%s", err.Msg)
			continue
		}
		out[key] = a
		order = append(order, key)
	}
	return out, order, written
}

func attrList(kw string, spec Keyword) string {
	if len(spec.Attrs) == 0 {
		return kw + " takes no attributes"
	}
	ks := make([]string, 0, len(spec.Attrs))
	for k := range spec.Attrs {
		ks = append(ks, k)
	}
	sort.Strings(ks)
	return kw + " takes " + strings.Join(ks, ", ")
}

func readNumber(s string, as AttrSpec) (float64, error) {
	if as.Gauge {
		if n, ok := parseAWG(s); ok {
			return AWGDiameter(n), nil
		}
	}
	if as.NeedUnit {
		_, rest := splitNumber(s)
		if rest == "" {
			return 0, fmt.Errorf("%s has no unit", Quote(s))
		}
	}
	v, err := ParseValue(s, as.Units...)
	if err != nil {
		return 0, err
	}
	return v, nil
}

func readAttr(a *Attr, as AttrSpec) error {
	s := a.Raw
	switch as.Type {
	case TNumber, TPositive:
		v, err := readNumber(s, as)
		if err != nil {
			return err
		}
		if as.Type == TPositive && v <= 0 {
			return fmt.Errorf("%s is not above zero", s)
		}
		a.Num = v
	case TPercent:
		if !strings.HasSuffix(s, "%") {
			return fmt.Errorf("%s needs a %% sign", Quote(s))
		}
		v, err := ParseValue(s, "%")
		if err != nil {
			return err
		}
		if v < 0 || v >= 1 {
			return fmt.Errorf("%s is outside 0%%…100%%", s)
		}
		a.Num = v
	case TInt:
		n, err := strconv.Atoi(s)
		if err != nil || n <= 0 {
			return fmt.Errorf("%s is not a whole number above zero", Quote(s))
		}
		a.Num = float64(n)
	case TPoints:
		for _, part := range strings.Split(s, ",") {
			pt := Point{}
			val, freq, hasF := strings.Cut(part, "@")
			v, err := readNumber(val, as)
			if err != nil {
				return err
			}
			if v <= 0 {
				return fmt.Errorf("%s is not above zero", val)
			}
			pt.V = v
			if hasF {
				f, err := ParseValue(freq, "Hz")
				if err != nil {
					return err
				}
				if f <= 0 {
					return fmt.Errorf("frequency %s is not above zero", freq)
				}
				pt.F = f
			}
			a.Points = append(a.Points, pt)
		}
		if len(a.Points) > 1 {
			for i, pt := range a.Points {
				if pt.F == 0 {
					return fmt.Errorf("with several points each needs @frequency")
				}
				if i > 0 && pt.F <= a.Points[i-1].F {
					return fmt.Errorf("frequencies must rise from point to point")
				}
			}
		}
		a.Num = a.Points[0].V
	case TComplex:
		for _, part := range splitComplexList(s) {
			z, err := ParseComplex(part)
			if err != nil {
				return err
			}
			a.Zs = append(a.Zs, z)
		}
		a.Num = real(a.Zs[0])
	case TWord, TWords:
		for _, w := range strings.Split(s, ",") {
			if !validName(w) {
				return fmt.Errorf("%s is not a word (%s)", Quote(w), namePattern)
			}
			a.Words = append(a.Words, w)
		}
		if as.Type == TWord && len(a.Words) != 1 {
			return fmt.Errorf("one word expected")
		}
		if len(as.Choices) > 0 {
			w := strings.ToLower(a.Words[0])
			known := false
			for _, c := range as.Choices {
				known = known || c == w
			}
			if !known {
				return fmt.Errorf("unknown %s %s", a.Key, Quote(a.Words[0]))
			}
			a.Words[0] = w
		}
	case TNumbers:
		for _, w := range strings.Split(s, ",") {
			v, err := readNumber(w, as)
			if err != nil {
				return err
			}
			if v <= 0 {
				return fmt.Errorf("%s is not above zero", w)
			}
			a.Nums = append(a.Nums, v)
		}
		a.Num = a.Nums[0]
	case TRange:
		lo, hi, ok := strings.Cut(s, ":")
		if !ok {
			hi = lo // a single frequency is a band of one point
		}
		l, err := ParseValue(lo, "Hz")
		if err != nil {
			return err
		}
		h, err := ParseValue(hi, "Hz")
		if err != nil {
			return err
		}
		if l <= 0 || h < l {
			return fmt.Errorf("range %s needs 0 < lo ≤ hi", s)
		}
		a.Lo, a.Hi = l, h
	case TText:
	}
	if math.IsNaN(a.Num) || math.IsInf(a.Num, 0) {
		return fmt.Errorf("%s is not finite", Quote(s))
	}
	return nil
}

// splitComplexList splits "12.5-j180,30+j40" on commas.
func splitComplexList(s string) []string { return strings.Split(s, ",") }

// check runs the whole-file rules once every statement is read.
func (p *parser) check() {
	nl := p.nl
	top := p.pos(1, 1)
	if nl.In == nil && !p.portSeen["in"] {
		p.errorf(top, "a line such as: port in n1 z=50", "no port in (transmitter side)")
	}
	if nl.Out == nil && !p.portSeen["out"] {
		p.errorf(top, "a line such as: port out n4 z=50", "no port out (antenna side)")
	}
	if nl.In != nil && nl.Out != nil && nl.Out.Node2 != "" && nl.In.Node == nl.Out.Node2 {
		p.errorf(nl.Out.Pos, "separate nodes for port in and port out", "port out is on the same node as port in")
	}
	if nl.In != nil && nl.Out != nil && nl.In.Node == nl.Out.Node {
		p.errorf(nl.Out.Pos, "separate nodes for port in and port out", "port out is on the same node as port in")
	}
	for _, pt := range []*Port{nl.In, nl.Out} {
		if pt != nil && !p.nodeSeen[pt.Node] {
			p.errorf(p.portNodePos[pt.Side], "a node that a part connects to", "port %s names unknown node %s", pt.Side, Quote(pt.Node))
		}
		if pt != nil && pt.Node2 != "" && !p.nodeSeen[pt.Node2] {
			p.errorf(p.portNodePos[pt.Side], "a node that a part connects to", "port %s names unknown node %q", pt.Side, pt.Node2)
		}
	}
	for _, c := range nl.Components {
		if c.Kind == Inductor {
			if a, ok := c.Attrs["core"]; ok {
				if _, known := p.coreNames[a.Words[0]]; !known {
					p.errorf(a.ValPos, "the name of a core statement", "inductor %s uses unknown core %s", c.Name, Quote(a.Words[0]))
				}
			}
		}
	}
	for _, o := range p.observed {
		if o.node != Ground && !p.nodeSeen[o.node] {
			p.errorf(o.pos, "a node of the circuit that a part connects to, or "+Ground,
				"%s %s names node %q, which no part connects to", o.kind, o.part, o.node)
		}
	}
	for _, sel := range nl.Selects {
		for _, n := range sel.Closed {
			if kind, ok := p.partKind[n]; ok && kind != Switch {
				p.errorf(sel.CPos, "the names of switch statements", "select %s closes %s %s, which is not a switch", sel.Name, kind, n)
			} else if !ok {
				p.errorf(sel.CPos, "the names of switch statements", "select %s closes unknown switch %s", sel.Name, Quote(n))
			}
		}
	}
	for _, k := range nl.Couplings {
		for i, ln := range []string{k.L1, k.L2} {
			if kind, ok := p.partKind[ln]; ok && kind != Inductor {
				p.errorf(k.LPos[i], "the name of an inductor", "coupling %s names %s %s, which is not an inductor", k.Name, kind, ln)
			} else if !ok {
				p.errorf(k.LPos[i], "the name of an inductor", "coupling %s names unknown inductor %s", k.Name, Quote(ln))
			}
		}
	}
	p.checkTouches()
	p.checkCouplings()
	if nl.In == nil || nl.Out == nil || len(p.errs) > 0 {
		return
	}
	// every node must reach ground through parts or a port impedance
	adj := map[string][]string{}
	link := func(a, b string) {
		adj[a] = append(adj[a], b)
		adj[b] = append(adj[b], a)
	}
	for _, c := range nl.Components {
		if s := SpecOf(c.Kind); s != nil && s.Observes {
			continue // joins nothing
		}
		ts := c.Terminals()
		for _, t := range ts[1:] {
			link(ts[0], t)
		}
	}
	link(nl.In.Node, Ground)
	if nl.Out.Node2 != "" {
		// a balanced load joins its two nodes; its centre reaches gnd
		// only through cm=
		link(nl.Out.Node, nl.Out.Node2)
		if nl.Out.HasCM {
			link(nl.Out.Node, Ground)
		}
	} else {
		link(nl.Out.Node, Ground)
	}
	seen := map[string]bool{Ground: true}
	stack := []string{Ground}
	for len(stack) > 0 {
		n := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		for _, m := range adj[n] {
			if !seen[m] {
				seen[m] = true
				stack = append(stack, m)
			}
		}
	}
	for _, n := range nl.Nodes {
		if !seen[n] {
			p.errorf(p.nodePos[n], "every node joined to gnd through parts or a port", "node %s has no path to ground", n)
		}
	}
}
