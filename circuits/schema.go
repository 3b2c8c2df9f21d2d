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
	Help     string // shown in "expected …" messages
}

// Keyword describes one statement of the netlist language.
type Keyword struct {
	Fields []string // names of positional fields, for messages
	Attrs  map[string]AttrSpec
	// Required attributes.
	Required []string
}

var lengthUnit = []string{"m"}

// ratingAttrs are read by the ratings layer; the parser checks their syntax.
var capacitorAttrs = map[string]AttrSpec{
	"q":          {Type: TPoints, Help: "Q, or Q@frequency points such as 90@3.5M,180@10M"},
	"esr":        {Type: TPositive, Units: []string{"ohm"}, Help: "series resistance in Ω"},
	"df":         {Type: TPositive, Units: []string{"%"}, Help: "dissipation factor tan δ, e.g. 0.001 or 0.1%"},
	"vpk":        {Type: TPositive, Units: []string{"V"}, Help: "rated peak voltage in V"},
	"vrms":       {Type: TPositive, Units: []string{"V"}, Help: "rated RMS voltage in V"},
	"irms":       {Type: TPoints, Units: []string{"A"}, Help: "rated RMS current in A, optionally at a frequency: 4@10M"},
	"pmax":       {Type: TPositive, Units: []string{"W"}, Help: "rated dissipation in W"},
	"dielectric": {Type: TWord, Help: "a dielectric class: c0g, np0, mica, porcelain, film, glass, air, vacuum, x7r, x5r, y5v, z5u"},
	"tol":        {Type: TPercent, Help: "value tolerance such as 5%"},
	"qtol":       {Type: TPercent, Help: "Q tolerance such as 20%"},
}

var inductorAttrs = map[string]AttrSpec{
	"q":     {Type: TPoints, Help: "Q, or Q@frequency points such as 90@3.5M,180@10M"},
	"core":  {Type: TWord, Help: "the name of a core statement"},
	"turns": {Type: TInt, Help: "number of turns, a whole number"},
	"wire":  {Type: TPositive, Units: lengthUnit, NeedUnit: true, Help: "wire diameter with a unit, e.g. 0.8mm"},
	"irms":  {Type: TPoints, Units: []string{"A"}, Help: "rated RMS current in A"},
	"tol":   {Type: TPercent, Help: "value tolerance such as 5%"},
	"qtol":  {Type: TPercent, Help: "Q tolerance such as 20%"},
}

var resistorAttrs = map[string]AttrSpec{
	"pmax": {Type: TPositive, Units: []string{"W"}, Help: "rated dissipation in W"},
	"vpk":  {Type: TPositive, Units: []string{"V"}, Help: "maximum working peak voltage in V"},
	"tol":  {Type: TPercent, Help: "value tolerance such as 5%"},
}

// Keywords is the whole statement table. Adding a component kind starts
// here (see DEVELOPERS.md).
var Keywords = map[string]Keyword{
	"title": {},
	"port": {Fields: []string{"in|out", "node"}, Attrs: map[string]AttrSpec{
		"z": {Type: TComplex, Help: "port impedance such as 50 or 12.5-j180"},
	}, Required: []string{"z"}},
	"core": {Fields: []string{"name"}, Attrs: map[string]AttrSpec{
		"ae":       {Type: TPositive, Units: []string{"mm2"}, NeedUnit: true, Help: "effective area with a unit, e.g. 15.5mm2"},
		"le":       {Type: TPositive, Units: lengthUnit, NeedUnit: true, Help: "effective path length with a unit, e.g. 42mm"},
		"al":       {Type: TPositive, Units: []string{"H"}, Help: "inductance factor in H per turn², e.g. 6.2nH"},
		"od":       {Type: TPositive, Units: lengthUnit, NeedUnit: true, Help: "outer diameter with a unit, e.g. 12.7mm"},
		"id":       {Type: TPositive, Units: lengthUnit, NeedUnit: true, Help: "inner diameter with a unit, e.g. 7.7mm"},
		"h":        {Type: TPositive, Units: lengthUnit, NeedUnit: true, Help: "height with a unit, e.g. 4.8mm"},
		"mu":       {Type: TPositive, Help: "initial relative permeability"},
		"material": {Type: TWord, Help: "a material name, built in or from a material statement"},
		"area":     {Type: TPositive, Units: []string{"mm2"}, NeedUnit: true, Help: "wound surface area for cooling, e.g. 900mm2 or 9cm2"},
	}},
	"capacitor": {Fields: []string{"name", "node", "node", "value"}, Attrs: capacitorAttrs},
	"inductor":  {Fields: []string{"name", "node", "node", "value"}, Attrs: inductorAttrs},
	"resistor":  {Fields: []string{"name", "node", "node", "value"}, Attrs: resistorAttrs},
	"coupling": {Fields: []string{"name", "inductor", "inductor"}, Attrs: map[string]AttrSpec{
		"k": {Type: TNumber, Help: "coupling coefficient between 0 and 1"},
	}, Required: []string{"k"}},
	"material": {Fields: []string{"name"}, Attrs: map[string]AttrSpec{
		"class": {Type: TWord, Help: "iron, nizn, mnzn or air"},
		"mu":    {Type: TPositive, Help: "initial relative permeability"},
		"tmax":  {Type: TNumber, Units: []string{"C"}, Help: "highest allowed core temperature in °C"},
		"flux":  {Type: TPoints, Units: []string{"T"}, Help: "guide peak flux density points such as 15mT@1M,3mT@28M"},
		"note":  {Type: TText, Help: "a short description"},
	}, Required: []string{"class"}},
	"audit": {Attrs: map[string]AttrSpec{
		"power":        {Type: TPositive, Units: []string{"W"}, Help: "PEP in W"},
		"mode":         {Type: TWord, Help: "carrier, data, cw, ssb, am or fm"},
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
	}},
}
