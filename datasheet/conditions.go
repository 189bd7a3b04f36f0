package datasheet

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"

	"skysheet/datasheet/weather"
	"skysheet/spectra"
)

// Conditions are the bands, weightings and temperatures behind the figures.
// Every field is echoed in the output. Bands are in nm, whatever the unit
// their key is written in (thermal_band_um is written in µm). The zero
// value is not useful; start from [DefaultConditions].
//
// The conditions and their keys are listed once, in the table behind
// [Conditions.List], [Conditions.Set] and the JSON form; the keys are
// those of skysheet.yaml.
type Conditions struct {
	SolarBand     spectra.Interval // solar_band_nm
	SolarSpectrum SolarSpectrum    // solar_spectrum
	ThermalBand   spectra.Interval // thermal_band_um
	WindowBand    spectra.Interval // window_band_um
	TemperatureK  float64          // temperature_k: the blackbody of the thermal weighting
	ClosureTol    float64          // closure_tolerance

	// The cooling conditions: air temperature, dew point (drives the clear
	// sky), solar irradiance, non-radiative heat-transfer coefficient, the
	// thermal exchange band of the cooling integrals and the sky.
	AmbientK      float64          // ambient_k
	DewPointC     float64          // dew_point_c
	IrradianceWm2 float64          // irradiance_w_m2
	HWm2K         float64          // h_w_m2k
	ExchangeBand  spectra.Interval // exchange_band_um
	Sky           SkyChoice        // sky

	// The optional terms of the clear-sky correlation (Berdahl & Martin
	// 1984), off by default: the hour of the day, 0–24 h from local
	// midnight, and the station pressure in hPa. See [ClearSky].
	HourOfDay       Optional // hour_of_day
	StationPressure Optional // station_pressure_hpa
	// RefractiveIndex, when on, converts near-normal emittance data to
	// hemispherical for the cooling figures and the SRI, as a smooth
	// dielectric of this index (see docs/cooling.md).
	RefractiveIndex Optional // refractive_index

	// Weather names an hourly weather series to run the hourly model
	// over (docs/cooling.md, "Over a weather series"); none by default.
	Weather WeatherChoice // weather
}

// Optional is a condition that may be off (the zero value) or hold a
// value. Its text and JSON forms are "off" and null when off.
type Optional struct {
	V  float64 // the value, in the condition's unit
	On bool
}

// On returns an Optional that holds v.
func On(v float64) Optional { return Optional{V: v, On: true} }

// String returns the value, or "off".
func (o Optional) String() string {
	if !o.On {
		return "off"
	}
	return strconv.FormatFloat(o.V, 'g', -1, 64)
}

// MarshalJSON writes the value, or null when off.
func (o Optional) MarshalJSON() ([]byte, error) {
	if !o.On {
		return []byte("null"), nil
	}
	return json.Marshal(o.V)
}

// UnmarshalJSON reads a number, or null (off).
func (o *Optional) UnmarshalJSON(b []byte) error {
	var v *float64
	if err := json.Unmarshal(b, &v); err != nil {
		return err
	}
	*o = Optional{}
	if v != nil {
		*o = On(*v)
	}
	return nil
}

// DefaultConditions returns the defaults: solar 280–2500 nm under the ASTM
// G173-03 global tilt spectrum; thermal 2.5–25 µm and window 8–13 µm under a
// 300 K blackbody; closure tolerance 0.02; for cooling, air at 300 K, dew
// point 10 °C, 1000 W/m² of sun, h = 6 W m⁻² K⁻¹, exchange band 2.5–100 µm
// and the clear two-band sky.
func DefaultConditions() Conditions {
	return Conditions{
		SolarBand:     spectra.Interval{Lo: 280, Hi: 2500},
		SolarSpectrum: SunGlobal,
		ThermalBand:   spectra.Interval{Lo: 2500, Hi: 25000},
		WindowBand:    spectra.Interval{Lo: 8000, Hi: 13000},
		TemperatureK:  300,
		ClosureTol:    spectra.DefaultClosureTol,
		AmbientK:      300,
		DewPointC:     10,
		IrradianceWm2: 1000,
		HWm2K:         6,
		ExchangeBand:  spectra.Interval{Lo: 2500, Hi: 100000},
	}
}

// Weightings returns the weightings of the solar figures (the ASTM G173-03
// spectrum chosen) and of the thermal figures (Planck's law at the
// blackbody temperature).
func (c Conditions) Weightings() (solar, thermal spectra.Weighting) {
	return c.SolarSpectrum.Weighting(), spectra.Blackbody{K: c.TemperatureK}
}

// SolarSpectrum is the ASTM G173-03 spectrum that weights the solar
// figures. Its text form is "global" or "direct".
type SolarSpectrum int

// The solar spectra.
const (
	SunGlobal SolarSpectrum = iota // ASTM G173-03 global tilt
	SunDirect                      // ASTM G173-03 direct + circumsolar
)

// Weighting returns the spectrum's table.
func (s SolarSpectrum) Weighting() spectra.Weighting {
	if s == SunDirect {
		return spectra.SolarDirect()
	}
	return spectra.SolarGlobal()
}

// String returns "global" or "direct".
func (s SolarSpectrum) String() string {
	if s == SunDirect {
		return "direct"
	}
	return "global"
}

// MarshalText writes the text form.
func (s SolarSpectrum) MarshalText() ([]byte, error) { return []byte(s.String()), nil }

// UnmarshalText reads "global" or "direct".
func (s *SolarSpectrum) UnmarshalText(b []byte) error {
	switch string(b) {
	case "global":
		*s = SunGlobal
	case "direct":
		*s = SunDirect
	default:
		return fmt.Errorf("solar spectrum %q: want \"global\" or \"direct\"", b)
	}
	return nil
}

// SkyChoice is the sky the cooling figures are computed under: the clear
// two-band sky (the zero value) or a spectral sky read from a file. Its
// text form is "clear two-band" or the file's name.
type SkyChoice struct {
	// File names the spectral sky as written in the conditions; "" for
	// the clear two-band sky.
	File string
	// Spectrum is the spectral sky's data, a T column (zenith atmospheric
	// transmittance); whoever reads the conditions reads the file.
	Spectrum *spectra.Spectrum
}

// skyClearWords is the text form of the clear two-band sky.
const skyClearWords = "clear two-band"

// Clear reports whether the choice is the clear two-band sky.
func (s SkyChoice) Clear() bool { return s.File == "" }

// String returns "clear two-band" or the spectral sky's file.
func (s SkyChoice) String() string {
	if s.Clear() {
		return skyClearWords
	}
	return s.File
}

// MarshalText writes the text form.
func (s SkyChoice) MarshalText() ([]byte, error) { return []byte(s.String()), nil }

// UnmarshalText reads "clear two-band" (or nothing) as the clear sky and
// anything else as the name of a spectral sky file, whose Spectrum is then
// still to be read.
func (s *SkyChoice) UnmarshalText(b []byte) error {
	name := strings.TrimSpace(string(b))
	if name == skyClearWords {
		name = ""
	}
	*s = SkyChoice{File: name}
	return nil
}

// WeatherChoice names the hourly weather series of the conditions, if any.
// Its text form is the file's name, or "none".
type WeatherChoice struct {
	// File names the series as written in the conditions; "" for none.
	File string
	// Series is the series read; whoever reads the conditions reads the
	// file.
	Series *weather.Series
}

// weatherNoneWords is the text form of no series.
const weatherNoneWords = "none"

// String returns the file's name or "none".
func (w WeatherChoice) String() string {
	if w.File == "" {
		return weatherNoneWords
	}
	return w.File
}

// MarshalText writes the text form.
func (w WeatherChoice) MarshalText() ([]byte, error) { return []byte(w.String()), nil }

// UnmarshalText reads "none" (or nothing) as no series and anything else as
// the name of a series file, whose Series is then still to be read.
func (w *WeatherChoice) UnmarshalText(b []byte) error {
	name := strings.TrimSpace(string(b))
	if name == weatherNoneWords {
		name = ""
	}
	*w = WeatherChoice{File: name}
	return nil
}

// condition is one of the conditions; the table conditionTable describes
// each.
type condition int

// The conditions, in the order of the JSON output.
const (
	condSolarBand condition = iota
	condSolarSpectrum
	condThermalBand
	condWindowBand
	condTemperature
	condClosureTol
	condAmbient
	condDewPoint
	condIrradiance
	condH
	condExchangeBand
	condSky
	condHour
	condPressure
	condWeather
	condRefractive
	numConditions
)

// conditionTable describes every condition: its key in skysheet.yaml and
// JSON, its label and the unit its value is written in.
var conditionTable = [numConditions]struct{ key, label, unit string }{
	condSolarBand:     {"solar_band_nm", "Solar band", "nm"},
	condSolarSpectrum: {"solar_spectrum", "Solar spectrum", ""},
	condThermalBand:   {"thermal_band_um", "Thermal band", "µm"},
	condWindowBand:    {"window_band_um", "Window band", "µm"},
	condTemperature:   {"temperature_k", "Blackbody temperature", "K"},
	condClosureTol:    {"closure_tolerance", "Closure tolerance", ""},
	condAmbient:       {"ambient_k", "Air temperature", "K"},
	condDewPoint:      {"dew_point_c", "Dew point", "°C"},
	condIrradiance:    {"irradiance_w_m2", "Solar irradiance", "W/m²"},
	condH:             {"h_w_m2k", "Heat-transfer coefficient h", "W m⁻² K⁻¹"},
	condExchangeBand:  {"exchange_band_um", "Exchange band", "µm"},
	condSky:           {"sky", "Sky", ""},
	condHour:          {"hour_of_day", "Hour of day (sky term)", "h"},
	condPressure:      {"station_pressure_hpa", "Station pressure (sky term)", "hPa"},
	condWeather:       {"weather", "Weather series", ""},
	condRefractive:    {"refractive_index", "Refractive index (near-normal to hemispherical)", ""},
}

func (k condition) key() string { return conditionTable[k].key }

// conditionByKey returns the condition whose key is key.
func conditionByKey(key string) (condition, bool) {
	for k := range numConditions {
		if conditionTable[k].key == key {
			return k, true
		}
	}
	return 0, false
}

// field returns a pointer to the field of c that holds condition k.
func (k condition) field(c *Conditions) any {
	switch k {
	case condSolarBand:
		return &c.SolarBand
	case condSolarSpectrum:
		return &c.SolarSpectrum
	case condThermalBand:
		return &c.ThermalBand
	case condWindowBand:
		return &c.WindowBand
	case condTemperature:
		return &c.TemperatureK
	case condClosureTol:
		return &c.ClosureTol
	case condAmbient:
		return &c.AmbientK
	case condDewPoint:
		return &c.DewPointC
	case condIrradiance:
		return &c.IrradianceWm2
	case condH:
		return &c.HWm2K
	case condExchangeBand:
		return &c.ExchangeBand
	case condSky:
		return &c.Sky
	case condHour:
		return &c.HourOfDay
	case condPressure:
		return &c.StationPressure
	case condWeather:
		return &c.Weather
	case condRefractive:
		return &c.RefractiveIndex
	}
	panic("datasheet: unknown condition " + strconv.Itoa(int(k)))
}

// same reports whether a and b agree on condition k.
func (k condition) same(a, b Conditions) bool {
	switch p := k.field(&a).(type) {
	case *spectra.Interval:
		return *p == *k.field(&b).(*spectra.Interval)
	case *float64:
		return *p == *k.field(&b).(*float64)
	case *SolarSpectrum:
		return *p == *k.field(&b).(*SolarSpectrum)
	case *SkyChoice:
		return *p == *k.field(&b).(*SkyChoice)
	case *Optional:
		return *p == *k.field(&b).(*Optional)
	case *WeatherChoice:
		return *p == *k.field(&b).(*WeatherChoice)
	}
	return false
}

// text writes the value of condition k of c with its unit, e.g.
// "2.5–25 µm" or "ASTM G173-03 global tilt".
func (k condition) text(c Conditions) string {
	unit := conditionTable[k].unit
	switch p := k.field(&c).(type) {
	case *spectra.Interval:
		return bandText(*p, unit)
	case *float64:
		if unit == "" {
			return fmtShort(*p)
		}
		return fmtShort(*p) + " " + unit
	case *SolarSpectrum:
		return p.Weighting().String()
	case *SkyChoice:
		return p.String()
	case *Optional:
		if !p.On {
			return "off"
		}
		return fmtShort(p.V) + " " + unit
	case *WeatherChoice:
		return p.String()
	}
	return ""
}

// words describes condition k of c as a verdict's basis names it, e.g.
// "solar band 280–2500 nm"; "" when c does not use it (the dew point under
// a spectral sky).
func (k condition) words(c Conditions) string {
	switch k {
	case condSolarBand, condThermalBand, condWindowBand, condExchangeBand:
		return strings.ToLower(conditionTable[k].label) + " " + k.text(c)
	case condSolarSpectrum:
		return c.SolarSpectrum.Weighting().String() + " spectrum"
	case condTemperature:
		return "blackbody at " + k.text(c)
	case condClosureTol:
		return "closure tolerance " + k.text(c)
	case condSky:
		if c.Sky.Clear() {
			return "clear two-band sky"
		}
		return "spectral sky " + c.Sky.File
	case condDewPoint:
		if !c.Sky.Clear() {
			return ""
		}
		return "dew point " + k.text(c)
	case condAmbient:
		return "air at " + k.text(c)
	case condH:
		return "h " + k.text(c)
	case condIrradiance:
		return "sun " + k.text(c)
	case condHour, condPressure:
		if !c.Sky.Clear() || !k.field(&c).(*Optional).On {
			return ""
		}
		return strings.ToLower(conditionTable[k].label[:strings.Index(conditionTable[k].label, " (")]) + " " + k.text(c)
	case condWeather:
		if c.Weather.File == "" {
			return ""
		}
		return "weather series " + c.Weather.File
	case condRefractive:
		if !c.RefractiveIndex.On {
			return ""
		}
		return "near-normal emittance converted to hemispherical at n " + fmtShort(c.RefractiveIndex.V)
	}
	return k.key()
}

// ErrConditionType is wrapped by the errors of [Conditions.Set] for a value
// of the wrong type.
var ErrConditionType = errors.New("wrong type")

// Set sets the condition named by key (as in skysheet.yaml, e.g.
// "thermal_band_um") from a value in the key's own unit: a list of two
// numbers for a band, a number, or text for the solar spectrum and the sky
// (a spectral sky's Spectrum is left for the caller to read). A value of
// the wrong type is an error wrapping [ErrConditionType]; Set does not
// check that the value makes sense (see [Conditions.Validate]).
func (c *Conditions) Set(key string, v any) error {
	k, ok := conditionByKey(key)
	if !ok {
		return fmt.Errorf("%q is not a condition", key)
	}
	number := func(x any) (float64, bool) {
		switch x := x.(type) {
		case float64:
			return x, true
		case int:
			return float64(x), true
		case int64:
			return float64(x), true
		case uint64:
			return float64(x), true
		}
		return 0, false
	}
	unit := conditionTable[k].unit
	switch p := k.field(c).(type) {
	case *spectra.Interval:
		var xs []any
		switch v := v.(type) {
		case []any:
			xs = v
		case []float64:
			for _, x := range v {
				xs = append(xs, x)
			}
		case [2]float64:
			xs = []any{v[0], v[1]}
		default:
			return fmt.Errorf("%s: %w: want a list of 2 numbers in %s, such as [2.5, 25]", key, ErrConditionType, unit)
		}
		if len(xs) != 2 {
			return fmt.Errorf("%s: %w: want a list of 2 numbers, found %d items", key, ErrConditionType, len(xs))
		}
		lo, ok1 := number(xs[0])
		hi, ok2 := number(xs[1])
		if !ok1 || !ok2 {
			return fmt.Errorf("%s: %w: want a list of 2 numbers in %s", key, ErrConditionType, unit)
		}
		*p = bandFrom(lo, hi, unit)
	case *float64:
		x, ok := number(v)
		if !ok {
			return fmt.Errorf("%s: %w: want a number, found %v", key, ErrConditionType, quoted(v))
		}
		*p = x
	case *SolarSpectrum:
		s, ok := v.(string)
		if !ok {
			return fmt.Errorf("%s: %w: want global or direct, found %v", key, ErrConditionType, quoted(v))
		}
		return p.UnmarshalText([]byte(s))
	case *SkyChoice:
		s, ok := v.(string)
		if !ok {
			return fmt.Errorf("%s: %w: want %q or a file name, found %v", key, ErrConditionType, skyClearWords, quoted(v))
		}
		return p.UnmarshalText([]byte(s))
	case *Optional:
		if x, ok := number(v); ok {
			*p = On(x)
			return nil
		}
		if s, ok := v.(string); v == nil || ok && (s == "off" || s == "") {
			*p = Optional{}
			return nil
		}
		return fmt.Errorf("%s: %w: want a number in %s or off, found %v", key, ErrConditionType, unit, quoted(v))
	case *WeatherChoice:
		s, ok := v.(string)
		if !ok {
			return fmt.Errorf("%s: %w: want a weather series file name or %q, found %v", key, ErrConditionType, weatherNoneWords, quoted(v))
		}
		return p.UnmarshalText([]byte(s))
	}
	return nil
}

func quoted(v any) string {
	if s, ok := v.(string); ok {
		return strconv.Quote(s)
	}
	return fmt.Sprint(v)
}

// Condition is one of the conditions, described for people.
type Condition struct {
	Key   string // as in skysheet.yaml and JSON, e.g. "thermal_band_um"
	Label string // e.g. "Thermal band"
	Value string // with its unit, e.g. "2.5–25 µm"
	Off   bool   // an optional condition that is not in use ("off")
}

// Text returns the value of the condition named key with its unit, as
// [Conditions.List] gives it; "" for an unknown key.
func (c Conditions) Text(key string) string {
	if k, ok := conditionByKey(key); ok {
		return k.text(c)
	}
	return ""
}

// List returns every condition of c, in the order of the JSON output; the
// weather series only when one is named.
func (c Conditions) List() []Condition {
	out := make([]Condition, 0, numConditions)
	for k := range numConditions {
		if k == condWeather && c.Weather.File == "" {
			continue
		}
		x := Condition{Key: k.key(), Label: conditionTable[k].label, Value: k.text(c)}
		if o, ok := k.field(&c).(*Optional); ok {
			x.Off = !o.On
		}
		out = append(out, x)
	}
	return out
}

// MarshalJSON writes the conditions under their keys, bands in the unit
// their key names.
func (c Conditions) MarshalJSON() ([]byte, error) {
	var b bytes.Buffer
	b.WriteByte('{')
	for k := range numConditions {
		if k > 0 {
			b.WriteByte(',')
		}
		var v any
		switch p := k.field(&c).(type) {
		case *spectra.Interval:
			v = bandOut(*p, conditionTable[k].unit)
		default:
			v = p
		}
		data, err := json.Marshal(v)
		if err != nil {
			return nil, err
		}
		b.WriteString(strconv.Quote(k.key()))
		b.WriteByte(':')
		b.Write(data)
	}
	b.WriteByte('}')
	return b.Bytes(), nil
}

// UnmarshalJSON reads the form MarshalJSON writes; keys it does not know
// are ignored. A spectral sky's Spectrum is not read.
func (c *Conditions) UnmarshalJSON(data []byte) error {
	var m map[string]json.RawMessage
	if err := json.Unmarshal(data, &m); err != nil {
		return err
	}
	for k := range numConditions {
		raw, ok := m[k.key()]
		if !ok {
			continue
		}
		var v any
		if err := json.Unmarshal(raw, &v); err != nil {
			return err
		}
		if err := c.Set(k.key(), v); err != nil {
			return err
		}
	}
	return nil
}

// Validate reports the first condition that makes no sense.
func (c Conditions) Validate() error {
	band := func(k condition, b spectra.Interval) error {
		name, unit := strings.ToLower(conditionTable[k].label), conditionTable[k].unit
		lo, hi := bandOut(b, unit)[0], bandOut(b, unit)[1]
		if !(b.Lo > 0 && b.Hi > b.Lo) || math.IsInf(b.Hi, 0) {
			return fmt.Errorf("%s %g–%g %s: want 0 < low < high", name, lo, hi, unit)
		}
		if unit == "µm" && b.Hi > maxBandUM*1000 {
			return fmt.Errorf("%s %g–%g µm: the upper end may not pass %g µm", name, lo, hi, float64(maxBandUM))
		}
		return nil
	}
	if err := band(condSolarBand, c.SolarBand); err != nil {
		return err
	}
	if r := spectra.SolarRangeNM; c.SolarBand.Lo < r.Lo || c.SolarBand.Hi > r.Hi {
		return fmt.Errorf("solar band %g–%g nm: the ASTM G173-03 tables cover only %g–%g nm", c.SolarBand.Lo, c.SolarBand.Hi, r.Lo, r.Hi)
	}
	if c.SolarSpectrum != SunGlobal && c.SolarSpectrum != SunDirect {
		return fmt.Errorf("solar spectrum %d: want global or direct", int(c.SolarSpectrum))
	}
	if err := band(condThermalBand, c.ThermalBand); err != nil {
		return err
	}
	if err := band(condWindowBand, c.WindowBand); err != nil {
		return err
	}
	if !(c.TemperatureK > 0) || math.IsInf(c.TemperatureK, 0) {
		return fmt.Errorf("temperature %g K: want a positive temperature in kelvin", c.TemperatureK)
	}
	if !(c.ClosureTol >= 0) || c.ClosureTol > 1 {
		return fmt.Errorf("closure tolerance %g: want 0..1", c.ClosureTol)
	}
	if n := c.RefractiveIndex; n.On && !(n.V > 1 && n.V <= maxRefractiveIndex) {
		return fmt.Errorf("refractive index %g: want a real index above 1 and at most %g, or off", n.V, float64(maxRefractiveIndex))
	}
	if c.Weather.File != "" && c.Weather.Series == nil {
		return fmt.Errorf("weather series %q: the file was not read", c.Weather.File)
	}
	return c.validateCooling()
}

// maxBandUM is the longest wavelength, in µm, that a thermal, window or
// exchange band may reach: far beyond any thermal figure, and a bound on the
// work a Planck-weighted integral may take.
const maxBandUM = 1000

// bandFrom returns the band lo–hi given in unit ("nm" or "µm") in nm.
func bandFrom(lo, hi float64, unit string) spectra.Interval {
	if unit == "µm" {
		return spectra.IntervalUM(lo, hi)
	}
	return spectra.Interval{Lo: lo, Hi: hi}
}

// bandOut returns band b (nm) in unit ("nm" or "µm").
func bandOut(b spectra.Interval, unit string) [2]float64 {
	if unit == "µm" {
		lo, hi := b.UM()
		return [2]float64{lo, hi}
	}
	return [2]float64{b.Lo, b.Hi}
}

// bandText writes band b (nm) in unit: "2.5–25 µm"; "" without a unit.
func bandText(b spectra.Interval, unit string) string {
	if unit == "" {
		return ""
	}
	v := bandOut(b, unit)
	return fmtShort(v[0]) + "–" + fmtShort(v[1]) + " " + unit
}

// umToNM converts a wavelength in µm to nm (see [spectra.IntervalUM]).
func umToNM(um float64) float64 { return spectra.IntervalUM(um, um).Lo }

// fmtShort writes x in the shortest form that reads back to it.
func fmtShort(x float64) string { return strconv.FormatFloat(x, 'g', -1, 64) }
