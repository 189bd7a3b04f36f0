package site

import (
	"bytes"
	"cmp"
	"fmt"
	"html"
	"math"
	"slices"
	"sort"
	"strconv"
	"strings"
	"sync"

	"github.com/golang/freetype/truetype"
	"github.com/wcharczuk/go-chart/v2"
	"github.com/wcharczuk/go-chart/v2/drawing"
	"golang.org/x/image/font"
	"golang.org/x/image/math/fixed"

	"skysheet/spectra"
)

// This file is the only one that knows go-chart. Charts are described by a
// plot value (lines, shaded bands, axes) and rendered to SVG.

// rgba is a colour with alpha in 0..255.
type rgba struct{ R, G, B, A uint8 }

func (c rgba) color() drawing.Color { return drawing.Color{R: c.R, G: c.G, B: c.B, A: c.A} }

// css returns the colour in CSS hex form (alpha dropped).
func (c rgba) css() string { return fmt.Sprintf("#%02x%02x%02x", c.R, c.G, c.B) }

func (c rgba) alpha(a uint8) rgba { c.A = a; return c }

// The chart palette: one colour per quantity, and a series palette for
// overlays. Chosen for this project; distinguishable in grey print.
var (
	colR       = rgba{0x1f, 0x5f, 0x8b, 0xff} // reflectance: deep blue
	colT       = rgba{0xc7, 0x84, 0x12, 0xff} // transmittance: amber
	colA       = rgba{0xa8, 0x32, 0x3e, 0xff} // absorptance / emittance: brick red
	colSun     = rgba{0xf2, 0xc9, 0x4c, 0x5a} // solar spectrum shading
	colBody    = rgba{0xf4, 0xdf, 0xdf, 0xff} // blackbody shading: opaque, so that the window band does not tint it
	colWindow  = rgba{0x3f, 0xa3, 0x5f, 0x24} // atmospheric window band: a faint green, its edges carry it
	colWindowE = rgba{0x1e, 0x6b, 0x4a, 0xff} // atmospheric window edges and label
	colMark    = rgba{0x3a, 0x42, 0x4d, 0xff} // marker lines (air temperature)
	colGrid    = rgba{0x1b, 0x23, 0x2e, 0x1c} // translucent: shows over shading too
	colAxis    = rgba{0x6a, 0x72, 0x7e, 0xff}
	colText    = rgba{0x3a, 0x42, 0x4d, 0xff}
	colPalette = []rgba{
		{0x1f, 0x5f, 0x8b, 0xff}, {0xa8, 0x32, 0x3e, 0xff}, {0xc7, 0x84, 0x12, 0xff}, {0x3d, 0x7a, 0x3a, 0xff},
		{0x6a, 0x4c, 0x9c, 0xff}, {0x1b, 0x23, 0x2e, 0xff}, {0xbf, 0x5b, 0x8a, 0xff}, {0x00, 0x83, 0x8f, 0xff},
	}
)

// px is a length in SVG units. A datasheet chart (chartW units wide) is
// drawn about 320 px wide, three to a row, on a desktop page and about
// 58 mm wide, three to a row, on printed A4 or Letter, so that one unit
// comes out at about 0.9 px on screen and 0.16 mm in print.
type px float64

// Text sizes of every chart: 16 units print at 7.3 pt on a chart 58 mm
// wide (16 × 58 / 360 mm), the smallest size the print test allows being
// 7 pt (cmd/skysheet/browser_test.go), and show at about 14 px on screen.
const (
	textTick   px = 16 // tick labels
	textName   px = 16 // axis titles
	textLegend px = 16 // legend entries
	textLabel  px = 16 // labels of points and bands
)

// points converts a size to the points go-chart takes at its DPI.
func (s px) points() float64 { return float64(s) * 72 / chart.DefaultDPI }

// line is one curve of a plot, possibly in several pieces (gaps between
// pieces stay gaps).
type line struct {
	name   string // legend entry; "" for none
	color  rgba
	width  float64
	dash   []float64
	fill   bool // shade the area between the curve and zero
	pieces []spectra.Piece
}

// band is a vertical shaded band across the plot, optionally with a line
// at each edge and a short label above the plot.
type band struct {
	name   string
	lo, hi float64
	color  rgba
	edge   rgba   // colour of the edge lines; zero alpha for none
	label  string // written above the plot, centred on the band, where it fits
}

// rule is a thin straight line across the whole plot: vertical at x = at,
// or horizontal at y = at.
type rule struct {
	name     string // legend entry; "" for none
	at       float64
	vertical bool
	color    rgba
	dash     []float64
}

// plot describes a chart.
type plot struct {
	width, height  int
	xName, yName   string
	xLo, xHi       float64
	yLo, yHi       float64
	xTicks, yTicks []float64 // nil: chosen from the range
	xFmt, yFmt     string    // strconv 'f' precision; -1 for shortest
	bands          []band
	rules          []rule
	lines          []line
	points         *pointSet
	noLegend       bool
}

// pointSet is a set of marked points, each a link, drawn over the plot.
type pointSet struct {
	x, y   []float64
	href   []string
	label  []string // short text next to the point
	title  []string // tooltip
	slug   []string
	colors []rgba
	// stroke is the ring around each point; the zero value is white.
	// Points drawn in a material's own colour take a dark ring, so that a
	// white or pale material shows on the white plot.
	stroke rgba
	pix    [][2]int  // pixel positions, filled while rendering
	box    chart.Box // the plot box, filled while rendering
	// linkAll makes every point a link with a tooltip; otherwise only the
	// labelled points are, and the rest are drawn as one shape.
	linkAll bool
}

// svg renders the plot to SVG with role="img" ("group" where its
// points are links) and an aria-label.
func (p plot) svg(ariaLabel string) (string, error) {
	var buf bytes.Buffer
	if err := p.chart().Render(svgRenderer, &buf); err != nil {
		return "", err
	}
	out := buf.String()
	if p.points != nil {
		out = strings.TrimSuffix(out, "</svg>") + p.points.anchors() + "</svg>"
	}
	// A chart whose points are links is a group, not an image: the
	// children of an image are presentational and may not be links
	// (WAI-ARIA 1.2, role img).
	role := "img"
	if p.points != nil {
		role = "group"
	}
	attrs := `<svg role="` + role + `" aria-label="` + html.EscapeString(ariaLabel) + `" `
	return strings.Replace(out, "<svg ", attrs, 1), nil
}

// defaultFont loads go-chart's font once: go-chart's own lazy loading is
// not safe for charts rendered in parallel.
var defaultFont = sync.OnceValues(chart.GetDefaultFont)

// Margins of the chart around the plot and its axes.
const (
	padTop, padLeft, padRight, padBottom = 40, 10, 18, 6
)

// chart returns the go-chart description of the plot.
func (p plot) chart() chart.Chart {
	f, _ := defaultFont() // the font is embedded; a failure leaves nil and go-chart tries again
	lg := p.legendLayout()
	// The height allows for two rows of legend; a longer legend makes the
	// chart taller rather than the plot smaller.
	p.height += max(0, lg.rows-legendRows) * legendRow
	// Band labels take a row of their own between the y-axis title and
	// the plot, which is that much shorter.
	top := padTop
	if p.bandLabelled() {
		top += bandLabelRow
	}
	c := chart.Chart{
		Font:       f,
		Width:      p.width,
		Height:     p.height,
		Background: chart.Style{Padding: chart.Box{Top: top, Left: padLeft, Right: padRight, Bottom: padBottom + lg.height()}, FillColor: drawing.ColorWhite},
		Canvas:     chart.Style{FillColor: drawing.ColorWhite},
	}
	axisStyle := chart.Style{StrokeColor: colAxis.color(), StrokeWidth: 1, FontColor: colText.color(), FontSize: textTick.points()}
	nameStyle := chart.Style{FontColor: colText.color(), FontSize: textName.points()}
	xt := ticks(p.xLo, p.xHi, p.xTicks, p.xFmt, 7)
	yt := ticks(p.yLo, p.yHi, p.yTicks, p.yFmt, 6)
	// Labels that would run into each other on this chart's axes lose
	// their text (the grid line stays): the plot is about the chart less
	// its margins and the y tick labels wide, and its height less the
	// margins, the x axis and the legend.
	yw := 0
	for _, t := range yt {
		yw = max(yw, textWidth(t.Label, textTick))
	}
	plotW := p.width - padLeft - padRight - yw - 10
	plotH := p.height - top - padBottom - lg.height() - 3*int(textTick)
	xt = spaceLabels(xt, p.xLo, p.xHi, float64(plotW), func(l string) float64 { return float64(textWidth(l, textTick)) + 6 })
	yt = spaceLabels(yt, p.yLo, p.yHi, float64(plotH), func(string) float64 { return float64(textTick) + 2 })
	c.XAxis = chart.XAxis{Name: p.xName, NameStyle: nameStyle, Style: axisStyle, Ticks: xt}
	// go-chart draws its primary y axis on the right; ours is on the left
	// (the secondary axis). The hidden primary axis carries the same ticks
	// because go-chart sizes the secondary range from the primary ticks.
	// The y-axis title is written level above the axis (see yTitle).
	c.YAxis = chart.YAxis{Style: chart.Hidden(), Ticks: yt}
	c.YAxisSecondary = chart.YAxis{Style: axisStyle, Ticks: yt}

	// Drawing order: shaded bands, shaded curves, grid, band edges and
	// rules, then the curves, so that no shading hides a line. (go-chart
	// would draw the grid first, under opaque shading.)
	var bands []band
	for _, b := range p.bands {
		lo, hi := math.Max(b.lo, p.xLo), math.Min(b.hi, p.xHi)
		if hi > lo {
			b.lo, b.hi = lo, hi
			bands = append(bands, b)
			c.Series = append(c.Series, bandSeries{lo: lo, hi: hi, color: b.color})
		}
	}
	var curves []chart.Series
	for _, l := range p.lines {
		var pieces []spectra.Piece
		for _, pc := range l.pieces {
			// About one point per unit of the plot's width, which the
			// page draws at a pixel or more (see thin).
			pieces = append(pieces, thin(clip(pc, p.xLo, p.xHi), p.xLo, p.xHi, plotW)...)
		}
		for _, pc := range pieces {
			if len(pc.NM) < 2 {
				continue
			}
			ys := make([]float64, len(pc.V))
			for i, v := range pc.V {
				ys[i] = math.Max(p.yLo, math.Min(p.yHi, v))
			}
			st := chart.Style{StrokeColor: l.color.color(), StrokeWidth: l.width, StrokeDashArray: l.dash}
			s := chart.ContinuousSeries{YAxis: chart.YAxisSecondary, XValues: pc.NM, YValues: ys, Style: st}
			if l.fill {
				s.Style.FillColor = l.color.color()
				s.Style.StrokeColor = l.color.alpha(0).color()
				c.Series = append(c.Series, s)
				continue
			}
			curves = append(curves, s)
		}
	}
	// The grid is always there: with nothing else to draw, it keeps the
	// axes (go-chart draws the left axis only for a series on it).
	c.Series = append(c.Series, gridSeries{xt: xt, yt: yt})
	for _, b := range bands {
		if b.edge.A != 0 {
			c.Series = append(c.Series, ruleSeries{at: b.lo, vertical: true, color: b.edge}, ruleSeries{at: b.hi, vertical: true, color: b.edge})
		}
	}
	for _, r := range p.rules {
		lo, hi := p.yLo, p.yHi
		if r.vertical {
			lo, hi = p.xLo, p.xHi
		}
		if r.at >= lo && r.at <= hi {
			c.Series = append(c.Series, ruleSeries{at: r.at, vertical: r.vertical, color: r.color, dash: r.dash})
		}
	}
	c.Series = append(c.Series, curves...)
	if p.points != nil {
		c.Series = append(c.Series, &pointSeries{set: p.points})
	}
	c.Elements = []chart.Renderable{yTitle(p.yName, nameStyle, top-padTop), bandLabels(p, bands)}
	if len(lg.entries) > 0 {
		c.Elements = append(c.Elements, lg.draw(p))
	}
	return c
}

// yTitleX is where the y-axis title starts.
const yTitleX = 10

// bandLabelRow is the height of the row of band labels above the plot.
const bandLabelRow = 20

// bandLabelled tells whether any band of the plot has a label.
func (p plot) bandLabelled() bool {
	for _, b := range p.bands {
		if b.label != "" && math.Min(b.hi, p.xHi) > math.Max(b.lo, p.xLo) {
			return true
		}
	}
	return false
}

// yTitle writes the y-axis title level, above the top left of the plot,
// raised by up above the row of band labels, if any.
func yTitle(name string, st chart.Style, up int) chart.Renderable {
	return func(r chart.Renderer, box chart.Box, defaults chart.Style) {
		if name == "" {
			return
		}
		r.ClearTextRotation()
		r.SetFont(defaults.GetFont())
		r.SetFontSize(st.FontSize)
		r.SetFontColor(st.FontColor)
		r.Text(name, yTitleX, box.Top-12-up)
	}
}

// bandLabels writes the labels of the bands in their row above the plot,
// centred on each band, leaving out a label that would run into another
// label or the edge of the chart; the legend names every band in full
// anyway.
func bandLabels(p plot, bands []band) chart.Renderable {
	return func(r chart.Renderer, box chart.Box, defaults chart.Style) {
		taken := 0
		xr := chart.ContinuousRange{Min: p.xLo, Max: p.xHi, Domain: box.Width()}
		for _, b := range bands {
			if b.label == "" {
				continue
			}
			// Centred on the band, or as far left of that as the text
			// before it needs, within the band.
			w := textWidth(b.label, textLabel)
			x0, x1 := box.Left+xr.Translate(b.lo), box.Left+xr.Translate(b.hi)
			x := max((x0+x1-w)/2, taken)
			if x+w > max(x1, (x0+x1+w)/2) || x+w > p.width-4 {
				continue
			}
			r.ClearTextRotation()
			r.SetFont(defaults.GetFont())
			r.SetFontSize(textLabel.points())
			col := b.edge
			if col.A == 0 {
				col = colText
			}
			r.SetFontColor(col.color())
			r.Text(b.label, x, box.Top-8)
			taken = x + w + 10
		}
	}
}

// ticks returns axis ticks from lo to hi: the given values, or about n
// round values, always with lo and hi themselves (go-chart takes the axis
// range from the outermost ticks). A labelled tick closer than 8 % of the
// range to one kept before it is dropped; the ends come first. Where the
// values are given, an end that is not one of them is kept without a
// label, so that the axis may end between round values.
func ticks(lo, hi float64, given []float64, prec string, n int) []chart.Tick {
	vals := given
	if vals == nil {
		step := niceStep((hi - lo) / float64(n))
		for v := math.Ceil(lo/step) * step; v <= hi+step*1e-9; v += step {
			vals = append(vals, math.Round(v/step)*step)
		}
	}
	p := -1
	if prec != "" {
		p, _ = strconv.Atoi(prec)
	}
	label := func(v float64) string {
		if v == 0 {
			v = 0 // not −0, which would be labelled "-0.0"
		}
		return strconv.FormatFloat(v, 'f', p, 64)
	}
	var out []chart.Tick
	minGap := (hi - lo) * 0.08 // on a 200 px axis, 16 px: a line of tick text
	add := func(v float64, labelled bool) {
		for _, t := range out {
			if t.Value == v || labelled && t.Label != "" && math.Abs(t.Value-v) < minGap {
				return
			}
		}
		t := chart.Tick{Value: v}
		if labelled {
			t.Label = label(v)
		}
		out = append(out, t)
	}
	for _, end := range []float64{lo, hi} {
		add(end, given == nil || slices.Contains(given, end))
	}
	for _, v := range vals {
		if v > lo && v < hi {
			add(v, true)
		}
	}
	// Sorted for a stable SVG.
	slices.SortFunc(out, func(a, b chart.Tick) int { return cmp.Compare(a.Value, b.Value) })
	return out
}

// spaceLabels removes the label of every tick whose text, extent(label)
// long along an axis of length units from lo to hi and centred on the
// tick, would overlap the text of a labelled tick kept before it; the
// ends are kept first, then the ticks from low to high.
func spaceLabels(ts []chart.Tick, lo, hi, length float64, extent func(string) float64) []chart.Tick {
	if !(hi > lo) || !(length > 0) {
		return ts
	}
	out := slices.Clone(ts)
	pos := func(t chart.Tick) float64 { return (t.Value - lo) / (hi - lo) * length }
	var kept []int
	clear := func(i int) bool {
		for _, k := range kept {
			if math.Abs(pos(out[i])-pos(out[k])) < (extent(out[i].Label)+extent(out[k].Label))/2 {
				return false
			}
		}
		return true
	}
	order := make([]int, 0, len(out))
	if len(out) > 0 {
		order = append(order, 0, len(out)-1)
	}
	for i := 1; i < len(out)-1; i++ {
		order = append(order, i)
	}
	for n, i := range order {
		if out[i].Label == "" || n == 1 && i == 0 {
			continue
		}
		if clear(i) {
			kept = append(kept, i)
		} else {
			out[i].Label = ""
		}
	}
	return out
}

// niceStep rounds a step up to 1, 2, 2.5 or 5 times a power of ten.
func niceStep(raw float64) float64 {
	if !(raw > 0) {
		return 1
	}
	mag := math.Pow(10, math.Floor(math.Log10(raw)))
	for _, m := range []float64{1, 2, 2.5, 5, 10} {
		if raw <= m*mag*(1+1e-9) {
			return m * mag
		}
	}
	return 10 * mag
}

// clip returns the part of p within [lo, hi], with end points interpolated
// at lo and hi where p crosses them.
func clip(p spectra.Piece, lo, hi float64) spectra.Piece {
	n := len(p.NM)
	if n == 0 || p.NM[n-1] < lo || p.NM[0] > hi {
		return spectra.Piece{}
	}
	// The points inside are p[i0:i1]; an end is interpolated where the
	// point before it lies outside.
	i0, _ := slices.BinarySearch(p.NM, lo)                         // first ≥ lo
	i1 := sort.Search(n, func(i int) bool { return p.NM[i] > hi }) // first > hi
	at := func(i int, x float64) float64 {
		f := (x - p.NM[i-1]) / (p.NM[i] - p.NM[i-1])
		return p.V[i-1] + f*(p.V[i]-p.V[i-1])
	}
	out := spectra.Piece{NM: make([]float64, 0, i1-i0+2), V: make([]float64, 0, i1-i0+2)}
	if i0 > 0 && p.NM[i0] > lo {
		out.NM, out.V = append(out.NM, lo), append(out.V, at(i0, lo))
	}
	out.NM, out.V = append(out.NM, p.NM[i0:i1]...), append(out.V, p.V[i0:i1]...)
	if i1 < n && p.NM[i1-1] < hi {
		out.NM, out.V = append(out.NM, hi), append(out.V, at(i1, hi))
	}
	return out
}

// swatch is how a legend entry shows its line or shading.
type swatch int

const (
	swatchLine  swatch = iota // a short horizontal line
	swatchBlock               // a shaded block
	swatchBand                // a shaded block between two edge lines
	swatchRule                // a short vertical line
)

// legendEntry is one entry of a legend.
type legendEntry struct {
	name  string
	color rgba
	edge  rgba
	kind  swatch
	dash  []float64
}

// legendEntries lists the named bands, rules and lines.
func (p plot) legendEntries() []legendEntry {
	var entries []legendEntry
	if p.noLegend {
		return nil
	}
	for _, b := range p.bands {
		if b.name == "" {
			continue
		}
		e := legendEntry{name: b.name, color: b.color, kind: swatchBlock}
		if b.edge.A != 0 {
			e.kind, e.edge = swatchBand, b.edge
		}
		entries = append(entries, e)
	}
	for _, r := range p.rules {
		if r.name != "" {
			kind := swatchLine
			if r.vertical {
				kind = swatchRule
			}
			entries = append(entries, legendEntry{name: r.name, color: r.color, kind: kind, dash: r.dash})
		}
	}
	for _, l := range p.lines {
		if l.name != "" {
			kind := swatchLine
			if l.fill {
				kind = swatchBlock
			}
			entries = append(entries, legendEntry{name: l.name, color: l.color, kind: kind, dash: l.dash})
		}
	}
	return entries
}

// Legend layout: one or two columns under the x-axis title.
const (
	legendRow    = 23 // height of a row
	legendTop    = 8  // space above the first row
	legendSwatch = 22 // width of a swatch
	legendGap    = 7  // between swatch and text
	legendColGap = 16 // between columns
	legendRows   = 2  // rows that plot.height allows for
)

// legendLayout is the arrangement of a legend.
type legendLayout struct {
	entries    []legendEntry
	cols, rows int
	col2       int        // x of the second column
	lines      [][]string // the text of each entry, one or more lines
	row        []int      // the row of each entry's first line
}

// legendLayout puts the entries in rows of two when the two columns fit
// side by side across the chart, else in one column, where an entry too
// long for the width runs on over as many rows as it needs.
func (p plot) legendLayout() legendLayout {
	lg := legendLayout{entries: p.legendEntries(), cols: 1}
	if len(lg.entries) == 0 {
		return legendLayout{}
	}
	var w [2]int
	for i, e := range lg.entries {
		w[i%2] = max(w[i%2], legendSwatch+legendGap+textWidth(e.name, textLegend))
	}
	// Even columns when they fit, else the second column right after the
	// first.
	half := (p.legendWidth() + legendColGap) / 2
	switch {
	case len(lg.entries) == 1:
	case max(w[0], w[1])+legendColGap <= half:
		lg.cols, lg.col2 = 2, padLeft+half
	case w[0]+legendColGap+w[1] <= p.legendWidth():
		lg.cols, lg.col2 = 2, padLeft+w[0]+legendColGap
	}
	for i, e := range lg.entries {
		if lg.cols == 2 {
			lg.lines = append(lg.lines, []string{e.name})
			lg.row = append(lg.row, i/2)
			lg.rows = i/2 + 1
			continue
		}
		ls := wrapText(e.name, p.legendWidth()-legendSwatch-legendGap)
		lg.lines = append(lg.lines, ls)
		lg.row = append(lg.row, lg.rows)
		lg.rows += len(ls)
	}
	return lg
}

// wrapText breaks s at spaces into lines estimated to take at most w
// pixels in the legend; a word longer than that is shortened with an
// ellipsis.
func wrapText(s string, w int) []string {
	var out []string
	line := ""
	for _, word := range strings.Fields(s) {
		if line != "" && textWidth(line+" "+word, textLegend) <= w {
			line += " " + word
			continue
		}
		if line != "" {
			out = append(out, line)
		}
		line = fitText(word, w)
	}
	if line != "" || len(out) == 0 {
		out = append(out, line)
	}
	return out
}

// legendWidth is the width the legend may take.
func (p plot) legendWidth() int { return p.width - padLeft - padRight }

// height is the space the legend takes at the bottom of the chart.
func (lg legendLayout) height() int {
	if lg.rows == 0 {
		return 0
	}
	return legendTop + legendRow*lg.rows
}

// draw draws the legend at the bottom of the chart, below the plot and
// its axis, so that it never hides a curve. Entries run in rows.
func (lg legendLayout) draw(p plot) chart.Renderable {
	return func(r chart.Renderer, box chart.Box, defaults chart.Style) {
		r.ClearTextRotation()
		r.SetFont(defaults.GetFont())
		r.SetFontSize(textLegend.points())
		top := p.height - padBottom - lg.height() + legendTop
		for i, e := range lg.entries {
			sx, w := padLeft, p.legendWidth()
			if lg.cols == 2 && i%2 == 1 {
				sx, w = lg.col2, p.width-padRight-lg.col2
			}
			cy := top + lg.row[i]*legendRow + legendRow/2
			drawSwatch(r, e, sx, cy)
			r.SetFontColor(colText.color())
			for k, l := range lg.lines[i] {
				r.Text(fitText(l, w-legendSwatch-legendGap), sx+legendSwatch+legendGap, cy+5+k*legendRow)
			}
		}
	}
}

// drawSwatch draws the swatch of a legend entry, legendSwatch wide and
// centred on height cy.
func drawSwatch(r chart.Renderer, e legendEntry, sx, cy int) {
	stroke := func(c rgba, width float64, dash []float64, x0, y0, x1, y1 int) {
		r.SetFillColor(drawing.Color{})
		r.SetStrokeColor(c.color())
		r.SetStrokeWidth(width)
		r.SetStrokeDashArray(dash)
		r.MoveTo(x0, y0)
		r.LineTo(x1, y1)
		r.Stroke()
		r.SetStrokeDashArray(nil)
	}
	switch e.kind {
	case swatchBlock, swatchBand:
		fill := e.color
		if e.kind == swatchBlock {
			fill.A = max(fill.A, 110) // a faint shade is hard to see in a small block
		}
		r.SetFillColor(fill.color())
		r.SetStrokeColor(e.color.alpha(0).color())
		r.SetStrokeWidth(1)
		r.MoveTo(sx, cy-7)
		r.LineTo(sx+legendSwatch, cy-7)
		r.LineTo(sx+legendSwatch, cy+7)
		r.LineTo(sx, cy+7)
		r.Close()
		r.FillStroke()
		if e.kind == swatchBand {
			stroke(e.edge, 1, nil, sx, cy-8, sx, cy+8)
			stroke(e.edge, 1, nil, sx+legendSwatch, cy-8, sx+legendSwatch, cy+8)
		}
	case swatchRule:
		stroke(e.color, 1, e.dash, sx+legendSwatch/2, cy-8, sx+legendSwatch/2, cy+8)
	default:
		stroke(e.color, 2, e.dash, sx, cy, sx+legendSwatch, cy)
	}
}

// fitText shortens s with an ellipsis until it is estimated to take at
// most w pixels in the legend.
func fitText(s string, w int) string {
	if textWidth(s, textLegend) <= w {
		return s
	}
	rs := []rune(s)
	for n := len(rs) - 1; n > 0; n-- {
		t := strings.TrimSpace(string(rs[:n])) + "…"
		if textWidth(t, textLegend) <= w {
			return t
		}
	}
	return "…"
}

// fallbackWiden is how much wider than the chart font text may be drawn:
// the SVG names the chart font, and a browser that lacks it draws a
// generic sans-serif, some of which run up to about a sixth wider (common
// practice, no source; checked by eye on the demo site).
const fallbackWiden = 1.18

// textWidth estimates the width of s drawn at the given size, for layout:
// measured with the chart font and widened by fallbackWiden.
func textWidth(s string, size px) int {
	f, err := defaultFont()
	if err != nil || s == "" {
		return 0
	}
	w := measureWith(faceKey{f, size.points(), chart.DefaultDPI}, s)
	return int(math.Ceil(float64(w) / 64 * fallbackWiden))
}

// bandSeries shades the full height of the plot between two x values; it
// is drawn first, behind the curves.
type bandSeries struct {
	lo, hi float64
	color  rgba
}

func (s bandSeries) GetName() string           { return "" }
func (s bandSeries) GetYAxis() chart.YAxisType { return chart.YAxisSecondary }
func (s bandSeries) GetStyle() chart.Style     { return chart.Style{} }
func (s bandSeries) Validate() error           { return nil }
func (s bandSeries) Render(r chart.Renderer, box chart.Box, xr, _ chart.Range, _ chart.Style) {
	x0, x1 := box.Left+xr.Translate(s.lo), box.Left+xr.Translate(s.hi)
	r.SetFillColor(s.color.color())
	r.SetStrokeColor(s.color.alpha(0).color())
	r.SetStrokeWidth(1)
	r.MoveTo(x0, box.Top)
	r.LineTo(x1, box.Top)
	r.LineTo(x1, box.Bottom)
	r.LineTo(x0, box.Bottom)
	r.Close()
	r.Fill()
}

// gridSeries draws a grid line at every tick inside the plot.
type gridSeries struct{ xt, yt []chart.Tick }

func (s gridSeries) GetName() string           { return "" }
func (s gridSeries) GetYAxis() chart.YAxisType { return chart.YAxisSecondary }
func (s gridSeries) GetStyle() chart.Style     { return chart.Style{} }
func (s gridSeries) Validate() error           { return nil }
func (s gridSeries) Render(r chart.Renderer, box chart.Box, xr, yr chart.Range, _ chart.Style) {
	r.SetFillColor(drawing.Color{})
	r.SetStrokeColor(colGrid.color())
	r.SetStrokeWidth(1)
	for _, t := range s.xt {
		if x := box.Left + xr.Translate(t.Value); x > box.Left && x < box.Right {
			r.MoveTo(x, box.Top)
			r.LineTo(x, box.Bottom)
		}
	}
	for _, t := range s.yt {
		if y := box.Bottom - yr.Translate(t.Value); y > box.Top && y < box.Bottom {
			r.MoveTo(box.Left, y)
			r.LineTo(box.Right, y)
		}
	}
	r.Stroke()
}

// ruleSeries draws a rule across the plot.
type ruleSeries struct {
	at       float64
	vertical bool
	color    rgba
	dash     []float64
}

func (s ruleSeries) GetName() string           { return "" }
func (s ruleSeries) GetYAxis() chart.YAxisType { return chart.YAxisSecondary }
func (s ruleSeries) GetStyle() chart.Style     { return chart.Style{} }
func (s ruleSeries) Validate() error           { return nil }
func (s ruleSeries) Render(r chart.Renderer, box chart.Box, xr, yr chart.Range, _ chart.Style) {
	r.SetFillColor(drawing.Color{})
	r.SetStrokeColor(s.color.color())
	r.SetStrokeWidth(1)
	r.SetStrokeDashArray(s.dash)
	if s.vertical {
		x := box.Left + xr.Translate(s.at)
		r.MoveTo(x, box.Top)
		r.LineTo(x, box.Bottom)
	} else {
		y := box.Bottom - yr.Translate(s.at)
		r.MoveTo(box.Left, y)
		r.LineTo(box.Right, y)
	}
	r.Stroke()
	r.SetStrokeDashArray(nil)
}

// pointSeries places the points of a pointSet on the chart: go-chart gives
// it the plot box and ranges, from which it records each point's pixel
// position. The points themselves are written as links after rendering.
type pointSeries struct{ set *pointSet }

func (s *pointSeries) GetName() string                { return "" }
func (s *pointSeries) GetYAxis() chart.YAxisType      { return chart.YAxisSecondary }
func (s *pointSeries) GetStyle() chart.Style          { return chart.Style{} }
func (s *pointSeries) Validate() error                { return nil }
func (s *pointSeries) Len() int                       { return len(s.set.x) }
func (s *pointSeries) GetValues(i int) (x, y float64) { return s.set.x[i], s.set.y[i] }
func (s *pointSeries) Render(r chart.Renderer, box chart.Box, xr, yr chart.Range, _ chart.Style) {
	s.set.pix = s.set.pix[:0]
	s.set.box = box
	for i := range s.set.x {
		s.set.pix = append(s.set.pix, [2]int{box.Left + xr.Translate(s.set.x[i]), box.Bottom - yr.Translate(s.set.y[i])})
	}
}

// pointRadius is the radius of a point of a pointSet.
const pointRadius = 6

// anchors returns the points as SVG links, each with its label where the
// label fits; without linkAll, the points without a label as one path.
func (ps *pointSet) anchors() string {
	var b strings.Builder
	family := "sans-serif"
	if f, err := defaultFont(); err == nil {
		family = "'" + f.Name(truetype.NameIDFontFamily) + "',sans-serif"
	}
	spots, fits := ps.labelSpots()
	ring := "#ffffff"
	if ps.stroke != (rgba{}) {
		ring = ps.stroke.css()
	}
	if !ps.linkAll {
		// One dot per pixel position, drawn as zero-length round-capped
		// strokes: a few bytes a point.
		seen := map[[2]int]bool{}
		var d strings.Builder
		for i, p := range ps.pix {
			if fits[i] || seen[p] {
				continue
			}
			seen[p] = true
			fmt.Fprintf(&d, "M%d %dh0", p[0], p[1])
		}
		if d.Len() > 0 {
			fmt.Fprintf(&b, `<path d="%s" style="fill:none;stroke:%s;stroke-width:%d;stroke-linecap:round;opacity:0.6" aria-hidden="true"/>`,
				d.String(), colPalette[0].css(), pointRadius)
		}
	}
	for i, p := range ps.pix {
		if !ps.linkAll && !fits[i] {
			continue
		}
		col := colPalette[0]
		if i < len(ps.colors) {
			col = ps.colors[i]
		}
		fmt.Fprintf(&b, `<a href="%s" data-slug="%s"><title>%s</title><circle cx="%d" cy="%d" r="%d" style="fill:%s;stroke:%s;stroke-width:1.5"/>`,
			html.EscapeString(ps.href[i]), html.EscapeString(ps.slug[i]), html.EscapeString(ps.title[i]), p[0], p[1], pointRadius, col.css(), ring)
		if fits[i] {
			fmt.Fprintf(&b, `<text x="%d" y="%d" style="font-size:%gpx;font-family:%s;fill:%s;stroke:#ffffff;stroke-width:3px;stroke-linejoin:round;paint-order:stroke">%s</text>`,
				spots[i][0], spots[i][1], float64(textLabel), html.EscapeString(family), colText.css(), html.EscapeString(ps.label[i]))
		}
		b.WriteString(`</a>`)
	}
	return b.String()
}

// labelGrid is the cell size, in pixels, of the grid that finds what a
// label would overlap.
const labelGrid = 32

// labelSpots places the label of each point, in order, at the first of a
// few spots around the point that keeps it inside the plot and clear of
// every point and of the labels placed before. A label with no clear spot
// is left out (fits false). The rectangles taken are kept in a grid of
// labelGrid cells, so that each spot is compared with its neighbours only,
// not with every point. It returns the start of each label's baseline.
func (ps *pointSet) labelSpots() (spots [][2]int, fits []bool) {
	type rect struct{ x0, y0, x1, y1 int }
	overlaps := func(a, b rect) bool { return min(a.x1, b.x1) > max(a.x0, b.x0) && min(a.y1, b.y1) > max(a.y0, b.y0) }
	grid := map[[2]int][]rect{}
	cells := func(r rect, f func(k [2]int) bool) bool {
		for gx := floorDiv(r.x0, labelGrid); gx <= floorDiv(r.x1, labelGrid); gx++ {
			for gy := floorDiv(r.y0, labelGrid); gy <= floorDiv(r.y1, labelGrid); gy++ {
				if !f([2]int{gx, gy}) {
					return false
				}
			}
		}
		return true
	}
	take := func(r rect) {
		cells(r, func(k [2]int) bool { grid[k] = append(grid[k], r); return true })
	}
	clear := func(r rect) bool {
		return cells(r, func(k [2]int) bool {
			for _, t := range grid[k] {
				if overlaps(r, t) {
					return false
				}
			}
			return true
		})
	}
	for _, p := range ps.pix {
		take(rect{p[0] - pointRadius - 1, p[1] - pointRadius - 1, p[0] + pointRadius + 1, p[1] + pointRadius + 1})
	}
	h := int(math.Ceil(float64(textLabel)))
	asc, desc := h*4/5, h/4 // baseline split of the text height
	d := pointRadius + 3
	spots, fits = make([][2]int, len(ps.pix)), make([]bool, len(ps.pix))
	for i, p := range ps.pix {
		if ps.label[i] == "" {
			continue
		}
		w := textWidth(ps.label[i], textLabel)
		cx, cy := p[0], p[1]
		mid := cy + (asc-desc)/2 // baseline that centres the text on the point
		for _, s := range [][2]int{
			{cx + d, mid},                      // right
			{cx - d - w, mid},                  // left
			{cx + d - 3, cy - d + 1},           // above right
			{cx + d - 3, cy + d + asc - 1},     // below right
			{cx - d + 3 - w, cy - d + 1},       // above left
			{cx - d + 3 - w, cy + d + asc - 1}, // below left
			{cx - w/2, cy - d - 1},             // above
			{cx - w/2, cy + d + asc + 1},       // below
		} {
			r := rect{s[0] - 1, s[1] - asc - 1, s[0] + w + 1, s[1] + desc + 1}
			if r.x0 < ps.box.Left || r.x1 > ps.box.Right || r.y0 < ps.box.Top || r.y1 > ps.box.Bottom || !clear(r) {
				continue
			}
			spots[i], fits[i] = s, true
			take(r)
			break
		}
	}
	return spots, fits
}

// floorDiv is a / b rounded down, for b > 0.
func floorDiv(a, b int) int {
	if a < 0 {
		return -((-a + b - 1) / b)
	}
	return a / b
}

// svgRenderer is the renderer provider of every chart: go-chart's SVG
// renderer with cached font faces and escaped text.
func svgRenderer(w, h int) (chart.Renderer, error) {
	r, err := cachedSVG(w, h)
	if err != nil {
		return nil, err
	}
	return escapedText{r}, nil
}

// escapedText escapes text for XML: go-chart writes text into the SVG as
// given.
type escapedText struct{ chart.Renderer }

func (r escapedText) Text(body string, x, y int) { r.Renderer.Text(html.EscapeString(body), x, y) }

// cachedSVG writes what chart.SVG writes, with font faces and text widths
// cached across charts (go-chart's SVG renderer builds a new TrueType face
// for every text measurement) and paths and styles written straight into
// one buffer: the SVG is byte-identical (see TestCachedSVGIdentical).
func cachedSVG(w, h int) (chart.Renderer, error) { return newSVGWriter(w, h) }

// faceKey identifies a font face.
type faceKey struct {
	font      *truetype.Font
	size, dpi float64
}

// faceCache holds faces for all charts, and the widths of the strings
// measured with them: a library's charts measure the same tick labels and
// axis names over and over, and a face loads a glyph's outline for each
// advance. A face is not safe for concurrent use, so measuring holds the
// lock.
var faceCache = struct {
	sync.Mutex
	faces  map[faceKey]font.Face
	widths map[widthKey]fixed.Int26_6
}{faces: map[faceKey]font.Face{}, widths: map[widthKey]fixed.Int26_6{}}

// widthKey is a string measured with a face.
type widthKey struct {
	face faceKey
	s    string
}

// maxCachedWidths bounds the width cache; it is emptied when full.
const maxCachedWidths = 1 << 16

// measureWith returns font.MeasureString of s with the face of k: from
// the cache when s was measured with it before, else with the face, which
// it makes once.
func measureWith(k faceKey, s string) fixed.Int26_6 {
	faceCache.Lock()
	defer faceCache.Unlock()
	wk := widthKey{k, s}
	if w, ok := faceCache.widths[wk]; ok {
		return w
	}
	face, ok := faceCache.faces[k]
	if !ok {
		face = truetype.NewFace(k.font, &truetype.Options{DPI: k.dpi, Size: k.size})
		faceCache.faces[k] = face
	}
	w := font.MeasureString(face, s)
	if len(faceCache.widths) >= maxCachedWidths {
		clear(faceCache.widths)
	}
	faceCache.widths[wk] = w
	return w
}
