package datasheet

import (
	"testing"

	"skysheet/spectra"
)

// BenchmarkErythemalTransmittance weighs a 1 nm UV transmittance scan.
func BenchmarkErythemalTransmittance(b *testing.B) {
	var nm, v []float64
	for x := 250.0; x <= 450; x++ {
		nm, v = append(nm, x), append(v, 0.02+0.001*(x-250))
	}
	t := spectra.Series{Pieces: []spectra.Piece{{NM: nm, V: v}}}
	for b.Loop() {
		ErythemalTransmittance(t)
	}
}
