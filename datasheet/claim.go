package datasheet

import (
	"encoding/json"
	"strconv"
)

// Claim is a figure that a maker or author claims for a material, as written
// in the material's front matter under "claims:".
type Claim struct {
	// Figure is the key of any figure the tool computes, e.g.
	// "solar_reflectance", "window_emittance", "cooling_power_w_m2".
	Figure string `yaml:"figure" json:"figure"`
	// Value is the claimed value, in the figure's own unit (fractions for
	// reflectance and emittance).
	Value float64 `yaml:"value" json:"value"`
	// Values are the claimed components of a colour figure instead of
	// Value: L*, a*, b* for color_lab, x, y for color_xy.
	Values []float64 `yaml:"values,omitempty" json:"values,omitempty"`
	// Tolerance is the claimed ± tolerance; zero means none was given.
	// For a colour it is the largest colour difference (ΔE, or the
	// distance in x, y for a chromaticity).
	Tolerance float64 `yaml:"tolerance,omitempty" json:"tolerance,omitempty"`
	// DeltaE names the colour difference of an L*a*b* claim: "cie76"
	// (CIE 1976 ΔE*ab, the default) or "ciede2000".
	DeltaE string `yaml:"delta_e,omitempty" json:"delta_e,omitempty"`
	// Basis is what the claimant says the value rests on; empty fields fall
	// back to the library's defaults.
	Basis Basis `yaml:"basis,omitempty" json:"basis,omitempty"`
	// Source says where the claim was made (a product sheet, a paper).
	Source string `yaml:"source,omitempty" json:"source,omitempty"`
}

// Basis is the stated basis of a claim. Zero fields mean "not stated".
type Basis struct {
	SolarBandNM   []float64 `yaml:"solar_band_nm,omitempty" json:"solar_band_nm,omitempty"`
	SolarSpectrum string    `yaml:"solar_spectrum,omitempty" json:"solar_spectrum,omitempty"`
	ThermalBandUM []float64 `yaml:"thermal_band_um,omitempty" json:"thermal_band_um,omitempty"`
	WindowBandUM  []float64 `yaml:"window_band_um,omitempty" json:"window_band_um,omitempty"`
	TemperatureK  float64   `yaml:"temperature_k,omitempty" json:"temperature_k,omitempty"`
	AngleDeg      float64   `yaml:"angle_deg,omitempty" json:"angle_deg,omitempty"`
	// Emittance is the emittance basis claimed: "near-normal" or
	// "hemispherical"; RefractiveIndex, when stated, converts near-normal
	// data to hemispherical (the refractive_index condition).
	Emittance       string  `yaml:"emittance,omitempty" json:"emittance,omitempty"`
	RefractiveIndex float64 `yaml:"refractive_index,omitempty" json:"refractive_index,omitempty"`
}

// MarshalJSON writes the claim with non-finite numbers as null, so that a
// malformed claim can still be reported.
func (c Claim) MarshalJSON() ([]byte, error) {
	var values []Num
	for _, v := range c.Values {
		values = append(values, Num(v))
	}
	return json.Marshal(struct {
		Figure    string `json:"figure"`
		Value     Num    `json:"value"`
		Values    []Num  `json:"values,omitempty"`
		Tolerance Num    `json:"tolerance,omitempty"`
		DeltaE    string `json:"delta_e,omitempty"`
		Basis     Basis  `json:"basis,omitzero"`
		Source    string `json:"source,omitempty"`
	}{c.Figure, Num(c.Value), values, Num(c.Tolerance), c.DeltaE, c.Basis, c.Source})
}

// MarshalJSON writes the basis with non-finite numbers as null.
func (b Basis) MarshalJSON() ([]byte, error) {
	nums := func(x []float64) []Num {
		if x == nil {
			return nil
		}
		out := make([]Num, len(x))
		for i, v := range x {
			out[i] = Num(v)
		}
		return out
	}
	return json.Marshal(struct {
		SolarBandNM   []Num  `json:"solar_band_nm,omitempty"`
		SolarSpectrum string `json:"solar_spectrum,omitempty"`
		ThermalBandUM []Num  `json:"thermal_band_um,omitempty"`
		WindowBandUM  []Num  `json:"window_band_um,omitempty"`
		TemperatureK  Num    `json:"temperature_k,omitempty"`
		AngleDeg      Num    `json:"angle_deg,omitempty"`
		Emittance     string `json:"emittance,omitempty"`
		Refractive    Num    `json:"refractive_index,omitempty"`
	}{nums(b.SolarBandNM), b.SolarSpectrum, nums(b.ThermalBandUM), nums(b.WindowBandUM), Num(b.TemperatureK), Num(b.AngleDeg),
		b.Emittance, Num(b.RefractiveIndex)})
}

// Text returns the claimed value as written, with its tolerance when one
// was claimed: "0.95 ± 0.01"; a colour with its components and colour
// difference: "L* 52, a* 24, b* 18, ΔE00 ≤ 2". It carries no unit.
func (c Claim) Text() string {
	if len(c.Values) > 0 {
		k := figureSpecs[c.Figure].kind
		s := claimedValuesText(k, c.Values)
		if c.Tolerance > 0 {
			name := "distance"
			if m, err := metricOf(k, c.DeltaE); err == nil {
				name = m.name
			}
			s += ", " + name + " ≤ " + strconv.FormatFloat(c.Tolerance, 'g', -1, 64)
		}
		return s
	}
	s := strconv.FormatFloat(c.Value, 'g', -1, 64)
	if c.Tolerance > 0 {
		s += " ± " + strconv.FormatFloat(c.Tolerance, 'g', -1, 64)
	}
	return s
}
