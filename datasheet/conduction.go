package datasheet

import (
	"errors"
	"fmt"
	"math"
)

// ErrSystemInput reports a system input (a layer's thickness or
// conductivity, a heat-transfer coefficient, a temperature, an emittance)
// outside its physical range.
var ErrSystemInput = errors.New("outside its physical range")

// Conductor is a layer that heat crosses by conduction alone.
type Conductor struct {
	ThicknessM      float64 // d, metres; 0 adds no resistance
	ConductivityWmK float64 // k, W m⁻¹ K⁻¹
}

// SeriesH returns the heat-transfer coefficient through a cover,
// h_eff = 1 / (1/h + Σ dᵢ/kᵢ) (W m⁻² K⁻¹): the outside coefficient h and
// the layers' conduction resistances in series (common practice, no
// source). h = 0 gives 0. It returns an error wrapping [ErrSystemInput] when
// h is negative or not finite, or a layer has d < 0 or k ≤ 0 (or either not
// finite).
func SeriesH(h float64, layers ...Conductor) (float64, error) {
	if !(h >= 0) || math.IsInf(h, 0) {
		return math.NaN(), fmt.Errorf("heat-transfer coefficient h %g W m⁻² K⁻¹ is %w: want a finite h ≥ 0", h, ErrSystemInput)
	}
	res := 1 / h // +Inf for h = 0
	for i, l := range layers {
		if !(l.ThicknessM >= 0) || math.IsInf(l.ThicknessM, 0) {
			return math.NaN(), fmt.Errorf("layer %d: thickness %g m is %w: want a finite d ≥ 0", i+1, l.ThicknessM, ErrSystemInput)
		}
		if !(l.ConductivityWmK > 0) || math.IsInf(l.ConductivityWmK, 0) {
			return math.NaN(), fmt.Errorf("layer %d: thermal conductivity %g W m⁻¹ K⁻¹ is %w: want a finite k > 0", i+1, l.ConductivityWmK, ErrSystemInput)
		}
		res += l.ThicknessM / l.ConductivityWmK
	}
	return 1 / res, nil
}
