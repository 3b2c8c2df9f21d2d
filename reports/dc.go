package reports

import (
	"fmt"
	"strings"

	"rfstress/circuits"
	"rfstress/stress"
)

// LethalDC is the DC voltage from which the caution calls DC lethal: the
// 60 V DC limit of safety extra-low voltage (IEC 62368-1; from memory).
const LethalDC = 60

// DCCaution names the highest DC node voltage of the bank, or "" when no
// section has DC. DC at plate-supply levels is lethal, and more so than
// RF burns: it does not let go.
func DCCaution(b *stress.Bank) string {
	var worst *stress.Section
	for _, s := range b.Sections {
		if s.MaxDCV > 0 && (worst == nil || s.MaxDCV > worst.MaxDCV) {
			worst = s
		}
	}
	if worst == nil {
		return ""
	}
	v := circuits.FormatSI(worst.MaxDCV, "V")
	if worst.MaxDCV < LethalDC {
		return fmt.Sprintf("DC %s at node %s of %s adds to the RF figures.", v, worst.MaxDCAt, Headline(worst.File))
	}
	return fmt.Sprintf("LETHAL DC: %s at node %s of %s, on the choke, the blocking capacitor and everything they touch; "+
		"a failed blocking capacitor puts it on the tank and the antenna. Switch off, wait for the bleeder, and ground "+
		"every high-voltage point with a grounding stick before touching; keep the interlocks working (SAFETY.md).",
		v, worst.MaxDCAt, Headline(worst.File))
}

// hotText names a section's highest node voltage and, when DC is part of
// it, its DC share.
func hotNode(s *stress.Section) string {
	h := fmt.Sprintf("%s node %s", Headline(s.File), s.MaxNodeAt)
	if s.MaxNodeVdc > 0 {
		h += fmt.Sprintf(" (%s of it DC)", circuits.FormatSI(s.MaxNodeVdc, "V"))
	}
	return h
}

// sectionLabel names a select position and the fault class of a section
// ("" for a netlist without select lines).
func sectionLabel(s *stress.Section) string {
	switch {
	case s.Position == "":
		return ""
	case s.Wrong:
		return "wrong band selected: position " + s.Position + " at the carriers of position " + s.For
	}
	return "position " + s.Position
}

// sectionHead is a section's file name with its position label, for
// headings where a switched bank's positions would otherwise read alike.
func sectionHead(s *stress.Section) string {
	return joinNonEmpty(" — ", Headline(s.File), circuits.Escape(sectionLabel(s)))
}

func joinNonEmpty(sep string, parts ...string) string {
	var out []string
	for _, p := range parts {
		if p != "" {
			out = append(out, p)
		}
	}
	return strings.Join(out, sep)
}

// JSONPartFaults is the single-part fault analysis of a section.
type JSONPartFaults struct {
	Faults       []JSONFaultRun    `json:"faults"`
	Parts        []JSONFaultPart   `json:"parts"`
	Consequences []JSONConsequence `json:"consequences"`
}

// JSONFaultRun is one fault: the part failed and the highest node voltage.
type JSONFaultRun struct {
	Fault      string   `json:"fault"`
	MaxNodeVpk *float64 `json:"max_node_vpk"`
	MaxNodeVdc *float64 `json:"max_node_vdc"`
	MaxNode    string   `json:"max_node,omitempty"`
	Error      string   `json:"error,omitempty"`
	// ShortedSupply names a supply the fault shorts
	ShortedSupply string `json:"shorted_supply,omitempty"`
}

// JSONFaultPart is one part's worst stresses over the other parts' faults.
type JSONFaultPart struct {
	Name    string           `json:"name"`
	Verdict string           `json:"verdict"`
	Worst   []JSONFaultWorst `json:"worst"`
}

// JSONFaultWorst is one quantity's worst value and the fault causing it.
type JSONFaultWorst struct {
	Quantity     string   `json:"quantity"`
	Value        *float64 `json:"value"`
	Fault        string   `json:"fault"`
	Verdict      string   `json:"verdict"`
	VerdictFault string   `json:"verdict_fault,omitempty"`
}

// JSONConsequence is a part beyond its derated limit under a fault.
type JSONConsequence struct {
	Fault    string   `json:"fault"`
	Part     string   `json:"part"`
	Quantity string   `json:"quantity"`
	Value    *float64 `json:"value"`
	Derated  *float64 `json:"derated_limit"`
	Rating   *float64 `json:"rating"`
	Verdict  string   `json:"verdict"`
	Text     string   `json:"text"`
}

func partFaultsJSON(s *stress.Section) *JSONPartFaults {
	pf := s.PartFaults
	if pf == nil {
		return nil
	}
	out := &JSONPartFaults{Faults: []JSONFaultRun{}, Parts: []JSONFaultPart{}, Consequences: []JSONConsequence{}}
	for _, r := range pf.Runs {
		jr := JSONFaultRun{Fault: r.Fault.String(), Error: r.Err, ShortedSupply: r.ShortedSupply}
		if r.Err == "" {
			jr.MaxNodeVpk, jr.MaxNodeVdc, jr.MaxNode = jsonNum(r.MaxNodeVpk), jsonNum(r.MaxNodeVdc), r.MaxNodeAt
		}
		out.Faults = append(out.Faults, jr)
	}
	for _, p := range pf.Parts {
		jp := JSONFaultPart{Name: p.Name, Verdict: p.Verdict.String(), Worst: []JSONFaultWorst{}}
		for _, w := range p.Worst {
			jw := JSONFaultWorst{Quantity: string(w.Quantity), Value: jsonNum(w.Value), Fault: w.Fault.String(), Verdict: w.Verdict.String()}
			if w.Verdict != 0 {
				jw.VerdictFault = w.VFault.String()
			}
			jp.Worst = append(jp.Worst, jw)
		}
		out.Parts = append(out.Parts, jp)
	}
	for _, c := range pf.Consequences {
		out.Consequences = append(out.Consequences, JSONConsequence{Fault: c.Fault.String(), Part: c.Part,
			Quantity: string(c.Quantity), Value: jsonNum(c.Value), Derated: jsonNum(c.Limit.Derated), Rating: jsonNum(c.Limit.Abs),
			Verdict: c.Verdict.String(), Text: ConsequenceText(c)})
	}
	return out
}

// ConsequenceText is one line of the fault list: "if C9 shorts, C10 sees
// 4.7 kV peak voltage (fail: rated 3 kV)".
func ConsequenceText(c stress.Consequence) string {
	s := c.Sentence(FormatQ(c.Quantity, c.Value) + " " + QuantityLabel(c.Quantity))
	if c.Limit.Abs > 0 {
		s += fmt.Sprintf(" (%s: rated %s, derated %s)", c.Verdict, FormatQ(c.Quantity, c.Limit.Abs), FormatQ(c.Quantity, c.Limit.Derated))
	} else {
		s += fmt.Sprintf(" (%s)", c.Verdict)
	}
	return s
}

// ShortedSupplyText says that a fault shorts a supply: its fuse or
// current limit decides what happens, not the network.
func ShortedSupplyText(r *stress.FaultRun) string {
	return fmt.Sprintf("%s shorts supply %s: its fuse or current limit decides what happens next, and this fault's DC figures say only that", r.Fault, r.ShortedSupply)
}

// casesText counts the audited cases in words: "1 case", "75 cases".
func casesText(n int) string {
	if n == 1 {
		return "1 case"
	}
	return fmt.Sprintf("%d cases", n)
}
