package spectra

import (
	"errors"
	"math"
	"strings"
	"testing"
)

// TestLongValueCut checks that a reader quotes at most a readable part of an
// offending value: a 1 MB cell must not put 1 MB into the message.
func TestLongValueCut(t *testing.T) {
	huge := strings.Repeat("x", 1<<20)
	for _, tc := range []struct {
		name, file, in string
		want           error
	}{
		{"neutral header", "a.csv", huge + ",R\n400,0.5\n500,0.5\n", errUnknownUnit},
		{"neutral column", "a.csv", "wavelength_nm," + huge + "\n400,0.5\n", errUnknownColumn},
		{"neutral cell", "a.csv", "wavelength_nm,R\n400," + huge + "\n500,0.5\n", errNotNumber},
		{"neutral metadata", "a.csv", "# u_R: " + huge + "\nwavelength_nm,R\n400,0.5\n500,0.5\n", errBadMetadata},
		{"jcamp units", "a.jdx", "##TITLE=x\n##JCAMP-DX=5.01\n##XUNITS=" + huge + "\n##YUNITS=REFLECTANCE\n##XYPOINTS=(XY..XY)\n400,0.5 500,0.5\n##END=\n", errXUnits},
		{"jcamp point", "a.jdx", "##TITLE=x\n##JCAMP-DX=5.01\n##XUNITS=NANOMETERS\n##YUNITS=REFLECTANCE\n##XYPOINTS=(XY..XY)\n400," + huge + " 500,0.5\n##END=\n", errNotNumber},
		{"jcamp label", "a.jdx", "##TITLE=x\n##" + huge + "\n##END=\n", errLabel},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Decode([]byte(tc.in), tc.file)
			if !errors.Is(err, tc.want) {
				t.Fatalf("error %.200v, want %v", err, tc.want)
			}
			if msg := err.Error(); len(msg) > 400 || !strings.Contains(msg, strings.Repeat("x", 30)) || !strings.Contains(msg, "x…") {
				t.Errorf("message of %d bytes, want the value cut to 40 characters and …: %.300s", len(msg), msg)
			}
		})
	}
}

// TestJCAMPWordInNumbers checks that a word where a number should be in a
// (X++(Y..Y)) line is refused with its line and column, not decoded as ASDF.
func TestJCAMPWordInNumbers(t *testing.T) {
	head := "##TITLE=w\n##JCAMP-DX=4.24\n##XUNITS=NANOMETERS\n##YUNITS=REFLECTANCE\n##FIRSTX=400\n##LASTX=430\n##NPOINTS=4\n##XYDATA=(X++(Y..Y))\n"
	for _, tc := range []struct {
		name, data string
		line, col  int
	}{
		{"NaN among numbers", "400 0.5 NaN 0.5 0.5\n", 9, 9},
		{"Inf among numbers", "400 0.5 0.5 0.5 -Inf\n", 9, 17},
		{"infinity alone", "400 infinity\n", 9, 5},
		{"NA among numbers", "400 0.5 NA 0.5 0.5\n", 9, 9},
		{"nan on a second line", "400 0.5 0.5\n420 nan 0.5\n", 10, 5},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Decode([]byte(head+tc.data+"##END=\n"), "w.jdx")
			var pe *ParseError
			if !errors.As(err, &pe) || !errors.Is(err, errNotNumber) {
				t.Fatalf("error %v, want a ParseError wrapping errNotNumber", err)
			}
			if pe.Line != tc.line || pe.Column != tc.col {
				t.Errorf("at %d:%d, want %d:%d (%v)", pe.Line, pe.Column, tc.line, tc.col, err)
			}
		})
	}
	// ASDF lines keep working: SQZ and DIF letters after the X value.
	asdf := strings.Replace(head, "##XYDATA", "##YFACTOR=0.001\n##XYDATA", 1) + "400 E00J0J0J0\n##END=\n"
	if s, err := Decode([]byte(asdf), "w.jdx"); err != nil {
		t.Errorf("ASDF line refused: %v", err)
	} else if got := s.Segments[0].Values[R]; math.Abs(got[3]-0.53) > 1e-12 { // 500, +10, +10, +10 times YFACTOR
		t.Errorf("ASDF line decodes to %v", got)
	}
}
