package stress

import (
	"fmt"
	"strings"

	"rfstress/circuits"
	"rfstress/ratings"
)

// balanceNote is the worst power-balance error the nominal audit met.
type balanceNote struct {
	f        float64
	err      float64
	suspects []string
}

// fill fills a split at f. The nominal audit checks each fill's power
// balance and refines a solve that misses it (circuits.SplitWork.
// FillChecked), keeping the worst miss for a finding; tolerance trials
// fill plainly (their nominal has been checked).
func (e *Engine) fill(w *workspace, s *circuits.Split, f float64) error {
	if !w.record {
		return w.sw.Fill(s, f)
	}
	b, err := w.sw.FillChecked(s, f)
	if err != nil {
		return err
	}
	if !(b <= circuits.BalanceTol) && !(w.bal.err >= b) {
		w.bal = balanceNote{f: f, err: b, suspects: w.sw.Suspects(f)}
	}
	return nil
}

// balanceFinding is the warning an audit carries when a solve did not
// balance even after refinement: its stresses may be wrong.
func (n balanceNote) finding() ratings.Finding {
	t := fmt.Sprintf("the network solve at %s does not balance: source power and the power taken by the parts differ by %.2g of the power offered, after one step of iterative refinement; stresses there cannot be trusted",
		circuits.FormatHz(n.f), n.err)
	if len(n.suspects) > 0 {
		t += "; parts far stiffer or weaker than the rest: " + strings.Join(n.suspects, ", ") + " (merge the nodes of a near-short, drop a near-open)"
	}
	return ratings.Finding{Severity: "warning", Text: t}
}
