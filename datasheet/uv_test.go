package datasheet

import (
	"math"
	"os"
	"strconv"
	"strings"
	"testing"

	"skysheet/spectra"
)

// uvSeries is a transmittance series with one piece.
func uvSeries(nm, v []float64) spectra.Series {
	return spectra.Series{Pieces: []spectra.Piece{{NM: nm, V: v}}}
}

// erythemalWeight integrates s_er(λ)·E(λ) over [lo, hi] by brute force on a
// 0.001 nm grid, independently of the package: s_er from the published
// ISO 17166 / CIE S 007 formula (quoted from memory), E linear between the
// ASTM G173-03 global tilt rows read from the embedded table file.
func erythemalWeight(t *testing.T, lo, hi float64) float64 {
	t.Helper()
	data, err := os.ReadFile("../spectra/astm-g173-03.csv")
	if err != nil {
		t.Fatal(err)
	}
	var nm, e []float64
	for _, ln := range strings.Split(strings.TrimSpace(string(data)), "\n")[2:] {
		f := strings.Split(strings.TrimSpace(ln), ",")
		x, _ := strconv.ParseFloat(f[0], 64)
		y, _ := strconv.ParseFloat(f[2], 64)
		if x > 401 {
			break
		}
		nm, e = append(nm, x), append(e, y)
	}
	ser := func(x float64) float64 {
		switch {
		case x <= 298:
			return 1
		case x <= 328:
			return math.Pow(10, 0.094*(298-x))
		}
		return math.Pow(10, 0.015*(140-x))
	}
	n := int(math.Round((hi - lo) / 0.001))
	var sum float64
	j := 1
	for k := 0; k <= n; k++ {
		x := lo + (hi-lo)*float64(k)/float64(n)
		for nm[j] < x {
			j++
		}
		f := (x - nm[j-1]) / (nm[j] - nm[j-1])
		v := ser(x) * (e[j-1] + f*(e[j]-e[j-1]))
		if k == 0 || k == n {
			v /= 2
		}
		sum += v
	}
	return sum * (hi - lo) / float64(n)
}

func TestErythemalTransmittance(t *testing.T) {
	nan := math.NaN()
	for _, tt := range []struct {
		name            string
		t               spectra.Series
		want, cov, fact float64 // fact NaN: not given
		above           bool
		tol             float64
	}{
		{"opaque", uvSeries([]float64{250, 450}, []float64{0, 0}), 0, 1, nan, true, 0},
		// T = 0 over the whole action spectrum (to 400 nm), clear beyond:
		// the weighting is zero above 400 nm, so nothing erythemal passes.
		{"opaque in the UV only", uvSeries([]float64{250, 400, 400.001, 2500}, []float64{0, 0, 0.9, 0.9}), 0, 1, nan, true, 0},
		{"clear", uvSeries([]float64{250, 450}, []float64{1, 1}), 1, 1, 1, false, 1e-12},
		{"constant 0.05", uvSeries([]float64{280, 400}, []float64{0.05, 0.05}), 0.05, 1, 20, false, 1e-12},
		{"constant 0.2, sloped grid", uvSeries([]float64{260, 301.3, 333.3, 420}, []float64{0.2, 0.2, 0.2, 0.2}), 0.2, 1, 5, false, 1e-12},
		{"below the cap", uvSeries([]float64{280, 400}, []float64{0.0009, 0.0009}), 0.0009, 1, nan, true, 1e-12},
		{"no UV data", uvSeries([]float64{450, 900}, []float64{0.5, 0.5}), nan, 0, nan, false, 0},
	} {
		u := ErythemalTransmittance(tt.t)
		got := float64(u.Transmittance)
		if math.IsNaN(tt.want) != math.IsNaN(got) || math.Abs(got-tt.want) > tt.tol {
			t.Errorf("%s: T_ery %.15g, want %g", tt.name, got, tt.want)
		}
		if float64(u.Coverage) != tt.cov {
			t.Errorf("%s: coverage %g, want %g", tt.name, float64(u.Coverage), tt.cov)
		}
		if f := float64(u.Factor); math.IsNaN(tt.fact) != math.IsNaN(f) || math.Abs(f-tt.fact) > 1e-9*tt.fact {
			t.Errorf("%s: factor %g, want %g", tt.name, f, tt.fact)
		}
		if u.AboveCap != tt.above {
			t.Errorf("%s: above cap %v, want %v", tt.name, u.AboveCap, tt.above)
		}
		if !strings.Contains(u.Note, "not a rating") {
			t.Errorf("%s: note %q does not say it is not a rating", tt.name, u.Note)
		}
	}
}

func TestErythemalTransmittanceWeights(t *testing.T) {
	if testing.Short() {
		t.Skip("brute-force integrals")
	}
	whole := erythemalWeight(t, 280, 400)
	// A step: T = 0 below s nm, 1 above. T_ery is the weighting's share
	// above the step.
	for _, s := range []float64{298, 305, 320, 328, 350} {
		x := uvSeries([]float64{250, s, s + 1e-9, 450}, []float64{0, 0, 1, 1})
		got := float64(ErythemalTransmittance(x).Transmittance)
		want := erythemalWeight(t, s, 400) / whole
		if math.Abs(got-want) > 2e-6 {
			t.Errorf("step at %g nm: T_ery %.8f, brute force %.8f", s, got, want)
		}
	}
	// Data that start above 280 nm: the mean is over the covered part and
	// the coverage is the covered share of the weighting.
	for _, lo := range []float64{295, 300, 310} {
		x := uvSeries([]float64{lo, 350, 420}, []float64{0.1, 0.3, 0.5})
		u := ErythemalTransmittance(x)
		want := erythemalWeight(t, lo, 400) / whole
		if math.Abs(float64(u.Coverage)-want) > 1e-6 {
			t.Errorf("data from %g nm: coverage %.8f, brute force %.8f", lo, float64(u.Coverage), want)
		}
		if !strings.Contains(u.Note, "The data cover") {
			t.Errorf("data from %g nm: note %q does not give the coverage", lo, u.Note)
		}
	}
}
