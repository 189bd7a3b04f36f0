package spectra

import (
	"bytes"
	"flag"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

var update = flag.Bool("update", false, "rewrite the generated files in testdata/jcamp")

// form is an encoding of ##XYDATA=(X++(Y..Y)).
type form int

const (
	formAFFN form = iota
	formPAC
	formSQZ
	formDIF
	formDIFDUP
)

func (f form) String() string { return [...]string{"AFFN", "PAC", "SQZ", "DIF", "DIFDUP"}[f] }

// sqzDigits writes v in SQZ form: the sign and first digit as one
// character (@ A-I for 0..9, a-i for −1..−9), then the other digits.
func sqzDigits(v int64) string {
	d := strconv.FormatInt(v, 10)
	if v < 0 {
		return string(rune('a'+d[1]-'1')) + d[2:]
	}
	if d[0] == '0' {
		return "@" + d[1:]
	}
	return string(rune('A'+d[0]-'1')) + d[1:]
}

// difDigits writes a difference in DIF form: % J-R for 0..9, j-r for −1..−9.
func difDigits(v int64) string {
	d := strconv.FormatInt(v, 10)
	if v < 0 {
		return string(rune('j'+d[1]-'1')) + d[2:]
	}
	if d[0] == '0' {
		return "%" + d[1:]
	}
	return string(rune('J'+d[0]-'1')) + d[1:]
}

// dupDigits writes a repeat count: S-Z for 1..8, s for 9.
func dupDigits(n int) string {
	d := strconv.Itoa(n)
	if d[0] == '9' {
		return "s" + d[1:]
	}
	return string(rune('S'+d[0]-'1')) + d[1:]
}

// encodeXYDATA writes the lines of an (X++(Y..Y)) table: x(i) is the X
// value as written for point i, ys the ordinates as written (before
// YFACTOR), perLine the number of new points a line. DIF forms repeat the
// last ordinate of each line at the start of the next (the Y-check) and end
// with a line holding only that check.
func encodeXYDATA(x func(i int) string, ys []int64, f form, perLine int) []string {
	var lines []string
	endedDIF := false
	for start := 0; start < len(ys); start += perLine {
		end := min(start+perLine, len(ys))
		var b strings.Builder
		switch f {
		case formAFFN:
			b.WriteString(x(start))
			for _, y := range ys[start:end] {
				fmt.Fprintf(&b, " %d", y)
			}
		case formPAC:
			b.WriteString(x(start))
			for _, y := range ys[start:end] {
				fmt.Fprintf(&b, "%+d", y)
			}
		case formSQZ:
			b.WriteString(x(start) + " ")
			for _, y := range ys[start:end] {
				b.WriteString(sqzDigits(y))
			}
		case formDIF, formDIFDUP:
			first := start
			if endedDIF {
				first = start - 1 // the Y-check point
			}
			endedDIF = end-first > 1
			b.WriteString(x(first) + " " + sqzDigits(ys[first]))
			var toks []string
			for i := first + 1; i < end; i++ {
				toks = append(toks, difDigits(ys[i]-ys[i-1]))
			}
			for i := 0; i < len(toks); {
				n := 1
				for f == formDIFDUP && i+n < len(toks) && toks[i+n] == toks[i] {
					n++
				}
				b.WriteString(toks[i])
				if n > 1 {
					b.WriteString(dupDigits(n))
				}
				i += n
			}
		}
		lines = append(lines, b.String())
	}
	if endedDIF {
		last := len(ys) - 1
		lines = append(lines, x(last)+" "+sqzDigits(ys[last]))
	}
	return lines
}

// jcampFile is a generated test file.
type jcampFile struct {
	name    string
	header  []string // records between ##JCAMP-DX= and the data table
	title   string
	table   string // "##XYDATA=(X++(Y..Y))" or "##XYPOINTS=(XY..XY)"
	lines   []string
	comment string
}

func (f jcampFile) bytes() []byte {
	var b bytes.Buffer
	fmt.Fprintf(&b, "##TITLE=%s\n##JCAMP-DX=4.24 $$ %s\n", f.title, f.comment)
	for _, h := range f.header {
		b.WriteString(h + "\n")
	}
	b.WriteString(f.table + "\n")
	for _, l := range f.lines {
		b.WriteString(l + "\n")
	}
	b.WriteString("##END=\n")
	return b.Bytes()
}

// grid describes an evenly spaced abscissa.
type grid struct {
	first, delta, factor float64
	n                    int
}

func (g grid) x(i int) string {
	return strconv.FormatFloat(math.Round((g.first+float64(i)*g.delta)/g.factor*1e6)/1e6, 'f', -1, 64)
}

func (g grid) records(xunits, yunits string, yfactor float64, firstY int64) []string {
	last := g.first + float64(g.n-1)*g.delta
	return []string{
		"##XUNITS=" + xunits, "##YUNITS=" + yunits,
		"##XFACTOR=" + strconv.FormatFloat(g.factor, 'g', -1, 64),
		"##YFACTOR=" + strconv.FormatFloat(yfactor, 'g', -1, 64),
		"##FIRSTX=" + strconv.FormatFloat(g.first, 'g', 10, 64),
		"##LASTX=" + strconv.FormatFloat(last, 'g', 10, 64),
		"##DELTAX=" + strconv.FormatFloat(g.delta, 'g', 10, 64),
		"##FIRSTY=" + strconv.FormatFloat(float64(firstY)*yfactor, 'g', 12, 64),
		"##NPOINTS=" + strconv.Itoa(g.n),
	}
}

// quantize samples f on the grid and rounds to whole multiples of yfactor.
func quantize(g grid, f func(x float64) float64, yfactor float64) []int64 {
	ys := make([]int64, g.n)
	for i := range ys {
		ys[i] = int64(math.Round(f(g.first+float64(i)*g.delta) / yfactor))
	}
	return ys
}

// noise is a fixed pseudo-random sequence in [−1, 1] (a linear
// congruential generator), so that generated files never change.
func noise(seed uint64) func() float64 {
	s := seed
	return func() float64 {
		s = s*6364136223846793005 + 1442695040888963407
		return float64(s>>11)/float64(1<<53)*2 - 1
	}
}

func gauss(x, mu, sigma float64) float64 {
	return math.Exp(-0.5 * (x - mu) * (x - mu) / (sigma * sigma))
}

// The invented demo sample: an invented white coating. demoR is its
// absolute reflectance (synthetic, not a measurement of anything).
func demoR(nm float64) float64 {
	um := nm / 1000
	solar := 0.06 + 0.88/(1+math.Exp(-(nm-395)/9)) - 0.03*math.Min(1, nm/2500) -
		0.05*gauss(nm, 1730, 25) - 0.07*gauss(nm, 2310, 30)
	ir := 0.035 + 0.07*gauss(um, 9.3, 0.6) + 0.03*gauss(um, 20, 2.5)
	f := 1 / (1 + math.Exp((um-4)/0.6))
	return solar*f + ir*(1-f)
}

// demoRef is the invented calibrated reflectance of an invented reference
// standard, tabulated at demoRefNM.
func demoRef(nm float64) float64 {
	return 0.985 - 0.09*math.Exp(-(nm-250)/120) - 0.02*(nm/25000)
}

func demoRefNM() []float64 {
	var nm []float64
	for x := 250.0; x < 500; x += 10 {
		nm = append(nm, x)
	}
	for x := 500.0; x < 2600; x += 100 {
		nm = append(nm, x)
	}
	for x := 2600.0; x <= 25000; x += 400 {
		nm = append(nm, x)
	}
	return nm
}

// demoRefInterp is the reference linear between its tabulated points, as
// ApplyReference reads it.
func demoRefInterp(nm float64) float64 {
	xs := demoRefNM()
	for i := 1; i < len(xs); i++ {
		if nm <= xs[i] {
			f := (nm - xs[i-1]) / (xs[i] - xs[i-1])
			return demoRef(xs[i-1]) + f*(demoRef(xs[i])-demoRef(xs[i-1]))
		}
	}
	return math.NaN()
}

// demoStep is the invented junction step of the FTIR file: it reads this
// much higher than the UV-Vis-NIR file (absolute reflectance).
const demoStep = 0.012

func demoReference() []byte {
	var b bytes.Buffer
	b.WriteString("# sample: invented diffuse reference standard RS-0 (not a real product)\n")
	b.WriteString("# provenance: invented calibration curve for tests, not a calibration of any real standard\n")
	b.WriteString("wavelength_nm,R\n")
	for _, nm := range demoRefNM() {
		fmt.Fprintf(&b, "%g,%.5f\n", nm, demoRef(nm))
	}
	return b.Bytes()
}

// generatedFiles returns every generated file under testdata/jcamp.
func generatedFiles() map[string][]byte {
	out := map[string][]byte{}
	add := func(f jcampFile) { out[f.name] = f.bytes() }

	g := grid{first: 300, delta: 10, factor: 1, n: 51}
	ys := quantize(g, func(nm float64) float64 { return 0.5 + 0.3*math.Sin(nm/60) }, 0.0001)
	add(jcampFile{name: "affn-nm-reflectance.jdx", title: "invented test curve, AFFN", comment: "synthetic test data",
		header: append([]string{"##DATA TYPE=UV/VIS SPECTRUM", "##ORIGIN=invented test lab", "##OWNER=public domain (invented data)",
			"##Spectrometer/Data System=invented UV-Vis spectrometer", "##Sampling Procedure=invented integrating sphere, 8 deg"},
			g.records("NANOMETERS", "REFLECTANCE", 0.0001, ys[0])...),
		table: "##XYDATA=(X++(Y..Y))", lines: encodeXYDATA(g.x, ys, formAFFN, 8)})

	g = grid{first: 2.5, delta: 0.05, factor: 0.001, n: 251}
	ys = quantize(g, func(um float64) float64 { return 40 + 30*math.Cos(um*1.3) + 0.5*um }, 0.01)
	add(jcampFile{name: "pac-um-transmittance-percent.jdx", title: "invented test curve, PAC", comment: "synthetic test data",
		header: append([]string{"##DATA TYPE=INFRARED SPECTRUM", "##ORIGIN=invented test lab", "##OWNER=public domain (invented data)"},
			g.records("MICROMETERS", "PERCENT TRANSMITTANCE", 0.01, ys[0])...),
		table: "##XYDATA=(X++(Y..Y))", lines: encodeXYDATA(g.x, ys, formPAC, 10)})

	g = grid{first: 4000, delta: -8, factor: 1, n: 451}
	ys = quantize(g, func(wn float64) float64 { return 0.3*math.Sin(wn/300)*math.Sin(wn/300) - 0.002 }, 0.00001)
	add(jcampFile{name: "sqz-wavenumber-transmittance.jdx", title: "invented test curve, SQZ", comment: "synthetic test data",
		header: append([]string{"##DATA TYPE=INFRARED SPECTRUM", "##ORIGIN=invented test lab", "##OWNER=public domain (invented data)"},
			g.records("1/CM", "TRANSMITTANCE", 0.00001, ys[0])...),
		table: "##XYDATA=(X++(Y..Y))", lines: encodeXYDATA(g.x, ys, formSQZ, 12)})

	g = grid{first: 250, delta: 2, factor: 1, n: 376}
	ys = quantize(g, func(nm float64) float64 { return 0.05 + 1.5*gauss(nm, 420, 40) + 0.4*gauss(nm, 800, 120) }, 0.00001)
	add(jcampFile{name: "dif-nm-absorbance.jdx", title: "invented test curve, DIF", comment: "synthetic test data",
		header: append([]string{"##DATA TYPE=UV/VIS SPECTRUM", "##ORIGIN=invented test lab", "##OWNER=public domain (invented data)"},
			g.records("NANOMETERS", "ABSORBANCE", 0.00001, ys[0])...),
		table: "##XYDATA=(X++(Y..Y))", lines: encodeXYDATA(g.x, ys, formDIF, 15)})

	g = grid{first: 400, delta: 1, factor: 1, n: 601}
	ys = quantize(g, func(nm float64) float64 {
		switch {
		case nm < 550:
			return 90
		case nm < 650:
			return 90 - 0.2*(nm-550)
		default:
			return 70 + 0.01*math.Round(nm/7)*7
		}
	}, 0.01)
	add(jcampFile{name: "difdup-nm-reflectance-percent.jdx", title: "invented test curve, DIFDUP", comment: "synthetic test data",
		header: append([]string{"##DATA TYPE=UV/VIS SPECTRUM", "##ORIGIN=invented test lab", "##OWNER=public domain (invented data)"},
			g.records("NANOMETERS", "%REFLECTANCE", 0.01, ys[0])...),
		table: "##XYDATA=(X++(Y..Y))", lines: encodeXYDATA(g.x, ys, formDIFDUP, 20)})

	var pts []string
	wn := []float64{4000, 3500, 3100, 2800, 2200, 1900, 1500, 1200, 1000, 900, 800, 700, 600, 500, 400}
	for i, w := range wn {
		pts = append(pts, fmt.Sprintf("%g, %.4f", w, 0.05+0.02*float64(i%5)))
	}
	add(jcampFile{name: "xypoints-wavenumber-reflectance.jdx", title: "invented test curve, XYPOINTS", comment: "synthetic test data",
		header: []string{"##DATA TYPE=INFRARED SPECTRUM", "##ORIGIN=invented test lab", "##OWNER=public domain (invented data)",
			"##XUNITS=1/CM", "##YUNITS=REFLECTANCE", "##XFACTOR=1", "##YFACTOR=1", "##FIRSTX=4000", "##LASTX=400", "##NPOINTS=15"},
		table: "##XYPOINTS=(XY..XY)", lines: pts})

	// The demo: an invented UV-Vis-NIR export in nm (DIFDUP) and an invented
	// FTIR export in 1/CM (SQZ, percent), both relative to the invented
	// reference standard, overlapping over 2399–2600 nm with a junction step.
	n1 := noise(1)
	g = grid{first: 250, delta: 5, factor: 1, n: 471}
	ys = quantize(g, func(nm float64) float64 { return (demoR(nm) + 0.0004*n1()) / demoRefInterp(nm) }, 0.00001)
	add(jcampFile{name: "uvvis.jdx", title: "invented white coating W-7, UV-Vis-NIR (synthetic demo data)", comment: "invented export, not a measurement",
		header: append([]string{"##DATA TYPE=UV/VIS SPECTRUM", "##ORIGIN=invented demo lab", "##OWNER=public domain (invented data)",
			"##DATE=2031/04/02", "##SPECTROMETER/DATA SYSTEM=invented double-beam UV-Vis-NIR spectrophotometer UV-1 with 150 mm sphere",
			"##SAMPLING PROCEDURE=hemispherical reflectance, 8 deg incidence, relative to reference standard RS-0",
			"##RESOLUTION=2 nm"},
			g.records("NANOMETERS", "REFLECTANCE", 0.00001, ys[0])...),
		table: "##XYDATA=(X++(Y..Y))", lines: encodeXYDATA(g.x, ys, formDIFDUP, 16)})

	n2 := noise(2)
	g = grid{first: 4168, delta: -4, factor: 1, n: 943}
	ys = quantize(g, func(wn float64) float64 {
		nm := 1e7 / wn
		return 100 * (demoR(nm) + demoStep + 0.0012*n2()) / demoRefInterp(nm)
	}, 0.001)
	add(jcampFile{name: "ftir.jdx", title: "invented white coating W-7, FTIR (synthetic demo data)", comment: "invented export, not a measurement",
		header: append([]string{"##DATA TYPE=INFRARED SPECTRUM", "##ORIGIN=invented demo lab", "##OWNER=public domain (invented data)",
			"##DATE=2031/04/03", "##SPECTROMETER/DATA SYSTEM=invented FTIR spectrometer IR-2 with gold-coated sphere",
			"##SAMPLING PROCEDURE=hemispherical reflectance, 12 deg incidence, relative to reference standard RS-0",
			"##RESOLUTION=4 1/CM"},
			g.records("1/CM", "%REFLECTANCE", 0.001, ys[0])...),
		table: "##XYDATA=(X++(Y..Y))", lines: encodeXYDATA(g.x, ys, formSQZ, 10)})

	out["reference.csv"] = demoReference()
	return out
}

// TestJCAMPTestdata keeps testdata/jcamp equal to what generatedFiles
// writes; run with -update to rewrite it.
func TestJCAMPTestdata(t *testing.T) {
	for name, want := range generatedFiles() {
		path := filepath.Join("..", "testdata", "jcamp", name)
		if *update {
			if err := os.WriteFile(path, want, 0o644); err != nil {
				t.Fatal(err)
			}
			continue
		}
		got, err := os.ReadFile(path)
		if err != nil {
			t.Fatalf("%v (run go test ./spectra -run TestJCAMPTestdata -update)", err)
		}
		if !bytes.Equal(got, want) {
			t.Errorf("%s differs from the generator; rerun with -update", path)
		}
	}
}
