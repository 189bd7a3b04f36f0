package spectra

import (
	"bytes"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"
)

// TestNoFloatNoise checks that unit conversions of decimal data give the
// decimal the data state, not float noise: 88.112 % is 0.88112 (dividing
// by 100 in float64 gives 0.8811199999999999), 8.7 µm is 8700 nm, and a
// JCAMP-DX ordinate 88112 × YFACTOR 0.00001 is 0.88112. Written back,
// the values are those decimals.
func TestNoFloatNoise(t *testing.T) {
	exact := func(s string) float64 {
		x, err := strconv.ParseFloat(s, 64)
		if err != nil {
			t.Fatal(err)
		}
		return x
	}
	// The noise this test is about: check that float64 arithmetic does
	// give it, so that the test can fail.
	hundred, pct := 100.0, exact("88.112")
	if pct/hundred == exact("0.88112") {
		t.Fatal("88.112/100 is exact in float64 here: the test shows nothing")
	}

	s, err := Parse(strings.NewReader("wavelength_um,R (%),T (%)\n8.7,88.112,1.11\n8.9,13.11,0.3\n"), "f.csv")
	if err != nil {
		t.Fatal(err)
	}
	g := s.Segments[0]
	for _, c := range []struct {
		got  float64
		want string
	}{{g.NM[0], "8700"}, {g.NM[1], "8900"}, {g.Values[R][0], "0.88112"}, {g.Values[R][1], "0.1311"},
		{g.Values[T][0], "0.0111"}, {g.Values[T][1], "0.003"}} {
		if c.got != exact(c.want) {
			t.Errorf("%v, want %s", c.got, c.want)
		}
	}
	var out bytes.Buffer
	if err := Write(&out, s); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(out.String(), "8700,0.88112,0.0111\n8900,0.1311,0.003\n") {
		t.Errorf("written:\n%s", out.String())
	}

	head := strings.NewReplacer("YUNITS=REFLECTANCE", "YUNITS=%REFLECTANCE", "YFACTOR=0.001", "YFACTOR=0.001").Replace(jdxHead)
	j, err := parseJCAMP(strings.NewReader(jdx(head, "400 88112 88112 88112 88112\n440 88112 88112 88112 88112\n")), "t.jdx")
	if err != nil {
		t.Fatal(err)
	}
	if v := j.Segments[0].Values[R][0]; v != exact("0.88112") {
		t.Errorf("JCAMP-DX: %v, want 0.88112", v)
	}
}

// TestScaled checks the fast path of scaled against strconv.ParseFloat of
// the decimal with its exponent moved (a correctly rounded reader, the
// Go standard library's), for random decimals of up to 15 digits and the
// shifts the readers use.
func TestScaled(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 1))
	for range 20000 {
		digits := 1 + r.IntN(15)
		var b strings.Builder
		if r.IntN(4) == 0 {
			b.WriteByte('-')
		}
		point := r.IntN(digits + 1)
		for i := range digits {
			if i == point && i > 0 {
				b.WriteByte('.')
			}
			b.WriteByte(byte('0' + r.IntN(10)))
		}
		dec := b.String()
		x, err := strconv.ParseFloat(dec, 64)
		if err != nil {
			t.Fatal(err)
		}
		for _, exp := range []int{-2, 3, -3} {
			want, err := strconv.ParseFloat(dec+"e"+strconv.Itoa(exp), 64)
			if err != nil {
				t.Fatal(err)
			}
			if got := scaled(dec, x, exp); got != want {
				t.Fatalf("scaled(%q, %d) = %v, want %v", dec, exp, got, want)
			}
		}
	}
	// Forms off the fast path still give the decimal's value.
	for _, tt := range []struct {
		dec  string
		exp  int
		want string
	}{{"8.8112e1", -2, "0.88112"}, {"1234567890.1234567", -2, "12345678.901234567"}, {"0.0000000000000000000000012", 3, "1.2e-21"}} {
		x, _ := strconv.ParseFloat(tt.dec, 64)
		want, _ := strconv.ParseFloat(tt.want, 64)
		if got := scaled(tt.dec, x, tt.exp); got != want {
			t.Errorf("scaled(%q, %d) = %v, want %s", tt.dec, tt.exp, got, tt.want)
		}
	}
}
