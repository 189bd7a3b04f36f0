package weather

import (
	"bytes"
	"math"
	"testing"
	"time"
)

// yearFile returns a year of hours (8,760) with every column, written by
// Write from a smooth invented series.
func yearFile() []byte {
	s := &Series{Name: "bench", Columns: []Column{{Quantity: Time}, {Quantity: AirTemperature}, {Quantity: DewPoint},
		{Quantity: GlobalHorizontal}, {Quantity: WindSpeed}, {Quantity: CloudFraction}, {Quantity: StationPressure}}}
	t0 := time.Date(2025, 1, 1, 0, 0, 0, 0, time.FixedZone("", 3600))
	for i := range 8760 {
		x := float64(i)
		s.Hours = append(s.Hours, Hour{Time: t0.Add(time.Duration(i) * time.Hour),
			AirC: math.Round(10*(20+8*math.Sin(x/24*2*math.Pi))) / 10, DewPointC: 8.5,
			GlobalWm2: math.Round(math.Max(0, 900*math.Sin((x-6)/24*2*math.Pi))), WindMS: 3.2, CloudFraction: 0.25, PressureHPa: 1009.4})
	}
	var buf bytes.Buffer
	if err := Write(&buf, s); err != nil {
		panic(err)
	}
	return buf.Bytes()
}

func BenchmarkParseYear(b *testing.B) {
	data := yearFile()
	b.SetBytes(int64(len(data)))
	for b.Loop() {
		s, err := Parse(bytes.NewReader(data), "year.csv")
		if err != nil || len(s.Hours) != 8760 {
			b.Fatal(err)
		}
	}
}
