package reports

import (
	"fmt"
	"io"
	"strconv"
	"strings"

	"github.com/jung-kurt/gofpdf"

	"rfstress/stress"
)

// pdfCanvas draws a schematic onto the report page at an offset and scale.
type pdfCanvas struct {
	p     *pdfw
	x, y  float64 // page position of the drawing's (0, 0)
	k     float64 // scale
	col   rgb
	width float64
}

func (c *pdfCanvas) pt(a spt) (float64, float64) { return c.x + a.x*c.k, c.y + a.y*c.k }

func (c *pdfCanvas) strokeColour() rgb { return c.col }

func (c *pdfCanvas) stroke(col rgb, w float64) {
	c.col, c.width = col, w
	c.p.draw(col)
	c.p.fill(col)
	c.p.f.SetLineWidth(w * c.k)
}

func (c *pdfCanvas) dash(on bool) {
	if on {
		c.p.f.SetDashPattern([]float64{1.2 * c.k, 0.8 * c.k}, 0)
	} else {
		c.p.f.SetDashPattern(nil, 0)
	}
}

func (c *pdfCanvas) line(a, b spt) {
	x1, y1 := c.pt(a)
	x2, y2 := c.pt(b)
	c.p.f.Line(x1, y1, x2, y2)
}

func (c *pdfCanvas) poly(pts []spt, closed, filled bool) {
	var ps []gofpdf.PointType
	for _, a := range pts {
		x, y := c.pt(a)
		ps = append(ps, gofpdf.PointType{X: x, Y: y})
	}
	if closed {
		style := "D"
		if filled {
			style = "FD"
		}
		c.p.f.Polygon(ps, style)
		return
	}
	if len(ps) < 2 {
		return
	}
	// one path, as the SVG's polyline: joined corners, and a dash runs on
	// round them
	c.p.f.MoveTo(ps[0].X, ps[0].Y)
	for _, q := range ps[1:] {
		c.p.f.LineTo(q.X, q.Y)
	}
	c.p.f.DrawPath("D")
}

func (c *pdfCanvas) circle(a spt, r float64, filled bool) {
	x, y := c.pt(a)
	if filled {
		c.p.fill(c.col)
	} else {
		c.p.fill(colWhite)
	}
	c.p.f.Circle(x, y, r*c.k, "FD")
	c.p.fill(c.col)
}

func (c *pdfCanvas) text(l slabel) {
	style := ""
	if l.bold {
		style = "B"
	}
	c.p.font(style, l.size*c.k)
	c.p.text(l.col)
	s := clean(l.s)
	x, y := c.pt(spt{l.x, l.y})
	w := c.p.width(s)
	switch l.anchor {
	case 'C':
		x -= w / 2
	case 'R':
		x -= w
	}
	c.p.textFill()
	c.p.f.Text(x, y, s)
	c.p.text(colInk)
}

// measure is the text width function the layout uses: the report's own
// fonts, so labels are placed exactly where the PDF prints them.
func (p *pdfw) measure(s string, size float64, bold bool) float64 {
	if bold {
		return p.widthIn(faceBold, size, s) // callers set their own font before writing
	}
	return p.widthIn(faceRegular, size, s)
}

// schematic draws a section's circuit with its stresses across the body,
// scaled down when it is wider than the page.
func (p *pdfw) schematic(s *stress.Section) {
	sc := LayoutSchematic(s, p.measure)
	if sc.W <= 0 || len(sc.symbols) == 0 {
		return
	}
	k := 1.0
	if sc.W > bodyW {
		k = bodyW / sc.W
	}
	p.sub("Circuit and the stress on each part", sc.H*k+8)
	p.font("", 7.5)
	p.text(colMuted)
	p.f.SetX(marginL)
	p.multi(bodyW, 3.4, "Each part in its verdict's colour with its value, its binding stress and the share of its derated limit used (worst case over the audit). Dots mark the coupled ends of coupled coils.")
	p.text(colInk)
	y := p.f.GetY() + 1.5
	x := marginL + (bodyW-sc.W*k)/2
	cv := &pdfCanvas{p: p, x: x, y: y, k: k}
	drawSchematic(cv, sc)
	p.f.SetDashPattern(nil, 0)
	p.f.SetLineWidth(0.2)
	p.f.SetXY(marginL, y+sc.H*k+2)
}

// svgCanvas writes a schematic as SVG elements.
type svgCanvas struct {
	b     strings.Builder
	col   rgb
	width float64
	dashd bool
}

func (c *svgCanvas) strokeColour() rgb { return c.col }

func (c *svgCanvas) stroke(col rgb, w float64) { c.col, c.width = col, w }
func (c *svgCanvas) dash(on bool)              { c.dashd = on }

func hex(c rgb) string { return fmt.Sprintf("#%02x%02x%02x", c.r, c.g, c.b) }

func f2(v float64) string { return strconv.FormatFloat(v, 'f', 2, 64) }

func (c *svgCanvas) style(fill string) string {
	s := fmt.Sprintf(` stroke="%s" stroke-width="%s" fill="%s"`, hex(c.col), f2(c.width), fill)
	if c.dashd {
		s += ` stroke-dasharray="1.2 0.8"`
	}
	return s
}

func (c *svgCanvas) line(a, b spt) {
	fmt.Fprintf(&c.b, "<line x1=\"%s\" y1=\"%s\" x2=\"%s\" y2=\"%s\"%s/>\n", f2(a.x), f2(a.y), f2(b.x), f2(b.y), c.style("none"))
}

func (c *svgCanvas) poly(pts []spt, closed, filled bool) {
	var ps []string
	for _, a := range pts {
		ps = append(ps, f2(a.x)+","+f2(a.y))
	}
	tag, fill := "polyline", "none"
	if closed {
		tag = "polygon"
		if filled {
			fill = hex(c.col)
		}
	}
	fmt.Fprintf(&c.b, "<%s points=\"%s\"%s/>\n", tag, strings.Join(ps, " "), c.style(fill))
}

func (c *svgCanvas) circle(a spt, r float64, filled bool) {
	fill := "#ffffff"
	if filled {
		fill = hex(c.col)
	}
	fmt.Fprintf(&c.b, "<circle cx=\"%s\" cy=\"%s\" r=\"%s\"%s/>\n", f2(a.x), f2(a.y), f2(r), c.style(fill))
}

func (c *svgCanvas) text(l slabel) {
	anchor := "start"
	switch l.anchor {
	case 'C':
		anchor = "middle"
	case 'R':
		anchor = "end"
	}
	weight := ""
	if l.bold {
		weight = ` font-weight="bold"`
	}
	fmt.Fprintf(&c.b, "<text x=\"%s\" y=\"%s\" font-size=\"%s\" text-anchor=\"%s\" fill=\"%s\"%s>%s</text>\n",
		f2(l.x), f2(l.y), f2(l.size*0.3528), anchor, hex(l.col), weight, xmlText(l.s))
}

// xmlText escapes text for SVG; control characters, which XML cannot
// carry, become spaces.
func xmlText(s string) string {
	var b strings.Builder
	for _, r := range s {
		switch {
		case r == '&':
			b.WriteString("&amp;")
		case r == '<':
			b.WriteString("&lt;")
		case r == '>':
			b.WriteString("&gt;")
		case r == '"':
			b.WriteString("&quot;")
		case r < 0x20 || r >= 0x7F && r < 0xA0 || r == 0xFFFE || r == 0xFFFF:
			b.WriteRune(' ')
		default:
			b.WriteRune(r)
		}
	}
	return b.String()
}

// svgMeasure measures text with the report's fonts, so the SVG is laid out
// as the PDF is.
func svgMeasure() measureFunc {
	f := gofpdf.New("P", "mm", "A4", "")
	f.AddUTF8FontFromBytes(fontSans, "", fontRegular)
	f.AddUTF8FontFromBytes(fontSans, "B", fontBold)
	return func(s string, size float64, bold bool) float64 {
		style := ""
		if bold {
			style = "B"
		}
		f.SetFont(fontSans, style, size)
		return f.GetStringWidth(clean(s))
	}
}

// WriteSchematicSVG writes the schematic of every section, one under the
// other with the file as a heading, as one SVG drawing (mm units).
func WriteSchematicSVG(w io.Writer, b *stress.Bank) error {
	if b == nil {
		return fmt.Errorf("schematic: nothing to draw")
	}
	measure := svgMeasure()
	var body strings.Builder
	y, width := 2.0, 60.0
	for _, s := range b.Sections {
		sc := LayoutSchematic(s, measure)
		title := heading(s.File, s.Title) // escaped and shortened, as in every heading
		fmt.Fprintf(&body, "<text x=\"2\" y=\"%s\" font-size=\"3.2\" font-weight=\"bold\" fill=\"%s\">%s</text>\n", f2(y+3.5), hex(colAccent), xmlText(title))
		y += 6
		cv := &svgCanvas{}
		drawSchematic(cv, sc)
		fmt.Fprintf(&body, "<g transform=\"translate(2 %s)\">\n%s</g>\n", f2(y), cv.b.String())
		y += sc.H + 6
		// room to spare: a viewer may set the labels in a wider font
		if sc.W+12 > width {
			width = sc.W + 12
		}
		if tw := measure(title, 3.2/0.3528, true) + 4; tw > width {
			width = tw
		}
	}
	_, err := fmt.Fprintf(w, "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n"+
		"<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"%smm\" height=\"%smm\" viewBox=\"0 0 %s %s\" font-family=\"DejaVu Sans Condensed, DejaVu Sans, sans-serif\">\n"+
		"<rect width=\"100%%\" height=\"100%%\" fill=\"#ffffff\"/>\n%s</svg>\n", f2(width), f2(y), f2(width), f2(y), body.String())
	return err
}
