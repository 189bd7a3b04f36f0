package main

import (
	"bytes"
	"flag"
	"fmt"
	"strconv"
	"strings"

	"skysheet/datasheet"
	"skysheet/datasheet/weather"
	"skysheet/spectra"
)

// bandFlag is a flag holding a band "LO,HI" (also "LO-HI" or "LO:HI") in
// unit ("nm" or "µm"), stored in nm.
type bandFlag struct {
	b    *spectra.Interval
	unit string
}

func (f bandFlag) String() string {
	if f.b == nil {
		return ""
	}
	lo, hi := f.b.Lo, f.b.Hi
	if f.unit == "µm" {
		lo, hi = f.b.UM()
	}
	return strconv.FormatFloat(lo, 'g', -1, 64) + "," + strconv.FormatFloat(hi, 'g', -1, 64)
}

func (f bandFlag) Set(s string) error {
	parts := strings.FieldsFunc(s, func(r rune) bool { return r == ',' || r == ':' || r == '–' })
	if len(parts) != 2 {
		if i := strings.LastIndex(s, "-"); i > 0 {
			parts = []string{s[:i], s[i+1:]}
		}
	}
	if len(parts) != 2 {
		return fmt.Errorf("%q: want LO,HI", s)
	}
	var b [2]float64
	for i, p := range parts {
		x, err := strconv.ParseFloat(strings.TrimSpace(p), 64)
		if err != nil {
			return fmt.Errorf("%q: want LO,HI as numbers", s)
		}
		b[i] = x
	}
	if !(b[0] < b[1]) {
		return fmt.Errorf("%q: want LO < HI", s)
	}
	*f.b = spectra.Interval{Lo: b[0], Hi: b[1]}
	if f.unit == "µm" {
		*f.b = spectra.IntervalUM(b[0], b[1])
	}
	return nil
}

// optionalFlag is a flag holding an optional condition: a number, or
// "off".
type optionalFlag struct{ o *datasheet.Optional }

func (f optionalFlag) String() string {
	if f.o == nil {
		return ""
	}
	return f.o.String()
}

func (f optionalFlag) Set(s string) error {
	if s = strings.TrimSpace(s); s == "off" {
		*f.o = datasheet.Optional{}
		return nil
	}
	x, err := strconv.ParseFloat(s, 64)
	if err != nil {
		return fmt.Errorf("%q: want a number or off", s)
	}
	*f.o = datasheet.On(x)
	return nil
}

// conditionFlags adds the flags for every condition, with c's values as
// defaults.
func conditionFlags(fs *flag.FlagSet, c *datasheet.Conditions) {
	fs.Var(bandFlag{&c.SolarBand, "nm"}, "solar-band", "solar band in nm, LO,HI (280,4000 for the whole G173 range)")
	fs.TextVar(&c.SolarSpectrum, "solar-spectrum", c.SolarSpectrum, "ASTM G173-03 `SPECTRUM`: global (global tilt) or direct (direct + circumsolar)")
	fs.Var(bandFlag{&c.ThermalBand, "µm"}, "thermal-band", "thermal band in µm, LO,HI")
	fs.Var(bandFlag{&c.WindowBand, "µm"}, "window-band", "atmospheric-window band in µm, LO,HI")
	fs.Float64Var(&c.TemperatureK, "temperature", c.TemperatureK, "blackbody temperature for thermal weighting, K")
	fs.Float64Var(&c.ClosureTol, "closure-tol", c.ClosureTol, "tolerance on |R+T+A-1|, R+T>1 and negative values")
	fs.Float64Var(&c.AmbientK, "ambient", c.AmbientK, "air temperature for cooling, K")
	fs.Float64Var(&c.DewPointC, "dew-point", c.DewPointC, "dew point of the clear sky, °C")
	fs.Float64Var(&c.IrradianceWm2, "irradiance", c.IrradianceWm2, "solar irradiance for cooling with sun, W/m²")
	fs.Float64Var(&c.HWm2K, "h-conv", c.HWm2K, "non-radiative (convective and conductive) heat-transfer coefficient, W m⁻² K⁻¹")
	fs.Var(bandFlag{&c.ExchangeBand, "µm"}, "exchange-band", "thermal exchange band of the cooling integrals in µm, LO,HI")
	fs.Var(optionalFlag{&c.HourOfDay}, "hour-of-day", "add the hour-of-day term of the clear-sky correlation at this `HOUR` (0–24 from local midnight), or off")
	fs.Var(optionalFlag{&c.StationPressure}, "station-pressure", "add the station-pressure term of the clear-sky correlation at this pressure in `HPA`, or off")
	fs.Var(optionalFlag{&c.RefractiveIndex}, "refractive-index", "convert near-normal emittance data to hemispherical for the cooling figures and the SRI, as a smooth dielectric of index `N` (Fresnel), or off")
	fs.TextVar(&c.Weather, "weather", c.Weather, "hourly weather series `FILE` (docs/format.md) to run the hourly cooling model over")
	fs.TextVar(&c.Sky, "sky", c.Sky, "sky of the cooling figures: a spectral sky `FILE` with a T column (zenith atmospheric transmittance), or clear two-band")
}

// loadSky reads the spectral sky file named by c.Sky, if any, into
// c.Sky.Spectrum. Verbs that use conditionFlags call it after parsing;
// c.Validate then checks the file's data. Files above limit bytes are
// refused (0: the default limit).
func loadSky(c *datasheet.Conditions, limit int64) error {
	if c.Sky.Clear() {
		c.Sky.Spectrum = nil
		return nil
	}
	data, err := readInputFile(c.Sky.File, limit)
	if err != nil {
		return fmt.Errorf("sky: %w", err)
	}
	s, err := spectra.Decode(data, c.Sky.File)
	if err != nil {
		return err
	}
	c.Sky.Spectrum = s
	return nil
}

// loadWeather reads the weather series named by c.Weather, if any, into
// c.Weather.Series, as loadSky does for the sky.
func loadWeather(c *datasheet.Conditions, limit int64) error {
	if c.Weather.File == "" {
		c.Weather.Series = nil
		return nil
	}
	data, err := readInputFile(c.Weather.File, limit)
	if err != nil {
		return fmt.Errorf("weather: %w", err)
	}
	s, err := weather.Parse(bytes.NewReader(data), c.Weather.File)
	if err != nil {
		return err
	}
	c.Weather.Series = s
	return nil
}
