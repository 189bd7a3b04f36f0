package spectra

import (
	"bytes"
	"fmt"
	"strconv"
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

// BenchmarkParseFloatBaseline is the floor BenchmarkParseRows/comma is
// measured against: the same file's numbers read with strconv.ParseFloat
// and nothing else (lines split on newlines and commas, comments and the
// header skipped). Reading aims at 2× this time at most; the ratio is
// read off the two benchmarks' ns/op.
func BenchmarkParseFloatBaseline(b *testing.B) {
	data := benchFile(2250, ",")
	b.SetBytes(int64(len(data)))
	for b.Loop() {
		var sum float64
		rest := data
		for len(rest) > 0 {
			line := rest
			if i := bytes.IndexByte(rest, '\n'); i >= 0 {
				line, rest = rest[:i], rest[i+1:]
			} else {
				rest = nil
			}
			if len(line) == 0 || line[0] == '#' || line[0] == 'w' {
				continue
			}
			for len(line) > 0 {
				field := line
				if i := bytes.IndexByte(line, ','); i >= 0 {
					field, line = line[:i], line[i+1:]
				} else {
					line = nil
				}
				v, err := strconv.ParseFloat(string(field), 64)
				if err != nil {
					b.Fatal(err)
				}
				sum += v
			}
		}
		if sum == 0 {
			b.Fatal("no numbers")
		}
	}
}
