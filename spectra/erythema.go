package spectra

import (
	"math"
	"sort"
	"sync"
)

// erythemaAction returns the erythema reference action spectrum of
// ISO 17166:1999 / CIE S 007/E:1998 at wavelength nm, relative to 1 below
// 298 nm:
//
//	s_er(λ) = 1                      λ ≤ 298 nm
//	        = 10^(0.094 (298 − λ))   298 < λ ≤ 328 nm
//	        = 10^(0.015 (140 − λ))   328 < λ ≤ 400 nm
//	        = 0                      λ > 400 nm.
//
// The standard defines it from 250 nm; below, it returns 1 as well. The two
// exponentials meet at 328 nm (both 10^−2.82).
func erythemaAction(nm float64) float64 {
	switch {
	case nm <= 298:
		return 1
	case nm <= 328:
		return math.Pow(10, 0.094*(298-nm))
	case nm <= 400:
		return math.Pow(10, 0.015*(140-nm))
	}
	return 0
}

// ErythemalBandNM is the band of [ErythemalSolar]: the UV part of the ASTM
// G173-03 tables, where the erythema action spectrum is defined.
var ErythemalBandNM = Interval{280, 400}

// erythemaStepNM is the spacing of the uniform grid on which
// [ErythemalSolar] is sampled, besides the G173 rows and the action
// spectrum's breakpoints (298 and 328 nm); its inverse is a whole number, so
// the grid falls on the rows. The action spectrum falls tenfold in 10.6 nm
// and the G173 UV rises steeply between its 0.5 nm rows: at this step,
// refining the grid fourfold changes an erythemal transmittance by less than
// 1e-6, and ∫ s_er E dλ agrees with a 0.001 nm brute-force sum to 1e-6
// (tested).
const erythemaStepNM = 0.01

// ErythemalSolar returns the erythemally weighted sunlight
// s_er(λ)·E(λ), with s_er the erythemaAction and E the ASTM G173-03
// global tilt irradiance, over [ErythemalBandNM] (zero outside), in
// W m⁻² nm⁻¹. Weighting a transmittance by it gives the share of the
// erythemally effective UV that passes.
func ErythemalSolar() Weighting {
	erythemalOnce.Do(loadErythemal)
	return erythemalW
}

var (
	erythemalOnce sync.Once
	erythemalW    *erythemal
)

// erythemal holds the weighting at its knots: every multiple of
// ErythemaStepNM in the band, which includes the G173 rows (0.5 nm apart
// there) and the breakpoints 298 and 328 nm.
type erythemal struct {
	perNM float64   // 1/ErythemaStepNM
	nm, w []float64 // knots and values, band ends included
}

func loadErythemal() {
	g173Once.Do(loadG173)
	e := &erythemal{perNM: math.Round(1 / erythemaStepNM)}
	lo, hi := ErythemalBandNM.Lo*e.perNM, ErythemalBandNM.Hi*e.perNM
	for k := lo; k <= hi; k++ {
		x := k / e.perNM
		e.nm = append(e.nm, x)
		e.w = append(e.w, e.value(x))
	}
	// The G173 rows and the breakpoints must be knots. (Knots returns a
	// window on the table itself: never append to it.)
	must := []float64{298, 328}
	must = append(must, g173Global.Knots(ErythemalBandNM.Lo, ErythemalBandNM.Hi)...)
	for _, x := range must {
		if e.index(x) < 0 {
			panic("spectra: erythemal grid misses a G173 row or breakpoint")
		}
	}
	erythemalW = e
}

func (e *erythemal) value(nm float64) float64 {
	if nm < ErythemalBandNM.Lo || nm > ErythemalBandNM.Hi {
		return 0
	}
	return erythemaAction(nm) * g173Global.At(nm)
}

// index returns the position of knot nm, or −1 when nm is not a knot.
func (e *erythemal) index(nm float64) int {
	k := math.Round(nm*e.perNM) - math.Round(ErythemalBandNM.Lo*e.perNM)
	if k < 0 || int(k) >= len(e.nm) || e.nm[int(k)] != nm {
		return -1
	}
	return int(k)
}

func (e *erythemal) At(nm float64) float64 {
	if i := e.index(nm); i >= 0 {
		return e.w[i]
	}
	return e.value(nm)
}

// Knots returns the knots strictly inside (lo, hi).
func (e *erythemal) Knots(lo, hi float64) []float64 {
	i := sort.Search(len(e.nm), func(i int) bool { return e.nm[i] > lo })
	j := sort.Search(len(e.nm), func(i int) bool { return e.nm[i] >= hi })
	if i >= j {
		return nil
	}
	return e.nm[i:j:j]
}

func (e *erythemal) String() string {
	return "CIE erythema action spectrum (ISO 17166) × ASTM G173-03 global tilt"
}
