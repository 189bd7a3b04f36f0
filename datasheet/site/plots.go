package site

import (
	"errors"
	"fmt"
	"html/template"
	"math"
	"reflect"
	"slices"
	"strconv"
	"strings"
	"sync"

	"skysheet/datasheet"
	"skysheet/datasheet/evaluate"
	"skysheet/datasheet/library"
	"skysheet/spectra"
)

// Chart sizes in SVG units; the page scales them to its width. A
// datasheet chart is drawn about 500 px wide beside another on a desktop
// page, the scatter chart across the page, so that text comes out at
// about the size of the page's small print (see textTick and friends).
const (
	chartW, chartH     = 360, 300
	scatterW, scatterH = 900, 460
)

// scaled returns the pieces with wavelengths divided by div (nm → µm).
func scaled(s spectra.Series, div float64) []spectra.Piece {
	out := make([]spectra.Piece, len(s.Pieces))
	for i, p := range s.Pieces {
		nm := make([]float64, len(p.NM))
		for j, x := range p.NM {
			nm[j] = x / div
		}
		out[i] = spectra.Piece{NM: nm, V: p.V}
	}
	return out
}

// weightingShade samples a weighting over [lo, hi] nm, scaled to a peak of
// 1, with x divided by div. The piece is shared (every material's chart
// shades the same sun and blackbody): it must not be changed.
func weightingShade(w spectra.Weighting, lo, hi, div float64) spectra.Piece {
	// A weighting that cannot be a map key (its value, not only its type:
	// a struct may hold one that cannot) is sampled each time.
	if v := reflect.ValueOf(w); !v.IsValid() || !v.Comparable() {
		return sampleShade(w, lo, hi, div)
	}
	key := shadeKey{w, lo, hi, div}
	shades.Lock()
	p, ok := shades.m[key]
	shades.Unlock()
	if ok {
		return p
	}
	p = sampleShade(w, lo, hi, div)
	shades.Lock()
	if len(shades.m) < maxShades {
		if shades.m == nil {
			shades.m = map[shadeKey]spectra.Piece{}
		}
		shades.m[key] = p
	}
	shades.Unlock()
	return p
}

// shades holds the shades made so far, up to maxShades.
var shades struct {
	sync.Mutex
	m map[shadeKey]spectra.Piece
}

const maxShades = 64

type shadeKey struct {
	w           spectra.Weighting
	lo, hi, div float64
}

// sampleShade is weightingShade without the memo.
func sampleShade(w spectra.Weighting, lo, hi, div float64) spectra.Piece {
	knots := w.Knots(lo, hi)
	var p spectra.Piece
	peak := 0.0
	for _, nm := range knots {
		if nm < lo || nm > hi {
			continue
		}
		v := w.At(nm)
		p.NM, p.V = append(p.NM, nm/div), append(p.V, v)
		peak = math.Max(peak, v)
	}
	if peak > 0 {
		for i := range p.V {
			p.V[i] /= peak
		}
	}
	return p
}

// yRange is 0..1, widened to −0.1 or 1.1 to show values slightly outside
// (the readers accept −0.05..1.05): ends that one decimal labels exactly.
func yRange(ss ...spectra.Series) (lo, hi float64) {
	lo, hi = 0, 1
	for _, s := range ss {
		for _, p := range s.Pieces {
			for _, v := range p.V {
				if v < 0 {
					lo = -0.1
				}
				if v > 1 {
					hi = 1.1
				}
			}
		}
	}
	return lo, hi
}

// materialCharts returns the charts of a material: solar range, thermal
// infrared and net cooling power, each only where the material has data
// for it.
func materialCharts(m *evaluate.Material) ([]chartView, error) {
	var out []chartView
	if cv, err := solarChart(m); err != nil {
		return nil, fmt.Errorf("solar chart: %w", err)
	} else if cv != nil {
		out = append(out, *cv)
	}
	if cv, err := thermalChart(m); err != nil {
		return nil, fmt.Errorf("thermal chart: %w", err)
	} else if cv != nil {
		out = append(out, *cv)
	}

	if cv, err := coolingChart(m.Figures); err != nil {
		return nil, fmt.Errorf("cooling chart: %w", err)
	} else if cv != nil {
		out = append(out, *cv)
	}
	return out, nil
}

// solarChart plots the reflectance, transmittance and absorptance of a
// material over the solar band of its conditions, the x axis spanning
// exactly that band. It returns nil when the material has no data there
// (an FTIR measurement only): there is nothing to draw.
func solarChart(m *evaluate.Material) (*chartView, error) {
	c, f, o := m.Conditions, m.Figures, m.Optics
	lo, hi := c.SolarBand.Lo, c.SolarBand.Hi
	if !hasData(lo, hi, o.R, o.T, o.A) {
		return nil, nil
	}
	sun := m.Solar
	sp := plot{width: chartW, height: chartH, xName: "Wavelength (nm)", yName: "Fraction of incident light",
		xLo: lo, xHi: hi, yFmt: "1"}
	sp.yLo, sp.yHi = yRange(o.R, o.T, o.A)
	sp.lines = append(sp.lines, line{name: sun.String() + " (relative)", color: colSun, fill: true,
		pieces: []spectra.Piece{weightingShade(sun, lo, hi, 1)}})
	sp.lines = append(sp.lines, line{name: "Reflectance R", color: colR, width: 2, pieces: o.R.Pieces})
	hasT := m.Sample.Has(spectra.T)
	if hasT {
		sp.lines = append(sp.lines, line{name: "Transmittance T", color: colT, width: 2, pieces: o.T.Pieces})
	}
	sp.lines = append(sp.lines, line{name: "Absorptance A", color: colA, width: 1, dash: []float64{5, 3}, pieces: o.A.Pieces})
	caption := fmt.Sprintf("Spectral reflectance%s and absorptance from %s to %s nm, over the %s spectrum shaded in yellow (scaled to its peak). Solar-weighted: R = %s%s, A = %s; data cover %s of the weighted band.",
		map[bool]string{true: ", transmittance", false: ""}[hasT], fmtG(lo), fmtG(hi), sun,
		fmtFrac(f.SolarReflectance), map[bool]string{true: ", T = " + fmtFrac(f.SolarTransmittance), false: ""}[hasT],
		fmtFrac(f.SolarAbsorptance), fmtPercent(f.SolarCoverage))
	svg, err := sp.svg("Solar range chart. " + caption)
	if err != nil {
		return nil, err
	}
	return &chartView{ID: "chart-solar", Title: "Solar range", Caption: caption, SVG: template.HTML(svg)}, nil
}

// hasData reports whether any of the series has data within [lo, hi] nm.
func hasData(lo, hi float64, ss ...spectra.Series) bool {
	for _, s := range ss {
		if len(s.Covered(lo, hi)) > 0 {
			return true
		}
	}
	return false
}

// windowBand is the atmospheric window of the conditions, marked on the
// thermal charts (in µm) by a light band between two dark lines.
func windowBand(c datasheet.Conditions) band {
	lo, hi := c.WindowBand.UM()
	return band{name: "Atmospheric window " + c.Text("window_band_um"),
		lo: lo, hi: hi, color: colWindow, edge: colWindowE, label: "window"}
}

// windowWords describes how windowBand looks, for captions.
const windowWords = "lies between the two dark green lines"

// thermalChart plots the emittance and reflectance of a material over the
// thermal band. It returns nil when the material has no data there (a
// UV-Vis-NIR measurement only): there is nothing to draw.
func thermalChart(m *evaluate.Material) (*chartView, error) {
	c, f, o := m.Conditions, m.Figures, m.Optics
	tlo, thi := c.ThermalBand.UM()
	if !hasData(c.ThermalBand.Lo, c.ThermalBand.Hi, o.A, o.R) {
		return nil, nil
	}
	tp := plot{width: chartW, height: chartH, xName: "Wavelength (µm)", yName: "Emittance, reflectance",
		xLo: tlo, xHi: thi, yFmt: "1"}
	tp.yLo, tp.yHi = yRange(o.R, o.A)
	tp.bands = []band{windowBand(c)}
	tp.lines = append(tp.lines, line{name: fmt.Sprintf("Blackbody at %s K (relative)", fmtG(c.TemperatureK)), color: colBody, fill: true,
		pieces: []spectra.Piece{weightingShade(m.Thermal, c.ThermalBand.Lo, c.ThermalBand.Hi, 1000)}})
	tp.lines = append(tp.lines, line{name: "Emittance ε = A", color: colA, width: 2, pieces: scaled(o.A, 1000)})
	tp.lines = append(tp.lines, line{name: "Reflectance R", color: colR, width: 1, dash: []float64{5, 3}, pieces: scaled(o.R, 1000)})
	windowLo, windowHi := c.WindowBand.UM()
	caption := fmt.Sprintf("Spectral emittance (equal to absorptance, Kirchhoff's law) and reflectance from %s to %s µm; the atmospheric window %s–%s µm %s, and the %s K blackbody spectrum is shaded in red (scaled to its peak). Thermal emittance %s, window emittance %s.",
		fmtG(tlo), fmtG(thi), fmtG(windowLo), fmtG(windowHi), windowWords, fmtG(c.TemperatureK),
		fmtFrac(f.ThermalEmittance), fmtFrac(f.WindowEmittance))
	svg, err := tp.svg("Thermal range chart. " + caption)
	if err != nil {
		return nil, err
	}
	return &chartView{ID: "chart-thermal", Title: "Thermal infrared", Caption: caption, SVG: template.HTML(svg)}, nil
}

// coolingRange returns a y range and its ticks for values from lo to hi:
// 0 always included, a margin of 1.5 % of the span beyond the data, the
// ends rounded out to half the tick step. The ticks are multiples of a
// round step chosen for about n steps.
func coolingRange(lo, hi float64, n int) (ylo, yhi float64, ticks []float64) {
	span := math.Max(hi, 0) - math.Min(lo, 0)
	if !(span > 0) || math.IsInf(span, 0) {
		return -1, 1, []float64{-1, 0, 1}
	}
	step := niceStep(span / float64(n))
	m := 0.015 * span
	ylo = math.Floor(math.Min(lo-m, 0)/(step/2)) * step / 2
	yhi = math.Ceil(math.Max(hi+m, 0)/(step/2)) * step / 2
	for k := math.Ceil(ylo / step); k*step <= yhi; k++ {
		v := k * step
		if v == 0 {
			v = 0 // not −0, which would be labelled "-0"
		}
		ticks = append(ticks, v)
	}
	return ylo, yhi, ticks
}

// coolingChart plots the net cooling power against surface temperature,
// with and without sun, from the figures' cooling curve.
func coolingChart(f *datasheet.Figures) (*chartView, error) {
	var day, night spectra.Piece
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, p := range f.CoolingCurve {
		if !isNaN(p.NetWm2) {
			day.NM, day.V = append(day.NM, p.SurfaceK), append(day.V, float64(p.NetWm2))
			lo, hi = math.Min(lo, float64(p.NetWm2)), math.Max(hi, float64(p.NetWm2))
		}
		if !isNaN(p.NetNightWm2) {
			night.NM, night.V = append(night.NM, p.SurfaceK), append(night.V, float64(p.NetNightWm2))
			lo, hi = math.Min(lo, float64(p.NetNightWm2)), math.Max(hi, float64(p.NetNightWm2))
		}
	}
	if len(day.NM) < 2 && len(night.NM) < 2 {
		return nil, nil
	}
	c := f.Conditions
	xs := append(append([]float64(nil), day.NM...), night.NM...)
	xlo, xhi := xs[0], xs[0]
	for _, x := range xs {
		xlo, xhi = math.Min(xlo, x), math.Max(xhi, x)
	}
	p := plot{width: chartW, height: chartH, xName: "Surface temperature (K)", yName: "Net cooling power (W/m²)",
		xLo: xlo, xHi: xhi, xFmt: "0", yFmt: "0"}
	p.yLo, p.yHi, p.yTicks = coolingRange(lo, hi, 7)
	p.rules = []rule{
		{at: 0, color: colAxis},
		{name: fmt.Sprintf("Air temperature %s K", fmtG(c.AmbientK)), at: c.AmbientK, vertical: true, color: colMark, dash: []float64{6, 3}},
	}
	p.lines = []line{
		{name: fmt.Sprintf("With sun (%s W/m²)", fmtG(c.IrradianceWm2)), color: colT, width: 2, pieces: []spectra.Piece{day}},
		{name: "Night (no sun)", color: colR, width: 2, dash: []float64{5, 3}, pieces: []spectra.Piece{night}},
	}
	settles := func(x datasheet.Num) string {
		if isNaN(x) {
			return "has no equilibrium"
		}
		return datasheet.KindTemperatureDifference.Words(float64(x), "K")
	}
	caption := fmt.Sprintf("Net cooling power (positive: the surface gives off more heat than it takes in) against surface temperature, under the %s sky with air at %s K and h = %s W m⁻² K⁻¹. At air temperature: %s with sun, %s at night. With sun the surface %s; at night it %s.",
		c.Sky, fmtG(c.AmbientK), fmtG(c.HWm2K), fmtNumber(datasheet.KindPower, f.CoolingPowerWm2, "W/m²"), fmtNumber(datasheet.KindPower, f.CoolingPowerNightWm2, "W/m²"),
		settles(f.EquilibriumDeltaK), settles(f.EquilibriumDeltaNightK))
	svg, err := p.svg("Cooling power chart. " + caption)
	if err != nil {
		return nil, err
	}
	return &chartView{ID: "chart-cooling", Title: "Net cooling power", Caption: caption, SVG: template.HTML(svg)}, nil
}

// overlay is what a comparison's charts draw of one material: its
// resolved reflectance and emittance.
type overlay struct{ r, a spectra.Series }

// setOverlay keeps o as what the comparison charts draw of material slug.
func (b *builder) setOverlay(slug string, o overlay) {
	b.mu.Lock()
	defer b.mu.Unlock()
	if b.overlays == nil {
		b.overlays = map[string]overlay{}
	}
	b.overlays[slug] = o
}

// overlayOf returns what the comparison charts draw of m: what its
// evaluation in this render kept (see setOverlay), or, for a material
// taken from the cache, its files read and resolved again, which must be
// those its summary rests on.
func (b *builder) overlayOf(m *evaluate.Summary) (overlay, error) {
	b.mu.Lock()
	o, ok := b.overlays[m.Slug]
	b.mu.Unlock()
	if ok {
		return o, nil
	}
	optics, inputs, err := evaluate.Optics(b.lib, m.Material)
	if err != nil {
		return overlay{}, err
	}
	if !slices.Equal(inputs, m.Inputs) {
		return overlay{}, &library.Error{File: m.Path, Err: errors.New("its files changed while the site was rendered: render again")}
	}
	o = overlay{r: optics.R, a: optics.A}
	b.setOverlay(m.Slug, o)
	return o, nil
}

// compareCharts overlays the reflectance (solar range) and emittance
// (thermal range) of several materials, os[i] being what is drawn of
// ms[i]. The ranges are those of the first material's conditions.
func compareCharts(ms []*evaluate.Summary, os []overlay) ([]chartView, error) {
	if len(ms) == 0 {
		return nil, nil
	}
	c := ms[0].Conditions
	tlo, thi := c.ThermalBand.UM()
	sp := plot{width: chartW, height: chartH, xName: "Wavelength (nm)", yName: "Reflectance",
		xLo: c.SolarBand.Lo, xHi: c.SolarBand.Hi, yLo: 0, yHi: 1, yFmt: "1"}
	tp := plot{width: chartW, height: chartH, xName: "Wavelength (µm)", yName: "Emittance",
		xLo: tlo, xHi: thi, yLo: 0, yHi: 1, yFmt: "1"}
	tp.bands = []band{windowBand(c)}
	var names []string
	var anyS, anyT bool
	for i, m := range ms {
		o := os[i]
		col := colPalette[i%len(colPalette)]
		var dash []float64
		if i >= len(colPalette) {
			dash = []float64{4, 3}
		}
		// A material without data in a range keeps its colour and its
		// legend entry there, marked as such.
		nameS, nameT := m.Front.Title, m.Front.Title
		if hasData(sp.xLo, sp.xHi, o.r) {
			anyS = true
		} else {
			nameS += " (no data here)"
		}
		if hasData(tp.xLo*1000, tp.xHi*1000, o.a) {
			anyT = true
		} else {
			nameT += " (no data here)"
		}
		sp.lines = append(sp.lines, line{name: nameS, color: col, width: 2, dash: dash, pieces: o.r.Pieces})
		tp.lines = append(tp.lines, line{name: nameT, color: col, width: 2, dash: dash, pieces: scaled(o.a, 1000)})
		lo, hi := yRange(o.r, o.a)
		sp.yLo, sp.yHi = math.Min(sp.yLo, lo), math.Max(sp.yHi, hi)
		tp.yLo, tp.yHi = sp.yLo, sp.yHi
		names = append(names, m.Front.Title)
	}
	list := strings.Join(names, "; ")
	var out []chartView
	if anyS {
		capS := fmt.Sprintf("Spectral reflectance of %s from %s to %s nm.", list, fmtG(sp.xLo), fmtG(sp.xHi))
		s1, err := sp.svg("Reflectance overlay. " + capS)
		if err != nil {
			return nil, err
		}
		out = append(out, chartView{ID: "chart-compare-solar", Title: "Reflectance, solar range", Caption: capS, SVG: template.HTML(s1)})
	}
	if anyT {
		capT := fmt.Sprintf("Spectral emittance of %s from %s to %s µm; the atmospheric window %s.", list, fmtG(tp.xLo), fmtG(tp.xHi), windowWords)
		s2, err := tp.svg("Emittance overlay. " + capT)
		if err != nil {
			return nil, err
		}
		out = append(out, chartView{ID: "chart-compare-thermal", Title: "Emittance, thermal infrared", Caption: capT, SVG: template.HTML(s2)})
	}
	return out, nil
}

// maxLabel is the most runes of a point label made from a slug.
const maxLabel = 12

// pointLabels returns a short label for each material that does not
// depend on the order of a table: its product code, or where that is
// missing or shared with another of the materials, its slug (shortened to
// maxLabel runes).
func pointLabels(ms []*evaluate.Summary) []string {
	codes := map[string]int{}
	for _, m := range ms {
		codes[strings.TrimSpace(m.Front.ProductCode)]++
	}
	out := make([]string, len(ms))
	for i, m := range ms {
		code := strings.TrimSpace(m.Front.ProductCode)
		if code != "" && codes[code] == 1 {
			out[i] = code
			continue
		}
		r := []rune(m.Slug)
		if len(r) > maxLabel {
			r = append(r[:maxLabel-1], '…')
		}
		out[i] = string(r)
	}
	return out
}

// scatterChart plots solar reflectance against window emittance, one
// linked point per material that has both; the labels that fit are drawn.
// Above linkedPoints materials only the labelled points are links and the
// rest are drawn as one shape, so that the index stays light.
func scatterChart(ms []*evaluate.Summary) (*chartView, error) {
	ps := &pointSet{}
	var shown []*evaluate.Summary
	for _, m := range ms {
		if !isNaN(m.Figures.SolarReflectance) && !isNaN(m.Figures.WindowEmittance) {
			shown = append(shown, m)
		}
	}
	labels := pointLabels(shown)
	xmin, ymin := 1.0, 1.0
	var skipped []string
	for _, m := range ms {
		x, y := m.Figures.SolarReflectance, m.Figures.WindowEmittance
		if isNaN(x) || isNaN(y) {
			skipped = append(skipped, m.Front.Title)
			continue
		}
		xmin, ymin = math.Min(xmin, float64(x)), math.Min(ymin, float64(y))
		ps.x, ps.y = append(ps.x, float64(x)), append(ps.y, float64(y))
		ps.href = append(ps.href, materialDir(m.Slug)+"index.html")
		ps.slug = append(ps.slug, m.Slug)
		label := labels[len(ps.label)]
		ps.label = append(ps.label, label)
		ps.title = append(ps.title, fmt.Sprintf("%s (%s): solar reflectance %s, window emittance %s", m.Front.Title, label, fmtFrac(x), fmtFrac(y)))
		ps.colors = append(ps.colors, colPalette[0])
	}
	if len(ps.x) == 0 {
		return nil, nil
	}
	ps.linkAll = len(ps.x) <= linkedPoints
	lower := func(v float64) float64 { return math.Max(0, math.Floor((v-0.02)*10)/10) }
	p := plot{width: scatterW, height: scatterH, xName: "Solar reflectance", yName: "Atmospheric-window emittance",
		xLo: lower(xmin), xHi: 1, yLo: lower(ymin), yHi: 1, xFmt: "2", yFmt: "2", points: ps, noLegend: true}
	caption := fmt.Sprintf("Each point is a material, linked to its datasheet, labelled with its product code (or short name) where the label fits; %d materials shown. Up and to the right is better for daytime radiative cooling.", len(ps.x))
	if !ps.linkAll {
		caption = fmt.Sprintf("Each point is a material; %d materials shown. The points labelled with a product code (or short name) link to their datasheets; the table lists every material. Up and to the right is better for daytime radiative cooling.", len(ps.x))
	}
	if len(skipped) > 0 {
		caption += " Not shown (a figure is missing): " + listSome(skipped, 10) + "."
	}
	// The accessible text names the points only in a small library; the
	// table beside the chart lists every material.
	aria := "Scatter chart of solar reflectance against window emittance. "
	if len(ps.title) <= describedPoints {
		aria += strings.Join(ps.title, ". ") + "."
	} else {
		lo, hi := ps.x[0], ps.x[0]
		wlo, whi := ps.y[0], ps.y[0]
		for i := range ps.x {
			lo, hi = math.Min(lo, ps.x[i]), math.Max(hi, ps.x[i])
			wlo, whi = math.Min(wlo, ps.y[i]), math.Max(whi, ps.y[i])
		}
		aria += fmt.Sprintf("%d materials: solar reflectance from %s to %s, window emittance from %s to %s; the table lists them all.",
			len(ps.x), fmtFrac(datasheet.Num(lo)), fmtFrac(datasheet.Num(hi)), fmtFrac(datasheet.Num(wlo)), fmtFrac(datasheet.Num(whi)))
	}
	svg, err := p.svg(aria)
	if err != nil {
		return nil, err
	}
	return &chartView{ID: "library-scatter", Title: "Solar reflectance against atmospheric-window emittance", Caption: caption, SVG: template.HTML(svg)}, nil
}

// linkedPoints is the most points of the index's scatter chart that are
// all links with a tooltip; describedPoints the most that its accessible
// text names one by one.
const (
	linkedPoints    = 200
	describedPoints = 20
)

// listSome joins the first n of names and says how many more there are.
func listSome(names []string, n int) string {
	if len(names) <= n {
		return strings.Join(names, "; ")
	}
	return fmt.Sprintf("%s and %d more", strings.Join(names[:n], "; "), len(names)-n)
}

// colorW and colorH are the size of each colour chart of the index, drawn
// two to a row on a wide screen and one above the other on a phone.
const colorW, colorH = 560, 440

// hexColor reads "#rrggbb"; ok is false for anything else.
func hexColor(s string) (rgba, bool) {
	var c rgba
	if len(s) != 7 || s[0] != '#' {
		return c, false
	}
	v, err := strconv.ParseUint(s[1:], 16, 32)
	if err != nil {
		return c, false
	}
	return rgba{uint8(v >> 16), uint8(v >> 8), uint8(v), 0xff}, true
}

// colorCharts plots the solar and the near-IR reflectance of each material
// against its lightness L*, each point in the material's own colour
// (its sRGB swatch, ringed dark so that pale colours show): what a colour
// costs in sunlight, and what a pigment that reflects the near infrared
// wins back. Materials without a colour or the reflectance are left out
// and named; nil when no material has both.
func colorCharts(ms []*evaluate.Summary) ([]chartView, error) {
	var shown []*evaluate.Summary
	var skipped []string
	for _, m := range ms {
		lab, _ := m.Figures.Figure("color_lab")
		if isNaN(lab.Value) || isNaN(m.Figures.SolarReflectance) {
			skipped = append(skipped, m.Front.Title)
			continue
		}
		shown = append(shown, m)
	}
	if len(shown) == 0 {
		return nil, nil
	}
	labels := pointLabels(shown)
	var out []chartView
	for _, c := range []struct {
		id, name, short string
		value           func(*datasheet.Figures) datasheet.Num
	}{
		{"color-solar", "Solar reflectance", "solar reflectance", func(f *datasheet.Figures) datasheet.Num { return f.SolarReflectance }},
		{"color-nir", "Near-IR reflectance", "near-IR reflectance", func(f *datasheet.Figures) datasheet.Num { return f.NIRReflectance }},
	} {
		ps := &pointSet{stroke: colText}
		var desc, missing []string
		for k, m := range shown {
			y := c.value(m.Figures)
			if isNaN(y) {
				missing = append(missing, m.Front.Title)
				continue
			}
			lab, _ := m.Figures.Figure("color_lab")
			col, ok := hexColor(m.Figures.Color.Reflectance.SRGB)
			if !ok {
				col = colPalette[0]
			}
			ps.x, ps.y = append(ps.x, float64(lab.Value)), append(ps.y, float64(y))
			ps.href = append(ps.href, materialDir(m.Slug)+"index.html")
			ps.slug = append(ps.slug, m.Slug)
			ps.label = append(ps.label, labels[k])
			title := fmt.Sprintf("%s (%s): L* %s, %s %s, colour %s", m.Front.Title, labels[k],
				strconv.FormatFloat(float64(lab.Value), 'f', 1, 64), c.short, fmtFrac(y), m.Figures.Color.Reflectance.SRGB)
			ps.title = append(ps.title, title)
			desc = append(desc, title)
			ps.colors = append(ps.colors, col)
		}
		if len(ps.x) == 0 {
			continue
		}
		p := plot{width: colorW, height: colorH, xName: "Lightness L* (D65, 2°)", yName: c.name,
			xLo: 0, xHi: 100, yLo: 0, yHi: 1, xTicks: []float64{0, 20, 40, 60, 80, 100}, xFmt: "0", yFmt: "1",
			points: ps, noLegend: true}
		ps.linkAll = len(ps.x) <= linkedPoints
		aria := fmt.Sprintf("Scatter chart of %s against lightness L*. %s.", c.short, strings.Join(desc, ". "))
		if len(desc) > describedPoints {
			aria = fmt.Sprintf("Scatter chart of %s against lightness L* of %d materials; the table lists them all.", c.short, len(desc))
		}
		svg, err := p.svg(aria)
		if err != nil {
			return nil, err
		}
		caption := fmt.Sprintf("Each point is a material in its own colour (the sRGB swatch of its datasheet, approximate on screen), linked to its datasheet; %d shown.", len(ps.x))
		if c.id == "color-solar" {
			caption += " A darker colour absorbs more sunlight: this is what a colour costs."
		} else {
			caption += " Pigments that reflect the near infrared sit high here whatever their colour: this is what they win back."
		}
		if n := append(append([]string{}, skipped...), missing...); len(n) > 0 {
			caption += " Not shown (no colour or no reflectance): " + listSome(n, 10) + "."
		}
		out = append(out, chartView{ID: c.id, Title: c.name + " against lightness L*", Caption: caption, SVG: template.HTML(svg)})
	}
	return out, nil
}
