package site

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"html/template"
	"math"
	"slices"
	"sort"
	"strconv"
	"strings"
	"sync"

	"skysheet/datasheet"
	"skysheet/datasheet/evaluate"
	"skysheet/datasheet/library"
	"skysheet/spectra"
)

// materialView builds the datasheet data of m for a page at root.
func (b *builder) materialView(m *evaluate.Material, body []byte, root string, cmps []*library.Comparison) (*materialView, error) {
	fm, f, vs := m.Front, m.Figures, m.Verdicts
	v := &materialView{Slug: m.Slug, Title: fm.Title, Maker: fm.Maker, Lab: fm.Lab, ProductCode: fm.ProductCode,
		Summary: fm.Summary, License: fm.License, Inputs: m.Inputs, Cautions: cautionsOf(f),
		Conditions: conditionPairs(m.Conditions), Overridden: fm.Conditions.Keys(),
		Assumptions: f.Assumptions, Closure: closureOf(f), Measured: measuredPairs(fm.Measured, f), Warnings: m.Warnings}
	if s := library.Slugify(fm.Category); s != "" {
		v.Category = link{Name: fm.Category, Href: root + listingDir("category", s) + "index.html"}
	}
	for _, t := range uniqueTags(fm.Tags) {
		v.Tags = append(v.Tags, link{Name: t, Href: root + listingDir("tag", tagSlug(t)) + "index.html"})
	}
	refs := noteRefs(f, "")
	for _, n := range f.ModelNotes {
		v.ModelNotes = append(v.ModelNotes, modelNoteView{ID: "model-" + n.Code, Mark: refs[n.Code].Mark, Text: n.Text})
	}
	c := m.Conditions
	v.Key = append(v.Key,
		keyCard(f, "solar_reflectance", "Solar reflectance", c.Text("solar_band_nm")+", "+c.SolarSpectrum.String()),
		keyCard(f, "thermal_emittance", "Thermal emittance", c.Text("thermal_band_um")+", "+c.Text("temperature_k")),
		keyCard(f, "window_emittance", "Window emittance", c.Text("window_band_um")),
		keyCard(f, "cooling_power_w_m2", "Net cooling, day", fmt.Sprintf("at air %s, %s sun", c.Text("ambient_k"), c.Text("irradiance_w_m2"))),
	)
	if m.Sample.Has(spectra.T) {
		v.Key = append(v.Key, keyCard(f, "solar_transmittance", "Solar transmittance", c.Text("solar_band_nm")))
	}
	for i := range v.Key {
		v.Key[i].Notes = figureNotes(f, v.Key[i].key, refs)
	}
	v.Claims = claimViews(vs)
	var counts datasheet.VerdictCounts
	counts.Add(vs...)
	v.ClaimCounts = countWords(counts)
	crefs := claimRefs(v.Claims)
	v.Colors = colorViews(f, crefs)
	for _, x := range f.Figures {
		if x.IsColor() { // shown with the swatch in the head
			continue
		}
		r := figRow{Key: x.Key, Label: x.Label, Value: fmtFigure(x), Band: x.BandText(),
			Weighting: x.Weighting, Coverage: fmtPercent(x.Coverage), Claims: crefs[x.Key],
			Partial: x.Partial, Notes: figureNotes(f, x.Key, refs)}
		if isNaN(x.Value) {
			r.Value, r.Why = "n/a", firstOf(x.ShortReason(), "not computed")
		}
		if x.Partial || x.ShortReason() != x.Reason { // partial, or withheld for its coverage
			v.Thresholds = &thresholds{fmtG(100*datasheet.Rules.MinCoverage) + " %", fmtG(100*datasheet.Rules.MinShownCoverage) + " %"}
		}
		r.Unc, r.UncCover = fmtUnc(x.Uncertainty)
		if r.Unc != "" {
			v.HasUnc = true
		}
		if x.Key == "solar_transmittance" && !m.Sample.Has(spectra.T) {
			r.Value += " (assumed)"
		}
		v.Figures = append(v.Figures, r)
	}
	for _, s := range fm.Spectra {
		v.Spectra = append(v.Spectra, spectrumRow{File: s.File, Role: s.Role, Instrument: s.Instrument, Notes: s.Notes})
	}
	if f.Stack != nil {
		v.Stack = stackViewOf(f, root)
	}
	html, err := b.md.render(body)
	if err != nil {
		return nil, err
	}
	v.Body = html
	v.Charts, err = materialCharts(m)
	if err != nil {
		return nil, err
	}
	if w := f.Weather; w != nil {
		v.Series = &seriesLine{Text: seriesSummary(w), Href: seriesPage}
	}
	v.Downloads = []link{
		{Name: "spectrum.csv", Href: "spectrum.csv", Note: "the spectrum, normalised to the neutral column format"},
		{Name: "figures.json", Href: "figures.json", Note: fmt.Sprintf("every figure with its basis (schema %d)", f.Schema)},
		{Name: "figures.csv", Href: "figures.csv", Note: "every figure as a table, with its unit, band, coverage and uncertainty"},
		{Name: "source.md", Href: "source.md", Note: "the Markdown source with its front matter"},
	}
	if len(vs) > 0 {
		v.Downloads = append(v.Downloads, link{Name: "claims.json", Href: "claims.json", Note: "the verdict on every claim, with its reason and basis"})
	}
	for _, x := range cmps {
		v.Comparisons = append(v.Comparisons, link{Name: x.Front.Title, Href: root + "compare/" + x.Slug + "/index.html"})
	}
	return v, nil
}

// minShownTransmittance is the least luminous transmittance for which a
// datasheet shows the transmitted colour: below it the sample is opaque to
// the eye and its "colour" is black (the figures are still computed).
const minShownTransmittance = 0.01

// colorViews describes the colours of f for the head of a datasheet: the
// reflected colour, and the transmitted one when transmittance was
// measured, with the claims of their figures.
func colorViews(f *datasheet.Figures, refs map[string][]claimRef) []colorView {
	var out []colorView
	for _, c := range []struct {
		title, prefix, lum string
		x                  *datasheet.Color
	}{
		{"Colour", "", "luminous_reflectance", &f.Color.Reflectance},
		{"Transmitted colour", "transmitted_", "luminous_transmittance", f.Color.Transmittance},
	} {
		if c.x == nil || c.prefix != "" && c.x.Reason == "" && float64(c.x.Luminous) < minShownTransmittance {
			continue
		}
		cv := colorView{Title: c.title}
		for _, k := range []string{c.prefix + "color_lab", c.prefix + "color_xy", c.lum} {
			cv.Claims = append(cv.Claims, refs[k]...)
		}
		if c.x.Reason != "" {
			cv.Note = "n/a: " + c.x.Reason + "."
			out = append(out, cv)
			continue
		}
		lab, _ := f.Figure(c.prefix + "color_lab")
		xy, _ := f.Figure(c.prefix + "color_xy")
		lum, _ := f.Figure(c.lum)
		cv.Hex = c.x.SRGB
		cv.Values = lab.Text() + " · " + xy.Text() + " · " + strings.ToLower(lum.Label[:1]) + strings.TrimSuffix(lum.Label[1:], " (D65, Y/100)") + " " + fmtFrac(lum.Value)
		cv.Note = "D65, 2°. Swatch sRGB " + c.x.SRGB + ", approximate on screen; "
		if c.x.Clipped {
			cv.Note += "this colour lies outside the sRGB gamut and is shown clipped, duller than it is."
		} else {
			cv.Note += "colours outside the sRGB gamut are shown clipped (not this one)."
		}
		out = append(out, cv)
	}
	return out
}

// stackViewOf lays out a stack's layers and the cooling of its emitter
// with and without the layers above, for a page at root.
func stackViewOf(f *datasheet.Figures, root string) *stackView {
	st := f.Stack
	v := &stackView{HEff: fmt.Sprintf("h_eff %s W m⁻² K⁻¹ through the layers above, h %s W m⁻² K⁻¹ without them",
		strconv.FormatFloat(float64(st.HEffWm2K), 'f', 2, 64), fmtG(float64(st.HWm2K)))}
	for i, l := range st.Layers {
		r := layerRow{N: i + 1, Name: l.Name, Thickness: "—", Conductivity: "—", Absorbed: fmtFrac(l.SolarAbsorbed),
			R: fmtFrac(l.SolarReflectance), T: fmtFrac(l.SolarTransmittance), Eps: fmtFrac(l.ThermalEmittance)}
		if l.Slug != "" {
			r.Href = root + materialDir(l.Slug) + "index.html"
		}
		if !isNaN(l.ThicknessMM) {
			r.Thickness, r.Conductivity = fmtG(float64(l.ThicknessMM))+" mm", fmtG(float64(l.ConductivityWmK))+" W m⁻¹ K⁻¹"
		}
		v.Layers = append(v.Layers, r)
	}
	u := st.Uncovered
	for _, x := range []struct {
		key  string
		with datasheet.Num
		bare datasheet.Num
	}{
		{"cooling_power_w_m2", f.CoolingPowerWm2, u.CoolingPowerWm2},
		{"cooling_power_night_w_m2", f.CoolingPowerNightWm2, u.CoolingPowerNightWm2},
		{"equilibrium_delta_k", f.EquilibriumDeltaK, u.EquilibriumDeltaK},
		{"equilibrium_delta_night_k", f.EquilibriumDeltaNightK, u.EquilibriumDeltaNightK},
	} {
		fig := figureOf(f, x.key)
		bare := fig
		fig.Value, bare.Value = x.with, x.bare
		v.Cover = append(v.Cover, coverRow{Label: fig.Label, With: fmtFigure(fig), Without: fmtFigure(bare)})
	}
	return v
}

// referenceOf lays out the differences of each of ms from comparison c's
// reference, as textiles: optics, UV and, over c's skin, the heat reaching
// the skin and the fabric's temperature, by day and by night.
func referenceOf(c *library.Comparison, ms []*evaluate.Summary, root string) *referenceView {
	v := &referenceView{Name: c.Reference.Front.Title, Cautions: WornCautions}
	var ref *evaluate.Summary
	for _, m := range ms {
		if m.Slug == c.Reference.Slug {
			ref = m
		}
	}
	if c.Skin != nil {
		v.Skin, v.SkinHref = c.Skin.Front.Title, root+materialDir(c.Skin.Slug)+"index.html"
	}
	nan := datasheet.Num(math.NaN())
	type getter func(m *evaluate.Summary) datasheet.Num
	worn := func(m *evaluate.Summary) *evaluate.Worn {
		if m == nil {
			return nil
		}
		return m.Worn[c.Slug]
	}
	balance := func(day bool, pick func(*datasheet.SkinBalance) float64) getter {
		return func(m *evaluate.Summary) datasheet.Num {
			w := worn(m)
			if w == nil {
				return nan
			}
			b := w.Night
			if day {
				b = w.Day
			}
			if b == nil {
				return nan
			}
			return datasheet.Num(pick(b))
		}
	}
	gain := func(b *datasheet.SkinBalance) float64 { return b.SkinGainWm2 }
	fabricC := func(b *datasheet.SkinBalance) float64 { return b.FabricK - 273.15 }
	fig := func(key string) getter {
		return func(m *evaluate.Summary) datasheet.Num { return figureOf(m.Figures, key).Value }
	}
	rows := []struct {
		label  string
		get    getter
		digits int
		unit   string
		skin   bool
	}{
		{"Solar reflectance", fig("solar_reflectance"), 3, "", false},
		{"Solar transmittance", fig("solar_transmittance"), 3, "", false},
		{"UV transmittance, erythemally weighted", func(m *evaluate.Summary) datasheet.Num {
			if w := worn(m); w != nil {
				return w.UV.Transmittance
			}
			return nan
		}, 3, "", false},
		{"Window emittance", fig("window_emittance"), 3, "", false},
		{"Heat reaching the skin, sun", balance(true, gain), 0, "W/m²", true},
		{"Heat reaching the skin, night", balance(false, gain), 0, "W/m²", true},
		{"Fabric temperature, sun", balance(true, fabricC), 1, "°C", true},
		{"Fabric temperature, night", balance(false, fabricC), 1, "°C", true},
	}
	num := func(x datasheet.Num, digits int, unit string, sign bool) string {
		if isNaN(x) {
			return "—"
		}
		f := "%." + strconv.Itoa(digits) + "f"
		if sign {
			f = "%+." + strconv.Itoa(digits) + "f"
		}
		s := strings.Replace(fmt.Sprintf(f, float64(x)), "-", "−", 1)
		if unit != "" {
			s += " " + unit
		}
		return s
	}
	for _, r := range rows {
		if r.skin && c.Skin == nil {
			continue
		}
		row := referenceRow{Label: r.label}
		rv := nan
		if ref != nil {
			rv = r.get(ref)
		}
		for _, m := range ms {
			x := r.get(m)
			cell := referenceCell{Value: num(x, r.digits, r.unit, false)}
			switch {
			case m == ref:
				cell.Diff = "reference"
			case !isNaN(x) && !isNaN(rv):
				cell.Diff = "Δ " + num(x-rv, r.digits, r.unit, true)
			}
			row.Cells = append(row.Cells, cell)
		}
		v.Rows = append(v.Rows, row)
	}
	// The UV protection factor it implies, 1/T_ery.
	uvf := referenceRow{Label: "UV protection factor implied, 1/T_ery"}
	for _, m := range ms {
		cell := referenceCell{Value: "—"}
		if w := worn(m); w != nil {
			switch {
			case w.UV.AboveCap:
				cell.Value = "above 1000"
			case !isNaN(w.UV.Factor):
				cell.Value = strconv.FormatFloat(float64(w.UV.Factor), 'f', 0, 64)
			}
		}
		uvf.Cells = append(uvf.Cells, cell)
	}
	v.Rows = append(v.Rows[:3], append([]referenceRow{uvf}, v.Rows[3:]...)...)
	for _, m := range ms {
		if w := worn(m); w != nil {
			if w.Problem != "" {
				v.Problems = append(v.Problems, m.Front.Title+": "+w.Problem)
			}
			if w.Day != nil && v.Setting == nil {
				v.Setting = w.Setting.Assumptions()
			}
		}
	}
	return v
}

// keyCard returns the headline card of figure key of f: its value and
// unit, its standard uncertainty (± in the value's unit) at the head of
// the note when it has one; or "n/a" with the reason where it has no
// value.
func keyCard(f *datasheet.Figures, key, label, note string) keyFig {
	x := figureOf(f, key)
	if isNaN(x.Value) {
		why := "not computed"
		if f != nil {
			if m := figureOf(f, key).ShortReason(); m != "" {
				why = m
			}
		}
		return keyFig{Label: label, Value: "n/a", Note: why, key: key}
	}
	if pm := plusMinus(x); pm != "" {
		note = strings.TrimSpace(pm) + "; " + note // in the value's unit, shown above
	}
	return keyFig{Label: label, Value: fmtNumber(x.Kind(), x.Value, ""), Unit: x.Unit, Note: note, Partial: x.Partial, key: key}
}

// noteMarks are the marks of the model notes, the same on every page.
var noteMarks = map[string]string{
	datasheet.NoteSRINotOpaque:     "†",
	datasheet.NoteCoolingLoneLayer: "‡",
	datasheet.NoteSRILowEmittance:  "§",
}

// noteLabels say each model note in a few words, for links to it.
var noteLabels = map[string]string{
	datasheet.NoteSRINotOpaque:     "the SRI is defined for opaque surfaces",
	datasheet.NoteCoolingLoneLayer: "a lone layer with nothing behind it",
	datasheet.NoteSRILowEmittance:  "the SRI applies to emittances above 0.1",
}

// noteRefs returns a reference to each model note of f by code, with
// href (the datasheet's address, "" on the datasheet itself) before its
// anchor.
func noteRefs(f *datasheet.Figures, href string) map[string]noteRef {
	out := map[string]noteRef{}
	for _, n := range f.ModelNotes {
		out[n.Code] = noteRef{ID: href + "#model-" + n.Code, Mark: firstOf(noteMarks[n.Code], "*"), Label: firstOf(noteLabels[n.Code], n.Code)}
	}
	return out
}

// figureNotes returns the references to the model notes that concern
// figure key.
func figureNotes(f *datasheet.Figures, key string, refs map[string]noteRef) []noteRef {
	var out []noteRef
	for _, n := range f.NotesFor(key) {
		out = append(out, refs[n.Code])
	}
	return out
}

// plusMinus writes " ±u" for a figure with a standard uncertainty u, two
// significant digits, the larger of the two cases the datasheet's table
// gives (errors independent beyond a resolution element, each file's
// errors moving as one);
// "" when it has none.
func plusMinus(x datasheet.Figure) string {
	u := x.Uncertainty
	if u == nil || isNaN(u.Uncorrelated) || isNaN(u.Correlated) {
		return ""
	}
	return " ±" + strconv.FormatFloat(math.Max(float64(u.Uncorrelated), float64(u.Correlated)), 'g', 2, 64)
}

// cautionsOf returns the cautions that come with the figures, or the
// site's own.
func cautionsOf(f *datasheet.Figures) []string {
	if f != nil && len(f.Cautions) > 0 {
		return f.Cautions
	}
	return Cautions
}

// uniqueTags returns the non-empty tags in order, without repeats.
func uniqueTags(tags []string) []string {
	var out []string
	seen := map[string]bool{}
	for _, t := range tags {
		if s := tagSlug(t); t != "" && s != "" && !seen[s] {
			seen[s] = true
			out = append(out, t)
		}
	}
	return out
}

func tagSlug(t string) string { return library.Slugify(t) }

// table builds a material table for a page at root.
func (b *builder) table(id, root string, ms []*evaluate.Summary, numbers map[string]int) tableView {
	t := tableView{ID: id, Columns: append([]column{{Key: "title", Label: "Material"}, {Key: "category", Label: "Category"}}, tableFigures...)}
	for _, m := range ms {
		r := row{N: numbers[m.Slug], Slug: m.Slug, Href: root + materialDir(m.Slug) + "index.html", Title: m.Front.Title, Maker: firstOf(m.Front.Maker, m.Front.Lab)}
		if s := library.Slugify(m.Front.Category); s != "" {
			r.Category = link{Name: m.Front.Category, Href: root + listingDir("category", s) + "index.html"}
		}
		if rf := b.rowFigs[m.Slug]; rf != nil {
			r.Cells, r.figs = rf.cells, rf
		}
		if m.Figures != nil {
			refs := noteRefs(m.Figures, r.Href)
			for _, n := range m.Figures.ModelNotes {
				r.Notes = append(r.Notes, refs[n.Code])
			}
		}
		t.Rows = append(t.Rows, r)
	}
	return t
}

// rowFigures are the figure cells of a material's row in the material
// tables, and their HTML: the same in every table, made once per render,
// the HTML only when a page shows the row (pages taken from the cache do
// not).
type rowFigures struct {
	cells []cell
	path  string // the material's file, for errors
	tmpl  *template.Template

	once    sync.Once
	text    template.HTML
	textErr error
}

// html returns the cells as the "material-cells" template writes them.
func (f *rowFigures) html() (template.HTML, error) {
	f.once.Do(func() {
		var buf bytes.Buffer
		if err := f.tmpl.ExecuteTemplate(&buf, "material-cells", f.cells); err != nil {
			f.textErr = &library.Error{File: f.path, Err: fmt.Errorf("material tables: %w", err)}
			return
		}
		f.text = template.HTML(buf.String())
	})
	return f.text, f.textErr
}

// prepare makes what the pages that rest on every material share: the
// index order, the categories and tags, and the rowFigures of every
// material (in parallel).
func (b *builder) prepare() {
	b.order, b.numbers = b.sortSums()
	b.categories, b.tags = b.groupBy(false), b.groupBy(true)
	figs := make([]*rowFigures, len(b.sums))
	b.each(len(b.sums), func(i int) {
		m := b.sums[i]
		figs[i] = &rowFigures{cells: figureCells(m), path: m.Path, tmpl: b.tmpl}
	})
	b.rowFigs = make(map[string]*rowFigures, len(b.sums))
	for i, m := range b.sums {
		b.rowFigs[m.Slug] = figs[i]
	}
}

// figureCells returns the figure cells of m's row in the material tables.
func figureCells(m *evaluate.Summary) []cell {
	cells := make([]cell, 0, len(tableFigures))
	for _, col := range tableFigures {
		x := figureOf(m.Figures, col.Key)
		if x.Key == "color_lab" { // a swatch and L*
			cl := cell{Key: col.Key, Text: "—", Value: sortValue(x.Value)}
			if !isNaN(x.Value) && m.Figures != nil {
				cl.Text, cl.Swatch = strconv.FormatFloat(float64(x.Value), 'f', 1, 64), m.Figures.Color.Reflectance.SRGB
			}
			cells = append(cells, cl)
			continue
		}
		c := cell{Key: col.Key, Text: fmtNumber(x.Kind(), x.Value, "") + plusMinus(x), Value: sortValue(x.Value), Partial: x.Partial}
		switch {
		case !isNaN(x.Value):
		case x.Reason != "":
			c.Text, c.Why = "n/a", x.ShortReason()
		}
		cells = append(cells, c)
	}
	return cells
}

func firstOf(s ...string) string {
	for _, x := range s {
		if x != "" {
			return x
		}
	}
	return ""
}

// ordered returns the materials in the order of the index and each
// material's number in it (made by prepare; not to be changed).
func (b *builder) ordered() ([]*evaluate.Summary, map[string]int) { return b.order, b.numbers }

// sortSums returns the materials sorted by title (then slug), the order
// of the index; and each material's number in it.
func (b *builder) sortSums() ([]*evaluate.Summary, map[string]int) {
	type keyed struct {
		title string // lower case
		m     *evaluate.Summary
	}
	ks := make([]keyed, len(b.sums))
	for i, m := range b.sums {
		ks[i] = keyed{strings.ToLower(m.Front.Title), m}
	}
	slices.SortStableFunc(ks, func(a, b keyed) int {
		if c := strings.Compare(a.title, b.title); c != 0 {
			return c
		}
		return strings.Compare(a.m.Slug, b.m.Slug)
	})
	ms := make([]*evaluate.Summary, len(ks))
	n := make(map[string]int, len(ks))
	for i, k := range ks {
		ms[i] = k.m
		n[k.m.Slug] = i + 1
	}
	return ms, n
}

// groupSet is the categories or the tags of the materials: their slugs in
// order, their names by slug and their materials in index order.
type groupSet struct {
	slugs   []string
	names   map[string]string
	members map[string][]*evaluate.Summary
}

// groups returns the tags (tags true) or the categories (made by
// prepare).
func (b *builder) groups(tags bool) groupSet {
	if tags {
		return b.tags
	}
	return b.categories
}

// groupBy returns the categories or tags of b.order.
func (b *builder) groupBy(tags bool) groupSet {
	g := groupSet{names: map[string]string{}, members: map[string][]*evaluate.Summary{}}
	for _, m := range b.order {
		var keys []string
		if tags {
			keys = uniqueTags(m.Front.Tags)
		} else if m.Front.Category != "" {
			keys = []string{m.Front.Category}
		}
		for _, k := range keys {
			s := library.Slugify(k)
			if s == "" {
				continue
			}
			if _, ok := g.names[s]; !ok {
				g.names[s] = k
				g.slugs = append(g.slugs, s)
			}
			g.members[s] = append(g.members[s], m)
		}
	}
	sort.Strings(g.slugs)
	return g
}

// indexFiles renders index.html, the pages and the CSV of its table.
func (b *builder) indexFiles(out files) error {
	p := b.newPage("index", b.site.Title, "index.html")
	ms, numbers := b.ordered()
	tables := b.pagedTables("library-table", "index.html", indexPagesDir, ms, numbers)
	v := &indexView{Count: len(ms), Table: tables[0].table}
	var csv tableView
	data, err := b.indexCSV(ms, numbers) // made on every render: in parts kept in the cache
	if err != nil {
		return &library.Error{File: tableCSVName, Err: err}
	}
	out[tableCSVName], csv.CSV = data, tableCSVName
	for i := range tables {
		tables[i].table.CSV = rootOf(tables[i].name) + csv.CSV
	}
	v.Table.CSV = csv.CSV
	if len(tables) > 1 {
		v.Table.Data = rowsScript
		data, err := b.rowsScript(ms, numbers)
		if err != nil {
			return &library.Error{File: rowsScript, Err: err}
		}
		out[rowsScript] = data
		for i, t := range tables[1:] {
			title, name := fmt.Sprintf("All materials, page %d", i+2), fmt.Sprintf("Page %d of %d", i+2, len(tables))
			key := b.pageKey(t.ms, "index page", t.name, title, name, t.table.CSV, strconv.Itoa(len(ms)))
			err := b.memo(key, out, func(out files) error {
				q := b.newPage("listing", title, t.name)
				q.L = &listingView{Kind: "All materials", Name: name, Table: t.table}
				html, err := b.execute("listing", q)
				if err != nil {
					return &library.Error{File: t.name, Err: err}
				}
				out[t.name] = html
				return nil
			})
			if err != nil {
				return err
			}
		}
	}
	for _, m := range ms {
		v.Claims.Add(m.Verdicts...)
	}
	v.ClaimWords = countWords(v.Claims)
	sc, err := scatterChart(ms)
	if err != nil {
		return &library.Error{File: "index.html", Err: fmt.Errorf("scatter chart: %w", err)}
	}
	v.Scatter = sc
	if v.ColorCharts, err = colorCharts(ms); err != nil {
		return &library.Error{File: "index.html", Err: fmt.Errorf("colour charts: %w", err)}
	}
	for _, kind := range []string{"category", "tag"} {
		g := b.groups(kind == "tag")
		for _, s := range g.slugs {
			l := link{Name: g.names[s], Href: listingDir(kind, s) + "index.html", Count: len(g.members[s])}
			if kind == "tag" {
				v.Tags = append(v.Tags, l)
			} else {
				v.Categories = append(v.Categories, l)
			}
		}
	}
	for _, c := range b.lib.Comparisons {
		v.Comparisons = append(v.Comparisons, link{Name: c.Front.Title, Href: "compare/" + c.Slug + "/index.html", Note: c.Front.Summary})
	}
	p.I = v
	html, err := b.execute("index", p)
	if err != nil {
		return &library.Error{File: "index.html", Err: err}
	}
	out["index.html"] = html
	return nil
}

// catalogFiles writes catalog.json.
func (b *builder) catalogFiles(out files) error {
	ms, _ := b.ordered()
	cat, err := b.catalog(ms)
	if err != nil {
		return &library.Error{File: "catalog.json", Err: err}
	}
	out["catalog.json"] = cat
	return nil
}

// pageRows is the most rows of a material table on one page: a longer
// table is split into pages that link each other, so that every material
// is reached without JavaScript and no page grows with the library.
const pageRows = 100

// indexPagesDir holds the pages of the index after the first, and
// rowsScript every row of the index, for sorting and filtering the whole
// library in the browser (a script, not JSON, so that it loads from
// file:// too).
const (
	indexPagesDir = "materials/page/"
	rowsScript    = "materials/rows.js"
)

// pagedTable is one page of a material table and the page's path.
type pagedTable struct {
	name  string
	table tableView
	ms    []*evaluate.Summary // the materials of its rows
}

// pagedTables splits the table of ms into pages of pageRows rows: the
// first is first (a path from the site root), page k is
// dir+"K/index.html".
func (b *builder) pagedTables(id, first, dir string, ms []*evaluate.Summary, numbers map[string]int) []pagedTable {
	n := max(1, (len(ms)+pageRows-1)/pageRows)
	names := make([]string, n)
	for k := range n {
		names[k] = first
		if k > 0 {
			names[k] = fmt.Sprintf("%s%d/index.html", dir, k+1)
		}
	}
	out := make([]pagedTable, n)
	for k := range n {
		lo, hi := k*pageRows, min(len(ms), (k+1)*pageRows)
		root := rootOf(names[k])
		t := b.table(id, root, ms[lo:hi], numbers)
		t.Total = len(ms)
		if k > 0 {
			t.ID = ""
		}
		if n > 1 {
			pg := &pager{Current: k + 1, First: lo + 1, Last: hi}
			for j := range n {
				l := link{Name: strconv.Itoa(j + 1), Href: root + names[j]}
				if j == k {
					l.Note = "current"
				}
				pg.Pages = append(pg.Pages, l)
			}
			t.Pager = pg
		}
		out[k] = pagedTable{name: names[k], table: t, ms: ms[lo:hi]}
	}
	return out
}

// rowsScript writes every row of the index as a script that sets
// window.skysheetRows: per material its number, slug, title, maker,
// category and category page, then text and sort value of each figure
// column. Links are relative to the site root.
func (b *builder) rowsScript(ms []*evaluate.Summary, numbers map[string]int) ([]byte, error) {
	out := []byte("// Every row of the index, for sorting and filtering (generated by skysheet).\nwindow.skysheetRows = [")
	out, err := b.appendParts(out, ms, "rows.js rows", ",", func(part []*evaluate.Summary) ([]byte, error) {
		t := b.table("", "", part, numbers)
		rows := make([][]any, 0, len(t.Rows))
		for _, r := range t.Rows {
			x := []any{r.N, r.Slug, r.Title, r.Maker, r.Category.Name, r.Category.Href}
			for _, c := range r.Cells {
				x = append(x, c.Text, c.Value)
			}
			rows = append(rows, x)
		}
		return jsonElements(rows)
	})
	if err != nil {
		return nil, err
	}
	return append(out, "];\n"...), nil
}

// listingDir is the output folder of the listing of the materials of one
// category or tag; kind is "category" or "tag".
func listingDir(kind, slug string) string { return "materials/by-" + kind + "/" + slug + "/" }

// listingFiles renders the pages that list the members of the category
// or tag (kind "category" or "tag") with the given slug and name.
func (b *builder) listingFiles(kind, slug, name string, members []*evaluate.Summary, out files) error {
	label := map[string]string{"category": "Category", "tag": "Tag"}[kind]
	first := listingDir(kind, slug) + "index.html"
	p := b.newPage("listing", label+": "+name, first)
	// Rows are numbered within the listing, in its order (the index's).
	numbers := make(map[string]int, len(members))
	for i, m := range members {
		numbers[m.Slug] = i + 1
	}
	tables := b.pagedTables("", first, listingDir(kind, slug)+"page/", members, numbers)
	var csv tableView
	if err := b.addTableCSV(out, listingDir(kind, slug), &csv, members, numbers); err != nil {
		return err
	}
	for i, t := range tables {
		q := p
		if i > 0 {
			q = b.newPage("listing", fmt.Sprintf("%s: %s, page %d", label, name, i+1), t.name)
		}
		t.table.CSV = csv.CSV // beside the first page; page/K/ is two folders below
		if i > 0 {
			t.table.CSV = "../../" + csv.CSV
		}
		q.L = &listingView{Kind: label, Name: name, Table: t.table}
		html, err := b.execute("listing", q)
		if err != nil {
			return &library.Error{File: t.name, Err: err}
		}
		out[t.name] = html
	}
	return nil
}

// comparisonFiles renders a comparison page, or takes it from the cache
// while its Markdown file and materials are unchanged.
func (b *builder) comparisonFiles(c *library.Comparison, out files) error {
	bySlug := map[string]*evaluate.Summary{}
	for _, m := range b.sums {
		bySlug[m.Slug] = m
	}
	var ms []*evaluate.Summary
	for _, x := range c.Materials {
		if m := bySlug[x.Slug]; m != nil {
			ms = append(ms, m)
		}
	}
	sum := sha256.Sum256(c.Source)
	return b.memo(b.pageKey(ms, "comparison", c.Path, hex.EncodeToString(sum[:])), out, func(out files) error {
		return b.comparisonPage(c, ms, out)
	})
}

// comparisonPage renders the page of comparison c of materials ms.
func (b *builder) comparisonPage(c *library.Comparison, ms []*evaluate.Summary, out files) error {
	name := "compare/" + c.Slug + "/index.html"
	fail := func(err error) error { return &library.Error{File: c.Path, Err: fmt.Errorf("page %s: %w", name, err)} }
	p := b.newPage("compare", c.Front.Title, name)
	v := &compareView{Title: c.Front.Title, Summary: c.Front.Summary, Cautions: Cautions}
	body, err := b.md.render(c.Body)
	if err != nil {
		return fail(err)
	}
	v.Body = body
	overlays := make([]overlay, len(ms))
	for i, m := range ms {
		if overlays[i], err = b.overlayOf(m); err != nil {
			return err
		}
	}
	if v.Charts, err = compareCharts(ms, overlays); err != nil {
		return fail(err)
	}
	for i, m := range ms {
		v.Columns = append(v.Columns, compareCol{Name: m.Front.Title, Href: p.Root + materialDir(m.Slug) + "index.html",
			Note: firstOf(m.Front.Maker, m.Front.Lab), Color: colPalette[i%len(colPalette)].css()})
	}
	// One row per figure key, in the order of the first material.
	var keys []string
	labels := map[string]string{}
	for _, m := range ms {
		for _, x := range m.Figures.Figures {
			if _, ok := labels[x.Key]; !ok {
				labels[x.Key] = x.Label
				keys = append(keys, x.Key)
			}
		}
	}
	for _, k := range keys {
		r := compareRow{Label: labels[k]}
		for _, m := range ms {
			x, ok := m.Figures.Figure(k)
			if !ok {
				r.Cells = append(r.Cells, "—")
				continue
			}
			r.Cells = append(r.Cells, fmtFigure(x))
		}
		v.Rows = append(v.Rows, r)
	}
	v.Rows = append(v.Rows, seriesRows(ms)...)
	v.Rows = append(v.Rows, compareColors(ms)...)
	cond := compareRow{Label: "Conditions"}
	for _, m := range ms {
		cc := m.Conditions
		cond.Cells = append(cond.Cells, fmt.Sprintf("%s, %s; %s at %s", cc.Text("solar_band_nm"), cc.SolarSpectrum, cc.Text("thermal_band_um"), cc.Text("temperature_k")))
	}
	v.Rows = append(v.Rows, cond)
	if c.Reference != nil {
		v.Reference = referenceOf(c, ms, p.Root)
	}
	p.C = v
	html, err := b.execute("compare", p)
	if err != nil {
		return fail(err)
	}
	out[name] = html
	return nil
}

// compareColors returns the rows of a comparison that show the materials'
// colours: their swatches, and the colour difference of each material from
// each one before it.
func compareColors(ms []*evaluate.Summary) []compareRow {
	sw := compareRow{Label: "Colour on screen (sRGB, approximate)"}
	any := false
	for _, m := range ms {
		h := m.Figures.Color.Reflectance.SRGB
		sw.Swatches = append(sw.Swatches, h)
		any = any || h != ""
	}
	if !any {
		return nil
	}
	rows := []compareRow{sw}
	for i := 0; i < len(ms)-1; i++ {
		r := compareRow{Label: "Colour difference from " + ms[i].Front.Title}
		for j, m := range ms {
			de76, de00, ok := datasheet.ColorDifference(ms[i].Figures, m.Figures)
			switch {
			case j <= i:
				r.Cells = append(r.Cells, "")
			case !ok:
				r.Cells = append(r.Cells, "—")
			default:
				r.Cells = append(r.Cells, fmt.Sprintf("ΔE*ab %.1f, ΔE00 %.1f", de76, de00))
			}
		}
		rows = append(rows, r)
	}
	return rows
}

// catalogEntry is one material in catalog.json.
type catalogEntry struct {
	Slug        string           `json:"slug"`
	Title       string           `json:"title"`
	Maker       string           `json:"maker,omitempty"`
	Lab         string           `json:"lab,omitempty"`
	ProductCode string           `json:"product_code,omitempty"`
	Category    string           `json:"category,omitempty"`
	Tags        []string         `json:"tags"`
	Summary     string           `json:"summary,omitempty"`
	License     string           `json:"license,omitempty"`
	Measured    library.Measured `json:"measured"`
	Page        string           `json:"page"`
	Spectrum    string           `json:"spectrum"`
	FiguresFile string           `json:"figures_file"`
	ClaimsFile  string           `json:"claims_file"`
	Source      string           `json:"source"`
	Inputs      []library.Input  `json:"inputs"`
	Claims      []catalogClaim   `json:"claims"` // each with its verdict
	// Headline holds the figures of the material tables, key to value
	// (null when not computed); every figure is in FiguresFile.
	Headline map[string]datasheet.Num `json:"headline"`
	// Weather holds the totals and months of the material's weather
	// series, when its conditions name one (every day is in FiguresFile).
	Weather *datasheet.SeriesFigures `json:"weather,omitempty"`
	// Stack lists the layers, top first, of a material computed as a
	// stack; absent for a measured material.
	Stack []catalogLayer `json:"stack,omitempty"`
}

// catalogLayer is one layer of a stack in catalog.json: a material of the
// library (slug and page) or a layer with spectra of its own (name only).
type catalogLayer struct {
	Name            string   `json:"name"`
	Slug            string   `json:"slug,omitempty"`
	Page            string   `json:"page,omitempty"`
	ThicknessMM     *float64 `json:"thickness_mm,omitempty"`
	ConductivityWmK *float64 `json:"conductivity_w_mk,omitempty"`
}

// catalog is the JSON of catalog.json.
type catalog struct {
	Schema      int                  `json:"schema"`
	Title       string               `json:"title"`
	Description string               `json:"description,omitempty"`
	SiteAddress string               `json:"site_address,omitempty"`
	Generator   string               `json:"generator"`
	Conditions  datasheet.Conditions `json:"conditions"`
	Config      library.Input        `json:"config"`
	Materials   []catalogEntry       `json:"materials"`
	Comparisons []catalogCompare     `json:"comparisons"`
}

type catalogCompare struct {
	Slug      string   `json:"slug"`
	Title     string   `json:"title"`
	Page      string   `json:"page"`
	Materials []string `json:"materials"`
	Reference string   `json:"reference,omitempty"` // slug of the material the others are compared with
	Skin      string   `json:"skin,omitempty"`      // slug of the skin-like surface they are worn over
}

// CatalogSchema is the version of catalog.json. Keys are only added
// within a version. Version 2 links each material's figures.json
// (figures_file) instead of embedding its figures, and adds headline.
const CatalogSchema = 2

func (b *builder) catalog(ms []*evaluate.Summary) ([]byte, error) {
	cfg := b.lib.Config
	c := catalog{Schema: CatalogSchema, Title: cfg.Title, Description: cfg.Description, SiteAddress: cfg.SiteAddress,
		Generator: "skysheet " + b.site.Version, Conditions: cfg.Conditions, Config: cfg.Input,
		Materials: []catalogEntry{}, Comparisons: []catalogCompare{}}
	for _, x := range b.lib.Comparisons {
		cc := catalogCompare{Slug: x.Slug, Title: x.Front.Title, Page: "compare/" + x.Slug + "/index.html"}
		for _, m := range x.Materials {
			cc.Materials = append(cc.Materials, m.Slug)
		}
		if x.Reference != nil {
			cc.Reference = x.Reference.Slug
		}
		if x.Skin != nil {
			cc.Skin = x.Skin.Slug
		}
		c.Comparisons = append(c.Comparisons, cc)
	}
	// The materials' entries are made in parts of pageRows materials, each
	// kept in the cache (see appendMemo), and put in place of the empty
	// list: the first `"materials":[]` of the compact document is the
	// key's, since a string holds a quote only as \".
	doc, err := json.Marshal(c)
	if err != nil {
		return nil, err
	}
	at := bytes.Index(doc, []byte(`"materials":[]`))
	if at < 0 {
		return nil, errors.New(`no "materials" in the catalog`)
	}
	at += len(`"materials":[`)
	var in indenter
	out := in.indent(make([]byte, 0, len(doc)+len(ms)*4096), doc[:at])
	if len(ms) > 0 {
		// The entries stand two levels down, where indenter puts the
		// first of them on a new line and separates them by a comma and a
		// new line; each part is kept indented from there.
		out = append(out, "\n    "...)
		in = indenter{depth: 2}
		out, err = b.appendParts(out, ms, "catalog entries, indented", ",\n    ", func(ms []*evaluate.Summary) ([]byte, error) {
			entries, err := b.catalogEntries(ms)
			if err != nil {
				return nil, err
			}
			part := indenter{depth: 2}
			return part.indent(make([]byte, 0, len(entries)+len(entries)/2), entries), nil
		})
		if err != nil {
			return nil, err
		}
	}
	out = in.indent(out, doc[at:])
	return append(out, '\n'), nil
}

// catalogEntries returns the catalog.json entries of ms as compact JSON,
// separated by commas.
func (b *builder) catalogEntries(ms []*evaluate.Summary) ([]byte, error) {
	es := make([]catalogEntry, 0, len(ms))
	for _, m := range ms {
		es = append(es, catalogEntryOf(m))
	}
	return jsonElements(es)
}

// catalogEntryOf returns the catalog.json entry of m.
func catalogEntryOf(m *evaluate.Summary) catalogEntry {
	fm := m.Front
	dir := materialDir(m.Slug)
	e := catalogEntry{Slug: m.Slug, Title: fm.Title, Maker: fm.Maker, Lab: fm.Lab, ProductCode: fm.ProductCode,
		Category: fm.Category, Tags: uniqueTags(fm.Tags), Summary: fm.Summary, License: fm.License, Measured: fm.Measured,
		Page: dir + "index.html", Spectrum: dir + "spectrum.csv", FiguresFile: dir + "figures.json", ClaimsFile: dir + "claims.json",
		Source: dir + "source.md", Inputs: m.Inputs, Claims: catalogClaims(m.Verdicts), Headline: map[string]datasheet.Num{}}
	for _, col := range tableFigures {
		e.Headline[col.Key] = figureOf(m.Figures, col.Key).Value
	}
	if w := m.Figures.Weather; w != nil {
		totals := *w
		totals.Days, totals.TypicalDay = nil, datasheet.TypicalDay{}
		e.Weather = &totals
	}
	if e.Tags == nil {
		e.Tags = []string{}
	}
	for i, l := range m.Stack {
		cl := catalogLayer{Name: l.Name}
		if l.Material != nil {
			cl.Slug, cl.Page = l.Material.Slug, materialDir(l.Material.Slug)+"index.html"
		}
		if l.Conductor != nil {
			lr := fm.Stack[i]
			cl.ThicknessMM, cl.ConductivityWmK = lr.ThicknessMM, lr.ConductivityWmK
		}
		e.Stack = append(e.Stack, cl)
	}
	return e
}
