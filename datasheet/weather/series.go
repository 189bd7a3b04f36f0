package weather

import (
	"time"

	"skysheet/spectra"
)

// Quantity is a column of a weather series.
type Quantity int

// The quantities of a weather series. Time, AirTemperature, DewPoint and
// GlobalHorizontal are required; the others are optional.
const (
	Time Quantity = iota
	AirTemperature
	DewPoint
	GlobalHorizontal // global horizontal irradiance
	WindSpeed
	CloudFraction
	StationPressure
	numQuantities
)

// Quantities lists every quantity in the order [Write] puts them.
var Quantities = []Quantity{Time, AirTemperature, DewPoint, GlobalHorizontal, WindSpeed, CloudFraction, StationPressure}

// String returns the column name of q as written in a header.
func (q Quantity) String() string {
	if q >= 0 && q < numQuantities {
		return quantityInfo[q].name
	}
	return "unknown quantity"
}

// Required reports whether every series must have q.
func (q Quantity) Required() bool { return q <= GlobalHorizontal }

// Column is one column of a series' header as read.
type Column struct {
	Quantity Quantity
	Header   string // the header cell as written
	Unit     string // the unit as written in canonical spelling ("°C", "K", "W/m²", "%", ...); "" for none
	Note     string // text after a comma inside the parentheses, e.g. "at 10 m"
}

// Hour is one row of a series: the conditions at the instant Time (or the
// mean over the hour centred on it, which is the same to the model).
// Optional quantities the series does not have are NaN.
type Hour struct {
	Time          time.Time // with the UTC offset written in the file
	AirC          float64   // air temperature, °C
	DewPointC     float64   // dew point, °C; at most DewPointSlackK above AirC
	GlobalWm2     float64   // global horizontal irradiance, W/m², 0..1500
	WindMS        float64   // wind speed, m/s, 0..100; NaN if absent
	CloudFraction float64   // cloud fraction, 0..1; NaN if absent
	PressureHPa   float64   // station pressure, hPa, 300..1100; NaN if absent
}

// Series is an hourly weather series: every hour follows the one before by
// exactly one hour.
type Series struct {
	// Name is the "# name:" metadata of the file, else the file name
	// without its folder and extension.
	Name string
	// Input names the file read and the SHA-256 of its bytes.
	Input spectra.Input
	// Meta holds the other "# key: value" lines before the header, in
	// order.
	Meta []spectra.Field
	// Columns is the header as read, in file order; it always holds the
	// required quantities.
	Columns []Column
	Hours   []Hour
}

// Has reports whether s has a column for q.
func (s *Series) Has(q Quantity) bool {
	for _, c := range s.Columns {
		if c.Quantity == q {
			return true
		}
	}
	return false
}

// DewPointSlackK is how far the dew point may lie above the air temperature
// (K): the rounding of two sensors near saturation. Values within it are kept
// as read; a model that needs T_dp ≤ T_air takes the smaller of the two.
// (Common practice, no source.)
const DewPointSlackK = 0.5

// MaxSize is the largest series file [Parse] reads, in bytes (64 MiB, about a
// century of hours).
const MaxSize = 64 << 20
