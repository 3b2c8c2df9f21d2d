package circuits

import (
	"fmt"
	"math"
	"math/cmplx"
	"strconv"
	"strings"
	"unicode/utf8"
)

// prefixes maps SI prefixes to their factors. "M" is mega and "m" is milli,
// as in SI; "u" stands in for "µ" where the keyboard has none.
var prefixes = map[string]float64{
	"f": 1e-15, "p": 1e-12, "n": 1e-9, "u": 1e-6, "µ": 1e-6, "μ": 1e-6,
	"m": 1e-3, "k": 1e3, "K": 1e3, "M": 1e6, "G": 1e9,
}

// units a value may carry after its prefix. Checking the unit against the
// field is left to the caller through the want argument.
var units = []string{"ohm", "Ohm", "Ω", "Hz", "mm2", "F", "H", "V", "A", "W", "m", "T", "%", "°C", "C"}

// ParseValue reads a real number with an optional SI prefix and an optional
// unit, e.g. "300p", "0.91uH", "2.2k", "15.5mm2", "10.1MHz", "50ohm".
// want lists the units accepted for this field (empty: any listed unit).
// The special unit "mm2" means square millimetres and returns m².
func ParseValue(s string, want ...string) (float64, error) {
	if s == "" {
		return 0, fmt.Errorf("empty value")
	}
	num, rest := splitNumber(s)
	if num == "" {
		return 0, fmt.Errorf("%s is not a number", Quote(s))
	}
	v, err := strconv.ParseFloat(num, 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, fmt.Errorf("%s is not a finite number", Quote(s))
	}
	if rest == "" {
		return v, nil
	}
	// mm2 is an area: read it before the prefix rule takes "m" as milli.
	if rest == "cm2" || rest == "cm²" {
		if !unitAllowed("mm2", want) {
			return 0, unitMismatch("cm2", want)
		}
		return v * 1e-4, nil
	}
	if rest == "mm2" || rest == "mm²" {
		if !unitAllowed("mm2", want) {
			return 0, unitMismatch("mm2", want)
		}
		return v * 1e-6, nil
	}
	// lengths also take centimetres and feet (international foot, 0.3048 m)
	if (rest == "cm" || rest == "ft") && len(want) > 0 && unitAllowed("m", want) {
		if rest == "cm" {
			return v * 1e-2, nil
		}
		return v * 0.3048, nil
	}
	// A bare unit ("50ohm", "1F") or a prefix followed by a unit or nothing.
	for _, u := range units {
		if rest == u {
			if u == "m" && (len(want) == 0 || !unitAllowed("m", want)) {
				break // "m" alone is milli unless metres are asked for
			}
			if !unitAllowed(u, want) {
				return 0, unitMismatch(u, want)
			}
			if u == "%" {
				return v / 100, nil
			}
			return v, nil
		}
	}
	r, size := utf8.DecodeRuneInString(rest)
	_ = r
	pre := rest[:size]
	if strings.HasPrefix(strings.ToUpper(rest), "MEG") {
		return 0, fmt.Errorf("%s: MEG is how circuit simulators spell mega; here write M for mega (m is milli), e.g. %sM", Quote(s), num)
	}
	f, ok := prefixes[pre]
	if !ok {
		return 0, fmt.Errorf("%s has an unknown prefix or unit %s (SI prefixes f p n u µ m k M G, then a unit)", Quote(s), Quote(rest))
	}
	unit := rest[size:]
	if unit == "" {
		return v * f, nil
	}
	if unit == "m2" && pre == "m" {
		return v * 1e-6, nil
	}
	for _, u := range units {
		if unit == u && u != "%" && u != "mm2" {
			if !unitAllowed(u, want) {
				return 0, unitMismatch(u, want)
			}
			return v * f, nil
		}
	}
	// a known unit in the wrong case: "Mhz", "mhz", "KHZ"
	for _, u := range units {
		if len(u) > 1 && strings.EqualFold(unit, u) {
			hint := "units are case-sensitive: write " + u
			if pre == "m" && u == "Hz" {
				hint = "m is milli: for megahertz write " + num + "MHz (units are case-sensitive)"
			} else {
				hint += ", e.g. " + num + pre + u
			}
			return 0, fmt.Errorf("%s has an unknown unit %s (%s)", Quote(s), Quote(unit), hint)
		}
	}
	return 0, fmt.Errorf("%s has an unknown unit %s (expected %s)", Quote(s), Quote(unit), wantText(want))
}

// unitQuantity names what each unit measures, for messages.
var unitQuantity = map[string]string{
	"F": "a capacitance", "H": "an inductance", "ohm": "a resistance", "Ohm": "a resistance", "Ω": "a resistance",
	"Hz": "a frequency", "V": "a voltage", "A": "a current", "W": "a power", "m": "a length", "T": "a flux density",
	"mm2": "an area", "cm2": "an area", "%": "a share", "C": "a temperature", "°C": "a temperature",
}

// unitMismatch says which quantity was written and which the field takes:
// "1uH" on a capacitor is an inductance where a capacitance belongs.
func unitMismatch(u string, want []string) error {
	got, ok1 := unitQuantity[u]
	need, ok2 := "", false
	if len(want) == 1 {
		need, ok2 = unitQuantity[want[0]]
	}
	if ok1 && ok2 && got != need {
		return fmt.Errorf("unit %s (%s) does not fit here (%s, %s)", u, got, wantText(want), need)
	}
	return fmt.Errorf("unit %s does not fit here (%s)", u, wantText(want))
}

func unitAllowed(u string, want []string) bool {
	if len(want) == 0 {
		return true
	}
	if u == "°C" {
		u = "C"
	}
	for _, w := range want {
		if w == u || (w == "ohm" && (u == "Ohm" || u == "Ω")) {
			return true
		}
	}
	return false
}

func wantText(want []string) string {
	if len(want) == 0 {
		return "a number with an optional SI prefix"
	}
	return "unit " + strings.Join(want, " or ")
}

// splitNumber cuts the leading decimal number (sign, digits, point, exponent)
// from s.
func splitNumber(s string) (num, rest string) {
	i := 0
	if i < len(s) && (s[i] == '+' || s[i] == '-') {
		i++
	}
	digits := 0
	for i < len(s) && (s[i] >= '0' && s[i] <= '9' || s[i] == '.') {
		i++
		digits++
	}
	if digits == 0 {
		return "", s
	}
	// exponent: e or E followed by an optional sign and digits
	if i < len(s) && (s[i] == 'e' || s[i] == 'E') {
		j := i + 1
		if j < len(s) && (s[j] == '+' || s[j] == '-') {
			j++
		}
		k := j
		for k < len(s) && s[k] >= '0' && s[k] <= '9' {
			k++
		}
		if k > j {
			i = k
		}
	}
	return s[:i], s[i:]
}

// ParseComplex reads an impedance such as "50", "12.5-j180", "12.5+j1.2k",
// "-j50" or "j25ohm". Prefixes apply to each part separately.
func ParseComplex(s string) (complex128, error) {
	t := strings.TrimSuffix(strings.TrimSuffix(strings.TrimSuffix(s, "ohm"), "Ω"), "Ohm")
	if t == "" {
		return 0, fmt.Errorf("empty impedance")
	}
	// find the j part: a '+' or '-' followed by j, or a leading j
	jpos := -1
	for i := 0; i < len(t); i++ {
		if t[i] == 'j' {
			jpos = i
			break
		}
	}
	if jpos < 0 {
		v, err := ParseValue(t, "ohm")
		if err != nil {
			return 0, err
		}
		return complex(v, 0), nil
	}
	sign := 1.0
	realPart := t[:jpos]
	if strings.HasSuffix(realPart, "-") {
		sign = -1
		realPart = realPart[:len(realPart)-1]
	} else if strings.HasSuffix(realPart, "+") {
		realPart = realPart[:len(realPart)-1]
	}
	var re float64
	if realPart != "" {
		v, err := ParseValue(realPart, "ohm")
		if err != nil {
			return 0, err
		}
		re = v
	}
	imText := t[jpos+1:]
	if imText == "" || imText[0] == '-' || imText[0] == '+' {
		return 0, fmt.Errorf("%s: expected a number after j, as in 12.5-j180", Quote(s))
	}
	im, err := ParseValue(imText, "ohm")
	if err != nil {
		return 0, err
	}
	z := complex(re, sign*im)
	if cmplx.IsNaN(z) || cmplx.IsInf(z) {
		return 0, fmt.Errorf("%s is not a finite impedance", Quote(s))
	}
	return z, nil
}

// FormatSI renders v with three significant figures and an SI prefix, then
// unit: 1234 "V" -> "1.23 kV". Non-finite values render as "—" so no NaN or
// Inf ever reaches a user.
func FormatSI(v float64, unit string) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return "—"
	}
	if v == 0 {
		return "0 " + unit
	}
	type pf struct {
		f float64
		p string
	}
	table := []pf{{1e9, "G"}, {1e6, "M"}, {1e3, "k"}, {1, ""}, {1e-3, "m"}, {1e-6, "µ"}, {1e-9, "n"}, {1e-12, "p"}, {1e-15, "f"}}
	a := math.Abs(v)
	chosen := table[len(table)-1]
	for _, t := range table {
		if a >= t.f*0.9995 {
			chosen = t
			break
		}
	}
	x := v / chosen.f
	var s string
	switch ax := math.Abs(x); {
	case ax >= 99.95:
		s = strconv.FormatFloat(x, 'f', 0, 64)
	case ax >= 9.995:
		s = strconv.FormatFloat(x, 'f', 1, 64)
	default:
		s = strconv.FormatFloat(x, 'f', 2, 64)
	}
	return s + " " + chosen.p + unit
}

// FormatComplex renders an impedance as "12.5-j180 Ω".
func FormatComplex(z complex128) string {
	re, im := real(z), imag(z)
	sign := "+"
	if im < 0 {
		sign = "-"
		im = -im
	}
	return trimFloat(re) + sign + "j" + trimFloat(im) + " Ω"
}

func trimFloat(v float64) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return "—"
	}
	return strconv.FormatFloat(v, 'g', 4, 64)
}

// FormatHz renders a frequency with up to six significant figures and no
// trailing zeros: 10.15 MHz stays 10.15 MHz (three figures would show a
// band edge as its neighbour).
func FormatHz(f float64) string {
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return "—"
	}
	p, unit := 1.0, "Hz"
	switch a := math.Abs(f); {
	case a >= 1e9:
		p, unit = 1e9, "GHz"
	case a >= 1e6:
		p, unit = 1e6, "MHz"
	case a >= 1e3:
		p, unit = 1e3, "kHz"
	}
	x, _ := strconv.ParseFloat(strconv.FormatFloat(f/p, 'g', 6, 64), 64)
	return strconv.FormatFloat(x, 'f', -1, 64) + " " + unit
}

// AWGDiameter is the diameter in metres of American Wire Gauge n (0000 is
// -3, 000 is -2, 00 is -1), by the rule that defines the gauge in ASTM
// B258: d = 0.005 in · 92^((36 − n)/39).
func AWGDiameter(n int) float64 {
	return 0.005 * 25.4e-3 * math.Pow(92, float64(36-n)/39)
}

// parseAWG reads a wire gauge written as "18awg", "AWG18" or "4/0awg".
func parseAWG(s string) (int, bool) {
	l := strings.ToLower(s)
	var g string
	switch {
	case strings.HasSuffix(l, "awg"):
		g = strings.TrimSpace(strings.TrimSuffix(l, "awg"))
	case strings.HasPrefix(l, "awg"):
		g = strings.TrimSpace(strings.TrimPrefix(l, "awg"))
	default:
		return 0, false
	}
	switch g {
	case "0000", "4/0":
		return -3, true
	case "000", "3/0":
		return -2, true
	case "00", "2/0":
		return -1, true
	}
	n, err := strconv.Atoi(g)
	if err != nil || n < 0 || n > 46 {
		return 0, false
	}
	return n, true
}
