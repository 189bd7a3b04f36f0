package datasheet

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"
)

// Kind is what a figure's number is: it decides how a claim of the figure
// is read, which values it may take, the allowance when none is claimed
// and how its numbers are written.
type Kind int

// The kinds of figures. The zero Kind is unknown (a figure the tool does
// not compute).
const (
	kindUnknown               Kind = iota
	KindFraction                   // 0..1: reflectances, transmittances, absorptances, emittances
	KindIndex                      // the Solar Reflectance Index: 0 standard black, 100 standard white
	KindPower                      // a power per area, W/m²
	KindTemperatureDifference      // a temperature difference, K
	kindQuantity                   // any other figure with a unit
	// KindLab is a colour in CIE 1976 L*a*b*, three components; claims
	// of it are judged by a colour difference ΔE.
	KindLab
	// KindChromaticity is a CIE 1931 chromaticity x, y, two components;
	// claims of it are judged by their distance in x, y.
	KindChromaticity
)

var kindWords = [...]string{"", "fraction", "index", "power", "temperature difference", "quantity", "lab colour", "chromaticity"}

// String returns the kind in words, e.g. "fraction" ("" when unknown).
func (k Kind) String() string {
	if k >= 0 && int(k) < len(kindWords) {
		return kindWords[k]
	}
	return "Kind(" + strconv.Itoa(int(k)) + ")"
}

// MarshalText writes the kind in words.
func (k Kind) MarshalText() ([]byte, error) {
	if k < 0 || int(k) >= len(kindWords) {
		return nil, fmt.Errorf("datasheet: unknown kind %d", int(k))
	}
	return []byte(k.String()), nil
}

// UnmarshalText reads a kind written by MarshalText.
func (k *Kind) UnmarshalText(b []byte) error {
	for i, w := range kindWords {
		if string(b) == w {
			*k = Kind(i)
			return nil
		}
	}
	return fmt.Errorf("datasheet: unknown kind %q: want one of %q", b, kindWords[1:])
}

// Format writes x as verdicts write numbers of a figure of kind k and the
// given unit: four decimals for a fraction or a chromaticity coordinate,
// two for an L*a*b* coordinate or colour difference, one decimal
// otherwise, followed by the unit when there is one; "n/a" for NaN.
func (k Kind) Format(x float64, unit string) string {
	if math.IsNaN(x) {
		return "n/a"
	}
	switch {
	case k == KindFraction || k == KindChromaticity || k == kindUnknown && unit == "":
		return strconv.FormatFloat(x, 'f', 4, 64)
	case k == KindLab:
		return strconv.FormatFloat(x, 'f', 2, 64)
	}
	s := strconv.FormatFloat(x, 'f', 1, 64)
	if unit != "" {
		s += " " + unit
	}
	return s
}

// Words writes x as a reader reads a figure of kind k: a temperature
// difference (the air minus the surface, positive when the surface is
// cooler) as where the surface settles, "settles 1.6 K above the air" or
// "settles 4.2 K below the air" (one decimal); any other kind as
// [Kind.Format] does.
func (k Kind) Words(x float64, unit string) string {
	if k != KindTemperatureDifference || math.IsNaN(x) {
		return k.Format(x, unit)
	}
	d := strconv.FormatFloat(math.Abs(x), 'f', 1, 64)
	switch {
	case d == "0.0":
		return "settles at the air temperature"
	case x < 0:
		return "settles " + d + " " + unit + " above the air"
	}
	return "settles " + d + " " + unit + " below the air"
}

// FormatSigned is [Kind.Format] with a sign ("+" or "−"), none when x
// shows as zero or is NaN.
func (k Kind) FormatSigned(x float64, unit string) string {
	s := k.Format(math.Abs(x), unit)
	switch {
	case math.IsNaN(x), s == k.Format(0, unit):
	case x < 0:
		s = "−" + s
	default:
		s = "+" + s
	}
	return s
}

// allConds are every condition a figure may rest on, in the order a
// verdict's basis names them, for a figure the table below does not know.
var allConds = []condition{condSolarBand, condSolarSpectrum, condThermalBand, condWindowBand, condTemperature,
	condSky, condDewPoint, condHour, condPressure, condAmbient, condH, condIrradiance, condExchangeBand, condRefractive}

// figureSpec is how claims of one figure are judged.
type figureSpec struct {
	kind Kind
	// conds are the conditions the figure rests on, in the order a
	// verdict's basis names them.
	conds []condition
	// What the figure is computed from, for the coverage rule and the
	// pitfalls: solar data (R, or T for a transmittance), infrared
	// emittance over the thermal or window band, the cooling integrals.
	solar, transmittance, thermal, window, cooling, sri bool
	// color: a colour figure, from the data over 380–780 nm under D65.
	color bool
	// hc is the convection coefficient of an SRI figure (ASTM E1980
	// wind class), W m⁻² K⁻¹.
	hc float64
}

// The conditions behind the kinds of figures.
var (
	solarConds   = []condition{condSolarBand, condSolarSpectrum}
	sriConds     = []condition{condSolarBand, condSolarSpectrum, condThermalBand, condTemperature, condRefractive}
	dayPower     = []condition{condSky, condDewPoint, condHour, condPressure, condAmbient, condIrradiance, condSolarSpectrum, condExchangeBand, condRefractive}
	nightPower   = []condition{condSky, condDewPoint, condHour, condPressure, condAmbient, condExchangeBand, condRefractive}
	dayBalance   = []condition{condSky, condDewPoint, condHour, condPressure, condAmbient, condH, condIrradiance, condSolarSpectrum, condExchangeBand, condRefractive}
	nightBalance = []condition{condSky, condDewPoint, condHour, condPressure, condAmbient, condH, condExchangeBand, condRefractive}
)

// figureSpecs is the one table of how each figure that [Compute] returns is
// judged. The cooling power at T_s = T_amb does not depend on h
// (docs/cooling.md), so only the equilibria list it; the absorbed sunlight
// is over the whole ASTM G173-03 range, so no cooling figure lists the
// solar band. TestFigureSpecs checks
// that every computed figure is here, with a kind that fits its unit.
var figureSpecs = map[string]figureSpec{
	"solar_reflectance":         {kind: KindFraction, conds: solarConds, solar: true},
	"solar_transmittance":       {kind: KindFraction, conds: solarConds, solar: true, transmittance: true},
	"solar_absorptance":         {kind: KindFraction, conds: solarConds, solar: true},
	"uv_reflectance":            {kind: KindFraction, conds: solarConds, solar: true},
	"visible_reflectance":       {kind: KindFraction, conds: solarConds, solar: true},
	"nir_reflectance":           {kind: KindFraction, conds: solarConds, solar: true},
	"thermal_emittance":         {kind: KindFraction, conds: []condition{condThermalBand, condTemperature}, thermal: true},
	"window_emittance":          {kind: KindFraction, conds: []condition{condWindowBand, condTemperature}, window: true},
	"cooling_power_w_m2":        {kind: KindPower, conds: dayPower, solar: true, cooling: true},
	"cooling_power_night_w_m2":  {kind: KindPower, conds: nightPower, cooling: true},
	"equilibrium_delta_k":       {kind: KindTemperatureDifference, conds: dayBalance, solar: true, cooling: true},
	"equilibrium_delta_night_k": {kind: KindTemperatureDifference, conds: nightBalance, cooling: true},
	"sri_low":                   {kind: KindIndex, conds: sriConds, solar: true, thermal: true, sri: true, hc: WindLow},
	"sri_medium":                {kind: KindIndex, conds: sriConds, solar: true, thermal: true, sri: true, hc: WindMedium},
	"sri_high":                  {kind: KindIndex, conds: sriConds, solar: true, thermal: true, sri: true, hc: WindHigh},
	"color_lab":                 {kind: KindLab, color: true},
	"color_xy":                  {kind: KindChromaticity, color: true},
	"luminous_reflectance":      {kind: KindFraction, color: true},
	"transmitted_color_lab":     {kind: KindLab, color: true, transmittance: true},
	"transmitted_color_xy":      {kind: KindChromaticity, color: true, transmittance: true},
	"luminous_transmittance":    {kind: KindFraction, color: true, transmittance: true},
}

// FigureKeys returns the keys of every figure [Compute] gives, sorted: the
// figures a claim may name.
func FigureKeys() []string {
	keys := make([]string, 0, len(figureSpecs))
	for k := range figureSpecs {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	return keys
}

// specOf returns how claims of figure f are judged: from the table, or,
// for a figure it lacks, from the figure's unit and band (a fraction over
// a band in nm rests on the solar conditions; anything else on all of
// them).
func specOf(f Figure) figureSpec {
	if s, ok := figureSpecs[f.Key]; ok {
		return s
	}
	s := figureSpec{kind: kindOfUnit(f.Unit), conds: allConds}
	if s.kind == KindFraction && f.BandUnit == "nm" {
		s.conds, s.solar = solarConds, true
	}
	return s
}

// kindOfUnit is the kind a figure's unit implies.
func kindOfUnit(unit string) Kind {
	switch unit {
	case "":
		return KindFraction
	case "W/m²":
		return KindPower
	case "K":
		return KindTemperatureDifference
	}
	return kindQuantity
}

// basisOf describes the conditions c that a figure of spec s rests on,
// each part marked stated or default (marks false: no marks), and returns
// the defaulted keys.
func (s figureSpec) basisOf(c Conditions, stated map[string]bool, marks bool) (string, []string) {
	var parts []string
	defaulted := []string{}
	for _, k := range s.conds {
		w := k.words(c)
		if w == "" {
			continue
		}
		switch {
		case !marks:
		case stated[k.key()]:
			w += " (stated)"
		default:
			w += " (default)"
			defaulted = append(defaulted, k.key())
		}
		parts = append(parts, w)
	}
	if s.color {
		parts = append(parts, colorWeighting+", 1 nm summation over 380–780 nm")
	}
	if s.sri {
		w := fmt.Sprintf("ASTM E1980 %s wind, h_c %g W m⁻² K⁻¹", windName(s.hc), s.hc)
		if marks {
			w += " (set by the figure)"
		}
		parts = append(parts, w)
	}
	return strings.Join(parts, ", "), defaulted
}

// windName names an ASTM E1980 wind class.
func windName(hc float64) string {
	switch hc {
	case WindLow:
		return "low"
	case WindMedium:
		return "medium"
	case WindHigh:
		return "high"
	}
	return "custom"
}

// sameBasis reports whether a and b agree on every condition a figure of
// spec s rests on.
func (s figureSpec) sameBasis(a, b Conditions) bool {
	for _, k := range s.conds {
		if !k.same(a, b) {
			return false
		}
	}
	return true
}
