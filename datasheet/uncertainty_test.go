package datasheet

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"skysheet/spectra"
)

// coarseSample is an invented opaque coating on a coarse grid: a visible
// file 300–2400 nm and an infrared file 2.5–25 µm (with a gap between), R
// given with a per-point standard uncertainty u when u > 0.
func coarseSample(u float64, withU bool) string {
	var b strings.Builder
	b.WriteString("# sample: invented coarse coating (test data)\n")
	if withU {
		b.WriteString("wavelength_nm,R,u_R\n")
	} else {
		b.WriteString("wavelength_nm,R\n")
	}
	row := func(nm, r float64) {
		if withU {
			fmt.Fprintf(&b, "%g,%g,%g\n", nm, r, u)
		} else {
			fmt.Fprintf(&b, "%g,%g\n", nm, r)
		}
	}
	for nm := 300.0; nm <= 2400; nm += 100 {
		row(nm, 0.9-0.3*math.Exp(-(nm-300)/80))
	}
	b.WriteString("\n")
	for nm := 2500.0; nm <= 25000; nm += 500 {
		r := 0.15
		if nm >= 8000 && nm <= 13000 {
			r = 0.04
		}
		row(nm, r)
	}
	return b.String()
}

func TestCorrelatedOffset(t *testing.T) {
	// A constant offset δ in R moves the solar reflectance by exactly δ when
	// errors move together: the weights of a weighted mean sum to 1
	// (definition of the fully correlated case, JCGM 100:2008 5.2.2).
	const delta = 0.01
	text := strings.Replace(coarseSample(0, false), "wavelength_nm,R\n", fmt.Sprintf("# u_R: %g\nwavelength_nm,R\n", delta), 1)
	f, err := compute(mustParse(t, text, "offset.csv"), DefaultConditions())
	if err != nil {
		t.Fatal(err)
	}
	x, _ := f.Figure("solar_reflectance")
	if x.Uncertainty == nil || math.Abs(float64(x.Uncertainty.Correlated)-delta) > 1e-12 {
		t.Fatalf("solar reflectance uncertainty %+v, want correlated %g", x.Uncertainty, delta)
	}
	// With R moved everywhere by δ and absorptance A = 1 − R, the cooling
	// powers move by terms linear in A (P_rad, P_atm, and I·δ from the sun),
	// as does the thermal emittance: exactly the half-difference of the
	// figures recomputed from the moved spectra. The equilibrium and the SRI
	// are not linear in A; their uncertainty is first order (the law of
	// propagation, JCGM 100:2008 5.1.2), which the half-difference (f(δ) −
	// f(−δ))/2 = f′δ + f‴δ³/6 + … meets to second order: the gap, relative,
	// falls about fourfold when δ halves.
	for _, key := range []string{"cooling_power_w_m2", "cooling_power_night_w_m2", "thermal_emittance", "equilibrium_delta_k", "sri_medium"} {
		x, _ := f.Figure(key)
		if x.Uncertainty == nil {
			t.Fatalf("%s: no uncertainty", key)
		}
		got := float64(x.Uncertainty.Correlated)
		half := func(d float64) float64 {
			a, _ := Compute2(t, text, +d).Figure(key)
			b, _ := Compute2(t, text, -d).Figure(key)
			return math.Abs(float64(a.Value-b.Value)) / 2
		}
		want := half(delta)
		if key == "equilibrium_delta_k" || key == "sri_medium" {
			gap := math.Abs(got-want) / want
			gapHalf := math.Abs(got/2-half(delta/2)) / (want / 2)
			t.Logf("%s: propagated %.10g, half-difference %.10g; gap %.2g, with δ/2 %.2g", key, got, want, gap, gapHalf)
			if gap > 1e-3 || !(gapHalf < gap/3) {
				t.Errorf("%s: correlated uncertainty %.10g against the half-difference %.10g (gap %.2g), "+
					"with δ/2 gap %.2g: not first order", key, got, want, gap, gapHalf)
			}
			continue
		}
		if math.Abs(got-want) > 1e-9*math.Max(1, want) {
			t.Errorf("%s: correlated uncertainty %+v, want %.10g from the moved spectra", key, x.Uncertainty, want)
		}
	}
}

// Compute2 computes the figures of text with every R moved by d.
func Compute2(t *testing.T, text string, d float64) *Figures {
	t.Helper()
	s := mustParse(t, text, "moved.csv")
	for i := range s.Segments {
		g := &s.Segments[i]
		for j := range g.Values[spectra.R] {
			g.Values[spectra.R][j] += d
		}
		g.Values[spectra.UR] = nil
	}
	f, err := compute(s, DefaultConditions())
	if err != nil {
		t.Fatal(err)
	}
	return f
}

func TestUncertaintyMonteCarlo(t *testing.T) {
	// Monte Carlo propagation (JCGM 101:2008, GUM Supplement 1): the spread
	// of the figures over random draws of R within its uncertainty must
	// match the propagated standard uncertainties, independent draws per
	// wavelength for the uncorrelated case and one shared draw for the
	// correlated case. 300 draws give the standard deviation to about 4 %.
	const u, draws, tol = 0.02, 300, 0.1
	keys := []string{"solar_reflectance", "thermal_emittance", "cooling_power_w_m2", "cooling_power_night_w_m2",
		"equilibrium_delta_k", "equilibrium_delta_night_k", "sri_medium"}
	f, err := compute(mustParse(t, coarseSample(u, true), "coarse.csv"), DefaultConditions())
	if err != nil {
		t.Fatal(err)
	}
	base := mustParse(t, coarseSample(0, false), "coarse.csv")
	rng := rand.New(rand.NewPCG(1, 1))
	for _, together := range []bool{false, true} {
		sum, sum2 := map[string]float64{}, map[string]float64{}
		for range draws {
			s := &spectra.Spectrum{Segments: make([]spectra.Segment, len(base.Segments))}
			z := rng.NormFloat64()
			for i, g := range base.Segments {
				r := make([]float64, len(g.NM))
				for j, v := range g.Values[spectra.R] {
					if !together {
						z = rng.NormFloat64()
					}
					r[j] = v + u*z
				}
				s.Segments[i] = spectra.Segment{NM: g.NM, Source: g.Source}
				s.Segments[i].Values[spectra.R] = r
			}
			g, err := compute(s, DefaultConditions())
			if err != nil {
				t.Fatal(err)
			}
			for _, k := range keys {
				x, _ := g.Figure(k)
				sum[k] += float64(x.Value)
				sum2[k] += float64(x.Value) * float64(x.Value)
			}
		}
		for _, k := range keys {
			mean := sum[k] / draws
			sd := math.Sqrt((sum2[k] - draws*mean*mean) / (draws - 1))
			x, _ := f.Figure(k)
			if x.Uncertainty == nil {
				t.Fatalf("%s: no uncertainty", k)
			}
			want := float64(x.Uncertainty.Uncorrelated)
			if together {
				want = float64(x.Uncertainty.Correlated)
			}
			t.Logf("%s together=%v sd %.5g want %.5g ratio %.3f", k, together, sd, want, sd/want)
			if math.Abs(sd-want) > tol*want {
				t.Errorf("%s (together %v): Monte Carlo spread %.5g, propagated %.5g", k, together, sd, want)
			}
		}
	}
}

func TestUncertaintyColumnOrMetadata(t *testing.T) {
	col, err := compute(mustParse(t, coarseSample(0.004, true), "c.csv"), DefaultConditions())
	if err != nil {
		t.Fatal(err)
	}
	text := strings.Replace(coarseSample(0, false), "wavelength_nm,R\n", "# u_R: 0.4 %\nwavelength_nm,R\n", 1)
	meta, err := compute(mustParse(t, text, "m.csv"), DefaultConditions())
	if err != nil {
		t.Fatal(err)
	}
	for i, x := range col.Figures {
		y := meta.Figures[i]
		if (x.Uncertainty == nil) != (y.Uncertainty == nil) {
			t.Fatalf("%s: %+v vs %+v", x.Key, x.Uncertainty, y.Uncertainty)
		}
		if x.Uncertainty != nil && (math.Abs(float64(x.Uncertainty.Uncorrelated-y.Uncertainty.Uncorrelated)) > 1e-12 ||
			math.Abs(float64(x.Uncertainty.Correlated-y.Uncertainty.Correlated)) > 1e-9) {
			t.Errorf("%s: column %+v, metadata %+v", x.Key, *x.Uncertainty, *y.Uncertainty)
		}
	}
}

func TestUncertaintyReach(t *testing.T) {
	none, err := compute(mustParse(t, coarseSample(0, false), "n.csv"), DefaultConditions())
	if err != nil {
		t.Fatal(err)
	}
	for _, x := range none.Figures {
		if x.Uncertainty != nil {
			t.Errorf("%s has an uncertainty without any in the data", x.Key)
		}
	}
	// The white coating states u_R for its UV-Vis-NIR file only and no u_T.
	f, err := compute(whiteSample(t), DefaultConditions())
	if err != nil {
		t.Fatal(err)
	}
	for _, tt := range []struct {
		key   string
		reach float64 // NaN: no uncertainty
	}{
		{"solar_reflectance", 1},
		{"solar_transmittance", math.NaN()},
		{"solar_absorptance", 0.5}, // half of ∂α/∂(R, T) is on T
		{"thermal_emittance", math.NaN()},
		{"cooling_power_night_w_m2", math.NaN()},
	} {
		x, _ := f.Figure(tt.key)
		switch {
		case math.IsNaN(tt.reach) && x.Uncertainty != nil:
			t.Errorf("%s: uncertainty %+v, want none", tt.key, *x.Uncertainty)
		case !math.IsNaN(tt.reach) && (x.Uncertainty == nil || math.Abs(float64(x.Uncertainty.Reach)-tt.reach) > 1e-9):
			t.Errorf("%s: uncertainty %+v, want reach %g", tt.key, x.Uncertainty, tt.reach)
		}
	}
}

// resampled writes quantity R of s, with a constant u_R, on a grid of
// step in the axis unit ("nm" or "cm-1") over [lo, hi], linear between
// s's points: what a user gets by exporting the same measurement more
// finely or more coarsely.
func resampled(t *testing.T, s *spectra.Spectrum, unit string, lo, hi, step, u float64) string {
	t.Helper()
	r := s.Series(spectra.R)
	var b strings.Builder
	fmt.Fprintf(&b, "# sample: resampled test data (invented)\n# u_R: %g\n", u)
	if unit == "nm" {
		b.WriteString("wavelength_nm,R\n")
	} else {
		b.WriteString("wavenumber_cm-1,R\n")
	}
	n := int(math.Round((hi - lo) / step))
	for i := 0; i <= n; i++ {
		x := lo + float64(i)*step
		nm := x
		if unit != "nm" {
			nm = 1e7 / x
		}
		v, ok := r.At(nm)
		if !ok {
			t.Fatalf("no R at %g nm", nm)
		}
		fmt.Fprintf(&b, "%g,%.6f\n", x, v)
	}
	return b.String()
}

// TestUncertaintyResampling checks that the uncertainty of every figure
// does not depend on how finely a file was exported (docs/cooling.md,
// "Uncertainty"): the white coating's UV-Vis-NIR file on 2 nm and 0.5 nm
// grids and its FTIR file on 4 cm⁻¹ and 1 cm⁻¹ grids, at their default
// resolutions of 2 nm and 4 cm⁻¹, give uncertainties within 5 % of each
// other. Errors independent from point to point would give half as much
// on the finer grids (1/√4).
func TestUncertaintyResampling(t *testing.T) {
	white := whiteSample(t)
	sample := func(uvStep, irStep float64) *Figures {
		uv := mustParse(t, resampled(t, white, "nm", 280, 2500, uvStep, 0.005), "uv.csv")
		ir := mustParse(t, resampled(t, white, "cm-1", 400, 4000, irStep, 0.01), "ir.csv")
		s, err := spectra.Join([]*spectra.Spectrum{uv, ir}, spectra.SpliceOptions{})
		if err != nil {
			t.Fatal(err)
		}
		f, err := compute(s, DefaultConditions())
		if err != nil {
			t.Fatal(err)
		}
		return f
	}
	coarse, fine := sample(2, 4), sample(0.5, 1)
	checked := 0
	for _, x := range coarse.Figures {
		y, _ := fine.Figure(x.Key)
		if x.Uncertainty == nil || y.Uncertainty == nil {
			if (x.Uncertainty == nil) != (y.Uncertainty == nil) {
				t.Errorf("%s: uncertainty %+v on the coarse grid, %+v on the fine one", x.Key, x.Uncertainty, y.Uncertainty)
			}
			continue
		}
		checked++
		for _, c := range []struct {
			name string
			a, b Num
		}{{"noise", x.Uncertainty.Uncorrelated, y.Uncertainty.Uncorrelated}, {"together", x.Uncertainty.Correlated, y.Uncertainty.Correlated},
			{"worst case", x.Uncertainty.WorstCase, y.Uncertainty.WorstCase}} {
			t.Logf("%s %s: %.4g coarse, %.4g fine", x.Key, c.name, float64(c.a), float64(c.b))
			if !(c.a > 0) || math.Abs(float64(c.b/c.a)-1) > 0.05 {
				t.Errorf("%s (%s): %.4g on the coarse grid, %.4g on the fine one: more than 5 %% apart", x.Key, c.name, float64(c.a), float64(c.b))
			}
		}
	}
	if checked < 10 {
		t.Errorf("only %d figures with an uncertainty", checked)
	}
}

// TestUncertaintyByFile checks the three cases against the figures
// recomputed with each file's R moved on its own (JCGM 100:2008 5.2.2,
// the fully correlated case within a file): together is the root sum of
// squares of the files' moves, the worst case the sum of their sizes; a
// figure that rests on one file alone has together equal to the worst
// case, the figure recomputed with that file moved.
func TestUncertaintyByFile(t *testing.T) {
	white := whiteSample(t)
	const uUV, uIR = 0.005, 0.01
	uvText := resampled(t, white, "nm", 280, 2500, 5, uUV)
	irText := resampled(t, white, "cm-1", 400, 4000, 4, uIR)
	join := func(uv, ir string, move [2]float64) *Figures {
		a, b := mustParse(t, uv, "uv.csv"), mustParse(t, ir, "ir.csv")
		for k, p := range []*spectra.Spectrum{a, b} {
			for i := range p.Segments {
				g := &p.Segments[i]
				for j := range g.Values[spectra.R] {
					g.Values[spectra.R][j] += move[k]
				}
				if move != [2]float64{} {
					g.Values[spectra.UR] = nil
				}
			}
		}
		s, err := spectra.Join([]*spectra.Spectrum{a, b}, spectra.SpliceOptions{})
		if err != nil {
			t.Fatal(err)
		}
		f, err := compute(s, DefaultConditions())
		if err != nil {
			t.Fatal(err)
		}
		return f
	}
	f := join(uvText, irText, [2]float64{})
	half := func(key string, up, dn [2]float64) float64 {
		a, _ := join(uvText, irText, up).Figure(key)
		b, _ := join(uvText, irText, dn).Figure(key)
		return float64(a.Value-b.Value) / 2
	}
	for _, tt := range []struct {
		key     string
		linear  bool
		oneFile bool
	}{
		{"solar_reflectance", true, true},
		{"thermal_emittance", true, true},
		{"cooling_power_w_m2", true, false},
		{"cooling_power_night_w_m2", true, false}, // the UV-Vis-NIR file reaches 2.5 µm, inside the exchange band
		{"equilibrium_delta_k", false, false},
		{"sri_medium", false, false},
	} {
		x, _ := f.Figure(tt.key)
		u := x.Uncertainty
		if u == nil {
			t.Fatalf("%s: no uncertainty", tt.key)
		}
		cUV := half(tt.key, [2]float64{uUV, 0}, [2]float64{-uUV, 0})
		cIR := half(tt.key, [2]float64{0, uIR}, [2]float64{0, -uIR})
		all := half(tt.key, [2]float64{uUV, uIR}, [2]float64{-uUV, -uIR})
		tol := 1e-9 * math.Max(1, math.Abs(all))
		if !tt.linear {
			tol = 0.02 * math.Abs(all) // linearised per file
		}
		t.Logf("%s: files %.5g, %.5g; all %.5g; got together %.5g worst %.5g noise %.5g", tt.key, cUV, cIR, all,
			float64(u.Correlated), float64(u.WorstCase), float64(u.Uncorrelated))
		worst := math.Abs(cUV) + math.Abs(cIR)
		if tt.oneFile {
			worst = math.Abs(all)
		}
		if math.Abs(float64(u.WorstCase)-worst) > tol {
			t.Errorf("%s: worst case %.10g, want %.10g", tt.key, float64(u.WorstCase), worst)
		}
		if want := math.Hypot(cUV, cIR); math.Abs(float64(u.Correlated)-want) > tol {
			t.Errorf("%s: together %.10g, want %.10g", tt.key, float64(u.Correlated), want)
		}
		if tt.oneFile && math.Abs(float64(u.Correlated-u.WorstCase)) > 1e-6*float64(u.WorstCase) {
			t.Errorf("%s rests on one file: together %v, worst case %v", tt.key, u.Correlated, u.WorstCase)
		}
		if !(u.Uncorrelated < u.Correlated) {
			t.Errorf("%s: noise %v not below together %v", tt.key, u.Uncorrelated, u.Correlated)
		}
	}
}

// TestSpreadBruteForce checks rowTable.spread against the double sum
// Σ_k Σ_l b_k b_l ρ_kl written out with the correlation computed from the
// wavelengths directly: ρ = max(0, 1 − |Δ|/w) with Δ in nm for a nm
// resolution and in cm⁻¹ for a wavenumber one, zero between files.
func TestSpreadBruteForce(t *testing.T) {
	uv := mustParse(t, "# resolution: 3 nm\nwavelength_nm,R\n400,0.5\n401,0.5\n402.5,0.5\n404,0.5\n409,0.5\n410,0.5\n", "uv.csv")
	ir := mustParse(t, "# resolution: 8 cm-1\nwavenumber_cm-1,R\n1010,0.1\n1006,0.1\n1003,0.1\n1000,0.1\n990,0.1\n", "ir.csv")
	s, err := spectra.Join([]*spectra.Spectrum{uv, ir}, spectra.SpliceOptions{})
	if err != nil {
		t.Fatal(err)
	}
	rt := newRowTable(s)
	rng := rand.New(rand.NewPCG(2, 3))
	b := make([]float64, len(rt.nm))
	for k := range b {
		b[k] = rng.NormFloat64()
	}
	var want float64
	for k := range b {
		for l := range b {
			ik, il := rt.nm[k] < 1000, rt.nm[l] < 1000 // the UV file
			if ik != il {
				continue
			}
			d := math.Abs(rt.nm[k]-rt.nm[l]) / 3
			if !ik {
				d = math.Abs(1e7/rt.nm[k]-1e7/rt.nm[l]) / 8
			}
			want += b[k] * b[l] * math.Max(0, 1-d)
		}
	}
	if got := rt.spread(b); math.Abs(got-math.Sqrt(want)) > 1e-12 {
		t.Errorf("spread %.15g, want %.15g", got, math.Sqrt(want))
	}
}

// TestUncertaintyMonteCarloCorrelated draws errors correlated within a
// resolution element (JCGM 101:2008 Monte Carlo): white noise averaged
// over a moving box of one element, whose autocorrelation is the triangle
// the propagation assumes, on a grid four times finer than the 2 nm
// resolution. The spread of the figures must match the "noise"
// uncertainty within 12 % (300 draws give a standard deviation to about
// 4 %).
func TestUncertaintyMonteCarloCorrelated(t *testing.T) {
	const u, draws, step, m = 0.01, 300, 0.5, 4 // m points per 2 nm element
	var nm, r []float64
	for x := 280.0; x <= 1200; x += step {
		nm = append(nm, x)
		r = append(r, 0.9-0.3*math.Exp(-(x-280)/80))
	}
	write := func(v []float64, withU bool) string {
		var b strings.Builder
		if withU {
			fmt.Fprintf(&b, "# u_R: %g\n", u)
		}
		b.WriteString("wavelength_nm,R\n")
		for i, x := range nm {
			fmt.Fprintf(&b, "%g,%.17g\n", x, v[i])
		}
		return b.String()
	}
	c := DefaultConditions()
	c.SolarBand = spectra.Interval{Lo: 280, Hi: 1200}
	f, err := compute(mustParse(t, write(r, true), "fine.csv"), c)
	if err != nil {
		t.Fatal(err)
	}
	keys := []string{"solar_reflectance", "uv_reflectance", "visible_reflectance"}
	rng := rand.New(rand.NewPCG(7, 11))
	sum, sum2 := map[string]float64{}, map[string]float64{}
	z := make([]float64, len(nm)+m)
	v := make([]float64, len(nm))
	for range draws {
		for i := range z {
			z[i] = rng.NormFloat64()
		}
		for i := range v {
			var e float64
			for j := range m {
				e += z[i+j]
			}
			v[i] = r[i] + u*e/math.Sqrt(m)
		}
		g, err := compute(mustParse(t, write(v, false), "draw.csv"), c)
		if err != nil {
			t.Fatal(err)
		}
		for _, k := range keys {
			x, _ := g.Figure(k)
			sum[k] += float64(x.Value)
			sum2[k] += float64(x.Value) * float64(x.Value)
		}
	}
	for _, k := range keys {
		mean := sum[k] / draws
		sd := math.Sqrt((sum2[k] - draws*mean*mean) / (draws - 1))
		x, _ := f.Figure(k)
		want := float64(x.Uncertainty.Uncorrelated)
		t.Logf("%s: Monte Carlo %.4g, propagated %.4g (ratio %.3f)", k, sd, want, sd/want)
		if math.Abs(sd-want) > 0.12*want {
			t.Errorf("%s: Monte Carlo spread %.4g, propagated %.4g", k, sd, want)
		}
	}
}

// A probe's change, found by moving the data up, against Resolve of the
// spectrum moved down: the same with the opposite sign, for every way
// Resolve obtains R, T and A (R and T measured, R and A measured, R alone).
func TestProbeIsSymmetric(t *testing.T) {
	texts := map[string]string{
		"R and T": "# u_R: 0.01\n# u_T: 0.02\nwavelength_nm,R,T\n300,0.91,0.05\n800,0.93,0.04\n2500,0.4,0.01\n9000,0.05,0.02\n20000,0.04,0.01\n",
		"R and A": "wavelength_nm,R,A,u_R\n300,0.91,0.05,0.01\n800,0.93,0.06,0.02\n2500,0.4,0.5,0.01\n9000,0.05,0.9,0.005\n",
		"R alone": "# u_R: 0.3 %\nwavelength_nm,R\n300,0.9\n1000,0.95\n9000,0.06\n",
	}
	for name, text := range texts {
		t.Run(name, func(t *testing.T) {
			s := mustParse(t, text, "mirror.csv")
			o := spectra.Resolve(s, 0.02)
			probed := 0
			defer func() {
				if probed == 0 {
					t.Error("no quantity has an uncertainty: nothing was checked")
				}
			}()
			for _, q := range []spectra.Quantity{spectra.R, spectra.T} {
				if ok, _, _ := hasUncertainty(s, q); !ok {
					continue
				}
				probed++
				pr := newProbe(s, q, o, 0.02, newRowTable(s))
				down := spectra.Resolve(shifted(s, q, -1), 0.02)
				moved := false
				for k, x := range [3][2]spectra.Series{{o.R, down.R}, {o.T, down.T}, {o.A, down.A}} {
					if len(pr.delta[k]) != len(x[1].Pieces) {
						t.Fatalf("%s moved: quantity %d has %d pieces, Resolve gives %d", q, k, len(pr.delta[k]), len(x[1].Pieces))
					}
					for p := range x[1].Pieces {
						for j, w := range x[1].Pieces[p].V {
							want := x[0].Pieces[p].V[j] - w // o − o⁻
							if g := pr.delta[k][p][j]; math.Abs(g-want) > 1e-15 {
								t.Errorf("%s moved: quantity %d at %g nm: change %.17g up, %.17g down", q, k, x[1].Pieces[p].NM[j], g, want)
							}
							moved = moved || want != 0
						}
					}
				}
				if !moved {
					t.Errorf("%s moved: nothing moved", q)
				}
			}
		})
	}
}
