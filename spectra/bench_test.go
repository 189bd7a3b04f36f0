package spectra

import (
	"bytes"
	"os"
	"testing"
)

func BenchmarkParse(b *testing.B) {
	data, err := os.ReadFile("../testdata/white-uvvis.csv")
	if err != nil {
		b.Fatal(err)
	}
	b.SetBytes(int64(len(data)))
	for b.Loop() {
		if _, err := Parse(bytes.NewReader(data), "white-uvvis.csv"); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkBandMeanSolar(b *testing.B) {
	data, _ := os.ReadFile("../testdata/white-uvvis.csv")
	s, err := Parse(bytes.NewReader(data), "w")
	if err != nil {
		b.Fatal(err)
	}
	r := s.Series(R)
	w := SolarGlobal()
	for b.Loop() {
		BandMean(r, w, 280, 2500)
	}
}

func BenchmarkBandMeanThermal(b *testing.B) {
	data, _ := os.ReadFile("../testdata/white-ftir.tsv")
	s, err := Parse(bytes.NewReader(data), "w")
	if err != nil {
		b.Fatal(err)
	}
	r := s.Series(R)
	w := Blackbody{K: 300}
	for b.Loop() {
		BandMean(r, w, 2500, 25000)
	}
}
