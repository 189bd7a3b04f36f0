package datasheet

import (
	"math"
	"strings"
	"testing"
)

func TestSRIReferenceSurfaces(t *testing.T) {
	for _, hc := range []float64{WindLow, WindMedium, WindHigh} {
		// ASTM E1980: the standard black (α 0.95, ε 0.90) scores 0 and the
		// standard white (α 0.20, ε 0.90) 100, at every wind.
		if got := SolarReflectanceIndex(0.95, 0.90, hc); got != 0 {
			t.Errorf("h_c %g: black SRI = %g, want 0", hc, got)
		}
		if got := SolarReflectanceIndex(0.20, 0.90, hc); got != 100 {
			t.Errorf("h_c %g: white SRI = %g, want 100", hc, got)
		}
	}
}

// sriClosedForm is the approximation of ASTM E1980-11:
// SRI = 123.97 − 141.35χ + 9.655χ², χ = (α − 0.029ε)(8.797 + h_c)/(9.5205ε + h_c).
func sriClosedForm(alpha, eps, hc float64) float64 {
	chi := (alpha - 0.029*eps) * (8.797 + hc) / (9.5205*eps + hc)
	return 123.97 - 141.35*chi + 9.655*chi*chi
}

func TestSRIAgainstClosedForm(t *testing.T) {
	// ASTM E1980-11 closed form, quoted (from memory) with a mean error of
	// 0.9 and a maximum of 2 against the exact balance over α 0.1..0.9,
	// ε 0.2..0.95. Against our exact balance the mean holds (about 0.6) and
	// the maximum holds at medium wind (1.1); at the corners of the grid
	// (α 0.1 with ε ≥ 0.8 at low wind, α 0.9 with low ε, α 0.1 with ε 0.2 at
	// high wind) the closed form departs by up to 2.6, so those two winds
	// get a tolerance of 2.7.
	var sum float64
	n := 0
	for _, w := range []struct{ hc, tol float64 }{{WindLow, 2.7}, {WindMedium, 2}, {WindHigh, 2.7}} {
		for a := 0.1; a <= 0.9+1e-9; a += 0.05 {
			for e := 0.2; e <= 0.95+1e-9; e += 0.05 {
				if a > 0.8 && e < 0.2 {
					continue
				}
				got, want := SolarReflectanceIndex(a, e, w.hc), sriClosedForm(a, e, w.hc)
				d := math.Abs(got - want)
				if d > w.tol {
					t.Errorf("α %.2f ε %.2f h_c %g: exact SRI %.2f, closed form %.2f", a, e, w.hc, got, want)
				}
				sum += d
				n++
			}
		}
	}
	if mean := sum / float64(n); mean > 0.9 {
		t.Errorf("mean |exact − closed form| = %.3f over %d points, want ≤ 0.9", mean, n)
	}
}

func TestSteadyTemperatureBalance(t *testing.T) {
	// The balance itself, ASTM E1980: α I = ε σ (T_s⁴ − T_sky⁴) + h_c (T_s − T_a).
	for _, tt := range []struct{ a, e, hc float64 }{{0.95, 0.9, 12}, {0.2, 0.9, 5}, {0.5, 0.1, 30}, {0.05, 0.95, 5}} {
		ts := steadyTemperature(tt.a, tt.e, tt.hc)
		r := tt.a*1000 - tt.e*sigmaCODATA*(math.Pow(ts, 4)-math.Pow(300, 4)) - tt.hc*(ts-310)
		if math.Abs(r) > 1e-6 {
			t.Errorf("α %g ε %g h_c %g: T_s %.6f K leaves %.3g W/m²", tt.a, tt.e, tt.hc, ts, r)
		}
	}
	if !math.IsNaN(steadyTemperature(0.5, 0, 0)) {
		t.Error("no emission and no convection: want NaN")
	}
}

func TestSRITranslucentFlag(t *testing.T) {
	s := mustParse(t, "wavelength_nm,R,T\n250,0.8,0.1\n2500,0.8,0.1\n\n2600,0.1,0\n25000,0.1,0\n", "film.csv")
	f, err := compute(s, DefaultConditions())
	if err != nil {
		t.Fatal(err)
	}
	if !f.SRI.Translucent || !strings.Contains(f.SRI.Note, "not opaque") {
		t.Errorf("solar transmittance %.3f: SRI not flagged: %+v", float64(f.SolarTransmittance), f.SRI)
	}
	if !strings.Contains(f.SRI.Note, "opaque, horizontal or low-sloped") {
		t.Errorf("note lacks the applicability: %s", f.SRI.Note)
	}
	w, err := compute(whiteSample(t), DefaultConditions())
	if err != nil {
		t.Fatal(err)
	}
	if w.SRI.Translucent {
		t.Errorf("white coating (T_sol %.4f) flagged", float64(w.SolarTransmittance))
	}
}
