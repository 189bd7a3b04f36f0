package colorimetry

import (
	"crypto/sha256"
	_ "embed"
	"encoding/csv"
	"encoding/hex"
	"fmt"
	"strconv"
	"strings"
	"sync"
)

// The visible range summed over, in nm, and the number of 1 nm steps in it.
const (
	visLo = 380
	visHi = 780
	nVis  = visHi - visLo + 1
)

//go:embed cie-1931-2deg-d65.csv
var cieCSV string

// cie holds the embedded tables, 1 nm apart from visLo to visHi.
type cie struct {
	xbar, ybar, zbar, d65 [nVis]float64
	// wx, wy, wz are the ASTM E308 weights for 1 nm summation,
	// k·S(λ)·x̄(λ) and so on, with k = 100 / Σ S(λ)·ȳ(λ): a perfect
	// reflector sums to Y = 100.
	wx, wy, wz [nVis]float64
	white      XYZ
}

var tables = sync.OnceValue(func() *cie {
	t, err := parseCIE(cieCSV)
	if err != nil {
		panic("colorimetry: embedded table: " + err.Error())
	}
	return t
})

// parseCIE reads the embedded CSV: comment lines starting with '#', the
// header wavelength_nm,xbar,ybar,zbar,d65, then one row per nm from visLo to
// visHi.
func parseCIE(text string) (*cie, error) {
	var body []string
	for line := range strings.Lines(text) {
		if !strings.HasPrefix(line, "#") {
			body = append(body, line)
		}
	}
	rows, err := csv.NewReader(strings.NewReader(strings.Join(body, ""))).ReadAll()
	if err != nil {
		return nil, err
	}
	if len(rows) != nVis+1 || strings.Join(rows[0], ",") != "wavelength_nm,xbar,ybar,zbar,d65" {
		return nil, fmt.Errorf("want the header and %d rows, got %d lines starting %q", nVis, len(rows), rows[0])
	}
	t := &cie{}
	for i, row := range rows[1:] {
		var v [5]float64
		for j := range v {
			if v[j], err = strconv.ParseFloat(row[j], 64); err != nil {
				return nil, fmt.Errorf("row %d: %v", i+1, err)
			}
		}
		if v[0] != float64(visLo+i) {
			return nil, fmt.Errorf("row %d: wavelength %g, want %d", i+1, v[0], visLo+i)
		}
		t.xbar[i], t.ybar[i], t.zbar[i], t.d65[i] = v[1], v[2], v[3], v[4]
	}
	var sy float64
	for i := range nVis {
		sy += t.d65[i] * t.ybar[i]
	}
	k := 100 / sy
	for i := range nVis {
		t.wx[i] = k * t.d65[i] * t.xbar[i]
		t.wy[i] = k * t.d65[i] * t.ybar[i]
		t.wz[i] = k * t.d65[i] * t.zbar[i]
	}
	// The white is the sum for a perfect reflector, taken by the same loop
	// as every sample, so that a perfect reflector's X/Xn, Y/Yn, Z/Zn are
	// exactly 1.
	var one [nVis]float64
	for i := range one {
		one[i] = 1
	}
	t.white = t.sum(&one)
	return t, nil
}

// sum returns the tristimulus values of values v at 380, 381, …, 780 nm.
func (t *cie) sum(v *[nVis]float64) XYZ {
	var c XYZ
	for i, x := range v {
		c.X += t.wx[i] * x
		c.Y += t.wy[i] * x
		c.Z += t.wz[i] * x
	}
	return c
}

// TableSHA256 returns the SHA-256 (lower-case hex) of the embedded CIE
// table, so that reports can name the exact copy they used.
func TableSHA256() string {
	sum := sha256.Sum256([]byte(cieCSV))
	return hex.EncodeToString(sum[:])
}
