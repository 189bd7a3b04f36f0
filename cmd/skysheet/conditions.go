package main

import (
	"flag"
	"fmt"
	"strconv"
	"strings"

	"skysheet/datasheet"
	"skysheet/spectra"
)

// bandFlag is a flag holding a band "LO,HI" (also "LO-HI" or "LO:HI").
type bandFlag struct{ b *[2]float64 }

func (f bandFlag) String() string {
	if f.b == nil {
		return ""
	}
	return strconv.FormatFloat(f.b[0], 'g', -1, 64) + "," + strconv.FormatFloat(f.b[1], 'g', -1, 64)
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
	*f.b = b
	return nil
}

// conditionFlags adds the flags for every condition, with c's values as
// defaults.
func conditionFlags(fs *flag.FlagSet, c *datasheet.Conditions) {
	fs.Var(bandFlag{&c.SolarBandNM}, "solar-band", "solar band in nm, LO,HI (280,4000 for the whole G173 range)")
	fs.StringVar(&c.SolarSpectrum, "solar-spectrum", c.SolarSpectrum, "ASTM G173-03 spectrum: global (global tilt) or direct (direct + circumsolar)")
	fs.Var(bandFlag{&c.ThermalBandUM}, "thermal-band", "thermal band in µm, LO,HI")
	fs.Var(bandFlag{&c.WindowBandUM}, "window-band", "atmospheric-window band in µm, LO,HI")
	fs.Float64Var(&c.TemperatureK, "temperature", c.TemperatureK, "blackbody temperature for thermal weighting, K")
	fs.Float64Var(&c.ClosureTol, "closure-tol", c.ClosureTol, "tolerance on |R+T+A-1|, R+T>1 and negative values")
	fs.Float64Var(&c.AmbientK, "ambient", c.AmbientK, "air temperature for cooling, K")
	fs.Float64Var(&c.DewPointC, "dew-point", c.DewPointC, "dew point of the clear sky, °C")
	fs.Float64Var(&c.IrradianceWm2, "irradiance", c.IrradianceWm2, "solar irradiance for cooling with sun, W/m²")
	fs.Float64Var(&c.HWm2K, "h-conv", c.HWm2K, "non-radiative (convective and conductive) heat-transfer coefficient, W m⁻² K⁻¹")
	fs.Var(bandFlag{&c.ExchangeBandUM}, "exchange-band", "thermal exchange band of the cooling integrals in µm, LO,HI")
	fs.StringVar(&c.Sky, "sky", c.Sky, "spectral sky file with a T column (zenith atmospheric transmittance); default: the clear two-band sky")
}

// loadSky reads the spectral sky file named by c.Sky, if any, into
// c.SkySpectrum. Verbs that use conditionFlags call it after parsing.
func loadSky(c *datasheet.Conditions, limit int64) error {
	if c.Sky == "" || c.Sky == datasheet.SkyClear {
		c.SkySpectrum = nil
		return nil
	}
	if limit <= 0 {
		limit = defaultMaxFileSize
	}
	data, err := readInputFile(c.Sky, limit)
	if err != nil {
		return fmt.Errorf("sky: %w", err)
	}
	s, err := spectra.Decode(data, c.Sky)
	if err != nil {
		return err
	}
	if _, err := datasheet.SpectralSky(s, c.Sky, c.AmbientK); err != nil {
		return err
	}
	c.SkySpectrum = s
	return nil
}
