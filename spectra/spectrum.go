package spectra

import (
	"fmt"
	"math"
	"sort"
	"strings"
)

// Quantity names a column of a spectrum.
type Quantity int

// The quantities a spectrum may carry. UR and UT are the standard
// uncertainties (absolute, as fractions) of R and T.
const (
	R  Quantity = iota // reflectance
	T                  // transmittance
	A                  // absorptance
	UR                 // standard uncertainty of R
	UT                 // standard uncertainty of T
	numQuantities
)

// quantities lists every quantity in column order.
var quantities = []Quantity{R, T, A, UR, UT}

// String returns the column name used by the neutral format.
func (q Quantity) String() string {
	switch q {
	case R:
		return "R"
	case T:
		return "T"
	case A:
		return "A"
	case UR:
		return "u_R"
	case UT:
		return "u_T"
	}
	return fmt.Sprintf("Quantity(%d)", int(q))
}

// name returns the quantity in words.
func (q Quantity) name() string {
	switch q {
	case R:
		return "reflectance"
	case T:
		return "transmittance"
	case A:
		return "absorptance"
	case UR:
		return "uncertainty of reflectance"
	case UT:
		return "uncertainty of transmittance"
	}
	return q.String()
}

// Field is one metadata entry, kept in file order.
type Field struct {
	Key, Value string
}

// Segment is a run of rows on one wavelength axis. Values[q] is nil when the
// quantity q is absent; otherwise it has one value per wavelength, with NaN
// marking an empty cell (not measured at that wavelength).
type Segment struct {
	NM     []float64
	Values [numQuantities][]float64
	Source string // file the segment came from
}

// Spectrum is one sample's measured data: metadata and one or more segments
// in increasing wavelength order that do not overlap. Nothing is
// interpolated between segments.
type Spectrum struct {
	Meta     []Field
	Sources  []string
	Segments []Segment
	// Notes are processing notes, one sentence each (an absorbance
	// conversion, a splice, a reference correction); [Resolve] reports them
	// among the assumptions.
	Notes []string
	// Splices records every junction where two instruments' data were
	// spliced (see [Splice]).
	Splices []SpliceRecord
	Inputs  []Input // files read by [Decode], with their SHA-256
	// Warnings are plausibility warnings of the readers, one sentence
	// each naming the file: data that read without error but look
	// mislabelled (a thousands separator read as a decimal point, say).
	// They are not errors; callers show them beside the figures.
	Warnings []string
	// Measurements describe how each file was measured, in the order
	// read (see [Measurement]); [Spectrum.MeasurementAt] finds the one
	// behind a value.
	Measurements []Measurement
}

// Get returns the first metadata value for key (compared without case) and
// whether it was present.
func (s *Spectrum) Get(key string) (string, bool) {
	k := normKey(key)
	for _, f := range s.Meta {
		if normKey(f.Key) == k {
			return f.Value, true
		}
	}
	return "", false
}

// Has reports whether any segment carries quantity q.
func (s *Spectrum) Has(q Quantity) bool {
	for _, g := range s.Segments {
		if g.Values[q] != nil {
			return true
		}
	}
	return false
}

// Range returns the lowest and highest wavelength in nm.
func (s *Spectrum) Range() (lo, hi float64) {
	if len(s.Segments) == 0 {
		return math.NaN(), math.NaN()
	}
	first, last := s.Segments[0], s.Segments[len(s.Segments)-1]
	return first.NM[0], last.NM[len(last.NM)-1]
}

// Len returns the number of rows over all segments.
func (s *Spectrum) Len() int {
	n := 0
	for _, g := range s.Segments {
		n += len(g.NM)
	}
	return n
}

// Series returns quantity q as a series: one piece per segment, empty cells
// dropped. Pieces with fewer than one point are left out.
func (s *Spectrum) Series(q Quantity) Series {
	var out Series
	for _, g := range s.Segments {
		v := g.Values[q]
		if v == nil {
			continue
		}
		var p Piece
		for i, x := range v {
			if !math.IsNaN(x) {
				p.NM = append(p.NM, g.NM[i])
				p.V = append(p.V, x)
			}
		}
		if len(p.NM) > 0 {
			out.Pieces = append(out.Pieces, p)
		}
	}
	return out
}

// merge joins spectra of one sample measured over different ranges (say a
// UV-Vis-NIR file and an FTIR file) into one. Ranges that touch (share an end
// wavelength) are joined into one segment; ranges with a gap stay separate
// segments. Overlapping ranges are an error wrapping errOverlap (see [Join]
// to splice them instead). Metadata, notes and splice records of later
// spectra are appended after those of earlier ones.
func merge(parts ...*Spectrum) (*Spectrum, error) {
	if len(parts) == 0 {
		return nil, fmt.Errorf("spectra: merge: %w", ErrNoData)
	}
	if len(parts) == 1 {
		return parts[0], nil
	}
	var segs []Segment
	out := &Spectrum{}
	for _, p := range parts {
		segs = append(segs, p.Segments...)
		out.Meta = append(out.Meta, p.Meta...)
		out.Sources = append(out.Sources, p.Sources...)
		out.Notes = append(out.Notes, p.Notes...)
		out.Splices = append(out.Splices, p.Splices...)
		out.Inputs = append(out.Inputs, p.Inputs...)
		out.Warnings = append(out.Warnings, p.Warnings...)
		out.Measurements = append(out.Measurements, p.Measurements...)
	}
	sort.SliceStable(segs, func(i, j int) bool { return segs[i].NM[0] < segs[j].NM[0] })
	for i, g := range segs {
		if i == 0 {
			out.Segments = append(out.Segments, g)
			continue
		}
		prev := &out.Segments[len(out.Segments)-1]
		end := prev.NM[len(prev.NM)-1]
		switch {
		case g.NM[0] < end:
			return nil, fmt.Errorf("spectra: %s (%s–%s nm) and %s (%s–%s nm): %w",
				prev.Source, fmtNM(prev.NM[0]), fmtNM(end), g.Source, fmtNM(g.NM[0]), fmtNM(g.NM[len(g.NM)-1]), errOverlap)
		case g.NM[0] == end:
			var note string
			*prev, note = joinTouching(*prev, g)
			if note != "" {
				out.Notes = append(out.Notes, note)
			}
		default:
			out.Segments = append(out.Segments, g)
		}
	}
	return out, nil
}

// joinTouching joins b after a, where b's first wavelength equals a's last,
// and returns a note when both give a different value there.
// At the shared wavelength a's value is kept where it has one, b's otherwise.
func joinTouching(a, b Segment) (Segment, string) {
	n := len(a.NM)
	var differ []string
	out := Segment{Source: a.Source + "+" + b.Source}
	out.NM = append(append([]float64{}, a.NM...), b.NM[1:]...)
	for q := range out.Values {
		if a.Values[q] == nil && b.Values[q] == nil {
			continue
		}
		va, vb := a.Values[q], b.Values[q]
		if va == nil {
			va = nans(n)
		}
		if vb == nil {
			vb = nans(len(b.NM))
		}
		v := append(append([]float64{}, va...), vb[1:]...)
		switch {
		case math.IsNaN(v[n-1]):
			v[n-1] = vb[0]
		case !math.IsNaN(vb[0]) && vb[0] != v[n-1]:
			differ = append(differ, fmt.Sprintf("%s %g (kept) against %g", Quantity(q), v[n-1], vb[0]))
		}
		out.Values[q] = v
	}
	if len(differ) == 0 {
		return out, ""
	}
	return out, fmt.Sprintf("%s and %s both give a value at %s nm, where they meet: %s.",
		a.Source, b.Source, fmtNM(a.NM[n-1]), strings.Join(differ, "; "))
}

func nans(n int) []float64 {
	v := make([]float64, n)
	for i := range v {
		v[i] = math.NaN()
	}
	return v
}
