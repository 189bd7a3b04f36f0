package datasheet_test

import (
	"fmt"
	"strings"

	"skysheet/datasheet"
	"skysheet/spectra"
)

func ExampleCompute() {
	in := "wavelength_um,R\n0.28,0.95\n2.5,0.95\n2.5001,0.04\n25,0.04\n"
	s, _ := spectra.Parse(strings.NewReader(in), "flat.csv")
	c := datasheet.DefaultConditions()
	f, _ := datasheet.Compute(s, spectra.Resolve(s, c.ClosureTol), c)
	fmt.Printf("R_sol %.3f, ε %.3f\n", f.SolarReflectance, f.ThermalEmittance)
	// Output: R_sol 0.950, ε 0.960
}

// The standard black and white surfaces of ASTM E1980 score 0 and 100.
func ExampleSolarReflectanceIndex() {
	for _, s := range []struct {
		name       string
		alpha, eps float64
	}{{"black", 0.95, 0.90}, {"white", 0.20, 0.90}, {"bare metal", 0.35, 0.10}} {
		fmt.Printf("%s: SRI %.1f\n", s.name, datasheet.SolarReflectanceIndex(s.alpha, s.eps, datasheet.WindMedium))
	}
	// Output:
	// black: SRI 0.0
	// white: SRI 100.0
	// bare metal: SRI 49.4
}

// The default clear sky: dew point 10 °C seen from air at 300 K.
func ExampleClearSky() {
	c := datasheet.DefaultConditions()
	k := datasheet.ClearSky(c)
	fmt.Printf("ε_sky %.4f, F_w %.4f, window %.4f over the hemisphere, zenith transmittance %.4f, clamped %v\n",
		float64(k.Emissivity), float64(k.WindowFraction), float64(k.WindowHemisphericalEmissivity),
		float64(k.WindowZenithTransmittance), k.Clamped)
	c.DewPointC = -20
	dry := datasheet.ClearSky(c)
	fmt.Printf("dew point −20 °C: window %.0f, clamped %v\n", float64(dry.WindowHemisphericalEmissivity), dry.Clamped)
	// Output:
	// ε_sky 0.7743, F_w 0.3222, window 0.2994 over the hemisphere, zenith transmittance 0.8164, clamped false
	// dew point −20 °C: window 0, clamped true
}
