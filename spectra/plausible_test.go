package spectra

import (
	"errors"
	"math"
	"strings"
	"testing"
)

func TestThousandsSeparators(t *testing.T) {
	for _, tc := range []struct {
		name, in string
		warn     bool
	}{
		// 1000–2500 nm written with a thousands point, read as 1–2.5 nm.
		{"nm grouped", "wavelength_nm\tR\n1.000\t0.5\n1.500\t0.6\n2.500\t0.7\n", true},
		// Wavenumbers 4000–400 cm⁻¹ grouped: 4–0.4 cm⁻¹ is 2.5–25 mm.
		{"wavenumber grouped", "wavenumber_cm-1;R\n4.000;0,5\n2.000;0,5\n1.000;0,5\n", true},
		// 1–2.5 µm is 1000–2500 nm: plausible, no warning.
		{"micrometres with three decimals", "wavelength_um,R\n1.000,0.5\n1.500,0.6\n2.500,0.7\n", false},
		// Plain nm values.
		{"nm plain", "wavelength_nm,R\n400,0.5\n2500,0.6\n", false},
		// Some values not grouped: no warning (the reader judges the axis whole).
		{"mixed", "wavelength_nm\tR\n1.000\t0.5\n1.5\t0.6\n", false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			s, err := Parse(strings.NewReader(tc.in), "x.csv")
			if err != nil {
				t.Fatal(err)
			}
			got := len(s.Warnings) > 0 && strings.Contains(s.Warnings[0], "thousands separator")
			if got != tc.warn {
				t.Fatalf("warnings %q, want a thousands warning: %v", s.Warnings, tc.warn)
			}
			if got && (!strings.HasPrefix(s.Warnings[0], "x.csv: ") || len(s.Warnings) != 1) {
				t.Errorf("warnings %q: want one, naming the file", s.Warnings)
			}
		})
	}
	// Warnings survive the joining of files.
	a, _ := Parse(strings.NewReader("wavelength_nm\tR\n1.000\t0.5\n2.000\t0.6\n"), "a.csv")
	b, _ := Parse(strings.NewReader("wavelength_nm,R\n400,0.5\n2500,0.6\n"), "b.csv")
	j, err := Join([]*Spectrum{a, b}, SpliceOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if len(j.Warnings) != 1 || !strings.HasPrefix(j.Warnings[0], "a.csv") {
		t.Errorf("joined warnings %q", j.Warnings)
	}
}

func TestThousandsHint(t *testing.T) {
	for _, cell := range []string{"1,234.5", "1.234,5", "12.345.678"} {
		_, err := Parse(strings.NewReader("wavelength_nm\tR (%)\n400\t"+cell+"\n500\t50\n"), "x.csv")
		if !errors.Is(err, errNotNumber) || !strings.Contains(err.Error(), "thousands separators?") {
			t.Errorf("%s: %v", cell, err)
		}
	}
	if _, err := Parse(strings.NewReader("wavelength_nm,R\n400,abc\n500,0.5\n"), "x.csv"); strings.Contains(err.Error(), "thousands") {
		t.Errorf("hint where none applies: %v", err)
	}
}

// TestAxisUnitWarning checks the warning for an axis that lies outside
// every band the figures use (280 nm to 100 µm) in its stated unit but
// inside them in another.
func TestAxisUnitWarning(t *testing.T) {
	for _, tc := range []struct {
		name, in string
		want     string // "" for no warning
	}{
		// 2.5–25 read as nm is outside 280 nm–100 µm; as µm, 2500–25000 nm.
		{"µm labelled nm", "wavelength_nm,R\n2.5,0.1\n25,0.05\n", "µm values labelled nm?"},
		// 300–2500 µm is 0.3–2.5 mm; as nm, inside the solar band.
		{"nm labelled µm", "wavelength_um,R\n300,0.1\n2500,0.05\n", "nm values labelled µm?"},
		// 2.5–25 cm⁻¹ is 0.4–4 mm; as µm, 2500–25000 nm.
		{"µm labelled cm⁻¹", "wavenumber_cm-1,R\n25,0.1\n2.5,0.05\n", "µm values labelled cm⁻¹?"},
		{"nm as stated", "wavelength_nm,R\n300,0.1\n2500,0.05\n", ""},
		{"µm as stated", "wavelength_um,R\n2.5,0.1\n25,0.05\n", ""},
		{"cm⁻¹ as stated", "wavenumber_cm-1,R\n4000,0.1\n400,0.05\n", ""},
		// Deep ultraviolet, 150–250 nm: outside the bands in every unit
		// tried, so no unit would fix it; no warning.
		{"vacuum UV", "wavelength_nm,R\n150,0.1\n250,0.05\n", ""},
	} {
		t.Run(tc.name, func(t *testing.T) {
			s, err := Parse(strings.NewReader(tc.in), "ax.csv")
			if err != nil {
				t.Fatal(err)
			}
			all := strings.Join(s.Warnings, "\n")
			if tc.want == "" && all != "" || tc.want != "" && (!strings.Contains(all, tc.want) || !strings.HasPrefix(all, "ax.csv: ")) {
				t.Errorf("warnings %q, want %q", all, tc.want)
			}
		})
	}
}

// TestPercentWarning checks the warning for a percent column whose values
// look like fractions (every value at most 1.05).
func TestPercentWarning(t *testing.T) {
	for _, tc := range []struct {
		name, in string
		warn     bool
	}{
		{"fractions under R (%)", "wavelength_nm,R (%)\n400,0.91\n500,0.93\n", true},
		{"fractions under T_pct", "wavelength_nm,R,T_pct\n400,0.05,0.85\n500,0.05,0.9\n", true},
		{"true percentages", "wavelength_nm,R (%)\n400,91\n500,93\n", false},
		// An opaque sample's transmittance in percent, all under 0.1 %:
		// near 0 either way.
		{"opaque T (%)", "wavelength_nm,R (%),T (%)\n400,91,0.02\n500,93,0.05\n", false},
		// An uncertainty column in percent is small by nature.
		{"u_R (%)", "wavelength_nm,R (%),u_R (%)\n400,91,0.5\n500,93,0.5\n", false},
		{"fraction column", "wavelength_nm,R\n400,0.91\n500,0.93\n", false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			s, err := Parse(strings.NewReader(tc.in), "p.csv")
			if err != nil {
				t.Fatal(err)
			}
			got := strings.Join(s.Warnings, "\n")
			if has := strings.Contains(got, "fractions in a percent column?"); has != tc.warn || has && !strings.HasPrefix(got, "p.csv: column ") {
				t.Errorf("warnings %q, want the percent warning: %v", got, tc.warn)
			}
		})
	}
	// The warning reaches a joined spectrum and its value is not changed:
	// a warning, not an error.
	s, _ := Parse(strings.NewReader("wavelength_nm,R (%)\n400,0.91\n500,0.93\n"), "p.csv")
	if v, _ := s.Series(R).At(400); math.Abs(v-0.0091) > 1e-15 {
		t.Errorf("R = %g, want 0.0091 (read as stated)", v)
	}
}

// TestConstUncertaintyWarning checks the warning for a constant
// uncertainty in metadata that looks like a percentage without its %.
func TestConstUncertaintyWarning(t *testing.T) {
	for in, warn := range map[string]bool{
		"# u_R: 0.5\nwavelength_nm,R (%)\n400,91\n500,93\n":   true,
		"# u_R: 0.5 %\nwavelength_nm,R (%)\n400,91\n500,93\n": false,
		"# u_T: 0.005\nwavelength_nm,T\n400,0.9\n500,0.9\n":   false,
	} {
		s, err := Parse(strings.NewReader(in), "c.csv")
		if err != nil {
			t.Fatal(err)
		}
		if got := strings.Join(s.Warnings, " "); strings.Contains(got, "a percentage without its %?") != warn {
			t.Errorf("%q: warnings %q, want one: %v", in, got, warn)
		}
	}
}

// TestJCAMPWarnings checks that the JCAMP-DX reader gives the same
// plausibility warnings as the neutral reader.
func TestJCAMPWarnings(t *testing.T) {
	head := "##TITLE=w\n##JCAMP-DX=4.24\n##DATA TYPE=INFRARED SPECTRUM\n"
	for _, tc := range []struct{ name, in, want string }{
		{"fractions under %REFLECTANCE", head + "##XUNITS=NANOMETERS\n##YUNITS=%REFLECTANCE\n##XYPOINTS=(XY..XY)\n400,0.9\n500,0.92\n##END=\n",
			"fractions in a percent column?"},
		{"µm labelled nm", head + "##XUNITS=NANOMETERS\n##YUNITS=REFLECTANCE\n##XYPOINTS=(XY..XY)\n2.5,0.1\n25,0.05\n##END=\n",
			"µm values labelled nm?"},
		{"plausible", head + "##XUNITS=NANOMETERS\n##YUNITS=%REFLECTANCE\n##XYPOINTS=(XY..XY)\n400,90\n500,92\n##END=\n", ""},
	} {
		t.Run(tc.name, func(t *testing.T) {
			s, err := Decode([]byte(tc.in), "w.jdx")
			if err != nil {
				t.Fatal(err)
			}
			got := strings.Join(s.Warnings, "\n")
			if tc.want == "" && got != "" || !strings.Contains(got, tc.want) || tc.want != "" && !strings.HasPrefix(got, "w.jdx: ") {
				t.Errorf("warnings %q, want %q", got, tc.want)
			}
		})
	}
}
