package site

import (
	"bytes"
	"encoding/csv"
	"math"
	"strconv"
	"strings"

	"skysheet/datasheet"
	"skysheet/datasheet/evaluate"
	"skysheet/datasheet/library"
)

// tableCSVName is the file name of a table's CSV, beside its page.
const tableCSVName = "materials.csv"

// tableCSV writes the materials of a table as CSV, in its rows' order:
// number, names, category and tags, then each figure of the table and its
// standard uncertainty (the larger of the two cases the datasheet gives,
// as the table shows), each column named with its key and unit, numbers in
// full precision, and the page of each material (an address when the site
// has one, else a path from the site's root).
func (b *builder) tableCSV(ms []*evaluate.Summary, numbers map[string]int) ([]byte, error) {
	rows, err := b.csvRows(ms, numbers)
	if err != nil {
		return nil, err
	}
	return append(csvHead(), rows...), nil
}

// csvHead returns the first line of a materials.csv.
func csvHead() []byte {
	var buf bytes.Buffer
	w := csv.NewWriter(&buf)
	head := []string{"#", "material", "slug", "maker", "lab", "product_code", "category", "tags"}
	for _, col := range tableFigures {
		unit := col.Unit // the table's figures without a unit are fractions
		if unit == "" {
			unit = "fraction"
		}
		head = append(head, col.Key+" ("+unit+")", col.Key+" u ("+unit+")")
	}
	w.Write(append(head, "page"))
	w.Flush()
	return buf.Bytes()
}

// csvRows returns the lines of a materials.csv for ms.
func (b *builder) csvRows(ms []*evaluate.Summary, numbers map[string]int) ([]byte, error) {
	var buf bytes.Buffer
	w := csv.NewWriter(&buf)
	for _, m := range ms {
		fm := m.Front
		r := []string{strconv.Itoa(numbers[m.Slug]), textCell(fm.Title), m.Slug, textCell(fm.Maker), textCell(fm.Lab),
			textCell(fm.ProductCode), textCell(fm.Category), textCell(strings.Join(uniqueTags(fm.Tags), "; "))}
		for _, col := range tableFigures {
			x := figureOf(m.Figures, col.Key)
			u := ""
			if x.Uncertainty != nil {
				u = csvNumber(datasheet.Num(math.Max(float64(x.Uncertainty.Uncorrelated), float64(x.Uncertainty.Correlated))))
			}
			r = append(r, csvNumber(x.Value), u)
		}
		w.Write(append(r, b.site.SiteAddress+materialDir(m.Slug)+"index.html"))
	}
	w.Flush()
	return buf.Bytes(), w.Error()
}

// indexCSV is tableCSV of the index's materials ms, its rows made in parts
// kept in the cache (see appendParts).
func (b *builder) indexCSV(ms []*evaluate.Summary, numbers map[string]int) ([]byte, error) {
	return b.appendParts(csvHead(), ms, "materials.csv rows", "", func(part []*evaluate.Summary) ([]byte, error) {
		return b.csvRows(part, numbers)
	})
}

// textCell returns the text of a CSV cell so that a spreadsheet shows it
// as text: a cell starting with "=", "+", "-", "@", a tab or a carriage
// return would be run as a formula, so it gets a leading apostrophe (the
// guidance of the OWASP page "CSV Injection").
func textCell(s string) string {
	if s != "" && strings.ContainsRune("=+-@\t\r", rune(s[0])) {
		return "'" + s
	}
	return s
}

// csvNumber writes v in full precision; "" when it is not a finite number.
func csvNumber(v datasheet.Num) string {
	if isNaN(v) {
		return ""
	}
	return strconv.FormatFloat(float64(v), 'g', -1, 64)
}

// addTableCSV writes the CSV of table t, listing ms, into folder dir of the
// site and links t to it.
func (b *builder) addTableCSV(out files, dir string, t *tableView, ms []*evaluate.Summary, numbers map[string]int) error {
	data, err := b.tableCSV(ms, numbers)
	if err != nil {
		return &library.Error{File: dir + tableCSVName, Err: err}
	}
	out[dir+tableCSVName] = data
	t.CSV = tableCSVName
	return nil
}
