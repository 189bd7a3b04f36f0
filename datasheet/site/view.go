package site

import (
	"encoding/json"
	"fmt"
	"html/template"
	"math"
	"sort"
	"strconv"
	"strings"

	"skysheet/datasheet"
	"skysheet/datasheet/library"
)

// page is the data every template gets.
type page struct {
	Site      siteInfo
	Root      string // relative path from the page to the site root ("" or "../../")
	Title     string
	Kind      string // index, datasheet, listing, compare, review
	Canonical string
	I         *indexView
	M         *materialView
	L         *listingView
	C         *compareView
	R         *reviewView
}

type siteInfo struct {
	Title, Description, Lab, Publisher, Version, SiteAddress string
}

// link is a named relative link; Href is complete for the page it is on.
type link struct {
	Name, Href, Note string
	Count            int
}

type pair struct{ K, V string }

type keyFig struct{ Label, Value, Unit, Note string }

type figRow struct {
	Key, Label, Value, Unc, Band, Weighting, Coverage string
	Claims                                            []claimRef // claims of this figure
}

type spectrumRow struct{ File, Role, Instrument, Notes string }

type closureView struct {
	OK       bool
	Summary  string
	Problems []string
}

type chartView struct {
	ID, Title, Caption string
	SVG                template.HTML
}

type materialView struct {
	Slug, Title, Maker, Lab, ProductCode, Summary, License string
	Category                                               link
	Tags                                                   []link
	Key                                                    []keyFig
	Figures                                                []figRow
	HasUnc                                                 bool
	Claims                                                 []claimView
	ClaimCounts                                            string // "3 claims: 1 supported, …"
	Body                                                   template.HTML
	Measured                                               []pair
	Spectra                                                []spectrumRow
	Inputs                                                 []library.Input
	Conditions                                             []pair
	Overridden                                             []string
	Assumptions                                            []string
	Closure                                                closureView
	Charts                                                 []chartView
	Downloads                                              []link
	Cautions                                               []string
	Comparisons                                            []link
}

// column is a column of a material table.
type column struct {
	Key, Label, Unit string
	Numeric          bool
}

type cell struct{ Key, Text, Value string }

type row struct {
	N                        int
	Slug, Href, Title, Maker string
	Category                 link
	Cells                    []cell
}

type tableView struct {
	ID      string
	Columns []column
	Rows    []row
}

type indexView struct {
	Count       int
	Claims      datasheet.VerdictCounts // over the whole library
	ClaimWords  string                  // the counts in words
	Table       tableView
	Scatter     *chartView
	Categories  []link
	Tags        []link
	Comparisons []link
}

type listingView struct {
	Kind, Name string
	Table      tableView
}

type compareCol struct{ Name, Href, Note, Color string }

type compareRow struct {
	Label string
	Cells []string
}

type compareView struct {
	Title, Summary string
	Body           template.HTML
	Charts         []chartView
	Columns        []compareCol
	Rows           []compareRow
	Cautions       []string
}

// Cautions are printed on every datasheet and comparison.
var Cautions = []string{
	"Computed figures are not a certification: they restate the measured spectra under the stated conditions and standards.",
	"Real performance depends on site, weather, soiling and ageing; a fresh laboratory sample is the best case.",
	"Building, roofing and energy decisions defer to local codes and licensed professionals.",
}

// numeric table columns of the index and listings.
var tableFigures = []column{
	{Key: "solar_reflectance", Label: "Solar reflectance", Numeric: true},
	{Key: "thermal_emittance", Label: "Thermal emittance", Numeric: true},
	{Key: "window_emittance", Label: "Window emittance", Numeric: true},
	{Key: "cooling_power_w_m2", Label: "Net cooling, day", Unit: "W/m²", Numeric: true},
}

// figureValue returns a headline figure of f by JSON key.
func figureValue(f *datasheet.Figures, key string) (datasheet.Num, bool) {
	if f == nil {
		return datasheet.Num(math.NaN()), false
	}
	switch key {
	case "solar_reflectance":
		return f.SolarReflectance, true
	case "solar_transmittance":
		return f.SolarTransmittance, true
	case "solar_absorptance":
		return f.SolarAbsorptance, true
	case "thermal_emittance":
		return f.ThermalEmittance, true
	case "window_emittance":
		return f.WindowEmittance, true
	case "cooling_power_w_m2":
		return f.CoolingPowerWm2, true
	case "cooling_power_night_w_m2":
		return f.CoolingPowerNightWm2, true
	}
	if x, ok := f.Figure(key); ok {
		return x.Value, true
	}
	return datasheet.Num(math.NaN()), false
}

func isNaN(v datasheet.Num) bool { return math.IsNaN(float64(v)) || math.IsInf(float64(v), 0) }

// fmtFrac formats a fraction with three decimals; "—" when unknown.
func fmtFrac(v datasheet.Num) string {
	if isNaN(v) {
		return "—"
	}
	return strconv.FormatFloat(float64(v), 'f', 3, 64)
}

// fmtValue formats a figure's value in its unit: fractions with three
// decimals, indices and physical quantities with one.
func fmtValue(key string, v datasheet.Num, unit string) string {
	if isNaN(v) {
		return "—"
	}
	if unit == "" && !notFraction(key) {
		return fmtFrac(v)
	}
	s := strconv.FormatFloat(float64(v), 'f', 1, 64)
	if unit != "" {
		s += " " + unit
	}
	return s
}

// notFraction reports whether the figure key names a quantity that is not
// a fraction (an index, a power, a temperature difference).
func notFraction(key string) bool {
	for _, p := range []string{"sri", "cooling_", "equilibrium_", "held_"} {
		if strings.HasPrefix(key, p) {
			return true
		}
	}
	return false
}

// fmtUnc formats a figure's standard uncertainty as "±indep. / ±together"
// (errors independent between wavelengths, errors moving together), two
// significant digits, marked "partial" with the share of the figure's
// sensitivity that stated uncertainties reach when below 100 %.
func fmtUnc(u *datasheet.Uncertainty) string {
	if u == nil || isNaN(u.Uncorrelated) || isNaN(u.Correlated) {
		return ""
	}
	g := func(x datasheet.Num) string { return "±" + strconv.FormatFloat(float64(x), 'g', 2, 64) }
	s := g(u.Uncorrelated) + " / " + g(u.Correlated)
	if !isNaN(u.Reach) && float64(u.Reach) < 0.995 {
		s += " (partial, " + strconv.FormatFloat(100*float64(u.Reach), 'f', 0, 64) + " %)"
	}
	return s
}

func fmtPercent(v datasheet.Num) string {
	if isNaN(v) {
		return "—"
	}
	return strconv.FormatFloat(100*float64(v), 'f', 1, 64) + " %"
}

// sortValue is the data-value of a numeric cell: shortest exact form, ""
// when unknown.
func sortValue(v datasheet.Num) string {
	if isNaN(v) {
		return ""
	}
	return strconv.FormatFloat(float64(v), 'g', -1, 64)
}

func fmtG(x float64) string { return strconv.FormatFloat(x, 'g', -1, 64) }

func fmtBand(b [2]float64, unit string) string {
	if unit == "" {
		return ""
	}
	return fmtG(b[0]) + "–" + fmtG(b[1]) + " " + unit
}

// spectrumName describes a solar spectrum condition.
func spectrumName(s string) string {
	switch s {
	case "global":
		return "ASTM G173-03 global tilt"
	case "direct":
		return "ASTM G173-03 direct + circumsolar"
	}
	return s
}

// conditionPairs lists conditions for people: the known ones with labels,
// then any other field in JSON order so that new conditions show up.
func conditionPairs(c datasheet.Conditions) []pair {
	ps := []pair{
		{"Solar band", fmtBand(c.SolarBandNM, "nm")},
		{"Solar spectrum", spectrumName(c.SolarSpectrum)},
		{"Thermal band", fmtBand(c.ThermalBandUM, "µm")},
		{"Window band", fmtBand(c.WindowBandUM, "µm")},
		{"Blackbody temperature", fmtG(c.TemperatureK) + " K"},
		{"Closure tolerance", fmtG(c.ClosureTol)},
		{"Air temperature", fmtG(c.AmbientK) + " K"},
		{"Dew point", fmtG(c.DewPointC) + " °C"},
		{"Solar irradiance", fmtG(c.IrradianceWm2) + " W/m²"},
		{"Heat-transfer coefficient h", fmtG(c.HWm2K) + " W m⁻² K⁻¹"},
		{"Exchange band", fmtBand(c.ExchangeBandUM, "µm")},
		{"Sky", c.Sky},
	}
	known := map[string]bool{"solar_band_nm": true, "solar_spectrum": true, "thermal_band_um": true,
		"window_band_um": true, "temperature_k": true, "closure_tolerance": true, "ambient_k": true,
		"dew_point_c": true, "irradiance_w_m2": true, "h_w_m2k": true, "exchange_band_um": true, "sky": true}
	data, err := json.Marshal(c)
	if err != nil {
		return ps
	}
	var m map[string]json.RawMessage
	if json.Unmarshal(data, &m) != nil {
		return ps
	}
	keys := make([]string, 0, len(m))
	for k := range m {
		if !known[k] {
			keys = append(keys, k)
		}
	}
	sort.Strings(keys)
	for _, k := range keys {
		v := strings.Trim(string(m[k]), `"`)
		if v == "" || v == "null" {
			continue
		}
		ps = append(ps, pair{conditionLabel(k), strings.ReplaceAll(v, ",", ", ")})
	}
	return ps
}

// conditionLabel turns a condition key into words: "ambient_k" → "Ambient (K)".
func conditionLabel(k string) string {
	units := map[string]string{"k": "K", "c": "°C", "um": "µm", "nm": "nm", "w_m2": "W/m²", "w_m2k": "W m⁻² K⁻¹"}
	for suf, u := range units {
		if strings.HasSuffix(k, "_"+suf) {
			base := strings.TrimSuffix(k, "_"+suf)
			return capitalize(strings.ReplaceAll(base, "_", " ")) + " (" + u + ")"
		}
	}
	return capitalize(strings.ReplaceAll(k, "_", " "))
}

func capitalize(s string) string {
	if s == "" {
		return s
	}
	return strings.ToUpper(s[:1]) + s[1:]
}

// closureOf describes the closure check as the CLI does.
func closureOf(f *datasheet.Figures) closureView {
	cl := f.Closure
	v := closureView{OK: cl.OK, Problems: cl.Problems}
	switch {
	case !cl.OK:
		v.Summary = fmt.Sprintf("fails (tolerance %g).", cl.Tolerance)
	case cl.Checked:
		v.Summary = fmt.Sprintf("holds: |R+T+A−1| is at most %.4f (at %g nm), tolerance %g.", cl.Residual, cl.ResidualNM, cl.Tolerance)
	default:
		v.Summary = fmt.Sprintf("R, T and A were not all measured at one wavelength; R+T ≤ 1 and no value below zero, tolerance %g.", cl.Tolerance)
	}
	return v
}

// measuredPairs lists the measurement details given.
func measuredPairs(m library.Measured) []pair {
	var ps []pair
	for _, p := range []pair{
		{"Date", m.Date}, {"Instrument", m.Instrument}, {"Angle of incidence", m.Angle},
		{"Reference standard", m.Reference}, {"Operator", m.Operator}, {"Notes", m.Notes},
	} {
		if strings.TrimSpace(p.V) != "" {
			ps = append(ps, p)
		}
	}
	return ps
}
