package datasheet

import (
	"fmt"
	"math"
	"os"
	"strings"
	"testing"
	"time"

	"skysheet/datasheet/weather"
	"skysheet/spectra"
)

// hourlyOf sets up the hourly model of s under c as Compute does, with the
// switches opt.
func hourlyOf(t testing.TB, s *spectra.Spectrum, c Conditions, opt hourlyOptions) (*Figures, *cooling, spectra.Optics, *hourlyModel) {
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
	m := &cooling{c: c, sky: sky, sun: c.SolarSpectrum.Weighting(), g: newCoolGrid(o.A, sky, c.ExchangeBand, c.AmbientK)}
	return f, m, o, m.hourly(f, o, opt)
}

// seriesText writes a series of the four required columns and the extra
// columns given, n hours from start; row(i) gives the cells after the time.
func seriesText(header string, start time.Time, n int, row func(i int) string) string {
	var b strings.Builder
	b.WriteString("# Invented, synthetic, not measured: a test series.\n")
	b.WriteString("time,air temperature (°C),dew point (°C),global horizontal irradiance (W/m²)" + header + "\n")
	for i := range n {
		b.WriteString(start.Add(time.Duration(i)*time.Hour).Format(time.RFC3339) + "," + row(i) + "\n")
	}
	return b.String()
}

func parseSeries(t testing.TB, text string) *weather.Series {
	t.Helper()
	s, err := weather.Parse(strings.NewReader(text), "test.csv")
	if err != nil {
		t.Fatal(err)
	}
	return s
}

func demoSeries(t testing.TB, name string) *weather.Series {
	t.Helper()
	s, err := weather.Read(os.DirFS("../content/weather"), name)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

var start = time.Date(2025, 7, 1, 0, 0, 0, 0, time.FixedZone("", 2*3600))

// TestSeriesConstant: a series that repeats the steady-state conditions
// every hour gives the steady-state figures every hour, and their energy is
// the power times the hours. The hour-of-day term is off here (the
// steady-state figures have none); everything else runs as over any series.
func TestSeriesConstant(t *testing.T) {
	opt := seriesOptions
	opt.hourTerm = false
	for _, tc := range []struct {
		name string
		s    *spectra.Spectrum
		c    func(*Conditions)
	}{
		{"white coating", whiteSample(t), func(*Conditions) {}},
		{"selective emitter, humid", selectiveSample(), func(c *Conditions) { c.DewPointC, c.AmbientK = 22, 305 }},
		{"black body, dry and still", constSample(1, 250, 100000), func(c *Conditions) { c.DewPointC, c.HWm2K, c.AmbientK = -10, 2, 290 }},
		{"clamped window", constSample(0.9, 250, 100000), func(c *Conditions) { c.DewPointC, c.AmbientK = -60, 300 }},
	} {
		t.Run(tc.name, func(t *testing.T) {
			c := DefaultConditions()
			tc.c(&c)
			cells := fmt.Sprintf("%s,%s,%s", fmtG(c.AmbientK-273.15), fmtG(c.DewPointC), fmtG(c.IrradianceWm2))
			const n = 72
			ser := parseSeries(t, seriesText("", start, n, func(int) string { return cells }))
			f, m, _, hm := hourlyOf(t, tc.s, c, opt)
			hours := hm.run(ser)
			for i, h := range hours {
				// The steady-state figures are computed by Compute on
				// the spectral grid; the hourly model reads a table.
				if d := h.power - float64(f.CoolingPowerWm2); math.Abs(d) > 1e-6 {
					t.Fatalf("hour %d: power %.9f W/m², steady state %.9f", i, h.power, float64(f.CoolingPowerWm2))
				}
				if d := h.surfaceK - float64(f.CoolingTerms.EquilibriumK); math.Abs(d) > 1e-6 {
					t.Fatalf("hour %d: surface %.9f K, steady-state equilibrium %.9f K", i, h.surfaceK, float64(f.CoolingTerms.EquilibriumK))
				}
				if h.psun != float64(f.CoolingTerms.SolarWm2) {
					t.Fatalf("hour %d: sun %v, steady state %v", i, h.psun, float64(f.CoolingTerms.SolarWm2))
				}
			}
			sf := seriesFigures(ser, "test.csv", hours)
			want := math.Max(float64(f.CoolingPowerWm2), 0) * n / 1000
			if d := float64(sf.EnergyKWhM2) - want; math.Abs(d) > 1e-9 {
				t.Errorf("energy %.9f kWh/m², power × hours %.9f", float64(sf.EnergyKWhM2), want)
			}
			// n samples span n − 1 hours of trapezoids.
			if d := float64(sf.EnergyTrapezoidKWhM2) - want*(n-1)/n; math.Abs(d) > 1e-9 {
				t.Errorf("trapezoid %.9f kWh/m², want %.9f", float64(sf.EnergyTrapezoidKWhM2), want*(n-1)/n)
			}
			dep := float64(f.EquilibriumDeltaK)
			below := 0
			if dep > 0 {
				below = n
			}
			if sf.HoursBelowAir != below || math.Abs(float64(sf.MeanDepressionK)-dep) > 1e-6 || math.Abs(float64(sf.DeepestDepressionK)-dep) > 1e-6 {
				t.Errorf("hours below %d (want %d), mean depression %v, deepest %v; steady state %v", sf.HoursBelowAir, below,
					sf.MeanDepressionK, sf.DeepestDepressionK, dep)
			}
			if want := math.Max(dep, 0) * n; math.Abs(float64(sf.DegreeHoursBelowAir)-want) > 1e-4 {
				t.Errorf("degree-hours %v, want %v", sf.DegreeHoursBelowAir, want)
			}
			if len(sf.Days) != 3 || len(sf.Months) != 1 || sf.Days[0].Hours != 24 || sf.Months[0].Hours != n {
				t.Errorf("days %d, months %d", len(sf.Days), len(sf.Months))
			}
			_ = m
		})
	}
}

// TestSeriesHours: at every hour the model agrees with Compute at that
// hour's air temperature, dew point and irradiance (hour term off), which
// checks the tabulation at temperatures between its nodes; night hours
// absorb no sun.
func TestSeriesHours(t *testing.T) {
	opt := seriesOptions
	opt.hourTerm = false
	s := whiteSample(t)
	c := DefaultConditions()
	ser := parseSeries(t, seriesText("", start, 24, func(i int) string {
		ghi := math.Max(0, 950*math.Sin(math.Pi*float64(i-6)/12))
		if i < 6 || i > 18 {
			ghi = 0
		}
		air := 24 + 8*math.Sin(math.Pi*float64(i-9)/12) + 0.37
		return fmt.Sprintf("%s,%s,%.0f", fmtG(air), fmtG(12+2*math.Cos(float64(i))), ghi)
	}))
	f0, _, _, hm := hourlyOf(t, s, c, opt)
	night := 0
	for i, h := range hm.run(ser) {
		w := ser.Hours[i]
		if w.GlobalWm2 == 0 {
			night++
			if h.psun != 0 {
				t.Errorf("hour %d: no sun, but %v W/m² absorbed", i, h.psun)
			}
		} else if math.Abs(h.psun-float64(f0.CoolingTerms.SolarAbsorbed)*w.GlobalWm2) > 1e-9 {
			t.Errorf("hour %d: sun %v, want α G = %v", i, h.psun, float64(f0.CoolingTerms.SolarAbsorbed)*w.GlobalWm2)
		}
		cc := c
		cc.AmbientK, cc.DewPointC, cc.IrradianceWm2 = w.AirC+273.15, w.DewPointC, w.GlobalWm2
		f, err := compute(s, cc)
		if err != nil {
			t.Fatal(err)
		}
		want := f.CoolingPowerNightWm2
		if w.GlobalWm2 > 0 {
			want = f.CoolingPowerWm2
		}
		if math.Abs(h.power-float64(want)) > 1e-6 {
			t.Errorf("hour %d (air %.2f °C, G %g): power %.9f, Compute %.9f W/m²", i, w.AirC, w.GlobalWm2, h.power, float64(want))
		}
		wantT := f.CoolingTerms.EquilibriumNightK
		if w.GlobalWm2 > 0 {
			wantT = f.CoolingTerms.EquilibriumK
		}
		if math.Abs(h.surfaceK-float64(wantT)) > 1e-6 {
			t.Errorf("hour %d: surface %.9f K, Compute %.9f K", i, h.surfaceK, float64(wantT))
		}
	}
	if night < 11 {
		t.Errorf("%d night hours", night)
	}
}

// TestSeriesTerms: the hour, pressure, cloud and wind switches change the
// hour as their correlations say.
func TestSeriesTerms(t *testing.T) {
	s := whiteSample(t)
	c := DefaultConditions()
	ser := parseSeries(t, seriesText(",cloud fraction,wind speed (m/s),station pressure (hPa)", start, 24, func(i int) string {
		return "20,10,0,0.4,3,900"
	}))
	_, _, _, all := hourlyOf(t, s, c, seriesOptions)
	_, _, _, none := hourlyOf(t, s, c, hourlyOptions{})
	for i, w := range ser.Hours {
		a, n := all.hour(w), none.hour(w)
		// Berdahl & Martin (1984): hour term 0.013 cos(2π t/24) and
		// pressure term 0.00012 (P − 1000); Crawford & Duchon (1999):
		// c + (1 − c) ε; Watmuff et al. (1977): h = 2.8 + 3.0 V.
		clear := 0.711 + 0.56*0.1 + 0.73*0.01 + 0.013*math.Cos(2*math.Pi*float64(i)/24) + 0.00012*(900-1000)
		if math.Abs(a.clearSky-clear) > 1e-12 || math.Abs(a.sky-(0.4+0.6*clear)) > 1e-12 {
			t.Errorf("hour %d: clear %v, cloudy %v; want %v, %v", i, a.clearSky, a.sky, clear, 0.4+0.6*clear)
		}
		if a.h != 2.8+3.0*3 || n.h != c.HWm2K {
			t.Errorf("hour %d: h %v and %v", i, a.h, n.h)
		}
		if n.sky != BerdahlMartin(10) {
			t.Errorf("hour %d: no terms, sky %v", i, n.sky)
		}
		if !(a.power < n.power) {
			t.Errorf("hour %d: a cloudy sky cools less: %v vs clear %v", i, a.power, n.power)
		}
	}
}

// TestSeriesResidual substitutes each free-floating temperature back into
// the spectral balance it was solved from (computed on the cooling grid at
// the hour's air temperature and sky, not from the table): the residual is
// below 1e-6 W/m².
func TestSeriesResidual(t *testing.T) {
	for _, name := range []string{"inland-dry.csv", "coastal-humid.csv"} {
		ser := demoSeries(t, name)
		for _, s := range []*spectra.Spectrum{whiteSample(t), selectiveSample()} {
			c := DefaultConditions()
			_, m, o, hm := hourlyOf(t, s, c, seriesOptions)
			hours := hm.run(ser)
			worst := 0.0
			for i := 0; i < len(hours); i += 47 {
				h := hours[i]
				fw := blackbodyFraction(skyWindow.Lo, skyWindow.Hi, h.airK)
				ew := math.Max(0, math.Min(1, 1-(1-h.sky)/fw))
				sky := Sky{Model: skyModelClear, AmbientK: h.airK, Window: skyWindow, WindowHemisphericalEmissivity: Num(ew)}
				st := newCoolGrid(o.A, sky, c.ExchangeBand, h.airK).load(o.A, 1)
				if math.Abs(st.patm-h.patm) > 1e-7 {
					t.Fatalf("%s hour %d: P_atm %v, table %v", name, i, st.patm, h.patm)
				}
				r := st.net(h.surfaceK, h.psun, h.h)
				worst = math.Max(worst, math.Abs(r))
				_ = m
			}
			if worst > 1e-6 {
				t.Errorf("%s: largest residual %g W/m²", name, worst)
			}
		}
	}
}

// TestSeriesTrapezoid: over the demo series the hourly sum and the
// trapezoid rule agree within 1 %, in total and month by month.
func TestSeriesTrapezoid(t *testing.T) {
	for _, name := range []string{"inland-dry.csv", "coastal-humid.csv"} {
		ser := demoSeries(t, name)
		for _, s := range []*spectra.Spectrum{whiteSample(t), selectiveSample()} {
			c := DefaultConditions()
			f, m, _, hm := hourlyOf(t, s, c, seriesOptions)
			sf := seriesFigures(ser, name, hm.run(ser))
			_ = f
			_ = m
			rel := func(a, b Num) float64 { return math.Abs(float64(a)-float64(b)) / float64(b) }
			if r := rel(sf.EnergyTrapezoidKWhM2, sf.EnergyKWhM2); !(r < 0.01) {
				t.Errorf("%s: trapezoid %v, hourly sum %v kWh/m²", name, sf.EnergyTrapezoidKWhM2, sf.EnergyKWhM2)
			}
			for _, mo := range sf.Months {
				if r := rel(mo.EnergyTrapezoidKWhM2, mo.EnergyKWhM2); !(r < 0.01) {
					t.Errorf("%s %s: trapezoid %v, hourly sum %v kWh/m²", name, mo.Period, mo.EnergyTrapezoidKWhM2, mo.EnergyKWhM2)
				}
			}
			if sf.Hours != 8760 || len(sf.Days) != 365 || len(sf.Months) != 12 {
				t.Errorf("%s: %d hours, %d days, %d months", name, sf.Hours, len(sf.Days), len(sf.Months))
			}
			var sum float64
			for _, d := range sf.Days {
				sum += float64(d.EnergyKWhM2)
			}
			if math.Abs(sum-float64(sf.EnergyKWhM2)) > 1e-9 {
				t.Errorf("%s: days sum to %v, total %v", name, sum, sf.EnergyKWhM2)
			}
			if !(sf.EnergyKWhM2 > 0) || sf.HoursBelowAir == 0 || sf.Unbalanced != 0 {
				t.Errorf("%s: %+v", name, sf)
			}
			warmest := sf.Months[0]
			for _, mo := range sf.Months {
				if mo.MeanAirC > warmest.MeanAirC {
					warmest = mo
				}
			}
			if len(sf.TypicalDay.Hours) != 24 || sf.TypicalDay.Month != warmest.Period {
				t.Errorf("%s: typical day %s, %d hours", name, sf.TypicalDay.Month, len(sf.TypicalDay.Hours))
			}
			t.Logf("%s: %.1f kWh/m² (trapezoid %.1f), %d h below air, %.0f K·h, mean %.2f K, deepest %.2f K",
				name, float64(sf.EnergyKWhM2), float64(sf.EnergyTrapezoidKWhM2), sf.HoursBelowAir,
				float64(sf.DegreeHoursBelowAir), float64(sf.MeanDepressionK), float64(sf.DeepestDepressionK))
		}
	}
}

// TestComputeWithSeries: Compute runs the series named by the conditions
// and records its name and hash.
func TestComputeWithSeries(t *testing.T) {
	ser := demoSeries(t, "coastal-humid.csv")
	c := DefaultConditions()
	c.Weather = WeatherChoice{File: "weather/coastal-humid.csv", Series: ser}
	f, err := compute(whiteSample(t), c)
	if err != nil {
		t.Fatal(err)
	}
	w := f.Weather
	if w == nil || w.SHA256 != ser.Input.SHA256 || w.Series != ser.Name || w.File != "weather/coastal-humid.csv" || w.Hours != 8760 {
		t.Fatalf("weather %+v", w)
	}
	found := false
	for _, in := range f.Provenance.Inputs {
		found = found || in.SHA256 == ser.Input.SHA256
	}
	if !found {
		t.Error("the series is not among the inputs of the provenance")
	}
	if len(w.Cautions) == 0 || len(w.Assumptions) < 5 {
		t.Errorf("cautions %v, assumptions %v", w.Cautions, w.Assumptions)
	}
	c.Weather = WeatherChoice{File: "x.csv"}
	if _, err := compute(whiteSample(t), c); err == nil {
		t.Error("a series named but not read is accepted")
	}
	c.Weather = WeatherChoice{}
	if f, _ := compute(whiteSample(t), c); f.Weather != nil {
		t.Error("figures over a series without one")
	}
}

// BenchmarkSeriesYear runs the hourly model over a year (8,760 hours) for
// the white coating, after its steady-state figures: tabulation, hours
// and totals.
func BenchmarkSeriesYear(b *testing.B) {
	ser := demoSeries(b, "inland-dry.csv")
	s := whiteSample(b)
	c := DefaultConditions()
	f, m, o, _ := hourlyOf(b, s, c, seriesOptions)
	for b.Loop() {
		hm := m.hourly(f, o, seriesOptions)
		seriesFigures(ser, "inland-dry.csv", hm.run(ser))
	}
}

// BenchmarkComputeWithSeries is Compute of the white coating with and
// without a year's series.
func BenchmarkComputeWithSeries(b *testing.B) {
	ser := demoSeries(b, "inland-dry.csv")
	s := whiteSample(b)
	o := spectra.Resolve(s, spectra.DefaultClosureTol)
	for _, with := range []bool{false, true} {
		c := DefaultConditions()
		if with {
			c.Weather = WeatherChoice{File: "inland-dry.csv", Series: ser}
		}
		b.Run(fmt.Sprint("series=", with), func(b *testing.B) {
			for b.Loop() {
				if _, err := Compute(s, o, c); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
