package datasheet

import (
	"fmt"
	"math"

	"skysheet/spectra"
)

// The convection coefficients of ASTM E1980 for low, medium and high wind,
// W m⁻² K⁻¹.
const (
	WindLow    = 5.0
	WindMedium = 12.0
	WindHigh   = 30.0
)

// The fixed conditions of ASTM E1980 and its two reference surfaces.
const (
	sriIrradiance = 1000.0 // W/m²
	sriAirK       = 310.0
	sriSkyK       = 300.0
	blackAlpha    = 0.95
	blackEps      = 0.90
	whiteAlpha    = 0.20
	whiteEps      = 0.90
)

// SRI is the Solar Reflectance Index of a surface after ASTM E1980 at the
// three standard winds, with the inputs and its applicability.
type SRI struct {
	Low    Num `json:"low"`
	Medium Num `json:"medium"`
	High   Num `json:"high"`
	// The inputs: solar absorptance and thermal emittance of the sample.
	SolarAbsorptance Num `json:"solar_absorptance"`
	ThermalEmittance Num `json:"thermal_emittance"`
	// Translucent is true when the solar transmittance exceeds 0.01, outside
	// the index's definition.
	Translucent bool   `json:"translucent"`
	Note        string `json:"note"`
}

// steadyTemperature returns the surface temperature T_s (K) that balances
// ASTM E1980's steady state α I = ε σ (T_s⁴ − T_sky⁴) + h_c (T_s − T_a) with
// I = 1000 W/m², T_a = 310 K, T_sky = 300 K, for solar absorptance alpha,
// thermal emittance eps and convection coefficient hc. It returns NaN when
// no temperature balances it (hc = 0 and eps = 0).
func steadyTemperature(alpha, eps, hc float64) float64 {
	sigma := spectra.StefanBoltzmann
	f := func(t float64) float64 {
		return eps*sigma*(t*t*t*t-sriSkyK*sriSkyK*sriSkyK*sriSkyK) + hc*(t-sriAirK) - alpha*sriIrradiance
	}
	t, err := increasingRoot(f, sriAirK, 1, 5000)
	if err != nil {
		return math.NaN()
	}
	return t
}

// SolarReflectanceIndex returns SRI = 100 (T_b − T_s)/(T_b − T_w) after
// ASTM E1980, where T_s, T_b and T_w are the exact steady temperatures
// (steadyTemperature) of the sample, the standard black (α 0.95, ε 0.90)
// and the standard white (α 0.20, ε 0.90) at convection coefficient hc.
// The black scores 0 and the white 100.
func SolarReflectanceIndex(alpha, eps, hc float64) float64 {
	tb := steadyTemperature(blackAlpha, blackEps, hc)
	tw := steadyTemperature(whiteAlpha, whiteEps, hc)
	ts := steadyTemperature(alpha, eps, hc)
	return 100 * (tb - ts) / (tb - tw)
}

// sriNote is the applicability of the index, in words.
const sriNote = "SRI (ASTM E1980) is defined for opaque, horizontal or low-sloped surfaces; it ranks roofing surfaces under fixed conditions (sun 1000 W/m², air 310 K, sky 300 K) and is not a cooling power."

// addSRI computes the SRI from the solar absorptance and thermal emittance
// in f and their gradients.
func addSRI(f *Figures, grads map[string]gradient, ratio float64) {
	alpha, eps := float64(f.SolarAbsorptance), ratio*float64(f.ThermalEmittance)
	f.SRI = SRI{SolarAbsorptance: f.SolarAbsorptance, ThermalEmittance: Num(eps), Note: sriNote}
	if ratio != 1 {
		f.SRI.Note += fmt.Sprintf(" Its thermal emittance is the near-normal %.3f converted to hemispherical (× %.3f, a smooth dielectric of n %s).",
			float64(f.ThermalEmittance), ratio, fmtG(float64(f.EmittanceBasis.RefractiveIndex)))
	}
	if t := float64(f.SolarTransmittance); t > 0.01 {
		f.SRI.Translucent = true
		f.SRI.Note += fmt.Sprintf(" This sample transmits %.1f %% of sunlight (more than 1 %%): it is not opaque and its SRI is outside the index's definition.", 100*t)
	}
	c := f.Conditions
	for _, w := range []struct {
		key, label string
		hc         float64
		dst        *Num
	}{
		{"sri_low", "SRI, low wind", WindLow, &f.SRI.Low},
		{"sri_medium", "SRI, medium wind", WindMedium, &f.SRI.Medium},
		{"sri_high", "SRI, high wind", WindHigh, &f.SRI.High},
	} {
		v := math.NaN()
		if !math.IsNaN(alpha) && !math.IsNaN(eps) {
			v = SolarReflectanceIndex(alpha, eps, w.hc)
		}
		*w.dst = Num(v)
		f.Figures = append(f.Figures, Figure{Key: w.key, Label: w.label, Value: Num(v), Band: c.SolarBand, BandUnit: "nm",
			Weighting: fmt.Sprintf("ASTM E1980, h_c %g W m⁻² K⁻¹; solar absorptance over %s, %s over %s at %s K",
				w.hc, bandText(c.SolarBand, "nm"), f.EmittanceBasis.short(), bandText(c.ThermalBand, "µm"), fmtG(c.TemperatureK)),
			Coverage: Num(math.Min(float64(f.SolarCoverage), float64(f.ThermalCoverage)))})
		if grads == nil || math.IsNaN(v) {
			continue
		}
		// Chain rule through the two inputs, with ∂SRI/∂α and ∂SRI/∂ε by
		// central differences.
		const d = 1e-5
		sa := (SolarReflectanceIndex(alpha+d, eps, w.hc) - SolarReflectanceIndex(alpha-d, eps, w.hc)) / (2 * d)
		se := (SolarReflectanceIndex(alpha, eps+d, w.hc) - SolarReflectanceIndex(alpha, eps-d, w.hc)) / (2 * d)
		grads[w.key] = grads["solar_absorptance"].scale(sa).plus(se*ratio, grads["thermal_emittance"])
	}
}
