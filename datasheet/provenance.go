package datasheet

import (
	"skysheet/spectra"
)

// Provenance is what a reader needs to reproduce a set of figures exactly:
// the input files and their SHA-256, the weighting data sets and their
// versions, the software version and the numerical settings. The conditions
// are recorded beside it, in [Figures.Conditions].
type Provenance struct {
	// Software is "skysheet VERSION", the version taken from the build
	// information (see [Version]).
	Software string `json:"software"`
	// Inputs lists the spectrum files, in the order they were merged.
	Inputs []spectra.Input `json:"inputs"`
	// Weightings lists every weighting a figure uses, once each.
	Weightings []WeightingSource `json:"weightings"`
	Settings   Settings          `json:"settings"`
}

// WeightingSource names a weighting and the data set or law behind it.
type WeightingSource struct {
	Name    string `json:"name"`             // as in [Figure.Weighting]
	Version string `json:"version"`          // the data set or law and its edition
	SHA256  string `json:"sha256,omitempty"` // of the embedded table, for tabulated data
}

// Settings are the numerical choices behind the figures.
type Settings struct {
	ClosureTolerance float64 `json:"closure_tolerance"`
	PlanckStepNM     float64 `json:"planck_step_nm"` // Planck weighting grid step
	Integration      string  `json:"integration"`
	Schema           int     `json:"schema"`
}

// provenanceOf returns the provenance of figures f computed from s with
// the weightings used.
func provenanceOf(s *spectra.Spectrum, f *Figures, used []spectra.Weighting) Provenance {
	p := Provenance{
		Software: "skysheet " + Version(),
		Inputs:   append([]spectra.Input{}, s.Inputs...),
		Settings: Settings{
			ClosureTolerance: f.Conditions.ClosureTol,
			PlanckStepNM:     spectra.PlanckStepNM,
			Integration:      "trapezoid rule on the union of data points, weighting knots and band limits",
			Schema:           SchemaVersion,
		},
	}
	for _, w := range used {
		p.Weightings = append(p.Weightings, weightingSource(w))
	}
	if sky := f.Conditions.Sky; sky.Spectrum != nil {
		p.Inputs = append(p.Inputs, sky.Spectrum.Inputs...)
	}
	if w := f.Conditions.Weather.Series; w != nil {
		p.Inputs = append(p.Inputs, w.Input)
	}
	if f.Sky.Model != "" {
		p.Weightings = append(p.Weightings, WeightingSource{Name: "sky: " + f.Sky.Model,
			Version: "sky model computed by skysheet " + Version() + " (see docs/cooling.md)"})
	}
	return p
}

// weightingSource describes weighting w and the data set or law behind it.
func weightingSource(w spectra.Weighting) WeightingSource {
	switch w := w.(type) {
	case spectra.Blackbody:
		return WeightingSource{Name: w.String(),
			Version: "Planck's law with the exact SI constants h, c, k (CODATA 2018)"}
	}
	if w == spectra.SolarGlobal() || w == spectra.SolarDirect() {
		return WeightingSource{Name: w.String(),
			Version: "ASTM G173-03 (reapproved 2012) reference spectra, 280–4000 nm, embedded table",
			SHA256:  spectra.SolarTableSHA256()}
	}
	return WeightingSource{Name: w.String(), Version: "computed by skysheet " + Version()}
}
