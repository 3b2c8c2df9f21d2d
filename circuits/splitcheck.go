package circuits

import "math"

// FillChecked is Fill with the power balance of both excitations checked
// (see Check): when either is off by more than BalanceTol, both are
// solved again with one step of iterative refinement. It returns the
// worse relative balance error as it ends, so the caller can report a
// frequency whose figures cannot be trusted.
func (w *SplitWork) FillChecked(s *Split, f float64) (float64, error) {
	if err := w.Fill(s, f); err != nil {
		return 0, err
	}
	if b := s.Balance(); b <= BalanceTol {
		return b, nil
	}
	w.refill(s, f)
	return s.Balance(), nil
}

// Suspects names the parts of the bound circuit whose stamps at f stand
// far from the rest (see Check.Suspects).
func (w *SplitWork) Suspects(f float64) []string { return w.fz.C.suspects(f) }

// refill solves both excitations again, each with one step of iterative
// refinement, into s (the factorisation of Fill is reused).
func (w *SplitWork) refill(s *Split, f float64) {
	for k := 0; k < 2; k++ {
		w.solveInto(s, f, k, true)
	}
}

// Balance is the worse relative power-balance error of the two
// excitations (Tellegen's theorem). Excitation 0, 1 V of EMF behind Zs
// with the antenna port open: the power into the network equals the
// parts' loss; relative to the available 1/(4·Re Zs). Excitation 1, 1 A
// into the antenna node with the EMF at zero: Re Zth (the power it
// injects) equals the parts' loss plus |Vin|²·Re(1/Zs) taken by the
// source impedance; relative to |Zth|·(1 A)².
func (s *Split) Balance() float64 {
	var loss [2]float64
	for k := 0; k < 2; k++ {
		loss[k] = real(s.Zcm) * abs2(s.Cm[k]) // a balanced load's common mode
		for i := range s.R {
			if s.Ports[i] {
				loss[k] += real(s.P[k][i].V*conj(s.P[k][i].I)) + real(s.P[k][i].V2*conj(s.P[k][i].I2))
			} else {
				loss[k] += s.R[i] * abs2(s.P[k][i].I)
			}
		}
	}
	vin := s.Vin[0]
	pin := real(vin * conj((1-vin)/s.Zs))
	e0 := math.Abs(pin-loss[0]) * 4 * real(s.Zs)
	sink := abs2(s.Vin[1]) * real(1/s.Zs)
	e1 := 0.0
	if z := math.Sqrt(abs2(s.Zth)); z > 0 {
		e1 = math.Abs(real(s.Zth)-loss[1]-sink) / z
	}
	if e1 > e0 || math.IsNaN(e1) {
		return e1
	}
	return e0
}
