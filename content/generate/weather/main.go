// Command weather writes the two invented hourly weather series of skysheet's
// demo library, content/weather/inland-dry.csv and
// content/weather/coastal-humid.csv: a full year (2025, 8,760 hours) at a hot,
// dry inland site and at a humid coastal one, both invented test sites of the
// invented Quillmere Cool Surfaces Laboratory. They are synthetic, made up
// from simple diurnal and seasonal shapes and a seeded random day-to-day
// weather, not measured anywhere; each file says so in its first lines.
//
// Run it from the repository root:
//
//	go run ./content/generate/weather
//	go run ./content/generate/weather -check   # writes nothing; exit 1 if a file is out of date
//
// It is deterministic: the same source writes the same bytes.
//
// # The shapes
//
// Each hour of the year is an instant on the clock of the site's UTC offset
// (kept all year, no daylight saving). The site sits on its zone's meridian,
// so solar noon is taken at 12:00 (the equation of time, under 17 minutes, is
// neglected).
//
//   - Sun: declination δ = 23.45° sin(2π (284 + n)/365) on day n (Cooper's
//     formula, as given by Duffie & Beckman; from memory), hour angle 15° per
//     hour from noon, elevation e from sin e = sin φ sin δ + cos φ cos δ cos ω.
//     Clear-sky global horizontal irradiance 1098 sin e exp(−0.057/sin e)
//     (the form of Haurwitz's clear-sky model; coefficients from memory),
//     zero when the sun is below the horizon, reduced under a cloud fraction
//     c by the factor 1 − 0.75 c^3.4 (the form of Kasten & Czeplak 1980; from
//     memory).
//   - Cloud fraction: a seasonal mean, plus a day-to-day anomaly (a
//     first-order autoregressive process, so that cloudy days come in
//     spells) and an hourly one, clipped to 0..1.
//   - Air temperature: annual mean, plus a seasonal cosine peaking in mid
//     July, plus a day-to-day anomaly, plus a diurnal swing from a minimum at
//     06:00 to a maximum at 15:00, whose amplitude clouds reduce.
//   - Dew point: the same seasonal shape, a small diurnal swing and its own
//     anomaly; never above the air temperature (the air is saturated then).
//   - Wind speed: a mean with an afternoon maximum (the sea breeze, at the
//     coast), a day-to-day anomaly and hourly gusts, never negative.
//   - Station pressure: the site's mean for its elevation, a seasonal term,
//     a day-to-day anomaly and the semidiurnal tide (about ±1 hPa).
//
// Values are rounded as a station would report them: 0.1 °C, 1 W/m², 0.1 m/s,
// 0.01 of cloud, 0.1 hPa.
package main

import (
	"bytes"
	"flag"
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"time"

	"skysheet/datasheet/weather"
	"skysheet/spectra"
)

// site holds the invented climate of one site. Temperatures in °C.
type site struct {
	file        string
	name        string
	description []spectra.Field // metadata, in order
	seed        uint64
	latitude    float64 // degrees north
	offsetHours int

	airMean, airSeason, airSwing, airAnomaly float64 // annual mean, seasonal half-range, diurnal range, day-to-day σ
	dewMean, dewSeason, dewSwing, dewAnomaly float64
	cloudSummer, cloudWinter, cloudSpread    float64
	windMean, windSwing, windAnomaly         float64
	pressure, pressureSeason                 float64 // hPa
}

var sites = []site{
	{
		file: "inland-dry.csv",
		name: "Dravenholt Basin, inland and dry (invented)",
		description: []spectra.Field{
			{Key: "site", Value: "Dravenholt Basin test field of the Quillmere Cool Surfaces Laboratory, an invented inland plain"},
			{Key: "latitude", Value: "31.5° N (invented site)"},
			{Key: "elevation", Value: "850 m (invented site)"},
			{Key: "clock", Value: "UTC+02:00 all year, no daylight saving"},
		},
		seed: 3101, latitude: 31.5, offsetHours: 2,
		airMean: 21, airSeason: 10, airSwing: 16, airAnomaly: 2.2,
		dewMean: 2, dewSeason: 4, dewSwing: 2, dewAnomaly: 3,
		cloudSummer: 0.04, cloudWinter: 0.28, cloudSpread: 0.22,
		windMean: 3.4, windSwing: 0.45, windAnomaly: 1.0,
		pressure: 915, pressureSeason: 3,
	},
	{
		file: "coastal-humid.csv",
		name: "Merrowgate Point, coastal and humid (invented)",
		description: []spectra.Field{
			{Key: "site", Value: "Merrowgate Point test roof of the Quillmere Cool Surfaces Laboratory, an invented harbour on a warm sea"},
			{Key: "latitude", Value: "22.5° N (invented site)"},
			{Key: "elevation", Value: "10 m (invented site)"},
			{Key: "clock", Value: "UTC+03:00 all year, no daylight saving"},
		},
		seed: 2207, latitude: 22.5, offsetHours: 3,
		airMean: 26, airSeason: 4, airSwing: 6, airAnomaly: 1.0,
		dewMean: 20, dewSeason: 4, dewSwing: 1, dewAnomaly: 1.2,
		cloudSummer: 0.5, cloudWinter: 0.3, cloudSpread: 0.25,
		windMean: 4.5, windSwing: 0.5, windAnomaly: 1.2,
		pressure: 1010, pressureSeason: 4,
	},
}

// Dir is where the series go, relative to the repository root.
const Dir = "content/weather"

// output is one file to write, its path relative to the root.
type output struct {
	path string
	data []byte
}

func files() []output {
	var out []output
	for _, s := range sites {
		out = append(out, output{filepath.ToSlash(filepath.Join(Dir, s.file)), s.render()})
	}
	return out
}

// noise is a seeded source of standard normal numbers whose sequence does not
// depend on the Go release (the PCG generator is specified; the normal
// numbers are made here by the Box–Muller transform).
type noise struct{ pcg *rand.PCG }

func newNoise(seed uint64) *noise { return &noise{rand.NewPCG(seed, 0x5eed)} }

// uniform returns a number in (0, 1).
func (n *noise) uniform() float64 { return (float64(n.pcg.Uint64()>>11) + 0.5) / (1 << 53) }

func (n *noise) normal() float64 {
	return math.Sqrt(-2*math.Log(n.uniform())) * math.Cos(2*math.Pi*n.uniform())
}

// ar1 is a first-order autoregressive process of unit variance.
type ar1 struct {
	phi, x float64
}

func (a *ar1) next(n *noise) float64 {
	a.x = a.phi*a.x + math.Sqrt(1-a.phi*a.phi)*n.normal()
	return a.x
}

// series makes the site's year of hours.
func (s site) series() *weather.Series {
	zone := time.FixedZone("", s.offsetHours*3600)
	start := time.Date(2025, 1, 1, 0, 0, 0, 0, zone)
	end := time.Date(2026, 1, 1, 0, 0, 0, 0, zone)
	out := &weather.Series{Name: s.name, Columns: []weather.Column{
		{Quantity: weather.Time},
		{Quantity: weather.AirTemperature},
		{Quantity: weather.DewPoint},
		{Quantity: weather.GlobalHorizontal},
		{Quantity: weather.WindSpeed, Note: "at 10 m"},
		{Quantity: weather.CloudFraction},
		{Quantity: weather.StationPressure},
	}, Meta: s.description}
	rng := newNoise(s.seed)
	// The day-to-day anomalies, one value per day (day 0 is the last of the
	// year before), joined linearly from noon to noon so that the weather
	// has no step at midnight.
	days := int(end.Sub(start)/(24*time.Hour)) + 2
	anomaly := func(phi float64) []float64 {
		a, v := ar1{phi: phi}, make([]float64, days)
		for i := range v {
			v[i] = a.next(rng)
		}
		return v
	}
	cloudD, airD, dewD, windD, pressureD := anomaly(0.7), anomaly(0.75), anomaly(0.8), anomaly(0.6), anomaly(0.8)
	hourCloud, hourWind := ar1{phi: 0.8}, ar1{phi: 0.5}
	for t := start; t.Before(end); t = t.Add(time.Hour) {
		day := t.YearDay()
		hour := float64(t.Hour())
		// Position between the noons of day i and day i+1.
		x := float64(day) + (hour-12)/24
		i := int(math.Floor(x))
		f := x - float64(i)
		at := func(v []float64) float64 { return v[i] + f*(v[i+1]-v[i]) }
		cloudA, airA, dewA, windA, pressureA := at(cloudD), at(airD), at(dewD), at(windD), at(pressureD)
		// Seasons: +1 in mid July, −1 in mid January.
		season := math.Cos(2 * math.Pi * float64(day-196) / 365)
		summer := (1 + season) / 2

		meanCloud := s.cloudWinter + (s.cloudSummer-s.cloudWinter)*summer
		dc := clamp(meanCloud+s.cloudSpread*cloudA, 0, 1)
		cloud := round(clamp(dc+0.08*hourCloud.next(rng), 0, 1), 100)

		air := s.airMean + s.airSeason*season + s.airAnomaly*airA + s.airSwing/2*(1-0.6*dc)*diurnal(hour)
		dew := s.dewMean + s.dewSeason*season + s.dewAnomaly*dewA + s.dewSwing/2*diurnal(hour)
		air = round(air, 10)
		dew = math.Min(round(dew, 10), air)

		ghi := math.Round(clearSky(s.latitude, day, hour) * (1 - 0.75*math.Pow(cloud, 3.4)))

		wind := s.windMean * (1 + s.windSwing*math.Cos(2*math.Pi*(hour-15)/24))
		wind = round(math.Max(0, wind+s.windAnomaly*windA+0.5*hourWind.next(rng)), 10)

		pressure := s.pressure - s.pressureSeason*season + 3*pressureA + math.Cos(4*math.Pi*(hour-10)/24)
		pressure = round(pressure, 10)

		out.Hours = append(out.Hours, weather.Hour{Time: t, AirC: air, DewPointC: dew, GlobalWm2: ghi,
			WindMS: wind, CloudFraction: cloud, PressureHPa: pressure})
	}
	return out
}

// diurnal is the shape of the daily swing: −1 at 06:00, +1 at 15:00, rising
// and falling as half cosines.
func diurnal(hour float64) float64 {
	if hour >= 6 && hour <= 15 {
		return math.Cos(math.Pi * (hour - 15) / 9)
	}
	if hour < 6 {
		hour += 24
	}
	return math.Cos(math.Pi * (hour - 15) / 15)
}

// clearSky returns the clear-sky global horizontal irradiance, W/m², at
// latitude (° N) on day n of the year at the solar hour.
func clearSky(latitude float64, n int, hour float64) float64 {
	rad := math.Pi / 180
	decl := 23.45 * rad * math.Sin(2*math.Pi*float64(284+n)/365)
	omega := 15 * rad * (hour - 12)
	phi := latitude * rad
	sinE := math.Sin(phi)*math.Sin(decl) + math.Cos(phi)*math.Cos(decl)*math.Cos(omega)
	if sinE <= 0.01 {
		return 0
	}
	return 1098 * sinE * math.Exp(-0.057/sinE)
}

func clamp(x, lo, hi float64) float64 { return math.Max(lo, math.Min(hi, x)) }

// round rounds x to 1/per (per = 10: tenths), as the float64 nearest to
// n/per, so that the file holds short numbers (n*0.1 would not: 3*0.1 =
// 0.30000000000000004).
func round(x, per float64) float64 {
	return math.Round(x*per) / per
}

// header is the comment block at the top of each file.
const header = `# Invented, synthetic, not measured: an hourly weather series made up for the demo of skysheet
# from simple diurnal and seasonal shapes and a seeded random day-to-day weather (see
# content/generate/weather). No station recorded it; the site does not exist. Do not use it to size,
# sell or judge anything.
# generated by: go run ./content/generate/weather
`

func (s site) render() []byte {
	var buf bytes.Buffer
	buf.WriteString(header)
	if err := weather.Write(&buf, s.series()); err != nil {
		panic(err) // writing to a bytes.Buffer does not fail
	}
	return buf.Bytes()
}

func main() {
	os.Exit(run(os.Args[1:], os.Stdout, os.Stderr))
}

func run(args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("weather", flag.ContinueOnError)
	fs.SetOutput(stderr)
	root := fs.String("root", ".", "repository root to write into (must hold go.mod)")
	check := fs.Bool("check", false, "write nothing; exit 1 if a file differs from what would be written")
	if err := fs.Parse(args); err != nil {
		return 2
	}
	if _, err := os.Stat(filepath.Join(*root, "go.mod")); err != nil {
		fmt.Fprintf(stderr, "weather: %s is not the repository root (no go.mod); run from the root or pass -root\n", *root)
		return 2
	}
	stale := 0
	for _, f := range files() {
		p := filepath.Join(*root, f.path)
		if *check {
			if old, err := os.ReadFile(p); err != nil || !bytes.Equal(old, f.data) {
				fmt.Fprintf(stderr, "weather: %s is out of date (run `go run ./content/generate/weather`)\n", f.path)
				stale++
			}
			continue
		}
		if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
			fmt.Fprintln(stderr, "weather:", err)
			return 1
		}
		if err := os.WriteFile(p, f.data, 0o644); err != nil {
			fmt.Fprintln(stderr, "weather:", err)
			return 1
		}
		fmt.Fprintf(stdout, "wrote %s\n", f.path)
	}
	if stale > 0 {
		return 1
	}
	return 0
}
