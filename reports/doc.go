package reports

import (
	"time"

	"rfstress/stress"
)

// ReportDoc is everything the PDF report shows, computed before it is
// drawn: the report only lays it out.
type ReportDoc struct {
	Tool    string    // "rfstress 0.4.0"
	Date    time.Time // from SOURCE_DATE_EPOCH when set, else now (UTC)
	Bank    *stress.Bank
	Filters []FilterPlot // one per section, same order
	// FilterAt, when set, gives section i's plot data in place of
	// Filters[i], waiting until it is ready: the caller may still be
	// gathering later sections' data while the report draws earlier ones.
	FilterAt func(i int) *FilterPlot
	// Start, when set, is the document begun ahead (StartPDF) the
	// report is drawn on.
	Start    *PDFStart
	CautionV float64 // node voltage above which the caution is stressed
	Subject  string  // page-header subject when not an audit (e.g. a comparison)
}

// FilterPlot is the data for one filter's response plot.
type FilterPlot struct {
	Sweep     []stress.SweepPoint // matched response, log-spaced
	BandLo    float64
	BandHi    float64
	Harmonics []stress.HarmonicLine
	Extra     []float64 // carrier-also frequencies
	// stress against frequency: the audit one carrier at a time
	Use *stress.BandUse
	// the antenna-port loads audited at each carrier, and the resistance
	// the load chart is drawn for (the antenna port's)
	Loads []stress.Case
	R0    float64
}

// filter is section i's plot data, nil when there is none.
func (d *ReportDoc) filter(i int) *FilterPlot {
	if d.FilterAt != nil {
		return d.FilterAt(i)
	}
	if i < len(d.Filters) {
		return &d.Filters[i]
	}
	return nil
}
