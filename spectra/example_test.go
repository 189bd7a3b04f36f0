package spectra_test

import (
	"fmt"
	"strings"

	"skysheet/spectra"
)

func ExampleParse() {
	in := "# sample: example\nwavelength_nm,R (%)\n300,90\n2500,90\n"
	s, err := spectra.Parse(strings.NewReader(in), "example.csv")
	if err != nil {
		fmt.Println(err)
		return
	}
	lo, hi := s.Range()
	v, _ := s.Series(spectra.R).At(1000)
	fmt.Printf("%g–%g nm, R(1000 nm) = %.2f\n", lo, hi, v)
	// Output: 300–2500 nm, R(1000 nm) = 0.90
}

func ExampleBandMean() {
	// A reflectance step from 0.1 to 0.9 at 700 nm, weighted by sunlight.
	r := spectra.Series{Pieces: []spectra.Piece{{
		NM: []float64{280, 700, 700.001, 2500},
		V:  []float64{0.1, 0.1, 0.9, 0.9},
	}}}
	m := spectra.BandMean(r, spectra.SolarGlobal(), 280, 2500)
	fmt.Printf("solar reflectance %.3f, coverage %.0f %%\n", m.Value, 100*m.Coverage)
	// Output: solar reflectance 0.516, coverage 100 %
}

func ExampleParse_error() {
	_, err := spectra.Parse(strings.NewReader("wavelength_nm;R\n400;0,5\n500;0,9x\n"), "white.csv")
	fmt.Println(err)
	// Output: white.csv:3: column 2 (R): "0,9x" is not a number
}

func ExampleSpectrum_MeasurementAt() {
	in := "# resolution: 8 cm-1\n# emittance: hemispherical\nwavenumber_cm-1,R\n4000,0.1\n400,0.1\n"
	s, _ := spectra.Parse(strings.NewReader(in), "ftir.csv")
	g := &s.Segments[0]
	m, _ := s.MeasurementAt(g, 10000)
	fmt.Printf("%s: resolution %s (%.0f nm at 10 µm), %s emittance\n", m.Source, m.Resolution, m.Resolution.Width(10000), m.Emittance)
	fmt.Println("default for a nm axis:", spectra.DefaultResolution("nm"))
	// Output:
	// ftir.csv: resolution 8 cm-1 (80 nm at 10 µm), hemispherical emittance
	// default for a nm axis: 2 nm
}

// A file with R and A but no T: T is derived as 1 − R − A, and the
// origins say so.
func ExampleResolve_origin() {
	in := "wavelength_nm,R,A\n300,0.05,0.10\n2500,0.05,0.10\n"
	s, _ := spectra.Parse(strings.NewReader(in), "ra.csv")
	o := spectra.Resolve(s, spectra.DefaultClosureTol)
	t, _ := o.T.At(1000)
	fmt.Printf("T = %.2f; R %s, T %s, A %s\n", t, o.Origin[spectra.R], o.Origin[spectra.T], o.Origin[spectra.A])
	// Output: T = 0.85; R measured, T derived, A measured
}
