package evaluate

import (
	"bytes"
	"fmt"
	"math"
	"math/rand/v2"
	"strconv"
	"testing"
	"testing/fstest"

	"skysheet/datasheet"
	"skysheet/spectra"
)

// benchSpectrum writes an invented white-paint-like sample in the neutral
// format (synthetic, not a measurement): R high in the solar range and
// low beyond 2.5 µm, a little T, instrument noise, constant standard
// uncertainties in the metadata, as bench/genlib writes them. The axis
// runs from lo to hi (in the header's unit) in n rows.
func benchSpectrum(header string, lo, hi float64, n int, toNM func(float64) float64) []byte {
	var b bytes.Buffer
	b.WriteString("# sample: invented white paint (synthetic data, not a measurement)\n# u_R: 0.005\n# u_T: 0.005\n")
	b.WriteString(header + "\n")
	r := rand.New(rand.NewPCG(1, 1))
	var line []byte
	for i := range n {
		x := lo + (hi-lo)*float64(i)/float64(n-1)
		nm := toNM(x)
		rv := 0.92 - 0.85/(1+math.Exp(-(nm-2600)/120)) + 0.04*math.Sin(nm/37) + 0.003*r.NormFloat64()
		tv := 0.02/(1+nm/3000) + 0.001*r.Float64()
		line = strconv.AppendFloat(line[:0], math.Round(x*1e4)/1e4, 'f', -1, 64)
		line = append(line, ',')
		line = strconv.AppendFloat(line, rv, 'f', 4, 64)
		line = append(line, ',')
		line = strconv.AppendFloat(line, tv, 'f', 4, 64)
		b.Write(append(line, '\n'))
	}
	return b.Bytes()
}

// figureFiles are the samples BenchmarkFigures reads: one material of the
// bench library (250–2500 nm every 1 nm, 4000–400 cm⁻¹ every 2 cm⁻¹) and
// one file of a million rows (250–25,250 nm every 0.025 nm).
func figureFiles() []struct {
	name  string
	files fstest.MapFS
} {
	nm := func(x float64) float64 { return x }
	wn := func(x float64) float64 { return 1e7 / x }
	return []struct {
		name  string
		files fstest.MapFS
	}{
		{"material", fstest.MapFS{
			"uvvis.csv": {Data: benchSpectrum("wavelength_nm,R,T", 250, 2500, 2251, nm)},
			"ftir.csv":  {Data: benchSpectrum("wavenumber_cm-1,R,T", 4000, 400, 1801, wn)},
		}},
		{"million-rows", fstest.MapFS{
			"big.csv": {Data: benchSpectrum("wavelength_nm,R,T", 250, 25250, 1_000_001, nm)},
		}},
	}
}

func names(fsys fstest.MapFS) (files []string, size int64) {
	for _, f := range []string{"uvvis.csv", "ftir.csv", "big.csv"} {
		if d, ok := fsys[f]; ok {
			files, size = append(files, f), size+int64(len(d.Data))
		}
	}
	return files, size
}

// BenchmarkFigures reads a sample's files (spectra.ReadSample: reading,
// hashing, joining) and computes every figure under the default
// conditions, cooling, sensitivities and uncertainty included (Sample):
// what "skysheet figures" does. Its time over that of
// BenchmarkFiguresParseFloatBaseline on the same files is the ratio the
// benchmarks' README quotes (target: 4× at most).
func BenchmarkFigures(b *testing.B) {
	c := datasheet.DefaultConditions()
	for _, tc := range figureFiles() {
		files, size := names(tc.files)
		b.Run(tc.name, func(b *testing.B) {
			b.SetBytes(size)
			for b.Loop() {
				s, err := spectra.ReadSample(tc.files, files, spectra.SampleOptions{})
				if err != nil {
					b.Fatal(err)
				}
				if _, err := Sample(s, c); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkFiguresParseFloatBaseline is the floor of BenchmarkFigures: the
// numbers of the same files read with strconv.ParseFloat and nothing else
// (lines split on newlines and commas, comments and headers skipped).
func BenchmarkFiguresParseFloatBaseline(b *testing.B) {
	for _, tc := range figureFiles() {
		files, size := names(tc.files)
		b.Run(tc.name, func(b *testing.B) {
			b.SetBytes(size)
			for b.Loop() {
				var sum float64
				for _, f := range files {
					sum += parseFloats(b, tc.files[f].Data)
				}
				if sum == 0 {
					b.Fatal("no numbers")
				}
			}
		})
	}
}

func parseFloats(b *testing.B, data []byte) float64 {
	var sum float64
	for rest := data; len(rest) > 0; {
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
				b.Fatal(fmt.Errorf("%q: %v", field, err))
			}
			sum += v
		}
	}
	return sum
}
