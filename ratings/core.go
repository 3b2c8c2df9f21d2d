package ratings

import (
	"fmt"
	"math"
	"strings"

	"rfstress/circuits"
)

// CoreInfo is a core statement read for its meaning. All lengths in m,
// areas in m², AL in H/turn².
type CoreInfo struct {
	Name     string
	Pos      circuits.Pos
	Ae, Le   float64 // effective area and path length
	AL       float64 // inductance factor
	Mu       float64 // relative permeability used for AL (0 when al= was given and no µ known)
	Area     float64 // surface area of the bare core for cooling (given or estimated)
	AreaEst  bool    // Area was estimated from the geometry
	Material *Material
	OD, ID   float64 // 0 when not given
	H        float64
}

// ToroidAeLe gives the effective area and path length of a toroid of
// rectangular section, outer diameter od, inner diameter id, height h, by
// IEC 60205: with r1 = id/2, r2 = od/2,
// le = 2π·ln(r2/r1)·r1·r2/(r2 − r1), Ae = h·ln²(r2/r1)·r1·r2/(r2 − r1).
func ToroidAeLe(od, id, h float64) (ae, le float64) {
	r1, r2 := id/2, od/2
	if !(r1 > 0 && r2 > r1 && h > 0) {
		return 0, 0
	}
	k := math.Log1p((r2 - r1) / r1) // ln(r2/r1) without cancellation for thin rings
	c := r1 * r2 / (r2 - r1)
	return h * k * k * c, 2 * math.Pi * k * c
}

// ALFromGeometry is µ0·µr·Ae/le in H/turn².
func ALFromGeometry(mu, ae, le float64) float64 {
	if !(le > 0) {
		return 0
	}
	return Mu0 * mu * ae / le
}

// ToroidArea is the outer surface of a toroid: outer cylinder, inner
// cylinder and two annular faces, π·OD·h + π·ID·h + (π/2)(OD² − ID²).
func ToroidArea(od, id, h float64) float64 {
	if id < 0 {
		id = 0
	}
	if !(od > id && h > 0) {
		return 0
	}
	return math.Pi*od*h + math.Pi*id*h + math.Pi/2*(od*od-id*id)
}

// ringFromAeLe stands in for a toroid when only Ae and le are known: a
// ring of square section a = √Ae around a mean diameter le/π.
func ringFromAeLe(ae, le float64) (od, id, h float64) {
	a := math.Sqrt(ae)
	dm := le / math.Pi
	return dm + a, math.Max(dm-a, 0), a
}

// surface is the bare core's dimensions for cooling and winding length:
// the given od/id/h, else the square-section ring from Ae and le.
func (c *CoreInfo) surface() (od, id, h float64, ok bool) {
	if c.OD > 0 && c.ID > 0 && c.H > 0 && c.OD > c.ID {
		return c.OD, c.ID, c.H, true
	}
	if c.Ae > 0 && c.Le > 0 {
		od, id, h = ringFromAeLe(c.Ae, c.Le)
		return od, id, h, true
	}
	return 0, 0, 0, false
}

// WoundArea is the cooling surface of the core wound with wire of
// diameter d: the given area=, else the toroid surface grown by one wire
// diameter on every side (OD+2d, ID−2d, h+2d), a full single layer being
// the usual case.
func (c *CoreInfo) WoundArea(d float64, given bool) float64 {
	if given {
		return c.Area
	}
	od, id, h, ok := c.surface()
	if !ok {
		return 0
	}
	return ToroidArea(od+2*d, id-2*d, h+2*d)
}

// TurnLength is the wire length of one turn: the perimeter of the core
// section grown by the wire, the centre line of a turn lying d/2 off each
// face: 2·((OD−ID)/2 + d) + 2·(h + d) = (OD − ID) + 2h + 4d. Leads are
// left out.
func (c *CoreInfo) TurnLength(d float64) float64 {
	od, id, h, ok := c.surface()
	if !ok {
		return 0
	}
	return (od - id) + 2*h + 4*d
}

// OneLayerTurns is how many turns of wire d lie side by side on the inner
// circumference: the wire centres sit on a circle of diameter ID − d, and
// each turn takes d of it, so floor(π·(ID − d)/d). -1 when ID is unknown.
func OneLayerTurns(id, d float64) int {
	if !(id > 0 && d > 0) {
		return -1
	}
	if d >= id {
		return 0
	}
	return int(math.Floor(math.Pi * (id - d) / d))
}

// buildCore reads a core statement. usedBy names an inductor that uses
// it ("" if none): only then are missing geometry and permeability errors.
func buildCore(s *circuits.Core, mats map[string]*Material, usedBy string, errs *circuits.ErrorList) *CoreInfo {
	add := func(pos circuits.Pos, want, format string, args ...any) {
		*errs = append(*errs, &circuits.Error{Pos: pos, Msg: fmt.Sprintf(format, args...), Want: want})
	}
	c := &CoreInfo{Name: s.Name, Pos: s.Pos}
	num := func(k string) float64 { v, _ := s.Attrs.Num(k); return v }
	c.OD, c.ID, c.H = num("od"), num("id"), num("h")
	if c.OD > 0 && c.ID > 0 && c.OD <= c.ID {
		add(s.Attrs["id"].ValPos, "an inner diameter below the outer one", "core %s: id=%s is not smaller than od=%s", s.Name, s.Attrs["id"].Raw, s.Attrs["od"].Raw)
	} else if c.OD > 0 && c.ID > 0 && c.H > 0 {
		c.Ae, c.Le = ToroidAeLe(c.OD, c.ID, c.H)
	}
	if v := num("ae"); v > 0 {
		c.Ae = v
	}
	if v := num("le"); v > 0 {
		c.Le = v
	}
	if a, ok := s.Attrs["material"]; ok && len(a.Words) > 0 {
		c.Material = lookupMaterial(mats, a.Words[0])
		if c.Material == nil {
			add(a.ValPos, "a built-in material ("+materialNames(mats)+") or a material statement", "core %s: unknown material %s", s.Name, circuits.Quote(a.Words[0]))
		}
	}
	if v := num("mu"); v > 0 {
		c.Mu = v
	} else if c.Material != nil {
		c.Mu = c.Material.Mu
	}
	if v := num("al"); v > 0 {
		c.AL = v
	} else if c.Mu > 0 && c.Ae > 0 && c.Le > 0 {
		c.AL = ALFromGeometry(c.Mu, c.Ae, c.Le)
	}
	if a, ok := s.Attrs["area"]; ok {
		c.Area = a.Num
	} else if od, id, h, ok := c.surface(); ok {
		c.Area = ToroidArea(od, id, h)
		c.AreaEst = true
	}
	if usedBy == "" {
		return c
	}
	badGeom := c.OD > 0 && c.ID > 0 && c.OD <= c.ID // already reported
	if !(c.Ae > 0 && c.Le > 0) && !badGeom {
		var have []string
		for _, k := range []string{"ae", "le", "od", "id", "h"} {
			if _, ok := s.Attrs[k]; ok {
				have = append(have, k+"=")
			}
		}
		got := "none given"
		if len(have) > 0 {
			got = "only " + strings.Join(have, ", ")
		}
		add(s.Pos, "ae= and le=, or od=, id= and h= for a toroid",
			"core %s (used by %s) has too little geometry (%s)", s.Name, usedBy, got)
	}
	_, namesMaterial := s.Attrs["material"]
	_, hasMu := s.Attrs["mu"]
	_, hasAL := s.Attrs["al"]
	switch {
	case namesMaterial && c.Material == nil:
		// an unknown material is reported already
	case c.Material.Magnetic() && !hasMu && !hasAL && c.Material.Mu == 0:
		add(s.Pos, "mu= (e.g. mu=10) or al= on the core, or a material statement with mu=",
			"core %s (used by %s): material %s is a class and gives no permeability", s.Name, usedBy, c.Material.Name)
	case c.AL == 0 && c.Mu == 0:
		add(s.Pos, "al=, mu=, or material= naming a material with mu=",
			"core %s (used by %s) has neither an AL value nor a permeability", s.Name, usedBy)
	}
	return c
}

// Volume is the core body's volume: π/4·(OD² − ID²)·h for a toroid of
// given dimensions, else Ae·le. 0 when unknown.
func (c *CoreInfo) Volume() float64 {
	if c.OD > 0 && c.ID > 0 && c.H > 0 && c.OD > c.ID {
		return math.Pi / 4 * (c.OD*c.OD - c.ID*c.ID) * c.H
	}
	return c.Ae * c.Le
}

// HeatCapacity is the core body's heat capacity in J/K: volume × the
// material's density × its specific heat. 0 without a material (no
// credit is taken for an unknown body).
func (c *CoreInfo) HeatCapacity() float64 {
	if c.Material == nil {
		return 0
	}
	return c.Volume() * c.Material.Density * c.Material.SpecHeat
}
