package site

import (
	"math"
	"slices"

	"skysheet/spectra"
)

// thin returns a piece thinned for a chart whose x axis spans [lo, hi] over
// about px pixels: each run of finite values keeps about one point per
// pixel it spans, chosen by largest-triangle-three-buckets (see lttb), and
// always its lowest and highest point. Charts only: figures and downloads
// always use the full data.
//
// Why the extremes are added: LTTB keeps the point of each bucket that
// makes the largest triangle with its neighbours' choices, which keeps a
// narrow peak or dip in almost every case but not in all (two features in
// one bucket: one is dropped). A reader judges a spectrum by its deepest
// dip and highest peak first, so the run's global minimum and maximum are
// always kept; that costs at most two points and makes the drawn range of
// every curve the range of its data.
//
// Gaps: a piece is drawn as one line and pieces are never joined, so a gap
// between pieces stays a gap. A NaN inside a piece (no reader gives one;
// the chart builders leave missing values out) ends a run and is drawn as a
// gap as well, rather than handed to the renderer.
func thin(p spectra.Piece, lo, hi float64, px int) []spectra.Piece {
	var out []spectra.Piece
	for start := 0; start < len(p.NM); {
		if !finite(p.NM[start]) || !finite(p.V[start]) {
			start++
			continue
		}
		end := start + 1
		for end < len(p.NM) && finite(p.NM[end]) && finite(p.V[end]) {
			end++
		}
		out = append(out, thinRun(spectra.Piece{NM: p.NM[start:end], V: p.V[start:end]}, lo, hi, px))
		start = end
	}
	return out
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }

// thinRun thins one run of finite points (see thin).
func thinRun(p spectra.Piece, lo, hi float64, px int) spectra.Piece {
	n := len(p.NM)
	if px <= 0 || !(hi > lo) {
		return p
	}
	// About one point per pixel of the axis that the run spans.
	want := max(3, int(math.Ceil(float64(px)*(p.NM[n-1]-p.NM[0])/(hi-lo))))
	if n <= want {
		return p
	}
	keep := lttb(p.NM, p.V, want)
	lowest, highest := 0, 0
	for i, v := range p.V {
		if v < p.V[lowest] {
			lowest = i
		}
		if v > p.V[highest] {
			highest = i
		}
	}
	for _, i := range []int{lowest, highest} {
		if j, found := slices.BinarySearch(keep, i); !found {
			keep = slices.Insert(keep, j, i)
		}
	}
	out := spectra.Piece{NM: make([]float64, len(keep)), V: make([]float64, len(keep))}
	for k, i := range keep {
		out.NM[k], out.V[k] = p.NM[i], p.V[i]
	}
	return out
}

// lttb returns, in increasing order, the indices of the n points of (x, y)
// that the largest-triangle-three-buckets algorithm keeps (S. Steinarsson,
// "Downsampling Time Series for Visual Representation", 2013): the
// first and the last point, and from each of n−2 buckets of consecutive
// points (equal counts, bucket i being points 1+⌊i·k⌋ to 1+⌊(i+1)·k⌋−1 with
// k = (len−2)/(n−2)) the one point that makes the largest triangle with the
// point kept from the bucket before and the mean point of the bucket after
// (for the last bucket, the last point). Ties go to the first point.
//
// With len(x) ≤ n every index is returned; with n < 3, the first and the
// last. x and y must be finite and of equal length; x is expected to
// increase (the buckets are by count, not by x).
func lttb(x, y []float64, n int) []int {
	size := len(x)
	if size <= n || size <= 2 {
		out := make([]int, size)
		for i := range out {
			out[i] = i
		}
		return out
	}
	if n < 3 {
		return []int{0, size - 1}
	}
	every := float64(size-2) / float64(n-2)
	// bucket returns the first and one past the last index of bucket i.
	bucket := func(i int) (int, int) {
		return 1 + int(math.Floor(float64(i)*every)), 1 + int(math.Floor(float64(i+1)*every))
	}
	out := make([]int, 0, n)
	out = append(out, 0)
	a := 0
	for i := range n - 2 {
		from, to := bucket(i)
		// The mean point of the next bucket, or the last point.
		var cx, cy float64
		if i == n-3 {
			cx, cy = x[size-1], y[size-1]
		} else {
			nf, nt := bucket(i + 1)
			for j := nf; j < nt; j++ {
				cx += x[j]
				cy += y[j]
			}
			cx /= float64(nt - nf)
			cy /= float64(nt - nf)
		}
		ax, ay := x[a], y[a]
		best, bestArea := from, -1.0
		for j := from; j < to; j++ {
			// Twice the triangle's area, halved as the reference
			// implementations do so that ties fall alike; the explicit
			// conversions forbid fused multiply-adds, which would round
			// differently.
			area := math.Abs(float64((ax-cx)*(y[j]-ay))-float64((ax-x[j])*(cy-ay))) / 2
			if area > bestArea {
				best, bestArea = j, area
			}
		}
		out = append(out, best)
		a = best
	}
	return append(out, size-1)
}
