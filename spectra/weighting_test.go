package spectra

import (
	"math"
	"os"
	"strconv"
	"strings"
	"testing"
)

// constant returns a series with value v over [lo, hi] nm.
func constant(v, lo, hi float64) Series {
	return Series{Pieces: []Piece{{NM: []float64{lo, hi}, V: []float64{v, v}}}}
}

func TestG173Totals(t *testing.T) {
	for _, tt := range []struct {
		name string
		w    Weighting
		want float64
	}{
		{"global tilt", SolarGlobal(), 1000.4},         // ASTM G173-03 total, 280–4000 nm
		{"direct + circumsolar", SolarDirect(), 900.1}, // ASTM G173-03 total, 280–4000 nm
	} {
		got := weightIntegral(tt.w, 280, 4000)
		if math.Abs(got-tt.want) > 0.05 {
			t.Errorf("%s: ∫E dλ = %.3f W/m², want %.1f", tt.name, got, tt.want)
		}
	}
}

// sigma is the Stefan–Boltzmann constant, CODATA 2018 (exact-derived value
// 5.670374419e-8 W m⁻² K⁻⁴).
const sigma = 5.670374419e-8

func TestStefanBoltzmannConstant(t *testing.T) {
	if math.Abs(StefanBoltzmann-sigma)/sigma > 1e-9 { // CODATA 2018
		t.Errorf("σ = %.10g, want %.10g", StefanBoltzmann, sigma)
	}
}

func TestPlanckIntegral(t *testing.T) {
	for _, T := range []float64{250, 300, 350} {
		got := weightIntegral(Blackbody{K: T}, 200, 2e6) // W m⁻² sr⁻¹
		want := sigma * math.Pow(T, 4) / math.Pi         // ∫B dλ = σT⁴/π, CODATA σ
		if math.Abs(got-want)/want > 2e-5 {
			t.Errorf("T=%g: ∫B dλ = %.6f, want σT⁴/π = %.6f", T, got, want)
		}
	}
}

func TestWienPeak(t *testing.T) {
	const T = 300.0
	best, bestNM := 0.0, 0.0
	for nm := 9000.0; nm < 10500; nm += 0.01 {
		if b := Planck(nm, T); b > best {
			best, bestNM = b, nm
		}
	}
	got := bestNM / 1000 * T
	if math.Abs(got-2897.771955) > 0.01 { // CODATA 2018 Wien displacement constant, µm K
		t.Errorf("λ_max T = %.3f µm K, want 2897.772", got)
	}
}

func TestBlackbodyFraction(t *testing.T) {
	const T = 1000.0
	total := sigma * math.Pow(T, 4) / math.Pi
	for _, tt := range []struct{ lambdaT, want float64 }{
		// Blackbody emission fractions F(0→λT), radiation heat-transfer
		// handbook tables (values from memory).
		{2898, 0.2501},
		{5000, 0.6337},
		{10000, 0.9142},
	} {
		nm := tt.lambdaT / T * 1000
		got := weightIntegral(Blackbody{K: T}, 100, nm) / total
		if math.Abs(got-tt.want) > 3e-4 {
			t.Errorf("F(0→%g µm K) = %.5f, want %.4f", tt.lambdaT, got, tt.want)
		}
	}
}

func TestBandMeanClosedForms(t *testing.T) {
	bb := Blackbody{K: 300}
	for _, tt := range []struct {
		name   string
		x      Series
		w      Weighting
		lo, hi float64
		want   float64
		cov    float64
	}{
		{"constant R, solar", constant(0.937, 250, 4000), SolarGlobal(), 280, 2500, 0.937, 1},
		{"constant A, thermal", constant(0.42, 2000, 30000), bb, 2500, 25000, 0.42, 1},
		{"constant, half-covered", constant(0.5, 2500, 13000), bb, 8000, 25000, 0.5, -1},
	} {
		m := BandMean(tt.x, tt.w, tt.lo, tt.hi)
		if math.Abs(m.Value-tt.want) > 1e-12 {
			t.Errorf("%s: mean %.15f, want %g", tt.name, m.Value, tt.want)
		}
		if tt.cov >= 0 && m.Coverage != tt.cov {
			t.Errorf("%s: coverage %g, want %g", tt.name, m.Coverage, tt.cov)
		}
	}
}

// g173Table reads the embedded table independently of the package code.
func g173Table(t *testing.T) (nm, global []float64) {
	data, err := os.ReadFile("astm-g173-03.csv")
	if err != nil {
		t.Fatal(err)
	}
	for _, ln := range strings.Split(strings.TrimSpace(string(data)), "\n")[2:] {
		f := strings.Split(strings.TrimSpace(ln), ",")
		x, _ := strconv.ParseFloat(f[0], 64)
		y, _ := strconv.ParseFloat(f[2], 64)
		nm, global = append(nm, x), append(global, y)
	}
	return nm, global
}

func TestBandMeanStep(t *testing.T) {
	// R = 0 below the step and 1 above: the mean is the weighting's partial
	// integral above the step over its integral on the band (ASTM G173-03
	// table, summed here by the trapezoid rule on its own rows).
	nm, w := g173Table(t)
	partial := func(lo, hi float64) float64 {
		s := 0.0
		for i := 1; i < len(nm); i++ {
			if nm[i-1] >= lo && nm[i] <= hi {
				s += (nm[i] - nm[i-1]) * (w[i] + w[i-1]) / 2
			}
		}
		return s
	}
	for _, step := range []float64{400, 700, 1000, 1700} {
		x := Series{Pieces: []Piece{{NM: []float64{280, step, step + 1e-7, 2500}, V: []float64{0, 0, 1, 1}}}}
		got := BandMean(x, SolarGlobal(), 280, 2500).Value
		want := partial(step, 2500) / partial(280, 2500)
		if math.Abs(got-want) > 1e-6 {
			t.Errorf("step at %g nm: mean %.8f, want %.8f", step, got, want)
		}
	}
}

// fineBlackbody samples the Planck weighting on a grid of the given step.
type fineBlackbody struct {
	Blackbody
	step float64
}

func (b fineBlackbody) Knots(lo, hi float64) []float64 {
	var out []float64
	for x := math.Floor(lo/b.step+1) * b.step; x < hi; x += b.step {
		if x > lo {
			out = append(out, x)
		}
	}
	return out
}

func TestPlanckGridFineEnough(t *testing.T) {
	// A spectrum with sharp features: emissive only in 8–13 µm.
	x := Series{Pieces: []Piece{{
		NM: []float64{2500, 7990, 8000, 13000, 13010, 25000},
		V:  []float64{0.05, 0.05, 0.95, 0.95, 0.05, 0.05}}}}
	for _, T := range []float64{250, 300, 350} {
		coarse := BandMean(x, Blackbody{K: T}, 2500, 25000).Value
		fine := BandMean(x, fineBlackbody{Blackbody{K: T}, PlanckStepNM / 8}, 2500, 25000).Value
		if d := math.Abs(coarse - fine); d > 1e-6 { // the stated grid criterion
			t.Errorf("T=%g: refining the Planck grid changes ε by %.2e", T, d)
		}
	}
}

func TestBandMeanCoefficients(t *testing.T) {
	// Value must equal Σ Coef·x for any data.
	x := Series{Pieces: []Piece{
		{NM: []float64{300, 450, 800, 1200}, V: []float64{0.2, 0.9, 0.8, 0.95}},
		{NM: []float64{1300, 2000, 2600}, V: []float64{0.7, 0.6, 0.5}},
	}}
	m := BandMean(x, SolarGlobal(), 280, 2500)
	sum := 0.0
	for i, p := range x.Pieces {
		for j, v := range p.V {
			sum += m.Coef[i][j] * v
		}
	}
	if math.Abs(sum-m.Value) > 1e-12 {
		t.Errorf("Σ coef·x = %.15f, Value = %.15f", sum, m.Value)
	}
	if m.Coverage >= 1 || m.Coverage <= 0.9 {
		t.Errorf("coverage %g: want the 280–300 and 1200–1300 nm gaps to lower it a little", m.Coverage)
	}
}

// TestKnotsAppendSafe checks that appending to the knots of a table does
// not overwrite the table itself.
func TestKnotsAppendSafe(t *testing.T) {
	w := SolarGlobal()
	before := w.At(400.5)
	k := w.Knots(300, 400)
	_ = append(k, -1, -1, -1)
	if got := w.At(400.5); got != before {
		t.Fatalf("G173 at 400.5 nm changed from %g to %g after appending to Knots", before, got)
	}
}

// The kept integrals are the integrals: computed again, the same bits.
func TestIntegrateWeightKept(t *testing.T) {
	for _, tc := range []struct {
		w      Weighting
		lo, hi float64
	}{{SolarGlobal(), 280, 4000}, {SolarGlobal(), 300, 2500}, {Blackbody{K: 300}, 2500, 25000}, {Blackbody{K: math.NaN()}, 2500, 25000}} {
		want := integrateWeightOnce(tc.w, tc.lo, tc.hi)
		for range 2 {
			if got := integrateWeight(tc.w, tc.lo, tc.hi); got != want && !(math.IsNaN(got) && math.IsNaN(want)) {
				t.Errorf("%s over %g–%g nm: %.17g, computed again %.17g", tc.w, tc.lo, tc.hi, got, want)
			}
		}
	}
}
