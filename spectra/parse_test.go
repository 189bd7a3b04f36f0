package spectra

import (
	"bytes"
	"errors"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestParseBadInput(t *testing.T) {
	for _, tt := range []struct {
		name, in string
		err      error
		msg      string // the full message
	}{
		{"not a number", "wavelength_nm;R\n400;0,5\n500;0,9x\n", errNotNumber, `w.csv:3: column 2 (R): "0,9x" is not a number`},
		{"not a number comma", "wavelength_nm,R\n400,0.5\n500,abc\n", errNotNumber, `w.csv:3: column 2 (R): "abc" is not a number`},
		{"nan", "wavelength_nm,R\n400,NaN\n500,0.5\n", errNotFinite, `w.csv:2: column 2 (R): "NaN" is not finite`},
		{"inf axis", "wavelength_nm,R\n400,0.5\nInf,0.5\n", errNotFinite, `w.csv:3: column 1 (spectral axis): "Inf" is not finite`},
		{"duplicate", "wavelength_nm,R\n400,0.5\n500,0.5\n500,0.6\n", errDuplicate, `w.csv:4: column 1 (spectral axis): 500 repeats an earlier wavelength (line 3)`},
		{"non-monotonic", "wavelength_nm,R\n400,0.5\n500,0.5\n450,0.6\n", errNotMonotonic, `w.csv:4: column 1 (spectral axis): 450 breaks the order of the spectral axis: the axis is ascending but line 3 has 500`},
		{"empty data", "# sample: x\nwavelength_nm,R\n", ErrNoData, `w.csv: no data: the header is followed by no rows`},
		{"no header", "# only comments\n", errHeader, `w.csv: no header line`},
		{"unknown unit", "wavelength_mm,R\n1,0.5\n", errUnknownUnit, `w.csv:1: column 1 (spectral axis): "wavelength_mm" is not a known spectral axis: want wavelength_nm, wavelength_um or wavenumber_cm-1`},
		{"unit mismatch", "wavenumber_nm,R\n1,0.5\n", errUnknownUnit, ""},
		{"unknown column", "wavelength_nm,X\n400,0.5\n", errUnknownColumn, `w.csv:1: column 2 (X): "X" is not a known column: want R, T, A, u_R or u_T, optionally with (%) or _pct`},
		{"duplicate column", "wavelength_nm,R,reflectance\n400,0.5,0.5\n", errDuplicateCol, ""},
		{"above 1.05", "wavelength_nm,R\n400,0.5\n500,96\n", errOutOfRange, `w.csv:3: column 2 (R): "96" is out of range: want a fraction within -0.05..1.05 (percent? mark the header, e.g. "R (%)")`},
		{"below -0.05", "wavelength_nm,T\n400,-0.2\n500,0.5\n", errOutOfRange, ""},
		{"percent above 105", "wavelength_nm,R (%)\n400,50\n500,120\n", errOutOfRange, `w.csv:3: column 2 (R (%)): "120" is out of range: want a percentage within -5..105`},
		{"field count", "wavelength_nm,R,T\n400,0.5,0.1\n500,0.5\n", errFieldCount, `w.csv:3: wrong number of columns: expected 3, found 2`},
		{"one row", "wavelength_nm,R\n400,0.5\n", errShortSegment, ""},
		{"zero wavenumber", "wavenumber_cm-1,R\n0,0.5\n100,0.5\n", errOutOfRange, ""},
		{"bad utf8", "wavelength_nm,R\n400,0.5\xff\n", errEncoding, ""},
		{"bad metadata u", "# u_R: lots\nwavelength_nm,R\n400,0.5\n500,0.5\n", errBadMetadata, ""},
		{"empty axis", "wavelength_nm,R\n400,0.5\n,0.5\n", errEmptyAxisValue, ""},
		{"quotes only header", "\" \n400,0.5\n", errUnknownUnit, ""},
		{"unclosed quote", "wavelength_nm,R\n400,0.5\n500,\"0.7\n600,0.8\n", errQuote, ""},
		{"bare quote", "wavelength_nm,R\n400,0.5\n500,0\"7\n", errQuote, `w.csv:3: misplaced quote at character 6: bare " in non-quoted-field`},
		{"field count after quoted delimiter", "wavelength_nm,\"R, %\"\n400,50\n500,\"7,0\",1\n", errFieldCount, `w.csv:3: wrong number of columns: expected 2, found 3`},
	} {
		t.Run(tt.name, func(t *testing.T) {
			_, err := Parse(strings.NewReader(tt.in), "w.csv")
			if !errors.Is(err, tt.err) {
				t.Fatalf("err = %v, want %v", err, tt.err)
			}
			var pe *ParseError
			if !errors.As(err, &pe) || pe.File != "w.csv" {
				t.Errorf("err %v is not a *ParseError naming the file", err)
			}
			if tt.msg != "" && err.Error() != tt.msg {
				t.Errorf("message\n got %s\nwant %s", err, tt.msg)
			}
		})
	}
}

func TestParseForms(t *testing.T) {
	for _, tt := range []struct{ name, in string }{
		{"comma", "wavelength_nm,R,T\n400,0.5,0.1\n500,0.7,0.2\n"},
		{"crlf bom", "\uFEFF# sample: a\r\nwavelength_nm,R,T\r\n400,0.5,0.1\r\n500,0.7,0.2\r\n"},
		{"tab decimal comma", "wavelength (nm)\tR\tT\n400\t0,5\t0,1\n500\t0,7\t0,2\n"},
		{"semicolon percent", "Wavelength [nm];R (%);T_pct\n400;50;10\n500;70;20\n"},
		{"spaces", "wavelength_nm   R    T\n400  0.5  0.1\n500  0.7   0.2\n"},
		{"micrometres", "wavelength (µm),R,T\n0.4,0.5,0.1\n0.5,0.7,0.2\n"},
		{"micrometres um descending", "wavelength_um,R,T\n0.5,0.7,0.2\n0.4,0.5,0.1\n"},
		{"wavenumber descending", "wavenumber_cm-1,R,T\n25000,0.5,0.1\n20000,0.7,0.2\n"},
		{"wavenumber ascending", "wavenumber (cm⁻¹),R,T\n20000,0.7,0.2\n25000,0.5,0.1\n"},
		{"quoted header", "\"wavelength_nm\",\"R\",\"T\"\n400,0.5,0.1\n500,0.7,0.2\n"},
		{"trailing delimiter", "wavelength_nm,R,T,\n400,0.5,0.1,\n500,0.7,0.2,\n"},
		// A quoted header cell may hold the delimiter; "R, %" is R in percent.
		{"quoted delimiter in header", "\"wavelength (nm)\",\"R, %\",\"T, %\"\n400,50,10\n500,70,20\n"},
		{"quoted cells", "wavelength_nm;\"R\";T\n\"400\";\"0,5\";0,1\n500;0,7;\"0,2\"\n"},
		{"comment between rows", "wavelength_nm,R,T\n400,0.5,0.1\n# instrument changed filters here\n  # and here\n500,0.7,0.2\n"},
		{"spaces around cells", "wavelength_nm , R , T\n 400 , 0.5 , 0.1 \n500,0.7,0.2\n"},
	} {
		t.Run(tt.name, func(t *testing.T) {
			s, err := Parse(strings.NewReader(tt.in), "f")
			if err != nil {
				t.Fatal(err)
			}
			r, tr := s.Series(R), s.Series(T)
			if len(r.Pieces) != 1 {
				t.Fatalf("got %d pieces", len(r.Pieces))
			}
			for i, want := range []struct{ nm, r, t float64 }{{400, 0.5, 0.1}, {500, 0.7, 0.2}} {
				p := r.Pieces[0]
				if math.Abs(p.NM[i]-want.nm) > 1e-9 || math.Abs(p.V[i]-want.r) > 1e-12 || math.Abs(tr.Pieces[0].V[i]-want.t) > 1e-12 {
					t.Errorf("row %d = (%g, %g, %g), want %v", i, p.NM[i], p.V[i], tr.Pieces[0].V[i], want)
				}
			}
		})
	}
}

func TestParseMetadataAndSegments(t *testing.T) {
	in := "# sample: white A\n# angle of incidence: 8°\n# u_R: 0.5 %\n# a plain comment\nwavelength_nm,R,T\n400,0.5,\n450,0.6,0.1\n500,0.7,0.2\n\n600,0.8,0.1\n700,0.8,0.1\n"
	s, err := Parse(strings.NewReader(in), "f")
	if err != nil {
		t.Fatal(err)
	}
	if v, _ := s.Get("Sample"); v != "white A" {
		t.Errorf("sample = %q", v)
	}
	if v, _ := s.Get("angle of incidence"); v != "8°" {
		t.Errorf("angle = %q", v)
	}
	if len(s.Segments) != 2 {
		t.Fatalf("segments = %d, want 2", len(s.Segments))
	}
	if got := s.Series(T).Pieces[0].NM; len(got) != 2 {
		t.Errorf("T points in first segment = %v, want the empty cell dropped", got)
	}
	if u := s.Series(UR).Pieces[1].V; u[0] != 0.005 {
		t.Errorf("u_R = %v, want 0.005 from metadata", u)
	}
}

// TestParseSegmentBreaks checks that a blank line, or a line of spaces,
// ends a segment in every delimiter, and a comment line does not.
func TestParseSegmentBreaks(t *testing.T) {
	for _, tt := range []struct {
		name, in string
		segments int
	}{
		{"comma blank", "wavelength_nm,R\n400,0.5\n500,0.6\n\n600,0.7\n700,0.8\n", 2},
		{"comma crlf blank", "wavelength_nm,R\r\n400,0.5\r\n500,0.6\r\n\r\n600,0.7\r\n700,0.8\r\n", 2},
		{"comma spaces line", "wavelength_nm,R\n400,0.5\n500,0.6\n   \n600,0.7\n700,0.8\n", 2},
		{"comma comment then blank", "wavelength_nm,R\n400,0.5\n500,0.6\n# next filter\n\n600,0.7\n700,0.8\n", 2},
		{"comma comment only", "wavelength_nm,R\n400,0.5\n500,0.6\n# next filter\n600,0.7\n700,0.8\n", 1},
		{"tab blank", "wavelength_nm\tR\n400\t0.5\n500\t0.6\n\n600\t0.7\n700\t0.8\n", 2},
		{"spaces blank", "wavelength_nm R\n400 0.5\n500 0.6\n\n600 0.7\n700 0.8\n", 2},
		{"three segments", "wavelength_nm,R\n400,0.5\n500,0.6\n\n\n600,0.7\n700,0.8\n\n800,0.7\n900,0.8\n", 3},
	} {
		t.Run(tt.name, func(t *testing.T) {
			s, err := Parse(strings.NewReader(tt.in), "f")
			if err != nil {
				t.Fatal(err)
			}
			if len(s.Segments) != tt.segments {
				t.Errorf("%d segments, want %d", len(s.Segments), tt.segments)
			}
		})
	}
	// Line numbers stay right after skipped lines.
	_, err := Parse(strings.NewReader("wavelength_nm,R\n400,0.5\n500,0.6\n\n# c\n600,0.7\n700,x\n"), "f")
	var pe *ParseError
	if !errors.As(err, &pe) || pe.Line != 7 || pe.Column != 2 {
		t.Errorf("error %v, want line 7 column 2", err)
	}
}

func TestRoundTrip(t *testing.T) {
	files, _ := filepath.Glob("../testdata/*.csv")
	if len(files) == 0 {
		t.Fatal("no testdata")
	}
	for _, name := range files {
		data, err := os.ReadFile(name)
		if err != nil {
			t.Fatal(err)
		}
		s, err := Parse(bytes.NewReader(data), name)
		if err != nil {
			continue // bad-input samples
		}
		checkRoundTrip(t, s)
	}
}

func checkRoundTrip(t *testing.T, s *Spectrum) {
	t.Helper()
	var buf bytes.Buffer
	if err := Write(&buf, s); err != nil {
		t.Fatal(err)
	}
	s2, err := Parse(bytes.NewReader(buf.Bytes()), "again")
	if err != nil {
		t.Fatalf("re-read: %v\n%s", err, buf.String())
	}
	for _, q := range quantities {
		a, b := s.Series(q), s2.Series(q)
		if len(a.Pieces) != len(b.Pieces) {
			t.Fatalf("%s: %d pieces, re-read %d", q, len(a.Pieces), len(b.Pieces))
		}
		for i := range a.Pieces {
			pa, pb := a.Pieces[i], b.Pieces[i]
			if len(pa.NM) != len(pb.NM) {
				t.Fatalf("%s piece %d: %d points, re-read %d", q, i, len(pa.NM), len(pb.NM))
			}
			for j := range pa.NM {
				if pa.NM[j] != pb.NM[j] || pa.V[j] != pb.V[j] {
					t.Fatalf("%s: (%v, %v) re-read as (%v, %v)", q, pa.NM[j], pa.V[j], pb.NM[j], pb.V[j])
				}
			}
		}
	}
	if len(s.Meta) != len(s2.Meta) {
		t.Errorf("metadata: %d fields, re-read %d", len(s.Meta), len(s2.Meta))
	}
	if len(s.Notes) != len(s2.Notes) || len(s.Splices) != len(s2.Splices) {
		t.Errorf("notes and splices: %d and %d, re-read %d and %d", len(s.Notes), len(s.Splices), len(s2.Notes), len(s2.Splices))
	}
	for i := range s.Splices {
		if i < len(s2.Splices) && s.Splices[i] != s2.Splices[i] {
			t.Errorf("splice %d: %+v, re-read %+v", i, s.Splices[i], s2.Splices[i])
		}
	}
}

func FuzzParse(f *testing.F) {
	files, _ := filepath.Glob("../testdata/*.csv")
	for _, name := range files {
		if data, err := os.ReadFile(name); err == nil {
			f.Add(data)
		}
	}
	f.Add([]byte("wavenumber_cm-1;R (%);T\n4000;50,5;1\n400;60;2\n"))
	f.Fuzz(func(t *testing.T, in []byte) {
		s, err := Parse(bytes.NewReader(in), "fuzz")
		if err != nil {
			var pe *ParseError
			if !errors.As(err, &pe) {
				t.Fatalf("error %v is not a *ParseError", err)
			}
			return
		}
		prev := math.Inf(-1)
		for _, g := range s.Segments {
			if len(g.NM) < 2 {
				t.Fatalf("segment of %d rows accepted", len(g.NM))
			}
			for i, nm := range g.NM {
				if !(nm > prev) || math.IsInf(nm, 0) {
					t.Fatalf("wavelengths not increasing: %v after %v", nm, prev)
				}
				prev = nm
				for q, v := range g.Values {
					if v != nil && (math.IsInf(v[i], 0) || v[i] < -0.0501 || v[i] > 1.0501) {
						t.Fatalf("%s value %v accepted", Quantity(q), v[i])
					}
				}
			}
		}
		checkRoundTrip(t, s)
	})
}

// TestUncertaintyUnit checks the rule of docs/format.md: an uncertainty
// column follows the unit of its column unless it carries its own.
func TestUncertaintyUnit(t *testing.T) {
	for _, tc := range []struct {
		name, header string
		row          string
		r, u         float64
	}{
		// 0.5 beside R (%) is 0.5 %, i.e. 0.005.
		{"plain u_R beside R (%)", "wavelength_nm,R (%),u_R", "80,0.5", 0.80, 0.005},
		{"u_R (%) beside R (%)", "wavelength_nm,R (%),u_R (%)", "80,0.5", 0.80, 0.005},
		{"u_R (%) beside a fraction", "wavelength_nm,R,u_R (%)", "0.8,0.5", 0.80, 0.005},
		{"plain u_R beside a fraction", "wavelength_nm,R,u_R", "0.8,0.005", 0.80, 0.005},
		{"u_R_pct beside R_pct, u_T beside a fraction T", "wavelength_nm,R_pct,u_R,T,u_T", "80,0.5,0.1,0.002", 0.80, 0.005},
	} {
		t.Run(tc.name, func(t *testing.T) {
			in := tc.header + "\n400," + tc.row + "\n500," + tc.row + "\n"
			s, err := Parse(strings.NewReader(in), "u.csv")
			if err != nil {
				t.Fatal(err)
			}
			r, _ := s.Series(R).At(450)
			u, _ := s.Series(UR).At(450)
			if math.Abs(r-tc.r) > 1e-12 || math.Abs(u-tc.u) > 1e-12 {
				t.Errorf("R %g, u_R %g; want %g, %g", r, u, tc.r, tc.u)
			}
			if s.Has(UT) {
				if ut, _ := s.Series(UT).At(450); math.Abs(ut-0.002) > 1e-12 {
					t.Errorf("u_T %g, want 0.002 (T is a fraction)", ut)
				}
			}
		})
	}
	// A plain u_R beside R (%) is checked as a percentage: 150 is out of range.
	_, err := Parse(strings.NewReader("wavelength_nm,R (%),u_R\n400,80,150\n500,80,1\n"), "u.csv")
	if !errors.Is(err, errOutOfRange) || !strings.Contains(err.Error(), "0..100") {
		t.Errorf("err %v", err)
	}
}
