package site

import (
	"bytes"
	"fmt"
	"html"
	"math"
	"strconv"
	"strings"
	"sync"

	"github.com/golang/freetype/truetype"
	"github.com/wcharczuk/go-chart/v2"
	"github.com/wcharczuk/go-chart/v2/drawing"
	"golang.org/x/image/font"

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
	colBody    = rgba{0xd9, 0x8c, 0x8c, 0x48} // blackbody shading
	colWindow  = rgba{0x7f, 0xbf, 0xb8, 0x40} // atmospheric window band
	colGrid    = rgba{0xe4, 0xe7, 0xeb, 0xff}
	colAxis    = rgba{0x6a, 0x72, 0x7e, 0xff}
	colText    = rgba{0x3a, 0x42, 0x4d, 0xff}
	colPalette = []rgba{
		{0x1f, 0x5f, 0x8b, 0xff}, {0xa8, 0x32, 0x3e, 0xff}, {0xc7, 0x84, 0x12, 0xff}, {0x3d, 0x7a, 0x3a, 0xff},
		{0x6a, 0x4c, 0x9c, 0xff}, {0x1b, 0x23, 0x2e, 0xff}, {0xbf, 0x5b, 0x8a, 0xff}, {0x00, 0x83, 0x8f, 0xff},
	}
)

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

// band is a vertical shaded band across the plot.
type band struct {
	name   string
	lo, hi float64
	color  rgba
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
	lines          []line
	points         *pointSet
	noLegend       bool
	maxPoints      int // about the most points per piece after thinning; 0 means the width in pixels
}

// pointSet is a set of marked points, each a link, drawn over the plot.
type pointSet struct {
	x, y   []float64
	href   []string
	label  []string // short text next to the point
	title  []string // tooltip
	slug   []string
	colors []rgba
	pix    [][2]int // pixel positions, filled while rendering
}

// svg renders the plot to SVG with role="img" and an aria-label.
func (p plot) svg(ariaLabel string) (string, error) {
	var buf bytes.Buffer
	if err := p.chart().Render(svgRenderer, &buf); err != nil {
		return "", err
	}
	out := buf.String()
	if p.points != nil {
		out = strings.TrimSuffix(out, "</svg>") + p.points.anchors() + "</svg>"
	}
	attrs := `<svg role="img" aria-label="` + html.EscapeString(ariaLabel) + `" `
	return strings.Replace(out, "<svg ", attrs, 1), nil
}

// defaultFont loads go-chart's font once: go-chart's own lazy loading is
// not safe for charts rendered in parallel.
var defaultFont = sync.OnceValues(chart.GetDefaultFont)

// chart returns the go-chart description of the plot.
func (p plot) chart() chart.Chart {
	f, _ := defaultFont() // the font is embedded; a failure leaves nil and go-chart tries again
	c := chart.Chart{
		Font:       f,
		Width:      p.width,
		Height:     p.height,
		Background: chart.Style{Padding: chart.Box{Top: 30, Left: 10, Right: 22, Bottom: 6 + p.legendHeight()}, FillColor: drawing.ColorWhite},
		Canvas:     chart.Style{FillColor: drawing.ColorWhite},
	}
	axisStyle := chart.Style{StrokeColor: colAxis.color(), StrokeWidth: 1, FontColor: colText.color(), FontSize: 10}
	nameStyle := chart.Style{FontColor: colText.color(), FontSize: 10.5}
	grid := chart.Style{StrokeColor: colGrid.color(), StrokeWidth: 1}
	xt := ticks(p.xLo, p.xHi, p.xTicks, p.xFmt, 7)
	yt := ticks(p.yLo, p.yHi, p.yTicks, p.yFmt, 6)
	c.XAxis = chart.XAxis{Name: p.xName, NameStyle: nameStyle, Style: axisStyle, Ticks: xt, GridMajorStyle: grid}
	// go-chart draws its primary y axis on the right; ours is on the left
	// (the secondary axis). The hidden primary axis carries the same ticks
	// because go-chart sizes the secondary range from the primary ticks.
	// The y-axis title is written level above the axis (see yTitle).
	c.YAxis = chart.YAxis{Style: chart.Hidden(), Ticks: yt}
	c.YAxisSecondary = chart.YAxis{Style: axisStyle, Ticks: yt, GridMajorStyle: grid}

	buckets := p.maxPoints / 4
	if buckets == 0 {
		buckets = p.width / 4 // at most 4 points per 4 px: finer than the eye
	}
	for _, b := range p.bands {
		lo, hi := math.Max(b.lo, p.xLo), math.Min(b.hi, p.xHi)
		if hi > lo {
			c.Series = append(c.Series, bandSeries{lo: lo, hi: hi, color: b.color})
		}
	}
	for _, l := range p.lines {
		for _, pc := range l.pieces {
			pc = thin(clip(pc, p.xLo, p.xHi), p.xLo, p.xHi, buckets)
			if len(pc.NM) < 2 {
				continue
			}
			ys := make([]float64, len(pc.V))
			for i, v := range pc.V {
				ys[i] = math.Max(p.yLo, math.Min(p.yHi, v))
			}
			st := chart.Style{StrokeColor: l.color.color(), StrokeWidth: l.width, StrokeDashArray: l.dash}
			if l.fill {
				st.FillColor = l.color.color()
				st.StrokeColor = l.color.alpha(0).color()
			}
			c.Series = append(c.Series, chart.ContinuousSeries{YAxis: chart.YAxisSecondary, XValues: pc.NM, YValues: ys, Style: st})
		}
	}
	if p.points != nil {
		c.Series = append(c.Series, &pointSeries{set: p.points})
	}
	if len(c.Series) == 0 {
		// Nothing to draw: an empty, invisible series keeps the axes.
		c.Series = append(c.Series, chart.ContinuousSeries{YAxis: chart.YAxisSecondary,
			XValues: []float64{p.xLo, p.xHi}, YValues: []float64{p.yLo, p.yLo},
			Style: chart.Style{StrokeColor: drawing.ColorWhite.WithAlpha(0), StrokeWidth: 1}})
	}
	c.Elements = []chart.Renderable{yTitle(p.yName, nameStyle)}
	if !p.noLegend {
		c.Elements = append(c.Elements, legend(p))
	}
	return c
}

// yTitle writes the y-axis title level, above the top left of the plot.
func yTitle(name string, st chart.Style) chart.Renderable {
	return func(r chart.Renderer, box chart.Box, defaults chart.Style) {
		if name == "" {
			return
		}
		r.ClearTextRotation()
		r.SetFont(defaults.GetFont())
		r.SetFontSize(st.FontSize)
		r.SetFontColor(st.FontColor)
		r.Text(name, 10, box.Top-12)
	}
}

// ticks returns axis ticks from lo to hi: the given values, or about n
// round values, always with lo and hi themselves (go-chart takes the axis
// range from the outermost ticks).
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
	label := func(v float64) string { return strconv.FormatFloat(v, 'f', p, 64) }
	var out []chart.Tick
	minGap := (hi - lo) * 0.06
	add := func(v float64) {
		for _, t := range out {
			if math.Abs(t.Value-v) < minGap {
				return
			}
		}
		out = append(out, chart.Tick{Value: v, Label: label(v)})
	}
	add(lo)
	add(hi)
	for _, v := range vals {
		if v > lo && v < hi {
			add(v)
		}
	}
	// Sorted for a stable SVG.
	for i := 1; i < len(out); i++ {
		for j := i; j > 0 && out[j].Value < out[j-1].Value; j-- {
			out[j], out[j-1] = out[j-1], out[j]
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
	var out spectra.Piece
	at := func(i int, x float64) float64 {
		f := (x - p.NM[i-1]) / (p.NM[i] - p.NM[i-1])
		return p.V[i-1] + f*(p.V[i]-p.V[i-1])
	}
	for i := range n {
		x := p.NM[i]
		if i > 0 && p.NM[i-1] < lo && x > lo {
			out.NM, out.V = append(out.NM, lo), append(out.V, at(i, lo))
		}
		if x >= lo && x <= hi {
			out.NM, out.V = append(out.NM, x), append(out.V, p.V[i])
		}
		if i > 0 && p.NM[i-1] < hi && x > hi {
			out.NM, out.V = append(out.NM, hi), append(out.V, at(i, hi))
		}
	}
	return out
}

// thin reduces a piece to at most about 4 points per bucket of (hi−lo)/n:
// in each bucket the first, lowest, highest and last point are kept in
// wavelength order, so peaks and dips survive. Charts only; figures are
// always computed from the full data.
func thin(p spectra.Piece, lo, hi float64, n int) spectra.Piece {
	if len(p.NM) <= 2*n || n <= 0 || !(hi > lo) {
		return p
	}
	var out spectra.Piece
	width := (hi - lo) / float64(n)
	for i := 0; i < len(p.NM); {
		b := math.Floor((p.NM[i] - lo) / width)
		j := i
		lowest, highest := i, i
		for j < len(p.NM) && math.Floor((p.NM[j]-lo)/width) == b {
			if p.V[j] < p.V[lowest] {
				lowest = j
			}
			if p.V[j] > p.V[highest] {
				highest = j
			}
			j++
		}
		keep := []int{i, lowest, highest, j - 1}
		// Sort the four indices and drop repeats.
		for a := 1; a < len(keep); a++ {
			for c := a; c > 0 && keep[c] < keep[c-1]; c-- {
				keep[c], keep[c-1] = keep[c-1], keep[c]
			}
		}
		last := -1
		for _, k := range keep {
			if k != last {
				out.NM, out.V = append(out.NM, p.NM[k]), append(out.V, p.V[k])
				last = k
			}
		}
		i = j
	}
	return out
}

// legendEntry is one line of a legend.
type legendEntry struct {
	name  string
	color rgba
	block bool
	dash  []float64
}

// legendEntries lists the named bands and lines.
func (p plot) legendEntries() []legendEntry {
	var entries []legendEntry
	if p.noLegend {
		return nil
	}
	for _, b := range p.bands {
		if b.name != "" {
			entries = append(entries, legendEntry{b.name, b.color, true, nil})
		}
	}
	for _, l := range p.lines {
		if l.name != "" {
			entries = append(entries, legendEntry{l.name, l.color, l.fill, l.dash})
		}
	}
	return entries
}

// Legend layout: two columns under the x-axis title.
const (
	legendRow    = 15
	legendCols   = 2
	legendBottom = 8
)

// legendHeight is the space the legend takes at the bottom of the chart.
func (p plot) legendHeight() int {
	n := len(p.legendEntries())
	if n == 0 {
		return 0
	}
	return legendBottom + legendRow*((n+legendCols-1)/legendCols)
}

// legend draws the named bands and lines in two columns at the bottom of
// the chart, below the plot and its axis, so that it never hides a curve.
func legend(p plot) chart.Renderable {
	entries := p.legendEntries()
	return func(r chart.Renderer, box chart.Box, defaults chart.Style) {
		if len(entries) == 0 {
			return
		}
		r.ClearTextRotation()
		r.SetFont(defaults.GetFont())
		r.SetFontSize(9)
		swatch, gap := 18, 6
		colW := (box.Right - box.Left) / legendCols
		top := p.height - p.legendHeight()
		for i, e := range entries {
			sx := box.Left + (i%legendCols)*colW
			cy := top + (i/legendCols)*legendRow + legendRow/2
			if e.block {
				r.SetFillColor(e.color.alpha(max(e.color.A, 110)).color())
				r.SetStrokeColor(e.color.alpha(0).color())
				r.SetStrokeWidth(1)
				r.MoveTo(sx, cy-5)
				r.LineTo(sx+swatch, cy-5)
				r.LineTo(sx+swatch, cy+5)
				r.LineTo(sx, cy+5)
				r.Close()
				r.FillStroke()
			} else {
				r.SetFillColor(drawing.Color{})
				r.SetStrokeColor(e.color.color())
				r.SetStrokeWidth(2)
				r.SetStrokeDashArray(e.dash)
				r.MoveTo(sx, cy)
				r.LineTo(sx+swatch, cy)
				r.Stroke()
				r.SetStrokeDashArray(nil)
			}
			r.SetFontColor(colText.color())
			r.Text(fitText(r, e.name, colW-swatch-2*gap), sx+swatch+gap, cy+4)
		}
	}
}

// fitText shortens s with an ellipsis until it measures at most w pixels.
func fitText(r chart.Renderer, s string, w int) string {
	if r.MeasureText(s).Width() <= w {
		return s
	}
	rs := []rune(s)
	for n := len(rs) - 1; n > 0; n-- {
		t := strings.TrimSpace(string(rs[:n])) + "…"
		if r.MeasureText(t).Width() <= w {
			return t
		}
	}
	return "…"
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
	for i := range s.set.x {
		s.set.pix = append(s.set.pix, [2]int{box.Left + xr.Translate(s.set.x[i]), box.Bottom - yr.Translate(s.set.y[i])})
	}
}

// anchors returns the points as SVG links.
func (ps *pointSet) anchors() string {
	var b strings.Builder
	for i, p := range ps.pix {
		col := colPalette[0]
		if i < len(ps.colors) {
			col = ps.colors[i]
		}
		fmt.Fprintf(&b, `<a href="%s" data-slug="%s"><title>%s</title><circle cx="%d" cy="%d" r="6" style="fill:%s;stroke:#ffffff;stroke-width:1.5"/>`,
			html.EscapeString(ps.href[i]), html.EscapeString(ps.slug[i]), html.EscapeString(ps.title[i]), p[0], p[1], col.css())
		if ps.label[i] != "" {
			fmt.Fprintf(&b, `<text x="%d" y="%d" style="font-size:11px;font-family:sans-serif;fill:#3a424d">%s</text>`, p[0]+8, p[1]-6, html.EscapeString(ps.label[i]))
		}
		b.WriteString(`</a>`)
	}
	return b.String()
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

// cachedSVG is chart.SVG with font faces cached across charts. go-chart's
// SVG renderer builds a new TrueType face for every text measurement, which
// dominates the time of a chart; the face depends only on font, size and
// DPI, and measuring with a cached face gives the same widths, so the SVG
// is byte-identical (see TestCachedSVGIdentical).
func cachedSVG(w, h int) (chart.Renderer, error) {
	r, err := chart.SVG(w, h)
	if err != nil {
		return nil, err
	}
	return &measuredSVG{Renderer: r, dpi: chart.DefaultDPI}, nil
}

// faceKey identifies a font face.
type faceKey struct {
	font      *truetype.Font
	size, dpi float64
}

// faceCache holds faces for all charts. A face is not safe for concurrent
// use, so measuring holds the lock.
var faceCache = struct {
	sync.Mutex
	faces map[faceKey]font.Face
}{faces: map[faceKey]font.Face{}}

// measuredSVG tracks the text state that go-chart's SVG renderer keeps to
// itself, and measures text with a cached face.
type measuredSVG struct {
	chart.Renderer
	font      *truetype.Font
	size, dpi float64
	theta     *float64
}

func (r *measuredSVG) ResetStyle()                 { r.Renderer.ResetStyle(); r.size = 0 } // the font is kept
func (r *measuredSVG) SetDPI(dpi float64)          { r.Renderer.SetDPI(dpi); r.dpi = dpi }
func (r *measuredSVG) SetFont(f *truetype.Font)    { r.Renderer.SetFont(f); r.font = f }
func (r *measuredSVG) SetFontSize(size float64)    { r.Renderer.SetFontSize(size); r.size = size }
func (r *measuredSVG) SetTextRotation(rad float64) { r.Renderer.SetTextRotation(rad); r.theta = &rad }
func (r *measuredSVG) ClearTextRotation()          { r.Renderer.ClearTextRotation(); r.theta = nil }

// MeasureText does what the SVG renderer's MeasureText does, with a face
// from the cache.
func (r *measuredSVG) MeasureText(body string) chart.Box {
	var box chart.Box
	if r.font == nil {
		return box
	}
	k := faceKey{r.font, r.size, r.dpi}
	faceCache.Lock()
	face, ok := faceCache.faces[k]
	if !ok {
		face = truetype.NewFace(r.font, &truetype.Options{DPI: r.dpi, Size: r.size})
		faceCache.faces[k] = face
	}
	w := font.MeasureString(face, body).Ceil()
	faceCache.Unlock()
	box.Right = w
	box.Bottom = int(drawing.PointsToPixels(r.dpi, r.size))
	if r.theta == nil {
		return box
	}
	return box.Corners().Rotate(chart.RadiansToDegrees(*r.theta)).Box()
}
