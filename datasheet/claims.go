package datasheet

import (
	"fmt"
	"math"
	"reflect"
	"regexp"
	"sort"
	"strconv"
	"strings"

	"skysheet/spectra"
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

// The pitfalls [Judge] detects.
const (
	// PitfallInfraredShort: an emittance from data that stop before the top
	// of its band (25 µm for the default thermal band).
	PitfallInfraredShort PitfallCode = iota + 1
	// PitfallSolarLateStart: a solar figure from data that start after
	// 300 nm, missing the ultraviolet.
	PitfallSolarLateStart
	// PitfallClosure: the data break R+T+A = 1 (or R+T ≤ 1, or R, T, A ≥ 0)
	// by more than the claim's tolerance.
	PitfallClosure
	// PitfallPercent: a fraction claimed as a percentage (96 for 0.96).
	PitfallPercent
)

var pitfallNames = map[PitfallCode]string{
	PitfallInfraredShort:  "infrared-data-short",
	PitfallSolarLateStart: "solar-data-late-start",
	PitfallClosure:        "closure-exceeds-tolerance",
	PitfallPercent:        "percent-for-fraction",
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
	// MinCoverage is the least share of a figure's weighting the data must
	// cover for a claim to be checked.
	MinCoverage = 0.98
	// DefaultUncertainty is the standard uncertainty assumed for a
	// fraction figure when no tolerance is claimed and the data give none.
	DefaultUncertainty = 0.005
	// DefaultRelUncertainty is the same for a figure with a unit, relative
	// to the claimed value.
	DefaultRelUncertainty = 0.05
	// CoverageFactor k turns the combined standard uncertainty into the
	// allowed difference (about 95 % for a normal distribution, JCGM
	// 100:2008 §6.3, section from memory).
	CoverageFactor = 2.0
	// SolarStartNM is the wavelength after which solar data start too late.
	SolarStartNM = 300.0
	// MaxAngleDiffDeg is the largest difference between the claimed and the
	// measured angle of incidence treated as the same basis.
	MaxAngleDiffDeg = 10.0
)

// edge is the absolute slack when comparing a difference with its
// allowance, so that rounding in the last bits does not flip a verdict.
const edge = 1e-9

// JudgeInput is what a claim is judged against.
type JudgeInput struct {
	// Spectrum is the material's measured data.
	Spectrum *spectra.Spectrum
	// Conditions are the material's defaults: the library's, with the
	// material's own overrides. A claim's basis overrides them.
	Conditions Conditions
	// Angle is the measurement's angle of incidence as written, e.g. "8°".
	// When empty, the spectrum's "angle of incidence" or "angle" metadata
	// is used; when none is known the angle is not compared.
	Angle string
}

// Verdict is the judgement of one claim against the spectra.
type Verdict struct {
	Claim  Claim  `json:"claim"`
	Status Status `json:"status"`
	// Label and Unit describe the figure ("" unit for a fraction); empty
	// when the figure is unknown.
	Label string `json:"label"`
	Unit  string `json:"unit"`
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
	// Basis is the basis used, in words, each part marked "stated" or
	// "default"; Defaulted lists the basis keys taken from the defaults.
	Basis      string     `json:"basis"`
	Defaulted  []string   `json:"defaulted"`
	Conditions Conditions `json:"conditions"`
}

// Judge decides whether the spectrum in m supports claim c. It never
// panics on bad claims or data: those give [CannotCheck] with the reason.
func Judge(c Claim, m JudgeInput) Verdict {
	nan := Num(math.NaN())
	v := Verdict{Claim: c, Status: CannotCheck, Computed: nan, Difference: nan, Allowed: nan,
		DefaultBasisValue: nan, Pitfalls: []Pitfall{}, Defaulted: []string{}, Conditions: m.Conditions}
	cannot := func(format string, a ...any) Verdict {
		v.Status, v.Reason = CannotCheck, fmt.Sprintf(format, a...)
		return v
	}
	if err := c.Validate(); err != nil {
		return cannot("The claim is malformed: %v.", err)
	}
	if m.Spectrum == nil || len(m.Spectrum.Segments) == 0 {
		return cannot("There are no spectra to check the claim against.")
	}
	if err := m.Conditions.Validate(); err != nil {
		return cannot("The default conditions are not usable: %v.", err)
	}
	cond, stated := c.Basis.apply(m.Conditions)
	v.Conditions = cond
	f, err := Compute(m.Spectrum, cond)
	if err != nil {
		return cannot("The claim's basis cannot be computed: %v.", err)
	}
	fig, ok := f.Figure(c.Figure)
	if !ok {
		return cannot("skysheet computes no figure %q%s.", c.Figure, suggest(c.Figure, f.Figures))
	}
	v.Label, v.Unit, v.Computed = fig.Label, fig.Unit, fig.Value
	kind := kindOf(fig)
	v.Basis, v.Defaulted = basisWords(kind, fig, cond, stated, c.Basis.AngleDeg, measuredAngle(m))
	if !reflect.DeepEqual(cond, m.Conditions) && !sameBasis(kind, cond, m.Conditions) {
		df, err := Compute(m.Spectrum, m.Conditions)
		if d, ok := df.figure(err, c.Figure); ok {
			v.DefaultBasisValue = d.Value
			v.BasisNote = fmt.Sprintf("On the default basis (%s) the spectra give %s.",
				basisShort(kind, d, m.Conditions), FormatValue(float64(d.Value), fig.Unit))
		}
	}

	// The allowance: the claimed tolerance, or the expanded combined
	// uncertainty of the computed figure and the claim's rounding.
	if c.Tolerance > 0 {
		v.Allowed, v.AllowedFrom = Num(c.Tolerance), "claimed tolerance"
	} else {
		uFig, from := figureUncertainty(fig, c.Value)
		uRound := roundingUncertainty(c.Value)
		v.Allowed = Num(CoverageFactor * math.Hypot(uFig, uRound))
		v.AllowedFrom = fmt.Sprintf("expanded uncertainty (k = %g) of the figure's standard uncertainty %s (%s) and the claim's rounding %s",
			CoverageFactor, FormatValue(uFig, fig.Unit), from, FormatValue(uRound, fig.Unit))
	}
	o := spectra.Resolve(m.Spectrum, cond.ClosureTol) // for the pitfalls
	v.Pitfalls = pitfalls(c, fig, kind, o, float64(v.Allowed))

	computed := float64(fig.Value)
	if math.IsNaN(computed) {
		return cannot("The data do not reach the %s at all.", bandWords(fig))
	}
	v.Difference = Num(computed - c.Value)
	if cov := float64(fig.Coverage); cov < MinCoverage {
		return cannot("The data cover only %.1f %% of the %s weighting over the %s (at least %g %% is needed).",
			100*cov, fig.Weighting, bandWords(fig), 100*MinCoverage)
	}
	if kind == kindTransmittance && !m.Spectrum.Has(spectra.T) {
		return cannot("No transmittance was measured, and the opaque assumption (T = 0) cannot confirm a claimed transmittance.")
	}
	if ma := measuredAngle(m); c.Basis.AngleDeg > 0 && !math.IsNaN(ma) && math.Abs(c.Basis.AngleDeg-ma) > MaxAngleDiffDeg {
		return cannot("The claim is for %g° incidence but the spectra were measured at %g°.", c.Basis.AngleDeg, ma)
	}

	diff := computed - c.Value
	within := math.Abs(diff) <= float64(v.Allowed)+edge
	if fig.Unit == "" && math.Abs(c.Value) > MaxFraction {
		v.Status = NotSupported
		if looksLikePercent(c.Value, fig) {
			v.Reason = fmt.Sprintf("The claim %s looks like a percentage: the figure is a fraction, and %g %% is %s against the computed %s.",
				strconv.FormatFloat(c.Value, 'g', -1, 64), c.Value, FormatValue(c.Value/100, ""), FormatValue(computed, ""))
		} else {
			v.Reason = fmt.Sprintf("The claim %s is out of range for a fraction (at most %g), and the spectra give %s.",
				strconv.FormatFloat(c.Value, 'g', -1, 64), MaxFraction, FormatValue(computed, ""))
		}
		return v
	}
	allow := "±" + FormatValue(float64(v.Allowed), fig.Unit) + " (claimed tolerance)"
	if c.Tolerance == 0 {
		allow = "±" + FormatValue(float64(v.Allowed), fig.Unit) + " (expanded uncertainty; no tolerance was claimed)"
	}
	if within {
		v.Status = Supported
		v.Reason = fmt.Sprintf("The spectra give %s against the claimed %s (difference %s), within %s.",
			FormatValue(computed, fig.Unit), FormatValue(c.Value, fig.Unit), FormatSigned(diff, fig.Unit), allow)
		return v
	}
	dir := "above"
	if diff < 0 {
		dir = "below"
	}
	v.Status = NotSupported
	v.Reason = fmt.Sprintf("The spectra give %s, %s %s the claimed %s, outside %s.",
		FormatValue(computed, fig.Unit), FormatValue(math.Abs(diff), fig.Unit), dir, FormatValue(c.Value, fig.Unit), allow)
	return v
}

// figure returns the figure key of f when f was computed without error.
func (f *Figures) figure(err error, key string) (Figure, bool) {
	if err != nil || f == nil {
		return Figure{}, false
	}
	return f.Figure(key)
}

// figureUncertainty returns the standard uncertainty of a figure and where
// it comes from: the stated defaults until the figures carry their own.
func figureUncertainty(fig Figure, claimed float64) (float64, string) {
	if fig.Unit == "" {
		return DefaultUncertainty, "default for fractions, common practice, no source"
	}
	return DefaultRelUncertainty * math.Abs(claimed), fmt.Sprintf("default %g %% of the claim, common practice, no source", 100*DefaultRelUncertainty)
}

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

// figureKind is what a figure weights and over which band of the
// conditions.
type figureKind int

const (
	kindOther figureKind = iota
	kindSolar
	kindTransmittance
	kindAbsorptance // solar, from R and T
	kindThermal
	kindWindow
)

func kindOf(f Figure) figureKind {
	switch {
	case f.Key == "solar_transmittance":
		return kindTransmittance
	case f.Key == "solar_absorptance":
		return kindAbsorptance
	case f.Key == "thermal_emittance":
		return kindThermal
	case f.Key == "window_emittance":
		return kindWindow
	case f.BandUnit == "nm":
		return kindSolar
	}
	return kindOther
}

// apply returns the conditions c with the stated parts of the basis, and
// which yaml keys were stated.
func (b Basis) apply(c Conditions) (Conditions, map[string]bool) {
	stated := map[string]bool{}
	if len(b.SolarBandNM) == 2 {
		c.SolarBandNM = [2]float64{b.SolarBandNM[0], b.SolarBandNM[1]}
		stated["solar_band_nm"] = true
	}
	if b.SolarSpectrum != "" {
		c.SolarSpectrum = b.SolarSpectrum
		stated["solar_spectrum"] = true
	}
	if len(b.ThermalBandUM) == 2 {
		c.ThermalBandUM = [2]float64{b.ThermalBandUM[0], b.ThermalBandUM[1]}
		stated["thermal_band_um"] = true
	}
	if len(b.WindowBandUM) == 2 {
		c.WindowBandUM = [2]float64{b.WindowBandUM[0], b.WindowBandUM[1]}
		stated["window_band_um"] = true
	}
	if b.TemperatureK > 0 {
		c.TemperatureK = b.TemperatureK
		stated["temperature_k"] = true
	}
	if b.AngleDeg > 0 {
		stated["angle_deg"] = true
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
	return nil
}

// pitfalls returns the pitfalls found behind claim c of figure fig.
func pitfalls(c Claim, fig Figure, kind figureKind, o spectra.Optics, allowed float64) []Pitfall {
	out := []Pitfall{}
	add := func(code PitfallCode, format string, a ...any) {
		out = append(out, Pitfall{Code: code, Text: fmt.Sprintf(format, a...)})
	}
	if looksLikePercent(c.Value, fig) {
		add(PitfallPercent, "The claim %s is above 1 for a fraction: it looks like a percentage (%s).",
			strconv.FormatFloat(c.Value, 'g', -1, 64), FormatValue(c.Value/100, ""))
	}
	switch kind {
	case kindSolar, kindTransmittance, kindAbsorptance:
		x := o.R
		if kind == kindTransmittance {
			x = o.T
		}
		if lo, _ := x.Range(); lo > SolarStartNM && lo > fig.Band[0] {
			add(PitfallSolarLateStart, "The solar data start at %s nm, after %g nm: the ultraviolet from %g to %s nm is not measured.",
				fmtHundredths(lo), SolarStartNM, fig.Band[0], fmtHundredths(lo))
		}
	case kindThermal, kindWindow:
		if _, hi := o.A.Range(); hi < fig.Band[1]*1000 {
			add(PitfallInfraredShort, "The infrared data stop at %s µm, before the top of the %g–%g µm band.",
				fmtHundredths(hi/1000), fig.Band[0], fig.Band[1])
		}
	}
	cl := o.Closure
	worst, what := cl.Excess, fmt.Sprintf("R+T exceeds 1 by %s at %s nm", FormatValue(cl.Excess, ""), fmtHundredths(cl.ExcessNM))
	if cl.Checked && cl.Residual > worst {
		worst, what = cl.Residual, fmt.Sprintf("|R+T+A−1| reaches %s at %s nm", FormatValue(cl.Residual, ""), fmtHundredths(cl.ResidualNM))
	}
	if -cl.Min > worst {
		worst, what = -cl.Min, fmt.Sprintf("%s is %s at %s nm", cl.MinOf, FormatValue(cl.Min, ""), fmtHundredths(cl.MinNM))
	}
	limit := allowed
	if fig.Unit != "" && c.Value != 0 {
		limit = allowed / math.Abs(c.Value) // relative, for figures with a unit
	}
	if worst > limit+edge {
		add(PitfallClosure, "The data break closure by more than the claim's ±%s: %s.", FormatValue(limit, ""), what)
	}
	return out
}

// MaxFraction is the largest claim read as a fraction, as the readers
// accept measured fractions up to 1.05; a larger claim of a fraction is not
// supported.
const MaxFraction = 1.05

// percentNear is how close a claim divided by 100 must come to the computed
// fraction to be taken for a percentage (common practice, no source).
const percentNear = 0.05

// looksLikePercent reports whether a claim of a fraction figure is above
// MaxFraction and, read as a percentage, a fraction near the computed
// value (or any fraction when none was computed).
func looksLikePercent(v float64, fig Figure) bool {
	if fig.Unit != "" || !(math.Abs(v) > MaxFraction && math.Abs(v) <= 100*MaxFraction) {
		return false
	}
	x := float64(fig.Value)
	return math.IsNaN(x) || math.Abs(v/100-x) <= percentNear
}

// measuredAngle returns the measurement's angle of incidence in degrees, or
// NaN when unknown.
func measuredAngle(m JudgeInput) float64 {
	s := m.Angle
	if s == "" && m.Spectrum != nil {
		for _, k := range []string{"angle of incidence", "angle"} {
			if v, ok := m.Spectrum.Get(k); ok {
				s = v
				break
			}
		}
	}
	return parseAngle(s)
}

var angleRE = regexp.MustCompile(`[0-9]+(\.[0-9]+)?`)

// parseAngle reads the first number in s ("8°", "near-normal, 8 deg").
func parseAngle(s string) float64 {
	x, err := strconv.ParseFloat(angleRE.FindString(s), 64)
	if err != nil || x >= 90 {
		return math.NaN()
	}
	return x
}

// sameBasis reports whether a and b agree on every condition a figure of
// the kind depends on.
func sameBasis(k figureKind, a, b Conditions) bool {
	switch k {
	case kindSolar, kindTransmittance, kindAbsorptance:
		return a.SolarBandNM == b.SolarBandNM && a.SolarSpectrum == b.SolarSpectrum
	case kindThermal:
		return a.ThermalBandUM == b.ThermalBandUM && a.TemperatureK == b.TemperatureK
	case kindWindow:
		return a.WindowBandUM == b.WindowBandUM && a.TemperatureK == b.TemperatureK
	}
	return reflect.DeepEqual(a, b)
}

// basisWords describes the basis of a figure of the kind, marking each part
// stated or default, and returns the defaulted yaml keys it depends on.
func basisWords(k figureKind, fig Figure, c Conditions, stated map[string]bool, claimAngle, measured float64) (string, []string) {
	var parts []string
	defaulted := []string{}
	part := func(key, text string) {
		if stated[key] {
			parts = append(parts, text+" (stated)")
			return
		}
		parts = append(parts, text+" (default)")
		defaulted = append(defaulted, key)
	}
	solar := func() {
		part("solar_band_nm", fmt.Sprintf("solar band %g–%g nm", c.SolarBandNM[0], c.SolarBandNM[1]))
		part("solar_spectrum", fmt.Sprintf("%s spectrum", fig.Weighting))
	}
	thermal := func() {
		part("thermal_band_um", fmt.Sprintf("thermal band %g–%g µm", c.ThermalBandUM[0], c.ThermalBandUM[1]))
	}
	window := func() {
		part("window_band_um", fmt.Sprintf("window band %g–%g µm", c.WindowBandUM[0], c.WindowBandUM[1]))
	}
	temp := func() { part("temperature_k", fmt.Sprintf("blackbody at %g K", c.TemperatureK)) }
	switch k {
	case kindSolar, kindTransmittance, kindAbsorptance:
		solar()
	case kindThermal:
		thermal()
		temp()
	case kindWindow:
		window()
		temp()
	default:
		solar()
		thermal()
		window()
		temp()
	}
	switch {
	case claimAngle > 0 && math.IsNaN(measured):
		parts = append(parts, fmt.Sprintf("angle of incidence %g° (stated; the data's angle is not recorded)", claimAngle))
	case claimAngle > 0:
		parts = append(parts, fmt.Sprintf("angle of incidence %g° (stated; measured at %g°)", claimAngle, measured))
	}
	return strings.Join(parts, ", "), defaulted
}

// basisShort describes the conditions a figure of the kind depends on,
// without marks.
func basisShort(k figureKind, fig Figure, c Conditions) string {
	switch k {
	case kindSolar, kindTransmittance, kindAbsorptance:
		return fmt.Sprintf("%g–%g nm, %s", c.SolarBandNM[0], c.SolarBandNM[1], fig.Weighting)
	case kindThermal, kindWindow:
		return fmt.Sprintf("%g–%g µm, %s", fig.Band[0], fig.Band[1], fig.Weighting)
	}
	return "the default conditions"
}

// bandWords names a figure's band, e.g. "band 2.5–25 µm".
func bandWords(f Figure) string {
	if f.BandUnit == "" {
		return "conditions of " + f.Label
	}
	return fmt.Sprintf("band %g–%g %s", f.Band[0], f.Band[1], f.BandUnit)
}

// suggest returns ", did you mean X?; known figures: ..." for an unknown key.
func suggest(key string, figs []Figure) string {
	keys := make([]string, len(figs))
	for i, f := range figs {
		keys[i] = f.Key
	}
	best, bestD := "", 4
	for _, k := range keys {
		if d := editDistance(strings.ToLower(key), k); d < bestD {
			best, bestD = k, d
		}
	}
	sort.Strings(keys)
	s := "; known figures: " + strings.Join(keys, ", ")
	if best != "" {
		s = " (did you mean " + best + "?)" + s
	}
	return s
}

// editDistance is the Levenshtein distance between a and b.
func editDistance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	prev := make([]int, len(rb)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(ra); i++ {
		cur := make([]int, len(rb)+1)
		cur[0] = i
		for j := 1; j <= len(rb); j++ {
			cost := 1
			if ra[i-1] == rb[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
		}
		prev = cur
	}
	return prev[len(rb)]
}

// FormatValue formats a number of a verdict as its reason writes it:
// fractions (unit "") with four decimals, figures with a unit with one
// decimal and the unit; "n/a" for NaN.
func FormatValue(x float64, unit string) string {
	if math.IsNaN(x) {
		return "n/a"
	}
	if unit == "" {
		return strconv.FormatFloat(x, 'f', 4, 64)
	}
	return strconv.FormatFloat(x, 'f', 1, 64) + " " + unit
}

// FormatSigned is [FormatValue] with a sign ("+" or "−"), none when x
// shows as zero or is NaN.
func FormatSigned(x float64, unit string) string {
	s := FormatValue(math.Abs(x), unit)
	switch {
	case math.IsNaN(x), s == FormatValue(0, unit):
	case x < 0:
		s = "−" + s
	default:
		s = "+" + s
	}
	return s
}

func fmtHundredths(x float64) string { return strconv.FormatFloat(math.Round(x*100)/100, 'f', -1, 64) }
