package spectra

import (
	"errors"
	"math"
	"os"
	"strings"
	"testing"
	"testing/fstest"
)

// TestResolution checks the "resolution" metadata and the defaults by
// axis unit (docs/format.md).
func TestResolution(t *testing.T) {
	for _, tt := range []struct {
		name, in string
		want     Resolution
		stated   bool
		widthAt  float64 // nm
		width    float64 // nm
	}{
		// 2 nm for nm axes, 4 cm⁻¹ for wavenumber axes: common practice, no source.
		{"nm default", "wavelength_nm,R\n400,0.5\n500,0.5\n", Resolution{NM: 2}, false, 450, 2},
		// 4 cm⁻¹ at 10 µm is λ²Δν̃ = (1e-3 cm)² × 4 cm⁻¹ = 4e-6 cm = 40 nm.
		{"wavenumber default", "wavenumber_cm-1,R\n400,0.5\n4000,0.5\n", Resolution{Wavenumber: 4}, false, 10000, 40},
		// µm axis: the wider of 2 nm and 4 cm⁻¹ (λ²Δν̃ = 2 nm at λ ≈ 2236 nm).
		{"um default, visible", "wavelength_um,R\n0.4,0.5\n20,0.5\n", Resolution{NM: 2, Wavenumber: 4}, false, 500, 2},
		{"um default, infrared", "wavelength_um,R\n0.4,0.5\n20,0.5\n", Resolution{NM: 2, Wavenumber: 4}, false, 5000, 10},
		{"stated with unit", "# resolution: 8 cm-1\nwavelength_nm,R\n400,0.5\n500,0.5\n", Resolution{Wavenumber: 8}, true, 10000, 80},
		{"stated bare, wavenumber axis", "# resolution: 2\nwavenumber_cm-1,R\n400,0.5\n4000,0.5\n", Resolution{Wavenumber: 2}, true, 10000, 20},
		{"stated bare, um axis", "# Resolution: 0.005\nwavelength_um,R\n0.4,0.5\n20,0.5\n", Resolution{NM: 5}, true, 10000, 5},
		{"stated in um", "# resolution: 0.01 µm\nwavelength_nm,R\n400,0.5\n500,0.5\n", Resolution{NM: 10}, true, 450, 10},
		{"stated 1/cm", "# resolution: 4 1/CM\nwavelength_nm,R\n400,0.5\n500,0.5\n", Resolution{Wavenumber: 4}, true, 5000, 10},
	} {
		t.Run(tt.name, func(t *testing.T) {
			s, err := Parse(strings.NewReader(tt.in), "f.csv")
			if err != nil {
				t.Fatal(err)
			}
			if len(s.Measurements) != 1 {
				t.Fatalf("%d measurements", len(s.Measurements))
			}
			m := s.Measurements[0]
			if m.Resolution != tt.want || m.ResolutionStated != tt.stated || m.Source != "f.csv" {
				t.Errorf("measurement %+v, want resolution %+v stated %v", m, tt.want, tt.stated)
			}
			if w := m.Resolution.Width(tt.widthAt); math.Abs(w-tt.width) > 1e-9*tt.width {
				t.Errorf("width at %g nm: %g, want %g", tt.widthAt, w, tt.width)
			}
		})
	}
	for _, bad := range []string{"0", "-2 nm", "two nm", "4 furlongs", "NaN", "Inf cm-1"} {
		_, err := Parse(strings.NewReader("# resolution: "+bad+"\nwavelength_nm,R\n400,0.5\n500,0.5\n"), "f.csv")
		var pe *ParseError
		if !errors.As(err, &pe) || !errors.Is(err, errBadMetadata) || pe.Line != 1 {
			t.Errorf("resolution %q: %v, want a bad metadata error on line 1", bad, err)
		}
	}
}

// TestEmittanceMetadata checks the "emittance" metadata.
func TestEmittanceMetadata(t *testing.T) {
	for in, want := range map[string]EmittanceBasis{
		"":                                   EmittanceUnstated,
		"# emittance: near-normal\n":         EmittanceNearNormal,
		"# Emittance: Near normal\n":         EmittanceNearNormal,
		"# emittance: hemispherical\n":       EmittanceHemispherical,
		"# emittance: total hemispherical\n": EmittanceHemispherical,
	} {
		s, err := Parse(strings.NewReader(in+"wavelength_nm,R\n400,0.5\n500,0.5\n"), "f.csv")
		if err != nil {
			t.Fatal(err)
		}
		if got := s.Measurements[0].Emittance; got != want {
			t.Errorf("%q: %v, want %v", in, got, want)
		}
	}
	_, err := Parse(strings.NewReader("# emittance: directional\nwavelength_nm,R\n400,0.5\n500,0.5\n"), "f.csv")
	if !errors.Is(err, errBadMetadata) || !strings.Contains(err.Error(), "want near-normal or hemispherical") {
		t.Errorf("bad basis: %v", err)
	}
}

// TestMeasurementAt checks that every value of a joined sample finds the
// file it came from, also where files touch, overlap (spliced) or leave a
// gap, and through JCAMP-DX.
func TestMeasurementAt(t *testing.T) {
	fsys := fstest.MapFS{
		"uv.csv":  {Data: []byte("# resolution: 1 nm\nwavelength_nm,R\n300,0.5\n1000,0.5\n2500,0.5\n")},
		"ir.csv":  {Data: []byte("wavenumber_cm-1,R\n4000,0.5\n1000,0.5\n400,0.5\n")},
		"ov.csv":  {Data: []byte("wavelength_nm,R\n2000,0.5\n3000,0.5\n")},
		"gap.csv": {Data: []byte("wavenumber_cm-1,R\n3000,0.5\n400,0.5\n")},
	}
	data, err := os.ReadFile("../testdata/jcamp/ftir.jdx")
	if err != nil {
		t.Fatal(err)
	}
	fsys["ftir.jdx"] = &fstest.MapFile{Data: data}
	for _, tt := range []struct {
		name  string
		files []string
	}{
		{"touching", []string{"uv.csv", "ir.csv"}},
		{"spliced", []string{"uv.csv", "ov.csv"}},
		{"gap", []string{"uv.csv", "gap.csv"}},
		{"jcamp", []string{"uv.csv", "ftir.jdx"}},
	} {
		t.Run(tt.name, func(t *testing.T) {
			s, err := ReadSample(fsys, tt.files, SampleOptions{})
			if err != nil {
				t.Fatal(err)
			}
			if len(s.Measurements) != 2 {
				t.Fatalf("%d measurements", len(s.Measurements))
			}
			for i := range s.Segments {
				g := &s.Segments[i]
				for _, nm := range g.NM {
					m, ok := s.MeasurementAt(g, nm)
					want := tt.files[1]
					if nm <= 2500 {
						want = "uv.csv" // the first file's value is kept where they meet or splice
					}
					if !ok || m.Source != want {
						t.Errorf("%g nm: %q, want %q", nm, m.Source, want)
					}
				}
			}
		})
	}
	if m := mustMeasurement(t, fsys, "ftir.jdx"); m.Resolution != (Resolution{Wavenumber: 4}) || !m.ResolutionStated {
		t.Errorf("JCAMP-DX ##RESOLUTION=4 1/CM: %+v", m)
	}
}

func mustMeasurement(t *testing.T, fsys fstest.MapFS, name string) Measurement {
	t.Helper()
	s, err := Decode(fsys[name].Data, name)
	if err != nil {
		t.Fatal(err)
	}
	return s.Measurements[0]
}
