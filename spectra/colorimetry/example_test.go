package colorimetry_test

import (
	"fmt"

	"skysheet/spectra"
	"skysheet/spectra/colorimetry"
)

func ExampleTristimulus() {
	// A grey: reflectance 0.5 from 300 to 900 nm.
	grey := spectra.Series{Pieces: []spectra.Piece{{NM: []float64{300, 900}, V: []float64{0.5, 0.5}}}}
	c, err := colorimetry.Tristimulus(grey)
	if err != nil {
		fmt.Println(err)
		return
	}
	lab := c.Lab()
	fmt.Printf("luminous reflectance %.3f\n", c.Luminous())
	fmt.Printf("L* %.2f, a* %.2f, b* %.2f\n", lab.L, lab.A, lab.B)
	fmt.Println("sRGB", c.SRGB().Hex())

	// Data from 400 nm on give no colour.
	_, err = colorimetry.Tristimulus(spectra.Series{Pieces: []spectra.Piece{{NM: []float64{400, 900}, V: []float64{0.5, 0.5}}}})
	fmt.Println(err)
	// Output:
	// luminous reflectance 0.500
	// L* 76.07, a* 0.00, b* 0.00
	// sRGB #bcbcbc
	// colorimetry: data do not cover 380–780 nm in one piece (no extrapolation into the visible): no data at 380–400 nm
}

func ExampleXYZ_SRGB() {
	// A saturated spectral green lies outside the sRGB gamut.
	c := colorimetry.XYZ{X: 10, Y: 30, Z: 5}
	s := c.SRGB()
	fmt.Println(s.Hex(), "clipped:", s.Clipped)
	fmt.Printf("linear R, G, B before clipping: %.3f\n", s.Linear)
	// Output:
	// #00b600 clipped: true
	// linear R, G, B before clipping: [-0.162 0.468 -0.003]

}

func ExampleDeltaE2000() {
	// Pair 17 of Sharma, Wu and Dalal (2005).
	a := colorimetry.Lab{L: 50, A: 2.5, B: 0}
	b := colorimetry.Lab{L: 73, A: 25, B: -18}
	fmt.Printf("ΔE00 %.4f, ΔE*ab %.4f\n", colorimetry.DeltaE2000(a, b), colorimetry.DeltaE76(a, b))
	// Output: ΔE00 27.1492, ΔE*ab 36.8680
}

func ExampleCoverage() {
	// Data from 400 nm on miss 380–400 nm, where the eye sees almost
	// nothing: there is no colour, but most of the luminous weight is there.
	s := spectra.Series{Pieces: []spectra.Piece{{NM: []float64{400, 900}, V: []float64{0.5, 0.5}}}}
	fmt.Printf("%.5f\n", colorimetry.Coverage(s))
	// Output: 0.99998
}
