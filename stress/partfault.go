package stress

import (
	"fmt"
	"math"
	"strings"

	"rfstress/circuits"
	"rfstress/ratings"
)

// ParsePartFaults reads a part-faults setting: "each" (every part shorted
// and opened in turn), "none" or "", or a list such as C9:short,L3:open.
// Part names are checked against the netlist by PartFaultList.
func ParsePartFaults(v string) (each bool, list []circuits.PartFault, err error) {
	switch strings.ToLower(strings.TrimSpace(v)) {
	case "", "none":
		return false, nil, nil
	case "each":
		return true, nil, nil
	}
	for _, item := range strings.Split(v, ",") {
		name, how, ok := strings.Cut(strings.TrimSpace(item), ":")
		if !ok || name == "" {
			return false, nil, fmt.Errorf("%q is not PART:short or PART:open", item)
		}
		switch strings.ToLower(how) {
		case "short":
			list = append(list, circuits.PartFault{Part: name, Short: true})
		case "open":
			list = append(list, circuits.PartFault{Part: name})
		default:
			return false, nil, fmt.Errorf("%q: the fault is short or open, not %q", item, how)
		}
	}
	return false, list, nil
}

// PartFaultList returns the single-part faults the conditions ask for on
// this engine's circuit: with "each", every part that can fail (not the
// DC sources) shorted, then opened, in netlist order.
func (e *Engine) PartFaultList() ([]circuits.PartFault, error) {
	each, list, err := ParsePartFaults(e.Cond.PartFaults)
	if err != nil {
		return nil, err
	}
	if each {
		list = nil
		for _, el := range e.C.Elements {
			if sp := circuits.SpecOf(el.Kind); sp != nil && (sp.Source || sp.Observes) {
				continue // sources and clearances are not parts that fail here
			}
			list = append(list, circuits.PartFault{Part: el.Name, Short: true}, circuits.PartFault{Part: el.Name})
		}
		return list, nil
	}
	for _, pf := range list {
		i := e.C.Index(pf.Part)
		if i < 0 {
			return nil, fmt.Errorf("part-faults names %s, which is not a part of this netlist", pf.Part)
		}
		if sp := circuits.SpecOf(e.C.Elements[i].Kind); sp != nil && sp.Source {
			return nil, fmt.Errorf("part-faults names %s, a %s: only parts fail here, sources do not", pf.Part, e.C.Elements[i].Kind)
		}
	}
	return list, nil
}

// FaultRun is the audit of the network with one part failed.
type FaultRun struct {
	Fault circuits.PartFault
	// Parts holds every part's result, nil for the failed part (not
	// judged); Err says why the run could not be solved.
	Parts      []*PartResult
	MaxNodeVpk float64
	MaxNodeVdc float64
	MaxNodeAt  string
	Err        string
	// ShortedSupply names a supply the fault shorts (its DC current above
	// ShortedSupplyA): the supply's fuse or current limit then decides,
	// and the DC figures of this fault say only that.
	ShortedSupply string
}

// ShortedSupplyA is the DC current above which a supply counts as shorted
// by a fault: only a dead short through ideal or failed parts reaches it.
const ShortedSupplyA = 1e4

// FaultWorst is one part's worst stress of one quantity over all faults.
type FaultWorst struct {
	Quantity ratings.Quantity
	Value    float64
	Fault    circuits.PartFault // the fault that caused Value
	Verdict  ratings.Verdict    // the worst verdict over the faults
	VFault   circuits.PartFault // the fault that caused Verdict
}

// PartFaultWorst is one part under every fault of the others.
type PartFaultWorst struct {
	Name    string
	Kind    circuits.Kind
	Verdict ratings.Verdict
	Worst   []*FaultWorst // in Quantities order
}

// Consequence is a part pushed beyond its derated limit by another part's
// failure: "if C9 shorts, C10 sees 4.7 kV peak".
type Consequence struct {
	Fault    circuits.PartFault
	Part     string
	Quantity ratings.Quantity
	Value    float64
	Limit    ratings.Limit
	Verdict  ratings.Verdict
}

// PartFaults is the single-part fault analysis of a section. It does not
// change the section's verdict or safe power: a design is not expected to
// survive every failure; this says what else each failure takes with it.
type PartFaults struct {
	Runs         []*FaultRun
	Parts        []*PartFaultWorst
	Consequences []Consequence // verdict marginal or fail, in fault then part order
}

// RunPartFaults audits the network once per fault, every part but the
// failed one judged under the engine's conditions. Each fault costs a
// whole audit: one factorisation per carrier and harmonic.
func (e *Engine) RunPartFaults(list []circuits.PartFault) (*PartFaults, error) {
	out := &PartFaults{}
	n := len(e.C.Elements)
	worst := make([]*PartFaultWorst, n)
	for i, el := range e.C.Elements {
		worst[i] = &PartFaultWorst{Name: el.Name, Kind: el.Kind}
	}
	fe := *e
	fe.faulted = true
	for _, pf := range list {
		fc, err := e.C.WithFault(pf)
		if err != nil {
			return nil, err
		}
		run := &FaultRun{Fault: pf, Parts: make([]*PartResult, n)}
		out.Runs = append(out.Runs, run)
		w := fe.newWorkspace(fc)
		nw, err := fe.run(w)
		if err != nil {
			run.Err = err.Error()
			continue
		}
		run.MaxNodeVpk, run.MaxNodeVdc = nw.vpk, nw.dc
		for j, el := range fc.Elements {
			if el.Kind == circuits.Supply && math.Abs(w.dcI[j]) > ShortedSupplyA {
				run.ShortedSupply = el.Name
			}
		}
		if len(fc.Nodes) > 0 {
			run.MaxNodeAt = fc.Nodes[nw.node]
		}
		failed := fc.Index(pf.Part)
		sec := &Section{Engine: &fe, NumCases: fe.NumCases(), Extra: w.extra}
		for j := range fc.Elements {
			if j == failed {
				continue
			}
			pr := fe.judge(sec, e.C.Elements[j], e.rparts[j], &w.acc[j])
			run.Parts[j] = pr
			pw := worst[j]
			for _, q := range Quantities {
				st, ok := pr.Stress[q]
				if !ok {
					continue
				}
				var fw *FaultWorst
				for _, x := range pw.Worst {
					if x.Quantity == q {
						fw = x
					}
				}
				if fw == nil {
					fw = &FaultWorst{Quantity: q, Value: math.Inf(-1)}
					pw.Worst = append(pw.Worst, fw)
				}
				if st.Value > fw.Value {
					fw.Value, fw.Fault = st.Value, pf
				}
				if st.Verdict > fw.Verdict {
					fw.Verdict, fw.VFault = st.Verdict, pf
				}
				if st.Verdict > pw.Verdict {
					pw.Verdict = st.Verdict
				}
				if st.Verdict >= ratings.Marginal {
					out.Consequences = append(out.Consequences, Consequence{Fault: pf, Part: pr.Name, Quantity: q,
						Value: st.Value, Limit: st.Limit, Verdict: st.Verdict})
				}
			}
		}
	}
	for _, pw := range worst {
		if len(pw.Worst) > 0 {
			out.Parts = append(out.Parts, pw)
		}
	}
	return out, nil
}

// Sentence says a consequence the way a builder would: "if C9 shorts,
// C10 sees 4.7 kV peak".
func (c Consequence) Sentence(value string) string {
	verb := "opens"
	if c.Fault.Short {
		verb = "shorts"
	}
	return fmt.Sprintf("if %s %s, %s sees %s", c.Fault.Part, verb, c.Part, value)
}
