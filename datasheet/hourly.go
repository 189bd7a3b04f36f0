package datasheet

import (
	"fmt"
	"math"
	"time"

	"skysheet/datasheet/weather"
	"skysheet/spectra"
)

// The hourly model runs the cooling balance of docs/cooling.md once per hour
// of a weather series (docs/cooling.md, "Over a weather series"). What does
// not change between hours is computed once: the emittance is folded into
// per-node weights of the cooling grid, split into the atmospheric window
// of the two-band sky and the rest of the exchange band, and the radiated
// powers E_win(T) = π ∫_win ε B(λ, T) dλ and E_out(T) (the rest) are
// tabulated against temperature at 1 K steps, with their derivatives, and
// read between by cubic Hermite interpolation. For P ∝ T⁴ the error of that
// interpolation is below 24 σ/384 ≈ 4e-9 W/m² (the Hermite remainder
// f⁗ h⁴/384); against the spectral sum it is tested to 1e-6 W/m².
//
// Each hour then costs a few table look-ups: with the two-band sky, whose
// hemispherical emissivity is 1 outside the window and e_w inside,
//
//	P_atm = E_out(T_air) + e_w E_win(T_air)
//	P_net(T_s) = E_win(T_s) + E_out(T_s) − P_atm − α G − h (T_air − T_s).

// hourlyOptions are the model's switches; the zero value is not used (see
// seriesOptions).
type hourlyOptions struct {
	hourTerm     bool // add the Berdahl–Martin hour-of-day term
	pressureTerm bool // add the station-pressure term where the series has pressure
	clouds       bool // apply the cloud correction where the series has a cloud fraction
	wind         bool // h from the wind speed where the series has it
}

// seriesOptions is the model the figures use.
var seriesOptions = hourlyOptions{hourTerm: true, pressureTerm: true, clouds: true, wind: true}

// hourResult is the model's result for one hour.
type hourResult struct {
	t          time.Time
	airK       float64
	ghi        float64 // global horizontal irradiance, W/m²
	clearSky   float64 // clear-sky broadband emissivity, with the terms used
	sky        float64 // with the cloud correction
	windowHemi float64 // e_w, hemispherical sky emissivity in the window
	h          float64 // W m⁻² K⁻¹
	psun       float64 // absorbed sunlight, W/m²
	patm       float64 // absorbed from the sky at T_s = T_air, W/m²
	prad       float64 // radiated at T_air, W/m²
	power      float64 // P_net at T_s = T_air, W/m²
	surfaceK   float64 // free-floating steady-state temperature; NaN when none balances
}

// radTable holds E_win and E_out against temperature for one emittance.
type radTable struct {
	wWin, wOut []float64 // per node of the grid: π Σ (Δλ/2) ε, split by the window
	c1, x      []float64 // the grid's Planck factors: B = c1/expm1(x/T)
	have       []bool    // per kelvin: tabulated
	v          [][4]float64
}

// radTableMaxK bounds the table; above it (and below 1 K) the sums are
// evaluated directly.
const radTableMaxK = 4000

func newRadTable(g *coolGrid, a spectra.Series) *radTable {
	t := &radTable{wWin: make([]float64, len(g.nodes)), wOut: make([]float64, len(g.nodes)), c1: g.c1, x: g.x,
		have: make([]bool, radTableMaxK+1), v: make([][4]float64, radTableMaxK+1)}
	for _, sp := range g.spans {
		x0, x1 := g.nodes[sp.a], g.nodes[sp.a+1]
		d := math.Pi * (x1 - x0) / 2
		w := t.wOut
		if m := (x0 + x1) / 2; m > skyWindow.Lo && m < skyWindow.Hi {
			w = t.wWin
		}
		w[sp.a] += d * sp.left.eval(a)
		w[sp.a+1] += d * sp.right.eval(a)
	}
	return t
}

// exact returns E_win, E_out and their derivatives with temperature at k
// kelvin by the sums over the grid.
func (t *radTable) exact(k float64) (r [4]float64) {
	inv := 1 / k
	for i, c1 := range t.c1 {
		ww, wo := t.wWin[i], t.wOut[i]
		if ww == 0 && wo == 0 {
			continue
		}
		xi := t.x[i] * inv
		e := math.Exp(xi)
		if math.IsInf(e, 1) {
			continue
		}
		b := c1 / (e - 1)
		db := b * xi * inv * e / (e - 1) // ∂B/∂T
		r[0] += ww * b
		r[1] += wo * b
		r[2] += ww * db
		r[3] += wo * db
	}
	return r
}

// node returns the tabulated values at k kelvin, computing them once.
func (t *radTable) node(k int) [4]float64 {
	if !t.have[k] {
		t.v[k], t.have[k] = t.exact(float64(k)), true
	}
	return t.v[k]
}

// at returns E_win(T) and E_out(T), W/m².
func (t *radTable) at(T float64) (win, out float64) {
	if !(T >= 1 && T < radTableMaxK) {
		r := t.exact(T)
		return r[0], r[1]
	}
	k := int(T)
	s := T - float64(k)
	a, b := t.node(k), t.node(k+1)
	s2, s3 := s*s, s*s*s
	h00, h10, h01, h11 := 2*s3-3*s2+1, s3-2*s2+s, -2*s3+3*s2, s3-s2
	win = h00*a[0] + h10*a[2] + h01*b[0] + h11*b[2]
	out = h00*a[1] + h10*a[3] + h01*b[1] + h11*b[3]
	return win, out
}

// total returns E_win(T) + E_out(T).
func (t *radTable) total(T float64) float64 {
	w, o := t.at(T)
	return w + o
}

// hourlyModel runs the balance hour by hour for one emittance.
type hourlyModel struct {
	tab      *radTable
	absorbed float64 // fraction of the global horizontal irradiance absorbed
	hDefault float64 // h when the series has no wind
	opt      hourlyOptions
}

// windowHemispherical returns e_w, the hemispherical emissivity inside the
// atmospheric window of the clear two-band sky whose broadband emissivity
// is eps at airK: the sky of [TwoBandSky]. It is the one place the hourly
// model depends on how the two-band sky is calibrated; TestSeriesConstant
// checks it against the steady-state figures.
func windowHemispherical(eps, airK float64) float64 {
	_, ew, _ := windowCalibration(eps, airK)
	return ew
}

// hour runs the model for one hour of weather.
func (m *hourlyModel) hour(w weather.Hour) hourResult {
	r := hourResult{t: w.Time, airK: w.AirC + 273.15, ghi: w.GlobalWm2}
	dew := math.Min(w.DewPointC, w.AirC)
	eps := BerdahlMartin(dew)
	if m.opt.hourTerm {
		eps += weather.HourTerm(weather.HourOfDay(w.Time))
	}
	if m.opt.pressureTerm && !math.IsNaN(w.PressureHPa) {
		eps += weather.PressureTerm(w.PressureHPa)
	}
	eps = math.Max(0, math.Min(1, eps))
	r.clearSky, r.sky = eps, eps
	if m.opt.clouds && !math.IsNaN(w.CloudFraction) {
		r.sky = weather.CloudySkyEmissivity(eps, w.CloudFraction)
	}
	r.windowHemi = windowHemispherical(r.sky, r.airK)
	r.h = m.hDefault
	if m.opt.wind && !math.IsNaN(w.WindMS) {
		r.h = weather.ConvectiveH(w.WindMS)
	}
	r.psun = m.absorbed * w.GlobalWm2
	win, out := m.tab.at(r.airK)
	r.prad = win + out
	r.patm = out + r.windowHemi*win
	r.power = r.prad - r.patm - r.psun
	f := func(ts float64) float64 { return m.tab.total(ts) - r.patm - r.psun - r.h*(r.airK-ts) }
	ts, err := increasingRoot(f, r.airK, 0.05*r.airK, 10*r.airK)
	if err != nil {
		ts = math.NaN()
	}
	r.surfaceK = ts
	return r
}

// run runs the model over every hour of s.
func (m *hourlyModel) run(s *weather.Series) []hourResult {
	out := make([]hourResult, len(s.Hours))
	for i, w := range s.Hours {
		out[i] = m.hour(w)
	}
	return out
}

// SeriesFigures are the figures of a material over an hourly weather series
// (docs/cooling.md, "Over a weather series"): (a) a panel held at the air
// temperature, whose net cooling power counts where it is positive, and
// (b) a free-floating surface in steady state each hour. Energies are in
// kWh/m², temperature differences in K (positive below the air).
type SeriesFigures struct {
	Series string `json:"series"` // the series' name
	File   string `json:"file"`   // as the conditions name it
	SHA256 string `json:"sha256"` // of the file's bytes
	Hours  int    `json:"hours"`
	From   string `json:"from"` // first hour, RFC 3339 with the file's offset
	To     string `json:"to"`   // last hour

	// Held at the air temperature: the positive part of the net cooling
	// power summed hour by hour (each hour's value held over the hour) and
	// integrated by the trapezoid rule between the hours.
	EnergyKWhM2          Num `json:"energy_kwh_m2"`
	EnergyTrapezoidKWhM2 Num `json:"energy_trapezoid_kwh_m2"`

	// Free-floating: hours whose steady-state surface temperature is below
	// the air, their degree-hours (K·h), the mean of T_air − T_s over all
	// hours and the deepest depression (the largest T_air − T_s). P_net
	// grows with T_s, so the hours below the air are also the hours with a
	// positive net cooling power at the air temperature.
	HoursBelowAir       int `json:"hours_below_air"`
	DegreeHoursBelowAir Num `json:"degree_hours_below_air_kh"`
	MeanDepressionK     Num `json:"mean_depression_k"`
	DeepestDepressionK  Num `json:"deepest_depression_k"`
	// Unbalanced counts the hours where no surface temperature balances
	// (left out of the free-floating figures).
	Unbalanced int `json:"unbalanced_hours"`

	Months     []SeriesPeriod `json:"months"`
	Days       []SeriesPeriod `json:"days"`
	TypicalDay TypicalDay     `json:"typical_day"`

	Assumptions []string `json:"assumptions"`
	Cautions    []string `json:"cautions"`
}

// SeriesPeriod sums one calendar day or month of a series, on the clock of
// the file's UTC offset. Period is "2025-07" or "2025-07-14".
type SeriesPeriod struct {
	Period               string `json:"period"`
	Hours                int    `json:"hours"`
	EnergyKWhM2          Num    `json:"energy_kwh_m2"`
	EnergyTrapezoidKWhM2 Num    `json:"energy_trapezoid_kwh_m2"`
	HoursBelowAir        int    `json:"hours_below_air"`
	DegreeHoursBelowAir  Num    `json:"degree_hours_below_air_kh"`
	MeanDepressionK      Num    `json:"mean_depression_k"`
	DeepestDepressionK   Num    `json:"deepest_depression_k"`
	MeanAirC             Num    `json:"mean_air_c"`
}

// TypicalDay is the mean day, hour by hour of the clock, of the month whose
// mean air temperature is highest.
type TypicalDay struct {
	Month string            `json:"month"`
	Hours []TypicalDayPoint `json:"hours"`
}

// TypicalDayPoint is one hour of the clock of the typical day: means over
// the month's days.
type TypicalDayPoint struct {
	Hour     int `json:"hour"` // 0..23
	AirC     Num `json:"air_c"`
	PowerWm2 Num `json:"power_w_m2"` // net at T_s = T_air, sign kept
	SurfaceC Num `json:"surface_c"`  // free-floating
	SunWm2   Num `json:"sun_w_m2"`   // global horizontal irradiance
}

// seriesCautions go with every set of series figures.
var seriesCautions = []string{
	"An hourly model, not a measurement: the energy and hours below the air are computed from the spectra and an invented or recorded weather series, not observed on a panel.",
	"Real output depends on soiling, ageing, dew and frost on the surface, and local weather and surroundings (shade, walls, wind at the surface) that the series does not hold.",
	"Cooling of buildings and equipment defers to licensed design, local codes and measured performance.",
}

// seriesFigures summarises the hours of series s.
func seriesFigures(s *weather.Series, file string, hours []hourResult) *SeriesFigures {
	f := &SeriesFigures{Series: s.Name, File: file, SHA256: s.Input.SHA256, Hours: len(hours),
		Months: []SeriesPeriod{}, Days: []SeriesPeriod{}, Cautions: append([]string(nil), seriesCautions...)}
	if len(hours) == 0 {
		return f
	}
	f.From, f.To = hours[0].t.Format(time.RFC3339), hours[len(hours)-1].t.Format(time.RFC3339)
	useful := func(i int) float64 { return math.Max(hours[i].power, 0) }
	type acc struct {
		p                       *SeriesPeriod
		sum, trap, dh, dep, air float64
		n, cool, below, nDep    int
		deepest                 float64
	}
	add := func(a *acc, i int) {
		h := hours[i]
		a.n++
		a.sum += useful(i)
		if i+1 < len(hours) {
			a.trap += (useful(i) + useful(i+1)) / 2
		}
		a.air += h.airK - 273.15
		if d := h.airK - h.surfaceK; !math.IsNaN(d) {
			a.nDep++
			a.dep += d
			a.deepest = math.Max(a.deepest, d)
			if d > 0 {
				a.below++
				a.dh += d
			}
		}
	}
	finish := func(a *acc) {
		p := a.p
		p.Hours, p.HoursBelowAir = a.n, a.below
		p.EnergyKWhM2, p.EnergyTrapezoidKWhM2 = Num(a.sum/1000), Num(a.trap/1000)
		p.DegreeHoursBelowAir = Num(a.dh)
		p.MeanAirC = Num(a.air / float64(a.n))
		p.MeanDepressionK, p.DeepestDepressionK = Num(math.NaN()), Num(math.NaN())
		if a.nDep > 0 {
			p.MeanDepressionK, p.DeepestDepressionK = Num(a.dep/float64(a.nDep)), Num(a.deepest)
		}
	}
	total := acc{p: &SeriesPeriod{}, deepest: math.Inf(-1)}
	var day, month *acc
	var days, months []*acc
	for i, h := range hours {
		d, mo := h.t.Format("2006-01-02"), h.t.Format("2006-01")
		if day == nil || day.p.Period != d {
			day = &acc{p: &SeriesPeriod{Period: d}, deepest: math.Inf(-1)}
			days = append(days, day)
		}
		if month == nil || month.p.Period != mo {
			month = &acc{p: &SeriesPeriod{Period: mo}, deepest: math.Inf(-1)}
			months = append(months, month)
		}
		add(&total, i)
		add(day, i)
		add(month, i)
		if math.IsNaN(h.surfaceK) {
			f.Unbalanced++
		}
	}
	finish(&total)
	for _, a := range days {
		finish(a)
		f.Days = append(f.Days, *a.p)
	}
	for _, a := range months {
		finish(a)
		f.Months = append(f.Months, *a.p)
	}
	t := total.p
	f.EnergyKWhM2, f.EnergyTrapezoidKWhM2 = t.EnergyKWhM2, t.EnergyTrapezoidKWhM2
	f.HoursBelowAir, f.DegreeHoursBelowAir = t.HoursBelowAir, t.DegreeHoursBelowAir
	f.MeanDepressionK, f.DeepestDepressionK = t.MeanDepressionK, t.DeepestDepressionK
	f.TypicalDay = typicalDay(hours, f.Months)
	return f
}

// typicalDay returns the mean day of the warmest month.
func typicalDay(hours []hourResult, months []SeriesPeriod) TypicalDay {
	best := -1
	for i, m := range months {
		if best < 0 || m.MeanAirC > months[best].MeanAirC {
			best = i
		}
	}
	td := TypicalDay{Hours: []TypicalDayPoint{}}
	if best < 0 {
		return td
	}
	td.Month = months[best].Period
	var sum [24][5]float64
	var n, nSurf [24]int
	for _, h := range hours {
		if h.t.Format("2006-01") != td.Month {
			continue
		}
		k := h.t.Hour()
		n[k]++
		sum[k][0] += h.airK - 273.15
		sum[k][1] += h.power
		sum[k][3] += h.ghi
		if !math.IsNaN(h.surfaceK) {
			nSurf[k]++
			sum[k][2] += h.surfaceK - 273.15
		}
	}
	for k := range 24 {
		if n[k] == 0 {
			continue
		}
		p := TypicalDayPoint{Hour: k, AirC: Num(sum[k][0] / float64(n[k])), PowerWm2: Num(sum[k][1] / float64(n[k])),
			SurfaceC: Num(math.NaN()), SunWm2: Num(sum[k][3] / float64(n[k]))}
		if nSurf[k] > 0 {
			p.SurfaceC = Num(sum[k][2] / float64(nSurf[k]))
		}
		td.Hours = append(td.Hours, p)
	}
	return td
}

// addSeries runs the hourly model over the conditions' weather series and
// stores the result in f.Weather. f holds the steady-state figures of o.
func (m *cooling) addSeries(f *Figures, o spectra.Optics) {
	s := m.c.Weather.Series
	if s == nil {
		return
	}
	if m.g == nil || math.IsNaN(float64(f.SolarAbsorptance)) {
		f.Weather = &SeriesFigures{Series: s.Name, File: m.c.Weather.File, SHA256: s.Input.SHA256, Hours: len(s.Hours),
			EnergyKWhM2: Num(math.NaN()), EnergyTrapezoidKWhM2: Num(math.NaN()), DegreeHoursBelowAir: Num(math.NaN()),
			MeanDepressionK: Num(math.NaN()), DeepestDepressionK: Num(math.NaN()), Months: []SeriesPeriod{}, Days: []SeriesPeriod{},
			TypicalDay: TypicalDay{Hours: []TypicalDayPoint{}}, Cautions: append([]string(nil), seriesCautions...),
			Assumptions: []string{"The series figures need emittance data in the exchange band and a solar absorptance; this sample lacks one of them."}}
		return
	}
	hm := m.hourly(f, o, seriesOptions)
	hours := hm.run(s)
	f.Weather = seriesFigures(s, m.c.Weather.File, hours)
	f.Weather.Assumptions = m.seriesAssumptions(s, hm.absorbed, f.Weather)
}

// hourly returns the hourly model of o, whose steady-state figures are f.
// The cooling grid must have been built for o.A.
func (m *cooling) hourly(f *Figures, o spectra.Optics, opt hourlyOptions) *hourlyModel {
	return &hourlyModel{tab: newRadTable(m.g, o.A), absorbed: absorbedFraction(f, m.c), hDefault: m.c.HWm2K, opt: opt}
}

// absorbedFraction returns the fraction of the sun's irradiance the
// steady-state figures absorb.
func absorbedFraction(f *Figures, c Conditions) float64 {
	if c.IrradianceWm2 > 0 && !math.IsNaN(float64(f.CoolingTerms.SolarWm2)) {
		return float64(f.CoolingTerms.SolarWm2) / c.IrradianceWm2
	}
	return float64(f.SolarAbsorptance)
}

// seriesAssumptions states the hourly model in sentences.
func (m *cooling) seriesAssumptions(s *weather.Series, absorbed float64, f *SeriesFigures) []string {
	var out []string
	terms := "its hour-of-day term"
	if s.Has(weather.StationPressure) {
		terms += " and its station-pressure term"
	}
	out = append(out, fmt.Sprintf("Each hour of %s: the clear-sky emissivity from the hour's dew point by the Berdahl & Martin (1984) "+
		"correlation with %s, in the clear two-band sky calibrated as for the steady-state figures.", s.Name, terms))
	if s.Has(weather.CloudFraction) {
		out = append(out, "Clouds: ε = c + (1 − c) ε_clear with the hour's cloud fraction c (Crawford & Duchon 1999), "+
			"clouds taken as blackbodies at the air temperature: the largest effect a cover can have.")
	} else {
		out = append(out, "The series gives no cloud fraction: every hour is taken as clear.")
	}
	out = append(out, fmt.Sprintf("Sun: the %s shape scaled to the hour's global horizontal irradiance, %.4f of it absorbed "+
		"(as in the steady-state figures); the surface is horizontal.", m.sun, absorbed))
	if s.Has(weather.WindSpeed) {
		out = append(out, "Non-radiative exchange: h = 2.8 + 3.0 V W m⁻² K⁻¹ from the hour's wind speed V (Watmuff, Charters & Proctor 1977); "+
			"a station's wind at 10 m is stronger than at a roof, so h is an upper estimate.")
	} else {
		out = append(out, fmt.Sprintf("Non-radiative exchange: the series gives no wind; h = %s W m⁻² K⁻¹ every hour, as in the conditions.", fmtG(m.c.HWm2K)))
	}
	out = append(out, "Held at the air temperature (heat removed behind the panel): the net cooling power each hour, "+
		"of which only the positive part counts as useful energy.",
		"Free-floating: the surface temperature that balances each hour in steady state; its thermal mass is neglected, "+
			"so it follows the weather at once (a real surface lags and smooths it). Latent heat of dew or frost is left out.")
	if d := float64(f.EnergyKWhM2); d > 0 {
		out = append(out, fmt.Sprintf("Energy: the hourly sum (each hour's power held over the hour) is %.3f kWh/m²; "+
			"the trapezoid rule between the hours gives %.3f kWh/m² (%+.2f %%).", d, float64(f.EnergyTrapezoidKWhM2),
			100*(float64(f.EnergyTrapezoidKWhM2)-d)/d))
	}
	if !m.c.Sky.Clear() {
		out = append(out, "The conditions' spectral sky is not used over the series: each hour's sky comes from its dew point.")
	}
	out = append(out, "The series gives the air temperature, dew point and sun of each hour: the conditions' air temperature, "+
		"dew point, irradiance and optional sky terms apply to the steady-state figures only.")
	if f.Unbalanced > 0 {
		out = append(out, fmt.Sprintf("In %d hours no surface temperature balances; they are left out of the free-floating figures.", f.Unbalanced))
	}
	return out
}

// Totals returns a copy of f with the totals and the months only: no days,
// no typical day, no assumptions (catalog.json and the summaries a site
// keeps of each material carry this; figures.json has everything).
func (f *SeriesFigures) Totals() *SeriesFigures {
	if f == nil {
		return nil
	}
	t := *f
	t.Days, t.TypicalDay, t.Assumptions = []SeriesPeriod{}, TypicalDay{Hours: []TypicalDayPoint{}}, []string{}
	return &t
}
