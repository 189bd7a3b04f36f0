package datasheet

import (
	"encoding/json"
	"errors"
	"strings"
	"testing"

	"skysheet/spectra"
)

// TestConditionsJSON checks the JSON form of the conditions: the keys of
// skysheet.yaml in table order, bands in the unit their key names, and a
// round trip.
func TestConditionsJSON(t *testing.T) {
	// The schema documented in the README (conditions of figures.json).
	const want = `{"solar_band_nm":[280,2500],"solar_spectrum":"global","thermal_band_um":[2.5,25],` +
		`"window_band_um":[8,13],"temperature_k":300,"closure_tolerance":0.02,"ambient_k":300,"dew_point_c":10,` +
		`"irradiance_w_m2":1000,"h_w_m2k":6,"exchange_band_um":[2.5,100],"sky":"clear two-band",` +
		`"hour_of_day":null,"station_pressure_hpa":null,"weather":"none","refractive_index":null}`
	c := DefaultConditions()
	got, err := json.Marshal(c)
	if err != nil || string(got) != want {
		t.Fatalf("JSON %s, %v\nwant %s", got, err, want)
	}
	var back Conditions
	if err := json.Unmarshal(got, &back); err != nil || back != c {
		t.Errorf("round trip: %+v, %v", back, err)
	}
	// An optional condition that is on is written as its number.
	c.HourOfDay, c.StationPressure = On(3.5), On(950)
	got, _ = json.Marshal(c)
	if !strings.Contains(string(got), `"hour_of_day":3.5,"station_pressure_hpa":950,`) {
		t.Errorf("JSON %s", got)
	}
	back = Conditions{}
	if err := json.Unmarshal(got, &back); err != nil || back != c {
		t.Errorf("round trip: %+v, %v", back, err)
	}
	for _, off := range []any{nil, "off", ""} {
		if err := back.Set("hour_of_day", off); err != nil || back.HourOfDay.On {
			t.Errorf("Set(hour_of_day, %v): %v, %+v", off, err, back.HourOfDay)
		}
	}
	if err := back.Set("hour_of_day", "noon"); !errors.Is(err, ErrConditionType) {
		t.Errorf("Set(hour_of_day, noon): %v", err)
	}
	var keys []string
	for _, x := range c.List() {
		keys = append(keys, `"`+x.Key+`":`)
	}
	for i, k := range keys {
		if j := strings.Index(want, k); j < 0 || i > 0 && j < strings.Index(want, keys[i-1]) {
			t.Errorf("key %s of List is not in JSON order", k)
		}
	}
}

// TestConditionsSet checks setting conditions by key: µm bands are held in
// nm without float noise (8.7 µm × 1000 is not 8700 in every float
// product; the decimal point is moved instead), and values of the wrong
// type are refused.
func TestConditionsSet(t *testing.T) {
	c := DefaultConditions()
	for _, tt := range []struct {
		key string
		v   any
	}{
		{"thermal_band_um", []any{8.7, 13.1}},
		{"solar_band_nm", [2]float64{300, 2400}},
		{"window_band_um", []float64{0.3, 0.7}},
		{"temperature_k", 290},
		{"solar_spectrum", "direct"},
		{"sky", "skies/dry.csv"},
		{"weather", "../weather/site.csv"},
	} {
		if err := c.Set(tt.key, tt.v); err != nil {
			t.Fatalf("Set(%s, %v): %v", tt.key, tt.v, err)
		}
	}
	if c.ThermalBand != (spectra.Interval{Lo: 8700, Hi: 13100}) || c.SolarBand != (spectra.Interval{Lo: 300, Hi: 2400}) ||
		c.WindowBand != (spectra.Interval{Lo: 300, Hi: 700}) || c.TemperatureK != 290 || c.SolarSpectrum != SunDirect ||
		c.Sky.File != "skies/dry.csv" || c.Weather.File != "../weather/site.csv" {
		t.Errorf("conditions %+v", c)
	}
	if got := c.Text("thermal_band_um"); got != "8.7–13.1 µm" {
		t.Errorf("thermal band text %q", got)
	}
	if got := c.Text("window_band_um"); got != "0.3–0.7 µm" {
		t.Errorf("window band text %q", got)
	}
	data, _ := json.Marshal(c)
	if !strings.Contains(string(data), `"thermal_band_um":[8.7,13.1]`) || !strings.Contains(string(data), `"window_band_um":[0.3,0.7]`) {
		t.Errorf("JSON %s", data)
	}
	for _, tt := range []struct {
		key string
		v   any
	}{
		{"temperature_k", "hot"},
		{"thermal_band_um", []any{8}},
		{"thermal_band_um", "8-13"},
		{"solar_spectrum", 3.0},
		{"weather", 1.0},
	} {
		if err := c.Set(tt.key, tt.v); !errors.Is(err, ErrConditionType) {
			t.Errorf("Set(%s, %v) = %v, want ErrConditionType", tt.key, tt.v, err)
		}
	}
	if err := c.Set("solar_spectrum", "noon"); err == nil || errors.Is(err, ErrConditionType) {
		t.Errorf("unknown spectrum: %v", err)
	}
	if err := c.Set("solar_band", []any{1, 2}); err == nil {
		t.Error("unknown key accepted")
	}
	if err := c.Set("sky", "clear two-band"); err != nil || !c.Sky.Clear() {
		t.Errorf("clear sky: %+v, %v", c.Sky, err)
	}
	if err := c.Set("weather", "none"); err != nil || c.Weather.File != "" {
		t.Errorf("no weather: %+v, %v", c.Weather, err)
	}
}
