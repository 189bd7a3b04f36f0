package datasheet

import (
	"encoding/csv"
	"io"
	"math"
	"strconv"
	"strings"
)

// csvHeader is the header row of [Figures.WriteCSV]. Each column says its
// unit: "(unit)" is the row's unit column, "(band_unit)" its band unit.
var csvHeader = []string{"key", "label", "value (unit)", "unit", "band low (band_unit)", "band high (band_unit)",
	"band_unit", "weighting", "coverage (fraction)", "u independent (unit)", "u together (unit)", "u worst case (unit)", "u known for (fraction)", "components (unit)"}

// WriteCSV writes the figures as CSV, one row per figure in the order of
// f.Figures, under a header naming each column with its unit: numbers in full precision (the shortest
// text that reads back to the same float64), an empty cell for a number
// that could not be computed, the unit "fraction" or "index" for figures
// without a physical unit, and the standard uncertainties (errors
// independent beyond a resolution element, each file's moving together,
// and the worst case; see [Uncertainty]) where the data give them, and for a figure of several components (L*, a*, b* of a
// colour) all of them, separated by "; ", Value being the first.
func (f *Figures) WriteCSV(w io.Writer) error {
	cw := csv.NewWriter(w)
	cw.Write(csvHeader)
	for _, x := range f.Figures {
		var lo, hi string
		if x.BandUnit != "" {
			b := bandOut(x.Band, x.BandUnit)
			lo, hi = csvNumber(Num(b[0])), csvNumber(Num(b[1]))
		}
		var ui, ut, uw, reach string
		if u := x.Uncertainty; u != nil {
			ui, ut, uw, reach = csvNumber(u.Uncorrelated), csvNumber(u.Correlated), csvNumber(u.WorstCase), csvNumber(u.Reach)
		}
		comps := make([]string, len(x.Components))
		for i, c := range x.Components {
			comps[i] = csvNumber(c)
		}
		cw.Write([]string{x.Key, x.Label, csvNumber(x.Value), unitName(x), lo, hi, x.BandUnit, x.Weighting,
			csvNumber(x.Coverage), ui, ut, uw, reach, strings.Join(comps, "; ")})
	}
	cw.Flush()
	return cw.Error()
}

// unitName is the unit of x for a table's column name: its unit, or its
// kind ("fraction", "index") when it has none.
func unitName(x Figure) string {
	if x.Unit != "" {
		return x.Unit
	}
	if k := x.Kind(); k != kindUnknown {
		return k.String()
	}
	return "fraction"
}

// csvNumber writes v in full precision ('g', shortest form that reads back
// exactly); "" when v is not a finite number.
func csvNumber(v Num) string {
	x := float64(v)
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return ""
	}
	return strconv.FormatFloat(x, 'g', -1, 64)
}
