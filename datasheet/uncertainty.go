package datasheet

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"sort"

	"skysheet/spectra"
)

// Uncertainty is the standard uncertainty of a figure, in the figure's unit,
// propagated from the standard uncertainties of R and T given with the data
// (docs/cooling.md, "Uncertainty"), three ways:
//
//   - Uncorrelated ("if noise"): the errors are correlated within a
//     spectral resolution element of each file and independent beyond it
//     and between files, so that the figure does not depend on how finely
//     the file was exported.
//   - Correlated ("together", "if offset"): the errors of each file (one
//     instrument) move as one, those of different files independently.
//   - WorstCase: the errors of every file move as one, with the signs
//     that add up: Σ over files of |the figure's move with that file's
//     errors|, the bound whatever the correlation between instruments.
//
// The errors of R and those of T are taken as independent of each other.
//
// Reach is the share of the figure's sensitivity, Σ|∂F/∂x| over the
// wavelengths it rests on, that falls where an uncertainty was stated; below
// 1 the uncertainty is understated. A figure with less than minReach gets
// no Uncertainty at all.
type Uncertainty struct {
	Uncorrelated Num `json:"uncorrelated"`
	Correlated   Num `json:"correlated"`
	WorstCase    Num `json:"worst_case"`
	Reach        Num `json:"reach"`
}

// minReach is the least reach for which an uncertainty is reported.
const minReach = 1e-3

// gradient holds the derivative of a figure with respect to every value of
// the resolved R, T and A series, indexed like their pieces; nil rows mean
// no dependence.
type gradient [3][][]float64

// plus returns g + a·h.
func (g gradient) plus(a float64, h gradient) gradient {
	var out gradient
	for q := range out {
		n := max(len(g[q]), len(h[q]))
		if n == 0 {
			continue
		}
		out[q] = make([][]float64, n)
		for p := range n {
			var x, y []float64
			if p < len(g[q]) {
				x = g[q][p]
			}
			if p < len(h[q]) {
				y = h[q][p]
			}
			if x == nil && y == nil {
				continue
			}
			row := make([]float64, max(len(x), len(y)))
			for j, v := range x {
				row[j] += v
			}
			for j, v := range y {
				row[j] += a * v
			}
			out[q][p] = row
		}
	}
	return out
}

// scale returns a·g.
func (g gradient) scale(a float64) gradient { return gradient{}.plus(a, g) }

// shifted returns a copy of s in which quantity q (R or T) is moved by
// sign × its standard uncertainty at every row where both are given.
func shifted(s *spectra.Spectrum, q spectra.Quantity, sign float64) *spectra.Spectrum {
	u := spectra.UR
	if q == spectra.T {
		u = spectra.UT
	}
	out := &spectra.Spectrum{Meta: s.Meta, Sources: s.Sources, Segments: make([]spectra.Segment, len(s.Segments))}
	for i, g := range s.Segments {
		out.Segments[i] = g
		if g.Values[q] == nil || g.Values[u] == nil {
			continue
		}
		v := make([]float64, len(g.NM))
		for j, x := range g.Values[q] {
			v[j] = x + sign*math.Abs(g.Values[u][j]) // NaN stays NaN
			if math.IsNaN(v[j]) && !math.IsNaN(x) {
				v[j] = x
			}
		}
		out.Segments[i].Values[q] = v
	}
	return out
}

// hasUncertainty reports whether s gives a standard uncertainty for q
// somewhere q is measured, and over which wavelengths.
func hasUncertainty(s *spectra.Spectrum, q spectra.Quantity) (ok bool, lo, hi float64) {
	u := spectra.UR
	if q == spectra.T {
		u = spectra.UT
	}
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, g := range s.Segments {
		if g.Values[q] == nil || g.Values[u] == nil {
			continue
		}
		for j, nm := range g.NM {
			if !math.IsNaN(g.Values[q][j]) && !math.IsNaN(g.Values[u][j]) {
				ok = true
				lo, hi = math.Min(lo, nm), math.Max(hi, nm)
			}
		}
	}
	return ok, lo, hi
}

// probe is the effect on the resolved optics of moving one measured
// quantity by its standard uncertainty everywhere at once: the change of
// every value, and the row of the table each value belongs to.
type probe struct {
	delta gradient // o⁺ − o at every point, indexed like o
	slot  [3][][]int
}

// newProbe moves quantity q of s up by its uncertainty and resolves it
// again. Resolve is affine in each measured value, wavelength by
// wavelength (A = 1 − R − T and the like, nothing clipped), so the change
// is the same, with the opposite sign, for a move down.
func newProbe(s *spectra.Spectrum, q spectra.Quantity, o spectra.Optics, tol float64, rt *rowTable) *probe {
	op := spectra.Resolve(shifted(s, q, +1), tol)
	pr := &probe{}
	// Pointwise changes. Resolve works wavelength by wavelength, so the
	// change at one point comes from that wavelength's own uncertainty; the
	// slots (the rows of rt) group the R, T and A values of one wavelength.
	for qi, pair := range [3][2]spectra.Series{{o.R, op.R}, {o.T, op.T}, {o.A, op.A}} {
		base, up := pair[0], pair[1]
		pr.delta[qi] = make([][]float64, len(base.Pieces))
		pr.slot[qi] = make([][]int, len(base.Pieces))
		if len(up.Pieces) != len(base.Pieces) {
			continue // cannot happen: Resolve's shape does not depend on values
		}
		for p, pc := range base.Pieces {
			if len(up.Pieces[p].V) != len(pc.V) {
				continue
			}
			d := make([]float64, len(pc.V))
			sl := make([]int, len(pc.V))
			at := nmCursor{nm: rt.sorted}
			for j, nm := range pc.NM {
				d[j] = up.Pieces[p].V[j] - pc.V[j]
				if i, ok := at.find(nm); ok {
					sl[j] = rt.sortedK[i]
				} else {
					sl[j] = rt.slot(nm)
				}
			}
			pr.delta[qi][p], pr.slot[qi][p] = d, sl
		}
	}
	return pr
}

// together returns Σ g·δ: the change of a figure (exact for a linear one,
// else to first order) when the quantity moves by its uncertainty
// everywhere at once.
func (pr *probe) together(g gradient) float64 {
	var sum float64
	for q := range g {
		for p, row := range g[q] {
			if p >= len(pr.delta[q]) || pr.delta[q][p] == nil {
				continue
			}
			d := pr.delta[q][p]
			for j, c := range row {
				if j < len(d) {
					sum += c * d[j]
				}
			}
		}
	}
	return sum
}

// statedMask returns, for every value of o's R, T and A series, whether
// its uncertainty is known from the data: R and T where u_R or u_T is given;
// A where it was derived as 1 − R − T and the uncertainties of the measured
// R and T behind it are given.
func statedMask(s *spectra.Spectrum, o spectra.Optics) [3][][]bool {
	type row struct{ r, t, a, ur, ut bool }
	has := func(g spectra.Segment, q spectra.Quantity, j int) bool {
		return g.Values[q] != nil && !math.IsNaN(g.Values[q][j])
	}
	// The rows by wavelength; where two segments share one, the later
	// segment's row counts.
	type entry struct {
		nm float64
		w  row
	}
	var rows []entry
	for _, g := range s.Segments {
		for j, nm := range g.NM {
			rows = append(rows, entry{nm, row{r: has(g, spectra.R, j), t: has(g, spectra.T, j), a: has(g, spectra.A, j),
				ur: has(g, spectra.UR, j), ut: has(g, spectra.UT, j)}})
		}
	}
	if !slices.IsSortedFunc(rows, func(a, b entry) int { return cmp.Compare(a.nm, b.nm) }) {
		slices.SortStableFunc(rows, func(a, b entry) int { return cmp.Compare(a.nm, b.nm) })
	}
	nms := make([]float64, 0, len(rows))
	ws := make([]row, 0, len(rows))
	for _, e := range rows {
		if n := len(nms); n > 0 && nms[n-1] == e.nm {
			ws[n-1] = e.w
			continue
		}
		nms, ws = append(nms, e.nm), append(ws, e.w)
	}
	var out [3][][]bool
	for q, x := range [3]spectra.Series{o.R, o.T, o.A} {
		out[q] = make([][]bool, len(x.Pieces))
		for p, pc := range x.Pieces {
			m := make([]bool, len(pc.NM))
			at := nmCursor{nm: nms}
			for j, nm := range pc.NM {
				var w row
				if i, ok := at.find(nm); ok {
					w = ws[i]
				}
				switch q {
				case int(spectra.R):
					m[j] = w.r && w.ur
				case int(spectra.T):
					m[j] = w.t && w.ut
				default:
					m[j] = !w.a && w.r && w.ur && (!w.t || w.ut)
				}
			}
			out[q][p] = m
		}
	}
	return out
}

// nmCursor finds wavelengths in a sorted list of distinct wavelengths,
// walking on from the last one found when the next is near, else
// searching: finding n increasing wavelengths costs about O(n).
type nmCursor struct {
	nm []float64
	i  int
}

// find returns the index of the first wavelength at or after x, and
// whether it is x.
func (c *nmCursor) find(x float64) (int, bool) {
	i := c.i
	if i > 0 && c.nm[i-1] >= x || i+8 < len(c.nm) && c.nm[i+8] < x {
		i = sort.SearchFloat64s(c.nm, x)
	} else {
		for i < len(c.nm) && c.nm[i] < x {
			i++
		}
	}
	c.i = i
	return i, i < len(c.nm) && c.nm[i] == x
}

// reachOf returns Σ|g| where the value's uncertainty is known over Σ|g|.
func reachOf(g gradient, mask [3][][]bool) float64 {
	var t, c float64
	for q := range g {
		for p, row := range g[q] {
			if p >= len(mask[q]) {
				continue
			}
			for j, v := range row {
				if j < len(mask[q][p]) {
					t += math.Abs(v)
					if mask[q][p][j] {
						c += math.Abs(v)
					}
				}
			}
		}
	}
	if t == 0 {
		return 0
	}
	return c / t
}

// bySlot sets buf[k] to Σ_q g·δ over the values at row k: the change of
// a linear figure when the quantity moves by its uncertainty at that
// wavelength alone.
func (pr *probe) bySlot(g gradient, buf []float64) {
	clear(buf)
	for q := range g {
		for p, row := range g[q] {
			if row == nil || p >= len(pr.delta[q]) || pr.delta[q][p] == nil {
				continue
			}
			d, sl := pr.delta[q][p], pr.slot[q][p]
			for j, c := range row {
				if j < len(d) && d[j] != 0 {
					buf[sl[j]] += c * d[j]
				}
			}
		}
	}
}

// rowTable lists the wavelengths of a spectrum's rows with the file each
// comes from (its group) and its position in resolution elements, sorted
// by group, then wavelength; slot finds a row by wavelength.
type rowTable struct {
	nm    []float64
	group []int
	pos   []float64 // ∫ dλ / w(λ): resolution elements from an arbitrary origin
	// sorted are the rows' distinct wavelengths in increasing order,
	// sortedK the row of each (the last, where rows share one); added
	// holds the rows slot adds.
	sorted  []float64
	sortedK []int
	added   map[float64]int
	end     []int // see windows
}

// newRowTable returns the rows of s. A row whose file is not known (a
// spectrum built without a reader) is its own group with the default
// resolution of a nm axis.
func newRowTable(s *spectra.Spectrum) *rowTable {
	type row struct {
		nm, pos float64
		group   int
	}
	n := 0
	for _, g := range s.Segments {
		n += len(g.NM)
	}
	// firstOf[i] is the first measurement from the file of measurement i:
	// the group of its rows.
	firstOf := make([]int, len(s.Measurements))
	for i, m := range s.Measurements {
		firstOf[i] = slices.IndexFunc(s.Measurements, func(x spectra.Measurement) bool { return x.Source == m.Source })
	}
	rows := make([]row, 0, n)
	var cands []int
	for i := range s.Segments {
		g := &s.Segments[i]
		// The measurements behind the segment, as MeasurementAt finds
		// them: the first whose range holds the wavelength, else the
		// first.
		cands = cands[:0]
		for k := range s.Measurements {
			if s.MeasurementOf(g, k) {
				cands = append(cands, k)
			}
		}
		for _, nm := range g.NM {
			group := -1
			res := spectra.DefaultResolution("nm")
			if len(cands) > 0 {
				k := cands[0]
				for _, c := range cands {
					if m := &s.Measurements[c]; nm >= m.Lo && nm <= m.Hi {
						k = c
						break
					}
				}
				res, group = s.Measurements[k].Resolution, firstOf[k]
			}
			rows = append(rows, row{nm: nm, pos: elements(res, nm), group: group})
		}
	}
	slices.SortFunc(rows, func(a, b row) int {
		if a.group != b.group {
			return a.group - b.group
		}
		return cmp.Compare(a.nm, b.nm)
	})
	rt := &rowTable{nm: make([]float64, len(rows)), group: make([]int, len(rows)), pos: make([]float64, len(rows))}
	for k, r := range rows {
		rt.nm[k], rt.group[k], rt.pos[k] = r.nm, r.group, r.pos
	}
	order := make([]int, len(rows))
	for k := range order {
		order[k] = k
	}
	slices.SortStableFunc(order, func(a, b int) int { return cmp.Compare(rt.nm[a], rt.nm[b]) })
	rt.sorted, rt.sortedK = make([]float64, 0, len(rows)), make([]int, 0, len(rows))
	for _, k := range order {
		if n := len(rt.sorted); n > 0 && rt.sorted[n-1] == rt.nm[k] {
			rt.sortedK[n-1] = k // the last row of that wavelength
			continue
		}
		rt.sorted, rt.sortedK = append(rt.sorted, rt.nm[k]), append(rt.sortedK, k)
	}
	return rt
}

// slot returns the row of wavelength nm, adding one (a group of its own)
// if the spectrum has none there.
func (rt *rowTable) slot(nm float64) int {
	if i, ok := slices.BinarySearch(rt.sorted, nm); ok {
		return rt.sortedK[i]
	}
	if k, ok := rt.added[nm]; ok {
		return k
	}
	k := len(rt.nm)
	rt.nm, rt.group, rt.pos = append(rt.nm, nm), append(rt.group, -2-k), append(rt.pos, 0)
	if rt.added == nil {
		rt.added = map[float64]int{}
	}
	rt.added[nm] = k
	return k
}

// elements returns the position of wavelength nm in resolution elements of
// r: ∫ dλ / w(λ) with w = max(NM, λ²Δν̃) (see [spectra.Resolution.Width]),
// in closed form.
func elements(r spectra.Resolution, nm float64) float64 {
	a, b := r.NM, r.Wavenumber*1e-7 // w = max(a, b λ²)
	switch {
	case b <= 0:
		return nm / a
	case a <= 0:
		return -1 / (b * nm)
	}
	c := math.Sqrt(a / b) // where a = b λ²
	if nm <= c {
		return nm / a
	}
	return c/a + 1/(b*c) - 1/(b*nm)
}

// spread returns the standard uncertainty of a linear figure whose change
// per row is b: √(Σ_k Σ_l b_k b_l ρ_kl) with ρ_kl = max(0, 1 − |pos_k −
// pos_l|) within a file and 0 between files. The triangular correlation
// is that of errors averaged over one resolution element (a box filter's
// autocorrelation), so it is positive semi-definite; on a grid of whole
// fractions of an element its sum over neighbours, times the spacing, is
// exactly one element, so the result does not depend on the spacing.
func (rt *rowTable) spread(b []float64) float64 {
	var sum float64
	n := len(b)
	end := rt.windows(n)
	for k := 0; k < n; k++ {
		x := b[k]
		if x == 0 {
			continue
		}
		sum += x * x
		pk := rt.pos[k]
		near, bl := rt.pos[k+1:end[k]], b[k+1:end[k]]
		for l, pl := range near {
			d := pl - pk
			sum += 2 * x * bl[l] * (1 - d)
		}
	}
	return math.Sqrt(math.Max(0, sum))
}

// windows returns, for each of the first n rows k, the end of the rows
// after it in its file that lie less than one resolution element away
// (the rows k+1 … end[k]−1): the same for every figure, found once.
func (rt *rowTable) windows(n int) []int {
	if len(rt.end) == n {
		return rt.end
	}
	rt.end = make([]int, n)
	for k := range n {
		l := k + 1
		for l < n && rt.group[l] == rt.group[k] && !(rt.pos[l]-rt.pos[k] >= 1) {
			l++
		}
		rt.end[k] = l
	}
	return rt.end
}

// byGroup returns, with c_f = Σ_k∈f b_k the change of a linear figure when
// the errors of file f move as one, √Σ_f c_f² (files independent) and
// Σ_f |c_f| (files fully correlated, with the signs that add up: the bound
// whatever the correlation between instruments), and the number of files
// with a non-zero c_f.
func (rt *rowTable) byGroup(b []float64) (together, bound float64, files int) {
	var sum, part float64
	n, files := len(b), 0
	for k := 0; k < n; k++ {
		part += b[k]
		if k == n-1 || rt.group[k+1] != rt.group[k] {
			if part != 0 {
				files++
			}
			sum += part * part
			bound += math.Abs(part)
			part = 0
		}
	}
	return math.Sqrt(sum), bound, files
}

// addUncertainty sets the uncertainty of every figure in f when s gives
// standard uncertainties of R or T, by the law of propagation of
// uncertainty (JCGM 100:2008 5.1.2 and 5.2.2): with b_k = Σ_q ∂F/∂q δq at
// row k, from the gradients grads and the pointwise change δ of the
// resolved R, T and A when the measured quantity moves by its uncertainty,
// "noise" is spread(b), "together" and the worst case come from the sums
// of b over each file (byGroup). The sums are exact for the linear
// figures and first order for the others (the equilibria, the SRI).
func addUncertainty(f *Figures, s *spectra.Spectrum, o spectra.Optics, grads map[string]gradient, tol float64) {
	var probes []*probe
	var rt *rowTable
	for _, q := range []spectra.Quantity{spectra.R, spectra.T} {
		ok, lo, hi := hasUncertainty(s, q)
		if !ok {
			continue
		}
		if rt == nil {
			rt = newRowTable(s)
		}
		probes = append(probes, newProbe(s, q, o, tol, rt))
		f.Assumptions = append(f.Assumptions, fmt.Sprintf("The standard uncertainty of %s is given over %s–%s nm; "+
			"elsewhere %s is taken as exact, which understates the uncertainty of figures that reach there.",
			q, fmtNM(lo), fmtNM(hi), q))
	}
	if len(probes) == 0 {
		return
	}
	words := "Uncertainties: errors correlated within a resolution element, independent beyond it (noise); each file's " +
		"errors as one, files independent (together); every file's as one, adding up (worst case); R and T independent."
	f.Assumptions = append(f.Assumptions, words)
	mask := statedMask(s, o)
	buf := make([]float64, len(rt.nm))
	for i := range f.Figures {
		x := &f.Figures[i]
		if math.IsNaN(float64(x.Value)) {
			continue
		}
		g, ok := grads[x.Key]
		if !ok {
			continue
		}
		reach := reachOf(g, mask)
		if reach < minReach {
			continue
		}
		var u2, t2, w2 float64
		for _, pr := range probes {
			w := pr.together(g)
			pr.bySlot(g, buf)
			u := rt.spread(buf)
			u2 += u * u
			t, bound, files := rt.byGroup(buf)
			if files <= 1 {
				// One file: together is the worst case.
				t, bound = w, w
			}
			t2 += t * t
			w2 += bound * bound
		}
		x.Uncertainty = &Uncertainty{Uncorrelated: Num(math.Sqrt(u2)), Correlated: Num(math.Sqrt(t2)),
			WorstCase: Num(math.Sqrt(w2)), Reach: Num(reach)}
	}
}

func fmtNM(nm float64) string { return fmtG(math.Round(nm*100) / 100) }
