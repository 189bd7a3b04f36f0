package datasheet

import (
	"errors"
	"math"
	"testing"
)

func TestSeriesH(t *testing.T) {
	for _, tt := range []struct {
		name   string
		h      float64
		layers []Conductor
		want   float64
	}{
		// By hand: 1/6 + 0.005/0.03 = 1/6 + 1/6 = 1/3, h_eff = 3.
		{"5 mm foam under h = 6", 6, []Conductor{{0.005, 0.03}}, 3},
		// By hand: 1/10 + 0.004/0.04 + 0.003/0.1 = 0.1 + 0.1 + 0.03 = 0.23,
		// h_eff = 1/0.23 = 100/23.
		{"two layers under h = 10", 10, []Conductor{{0.004, 0.04}, {0.003, 0.1}}, 100.0 / 23},
		// By hand: 1/8 + 0.002/0.026 = 0.125 + 0.0769230769… = 0.2019230769…,
		// h_eff = 4.952380952… (= 1/(1/8 + 1/13) = 104/21).
		{"2 mm still air under h = 8", 8, []Conductor{{0.002, 0.026}}, 104.0 / 21},
		{"no layers", 6, nil, 6},
		{"zero thickness", 6, []Conductor{{0, 0.2}}, 6},
		{"no outside exchange", 0, []Conductor{{0.01, 0.03}}, 0},
	} {
		got, err := SeriesH(tt.h, tt.layers...)
		if err != nil {
			t.Errorf("%s: %v", tt.name, err)
			continue
		}
		if math.Abs(got-tt.want) > 1e-12 {
			t.Errorf("%s: h_eff %.15g, want %.15g", tt.name, got, tt.want)
		}
	}
}

func TestSeriesHErrors(t *testing.T) {
	for _, tt := range []struct {
		name   string
		h      float64
		layers []Conductor
	}{
		{"negative h", -1, nil},
		{"NaN h", math.NaN(), nil},
		{"infinite h", math.Inf(1), nil},
		{"negative thickness", 6, []Conductor{{-0.001, 0.03}}},
		{"zero conductivity", 6, []Conductor{{0.001, 0}}},
		{"negative conductivity", 6, []Conductor{{0.001, -0.03}}},
		{"NaN thickness", 6, []Conductor{{0.001, 0.03}, {math.NaN(), 0.03}}},
		{"infinite conductivity", 6, []Conductor{{0.001, math.Inf(1)}}},
	} {
		if _, err := SeriesH(tt.h, tt.layers...); !errors.Is(err, ErrSystemInput) {
			t.Errorf("%s: %v, want ErrSystemInput", tt.name, err)
		}
	}
}
