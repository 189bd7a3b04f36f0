package weather

import (
	"fmt"
	"strings"

	"skysheet/spectra/msg"
)

// unit is one accepted unit of a quantity: a value v read in it is
// v*mul/div + offset in the quantity's internal unit. (Dividing by 100 rather
// than multiplying by 0.01 keeps 57 % at exactly 0.57.)
type unit struct {
	name      string   // canonical spelling, as Column.Unit reports it
	spellings []string // accepted spellings after normUnit
	mul, div  float64
	offset    float64
}

// internal converts v read in u to the internal unit.
func (u unit) internal(v float64) float64 {
	if u.mul == 1 && u.div == 1 {
		return v + u.offset
	}
	return v*u.mul/u.div + u.offset
}

// external converts v in the internal unit to u.
func (u unit) external(v float64) float64 { return (v - u.offset) * u.div / u.mul }

// quantityDef describes how a quantity is written and checked.
type quantityDef struct {
	name    string   // the column name, lower case
	aliases []string // other accepted names, after normName
	units   []unit   // units[0] is the internal unit, written by Write
	// unitless: the column may carry no unit (it then means units[0]).
	unitless bool
	lo, hi   float64 // accepted range in the internal unit
}

var (
	celsius = unit{"°C", []string{"°c", "℃", "degc", "deg c", "celsius"}, 1, 1, 0}
	kelvin  = unit{"K", []string{"k", "kelvin"}, 1, 1, -273.15}
)

// quantityInfo is indexed by Quantity.
var quantityInfo = [numQuantities]quantityDef{
	Time: {name: "time"},
	AirTemperature: {name: "air temperature", units: []unit{celsius, kelvin},
		lo: -90, hi: 60},
	DewPoint: {name: "dew point", aliases: []string{"dew point temperature"},
		units: []unit{celsius, kelvin}, lo: -100, hi: 60},
	GlobalHorizontal: {name: "global horizontal irradiance", aliases: []string{"ghi"},
		units: []unit{{"W/m²", []string{"w/m2", "w m-2", "wm-2"}, 1, 1, 0}}, lo: 0, hi: 1500},
	WindSpeed: {name: "wind speed", units: []unit{
		{"m/s", []string{"m/s", "m s-1", "ms-1"}, 1, 1, 0},
		{"km/h", []string{"km/h", "km h-1", "kmh-1"}, 1, 3.6, 0},
	}, lo: 0, hi: 100},
	CloudFraction: {name: "cloud fraction", unitless: true, units: []unit{
		{"", []string{"1", "0-1", "0..1", "fraction"}, 1, 1, 0},
		{"%", []string{"%", "percent"}, 1, 100, 0},
	}, lo: 0, hi: 1},
	StationPressure: {name: "station pressure", units: []unit{
		{"hPa", []string{"hpa", "mbar", "mb"}, 1, 1, 0},
		{"kPa", []string{"kpa"}, 10, 1, 0},
		{"Pa", []string{"pa"}, 1, 100, 0},
	}, lo: 300, hi: 1100},
}

// cell is a parsed header cell.
type cell struct {
	q    Quantity
	unit unit
	col  Column
}

// normName lowers s, reads "_" as a space and collapses runs of spaces.
func normName(s string) string {
	s = strings.ToLower(strings.ReplaceAll(s, "_", " "))
	return strings.Join(strings.Fields(s), " ")
}

// normUnit lowers a unit and writes ², ³, ⁻, · and ^ the plain way, so that
// "W·m⁻²", "W m^-2" and "W m-2" agree.
var unitReplacer = strings.NewReplacer("²", "2", "⁻", "-", "·", " ", "*", " ", "^", "", "−", "-", "–", "-")

func normUnit(s string) string {
	s = strings.ToLower(unitReplacer.Replace(s))
	return strings.Join(strings.Fields(s), " ")
}

// knownNames lists the column names for messages.
func knownNames() string {
	var b strings.Builder
	for q := Time; q < numQuantities; q++ {
		switch {
		case q == numQuantities-1:
			b.WriteString(" or ")
		case q > 0:
			b.WriteString(", ")
		}
		b.WriteString(quantityInfo[q].name)
	}
	return b.String()
}

// unitNames lists the units a quantity accepts, for messages.
func (d *quantityDef) unitNames() string {
	var names []string
	for _, u := range d.units {
		if u.name != "" {
			names = append(names, "("+u.name+")")
		}
	}
	s := strings.Join(names, " or ")
	if d.unitless {
		s = "no unit, (0–1) or (%)"
	}
	return s
}

// parseHeaderCell reads one header cell: a column name, then optionally a
// unit in parentheses or brackets, which may end with ", note".
func parseHeaderCell(raw string) (cell, error) {
	h := strings.TrimSpace(raw)
	c := cell{col: Column{Header: h}}
	name, inside, hasUnit := h, "", false
	if i := strings.IndexAny(h, "(["); i >= 0 {
		closer := byte(')')
		if h[i] == '[' {
			closer = ']'
		}
		if h[len(h)-1] != closer {
			return c, fmt.Errorf("%q %w: the unit must close the cell with %q, e.g. \"air temperature (°C)\"", msg.Cut(h), ErrBadHeader, string(closer))
		}
		name, inside, hasUnit = h[:i], h[i+1:len(h)-1], true
	}
	n := normName(name)
	q := Quantity(-1)
	for i := range quantityInfo {
		d := &quantityInfo[i]
		if n == d.name {
			q = Quantity(i)
			break
		}
		for _, a := range d.aliases {
			if n == a {
				q = Quantity(i)
			}
		}
	}
	if q < 0 {
		return c, fmt.Errorf("%q %w: want %s, with its unit in parentheses", msg.Cut(h), ErrUnknownColumn, knownNames())
	}
	c.q, c.col.Quantity = q, q
	d := &quantityInfo[q]
	u, note, _ := strings.Cut(inside, ",")
	c.col.Note = strings.TrimSpace(note)
	un := normUnit(u)
	if q == Time {
		if hasUnit && (un != "" || c.col.Note != "") {
			return c, fmt.Errorf("%q %w for time: time takes no unit; each value carries its UTC offset, e.g. 2026-07-01T13:00:00+02:00", msg.Cut(strings.TrimSpace(inside)), ErrUnit)
		}
		return c, nil
	}
	if un == "" {
		if d.unitless {
			c.unit = d.units[0]
			return c, nil
		}
		return c, fmt.Errorf("%s %w: write %s", d.name, ErrNoUnit, unitExamples(d))
	}
	for _, cand := range d.units {
		for _, sp := range cand.spellings {
			if un == sp {
				c.unit, c.col.Unit = cand, cand.name
				return c, nil
			}
		}
	}
	return c, fmt.Errorf("%q %w for %s: want %s", msg.Cut(strings.TrimSpace(u)), ErrUnit, d.name, d.unitNames())
}

// unitExamples writes a quantity's header with each of its units.
func unitExamples(d *quantityDef) string {
	var ex []string
	for _, u := range d.units {
		ex = append(ex, "\""+d.name+" ("+u.name+")\"")
	}
	return strings.Join(ex, " or ")
}
