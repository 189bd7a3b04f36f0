package spectra

import (
	"errors"
	"fmt"
	"math"
	"sort"
)

// errNoCommonRange reports that the layers of a stack share no wavelength
// range over which every one of them has both R and T.
var errNoCommonRange = errors.New("layers share no wavelength range with both R and T")

// StackOptics is the optics of layers stacked top first, light falling on
// the top. Its Optics hold the whole stack: R seen from above, T (the same
// both ways) and A = 1 − R − T; UR and UT are empty (the layers'
// uncertainties are not propagated). Every series of the stack has the same
// pieces and points.
type StackOptics struct {
	Optics
	// RBelow is the stack's reflectance seen from below. With layers that are
	// each the same from both sides the stack as a whole is not: RBelow
	// differs from R unless the stack is symmetric.
	RBelow Series
	// Absorbed[i] is the fraction of the light falling on the top that layer
	// i (0 = top) absorbs, counting every reflection between the layers.
	// Σᵢ Absorbed[i] = A at every point.
	Absorbed []Series
}

// Stack returns the optics of layers stacked top first, combined wavelength
// by wavelength by incoherent multiple reflection between layers much
// thicker than the wavelength (common practice, no source). For two layers
//
//	R = R₁ + T₁² R₂ / (1 − R₁ R₂),  T = T₁ T₂ / (1 − R₁ R₂),  A = 1 − R − T,
//
// applied pairwise for more, each layer being taken as the same from both
// sides and its absorptance as 1 − R − T. Values outside 0..1 are clipped
// and a pair with R + T > 1 is scaled down to sum to 1 (said in the
// assumptions).
//
// The stack is evaluated at every wavelength of any layer's R or T that lies
// where every layer has both R and T: its coverage is the intersection of
// the layers' and gaps stay gaps. Between those points it is linear, like
// measured data. The layers' closure checks are carried over, each problem
// prefixed with its layer's number (1 = top).
//
// It returns an error wrapping [ErrNoData] when there are no layers, and
// errNoCommonRange when the layers share no range.
func Stack(layers []Optics) (StackOptics, error) {
	if len(layers) == 0 {
		return StackOptics{}, fmt.Errorf("spectra: stack: %w: no layers", ErrNoData)
	}
	common := layerSpans(layers[0])
	for _, l := range layers[1:] {
		common = intersect(common, layerSpans(l))
	}
	if len(common) == 0 {
		return StackOptics{}, fmt.Errorf("spectra: stack of %d layers: %w", len(layers), errNoCommonRange)
	}
	n := len(layers)
	out := StackOptics{Absorbed: make([]Series, n)}
	out.Origin = [3]Origin{Derived, Derived, Derived}
	var clipped spans
	var work stackWork
	for _, sp := range common {
		grid := []float64{sp.Lo, sp.Hi}
		src := make([][2]walker, n) // per layer: the R and T pieces holding sp
		for i, l := range layers {
			src[i] = [2]walker{{p: pieceOver(l.R, sp)}, {p: pieceOver(l.T, sp)}}
			for _, w := range src[i] {
				grid = append(grid, inside(w.p.NM, sp)...)
			}
		}
		grid = sortedUnique(grid)
		m := len(grid)
		r, rb, t, a := make([]float64, m), make([]float64, m), make([]float64, m), make([]float64, m)
		abs := make([][]float64, n)
		for i := range abs {
			abs[i] = make([]float64, m)
		}
		lr, lt := make([]float64, n), make([]float64, n)
		la := make([]float64, n)
		for k, nm := range grid {
			for i := range layers {
				var c bool
				lr[i], lt[i], c = physical(src[i][0].at(nm), src[i][1].at(nm))
				if c {
					clipped.add(nm)
				}
			}
			r[k], rb[k], t[k] = work.solve(lr, lt, la)
			a[k] = 1 - r[k] - t[k]
			for i := range abs {
				abs[i][k] = la[i]
			}
		}
		out.R.Pieces = append(out.R.Pieces, Piece{NM: grid, V: r})
		out.RBelow.Pieces = append(out.RBelow.Pieces, Piece{NM: grid, V: rb})
		out.T.Pieces = append(out.T.Pieces, Piece{NM: grid, V: t})
		out.A.Pieces = append(out.A.Pieces, Piece{NM: grid, V: a})
		for i := range abs {
			out.Absorbed[i].Pieces = append(out.Absorbed[i].Pieces, Piece{NM: grid, V: abs[i]})
		}
	}
	out.Closure = stackClosure(layers)
	lo, hi := out.R.Range()
	out.Assumptions = []string{
		fmt.Sprintf("Stack of %d layers, top first, combined by incoherent multiple reflection between layers much thicker "+
			"than the wavelength (common practice, no source): R = R₁ + T₁²R₂/(1 − R₁R₂), T = T₁T₂/(1 − R₁R₂), "+
			"A = 1 − R − T, applied pairwise.", n),
		"Each layer is taken as the same from both sides (a layer measured from one side only is assumed to reflect and transmit alike from the other), " +
			"with absorptance 1 − R − T.",
		fmt.Sprintf("The stack is computed where every layer has both R and T (%s–%s nm in all, %d range(s)), at the union of the layers' wavelengths, linear between them.",
			fmtNM(lo), fmtNM(hi), len(common)),
		"Spectral emittance equals spectral absorptance (Kirchhoff's law); the layers' uncertainties are not carried to the stack.",
	}
	if !clipped.empty() {
		out.Assumptions = append(out.Assumptions, fmt.Sprintf("Over %s a layer's R or T lay outside 0..1, or R + T above 1: clipped to 0..1 and scaled to R + T = 1 for the stack.", clipped))
	}
	return out, nil
}

// side is a layer or a sub-stack as light sees it: reflectance from above
// (rf) and from below (rb), and transmittance (the same both ways).
type side struct{ rf, rb, t float64 }

// passAll is the empty stack: it passes everything.
var passAll = side{0, 0, 1}

// over returns a stacked on b (a on top). Light crossing a bounces between
// a's underside and b's top: the geometric series Σ (a.rb b.rf)ᵏ sums to
// 1/(1 − a.rb b.rf). When that product is 1 both faces are perfect mirrors,
// so nothing crosses either and a.t = b.t = 0.
func over(a, b side) side {
	d := 1 - a.rb*b.rf
	if d <= 0 {
		return side{rf: a.rf, rb: b.rb}
	}
	return side{
		rf: a.rf + a.t*a.t*b.rf/d,
		rb: b.rb + b.t*b.t*a.rb/d,
		t:  a.t * b.t / d,
	}
}

// stackWork holds the scratch space of one stack evaluation.
type stackWork struct{ top, bottom []side }

// solve returns R (from above), R from below and T of the symmetric layers
// (r[i], t[i]), top first, and writes into abs[i] the fraction of the light
// falling on the top that layer i absorbs.
//
// Per-layer absorption by net fluxes. Let gap k lie below layer k (gap 0 is
// above the stack, gap n below it), with downward flux dₖ and upward flux uₖ
// per unit incident flux. The energy layer i (1-based) keeps is what flows
// into it minus what flows out:
//
//	Aᵢ = (dᵢ₋₁ + uᵢ) − (uᵢ₋₁ + dᵢ) = (dᵢ₋₁ − uᵢ₋₁) − (dᵢ − uᵢ),
//
// the net downward flux above it less the net downward flux below it. In
// gap k, with P = layers 1..k and S = layers k+1..n each combined by over,
// light arrives through P and then bounces between P's underside and S's
// top, so dₖ = P.t / (1 − P.rb S.rf) and uₖ = S.rf dₖ. At the ends d₀ = 1,
// u₀ = R and dₙ = T, uₙ = 0, so the Aᵢ telescope to Σ Aᵢ = 1 − R − T = A
// exactly (to rounding). Since uᵢ₋₁ = rᵢ dᵢ₋₁ + tᵢ uᵢ and
// dᵢ = tᵢ dᵢ₋₁ + rᵢ uᵢ, the same Aᵢ equals (1 − rᵢ − tᵢ)(dᵢ₋₁ + uᵢ): the
// layer's own absorptance times all the light falling on it (the tests check
// both forms).
func (w *stackWork) solve(r, t, abs []float64) (rf, rb, tt float64) {
	n := len(r)
	if cap(w.top) < n+1 {
		w.top, w.bottom = make([]side, n+1), make([]side, n+1)
	}
	top, bottom := w.top[:n+1], w.bottom[:n+1]
	top[0], bottom[n] = passAll, passAll
	for i := 0; i < n; i++ { // top[k]: layers 1..k
		top[i+1] = over(top[i], side{r[i], r[i], t[i]})
	}
	for i := n - 1; i >= 0; i-- { // bottom[k]: layers k+1..n
		bottom[i] = over(side{r[i], r[i], t[i]}, bottom[i+1])
	}
	whole := top[n]
	dPrev, uPrev := 1.0, whole.rf
	for k := 1; k <= n; k++ {
		var d, u float64
		if k == n {
			d, u = whole.t, 0
		} else if den := 1 - top[k].rb*bottom[k].rf; den > 0 {
			d = top[k].t / den
			u = bottom[k].rf * d
		}
		abs[k-1] = (dPrev - uPrev) - (d - u)
		dPrev, uPrev = d, u
	}
	return whole.rf, whole.rb, whole.t
}

// physical clips r and t to 0..1 and scales them down where r + t > 1; it
// reports whether it changed anything.
func physical(r, t float64) (float64, float64, bool) {
	r0, t0 := r, t
	r, t = math.Max(0, math.Min(1, r)), math.Max(0, math.Min(1, t))
	if s := r + t; s > 1 {
		r, t = r/s, t/s
	}
	return r, t, r != r0 || t != t0
}

// layerSpans returns the ranges over which a layer has both R and T.
func layerSpans(o Optics) []Interval {
	return intersect(pieceSpans(o.R), pieceSpans(o.T))
}

func pieceSpans(s Series) []Interval {
	var out []Interval
	for _, p := range s.Pieces {
		if len(p.NM) > 1 {
			out = append(out, Interval{p.NM[0], p.NM[len(p.NM)-1]})
		}
	}
	return out
}

// intersect returns the ranges of positive width common to a and b, both
// sorted lists of disjoint (or touching) closed ranges.
func intersect(a, b []Interval) []Interval {
	var out []Interval
	for i, j := 0, 0; i < len(a) && j < len(b); {
		lo, hi := math.Max(a[i].Lo, b[j].Lo), math.Min(a[i].Hi, b[j].Hi)
		if hi > lo {
			out = append(out, Interval{lo, hi})
		}
		if a[i].Hi < b[j].Hi {
			i++
		} else {
			j++
		}
	}
	return out
}

// pieceOver returns the piece of s that holds the whole of sp (one exists,
// since sp came from intersecting the pieces' ranges).
func pieceOver(s Series, sp Interval) Piece {
	for _, p := range s.Pieces {
		if len(p.NM) > 1 && p.NM[0] <= sp.Lo && p.NM[len(p.NM)-1] >= sp.Hi {
			return p
		}
	}
	panic("spectra: stack: no piece covers a common range")
}

// walker interpolates a piece at increasing wavelengths, keeping its place.
type walker struct {
	p Piece
	j int // p.NM[j] is the last point at or below the previous wavelength
}

// at returns the piece's value at nm, which must lie in the piece and not
// below the previous call's.
func (w *walker) at(nm float64) float64 {
	x := w.p.NM
	for w.j < len(x)-1 && x[w.j+1] <= nm {
		w.j++
	}
	if x[w.j] == nm || w.j == len(x)-1 {
		return w.p.V[w.j]
	}
	f := (nm - x[w.j]) / (x[w.j+1] - x[w.j])
	return w.p.V[w.j] + f*(w.p.V[w.j+1]-w.p.V[w.j])
}

// inside returns the points of the sorted nm strictly inside sp.
func inside(nm []float64, sp Interval) []float64 {
	i := sort.Search(len(nm), func(i int) bool { return nm[i] > sp.Lo })
	j := sort.Search(len(nm), func(i int) bool { return nm[i] >= sp.Hi })
	if i >= j {
		return nil
	}
	return nm[i:j]
}

func sortedUnique(g []float64) []float64 {
	sort.Float64s(g)
	out := g[:0]
	for i, v := range g {
		if i == 0 || v > out[len(out)-1] {
			out = append(out, v)
		}
	}
	return out
}

// stackClosure carries the layers' closure checks over to the stack: the
// worst residual, excess and minimum of any layer, and every problem
// prefixed with its layer's number (1 = top).
func stackClosure(layers []Optics) Closure {
	c := Closure{Tolerance: layers[0].Closure.Tolerance, Min: math.Inf(1), Excess: math.Inf(-1)}
	for i, l := range layers {
		lc := l.Closure
		c.Tolerance = math.Max(c.Tolerance, lc.Tolerance)
		if lc.Checked {
			c.Checked = true
			c.Points += lc.Points
			if lc.Residual > c.Residual {
				c.Residual, c.ResidualNM = lc.Residual, lc.ResidualNM
			}
		}
		if lc.Excess > c.Excess {
			c.Excess, c.ExcessNM = lc.Excess, lc.ExcessNM
		}
		if lc.Min < c.Min {
			c.Min, c.MinNM, c.MinOf = lc.Min, lc.MinNM, lc.MinOf
		}
		for _, p := range lc.Problems {
			c.Problems = append(c.Problems, fmt.Sprintf("Layer %d: %s", i+1, p))
		}
	}
	return c
}
