package weather

import (
	"math"
	"time"
)

// ConvectiveMaxWindMS is the highest wind speed (m/s) of the measurements
// behind [ConvectiveH] (from memory); above it the correlation extrapolates.
const ConvectiveMaxWindMS = 7

// ConvectiveH returns the non-radiative (convective) heat-transfer
// coefficient, W m⁻² K⁻¹, of a flat plate outdoors in a wind of windMS m/s:
//
//	h = 2.8 + 3.0 V
//
// after Watmuff, Charters & Proctor (1977, COMPLES, Revue Internationale
// d'Héliotechnique 2, 56), as given by Duffie & Beckman, Solar Engineering of
// Thermal Processes, §3.15 (references, coefficients and the plate size from memory). It is McAdams's (1954)
// wind-tunnel result h = 5.7 + 3.8 V for a plate 0.5 m square with the
// radiation and free convection that it includes taken out, which is what a
// model that computes the long-wave exchange with the sky separately needs.
// Valid for 0 ≤ V ≤ [ConvectiveMaxWindMS] (from memory). V is the wind over
// the surface: a weather station's wind at 10 m height is higher than the
// wind at a roof, so h from it is an upper estimate (common practice, no
// source). It panics if windMS is negative or NaN.
func ConvectiveH(windMS float64) float64 {
	if !(windMS >= 0) {
		panic("weather: ConvectiveH of a negative or NaN wind speed")
	}
	return 2.8 + 3.0*windMS
}

// CloudySkyEmissivity returns the effective emissivity of a sky partly
// covered by clouds, from the clear-sky emissivity clear and the cloud
// fraction c (0..1):
//
//	ε = c + (1 − c) ε_clear
//
// the form of Crawford & Duchon (1999, Journal of Applied Meteorology 38,
// 474–480; from memory), who used it with c = 1 − s, s being the ratio of the
// measured to the clear-sky solar irradiance. It takes the clouds as
// blackbodies at the air temperature — low, thick cloud — and so gives the
// largest effect of a given cover: high or thin clouds radiate less, and
// a surface under them cools more than this says. It panics if c or clear is
// outside 0..1 or NaN.
func CloudySkyEmissivity(clear, c float64) float64 {
	if !(c >= 0 && c <= 1) || !(clear >= 0 && clear <= 1) {
		panic("weather: CloudySkyEmissivity needs a cloud fraction and an emissivity within 0..1")
	}
	return c + (1-c)*clear
}

// HourTerm returns the hour-of-day term of the Berdahl–Martin clear-sky
// correlation (Berdahl & Martin 1984, Solar Energy 32, 663; from memory),
// to be added to the dew-point form 0.711 + 0.56 x + 0.73 x²:
//
//	Δε = 0.013 cos(2π t / 24)
//
// with t the hour of the day from midnight (0..24; see [HourOfDay]). The sky
// is a little more emissive at night (+0.013 at midnight) than by day
// (−0.013 at noon) at the same dew point.
func HourTerm(hourOfDay float64) float64 {
	return 0.013 * math.Cos(2*math.Pi*hourOfDay/24)
}

// PressureTerm returns the station-pressure term of the Berdahl–Martin
// clear-sky correlation (Berdahl & Martin 1984, Solar Energy 32, 663; from
// memory), to be added like [HourTerm]:
//
//	Δε = 0.00012 (P − 1000)
//
// with P the station pressure in hPa (mbar): a high site, under less air,
// sees a drier sky (−0.012 at 900 hPa).
func PressureTerm(pressureHPa float64) float64 {
	return 0.00012 * (pressureHPa - 1000)
}

// HourOfDay returns the hours since midnight of t in t's own UTC offset (the
// local clock time the file states), 0 ≤ h < 24.
func HourOfDay(t time.Time) float64 {
	return float64(t.Hour()) + float64(t.Minute())/60 + (float64(t.Second())+float64(t.Nanosecond())/1e9)/3600
}
