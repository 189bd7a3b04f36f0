package spectra

import (
	"bytes"
	"encoding/json"
	"errors"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"sort"
	"strings"
	"testing"
)

// jdx builds a small JCAMP-DX file: the records, then the data lines,
// then ##END=. Line numbers: records from 1, data right after.
func jdx(records, data string) string {
	return records + data + "##END=\n"
}

const jdxHead = "##TITLE=t\n##JCAMP-DX=4.24\n##XUNITS=NANOMETERS\n##YUNITS=REFLECTANCE\n##XFACTOR=1\n##YFACTOR=0.001\n##FIRSTX=400\n##LASTX=470\n##NPOINTS=8\n##XYDATA=(X++(Y..Y))\n"

// The eight points 400..470 nm of every valid case below, decoded by hand
// with the ASDF character tables of JCAMP-DX 4.24 (from memory; the same
// tables are checked against a general-purpose JCAMP-DX library in
// TestJCAMPCrossCheck).
var want8 = []float64{0.5, 0.51, 0.52, 0.53, 0.54, 0.55, 0.56, 0.57}

func TestParseJCAMPForms(t *testing.T) {
	for _, tt := range []struct {
		name, head, data string
		want             []float64
	}{
		{"AFFN", jdxHead, "400 500 510 520 530\n440 540 550 560 570\n", want8},
		{"AFFN commas and exponent", jdxHead, "400, 5.0E2, 510, 520, 530\n440 540 550 +5.6e+2 570\n", want8},
		{"PAC", jdxHead, "400+500+510+520+530\n440+540+550+560+570\n", want8},
		{"SQZ", jdxHead, "400E00A10A20A30\n440E40E50E60E70\n", []float64{0.5, 0.11, 0.12, 0.13, 0.54, 0.55, 0.56, 0.57}},
		{"DIF with Y-check", jdxHead, "400 E00J0J0J0\n430 E30J0J0J0J0\n470 E70\n", want8},
		{"DIFDUP", jdxHead, "400 E00J0U\n430 E30J0V\n470 E70\n", want8},
		{"DIF without the final check line", jdxHead, "400 E00J0J0J0\n430 E30J0J0J0J0\n", want8},
		{"SQZ DUP", jdxHead, "400 E00T E10T\n440 E20U@10\n", []float64{0.5, 0.5, 0.51, 0.51, 0.52, 0.52, 0.52, 0.01}},
		{"negative SQZ and DIF", strings.NewReplacer("NPOINTS=8", "NPOINTS=7", "LASTX=470", "LASTX=460").Replace(jdxHead), "400 a0j0J0%\n430 a0@10b0k5\n", []float64{-0.01, -0.02, -0.01, -0.01, 0.01, -0.02, -0.045}},
		{"comments", "$$ a comment before the title\n" + strings.Replace(jdxHead, "REFLECTANCE", "REFLECTANCE $$ fraction", 1), "400 500 510 520 530 $$ first line\n$$ a comment line\n440 540 550 560 570\n", want8},
		{"missing value", jdxHead, "400 500 ? 520 530\n440 540 550 560 570\n", []float64{0.5, math.NaN(), 0.52, 0.53, 0.54, 0.55, 0.56, 0.57}},
		{"descending X", strings.NewReplacer("FIRSTX=400", "FIRSTX=470", "LASTX=470", "LASTX=400").Replace(jdxHead), "470 570 560 550 540\n430 530 520 510 500\n", want8},
		{"labels normalised", strings.NewReplacer("##XUNITS", "##x-units", "##YUNITS", "##Y_UNITS", "##NPOINTS", "##N Points", "##FIRSTX", "##first x", "##XYDATA", "##xy data", "NANOMETERS", "nanometers").Replace(jdxHead), "400 500 510 520 530\n440 540 550 560 570\n", want8},
		{"CRLF and BOM", "\uFEFF" + strings.ReplaceAll(jdxHead, "\n", "\r\n"), "400 500 510 520 530\r\n440 540 550 560 570\r\n", want8},
	} {
		t.Run(tt.name, func(t *testing.T) {
			s, err := parseJCAMP(strings.NewReader(jdx(tt.head, tt.data)), "t.jdx")
			if err != nil {
				t.Fatal(err)
			}
			g := s.Segments[0]
			if len(g.NM) != len(tt.want) {
				t.Fatalf("got %d points %v, want %d", len(g.NM), g.Values[R], len(tt.want))
			}
			for i, w := range tt.want {
				nm, v := g.NM[i], g.Values[R][i]
				if math.Abs(nm-(400+10*float64(i))) > 1e-9 || !(math.Abs(v-w) < 1e-12 || math.IsNaN(v) && math.IsNaN(w)) {
					t.Errorf("point %d = (%g, %g), want (%g, %g)", i, nm, v, 400+10*float64(i), w)
				}
			}
		})
	}
}

func TestParseJCAMPUnits(t *testing.T) {
	head := func(xu, yu, xf, first, last string) string {
		return strings.NewReplacer("XUNITS=NANOMETERS", "XUNITS="+xu, "YUNITS=REFLECTANCE", "YUNITS="+yu, "XFACTOR=1", "XFACTOR="+xf,
			"YFACTOR=0.001", "YFACTOR=1", "FIRSTX=400", "FIRSTX="+first, "LASTX=470", "LASTX="+last, "NPOINTS=8", "NPOINTS=2").Replace(jdxHead)
	}
	for _, tt := range []struct {
		name, in string
		q        Quantity
		nm, v    [2]float64
		note     bool
	}{
		// 1 µm = 1000 nm (SI)
		{"micrometres", jdx(head("MICROMETERS", "REFLECTANCE", "0.001", "0.4", "0.5"), "400 0.25 0.75\n"), R, [2]float64{400, 500}, [2]float64{0.25, 0.75}, false},
		// λ/nm = 10^7 / (ν̃/cm⁻¹) (SI: 1 cm = 10^7 nm); descending wavenumber is ascending wavelength
		{"wavenumber", jdx(head("1/CM", "TRANSMITTANCE", "1", "25000", "20000"), "25000 0.1 0.2\n"), T, [2]float64{400, 500}, [2]float64{0.1, 0.2}, false},
		// percent / 100
		{"percent reflectance", jdx(head("NANOMETERS", "%REFLECTANCE", "1", "400", "500"), "400 50 97.5\n"), R, [2]float64{400, 500}, [2]float64{0.5, 0.975}, false},
		{"percent transmittance words", jdx(head("NANOMETERS", "PERCENT TRANSMITTANCE", "1", "400", "500"), "400 12 3\n"), T, [2]float64{400, 500}, [2]float64{0.12, 0.03}, false},
		// T = 10^(−A), the definition of decadic absorbance (IUPAC Gold Book, "absorbance")
		{"absorbance", jdx(head("NANOMETERS", "ABSORBANCE", "1", "400", "500"), "400 1 2\n"), T, [2]float64{400, 500}, [2]float64{0.1, 0.01}, true},
	} {
		t.Run(tt.name, func(t *testing.T) {
			s, err := parseJCAMP(strings.NewReader(tt.in), "u.jdx")
			if err != nil {
				t.Fatal(err)
			}
			g := s.Segments[0]
			if g.Values[tt.q] == nil {
				t.Fatalf("no %s column", tt.q)
			}
			for i := range 2 {
				if math.Abs(g.NM[i]-tt.nm[i]) > 1e-9 || math.Abs(g.Values[tt.q][i]-tt.v[i]) > 1e-15 {
					t.Errorf("point %d = (%g, %g), want (%g, %g)", i, g.NM[i], g.Values[tt.q][i], tt.nm[i], tt.v[i])
				}
			}
			if got := len(s.Notes) == 1 && strings.Contains(s.Notes[0], "T = 10^(−A)"); got != tt.note {
				t.Errorf("notes %q, want an absorbance note: %v", s.Notes, tt.note)
			}
		})
	}
}

func TestParseJCAMPBad(t *testing.T) {
	rep := func(old, new string) string { return strings.Replace(jdxHead, old, new, 1) }
	affn := "400 500 510 520 530\n440 540 550 560 570\n"
	xyp := "##TITLE=p\n##JCAMP-DX=5.01\n##XUNITS=1/CM\n##YUNITS=REFLECTANCE\n##FIRSTX=4000\n##LASTX=400\n##NPOINTS=3\n##XYPOINTS=(XY..XY)\n"
	for _, tt := range []struct {
		name, in string
		errs     []error
		line     int
		msg      string
	}{
		{"X-check", jdx(jdxHead, "400 500 510 520 530\n450 540 550 560 570\n"), []error{errXCheck}, 12,
			"t.jdx:12: column 1 (X value): X-check failed: the line starts at X 450 (450 after XFACTOR) but point 5 lies at 440 by FIRSTX, LASTX and NPOINTS"},
		{"FIRSTX", jdx(rep("FIRSTX=400", "FIRSTX=410"), affn), []error{errFirstX, errXCheck}, 11, ""},
		{"LASTX against DELTAX", jdx(rep("LASTX=470", "LASTX=480\n##DELTAX=10"), affn), []error{errLastX}, 8, ""},
		{"LASTX far off", jdx(rep("LASTX=470", "LASTX=540"), affn), []error{errXCheck}, 12, ""},
		{"Y-check value wrong", jdx(jdxHead, "400 E00J0J0J0\n430 E31J0J0J0J0\n470 E70\n"), []error{errYCheck}, 12,
			"t.jdx:12: column 5 (Y value): Y-check failed: the line's first Y 531 should repeat the last Y of line 11, which decodes to 530"},
		{"Y-check value missing", jdx(jdxHead, "400 E00J0J0J0\n440 J0J0J0J0\n"), []error{errYCheck}, 12, ""},
		{"final Y-check wrong", jdx(jdxHead, "400 E00J0J0J0\n430 E30J0J0J0J0\n470 E71\n"), []error{errYCheck}, 13, ""},
		{"too many points", jdx(jdxHead, "400 500 510 520 530\n440 540 550 560 570 580\n"), []error{errPointCount}, 12, ""},
		{"too few points", jdx(jdxHead, "400 500 510 520 530\n440 540 550 560\n"), []error{errPointCount}, 12,
			"t.jdx:12: point count differs from NPOINTS: NPOINTS=8 but the table holds 7"},
		{"FIRSTY", jdx(rep("NPOINTS=8", "NPOINTS=8\n##FIRSTY=0.6"), affn), []error{errFirstY}, 10, ""},
		{"bad character", jdx(jdxHead, "400 500 510 520 530\n440 540 55# 560 570\n"), []error{errASDF}, 12,
			"t.jdx:12: column 11: bad compressed (ASDF) data: unexpected character '#'"},
		{"DIF first on a line", jdx(jdxHead, "400 J0J0\n"), []error{errASDF}, 11, ""},
		{"DUP first on a line", jdx(jdxHead, "400 S3\n"), []error{errASDF}, 11, ""},
		{"line starts with DIF", jdx(jdxHead, "J0 500\n"), []error{errASDF}, 11, ""},
		{"no END", jdxHead + affn, []error{errNoEnd}, 12, ""},
		{"second block", jdx(jdxHead, affn) + "##TITLE=again\n", []error{errMultiBlock}, 14, ""},
		{"nested block", jdx("##TITLE=link\n##JCAMP-DX=5.01\n##DATA TYPE=LINK\n##BLOCKS=2\n", ""), []error{errUnsupported, errMultiBlock}, 3, ""},
		{"ntuples", jdx(rep("##XUNITS", "##NTUPLES=NMR\n##XUNITS"), affn), []error{errUnsupported}, 3, ""},
		{"not JCAMP", "wavelength_nm,R\n400,0.5\n", []error{errNotJCAMP}, 1, ""},
		{"title not first", jdx("##JCAMP-DX=4.24\n##TITLE=t\n", ""), []error{errNotJCAMP}, 1, ""},
		{"label without =", jdx("##TITLE=t\n##JCAMP-DX 4.24\n", ""), []error{errLabel}, 2, ""},
		{"no version", jdx(rep("##JCAMP-DX=4.24\n", ""), affn), []error{errMissingLabel}, 1, ""},
		{"no XUNITS", jdx(rep("##XUNITS=NANOMETERS\n", ""), affn), []error{errMissingLabel}, 9, ""},
		{"XUNITS Hz", jdx(rep("NANOMETERS", "HZ"), affn), []error{errXUnits}, 3, ""},
		{"YUNITS arbitrary", jdx(rep("=REFLECTANCE", "=ARBITRARY UNITS"), affn), []error{errYUnits}, 4, ""},
		{"YUNITS percent absorbance", jdx(rep("=REFLECTANCE", "=%ABSORBANCE"), affn), []error{errYUnits}, 4, ""},
		{"no NPOINTS", jdx(rep("##NPOINTS=8\n", ""), affn), []error{errMissingLabel}, 9, ""},
		{"NPOINTS not whole", jdx(rep("NPOINTS=8", "NPOINTS=7.5"), affn), []error{errOutOfRange}, 9, ""},
		{"FIRSTX not a number", jdx(rep("FIRSTX=400", "FIRSTX=4OO"), affn), []error{errNotNumber}, 7, ""},
		{"zero XFACTOR", jdx(rep("XFACTOR=1", "XFACTOR=0"), affn), []error{errOutOfRange}, 5, ""},
		{"duplicate label", jdx(rep("##XFACTOR=1\n", "##XFACTOR=1\n##X FACTOR=1\n"), affn), []error{errDuplicateLabel}, 6, ""},
		{"percent in a fraction file", jdx(rep("YFACTOR=0.001", "YFACTOR=0.1"), affn), []error{errOutOfRange}, 11,
			`t.jdx:11: column 5 (Y value): Y 50 is out of range: YUNITS=REFLECTANCE is a fraction, want -0.05..1.05 (percent? write YUNITS=%REFLECTANCE)`},
		{"far out of range", jdx(rep("YFACTOR=0.001", "YFACTOR=1"), affn), []error{errOutOfRange}, 11, ""},
		{"no data table", jdx(strings.TrimSuffix(jdxHead, "##XYDATA=(X++(Y..Y))\n"), ""), []error{errMissingLabel}, 0, ""},
		{"unknown table form", jdx(rep("(X++(Y..Y))", "(X++(R..R))"), affn), []error{errUnsupported}, 10, ""},
		{"zero wavenumber", jdx(strings.NewReplacer("NANOMETERS", "1/CM", "FIRSTX=400", "FIRSTX=0", "LASTX=470", "LASTX=70").Replace(jdxHead), "0 500 510 520 530\n40 540 550 560 570\n"), []error{errOutOfRange}, 11, ""},
		{"XYPOINTS odd", jdx(xyp, "4000, 0.1\n1000, 0.2, 400\n"), []error{errFieldCount}, 10, ""},
		{"XYPOINTS order", jdx(xyp, "4000, 0.1\n1000, 0.2\n2000, 0.3\n"), []error{errNotMonotonic}, 11, ""},
		{"XYPOINTS repeat", jdx(xyp, "4000, 0.1\n4000, 0.2\n400, 0.3\n"), []error{errDuplicate}, 10, ""},
		{"XYPOINTS count", jdx(xyp, "4000, 0.1\n400, 0.2\n"), []error{errPointCount}, 10, ""},
		{"XYPOINTS FIRSTX", jdx(xyp, "3990, 0.1\n1000, 0.2\n400, 0.3\n"), []error{errFirstX}, 5, ""},
		{"XYPOINTS LASTX", jdx(xyp, "4000, 0.1\n1000, 0.2\n500, 0.3\n"), []error{errLastX}, 6, ""},
		{"XYPOINTS not a number", jdx(xyp, "4000, 0.1\n1000, O.2\n400, 0.3\n"), []error{errNotNumber}, 10, ""},
		{"absorbance below zero", jdx(rep("=REFLECTANCE", "=ABSORBANCE"), "400 500 510 520 530\n440 540 550 -560 570\n"), []error{errOutOfRange}, 12, ""},
		{"bad splice metadata", jdx(rep("##XUNITS", "##$SPLICE={\"quantity\":\"Q\"}\n##XUNITS"), affn), []error{errBadMetadata}, 3, ""},
		{"bad uncertainty metadata", jdx(rep("##XUNITS", "##$U_R=lots\n##XUNITS"), affn), []error{errBadMetadata}, 3, ""},
	} {
		t.Run(tt.name, func(t *testing.T) {
			_, err := parseJCAMP(strings.NewReader(tt.in), "t.jdx")
			for _, e := range tt.errs {
				if !errors.Is(err, e) {
					t.Errorf("err = %v, want %v", err, e)
				}
			}
			var pe *ParseError
			if !errors.As(err, &pe) || pe.File != "t.jdx" {
				t.Fatalf("err %v is not a *ParseError naming the file", err)
			}
			if pe.Line != tt.line {
				t.Errorf("line %d, want %d (%v)", pe.Line, tt.line, err)
			}
			if tt.msg != "" && err.Error() != tt.msg {
				t.Errorf("message\n got %s\nwant %s", err, tt.msg)
			}
		})
	}
}

func TestParseJCAMPMetadata(t *testing.T) {
	in := "##TITLE=white W-1 \xb5m $$ Latin-1\n##JCAMP-DX=5.01\n##ORIGIN=invented lab\n##OWNER=public domain\n##LONG DATE=2031/04/02 10:00\n" +
		"##SPECTROMETER/DATA SYSTEM=invented UV-Vis\n##SAMPLING PROCEDURE=sphere,\n 8 deg\n##$REFERENCE FILE=ref.csv\n##$U_R=0.5 %\n" +
		"##$A VERY LONG USER DEFINED LABEL=x\n##PEAK TABLE=(XY..XY)\n450, 0.9\n" +
		strings.TrimPrefix(jdxHead, "##TITLE=t\n##JCAMP-DX=4.24\n") + "400 500 510 520 530\n440 540 550 560 570\n##END=\n"
	s, err := parseJCAMP(strings.NewReader(in), "m.jdx")
	if err != nil {
		t.Fatal(err)
	}
	for k, want := range map[string]string{
		"title": "white W-1 µm", "jcamp-dx": "5.01", "origin": "invented lab", "owner": "public domain", "date": "2031/04/02 10:00",
		"instrument": "invented UV-Vis", "sampling procedure": "sphere, 8 deg", "reference_file": "ref.csv", "x units": "NANOMETERS",
		"y units": "REFLECTANCE", "a_very_long_user_defined_label": "x",
	} {
		if v, ok := s.Get(k); v != want {
			t.Errorf("%s = %q (%v), want %q", k, v, ok, want)
		}
	}
	if f, ok := referenceFile(s); !ok || f != "ref.csv" {
		t.Errorf("ReferenceFile = %q, %v", f, ok)
	}
	if u := s.Segments[0].Values[UR]; u == nil || u[0] != 0.005 {
		t.Errorf("u_R = %v, want 0.005 from ##$U_R", u)
	}
	checkRoundTrip(t, s)
}

// TestParseJCAMPEncoded decodes every form written by the test encoder
// (AFFN, PAC, SQZ, DIF, DIFDUP) for ordinates with runs, sign changes and
// large steps, against the ordinates encoded.
func TestParseJCAMPEncoded(t *testing.T) {
	next := noise(7)
	ys := make([]int64, 203)
	for i := range ys {
		switch {
		case i%50 < 12:
			ys[i] = 3000 // a run for DUP
		case i%7 == 0:
			ys[i] = int64((next() + 1) * 45000) // a large step
		default:
			ys[i] = ys[i-1] + int64(next()*120) // small steps of either sign
		}
	}
	g := grid{first: 1000, delta: -2.5, factor: 0.5, n: len(ys)}
	for _, f := range []form{formAFFN, formPAC, formSQZ, formDIF, formDIFDUP} {
		for _, perLine := range []int{1, 7, 40} {
			var b strings.Builder
			b.WriteString("##TITLE=e\n##JCAMP-DX=4.24\n")
			for _, r := range g.records("NANOMETERS", "TRANSMITTANCE", 0.00001, ys[0]) {
				b.WriteString(r + "\n")
			}
			b.WriteString("##XYDATA=(X++(Y..Y))\n" + strings.Join(encodeXYDATA(g.x, ys, f, perLine), "\n") + "\n##END=\n")
			s, err := parseJCAMP(strings.NewReader(b.String()), "e.jdx")
			if err != nil {
				t.Fatalf("%s, %d a line: %v\n%s", f, perLine, err, b.String())
			}
			seg := s.Segments[0]
			for i := range ys {
				j := len(ys) - 1 - i // descending X is ascending wavelength
				if nm, v := seg.NM[j], seg.Values[T][j]; math.Abs(nm-(1000-2.5*float64(i))) > 1e-9 || math.Abs(v-float64(ys[i])*0.00001) > 1e-15 {
					t.Fatalf("%s, %d a line: point %d = (%g, %g), want (%g, %g)", f, perLine, i, nm, v, 1000-2.5*float64(i), float64(ys[i])*0.00001)
				}
			}
		}
	}
}

// TestJCAMPCrossCheck parses every test file in testdata/jcamp with the
// general-purpose JCAMP-DX library "jcampconverter" from the npm registry
// (through testdata/jcamp/crosscheck/parse.mjs) and compares every point
// with ParseJCAMP after the unit conversions (nm = µm × 1000 = 10^7 / cm⁻¹;
// percent / 100; T = 10^(−A)). It needs node and the library installed
// (npm ci --prefix testdata/jcamp/crosscheck); without them it is skipped,
// unless CI is set.
func TestJCAMPCrossCheck(t *testing.T) {
	dir := filepath.Join("..", "testdata", "jcamp")
	var files []string
	for _, pat := range []string{"*.jdx", "*.dx"} {
		m, _ := filepath.Glob(filepath.Join(dir, pat))
		files = append(files, m...)
	}
	if len(files) < 8 {
		t.Fatalf("found %d test files in %s", len(files), dir)
	}
	node, err := exec.LookPath("node")
	if err == nil {
		_, err = os.Stat(filepath.Join(dir, "crosscheck", "node_modules", "jcampconverter", "package.json"))
	}
	if err != nil {
		if os.Getenv("CI") != "" {
			t.Fatalf("cross-check unavailable in CI: %v (run npm ci --prefix testdata/jcamp/crosscheck)", err)
		}
		t.Skipf("cross-check unavailable: %v (run npm ci --prefix testdata/jcamp/crosscheck)", err)
	}
	cmd := exec.Command(node, append([]string{filepath.Join(dir, "crosscheck", "parse.mjs")}, files...)...)
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("node: %v\n%s", err, stderr.String())
	}
	var theirs []struct {
		File, Title, XUnits, YUnits string
		X, Y                        []float64
	}
	if err := json.Unmarshal(out, &theirs); err != nil {
		t.Fatal(err)
	}
	if len(theirs) != len(files) {
		t.Fatalf("library parsed %d files, want %d", len(theirs), len(files))
	}
	for _, th := range theirs {
		t.Run(filepath.Base(th.File), func(t *testing.T) {
			data, err := os.ReadFile(th.File)
			if err != nil {
				t.Fatal(err)
			}
			s, err := parseJCAMP(bytes.NewReader(data), th.File)
			if err != nil {
				t.Fatal(err)
			}
			if title, _ := s.Get("title"); title != th.Title {
				t.Errorf("title %q, library %q", title, th.Title)
			}
			type pt struct{ nm, v float64 }
			var want []pt
			yu := strings.ToUpper(strings.ReplaceAll(th.YUnits, " ", ""))
			for i, x := range th.X {
				p := pt{x, th.Y[i]}
				switch strings.ToUpper(th.XUnits) {
				case "MICROMETERS":
					p.nm = x * 1000
				case "1/CM":
					p.nm = 1e7 / x
				}
				switch {
				case strings.Contains(yu, "ABSORBANCE"):
					p.v = math.Pow(10, -p.v)
				case strings.Contains(yu, "%") || strings.Contains(yu, "PERCENT"):
					p.v /= 100
				}
				want = append(want, p)
			}
			sort.Slice(want, func(i, j int) bool { return want[i].nm < want[j].nm })
			g := s.Segments[0]
			q := R
			if g.Values[R] == nil {
				q = T
			}
			if len(g.NM) != len(want) {
				t.Fatalf("%d points, library %d", len(g.NM), len(want))
			}
			for i, w := range want {
				if math.Abs(g.NM[i]-w.nm) > 1e-9*w.nm || math.Abs(g.Values[q][i]-w.v) > 1e-12 {
					t.Fatalf("point %d = (%.12g, %.12g), library (%.12g, %.12g)", i, g.NM[i], g.Values[q][i], w.nm, w.v)
				}
			}
		})
	}
}

func FuzzJCAMP(f *testing.F) {
	files, _ := filepath.Glob("../testdata/jcamp/*.jdx")
	for _, name := range files {
		if data, err := os.ReadFile(name); err == nil {
			f.Add(data)
		}
	}
	f.Add([]byte(jdx(jdxHead, "400 E00J0U\n430 E30J0V\n470 E70\n")))
	f.Add([]byte(jdx(jdxHead, "400+500+510+520+530\n440 540 ? 560 570\n")))
	f.Add([]byte(jdx("##TITLE=p\n##JCAMP-DX=5.01\n##XUNITS=1/CM\n##YUNITS=ABSORBANCE\n##XYPOINTS=(XY..XY)\n", "4000, 0.1; 1000, 0.2\n400, ?\n")))
	f.Fuzz(func(t *testing.T, in []byte) {
		s, err := parseJCAMP(bytes.NewReader(in), "fuzz.jdx")
		if err != nil {
			var pe *ParseError
			if !errors.As(err, &pe) || pe.File != "fuzz.jdx" {
				t.Fatalf("error %v is not a *ParseError naming the file", err)
			}
			return
		}
		if len(s.Segments) != 1 || len(s.Sources) != 1 {
			t.Fatalf("%d segments, %d sources", len(s.Segments), len(s.Sources))
		}
		g := s.Segments[0]
		if len(g.NM) < 2 {
			t.Fatalf("%d points accepted", len(g.NM))
		}
		values := 0
		for i, nm := range g.NM {
			if !(nm > 0) || math.IsInf(nm, 0) || i > 0 && !(nm > g.NM[i-1]) {
				t.Fatalf("wavelength %v at %d (before: %v)", nm, i, g.NM[max(i-1, 0)])
			}
			for q, v := range g.Values {
				if v == nil {
					continue
				}
				if math.IsNaN(v[i]) {
					continue
				}
				if Quantity(q) <= A && (v[i] < -0.0501 || v[i] > 1.0501) {
					t.Fatalf("%s value %v accepted", Quantity(q), v[i])
				}
				if Quantity(q) <= A {
					values++
				}
			}
		}
		if values < 2 {
			t.Fatalf("%d values accepted", values)
		}
		checkRoundTrip(t, s)
	})
}
