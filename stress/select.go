package stress

import (
	"rfstress/circuits"
	"rfstress/ratings"
)

// Variant is one network and band to audit from a netlist: the netlist as
// written, or one position of a switched bank.
type Variant struct {
	C    *circuits.Circuit
	Cond Conditions
	// Position is the select position the switches are in ("" without
	// select lines); Wrong marks it audited at position For's carriers,
	// the fault "wrong band selected".
	Position, For string
	Wrong         bool
}

// Variants expands a netlist's select lines. Each position is audited at
// its own band's carriers with its switches closed and every other switch
// open; then every other position is audited at those carriers, the
// fault class "wrong band selected" (a band switch or its control left in
// the wrong place while transmitting). The select band replaces the band
// of the conditions. Without select lines the netlist is the one variant.
func Variants(c *circuits.Circuit, cond Conditions) []Variant {
	sels := c.NL.Selects
	if len(sels) == 0 {
		return []Variant{{C: c, Cond: cond}}
	}
	pos := make([]*circuits.Circuit, len(sels))
	for i, s := range sels {
		pos[i] = c.WithSwitches(s.Closed)
	}
	var out []Variant
	for i, p := range sels {
		cp := cond
		cp.BandLo, cp.BandHi = p.Lo, p.Hi
		out = append(out, Variant{C: pos[i], Cond: cp, Position: p.Name})
		for j, q := range sels {
			if j != i {
				out = append(out, Variant{C: pos[j], Cond: cp, Position: q.Name, For: p.Name, Wrong: true})
			}
		}
	}
	return out
}

// AuditNetlist audits every variant of a netlist (Variants) and, where
// the conditions ask for single-part faults, runs them on each position
// (not on the wrong-band variants). Sections come in Variants order, each
// with the engine that made it.
func AuditNetlist(c *circuits.Circuit, rs *ratings.Set, cond Conditions, allowUnrated bool) ([]*Section, []*Engine, error) {
	var secs []*Section
	var engs []*Engine
	for _, v := range Variants(c, cond) {
		if err := v.Cond.Check(); err != nil {
			return nil, nil, err
		}
		eng, err := NewEngine(v.C, rs, v.Cond)
		if err != nil {
			return nil, nil, err
		}
		eng.AllowUnrated = allowUnrated
		sec, err := eng.Audit()
		if err != nil {
			return nil, nil, err
		}
		sec.Position, sec.Wrong, sec.For = v.Position, v.Wrong, v.For
		if v.Wrong {
			dropPassFinding(sec) // a wrong band is meant not to pass
		}
		if !v.Wrong {
			list, err := eng.PartFaultList()
			if err != nil {
				return nil, nil, err
			}
			if len(list) > 0 {
				if sec.PartFaults, err = eng.RunPartFaults(list); err != nil {
					return nil, nil, err
				}
			}
		}
		secs = append(secs, sec)
		engs = append(engs, eng)
	}
	return secs, engs, nil
}
