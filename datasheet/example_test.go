package datasheet_test

import (
	"fmt"
	"strings"

	"skysheet/datasheet"
	"skysheet/datasheet/weather"
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

// A two-band sky calibrated on a given emissivity, such as a cloud-corrected
// one: a horizontal blackbody at the air temperature receives exactly that
// share of σT⁴.
func ExampleTwoBandSky() {
	k := datasheet.TwoBandSky(0.85, 290)
	fmt.Printf("hemispherical %.4f, window %.4f, zenith transmittance %.4f\n", float64(k.HemisphericalEmissivity),
		float64(k.WindowHemisphericalEmissivity), float64(k.WindowZenithTransmittance))
	// Output: hemispherical 0.8500, window 0.5216, zenith transmittance 0.6386
}

// The correlation's optional terms, off by default, as conditions.
func ExampleClearSky_terms() {
	c := datasheet.DefaultConditions()
	c.HourOfDay, c.StationPressure = datasheet.On(3), datasheet.On(850)
	k := datasheet.ClearSky(c)
	fmt.Printf("ε_sky %.4f (hour term %+.4f, pressure term %+.4f)\n", float64(k.Emissivity), float64(k.HourTerm), float64(k.PressureTerm))
	fmt.Println(c.Text("hour_of_day"), "/", c.Text("station_pressure_hpa"))
	// Output:
	// ε_sky 0.7655 (hour term +0.0092, pressure term -0.0180)
	// 3 h / 850 hPa
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

func ExampleFigures_WriteCSV() {
	// A flat reflectance of 0.9 over the solar band and 0.05 over the
	// thermal band: band-weighted means of a constant are that constant,
	// here to the last bit the integration keeps (every number is written
	// in full precision), the thermal one with the 2500–2501 nm ramp.
	s, err := spectra.Parse(strings.NewReader("wavelength_nm,R\n280,0.9\n2500,0.9\n2501,0.05\n25000,0.05\n"), "flat.csv")
	if err != nil {
		fmt.Println(err)
		return
	}
	c := datasheet.DefaultConditions()
	f, err := datasheet.Compute(s, spectra.Resolve(s, c.ClosureTol), c)
	if err != nil {
		fmt.Println(err)
		return
	}
	var b strings.Builder
	f.WriteCSV(&b)
	lines := strings.Split(b.String(), "\n")
	fmt.Println(lines[0])
	for _, l := range lines[1:] {
		if strings.HasPrefix(l, "solar_reflectance,") || strings.HasPrefix(l, "thermal_emittance,") {
			fmt.Println(l)
		}
	}
	// Output:
	// key,label,value (unit),unit,band low (band_unit),band high (band_unit),band_unit,weighting,coverage (fraction),u independent (unit),u together (unit),u worst case (unit),u known for (fraction),components (unit)
	// solar_reflectance,Solar reflectance,0.8999999999999985,fraction,280,2500,nm,ASTM G173-03 global tilt,1,,,,,
	// thermal_emittance,Thermal emittance,0.9499999801872775,fraction,2.5,25,µm,Planck blackbody at 300 K,1,,,,,
}

// A day of weather: the same flat sample held at the air temperature and
// left to float, hour by hour.
func ExampleCompute_weather() {
	var b strings.Builder
	b.WriteString("# name: Test roof (invented)\ntime,air temperature (°C),dew point (°C),global horizontal irradiance (W/m²)\n")
	for h := range 24 {
		fmt.Fprintf(&b, "2026-07-01T%02d:00:00+02:00,%d,12,0\n", h, 18+h/4)
	}
	series, _ := weather.Parse(strings.NewReader(b.String()), "roof.csv")
	s, _ := spectra.Parse(strings.NewReader("wavelength_um,R\n0.28,0.95\n2.5,0.95\n2.5001,0.04\n25,0.04\n"), "flat.csv")
	c := datasheet.DefaultConditions()
	c.Weather = datasheet.WeatherChoice{File: "roof.csv", Series: series}
	f, _ := datasheet.Compute(s, spectra.Resolve(s, c.ClosureTol), c)
	w := f.Weather
	fmt.Printf("%s: %d hours on %d day, %d of them below the air\n", w.Series, w.Hours, len(w.Days), w.HoursBelowAir)
	fmt.Println("energy > 0:", w.EnergyKWhM2 > 0)
	// Output:
	// Test roof (invented): 24 hours on 1 day, 24 of them below the air
	// energy > 0: true
}

func ExampleEmittanceBasis() {
	in := "wavelength_um,R\n0.28,0.95\n2.5,0.95\n2.5001,0.04\n25,0.04\n"
	s, _ := spectra.Parse(strings.NewReader(in), "flat.csv")
	c := datasheet.DefaultConditions()
	c.RefractiveIndex = datasheet.On(1.5)
	f, _ := datasheet.Compute(s, spectra.Resolve(s, c.ClosureTol), c)
	fmt.Println(f.EmittanceBasis.Words())
	fmt.Printf("ε %.3f, in the SRI %.3f\n", f.ThermalEmittance, f.SRI.ThermalEmittance)
	// Output:
	// near-normal (default for FTIR data); cooling figures and SRI converted to hemispherical as a smooth dielectric of n 1.5 (× 0.946)
	// ε 0.960, in the SRI 0.908
}

// A grey and a darker grey: the colour figures and their difference.
func ExampleColorDifference() {
	c := datasheet.DefaultConditions()
	grey := func(rho string) *datasheet.Figures {
		s, _ := spectra.Parse(strings.NewReader("wavelength_nm,R\n280,"+rho+"\n2500,"+rho+"\n"), "grey.csv")
		f, _ := datasheet.Compute(s, spectra.Resolve(s, c.ClosureTol), c)
		return f
	}
	a, b := grey("0.5"), grey("0.4")
	lab, _ := a.Figure("color_lab")
	fmt.Println(lab.Text(), a.Color.Reflectance.SRGB)
	de76, de00, _ := datasheet.ColorDifference(a, b)
	fmt.Printf("ΔE*ab %.2f, ΔE00 %.2f\n", de76, de00)
	// Output:
	// L* 76.07, a* 0.00, b* 0.00 #bcbcbc
	// ΔE*ab 6.60, ΔE00 4.94
}

// Clear glass transmits: its SRI and cooling figures carry notes.
func ExampleFigures_NotesFor() {
	in := "wavelength_nm,R,T\n280,0.08,0.83\n2500,0.08,0.83\n\n2600,0.05,0\n25000,0.05,0\n"
	s, _ := spectra.Parse(strings.NewReader(in), "glass.csv")
	c := datasheet.DefaultConditions()
	f, _ := datasheet.Compute(s, spectra.Resolve(s, c.ClosureTol), c)
	for _, n := range f.NotesFor("sri_low") {
		fmt.Println(n.Code+":", n.Text)
	}
	// Output: sri-not-opaque: The SRI (ASTM E1980) is defined for opaque surfaces; this sample transmits 83.0 % of sunlight and 0.0 % of thermal radiation.
}

// A figure covered less than 90 % by data has no value, and says why.
func ExampleFigure_ShortReason() {
	in := "wavelength_nm,R\n280,0.9\n2500,0.9\n\n2500.1,0.1\n19000,0.1\n" // infrared data stop at 19 µm
	s, _ := spectra.Parse(strings.NewReader(in), "short.csv")
	c := datasheet.DefaultConditions()
	f, _ := datasheet.Compute(s, spectra.Resolve(s, c.ClosureTol), c)
	x, _ := f.Figure("thermal_emittance")
	fmt.Println(x.Value, x.ShortReason())
	// Output: NaN coverage < 90 %
}
