package datasheet

import (
	"encoding/json"
	"fmt"
	"math"
	"strconv"

	"skysheet/spectra"
)

// SchemaVersion is the version of the figures JSON schema. Keys are only
// ever added within a version.
const SchemaVersion = 1

// Conditions are the bands, weightings and temperatures behind the figures.
// Every field is echoed in the output. The zero value is not useful; start
// from [DefaultConditions].
type Conditions struct {
	SolarBandNM   [2]float64 `json:"solar_band_nm" yaml:"solar_band_nm"`
	SolarSpectrum string     `json:"solar_spectrum" yaml:"solar_spectrum"` // "global" or "direct"
	ThermalBandUM [2]float64 `json:"thermal_band_um" yaml:"thermal_band_um"`
	WindowBandUM  [2]float64 `json:"window_band_um" yaml:"window_band_um"`
	TemperatureK  float64    `json:"temperature_k" yaml:"temperature_k"`
	ClosureTol    float64    `json:"closure_tolerance" yaml:"closure_tolerance"`

	// The cooling conditions: air temperature, dew point (drives the clear
	// sky), solar irradiance, non-radiative heat-transfer coefficient and the
	// thermal exchange band of the cooling integrals.
	AmbientK       float64    `json:"ambient_k" yaml:"ambient_k"`
	DewPointC      float64    `json:"dew_point_c" yaml:"dew_point_c"`
	IrradianceWm2  float64    `json:"irradiance_w_m2" yaml:"irradiance_w_m2"`
	HWm2K          float64    `json:"h_w_m2k" yaml:"h_w_m2k"`
	ExchangeBandUM [2]float64 `json:"exchange_band_um" yaml:"exchange_band_um"`
	// Sky is "" or [SkyClear] for the clear two-band sky, else the name of a
	// spectral sky file whose content is SkySpectrum (a T column: zenith
	// atmospheric transmittance).
	Sky         string            `json:"sky" yaml:"sky"`
	SkySpectrum *spectra.Spectrum `json:"-" yaml:"-"`
}

// DefaultConditions returns the defaults: solar 280–2500 nm under the ASTM
// G173-03 global tilt spectrum; thermal 2.5–25 µm and window 8–13 µm under a
// 300 K blackbody; closure tolerance 0.02; for cooling, air at 300 K, dew
// point 10 °C, 1000 W/m² of sun, h = 6 W m⁻² K⁻¹, exchange band 2.5–100 µm
// and the clear two-band sky.
func DefaultConditions() Conditions {
	return Conditions{
		SolarBandNM:    [2]float64{280, 2500},
		SolarSpectrum:  "global",
		ThermalBandUM:  [2]float64{2.5, 25},
		WindowBandUM:   [2]float64{8, 13},
		TemperatureK:   300,
		ClosureTol:     spectra.DefaultClosureTol,
		AmbientK:       300,
		DewPointC:      10,
		IrradianceWm2:  1000,
		HWm2K:          6,
		ExchangeBandUM: [2]float64{2.5, 100},
		Sky:            SkyClear,
	}
}

// Validate reports the first condition that makes no sense.
func (c Conditions) Validate() error {
	band := func(name string, b [2]float64, unit string) error {
		if !(b[0] > 0 && b[1] > b[0]) || math.IsInf(b[1], 0) {
			return fmt.Errorf("%s %g–%g %s: want 0 < low < high", name, b[0], b[1], unit)
		}
		if unit == "µm" && b[1] > MaxBandUM {
			return fmt.Errorf("%s %g–%g µm: the upper end may not pass %g µm", name, b[0], b[1], float64(MaxBandUM))
		}
		return nil
	}
	if err := band("solar band", c.SolarBandNM, "nm"); err != nil {
		return err
	}
	if r := spectra.SolarRangeNM; c.SolarBandNM[0] < r.Lo || c.SolarBandNM[1] > r.Hi {
		return fmt.Errorf("solar band %g–%g nm: the ASTM G173-03 tables cover only %g–%g nm", c.SolarBandNM[0], c.SolarBandNM[1], r.Lo, r.Hi)
	}
	if _, err := spectra.Solar(c.SolarSpectrum); err != nil {
		return err
	}
	if err := band("thermal band", c.ThermalBandUM, "µm"); err != nil {
		return err
	}
	if err := band("window band", c.WindowBandUM, "µm"); err != nil {
		return err
	}
	if !(c.TemperatureK > 0) || math.IsInf(c.TemperatureK, 0) {
		return fmt.Errorf("temperature %g K: want a positive temperature in kelvin", c.TemperatureK)
	}
	if !(c.ClosureTol >= 0) || c.ClosureTol > 1 {
		return fmt.Errorf("closure tolerance %g: want 0..1", c.ClosureTol)
	}
	return c.validateCooling()
}

// MaxBandUM is the longest wavelength, in µm, that a thermal, window or
// exchange band may reach: far beyond any thermal figure, and a bound on the
// work a Planck-weighted integral may take.
const MaxBandUM = 1000

// Num is a figure's value; NaN means "not computable" and is written as
// JSON null.
type Num float64

// MarshalJSON writes NaN and infinities as null.
func (n Num) MarshalJSON() ([]byte, error) {
	f := float64(n)
	if math.IsNaN(f) || math.IsInf(f, 0) {
		return []byte("null"), nil
	}
	return strconv.AppendFloat(nil, f, 'g', -1, 64), nil
}

// UnmarshalJSON reads null as NaN.
func (n *Num) UnmarshalJSON(b []byte) error {
	if string(b) == "null" {
		*n = Num(math.NaN())
		return nil
	}
	var f float64
	if err := json.Unmarshal(b, &f); err != nil {
		return err
	}
	*n = Num(f)
	return nil
}

// Figure describes one computed figure: what it is, its value and the basis
// behind it.
type Figure struct {
	Key       string     `json:"key"`   // JSON key of the value, e.g. "solar_reflectance"
	Label     string     `json:"label"` // in words, e.g. "Solar reflectance"
	Value     Num        `json:"value"`
	Unit      string     `json:"unit"` // "" for a fraction
	Band      [2]float64 `json:"band,omitempty"`
	BandUnit  string     `json:"band_unit,omitempty"` // "nm" or "µm"
	Weighting string     `json:"weighting,omitempty"`
	Coverage  Num        `json:"coverage"` // fraction of the weighting covered by data
	// Uncertainty is the figure's standard uncertainty when the data give
	// uncertainties of R or T.
	Uncertainty *Uncertainty `json:"uncertainty,omitempty"`
}

// ClosureReport is the JSON form of the closure check.
type ClosureReport struct {
	OK         bool     `json:"ok"`
	Tolerance  float64  `json:"tolerance"`
	Checked    bool     `json:"checked"` // R, T and A all measured somewhere
	Residual   float64  `json:"max_residual"`
	ResidualNM float64  `json:"max_residual_nm"`
	Excess     float64  `json:"max_excess"` // largest R+T−1
	ExcessNM   float64  `json:"max_excess_nm"`
	Min        float64  `json:"min_value"`
	MinNM      float64  `json:"min_value_nm"`
	MinOf      string   `json:"min_value_of"`
	Problems   []string `json:"problems"`
}

// Figures is everything computed for one sample. Its JSON form is the schema
// printed by "skysheet figures --json" and written as figures.json.
type Figures struct {
	Schema             int           `json:"schema"`
	SolarReflectance   Num           `json:"solar_reflectance"`
	SolarTransmittance Num           `json:"solar_transmittance"`
	SolarAbsorptance   Num           `json:"solar_absorptance"`
	SolarCoverage      Num           `json:"solar_coverage"`
	UVReflectance      Num           `json:"uv_reflectance"`
	VisibleReflectance Num           `json:"visible_reflectance"`
	NIRReflectance     Num           `json:"nir_reflectance"`
	ThermalEmittance   Num           `json:"thermal_emittance"`
	ThermalCoverage    Num           `json:"thermal_coverage"`
	WindowEmittance    Num           `json:"window_emittance"`
	WindowCoverage     Num           `json:"window_coverage"`
	Closure            ClosureReport `json:"closure"`
	Assumptions        []string      `json:"assumptions"`
	Conditions         Conditions    `json:"conditions"`
	Figures            []Figure      `json:"figures"`
	// Splices lists every junction where two instruments' data were
	// spliced, with the mismatch found there; empty when none.
	Splices []spectra.SpliceRecord `json:"splices"`

	// Cooling under the stated sky (see docs/cooling.md). The cooling powers
	// are P_net at T_s = T_amb in W/m², with and without sun; the equilibrium
	// figures are T_amb − T_eq in K, positive below ambient.
	CoolingPowerWm2        Num           `json:"cooling_power_w_m2"`
	CoolingPowerNightWm2   Num           `json:"cooling_power_night_w_m2"`
	EquilibriumDeltaK      Num           `json:"equilibrium_delta_k"`
	EquilibriumDeltaNightK Num           `json:"equilibrium_delta_night_k"`
	CoolingTerms           CoolingTerms  `json:"cooling_terms"`
	HeldPowerWm2           Num           `json:"held_power_w_m2"` // blackbody power at T_amb where emittance is held constant
	Sky                    Sky           `json:"sky"`
	CoolingCurve           []CurvePoint  `json:"cooling_curve"`
	Sensitivity            []Sensitivity `json:"sensitivity"`
	SRI                    SRI           `json:"sri"`
	Cautions               []string      `json:"cautions"`
	Provenance             Provenance    `json:"provenance"`
}

// Cautions go with every set of figures.
var Cautions = []string{
	"Computed figures are not a certification.",
	"Real performance depends on site, weather, soiling and ageing; the sky, air and wind here are stated conditions, not a forecast.",
	"Building, roofing and energy decisions defer to local codes and licensed professionals.",
}

// Figure returns the figure with the given key.
func (f *Figures) Figure(key string) (Figure, bool) {
	for _, x := range f.Figures {
		if x.Key == key {
			return x, true
		}
	}
	return Figure{}, false
}

// Compute returns the figures of s under conditions c: the band figures,
// the cooling figures under the stated sky, the SRI and, when s gives
// standard uncertainties of R or T, the uncertainty of every figure.
func Compute(s *spectra.Spectrum, c Conditions) (*Figures, error) {
	if err := c.Validate(); err != nil {
		return nil, err
	}
	sky, err := skyFor(c)
	if err != nil {
		return nil, err
	}
	sun, _ := spectra.Solar(c.SolarSpectrum)
	o := spectra.Resolve(s, c.ClosureTol)
	m := &cooling{c: c, sky: sky, sun: sun, g: newCoolGrid(o.A, sky, c.ExchangeBandUM, c.AmbientK)}
	f, grads := computeOptics(o, c)
	f.Splices = append([]spectra.SpliceRecord{}, s.Splices...)
	m.addCooling(f, o, grads, true)
	addSRI(f, grads)
	eval := func(o spectra.Optics, lin func(string) float64) map[string]float64 {
		alpha := float64(f.SolarAbsorptance) + lin("solar_absorptance")
		eps := float64(f.ThermalEmittance) + lin("thermal_emittance")
		r := m.evaluate(o.A, alpha)
		out := map[string]float64{"equilibrium_delta_k": c.AmbientK - r.eqDay, "equilibrium_delta_night_k": c.AmbientK - r.eqNight}
		for key, hc := range map[string]float64{"sri_low": WindLow, "sri_medium": WindMedium, "sri_high": WindHigh} {
			out[key] = SolarReflectanceIndex(alpha, eps, hc)
		}
		return out
	}
	addUncertainty(f, s, o, grads, c.ClosureTol, eval)
	f.Cautions = append([]string(nil), Cautions...)
	f.Provenance = provenanceOf(s, f)
	return f, nil
}

// computeOptics returns the band figures of o and the gradient of each with
// respect to the values of o's series.
func computeOptics(o spectra.Optics, c Conditions) (*Figures, map[string]gradient) {
	f := &Figures{Schema: SchemaVersion, Conditions: c, Assumptions: append([]string(nil), o.Assumptions...)}
	grads := map[string]gradient{}
	sun, _ := spectra.Solar(c.SolarSpectrum)
	lo, hi := c.SolarBandNM[0], c.SolarBandNM[1]
	add := func(key, label string, q spectra.Quantity, x spectra.Series, w spectra.Weighting, a, b, scale float64, unit string) spectra.Mean {
		m := spectra.BandMean(x, w, a*scale, b*scale)
		f.Figures = append(f.Figures, Figure{Key: key, Label: label, Value: Num(m.Value),
			Band: [2]float64{a, b}, BandUnit: unit, Weighting: w.String(), Coverage: Num(m.Coverage)})
		var g gradient
		g[q] = m.Coef
		grads[key] = g
		return m
	}
	rs := add("solar_reflectance", "Solar reflectance", spectra.R, o.R, sun, lo, hi, 1, "nm")
	ts := add("solar_transmittance", "Solar transmittance", spectra.T, o.T, sun, lo, hi, 1, "nm")
	f.SolarReflectance, f.SolarTransmittance, f.SolarCoverage = Num(rs.Value), Num(ts.Value), Num(rs.Coverage)
	f.SolarAbsorptance = Num(1 - rs.Value - ts.Value)
	f.Figures = append(f.Figures, Figure{Key: "solar_absorptance", Label: "Solar absorptance (1 − R − T)",
		Value: f.SolarAbsorptance, Band: [2]float64{lo, hi}, BandUnit: "nm", Weighting: sun.String(),
		Coverage: Num(math.Min(rs.Coverage, ts.Coverage))})
	grads["solar_absorptance"] = grads["solar_reflectance"].scale(-1).plus(-1, grads["solar_transmittance"])
	sub := func(key, label string, a, b float64) Num {
		a, b = math.Max(a, lo), math.Min(b, hi)
		if !(b > a) {
			return Num(math.NaN())
		}
		return Num(add(key, label, spectra.R, o.R, sun, a, b, 1, "nm").Value)
	}
	f.UVReflectance = sub("uv_reflectance", "Solar-weighted UV reflectance", lo, 400)
	f.VisibleReflectance = sub("visible_reflectance", "Solar-weighted visible reflectance", 400, 700)
	f.NIRReflectance = sub("nir_reflectance", "Solar-weighted near-IR reflectance", 700, hi)
	bb := spectra.Blackbody{K: c.TemperatureK}
	te := add("thermal_emittance", "Thermal emittance", spectra.A, o.A, bb, c.ThermalBandUM[0], c.ThermalBandUM[1], 1000, "µm")
	we := add("window_emittance", "Atmospheric-window emittance", spectra.A, o.A, bb, c.WindowBandUM[0], c.WindowBandUM[1], 1000, "µm")
	f.ThermalEmittance, f.ThermalCoverage = Num(te.Value), Num(te.Coverage)
	f.WindowEmittance, f.WindowCoverage = Num(we.Value), Num(we.Coverage)

	cl := o.Closure
	f.Closure = ClosureReport{OK: cl.OK(), Tolerance: cl.Tolerance, Checked: cl.Checked,
		Residual: cl.Residual, ResidualNM: cl.ResidualNM, Excess: cl.Excess, ExcessNM: cl.ExcessNM,
		Min: cl.Min, MinNM: cl.MinNM, MinOf: cl.MinOf.String(), Problems: cl.Problems}
	if f.Closure.Problems == nil {
		f.Closure.Problems = []string{}
	}
	f.Assumptions = append(f.Assumptions,
		fmt.Sprintf("Planck weighting sampled at the data wavelengths plus every %g nm (trapezoid rule).", spectra.PlanckStepNM))
	for _, x := range f.Figures {
		if cov := float64(x.Coverage); cov < 1 && !math.IsNaN(float64(x.Value)) {
			f.Assumptions = append(f.Assumptions, fmt.Sprintf("%s covers %.1f %% of its weighting over %g–%g %s: the mean is over the covered part only.",
				x.Label, 100*cov, x.Band[0], x.Band[1], x.BandUnit))
		}
	}
	return f, grads
}
