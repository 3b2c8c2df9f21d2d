package main

import (
	"fmt"
	"io"
	"math"
	"os"
	"strconv"
	"strings"

	"rfstress/circuits"
	"rfstress/ratings"
	"rfstress/stress"
)

func init() {
	register(command{name: "template", summary: "write a commented starting netlist: lowpass, bandpass, tuner or pi, from the prototype formulas", run: runTemplate})
}

// A template is our own starting design: values from the textbook
// prototype formulas, ratings sized by auditing the design itself under
// its own `audit` line, so the file audits clean as written. The
// builder returns the parts (without ratings) and the comment lines that
// show the working.
type tmplPart struct {
	kind   circuits.Kind
	name   string
	a, b   string
	value  float64
	q      string // q= as written
	diel   string // capacitors
	vpk    float64
	irms   float64
	wire   float64 // inductors, m
	gap    float64 // air-dielectric capacitors: plate spacing, m
	remark string
}

type tmplDesign struct {
	title   string
	zin     complex128
	zout    complex128
	out     string // the antenna port's node
	parts   []*tmplPart
	working []string // comment lines: method and numbers
	audit   string   // the audit line's settings after power and freq
}

// Rating steps a builder buys from, smallest first (common practice:
// the round figures parts are sold at).
var (
	vpkSteps  = []float64{100, 200, 300, 500, 750, 1000, 1500, 2000, 3000, 4000, 5000, 7500, 10000, 15000, 20000}
	irmsSteps = []float64{0.5, 1, 1.5, 2, 3, 4, 5, 7.5, 10, 15, 20, 30}
	wireSteps = []float64{0.5e-3, 0.8e-3, 1e-3, 1.25e-3, 1.5e-3, 2e-3, 2.5e-3, 3e-3, 4e-3, 5e-3}
	// plate spacings of air variables, from receiving types to
	// transmitting ones (common practice)
	gapSteps = []float64{0.3e-3, 0.5e-3, 0.75e-3, 1e-3, 1.5e-3, 2e-3, 3e-3, 4e-3, 5e-3, 7.5e-3, 10e-3}
)

func runTemplate(args []string, stdout, stderr io.Writer) (int, error) {
	fs := newFlags("template", "template lowpass|bandpass|tuner|pi --freq F [--power W] [options] > my.net",
		"Writes a commented starting netlist for a transmit lowpass, a bandpass, a T-network tuner\n"+
			"or a pi network. Values come from the prototype formulas named in the file; ratings are\n"+
			"sized by auditing the design under its own audit line, so it audits clean as written.\n"+
			"Replace the ratings with those of the parts you buy, then audit again.", stdout)
	freq := fs.String("freq", "", "operating `frequency`, e.g. 7.1M (required)")
	power := fs.Float64("power", 100, "PEP in `watts`")
	z := fs.Float64("z", 50, "system impedance in `ohms` (transmitter side)")
	poles := fs.Int("poles", 5, "lowpass/bandpass: `number` of prototype elements (odd, 3 to 9)")
	response := fs.String("response", "chebyshev", "lowpass/bandpass `shape`: chebyshev or butterworth")
	ripple := fs.Float64("ripple", 0.1, "Chebyshev passband ripple in `dB`")
	cutoff := fs.String("cutoff", "", "lowpass cutoff `frequency` (default 1.3 × --freq)")
	bw := fs.String("bw", "", "bandpass `bandwidth` (default 10 % of --freq)")
	load := fs.String("load", "", "tuner/pi: antenna `impedance`, complex allowed (default: tuner 12.5-j180, pi 50)")
	ql := fs.Float64("q", 3, "pi: loaded `Q`")
	if help, err := parseFlags(fs, args); help || err != nil {
		return exitOK, err
	}
	if fs.NArg() != 1 {
		return exitUsage, usagef("template needs one shape: lowpass, bandpass, tuner or pi (see rfstress template --help)")
	}
	if *freq == "" {
		return exitUsage, usagef("template needs --freq, the operating frequency (e.g. --freq 7.1M)")
	}
	f0, err := parseFreq("freq", *freq)
	if err != nil {
		return exitUsage, err
	}
	if !(*power > 0) || *power > 1e6 {
		return exitUsage, usagef("--power %g: expected a PEP above 0 W", *power)
	}
	if !(*z > 0) || *z > 1e4 {
		return exitUsage, usagef("--z %g: expected an impedance above 0 Ω", *z)
	}
	var d *tmplDesign
	switch shape := fs.Arg(0); shape {
	case "lowpass", "bandpass":
		if *poles < 3 || *poles > 9 || *poles%2 == 0 {
			return exitUsage, usagef("--poles %d: expected an odd number from 3 to 9 (the templates begin and end with a shunt element, which takes an odd count; an even Chebyshev also cannot have equal source and load)", *poles)
		}
		var g []float64
		name := ""
		switch *response {
		case "chebyshev":
			if !(*ripple > 0) || *ripple > 3 {
				return exitUsage, usagef("--ripple %g: expected 0 < ripple ≤ 3 dB", *ripple)
			}
			g = chebyshevG(*poles, *ripple)
			name = fmt.Sprintf("%d-pole %s dB Chebyshev", *poles, trimFloat(*ripple))
		case "butterworth":
			g = butterworthG(*poles)
			name = fmt.Sprintf("%d-pole Butterworth", *poles)
		default:
			return exitUsage, usagef("--response %s: expected chebyshev or butterworth", *response)
		}
		if shape == "lowpass" {
			fc := 1.3 * f0
			if *cutoff != "" {
				if fc, err = parseFreq("cutoff", *cutoff); err != nil {
					return exitUsage, err
				}
				if fc <= f0 {
					return exitUsage, usagef("--cutoff %s: must be above --freq %s", *cutoff, *freq)
				}
			}
			d = lowpassDesign(g, name, *z, f0, fc)
		} else {
			b := 0.1 * f0
			if *bw != "" {
				if b, err = parseFreq("bw", *bw); err != nil {
					return exitUsage, err
				}
				if b >= f0 {
					return exitUsage, usagef("--bw %s: must be below --freq %s", *bw, *freq)
				}
			}
			d = bandpassDesign(g, name, *z, f0, b)
		}
	case "tuner", "pi":
		zl := complex(12.5, -180)
		if shape == "pi" {
			zl = complex(*z, 0)
		}
		if *load != "" {
			v, err := circuits.ParseComplex(*load)
			if err != nil || !(real(v) > 0) {
				return exitUsage, usagef("--load %s: expected an impedance with a positive resistance, e.g. 12.5-j180", *load)
			}
			zl = v
		}
		if shape == "tuner" {
			d = tunerDesign(*z, zl, f0)
		} else {
			if !(*ql >= 1) || *ql > 50 {
				return exitUsage, usagef("--q %g: expected a loaded Q from 1 to 50", *ql)
			}
			if d, err = piDesign(*z, zl, f0, *ql); err != nil {
				return exitUsage, err
			}
		}
	default:
		return exitUsage, usagef("template %s: unknown shape (expected lowpass, bandpass, tuner or pi)", shape)
	}
	src, err := sizeRatings(d, f0, *power)
	if err != nil {
		return exitUsage, err
	}
	_, err = stdout.Write(src)
	return exitOK, err
}

// butterworthG: g_k = 2·sin((2k−1)π/(2n)) (Matthaei, Young & Jones 1964,
// eq. 4.05-1); g[0] = 1 is the source.
func butterworthG(n int) []float64 {
	g := make([]float64, n+1)
	g[0] = 1
	for k := 1; k <= n; k++ {
		g[k] = 2 * math.Sin(float64(2*k-1)*math.Pi/float64(2*n))
	}
	return g
}

// chebyshevG: the equal-ripple prototype (Matthaei, Young & Jones 1964,
// eq. 4.05-2): β = ln coth(L_Ar/17.37), γ = sinh(β/2n), a_k =
// sin((2k−1)π/2n), b_k = γ² + sin²(kπ/n), g_1 = 2a_1/γ, g_k =
// 4a_{k−1}a_k/(b_{k−1}g_{k−1}).
func chebyshevG(n int, lar float64) []float64 {
	beta := math.Log(1 / math.Tanh(lar/(40/math.Ln10)))
	gamma := math.Sinh(beta / float64(2*n))
	a := func(k int) float64 { return math.Sin(float64(2*k-1) * math.Pi / float64(2*n)) }
	b := func(k int) float64 {
		s := math.Sin(float64(k) * math.Pi / float64(n))
		return gamma*gamma + s*s
	}
	g := make([]float64, n+1)
	g[0] = 1
	g[1] = 2 * a(1) / gamma
	for k := 2; k <= n; k++ {
		g[k] = 4 * a(k-1) * a(k) / (b(k-1) * g[k-1])
	}
	return g
}

func gList(g []float64) string {
	var s []string
	for k := 1; k < len(g); k++ {
		s = append(s, fmt.Sprintf("g%d=%.4f", k, g[k]))
	}
	return strings.Join(s, " ")
}

// lowpassDesign: shunt-capacitor-first ladder, C = g/(2π·fc·R),
// L = g·R/(2π·fc) (Matthaei, Young & Jones 1964, sec. 4.04).
func lowpassDesign(g []float64, name string, r, f0, fc float64) *tmplDesign {
	wc := 2 * math.Pi * fc
	d := &tmplDesign{title: fmt.Sprintf("%s lowpass, cutoff %s, for %s", name, circuits.FormatHz(fc), circuits.FormatHz(f0)),
		zin: complex(r, 0), zout: complex(r, 0),
		audit: "mode=ssb swr=2 faults=open,short harmonics=push-pull"}
	d.working = []string{
		fmt.Sprintf("%s lowpass prototype (Matthaei, Young & Jones 1964, sec. 4.05):", name),
		"  " + gList(g),
		fmt.Sprintf("scaled to R = %s Ω and cutoff fc = %s: C = g/(2π·fc·R), L = g·R/(2π·fc)", trimFloat(r), circuits.FormatHz(fc)),
		"(the cutoff sits above the operating frequency so the band is in the flat part)",
	}
	n := len(g) - 1
	node := 1
	for k := 1; k <= n; k++ {
		if k%2 == 1 {
			d.parts = append(d.parts, &tmplPart{kind: circuits.Capacitor, name: fmt.Sprintf("C%d", k), a: nodeName(node), b: circuits.Ground,
				value: g[k] / (wc * r), q: "1500", diel: "mica", remark: fmt.Sprintf("g%d", k)})
		} else {
			d.parts = append(d.parts, &tmplPart{kind: circuits.Inductor, name: fmt.Sprintf("L%d", k), a: nodeName(node), b: nodeName(node + 1),
				value: g[k] * r / wc, q: "200", remark: fmt.Sprintf("g%d, air-wound", k)})
			node++
		}
	}
	d.out = nodeName(node)
	return d
}

// bandpassDesign: the lowpass prototype moved to the band by the
// lowpass-to-bandpass mapping (Matthaei, Young & Jones 1964, sec. 8.04):
// each shunt g becomes a parallel resonator C = g/(ω0·w·R), L = w·R/(ω0·g);
// each series g a series resonator L = g·R/(ω0·w), C = w/(ω0·g·R), with
// w the fractional bandwidth.
func bandpassDesign(g []float64, name string, r, f0, bw float64) *tmplDesign {
	w0 := 2 * math.Pi * f0
	w := bw / f0
	d := &tmplDesign{title: fmt.Sprintf("%s bandpass, %s wide at %s", name, circuits.FormatHz(bw), circuits.FormatHz(f0)),
		zin: complex(r, 0), zout: complex(r, 0),
		audit: "mode=ssb swr=2 faults=open,short harmonics=push-pull"}
	d.working = []string{
		fmt.Sprintf("%s lowpass prototype (Matthaei, Young & Jones 1964, sec. 4.05):", name),
		"  " + gList(g),
		fmt.Sprintf("mapped to the band (sec. 8.04): f0 = %s, fractional bandwidth w = %s",
			circuits.FormatHz(f0), strconv.FormatFloat(w, 'f', 4, 64)),
		"  shunt g: parallel L-C to ground, C = g/(ω0·w·R), L = w·R/(ω0·g)",
		"  series g: series L-C, L = g·R/(ω0·w), C = w/(ω0·g·R)",
	}
	n := len(g) - 1
	node := 1
	for k := 1; k <= n; k++ {
		if k%2 == 1 {
			d.parts = append(d.parts,
				&tmplPart{kind: circuits.Capacitor, name: fmt.Sprintf("C%d", k), a: nodeName(node), b: circuits.Ground,
					value: g[k] / (w0 * w * r), q: "1500", diel: "mica", remark: fmt.Sprintf("g%d, shunt resonator", k)},
				&tmplPart{kind: circuits.Inductor, name: fmt.Sprintf("L%d", k), a: nodeName(node), b: circuits.Ground,
					value: w * r / (w0 * g[k]), q: "200", remark: fmt.Sprintf("g%d, shunt resonator", k)})
		} else {
			mid := fmt.Sprintf("s%d", k)
			d.parts = append(d.parts,
				&tmplPart{kind: circuits.Inductor, name: fmt.Sprintf("L%d", k), a: nodeName(node), b: mid,
					value: g[k] * r / (w0 * w), q: "200", remark: fmt.Sprintf("g%d, series resonator", k)},
				&tmplPart{kind: circuits.Capacitor, name: fmt.Sprintf("C%d", k), a: mid, b: nodeName(node + 1),
					value: w / (w0 * g[k] * r), q: "1500", diel: "mica", remark: fmt.Sprintf("g%d, series resonator", k)})
			node++
		}
	}
	d.out = nodeName(node)
	return d
}

// tunerDesign: a high-pass T (series C, shunt L, series C) matching the
// transmitter's R to the antenna ZL = RL + jXL through a virtual
// resistance Rv above both (the two-L-section view of the T; Bowick,
// RF Circuit Design, ch. 4): Q1 = √(Rv/R − 1), Q2 = √(Rv/RL − 1),
// X_C1 = Q1·R, X_C2 = Q2·RL + XL, X_L = (Rv/Q1)‖(Rv/Q2).
func tunerDesign(r float64, zl complex128, f0 float64) *tmplDesign {
	rl, xl := real(zl), imag(zl)
	// Rv = 10·R gives the transmitter side a loaded Q of 3 (common
	// practice); a capacitive antenna needs Q2·RL above −XL so that C2
	// is still a capacitor, with some margin
	rv := math.Max(r, rl) * 10
	q2min := 1.0
	if xl < 0 {
		q2min = math.Max(q2min, -1.5*xl/rl)
	}
	if rv < rl*(1+q2min*q2min) {
		rv = rl * (1 + q2min*q2min)
	}
	q1 := math.Sqrt(rv/r - 1)
	q2 := math.Sqrt(rv/rl - 1)
	w0 := 2 * math.Pi * f0
	xc1 := q1 * r
	xc2 := q2*rl + xl // the antenna's own reactance counts toward C2's
	xL := (rv / q1) * (rv / q2) / (rv/q1 + rv/q2)
	d := &tmplDesign{title: fmt.Sprintf("T-network tuner, %s Ω to %s Ω at %s", trimFloat(r), strings.TrimSuffix(circuits.FormatComplex(zl), " Ω"), circuits.FormatHz(f0)),
		zin: complex(r, 0), zout: zl, out: "n3", audit: "mode=ssb swr=1.5 harmonics=none"}
	d.working = []string{
		"High-pass T: series C1, shunt L1, series C2, seen as two L sections back to back",
		"meeting at a virtual resistance Rv (Bowick, RF Circuit Design, ch. 4):",
		fmt.Sprintf("  Rv = %s Ω, Q1 = √(Rv/R − 1) = %.3f, Q2 = √(Rv/RL − 1) = %.3f", trimFloat(math.Round(rv*10)/10), q1, q2),
		fmt.Sprintf("  X_C1 = Q1·R = %.1f Ω; X_C2 = Q2·RL + XL = %.1f Ω; X_L1 = (Rv/Q1)‖(Rv/Q2) = %.1f Ω", xc1, xc2, xL),
		"Lossless values: a real coil's loss moves the match; retune with `rfstress solve`.",
		"Harmonics are left out (harmonics=none): a lowpass ahead of the tuner removes them.",
	}
	d.parts = []*tmplPart{
		{kind: circuits.Capacitor, name: "C1", a: "n1", b: "n2", value: 1 / (w0 * xc1), q: "3000", diel: "air", remark: "transmitter side, air variable"},
		{kind: circuits.Inductor, name: "L1", a: "n2", b: circuits.Ground, value: xL / w0, q: "200", remark: "roller or tapped coil"},
		{kind: circuits.Capacitor, name: "C2", a: "n2", b: "n3", value: 1 / (w0 * xc2), q: "3000", diel: "air", remark: "antenna side, air variable"},
	}
	return d
}

// piDesign: a pi network (shunt C1, series L, shunt C2) for loaded Q,
// through a virtual resistance below both ends (Bowick, RF Circuit
// Design, ch. 4): Rv = Rmax/(Q² + 1), Q1 = √(R1/Rv − 1), Q2 = √(R2/Rv − 1),
// X_C1 = R1/Q1, X_C2 = R2/Q2, X_L = (Q1 + Q2)·Rv.
func piDesign(r1 float64, zl complex128, f0, q float64) (*tmplDesign, error) {
	r2 := real(zl)
	if imag(zl) != 0 {
		return nil, usagef("--load: a pi template matches resistances; give the load's resistance (the output capacitor can absorb a reactance later)")
	}
	rv := math.Max(r1, r2) / (q*q + 1)
	q1 := math.Sqrt(r1/rv - 1)
	q2 := math.Sqrt(r2/rv - 1)
	w0 := 2 * math.Pi * f0
	d := &tmplDesign{title: fmt.Sprintf("pi network, %s Ω to %s Ω at %s, loaded Q %s", trimFloat(r1), trimFloat(r2), circuits.FormatHz(f0), trimFloat(q)),
		zin: complex(r1, 0), zout: complex(r2, 0), out: "n2", audit: "mode=ssb swr=2 faults=open,short harmonics=push-pull"}
	d.working = []string{
		"Pi network: shunt C1, series L1, shunt C2, two L sections meeting at a virtual",
		"resistance Rv below both ends (Bowick, RF Circuit Design, ch. 4):",
		fmt.Sprintf("  Rv = Rmax/(Q² + 1) = %.2f Ω, Q1 = %.3f, Q2 = %.3f", rv, q1, q2),
		fmt.Sprintf("  X_C1 = R1/Q1 = %.1f Ω, X_C2 = R2/Q2 = %.1f Ω, X_L = (Q1 + Q2)·Rv = %.1f Ω", r1/q1, r2/q2, (q1+q2)*rv),
	}
	d.parts = []*tmplPart{
		{kind: circuits.Capacitor, name: "C1", a: "n1", b: circuits.Ground, value: q1 / (w0 * r1), q: "1500", diel: "mica", remark: "input side"},
		{kind: circuits.Inductor, name: "L1", a: "n1", b: "n2", value: (q1 + q2) * rv / w0, q: "200", remark: "air-wound"},
		{kind: circuits.Capacitor, name: "C2", a: "n2", b: circuits.Ground, value: q2 / (w0 * r2), q: "1500", diel: "mica", remark: "output side"},
	}
	return d, nil
}

func nodeName(i int) string { return "n" + strconv.Itoa(i) }

func trimFloat(v float64) string { return strconv.FormatFloat(v, 'g', 6, 64) }

// siText writes a value with an SI prefix the netlist reads (u for µ),
// four significant figures.
func siText(v float64) string {
	type pf struct {
		f float64
		p string
	}
	for _, t := range []pf{{1e9, "G"}, {1e6, "M"}, {1e3, "k"}, {1, ""}, {1e-3, "m"}, {1e-6, "u"}, {1e-9, "n"}, {1e-12, "p"}} {
		if math.Abs(v) >= t.f*0.99995 {
			return strconv.FormatFloat(v/t.f, 'g', 4, 64) + t.p
		}
	}
	return strconv.FormatFloat(v/1e-15, 'g', 4, 64) + "f"
}

// text renders the design as a netlist.
func (d *tmplDesign) text(f0, power float64) []byte {
	var b strings.Builder
	line := func(format string, a ...any) { fmt.Fprintf(&b, format+"\n", a...) }
	line("# rfstress template: %s", d.title)
	line("#")
	line("# A starting point of our own, not a published design. How the values came:")
	for _, w := range d.working {
		line("#   %s", w)
	}
	line("#")
	line("# Ratings (vpk=, irms=, wire=, an air variable's plate gap=) were sized by")
	line("# auditing this file under its own audit line, with the standard derating,")
	line("# and rounded up to common steps. They are what the parts must at least")
	line("# carry: replace them with the ratings of the parts you buy, add tol=, real")
	line("# Q and cores, and audit again:")
	line("#   rfstress audit my.net --report my.pdf")
	line("#")
	line("# CAUTION: RF voltages at tanks, trimmers and tuner capacitors reach kilovolts")
	line("# even at 100 W: RF burns and arcing. Never touch or adjust while transmitting.")
	line("# See SAFETY.md; follow local codes and licensed practice.")
	line("")
	line("title  %s", d.title)
	line("port   in  n1  z=%s      # transmitter side", zText(d.zin))
	line("port   out %s  z=%s      # antenna side", d.out, zText(d.zout))
	line("")
	for _, p := range d.parts {
		switch p.kind {
		case circuits.Capacitor:
			gap := ""
			if p.diel == "air" {
				gap = " gap=" + trimFloat(p.gap*1e3) + "mm"
			}
			line("capacitor %-3s %-3s %-3s %-8s q=%s dielectric=%s vpk=%s irms=%s%s   # %s",
				p.name, p.a, p.b, siText(p.value)+"F", p.q, p.diel, trimFloat(p.vpk), trimFloat(p.irms), gap, p.remark)
		case circuits.Inductor:
			line("inductor  %-3s %-3s %-3s %-8s q=%s wire=%smm   # %s",
				p.name, p.a, p.b, siText(p.value)+"H", p.q, trimFloat(p.wire*1e3), p.remark)
		}
	}
	line("")
	line("audit  power=%s freq=%s %s", trimFloat(power), siText(f0)+"Hz", d.audit)
	return []byte(b.String())
}

func zText(z complex128) string {
	if imag(z) == 0 {
		return trimFloat(real(z))
	}
	sign := "+"
	if imag(z) < 0 {
		sign = "-"
	}
	return trimFloat(real(z)) + sign + "j" + trimFloat(math.Abs(imag(z)))
}

// sizeRatings starts every part at the smallest step, audits, raises
// each rating that is not ok to the next step, and repeats until the
// whole file audits ok.
func sizeRatings(d *tmplDesign, f0, power float64) ([]byte, error) {
	for _, p := range d.parts {
		p.vpk, p.irms, p.wire, p.gap = vpkSteps[0], irmsSteps[0], wireSteps[0], gapSteps[0]
	}
	for round := 0; round < 40; round++ {
		src := d.text(f0, power)
		sec, err := auditSource("template.net", src)
		if err != nil {
			return nil, fmt.Errorf("template: %v", err)
		}
		if sec.Verdict == ratings.OK {
			return src, nil
		}
		for i, pr := range sec.Parts {
			p := d.parts[i]
			for q, st := range pr.Stress {
				if st.Verdict == ratings.OK {
					continue
				}
				switch q {
				case ratings.Vpk, ratings.Vrms:
					p.vpk = nextStep(vpkSteps, p.vpk)
				case ratings.Irms:
					p.irms = nextStep(irmsSteps, p.irms)
				case ratings.Jrms, ratings.Temp, ratings.Pdiss:
					p.wire = nextStep(wireSteps, p.wire)
				case ratings.Arc:
					p.gap = nextStep(gapSteps, p.gap)
				}
			}
		}
	}
	return nil, fmt.Errorf("template: no ratings in the usual steps carry %s W PEP at this design; lower --power or change the design", trimFloat(power))
}

func nextStep(steps []float64, v float64) float64 {
	for _, s := range steps {
		if s > v*1.0001 {
			return s
		}
	}
	return v * 1.5
}

// auditSource audits netlist text under its own audit lines with the
// standard profile and built-in materials.
func auditSource(name string, src []byte) (*stress.Section, error) {
	nl, err := circuits.Parse(name, src)
	if err != nil {
		return nil, err
	}
	c, err := circuits.Build(nl)
	if err != nil {
		return nil, err
	}
	cond := stress.Defaults()
	if err := cond.Apply(stress.FileSettings(nl)); err != nil {
		return nil, err
	}
	prof, err := ratings.LoadProfile(cond.Derate, os.ReadFile)
	if err != nil {
		return nil, err
	}
	rs, err := ratings.Prepare(nl, ratings.Builtin(), prof)
	if err != nil {
		return nil, err
	}
	eng, err := stress.NewEngine(c, rs, cond)
	if err != nil {
		return nil, err
	}
	return eng.Audit()
}
