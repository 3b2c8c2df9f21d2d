package circuits

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// base is a valid netlist; each malformed case replaces or adds lines.
const base = `title error test
port in n1 z=50
port out n2 z=50
capacitor C1 n1 gnd 300p q=1000
inductor L1 n1 n2 1u q=200
capacitor C2 n2 gnd 300p q=1000
`

// TestBaseIsValid: the template the error cases start from parses.
func TestBaseIsValid(t *testing.T) {
	mustParse(t, "t.net", base)
}

// TestParseErrors: each malformed netlist reports exactly one error, with
// the file, line, column (in characters, from 1) of the offending text, a
// message and the expected form. The messages are what the format
// document (docs/netlist.md) promises; the test was written from it.
func TestParseErrors(t *testing.T) {
	cases := []struct {
		name string
		text string
		want string
	}{
		// DC sources, contacts and band positions: columns counted by hand
		{"supply on gnd", base + "supply B1 gnd 3kV\n",
			"t.net:7:11: supply B1 is on gnd (it connects its node to gnd) (a node other than gnd)"},
		{"negative draw", base + "draw D1 n2 -1A\n",
			"t.net:7:12: draw value -1A is not positive (a value above zero, such as 0.8A)"},
		{"switch state", base + "switch S1 n1 n2 state=half\n",
			`t.net:7:23: switch S1: unknown state "half" (closed or open)`},
		{"switch without state", base + "switch S1 n1 n2\n",
			"t.net:7:1: switch needs state= (closed or open)"},
		{"select of an unknown switch", base + "select P1 closed=S9 band=7M\n",
			`t.net:7:18: select P1 closes unknown switch "S9" (the names of switch statements)`},
		{"select of a capacitor", base + "select P1 closed=C1 band=7M\n",
			"t.net:7:18: select P1 closes capacitor C1, which is not a switch (the names of switch statements)"},
		{"duplicate part name", base + "capacitor C1 n2 gnd 100p\n",
			"t.net:7:11: part C1 is already defined at line 4 (a name not used before)"},
		{"duplicate name across kinds", base + "resistor L1 n2 gnd 1k\n",
			"t.net:7:10: part L1 is already defined at line 5 (a name not used before)"},
		{"duplicate core", base + "core T1 al=4nH\ncore T1 al=5nH\n",
			"t.net:8:6: core T1 is already defined at line 7 (a name not used before)"},
		{"port on an unknown node", strings.Replace(base, "port out n2", "port out n9", 1),
			`t.net:3:10: port out names unknown node "n9" (a node that a part connects to)`},
		{"second port in", base + "port in n2 z=50\n",
			"t.net:7:6: port in is already defined at line 2 (one port in)"},
		{"port side", base + "port middle n1 z=50\n",
			`t.net:7:6: unknown port side "middle" (in (transmitter side) or out (antenna side))`},
		{"port on ground", strings.Replace(base, "port out n2", "port out gnd", 1),
			"t.net:3:10: port out on the ground node (a node other than gnd)"},
		{"port without z", strings.Replace(base, "port out n2 z=50", "port out n2", 1),
			"t.net:3:1: port needs z= (port impedance such as 50 or 12.5-j180)"},
		{"port z with no resistance", strings.Replace(base, "port out n2 z=50", "port out n2 z=-j50", 1),
			"t.net:3:15: port impedance -j50 has no positive resistance (a resistive part above 0 Ω, e.g. 50 or 12.5-j180)"},
		{"port z list", strings.Replace(base, "port out n2 z=50", "port out n2 z=50,75", 1),
			"t.net:3:15: port z takes one impedance (one impedance)"},
		{"ports on one node", strings.Replace(base, "port out n2", "port out n1", 1),
			"t.net:3:6: port out is on the same node as port in (separate nodes for port in and port out)"},
		{"missing port out", strings.Replace(base, "port out n2 z=50\n", "", 1),
			"t.net:1:1: no port out (antenna side) (a line such as: port out n4 z=50)"},
		{"bad complex impedance", strings.Replace(base, "port out n2 z=50", "port out n2 z=12.5-j", 1),
			`t.net:3:15: bad z=: "12.5-j": expected a number after j, as in 12.5-j180 (port impedance such as 50 or 12.5-j180)`},
		{"impedance with a wrong unit", strings.Replace(base, "port out n2 z=50", "port out n2 z=50V", 1),
			"t.net:3:15: bad z=: unit V (a voltage) does not fit here (unit ohm, a resistance) (port impedance such as 50 or 12.5-j180)"},
		{"unknown inductor in a coupling", base + "coupling K1 L1 L9 k=0.5\n",
			`t.net:7:16: coupling K1 names unknown inductor "L9" (the name of an inductor)`},
		{"coupling a capacitor", base + "coupling K1 C1 L1 k=0.5\n",
			"t.net:7:13: coupling K1 names capacitor C1, which is not an inductor (the name of an inductor)"},
		{"coupling to itself", base + "coupling K1 L1 L1 k=0.5\n",
			"t.net:7:16: coupling K1 couples L1 to itself (two different inductors)"},
		{"k of 1", base + "inductor L2 n2 gnd 1u q=200\ncoupling K1 L1 L2 k=1\n",
			"t.net:8:21: coupling coefficient k=1 is out of range (0 < k < 1)"},
		{"k of 0", base + "inductor L2 n2 gnd 1u q=200\ncoupling K1 L1 L2 k=0\n",
			"t.net:8:21: coupling coefficient k=0 is out of range (0 < k < 1)"},
		{"k negative", base + "inductor L2 n2 gnd 1u q=200\ncoupling K1 L1 L2 k=-0.3\n",
			"t.net:8:21: coupling coefficient k=-0.3 is out of range (0 < k < 1)"},
		{"k NaN", base + "inductor L2 n2 gnd 1u q=200\ncoupling K1 L1 L2 k=NaN\n",
			`t.net:8:21: bad k=: "NaN" is not a number (coupling coefficient between 0 and 1)`},
		{"coupling without k", base + "inductor L2 n2 gnd 1u q=200\ncoupling K1 L1 L2\n",
			"t.net:8:1: coupling needs k= (coupling coefficient between 0 and 1)"},
		{"negative value", base + "capacitor C3 n2 gnd -100p\n",
			"t.net:7:21: capacitor value -100p is not positive (a value above zero, such as 300p)"},
		{"zero value", base + "inductor L2 n2 gnd 0\n",
			"t.net:7:20: inductor value 0 is not positive (a value above zero, such as 0.91u)"},
		{"NaN value", base + "resistor R1 n2 gnd NaN\n",
			`t.net:7:20: bad resistor value: "NaN" is not a number (a value such as 2.2k)`},
		{"infinite value", base + "resistor R1 n2 gnd 1e400\n",
			`t.net:7:20: bad resistor value: "1e400" is not a finite number (a value such as 2.2k)`},
		{"bad prefix", base + "capacitor C3 n2 gnd 100x\n",
			`t.net:7:21: bad capacitor value: "100x" has an unknown prefix or unit "x" (SI prefixes f p n u µ m k M G, then a unit) (a value such as 300p)`},
		{"wrong unit", base + "capacitor C3 n2 gnd 1uH\n",
			"t.net:7:21: bad capacitor value: unit H (an inductance) does not fit here (unit F, a capacitance) (a value such as 300p)"},
		{"no path to ground", base + "capacitor C3 n5 n6 10p\ncapacitor C4 n6 n5 22p\n",
			"t.net:7:14: node n5 has no path to ground (every node joined to gnd through parts or a port)\n" +
				"t.net:7:17: node n6 has no path to ground (every node joined to gnd through parts or a port)"},
		{"part connected to itself", base + "resistor R1 n2 n2 50\n",
			"t.net:7:16: resistor R1 is connected to itself (both ends on n2) (two different nodes)"},
		{"unknown keyword", base + "capacitr C3 n2 gnd 100p\n",
			`t.net:7:1: unknown keyword "capacitr" (one of {keywords})`},
		{"unknown attribute", base + "capacitor C3 n2 gnd 100p volts=500\n",
			`t.net:7:26: unknown attribute "volts" for capacitor ({attrs:capacitor})`},
		{"unknown attribute of a coupling", base + "inductor L2 n2 gnd 1u q=200\ncoupling K1 L1 L2 k=0.5 m=2\n",
			`t.net:8:25: unknown attribute "m" for coupling (coupling takes k)`},
		{"unknown attribute of a port", strings.Replace(base, "port out n2 z=50", "port out n2 z=50 r=50", 1),
			`t.net:3:18: unknown attribute "r" for port ({attrs:port})`},
		{"attribute given twice", base + "inductor L2 n2 gnd 1u q=200 q=300\n",
			"t.net:7:29: attribute q given twice (each attribute once)"},
		{"bad value given twice", base + "inductor L2 n2 gnd 1u q=abc q=300\n",
			`t.net:7:25: bad q=: "abc" is not a number (Q, or Q@frequency points such as 90@3.5M,180@10M)` + "\n" +
				"t.net:7:29: attribute q given twice (each attribute once)"},
		{"coupling to a part with a bad value", base + "inductor L2 n2 gnd -1u\ncoupling K1 L1 L2 k=0.5\n",
			"t.net:7:20: inductor value -1u is not positive (a value above zero, such as 0.91u)"},
		{"attribute with no value", base + "inductor L2 n2 gnd 1u q=\n",
			"t.net:7:25: attribute q has no value (Q, or Q@frequency points such as 90@3.5M,180@10M)"},
		{"word after attributes", base + "capacitor C3 n2 gnd 100p q=500 extra\n",
			`t.net:7:32: "extra" after the attributes began (key=value)`},
		{"missing unit on a length", base + "core T1 od=13 id=7mm h=5mm\n",
			`t.net:7:12: bad od=: "13" has no unit (outer diameter with a unit, e.g. 13mm)`},
		{"missing unit on an area", base + "core T1 ae=16\n",
			`t.net:7:12: bad ae=: "16" has no unit (effective area with a unit, e.g. 16mm2)`},
		{"length in a wrong unit", base + "inductor L2 n2 gnd 1u wire=0.8mH\n",
			"t.net:7:28: bad wire=: unit H (an inductance) does not fit here (unit m, a length) (wire diameter with a unit, e.g. 0.8mm, or a gauge, e.g. 18awg)"},
		{"too few fields", base + "capacitor C3 n2 gnd\n",
			"t.net:7:17: capacitor takes 4 fields before its attributes, found 3 (capacitor name node node value key=value…)"},
		{"too many fields", base + "resistor R1 n2 gnd 50 100\n",
			"t.net:7:23: resistor takes 4 fields before its attributes, found 5 (resistor name node node value key=value…)"},
		{"bad part name", base + "capacitor C$3 n2 gnd 100p\n",
			`t.net:7:11: bad part name "C$3" (a letter or digit, then letters, digits, _, - or .)`},
		{"bad node name", base + "capacitor C3 n2 g/nd 100p\n",
			`t.net:7:17: bad node name "g/nd" (a node name: a letter or digit, then letters, digits, _, - or .)`},
		{"two loss figures", base + "capacitor C3 n2 gnd 100p q=1000 esr=0.1\n",
			"t.net:7:11: capacitor C3 gives more than one loss figure (one of q=, esr=, df=)"},
		{"unknown core", base + "inductor L2 n2 gnd 1u core=T9\n",
			`t.net:7:28: inductor L2 uses unknown core "T9" (the name of a core statement)`},
		{"tolerance without %", base + "capacitor C3 n2 gnd 100p tol=5\n",
			`t.net:7:30: bad tol=: "5" needs a % sign (value tolerance such as 5%)`},
		{"turns not whole", base + "inductor L2 n2 gnd 1u turns=12.5\n",
			`t.net:7:29: bad turns=: "12.5" is not a whole number above zero (number of turns, a whole number)`},
		{"Q points falling in frequency", base + "inductor L2 n2 gnd 1u q=200@10M,100@3M\n",
			"t.net:7:25: bad q=: frequencies must rise from point to point (Q, or Q@frequency points such as 90@3.5M,180@10M)"},
		{"Q points missing a frequency", base + "inductor L2 n2 gnd 1u q=200@10M,100\n",
			"t.net:7:25: bad q=: with several points each needs @frequency (Q, or Q@frequency points such as 90@3.5M,180@10M)"},
		{"negative Q", base + "inductor L2 n2 gnd 1u q=-50\n",
			"t.net:7:25: bad q=: -50 is not above zero (Q, or Q@frequency points such as 90@3.5M,180@10M)"},
		{"zero esr", base + "capacitor C3 n2 gnd 100p esr=0\n",
			"t.net:7:30: bad esr=: 0 is not above zero (series resistance in Ω)"},
		{"second title", base + "title again\n",
			"t.net:7:1: second title (one title per file)"},
		{"columns count characters", base + "capacitor Cµ n2 gnd 100µ q=abc\n",
			`t.net:7:28: bad q=: "abc" is not a number (Q, or Q@frequency points such as 90@3.5M,180@10M)`},
		{"tabs are one column", base + "capacitor\tC3\tn2\tgnd\t100p\tq=0\n",
			"t.net:7:28: bad q=: 0 is not above zero (Q, or Q@frequency points such as 90@3.5M,180@10M)"},
		{"not UTF-8", base + "title \xff\n",
			"t.net:1:1: file is not valid UTF-8 (a UTF-8 text file)"},
	}
	if len(cases) < 20 {
		t.Fatalf("only %d cases", len(cases))
	}
	for _, tc := range cases {
		_, err := Parse("t.net", []byte(tc.text))
		if err == nil {
			t.Errorf("%s: no error, want %q", tc.name, tc.want)
			continue
		}
		var list ErrorList
		if !errors.As(err, &list) {
			t.Errorf("%s: error is %T, want ErrorList", tc.name, err)
		}
		if want := expandLists(tc.want); err.Error() != want {
			t.Errorf("%s:\n got: %s\nwant: %s", tc.name, err, want)
		}
	}
}

// TestSeveralErrors: a file with many mistakes reports every one of them,
// in line and column order, not only the first.
func TestSeveralErrors(t *testing.T) {
	path := filepath.Join("testdata", "bad_several.net")
	src, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	_, err = Parse(path, src)
	var list ErrorList
	if !errors.As(err, &list) {
		t.Fatalf("error %v, want an ErrorList", err)
	}
	want := []string{
		path + `:5:14: bad z=: "abc" is not a number (port impedance such as 50 or 12.5-j180)`,
		path + ":7:20: inductor value 0 is not positive (a value above zero, such as 0.91u)",
		path + ":8:11: part C1 is already defined at line 6 (a name not used before)",
		path + `:9:1: unknown keyword "capcitor" (one of {keywords})`,
		path + ":10:16: resistor R1 is connected to itself (both ends on b) (two different nodes)",
		path + `:11:24: unknown attribute "colour" for capacitor ({attrs:capacitor})`,
		path + `:12:17: coupling K1 names unknown inductor "L2" (the name of an inductor)`,
		path + ":12:22: coupling coefficient k=1.2 is out of range (0 < k < 1)",
		path + `:13:17: coupling K2 names unknown inductor "L7" (the name of an inductor)`,
		path + `:14:12: bad le=: "42" has no unit (effective path length with a unit, e.g. 40mm)`,
	}
	if len(list) != len(want) {
		t.Errorf("%d errors, want %d:\n%s", len(list), len(want), err)
	}
	for i := range min(len(list), len(want)) {
		if got, w := list[i].Error(), expandLists(want[i]); got != w {
			t.Errorf("error %d:\n got: %s\nwant: %s", i+1, got, w)
		}
	}
}

// expandLists fills the keyword and attribute lists into an expected
// message: those lists grow with every element kind, and what these cases
// check is the message's form and position, not the current vocabulary.
func expandLists(s string) string {
	s = strings.ReplaceAll(s, "{keywords}", keywordList())
	for kw, spec := range Keywords {
		s = strings.ReplaceAll(s, "{attrs:"+kw+"}", attrList(kw, spec))
	}
	return s
}
