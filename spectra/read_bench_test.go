package spectra

import (
	"bytes"
	"fmt"
	"strings"
	"testing"
)

// benchFile returns a neutral-format file of n rows with the given
// delimiter and a header with a percent column, as instruments export them.
func benchFile(n int, delim string) []byte {
	var b strings.Builder
	b.WriteString("# sample: synthetic benchmark data\n")
	r, t := "R (%)", "T (%)"
	if delim == " " {
		r, t = "R_pct", "T_pct"
	}
	b.WriteString("wavelength_nm" + delim + r + delim + t + "\n")
	for i := range n {
		fmt.Fprintf(&b, "%g%s%.4f%s%.4f\n", 250+float64(i)*0.5, delim, 90+float64(i%97)/10, delim, 1+float64(i%89)/100)
	}
	return []byte(b.String())
}

// BenchmarkParseRows reads files of 2,250 rows (one UV-Vis-NIR export at
// 1 nm) in the three delimiters the reader accepts.
func BenchmarkParseRows(b *testing.B) {
	for _, d := range []struct{ name, delim string }{{"comma", ","}, {"tab", "\t"}, {"space", " "}} {
		data := benchFile(2250, d.delim)
		b.Run(d.name, func(b *testing.B) {
			b.SetBytes(int64(len(data)))
			for b.Loop() {
				if _, err := Parse(bytes.NewReader(data), "bench.csv"); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
