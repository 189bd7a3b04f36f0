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
	// power at ambient moves by P_rad + P_atm terms linear in A and by
	// I·δ from the sun; recompute the moved spectra directly.
	up := Compute2(t, text, +delta)
	dn := Compute2(t, text, -delta)
	for _, key := range []string{"cooling_power_w_m2", "cooling_power_night_w_m2", "equilibrium_delta_k", "sri_medium", "thermal_emittance"} {
		x, _ := f.Figure(key)
		a, _ := up.Figure(key)
		b, _ := dn.Figure(key)
		want := math.Abs(float64(a.Value-b.Value)) / 2
		if x.Uncertainty == nil || math.Abs(float64(x.Uncertainty.Correlated)-want) > 1e-9*math.Max(1, want) {
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
