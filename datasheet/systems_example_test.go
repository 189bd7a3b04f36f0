package datasheet_test

import (
	"fmt"

	"skysheet/datasheet"
	"skysheet/spectra"
)

// A 5 mm foam cover (k = 0.03 W m⁻¹ K⁻¹) under h = 6 W m⁻² K⁻¹ halves the
// non-radiative exchange.
func ExampleSeriesH() {
	h, err := datasheet.SeriesH(6, datasheet.Conductor{ThicknessM: 0.005, ConductivityWmK: 0.03})
	fmt.Printf("h_eff %.2f W m⁻² K⁻¹, %v\n", h, err)
	// Output: h_eff 3.00 W m⁻² K⁻¹, <nil>
}

// A fabric that passes 4 % of the UV everywhere.
func ExampleErythemalTransmittance() {
	t := spectra.Series{Pieces: []spectra.Piece{{NM: []float64{250, 450}, V: []float64{0.04, 0.04}}}}
	u := datasheet.ErythemalTransmittance(t)
	fmt.Printf("T_ery %.3f, factor %.0f, coverage %.0f %%\n", float64(u.Transmittance), float64(u.Factor), 100*float64(u.Coverage))
	// Output: T_ery 0.040, factor 25, coverage 100 %
}

// A light fabric, 5 mm off the skin, by day and by night under the default
// setting.
func ExampleSkinHeat() {
	f := datasheet.Fabric{SolarFabric: 0.25, SolarSkin: 0.15, Emittance: 0.85, Transmittance: 0.05, Reflectance: 0.10}
	s := datasheet.DefaultSkinSetting()
	day, _ := datasheet.SkinHeat(f, s)
	s.IrradianceWm2 = 0
	night, _ := datasheet.SkinHeat(f, s)
	fmt.Printf("day: fabric %.1f K, into skin %.1f W/m²\n", day.FabricK, day.SkinGainWm2)
	fmt.Printf("night: fabric %.1f K, into skin %.1f W/m²\n", night.FabricK, night.SkinGainWm2)
	// Output:
	// day: fabric 310.7 K, into skin 181.2 W/m²
	// night: fabric 299.4 K, into skin -88.7 W/m²
}
