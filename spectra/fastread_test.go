package spectra

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
)

// parseCSV reads data as Parse does, but splits every delimited file
// with encoding/csv, the reader the line-by-line split must agree with.
func parseCSV(data []byte, name string) (*Spectrum, error) {
	p := parser{file: name, s: &Spectrum{Sources: []string{name}}, csvOnly: true}
	if err := p.run(data); err != nil {
		return nil, err
	}
	return p.s, nil
}

// sameRead reports how two reads of one file differ ("" when they do
// not): the same error message, or the same values bit for bit (NaN for
// NaN), columns, metadata and warnings.
func sameRead(a *Spectrum, ea error, b *Spectrum, eb error) string {
	if (ea == nil) != (eb == nil) {
		return fmt.Sprintf("errors %v and %v", ea, eb)
	}
	if ea != nil {
		if ea.Error() != eb.Error() {
			return fmt.Sprintf("messages\n%v\n%v", ea, eb)
		}
		return ""
	}
	if fmt.Sprint(a.Meta, a.Warnings, a.Measurements, a.Notes) != fmt.Sprint(b.Meta, b.Warnings, b.Measurements, b.Notes) {
		return fmt.Sprintf("metadata or warnings\n%v %v\n%v %v", a.Meta, a.Warnings, b.Meta, b.Warnings)
	}
	if len(a.Segments) != len(b.Segments) {
		return fmt.Sprintf("%d and %d segments", len(a.Segments), len(b.Segments))
	}
	same := func(x, y []float64) bool {
		if (x == nil) != (y == nil) || len(x) != len(y) {
			return false
		}
		for i := range x {
			if math.Float64bits(x[i]) != math.Float64bits(y[i]) {
				return false
			}
		}
		return true
	}
	for i := range a.Segments {
		ga, gb := a.Segments[i], b.Segments[i]
		if !same(ga.NM, gb.NM) {
			return fmt.Sprintf("segment %d: axis %v and %v", i, ga.NM, gb.NM)
		}
		for q := range ga.Values {
			if !same(ga.Values[q], gb.Values[q]) {
				return fmt.Sprintf("segment %d: %s %v and %v", i, Quantity(q), ga.Values[q], gb.Values[q])
			}
		}
	}
	return ""
}

// TestSplitLikeCSV checks that delimited files without quotes, read line
// by line, give what encoding/csv gives: the cells, the skipped lines,
// the segments and every message, on the cases where csv's rules are
// least obvious.
func TestSplitLikeCSV(t *testing.T) {
	for _, tc := range []struct{ name, in string }{
		{"plain", "wavelength_nm,R,T\n400,0.5,0.1\n500,0.6,0.2\n"},
		{"CRLF and a blank CRLF line", "wavelength_nm,R\r\n400,0.5\r\n500,0.6\r\n\r\n600,0.7\r\n700,0.8\r\n"},
		{"runs of tabs are one delimiter", "wavelength_nm\tR\tT\n400\t\t0.5\t0.1\n500\t \t0.6\t0.2\n"},
		{"a leading tab", "wavelength_nm\tR\n\t400\t0.5\n\t500\t0.6\n"},
		{"a trailing tab", "wavelength_nm\tR\t\n400\t0.5\t\n500\t0.6\t\n"},
		{"empty cells with commas", "wavelength_nm,R,T\n400,,0.1\n500, ,0.2\n"},
		{"trailing delimiters", "wavelength_nm,R\n400,0.5,\n500,0.6, ,\n"},
		{"a line of spaces ends a segment", "wavelength_nm,R\n400,0.5\n500,0.6\n   \n600,0.7\n700,0.8\n"},
		{"a comment after spaces", "wavelength_nm;R\n400;0,5\n  # note; more\n500;0,6\n"},
		{"a comment at the start", "wavelength_nm,R\n400,0.5\n# note\n500,0.6\n"},
		{"a comment does not end a segment", "wavelength_nm,R\n400,0.5\n#\n500,0.6\n"},
		{"invalid UTF-8 in a comment", "wavelength_nm,R\n400,0.5\n#\xff\n500,0.6\n"},
		{"invalid UTF-8 after spaces", "wavelength_nm,R\n400,0.5\n #\xff\n500,0.6\n"},
		{"no-break spaces", "wavelength_nm,R\n\u00a0400\u00a0,0.5\n500,\u00a00.6\u2003\n"},
		{"no-break space before a tab", "wavelength_nm\tR\n400\u00a0\t\u00a00.5\n500\t0.6\n"},
		{"short segment before a blank line", "wavelength_nm,R\n400,0.5\n\n500,0.6\n600,0.7\n"},
		{"blank lines at the end", "wavelength_nm,R\n400,0.5\n500,0.6\n\n\n"},
		{"a lone carriage return at the end", "wavelength_nm,R\n400,0.5\n500,0.6\n\r"},
		{"no newline at the end", "wavelength_nm,R\n400,0.5\n500,0.6"},
		{"a header with trailing commas", "wavelength_nm,R,,\n400,0.5\n500,0.6\n"},
		{"wrong count", "wavelength_nm,R,T\n400,0.5\n"},
		{"decimal commas", "wavenumber_cm-1;R (%)\n4000;50,5\n400;60,25\n"},
		{"many columns", "wavelength_nm,R,T,A,u_R,u_T\n400,0.5,0.1,0.4,0.01,0.01,,,,,,,\n500,0.5,0.1,0.4,0.01,0.01\n"},
		{"repeated value, not the last", "wavelength_nm,R\n400,0.5\n500,0.6\n600,0.6\n500,0.7\n"},
		{"repeated value in an earlier segment", "wavelength_um,R\n1,0.5\n2,0.6\n\n3,0.6\n1.0,0.7\n"},
		{"out of order, not repeated", "wavenumber_cm-1,R\n4000,0.5\n3000,0.6\n3500,0.7\n"},
		{"BOM", "\ufeffwavelength_nm,R\n400,0.5\n500,0.6\n"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			a, ea := parseBytes([]byte(tc.in), "s.csv")
			b, eb := parseCSV([]byte(tc.in), "s.csv")
			if d := sameRead(a, ea, b, eb); d != "" {
				t.Error(d)
			}
		})
	}
}

// FuzzSplitLikeCSV is TestSplitLikeCSV on any input: the line-by-line
// split and encoding/csv read every file alike.
func FuzzSplitLikeCSV(f *testing.F) {
	files, _ := filepath.Glob("../testdata/*.csv")
	for _, name := range files {
		if data, err := os.ReadFile(name); err == nil {
			f.Add(data)
		}
	}
	f.Add([]byte("wavelength_nm\tR\tT\n400\t\t0.5\t0.1\n \t\n500\t0.6\t0.2\n#x\n\n600\t0,7\t0.3\n"))
	f.Add([]byte("wavelength_um;R_pct\n1;50\n\n2;60\n3;60\n1.0;1\n"))
	f.Fuzz(func(t *testing.T, in []byte) {
		a, ea := parseBytes(in, "f.csv")
		b, eb := parseCSV(in, "f.csv")
		if d := sameRead(a, ea, b, eb); d != "" {
			t.Fatal(d)
		}
	})
}

// TestRepeatedValue checks the messages for a spectral axis value given
// twice: the line of its first row, however far back, in any unit and
// across segments; a value out of order that is not repeated is named as
// such.
func TestRepeatedValue(t *testing.T) {
	for _, tc := range []struct{ name, in, msg string }{
		{"the last row", "wavelength_nm,R\n400,0.5\n500,0.5\n500,0.6\n",
			`r.csv:4: column 1 (spectral axis): 500 repeats an earlier wavelength (line 3)`},
		{"an earlier row", "wavelength_nm,R\n400,0.5\n500,0.5\n# c\n600,0.5\n400,0.6\n",
			`r.csv:6: column 1 (spectral axis): 400 repeats an earlier wavelength (line 2)`},
		{"descending", "wavelength_nm,R\n600,0.5\n500,0.5\n400,0.5\n500,0.6\n",
			`r.csv:5: column 1 (spectral axis): 500 repeats an earlier wavelength (line 3)`},
		{"an earlier segment", "wavenumber_cm-1 R\n4000 0.5\n3000 0.5\n\n2000 0.5\n1000 0.5\n3000 0.1\n",
			`r.csv:7: column 1 (spectral axis): 3000 repeats an earlier wavelength (line 3)`},
		{"written differently", "wavelength_um\tR\n1.5\t0.5\n2\t0.5\n3\t0.5\n1.50\t0.1\n",
			`r.csv:5: column 1 (spectral axis): 1.50 repeats an earlier wavelength (line 2)`},
		{"out of order", "wavelength_nm,R\n400,0.5\n500,0.5\n600,0.5\n450,0.6\n",
			`r.csv:5: column 1 (spectral axis): 450 breaks the order of the spectral axis: the axis is ascending but line 4 has 600`},
		{"quoted", "wavelength_nm,\"R\"\n400,0.5\n500,0.5\n600,0.5\n400,0.6\n",
			`r.csv:5: column 1 (spectral axis): 400 repeats an earlier wavelength (line 2)`},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Parse(strings.NewReader(tc.in), "r.csv")
			if err == nil || err.Error() != tc.msg {
				t.Errorf("message\n got %v\nwant %s", err, tc.msg)
			}
		})
	}
}

// TestIsGrouped checks isGrouped against the regular expression it
// stands for, ^\d{1,3}[.,]\d{3}$.
func TestIsGrouped(t *testing.T) {
	re := regexp.MustCompile(`^\d{1,3}[.,]\d{3}$`)
	cases := []string{"", "2.500", "1,000", "999.999", "1000.000", ".500", "2.50", "2.5000", "2,5", "a.500", "2.50a",
		"-2.500", "2.500 ", "22.222", "2..500", "2,50,0", "١.٥٠٠"}
	r := rand.New(rand.NewPCG(1, 2))
	for range 5000 {
		b := make([]byte, r.IntN(8))
		for i := range b {
			b[i] = "0123456789.,-x"[r.IntN(14)]
		}
		cases = append(cases, string(b))
	}
	for _, s := range cases {
		if got, want := isGrouped(s), re.MatchString(s); got != want {
			t.Errorf("isGrouped(%q) = %v, want %v", s, got, want)
		}
	}
}

// TestPlainDecimal checks that a plain decimal read directly is the
// double strconv.ParseFloat reads, bit for bit, and that everything else
// is left to strconv.ParseFloat.
func TestPlainDecimal(t *testing.T) {
	cases := []string{"0", "-0", "+0", "0.0", "-0.000", "1", "88.112", "0.88112", ".5", "5.", "-.5", "+1.25",
		"123456789012345", "1234567890.12345", "0.000000000000000000001", "0.0000000000000000000000123",
		"999999999999999", "9007199254740993", "0.1", "2500", "4000.0", "1e3", "0x1p3", "inf", "NaN", "1_000",
		".", "-", "+", "", "1.2.3", "1,5", "--1", "00000000000000000001.5"}
	r := rand.New(rand.NewPCG(3, 4))
	for range 20000 {
		n := 1 + r.IntN(17)
		b := make([]byte, n)
		for i := range b {
			b[i] = "0123456789"[r.IntN(10)]
		}
		s := string(b)
		if p := r.IntN(n + 1); p < n {
			s = s[:p] + "." + s[p:]
		}
		if r.IntN(3) == 0 {
			s = "-" + s
		}
		cases = append(cases, s)
	}
	for _, s := range cases {
		want, err := strconv.ParseFloat(s, 64)
		m, frac, neg, ok := plainDecimal(s, '.')
		if !ok {
			continue
		}
		if err != nil {
			t.Errorf("%q: read as a plain decimal, but ParseFloat says %v", s, err)
			continue
		}
		got, ok := exactDecimal(m, -frac, neg)
		if ok && math.Float64bits(got) != math.Float64bits(want) {
			t.Errorf("%q: %v, ParseFloat %v", s, got, want)
		}
		// Scaled by a power of ten: the double nearest the decimal with its
		// point moved, as ParseFloat reads it with an exponent.
		for _, exp := range []int{-2, 3} {
			d := decimal{x: want, m: m, frac: frac, neg: neg, plain: true}
			wantS, _ := strconv.ParseFloat(s+"e"+strconv.Itoa(exp), 64)
			if got := d.scaled(exp); math.Float64bits(got) != math.Float64bits(wantS) {
				t.Errorf("%q × 10^%d: %v, ParseFloat %v", s, exp, got, wantS)
			}
		}
	}
}

// TestDecodeKeepsNoData checks that a spectrum, its warnings and its
// errors do not change when the caller reuses the bytes it decoded (the
// reader reads them in place, without copying).
func TestDecodeKeepsNoData(t *testing.T) {
	for _, in := range []string{
		"wavelength_nm,Reflectance (%),T\n400,0.5,0.1\n500,0.6,0.2\n", // fractions in a percent column: a warning
		"wavelength_nm,R,Transmittance\n400,0.5,0.1\n500,0.6,9\n",     // an error naming the column
		"wavelength_nm R_pct\n400 0.5\n500 0.6\n",
	} {
		data := []byte(in)
		s, err := Decode(data, "k.csv")
		before := fmt.Sprint(err)
		var warn string
		if s != nil {
			warn = fmt.Sprint(s.Warnings)
		}
		var pe *ParseError
		name := ""
		if errors.As(err, &pe) {
			name = pe.Name
		}
		for i := range data {
			data[i] = 'x'
		}
		if fmt.Sprint(err) != before || s != nil && fmt.Sprint(s.Warnings) != warn || pe != nil && pe.Name != name {
			t.Errorf("%q: changed with the input: %v, %v", in, err, s)
		}
		if s == nil && pe == nil {
			t.Errorf("%q: neither a spectrum nor a ParseError: %v", in, err)
		}
	}
}

// TestSegmentCapacity checks that a file whose rows are few among many
// comment lines, or whose segments shrink, keeps no unused room.
func TestSegmentCapacity(t *testing.T) {
	var b bytes.Buffer
	b.WriteString("wavelength_nm,R\n400,0.5\n500,0.6\n")
	for range 10000 {
		b.WriteString("# a comment\n")
	}
	b.WriteString("\n600,0.5\n700,0.6\n")
	s, err := Parse(&b, "c.csv")
	if err != nil {
		t.Fatal(err)
	}
	for i, g := range s.Segments {
		if cap(g.NM) > 64 || cap(g.Values[R]) > 64 {
			t.Errorf("segment %d: room for %d and %d rows, holds %d", i, cap(g.NM), cap(g.Values[R]), len(g.NM))
		}
	}
}
