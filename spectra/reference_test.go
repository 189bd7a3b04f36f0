package spectra

import (
	"errors"
	"math"
	"strings"
	"testing"
	"testing/fstest"
)

func mustParse(t *testing.T, name, in string) *Spectrum {
	t.Helper()
	s, err := Parse(strings.NewReader(in), name)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

func TestApplyReferenceConstant(t *testing.T) {
	// A constant reference of 0.5 halves every R exactly (R_abs = R_rel × R_ref).
	s := mustParse(t, "rel.csv", "# sample: invented\n# reference_file: ref.csv\nwavelength_nm,R,T\n400,0.9,0.05\n500,0.8,0.04\n\n700,0.7,0.03\n800,0.6,0.02\n")
	ref := mustParse(t, "ref.csv", "# provenance: invented calibration curve for tests\nwavelength_nm,R\n300,0.5\n900,0.5\n")
	out, err := ApplyReference(s, ref)
	if err != nil {
		t.Fatal(err)
	}
	want, wantT := []float64{0.45, 0.4, 0.35, 0.3}, []float64{0.05, 0.04, 0.03, 0.02}
	i := 0
	for _, g := range out.Segments {
		for j := range g.NM {
			if g.Values[R][j] != want[i] {
				t.Errorf("R(%g) = %.17g, want exactly %g", g.NM[j], g.Values[R][j], want[i])
			}
			if g.Values[T][j] != wantT[i] {
				t.Errorf("T changed at %g", g.NM[j])
			}
			i++
		}
	}
	if _, ok := referenceFile(out); ok {
		t.Error("reference_file kept after correction")
	}
	for k, v := range map[string]string{referenceAppliedKey: "ref.csv", "reference provenance": "invented calibration curve for tests", "sample": "invented"} {
		if got, _ := out.Get(k); got != v {
			t.Errorf("%s = %q, want %q", k, got, v)
		}
	}
	if len(out.Notes) != 1 || !strings.Contains(out.Notes[0], "R = R_rel × R_ref") {
		t.Errorf("notes %q", out.Notes)
	}
	if s.Segments[0].Values[R][0] != 0.9 {
		t.Error("input modified")
	}
	if _, err := ApplyReference(out, ref); !errors.Is(err, errReferenceApplied) {
		t.Errorf("second correction: %v", err)
	}
	checkRoundTrip(t, out)
}

func TestApplyReferenceInterpolatedAndUncertainty(t *testing.T) {
	s := mustParse(t, "rel.csv", "wavelength_nm,R,u_R\n400,0.9,0.01\n450,0.8,0.02\n500,0.7,0.01\n")
	ref := mustParse(t, "ref.csv", "wavelength_nm,R,u_R\n400,0.95,0.003\n500,0.99,0.004\n")
	out, err := ApplyReference(s, ref)
	if err != nil {
		t.Fatal(err)
	}
	g := out.Segments[0]
	for i, c := range []struct{ r, rref, u, uref float64 }{{0.9, 0.95, 0.01, 0.003}, {0.8, 0.97, 0.02, 0.0035}, {0.7, 0.99, 0.01, 0.004}} {
		// R_ref linear between its points; u of a product of uncorrelated
		// quantities: u² = (R_ref·u_rel)² + (R_rel·u_ref)² (JCGM 100:2008, 5.1.2)
		wantR, wantU := c.r*c.rref, math.Sqrt(c.rref*c.rref*c.u*c.u+c.r*c.r*c.uref*c.uref)
		if math.Abs(g.Values[R][i]-wantR) > 1e-15 || math.Abs(g.Values[UR][i]-wantU) > 1e-15 {
			t.Errorf("point %d: R %g u %g, want %g %g", i, g.Values[R][i], g.Values[UR][i], wantR, wantU)
		}
	}
}

func TestApplyReferenceErrors(t *testing.T) {
	s := mustParse(t, "rel.csv", "wavelength_nm,R\n400,0.9\n1000,0.8\n")
	for _, tt := range []struct {
		name string
		s    *Spectrum
		ref  string
		err  error
	}{
		{"above the range", s, "wavelength_nm,R\n300,0.9\n900,0.9\n", errReferenceRange},
		{"below the range", s, "wavelength_nm,R\n401,0.9\n1200,0.9\n", errReferenceRange},
		{"in a gap", mustParse(t, "rel.csv", "wavelength_nm,R\n400,0.9\n550,0.85\n1000,0.8\n"), "wavelength_nm,R\n300,0.9\n500,0.9\n\n600,0.9\n1200,0.9\n", errReferenceRange},
		{"reference without R", s, "wavelength_nm,T\n300,0.9\n1200,0.9\n", errNoReflectance},
		{"sample without R", mustParse(t, "t.csv", "wavelength_nm,T\n400,0.9\n1000,0.8\n"), "wavelength_nm,R\n300,0.9\n1200,0.9\n", errNoReflectance},
	} {
		t.Run(tt.name, func(t *testing.T) {
			if _, err := ApplyReference(tt.s, mustParse(t, "ref.csv", tt.ref)); !errors.Is(err, tt.err) {
				t.Errorf("err = %v, want %v", err, tt.err)
			}
		})
	}
}

func TestReferenceWarning(t *testing.T) {
	const data = "wavelength_nm,R\n400,0.5\n500,0.6\n"
	for _, tt := range []struct {
		name, meta string
		warn       bool
	}{
		{"relative to a named standard", "# sampling procedure: hemispherical reflectance, 8 deg, relative to reference standard RS-0\n", true},
		{"relative to a white standard", "# method: relative to a white standard\n", true},
		{"relative reflectance", "# y units: Relative Reflectance\n", true},
		{"absolute", "# sampling procedure: absolute hemispherical reflectance\n", false},
		{"reference named", "# sampling procedure: relative to reference standard RS-0\n# reference_file: ref.csv\n", false},
		{"already corrected", "# sampling procedure: relative to reference standard RS-0\n# reference_applied: ref.csv\n", false},
		{"the reference's own metadata", "# reference sampling procedure: relative to a primary standard\n", false},
		{"no metadata", "", false},
	} {
		s, err := Parse(strings.NewReader(tt.meta+data), "s.csv")
		if err != nil {
			t.Fatalf("%s: %v", tt.name, err)
		}
		w := ReferenceWarning(s, "s.csv")
		if (w != "") != tt.warn {
			t.Errorf("%s: warning %q, want one: %v", tt.name, w, tt.warn)
		}
		if w != "" && !strings.HasPrefix(w, "s.csv: ") {
			t.Errorf("%s: warning %q does not name the file", tt.name, w)
		}
	}
}

// TestReadSampleReferenceWarning checks that ReadSample warns about a file
// measured relative to a standard only when no standard is applied to it.
func TestReadSampleReferenceWarning(t *testing.T) {
	fsys := fstest.MapFS{
		"s.csv":   {Data: []byte("# sampling procedure: relative to reference standard RS-0\nwavelength_nm,R\n400,0.5\n500,0.6\n")},
		"ref.csv": {Data: []byte("wavelength_nm,R\n300,0.98\n600,0.98\n")},
	}
	s, err := ReadSample(fsys, []string{"s.csv"}, SampleOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Warnings) != 1 || !strings.Contains(s.Warnings[0], "relative to reference standard") {
		t.Errorf("without a reference: warnings %q, want one about the reference standard", s.Warnings)
	}
	s, err = ReadSample(fsys, []string{"s.csv"}, SampleOptions{Reference: "ref.csv"})
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Warnings) != 0 {
		t.Errorf("with a reference: warnings %q, want none", s.Warnings)
	}
}
