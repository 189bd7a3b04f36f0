package datasheet

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"strings"
	"testing"

	"skysheet/spectra"
)

// sampleCSV builds a neutral-format file from rows of wavelength (nm) and R.
func sampleCSV(rows [][2]float64) string {
	var b strings.Builder
	b.WriteString("# sample: invented test surface\nwavelength_nm,R\n")
	for _, r := range rows {
		b.WriteString(fmtG(r[0]) + "," + strings.TrimSpace(fmtG(r[1])) + "\n")
	}
	return b.String()
}

func mustParse(t testing.TB, text, name string) *spectra.Spectrum {
	t.Helper()
	s, err := spectra.Parse(strings.NewReader(text), name)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// constSample is an opaque surface of absorptance a over [lo, hi] nm.
func constSample(a, lo, hi float64) *spectra.Spectrum {
	s, err := spectra.Parse(strings.NewReader(sampleCSV([][2]float64{{lo, 1 - a}, {hi, 1 - a}})), "const.csv")
	if err != nil {
		panic(err)
	}
	return s
}

// whiteSample reads the invented white coating of testdata.
func whiteSample(t testing.TB) *spectra.Spectrum {
	t.Helper()
	return readTestSample(t, "white-uvvis.csv", "white-ftir.tsv")
}

// selectiveSample is a surface of solar reflectance 0.97 that emits 0.95
// inside 8–13 µm and 0.05 elsewhere in the infrared.
func selectiveSample() *spectra.Spectrum {
	s, err := spectra.Parse(strings.NewReader(sampleCSV([][2]float64{
		{250, 0.97}, {2500, 0.97}, {2600, 0.95}, {7900, 0.95}, {8000, 0.05}, {13000, 0.05}, {13100, 0.95}, {25000, 0.95},
	})), "selective.csv")
	if err != nil {
		panic(err)
	}
	return s
}

// coolingOf repeats Compute's set-up for the internal checks.
func coolingOf(t *testing.T, s *spectra.Spectrum, c Conditions) (*Figures, coolFigures) {
	t.Helper()
	f, err := compute(s, c)
	if err != nil {
		t.Fatal(err)
	}
	sky, err := skyFor(c)
	if err != nil {
		t.Fatal(err)
	}
	o := spectra.Resolve(s, c.ClosureTol)
	m := &cooling{c: c, sky: sky, sun: spectra.SolarGlobal(), g: newCoolGrid(o.A, sky, c.ExchangeBand, c.AmbientK)}
	return f, m.evaluate(o.A, float64(f.CoolingTerms.SolarAbsorbed))
}

func TestBlackbodyNetPower(t *testing.T) {
	for _, tt := range []struct {
		dp, amb float64
		band    [2]float64
	}{
		{10, 300, [2]float64{2.5, 100}},
		{-10, 280, [2]float64{2.5, 100}},
		{20, 310, [2]float64{2.5, 100}},
		{10, 300, [2]float64{5, 50}},
		{-20, 300, [2]float64{2.5, 100}}, // clamped window
	} {
		c := DefaultConditions()
		c.DewPointC, c.AmbientK, c.ExchangeBand, c.IrradianceWm2 = tt.dp, tt.amb, bandFrom(tt.band[0], tt.band[1], "µm"), 0
		f, err := compute(constSample(1, 1000, 200000), c)
		if err != nil {
			t.Fatal(err)
		}
		// Independent: ε_sky by the stated correlation (Berdahl & Martin
		// 1984, a hemispherical flux), F_w by Simpson integration of
		// Planck's law, the window's hemispherical emissivity
		// ε_w = 1 − (1 − ε_sky)/F_w clamped to 0..1; for a blackbody at
		// ambient, P_net = σT⁴ (1 − ε_eff) with ε_eff = 1 − F_w (1 − ε_w)
		// (Stefan–Boltzmann law), which is ε_sky unless clamped.
		sigmaT4 := sigmaCODATA * math.Pow(tt.amb, 4)
		fw := math.Pi * integrate(func(nm float64) float64 { return planckRef(nm, tt.amb) }, 8000, 13000, 2000) / sigmaT4
		epsSky := 0.711 + 0.56*tt.dp/100 + 0.73*tt.dp*tt.dp/1e4
		ew := math.Max(0, math.Min(1, 1-(1-epsSky)/fw))
		effective := 1 - fw*(1-ew)
		want := sigmaT4 * (1 - effective)
		if got := float64(f.CoolingPowerNightWm2); math.Abs(got-want) > 0.01 {
			t.Errorf("T_dp %g °C, T %g K, band %v: P_net = %.4f W/m², want σT⁴(1 − ε_eff) = %.4f", tt.dp, tt.amb, tt.band, got, want)
		}
		if got := float64(f.Sky.HemisphericalEmissivity); math.Abs(got-effective) > 1e-7 {
			t.Errorf("effective sky emissivity %.8f, want %.8f", got, effective)
		}
	}
}

func TestEnergyBalance(t *testing.T) {
	white := whiteSample(t)
	for _, tt := range []struct {
		name string
		s    *spectra.Spectrum
		mod  func(*Conditions)
	}{
		{"white default", white, func(*Conditions) {}},
		{"white humid windless", white, func(c *Conditions) { c.DewPointC, c.HWm2K = 20, 0 }},
		{"grey 0.5", constSample(0.5, 250, 30000), func(*Conditions) {}},
		{"black hot", constSample(0.98, 250, 30000), func(c *Conditions) { c.AmbientK = 320 }},
		{"selective dry", selectiveSample(), func(c *Conditions) { c.DewPointC, c.HWm2K = -20, 1 }},
	} {
		t.Run(tt.name, func(t *testing.T) {
			c := DefaultConditions()
			tt.mod(&c)
			f, r := coolingOf(t, tt.s, c)
			for _, eq := range []struct {
				name     string
				teq, sun float64
				delta    Num
			}{{"day", r.eqDay, r.psun, f.EquilibriumDeltaK}, {"night", r.eqNight, 0, f.EquilibriumDeltaNightK}} {
				if p := r.state.net(eq.teq, eq.sun, c.HWm2K); math.Abs(p) > 1e-6 {
					t.Errorf("%s: P_net(T_eq = %.6f K) = %.3g W/m², want 0 within 1e-6", eq.name, eq.teq, p)
				}
				if d := float64(eq.delta) - (c.AmbientK - eq.teq); d != 0 {
					t.Errorf("%s: equilibrium delta %v, T_amb − T_eq %v", eq.name, float64(eq.delta), c.AmbientK-eq.teq)
				}
			}
			prev := math.Inf(-1)
			for ts := c.AmbientK - 80; ts <= c.AmbientK+80; ts += 0.25 {
				p := r.state.net(ts, r.psun, c.HWm2K)
				if !(p > prev) {
					t.Fatalf("P_net not increasing: %.6f at %.2f K after %.6f", p, ts, prev)
				}
				prev = p
			}
			for i := 1; i < len(f.CoolingCurve); i++ {
				a, b := f.CoolingCurve[i-1], f.CoolingCurve[i]
				if !(b.NetWm2 > a.NetWm2 && b.NetNightWm2 > a.NetNightWm2) {
					t.Errorf("curve not increasing at %g K", b.SurfaceK)
				}
			}
		})
	}
}

func TestSelectiveEmitterAtNoon(t *testing.T) {
	// Fact of the trade (common practice, no source): a surface of solar
	// reflectance ≥ 0.95 emitting mainly in 8–13 µm, under a dry clear sky
	// (dew point −20 °C) and well insulated (h ≤ 1.5), settles more than
	// 10 K below ambient at noon.
	c := DefaultConditions()
	c.DewPointC, c.HWm2K = -20, 1.5
	f, err := compute(selectiveSample(), c)
	if err != nil {
		t.Fatal(err)
	}
	if f.SolarReflectance < 0.95 {
		t.Fatalf("solar reflectance %.3f, want ≥ 0.95", float64(f.SolarReflectance))
	}
	if d := float64(f.EquilibriumDeltaK); !(d > 10) {
		t.Errorf("settles %.2f K below ambient at noon, want more than 10 K", d)
	}
}

func TestGridFineEnough(t *testing.T) {
	c := DefaultConditions()
	for _, s := range []*spectra.Spectrum{whiteSample(t), selectiveSample()} {
		o := spectra.Resolve(s, c.ClosureTol)
		sky := ClearSky(c)
		var got [2]coolFigures
		for i, step := range []float64{referenceStep, referenceStep / 4} {
			m := &cooling{c: c, sky: sky, g: newCoolGridStep(o.A, sky, c.ExchangeBand, c.AmbientK, step)}
			got[i] = bySums(m, o.A, 0.05)
		}
		if d := math.Abs(got[0].night - got[1].night); d > 0.01 {
			t.Errorf("refining the reference grid moves the cooling power by %.4f W/m²", d)
		}
		if d := math.Abs(got[0].eqNight - got[1].eqNight); d > 0.001 {
			t.Errorf("refining the reference grid moves the equilibrium by %.5f K", d)
		}
	}
}

func TestHeldPart(t *testing.T) {
	c := DefaultConditions()
	f, err := compute(whiteSample(t), c)
	if err != nil {
		t.Fatal(err)
	}
	// Blackbody power at 300 K over 25–100 µm by Simpson integration of
	// Planck's law (the white data stop at 25 µm).
	want := math.Pi * integrate(func(nm float64) float64 { return planckRef(nm, 300) }, 25000, 100000, 20000)
	if got := float64(f.HeldPowerWm2); math.Abs(got-want) > 0.01 {
		t.Errorf("held power %.4f W/m², want %.4f", got, want)
	}
	if b := f.CoolingTerms.HeldBands; len(b) != 1 || b[0] != (spectra.Interval{Lo: 25000, Hi: 100000}) {
		t.Errorf("held bands %v, want [[25 100]]", b)
	}
	said := false
	for _, a := range f.Assumptions {
		said = said || strings.Contains(a, "held constant") && strings.Contains(a, "25–100 µm")
	}
	if !said {
		t.Errorf("assumptions do not state the held part: %q", f.Assumptions)
	}

	// A gap between two files is bridged by the nearest value on each side.
	s := mustParse(t, "wavelength_nm,R\n2500,0.1\n6000,0.1\n\n10000,0.7\n100000,0.7\n", "gap.csv")
	f, err = compute(s, c)
	if err != nil {
		t.Fatal(err)
	}
	if b := f.CoolingTerms.HeldBands; len(b) != 1 || b[0] != (spectra.Interval{Lo: 6000, Hi: 10000}) {
		t.Errorf("held bands %v, want [[6 10]]", b)
	}
	want = math.Pi * integrate(func(nm float64) float64 { return planckRef(nm, 300) }, 6000, 10000, 4000)
	if got := float64(f.HeldPowerWm2); math.Abs(got-want) > 0.01 {
		t.Errorf("held power over the gap %.4f W/m², want %.4f", got, want)
	}
	// Emitted: 0.9 up to 8 µm, 0.3 beyond (the nearest values), by Simpson.
	emit := func(nm float64) float64 {
		e := 0.9
		if nm > 8000 {
			e = 0.3
		}
		return e * planckRef(nm, 300)
	}
	want = math.Pi * (integrate(emit, 6000, 8000, 2000) + integrate(emit, 8000, 10000, 2000))
	if got := float64(f.CoolingTerms.HeldEmittedWm2); math.Abs(got-want) > 0.01 {
		t.Errorf("emitted over the gap %.4f W/m², want %.4f", got, want)
	}
}

func TestCoolingWithoutThermalData(t *testing.T) {
	s := mustParse(t, sampleCSV([][2]float64{{280, 0.9}, {2500, 0.9}}), "vis.csv")
	f, err := compute(s, DefaultConditions())
	if err != nil {
		t.Fatal(err)
	}
	for _, v := range []Num{f.CoolingPowerWm2, f.CoolingPowerNightWm2, f.EquilibriumDeltaK, f.HeldPowerWm2} {
		if !math.IsNaN(float64(v)) {
			t.Errorf("cooling figure %v without thermal data, want null", float64(v))
		}
	}
	b, err := json.Marshal(f)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(b), `"cooling_power_w_m2":null`) {
		t.Errorf("JSON lacks a null cooling power")
	}
}

func TestValidateCooling(t *testing.T) {
	for _, tt := range []struct {
		name string
		mod  func(*Conditions)
	}{
		{"ambient in °C", func(c *Conditions) { c.AmbientK = 27 }},
		{"ambient NaN", func(c *Conditions) { c.AmbientK = math.NaN() }},
		{"dew point above air", func(c *Conditions) { c.DewPointC = 30 }},
		{"dew point NaN", func(c *Conditions) { c.DewPointC = math.NaN() }},
		{"negative sun", func(c *Conditions) { c.IrradianceWm2 = -1 }},
		{"negative h", func(c *Conditions) { c.HWm2K = -0.5 }},
		{"infinite h", func(c *Conditions) { c.HWm2K = math.Inf(1) }},
		{"band reversed", func(c *Conditions) { c.ExchangeBand = spectra.Interval{Lo: 100000, Hi: 2500} }},
		{"band zero", func(c *Conditions) { c.ExchangeBand = spectra.Interval{Lo: 0, Hi: 100000} }},
	} {
		c := DefaultConditions()
		tt.mod(&c)
		if err := c.Validate(); err == nil {
			t.Errorf("%s: Validate accepted %+v", tt.name, c)
		}
	}
	if err := DefaultConditions().Validate(); err != nil {
		t.Errorf("defaults rejected: %v", err)
	}
}

func BenchmarkCompute(b *testing.B) {
	s := whiteSample(b)
	c := DefaultConditions()
	for b.Loop() {
		if _, err := compute(s, c); err != nil {
			b.Fatal(err)
		}
	}
}

func FuzzCompute(f *testing.F) {
	f.Add([]byte(sampleCSV([][2]float64{{250, 0.9}, {2500, 0.9}, {2600, 0.1}, {25000, 0.1}})))
	f.Add([]byte("wavenumber_cm-1;R (%);T;u_R\n4000;50,5;1;0,01\n400;60;2;0,02\n\n300;10;0;\n200;12;0;\n"))
	f.Add([]byte("wavelength_um,A,T,u_T\n2.5,0.9,0.01,0.001\n8,0.95,0,0.001\n\n13,0.9,0,\n150,0.5,0,\n"))
	f.Fuzz(func(t *testing.T, in []byte) {
		s, err := spectra.Parse(bytes.NewReader(in), "fuzz")
		if err != nil {
			return
		}
		x, err := compute(s, DefaultConditions())
		if err != nil {
			t.Fatalf("Compute failed on a parsed spectrum: %v", err)
		}
		if h := float64(x.CoolingTerms.HeldShare); !math.IsNaN(h) && !(h >= 0 && h <= 1+1e-12) {
			t.Fatalf("held share %v", h)
		}
		for _, fig := range x.Figures {
			if v := float64(fig.Value); math.IsInf(v, 0) {
				t.Fatalf("%s infinite", fig.Key)
			}
			if u := fig.Uncertainty; u != nil && !(u.Uncorrelated >= 0 && u.Correlated >= 0) {
				t.Fatalf("%s: uncertainty %+v", fig.Key, *u)
			}
		}
		if _, err := json.Marshal(x); err != nil {
			t.Fatal(err)
		}
	})
}

// TestConditionMessagesRounded checks that a value the message derives
// (the air temperature in °C, 290 K − 273.15 = 16.850000000000023 in
// float64) is written as the data state it.
func TestConditionMessagesRounded(t *testing.T) {
	c := DefaultConditions()
	c.AmbientK, c.DewPointC = 290, 20
	err := c.Validate()
	if err == nil || !strings.Contains(err.Error(), "(16.85 °C)") {
		t.Errorf("message %v, want the air at 16.85 °C", err)
	}
}

// g173Table reads the global tilt column of the embedded ASTM G173-03 table
// with the test's own reader: wavelengths (nm) and W m⁻² nm⁻¹.
func g173Table(t *testing.T) (nm, e []float64) {
	t.Helper()
	for _, r := range plainTable(t, "../spectra/astm-g173-03.csv", 2, ",", false, 3) {
		nm, e = append(nm, r[0]), append(e, r[2])
	}
	return nm, e
}

// trapezoidOver integrates the table by the trapezoid rule over its own
// points between lo and hi, which must be points of the table.
func trapezoidOver(nm, e []float64, lo, hi float64) float64 {
	var s float64
	for i := 1; i < len(nm); i++ {
		if nm[i-1] >= lo && nm[i] <= hi {
			s += (nm[i] - nm[i-1]) * (e[i-1] + e[i]) / 2
		}
	}
	return s
}

// TestAbsorbedSunlight checks P_sun = I ∫ α E dλ / ∫ E dλ over the whole
// ASTM G173-03 range 280–4000 nm, against the table read and integrated
// here; the standard quotes 1000.4 W/m² for the global tilt total (ASTM
// G173-03; spectra/astm-g173-03.md).
func TestAbsorbedSunlight(t *testing.T) {
	nm, e := g173Table(t)
	total := trapezoidOver(nm, e, 280, 4000)
	if math.Abs(total-1000.4) > 0.05 {
		t.Fatalf("G173 global tilt total %.3f W/m², the standard quotes 1000.4", total)
	}
	const step = 0.01 // nm: the width of the steps below
	for _, tt := range []struct {
		name     string
		rows     [][2]float64 // wavelength nm, R (T = 0: A = 1 − R)
		want     float64      // P_sun at I = 1000.4 W/m², W/m²
		coverage float64
	}{
		// Black over the whole range: all of the stated irradiance.
		{"black", [][2]float64{{280, 0}, {4000, 0}}, 1000.4, 1},
		// Absorbing only beyond 2500 nm, as white paints do: the sunlight of
		// 2500–4000 nm, which a solar band ending at 2500 nm leaves out.
		{"absorbs beyond 2.5 µm", [][2]float64{{280, 1}, {2500, 1}, {2500 + step, 0}, {4000, 0}},
			1000.4 * trapezoidOver(nm, e, 2500, 4000) / total, 1},
		// Data to 2500 nm only: the mean over the covered part, with the
		// covered share of the spectrum's power as coverage.
		{"grey to 2.5 µm", [][2]float64{{280, 0.5}, {2500, 0.5}}, 1000.4 * 0.5, trapezoidOver(nm, e, 280, 2500) / total},
	} {
		t.Run(tt.name, func(t *testing.T) {
			c := DefaultConditions()
			c.IrradianceWm2 = 1000.4
			s := mustParse(t, sampleCSV(tt.rows), "sun.csv")
			f, err := compute(s, c)
			if err != nil {
				t.Fatal(err)
			}
			ct := f.CoolingTerms
			if got := float64(ct.SolarWm2); math.Abs(got-tt.want) > 1e-3 {
				t.Errorf("P_sun = %.4f W/m², want %.4f", got, tt.want)
			}
			if got := float64(ct.SolarAbsorbedCoverage); math.Abs(got-tt.coverage) > 1e-6 {
				t.Errorf("coverage %.6f, want %.6f", got, tt.coverage)
			}
			if got, want := float64(ct.SolarAbsorbed)*c.IrradianceWm2, float64(ct.SolarWm2); math.Abs(got-want) > 1e-9 {
				t.Errorf("absorbed share × I = %g, P_sun %g", got, want)
			}
		})
	}
	// The solar absorptance figure keeps its stated band: 0 for the sample
	// that absorbs only beyond 2.5 µm, while P_sun counts that sunlight.
	f, err := compute(mustParse(t, sampleCSV([][2]float64{{280, 1}, {2500, 1}, {2500 + step, 0}, {4000, 0}}), "sun.csv"), DefaultConditions())
	if err != nil {
		t.Fatal(err)
	}
	if f.SolarAbsorptance != 0 || !(f.CoolingTerms.SolarWm2 > 5) {
		t.Errorf("α_sol %g over 280–2500 nm, P_sun %g W/m²", float64(f.SolarAbsorptance), float64(f.CoolingTerms.SolarWm2))
	}
	b, _ := json.Marshal(f.CoolingTerms)
	for _, k := range []string{`"solar_w_m2":`, `"solar_absorbed_fraction":`, `"solar_absorbed_coverage":`} {
		if !strings.Contains(string(b), k) {
			t.Errorf("cooling_terms JSON lacks %s: %s", k, b)
		}
	}
}

// TestHeldUncertainty checks the extrapolation's uncertainty against the
// figures recomputed from data that extend over the held part explicitly
// with emittance 0.9 and 1 (the alternatives), taking the largest change
// as the half-width of a rectangular distribution (JCGM 100:2008 4.3.7,
// from memory): exactly for the powers, within 3 % for the equilibria
// (linearised at the equilibrium).
func TestHeldUncertainty(t *testing.T) {
	// A spectral sky that lets some of the held part (25–100 µm) through,
	// so that the powers depend on it too (under the two-band sky it is
	// black there).
	const head = "wavelength_um,R\n0.28,0.9\n2.5,0.9\n2.5001,0.25\n25,0.25\n"
	c := DefaultConditions()
	c.Sky = SkyChoice{File: "sky.csv", Spectrum: mustParse(t, "wavelength_um,T\n2,0.3\n200,0.3\n", "sky.csv")}
	base, err := compute(mustParse(t, head, "b.csv"), c)
	if err != nil {
		t.Fatal(err)
	}
	alt := func(e float64) *Figures {
		f, err := compute(mustParse(t, head+fmt.Sprintf("25.000001,%g\n100,%g\n", 1-e, 1-e), "a.csv"), c)
		if err != nil {
			t.Fatal(err)
		}
		return f
	}
	a9, a10 := alt(0.9), alt(1)
	for _, tt := range []struct {
		key string
		tol float64 // relative
	}{
		{"cooling_power_w_m2", 1e-4}, {"cooling_power_night_w_m2", 1e-4},
		{"equilibrium_delta_k", 0.03}, {"equilibrium_delta_night_k", 0.03},
	} {
		x, _ := base.Figure(tt.key)
		y9, _ := a9.Figure(tt.key)
		y10, _ := a10.Figure(tt.key)
		want := math.Max(math.Abs(float64(y9.Value-x.Value)), math.Abs(float64(y10.Value-x.Value))) / math.Sqrt(3)
		got, ok := base.CoolingTerms.HeldUncertainty[tt.key]
		t.Logf("%s: %.5g, from the extended data %.5g (%v, %v, %v)", tt.key, float64(got), want, x.Value, y9.Value, y10.Value)
		if !ok || !(want > 0) || math.Abs(float64(got)-want) > tt.tol*want {
			t.Errorf("%s: held uncertainty %v (present %v), want %.6g", tt.key, got, ok, want)
		}
	}
	// Data over the whole exchange band: nothing is held, no uncertainty.
	full, err := compute(constSample(0.9, 250, 100000), c)
	if err != nil {
		t.Fatal(err)
	}
	if n := len(full.CoolingTerms.HeldUncertainty); n != 0 {
		t.Errorf("nothing held, yet %d held uncertainties", n)
	}
}

// The interpolated P_rad of a full evaluation against the sums themselves
// (the sums are checked against Planck's law and Stefan-Boltzmann in
// TestBlackbodyNetPower): the equilibria agree to the root searches'
// tolerance, the curve to 1e-12 of P_rad.
func TestSmoothAgreesWithSums(t *testing.T) {
	hot := DefaultConditions()
	hot.AmbientK, hot.HWm2K = 318.15, 0
	interpolated := 0 // equilibria within the interpolant's range
	defer func() {
		if interpolated < 3 {
			t.Errorf("only %d equilibria within the interpolant's range: the test checks too little", interpolated)
		}
	}()
	for _, tc := range []struct {
		name  string
		s     *spectra.Spectrum
		c     Conditions
		alpha float64
	}{
		{"white", whiteSample(t), DefaultConditions(), 0.05},
		{"selective", selectiveSample(), DefaultConditions(), 0.03},
		{"selective, hot, h = 0", selectiveSample(), hot, 0.03},
		{"grey 0.9", constSample(0.9, 250, 30000), DefaultConditions(), 0.9},
		{"grey 0.1", constSample(0.1, 250, 30000), hot, 0.1},
	} {
		t.Run(tc.name, func(t *testing.T) {
			o := spectra.Resolve(tc.s, tc.c.ClosureTol)
			sky := ClearSky(tc.c)
			m := &cooling{c: tc.c, sky: sky, g: newCoolGrid(o.A, sky, tc.c.ExchangeBand, tc.c.AmbientK)}
			smooth, exact := m.evaluate(o.A, tc.alpha), bySums(m, o.A, tc.alpha)
			if smooth.state.fit == nil {
				t.Fatal("no interpolant: P_rad not resolved to smoothTol")
			}
			for _, x := range [][2]float64{{smooth.eqNight, exact.eqNight}, {smooth.eqDay, exact.eqDay}} {
				if math.Abs(x[0]-x[1]) > 2e-9 {
					t.Errorf("equilibrium %.12f K, by the sums %.12f K", x[0], x[1])
				}
			}
			s := smooth.state
			// Unchecked (the sensitivity table's) against refined on the sums.
			for i, psun := range []float64{0, tc.c.IrradianceWm2 * tc.alpha} {
				u, ok1 := s.equilibriumNear(psun, tc.c.HWm2K, false)
				r, ok2 := s.equilibriumNear(psun, tc.c.HWm2K, true)
				inside := s.fit.covers([]float64{exact.eqNight, exact.eqDay}[i])
				if ok1 != inside || ok2 != inside {
					t.Errorf("P_sun %g W/m²: found with the interpolant %v, %v; want %v (T_eq %g K)", psun, ok1, ok2, inside, []float64{exact.eqNight, exact.eqDay}[i])
				}
				if inside {
					interpolated++
				}
				if inside && math.Abs(u-r) > 1e-10 {
					t.Errorf("P_sun %g W/m²: equilibrium from the interpolant %.13f K, refined on the sums %.13f K", psun, u, r)
				}
			}
			for d := float64(smoothBelowK); d <= smoothAboveK; d += 0.37 {
				T := tc.c.AmbientK + d
				if got, want := s.pradNear(T), s.prad(T); math.Abs(got-want) > 1e-12*want {
					t.Errorf("P_rad(%g K) = %.15g, by the sums %.15g", T, got, want)
				}
				const dt = 0.01
				want := (s.prad(T+dt)-s.prad(T-dt))/(2*dt) + tc.c.HWm2K
				if got := s.slope(T, tc.c.HWm2K); math.Abs(got-want) > 1e-6*want {
					t.Errorf("slope at %g K = %.10g, central difference of the sums %.10g", T, got, want)
				}
			}
		})
	}
}

// A state under another sky sums P_atm as a state loaded under that sky.
func TestUnderSky(t *testing.T) {
	c := DefaultConditions()
	s := whiteSample(t)
	o := spectra.Resolve(s, c.ClosureTol)
	sky := ClearSky(c)
	g := newCoolGrid(o.A, sky, c.ExchangeBand, c.AmbientK)
	wet := c
	wet.DewPointC += 5
	h := g.withSky(ClearSky(wet))
	if got, want := g.load(o.A, 1).underSky(h).patm, h.load(o.A, 1).patm; got != want {
		t.Errorf("P_atm under the wetter sky %.17g, loaded under it %.17g", got, want)
	}
	if got, want := g.load(o.A, 1).patm, h.load(o.A, 1).patm; got == want {
		t.Errorf("P_atm %g does not depend on the dew point", got)
	}
}

// bySums is evaluate without the interpolant: every equilibrium found on
// the full sums.
func bySums(m *cooling, a spectra.Series, alpha float64) coolFigures {
	k := 1.0
	if m.ratio > 0 {
		k = m.ratio
	}
	return m.figuresOf(m.g.load(a, k), alpha)
}

// refine gives up, so that the full search runs, on a slope it cannot use.
func TestRefineRefuses(t *testing.T) {
	c := DefaultConditions()
	o := spectra.Resolve(whiteSample(t), c.ClosureTol)
	sky := ClearSky(c)
	m := &cooling{c: c, sky: sky, g: newCoolGrid(o.A, sky, c.ExchangeBand, c.AmbientK)}
	base := m.evaluate(o.A, 0.05)
	s := base.state
	for _, tc := range []struct {
		name     string
		t, slope float64
	}{
		{"no slope", base.eqNight - 1, 0},
		{"a NaN slope", base.eqNight - 1, math.NaN()},
		{"a slope that steps out of range", base.eqNight - 1, 1e-12},
	} {
		if got, ok := s.refine(tc.t, tc.slope, 0, c.HWm2K); ok {
			t.Errorf("%s: refine gave %g K, want no result (the full search runs)", tc.name, got)
		}
	}
}

// The change over the held part alone against the difference of two full
// loads, under a spectral sky that lets the held part through.
func TestHeldChange(t *testing.T) {
	c := DefaultConditions()
	c.Sky = SkyChoice{File: "sky.csv", Spectrum: mustParse(t, "wavelength_um,T\n2,0.3\n200,0.3\n", "sky.csv")}
	sky, err := skyFor(c)
	if err != nil {
		t.Fatal(err)
	}
	o := spectra.Resolve(mustParse(t, "wavelength_um,R\n0.28,0.9\n2.5,0.9\n2.5001,0.25\n25,0.25\n", "b.csv"), c.ClosureTol)
	g := newCoolGrid(o.A, sky, c.ExchangeBand, c.AmbientK)
	base := g.load(o.A, 0.97)
	for _, e := range heldAlternatives {
		alt := g.loadHeld(o.A, 0.97, e)
		ch := base.heldChange(e)
		for _, T := range []float64{c.AmbientK, c.AmbientK - 17.3, c.AmbientK + 4.1} {
			want := (alt.prad(T) - alt.patm) - (base.prad(T) - base.patm)
			if got := ch(T); math.Abs(got-want) > 1e-9*math.Abs(want) || want == 0 {
				t.Errorf("held at %g, %g K: change %.12g W/m², two full loads %.12g W/m²", e, T, got, want)
			}
		}
	}
}
