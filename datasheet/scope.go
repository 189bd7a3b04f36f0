package datasheet

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"skysheet/spectra"
)

// Where a figure's model stops: coverage that is too low to give a number,
// samples that transmit, an emittance below the SRI's range.

// The coverage thresholds of a figure's value (common practice, no
// source): below minShownCoverage of its weighting covered by data it is
// not given (null, with the reason); below fullCoverage it is given with a
// "partial data" mark. fullCoverage is also the least coverage a claim
// needs (Rules.MinCoverage).
const (
	minShownCoverage = 0.90
	fullCoverage     = minCoverage
)

// Thresholds of the model notes: a sample transmitting more than
// maxOpaqueTransmittance of sunlight or of thermal radiation is not opaque
// (the bound ASTM E1980's note uses today, common practice, no source); the
// SRI applies to thermal emittances above minSRIEmittance (ASTM E1980 §1.1,
// from memory).
const (
	maxOpaqueTransmittance = 0.01
	minSRIEmittance        = 0.1
)

// The codes of the model notes.
const (
	NoteSRINotOpaque     = "sri-not-opaque"
	NoteSRILowEmittance  = "sri-low-emittance"
	NoteCoolingLoneLayer = "cooling-lone-layer"
)

// ModelNote is a limit of a model that this sample's figures reach, said
// beside them: its code, the figures it concerns and one sentence.
type ModelNote struct {
	Code    string   `json:"code"`
	Figures []string `json:"figures"`
	Text    string   `json:"text"`
}

// NotesFor returns the model notes of f that concern figure key.
func (f *Figures) NotesFor(key string) []ModelNote {
	var out []ModelNote
	for _, n := range f.ModelNotes {
		for _, k := range n.Figures {
			if k == key {
				out = append(out, n)
				break
			}
		}
	}
	return out
}

// withheldPrefix begins the reason of a figure withheld for its coverage.
const withheldPrefix = "not given: "

// ShortReason says in a few words why the figure has no value
// ("coverage < 90 %"); "" when it has one.
func (f Figure) ShortReason() string {
	if f.Short != "" {
		return f.Short
	}
	return f.Reason
}

// coveragePart is one share of a weighting on which a figure rests: the
// share covered by data and what it is a share of, in words.
type coveragePart struct {
	cov        float64
	what, rest string
}

// coverageParts returns the shares of weightings that figure fig of f (of
// spec) rests on, in the order they are checked: for a cooling figure the
// blackbody power over the part of the exchange band that must be
// measured, then, with sun, the solar weighting; for an SRI the solar then
// the thermal weighting; else the figure's own weighting.
func coverageParts(spec figureSpec, fig Figure, f *Figures) []coveragePart {
	input := func(key, rest string) []coveragePart {
		x, ok := f.Figure(key)
		if !ok {
			return nil
		}
		return []coveragePart{{float64(x.Coverage), fmt.Sprintf("the %s weighting over the %s", x.Weighting, bandWords(x)), rest}}
	}
	switch {
	case spec.cooling:
		c := f.Conditions
		check := coolingCheckBand(c)
		out := []coveragePart{{measuredShare(f, check), fmt.Sprintf("the blackbody power at %g K over %s", c.AmbientK, bandText(check, "µm")),
			fmt.Sprintf(", the part of the exchange band %s that must be measured", bandText(c.ExchangeBand, "µm"))}}
		if spec.solar {
			out = append(out, coveragePart{float64(f.CoolingTerms.SolarAbsorbedCoverage), fmt.Sprintf("the %s power over %s",
				c.SolarSpectrum.Weighting(), bandText(spectra.SolarRangeNM, "nm")), ", on which the absorbed sunlight rests"})
		}
		return out
	case spec.sri:
		return append(input("solar_reflectance", ", on which the index's solar absorptance rests"),
			input("thermal_emittance", ", on which the index's thermal emittance rests")...)
	}
	return []coveragePart{{float64(fig.Coverage), fmt.Sprintf("the %s weighting over the %s", fig.Weighting, bandWords(fig)), ""}}
}

// leastShare returns the smallest share of parts; false when there are
// none.
func leastShare(parts []coveragePart) (float64, bool) {
	if len(parts) == 0 {
		return 0, false
	}
	least := parts[0].cov
	for _, p := range parts[1:] {
		least = min(least, p.cov)
	}
	return least, true
}

// shortOf returns the first part covered less than min.
func shortOf(parts []coveragePart, min float64) (coveragePart, bool) {
	for _, p := range parts {
		if !(p.cov >= min) {
			return p, true
		}
	}
	return coveragePart{}, false
}

// applyCoverage withholds the value of every figure of f covered less than
// minShownCoverage by data (NaN, with the reason), marks those covered less
// than fullCoverage as partial, gives every other figure without a value
// its reason, and makes the headline fields, the SRI and the cooling curve
// agree.
func applyCoverage(f *Figures) {
	withheld := map[string]bool{}
	groups, order := map[string][]string{}, []string(nil) // labels of the withheld figures by reason
	for i := range f.Figures {                            // the reasons of missing figures, before any is withheld
		if x := &f.Figures[i]; math.IsNaN(float64(x.Value)) {
			x.Reason = f.Missing(x.Key)
		}
	}
	for i := range f.Figures {
		x := &f.Figures[i]
		if math.IsNaN(float64(x.Value)) {
			continue
		}
		parts := coverageParts(specOf(*x), *x, f)
		// The coverage reported is the share that decides, so that a
		// cooling figure over 2.5–100 µm from data to 25 µm does not show
		// 84 % beside a value the rule says is covered.
		if least, ok := leastShare(parts); ok {
			x.Coverage = Num(least)
		}
		if p, short := shortOf(parts, minShownCoverage); short {
			x.Reason = fmt.Sprintf(withheldPrefix+"the data cover only %.1f %% of %s%s (at least %g %% is needed)",
				100*p.cov, p.what, p.rest, 100*minShownCoverage)
			x.Short = fmt.Sprintf("coverage < %g %%", 100*minShownCoverage)
			withheld[x.Key] = true
			g := fmt.Sprintf("the data cover only %.1f %% of %s (at least %g %% is needed)", 100*p.cov, p.what, 100*minShownCoverage)
			if _, ok := groups[g]; !ok {
				order = append(order, g)
			}
			groups[g] = append(groups[g], x.Label)
			continue
		}
		if _, short := shortOf(parts, fullCoverage); short {
			x.Partial = true
		}
	}
	// A withheld figure's assumption says so, in place of the mean over
	// the covered part.
	kept := f.Assumptions[:0]
	for _, a := range f.Assumptions {
		if !slices.ContainsFunc(f.Figures, func(x Figure) bool { return withheld[x.Key] && strings.HasPrefix(a, x.Label+" covers ") }) {
			kept = append(kept, a)
		}
	}
	f.Assumptions = kept
	for i := range f.Figures {
		if x := &f.Figures[i]; withheld[x.Key] {
			x.Value, x.Uncertainty = Num(math.NaN()), nil
		}
	}
	for _, g := range order {
		f.Assumptions = append(f.Assumptions, fmt.Sprintf("Not given, as %s: %s.", g, strings.Join(groups[g], "; ")))
	}
	if len(withheld) == 0 {
		return
	}
	for key, dst := range map[string]*Num{
		"solar_reflectance": &f.SolarReflectance, "solar_transmittance": &f.SolarTransmittance,
		"solar_absorptance": &f.SolarAbsorptance, "uv_reflectance": &f.UVReflectance,
		"visible_reflectance": &f.VisibleReflectance, "nir_reflectance": &f.NIRReflectance,
		"thermal_emittance": &f.ThermalEmittance, "window_emittance": &f.WindowEmittance,
		"cooling_power_w_m2": &f.CoolingPowerWm2, "cooling_power_night_w_m2": &f.CoolingPowerNightWm2,
		"equilibrium_delta_k": &f.EquilibriumDeltaK, "equilibrium_delta_night_k": &f.EquilibriumDeltaNightK,
		"sri_low": &f.SRI.Low, "sri_medium": &f.SRI.Medium, "sri_high": &f.SRI.High,
	} {
		if withheld[key] {
			*dst = Num(math.NaN())
		}
	}
	f.SRI.SolarAbsorptance, f.SRI.ThermalEmittance = f.SolarAbsorptance, f.ThermalEmittance
	if withheld["cooling_power_night_w_m2"] {
		f.CoolingCurve, f.Sensitivity = []CurvePoint{}, []Sensitivity{}
	}
}

// addModelNotes states where the SRI and cooling models stop applying to
// the sample of optics o: a sample that transmits sunlight or thermal
// radiation, and a thermal emittance below the SRI's range.
func addModelNotes(f *Figures, o spectra.Optics, c Conditions) {
	f.ModelNotes = []ModelNote{}
	_, bb := c.Weightings()
	ts := float64(f.SolarTransmittance)
	tt := spectra.BandMean(o.T, bb, c.ThermalBand.Lo, c.ThermalBand.Hi).Value
	sri := []string{"sri_low", "sri_medium", "sri_high"}
	if ts > maxOpaqueTransmittance || tt > maxOpaqueTransmittance {
		trans := transmitsWords(ts, tt)
		f.ModelNotes = append(f.ModelNotes,
			ModelNote{Code: NoteSRINotOpaque, Figures: sri,
				Text: fmt.Sprintf("The SRI (ASTM E1980) is defined for opaque surfaces; this sample transmits %s.", trans)},
			ModelNote{Code: NoteCoolingLoneLayer,
				Figures: []string{"cooling_power_w_m2", "cooling_power_night_w_m2", "equilibrium_delta_k", "equilibrium_delta_night_k"},
				Text:    "The cooling figures take a lone layer radiating from its upper face, with nothing behind it: what it transmits heats nothing here (over a roof or skin it would; see docs/systems.md)."})
	}
	if eps := float64(f.ThermalEmittance); eps <= minSRIEmittance {
		f.ModelNotes = append(f.ModelNotes, ModelNote{Code: NoteSRILowEmittance, Figures: sri,
			Text: fmt.Sprintf("ASTM E1980 (§1.1) applies the SRI to surfaces with a thermal emittance above %g; this sample's is %.3f.",
				minSRIEmittance, eps)})
	}
}

// transmitsWords says what a sample transmits: "83.2 % of sunlight and
// 0.0 % of thermal radiation (2.5–25 µm)".
func transmitsWords(solar, thermal float64) string {
	pct := func(x float64) string {
		if math.IsNaN(x) {
			return "an unknown share"
		}
		return fmt.Sprintf("%.1f %%", 100*x)
	}
	return pct(solar) + " of sunlight and " + pct(thermal) + " of thermal radiation"
}
