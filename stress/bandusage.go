package stress

// BandUse is how hard each part is worked at each carrier frequency: the
// audit repeated one carrier at a time, for the report's plot of stress
// against frequency.
type BandUse struct {
	F       []float64   // carrier frequencies: n across the band, then the carrier-also ones
	OffBand []bool      // a carrier-also frequency
	Use     [][]float64 // per part (netlist order), per frequency: worst use of a derated limit (0 when nothing rated)
}

// BandUse audits the engine's circuit at n frequencies evenly across the
// band (one when the band is a single frequency) and at each carrier-also
// frequency, under the same loads, faults, harmonics and ratings.
func (e *Engine) BandUse(n int) (*BandUse, error) {
	c := e.Cond
	var fs []float64
	var off []bool
	if c.BandHi <= c.BandLo || n < 2 {
		fs, off = append(fs, (c.BandLo+c.BandHi)/2), append(off, false)
	} else {
		for i := 0; i < n; i++ {
			fs = append(fs, c.BandLo+(c.BandHi-c.BandLo)*float64(i)/float64(n-1))
			off = append(off, false)
		}
	}
	for _, f := range c.CarrierAlso {
		fs, off = append(fs, f), append(off, true)
	}
	u := &BandUse{F: fs, OffBand: off, Use: make([][]float64, len(e.C.Elements))}
	// one workspace serves every frequency: the sub-engines differ only in
	// their carrier, and run resets what it accumulates
	var w *workspace
	for k, f := range fs {
		one := c
		one.BandLo, one.BandHi, one.Points, one.CarrierAlso = f, f, 1, nil
		sub, err := newEngine(e.C, e.R, one, off[k])
		if err != nil {
			return nil, err
		}
		// the use Audit's verdicts would give (PartResult.Util), read from
		// the accumulators: no verdict texts, findings or sections for a
		// plot that shows one number per part
		if w == nil {
			w = sub.newWorkspace(e.C)
			w.record = true
		}
		if _, err := sub.run(w); err != nil {
			return nil, err
		}
		for i := range e.C.Elements {
			u.Use[i] = append(u.Use[i], w.partUse(i))
		}
	}
	return u, nil
}

// partUse is part i's worst use of a derated rating over the run, guides
// left out: what judge makes PartResult.Util.
func (w *workspace) partUse(i int) float64 {
	a, lim := &w.acc[i], &w.lim[i]
	use := 0.0
	for qi := 0; qi < nQ; qi++ {
		if a.has[qi] && !lim.advice[qi] && lim.derated[qi] > 0 && a.util[qi] > use {
			use = a.util[qi]
		}
	}
	return use
}

// CasesPerCarrier is the number of antenna-port terminations audited at
// each carrier: matched, the SWR circle's phases, explicit loads, faults.
func (e *Engine) CasesPerCarrier() int { return e.perCarrier }

// LoadSet is the antenna-port loads audited at each carrier, in case
// order (faults included: open is an infinite impedance).
func (e *Engine) LoadSet() []Case {
	var out []Case
	for i := 0; i < e.perCarrier; i++ {
		out = append(out, e.Case(i))
	}
	return out
}
