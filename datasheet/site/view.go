package site

import (
	"fmt"
	"html/template"
	"math"
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
	W         *weatherView
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

type keyFig struct {
	Label, Value, Unit, Note string
	Partial                  bool
	Notes                    []noteRef
	key                      string // the figure's key
}

// noteRef points from a figure to a model note of its datasheet.
type noteRef struct {
	ID, Mark, Label string // Label: what the note says, in a few words
}

// modelNoteView is a model note on the datasheet.
type modelNoteView struct{ ID, Mark, Text string }

type figRow struct {
	Key, Label, Value, Unc, Band, Weighting, Coverage string
	Why                                               string // why there is no value
	Partial                                           bool
	Notes                                             []noteRef
	// UncCover is, when the stated uncertainties cover only part of what
	// the figure depends on, that share in words ("covers 48 %").
	UncCover string
	Claims   []claimRef // claims of this figure
}

// colorView is the colour of a material's reflectance or transmittance
// for the datasheet: a swatch and its figures, or why there is none.
type colorView struct {
	Title  string // "Colour", "Transmitted colour"
	Hex    string // sRGB "#rrggbb"; "" when there is no colour
	Values string // "L* 52.10, a* 24.31, b* 18.02 · x 0.4123, y 0.3567 · luminous reflectance 0.212"
	Note   string // the screen note, or why there is no colour
	Claims []claimRef
}

type spectrumRow struct{ File, Role, Instrument, Notes string }

// thresholds are the coverage thresholds of the figures, "98 %".
type thresholds struct{ Full, Shown string }

type closureView struct {
	OK       bool
	Summary  string
	Problems []string
	Origins  string // how R, T and A were obtained
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
	Colors                                                 []colorView
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
	Warnings                                               []string // about the input data, not errors
	ModelNotes                                             []modelNoteView
	Thresholds                                             *thresholds // of coverage, when a figure is partial or not given
	Closure                                                closureView
	Charts                                                 []chartView
	Series                                                 *seriesLine // figures over a weather series, if any
	Downloads                                              []link
	Cautions                                               []string
	Comparisons                                            []link
	Stack                                                  *stackView // a stack's layers; nil for a measured material
}

// stackView is a stack's layers and its emitter with and without the
// layers above it.
type stackView struct {
	Layers []layerRow
	Cover  []coverRow
	HEff   string // h_eff and h, in words
}

type layerRow struct {
	N                                 int
	Name, Href                        string
	Thickness, Conductivity, Absorbed string
	R, T, Eps                         string
}

// coverRow is one cooling figure of the bottom layer under the layers
// above it and alone.
type coverRow struct{ Label, With, Without string }

// column is a column of a material table.
type column struct {
	Key, Label, Unit string
	Numeric          bool
}

// cell is a cell of a material table; Swatch, when set, is a colour
// "#rrggbb" shown before the text.
type cell struct {
	Key, Text, Value, Swatch string
	Why                      string // why there is no value, in a few words
	Partial                  bool
}

type row struct {
	N                        int
	Slug, Href, Title, Maker string
	Category                 link
	Cells                    []cell
	Notes                    []noteRef // the model notes of the material, linking to its datasheet
	figs                     *rowFigures
}

// CellsHTML returns Cells as the "material-cells" template writes them:
// made once per material and render, when a page first shows the row.
func (r row) CellsHTML() (template.HTML, error) {
	if r.figs == nil {
		return "", nil
	}
	return r.figs.html()
}

type tableView struct {
	ID      string
	Columns []column
	Rows    []row
	CSV     string // the table as CSV, relative to the page; "" for none
	// Pager links the pages of a table longer than pageRows; nil for a
	// table on one page.
	Pager *pager
	// Data is, for the index of a paged library, the path from the page
	// to the script with every row (see rowsScript); "" otherwise.
	Data  string
	Total int // rows of the whole table, on every page
}

// pager is the list of the pages of a table.
type pager struct {
	Current int
	Pages   []link // Name is the page number, Href relative to the page; Note is "current" on this page's own
	First   int    // number of the first row on this page
	Last    int    // number of the last row on this page
}

type indexView struct {
	Count       int
	Claims      datasheet.VerdictCounts // over the whole library
	ClaimWords  string                  // the counts in words
	Table       tableView
	Scatter     *chartView
	ColorCharts []chartView
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
	// Swatches, when set, replaces Cells: one colour "#rrggbb" per
	// material ("" for none).
	Swatches []string
}

type compareView struct {
	Title, Summary string
	Body           template.HTML
	Charts         []chartView
	Columns        []compareCol
	Rows           []compareRow
	Cautions       []string
	Reference      *referenceView // nil when the page names no reference
}

// referenceView is each material's differences from the page's reference
// material, as textiles.
type referenceView struct {
	Name, Skin, SkinHref string
	Rows                 []referenceRow
	Setting              []string // the skin balance's assumptions
	Problems             []string // why a material has no skin figures
	Cautions             []string
}

type referenceRow struct {
	Label string
	Cells []referenceCell
}

// referenceCell is a value and its difference from the reference's ("" in
// the reference's own column).
type referenceCell struct{ Value, Diff string }

// WornCautions are printed on a comparison page with a reference.
var WornCautions = []string{
	"These figures compare fabrics under one stated scene from their spectra. They are no substitute for thermal-comfort testing or UV-protection testing, and they do not predict how anyone feels.",
	"People in heat need shade, water and rest, whatever they wear. Follow local heat-health guidance.",
	"The UV figure is an erythemally weighted estimate on the ASTM G173 global tilt spectrum, not the solar spectrum the textile UV-protection standards use: it is not a rating.",
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
	{Key: "color_lab", Label: "Colour", Unit: "L*", Numeric: true},
}

// figureOf returns the figure of f with the given key; a figure without
// a value when f or the figure is missing.
func figureOf(f *datasheet.Figures, key string) datasheet.Figure {
	if f != nil {
		if x, ok := f.Figure(key); ok {
			return x
		}
	}
	return datasheet.Figure{Key: key, Value: datasheet.Num(math.NaN())}
}

func isNaN(v datasheet.Num) bool { return math.IsNaN(float64(v)) || math.IsInf(float64(v), 0) }

// fmtFrac formats a fraction with three decimals; "—" when unknown.
func fmtFrac(v datasheet.Num) string {
	if isNaN(v) {
		return "—"
	}
	return strconv.FormatFloat(float64(v), 'f', 3, 64)
}

// fmtNumber formats a number of a figure of kind k in unit: fractions with
// three decimals, indices and physical quantities with one, followed by
// the unit when there is one; "—" when unknown.
func fmtNumber(k datasheet.Kind, v datasheet.Num, unit string) string {
	if isNaN(v) {
		return "—"
	}
	if k == datasheet.KindFraction {
		return fmtFrac(v)
	}
	s := strconv.FormatFloat(float64(v), 'f', 1, 64)
	if unit != "" {
		s += " " + unit
	}
	return s
}

// fmtFigure formats a figure's value in its unit (see fmtNumber); a
// temperature difference in words, as where the surface settles.
func fmtFigure(x datasheet.Figure) string {
	if x.Components != nil {
		if isNaN(x.Value) {
			return "—"
		}
		return x.Text()
	}
	if k := x.Kind(); k == datasheet.KindTemperatureDifference && !isNaN(x.Value) {
		return k.Words(float64(x.Value), x.Unit)
	}
	return fmtNumber(x.Kind(), x.Value, x.Unit)
}

// fmtUnc formats a figure's standard uncertainty as "±noise / ±together"
// (errors independent beyond a resolution element, each file's errors
// moving as one), two
// significant digits; and, when the stated uncertainties of R and T cover
// less than all of what the figure depends on (its sensitivity), the
// share they cover in plain words: "covers 48 %" (the datasheet explains
// it beside the table).
func fmtUnc(u *datasheet.Uncertainty) (unc, cover string) {
	if u == nil || isNaN(u.Uncorrelated) || isNaN(u.Correlated) {
		return "", ""
	}
	g := func(x datasheet.Num) string { return "±" + strconv.FormatFloat(float64(x), 'g', 2, 64) }
	unc = g(u.Uncorrelated) + " / " + g(u.Correlated)
	if !isNaN(u.Reach) && float64(u.Reach) < 0.995 {
		cover = "covers " + strconv.FormatFloat(100*float64(u.Reach), 'f', 0, 64) + " %"
	}
	return unc, cover
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

// fmtNM writes a wavelength from the data to 0.01 nm.
func fmtNM(nm float64) string { return fmtG(math.Round(nm*100) / 100) }

// conditionPairs lists the conditions for people, in the order of the
// conditions table.
func conditionPairs(c datasheet.Conditions) []pair {
	var ps []pair
	for _, x := range c.List() {
		if !x.Off {
			ps = append(ps, pair{x.Label, x.Value})
		}
	}
	return ps
}

// closureOf describes the closure check as the CLI does.
func closureOf(f *datasheet.Figures) closureView {
	cl := f.Closure
	v := closureView{OK: cl.OK, Problems: cl.Problems, Origins: f.Origins.Text()}
	switch {
	case !cl.OK:
		v.Summary = fmt.Sprintf("fails (tolerance %g).", cl.Tolerance)
	case cl.Checked:
		v.Summary = fmt.Sprintf("holds: |R+T+A−1| is at most %.4f (at %s nm), tolerance %g.", cl.Residual, fmtNM(cl.ResidualNM), cl.Tolerance)
	default:
		v.Summary = fmt.Sprintf("R, T and A were not all measured at one wavelength; R+T ≤ 1 and no value below zero, tolerance %g.", cl.Tolerance)
	}
	return v
}

// measuredPairs lists the measurement details given and, when f has
// emittance data, the basis of the emittance (beside the angle of
// incidence when one is given: both say how the sample was seen).
func measuredPairs(m library.Measured, f *datasheet.Figures) []pair {
	var ps []pair
	angle := pair{"Angle of incidence", m.Angle}
	emittance := pair{"Emittance", ""}
	if f != nil && !isNaN(f.ThermalEmittance) {
		emittance.V = f.EmittanceBasis.Words()
		if strings.TrimSpace(angle.V) != "" {
			angle = pair{"Angle; emittance", angle.V + "; " + emittance.V}
			emittance.V = ""
		}
	}
	for _, p := range []pair{
		{"Date", m.Date}, {"Instrument", m.Instrument}, angle,
		{"Reference standard", m.Reference}, {"Operator", m.Operator}, {"Notes", m.Notes}, emittance,
	} {
		if strings.TrimSpace(p.V) != "" {
			ps = append(ps, p)
		}
	}
	return ps
}
