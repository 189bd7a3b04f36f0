package spectra

import (
	"errors"
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
		{"neutral header", "a.csv", huge + ",R\n400,0.5\n500,0.5\n", ErrUnknownUnit},
		{"neutral column", "a.csv", "wavelength_nm," + huge + "\n400,0.5\n", ErrUnknownColumn},
		{"neutral cell", "a.csv", "wavelength_nm,R\n400," + huge + "\n500,0.5\n", ErrNotNumber},
		{"neutral metadata", "a.csv", "# u_R: " + huge + "\nwavelength_nm,R\n400,0.5\n500,0.5\n", ErrBadMetadata},
		{"jcamp units", "a.jdx", "##TITLE=x\n##JCAMP-DX=5.01\n##XUNITS=" + huge + "\n##YUNITS=REFLECTANCE\n##XYPOINTS=(XY..XY)\n400,0.5 500,0.5\n##END=\n", ErrXUnits},
		{"jcamp point", "a.jdx", "##TITLE=x\n##JCAMP-DX=5.01\n##XUNITS=NANOMETERS\n##YUNITS=REFLECTANCE\n##XYPOINTS=(XY..XY)\n400," + huge + " 500,0.5\n##END=\n", ErrNotNumber},
		{"jcamp label", "a.jdx", "##TITLE=x\n##" + huge + "\n##END=\n", ErrLabel},
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
