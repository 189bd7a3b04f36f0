package site

import (
	"bytes"
	"math"
	"slices"
	"strings"
	"testing"

	"github.com/wcharczuk/go-chart/v2"

	"skysheet/spectra"
)

// testPlot is a chart like a datasheet's: three curves of 2000 points, a
// shaded band, a shaded curve and a legend.
func testPlot() plot {
	var r, a, sun spectra.Piece
	for i := range 2000 {
		nm := 300 + float64(i)
		r.NM, r.V = append(r.NM, nm), append(r.V, 0.9-0.1*math.Sin(nm/90))
		a.NM, a.V = append(a.NM, nm), append(a.V, 0.1+0.1*math.Sin(nm/90))
		sun.NM, sun.V = append(sun.NM, nm), append(sun.V, math.Exp(-math.Pow((nm-600)/400, 2)))
	}
	return plot{
		width: 640, height: 380, xName: "Wavelength (nm)", yName: "Fraction",
		xLo: 300, xHi: 2300, yLo: 0, yHi: 1, yFmt: "1",
		bands: []band{{name: "Band", lo: 800, hi: 1300, color: colWindow}},
		lines: []line{
			{name: "Solar spectrum (relative)", color: colSun, fill: true, pieces: []spectra.Piece{sun}},
			{name: "Reflectance R", color: colR, width: 2, pieces: []spectra.Piece{r}},
			{name: "Absorptance A", color: colA, width: 2, dash: []float64{5, 3}, pieces: []spectra.Piece{a}},
		},
	}
}

// TestCachedSVGIdentical checks that caching font faces does not change a
// single byte of go-chart's SVG output.
func TestCachedSVGIdentical(t *testing.T) {
	for _, p := range []plot{testPlot(), axesPlot(), func() plot {
		p := testPlot()
		p.yName = "Rotated axis name with more text (W m⁻² nm⁻¹)"
		return p
	}(), markedPlot(), pointPlot()} {
		var plain, cached bytes.Buffer
		if err := p.chart().Render(chart.SVG, &plain); err != nil {
			t.Fatal(err)
		}
		if err := p.chart().Render(cachedSVG, &cached); err != nil {
			t.Fatal(err)
		}
		if plain.Len() < 1000 || !bytes.Equal(plain.Bytes(), cached.Bytes()) {
			t.Errorf("cached renderer output differs (%d vs %d bytes)", plain.Len(), cached.Len())
		}
		// Render a second time: a warm cache must give the same bytes too.
		cached.Reset()
		if err := p.chart().Render(cachedSVG, &cached); err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(plain.Bytes(), cached.Bytes()) {
			t.Errorf("warm cached renderer output differs")
		}
	}
}

// markedPlot is a chart with a band with edges and a label, rules and a
// long legend in one column.
func markedPlot() plot {
	p := testPlot()
	p.bands = []band{{name: "Window", lo: 800, hi: 1300, color: colWindow, edge: colWindowE, label: "window"}}
	p.rules = []rule{{at: 0.5, color: colAxis}, {name: "Marker at 1500", at: 1500, vertical: true, color: colMark, dash: []float64{6, 3}}}
	p.lines = append(p.lines, line{name: "A rather long legend entry that needs a whole row", color: colT, width: 2, pieces: p.lines[1].pieces})
	return p
}

// pointPlot is a scatter chart.
func pointPlot() plot {
	ps := &pointSet{x: []float64{0.2, 0.5, 0.52}, y: []float64{0.3, 0.6, 0.61}, href: []string{"a", "b", "c"},
		label: []string{"A-1", "B-2", "C-3"}, title: []string{"a", "b", "c"}, slug: []string{"a", "b", "c"}}
	return plot{width: scatterW, height: scatterH, xName: "x", yName: "y", xLo: 0, xHi: 1, yLo: 0, yHi: 1, points: ps, noLegend: true}
}

// axesPlot is a chart with little to draw but its axes, ticks, names and
// legend: the cost is nearly all text measurement.
func axesPlot() plot {
	p := testPlot()
	for i := range p.lines {
		p.lines[i].pieces = []spectra.Piece{{NM: []float64{300, 2300}, V: []float64{0.2, 0.8}}}
	}
	return p
}

func BenchmarkAxesPlainSVG(b *testing.B)  { benchRender(b, axesPlot(), chart.SVG) }
func BenchmarkAxesCachedSVG(b *testing.B) { benchRender(b, axesPlot(), cachedSVG) }

func benchRender(b *testing.B, p plot, rp chart.RendererProvider) {
	var buf bytes.Buffer
	for b.Loop() {
		buf.Reset()
		if err := p.chart().Render(rp, &buf); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkChartPlainSVG(b *testing.B) {
	p := testPlot()
	var buf bytes.Buffer
	for b.Loop() {
		buf.Reset()
		if err := p.chart().Render(chart.SVG, &buf); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkChartCachedSVG(b *testing.B) {
	p := testPlot()
	var buf bytes.Buffer
	for b.Loop() {
		buf.Reset()
		if err := p.chart().Render(cachedSVG, &buf); err != nil {
			b.Fatal(err)
		}
	}
}

func TestEscapedText(t *testing.T) {
	p := testPlot()
	p.lines[1].name = `<script>alert("x")</script> & more`
	out, err := p.svg(`label with "quotes" <b>`)
	if err != nil {
		t.Fatal(err)
	}
	if strings.Contains(out, "<script>") || strings.Contains(out, "<b>") {
		t.Errorf("unescaped text in SVG")
	}
	if !strings.Contains(out, "&lt;script&gt;") || !strings.Contains(out, `aria-label="label with &#34;quotes&#34; &lt;b&gt;"`) {
		t.Errorf("escaped text missing")
	}
}

func TestClip(t *testing.T) {
	p := spectra.Piece{NM: []float64{100, 200, 300, 400}, V: []float64{0, 1, 2, 3}}
	got := clip(p, 150, 350)
	want := spectra.Piece{NM: []float64{150, 200, 300, 350}, V: []float64{0.5, 1, 2, 2.5}} // linear interpolation by hand
	if len(got.NM) != len(want.NM) {
		t.Fatalf("got %+v", got)
	}
	for i := range want.NM {
		if got.NM[i] != want.NM[i] || math.Abs(got.V[i]-want.V[i]) > 1e-12 {
			t.Errorf("got %+v, want %+v", got, want)
		}
	}
	if got := clip(p, 500, 600); len(got.NM) != 0 {
		t.Errorf("outside: %+v", got)
	}
	// Ends on data points, and a range between two points; linear
	// interpolation by hand.
	for _, tt := range []struct {
		lo, hi float64
		want   spectra.Piece
	}{
		{200, 300, spectra.Piece{NM: []float64{200, 300}, V: []float64{1, 2}}},
		{100, 400, p},
		{50, 450, p},
		{220, 260, spectra.Piece{NM: []float64{220, 260}, V: []float64{1.2, 1.6}}},
		{400, 500, spectra.Piece{NM: []float64{400}, V: []float64{3}}},
	} {
		got := clip(p, tt.lo, tt.hi)
		if len(got.NM) != len(tt.want.NM) {
			t.Fatalf("[%g, %g]: got %+v, want %+v", tt.lo, tt.hi, got, tt.want)
		}
		for i := range tt.want.NM {
			if got.NM[i] != tt.want.NM[i] || math.Abs(got.V[i]-tt.want.V[i]) > 1e-12 {
				t.Errorf("[%g, %g]: got %+v, want %+v", tt.lo, tt.hi, got, tt.want)
			}
		}
	}
}

func TestTicks(t *testing.T) {
	got := ticks(280, 2500, nil, "", 7)
	var vals []float64
	for _, tk := range got {
		vals = append(vals, tk.Value)
	}
	// 280 and 2500 always, round steps of 500 between, none too close to
	// the ends (300 would crowd 280).
	want := []float64{280, 500, 1000, 1500, 2000, 2500}
	if !slices.Equal(vals, want) {
		t.Fatalf("ticks %v, want %v", vals, want)
	}
	// Given values: an end between them is a tick without a label, and
	// does not push out a labelled tick next to it.
	got = ticks(-450, 200, []float64{-400, -300, -200, -100, 0, 100, 200}, "0", 7)
	var labels []string
	vals = vals[:0]
	for _, tk := range got {
		vals, labels = append(vals, tk.Value), append(labels, tk.Label)
	}
	if want := []float64{-450, -400, -300, -200, -100, 0, 100, 200}; !slices.Equal(vals, want) {
		t.Errorf("ticks %v, want %v", vals, want)
	}
	if want := []string{"", "-400", "-300", "-200", "-100", "0", "100", "200"}; !slices.Equal(labels, want) {
		t.Errorf("tick labels %q, want %q", labels, want)
	}
}

// TestLegendLayout checks that a legend takes two columns when they fit
// and one when they do not, and that a longer legend makes the chart
// taller rather than the plot smaller.
func TestLegendLayout(t *testing.T) {
	p := testPlot()
	if lg := p.legendLayout(); lg.cols != 2 || lg.rows != 2 {
		t.Errorf("three short entries: %d columns, %d rows; want 2, 2", lg.cols, lg.rows)
	}
	m := markedPlot()
	lg := m.legendLayout()
	if lg.cols != 1 || lg.rows != 6 {
		t.Errorf("six entries, one long: %d columns, %d rows; want 1, 6", lg.cols, lg.rows)
	}
	if c := m.chart(); c.Height != m.height+4*legendRow {
		t.Errorf("chart height %d with six legend rows, want %d", c.Height, m.height+4*legendRow)
	}
}

// TestEmptyPlot checks that a plot with nothing in range still renders
// its axes.
func TestEmptyPlot(t *testing.T) {
	p := testPlot()
	p.xLo, p.xHi = 5000, 6000
	p.bands = nil
	svg, err := p.svg("empty")
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(svg, ">5000</text>") || !strings.Contains(svg, ">6000</text>") || !strings.Contains(svg, ">0.0</text>") || !strings.Contains(svg, ">1.0</text>") {
		t.Errorf("axes missing from an empty plot")
	}
}
