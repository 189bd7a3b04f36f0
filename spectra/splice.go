package spectra

import (
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"path/filepath"
	"sort"
	"strings"
)

// SpliceMethod is how splice matches one instrument's data to the other's
// in their overlap.
type SpliceMethod int

// The splice methods.
const (
	SpliceOffset SpliceMethod = iota // add the least-squares offset
	SpliceScale                      // multiply by the least-squares factor
	SpliceNone                       // cut at the junction, adjust nothing
)

// String returns the method's name: offset, scale or none.
func (m SpliceMethod) String() string {
	switch m {
	case SpliceOffset:
		return "offset"
	case SpliceScale:
		return "scale"
	case SpliceNone:
		return "none"
	}
	return fmt.Sprintf("SpliceMethod(%d)", int(m))
}

// MarshalText writes the method's name.
func (m SpliceMethod) MarshalText() ([]byte, error) { return []byte(m.String()), nil }

// UnmarshalText reads a method named offset, scale or none.
func (m *SpliceMethod) UnmarshalText(b []byte) error {
	x, err := parseSpliceMethod(string(b))
	if err == nil {
		*m = x
	}
	return err
}

// parseSpliceMethod returns the method named offset, scale or none.
func parseSpliceMethod(s string) (SpliceMethod, error) {
	for _, m := range []SpliceMethod{SpliceOffset, SpliceScale, SpliceNone} {
		if strings.EqualFold(strings.TrimSpace(s), m.String()) {
			return m, nil
		}
	}
	return 0, fmt.Errorf("%q %w: want offset, scale or none", s, errSpliceMethod)
}

// DefaultSpliceTol is the default tolerance on the mean junction mismatch
// |ΔR| before correction (common practice, no source).
const DefaultSpliceTol = 0.02

// The errors splice and [Join] may return.
var (
	errSpliceMethod = errors.New("is not a splice method")
	errNoOverlap    = errors.New("ranges do not overlap")
	errNested       = errors.New("lies within the other's range: nothing to splice")
	errShortOverlap = errors.New("has fewer than 2 points in the overlap to fit")
	errNoCommon     = errors.New("no quantity is measured by both over the overlap")
	errJunction     = errors.New("junction lies outside the overlap")
	errAdjust       = errors.New("does not name one of the spliced files")
	errScale        = errors.New("fitted scale factor is not positive")
)

// SpliceOptions chooses how two overlapping spectra are joined. The zero
// value splices by offset, adjusts the longer-wavelength part, cuts at the
// middle of the overlap and flags mismatches above [DefaultSpliceTol].
type SpliceOptions struct {
	Method SpliceMethod
	// Adjust names the file whose data are adjusted (a source as given, or
	// its base name); "" means the part reaching the longer wavelengths.
	Adjust string
	// JunctionNM is where the spliced spectrum passes from one part to the
	// other; 0 means the middle of the overlap.
	JunctionNM float64
	// Tolerance on the mean |Δ| before correction above which a splice is
	// flagged; 0 means DefaultSpliceTol.
	Tolerance float64
}

// SpliceRecord says what splice did for one quantity at one junction.
// Its JSON form (see MarshalJSON) is the one in figures.json and in the
// neutral format's "# splice:" metadata.
type SpliceRecord struct {
	Quantity   Quantity     // R, T or A
	JunctionNM float64      // where the data pass from one part to the other
	OverlapNM  [2]float64   // the overlap of both parts
	Method     SpliceMethod // offset, scale or none
	Adjusted   string       // sources of the adjusted part, joined by "+"
	Fixed      string       // sources of the part matched to
	// Value is the offset added to the adjusted part, or the factor it was
	// multiplied by; 0 for SpliceNone.
	Value float64
	// MismatchMean and MismatchMax are the mean and largest |adjusted −
	// fixed| over the overlap before correction; ResidualMean and
	// ResidualMax the same after.
	MismatchMean, MismatchMax float64
	ResidualMean, ResidualMax float64
	Points                    int     // wavelengths compared in the overlap
	Tolerance                 float64 // on MismatchMean
	Flagged                   bool    // MismatchMean > Tolerance
}

// spliceJSON is the JSON form of a SpliceRecord.
type spliceJSON struct {
	Quantity     string     `json:"quantity"`
	JunctionNM   float64    `json:"junction_nm"`
	OverlapNM    [2]float64 `json:"overlap_nm"`
	Method       string     `json:"method"`
	Adjusted     string     `json:"adjusted"`
	Fixed        string     `json:"fixed"`
	Value        float64    `json:"offset_or_scale"`
	MismatchMean float64    `json:"mismatch_mean"`
	MismatchMax  float64    `json:"mismatch_max"`
	ResidualMean float64    `json:"residual_mean"`
	ResidualMax  float64    `json:"residual_max"`
	Points       int        `json:"points"`
	Tolerance    float64    `json:"tolerance"`
	Flagged      bool       `json:"flagged"`
}

// MarshalJSON writes the record with the keys quantity, junction_nm,
// overlap_nm, method, adjusted, fixed, offset_or_scale, mismatch_mean,
// mismatch_max, residual_mean, residual_max, points, tolerance and flagged.
func (r SpliceRecord) MarshalJSON() ([]byte, error) {
	return json.Marshal(spliceJSON{r.Quantity.String(), r.JunctionNM, r.OverlapNM, r.Method.String(), r.Adjusted, r.Fixed,
		r.Value, r.MismatchMean, r.MismatchMax, r.ResidualMean, r.ResidualMax, r.Points, r.Tolerance, r.Flagged})
}

// UnmarshalJSON reads the form written by MarshalJSON.
func (r *SpliceRecord) UnmarshalJSON(b []byte) error {
	var j spliceJSON
	if err := json.Unmarshal(b, &j); err != nil {
		return err
	}
	m, err := parseSpliceMethod(j.Method)
	if err != nil {
		return err
	}
	q := -1
	for _, c := range []Quantity{R, T, A} {
		if j.Quantity == c.String() {
			q = int(c)
		}
	}
	if q < 0 {
		return fmt.Errorf("quantity %q: want R, T or A", j.Quantity)
	}
	*r = SpliceRecord{Quantity(q), j.JunctionNM, j.OverlapNM, m, j.Adjusted, j.Fixed, j.Value,
		j.MismatchMean, j.MismatchMax, j.ResidualMean, j.ResidualMax, j.Points, j.Tolerance, j.Flagged}
	return nil
}

func decodeSpliceRecord(v string) (SpliceRecord, error) {
	var r SpliceRecord
	err := json.Unmarshal([]byte(v), &r)
	return r, err
}

// splice joins two spectra of one sample whose ranges overlap, such as a
// UV-Vis-NIR file and an FTIR file that both cover 2.4–2.6 µm. For each of
// R, T and A measured by both over the overlap it compares the two at every
// measured wavelength of either inside the overlap (each linear between its
// own points), fits the offset c minimising Σ(g + c − f)² (c = mean(f − g))
// or the factor k minimising Σ(k·g − f)² (k = Σfg / Σg²), where f is the
// fixed part and g the adjusted one, and applies it to the adjusted part
// (a factor also scales that quantity's uncertainty). The result follows the
// lower-starting part up to the junction and the other after it; at the
// junction it takes the fixed part's value. Every quantity is cut there.
//
// The returned spectrum carries one [SpliceRecord] per fitted quantity in
// Splices and a sentence for each in Notes; the returned record is the
// first (R before T before A). Neither input is modified.
func splice(a, b *Spectrum, opt SpliceOptions) (*Spectrum, SpliceRecord, error) {
	if a == nil || b == nil || len(a.Segments) == 0 || len(b.Segments) == 0 {
		return nil, SpliceRecord{}, fmt.Errorf("spectra: splice: %w", ErrNoData)
	}
	if opt.Method < SpliceOffset || opt.Method > SpliceNone {
		return nil, SpliceRecord{}, fmt.Errorf("spectra: splice: %v %w", opt.Method, errSpliceMethod)
	}
	alo, ahi := a.Range()
	blo, bhi := b.Range()
	if blo < alo || blo == alo && bhi < ahi {
		a, b = b, a
		alo, ahi, blo, bhi = blo, bhi, alo, ahi
	}
	an, bn := sourceName(a), sourceName(b)
	olo, ohi := blo, math.Min(ahi, bhi)
	switch {
	case !(ohi > olo):
		return nil, SpliceRecord{}, fmt.Errorf("spectra: splice %s (%s–%s nm) and %s (%s–%s nm): %w",
			an, fmtNM(alo), fmtNM(ahi), bn, fmtNM(blo), fmtNM(bhi), errNoOverlap)
	case bhi <= ahi:
		return nil, SpliceRecord{}, fmt.Errorf("spectra: splice: %s (%s–%s nm) %w %s (%s–%s nm)",
			bn, fmtNM(blo), fmtNM(bhi), errNested, an, fmtNM(alo), fmtNM(ahi))
	}
	fixed, adj := a, b
	if opt.Adjust != "" {
		ma, mb := hasSource(a, opt.Adjust), hasSource(b, opt.Adjust)
		switch {
		case ma && !mb:
			fixed, adj = b, a
		case mb && !ma:
		default:
			return nil, SpliceRecord{}, fmt.Errorf("spectra: splice %s and %s: adjust %q %w", an, bn, opt.Adjust, errAdjust)
		}
	}
	tol := opt.Tolerance
	if !(tol > 0) {
		tol = DefaultSpliceTol
	}
	junction := opt.JunctionNM
	if junction == 0 {
		junction = (olo + ohi) / 2
	} else if !(junction >= olo && junction <= ohi) {
		return nil, SpliceRecord{}, fmt.Errorf("spectra: splice %s and %s: %s nm: %w (%s–%s nm)", an, bn, fmtNM(junction), errJunction, fmtNM(olo), fmtNM(ohi))
	}

	adjusted := adj.clone()
	var recs []SpliceRecord
	for _, q := range []Quantity{R, T, A} {
		f, g := fixed.Series(q), adj.Series(q)
		if f.Empty() || g.Empty() {
			continue
		}
		fv, gv := compare(f, g, olo, ohi)
		if len(fv) == 0 {
			continue
		}
		if len(fv) < 2 {
			return nil, SpliceRecord{}, fmt.Errorf("spectra: splice %s and %s: %s %w (%s–%s nm)", an, bn, q, errShortOverlap, fmtNM(olo), fmtNM(ohi))
		}
		r := SpliceRecord{Quantity: q, JunctionNM: junction, OverlapNM: [2]float64{olo, ohi}, Method: opt.Method,
			Adjusted: sourceName(adj), Fixed: sourceName(fixed), Points: len(fv), Tolerance: tol}
		var sfg, sgg, sd float64
		for i := range fv {
			sfg += fv[i] * gv[i]
			sgg += gv[i] * gv[i]
			sd += fv[i] - gv[i]
		}
		apply := func(x float64) float64 { return x }
		switch opt.Method {
		case SpliceOffset:
			r.Value = sd / float64(len(fv))
			c := r.Value
			apply = func(x float64) float64 { return x + c }
		case SpliceScale:
			r.Value = 1
			if sgg > 0 {
				r.Value = sfg / sgg
			}
			if !(r.Value > 0) || math.IsInf(r.Value, 0) {
				return nil, SpliceRecord{}, fmt.Errorf("spectra: splice %s and %s: %s: %w (%s)", an, bn, q, errScale, fmtNum(r.Value))
			}
			k := r.Value
			apply = func(x float64) float64 { return k * x }
		}
		for i := range fv {
			d, e := math.Abs(gv[i]-fv[i]), math.Abs(apply(gv[i])-fv[i])
			r.MismatchMean += d
			r.ResidualMean += e
			r.MismatchMax = math.Max(r.MismatchMax, d)
			r.ResidualMax = math.Max(r.ResidualMax, e)
		}
		r.MismatchMean /= float64(len(fv))
		r.ResidualMean /= float64(len(fv))
		r.Flagged = r.MismatchMean > tol
		adjusted.mapValues(q, apply)
		if opt.Method == SpliceScale && (q == R || q == T) {
			u, k := UR, r.Value
			if q == T {
				u = UT
			}
			adjusted.mapValues(u, func(x float64) float64 { return k * x })
		}
		recs = append(recs, r)
	}
	if len(recs) == 0 {
		return nil, SpliceRecord{}, fmt.Errorf("spectra: splice %s and %s (%s–%s nm): %w", an, bn, fmtNM(olo), fmtNM(ohi), errNoCommon)
	}

	fixedCut, adjCut := fixed.clone(), adjusted
	lower, upper := fixedCut, adjCut
	if fixed == b {
		lower, upper = adjCut, fixedCut
	}
	lower.Segments = cutSegments(lower.Segments, junction, true)
	upper.Segments = cutSegments(upper.Segments, junction, false)
	// At the junction both parts take the fixed part's value where it has one.
	if n := len(lower.Segments); n > 0 && len(upper.Segments) > 0 {
		lg, ug := &lower.Segments[n-1], &upper.Segments[0]
		if li := len(lg.NM) - 1; lg.NM[li] == junction && ug.NM[0] == junction {
			fg, ag, fi, ai := lg, ug, li, 0
			if fixed == b {
				fg, ag, fi, ai = ug, lg, 0, li
			}
			for q := range fg.Values {
				if fg.Values[q] != nil && !math.IsNaN(fg.Values[q][fi]) {
					if ag.Values[q] != nil {
						ag.Values[q][ai] = fg.Values[q][fi]
					}
				}
			}
		}
	}
	out, err := merge(lower, upper)
	if err != nil {
		return nil, SpliceRecord{}, err
	}
	for _, r := range recs {
		out.Notes = append(out.Notes, spliceNote(r))
	}
	out.Splices = append(out.Splices, recs...)
	return out, recs[0], nil
}

// Join joins the spectra of one sample into one: it sorts them by their
// first wavelength, splices a part into what precedes it where they overlap
// (with opt; see splice) and merges it where they touch or leave a gap (see
// merge). opt.Adjust applies at a junction where one side is exactly that
// file and opt.JunctionNM at the overlap that contains it; either naming
// nothing used is an error.
func Join(parts []*Spectrum, opt SpliceOptions) (*Spectrum, error) {
	if len(parts) == 0 {
		return nil, fmt.Errorf("spectra: join: %w", ErrNoData)
	}
	sorted := make([]*Spectrum, len(parts))
	copy(sorted, parts)
	for _, p := range sorted {
		if p == nil || len(p.Segments) == 0 {
			return nil, fmt.Errorf("spectra: join: %w", ErrNoData)
		}
	}
	sort.SliceStable(sorted, func(i, j int) bool {
		li, hi := sorted[i].Range()
		lj, hj := sorted[j].Range()
		return li < lj || li == lj && hi < hj
	})
	if opt.Adjust != "" {
		found := false
		for _, p := range sorted {
			found = found || hasSource(p, opt.Adjust)
		}
		if !found {
			return nil, fmt.Errorf("spectra: join: adjust %q %w", opt.Adjust, errAdjust)
		}
	}
	usedJunction := opt.JunctionNM == 0
	acc := sorted[0]
	for _, p := range sorted[1:] {
		_, ahi := acc.Range()
		plo, phi := p.Range()
		var err error
		if plo >= ahi {
			acc, err = merge(acc, p)
			if err != nil {
				return nil, err
			}
			continue
		}
		o := opt
		only := func(s *Spectrum) bool { return len(s.Sources) == 1 && hasSource(s, o.Adjust) }
		if o.Adjust != "" && !only(acc) && !only(p) {
			o.Adjust = ""
		}
		if o.JunctionNM != 0 {
			if o.JunctionNM >= plo && o.JunctionNM <= math.Min(ahi, phi) {
				usedJunction = true
			} else {
				o.JunctionNM = 0
			}
		}
		acc, _, err = splice(acc, p, o)
		if err != nil {
			return nil, err
		}
	}
	if !usedJunction {
		return nil, fmt.Errorf("spectra: join: %s nm: %w of any two files", fmtNM(opt.JunctionNM), errJunction)
	}
	return acc, nil
}

// compare returns f and g at every wavelength of either inside [lo, hi]
// where both are defined.
func compare(f, g Series, lo, hi float64) (fv, gv []float64) {
	var nms []float64
	for _, s := range []Series{f, g} {
		for _, p := range s.Pieces {
			for _, nm := range p.NM {
				if nm >= lo && nm <= hi {
					nms = append(nms, nm)
				}
			}
		}
	}
	sort.Float64s(nms)
	for i, nm := range nms {
		if i > 0 && nm == nms[i-1] {
			continue
		}
		x, ok1 := f.At(nm)
		y, ok2 := g.At(nm)
		if ok1 && ok2 {
			fv = append(fv, x)
			gv = append(gv, y)
		}
	}
	return fv, gv
}

// cutSegments keeps the parts of segs at or below the junction (below) or
// at or above it, adding a point at the junction, interpolated within each
// quantity's own points, where a segment spans it. Segments left with fewer
// than 2 points are dropped.
func cutSegments(segs []Segment, junction float64, below bool) []Segment {
	var out []Segment
	for _, g := range segs {
		lo, hi := g.NM[0], g.NM[len(g.NM)-1]
		if below && hi <= junction || !below && lo >= junction {
			out = append(out, g)
			continue
		}
		if below && lo >= junction || !below && hi <= junction {
			continue
		}
		c := Segment{Source: g.Source}
		var keep []int
		for i, nm := range g.NM {
			if below && nm < junction || !below && nm > junction {
				keep = append(keep, i)
			}
		}
		exact := sort.SearchFloat64s(g.NM, junction)
		hasExact := exact < len(g.NM) && g.NM[exact] == junction
		at := func(q int) float64 {
			if hasExact {
				return g.Values[q][exact]
			}
			v, _ := segmentPiece(g, Quantity(q)).value(junction)
			return v
		}
		if !below {
			c.NM = append(c.NM, junction)
			for q := range g.Values {
				if g.Values[q] != nil {
					c.Values[q] = append(c.Values[q], at(q))
				}
			}
		}
		for _, i := range keep {
			c.NM = append(c.NM, g.NM[i])
			for q := range g.Values {
				if g.Values[q] != nil {
					c.Values[q] = append(c.Values[q], g.Values[q][i])
				}
			}
		}
		if below {
			c.NM = append(c.NM, junction)
			for q := range g.Values {
				if g.Values[q] != nil {
					c.Values[q] = append(c.Values[q], at(q))
				}
			}
		}
		if len(c.NM) >= 2 {
			out = append(out, c)
		}
	}
	return out
}

// spliceNote says in one sentence what a splice did.
func spliceNote(r SpliceRecord) string {
	var did string
	switch r.Method {
	case SpliceOffset:
		did = fmt.Sprintf("%s of %s offset by %+.4f to match %s", r.Quantity, r.Adjusted, r.Value, r.Fixed)
	case SpliceScale:
		did = fmt.Sprintf("%s of %s scaled by %.4f to match %s", r.Quantity, r.Adjusted, r.Value, r.Fixed)
	default:
		did = fmt.Sprintf("%s not adjusted", r.Quantity)
	}
	s := fmt.Sprintf("Spliced %s and %s at %s nm (overlap %s–%s nm): %s; %s mismatch before correction mean %.4f, max %.4f (tolerance %g)",
		r.Fixed, r.Adjusted, fmtNM(r.JunctionNM), fmtNM(r.OverlapNM[0]), fmtNM(r.OverlapNM[1]), did, r.Quantity, r.MismatchMean, r.MismatchMax, r.Tolerance)
	if r.Flagged {
		return s + ": ABOVE TOLERANCE, check both instruments."
	}
	return s + "."
}

// sourceName names a spectrum by its sources.
func sourceName(s *Spectrum) string {
	if len(s.Sources) == 0 {
		return "(unnamed)"
	}
	return strings.Join(s.Sources, "+")
}

// hasSource reports whether name is one of s's sources, or the base name
// of one.
func hasSource(s *Spectrum, name string) bool {
	for _, src := range s.Sources {
		if src == name || filepath.Base(src) == filepath.Base(name) {
			return true
		}
	}
	return false
}

// clone returns a deep copy of s.
func (s *Spectrum) clone() *Spectrum {
	c := &Spectrum{
		Meta:     append([]Field(nil), s.Meta...),
		Sources:  append([]string(nil), s.Sources...),
		Notes:    append([]string(nil), s.Notes...),
		Splices:  append([]SpliceRecord(nil), s.Splices...),
		Warnings: append([]string(nil), s.Warnings...),
		Segments: make([]Segment, len(s.Segments)),

		Measurements: append([]Measurement(nil), s.Measurements...),
	}
	for i, g := range s.Segments {
		n := Segment{Source: g.Source, NM: append([]float64(nil), g.NM...)}
		for q, v := range g.Values {
			if v != nil {
				n.Values[q] = append([]float64(nil), v...)
			}
		}
		c.Segments[i] = n
	}
	return c
}

// mapValues applies f to every value of quantity q in place.
func (s *Spectrum) mapValues(q Quantity, f func(float64) float64) {
	for _, g := range s.Segments {
		for i, x := range g.Values[q] {
			if !math.IsNaN(x) {
				g.Values[q][i] = f(x)
			}
		}
	}
}
