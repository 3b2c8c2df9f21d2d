package reports

import (
	"math"
	"sort"
	"strings"

	"rfstress/circuits"
	"rfstress/ratings"
	"rfstress/stress"
)

// The schematic is laid out once into a small model (positions in mm,
// every line and label placed) and then replayed onto a canvas: the PDF
// page and the SVG file show the same drawing. The layout is presentation
// only; every figure printed on it comes from the audit's results.
//
// Layout rule: the transmitter port sits on the left, the antenna port on
// the right, the ground rail along the bottom. Nodes are ordered left to
// right by their distance from the input (breadth first over parts and
// couplings), so a ladder comes out as the trade draws it: series parts
// along the top line, shunt parts hanging down to the ground rail. Series
// parts that cannot sit on the top line (a part in parallel with another,
// or one that bridges nodes further apart) are lifted onto lanes above it,
// each lane holding parts whose spans do not overlap, which keeps
// crossings few for any topology.

// spt is a point of the schematic, mm, y downwards.
type spt struct{ x, y float64 }

// slabel is one line of text; y is the baseline.
type slabel struct {
	x, y   float64
	s      string
	size   float64 // pt
	bold   bool
	col    rgb
	anchor byte // 'L', 'C' or 'R'
}

// ssymbol is one part placed between its two terminals a and b (a is
// left of or above b).
type ssymbol struct {
	name     string
	kind     circuits.Kind
	a, b     spt
	col      rgb
	core     bool
	variable bool // range= or steps=: an adjustable part
	dot      int  // coupled coil: 1 dot at the a end, 2 at the b end
	verdict  ratings.Verdict
}

// slink is a coupling between two coils: a dashed path and its label.
type slink struct {
	path []spt
}

// sterm is a port terminal (an open circle).
type sterm struct{ at spt }

// Schematic is a laid-out circuit drawing.
type Schematic struct {
	W, H    float64 // extent, mm, after the drawing is moved to start at (0, 0)
	symbols []ssymbol
	wires   [][2]spt
	joints  []spt
	terms   []sterm
	grounds []spt
	links   []slink
	labels  []slabel
}

// measureFunc is the width in mm of s in the report font.
type measureFunc func(s string, size float64, bold bool) float64

// Layout constants, mm.
const (
	schSymLen   = 9.0  // a symbol's body along its axis
	schShuntLen = 30.0 // top line to ground rail
	schLane     = 15.0 // distance between lanes above the top line
	schPortLead = 7.0  // port terminal to the first node
	schMinGap   = 16.0 // least width for a series part
	schNameSize = 6.5  // pt
	schStrSize  = 6.0  // pt
	schLineH    = 2.7  // mm between label lines
)

type schPart struct {
	name     string
	kind     circuits.Kind
	a, b     string
	core     bool
	variable bool
	coupled  bool
	line1    string // name and value
	line2    string // binding stress
	line3    string // share of its derated limit, or why none
	col      rgb
	verdict  ratings.Verdict
	below    *schPart // a branch to ground: the part under this one
	from     string   // and the node the branch hangs from
	inChain  bool     // drawn as the lower part of a branch
}

// partLabel gives the label lines of a part from its audit result:
// "C3 470 pF", "2.66 kV pk", "127 %" (of its derated limit).
func partLabel(pr *stress.PartResult) (string, string, string) {
	l1 := pr.Name
	if pr.Value != 0 {
		l1 += " " + ValueText(pr.Kind, pr.Value)
	}
	st := bindingStress(pr)
	if st == nil {
		if v, ok := pr.Stress[ratings.Vpk]; ok {
			return l1, FormatQ(ratings.Vpk, v.Value) + " pk", "no rating"
		}
		return l1, "", "no rating"
	}
	v := FormatQ(st.Quantity, st.Value)
	switch st.Quantity {
	case ratings.Vpk, ratings.Bpk:
		v += " pk"
	case ratings.Vrms, ratings.Irms:
		v += " rms"
	}
	if st.Limit.Abs <= 0 {
		return l1, v, "unrated"
	}
	return l1, v, pct(st.Util) + " " + strings.ToUpper(st.Verdict.String())
}

// partLabels places a part's label lines from baseline y down.
func partLabels(p *schPart, x, y float64, anchor byte) []slabel {
	out := []slabel{{x: x, y: y, s: p.line1, size: schNameSize, bold: true, col: colInk, anchor: anchor}}
	if p.line2 != "" {
		out = append(out, slabel{x: x, y: y + schLineH, s: p.line2, size: schStrSize, col: p.col, anchor: anchor})
	}
	if p.line3 != "" {
		out = append(out, slabel{x: x, y: y + 2*schLineH, s: p.line3, size: schStrSize, bold: true, col: p.col, anchor: anchor})
	}
	return out
}

// bindingStress is the part's judged stress with the worst verdict, and
// among those the highest use of its derated limit.
func bindingStress(pr *stress.PartResult) *stress.Stress {
	var best *stress.Stress
	for _, q := range stress.Quantities {
		st, ok := pr.Stress[q]
		if !ok || st.Limit.Quantity == "" {
			continue
		}
		if best == nil || st.Verdict > best.Verdict || st.Verdict == best.Verdict && st.Util > best.Util {
			best = st
		}
	}
	return best
}

// LayoutSchematic lays out a section's circuit with its stresses.
func LayoutSchematic(s *stress.Section, measure measureFunc) *Schematic {
	sc := &Schematic{}
	nl := s.Netlist
	if nl == nil {
		return sc
	}
	results := map[string]*stress.PartResult{}
	for _, pr := range s.Parts {
		results[pr.Name] = pr
	}
	coupledTo := map[string][]string{}
	for _, k := range nl.Couplings {
		coupledTo[k.L1] = append(coupledTo[k.L1], k.L2)
		coupledTo[k.L2] = append(coupledTo[k.L2], k.L1)
	}
	var parts []*schPart
	byName := map[string]*schPart{}
	for _, c := range nl.Components {
		if c.A == circuits.Ground && c.B == circuits.Ground {
			continue // shorted to itself: nothing to draw
		}
		if k := circuits.SpecOf(c.Kind); k != nil && k.Observes {
			continue // a clearance joins nothing: it is in the part table, not the circuit
		}
		a, b := c.A, c.B
		if t := c.Terminals(); len(t) >= 4 {
			// a balanced two-port: drawn from its first end to its second
			a, b = t[0], t[len(t)/2]
		}
		sp := &schPart{name: c.Name, kind: c.Kind, a: a, b: b, col: colMuted, coupled: len(coupledTo[c.Name]) > 0}
		_, sp.core = c.Attrs["core"]
		_, rng := c.Attrs["range"]
		_, stp := c.Attrs["steps"]
		sp.variable = rng || stp
		sp.line1 = c.Name
		if pr := results[c.Name]; pr != nil {
			sp.line1, sp.line2, sp.line3 = partLabel(pr)
			sp.col = verdictColor(pr.Verdict)
			sp.verdict = pr.Verdict
		}
		parts = append(parts, sp)
		byName[c.Name] = sp
	}

	// --- a branch to ground through one series part and one shunt part (a
	// series-resonant trap) hangs from its node like a single shunt part
	touch := map[string][]*schPart{}
	for _, p := range parts {
		if p.a != circuits.Ground {
			touch[p.a] = append(touch[p.a], p)
		}
		if p.b != circuits.Ground && p.b != p.a {
			touch[p.b] = append(touch[p.b], p)
		}
	}
	folded := map[string]bool{}
	var nodes []string
	for _, n := range nl.Nodes {
		isPort := nl.In != nil && nl.In.Node == n || nl.Out != nil && nl.Out.Node == n
		if ps := touch[n]; !isPort && len(ps) == 2 {
			ser, sh := ps[0], ps[1]
			if ser.a == circuits.Ground || ser.b == circuits.Ground {
				ser, sh = sh, ser
			}
			other := ser.a
			if other == n {
				other = ser.b
			}
			if (sh.a == circuits.Ground || sh.b == circuits.Ground) && ser.a != circuits.Ground && ser.b != circuits.Ground &&
				other != n && !folded[other] && ser.below == nil && !sh.inChain {
				ser.below, ser.from, sh.inChain = sh, other, true
				folded[n] = true
				continue
			}
		}
		nodes = append(nodes, n)
	}

	// --- node order: breadth first from the input over parts and couplings
	nodeIdx := map[string]int{}
	for i, n := range nodes {
		nodeIdx[n] = i
	}
	adj := make([][]int, len(nodes))
	link := func(a, b string) {
		ia, oka := nodeIdx[a]
		ib, okb := nodeIdx[b]
		if oka && okb && ia != ib {
			adj[ia] = append(adj[ia], ib)
			adj[ib] = append(adj[ib], ia)
		}
	}
	for _, p := range parts {
		link(p.a, p.b)
	}
	hot := func(p *schPart) string { // a coil's non-ground end
		if p.a == circuits.Ground {
			return p.b
		}
		return p.a
	}
	for _, k := range nl.Couplings {
		if p1, p2 := byName[k.L1], byName[k.L2]; p1 != nil && p2 != nil {
			link(hot(p1), hot(p2))
		}
	}
	layer := make([]int, len(nodes))
	for i := range layer {
		layer[i] = -1
	}
	next := 0
	bfs := func(start int) {
		layer[start] = next
		q := []int{start}
		for len(q) > 0 {
			n := q[0]
			q = q[1:]
			for _, m := range adj[n] {
				if layer[m] < 0 {
					layer[m] = layer[n] + 1
					if layer[m] >= next {
						next = layer[m] + 1
					}
					q = append(q, m)
				}
			}
		}
		if next <= layer[start] {
			next = layer[start] + 1
		}
	}
	if nl.In != nil {
		if i, ok := nodeIdx[nl.In.Node]; ok {
			bfs(i)
		}
	}
	for i := range nodes {
		if layer[i] < 0 {
			bfs(i)
		}
	}
	outNode := ""
	if nl.Out != nil {
		outNode = nl.Out.Node
	}
	order := make([]int, len(nodes))
	for i := range order {
		order[i] = i
	}
	sort.SliceStable(order, func(i, j int) bool {
		a, b := order[i], order[j]
		if layer[a] != layer[b] {
			return layer[a] < layer[b]
		}
		return nodes[a] != outNode && nodes[b] == outNode
	})
	col := map[string]int{}
	for c, i := range order {
		col[nodes[i]] = c
	}
	nCol := len(order)
	if nCol == 0 {
		return sc
	}

	// --- shunts per column; coils coupled leftwards first, rightwards last
	shunts := make([][]*schPart, nCol)
	var series []*schPart
	for _, p := range parts {
		switch {
		case p.inChain:
		case p.below != nil:
			shunts[col[p.from]] = append(shunts[col[p.from]], p)
		case p.b == circuits.Ground:
			shunts[col[p.a]] = append(shunts[col[p.a]], p)
		case p.a == circuits.Ground:
			shunts[col[p.b]] = append(shunts[col[p.b]], p)
		default:
			series = append(series, p)
		}
	}
	side := func(p *schPart, c int) int {
		for _, o := range coupledTo[p.name] {
			if op := byName[o]; op != nil {
				oc := col[hot(op)]
				if op.a != circuits.Ground && op.b != circuits.Ground {
					oc = col[op.a]
				}
				if oc < c {
					return 0
				}
				if oc > c {
					return 2
				}
			}
		}
		return 1
	}
	for c := range shunts {
		sort.SliceStable(shunts[c], func(i, j int) bool { return side(shunts[c][i], c) < side(shunts[c][j], c) })
	}

	// --- series parts: the top line between neighbouring columns, else a lane
	type span struct {
		p          *schPart
		c1, c2     int
		lane       int
		aLeft      bool // the part's a terminal is its left end
		x1, x2, yl float64
	}
	var spans []*span
	mainUsed := make([]bool, nCol)
	for _, p := range series {
		c1, c2 := col[p.a], col[p.b]
		sp := &span{p: p, c1: c1, c2: c2, aLeft: true, lane: -1}
		if c2 < c1 {
			sp.c1, sp.c2, sp.aLeft = c2, c1, false
		}
		if sp.c2 == sp.c1+1 && !mainUsed[sp.c1] {
			mainUsed[sp.c1] = true
			sp.lane = 0
		}
		spans = append(spans, sp)
	}
	var labelW func(p *schPart) float64
	labelW = func(p *schPart) float64 {
		if p.below != nil {
			q := *p
			q.below = nil
			return math.Max(labelW(&q), labelW(p.below))
		}
		return math.Max(measure(p.line1, schNameSize, true), math.Max(measure(p.line2, schStrSize, false), measure(p.line3, schStrSize, true)))
	}
	// gap widths between columns: room for the widest label of the parts
	// that span exactly that gap
	gap := make([]float64, nCol)
	for c := 0; c+1 < nCol; c++ {
		gap[c] = 6
		if mainUsed[c] {
			gap[c] = schMinGap
		}
	}
	for _, sp := range spans {
		if sp.c2 == sp.c1+1 {
			gap[sp.c1] = math.Max(gap[sp.c1], math.Max(schMinGap, labelW(sp.p)+4))
		}
	}
	// a coupled pair of shunt coils across a gap needs room for its mark
	for c := 0; c+1 < nCol; c++ {
		if len(shunts[c]) > 0 && len(shunts[c+1]) > 0 && !mainUsed[c] {
			gap[c] = math.Max(gap[c], 8)
		}
	}

	// --- x positions: each column's bus holds its shunts side by side
	xStart := make([]float64, nCol)
	xEnd := make([]float64, nCol)
	shuntX := map[*schPart]float64{}
	x := schPortLead
	for c := 0; c < nCol; c++ {
		xStart[c] = x
		for i, p := range shunts[c] {
			if i > 0 {
				x += 3
			}
			shuntX[p] = x
			x += 2.5 + labelW(p) + 1.5
		}
		if len(shunts[c]) > 0 {
			x -= 2.5 + labelW(shunts[c][len(shunts[c])-1]) + 1.5
			// the last shunt's label hangs to the right of the bus
		}
		xEnd[c] = x
		if c+1 < nCol {
			lastLabel := 0.0
			if n := len(shunts[c]); n > 0 {
				lastLabel = 2.5 + labelW(shunts[c][n-1]) + 1.5
			}
			x += math.Max(gap[c], lastLabel+3)
		}
	}
	width := x + schPortLead
	if n := len(shunts[nCol-1]); nCol > 0 && n > 0 {
		width = math.Max(width, xEnd[nCol-1]+2.5+labelW(shunts[nCol-1][n-1])+2)
	}
	// parts between the same node and itself, or bridges: lanes above
	type iv struct{ lo, hi float64 }
	var lanes [][]iv
	for _, sp := range spans {
		sp.x1, sp.x2 = xEnd[sp.c1], xStart[sp.c2]
		if sp.c1 == sp.c2 {
			sp.x1, sp.x2 = xStart[sp.c1]-schMinGap/2, xStart[sp.c1]+schMinGap/2
		}
		if sp.lane == 0 {
			continue
		}
		w := labelW(sp.p) + 4
		lo, hi := sp.x1, sp.x2
		if mid := (lo + hi) / 2; hi-lo < w {
			lo, hi = mid-w/2, mid+w/2
		}
		for l := 0; ; l++ {
			if l == len(lanes) {
				lanes = append(lanes, nil)
			}
			free := true
			for _, o := range lanes[l] {
				if lo < o.hi+1 && o.lo < hi+1 {
					free = false
					break
				}
			}
			if free {
				lanes[l] = append(lanes[l], iv{lo, hi})
				sp.lane = l + 1
				break
			}
		}
	}

	// --- emit: top line, series parts, shunts, ports, ground rail
	y0 := 0.0
	yG := schShuntLen
	place := func(p *schPart, a, b spt, aIsA bool) {
		sym := ssymbol{name: p.name, kind: p.kind, a: a, b: b, col: p.col, core: p.core, variable: p.variable, verdict: p.verdict}
		if p.coupled {
			sym.dot = 1
			if !aIsA {
				sym.dot = 2
			}
		}
		sc.symbols = append(sc.symbols, sym)
	}
	for c := 0; c < nCol; c++ {
		if xEnd[c] > xStart[c] {
			sc.wires = append(sc.wires, [2]spt{{xStart[c], y0}, {xEnd[c], y0}})
		}
	}
	conn := make([]int, nCol) // connections at each bus, for junction dots
	symCentre := map[string]spt{}
	spanOf := map[string][2]float64{} // series parts: the x extent of their gap
	// clearOf is the x at which a raised series part and its label sit:
	// the middle of its span, unless a riser of a part in a higher lane
	// would run through the symbol or the label there; then the middle of
	// the widest stretch of the span between such risers, if it fits.
	clearOf := func(sp *span, w float64) float64 {
		mid := (sp.x1 + sp.x2) / 2
		if sp.lane == 0 {
			return mid
		}
		w = math.Max(w, schSymLen+3)
		xs := []float64{sp.x1, sp.x2}
		hit := false
		for _, o := range spans {
			if o == sp || o.lane <= sp.lane {
				continue
			}
			for _, x := range []float64{o.x1, o.x2} {
				if x > sp.x1 && x < sp.x2 {
					xs = append(xs, x)
					if math.Abs(x-mid) < w/2+0.5 {
						hit = true
					}
				}
			}
		}
		if !hit {
			return mid
		}
		sort.Float64s(xs)
		best, at := 0.0, mid
		for i := 1; i < len(xs); i++ {
			if g := xs[i] - xs[i-1]; g > best {
				best, at = g, (xs[i]+xs[i-1])/2
			}
		}
		if best < w+1 {
			return mid
		}
		return at
	}
	for _, sp := range spans {
		yl := y0 - float64(sp.lane)*schLane
		sp.yl = yl
		mid := clearOf(sp, labelW(sp.p)+2)
		a, b := spt{mid - schSymLen/2 - 1.5, yl}, spt{mid + schSymLen/2 + 1.5, yl}
		if sp.lane > 0 {
			sc.wires = append(sc.wires, [2]spt{{sp.x1, y0}, {sp.x1, yl}}, [2]spt{{sp.x2, y0}, {sp.x2, yl}})
			sc.joints = append(sc.joints, spt{sp.x1, y0}, spt{sp.x2, y0})
		}
		sc.wires = append(sc.wires, [2]spt{{sp.x1, yl}, a}, [2]spt{b, {sp.x2, yl}})
		place(sp.p, a, b, sp.aLeft)
		symCentre[sp.p.name] = spt{mid, yl}
		spanOf[sp.p.name] = [2]float64{sp.x1, sp.x2}
		conn[sp.c1]++
		conn[sp.c2]++
		sc.labels = append(sc.labels, partLabels(sp.p, mid, yl-4.2-2*schLineH, 'C')...)
	}
	for c := 0; c < nCol; c++ {
		for _, p := range shunts[c] {
			x := shuntX[p]
			conn[c]++
			sc.joints = append(sc.joints, spt{x, yG})
			chain := []*schPart{p}
			if p.below != nil {
				chain = append(chain, p.below)
			}
			seg := (yG - y0) / float64(len(chain))
			top := y0
			for i, q := range chain {
				mid := top + seg/2
				a, b := spt{x, mid - schSymLen/2 - 1.5}, spt{x, mid + schSymLen/2 + 1.5}
				sc.wires = append(sc.wires, [2]spt{{x, top}, a}, [2]spt{b, {x, top + seg}})
				aTop := q.b == circuits.Ground // a plain shunt: a on the node
				if i == 0 && p.below != nil {
					aTop = q.a == p.from
				} else if i == 1 {
					aTop = q.a != circuits.Ground
				}
				place(q, a, b, aTop)
				symCentre[q.name] = spt{x, mid}
				sc.labels = append(sc.labels, partLabels(q, x+3, mid-3.2, 'L')...)
				top += seg
			}
		}
	}
	// junction dots where a bus meets three or more wires
	for c := 0; c < nCol; c++ {
		n := conn[c]
		if nl.In != nil && col[nl.In.Node] == c || nl.Out != nil && col[nl.Out.Node] == c {
			n++
		}
		if n >= 3 {
			for _, p := range shunts[c] {
				if shuntX[p] > xStart[c] && shuntX[p] < xEnd[c] || n >= 3 && len(shunts[c]) > 0 {
					sc.joints = append(sc.joints, spt{shuntX[p], y0})
				}
			}
		}
	}
	// ports: terminals at both ends of the top line and the ground rail
	portLabel := func(pt *circuits.Port, x float64, anchor byte, lx float64) {
		if pt == nil {
			return
		}
		c, ok := col[pt.Node]
		if !ok {
			return
		}
		bx := xStart[c] // input: to the bus's left end
		if anchor == 'L' {
			bx = xEnd[c] // output: from the bus's right end
		}
		sc.wires = append(sc.wires, [2]spt{{math.Min(x, bx), y0}, {math.Max(x, bx), y0}})
		sc.terms = append(sc.terms, sterm{spt{x, y0}}, sterm{spt{x, yG}})
		word := "transmitter"
		if pt.Side == "out" {
			word = "antenna"
		}
		sc.labels = append(sc.labels,
			slabel{x: lx, y: (y0+yG)/2 - 1, s: pt.Side, size: schNameSize, bold: true, col: colInk, anchor: anchor},
			slabel{x: lx, y: (y0+yG)/2 - 1 + schLineH, s: word, size: schStrSize, col: colMuted, anchor: anchor},
			slabel{x: lx, y: (y0+yG)/2 - 1 + 2*schLineH, s: circuits.FormatComplex(pt.Z), size: schStrSize, col: colMuted, anchor: anchor})
	}
	xIn, xOut := 0.0, width
	portLabel(nl.In, xIn, 'R', xIn-2)
	portLabel(nl.Out, xOut, 'L', xOut+2)
	sc.wires = append(sc.wires, [2]spt{{xIn, yG}, {xOut, yG}})
	// the earth mark: in the middle of the widest stretch of rail that no
	// shunt part meets, so it never sits on a junction
	xs := []float64{xIn, xOut}
	for _, x := range shuntX {
		xs = append(xs, x)
	}
	sort.Float64s(xs)
	gx, best := (xIn+xOut)/2, -1.0
	for i := 1; i < len(xs); i++ {
		if d := xs[i] - xs[i-1]; d > best+1e-9 {
			gx, best = (xs[i]+xs[i-1])/2, d
		}
	}
	sc.grounds = append(sc.grounds, spt{gx, yG})
	// couplings: a dashed path between the two coils, labelled
	var brackets [][3]float64
	for _, k := range nl.Couplings {
		c1, ok1 := symCentre[k.L1]
		c2, ok2 := symCentre[k.L2]
		if !ok1 || !ok2 {
			continue
		}
		if c2.x < c1.x {
			c1, c2 = c2, c1
		}
		ya, yb := c1.y+5.5, c2.y+5.5
		var path []spt
		if c1.y == c2.y && math.Abs(c2.x-c1.x) < 30 && c1.y > y0 {
			// neighbouring shunt coils: a short link between their bodies
			path = []spt{{c1.x + 1.8, c1.y + 4.6}, {c2.x - 1.8, c2.y + 4.6}}
			ya = c1.y + 4.6
		} else if c1.y <= y0 && c2.y <= y0 {
			// series coils: a bracket over their labels
			yl := math.Min(c1.y, c2.y) - 4.2 - 2*schLineH - 4
			l := 0
			for _, o := range brackets {
				if c1.x <= o[1]+2 && o[0] <= c2.x+2 && int(o[2]) >= l {
					l = int(o[2]) + 1
				}
			}
			brackets = append(brackets, [3]float64{c1.x, c2.x, float64(l)})
			yl -= 4.5 * float64(l)
			path = []spt{{c1.x, yl + 1.2}, {c1.x, yl}, {c2.x, yl}, {c2.x, yl + 1.2}}
			ya = yl - 3.6
		} else {
			// a series coil and a shunt coil: leave the series coil sideways,
			// drop at the edge of its gap (clear of the shunt labels beside
			// it), then run under to the shunt coil
			yl := math.Max(ya, yb)
			ser, sh := c1, c2
			name := k.L1
			if c1.y > y0 {
				ser, sh, name = c2, c1, k.L2
			}
			if _, ok := spanOf[name]; !ok {
				name = k.L2
			}
			xd := ser.x
			if sp, ok := spanOf[name]; ok {
				xd = sp[1] - 1.5
				if sh.x < ser.x {
					xd = sp[0] + 1.5
				}
			}
			path = []spt{{ser.x, ser.y + 2.5}, {xd, ser.y + 2.5}, {xd, yl}, {sh.x, yl}, {sh.x, sh.y + 4.5}}
			ya = yl
			c1, c2 = spt{math.Min(xd, sh.x), 0}, spt{math.Max(xd, sh.x), 0}
		}
		sc.links = append(sc.links, slink{path: path})
		kl := slabel{x: (c1.x + c2.x) / 2, y: ya + 2.6, s: k.Name + " k " + num(k.K, 3),
			size: schStrSize - 0.5, col: colMuted, anchor: 'C'}
		// centred under the path, else flush with either end: the first
		// place no wire runs through
		for _, alt := range []slabel{kl, {x: math.Max(c1.x, c2.x) - 1, anchor: 'R'}, {x: math.Min(c1.x, c2.x) + 1, anchor: 'L'}} {
			try := kl
			try.x, try.anchor = alt.x, alt.anchor
			if !wireThrough(sc.wires, try.box(measure)) {
				kl = try
				break
			}
		}
		sc.labels = append(sc.labels, kl)
	}
	sc.normalise(measure)
	return sc
}

// normalise moves the drawing so its extent, labels included, starts at
// (0, 0), and records that extent.
func (sc *Schematic) normalise(measure measureFunc) {
	lo, hi := spt{math.Inf(1), math.Inf(1)}, spt{math.Inf(-1), math.Inf(-1)}
	grow := func(p spt) {
		lo.x, lo.y = math.Min(lo.x, p.x), math.Min(lo.y, p.y)
		hi.x, hi.y = math.Max(hi.x, p.x), math.Max(hi.y, p.y)
	}
	for _, w := range sc.wires {
		grow(w[0])
		grow(w[1])
	}
	for _, s := range sc.symbols {
		grow(spt{s.a.x - 3, s.a.y - 3})
		grow(spt{s.b.x + 3, s.b.y + 3})
	}
	for _, g := range sc.grounds {
		grow(spt{g.x, g.y + 5})
	}
	for _, l := range sc.labels {
		bb := l.box(measure)
		grow(spt{bb[0], bb[1]})
		grow(spt{bb[2], bb[3]})
	}
	if math.IsInf(lo.x, 0) {
		return
	}
	d := spt{-lo.x + 1, -lo.y + 1}
	mv := func(p *spt) { p.x += d.x; p.y += d.y }
	for i := range sc.wires {
		mv(&sc.wires[i][0])
		mv(&sc.wires[i][1])
	}
	for i := range sc.symbols {
		mv(&sc.symbols[i].a)
		mv(&sc.symbols[i].b)
	}
	for i := range sc.joints {
		mv(&sc.joints[i])
	}
	for i := range sc.terms {
		mv(&sc.terms[i].at)
	}
	for i := range sc.grounds {
		mv(&sc.grounds[i])
	}
	for i := range sc.links {
		for j := range sc.links[i].path {
			mv(&sc.links[i].path[j])
		}
	}
	for i := range sc.labels {
		sc.labels[i].x += d.x
		sc.labels[i].y += d.y
	}
	sc.W, sc.H = hi.x-lo.x+2, hi.y-lo.y+2
}

// box is a label's extent [x0 y0 x1 y1] in mm.
func (l slabel) box(measure measureFunc) [4]float64 {
	w := measure(l.s, l.size, l.bold)
	x0 := l.x
	switch l.anchor {
	case 'C':
		x0 -= w / 2
	case 'R':
		x0 -= w
	}
	h := l.size * 0.3528
	return [4]float64{x0, l.y - h*0.8, x0 + w, l.y + h*0.25}
}

// Labels lists the schematic's texts, for tests and for readers of the SVG.
func (sc *Schematic) Labels() []string {
	var out []string
	for _, l := range sc.labels {
		out = append(out, l.s)
	}
	return out
}

// wireThrough reports whether a vertical wire runs through a box
// [x0 y0 x1 y1] (0.2 mm in from its edges: a stroke's half width).
func wireThrough(wires [][2]spt, bb [4]float64) bool {
	for _, w := range wires {
		a, b := w[0], w[1]
		if a.x != b.x {
			continue
		}
		if a.x > bb[0]+0.2 && a.x < bb[2]-0.2 && math.Min(a.y, b.y) < bb[3]-0.2 && math.Max(a.y, b.y) > bb[1]+0.2 {
			return true
		}
	}
	return false
}
