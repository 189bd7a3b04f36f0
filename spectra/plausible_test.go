package spectra

import (
	"errors"
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
			got := len(s.Warnings) > 0
			if got != tc.warn {
				t.Fatalf("warnings %q, want a warning: %v", s.Warnings, tc.warn)
			}
			if got && (!strings.HasPrefix(s.Warnings[0], "x.csv: ") || !strings.Contains(s.Warnings[0], "thousands separator")) {
				t.Errorf("warning %q does not name the file and the cause", s.Warnings[0])
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
