package spectra

import (
	"math"
	"testing"
)

// erythemaFormula is the erythema reference action spectrum as published in
// ISO 17166:1999 / CIE S 007/E:1998 (piecewise formula, quoted from memory),
// written out here independently: log₁₀ s_er(λ) is 0 up to 298 nm, then
// falls by 0.094 per nm to 328 nm and by 0.015 per nm to 400 nm.
func erythemaFormula(nm float64) float64 {
	var log10 float64
	switch {
	case nm <= 298:
		log10 = 0
	case nm <= 328:
		log10 = -0.094 * (nm - 298)
	case nm <= 400:
		log10 = -0.094*30 - 0.015*(nm-328) // 0.015 (140 − λ) = −2.82 − 0.015 (λ − 328)
	default:
		return 0
	}
	return math.Exp(log10 * math.Ln10)
}

func TestErythemaAction(t *testing.T) {
	for _, tt := range []struct {
		nm, want float64
	}{
		{250, 1}, // ISO 17166: 1 from 250 to 298 nm
		{280, 1},
		{298, 1},                    // breakpoint
		{300, math.Pow(10, -0.188)}, // 10^(0.094·(298 − 300)) = 0.6486
		{310, math.Pow(10, -1.128)}, // 0.07447
		{328, math.Pow(10, -2.82)},  // breakpoint: both branches give 10^−2.82
		{340, math.Pow(10, -3)},     // 10^(0.015·(140 − 340))
		{400, math.Pow(10, -3.9)},   // upper end, 1.2589e-4
		{400.5, 0},                  // outside the action spectrum
		{298.000001, erythemaFormula(298.000001)},
		{328.000001, erythemaFormula(328.000001)},
		{355.5, erythemaFormula(355.5)},
	} {
		got, want := erythemaAction(tt.nm), tt.want
		if f := erythemaFormula(tt.nm); math.Abs(f-want) > 1e-12*want {
			t.Fatalf("test formula at %g nm: %g, quoted %g", tt.nm, f, want)
		}
		if math.Abs(got-want) > 1e-12*want {
			t.Errorf("s_er(%g nm) = %.15g, want %.15g", tt.nm, got, want)
		}
	}
	// Continuous at both breakpoints.
	for _, b := range []float64{298, 328} {
		if l, r := erythemaAction(b), erythemaAction(math.Nextafter(b, 1000)); math.Abs(l-r) > 1e-12 {
			t.Errorf("jump at %g nm: %g to %g", b, l, r)
		}
	}
}

func TestErythemalSolarAtRows(t *testing.T) {
	nm, e := g173Table(t)
	w := ErythemalSolar()
	for i, x := range nm {
		if x > 400 {
			break
		}
		want := erythemaFormula(x) * e[i] // ISO 17166 formula × ASTM G173-03 global row
		if got := w.At(x); math.Abs(got-want) > 1e-12*want {
			t.Errorf("%g nm: %g, want %g", x, got, want)
		}
	}
	if w.At(401) != 0 || w.At(279) != 0 {
		t.Error("weighting not zero outside 280–400 nm")
	}
}

// bruteErythemal integrates s_er·E over [lo, hi] by the trapezoid rule on a
// 0.001 nm grid, E linear between the G173 rows (read from the table file).
func bruteErythemal(t *testing.T, lo, hi float64) float64 {
	nm, e := g173Table(t)
	at := func(x float64) float64 {
		for i := 1; i < len(nm); i++ {
			if x <= nm[i] {
				f := (x - nm[i-1]) / (nm[i] - nm[i-1])
				return e[i-1] + f*(e[i]-e[i-1])
			}
		}
		return 0
	}
	n := int(math.Round((hi - lo) / 0.001))
	var sum float64
	for k := 0; k <= n; k++ {
		x := lo + (hi-lo)*float64(k)/float64(n)
		v := erythemaFormula(x) * at(x)
		if k == 0 || k == n {
			v /= 2
		}
		sum += v
	}
	return sum * (hi - lo) / float64(n)
}

func TestErythemalSolarIntegral(t *testing.T) {
	if testing.Short() {
		t.Skip("brute-force integral")
	}
	for _, b := range [][2]float64{{280, 400}, {300, 400}, {310, 330}} {
		got := weightIntegral(ErythemalSolar(), b[0], b[1])
		want := bruteErythemal(t, b[0], b[1])
		if math.Abs(got-want) > 1e-6*want {
			t.Errorf("∫ s_er E over %g–%g nm: %.9g, brute force %.9g", b[0], b[1], got, want)
		}
	}
}

// fineErythemal samples the weighting on a finer uniform grid.
type fineErythemal struct {
	*erythemal
	step float64
}

func (f fineErythemal) Knots(lo, hi float64) []float64 {
	var grid []float64
	for k := math.Floor(lo/f.step) + 1; k*f.step < hi; k++ {
		grid = append(grid, k*f.step)
	}
	grid = unionGrid(lo, hi, grid, []float64{298, 328})
	grid = unionGrid(lo, hi, grid[1:len(grid)-1], SolarGlobal().Knots(lo, hi))
	return grid[1 : len(grid)-1]
}

func TestErythemaGridFineEnough(t *testing.T) {
	w := ErythemalSolar().(*erythemal)
	for _, x := range []Series{
		{Pieces: []Piece{{NM: []float64{280, 300, 320, 340, 400}, V: []float64{0, 0.01, 0.4, 0.9, 0.95}}}},
		{Pieces: []Piece{{NM: []float64{290, 310, 311, 400}, V: []float64{0.9, 0.9, 0.02, 0.02}}}},
		{Pieces: []Piece{{NM: []float64{280, 400}, V: []float64{0.3, 0.05}}}},
	} {
		coarse := BandMean(x, w, 280, 400).Value
		fine := BandMean(x, fineErythemal{w, erythemaStepNM / 4}, 280, 400).Value
		if len(fineErythemal{w, erythemaStepNM / 4}.Knots(280, 400)) < 4*len(w.Knots(280, 400)) {
			t.Fatal("the fine grid is not finer")
		}
		if d := math.Abs(coarse - fine); d > 1e-6 { // the stated grid criterion
			t.Errorf("refining the erythemal grid changes T_ery %.8f by %.2e", coarse, d)
		}
	}
}

func TestErythemalSolarLeavesG173Alone(t *testing.T) {
	ErythemalSolar()
	nm, e := g173Table(t)
	sun := SolarGlobal()
	for i, x := range nm {
		if x < 395 || x > 405 {
			continue
		}
		if got := sun.At(x); got != e[i] { // ASTM G173-03 global tilt row
			t.Errorf("G173 global at %g nm reads %g after loading the erythemal weighting, table %g", x, got, e[i])
		}
	}
	if k := sun.Knots(399, 402); len(k) != 3 || k[0] != 399.5 || k[1] != 400 || k[2] != 401 {
		t.Errorf("G173 rows in (399, 402): %v, want [399.5 400 401]", k)
	}
}
