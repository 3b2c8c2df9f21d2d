package circuits

// AttrType says how an attribute value is written and read.
type AttrType int

const (
	// TNumber: a real number with SI prefix and one of the field's units.
	TNumber AttrType = iota
	// TPositive: like TNumber but must be > 0.
	TPositive
	// TPoints: a constant or points "value@frequency" joined by commas.
	TPoints
	// TComplex: an impedance, possibly complex ("12.5-j180"); commas join several.
	TComplex
	// TWord: one word (a name or a keyword).
	TWord
	// TWords: words joined by commas.
	TWords
	// TInt: a positive whole number.
	TInt
	// TPercent: a share written with a % sign ("5%").
	TPercent
	// TRange: two frequencies "lo:hi".
	TRange
	// TText: kept verbatim; the layer that uses it reads it.
	TText
	// TNumbers: numbers joined by commas.
	TNumbers
)

// AttrSpec describes one attribute a keyword accepts.
type AttrSpec struct {
	Type  AttrType
	Units []string // accepted units for numbers; empty means a bare number
	// NeedUnit makes a bare number an error; used for lengths and areas,
	// where a bare number is almost always a unit slip (mm taken as m).
	NeedUnit bool
	// Gauge lets a wire diameter be written as an AWG number ("18awg").
	Gauge bool
	// Choices, for a TWord, are the words allowed, read case-insensitively
	// and kept in lower case, so every layer reads the same word.
	Choices []string
	Help    string // shown in "expected …" messages
}

// Keyword describes one statement of the netlist language.
type Keyword struct {
	Fields []string // names of positional fields, for messages
	Attrs  map[string]AttrSpec
	// Required attributes.
	Required []string
}

var lengthUnit = []string{"m"}

// Keywords is the statement table. Element kinds add their own keyword
// when they register (kind.go); the rest are declarations and directives.
var Keywords = map[string]Keyword{
	"title": {},
	"port": {Fields: []string{"in|out", "node"}, Attrs: map[string]AttrSpec{
		"z":        {Type: TComplex, Help: "port impedance such as 50 or 12.5-j180"},
		"source":   {Type: TComplex, Help: "the transmitter's output impedance (port in) such as 3+j0"},
		"cm":       {Type: TComplex, Help: "common-mode impedance from a balanced load's centre to gnd (port out A B) such as 2k"},
		"measured": measuredAttrs["measured"],
		"outside":  measuredAttrs["outside"],
	}, Required: []string{"z"}},
	"core": {Fields: []string{"name"}, Attrs: map[string]AttrSpec{
		"ae":       {Type: TPositive, Units: []string{"mm2"}, NeedUnit: true, Help: "effective area with a unit, e.g. 16mm2"},
		"le":       {Type: TPositive, Units: lengthUnit, NeedUnit: true, Help: "effective path length with a unit, e.g. 40mm"},
		"al":       {Type: TPositive, Units: []string{"H"}, Help: "inductance factor in H per turn², e.g. 6.2nH"},
		"od":       {Type: TPositive, Units: lengthUnit, NeedUnit: true, Help: "outer diameter with a unit, e.g. 13mm"},
		"id":       {Type: TPositive, Units: lengthUnit, NeedUnit: true, Help: "inner diameter with a unit, e.g. 7mm"},
		"h":        {Type: TPositive, Units: lengthUnit, NeedUnit: true, Help: "height with a unit, e.g. 5mm"},
		"mu":       {Type: TPositive, Help: "initial relative permeability"},
		"material": {Type: TWord, Help: "a material name, built in or from a material statement"},
		"area":     {Type: TPositive, Units: []string{"mm2"}, NeedUnit: true, Help: "wound surface area for cooling, e.g. 900mm2 or 9cm2"},
	}},
	"coupling": {Fields: []string{"name", "inductor", "inductor"}, Attrs: map[string]AttrSpec{
		"k": {Type: TNumber, Help: "coupling coefficient between 0 and 1"},
	}, Required: []string{"k"}},
	"material": {Fields: []string{"name"}, Attrs: map[string]AttrSpec{
		"class": {Type: TWord, Help: "iron, nizn, mnzn or air"},
		"mu":    {Type: TPositive, Help: "initial relative permeability"},
		"tmax":  {Type: TNumber, Units: []string{"C"}, Help: "highest allowed core temperature in °C"},
		"bsat":  {Type: TPositive, Units: []string{"T"}, Help: "saturation flux density such as 0.3T"},
		"guide": {Type: TPoints, Units: []string{"T"}, Help: "heating-guide peak flux density at average power, or points such as 15mT@1M,3mT@28M"},
		"note":  {Type: TText, Help: "a short description"},
	}, Required: []string{"class"}},
	"select": {Fields: []string{"name"}, Attrs: map[string]AttrSpec{
		"closed": {Type: TWords, Help: "the switches closed in this position, such as S1,S4"},
		"band":   {Type: TRange, Help: "the carrier band of this position, such as 7M:7.3M"},
	}, Required: []string{"closed", "band"}},
	"audit": {Attrs: map[string]AttrSpec{
		"power":        {Type: TPositive, Units: []string{"W"}, Help: "PEP in W"},
		"mode":         {Type: TWord, Help: "a mode preset such as carrier, data, cw, ssb, am, fm, data-15s or tune"},
		"avg-ratio":    {Type: TPositive, Help: "average to PEP power ratio, 0 < r ≤ 1"},
		"drive":        {Type: TWord, Help: "available or delivered"},
		"harmonics":    {Type: TText, Help: "a preset (none, push-pull, single-ended, square) or dBc values such as -30,-12,-40"},
		"band":         {Type: TRange, Help: "carrier band such as 10.1M:10.15M"},
		"freq":         {Type: TPositive, Units: []string{"Hz"}, Help: "a single carrier frequency such as 7.1M"},
		"points":       {Type: TInt, Help: "carrier frequencies across the band"},
		"swr":          {Type: TNumber, Help: "SWR of the load circle, ≥ 1"},
		"phases":       {Type: TInt, Help: "loads around the SWR circle"},
		"load":         {Type: TComplex, Help: "explicit loads such as 12.5-j180"},
		"faults":       {Type: TWords, Help: "open, short or both: open,short"},
		"carrier-also": {Type: TNumbers, Units: []string{"Hz"}, Help: "extra carrier frequencies such as 14.2M"},
		"derate":       {Type: TWord, Help: "derating profile: standard, strict or none"},
		"ambient":      {Type: TNumber, Units: []string{"C"}, Help: "ambient temperature in °C"},
		"harmonic-max": {Type: TInt, Help: "highest harmonic order audited"},
		"key-down":     {Type: TText, Help: "time at the mode's average power before the temperature is judged, such as 90s or 5m; steady for steady state"},
		"tx-swr-max":   {Type: TNumber, Help: "highest SWR the transmitter may see, e.g. 2"},
		"altitude":     {Type: TNumber, Units: lengthUnit, NeedUnit: true, Help: "altitude above sea level with a unit, e.g. 1500m: air pressure for clearances"},
		"part-faults":  {Type: TText, Help: "single-part faults: each, or a list such as C9:short,L3:open"},
	}},
}
