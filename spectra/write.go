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
			buf = strconv.AppendFloat(buf[:0], nm, 'g', -1, 64)
			for _, q := range qs {
				buf = append(buf, ',')
				if v := g.Values[q]; v != nil && !math.IsNaN(v[j]) {
					buf = strconv.AppendFloat(buf, v[j], 'g', -1, 64)
				}
			}
			buf = append(buf, '\n')
			bw.Write(buf)
		}
	}
	return bw.Flush()
}
