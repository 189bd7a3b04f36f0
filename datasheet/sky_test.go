package datasheet

import (
	"bytes"
	"errors"
	"math"
	"strings"
	"testing"

	"skysheet/spectra"
)

// sigmaCODATA is the Stefan–Boltzmann constant, CODATA 2018.
const sigmaCODATA = 5.670374419e-8

// planckRef is the Planck spectral radiance in W m⁻² sr⁻¹ nm⁻¹ written out
// here with the exact SI constants (CODATA 2018), apart from the package's.
func planckRef(nm, kelvin float64) float64 {
	const h, c, k = 6.62607015e-34, 299792458.0, 1.380649e-23
	l := nm * 1e-9
	return 2 * h * c * c / math.Pow(l, 5) / math.Expm1(h*c/(l*k*kelvin)) * 1e-9
}

// integrate returns ∫ f over [a, b] by the composite Simpson rule with n
// (even) intervals.
func integrate(f func(float64) float64, a, b float64, n int) float64 {
	h := (b - a) / float64(n)
	sum := f(a) + f(b)
	for i := 1; i < n; i++ {
		w := 2.0
		if i%2 == 1 {
			w = 4
		}
		sum += w * f(a+float64(i)*h)
	}
	return sum * h / 3
}

// expIntegral3 returns E₃(z) from the series of E₁ (Abramowitz & Stegun
// 5.1.11) and the recurrence E_{n+1}(z) = (e^{−z} − z E_n(z))/n (A&S 5.1.14).
func expIntegral3(z float64) float64 {
	const euler = 0.57721566490153286
	e1 := -euler - math.Log(z)
	term := 1.0
	for k := 1; k < 200; k++ {
		term *= -z / float64(k)
		e1 -= term / float64(k)
		if math.Abs(term) < 1e-18 {
			break
		}
	}
	e2 := math.Exp(-z) - z*e1
	return (math.Exp(-z) - z*e2) / 2
}

func TestBerdahlMartin(t *testing.T) {
	for _, tt := range []struct{ dp, want float64 }{
		// Berdahl & Martin (1984) clear-sky correlation, coefficients from
		// memory (0.711, 0.56, 0.73); values worked by hand.
		{0, 0.711},
		{10, 0.7743},
		{-20, 0.6282},
		{20, 0.8522},
	} {
		if got := BerdahlMartin(tt.dp); math.Abs(got-tt.want) > 1e-12 {
			t.Errorf("ε_sky(T_dp = %g °C) = %.6f, want %.4f", tt.dp, got, tt.want)
		}
	}
}

func TestBlackbodyFraction(t *testing.T) {
	for _, tt := range []struct{ lambdaT, want float64 }{
		// Blackbody radiation functions F(0→λT), radiation heat-transfer
		// handbook tables (values from memory). The tables predate the exact
		// SI constants and differ from CODATA 2018 by up to 5e-5; the tight
		// check is the Simpson integration below.
		{2000, 0.066728},
		{2898, 0.250108},
		{3000, 0.273232},
		{4000, 0.480877},
		{5000, 0.633747},
		{6000, 0.737818},
		{10000, 0.914199},
	} {
		got := blackbodyFraction(0, tt.lambdaT, 1000) // at 1000 K, λ in nm equals λT in µm K
		if math.Abs(got-tt.want) > 1e-4 {
			t.Errorf("F(0→%g µm K) = %.6f, want %.6f", tt.lambdaT, got, tt.want)
		}
	}
	// The window fraction against a direct Simpson integration of Planck's
	// law, normalised by the Stefan–Boltzmann law (CODATA 2018 σ).
	for _, T := range []float64{250, 300, 330} {
		want := math.Pi * integrate(func(nm float64) float64 { return planckRef(nm, T) }, 8000, 13000, 2000) / (sigmaCODATA * math.Pow(T, 4))
		if got := blackbodyFraction(8000, 13000, T); math.Abs(got-want) > 1e-9 {
			t.Errorf("F_w(%g K) = %.10f, want %.10f", T, got, want)
		}
	}
}

// clearAt returns the clear sky at a dew point (°C) and air temperature (K)
// under otherwise default conditions.
func clearAt(dp, amb float64) Sky {
	c := DefaultConditions()
	c.DewPointC, c.AmbientK = dp, amb
	return ClearSky(c)
}

func TestClearSky(t *testing.T) {
	for _, tt := range []struct {
		name        string
		dp, amb     float64
		clamped     bool
		wantWindowE float64 // NaN: check the flux instead
	}{
		{"default", 10, 300, false, math.NaN()},
		{"humid", 20, 300, false, math.NaN()},
		{"cold air", 0, 275, false, math.NaN()},
		{"dry clamps to 0", -20, 300, true, 0},
		{"very humid clamps to 1", 40, 320, true, 1},
	} {
		t.Run(tt.name, func(t *testing.T) {
			k := clearAt(tt.dp, tt.amb)
			if k.Clamped != tt.clamped {
				t.Fatalf("clamped = %v, want %v", k.Clamped, tt.clamped)
			}
			if !tt.clamped {
				// Stated definition: a horizontal blackbody receives
				// ε_sky σT⁴ (Berdahl & Martin): the blackbody-weighted mean of
				// the hemispherical sky emissivity, by Simpson integration.
				f := func(nm float64) float64 {
					h, _ := k.hemisphericalOn(nm, nm)
					return h * planckRef(nm, tt.amb)
				}
				const e = 1e-7 // keep each part on its own side of the window's edges
				// Beyond 1 mm (ε = 1) the Rayleigh–Jeans law gives
				// ∫ B dλ = 2ckT/(3λ³).
				tail := 2 * 299792458.0 * 1.380649e-23 * tt.amb / (3 * 1e-9)
				mean := math.Pi * (integrate(f, 100, 8000-e, 20000) + integrate(f, 8000+e, 13000-e, 2000) + integrate(f, 13000+e, 1e6, 200000) + tail) /
					(sigmaCODATA * math.Pow(tt.amb, 4))
				if want := BerdahlMartin(tt.dp); math.Abs(mean-want) > 1e-6 {
					t.Errorf("blackbody-weighted hemispherical emissivity %.7f, want ε_sky %.7f", mean, want)
				}
			} else if float64(k.WindowHemisphericalEmissivity) != tt.wantWindowE {
				t.Errorf("ε_w = %g, want %g", float64(k.WindowHemisphericalEmissivity), tt.wantWindowE)
			}
			if !strings.Contains(k.Description, "dew point") || (tt.clamped && !strings.Contains(k.Description, "clamped")) {
				t.Errorf("description does not say it: %s", k.Description)
			}
		})
	}
}

// TestClearSkyFlux checks that the two-band sky gives the correlation's
// hemispherical flux L↓ = ε_sky σT_a⁴ (Berdahl & Martin 1984, Solar Energy
// 32, 663: the correlation was fitted to pyrgeometer measurements of the
// downward long-wave flux on a horizontal surface; from memory), and that the
// reported zenith transmittance of the window gives the same flux under the
// angular law.
func TestClearSkyFlux(t *testing.T) {
	for _, amb := range []float64{300, 305} {
		sigmaT4 := sigmaCODATA * math.Pow(amb, 4)
		fw := math.Pi * integrate(func(nm float64) float64 { return planckRef(nm, amb) }, 8000, 13000, 2000) / sigmaT4
		for dp := -5.0; dp <= 25; dp++ {
			k := clearAt(dp, amb)
			if k.Clamped {
				t.Fatalf("T_dp %g °C, air %g K: clamped", dp, amb)
			}
			x := dp / 100
			want := (0.711 + 0.56*x + 0.73*x*x) * sigmaT4
			// The flux as the cooling integrals take it: black outside the
			// window, the hemispherical window value inside.
			hw, _ := k.hemisphericalOn(10000, 10000)
			if got := sigmaT4 * ((1 - fw) + fw*hw); math.Abs(got-want) > 1e-6*want {
				t.Errorf("T_dp %g °C, air %g K: L↓ = %.7f W/m², want ε_sky σT⁴ = %.7f", dp, amb, got, want)
			}
			// The same from the zenith transmittance t: the window's
			// hemispherical emissivity is 1 − 2E₃(−ln t) (A&S 5.1).
			tz := float64(k.WindowZenithTransmittance)
			if got := sigmaT4 * ((1 - fw) + fw*(1-2*expIntegral3(-math.Log(tz)))); math.Abs(got-want) > 1e-6*want {
				t.Errorf("T_dp %g °C, air %g K: from the zenith transmittance %.6f, L↓ = %.7f W/m², want %.7f", dp, amb, tz, got, want)
			}
			if got := float64(k.HemisphericalEmissivity) * sigmaT4; math.Abs(got-want) > 1e-6*want {
				t.Errorf("T_dp %g °C, air %g K: reported hemispherical emissivity gives %.7f W/m², want %.7f", dp, amb, got, want)
			}
		}
	}
}

// TestBlackNightPower checks the night cooling power of a black surface at
// 300 K under the default clear sky (dew point 10 °C): σT⁴ (1 − ε_sky), the
// correlation used as published, about 103.7 W/m².
func TestBlackNightPower(t *testing.T) {
	c := DefaultConditions()
	c.IrradianceWm2 = 0
	f, err := compute(constSample(1, 1000, 200000), c)
	if err != nil {
		t.Fatal(err)
	}
	x := c.DewPointC / 100
	epsSky := 0.711 + 0.56*x + 0.73*x*x                          // Berdahl & Martin (1984), from memory
	want := sigmaCODATA * math.Pow(c.AmbientK, 4) * (1 - epsSky) // Stefan–Boltzmann law, CODATA 2018 σ
	if math.Abs(want-103.7) > 0.2 {
		t.Fatalf("recomputed %.3f W/m², outside 103.7 ± 0.2", want)
	}
	if got := float64(f.CoolingPowerNightWm2); math.Abs(got-want) > 0.01 {
		t.Errorf("black surface at night: %.4f W/m², want σT⁴(1 − ε_sky) = %.4f", got, want)
	}
}

// TestSkyTerms checks the optional terms of the correlation (Berdahl &
// Martin 1984, from memory): Δε = 0.013 cos(2π t/24) and 0.00012 (P − 1000),
// recomputed here, off by default.
func TestSkyTerms(t *testing.T) {
	c := DefaultConditions()
	base := ClearSky(c)
	if !math.IsNaN(float64(base.HourTerm)) || !math.IsNaN(float64(base.PressureTerm)) {
		t.Fatalf("terms on by default: %v %v", base.HourTerm, base.PressureTerm)
	}
	c.HourOfDay, c.StationPressure = On(3), On(850)
	k := ClearSky(c)
	dh, dp := 0.013*math.Cos(2*math.Pi*3/24), 0.00012*(850-1000)
	if got := float64(k.Emissivity - base.Emissivity); math.Abs(got-(dh+dp)) > 1e-12 {
		t.Errorf("terms add %.6f, want %.6f", got, dh+dp)
	}
	if math.Abs(float64(k.HourTerm)-dh) > 1e-12 || math.Abs(float64(k.PressureTerm)-dp) > 1e-12 {
		t.Errorf("terms %v %v, want %v %v", k.HourTerm, k.PressureTerm, dh, dp)
	}
	if !strings.Contains(k.Description, "hour-of-day term") || !strings.Contains(k.Description, "850 hPa") {
		t.Errorf("description does not name the terms: %s", k.Description)
	}
	for _, bad := range []Conditions{{HourOfDay: On(25)}, {StationPressure: On(101.3)}} {
		c := DefaultConditions()
		c.HourOfDay, c.StationPressure = bad.HourOfDay, bad.StationPressure
		if err := c.Validate(); err == nil {
			t.Errorf("%+v passes Validate", bad)
		}
	}
}

// TestSkyOutsideModel checks that a sky drier than the two-band model can
// represent is named in the figures' assumptions.
func TestSkyOutsideModel(t *testing.T) {
	c := DefaultConditions()
	c.DewPointC = -20
	f, err := compute(constSample(0.9, 1000, 200000), c)
	if err != nil {
		t.Fatal(err)
	}
	var found bool
	for _, a := range f.Assumptions {
		found = found || strings.HasPrefix(a, "Outside the sky model")
	}
	if !found {
		t.Errorf("no assumption names the clamped sky: %q", f.Assumptions)
	}
}

func TestHemisphericalEmissivity(t *testing.T) {
	for _, e := range []float64{1e-6, 1e-4, 1e-3, 0.01, 0.05, 0.1, 0.3, 0.5, 0.8, 0.95, 0.999} {
		// 2∫₀¹ μ (1 − e^(−τ/μ)) dμ = 1 − 2E₃(τ), τ = −ln(1 − e): exponential
		// integral, Abramowitz & Stegun 5.1.
		want := 1 - 2*expIntegral3(-math.Log(1-e))
		if got := hemispherical(e); math.Abs(got-want) > 1e-7 {
			t.Errorf("h(%g) = %.10f, want 1 − 2E₃(τ) = %.10f", e, got, want)
		}
		if fine := hemisphericalRule(e, 200); math.Abs(hemispherical(e)-fine) > 1e-7 {
			t.Errorf("h(%g): %d-node rule %.10f, 200-node rule %.10f", e, angularNodes, hemispherical(e), fine)
		}
	}
	if hemispherical(0) != 0 || hemispherical(1) != 1 {
		t.Errorf("h(0) = %g, h(1) = %g, want 0 and 1", hemispherical(0), hemispherical(1))
	}
}

func TestGaussLegendreExact(t *testing.T) {
	// An n-point Gauss–Legendre rule integrates polynomials of degree up to
	// 2n − 1 exactly (Abramowitz & Stegun 25.4.29): ∫₋₁¹ x^k dx = 2/(k+1) for even k.
	for _, n := range []int{2, 5, angularNodes} {
		x, w := gaussLegendre(n)
		for k := 0; k <= 2*n-1; k++ {
			var got float64
			for i := range x {
				got += w[i] * math.Pow(x[i], float64(k))
			}
			want := 0.0
			if k%2 == 0 {
				want = 2 / float64(k+1)
			}
			if math.Abs(got-want) > 1e-13 {
				t.Errorf("n=%d: ∫x^%d = %.15f, want %.15f", n, k, got, want)
			}
		}
	}
}

func TestSkyAngle(t *testing.T) {
	k := clearAt(10, 300)
	ew := float64(k.WindowEmissivity)
	for _, tt := range []struct{ nm, mu, want float64 }{
		{10000, 1, ew},
		{10000, 0.5, 1 - (1-ew)*(1-ew)}, // 1/cos θ = 2: definition in the issue
		{5000, 0.3, 1},
		{20000, 0.01, 1},
	} {
		if got := k.at(tt.nm, tt.mu); math.Abs(got-tt.want) > 1e-12 {
			t.Errorf("ε(%g nm, μ=%g) = %.12f, want %.12f", tt.nm, tt.mu, got, tt.want)
		}
	}
}

// skyFile writes a neutral-format sky: T = 1 − ε_w inside 8–13 µm, 0 outside,
// with steep edges 1 nm wide.
func skyFile(ew float64) string {
	var b strings.Builder
	b.WriteString("# sample: invented two-band sky (test data)\nwavelength_nm,T\n")
	for _, r := range [][2]float64{{2000, 0}, {7999, 0}, {8000, 1 - ew}, {13000, 1 - ew}, {13001, 0}, {200000, 0}} {
		b.WriteString(fmtG(r[0]) + "," + fmtG(r[1]) + "\n")
	}
	return b.String()
}

func TestSpectralSkyMatchesTwoBand(t *testing.T) {
	clear := clearAt(10, 300)
	s, err := spectra.Parse(strings.NewReader(skyFile(float64(clear.WindowEmissivity))), "sky.csv")
	if err != nil {
		t.Fatal(err)
	}
	k, err := spectralSky(s, "sky.csv", 300)
	if err != nil {
		t.Fatal(err)
	}
	// The spectral form of the same sky must give the same broadband
	// figures, up to the 1 nm edges (about 1e-4 of the window).
	for _, tt := range []struct {
		name      string
		got, want Num
	}{
		{"zenith", k.ZenithEmissivity, clear.ZenithEmissivity},
		{"hemispherical", k.HemisphericalEmissivity, clear.HemisphericalEmissivity},
		{"window", k.WindowEmissivity, clear.WindowEmissivity},
	} {
		if math.Abs(float64(tt.got-tt.want)) > 2e-4 {
			t.Errorf("%s emissivity %.5f, want %.5f", tt.name, float64(tt.got), float64(tt.want))
		}
	}
	sample := constSample(0.05, 2000, 200000)
	c := DefaultConditions()
	c.IrradianceWm2 = 0
	f1, err := compute(sample, c)
	if err != nil {
		t.Fatal(err)
	}
	c.Sky = SkyChoice{File: "sky.csv", Spectrum: s}
	f2, err := compute(sample, c)
	if err != nil {
		t.Fatal(err)
	}
	if d := float64(f1.CoolingPowerNightWm2 - f2.CoolingPowerNightWm2); math.Abs(d) > 0.05 {
		t.Errorf("two-band sky %.3f W/m², its spectral form %.3f W/m²", float64(f1.CoolingPowerNightWm2), float64(f2.CoolingPowerNightWm2))
	}
	if f2.Sky.Model != skyModelSpectral || f2.Sky.Source != "sky.csv" {
		t.Errorf("sky %+v", f2.Sky)
	}
}

func TestSpectralSkyErrors(t *testing.T) {
	s, err := spectra.Parse(strings.NewReader("wavelength_nm,R\n8000,0.5\n9000,0.5\n"), "r.csv")
	if err != nil {
		t.Fatal(err)
	}
	if _, err := spectralSky(s, "r.csv", 300); !errors.Is(err, spectra.ErrNoValues) {
		t.Errorf("sky without T: err = %v, want ErrNoValues", err)
	}
	c := DefaultConditions()
	c.Sky = SkyChoice{File: "missing.csv"}
	if err := c.Validate(); err == nil {
		t.Error("a named sky file that was not read passes Validate")
	}
	c.Sky.Spectrum = s
	if err := c.Validate(); !errors.Is(err, spectra.ErrNoValues) {
		t.Errorf("sky without T passes Validate: %v", err)
	}
}

func FuzzSpectralSky(f *testing.F) {
	f.Add([]byte(skyFile(0.3)))
	f.Add([]byte("wavenumber_cm-1;T (%)\n1250;80\n770;70\n\n700;10\n400;0\n"))
	f.Fuzz(func(t *testing.T, in []byte) {
		s, err := spectra.Parse(bytes.NewReader(in), "fuzz")
		if err != nil {
			return
		}
		k, err := spectralSky(s, "fuzz", 300)
		if err != nil {
			if !errors.Is(err, spectra.ErrNoValues) {
				t.Fatalf("unexpected error %v", err)
			}
			return
		}
		for _, v := range []Num{k.ZenithEmissivity, k.HemisphericalEmissivity, k.WindowEmissivity} {
			if !(v >= -1e-9 && v <= 1+1e-9) {
				t.Fatalf("emissivity %v outside 0..1: %+v", v, k)
			}
		}
		for _, nm := range []float64{3000, 9000, 12000, 30000} {
			if e := k.zenithAt(nm); !(e >= 0 && e <= 1) {
				t.Fatalf("zenith emissivity %v at %g nm", e, nm)
			}
		}
	})
}
