package datasheet

import (
	"fmt"
	"math"
	"regexp"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"

	"skysheet/spectra"
)

// JudgeInput is what a claim is judged against.
type JudgeInput struct {
	// Spectrum is the material's measured data.
	Spectrum *spectra.Spectrum
	// Optics, when not nil, are Spectrum resolved by [spectra.Resolve]:
	// claims reuse them instead of resolving the spectrum again.
	Optics *spectra.Optics
	// Conditions are the material's defaults: the library's, with the
	// material's own overrides. A claim's basis overrides them.
	Conditions Conditions
	// Figures, when not nil, are the figures [Compute] returned for
	// Spectrum under Conditions: claims on those conditions reuse them
	// instead of computing them again. They are used only when their own
	// Conditions equal Conditions.
	Figures *Figures
	// Angle is the measurement's angle of incidence as written, e.g. "8°".
	// When empty, the spectrum's "angle of incidence" or "angle" metadata
	// is used; when none is known the angle is not compared.
	Angle string
}

// judgeOne decides whether the spectrum in m supports claim c. It never
// panics on bad claims or data: those give [CannotCheck] with the reason.
func judgeOne(c Claim, m JudgeInput) Verdict {
	return newJudge(m).judge(c)
}

// JudgeAll decides, for each claim of cs in order, whether the spectrum in
// m supports it. It never panics on bad claims or data: those give
// [CannotCheck] with the reason. It computes the figures once for each
// distinct basis among the claims, and not at all for the material's own
// conditions when m.Figures holds them; it resolves the spectrum only when
// m.Optics is nil. The result is never nil.
func JudgeAll(cs []Claim, m JudgeInput) []Verdict {
	j := newJudge(m)
	out := make([]Verdict, len(cs))
	for i, c := range cs {
		out[i] = j.judge(c)
	}
	return out
}

// judge judges the claims of one material, keeping what it computed.
type judge struct {
	in     JudgeInput
	figs   map[Conditions]computed // by basis; Conditions is comparable
	optics map[float64]spectra.Optics
	// computes and resolves count the calls of Compute and
	// spectra.Resolve, for the tests.
	computes, resolves int
}

// computed is the result of Compute on one basis.
type computed struct {
	f   *Figures
	err error
}

func newJudge(m JudgeInput) *judge {
	j := &judge{in: m, figs: map[Conditions]computed{}, optics: map[float64]spectra.Optics{}}
	if m.Figures != nil && m.Figures.Conditions == m.Conditions {
		j.figs[m.Conditions] = computed{f: m.Figures}
	}
	return j
}

// figures returns the figures of the material's spectrum under c.
func (j *judge) figures(c Conditions) (*Figures, error) {
	if r, ok := j.figs[c]; ok {
		return r.f, r.err
	}
	j.computes++
	// Claims never name the figures over a weather series: another basis
	// is computed without it.
	cc := c
	cc.Weather = WeatherChoice{}
	f, err := Compute(j.in.Spectrum, j.resolved(c.ClosureTol), cc)
	j.figs[c] = computed{f, err}
	return f, err
}

// resolved returns the material's optics with closure tolerance tol.
func (j *judge) resolved(tol float64) spectra.Optics {
	if o, ok := j.optics[tol]; ok {
		return o
	}
	if o := j.in.Optics; o != nil && o.Closure.Tolerance == tol {
		j.optics[tol] = *o
		return *o
	}
	j.resolves++
	o := spectra.Resolve(j.in.Spectrum, tol)
	j.optics[tol] = o
	return o
}

func (j *judge) judge(c Claim) Verdict {
	m := j.in
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
	f, err := j.figures(cond)
	if err != nil {
		return cannot("The claim's basis cannot be computed: %v.", err)
	}
	fig, ok := f.Figure(c.Figure)
	if !ok {
		if s, known := figureSpecs[c.Figure]; known && s.transmittance && !m.Spectrum.Has(spectra.T) {
			return cannot("%s", noTransmittance)
		}
		return cannot("skysheet computes no figure %q%s.", c.Figure, suggest(c.Figure, f.Figures))
	}
	spec := specOf(fig)
	v.Label, v.Unit, v.Kind, v.Computed = fig.Label, fig.Unit, spec.kind, fig.Value
	ma := measuredAngle(m)
	v.Basis, v.Defaulted = basisWords(spec, cond, stated, c.Basis.AngleDeg, ma)
	if b, _ := spectra.ParseEmittanceBasis(c.Basis.Emittance); b != spectra.EmittanceUnstated && spec.emittance() {
		v.Basis += ", " + b.String() + " emittance (stated)"
	}
	if cond != m.Conditions && !spec.sameBasis(cond, m.Conditions) {
		df, err := j.figures(m.Conditions)
		if d, ok := df.figure(err, c.Figure); ok {
			v.DefaultBasisValue = d.Value
			v.BasisNote = fmt.Sprintf("On the default basis (%s) the spectra give %s.",
				basisShort(spec, d, m.Conditions), v.Format(float64(d.Value)))
		}
	}

	if spec.kind.componentNames() != nil {
		return judgeColor(c, v, fig, spec)
	}

	// The allowance: the claimed tolerance, or the expanded combined
	// uncertainty of the computed figure and the claim's rounding.
	if c.Tolerance > 0 {
		v.Allowed, v.AllowedFrom = Num(c.Tolerance), "claimed tolerance"
	} else {
		uFig, from := assumedUncertainty(spec.kind, c.Value, fig.Unit)
		uRound := roundingUncertainty(c.Value)
		v.Allowed = Num(coverageFactor * math.Hypot(uFig, uRound))
		v.AllowedFrom = fmt.Sprintf("expanded uncertainty (k = %g) of the figure's standard uncertainty %s (%s) and the claim's rounding %s",
			coverageFactor, v.Format(uFig), from, v.Format(uRound))
	}
	o := j.resolved(cond.ClosureTol) // for the pitfalls
	v.Pitfalls = pitfalls(c, fig, spec, f, o, float64(v.Allowed))
	if p, ok := j.emittancePitfall(c, fig, spec, f, cond); ok {
		v.Pitfalls = append(v.Pitfalls, p)
	}

	// A cooling verdict always says over what the emittance is held
	// constant beyond the data.
	held := ""
	if spec.cooling && !math.IsNaN(float64(f.CoolingTerms.HeldShare)) { // the data reach the exchange band
		held = heldClause(f)
	}
	say := func(s Status, format string, a ...any) Verdict {
		v.Status, v.Reason = s, strings.TrimSuffix(fmt.Sprintf(format, a...), ".")+held+"."
		return v
	}
	computed := float64(fig.Value)
	// A figure withheld because the data cover too little of its
	// weighting says so, as a claim of a figure with a value would; one
	// that says itself why it has no value, says that.
	if math.IsNaN(computed) && strings.HasPrefix(fig.Reason, withheldPrefix) {
		if why := coverageShort(spec, fig, f); why != "" {
			return say(CannotCheck, "%s", why)
		}
	}
	if math.IsNaN(computed) && fig.Reason != "" && fig.Reason != f.missingWords(fig) {
		return say(CannotCheck, "%s.", capitalize(fig.Reason))
	}
	if math.IsNaN(computed) {
		if band, _ := missingBand(spec, fig, f); band != "" {
			return cannot("The data do not reach the band %s at all.", band)
		}
		return cannot("%s.", capitalize(errNoRoot.Error()))
	}
	v.Difference = Num(computed - c.Value)
	if why := coverageShort(spec, fig, f); why != "" {
		return say(CannotCheck, "%s", why)
	}
	if spec.transmittance && !m.Spectrum.Has(spectra.T) {
		return cannot("%s", noTransmittance)
	}
	if c.Basis.AngleDeg > 0 && !math.IsNaN(ma) && math.Abs(c.Basis.AngleDeg-ma) > maxAngleDiffDeg {
		return say(CannotCheck, "The claim is for %g° incidence but the spectra were measured at %g°.", c.Basis.AngleDeg, ma)
	}
	if why := outOfRange(c.Value, spec, fig, cond, v); why != "" {
		return say(NotSupported, "%s", why)
	}

	diff := computed - c.Value
	within := math.Abs(diff) <= float64(v.Allowed)+edge
	allow := "±" + v.Format(float64(v.Allowed)) + " (claimed tolerance)"
	if c.Tolerance == 0 {
		allow = "±" + v.Format(float64(v.Allowed)) + " (expanded uncertainty; no tolerance was claimed)"
	}
	if within {
		return say(Supported, "The spectra give %s against the claimed %s (difference %s), within %s.",
			v.Format(computed), v.Format(c.Value), v.FormatSigned(diff), allow)
	}
	dir := "above"
	if diff < 0 {
		dir = "below"
	}
	return say(NotSupported, "The spectra give %s, %s %s the claimed %s, outside %s.",
		v.Format(computed), v.Format(math.Abs(diff)), dir, v.Format(c.Value), allow)
}

// noTransmittance is the reason a claim of a transmittance cannot be
// checked against a sample whose transmittance was not measured.
const noTransmittance = "No transmittance was measured, and the opaque assumption (T = 0) cannot confirm a claimed transmittance."

// judgeColor judges claim c of a multi-component figure fig (a colour or
// a chromaticity): the distance between the claimed and the computed
// values (a colour difference ΔE for L*a*b*) against the claimed tolerance
// or a default allowance. v holds what judge has filled in.
func judgeColor(c Claim, v Verdict, fig Figure, spec figureSpec) Verdict {
	cannot := func(format string, a ...any) Verdict {
		v.Status, v.Reason = CannotCheck, fmt.Sprintf(format, a...)
		return v
	}
	metric, err := metricOf(spec.kind, c.DeltaE)
	if err != nil { // Validate has checked it; kept for a Claim built in code
		return cannot("The claim is malformed: %v.", err)
	}
	v.Measure = metric.words
	u, from := defaultDeltaEUncertainty, "default for a colour difference, common practice, no source"
	if spec.kind == KindChromaticity {
		u, from = defaultXYUncertainty, "default for a chromaticity, common practice, no source"
	}
	if c.Tolerance > 0 {
		v.Allowed, v.AllowedFrom = Num(c.Tolerance), "claimed tolerance"
	} else {
		var uRound float64
		for _, x := range c.Values {
			uRound = math.Max(uRound, roundingUncertainty(x))
		}
		v.Allowed = Num(coverageFactor * math.Hypot(u, uRound))
		v.AllowedFrom = fmt.Sprintf("expanded uncertainty (k = %g) of the figure's standard uncertainty %s (%s) and the claim's rounding %s",
			coverageFactor, v.Format(u), from, v.Format(uRound))
	}
	got := make([]float64, len(fig.Components))
	for i, x := range fig.Components {
		got[i] = float64(x)
		if math.IsNaN(got[i]) {
			if fig.Reason != "" {
				return cannot("%s.", capitalize(fig.Reason))
			}
			return cannot("The spectra give no %s.", spec.kind)
		}
	}
	v.ComputedValues = fig.Components
	d := metric.dist(got, c.Values)
	v.Difference = Num(d)
	claimed, computed := claimedValuesText(spec.kind, c.Values), spec.kind.FormatValues(got)
	if why := colorOutOfRange(spec.kind, c.Values); why != "" {
		v.Status, v.Reason = NotSupported, fmt.Sprintf("The claim %s is %s, and the spectra give %s.", claimed, why, computed)
		return v
	}
	allow := "the allowed " + v.Format(float64(v.Allowed)) + " (claimed tolerance)"
	if c.Tolerance == 0 {
		allow = "the allowed " + v.Format(float64(v.Allowed)) + " (expanded uncertainty; no tolerance was claimed)"
	}
	if d <= float64(v.Allowed)+edge {
		v.Status, v.Reason = Supported, fmt.Sprintf("The spectra give %s against the claimed %s: %s %s, within %s.",
			computed, claimed, metric.name, v.Format(d), allow)
		return v
	}
	v.Status, v.Reason = NotSupported, fmt.Sprintf("The spectra give %s against the claimed %s: %s %s, outside %s.",
		computed, claimed, metric.name, v.Format(d), allow)
	return v
}

// colorOutOfRange returns why claimed values of kind k are no colour at
// all, or "": L* below 0 (less light than none), a chromaticity outside
// x, y ≥ 0, x + y ≤ 1 (CIE 1931: x + y + z = 1 with z ≥ 0).
func colorOutOfRange(k Kind, v []float64) string {
	switch {
	case k == KindLab && v[0] < 0:
		return "below L* = 0, the black of no light at all"
	case k == KindChromaticity && (v[0] < 0 || v[1] < 0 || v[0]+v[1] > 1):
		return "outside the chromaticity diagram (x, y ≥ 0 and x + y ≤ 1)"
	}
	return ""
}

// figure returns the figure key of f when f was computed without error.
func (f *Figures) figure(err error, key string) (Figure, bool) {
	if err != nil || f == nil {
		return Figure{}, false
	}
	return f.Figure(key)
}

// missingBand returns the band where figure fig of f, of spec, lacks the
// data it rests on, in words, and whether that band is in the infrared:
// for an SRI, the thermal band when the emittance is missing, else the
// solar band; for a cooling figure, the exchange band when no emittance
// reaches it, else the solar band when the absorbed sunlight is unknown;
// else the figure's own band. It returns "" for a cooling figure that has
// its data but no equilibrium.
func missingBand(spec figureSpec, fig Figure, f *Figures) (string, bool) {
	nan := func(key string) bool {
		x, ok := f.Figure(key)
		return ok && math.IsNaN(float64(x.Value))
	}
	c := f.Conditions
	switch {
	case spec.sri:
		if nan("thermal_emittance") {
			return bandText(c.ThermalBand, "µm"), true
		}
		return bandText(c.SolarBand, "nm"), false
	case spec.cooling:
		if nan("cooling_power_night_w_m2") {
			return bandText(c.ExchangeBand, "µm"), true
		}
		if spec.solar && nan(fig.Key) {
			return bandText(spectra.SolarRangeNM, "nm"), false
		}
		return "", false
	}
	return fig.BandText(), fig.BandUnit == "µm"
}

// Missing says why figure key of f has no value, for a reader: "no
// infrared data over 2.5–25 µm", "no solar data over 280–2500 nm", or why
// no equilibrium was found; "" when the figure has a value or f has no
// such figure.
func (f *Figures) Missing(key string) string {
	fig, ok := f.Figure(key)
	if !ok || !math.IsNaN(float64(fig.Value)) {
		return ""
	}
	if fig.Reason != "" {
		return fig.Reason
	}
	return f.missingWords(fig)
}

// missingWords says which data figure fig of f lacks, from its band.
func (f *Figures) missingWords(fig Figure) string {
	band, infrared := missingBand(specOf(fig), fig, f)
	switch {
	case band == "":
		return errNoRoot.Error()
	case infrared:
		return "no infrared data over " + band
	}
	return "no solar data over " + band
}

func capitalize(s string) string {
	if s == "" {
		return s
	}
	r, n := utf8.DecodeRuneInString(s)
	return string(unicode.ToUpper(r)) + s[n:]
}

// assumedUncertainty returns the standard uncertainty assumed for a figure
// of kind k when no tolerance is claimed, and where it comes from.
func assumedUncertainty(k Kind, claimed float64, unit string) (float64, string) {
	floor := 0.0
	switch k {
	case KindFraction:
		return defaultUncertainty, "default for fractions, common practice, no source"
	case KindIndex:
		return defaultIndexUncertainty, "default for an index such as the SRI, common practice, no source"
	case KindPower:
		floor = defaultPowerFloorWm2
	case KindTemperatureDifference:
		floor = defaultDeltaFloorK
	}
	u := defaultRelUncertainty * math.Abs(claimed)
	if u >= floor {
		return u, fmt.Sprintf("default %g %% of the claim, common practice, no source", 100*defaultRelUncertainty)
	}
	return floor, fmt.Sprintf("default floor %s, as %g %% of the claim is less, common practice, no source",
		k.Format(floor, unit), 100*defaultRelUncertainty)
}

// coverageShort returns why the data cover too little of what figure fig
// (of f) rests on for a claim of it to be checked, or "".
func coverageShort(spec figureSpec, fig Figure, f *Figures) string {
	p, short := shortOf(coverageParts(spec, fig, f), minCoverage)
	if !short {
		return ""
	}
	return fmt.Sprintf("The data cover only %.1f %% of %s%s (at least %g %% is needed).", 100*p.cov, p.what, p.rest, 100*minCoverage)
}

// coolingCheckBand returns the part of c's exchange band that the data
// must cover for a cooling claim: CoolingCheckLoUM–CoolingCheckHiUM within
// it, or the whole band when they do not overlap.
func coolingCheckBand(c Conditions) spectra.Interval {
	lo, hi := math.Max(umToNM(coolingCheckLoUM), c.ExchangeBand.Lo), math.Min(umToNM(coolingCheckHiUM), c.ExchangeBand.Hi)
	if !(hi > lo) {
		return c.ExchangeBand
	}
	return spectra.Interval{Lo: lo, Hi: hi}
}

// measuredShare returns the share of the blackbody power at the air
// temperature over band that falls where f's emittance is measured, not
// held constant: 1 − (power over the held bands within it) / (power over
// it), with the blackbody fractions of Planck's law.
func measuredShare(f *Figures, band spectra.Interval) float64 {
	t := f.Conditions.AmbientK
	total := blackbodyFraction(band.Lo, band.Hi, t)
	if !(total > 0) {
		return 0
	}
	var held float64
	for _, h := range f.CoolingTerms.HeldBands {
		if a, b := math.Max(h.Lo, band.Lo), math.Min(h.Hi, band.Hi); b > a {
			held += blackbodyFraction(a, b, t)
		}
	}
	return math.Max(0, math.Min(1, 1-held/total))
}

// heldClause says, as the end of a sentence, where the emittance of f is
// held constant beyond the data and what share of the exchange band's
// blackbody power that part carries.
func heldClause(f *Figures) string {
	ct := f.CoolingTerms
	if len(ct.HeldBands) == 0 {
		return ", with the emittance measured over the whole exchange band"
	}
	return fmt.Sprintf(", with the emittance held constant over %s (%.1f %% of the exchange band's blackbody power at %g K)",
		heldBands(ct.HeldBands), 100*float64(ct.HeldShare), f.Conditions.AmbientK)
}

// heldBands lists held bands in µm: "25–100 µm" or "20–21 and 25–100 µm".
func heldBands(bs []spectra.Interval) string {
	parts := make([]string, len(bs))
	for i, b := range bs {
		parts[i] = fmtHundredths(b.Lo/1000) + "–" + fmtHundredths(b.Hi/1000)
	}
	s := parts[len(parts)-1]
	if len(parts) > 1 {
		s = strings.Join(parts[:len(parts)-1], ", ") + " and " + s
	}
	return s + " µm"
}

// alphaPerIndex is the solar absorptance that one SRI unit stands for:
// the standard black and white differ by 0.75 in absorptance over their
// 100 index units (ASTM E1980 definition; the index is close to linear in
// absorptance).
const alphaPerIndex = (blackAlpha - whiteAlpha) / 100

// outOfRange returns why claim value x lies outside what a figure of its
// kind can be, whatever the spectra, or "".
func outOfRange(x float64, spec figureSpec, fig Figure, c Conditions, v Verdict) string {
	claim := strconv.FormatFloat(x, 'g', -1, 64)
	got := v.Format(float64(fig.Value))
	switch spec.kind {
	case KindFraction:
		if math.Abs(x) <= maxFraction {
			return ""
		}
		if looksLikePercent(x, fig, spec) {
			return fmt.Sprintf("The claim %s looks like a percentage: the figure is a fraction, and %g %% is %s against the computed %s.",
				claim, x, formatValue(x/100, ""), got)
		}
		return fmt.Sprintf("The claim %s is out of range for a fraction (at most %g), and the spectra give %s.", claim, maxFraction, got)
	case KindIndex:
		if !(spec.hc > 0) {
			return ""
		}
		// The extremes of the index at this wind: no absorption with full
		// emission, and full absorption with none (ASTM E1980 balance).
		top, bottom := SolarReflectanceIndex(0, 1, spec.hc), SolarReflectanceIndex(1, 0, spec.hc)
		switch {
		case x > top:
			return fmt.Sprintf("The claim %s is above the largest SRI any surface reaches at %s wind (%s, for solar absorptance 0 and thermal emittance 1), and the spectra give %s.",
				claim, windName(spec.hc), v.Format(top), got)
		case x < bottom:
			return fmt.Sprintf("The claim %s is below the least SRI any surface reaches at %s wind (%s, for solar absorptance 1 and thermal emittance 0), and the spectra give %s.",
				claim, windName(spec.hc), v.Format(bottom), got)
		}
	case KindPower:
		// P_net(T_amb) = P_rad − P_atm − P_sun, with 0 ≤ P_rad, P_atm ≤ σT⁴
		// (Stefan–Boltzmann law) and 0 ≤ P_sun ≤ I.
		bb := spectra.StefanBoltzmann * math.Pow(c.AmbientK, 4)
		least := -bb
		if spec.solar {
			least -= c.IrradianceWm2
		}
		switch {
		case x > bb:
			return fmt.Sprintf("The claim %s is more than a blackbody radiates at the air temperature of %g K (σT⁴ = %s), and the spectra give %s.",
				v.Format(x), c.AmbientK, v.Format(bb), got)
		case x < least:
			return fmt.Sprintf("The claim %s is below the least any surface can give (%s, with no emission, a black sky and all the sunlight absorbed), and the spectra give %s.",
				v.Format(x), v.Format(least), got)
		}
	case KindTemperatureDifference:
		if x >= c.AmbientK {
			return fmt.Sprintf("The claim %s would put the surface at or below absolute zero, the air being at %g K, and the spectra give %s.",
				v.Format(x), c.AmbientK, got)
		}
	}
	return ""
}

// percentNear is how close a claim divided by 100 must come to the computed
// fraction to be taken for a percentage (common practice, no source).
const percentNear = 0.05

// looksLikePercent reports whether a claim of a fraction figure is above
// MaxFraction and, read as a percentage, a fraction near the computed
// value (or any fraction when none was computed).
func looksLikePercent(v float64, fig Figure, spec figureSpec) bool {
	if spec.kind != KindFraction || !(math.Abs(v) > maxFraction && math.Abs(v) <= 100*maxFraction) {
		return false
	}
	x := float64(fig.Value)
	return math.IsNaN(x) || math.Abs(v/100-x) <= percentNear
}

// pitfalls returns the pitfalls found behind claim c of figure fig, one of
// the figures f computed from the optics o.
func pitfalls(c Claim, fig Figure, spec figureSpec, f *Figures, o spectra.Optics, allowed float64) []Pitfall {
	out := []Pitfall{}
	add := func(code PitfallCode, format string, a ...any) {
		out = append(out, Pitfall{Code: code, Text: fmt.Sprintf(format, a...)})
	}
	cond := f.Conditions
	if looksLikePercent(c.Value, fig, spec) {
		add(pitfallPercent, "The claim %s is above 1 for a fraction: it looks like a percentage (%s).",
			strconv.FormatFloat(c.Value, 'g', -1, 64), formatValue(c.Value/100, ""))
	}
	if spec.solar {
		x, from := o.R, cond.SolarBand.Lo
		if spec.transmittance {
			x = o.T
		}
		if fig.BandUnit == "nm" {
			from = fig.Band.Lo
		}
		if lo, _ := x.Range(); lo > solarStartNM && lo > from {
			add(pitfallSolarLateStart, "The solar data start at %s nm, after %g nm: the ultraviolet from %g to %s nm is not measured.",
				fmtHundredths(lo), solarStartNM, from, fmtHundredths(lo))
		}
	}
	if spec.thermal || spec.window {
		band := cond.ThermalBand
		if spec.window {
			band = cond.WindowBand
		}
		if _, hi := o.A.Range(); hi < band.Hi {
			add(pitfallInfraredShort, "The infrared data stop at %s µm, before the top of the %s band.",
				fmtHundredths(hi/1000), bandText(band, "µm"))
		}
	}
	if ct := f.CoolingTerms; spec.cooling && float64(ct.HeldShare) > maxHeldShare {
		add(pitfallHeldLarge, "The emittance is held constant beyond the data over %s, which carries %.1f %% of the exchange band's blackbody power at %g K (more than %g %%): the figure rests on that assumption.",
			heldBands(ct.HeldBands), 100*float64(ct.HeldShare), cond.AmbientK, 100*maxHeldShare)
	}
	if spec.sri && f.SRI.Translucent {
		add(pitfallSRITranslucent, "The sample transmits %s of sunlight (above 0.01): the SRI of ASTM E1980 is defined for opaque surfaces.",
			formatValue(float64(f.SolarTransmittance), ""))
	}
	cl := o.Closure
	worst, what := cl.Excess, fmt.Sprintf("R+T exceeds 1 by %s at %s nm", formatValue(cl.Excess, ""), fmtHundredths(cl.ExcessNM))
	if cl.Checked && cl.Residual > worst {
		worst, what = cl.Residual, fmt.Sprintf("|R+T+A−1| reaches %s at %s nm", formatValue(cl.Residual, ""), fmtHundredths(cl.ResidualNM))
	}
	if -cl.Min > worst {
		worst, what = -cl.Min, fmt.Sprintf("%s is %s at %s nm", cl.MinOf, formatValue(cl.Min, ""), fmtHundredths(cl.MinNM))
	}
	// The allowance as a fraction: as it is for a fraction, through the
	// absorptance an index unit stands for, else relative to the claim.
	limit, how := allowed, ""
	switch {
	case spec.kind == KindFraction || spec.kind == kindUnknown:
	case spec.kind == KindIndex:
		limit = allowed * alphaPerIndex
		how = fmt.Sprintf(" (±%s index units at %g of absorptance per unit)", KindIndex.Format(allowed, ""), alphaPerIndex)
	case c.Value != 0:
		limit = allowed / math.Abs(c.Value)
		how = " (relative to the claimed value)"
	}
	if worst > limit+edge {
		add(pitfallClosure, "The data break closure by more than the claim's ±%s%s: %s.", formatValue(limit, ""), how, what)
	}
	return out
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

// basisWords describes the basis of a figure of spec s: the conditions it
// rests on, each marked stated or default, and the angle of incidence
// when the claim states one. It returns the defaulted keys too.
func basisWords(s figureSpec, c Conditions, stated map[string]bool, claimAngle, measured float64) (string, []string) {
	words, defaulted := s.basisOf(c, stated, true)
	switch {
	case claimAngle > 0 && math.IsNaN(measured):
		words += fmt.Sprintf(", angle of incidence %g° (stated; the data's angle is not recorded)", claimAngle)
	case claimAngle > 0:
		words += fmt.Sprintf(", angle of incidence %g° (stated; measured at %g°)", claimAngle, measured)
	}
	return words, defaulted
}

// basisShort describes the conditions c that figure d of spec s rests on,
// without marks.
func basisShort(s figureSpec, d Figure, c Conditions) string {
	switch {
	case s.kind == KindFraction && s.solar:
		return bandText(c.SolarBand, "nm") + ", " + d.Weighting
	case s.thermal && !s.sri, s.window:
		return d.BandText() + ", " + d.Weighting
	}
	w, _ := s.basisOf(c, nil, false)
	return w
}

// emittance reports whether figures of the spec rest on the emittance.
func (s figureSpec) emittance() bool { return s.thermal || s.window || s.cooling || s.sri }

// illustrativeIndex is the refractive index used to show what a
// near-normal figure would be on a hemispherical basis when none is stated:
// a typical polymer or glass (common practice, no source).
const illustrativeIndex = 1.5

// emittancePitfall names the pitfall emittance-basis when claim c states an
// emittance basis other than the one figure fig of f rests on, with the
// figure on both bases where it can be had: the other value by the Fresnel
// ratio for a smooth dielectric of the stated refractive index (or 1.5,
// said to be illustrative), recomputed for the cooling figures and the SRI.
func (j *judge) emittancePitfall(c Claim, fig Figure, spec figureSpec, f *Figures, cond Conditions) (Pitfall, bool) {
	claimed, _ := spectra.ParseEmittanceBasis(c.Basis.Emittance)
	if claimed == spectra.EmittanceUnstated || !spec.emittance() {
		return Pitfall{}, false
	}
	eb := f.EmittanceBasis
	has := eb.Figures
	if spec.thermal && !spec.sri || spec.window {
		has = eb.Data // the band figures are never converted
	}
	if has == claimed || has == spectra.EmittanceUnstated {
		return Pitfall{}, false
	}
	n, nWords := illustrativeIndex, fmt.Sprintf("n %g, illustrative: state refractive_index for the material's own", illustrativeIndex)
	if cond.RefractiveIndex.On {
		n, nWords = cond.RefractiveIndex.V, "n "+fmtG(cond.RefractiveIndex.V)+", stated"
	}
	ratio := hemisphericalRatio(n)
	val := float64(fig.Value)
	other := math.NaN()
	switch {
	case spec.thermal && !spec.sri || spec.window:
		if claimed == spectra.EmittanceHemispherical {
			other = val * ratio
		} else {
			other = val / ratio
		}
	case eb.Data == spectra.EmittanceNearNormal:
		// Cooling figures and SRI: recomputed with the conversion on (the
		// claim is hemispherical) or off (the claim is near-normal).
		alt := cond
		alt.RefractiveIndex = Optional{}
		if claimed == spectra.EmittanceHemispherical {
			alt.RefractiveIndex = On(n)
		}
		if af, err := j.figures(alt); err == nil {
			if x, ok := af.Figure(fig.Key); ok {
				other = float64(x.Value)
			}
		}
	}
	k := fig.Kind()
	text := fmt.Sprintf("The claim is for %s emittance but the figure rests on %s emittance (%s): %s.",
		claimed, has, eb.From, k.Format(val, fig.Unit))
	if !math.IsNaN(other) && !math.IsNaN(val) {
		text = fmt.Sprintf("The claim is for %s emittance but the figure rests on %s emittance (%s): %s %s, about %s %s as a smooth dielectric (Fresnel, %s).",
			claimed, has, eb.From, k.Format(val, fig.Unit), has, k.Format(other, fig.Unit), claimed, nWords)
	}
	return Pitfall{Code: pitfallEmittanceBasis, Text: text}, true
}
