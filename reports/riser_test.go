package reports

import (
	"strings"
	"testing"
)

// TestNoWireThroughLabels: on a drawing, wires never run through text
// (common practice in drafting: a reader must not take a stroke for part
// of a value). The relay bank's raised series coils and contacts share
// buses, so the risers of the upper lanes pass the lower parts, and a
// balun's coupling label sits beside a shunt winding's wire: on every
// example schematic each vertical wire must stay clear of every label.
func TestNoWireThroughLabels(t *testing.T) {
	var srcs []netSrc
	for _, s := range demoSources(t) {
		if strings.HasSuffix(s.name, ".net") {
			srcs = append(srcs, s)
		}
	}
	if len(srcs) == 0 {
		t.Skip("example station absent")
	}
	m := svgMeasure()
	for _, s := range demoDoc(t, srcs, 0).Bank.Sections {
		sc := LayoutSchematic(s, m)
		for _, w := range sc.wires {
			a, b := w[0], w[1]
			if a.x != b.x {
				continue
			}
			ylo, yhi := minf(a.y, b.y), maxf(a.y, b.y)
			for _, l := range sc.labels {
				bb := l.box(m)
				// 0.2 mm: a stroke's half width beside the glyphs
				if a.x > bb[0]+0.2 && a.x < bb[2]-0.2 && ylo < bb[3]-0.2 && yhi > bb[1]+0.2 {
					t.Errorf("%s %s: wire at x=%.1f mm runs through label %q", s.File, sectionLabel(s), a.x, l.s)
				}
			}
		}
	}
}
