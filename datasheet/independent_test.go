package datasheet

import (
	"bufio"
	"math"
	"os"
	"sort"
	"strconv"
	"strings"
	"testing"
)

// This file recomputes the cooling figures of the invented white coating
// from the stated definitions alone, with a deliberately plain method: its
// own reading of the two files, fine uniform grids, midpoint sums, a
// brute-force angular integral and bisection. It shares nothing with the
// package but the definitions.

// plainTable reads numeric rows after the header lines of a text file, with
// the given separator and decimal mark, returning the first n columns.
func plainTable(t *testing.T, path string, headers int, sep string, comma bool, n int) [][]float64 {
	t.Helper()
	fh, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer fh.Close()
	var rows [][]float64
	sc := bufio.NewScanner(fh)
	for sc.Scan() {
		line := strings.TrimSpace(sc.Text())
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		if headers > 0 {
			headers--
			continue
		}
		f := strings.Split(line, sep)
		row := make([]float64, n)
		for i := range n {
			s := strings.TrimSpace(f[i])
			if comma {
				s = strings.Replace(s, ",", ".", 1)
			}
			v, err := strconv.ParseFloat(s, 64)
			if err != nil {
				t.Fatalf("%s: %q: %v", path, line, err)
			}
			row[i] = v
		}
		rows = append(rows, row)
	}
	return rows
}

// linear interpolates y(x) on ascending xs, holding the end values outside.
func linear(xs, ys []float64, x float64) float64 {
	i := sort.SearchFloat64s(xs, x)
	switch {
	case i == 0:
		return ys[0]
	case i == len(xs):
		return ys[len(ys)-1]
	case xs[i] == x:
		return ys[i]
	}
	f := (x - xs[i-1]) / (xs[i] - xs[i-1])
	return ys[i-1] + f*(ys[i]-ys[i-1])
}

func TestIndependentRecomputation(t *testing.T) {
	if testing.Short() {
		t.Skip("brute-force recomputation")
	}
	// The sample: UV-Vis-NIR (nm, R, T) then FTIR (cm⁻¹, R in %, decimal
	// comma); the first file's value is kept at the shared 2500 nm.
	var nm, rt, em []float64 // wavelength, R+T, emittance 1 − R − T
	for _, r := range plainTable(t, "../testdata/white-uvvis.csv", 1, ",", false, 3) {
		nm, rt, em = append(nm, r[0]), append(rt, r[1]+r[2]), append(em, 1-r[1]-r[2])
	}
	ir := plainTable(t, "../testdata/white-ftir.tsv", 1, "\t", true, 2)
	for i := range ir { // descending wavenumbers: ascending wavelengths
		w := 1e7 / ir[i][0]
		if w <= nm[len(nm)-1] {
			continue
		}
		r := ir[i][1] / 100
		nm, rt, em = append(nm, w), append(rt, r), append(em, 1-r) // opaque: T = 0
	}
	eps := func(x float64) float64 { return linear(nm, em, x) } // held constant past the data

	// Solar absorptance: ASTM G173-03 global tilt, read from the table file,
	// linear between its points; midpoint sums on a 0.05 nm grid.
	var gnm, gw []float64
	for _, r := range plainTable(t, "../spectra/astm-g173-03.csv", 2, ",", false, 3) {
		gnm, gw = append(gnm, r[0]), append(gw, r[2])
	}
	var num, den float64
	for x := 280 + 0.025; x < 2500; x += 0.05 {
		e := linear(gnm, gw, x)
		num += e * linear(nm, rt, x)
		den += e
	}
	alpha := 1 - num/den
	// Absorbed sunlight over the whole G173 range 280–4000 nm on the
	// joined spectrum, ∫ α E dλ / ∫ E dλ, α = 1 − R − T (the infrared file
	// opaque), the same midpoint sums.
	num, den = 0, 0
	for x := 280 + 0.025; x < 4000; x += 0.05 {
		e := linear(gnm, gw, x)
		num += e * linear(nm, em, x)
		den += e
	}
	absorbed := num / den

	planck := func(x, T float64) float64 { return planckRef(x, T) }
	// Thermal emittance for the SRI: Planck 300 K over 2.5–25 µm.
	num, den = 0, 0
	for x := 2500 + 0.25; x < 25000; x += 0.5 {
		b := planck(x, 300)
		num += eps(x) * b
		den += b
	}
	thermal := num / den

	// Sky: ε_sky = 0.711 + 0.56 x + 0.73 x², x = T_dp/100, the hemispherical
	// flux on a horizontal surface over σT⁴ (Berdahl & Martin 1984); the
	// window's hemispherical emissivity ε_w = 1 − (1 − ε_sky)/F_w.
	const ta, dp, h, sun = 300.0, 10.0, 6.0, 1000.0
	sigmaT4 := sigmaCODATA * math.Pow(ta, 4)
	var fw float64
	for x := 8000 + 0.5; x < 13000; x += 1 {
		fw += math.Pi * planck(x, ta)
	}
	fw /= sigmaT4
	epsSky := 0.711 + 0.56*dp/100 + 0.73*(dp/100)*(dp/100)
	ew := math.Max(0, math.Min(1, 1-(1-epsSky)/fw))
	// The zenith transmittance t of the window whose angular law
	// ε(θ) = 1 − t^(1/cos θ) gives ε_w over the hemisphere: bisection on a
	// 400-step midpoint sum of 2 ∫ sin θ cos θ ε(θ) dθ.
	const steps = 400
	hemi := func(t float64) float64 {
		var s float64
		for k := range steps {
			th := (float64(k) + 0.5) * math.Pi / 2 / steps
			s += 2 * math.Sin(th) * math.Cos(th) * (1 - math.Pow(t, 1/math.Cos(th))) * (math.Pi / 2 / steps)
		}
		return s
	}
	tz := 0.0
	for lo, hi, i := 0.0, 1.0, 0; i < 60; i++ {
		tz = (lo + hi) / 2
		if hemi(tz) > ew { // too opaque: raise t
			lo = tz
		} else {
			hi = tz
		}
	}

	// Exchange band 2.5–100 µm on a 1 nm grid.
	var grid, e, bAmb []float64
	for x := 2500 + 0.5; x < 100000; x += 1 {
		grid, e, bAmb = append(grid, x), append(e, eps(x)), append(bAmb, planck(x, ta))
	}
	pRad := func(T float64) float64 {
		var s float64
		for i, x := range grid {
			s += e[i] * planck(x, T)
		}
		return math.Pi * s
	}
	// P_atm = 2π ∫₀^{π/2} sin θ cos θ ∫ ε ε_sky(λ, θ) B(λ, T_amb) dλ dθ,
	// midpoint rule over θ with 400 steps, the window under the angular law
	// from its zenith transmittance.
	var pAtm float64
	for k := range steps {
		th := (float64(k) + 0.5) * math.Pi / 2 / steps
		win := 1 - math.Pow(tz, 1/math.Cos(th))
		var s float64
		for i, x := range grid {
			sky := 1.0
			if x > 8000 && x < 13000 {
				sky = win
			}
			s += e[i] * sky * bAmb[i]
		}
		pAtm += 2 * math.Pi * math.Sin(th) * math.Cos(th) * s * (math.Pi / 2 / steps)
	}
	pSun := sun * absorbed
	net := func(T, ps float64) float64 { return pRad(T) - pAtm - ps - h*(ta-T) }
	bisect := func(f func(float64) float64, lo, hi float64) float64 {
		for range 60 {
			m := (lo + hi) / 2
			if f(m) > 0 {
				hi = m
			} else {
				lo = m
			}
		}
		return (lo + hi) / 2
	}
	dayPower, nightPower := net(ta, pSun), net(ta, 0)
	dayDelta := ta - bisect(func(T float64) float64 { return net(T, pSun) }, 200, 400)
	nightDelta := ta - bisect(func(T float64) float64 { return net(T, 0) }, 200, 400)
	// SRI: ASTM E1980 balance α I = ε σ (T⁴ − T_sky⁴) + h_c (T − T_a) by bisection.
	steady := func(a, e, hc float64) float64 {
		return bisect(func(T float64) float64 {
			return e*sigmaCODATA*(math.Pow(T, 4)-math.Pow(300, 4)) + hc*(T-310) - a*1000
		}, 250, 500)
	}
	sri := func(hc float64) float64 {
		tb, tw := steady(0.95, 0.9, hc), steady(0.2, 0.9, hc)
		return 100 * (tb - steady(alpha, thermal, hc)) / (tb - tw)
	}

	f, err := compute(whiteSample(t), DefaultConditions())
	if err != nil {
		t.Fatal(err)
	}
	for _, tt := range []struct {
		name      string
		got, want float64
		tol       float64
	}{
		// Done-when tolerances of the cooling figures: 1 % or 1 W/m²,
		// 0.3 K, 0.6 of SRI.
		{"cooling power, sun", float64(f.CoolingPowerWm2), dayPower, math.Max(1, 0.01*math.Abs(dayPower))},
		{"cooling power, night", float64(f.CoolingPowerNightWm2), nightPower, math.Max(1, 0.01*math.Abs(nightPower))},
		{"below ambient, sun", float64(f.EquilibriumDeltaK), dayDelta, 0.3},
		{"below ambient, night", float64(f.EquilibriumDeltaNightK), nightDelta, 0.3},
		{"SRI low", float64(f.SRI.Low), sri(5), 0.6},
		{"SRI medium", float64(f.SRI.Medium), sri(12), 0.6},
		{"SRI high", float64(f.SRI.High), sri(30), 0.6},
		{"sky window emissivity", float64(f.Sky.WindowHemisphericalEmissivity), ew, 1e-4},
		{"sky window zenith transmittance", float64(f.Sky.WindowZenithTransmittance), tz, 1e-4},
	} {
		t.Logf("%s: %.5f, independent %.5f", tt.name, tt.got, tt.want)
		if math.Abs(tt.got-tt.want) > tt.tol {
			t.Errorf("%s = %.4f, independent recomputation %.4f (tolerance %g)", tt.name, tt.got, tt.want, tt.tol)
		}
	}
}
