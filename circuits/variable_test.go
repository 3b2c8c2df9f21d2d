package circuits

import (
	"strings"
	"testing"
)

func TestAdjustParse(t *testing.T) {
	src := `port in n1 z=50
port out n2 z=50
capacitor C1 n1 gnd 40p range=10p:60p
inductor  L1 n1 n2 4u steps=1u,2u,4u,8u
capacitor C2 n2 gnd 100p range=10p:190p steps=10
`
	nl, err := Parse("v.net", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	c1, l1, c2 := nl.Component("C1").Adjust, nl.Component("L1").Adjust, nl.Component("C2").Adjust
	if c1 == nil || c1.Lo != 10e-12 || c1.Hi != 60e-12 || c1.Discrete() {
		t.Errorf("C1 %+v", c1)
	}
	if l1 == nil || len(l1.Steps) != 4 || l1.Lo != 1e-6 || l1.Hi != 8e-6 || l1.Steps[2] != 4e-6 {
		t.Errorf("L1 %+v", l1)
	}
	// ten even steps from 10 p to 190 p are 20 p apart
	if c2 == nil || len(c2.Steps) != 10 || abs(c2.Steps[1]-30e-12) > 1e-24 || c2.Steps[9] != 190e-12 {
		t.Errorf("C2 %+v", c2)
	}
	if i := l1.NearestStep(5e-6); i != 2 {
		t.Errorf("nearest step to 5 µH is %d, want 2 (4 µH: log distance)", i)
	}
}

func abs(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}

func TestAdjustErrors(t *testing.T) {
	head := "port in n1 z=50\nport out n2 z=50\n"
	cases := []struct{ line, want string }{
		{"capacitor C1 n1 n2 40p range=10p", "v.net:3:30: range 10p needs two values joined by a colon"},
		{"capacitor C1 n1 n2 40p range=60p:10p", "v.net:3:30: range 60p:10p is empty or not above zero"},
		{"capacitor C1 n1 n2 40p range=0:60p", "v.net:3:30: range 0:60p is empty or not above zero"},
		{"capacitor C1 n1 n2 40p range=10u:60uH", "bad range high end"},
		{"capacitor C1 n1 n2 80p range=10p:60p", "v.net:3:24: capacitor C1 value 80.0 pF lies outside its range 10.0 pF…60.0 pF"},
		{"capacitor C1 n1 n2 40p steps=8", "v.net:3:30: steps=8 needs range="},
		{"capacitor C1 n1 n2 40p range=10p:60p steps=1", "steps=1 is out of range"},
		{"inductor L1 n1 n2 2u steps=1u,4u,2u", "v.net:3:34: step 2u is not above the one before"},
		{"inductor L1 n1 n2 2u steps=1u,x,4u", "v.net:3:31: bad step"},
		{"inductor L1 n1 n2 2u range=1u:3u steps=1u,2u,4u", "a step lies outside the range"},
		{"resistor R1 n1 n2 50 range=1:100", "unknown attribute \"range\" for resistor"},
	}
	for _, c := range cases {
		_, err := Parse("v.net", []byte(head+c.line+"\n"))
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want %q", c.line, err, c.want)
		}
	}
}
