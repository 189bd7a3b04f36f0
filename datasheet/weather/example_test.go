package weather_test

import (
	"fmt"
	"os"

	"skysheet/datasheet/weather"
)

func ExampleRead() {
	s, err := weather.Read(os.DirFS("testdata"), "sample.csv")
	if err != nil {
		fmt.Println(err)
		return
	}
	first, last := s.Hours[0], s.Hours[len(s.Hours)-1]
	fmt.Printf("%s: %d hours, %s to %s\n", s.Name, len(s.Hours), first.Time.Format("15:04 -07:00"), last.Time.Format("15:04 -07:00"))
	fmt.Printf("cloud fraction given: %v; wind at 01:00: %.1f m/s\n", s.Has(weather.CloudFraction), s.Hours[1].WindMS)
	// Output:
	// Example roof, one spring night (invented): 8 hours, 00:00 +01:00 to 08:00 +02:00
	// cloud fraction given: true; wind at 01:00: 1.8 m/s
}

func ExampleCloudySkyEmissivity() {
	// A clear sky of emissivity 0.774, at night (hour term of midnight),
	// at a station at 950 hPa, four tenths covered by low cloud.
	clear := 0.774 + weather.HourTerm(0) + weather.PressureTerm(950)
	fmt.Printf("clear %.3f, cloud 0.4: %.3f\n", clear, weather.CloudySkyEmissivity(clear, 0.4))
	// Output: clear 0.781, cloud 0.4: 0.869
}
