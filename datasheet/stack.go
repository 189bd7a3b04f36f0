package datasheet

import (
	"fmt"
	"math"

	"skysheet/spectra"
)

// Layer is one layer of a stack, for [ComputeStack]: its name (and slug,
// when it is a material of a library), its measured sample and, when heat
// crosses it by conduction, its thickness and conductivity.
type Layer struct {
	Name, Slug string
	Sample     *spectra.Spectrum
	Conductor  *Conductor
}

// StackReport is what a stack's figures hold beyond a measured sample's:
// its layers, where the sunlight is absorbed, and the cooling of the bottom
// layer with and without the layers above it.
type StackReport struct {
	Layers []LayerReport `json:"layers"`
	// HWm2K is the outside heat-transfer coefficient h of the conditions;
	// HEffWm2K is h through the layers above the bottom one, in series
	// (see [SeriesH]): the h of the stack's conditions and figures.
	HWm2K    Num `json:"h_w_m2k"`
	HEffWm2K Num `json:"h_eff_w_m2k"`
	// Uncovered is the bottom layer alone under the same conditions with
	// the outside h: the emitter without its cover.
	Uncovered CoolingSummary `json:"uncovered"`
}

// LayerReport is one layer of a stack.
type LayerReport struct {
	Name            string `json:"name"`
	Slug            string `json:"slug,omitempty"`
	ThicknessMM     Num    `json:"thickness_mm"`      // null when not given
	ConductivityWmK Num    `json:"conductivity_w_mk"` // null when not given
	// SolarAbsorbed is the share of the sunlight falling on the stack that
	// this layer absorbs, counting every reflection between the layers; the
	// layers' shares add up to the stack's solar absorptance.
	SolarAbsorbed Num `json:"solar_absorbed"`
	// The layer's own figures, measured alone.
	SolarReflectance   Num `json:"solar_reflectance"`
	SolarTransmittance Num `json:"solar_transmittance"`
	ThermalEmittance   Num `json:"thermal_emittance"`
}

// CoolingSummary is the headline cooling figures of a surface.
type CoolingSummary struct {
	CoolingPowerWm2        Num `json:"cooling_power_w_m2"`
	CoolingPowerNightWm2   Num `json:"cooling_power_night_w_m2"`
	EquilibriumDeltaK      Num `json:"equilibrium_delta_k"`
	EquilibriumDeltaNightK Num `json:"equilibrium_delta_night_k"`
}

// Stacked is a stack evaluated by [ComputeStack]: its figures, and the
// stack as a spectrum (R, T and A at the stack's wavelengths, for a
// download and charts) with its optics.
type Stacked struct {
	Figures *Figures
	Sample  *spectra.Spectrum
	Optics  spectra.StackOptics
}

// ComputeStack returns the figures of layers stacked top first under
// conditions c: each layer resolved with c's closure tolerance and the
// layers combined by [spectra.Stack]; the stack's band figures as for a
// measured sample; its cooling with h replaced by h_eff, the outside h and
// the conduction of every layer above the bottom one that gives a thickness
// and a conductivity in series ([SeriesH]); and, in Figures.Stack, the
// share of sunlight each layer absorbs and the cooling of the bottom layer
// alone under h. The stack is treated as one surface at one temperature:
// sunlight a cover absorbs counts as heat on the emitter (the assumptions
// say so).
func ComputeStack(layers []Layer, c Conditions) (*Stacked, error) {
	if err := c.Validate(); err != nil {
		return nil, err
	}
	if len(layers) < 2 {
		return nil, fmt.Errorf("stack: want at least two layers, got %d: %w", len(layers), ErrSystemInput)
	}
	opt := make([]spectra.Optics, len(layers))
	var conductors []Conductor
	for i, l := range layers {
		opt[i] = spectra.Resolve(l.Sample, c.ClosureTol)
		if l.Conductor != nil && i < len(layers)-1 {
			conductors = append(conductors, *l.Conductor)
		}
	}
	heff, err := SeriesH(c.HWm2K, conductors...)
	if err != nil {
		return nil, fmt.Errorf("stack: %w", err)
	}
	heff = round3(heff) // a condition people read: to 0.001 W m⁻² K⁻¹
	so, err := spectra.Stack(opt)
	if err != nil {
		return nil, err
	}
	so.Closure.Tolerance = c.ClosureTol
	s := stackSample(layers, so)
	cs := c
	cs.HWm2K = heff
	f, err := Compute(s, so.Optics, cs)
	if err != nil {
		return nil, err
	}
	bottom := len(layers) - 1
	bf, err := Compute(layers[bottom].Sample, opt[bottom], c)
	if err != nil {
		return nil, err
	}
	rep := &StackReport{HWm2K: Num(c.HWm2K), HEffWm2K: Num(heff), Uncovered: CoolingSummary{
		bf.CoolingPowerWm2, bf.CoolingPowerNightWm2, bf.EquilibriumDeltaK, bf.EquilibriumDeltaNightK}}
	sun, bb := c.Weightings()
	band := func(x spectra.Series, w spectra.Weighting, b spectra.Interval) Num {
		return Num(spectra.BandMean(x, w, b.Lo, b.Hi).Value)
	}
	nan := Num(math.NaN())
	for i, l := range layers {
		lr := LayerReport{Name: l.Name, Slug: l.Slug, ThicknessMM: nan, ConductivityWmK: nan,
			SolarAbsorbed:      band(so.Absorbed[i], sun, c.SolarBand),
			SolarReflectance:   band(opt[i].R, sun, c.SolarBand),
			SolarTransmittance: band(opt[i].T, sun, c.SolarBand),
			ThermalEmittance:   band(opt[i].A, bb, c.ThermalBand)}
		if l.Conductor != nil {
			lr.ThicknessMM, lr.ConductivityWmK = Num(l.Conductor.ThicknessM*1000), Num(l.Conductor.ConductivityWmK)
		}
		rep.Layers = append(rep.Layers, lr)
	}
	f.Stack = rep
	// R and T come from the layers' own by multiple reflection, A from them.
	f.Origins = Origins{R: "computed from the layers", T: "computed from the layers", A: "derived"}
	f.Assumptions = append(f.Assumptions, stackAssumptions(layers, c.HWm2K, heff, len(conductors) > 0)...)
	return &Stacked{Figures: f, Sample: s, Optics: so}, nil
}

// stackAssumptions states how a stack's cooling is modelled.
func stackAssumptions(layers []Layer, h, heff float64, conducts bool) []string {
	out := []string{
		"The stack is taken as one surface at one temperature for its cooling figures: sunlight absorbed in any layer, " +
			"a cover included, heats the emitter below, and the stack emits with its own spectral absorptance (Kirchhoff's law). " +
			"A cover's own temperature is not solved for; since a real cover loses part of the sunlight it absorbs to the air, " +
			"this errs on the warm side for the emitter.",
	}
	if conducts {
		out = append(out, fmt.Sprintf("The layers above the bottom one block the wind: the non-radiative exchange crosses them by conduction "+
			"in series with the outside air, h_eff = 1/(1/h + Σ dᵢ/kᵢ) = %s W m⁻² K⁻¹ (to 0.001) with h = %s W m⁻² K⁻¹ (common practice, no source). "+
			"Without the cover the bottom layer alone exchanges with h.", fmtG(heff), fmtG(h)))
	} else {
		out = append(out, fmt.Sprintf("No layer gives a thickness and conductivity: the stack exchanges heat with the air through h = %s W m⁻² K⁻¹, as the bottom layer alone would.", fmtG(h)))
	}
	if layers[len(layers)-1].Conductor != nil {
		out = append(out, "The bottom layer's thickness and conductivity are not used: it is the surface whose temperature is found.")
	}
	return out
}

func round3(x float64) float64 { return math.Round(x*1000) / 1000 }

// stackSample writes the stack's optics as a spectrum: one segment per
// piece with R, T and A, the layers' sources and inputs.
func stackSample(layers []Layer, so spectra.StackOptics) *spectra.Spectrum {
	s := &spectra.Spectrum{}
	for i, l := range layers {
		s.Meta = append(s.Meta, spectra.Field{Key: fmt.Sprintf("layer %d", i+1), Value: l.Name})
		s.Sources = append(s.Sources, l.Sample.Sources...)
		s.Inputs = append(s.Inputs, l.Sample.Inputs...)
	}
	for i, p := range so.R.Pieces {
		var g spectra.Segment
		g.NM = p.NM
		g.Values[spectra.R], g.Values[spectra.T], g.Values[spectra.A] = p.V, so.T.Pieces[i].V, so.A.Pieces[i].V
		g.Source = "stack"
		s.Segments = append(s.Segments, g)
	}
	return s
}
