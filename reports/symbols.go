package reports

import (
	"math"

	"rfstress/circuits"
)

// canvas is what a schematic is drawn on: the PDF page or an SVG file.
// Coordinates are mm, y downwards.
type canvas interface {
	stroke(c rgb, width float64)
	dash(on bool)
	line(a, b spt)
	poly(pts []spt, closed, filled bool)
	circle(c spt, r float64, filled bool)
	text(l slabel)
}

// frame maps a symbol's own coordinates onto the page: u runs along the
// symbol from its a terminal to its b terminal, v across it (for a
// horizontal symbol, v > 0 is upwards on the page).
type frame struct {
	a      spt
	du, dv spt
	length float64
}

func newFrame(s ssymbol) frame {
	dx, dy := s.b.x-s.a.x, s.b.y-s.a.y
	l := math.Hypot(dx, dy)
	if l == 0 {
		l = 1
	}
	du := spt{dx / l, dy / l}
	return frame{a: s.a, du: du, dv: spt{du.y, -du.x}, length: l}
}

// at is the page point of (u, v).
func (f frame) at(u, v float64) spt {
	return spt{f.a.x + u*f.du.x + v*f.dv.x, f.a.y + u*f.du.y + v*f.dv.y}
}

// body gives the start and end of the symbol's body along u, centred.
func (f frame) body(n float64) (float64, float64) {
	return (f.length - n) / 2, (f.length + n) / 2
}

// leads draws the wires from both terminals to a body n long.
func (f frame) leads(cv canvas, n float64) (float64, float64) {
	u0, u1 := f.body(n)
	cv.line(f.at(0, 0), f.at(u0, 0))
	cv.line(f.at(u1, 0), f.at(f.length, 0))
	return u0, u1
}

// symbolDrawer draws one kind of part between its terminals. A new kind of
// element adds one drawer to symbolDrawers; kinds without one are drawn
// as a plain box with their kind's initial.
type symbolDrawer func(cv canvas, f frame, s ssymbol)

var symbolDrawers = map[circuits.Kind]symbolDrawer{
	circuits.Capacitor: drawCapacitor,
	circuits.Inductor:  drawInductor,
	circuits.Resistor:  drawResistor,
	circuits.Block:     drawBlock,
	circuits.Line:      drawLine,
	circuits.Connector: drawConnector,
}

const symW = 0.35 // symbol stroke, mm

// drawSymbol draws a placed part in its verdict's colour.
func drawSymbol(cv canvas, s ssymbol) {
	f := newFrame(s)
	cv.stroke(s.col, symW)
	d, ok := symbolDrawers[s.kind]
	if !ok {
		d = drawBox
	}
	d(cv, f, s)
	if s.variable {
		// adjustable: an arrow slanting through the body (IEC 60617-2)
		u0, u1 := f.body(schSymLen)
		a, b := f.at(u0+0.5, -3), f.at(u1-0.5, 3.2)
		cv.line(a, b)
		dx, dy := b.x-a.x, b.y-a.y
		l := math.Hypot(dx, dy)
		ux, uy := dx/l, dy/l
		h := 1.2
		cv.poly([]spt{b, {b.x - h*ux + h*0.45*uy, b.y - h*uy - h*0.45*ux}, {b.x - h*ux - h*0.45*uy, b.y - h*uy + h*0.45*ux}}, true, true)
	}
	if s.dot != 0 {
		u0, u1 := f.body(schSymLen)
		u := u0 + 0.6
		if s.dot == 2 {
			u = u1 - 0.6
		}
		cv.circle(f.at(u, -1.9), 0.55, true)
	}
}

// drawCapacitor: two parallel plates (IEC 60617-4, IEEE 315 fixed capacitor).
func drawCapacitor(cv canvas, f frame, _ ssymbol) {
	const gap, plate = 1.5, 5.0
	u0, u1 := f.leads(cv, gap)
	cv.stroke(currentStroke(cv), 0.6)
	cv.line(f.at(u0, -plate/2), f.at(u0, plate/2))
	cv.line(f.at(u1, -plate/2), f.at(u1, plate/2))
}

// drawInductor: four half-loops (IEC 60617-4); a magnetic core adds a line
// along the winding.
func drawInductor(cv canvas, f frame, s ssymbol) {
	const loops = 4
	n := schSymLen * 0.85
	u0, _ := f.leads(cv, n)
	r := n / loops / 2
	var pts []spt
	for i := 0; i < loops; i++ {
		c := u0 + r + 2*r*float64(i)
		for k := 0; k <= 12; k++ {
			a := math.Pi - math.Pi*float64(k)/12
			pts = append(pts, f.at(c+r*math.Cos(a), r*math.Sin(a)))
		}
	}
	cv.poly(pts, false, false)
	if s.core {
		cv.line(f.at(u0, r+0.9), f.at(u0+n, r+0.9))
	}
}

// drawResistor: a rectangle (IEC 60617-4).
func drawResistor(cv canvas, f frame, _ ssymbol) {
	const n, h = 7.0, 2.4
	u0, u1 := f.leads(cv, n)
	cv.poly([]spt{f.at(u0, -h/2), f.at(u1, -h/2), f.at(u1, h/2), f.at(u0, h/2)}, true, false)
}

// drawBlock: a measured two-port, a box with both ports' common terminal
// to ground under it (IEC 60617-2 general two-port with earth).
func drawBlock(cv canvas, f frame, _ ssymbol) {
	const n, h = 8.0, 5.0
	u0, u1 := f.leads(cv, n)
	cv.poly([]spt{f.at(u0, -h/2), f.at(u1, -h/2), f.at(u1, h/2), f.at(u0, h/2)}, true, false)
	c := f.at((u0+u1)/2, 0)
	cv.text(slabel{x: c.x, y: c.y + 1, s: "S", size: 7, bold: true, col: currentStroke(cv), anchor: 'C'})
	g := f.at((u0+u1)/2, -h/2)
	drawGround(cv, g)
}

// drawLine: a transmission line as a screened conductor, the screen drawn
// as a tube with its two ends (common practice for coaxial line).
func drawLine(cv canvas, f frame, _ ssymbol) {
	const n, h = 9.0, 1.6
	u0, u1 := f.body(n)
	cv.line(f.at(0, 0), f.at(f.length, 0))
	cv.line(f.at(u0, h), f.at(u1, h))
	cv.line(f.at(u0, -h), f.at(u1, -h))
	for _, u := range []float64{u0, u1} {
		var pts []spt
		for k := 0; k <= 16; k++ {
			a := 2 * math.Pi * float64(k) / 16
			pts = append(pts, f.at(u+0.6*math.Cos(a), h*math.Sin(a)))
		}
		cv.poly(pts, false, false)
	}
}

// drawConnector: a plug in its socket (IEC 60617-3: a pin meeting a
// socket's arc).
func drawConnector(cv canvas, f frame, _ ssymbol) {
	const n = 5.0
	u0, u1 := f.body(n)
	cv.line(f.at(0, 0), f.at(u0+2.2, 0))
	cv.line(f.at(u0+2.2, 0.9), f.at(u0+2.2, -0.9))
	var arc []spt
	for k := 0; k <= 12; k++ {
		a := math.Pi/2 + math.Pi*float64(k)/12
		arc = append(arc, f.at(u1+1.6*math.Cos(a)-0.4, 1.6*math.Sin(a)))
	}
	cv.poly(arc, false, false)
	cv.line(f.at(u1-0.4, 0), f.at(f.length, 0))
}

// drawBox is the general element: a rectangle with a cross-line, for kinds
// that have no drawer yet.
func drawBox(cv canvas, f frame, _ ssymbol) {
	const n, h = 7.0, 4.0
	u0, u1 := f.leads(cv, n)
	cv.poly([]spt{f.at(u0, -h/2), f.at(u1, -h/2), f.at(u1, h/2), f.at(u0, h/2)}, true, false)
	cv.line(f.at(u0, -h/2), f.at(u1, h/2))
}

// currentStroke lets a drawer thicken a line in the symbol's own colour.
func currentStroke(cv canvas) rgb {
	if s, ok := cv.(interface{ strokeColour() rgb }); ok {
		return s.strokeColour()
	}
	return colInk
}

// drawGround: three shortening bars (IEC 60617-2 earth).
func drawGround(cv canvas, g spt) {
	cv.line(g, spt{g.x, g.y + 2})
	for i, w := range []float64{4, 2.6, 1.2} {
		y := g.y + 2 + float64(i)*0.9
		cv.line(spt{g.x - w/2, y}, spt{g.x + w/2, y})
	}
}

// drawSchematic replays a laid-out schematic onto a canvas.
func drawSchematic(cv canvas, sc *Schematic) {
	cv.stroke(colInk, 0.25)
	for _, w := range sc.wires {
		cv.line(w[0], w[1])
	}
	for _, g := range sc.grounds {
		drawGround(cv, g)
	}
	for _, j := range sc.joints {
		cv.circle(j, 0.5, true)
	}
	cv.stroke(colInk, 0.25)
	for _, t := range sc.terms {
		cv.circle(t.at, 0.9, false)
	}
	for _, s := range sc.symbols {
		drawSymbol(cv, s)
	}
	cv.stroke(colMuted, 0.2)
	cv.dash(true)
	for _, l := range sc.links {
		cv.poly(l.path, false, false)
	}
	cv.dash(false)
	for _, l := range sc.labels {
		cv.text(l)
	}
}
