package reports

import (
	"fmt"
	"strconv"
	"strings"
	"unicode/utf8"

	"rfstress/circuits"
	"rfstress/ratings"
)

// method is the page on how the figures were reached and what they leave
// out. It describes the model; the numbers it prints are the profile's.
func (p *pdfw) method() {
	p.newPage("Method and assumptions")
	p.bullets("Circuit, losses and source",
		"Each netlist is solved by modified nodal analysis at every carrier frequency and at every harmonic of it; the response plots use the two-port (ABCD and S-parameter) relations.",
		"Inductor loss is a series resistance R = ωL/Q(f), with Q interpolated log-log between the given points and held beyond them. For a wound inductor the AC resistance of its copper (annealed copper resistivity, with skin effect) is a floor under that loss. Coupled windings (transformers, baluns) share a lossy core, modelled by complex permeability: every term of the inductance matrix carries the same loss angle, ωM/Q beside ωL/Q, so a transformer's load ampere-turns cancel in its loss as in its flux. Each winding is judged on its core's loss from its own flux linkage, (ω/Q)·|λ|²/L: for windings on one core that is the core's whole loss, for a loose coupling the lone coil's.",
		"Capacitor loss is a series resistance ESR = 1/(ωC·Q(f)), or the esr= given, or tan δ/(ωC) from df=. Parts without a loss figure get a typical Q for their kind and dielectric, chosen on the low side so losses are not understated.",
		"The transmitter is an EMF behind its port impedance Z. The power given is the available power P, so the EMF is 2√(P·Re Z) RMS. With drive=delivered the EMF is scaled instead until the network takes P (never beyond 1000 times the available power).",
	)
	p.bullets("Harmonics and loads",
		"Each harmonic n of the carrier is driven as a source of its own at n·f, at the preset or given level in dB below the carrier's available power.",
		"Combination over carrier and harmonics: peak values add as if every harmonic peaked at the same instant (the worst phase), RMS values add as the root of the sum of squares, dissipations add.",
		"The antenna port sees the matched load; every load on the SWR circle, described by Γ = (Z − Z0)/(Z + Z0*), the power-wave reflection coefficient taken with reference Z0* so that it vanishes at the antenna's own impedance; any explicit loads; and, when asked, the antenna open and shorted. On the circle, each part's worst phase is found on the continuous circle, not only at the sampled phases.",
		"At harmonics the load is unknown, so each harmonic is taken at its own worst load over the continuous SWR circle, independently of the carrier and of the other harmonics: a safe upper bound.",
		"Voltage-type stress (peak and RMS voltage, peak flux density) is taken at PEP. Heating-type stress (RMS current, dissipation, temperature, current density, the flux judged against the heating guide) is taken at the average power: PEP times the mode's average-to-PEP ratio.",
		"Flux density is the winding's flux linkage over turns and effective core area (the transformer EMF equation), with toroid area and path length from the core dimensions. A core has three limits, judged apart: saturation (peak flux at PEP against the material's saturation flux density; a rating), a heating guide (the flux at average power against B₁·√(1 MHz/f), our formulation from core loss per cycle growing as B², one anchor B₁ per material class, or the material's own points; advice, at most marginal), and temperature (a rating).",
		"Core temperature is ambient plus a still-air rise from the average dissipation and wound surface, ΔT ≈ (P[mW]/A[cm²])^0.833 (common practice), reached in time as a first-order system: ΔT(t) = ΔT_final·(1 − e^(−t/τ)), τ = R_th·C_th, the heat capacity from the core's and the winding's mass (densities and specific heats from memory). The default is steady state; a key-down time or a keyed mode (on for a set part of a period) changes it. Its use is rise over allowed rise.",
		"A stress up to the derated limit (rating × derating factor) is ok, up to the rating marginal, past the rating a failure; a stressed quantity that has no rating is unrated. The safe power is the PEP at which the first rated quantity meets its derated limit: voltages, currents and flux grow with √P, dissipation with P, temperature rise through the thermal model; the heating guide never sets it. Ratings to buy are rounded up to common series (capacitor working voltages, the R10 preferred numbers for currents, usual resistor wattages).",
	)
	p.bullets("Clearances and arcing",
		"Each declared clearance (gap= on a part: plate or lead spacing; or a clearance statement between two nodes) is judged against the worst peak voltage between its two nodes over every case, harmonics added as peaks add.",
		fmt.Sprintf("Air: the uniform-field breakdown of the gap from Paschen's law for air, at the reduced p·d of the gap with the ISO 2533 standard-atmosphere pressure at the audit's altitude and the air at ambient temperature, times %.2g for RF (ion space charge lowers the breakdown of millimetre gaps at HF) and %.2g for the edges of plates and leads (common practice, from memory). That is the voltage that would arc; the profile derates it.", ratings.RFFactor, ratings.FieldFactor),
		fmt.Sprintf("Board surfaces: a creepage-style working voltage of %.0f V peak per mm for a clean uncoated board and %.0f V peak per mm under conformal coating (our own round figures, common practice from memory, in the spirit of the IEC 60664-1 family's tables, not copied from them).", ratings.BoardVpkPerMM, ratings.CoatedVpkPerMM),
		"Every node's peak to ground and every part's peak across it is compared with the voltage at which a typical 1 mm air gap would arc; where it is higher and no clearance is declared for that pair of nodes, a finding says where to look.",
		"A connector is a series part of zero length: its peak voltage is its centre conductor's to ground (the shell), its current the current through it.",
	)
	p.profiles()
	p.bullets("Published sources used",
		"C.-W. Ho, A. E. Ruehli, P. A. Brennan, “The modified nodal approach to network analysis”, IEEE Transactions on Circuits and Systems, 1975: the circuit equations.",
		"D. M. Pozar, Microwave Engineering: ABCD and S-parameter relations of two-ports.",
		"G. L. Matthaei, L. Young, E. M. T. Jones, Microwave Filters, Impedance-Matching Networks, and Coupling Structures, 1964: filter prototypes behind the example netlists.",
		"IEC 60205: effective area Ae and path length le of toroidal cores.",
		"IEC 60028: resistivity of annealed copper; IEC 60287-1-1: skin-effect factor of round wire.",
		"The transformer EMF equation, relating winding voltage, turns, core area and flux density.",
		"K. Kurokawa, “Power waves and the scattering matrix”, IEEE Transactions on Microwave Theory and Techniques, 1965: the load circle.",
		"ISO 3 preferred numbers (R10): current ratings to buy.",
		"ISO 2533 (ICAO) standard atmosphere: air pressure at altitude.",
		"Paschen's law in Townsend's form, with A, B and γ for air from Yu. P. Raizer, Gas Discharge Physics, 1991; the empirical uniform-field breakdown of air from E. Kuffel, W. S. Zaengl, J. Kuffel, High Voltage Engineering: Fundamentals, 2000; RF breakdown discussed in J. M. Meek, J. D. Craggs, Electrical Breakdown of Gases, 1978.",
		"IEC 60664-1: the family of creepage and clearance tables behind the board-surface guides (not copied).",
		"Touchstone File Format Specification 2.0: the sweep export.",
		"reproducible-builds.org, SOURCE_DATE_EPOCH specification: the report's date.",
	)
	p.bullets("What the estimate does not cover",
		"Arcing across gaps the netlist does not declare (beyond the 1 mm check of every node and part), across switch and relay contacts (including switching while transmitting), tracking of dirty or damp boards, and corona.",
		"Self-resonance and parasitic inductance and capacitance of parts and wiring, unless they are modelled in the netlist.",
		"Drift of part values with temperature and voltage; heat flowing between parts, and core loss beyond what the Q figures say (hence the heating guide).",
		"Intermodulation and any non-linear part; RF exposure and specific absorption rate (SAR) near antennas; mains and high-voltage supplies.",
	)
	p.f.Ln(2)
	p.font("B", 8.5)
	p.f.SetX(marginL)
	p.multi(bodyW, 4, "These figures are engineering estimates from a model of the circuit, not a guarantee. Confirm them by measurement at low power, follow local codes and licensed practice, and read SAFETY.md.")
}

// profileQ are the quantities a derating profile can carry factors for,
// in the order printed.
var profileQ = []ratings.Quantity{ratings.Vpk, ratings.Vrms, ratings.Irms, ratings.Pdiss, ratings.Bpk, ratings.Jrms, ratings.Pm, ratings.Arc}

// profiles prints each derating profile used, once.
func (p *pdfw) profiles() {
	var profs []*ratings.Profile
	seen := map[string]bool{}
	for _, s := range p.doc.Bank.Sections {
		if s.Profile == nil || seen[s.Profile.Name] {
			continue
		}
		seen[s.Profile.Name] = true
		profs = append(profs, s.Profile)
	}
	for _, pr := range profs {
		p.sub("Derating profile “"+pr.Name+"”", 40)
		p.para(8.5, fmt.Sprintf("Share of each absolute rating a part may use, by part class and quantity; an empty cell has no factor (1). "+
			"Core temperature is kept %s °C below the material's highest temperature.", num(pr.TempMargin, 0)))
		p.f.Ln(1)
		titles := []string{"part class"}
		for _, q := range profileQ {
			titles = append(titles, QuantityLabel(q))
		}
		cols := widths(titles, []float64{18, 10, 10, 10, 13, 12, 11, 11, 12}, "LRRRRRRRR")
		var rows []trow
		for _, class := range ratings.Classes() {
			m, ok := pr.Factors[class]
			if !ok {
				continue
			}
			r := trow{cells: []tcell{{s: class, bold: true}}}
			for _, q := range profileQ {
				if v, ok := m[q]; ok && v > 0 {
					r.cells = append(r.cells, tc(strconv.FormatFloat(v, 'f', -1, 64)))
				} else {
					r.cells = append(r.cells, tc(""))
				}
			}
			rows = append(rows, r)
		}
		p.table(cols, rows, 8)
	}
}

// listings prints every netlist as read, with line numbers, so the report
// and the files it judged stay together.
func (p *pdfw) listings() {
	f := p.f
	p.newPage("Netlists as audited")
	const size = 6.8
	const lh = 3.0
	const numW = 9.0
	listed := map[string]bool{} // a switched bank's positions share one source
	for _, s := range p.doc.Bank.Sections {
		if listed[s.File+"\x00"+s.SHA256] {
			continue
		}
		listed[s.File+"\x00"+s.SHA256] = true
		p.sub(Headline(s.File), 12)
		p.mono(6.3)
		p.text(colMuted)
		f.SetX(marginL)
		p.cell(bodyW, 3.4, "SHA-256 "+s.SHA256, 1, "L")
		f.Ln(1)
		if s.Netlist == nil {
			p.para(8.5, "(source not available)")
			continue
		}
		p.mono(size)
		charW := p.width("0")
		perLine := int((bodyW - numW - 2) / charW)
		if perLine < 20 {
			perLine = 20
		}
		src := strings.ToValidUTF8(string(s.Netlist.Source), "\uFFFD")
		src = strings.ReplaceAll(src, "\r\n", "\n")
		lines := strings.Split(src, "\n")
		if len(lines) > 0 && lines[len(lines)-1] == "" {
			lines = lines[:len(lines)-1]
		}
		for i, raw := range lines {
			text := circuits.Escape(expandTabs(raw))
			comment := strings.HasPrefix(strings.TrimSpace(text), "#")
			parts := wrapRunes(text, perLine)
			if len(parts) > listingMaxRows {
				// a line of many kilobytes would fill pages; its hash above
				// still identifies the file exactly
				rest := utf8.RuneCountInString(text) - (listingMaxRows-1)*perLine
				parts = append(parts[:listingMaxRows-1], fmt.Sprintf("… %d more characters not shown", rest))
			}
			for j, part := range parts {
				p.room(lh)
				y := f.GetY()
				p.mono(size)
				p.text(colMuted)
				mark := "↳" // a continuation of a long line
				if j == 0 {
					mark = strconv.Itoa(i + 1)
				}
				p.cellAt(marginL, y, numW, lh, mark, "R")
				if !comment {
					p.text(colInk)
				}
				p.cellAt(marginL+numW+2, y, bodyW-numW-2, lh, part, "L")
				f.SetY(y + lh)
			}
		}
		p.text(colInk)
		f.Ln(3)
	}
}

// listingMaxRows is the most rows one source line takes in the listing.
const listingMaxRows = 8

// expandTabs replaces tabs with spaces to the next multiple of eight.
func expandTabs(s string) string {
	if !strings.Contains(s, "\t") {
		return s
	}
	var b strings.Builder
	col := 0
	for _, r := range s {
		if r == '\t' {
			n := 8 - col%8
			b.WriteString(strings.Repeat(" ", n))
			col += n
			continue
		}
		b.WriteRune(r)
		col++
	}
	return b.String()
}

// wrapRunes cuts s into pieces of at most n characters; an empty line
// stays one empty piece.
func wrapRunes(s string, n int) []string {
	if utf8.RuneCountInString(s) <= n {
		return []string{s}
	}
	var out []string
	r := []rune(s)
	for len(r) > n {
		out = append(out, string(r[:n]))
		r = r[n:]
	}
	return append(out, string(r))
}

// bullets writes a sub-heading and its bulleted paragraphs.
func (p *pdfw) bullets(title string, items ...string) {
	p.sub(title, 12)
	for _, s := range items {
		p.bullet(8.5, s)
	}
}
