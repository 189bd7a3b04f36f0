package spectra

import (
	"errors"
	"math"
	"strings"
	"testing"
)

func TestMerge(t *testing.T) {
	uv := mustParse(t, "uv.csv", "wavelength_nm,R,T\n300,0.5,0.1\n2500,0.9,0.0\n")
	ir := mustParse(t, "ir.csv", "wavelength_um,R\n2.5,0.1\n25,0.05\n")
	gap := mustParse(t, "gap.csv", "wavelength_um,R\n3,0.1\n25,0.05\n")
	over := mustParse(t, "over.csv", "wavelength_um,R\n2.4,0.1\n25,0.05\n")

	s, err := merge(ir, uv) // order of arguments does not matter
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Segments) != 1 || s.Len() != 3 {
		t.Fatalf("touching files: %d segments, %d rows; want 1 and 3", len(s.Segments), s.Len())
	}
	if v, _ := s.Series(R).At(2500); v != 0.9 {
		t.Errorf("R at the shared wavelength = %g, want the first file's 0.9", v)
	}
	if len(s.Notes) != 1 || !strings.Contains(s.Notes[0], "R 0.9 (kept) against 0.1") {
		t.Errorf("notes = %q, want the differing values at 2500 nm said", s.Notes)
	}
	if tr := s.Series(T); len(tr.Pieces) != 1 || tr.Pieces[0].NM[1] != 2500 {
		t.Errorf("T should end at 2500 nm: %+v", tr)
	}

	s, err = merge(uv, gap)
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Segments) != 2 {
		t.Fatalf("gap: %d segments, want 2", len(s.Segments))
	}
	if _, ok := s.Series(R).At(2700); ok {
		t.Error("a gap between files must not be interpolated")
	}

	if _, err := merge(uv, over); !errors.Is(err, errOverlap) {
		t.Errorf("overlap: err = %v, want ErrOverlap", err)
	}
}

func TestResolve(t *testing.T) {
	for _, tt := range []struct {
		name     string
		in       string
		at       float64
		r, tr, a float64
		says     string // an assumption that must be stated
		ok       bool
		origin   [3]Origin // of R, T and A
	}{
		{"R only: opaque", "wavelength_nm,R\n400,0.9\n500,0.8\n", 500, 0.8, 0, 0.2, "taken as opaque (T = 0)", true,
			[3]Origin{Measured, AssumedZero, Derived}},
		{"R and T", "wavelength_nm,R,T\n400,0.5,0.3\n500,0.6,0.3\n", 500, 0.6, 0.3, 0.1, "A = 1 − R − T", true,
			[3]Origin{Measured, Measured, Derived}},
		// R + T + A = 1 gives T = 1 − 0.85 − 0.10 = 0.05, not 0: the
		// solar absorptance is then 0.10, not 1 − R = 0.15.
		{"R and A: T derived", "wavelength_nm,R,A\n400,0.85,0.10\n500,0.85,0.10\n", 500, 0.85, 0.05, 0.10, "T = 1 − R − A", true,
			[3]Origin{Measured, Derived, Measured}},
		{"R and A above one", "wavelength_nm,R,A\n400,0.95,0.10\n500,0.85,0.10\n", 400, 0.95, -0.05, 0.10, "R+A exceeds 1 by 0.0500 at 400 nm", false,
			[3]Origin{Measured, Derived, Measured}},
		{"T and A", "wavelength_nm,T,A\n400,0.5,0.3\n500,0.6,0.3\n", 500, 0.1, 0.6, 0.3, "R = 1 − T − A", true,
			[3]Origin{Derived, Measured, Measured}},
		{"A only", "wavelength_nm,A\n400,0.5\n500,0.6\n", 500, 0.4, 0, 0.6, "opaque", true,
			[3]Origin{Derived, AssumedZero, Measured}},
		{"R+T above one", "wavelength_nm,R,T\n400,0.9,0.2\n500,0.6,0.3\n", 400, 0.9, 0.2, -0.1, "Kirchhoff", false,
			[3]Origin{Measured, Measured, Derived}},
		{"negative", "wavelength_nm,R\n400,-0.04\n500,0.6\n", 400, -0.04, 0, 1.04, "opaque", false,
			[3]Origin{Measured, AssumedZero, Derived}},
		{"within tolerance", "wavelength_nm,R,T,A\n400,0.5,0.2,0.31\n500,0.6,0.2,0.2\n", 400, 0.5, 0.2, 0.31, "Kirchhoff", true,
			[3]Origin{Measured, Measured, Measured}},
		// T measured in the visible only: measured there, taken as 0 beyond.
		{"T over part", "wavelength_nm,R,T\n400,0.5,0.3\n500,0.6,0.3\n\n600,0.6,\n700,0.6,\n", 700, 0.6, 0, 0.4, "not measured over 600–700 nm", true,
			[3]Origin{Measured, Measured | AssumedZero, Derived}},
	} {
		t.Run(tt.name, func(t *testing.T) {
			o := Resolve(mustParse(t, "x", tt.in), 0.02)
			for _, c := range []struct {
				s    Series
				want float64
			}{{o.R, tt.r}, {o.T, tt.tr}, {o.A, tt.a}} {
				if v, ok := c.s.At(tt.at); !ok || math.Abs(v-c.want) > 1e-12 {
					t.Errorf("at %g nm: got %g (%v), want %g", tt.at, v, ok, c.want)
				}
			}
			if o.Origin != tt.origin {
				t.Errorf("origin %v, want %v", o.Origin, tt.origin)
			}
			if all := strings.Join(append(o.Assumptions, o.Closure.Problems...), " "); !strings.Contains(all, tt.says) {
				t.Errorf("assumptions and problems %q do not say %q", all, tt.says)
			}
			if o.Closure.OK() != tt.ok {
				t.Errorf("closure ok = %v, want %v: %v", o.Closure.OK(), tt.ok, o.Closure.Problems)
			}
		})
	}
}

// TestOverlapMessageRounded checks that wavelengths from the data (here
// from wavenumbers) are written to 0.01 nm in messages.
func TestOverlapMessageRounded(t *testing.T) {
	a, err := Parse(strings.NewReader("wavenumber_cm-1,R\n4168,0.5\n400,0.5\n"), "ir.csv")
	if err != nil {
		t.Fatal(err)
	}
	b, err := Parse(strings.NewReader("wavelength_nm,R\n300,0.5\n2500,0.5\n"), "uv.csv")
	if err != nil {
		t.Fatal(err)
	}
	_, err = merge(b, a)
	// 1e7/4168 = 2399.2322456813818… nm.
	if err == nil || !strings.Contains(err.Error(), "ir.csv (2399.23–25000 nm)") {
		t.Errorf("message %v", err)
	}
}
