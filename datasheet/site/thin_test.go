package site

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"slices"
	"strings"
	"testing"

	"skysheet/datasheet/evaluate"
	"skysheet/datasheet/library"
	"skysheet/spectra"
)

// xy is a named series for the thinning tests.
type xy struct {
	name string
	x, y []float64
}

// syntheticSeries returns series with the shapes charts meet: a 1 nm
// UV-Vis-NIR grid with noise and an absorption edge, an FTIR grid (even in
// wavenumber, so uneven in wavelength), a flat line (every triangle ties),
// a straight slope (areas that differ only by rounding), steps, lone
// spikes and a random walk.
func syntheticSeries() []xy {
	r := rand.New(rand.NewPCG(15, 3))
	var out []xy
	add := func(name string, n int, f func(i int) (float64, float64)) {
		s := xy{name: name}
		for i := range n {
			x, y := f(i)
			s.x, s.y = append(s.x, x), append(s.y, y)
		}
		out = append(out, s)
	}
	add("UV-Vis-NIR 1 nm, edge and noise", 2251, func(i int) (float64, float64) {
		nm := 250 + float64(i)
		return nm, 0.9/(1+math.Exp(-(nm-400)/8)) + 0.004*r.NormFloat64()
	})
	add("FTIR 2 cm-1 in nm", 1801, func(i int) (float64, float64) {
		nm := 1e7 / (4000 - 2*float64(i))
		return nm, 0.95 - 0.5*math.Exp(-math.Pow((nm-9500)/400, 2)) + 0.002*r.NormFloat64()
	})
	add("flat", 1000, func(i int) (float64, float64) { return float64(i), 0.5 })
	add("slope", 997, func(i int) (float64, float64) { return float64(i) * 0.1, 0.3 + float64(i)*1e-4 })
	add("steps", 1500, func(i int) (float64, float64) { return float64(i), float64(i / 300) })
	add("spikes", 1200, func(i int) (float64, float64) {
		y := 0.5
		if i%97 == 13 {
			y = 0.9
		}
		if i%131 == 7 {
			y = 0.05
		}
		return float64(i), y
	})
	walk := 0.0
	add("random walk", 5000, func(i int) (float64, float64) { walk += r.NormFloat64(); return float64(i), walk })
	return out
}

// demoSeries returns the R, T and A pieces of the demo library's
// materials (the repository root) that are long enough to be thinned.
func demoSeries(t *testing.T) []xy {
	t.Helper()
	lib, err := library.Load(os.DirFS("../.."))
	if err != nil {
		t.Fatal(err)
	}
	mats, err := evaluate.All(lib, evaluate.Options{})
	if err != nil {
		t.Fatal(err)
	}
	var out []xy
	for _, m := range mats {
		for _, q := range []struct {
			name string
			s    spectra.Series
		}{{"R", m.Optics.R}, {"T", m.Optics.T}, {"A", m.Optics.A}} {
			for i, p := range q.s.Pieces {
				if len(p.NM) > 400 {
					out = append(out, xy{fmt.Sprintf("demo %s %s piece %d", m.Slug, q.name, i), p.NM, p.V})
				}
			}
		}
	}
	if len(out) < 10 {
		t.Fatalf("only %d demo series long enough to thin", len(out))
	}
	return out
}

// TestThinCrossCheck thins synthetic series and the demo's spectra with
// lttb and with the largest-triangle-three-buckets implementation of the
// general-purpose npm library "downsample" 1.4.0 (through
// testdata/lttb/crosscheck/thin.mjs), at several thresholds, and compares
// the indices kept: they must be the same. It needs node and the library
// (npm ci --prefix testdata/lttb/crosscheck); without them it is skipped,
// unless CI is set.
func TestThinCrossCheck(t *testing.T) {
	dir := filepath.Join("..", "..", "testdata", "lttb", "crosscheck")
	node, err := exec.LookPath("node")
	if err == nil {
		_, err = os.Stat(filepath.Join(dir, "node_modules", "downsample", "package.json"))
	}
	if err != nil {
		if os.Getenv("CI") != "" {
			t.Fatalf("cross-check unavailable in CI: %v (run npm ci --prefix testdata/lttb/crosscheck)", err)
		}
		t.Skipf("cross-check unavailable: %v (run npm ci --prefix testdata/lttb/crosscheck)", err)
	}
	type series struct {
		Name string    `json:"name"`
		X    []float64 `json:"x"`
		Y    []float64 `json:"y"`
		N    int       `json:"n"`
	}
	var in struct {
		Series []series `json:"series"`
	}
	all := append(syntheticSeries(), demoSeries(t)...)
	for _, s := range all {
		for _, n := range []int{3, 4, 100, 360, len(s.x) - 1, len(s.x)} {
			in.Series = append(in.Series, series{fmt.Sprintf("%s, n = %d", s.name, n), s.x, s.y, n})
		}
	}
	// Short series, where the buckets hold one or two points.
	for _, size := range []int{3, 4, 5, 7, 10} {
		s := series{Name: fmt.Sprintf("%d points", size)}
		for i := range size {
			s.X, s.Y = append(s.X, float64(i)), append(s.Y, math.Sin(float64(i*i)))
		}
		for n := 3; n <= size; n++ {
			s.N = n
			c := s
			c.Name += fmt.Sprintf(", n = %d", n)
			in.Series = append(in.Series, c)
		}
	}
	input, err := json.Marshal(in)
	if err != nil {
		t.Fatal(err)
	}
	cmd := exec.Command(node, filepath.Join(dir, "thin.mjs"))
	cmd.Stdin = bytes.NewReader(input)
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("node: %v\n%s", err, stderr.String())
	}
	var theirs struct {
		Series []struct {
			Name string `json:"name"`
			Kept []int  `json:"kept"`
		} `json:"series"`
	}
	if err := json.Unmarshal(out, &theirs); err != nil || len(theirs.Series) != len(in.Series) {
		t.Fatalf("node output: %v (%d series for %d)", err, len(theirs.Series), len(in.Series))
	}
	shortEnd := 0
	for i, s := range in.Series {
		want := theirs.Series[i].Kept // npm "downsample" 1.4.0, LTTB
		// One known difference: downsample reports as the last index the
		// count of points in its buckets, which is one short of the last
		// point when (n−2)·k rounds down below len−2 (k = (len−2)/(n−2));
		// the last point itself, in Steinarsson's reference code and here,
		// is always kept. Where that happens the rest must still agree.
		size := len(s.X)
		if k := len(want) - 1; s.N >= 3 && s.N < size && want[k] == size-2 &&
			1+int(math.Floor(float64(s.N-2)*(float64(size-2)/float64(s.N-2)))) == size-2 {
			want = append(want[:k:k], size-1)
			shortEnd++
		}
		if got := lttb(s.X, s.Y, s.N); !slices.Equal(got, want) {
			first := 0
			for first < min(len(got), len(want)) && got[first] == want[first] {
				first++
			}
			t.Errorf("%s: %d indices, downsample %d; first difference at position %d", s.Name, len(got), len(want), first)
		}
	}
	t.Logf("%d series compared; in %d, downsample's last index was one short of the last point", len(in.Series), shortEnd)
}

// TestLTTB checks the properties of lttb on every synthetic series and
// threshold, and one case worked by hand.
func TestLTTB(t *testing.T) {
	// Worked by hand from the algorithm's definition: buckets {1, 2} and
	// {3, 4, 5}; in the first, point 1 makes the larger triangle with
	// point 0 and the next bucket's mean (4, 10/3) (area 8.33 against
	// 3.33); in the second, point 5 with point 1 and the last point
	// (area 20 against 5 and 5).
	if got := lttb([]float64{0, 1, 2, 3, 4, 5, 6}, []float64{0, 5, 0, 1, 0, 9, 0}, 4); !slices.Equal(got, []int{0, 1, 5, 6}) {
		t.Errorf("hand-worked case: %v, want [0 1 5 6]", got)
	}
	for _, s := range syntheticSeries() {
		size := len(s.x)
		for _, tc := range []struct {
			n, want int
		}{
			{0, 2}, {2, 2}, {3, 3}, {50, 50}, {360, 360}, {size - 1, size - 1}, {size, size}, {size + 10, size},
		} {
			got := lttb(s.x, s.y, tc.n)
			if len(got) != tc.want {
				t.Errorf("%s, n = %d: %d points, want %d", s.name, tc.n, len(got), tc.want)
				continue
			}
			if got[0] != 0 || got[len(got)-1] != size-1 {
				t.Errorf("%s, n = %d: ends %d and %d, want 0 and %d", s.name, tc.n, got[0], got[len(got)-1], size-1)
			}
			for i := 1; i < len(got); i++ {
				if got[i] <= got[i-1] {
					t.Fatalf("%s, n = %d: indices not increasing at %d: %v", s.name, tc.n, i, got[i-1:i+1])
				}
			}
			if tc.n >= 3 && tc.n < size {
				// One point from each bucket of consecutive points.
				every := float64(size-2) / float64(tc.n-2)
				for b := range tc.n - 2 {
					from, to := 1+int(math.Floor(float64(b)*every)), 1+int(math.Floor(float64(b+1)*every))
					if k := got[b+1]; k < from || k >= to {
						t.Fatalf("%s, n = %d: bucket %d [%d, %d) kept %d", s.name, tc.n, b, from, to, k)
					}
				}
			}
		}
	}
}

// TestThin checks what a chart gets from thin: about one point per pixel
// that a run spans, its ends and its extremes kept, x increasing, short
// runs unchanged, NaN a gap.
func TestThin(t *testing.T) {
	flat := func(n int, lo, step float64) spectra.Piece {
		var p spectra.Piece
		for i := range n {
			p.NM, p.V = append(p.NM, lo+float64(i)*step), append(p.V, 0.5+0.01*math.Sin(float64(i)/40))
		}
		return p
	}
	// A dip and a peak one point wide each, in the same bucket of 360:
	// LTTB keeps one point per bucket, so alone it loses one of them.
	twin := flat(2251, 250, 1)
	twin.V[1000], twin.V[1002] = 0.05, 0.98
	if k := lttb(twin.NM, twin.V, 360); slices.Contains(k, 1000) && slices.Contains(k, 1002) {
		t.Fatalf("the case does not test the extremes: LTTB alone kept both")
	}
	for _, tc := range []struct {
		name     string
		p        spectra.Piece
		lo, hi   float64
		px       int
		min, max int // points kept
	}{
		{"1 nm grid over the whole axis", flat(2251, 250, 1), 250, 2500, 360, 360, 362},
		{"dip and peak in one bucket", twin, 250, 2500, 360, 360, 362},
		{"a tenth of the axis", flat(2251, 250, 0.1), 250, 2500, 360, 36, 38},
		{"short piece unchanged", flat(300, 250, 2250.0/299), 250, 2500, 360, 300, 300},
		{"no width: unchanged", flat(2251, 250, 1), 250, 2500, 0, 2251, 2251},
		{"empty axis: unchanged", flat(2251, 250, 1), 250, 250, 360, 2251, 2251},
		{"two points", flat(2, 250, 1), 250, 2500, 360, 2, 2},
	} {
		got := thin(tc.p, tc.lo, tc.hi, tc.px)
		if len(got) != 1 {
			t.Errorf("%s: %d pieces, want 1", tc.name, len(got))
			continue
		}
		g := got[0]
		if n := len(g.NM); n < tc.min || n > tc.max || len(g.V) != n {
			t.Errorf("%s: %d points, want %d to %d", tc.name, n, tc.min, tc.max)
			continue
		}
		last := len(tc.p.NM) - 1
		if g.NM[0] != tc.p.NM[0] || g.NM[len(g.NM)-1] != tc.p.NM[last] {
			t.Errorf("%s: ends %v, %v; want %v, %v", tc.name, g.NM[0], g.NM[len(g.NM)-1], tc.p.NM[0], tc.p.NM[last])
		}
		for i := 1; i < len(g.NM); i++ {
			if !(g.NM[i] > g.NM[i-1]) {
				t.Fatalf("%s: x not increasing at %d", tc.name, i)
			}
		}
		// Every point kept is a point of the data, and the extremes are kept.
		for i, x := range g.NM {
			j := slices.Index(tc.p.NM, x)
			if j < 0 || tc.p.V[j] != g.V[i] {
				t.Fatalf("%s: point (%v, %v) is not in the data", tc.name, x, g.V[i])
			}
		}
		if slices.Min(g.V) != slices.Min(tc.p.V) || slices.Max(g.V) != slices.Max(tc.p.V) {
			t.Errorf("%s: range %v–%v drawn, data %v–%v", tc.name, slices.Min(g.V), slices.Max(g.V), slices.Min(tc.p.V), slices.Max(tc.p.V))
		}
	}

	// A NaN inside a piece ends a run: two pieces, never joined across it.
	p := flat(2251, 250, 1)
	p.V[1200] = math.NaN()
	got := thin(p, 250, 2500, 360)
	if len(got) != 2 || got[0].NM[len(got[0].NM)-1] != 1449 || got[1].NM[0] != 1451 {
		t.Fatalf("NaN at 1450 nm: %d pieces %v", len(got), got)
	}
	for _, g := range got {
		for _, v := range g.V {
			if math.IsNaN(v) {
				t.Fatalf("NaN drawn")
			}
		}
	}
	if got := thin(spectra.Piece{NM: []float64{1, 2}, V: []float64{math.NaN(), math.NaN()}}, 0, 3, 360); len(got) != 0 {
		t.Errorf("all NaN: %v", got)
	}
}

// curveRE matches the paths of go-chart's SVG.
var curveRE = regexp.MustCompile(`<path\s+d="([^"]*)" style="([^"]*)"`)

// TestChartThinned draws a chart of a 1 nm spectrum in two pieces with a
// gap between them: each piece is one path of about a point per unit of
// the chart's width, and nothing is drawn across the gap.
func TestChartThinned(t *testing.T) {
	var a, b spectra.Piece
	for nm := 250.0; nm <= 2500; nm++ {
		v := 0.6 + 0.3*math.Sin(nm/50)
		switch {
		case nm <= 1200:
			a.NM, a.V = append(a.NM, nm), append(a.V, v)
		case nm >= 1300:
			b.NM, b.V = append(b.NM, nm), append(b.V, v)
		}
	}
	p := plot{width: chartW, height: chartH, xLo: 250, xHi: 2500, yLo: 0, yHi: 1, xFmt: "0", yFmt: "1",
		lines: []line{{name: "R", color: colR, width: 2, pieces: []spectra.Piece{a, b}}}}
	out, err := p.svg("test")
	if err != nil {
		t.Fatal(err)
	}
	stroke := fmt.Sprintf("stroke:rgba(%d,%d,%d,1.0)", colR.R, colR.G, colR.B)
	var vertices []int
	for _, m := range curveRE.FindAllStringSubmatch(out, -1) {
		// The legend's swatch is a path of two points.
		if n := strings.Count(m[1], "L ") + 1; n > 2 && strings.Contains(m[2], stroke) && strings.Contains(m[2], "stroke-width:2;") {
			vertices = append(vertices, n)
		}
	}
	// The pieces span 950 and 1200 nm of 2250 and the plot is about 300
	// units wide (360 less the margins and the y labels): about 127 and
	// 160 points, each with up to two extremes added.
	if len(vertices) != 2 || vertices[0] < 110 || vertices[0] > 140 || vertices[1] < 140 || vertices[1] > 175 || vertices[1] <= vertices[0] {
		t.Errorf("paths of the curve: %v vertices, want two of about 127 and 160", vertices)
	}
}

// TestDemoPagesLight renders the demo library into memory: every
// datasheet, charts included, is under 300 KB, and its spectrum.csv holds
// every point of the material's spectrum, however thinned its charts are.
func TestDemoPagesLight(t *testing.T) {
	lib, err := library.Load(os.DirFS("../.."))
	if err != nil {
		t.Fatal(err)
	}
	out := memWriter{}
	if err := Render(lib, Options{}, out); err != nil {
		t.Fatal(err)
	}
	mats, err := evaluate.All(lib, evaluate.Options{})
	if err != nil {
		t.Fatal(err)
	}
	thinned := 0
	for _, m := range mats {
		dir := "m/" + m.Slug + "/"
		page := out[dir+"index.html"]
		if len(page) == 0 || len(page) >= 300_000 {
			t.Errorf("%sindex.html: %d bytes, want under 300 KB", dir, len(page))
		}
		s, err := spectra.Parse(bytes.NewReader(out[dir+"spectrum.csv"]), "spectrum.csv")
		if err != nil {
			t.Errorf("%sspectrum.csv: %v", dir, err)
			continue
		}
		if s.Len() != m.Sample.Len() {
			t.Errorf("%sspectrum.csv: %d rows, the spectrum has %d", dir, s.Len(), m.Sample.Len())
		}
		for _, q := range []spectra.Quantity{spectra.R, spectra.T, spectra.A} {
			got, want := s.Series(q), m.Sample.Series(q)
			if len(got.Pieces) != len(want.Pieces) {
				t.Errorf("%sspectrum.csv: %v in %d pieces, want %d", dir, q, len(got.Pieces), len(want.Pieces))
				continue
			}
			for i := range want.Pieces {
				if !slices.Equal(got.Pieces[i].NM, want.Pieces[i].NM) || !slices.Equal(got.Pieces[i].V, want.Pieces[i].V) {
					t.Errorf("%sspectrum.csv: %v piece %d differs from the spectrum", dir, q, i)
				}
				if len(want.Pieces[i].NM) > chartW+2 {
					thinned++
				}
			}
		}
	}
	if thinned == 0 {
		t.Errorf("no demo spectrum has more points than a chart draws: the test shows nothing")
	}
}
