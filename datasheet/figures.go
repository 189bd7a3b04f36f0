package datasheet

import (
	"encoding/json"
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"

	"skysheet/spectra"
)

// SchemaVersion is the version of the figures JSON schema. Keys are only
// ever added within a version.
const SchemaVersion = 1

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
	Key   string // JSON key of the value, e.g. "solar_reflectance"
	Label string // in words, e.g. "Solar reflectance"
	Value Num
	Unit  string // "" for a fraction or an index
	// Band is the band the figure rests on, in nm; BandUnit is the unit
	// it is written in: "nm" or "µm".
	Band      spectra.Interval
	BandUnit  string
	Weighting string
	Coverage  Num // fraction of the weighting covered by data
	// Uncertainty is the figure's standard uncertainty when the data give
	// uncertainties of R or T.
	Uncertainty *Uncertainty
	// Components holds every component of a multi-component figure (L*,
	// a*, b* of a colour; x, y of a chromaticity); Value is then the
	// first. Nil for a single number.
	Components []Num
	// Reason says why Value is n/a: too little of its weighting covered
	// by data, none of its band, or what the figure says itself (a colour
	// from data that do not cover 380–780 nm); see [Figures.Missing].
	Reason string
	// Partial marks a value whose weighting is covered by data less than
	// fully (see docs/cooling.md, "Where the models stop").
	Partial bool
	// Short is Reason in a few words when Reason is long ("coverage <
	// 90 %"); "" otherwise. [Figure.ShortReason] gives whichever applies.
	Short string
}

// figureJSON is the JSON form of a Figure.
type figureJSON struct {
	Key         string       `json:"key"`
	Label       string       `json:"label"`
	Value       Num          `json:"value"`
	Unit        string       `json:"unit"`
	Band        [2]float64   `json:"band,omitempty"`
	BandUnit    string       `json:"band_unit,omitempty"`
	Weighting   string       `json:"weighting,omitempty"`
	Coverage    Num          `json:"coverage"`
	Uncertainty *Uncertainty `json:"uncertainty,omitempty"`
	Components  []Num        `json:"components,omitempty"`
	Reason      string       `json:"reason,omitempty"`
	Partial     bool         `json:"partial,omitempty"`
}

// MarshalJSON writes the figure with its band in its band unit.
func (f Figure) MarshalJSON() ([]byte, error) {
	return json.Marshal(figureJSON{f.Key, f.Label, f.Value, f.Unit, bandOut(f.Band, f.BandUnit), f.BandUnit,
		f.Weighting, f.Coverage, f.Uncertainty, f.Components, f.Reason, f.Partial})
}

// UnmarshalJSON reads the form MarshalJSON writes.
func (f *Figure) UnmarshalJSON(b []byte) error {
	var j figureJSON
	if err := json.Unmarshal(b, &j); err != nil {
		return err
	}
	*f = Figure{j.Key, j.Label, j.Value, j.Unit, bandFrom(j.Band[0], j.Band[1], j.BandUnit), j.BandUnit,
		j.Weighting, j.Coverage, j.Uncertainty, j.Components, j.Reason, j.Partial, ""}
	return nil
}

// Kind returns what the figure's number is (see the kind table).
func (f Figure) Kind() Kind { return specOf(f).kind }

// BandText writes the figure's band in its band unit, e.g. "2.5–25 µm";
// "" when it has none.
func (f Figure) BandText() string { return bandText(f.Band, f.BandUnit) }

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

// Origins says how each of R, T and A behind the figures was obtained:
// "measured", "derived" (1 minus the other two), "assumed 0" (transmittance
// not measured, the sample taken as opaque), or several joined by "and"
// when they differ over the range.
type Origins struct {
	R string `json:"R"`
	T string `json:"T"`
	A string `json:"A"`
}

// Text says the origins in one line, e.g. "R measured; T derived as
// 1 − R − A; A measured".
func (o Origins) Text() string {
	var parts []string
	for _, x := range []struct{ q, v, rest string }{{"R", o.R, "T − A"}, {"T", o.T, "R − A"}, {"A", o.A, "R − T"}} {
		if x.v == "" {
			continue
		}
		w := x.q + " " + x.v
		if strings.Contains(x.v, "derived") {
			w = strings.Replace(w, "derived", "derived as "+x.q+" = 1 − "+x.rest, 1)
		}
		parts = append(parts, w)
	}
	return strings.Join(parts, "; ")
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
	Origins            Origins       `json:"origins"`
	// Warnings are the readers' plausibility warnings about the input
	// files (a percent column holding fractions, an axis in the wrong
	// unit), one sentence each naming the file; empty when none.
	Warnings    []string   `json:"warnings"`
	Assumptions []string   `json:"assumptions"`
	Conditions  Conditions `json:"conditions"`
	Figures     []Figure   `json:"figures"`
	// Splices lists every junction where two instruments' data were
	// spliced, with the mismatch found there; empty when none.
	Splices []spectra.SpliceRecord `json:"splices"`

	// Cooling under the stated sky (see docs/cooling.md). The cooling powers
	// are P_net at T_s = T_amb in W/m², with and without sun; the equilibrium
	// figures are T_amb − T_eq in K, positive below ambient.
	CoolingPowerWm2        Num          `json:"cooling_power_w_m2"`
	CoolingPowerNightWm2   Num          `json:"cooling_power_night_w_m2"`
	EquilibriumDeltaK      Num          `json:"equilibrium_delta_k"`
	EquilibriumDeltaNightK Num          `json:"equilibrium_delta_night_k"`
	CoolingTerms           CoolingTerms `json:"cooling_terms"`
	// EmittanceBasis says whether the emittance data are near-normal or
	// hemispherical and whether the cooling figures and the SRI were
	// converted.
	EmittanceBasis EmittanceBasis `json:"emittance_basis"`
	HeldPowerWm2   Num            `json:"held_power_w_m2"` // blackbody power at T_amb where emittance is held constant
	Sky            Sky            `json:"sky"`
	CoolingCurve   []CurvePoint   `json:"cooling_curve"`
	Sensitivity    []Sensitivity  `json:"sensitivity"`
	SRI            SRI            `json:"sri"`
	// Color is the colour of the reflectance, and of the transmittance
	// when it was measured (CIE 1931 2°, D65; see docs/color.md).
	Color Colors `json:"color"`
	// Weather holds the figures over the conditions' weather series; nil
	// (null) when the conditions name none.
	Weather *SeriesFigures `json:"weather"`
	// ModelNotes say where the SRI and cooling models stop applying to
	// this sample (it transmits; its emittance is below the SRI's range),
	// each naming the figures it concerns; empty when none.
	ModelNotes []ModelNote `json:"model_notes"`
	Cautions   []string    `json:"cautions"`
	Provenance Provenance  `json:"provenance"`
	// Stack is set for a stack of layers (see [ComputeStack]).
	Stack *StackReport `json:"stack,omitempty"`
}

// cautions go with every set of figures.
var cautions = []string{
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
// standard uncertainties of R or T, the uncertainty of every figure. o is
// s resolved by [spectra.Resolve] with the closure tolerance of c; when its
// tolerance differs, s is resolved again.
func Compute(s *spectra.Spectrum, o spectra.Optics, c Conditions) (*Figures, error) {
	if err := c.Validate(); err != nil {
		return nil, err
	}
	sky, err := skyFor(c)
	if err != nil {
		return nil, err
	}
	if o.Closure.Tolerance != c.ClosureTol {
		o = spectra.Resolve(s, c.ClosureTol)
	}
	sun := c.SolarSpectrum.Weighting()
	basis := emittanceBasisOf(s, c)
	// ratio converts near-normal emittance to hemispherical for the
	// cooling figures and the SRI; 1 when no conversion is asked.
	ratio := 1.0
	if r := float64(basis.Ratio); !math.IsNaN(r) {
		ratio = r
	}
	m := &cooling{c: c, sky: sky, sun: sun, g: newCoolGrid(o.A, sky, c.ExchangeBand, c.AmbientK), basis: basis, ratio: ratio}
	f, grads, used := computeOptics(o, c)
	f.EmittanceBasis = basis
	f.Splices = append([]spectra.SpliceRecord{}, s.Splices...)
	f.Warnings = append([]string{}, s.Warnings...)
	m.addCooling(f, o, grads)
	m.addSeries(f, withEmittanceRatio(o, ratio))
	addSRI(f, grads, ratio)
	addUncertainty(f, s, o, grads, c.ClosureTol)
	addModelNotes(f, o, c)
	applyCoverage(f)
	for key := range f.CoolingTerms.HeldUncertainty {
		if x, ok := f.Figure(key); !ok || math.IsNaN(float64(x.Value)) {
			delete(f.CoolingTerms.HeldUncertainty, key) // the figure is not given
		}
	}
	addColor(f, s, o) // after the coverage rule: colours have their own
	f.Cautions = append([]string(nil), cautions...)
	f.Provenance = provenanceOf(s, f, used)
	f.Provenance.Weightings = append(f.Provenance.Weightings, colorSource())
	return f, nil
}

// computeOptics returns the band figures of o, the gradient of each with
// respect to the values of o's series, and the weightings they use, each
// once, in order of first use.
func computeOptics(o spectra.Optics, c Conditions) (*Figures, map[string]gradient, []spectra.Weighting) {
	f := &Figures{Schema: SchemaVersion, Conditions: c, Assumptions: append([]string(nil), o.Assumptions...)}
	grads := map[string]gradient{}
	var used []spectra.Weighting
	sun, bb := c.Weightings()
	lo, hi := c.SolarBand.Lo, c.SolarBand.Hi
	add := func(key, label string, q spectra.Quantity, x spectra.Series, w spectra.Weighting, band spectra.Interval, unit string) spectra.Mean {
		m := spectra.BandMean(x, w, band.Lo, band.Hi)
		f.Figures = append(f.Figures, Figure{Key: key, Label: label, Value: Num(m.Value),
			Band: band, BandUnit: unit, Weighting: w.String(), Coverage: Num(m.Coverage)})
		if !slices.Contains(used, w) {
			used = append(used, w)
		}
		var g gradient
		g[q] = m.Coef
		grads[key] = g
		return m
	}
	rs := add("solar_reflectance", "Solar reflectance", spectra.R, o.R, sun, c.SolarBand, "nm")
	ts := add("solar_transmittance", "Solar transmittance", spectra.T, o.T, sun, c.SolarBand, "nm")
	f.SolarReflectance, f.SolarTransmittance, f.SolarCoverage = Num(rs.Value), Num(ts.Value), Num(rs.Coverage)
	f.SolarAbsorptance = Num(1 - rs.Value - ts.Value)
	f.Figures = append(f.Figures, Figure{Key: "solar_absorptance", Label: "Solar absorptance (1 − R − T)",
		Value: f.SolarAbsorptance, Band: c.SolarBand, BandUnit: "nm", Weighting: sun.String(),
		Coverage: Num(math.Min(rs.Coverage, ts.Coverage))})
	grads["solar_absorptance"] = grads["solar_reflectance"].scale(-1).plus(-1, grads["solar_transmittance"])
	sub := func(key, label string, a, b float64) Num {
		a, b = math.Max(a, lo), math.Min(b, hi)
		if !(b > a) {
			return Num(math.NaN())
		}
		return Num(add(key, label, spectra.R, o.R, sun, spectra.Interval{Lo: a, Hi: b}, "nm").Value)
	}
	f.UVReflectance = sub("uv_reflectance", "Solar-weighted UV reflectance", lo, 400)
	f.VisibleReflectance = sub("visible_reflectance", "Solar-weighted visible reflectance", 400, 700)
	f.NIRReflectance = sub("nir_reflectance", "Solar-weighted near-IR reflectance", 700, hi)
	te := add("thermal_emittance", "Thermal emittance", spectra.A, o.A, bb, c.ThermalBand, "µm")
	we := add("window_emittance", "Atmospheric-window emittance", spectra.A, o.A, bb, c.WindowBand, "µm")
	f.ThermalEmittance, f.ThermalCoverage = Num(te.Value), Num(te.Coverage)
	f.WindowEmittance, f.WindowCoverage = Num(we.Value), Num(we.Coverage)

	cl := o.Closure
	f.Origins = Origins{R: o.Origin[spectra.R].String(), T: o.Origin[spectra.T].String(), A: o.Origin[spectra.A].String()}
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
			f.Assumptions = append(f.Assumptions, fmt.Sprintf("%s covers %.1f %% of its weighting over %s: the mean is over the covered part only.",
				x.Label, 100*cov, x.BandText()))
		}
	}
	return f, grads, used
}
