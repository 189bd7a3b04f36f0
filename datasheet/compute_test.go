package datasheet

import (
	"bufio"
	"math"
	"os"
	"sort"
	"strconv"
	"strings"
	"testing"

	"skysheet/spectra"
)

// compute resolves s and computes its figures under c.
func compute(s *spectra.Spectrum, c Conditions) (*Figures, error) {
	return Compute(s, spectra.Resolve(s, c.ClosureTol), c)
}

func readTestSample(t testing.TB, names ...string) *spectra.Spectrum {
	t.Helper()
	var parts []*spectra.Spectrum
	for _, n := range names {
		data, err := os.ReadFile("../testdata/" + n)
		if err != nil {
			t.Fatal(err)
		}
		s, err := spectra.Decode(data, n)
		if err != nil {
			t.Fatal(err)
		}
		parts = append(parts, s)
	}
	s, err := spectra.Join(parts, spectra.SpliceOptions{})
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// lin interpolates the table (x, y) linearly at v; ok is false outside it.
func lin(x, y []float64, v float64) (float64, bool) {
	if v < x[0] || v > x[len(x)-1] {
		return 0, false
	}
	i := sort.SearchFloat64s(x, v)
	if x[i] == v {
		return y[i], true
	}
	f := (v - x[i-1]) / (x[i] - x[i-1])
	return y[i-1] + f*(y[i]-y[i-1]), true
}

// g173 reads the embedded table directly (column 2 global, 3 direct).
func g173(t *testing.T, col int) (nm, w []float64) {
	f, err := os.Open("../spectra/astm-g173-03.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	sc := bufio.NewScanner(f)
	for i := 0; sc.Scan(); i++ {
		if i < 2 {
			continue
		}
		c := strings.Split(strings.TrimSpace(sc.Text()), ",")
		a, _ := strconv.ParseFloat(c[0], 64)
		b, _ := strconv.ParseFloat(c[col], 64)
		nm, w = append(nm, a), append(w, b)
	}
	return nm, w
}

// planck is an independent Planck law (CODATA 2018 exact h, c, k), any unit.
func planck(nm, T float64) float64 {
	const h, c, k = 6.62607015e-34, 299792458.0, 1.380649e-23
	l := nm * 1e-9
	return 1 / (l * l * l * l * l * (math.Exp(h*c/(l*k*T)) - 1))
}

// TestComputeIndependent recomputes the figures of the two-instrument test
// sample by brute force: a fine uniform grid, linear interpolation of data
// and weighting, the trapezoid rule. The stated definitions must agree to
// 1e-3 (the precision a reviewer is promised in the README).
func TestComputeIndependent(t *testing.T) {
	s := readTestSample(t, "white-uvvis.csv", "white-ftir.tsv")
	f, err := compute(s, DefaultConditions())
	if err != nil {
		t.Fatal(err)
	}
	rs, ts := s.Series(spectra.R), s.Series(spectra.T)
	// R and T of the first file only; R of the second.
	r := func(nm float64) float64 { v, _ := rs.At(nm); return v }
	tr := func(nm float64) float64 {
		v, ok := ts.At(nm)
		if !ok {
			return 0
		}
		return v
	}
	mean := func(x func(float64) float64, w func(float64) float64, lo, hi, step float64) float64 {
		var sx, sw float64
		n := int(math.Round((hi - lo) / step))
		for i := 0; i <= n; i++ {
			nm := lo + float64(i)*step
			c := 1.0
			if i == 0 || i == n {
				c = 0.5
			}
			sx += c * x(nm) * w(nm)
			sw += c * w(nm)
		}
		return sx / sw
	}
	gnm, gw := g173(t, 2)
	sun := func(nm float64) float64 { v, _ := lin(gnm, gw, nm); return v }
	bb := func(nm float64) float64 { return planck(nm, 300) }
	emit := func(nm float64) float64 { return 1 - r(nm) - tr(nm) }
	for _, tt := range []struct {
		key  string
		got  Num
		want float64
	}{
		{"solar_reflectance", f.SolarReflectance, mean(r, sun, 280, 2500, 0.05)},
		{"solar_transmittance", f.SolarTransmittance, mean(tr, sun, 280, 2500, 0.05)},
		{"uv_reflectance", f.UVReflectance, mean(r, sun, 280, 400, 0.05)},
		{"visible_reflectance", f.VisibleReflectance, mean(r, sun, 400, 700, 0.05)},
		{"nir_reflectance", f.NIRReflectance, mean(r, sun, 700, 2500, 0.05)},
		{"thermal_emittance", f.ThermalEmittance, mean(emit, bb, 2500, 25000, 0.5)},
		{"window_emittance", f.WindowEmittance, mean(emit, bb, 8000, 13000, 0.5)},
	} {
		if d := math.Abs(float64(tt.got) - tt.want); d > 1e-3 || math.IsNaN(d) {
			t.Errorf("%s = %.5f, brute force %.5f", tt.key, float64(tt.got), tt.want)
		}
	}
	if got := float64(f.SolarAbsorptance); math.Abs(got-(1-float64(f.SolarReflectance)-float64(f.SolarTransmittance))) > 1e-12 {
		t.Errorf("solar absorptance %g is not 1 − R − T", got)
	}
}

// TestComputeUnitsAgree checks that one spectrum written in nm, µm and
// descending wavenumbers gives the same figures (closed form: the unit of
// the axis must not matter).
func TestComputeUnitsAgree(t *testing.T) {
	var nm, um, wn strings.Builder
	nm.WriteString("wavelength_nm,R\n")
	um.WriteString("wavelength_um,R\n")
	wn.WriteString("wavenumber_cm-1,R\n")
	var rows []string
	for x := 250.0; x <= 25000; x *= 1.01 {
		v := 0.5 + 0.4*math.Sin(x/700)
		fmt := strconv.FormatFloat
		nm.WriteString(fmt(x, 'g', -1, 64) + "," + fmt(v, 'g', -1, 64) + "\n")
		um.WriteString(fmt(x/1000, 'g', -1, 64) + "," + fmt(v, 'g', -1, 64) + "\n")
		rows = append(rows, fmt(1e7/x, 'g', -1, 64)+","+fmt(v, 'g', -1, 64)+"\n")
	}
	for _, r := range rows { // descending wavenumbers = ascending wavelength
		wn.WriteString(r)
	}
	var want *Figures
	for _, in := range []string{nm.String(), um.String(), wn.String()} {
		s, err := spectra.Parse(strings.NewReader(in), "x")
		if err != nil {
			t.Fatal(err)
		}
		f, err := compute(s, DefaultConditions())
		if err != nil {
			t.Fatal(err)
		}
		if want == nil {
			want = f
			continue
		}
		for i, x := range f.Figures {
			if d := math.Abs(float64(x.Value - want.Figures[i].Value)); d > 1e-9 {
				t.Errorf("%s differs by %g between axis units", x.Key, d)
			}
		}
	}
}

func TestConditionsValidate(t *testing.T) {
	for _, tt := range []struct {
		name string
		mod  func(*Conditions)
		ok   bool
	}{
		{"defaults", func(*Conditions) {}, true},
		{"whole G173", func(c *Conditions) { c.SolarBand = spectra.Interval{Lo: 280, Hi: 4000} }, true},
		{"below G173", func(c *Conditions) { c.SolarBand = spectra.Interval{Lo: 250, Hi: 2500} }, false},
		{"reversed", func(c *Conditions) { c.ThermalBand = spectra.Interval{Lo: 25000, Hi: 2500} }, false},
		{"unknown spectrum", func(c *Conditions) { c.SolarSpectrum = 7 }, false},
		{"huge thermal band", func(c *Conditions) { c.ThermalBand = spectra.Interval{Lo: 2500, Hi: 1e12} }, false},
		{"zero kelvin", func(c *Conditions) { c.TemperatureK = 0 }, false},
		{"negative tolerance", func(c *Conditions) { c.ClosureTol = -1 }, false},
	} {
		c := DefaultConditions()
		tt.mod(&c)
		if err := c.Validate(); (err == nil) != tt.ok {
			t.Errorf("%s: Validate() = %v", tt.name, err)
		}
	}
}

func TestClosureReported(t *testing.T) {
	// R+T+A = 1.05 at 600 nm: a violation of 0.05 there.
	in := "wavelength_nm,R,T,A\n400,0.5,0.2,0.3\n600,0.5,0.25,0.3\n800,0.5,0.2,0.3\n"
	s, err := spectra.Parse(strings.NewReader(in), "x")
	if err != nil {
		t.Fatal(err)
	}
	f, _ := compute(s, DefaultConditions())
	if f.Closure.OK || f.Closure.ResidualNM != 600 || math.Abs(f.Closure.Residual-0.05) > 1e-12 {
		t.Errorf("closure = %+v, want a 0.05 violation at 600 nm", f.Closure)
	}
}

// TestKindWords checks how a temperature difference reads: the air minus
// the surface, positive when the surface is cooler.
func TestKindWords(t *testing.T) {
	for _, tt := range []struct {
		x    float64
		want string
	}{
		{4.2, "settles 4.2 K below the air"},
		{-1.6, "settles 1.6 K above the air"},
		{0.04, "settles at the air temperature"},
		{-0.04, "settles at the air temperature"},
		{math.NaN(), "n/a"},
	} {
		if got := KindTemperatureDifference.Words(tt.x, "K"); got != tt.want {
			t.Errorf("Words(%g) = %q, want %q", tt.x, got, tt.want)
		}
	}
	if got := KindPower.Words(-18.24, "W/m²"); got != "-18.2 W/m²" {
		t.Errorf("a power in words: %q", got)
	}
}

// TestOrigins checks that a file giving R and A but not T has T derived
// as 1 − R − A and that the figures say so: A = 0.10 is the solar
// absorptance, not 1 − R.
func TestOrigins(t *testing.T) {
	for _, tc := range []struct {
		name, in   string
		alpha, tau float64 // expected solar absorptance and transmittance
		origins    Origins
		text       string
	}{
		// R + T + A = 1 with R 0.05, A 0.10: T = 0.85, α = A = 0.10.
		{"R and A", "wavelength_nm,R,A\n250,0.05,0.10\n30000,0.05,0.10\n", 0.10, 0.85,
			Origins{"measured", "derived", "measured"}, "T derived as T = 1 − R − A"},
		// R alone: T = 0 assumed, α = 1 − R = 0.95.
		{"R only", "wavelength_nm,R\n250,0.05\n30000,0.05\n", 0.95, 0,
			Origins{"measured", "assumed 0", "derived"}, "R measured; T assumed 0; A derived as A = 1 − R − T"},
		{"all three", "wavelength_nm,R,T,A\n250,0.05,0.85,0.10\n30000,0.05,0.85,0.10\n", 0.10, 0.85,
			Origins{"measured", "measured", "measured"}, "R measured; T measured; A measured"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			s, err := spectra.Parse(strings.NewReader(tc.in), "x.csv")
			if err != nil {
				t.Fatal(err)
			}
			f, err := compute(s, DefaultConditions())
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(float64(f.SolarAbsorptance)-tc.alpha) > 1e-9 || math.Abs(float64(f.SolarTransmittance)-tc.tau) > 1e-9 {
				t.Errorf("α %g, τ %g; want %g, %g", f.SolarAbsorptance, f.SolarTransmittance, tc.alpha, tc.tau)
			}
			if f.Origins != tc.origins {
				t.Errorf("origins %+v, want %+v", f.Origins, tc.origins)
			}
			if !strings.Contains(f.Origins.Text(), tc.text) {
				t.Errorf("origins say %q, want %q", f.Origins.Text(), tc.text)
			}
		})
	}
}
