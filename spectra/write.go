package spectra

import (
	"bufio"
	"io"
	"math"
	"strconv"
	"strings"
)

// Write writes s in the neutral column format: metadata as "# key: value"
// lines, then each processing note as "# processing note: ..." and each
// splice record as "# splice: {JSON}", a header "wavelength_nm,R,..." naming the quantities present, one
// row per wavelength with empty cells where a quantity was not measured, and
// a blank line between segments. Numbers use the shortest form that reads
// back to the same float64, so [Parse] returns an equal spectrum.
func Write(w io.Writer, s *Spectrum) error {
	bw := bufio.NewWriter(w)
	clean := strings.NewReplacer("\r\n", " ", "\n", " ", "\r", " ")
	for _, f := range s.Meta {
		k := strings.TrimSpace(strings.ReplaceAll(clean.Replace(f.Key), ":", "_"))
		if k == "" {
			continue
		}
		bw.WriteString("# " + k + ": " + clean.Replace(f.Value) + "\n")
	}
	for _, n := range s.Notes {
		bw.WriteString("# " + noteKey + ": " + clean.Replace(n) + "\n")
	}
	for _, r := range s.Splices {
		j, err := r.MarshalJSON()
		if err != nil {
			return err
		}
		bw.WriteString("# " + spliceKey + ": " + string(j) + "\n")
	}
	var qs []Quantity
	for _, q := range quantities {
		if s.Has(q) {
			qs = append(qs, q)
		}
	}
	bw.WriteString("wavelength_nm")
	for _, q := range qs {
		bw.WriteString("," + q.String())
	}
	bw.WriteString("\n")
	var buf []byte
	for i, g := range s.Segments {
		if i > 0 {
			bw.WriteString("\n")
		}
		for j, nm := range g.NM {
			buf = appendShortest(buf[:0], nm)
			for _, q := range qs {
				buf = append(buf, ',')
				if v := g.Values[q]; v != nil && !math.IsNaN(v[j]) {
					buf = appendShortest(buf, v[j])
				}
			}
			buf = append(buf, '\n')
			bw.Write(buf)
		}
	}
	return bw.Flush()
}

// appendShortest appends x as strconv.AppendFloat(dst, x, 'g', -1, 64)
// does, faster for the numbers measured data hold: decimals n·10⁻ᵏ with
// k ≤ 8 and 10⁻⁴ ≤ |x| < 10⁶. Such an x times 10⁸ rounds to an integer N
// below 10¹⁴ with N/10⁸ = x (both exact, the division correctly rounded),
// and the shortest form that reads back to x is N·10⁻⁸ without its
// trailing zeros: a decimal of at most 15 significant digits reads back
// to no other float64 than its own (IEEE 754 binary64 holds 15 decimal
// digits: DBL_DIG, C11 5.2.4.2.2), so no other decimal as short reads
// back to x; the 'g' format writes these x without an exponent. Other
// numbers go to strconv.
func appendShortest(dst []byte, x float64) []byte {
	a := math.Abs(x)
	if !(a >= 1e-4 && a < 1e6) {
		return strconv.AppendFloat(dst, x, 'g', -1, 64)
	}
	u := uint64(a*1e8 + 0.5) // below 10¹⁴: exact in float64
	if float64(u)/1e8 != a {
		return strconv.AppendFloat(dst, x, 'g', -1, 64)
	}
	k := 8 // u·10⁻ᵏ; drop trailing zeros
	if u%1e8 == 0 {
		u, k = u/1e8, 0
	} else {
		if u%1e4 == 0 {
			u, k = u/1e4, k-4
		}
		if u%100 == 0 {
			u, k = u/100, k-2
		}
		if u%10 == 0 {
			u, k = u/10, k-1
		}
	}
	// The digits from the last, with the point k digits from the end and
	// zeros before the first digit down to "0.".
	var b [24]byte
	i := len(b)
	for d := 0; u > 0 || d <= k; d++ {
		if d == k && k > 0 {
			i--
			b[i] = '.'
		}
		i--
		b[i] = byte('0' + u%10)
		u /= 10
	}
	if x < 0 {
		dst = append(dst, '-')
	}
	return append(dst, b[i:]...)
}
