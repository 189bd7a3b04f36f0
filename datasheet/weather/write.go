package weather

import (
	"bufio"
	"encoding/csv"
	"io"
	"strconv"
	"strings"
	"time"
)

// Write writes s in the series format: "# name:" and the metadata as
// "# key: value" lines (keys that could not be read back as metadata are
// written as plain comments), a header naming s.Columns in file order with
// the internal unit of each (°C, W/m², m/s, fraction, hPa) and its note, then
// one row per hour, times in RFC 3339 with their offset and numbers in the
// shortest form that reads back to the same float64. Values converted from
// other units (K, km/h, %, kPa, Pa) read back within rounding. The header
// has no non-ASCII spelling beyond "°C" and "W/m²".
func Write(w io.Writer, s *Series) error {
	bw := bufio.NewWriter(w)
	clean := strings.NewReplacer("\r\n", " ", "\n", " ", "\r", " ")
	if s.Name != "" {
		bw.WriteString("# name: " + clean.Replace(s.Name) + "\n")
	}
	for _, f := range s.Meta {
		k := strings.TrimSpace(clean.Replace(f.Key))
		if !isMetaKey(k) || normName(k) == "name" {
			k = "(" + k + ")" // kept, but as a plain comment
		}
		bw.WriteString("# " + k + ": " + clean.Replace(f.Value) + "\n")
	}
	cw := csv.NewWriter(bw)
	header := make([]string, len(s.Columns))
	for i, c := range s.Columns {
		d := &quantityInfo[c.Quantity]
		h := d.name
		var inside []string
		if c.Quantity != Time && d.units[0].name != "" {
			inside = append(inside, d.units[0].name)
		}
		if n := strings.TrimSpace(clean.Replace(c.Note)); n != "" && c.Quantity != Time {
			if len(inside) == 0 {
				inside = append(inside, "0–1")
			}
			inside = append(inside, n)
		}
		if len(inside) > 0 {
			h += " (" + strings.Join(inside, ", ") + ")"
		}
		header[i] = h
	}
	if err := cw.Write(header); err != nil {
		return err
	}
	rec := make([]string, len(s.Columns))
	for _, h := range s.Hours {
		for i, c := range s.Columns {
			var v float64
			switch c.Quantity {
			case Time:
				rec[i] = h.Time.Format(time.RFC3339Nano)
				continue
			case AirTemperature:
				v = h.AirC
			case DewPoint:
				v = h.DewPointC
			case GlobalHorizontal:
				v = h.GlobalWm2
			case WindSpeed:
				v = h.WindMS
			case CloudFraction:
				v = h.CloudFraction
			case StationPressure:
				v = h.PressureHPa
			}
			rec[i] = strconv.FormatFloat(v, 'f', -1, 64)
		}
		if err := cw.Write(rec); err != nil {
			return err
		}
	}
	cw.Flush()
	if err := cw.Error(); err != nil {
		return err
	}
	return bw.Flush()
}
