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

// BenchmarkFabricOnSkin derives a fabric's grey figures from a 1 nm solar
// scan and a 4 cm⁻¹-like infrared scan over a 1 nm skin spectrum, then
// solves day and night.
func BenchmarkFabricOnSkin(b *testing.B) {
	var nm, r, t, snm, sr []float64
	for x := 250.0; x <= 2500; x++ {
		nm, r, t = append(nm, x), append(r, 0.3+0.1*float64(int(x)%7)/7), append(t, 0.4)
		snm, sr = append(snm, x), append(sr, 0.1+0.4*float64(int(x)%11)/11)
	}
	for x := 2500.0 + 10; x <= 25000; x *= 1.002 {
		nm, r, t = append(nm, x), append(r, 0.05), append(t, 0.1)
	}
	for x := 2501.0; x <= 4000; x++ {
		snm, sr = append(snm, x), append(sr, 0.03)
	}
	one := func(nm, v []float64) spectra.Series { return spectra.Series{Pieces: []spectra.Piece{{NM: nm, V: v}}} }
	zeros := make([]float64, len(snm))
	fabric := spectra.Optics{R: one(nm, r), T: one(nm, t)}
	skin := spectra.Optics{R: one(snm, sr), T: one(snm, zeros)}
	s := DefaultSkinSetting()
	for b.Loop() {
		f, err := FabricOnSkin(fabric, skin, s)
		if err != nil {
			b.Fatal(err)
		}
		night := s
		night.IrradianceWm2 = 0
		if _, err := SkinHeat(f, s); err != nil {
			b.Fatal(err)
		}
		if _, err := SkinHeat(f, night); err != nil {
			b.Fatal(err)
		}
	}
}
