package colorimetry

import (
	"math"
	"testing"
)

// BenchmarkTristimulus2000 computes the colour of a 2,000-point series
// (250–2500 nm, irregular enough to be realistic: a smooth reflectance on
// a 1.125 nm grid).
func BenchmarkTristimulus2000(b *testing.B) {
	s := sampled(250, 2500, 1.125, func(nm float64) float64 { return 0.3 + 0.2*math.Sin(nm/50) })
	if n := len(s.Pieces[0].NM); n != 2001 {
		b.Fatalf("%d points", n)
	}
	tables() // load the embedded tables outside the timing
	for b.Loop() {
		if _, err := Tristimulus(s); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkColour converts tristimulus values to everything a datasheet
// shows: chromaticity, L*a*b*, sRGB with its hex form.
func BenchmarkColour(b *testing.B) {
	c := XYZ{20, 18, 9}
	c.SRGB()
	for b.Loop() {
		c.Chromaticity()
		c.Lab()
		_ = c.SRGB().Hex()
	}
}

func BenchmarkDeltaE2000(b *testing.B) {
	p, q := Lab{50, 2.5, 0}, Lab{73, 25, -18}
	for b.Loop() {
		DeltaE2000(p, q)
	}
}
