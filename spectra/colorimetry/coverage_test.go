package colorimetry

import (
	"bufio"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"

	"skysheet/spectra"
)

// TestTableSHA256 names the exact copy of the table embedded.
func TestTableSHA256(t *testing.T) {
	// sha256sum (GNU coreutils 9.1) of cie-1931-2deg-d65.csv as committed.
	const want = "9383d69aa613e1013c9d7e890a798267a5a5aff9314f0d23905fd3d3a76ae3ab"
	if got := TableSHA256(); got != want {
		t.Errorf("TableSHA256() = %s, want %s", got, want)
	}
}

// luminousShare sums D65 × ȳ from the CSV file itself (not the parsed
// tables) over lo..hi nm, as a share of the sum over 380–780 nm.
func luminousShare(t *testing.T, lo, hi int) float64 {
	f, err := os.Open("cie-1931-2deg-d65.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var part, all float64
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		c := strings.Split(sc.Text(), ",")
		nm, err := strconv.Atoi(c[0])
		if err != nil {
			continue // comments and header
		}
		y, _ := strconv.ParseFloat(c[2], 64)
		s, _ := strconv.ParseFloat(c[4], 64)
		all += y * s
		if nm >= lo && nm <= hi {
			part += y * s
		}
	}
	return part / all
}

func TestCoverageShare(t *testing.T) {
	half := constant(0.5)
	for _, tt := range []struct {
		name string
		s    spectra.Series
		want float64
	}{
		{"whole range", sampled(250, 2500, 10, half), 1},
		{"none", sampled(900, 2500, 10, half), 0},
		{"empty", spectra.Series{}, 0},
		{"from 400 nm", sampled(400, 2500, 10, half), luminousShare(t, 400, 780)},
		{"to 700 nm", sampled(300, 700, 10, half), luminousShare(t, 380, 700)},
		{"gap 500–510 nm", pieces(sampled(300, 500, 10, half).Pieces[0], sampled(510, 900, 10, half).Pieces[0]),
			1 - luminousShare(t, 501, 509)},
	} {
		if got := Coverage(tt.s); math.Abs(got-tt.want) > 1e-12 {
			t.Errorf("%s: coverage %.15f, want %.15f", tt.name, got, tt.want)
		}
	}
}
