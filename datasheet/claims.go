package datasheet

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"

	"skysheet/spectra"
	"skysheet/spectra/msg"
)

// Status is the verdict on a claim.
type Status int

// The verdicts. Their String forms are the words shown to readers.
const (
	Supported    Status = iota // the spectra give the claimed value within its tolerance
	NotSupported               // the spectra give a value outside it
	CannotCheck                // the spectra cannot decide
)

var statusWords = [...]string{"supported", "not supported", "cannot be checked"}

// String returns "supported", "not supported" or "cannot be checked".
func (s Status) String() string {
	if s >= 0 && int(s) < len(statusWords) {
		return statusWords[s]
	}
	return "Status(" + strconv.Itoa(int(s)) + ")"
}

// Mark returns the neutral sign shown beside a verdict: "=" the spectra
// agree with the claim, "≠" they disagree, "?" they cannot tell. The sign
// always goes with the words of String, never instead of them.
func (s Status) Mark() string {
	switch s {
	case Supported:
		return "="
	case NotSupported:
		return "≠"
	}
	return "?"
}

// VerdictCounts counts verdicts by status.
type VerdictCounts struct {
	Claims       int `json:"claims"`
	Supported    int `json:"supported"`
	NotSupported int `json:"not_supported"`
	CannotCheck  int `json:"cannot_be_checked"`
}

// Add counts the verdicts vs.
func (c *VerdictCounts) Add(vs ...Verdict) {
	for _, v := range vs {
		c.Claims++
		switch v.Status {
		case Supported:
			c.Supported++
		case NotSupported:
			c.NotSupported++
		default:
			c.CannotCheck++
		}
	}
}

// MarshalText writes the status as its String form.
func (s Status) MarshalText() ([]byte, error) {
	if s < 0 || int(s) >= len(statusWords) {
		return nil, fmt.Errorf("datasheet: unknown status %d", int(s))
	}
	return []byte(s.String()), nil
}

// UnmarshalText reads a status written by MarshalText.
func (s *Status) UnmarshalText(b []byte) error {
	for i, w := range statusWords {
		if string(b) == w {
			*s = Status(i)
			return nil
		}
	}
	return fmt.Errorf("datasheet: unknown status %q: want one of %q", b, statusWords)
}

// PitfallCode names a common mistake behind a claimed figure.
type PitfallCode int

// The pitfalls judgeOne detects.
const (
	// pitfallInfraredShort: an emittance from data that stop before the top
	// of its band (25 µm for the default thermal band).
	pitfallInfraredShort PitfallCode = iota + 1
	// pitfallSolarLateStart: a solar figure from data that start after
	// 300 nm, missing the ultraviolet.
	pitfallSolarLateStart
	// pitfallClosure: the data break R+T+A = 1 (or R+T ≤ 1, or R, T, A ≥ 0)
	// by more than the claim's tolerance.
	pitfallClosure
	// pitfallPercent: a fraction claimed as a percentage (96 for 0.96).
	pitfallPercent
	// pitfallHeldLarge: a cooling figure for which the emittance is held
	// constant beyond the data over more than [MaxHeldShare] of the
	// exchange band's blackbody power.
	pitfallHeldLarge
	// pitfallSRITranslucent: an SRI claimed for a sample whose solar
	// transmittance exceeds 0.01; ASTM E1980 defines the index for opaque
	// surfaces.
	pitfallSRITranslucent
	// pitfallEmittanceBasis: a claim on one emittance basis (near-normal
	// or hemispherical) of a figure that rests on the other.
	pitfallEmittanceBasis
)

var pitfallNames = map[PitfallCode]string{
	pitfallInfraredShort:  "infrared-data-short",
	pitfallSolarLateStart: "solar-data-late-start",
	pitfallClosure:        "closure-exceeds-tolerance",
	pitfallPercent:        "percent-for-fraction",
	pitfallHeldLarge:      "held-emittance-large",
	pitfallSRITranslucent: "sri-not-opaque",
	pitfallEmittanceBasis: "emittance-basis",
}

// String returns the pitfall's code word, e.g. "percent-for-fraction".
func (p PitfallCode) String() string {
	if s, ok := pitfallNames[p]; ok {
		return s
	}
	return "PitfallCode(" + strconv.Itoa(int(p)) + ")"
}

// MarshalText writes the code word.
func (p PitfallCode) MarshalText() ([]byte, error) {
	if _, ok := pitfallNames[p]; !ok {
		return nil, fmt.Errorf("datasheet: unknown pitfall %d", int(p))
	}
	return []byte(p.String()), nil
}

// UnmarshalText reads a code word written by MarshalText.
func (p *PitfallCode) UnmarshalText(b []byte) error {
	for c, s := range pitfallNames {
		if s == string(b) {
			*p = c
			return nil
		}
	}
	return fmt.Errorf("datasheet: unknown pitfall %q", b)
}

// Pitfall is a common mistake found behind a claim, with a sentence giving
// the numbers.
type Pitfall struct {
	Code PitfallCode `json:"code"`
	Text string      `json:"text"`
}

// Thresholds of the verdicts (rules of this tool; common practice, no
// source). docs/review.md states them for readers.
const (
	// minCoverage is the least share of a figure's weighting the data must
	// cover for a claim to be checked. For a cooling figure it applies to
	// the blackbody power over [CoolingCheckLoUM]–[CoolingCheckHiUM] within
	// the exchange band (and to the solar weighting for figures with sun).
	minCoverage = 0.98
	// defaultUncertainty is the standard uncertainty assumed for a
	// fraction figure when no tolerance is claimed and the data give none.
	defaultUncertainty = 0.005
	// defaultIndexUncertainty is the same for an index (the SRI), in
	// index units.
	defaultIndexUncertainty = 1.0
	// defaultRelUncertainty is the same for a power or a temperature
	// difference, relative to the claimed value, but never below
	// DefaultPowerFloorWm2 or DefaultDeltaFloorK.
	defaultRelUncertainty = 0.05
	// defaultPowerFloorWm2 is the least default standard uncertainty of a
	// power, W/m².
	defaultPowerFloorWm2 = 2.0
	// defaultDeltaFloorK is the least default standard uncertainty of a
	// temperature difference, K.
	defaultDeltaFloorK = 0.5
	// coolingCheckLoUM and CoolingCheckHiUM bound the part of the exchange
	// band, µm, that the data must cover for a cooling claim to be
	// checked: the default thermal band, the reach of usual FTIR data.
	// Beyond the data the emittance is held constant (docs/cooling.md) and
	// the verdict says how much blackbody power that part carries.
	coolingCheckLoUM = 2.5
	coolingCheckHiUM = 25.0
	// maxHeldShare is the share of the exchange band's blackbody power at
	// the air temperature over which the emittance may be held constant
	// before the verdict names it as a pitfall.
	maxHeldShare = 0.25
	// coverageFactor k turns the combined standard uncertainty into the
	// allowed difference (about 95 % for a normal distribution, JCGM
	// 100:2008 §6.3, section from memory).
	coverageFactor = 2.0
	// solarStartNM is the wavelength after which solar data start too late.
	solarStartNM = 300.0
	// defaultDeltaEUncertainty is the standard uncertainty assumed for a
	// colour L*a*b* when no tolerance is claimed, as a colour difference
	// ΔE (either formula).
	defaultDeltaEUncertainty = 1.0
	// defaultXYUncertainty is the same for a chromaticity x, y, as a
	// distance in x, y.
	defaultXYUncertainty = 0.002
	// maxAngleDiffDeg is the largest difference between the claimed and the
	// measured angle of incidence treated as the same basis.
	maxAngleDiffDeg = 10.0
)

// JudgeRules are the thresholds verdicts follow, as [Rules] gives them:
// the constants of the same names (rules of this tool; common practice,
// no source, except where a constant names its source). docs/review.md
// states them for readers.
type JudgeRules struct {
	MinCoverage, MinShownCoverage, DefaultUncertainty, DefaultIndexUncertainty, DefaultRelUncertainty float64
	DefaultPowerFloorWm2, DefaultDeltaFloorK, CoolingCheckLoUM, CoolingCheckHiUM                      float64
	MaxHeldShare, CoverageFactor, SolarStartNM, MaxAngleDiffDeg, MaxFraction                          float64
	DefaultDeltaEUncertainty, DefaultXYUncertainty                                                    float64
}

// Rules are the thresholds the verdicts follow.
var Rules = JudgeRules{
	MinCoverage: minCoverage, MinShownCoverage: minShownCoverage, DefaultUncertainty: defaultUncertainty, DefaultIndexUncertainty: defaultIndexUncertainty,
	DefaultRelUncertainty: defaultRelUncertainty, DefaultPowerFloorWm2: defaultPowerFloorWm2, DefaultDeltaFloorK: defaultDeltaFloorK,
	CoolingCheckLoUM: coolingCheckLoUM, CoolingCheckHiUM: coolingCheckHiUM, MaxHeldShare: maxHeldShare,
	CoverageFactor: coverageFactor, SolarStartNM: solarStartNM, MaxAngleDiffDeg: maxAngleDiffDeg, MaxFraction: maxFraction,
	DefaultDeltaEUncertainty: defaultDeltaEUncertainty, DefaultXYUncertainty: defaultXYUncertainty,
}

// edge is the absolute slack when comparing a difference with its
// allowance, so that rounding in the last bits does not flip a verdict.
const edge = 1e-9

// Verdict is the judgement of one claim against the spectra.
type Verdict struct {
	Claim  Claim  `json:"claim"`
	Status Status `json:"status"`
	// Label, Unit and Kind describe the figure ("" unit for a fraction or
	// an index); empty when the figure is unknown.
	Label string `json:"label"`
	Unit  string `json:"unit"`
	Kind  Kind   `json:"kind,omitempty"`
	// Computed is the figure on the claim's basis; Difference is
	// Computed − claimed. NaN (null) when not computable.
	Computed   Num `json:"computed"`
	Difference Num `json:"difference"`
	// Allowed is the largest |Difference| judged supported, and AllowedFrom
	// says where it comes from.
	Allowed     Num    `json:"allowed"`
	AllowedFrom string `json:"allowed_from"`
	// Reason gives the verdict in one sentence.
	Reason string `json:"reason"`
	// DefaultBasisValue is the figure on the default basis when the claim
	// states a different one (NaN otherwise), and BasisNote says so in words.
	DefaultBasisValue Num       `json:"default_basis_value"`
	BasisNote         string    `json:"basis_note,omitempty"`
	Pitfalls          []Pitfall `json:"pitfalls"`
	// ComputedValues are the computed components of a colour figure
	// (L*, a*, b* or x, y); Difference is then the distance from the
	// claimed values, measured as Measure says (e.g. "CIEDE2000 ΔE00").
	ComputedValues []Num  `json:"computed_values,omitempty"`
	Measure        string `json:"difference_measure,omitempty"`
	// Basis is the basis used, in words, each part marked "stated" or
	// "default"; Defaulted lists the basis keys taken from the defaults.
	Basis      string     `json:"basis"`
	Defaulted  []string   `json:"defaulted"`
	Conditions Conditions `json:"conditions"`
}

// Format writes x as the verdict's reason writes numbers of its figure
// (see [Kind.Format]).
func (v Verdict) Format(x float64) string { return v.Kind.Format(x, v.Unit) }

// FormatSigned is [Verdict.Format] with a sign.
func (v Verdict) FormatSigned(x float64) string { return v.Kind.FormatSigned(x, v.Unit) }

// roundingUncertainty is the standard uncertainty of a value known only to
// its last written digit: half a unit of that digit over √3 (a rectangular
// distribution, JCGM 100:2008 §F.2.2.1, section from memory). The digits are those of the
// shortest decimal form of v, so 0.95 has two.
func roundingUncertainty(v float64) float64 {
	s := strconv.FormatFloat(math.Abs(v), 'f', -1, 64)
	decimals := 0
	if i := strings.IndexByte(s, '.'); i >= 0 {
		decimals = len(s) - i - 1
	}
	return 0.5 * math.Pow(10, -float64(decimals)) / math.Sqrt(3)
}

// apply returns the conditions c with the stated parts of the basis, and
// which yaml keys were stated.
func (b Basis) apply(c Conditions) (Conditions, map[string]bool) {
	stated := map[string]bool{}
	set := func(key string, v any, given bool) {
		if given && c.Set(key, v) == nil {
			stated[key] = true
		}
	}
	set(condSolarBand.key(), b.SolarBandNM, len(b.SolarBandNM) == 2)
	set(condSolarSpectrum.key(), b.SolarSpectrum, b.SolarSpectrum != "")
	set(condThermalBand.key(), b.ThermalBandUM, len(b.ThermalBandUM) == 2)
	set(condWindowBand.key(), b.WindowBandUM, len(b.WindowBandUM) == 2)
	set(condTemperature.key(), b.TemperatureK, b.TemperatureK > 0)
	if b.AngleDeg > 0 {
		stated["angle_deg"] = true
	}
	if b.RefractiveIndex > 0 {
		c.RefractiveIndex = On(b.RefractiveIndex)
		stated[condRefractive.key()] = true
	}
	if b.Emittance != "" {
		stated["emittance"] = true
	}
	return c, stated
}

// Validate reports the first thing that makes the claim unusable.
func (c Claim) Validate() error {
	finite := func(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
	if strings.TrimSpace(c.Figure) == "" {
		return fmt.Errorf("no figure named: want e.g. figure: solar_reflectance")
	}
	if !finite(c.Value) {
		return fmt.Errorf("%s: value %g is not a finite number", c.Figure, c.Value)
	}
	if !finite(c.Tolerance) || c.Tolerance < 0 {
		return fmt.Errorf("%s: tolerance %g: want a positive number or none", c.Figure, c.Tolerance)
	}
	if err := c.validateValues(); err != nil {
		return fmt.Errorf("%s: %v", c.Figure, err)
	}
	b := c.Basis
	for _, band := range []struct {
		key  string
		v    []float64
		unit string
	}{{"solar_band_nm", b.SolarBandNM, "nm"}, {"thermal_band_um", b.ThermalBandUM, "µm"}, {"window_band_um", b.WindowBandUM, "µm"}} {
		if band.v == nil {
			continue
		}
		if len(band.v) != 2 || !finite(band.v[0]) || !finite(band.v[1]) || !(band.v[0] > 0 && band.v[1] > band.v[0]) {
			return fmt.Errorf("%s: basis %s %v: want [LO, HI] in %s with 0 < LO < HI", c.Figure, band.key, band.v, band.unit)
		}
	}
	if s := b.SolarSpectrum; s != "" && s != "global" && s != "direct" {
		return fmt.Errorf("%s: basis solar_spectrum %q: want global or direct", c.Figure, s)
	}
	if !finite(b.TemperatureK) || b.TemperatureK < 0 {
		return fmt.Errorf("%s: basis temperature_k %g: want a temperature in kelvin", c.Figure, b.TemperatureK)
	}
	if !finite(b.AngleDeg) || b.AngleDeg < 0 || b.AngleDeg >= 90 {
		return fmt.Errorf("%s: basis angle_deg %g: want 0 ≤ angle < 90", c.Figure, b.AngleDeg)
	}
	if _, err := spectra.ParseEmittanceBasis(b.Emittance); err != nil {
		return fmt.Errorf("%s: basis %v", c.Figure, err)
	}
	if n := b.RefractiveIndex; !finite(n) || n != 0 && !(n > 1 && n <= maxRefractiveIndex) {
		return fmt.Errorf("%s: basis refractive_index %g: want a real index above 1 and at most %g", c.Figure, n, float64(maxRefractiveIndex))
	}
	return nil
}

// validateValues checks values and delta_e against the claimed figure's
// kind: a colour figure takes values (as many as it has components) and
// no value; any other figure neither values nor delta_e.
func (c Claim) validateValues() error {
	for _, v := range c.Values {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("values %v: want finite numbers", c.Values)
		}
	}
	spec, known := figureSpecs[c.Figure]
	names := spec.kind.componentNames()
	switch {
	case !known:
		return nil // judged as an unknown figure
	case names == nil && len(c.Values) > 0:
		return fmt.Errorf("values %v: a claim of this figure states one value (value:), not values", c.Values)
	case names == nil && c.DeltaE != "":
		return fmt.Errorf("delta_e %q: only claims of an L*a*b* colour take delta_e", c.DeltaE)
	case names == nil:
		return nil
	case len(c.Values) != len(names):
		return fmt.Errorf("values %v: want the %d values %s, e.g. values: [%s]", c.Values, len(names), strings.Join(names, ", "), examples[spec.kind])
	case c.Value != 0:
		return fmt.Errorf("value %g: a colour is claimed with values: [%s], not value:", c.Value, strings.Join(names, ", "))
	}
	_, err := metricOf(spec.kind, c.DeltaE)
	return err
}

// examples are example values of the multi-component kinds, for messages.
var examples = map[Kind]string{KindLab: "52.0, 24.5, 18.0", KindChromaticity: "0.41, 0.36"}

// maxFraction is the largest claim read as a fraction, as the readers
// accept measured fractions up to 1.05; a larger claim of a fraction is not
// supported.
const maxFraction = 1.05

// bandWords names a figure's band, e.g. "band 2.5–25 µm".
func bandWords(f Figure) string {
	if f.BandUnit == "" {
		return "conditions of " + f.Label
	}
	return "band " + f.BandText()
}

// suggest returns " (did you mean X?); known figures: ..." for an unknown
// figure key.
func suggest(key string, figs []Figure) string {
	keys := make([]string, len(figs))
	for i, f := range figs {
		keys[i] = f.Key
	}
	best, close := msg.Nearest(key, keys)
	sort.Strings(keys)
	s := "; known figures: " + strings.Join(keys, ", ")
	if close {
		s = " (did you mean " + best + "?)" + s
	}
	return s
}

// formatValue formats a number of a verdict as its reason writes it:
// fractions (unit "") with four decimals, figures with a unit with one
// decimal and the unit; "n/a" for NaN.
func formatValue(x float64, unit string) string {
	if math.IsNaN(x) {
		return "n/a"
	}
	if unit == "" {
		return strconv.FormatFloat(x, 'f', 4, 64)
	}
	return strconv.FormatFloat(x, 'f', 1, 64) + " " + unit
}

// formatSigned is formatValue with a sign ("+" or "−"), none when x
// shows as zero or is NaN.
func formatSigned(x float64, unit string) string {
	s := formatValue(math.Abs(x), unit)
	switch {
	case math.IsNaN(x), s == formatValue(0, unit):
	case x < 0:
		s = "−" + s
	default:
		s = "+" + s
	}
	return s
}

func fmtHundredths(x float64) string { return strconv.FormatFloat(math.Round(x*100)/100, 'f', -1, 64) }
