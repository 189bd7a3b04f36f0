package datasheet_test

import (
	"fmt"
	"strings"

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

// A clear film 5 mm thick (k = 0.03 W m⁻¹ K⁻¹) over a grey panel: the
// optics are the panel's, the non-radiative exchange is halved.
func ExampleComputeStack() {
	film, _ := spectra.Parse(strings.NewReader("wavelength_nm,R,T\n250,0,1\n30000,0,1\n"), "film.csv")
	panel, _ := spectra.Parse(strings.NewReader("wavelength_nm,R\n250,0.8\n2500,0.8\n2600,0.1\n30000,0.1\n"), "panel.csv")
	st, err := datasheet.ComputeStack([]datasheet.Layer{
		{Name: "film", Sample: film, Conductor: &datasheet.Conductor{ThicknessM: 0.005, ConductivityWmK: 0.03}},
		{Name: "panel", Sample: panel},
	}, datasheet.DefaultConditions())
	if err != nil {
		fmt.Println(err)
		return
	}
	f := st.Figures
	fmt.Printf("R_sol %.3f, h_eff %.2f W m⁻² K⁻¹, absorbed in the film %.3f\n",
		float64(f.SolarReflectance), float64(f.Stack.HEffWm2K), float64(f.Stack.Layers[0].SolarAbsorbed))
	// Output: R_sol 0.800, h_eff 3.00 W m⁻² K⁻¹, absorbed in the film 0.000
}
