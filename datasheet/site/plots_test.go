package site

import (
	"fmt"
	"math"
	"regexp"
	"slices"
	"strings"
	"testing"
	"time"

	"skysheet/datasheet"
	"skysheet/datasheet/evaluate"
	"skysheet/datasheet/library"
	"skysheet/spectra"
)

// spectrumCSV writes a spectrum in the neutral column format from lo to hi
// nm in steps of step, with R and T from the given functions.
func spectrumCSV(lo, hi, step float64, r, tr func(nm float64) float64) string {
	var b strings.Builder
	b.WriteString("wavelength_nm,R,T\n")
	for nm := lo; nm <= hi+1e-9; nm += step {
		fmt.Fprintf(&b, "%g,%.4f,%.4f\n", nm, r(nm), tr(nm))
	}
	return b.String()
}

// Spectra of invented test surfaces: a white paint measured from 250 nm
// (UV-Vis-NIR) and a selective emitter (FTIR).
var (
	uvvisCSV = spectrumCSV(250, 2500, 5, func(nm float64) float64 { return 0.1 + 0.8/(1+math.Exp(-(nm-420)/12)) }, func(float64) float64 { return 0 })
	ftirCSV  = spectrumCSV(2500, 25000, 50, func(nm float64) float64 {
		if nm > 8000 && nm < 13000 {
			return 0.08
		}
		return 0.9
	}, func(float64) float64 { return 0 })
)

// testMaterial makes a material from spectra in the neutral format, with
// the default conditions.
func testMaterial(t *testing.T, slug, code string, csv ...string) *evaluate.Material {
	t.Helper()
	var parts []*spectra.Spectrum
	for i, c := range csv {
		s, err := spectra.Parse(strings.NewReader(c), fmt.Sprintf("%s-%d.csv", slug, i))
		if err != nil {
			t.Fatal(err)
		}
		parts = append(parts, s)
	}
	s := parts[0]
	if len(parts) > 1 {
		var err error
		if s, err = spectra.Join(parts, spectra.SpliceOptions{}); err != nil {
			t.Fatal(err)
		}
	}
	c := datasheet.DefaultConditions()
	m, err := evaluate.Sample(s, c)
	if err != nil {
		t.Fatal(err)
	}
	m.Material = &library.Material{Slug: slug, Front: library.FrontMatter{Title: "Test surface " + slug, ProductCode: code}, Conditions: c}
	return m
}

// overlaysOf returns the summaries of ms and what their comparison
// charts draw.
func overlaysOf(ms ...*evaluate.Material) ([]*evaluate.Summary, []overlay) {
	var sums []*evaluate.Summary
	var os []overlay
	for _, m := range ms {
		sums = append(sums, &m.Summary)
		os = append(os, overlay{r: m.Optics.R, a: m.Optics.A})
	}
	return sums, os
}

func chartIDs(cs []chartView) []string {
	var ids []string
	for _, c := range cs {
		ids = append(ids, c.ID)
	}
	return ids
}

// TestSolarChartSpansBand checks that the solar chart's x axis is the
// solar band of the conditions (280–2500 nm by default) even where the
// data start earlier (250 nm), with the band's ends as the outer ticks.
func TestSolarChartSpansBand(t *testing.T) {
	m := testMaterial(t, "white", "W-1", uvvisCSV)
	cv, err := solarChart(m)
	if err != nil || cv == nil {
		t.Fatalf("solar chart: %v, %v", cv, err)
	}
	svg := string(cv.SVG)
	paths := svgPaths(svg)
	left, right, axisY := xAxisLine(t, paths)
	// Tick marks hang 5 px below the axis line (go-chart).
	var tickX []int
	for _, p := range paths {
		if len(p.pts) == 2 && p.pts[0][0] == p.pts[1][0] && p.pts[0][1] == axisY && p.pts[1][1] == axisY+5 {
			tickX = append(tickX, p.pts[0][0])
		}
	}
	if len(tickX) < 3 || slices.Min(tickX) != left || slices.Max(tickX) != right {
		t.Errorf("tick marks at %v, want the outer ones at the axis ends %d and %d", tickX, left, right)
	}
	var labels []svgText
	for _, x := range svgTexts(t, svg) {
		if x.y > axisY+8 && x.y < axisY+30 {
			labels = append(labels, x)
		}
	}
	slices.SortFunc(labels, func(a, b svgText) int { return a.x - b.x })
	if len(labels) < 3 || labels[0].body != "280" || labels[len(labels)-1].body != "2500" {
		t.Errorf("x tick labels %v, want 280 first and 2500 last", labels)
	}
	// The reflectance curve starts at the axis' left end, clipped at
	// 280 nm, and never leaves the axis range.
	minX := math.MaxInt
	for _, p := range paths {
		if p.stroke != svgColor(colR) || len(p.pts) < 10 {
			continue
		}
		for _, pt := range p.pts {
			minX = min(minX, pt[0])
			if pt[0] < left || pt[0] > right {
				t.Fatalf("reflectance drawn at x = %d, outside the axis %d–%d", pt[0], left, right)
			}
		}
	}
	if minX != left {
		t.Errorf("reflectance starts at x = %d, want the axis start %d", minX, left)
	}
}

// TestChartsWithoutData checks that a range without data gives no chart
// rather than empty axes.
func TestChartsWithoutData(t *testing.T) {
	uv := testMaterial(t, "uv-only", "U-1", uvvisCSV)
	ir := testMaterial(t, "ir-only", "I-1", ftirCSV)
	both := testMaterial(t, "both", "B-1", uvvisCSV, ftirCSV)
	for _, c := range []struct {
		m    *evaluate.Material
		want []string
	}{
		{uv, []string{"chart-solar"}},
		{ir, []string{"chart-thermal", "chart-cooling"}}, // the night curve needs no solar data
		{both, []string{"chart-solar", "chart-thermal", "chart-cooling"}},
	} {
		cs, err := materialCharts(c.m)
		if err != nil {
			t.Fatal(err)
		}
		if got := chartIDs(cs); !slices.Equal(got, c.want) {
			t.Errorf("%s: charts %v, want %v", c.m.Slug, got, c.want)
		}
	}
	cs, err := compareCharts(overlaysOf(uv, both))
	if err != nil {
		t.Fatal(err)
	}
	if got := chartIDs(cs); !slices.Equal(got, []string{"chart-compare-solar", "chart-compare-thermal"}) {
		t.Fatalf("comparison charts %v", got)
	}
	if svg := string(cs[1].SVG); !strings.Contains(svg, "Test surface uv-only (no data here)") || strings.Contains(svg, "Test surface both (no data here)") {
		t.Errorf("the thermal overlay does not mark exactly the material without thermal data")
	}
	if cs, _ := compareCharts(overlaysOf(uv)); !slices.Equal(chartIDs(cs), []string{"chart-compare-solar"}) {
		t.Errorf("comparison of UV-Vis data only: charts %v, want the solar overlay only", chartIDs(cs))
	}
}

// luminance is the relative luminance of an opaque colour (WCAG 2.1,
// definition "relative luminance", sRGB).
func luminance(c rgba) float64 {
	lin := func(v uint8) float64 {
		s := float64(v) / 255
		if s <= 0.03928 {
			return s / 12.92
		}
		return math.Pow((s+0.055)/1.055, 2.4)
	}
	return 0.2126*lin(c.R) + 0.7152*lin(c.G) + 0.0722*lin(c.B)
}

// contrast is the contrast ratio of two opaque colours (WCAG 2.1,
// definition "contrast ratio").
func contrast(a, b rgba) float64 {
	la, lb := luminance(a), luminance(b)
	return (max(la, lb) + 0.05) / (min(la, lb) + 0.05)
}

// over returns c drawn with its alpha over an opaque background.
func over(c, bg rgba) rgba {
	a := float64(c.A) / 255
	mix := func(x, y uint8) uint8 { return uint8(math.Round(a*float64(x) + (1-a)*float64(y))) }
	return rgba{mix(c.R, bg.R), mix(c.G, bg.G), mix(c.B, bg.B), 0xff}
}

// TestChartContrast checks the marks that carry meaning against what they
// are drawn on, by luminance alone, so that they hold in grey print too.
func TestChartContrast(t *testing.T) {
	white := rgba{0xff, 0xff, 0xff, 0xff}
	if colBody.A != 0xff {
		t.Errorf("the blackbody shade is translucent: the window band would tint it")
	}
	for _, c := range []struct {
		name   string
		fg, bg rgba
		min    float64
	}{
		// WCAG 2.1 SC 1.4.11 (non-text contrast): 3:1 for graphics.
		{"window edge on white", colWindowE, white, 3},
		{"window edge on blackbody shade", colWindowE, colBody, 3},
		{"window edge on window band", colWindowE, over(colWindow, white), 3},
		{"air temperature line on white", colMark, white, 3},
		{"emittance on blackbody shade", colA, colBody, 3},
		{"reflectance on blackbody shade", colR, colBody, 3},
		// WCAG 2.1 SC 1.4.3 (contrast, minimum): 4.5:1 for text.
		{"window label on white", colWindowE, white, 4.5},
		{"chart text on white", colText, white, 4.5},
	} {
		if got := contrast(c.fg, c.bg); got < c.min {
			t.Errorf("%s: contrast %.2f, want at least %g", c.name, got, c.min)
		}
	}
	// The window band over the blackbody shade: none, the shade is
	// opaque and drawn after the band. Over white it stays a light tint.
	if l := luminance(over(colWindow, white)); l < 0.8 {
		t.Errorf("window band luminance %.2f on white: not a light band", l)
	}
}

// TestThermalWindow checks how the thermal chart marks the atmospheric
// window: a line at each edge, at the right wavelengths, and a label.
func TestThermalWindow(t *testing.T) {
	m := testMaterial(t, "emitter", "E-1", ftirCSV)
	cv, err := thermalChart(m)
	if err != nil || cv == nil {
		t.Fatalf("thermal chart: %v, %v", cv, err)
	}
	svg := string(cv.SVG)
	paths := svgPaths(svg)
	left, right, _ := xAxisLine(t, paths)
	c := m.Conditions
	tlo, thi := c.ThermalBand.UM()
	wlo, whi := c.WindowBand.UM()
	at := func(um float64) int {
		return left + int(math.Ceil((um-tlo)/(thi-tlo)*float64(right-left)))
	}
	var edges []int
	for _, p := range paths {
		if p.stroke == svgColor(colWindowE) && len(p.pts) == 2 && p.pts[0][0] == p.pts[1][0] {
			edges = append(edges, p.pts[0][0])
			if p.width != 1 {
				t.Errorf("window edge %d px wide, want 1", p.width)
			}
		}
	}
	// Two edges in the plot and two in the legend swatch.
	if want := []int{at(wlo), at(whi)}; len(edges) != 4 || !slices.Equal(edges[:2], want) {
		t.Errorf("window edges at x = %v, want %v then the legend's", edges, want)
	}
	label := textNamed(t, svgTexts(t, svg), "window")
	if label.fill != svgColor(colWindowE) {
		t.Errorf("window label in %s, want the edge colour", label.fill)
	}
	if !strings.Contains(cv.Caption, windowWords) || strings.Contains(cv.Caption, "shaded in green") {
		t.Errorf("caption does not describe the window as drawn: %s", cv.Caption)
	}
}

// TestCoolingRange checks the y range of the cooling chart against ranges
// worked out by hand.
func TestCoolingRange(t *testing.T) {
	for _, c := range []struct {
		lo, hi   float64
		ylo, yhi float64
		ticks    []float64
	}{
		// span 630, step niceStep(90) = 100, margin 9.45, ends to 50
		{-440, 190, -450, 200, []float64{-400, -300, -200, -100, 0, 100, 200}},
		// all positive: 0 stays in; span 120, step 20, margin 1.8
		{30, 120, 0, 130, []float64{0, 20, 40, 60, 80, 100, 120}},
		// span 125, step 20, margin 1.875; the first tick is ceil(−0.5)·20
		{-5, 120, -10, 130, []float64{0, 20, 40, 60, 80, 100, 120}},
		// span 1500, step 250, margin 22.5
		{-1290, 210, -1375, 250, []float64{-1250, -1000, -750, -500, -250, 0, 250}},
	} {
		ylo, yhi, ticks := coolingRange(c.lo, c.hi, 7)
		if ylo != c.ylo || yhi != c.yhi || !slices.Equal(ticks, c.ticks) {
			t.Errorf("coolingRange(%g, %g) = %g, %g, %v; want %g, %g, %v", c.lo, c.hi, ylo, yhi, ticks, c.ylo, c.yhi, c.ticks)
		}
		for _, v := range append(ticks, ylo, yhi) {
			if v == 0 && math.Signbit(v) {
				t.Errorf("coolingRange(%g, %g): a tick at −0 would be labelled \"-0\"", c.lo, c.hi)
			}
		}
		if ylo > min(c.lo, 0) || yhi < max(c.hi, 0) {
			t.Errorf("coolingRange(%g, %g) = %g, %g leaves data or 0 out", c.lo, c.hi, ylo, yhi)
		}
	}
}

// TestCoolingChart checks the marks of the cooling chart: a thin line at
// air temperature, a thin zero line, and a y axis fitted to the data.
func TestCoolingChart(t *testing.T) {
	c := datasheet.DefaultConditions()
	f := &datasheet.Figures{Conditions: c}
	for k := 260.0; k <= 310; k += 2 {
		f.CoolingCurve = append(f.CoolingCurve, datasheet.CurvePoint{SurfaceK: k, NetWm2: datasheet.Num(-440 + 12*(k-260)), NetNightWm2: datasheet.Num(-340 + 10.6*(k-260))})
	}
	cv, err := coolingChart(f)
	if err != nil || cv == nil {
		t.Fatalf("cooling chart: %v, %v", cv, err)
	}
	svg := string(cv.SVG)
	paths := svgPaths(svg)
	left, right, axisY := xAxisLine(t, paths)
	ambientX := left + int(math.Ceil((c.AmbientK-260)/50*float64(right-left)))
	var marker, zero bool
	for _, p := range paths {
		if len(p.pts) != 2 {
			continue
		}
		vertical, horizontal := p.pts[0][0] == p.pts[1][0], p.pts[0][1] == p.pts[1][1]
		switch {
		case p.stroke == svgColor(colMark) && vertical && p.pts[0][0] == ambientX && p.pts[1][1]-p.pts[0][1] > 100:
			marker = true
			if p.width != 1 {
				t.Errorf("air temperature line %d px wide, want 1", p.width)
			}
		case p.stroke == svgColor(colAxis) && horizontal && p.pts[0][0] == left && p.pts[1][0] == right && p.pts[0][1] != axisY:
			zero = true
		}
		if p.fill == colAxis.alpha(0x90).color().String() {
			t.Errorf("a shaded bar is drawn: %v", p.pts)
		}
	}
	if !marker || !zero {
		t.Errorf("air temperature line found: %v; zero line found: %v", marker, zero)
	}
	// Data from −440 to 190 W/m² (by construction above): the labelled
	// ticks run from −400 to 200 (see TestCoolingRange).
	var ys []string
	for _, x := range svgTexts(t, svg) {
		if x.x < left && x.y < axisY+10 {
			ys = append(ys, x.body)
		}
	}
	if !slices.Contains(ys, "-400") || !slices.Contains(ys, "200") || slices.Contains(ys, "-600") || slices.Contains(ys, "-500") || slices.Contains(ys, "300") {
		t.Errorf("y tick labels %v, want -400 … 200", ys)
	}
}

// TestPointLabels checks the labels of the scatter chart's points.
func TestPointLabels(t *testing.T) {
	var ms []*evaluate.Summary
	for _, m := range []*library.Material{
		{Slug: "alpha", Front: library.FrontMatter{ProductCode: "AX-1"}},
		{Slug: "beta", Front: library.FrontMatter{ProductCode: " BX-2 "}},
		{Slug: "beta-aged", Front: library.FrontMatter{ProductCode: "BX-2"}},
		{Slug: "gamma", Front: library.FrontMatter{}},
		{Slug: "a-very-long-slug-indeed", Front: library.FrontMatter{}},
	} {
		ms = append(ms, &evaluate.Summary{Material: m})
	}
	want := []string{"AX-1", "beta", "beta-aged", "gamma", "a-very-long…"}
	if got := pointLabels(ms); !slices.Equal(got, want) {
		t.Errorf("labels %q, want %q", got, want)
	}
}

// TestScatterLabels checks that the scatter chart labels points with their
// codes, not table numbers, keeps each point a link with its slug, and
// places labels clear of each other and of the points.
func TestScatterLabels(t *testing.T) {
	var ms []*evaluate.Summary
	var rows []row
	// Four points close together and one apart.
	for i, xy := range [][2]float64{{0.90, 0.90}, {0.905, 0.902}, {0.91, 0.899}, {0.903, 0.896}, {0.5, 0.95}} {
		m := testMaterial(t, fmt.Sprintf("m%d", i), fmt.Sprintf("C-%d", 10+i), uvvisCSV, ftirCSV)
		m.Figures.SolarReflectance, m.Figures.WindowEmittance = datasheet.Num(xy[0]), datasheet.Num(xy[1])
		ms = append(ms, &m.Summary)
		rows = append(rows, row{N: 5 - i, Href: "m/" + m.Slug + "/index.html"})
	}
	cv, err := scatterChart(ms)
	if err != nil || cv == nil {
		t.Fatalf("scatter chart: %v, %v", cv, err)
	}
	svg := string(cv.SVG)
	type box struct{ x0, y0, x1, y1 int }
	var boxes []box
	for i, m := range ms {
		if !strings.Contains(svg, fmt.Sprintf(`<a href="m/%s/index.html" data-slug="%s">`, m.Slug, m.Slug)) {
			t.Errorf("point %s is not a link with its slug", m.Slug)
		}
		if strings.Contains(svg, fmt.Sprintf(">%d</text>", rows[i].N)) {
			t.Errorf("a point is labelled with its table number %d", rows[i].N)
		}
	}
	// Only the labels that fit are drawn: the point apart and at least two
	// of the four close together (worked out by hand from the spots).
	labels := regexpTexts(svg)
	if len(labels) < 3 || len(labels) > len(ms) {
		t.Fatalf("%d point labels, want 3 to %d", len(labels), len(ms))
	}
	codes := map[string]bool{}
	for _, m := range ms {
		codes[m.Front.ProductCode] = true
	}
	if labels[len(labels)-1].body != ms[len(ms)-1].Front.ProductCode {
		t.Errorf("the point apart is not labelled")
	}
	for _, l := range labels {
		if !codes[l.body] {
			t.Errorf("label %q is not a product code", l.body)
		}
		if l.size*scatterFullWidth/scatterW < minText {
			t.Errorf("label %q is %.1f px at full width, want at least %g", l.body, l.size*scatterFullWidth/scatterW, minText)
		}
		h := int(l.size)
		boxes = append(boxes, box{l.x, l.y - h*4/5, l.x + textWidth(l.body, textLabel), l.y + h/4})
	}
	circles := circleRE.FindAllStringSubmatch(svg, -1)
	for i, a := range boxes {
		for j, b := range boxes[i+1:] {
			if a.x0 < b.x1 && b.x0 < a.x1 && a.y0 < b.y1 && b.y0 < a.y1 {
				t.Errorf("labels %q and %q overlap", labels[i].body, labels[i+1+j].body)
			}
		}
		for _, c := range circles {
			var cx, cy int
			fmt.Sscan(c[1], &cx)
			fmt.Sscan(c[2], &cy)
			if a.x0 < cx+pointRadius && cx-pointRadius < a.x1 && a.y0 < cy+pointRadius && cy-pointRadius < a.y1 {
				t.Errorf("label %q covers the point at %d, %d", labels[i].body, cx, cy)
			}
		}
	}
}

// TestScatterLarge checks the scatter chart of a large library: labels
// only where they fit, the unlabelled points drawn as one shape, a small
// chart whose accessible text does not list every material, and no
// comparison of every pair of points (a time limit far above the grid's
// cost).
func TestScatterLarge(t *testing.T) {
	const n = 10000
	var ms []*evaluate.Summary
	for i := range n {
		m := &evaluate.Summary{Material: &library.Material{Slug: fmt.Sprintf("m-%05d", i),
			Front: library.FrontMatter{Title: fmt.Sprintf("Material %05d", i), ProductCode: fmt.Sprintf("P-%05d", i)}},
			Figures: &datasheet.Figures{}}
		// A spread that fills the plot unevenly, as real libraries do.
		m.Figures.SolarReflectance = datasheet.Num(0.5 + 0.5*math.Sqrt(float64((i*7919)%n)/n))
		m.Figures.WindowEmittance = datasheet.Num(0.6 + 0.4*float64((i*104729)%n)/n)
		ms = append(ms, m)
	}
	start := time.Now()
	cv, err := scatterChart(ms)
	if err != nil || cv == nil {
		t.Fatalf("scatter chart: %v, %v", cv, err)
	}
	if d := time.Since(start); d > 20*time.Second {
		t.Errorf("scatter of %d points took %v", n, d)
	}
	svg := string(cv.SVG)
	if len(svg) > 200_000 {
		t.Errorf("scatter of %d points is %d bytes, want under 200 kB", n, len(svg))
	}
	labels := regexpTexts(svg)
	links := strings.Count(svg, "<a href=")
	if len(labels) == 0 || len(labels) >= n/10 || links != len(labels) {
		t.Errorf("%d labels and %d links of %d points, want a few labels, each point labelled a link", len(labels), links, n)
	}
	if m := regexp.MustCompile(`aria-label="([^"]*)"`).FindStringSubmatch(svg); m == nil || len(m[1]) > 500 || strings.Contains(m[1], "Material 00001") {
		t.Errorf("accessible text lists the materials: %.200q", m)
	}
	if !strings.Contains(svg, `stroke-linecap:round`) {
		t.Error("unlabelled points are not drawn")
	}
}

// Sizes for readable chart text: at least 12 px as drawn (common practice,
// no source). A datasheet chart is drawn about 500 px wide beside another
// on a 1120 px page column; the scatter chart across it, about 1070 px.
const (
	minText          = 12.0
	chartDrawnWidth  = 500.0
	scatterFullWidth = 1070.0
)

// TestChartTextReadable checks the size of every text of the datasheet
// and comparison charts of the test library, and that each legend lies
// below the plot and its axis title, within the chart, its entries apart.
func TestChartTextReadable(t *testing.T) {
	lib := testLibrary(t)
	ms, err := evaluate.All(lib, evaluate.Options{})
	if err != nil {
		t.Fatal(err)
	}
	var charts []chartView
	bySlug := map[string]*evaluate.Material{}
	for _, m := range ms {
		cs, err := materialCharts(m)
		if err != nil {
			t.Fatal(err)
		}
		charts = append(charts, cs...)
		bySlug[m.Slug] = m
	}
	for _, c := range lib.Comparisons {
		var members []*evaluate.Material
		for _, x := range c.Materials {
			members = append(members, bySlug[x.Slug])
		}
		cs, err := compareCharts(overlaysOf(members...))
		if err != nil {
			t.Fatal(err)
		}
		charts = append(charts, cs...)
	}
	if len(charts) < 5 {
		t.Fatalf("only %d charts", len(charts))
	}
	for _, c := range charts {
		svg := string(c.SVG)
		texts := svgTexts(t, svg)
		for _, x := range texts {
			if drawn := x.size * chartDrawnWidth / chartW; drawn < minText {
				t.Errorf("%s: %q is %.1f px when drawn, want at least %g", c.ID, x.body, drawn, minText)
			}
		}
		var title svgText
		for _, x := range texts {
			if strings.HasPrefix(x.body, "Wavelength (") || strings.HasPrefix(x.body, "Surface temperature (") {
				title = x
			}
		}
		if title.body == "" {
			t.Fatalf("%s: no x-axis title", c.ID)
		}
		var legend []svgText
		for _, x := range texts {
			if x.y > title.y {
				legend = append(legend, x)
				if top := x.y - int(x.size*4/5); top < title.y+4 {
					t.Errorf("%s: legend entry %q reaches up to %d, into the axis title at %d", c.ID, x.body, top, title.y)
				}
				if right := x.x + textWidth(x.body, textLegend); right > chartW-4 {
					t.Errorf("%s: legend entry %q runs to %d, past the chart's width %d", c.ID, x.body, right, chartW)
				}
			}
		}
		if len(legend) < 2 {
			t.Errorf("%s: %d legend entries", c.ID, len(legend))
		}
		for i, a := range legend {
			for _, b := range legend[i+1:] {
				if a.y == b.y && a.x < b.x+textWidth(b.body, textLegend) && b.x < a.x+textWidth(a.body, textLegend) {
					t.Errorf("%s: legend entries %q and %q overlap", c.ID, a.body, b.body)
				}
			}
		}
	}
}

// TestYRange checks the y range of the spectral charts and that its ends
// and the round values 0 and 1 are all labelled, each exactly.
func TestYRange(t *testing.T) {
	in := spectra.Series{Pieces: []spectra.Piece{{NM: []float64{300, 400}, V: []float64{0.5, 0.6}}}}
	out := spectra.Series{Pieces: []spectra.Piece{{NM: []float64{300, 400}, V: []float64{-0.02, 1.03}}}}
	if lo, hi := yRange(in); lo != 0 || hi != 1 {
		t.Errorf("yRange of values within 0..1: %g..%g, want 0..1", lo, hi)
	}
	lo, hi := yRange(in, out)
	if lo != -0.1 || hi != 1.1 {
		t.Errorf("yRange of −0.02..1.03: %g..%g, want −0.1..1.1", lo, hi)
	}
	var labels []string
	for _, tk := range ticks(lo, hi, nil, "1", 6) {
		labels = append(labels, tk.Label)
	}
	if want := []string{"-0.1", "0.0", "0.2", "0.4", "0.6", "0.8", "1.0", "1.1"}; !slices.Equal(labels, want) {
		t.Errorf("tick labels %q, want %q", labels, want)
	}
}

// gridWeighting is a weighting of a type that cannot be a map key.
type gridWeighting struct{ nm []float64 }

func (g gridWeighting) At(nm float64) float64          { return nm }
func (g gridWeighting) Knots(lo, hi float64) []float64 { return g.nm }
func (g gridWeighting) String() string                 { return "grid" }

// wrappedWeighting is of a comparable type, but holds a weighting that may
// not be: as a map key it panics when it does not.
type wrappedWeighting struct{ spectra.Weighting }

// TestWeightingShadeShared checks that a shade is sampled once and shared
// by every chart that asks for it, the same points as a fresh sample, and
// that a weighting that cannot be a map key is sampled each time.
func TestWeightingShadeShared(t *testing.T) {
	sun := spectra.SolarGlobal()
	a, b := weightingShade(sun, 300, 2400, 1), weightingShade(sun, 300, 2400, 1)
	fresh := sampleShade(sun, 300, 2400, 1)
	if len(a.NM) < 100 || !slices.Equal(a.NM, fresh.NM) || !slices.Equal(a.V, fresh.V) {
		t.Fatalf("shade of %d points, fresh sample of %d", len(a.NM), len(fresh.NM))
	}
	if &a.NM[0] != &b.NM[0] {
		t.Error("the second chart sampled the sun again")
	}
	if c := weightingShade(sun, 300, 2000, 1); len(c.NM) >= len(a.NM) {
		t.Errorf("a narrower band gave %d points, the wider %d", len(c.NM), len(a.NM))
	}
	g := gridWeighting{nm: []float64{400, 500, 600}}
	if p := weightingShade(g, 300, 700, 1); !slices.Equal(p.NM, g.nm) || p.V[2] != 1 {
		t.Errorf("shade of an uncomparable weighting %v", p)
	}
	if p := weightingShade(wrappedWeighting{g}, 300, 700, 1); !slices.Equal(p.NM, g.nm) || p.V[2] != 1 {
		t.Errorf("shade of a weighting holding an uncomparable one %v", p)
	}
}
