package spectra

import (
	"bufio"
	"errors"
	"fmt"
	"io"
	"math"
	"regexp"
	"strconv"
	"strings"
	"unicode/utf8"

	"skysheet/spectra/msg"
)

// The errors the JCAMP-DX reader may return, wrapped in a [ParseError]
// (besides the neutral reader's, such as errNotNumber and errOutOfRange).
var (
	errNotJCAMP       = errors.New("is not a JCAMP-DX file")
	errLabel          = errors.New("bad labelled data record")
	errMissingLabel   = errors.New("required label missing")
	errDuplicateLabel = errors.New("label appears twice")
	errUnsupported    = errors.New("is not supported")
	errXUnits         = errors.New("is not a supported X unit: want NANOMETERS, MICROMETERS or 1/CM")
	errYUnits         = errors.New("is not a supported Y unit: want REFLECTANCE, TRANSMITTANCE (fraction or percent) or ABSORBANCE")
	errASDF           = errors.New("bad compressed (ASDF) data")
	errXCheck         = errors.New("X-check failed")
	errYCheck         = errors.New("Y-check failed")
	errPointCount     = errors.New("point count differs from NPOINTS")
	errFirstX         = errors.New("FIRSTX does not match the data")
	errLastX          = errors.New("LASTX does not match the data")
	errFirstY         = errors.New("FIRSTY does not match the data")
	errNoEnd          = errors.New("no ##END= record (truncated file?)")
	errMultiBlock     = errors.New("holds more than one block; only single-spectrum files are read")
)

func init() { readJCAMP = parseJCAMP }

// parseJCAMP reads a single-spectrum JCAMP-DX file (IUPAC JCAMP-DX 4.24 or
// 5.x) from r; name is used in errors and recorded as the source.
//
// The data table is ##XYDATA=(X++(Y..Y)), in AFFN or in the compressed ASDF
// forms (PAC, SQZ, DIF with its Y-check, DUP), or ##XYPOINTS=(XY..XY).
// ##XFACTOR and ##YFACTOR scale the numbers; ##FIRSTX, ##LASTX and ##NPOINTS
// define the abscissa of ##XYDATA. The X value that starts every line is
// checked against the running abscissa, the DIF Y-check value against the last
// ordinate of the line before, and the point count, FIRSTX, LASTX, DELTAX and
// FIRSTY against the data: any mismatch is an error naming the line.
//
// ##XUNITS must be NANOMETERS, MICROMETERS or 1/CM; ##YUNITS REFLECTANCE or
// TRANSMITTANCE (a fraction, or percent when written with % or PERCENT) or
// ABSORBANCE, converted to transmittance as T = 10^(−A) with a note saying
// so. "?" marks a missing ordinate (an empty cell). Labels are compared
// without case, spaces, dashes, slashes and underscores; "$$" starts a
// comment. Descriptive records (##TITLE, ##ORIGIN, ##OWNER, ##DATE,
// ##SPECTROMETER/DATA SYSTEM, ##SAMPLING PROCEDURE, user-defined ##$ labels...)
// become metadata.
func parseJCAMP(r io.Reader, name string) (*Spectrum, error) {
	recs, err := splitRecords(r, name)
	if err != nil {
		return nil, err
	}
	j := jcamp{file: name, s: &Spectrum{Sources: []string{name}}}
	j.meta = newFileMeta()
	if err := j.build(recs); err != nil {
		return nil, err
	}
	return j.s, nil
}

// jline is one source line.
type jline struct {
	text string
	n    int
}

// record is one labelled data record: "##LABEL=value" and the lines after it
// up to the next label.
type record struct {
	label string // as written, without ## and =
	norm  string // normalised (see normLabel)
	value string // text after '=' on the label line, comment removed, trimmed
	line  int
	body  []jline
}

// normLabel normalises a label as JCAMP-DX says: case, spaces, dashes,
// slashes and underscores do not count (JCAMP-DX 4.24, from memory).
func normLabel(l string) string {
	return strings.Map(func(r rune) rune {
		switch r {
		case ' ', '\t', '-', '/', '_':
			return -1
		}
		return r
	}, strings.ToUpper(strings.TrimSpace(l)))
}

func stripComment(s string) string {
	if i := strings.Index(s, "$$"); i >= 0 {
		return s[:i]
	}
	return s
}

// latin1 reads s byte by byte as ISO 8859-1.
func latin1(s string) string {
	r := make([]rune, len(s))
	for i := 0; i < len(s); i++ {
		r[i] = rune(s[i])
	}
	return string(r)
}

// splitRecords reads the lines of r into labelled records up to ##END=.
func splitRecords(r io.Reader, file string) ([]*record, error) {
	sc := bufio.NewScanner(r)
	sc.Buffer(make([]byte, 64*1024), 16*1024*1024)
	var recs []*record
	var cur *record
	n, ended := 0, false
	for sc.Scan() {
		n++
		text := sc.Text()
		if n == 1 {
			text = strings.TrimPrefix(text, "\uFEFF")
		}
		text = strings.TrimSuffix(text, "\r")
		if !utf8.ValidString(text) {
			text = latin1(text)
		}
		t := strings.TrimSpace(text)
		if ended {
			if l, _, ok := strings.Cut(strings.TrimPrefix(t, "##"), "="); ok && strings.HasPrefix(t, "##") && normLabel(l) == "TITLE" {
				return nil, &ParseError{File: file, Line: n, Err: fmt.Errorf("a second ##TITLE= after ##END=: the file %w", errMultiBlock)}
			}
			continue
		}
		if strings.HasPrefix(t, "##") {
			l, v, ok := strings.Cut(t[2:], "=")
			if !ok {
				return nil, &ParseError{File: file, Line: n, Err: fmt.Errorf("%w: %s has no '='", errLabel, msg.Quote(t))}
			}
			cur = &record{label: strings.TrimSpace(l), norm: normLabel(l), value: strings.TrimSpace(stripComment(v)), line: n}
			recs = append(recs, cur)
			ended = cur.norm == "END"
			continue
		}
		if cur == nil {
			if t == "" || strings.HasPrefix(t, "$$") {
				continue
			}
			return nil, &ParseError{File: file, Line: n, Err: fmt.Errorf("%w: text before the first ##TITLE=", errNotJCAMP)}
		}
		cur.body = append(cur.body, jline{text, n})
	}
	if err := sc.Err(); err != nil {
		return nil, &ParseError{File: file, Line: n + 1, Err: err}
	}
	switch {
	case len(recs) == 0:
		return nil, &ParseError{File: file, Err: fmt.Errorf("%w: no labelled data records (##LABEL=value)", errNotJCAMP)}
	case recs[0].norm != "TITLE":
		return nil, &ParseError{File: file, Line: recs[0].line, Err: fmt.Errorf("%w: the first record must be ##TITLE=, not ##%s=", errNotJCAMP, msg.Cut(recs[0].label))}
	case !ended:
		return nil, &ParseError{File: file, Line: n, Err: errNoEnd}
	}
	return recs, nil
}

// jcampMetaKeys names the metadata key of each descriptive standard label.
var jcampMetaKeys = map[string]string{
	"TITLE":                  "title",
	"JCAMPDX":                "jcamp-dx",
	"DATATYPE":               "data type",
	"DATACLASS":              "data class",
	"ORIGIN":                 "origin",
	"OWNER":                  "owner",
	"DATE":                   "date",
	"LONGDATE":               "date",
	"TIME":                   "time",
	"SPECTROMETERDATASYSTEM": "instrument",
	"INSTRUMENTPARAMETERS":   "instrument parameters",
	"SAMPLINGPROCEDURE":      "sampling procedure",
	"SAMPLEDESCRIPTION":      "sample description",
	"SOURCEREFERENCE":        "source reference",
	"CROSSREFERENCE":         "cross reference",
	"DATAPROCESSING":         "data processing",
	"XUNITS":                 "x units",
	"YUNITS":                 "y units",
}

// controlLabels are read by the reader and may appear once.
var controlLabels = map[string]bool{
	"XUNITS": true, "YUNITS": true, "XFACTOR": true, "YFACTOR": true, "FIRSTX": true, "LASTX": true,
	"DELTAX": true, "FIRSTY": true, "NPOINTS": true, "XYDATA": true, "XYPOINTS": true, "JCAMPDX": true,
}

// metaKeyOf turns a label as written into a metadata key: lower case, words
// of letters and digits; more than four words are joined by underscores so
// that the neutral format keeps the key.
func metaKeyOf(label string) string {
	f := strings.FieldsFunc(strings.ToLower(label), func(r rune) bool {
		return !(r >= 'a' && r <= 'z' || r >= '0' && r <= '9' || r > 127 && r != 0xFFFD)
	})
	if len(f) > 4 {
		return strings.Join(f, "_")
	}
	return strings.Join(f, " ")
}

// jcamp holds what the reader has found.
type jcamp struct {
	file string
	s    *Spectrum
	meta *fileMeta
	recs map[string]*record
}

func (j *jcamp) errAt(line int, err error) error {
	return &ParseError{File: j.file, Line: line, Err: err}
}

func (j *jcamp) build(recs []*record) error {
	j.recs = map[string]*record{}
	for i, r := range recs {
		switch r.norm {
		case "", "END":
			continue
		case "TITLE":
			if i > 0 {
				return j.errAt(r.line, fmt.Errorf("a nested ##TITLE=: the file %w", errMultiBlock))
			}
		case "BLOCKS", "NTUPLES", "PAGE":
			return j.errAt(r.line, fmt.Errorf("##%s= (compound or multi-page file) %w: %w", msg.Cut(r.label), errUnsupported, errMultiBlock))
		case "DATATYPE":
			if strings.Contains(strings.ToUpper(r.value), "LINK") {
				return j.errAt(r.line, fmt.Errorf("DATA TYPE=%s (compound file) %w: %w", msg.Cut(r.value), errUnsupported, errMultiBlock))
			}
		}
		if controlLabels[r.norm] {
			if prev, dup := j.recs[r.norm]; dup {
				return j.errAt(r.line, fmt.Errorf("##%s= %w (also line %d)", msg.Cut(r.label), errDuplicateLabel, prev.line))
			}
			j.recs[r.norm] = r
		}
		if r.norm == "PEAKTABLE" || r.norm == "PEAKASSIGNMENTS" || r.norm == "XYDATA" || r.norm == "XYPOINTS" {
			continue
		}
		if controlLabels[r.norm] && jcampMetaKeys[r.norm] == "" {
			continue
		}
		key := jcampMetaKeys[r.norm]
		if key == "" {
			key = metaKeyOf(r.label)
		}
		if key == "" {
			continue
		}
		v := r.value
		for _, b := range r.body {
			if t := strings.TrimSpace(stripComment(b.text)); t != "" {
				v = strings.TrimSpace(v + " " + t)
			}
		}
		if err := addMeta(j.s, j.meta, key, v); err != nil {
			return j.errAt(r.line, err)
		}
	}
	if j.recs["JCAMPDX"] == nil {
		return j.errAt(recs[0].line, fmt.Errorf("%w: ##JCAMP-DX=", errMissingLabel))
	}
	return j.data()
}

// rawPoint is a decoded point before units: x in the file's X unit, y as
// written times YFACTOR is applied later; line and col locate y.
type rawPoint struct {
	x, y      float64
	line, col int
}

func (j *jcamp) data() error {
	xy, xp := j.recs["XYDATA"], j.recs["XYPOINTS"]
	var table *record
	points := false
	switch {
	case xy != nil && xp != nil:
		return j.errAt(xp.line, fmt.Errorf("a second data table (also ##XYDATA= on line %d) %w", xy.line, errUnsupported))
	case xy != nil:
		table = xy
		switch f := strings.ToUpper(strings.Join(strings.Fields(xy.value), "")); f {
		case "(X++(Y..Y))":
		case "(XY..XY)":
			points = true
		default:
			return j.errAt(xy.line, fmt.Errorf("##XYDATA=%s %w: want (X++(Y..Y)) or (XY..XY)", msg.Cut(xy.value), errUnsupported))
		}
	case xp != nil:
		table = xp
		points = true
		if f := strings.ToUpper(strings.Join(strings.Fields(xp.value), "")); f != "(XY..XY)" {
			return j.errAt(xp.line, fmt.Errorf("##XYPOINTS=%s %w: want (XY..XY)", msg.Cut(xp.value), errUnsupported))
		}
	default:
		return j.errAt(0, fmt.Errorf("%w: ##XYDATA= or ##XYPOINTS=", errMissingLabel))
	}
	xu, err := j.xUnits(table)
	if err != nil {
		return err
	}
	yu, err := j.yUnits(table)
	if err != nil {
		return err
	}
	xf, err := j.factor("XFACTOR")
	if err != nil {
		return err
	}
	yf, err := j.factor("YFACTOR")
	if err != nil {
		return err
	}
	var pts []rawPoint
	if points {
		pts, err = j.xyPoints(table, xf)
	} else {
		pts, err = j.xyData(table, xf)
	}
	if err != nil {
		return err
	}
	if fy := j.recs["FIRSTY"]; fy != nil && !math.IsNaN(pts[0].y) {
		want, err := j.number(fy)
		if err != nil {
			return err
		}
		got := pts[0].y * yf
		if tol := math.Max(math.Abs(yf), math.Max(1e-5*math.Abs(want), 0.5*resolution(fy.value))); math.Abs(got-want) > tol {
			return j.errAt(fy.line, fmt.Errorf("%w: FIRSTY=%s but the first Y is %s (line %d)", errFirstY, msg.Cut(fy.value), fmtNum(got), pts[0].line))
		}
	}
	return j.store(pts, xu, yu, xf, yf)
}

// jcampX is a supported X unit.
type jcampX int

const (
	xNM jcampX = iota
	xUM
	xWavenumber
)

func (j *jcamp) xUnits(table *record) (jcampX, error) {
	r := j.recs["XUNITS"]
	if r == nil {
		return 0, j.errAt(table.line, fmt.Errorf("%w: ##XUNITS=", errMissingLabel))
	}
	switch strings.ToUpper(strings.Join(strings.Fields(r.value), "")) {
	case "NANOMETERS", "NANOMETER", "NANOMETRES", "NANOMETRE", "NM":
		return xNM, nil
	case "MICROMETERS", "MICROMETER", "MICROMETRES", "MICROMETRE", "MICRONS", "MICRON", "UM", "µM", "ΜM":
		return xUM, nil
	case "1/CM", "CM-1", "CM^-1", "WAVENUMBERS", "WAVENUMBERS(1/CM)":
		return xWavenumber, nil
	}
	return 0, j.errAt(r.line, fmt.Errorf("XUNITS=%s %w", msg.Quote(r.value), errXUnits))
}

// jcampY is the meaning of the ordinate.
type jcampY struct {
	q          Quantity
	percent    bool
	absorbance bool
	written    string
}

func (j *jcamp) yUnits(table *record) (jcampY, error) {
	r := j.recs["YUNITS"]
	if r == nil {
		return jcampY{}, j.errAt(table.line, fmt.Errorf("%w: ##YUNITS=", errMissingLabel))
	}
	u := strings.ToUpper(strings.Join(strings.Fields(r.value), ""))
	y := jcampY{written: r.value}
	if strings.Contains(u, "%") || strings.HasPrefix(u, "PERCENT") {
		y.percent = true
		u = strings.NewReplacer("%", "", "PERCENT", "", "(", "", ")", "", "[", "", "]", "").Replace(u)
	}
	switch u {
	case "REFLECTANCE", "R":
		y.q = R
	case "TRANSMITTANCE", "T":
		y.q = T
	case "ABSORBANCE":
		if y.percent {
			return y, j.errAt(r.line, fmt.Errorf("YUNITS=%s %w", msg.Quote(r.value), errYUnits))
		}
		y.q, y.absorbance = T, true
	default:
		return y, j.errAt(r.line, fmt.Errorf("YUNITS=%s %w", msg.Quote(r.value), errYUnits))
	}
	return y, nil
}

var affnRE = regexp.MustCompile(`^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$`)

// number reads the numeric value of a record.
func (j *jcamp) number(r *record) (float64, error) {
	if !affnRE.MatchString(r.value) {
		return 0, j.errAt(r.line, fmt.Errorf("##%s=%s %w", msg.Cut(r.label), msg.Quote(r.value), errNotNumber))
	}
	x, err := strconv.ParseFloat(r.value, 64)
	if err != nil || math.IsInf(x, 0) {
		return 0, j.errAt(r.line, fmt.Errorf("##%s=%s %w", msg.Cut(r.label), msg.Quote(r.value), errNotFinite))
	}
	return x, nil
}

func (j *jcamp) factor(label string) (float64, error) {
	r := j.recs[label]
	if r == nil {
		return 1, nil
	}
	f, err := j.number(r)
	if err == nil && f == 0 {
		err = j.errAt(r.line, fmt.Errorf("##%s=%s %w: want a non-zero factor", msg.Cut(r.label), msg.Cut(r.value), errOutOfRange))
	}
	return f, err
}

// resolution returns the place value of the last digit written in an AFFN
// number (1 for "400", 0.01 for "3999.64", 100 for "4E2").
func resolution(s string) float64 {
	s = strings.TrimLeft(s, "+-")
	exp := 0
	if i := strings.IndexAny(s, "eE"); i >= 0 {
		exp, _ = strconv.Atoi(s[i+1:])
		s = s[:i]
	}
	if i := strings.IndexByte(s, '.'); i >= 0 {
		exp -= len(s) - i - 1
	}
	if exp < -300 || exp > 300 {
		return 0
	}
	return math.Pow(10, float64(exp))
}

// maxPoints bounds NPOINTS, so that a few DUP counts cannot make the reader
// take gigabytes (common practice, no source: far above any optical
// spectrum's size).
const maxPoints = 1 << 21

// xyData decodes ##XYDATA=(X++(Y..Y)).
func (j *jcamp) xyData(table *record, xf float64) ([]rawPoint, error) {
	need := func(l string) (*record, error) {
		r := j.recs[l]
		if r == nil {
			return nil, j.errAt(table.line, fmt.Errorf("%w: ##%s= (needed by ##XYDATA=(X++(Y..Y)))", errMissingLabel, l))
		}
		return r, nil
	}
	fxr, err := need("FIRSTX")
	if err != nil {
		return nil, err
	}
	lxr, err := need("LASTX")
	if err != nil {
		return nil, err
	}
	npr, err := need("NPOINTS")
	if err != nil {
		return nil, err
	}
	firstX, err := j.number(fxr)
	if err != nil {
		return nil, err
	}
	lastX, err := j.number(lxr)
	if err != nil {
		return nil, err
	}
	nf, err := j.number(npr)
	if err != nil {
		return nil, err
	}
	if nf != math.Trunc(nf) || nf < 2 || nf > maxPoints {
		return nil, j.errAt(npr.line, fmt.Errorf("NPOINTS=%s %w: want a whole number from 2 to %d", msg.Cut(npr.value), errOutOfRange, maxPoints))
	}
	n := int(nf)
	dx := (lastX - firstX) / float64(n-1)
	if dx == 0 || math.IsInf(dx, 0) || math.IsNaN(dx) {
		return nil, j.errAt(lxr.line, fmt.Errorf("%w: FIRSTX=%s and LASTX=%s leave no spacing between %d points", errLastX, msg.Cut(fxr.value), msg.Cut(lxr.value), n))
	}
	if dr := j.recs["DELTAX"]; dr != nil {
		d, err := j.number(dr)
		if err != nil {
			return nil, err
		}
		end := firstX + float64(n-1)*d
		if tol := math.Max(0.5*math.Abs(d), resolution(lxr.value)); !(math.Abs(end-lastX) <= tol) {
			return nil, j.errAt(lxr.line, fmt.Errorf("%w: LASTX=%s but FIRSTX + (NPOINTS−1)·DELTAX = %s", errLastX, msg.Cut(lxr.value), fmtNum(end)))
		}
	}

	var pts []rawPoint
	push := func(y float64, ln, col int) error {
		if len(pts) >= n {
			return &ParseError{File: j.file, Line: ln, Column: col, Name: "Y value", Err: fmt.Errorf("%w: more than NPOINTS=%d points", errPointCount, n)}
		}
		pts = append(pts, rawPoint{x: firstX + float64(len(pts))*dx, y: y, line: ln, col: col})
		return nil
	}
	prevDIF, lastY, lastLine := false, 0.0, table.line
	for _, ln := range table.body {
		toks, err := tokenize(stripComment(ln.text))
		if err != nil {
			var te *tokenError
			errors.As(err, &te)
			return nil, &ParseError{File: j.file, Line: ln.n, Column: te.col, Err: te.err}
		}
		if len(toks) == 0 {
			continue
		}
		bad := func(t token, name string, err error) error {
			return &ParseError{File: j.file, Line: ln.n, Column: t.col, Name: name, Err: err}
		}
		xt, rest := toks[0], toks[1:]
		if xt.kind != tokAbs {
			return nil, bad(xt, "X value", fmt.Errorf("%w: a line must start with an X value", errASDF))
		}
		idx := len(pts)
		if prevDIF {
			if len(rest) == 0 || rest[0].kind != tokAbs {
				return nil, bad(xt, "X value", fmt.Errorf("%w: line %d ends in DIF form, so this line must start with its last Y value repeated", errYCheck, lastLine))
			}
			if c := rest[0].v; math.Abs(c-lastY) > 1e-9*math.Max(1, math.Max(math.Abs(c), math.Abs(lastY))) {
				return nil, bad(rest[0], "Y value", fmt.Errorf("%w: the line's first Y %s should repeat the last Y of line %d, which decodes to %s", errYCheck, fmtNum(c), lastLine, fmtNum(lastY)))
			}
			idx--
		}
		want := firstX + float64(idx)*dx
		got := xt.v * xf
		if tol := math.Max(0.5*math.Abs(dx), xt.res*math.Abs(xf)) + 1e-9*math.Abs(want); !(math.Abs(got-want) <= tol) {
			err := fmt.Errorf("%w: the line starts at X %s (%s after XFACTOR) but point %d lies at %s by FIRSTX, LASTX and NPOINTS", errXCheck, fmtNum(xt.v), fmtNum(got), idx+1, fmtNum(want))
			if idx == 0 {
				err = fmt.Errorf("%w: %w", errFirstX, err)
			}
			return nil, bad(xt, "X value", err)
		}
		cur, have, kind, dup := 0.0, false, tokKind(0), false
		lastDif := 0.0
		for i, t := range rest {
			if i == 0 && prevDIF {
				cur, have, kind = t.v, true, tokAbs
				continue
			}
			switch t.kind {
			case tokAbs:
				cur, have, kind = t.v, true, tokAbs
				if err := push(cur, ln.n, t.col); err != nil {
					return nil, err
				}
			case tokMissing:
				cur, have, kind = math.NaN(), true, tokMissing
				if err := push(cur, ln.n, t.col); err != nil {
					return nil, err
				}
			case tokDif:
				if !have || math.IsNaN(cur) {
					return nil, bad(t, "Y value", fmt.Errorf("%w: a DIF value needs a Y value before it on the same line", errASDF))
				}
				cur, lastDif, kind = cur+t.v, t.v, tokDif
				if err := push(cur, ln.n, t.col); err != nil {
					return nil, err
				}
			case tokDup:
				if !have || dup {
					return nil, bad(t, "Y value", fmt.Errorf("%w: a DUP count needs a Y value before it on the same line", errASDF))
				}
				for k := 1; k < t.count; k++ {
					if kind == tokDif {
						cur += lastDif
					}
					if err := push(cur, ln.n, t.col); err != nil {
						return nil, err
					}
				}
			}
			dup = t.kind == tokDup
		}
		prevDIF = kind == tokDif
		if have {
			lastY = cur
		}
		lastLine = ln.n
	}
	if len(pts) != n {
		return nil, j.errAt(lastLine, fmt.Errorf("%w: NPOINTS=%d but the table holds %d", errPointCount, n, len(pts)))
	}
	return pts, nil
}

// xyPoints decodes ##XYPOINTS=(XY..XY): pairs "x, y" separated by spaces,
// commas or semicolons, one or more pairs a line.
func (j *jcamp) xyPoints(table *record, xf float64) ([]rawPoint, error) {
	var pts []rawPoint
	var xres []float64
	last := table.line
	for _, ln := range table.body {
		f := fieldsAt(stripComment(ln.text), " \t,;")
		if len(f) == 0 {
			continue
		}
		if len(f)%2 != 0 {
			return nil, j.errAt(ln.n, fmt.Errorf("%w: expected X, Y pairs, found %d numbers", errFieldCount, len(f)))
		}
		for i := 0; i < len(f); i += 2 {
			xs, ys := f[i], f[i+1]
			if !affnRE.MatchString(xs.text) {
				return nil, &ParseError{File: j.file, Line: ln.n, Column: xs.col, Name: "X value", Err: fmt.Errorf("%s %w", msg.Quote(xs.text), errNotNumber)}
			}
			x, _ := strconv.ParseFloat(xs.text, 64)
			y := math.NaN()
			if ys.text != "?" {
				if !affnRE.MatchString(ys.text) {
					return nil, &ParseError{File: j.file, Line: ln.n, Column: ys.col, Name: "Y value", Err: fmt.Errorf("%s %w", msg.Quote(ys.text), errNotNumber)}
				}
				y, _ = strconv.ParseFloat(ys.text, 64)
			}
			if math.IsInf(x*xf, 0) {
				return nil, &ParseError{File: j.file, Line: ln.n, Column: xs.col, Name: "X value", Err: fmt.Errorf("%s %w", msg.Quote(xs.text), errNotFinite)}
			}
			if k := len(pts); k > 0 {
				p := pts[k-1]
				switch {
				case x*xf == p.x:
					return nil, &ParseError{File: j.file, Line: ln.n, Column: xs.col, Name: "X value", Err: fmt.Errorf("%s %w (line %d)", msg.Cut(xs.text), errDuplicate, p.line)}
				case k > 1 && (x*xf > p.x) != (p.x > pts[k-2].x):
					return nil, &ParseError{File: j.file, Line: ln.n, Column: xs.col, Name: "X value", Err: fmt.Errorf("%s %w: X values must rise or fall throughout", msg.Cut(xs.text), errNotMonotonic)}
				}
			}
			pts = append(pts, rawPoint{x: x * xf, y: y, line: ln.n, col: ys.col})
			xres = append(xres, resolution(xs.text)*math.Abs(xf))
		}
		last = ln.n
	}
	if len(pts) < 2 {
		return nil, j.errAt(last, fmt.Errorf("%w: ##XYPOINTS= holds %d points, want at least 2", ErrNoData, len(pts)))
	}
	if r := j.recs["NPOINTS"]; r != nil {
		n, err := j.number(r)
		if err != nil {
			return nil, err
		}
		if n != float64(len(pts)) {
			return nil, j.errAt(last, fmt.Errorf("%w: NPOINTS=%s but the table holds %d", errPointCount, msg.Cut(r.value), len(pts)))
		}
	}
	for _, c := range []struct {
		label string
		i     int
		err   error
	}{{"FIRSTX", 0, errFirstX}, {"LASTX", len(pts) - 1, errLastX}} {
		r := j.recs[c.label]
		if r == nil {
			continue
		}
		want, err := j.number(r)
		if err != nil {
			return nil, err
		}
		p := pts[c.i]
		if tol := math.Max(xres[c.i], resolution(r.value)) + 1e-9*math.Abs(want); !(math.Abs(p.x-want) <= tol) {
			return nil, j.errAt(r.line, fmt.Errorf("%w: %s=%s but the table's X is %s (line %d)", c.err, msg.Cut(c.label), msg.Cut(r.value), fmtNum(p.x), p.line))
		}
	}
	return pts, nil
}

type field struct {
	text string
	col  int
}

// fieldsAt splits s at runs of the separator bytes, keeping 1-based columns.
func fieldsAt(s, seps string) []field {
	var out []field
	start := -1
	for i := 0; i <= len(s); i++ {
		if i == len(s) || strings.IndexByte(seps, s[i]) >= 0 {
			if start >= 0 {
				out = append(out, field{s[start:i], start + 1})
				start = -1
			}
			continue
		}
		if start < 0 {
			start = i
		}
	}
	return out
}

// store converts the points to nm and fractions and makes the segment.
func (j *jcamp) store(pts []rawPoint, xu jcampX, yu jcampY, xf, yf float64) error {
	if len(pts) > 1 && pts[0].x > pts[len(pts)-1].x != (xu == xWavenumber) {
		for a, b := 0, len(pts)-1; a < b; a, b = a+1, b-1 {
			pts[a], pts[b] = pts[b], pts[a]
		}
	}
	g := Segment{Source: j.file, NM: make([]float64, len(pts)), Values: [numQuantities][]float64{}}
	v := make([]float64, len(pts))
	values := 0
	maxPct := 0.0 // the largest |Y| of a percent ordinate, for percentWarnings
	for i, p := range pts {
		at := func(name string, err error) error {
			return &ParseError{File: j.file, Line: p.line, Column: p.col, Name: name, Err: err}
		}
		// X and Y are decimal numbers times decimal factors: the noise of
		// the products is dropped (decimalClean) before converting.
		var nm float64
		x := p.x
		if xf != 1 {
			x = decimalClean(x)
		}
		switch xu {
		case xNM:
			nm = x
		case xUM:
			nm = shiftDecimal(x, 3)
		case xWavenumber:
			nm = 1e7 / x
		}
		if !(nm > 0) || math.IsInf(nm, 0) {
			return at("X value", fmt.Errorf("X %s %w: want a positive wavelength or wavenumber", fmtNum(p.x), errOutOfRange))
		}
		if i > 0 && !(nm > g.NM[i-1]) {
			return at("X value", fmt.Errorf("X %s %w: it gives the same wavelength as the point before", fmtNum(p.x), errDuplicate))
		}
		g.NM[i] = nm
		y := p.y * yf
		if yf != 1 {
			y = decimalClean(y)
		}
		switch {
		case math.IsNaN(p.y):
			v[i] = math.NaN()
			continue
		case math.IsInf(y, 0):
			return at("Y value", fmt.Errorf("Y %g × YFACTOR %w", p.y, errNotFinite))
		case yu.absorbance:
			t := math.Pow(10, -y)
			if !(t >= -0.05 && t <= 1.05) {
				return at("Y value", fmt.Errorf("absorbance %s gives T = %s, which %w: want T within -0.05..1.05", fmtNum(y), fmtNum(t), errOutOfRange))
			}
			y = t
		case yu.percent:
			if !(y >= -5 && y <= 105) {
				return at("Y value", fmt.Errorf("Y %s %w: YUNITS=%s is percent, want -5..105", fmtNum(y), errOutOfRange, msg.Cut(yu.written)))
			}
			maxPct = math.Max(maxPct, math.Abs(y))
			y = decimalClean(y / 100)
		default:
			if !(y >= -0.05 && y <= 1.05) {
				hint := ""
				if y > 1.05 && y <= 105 {
					hint = " (percent? write YUNITS=%" + strings.ToUpper(yu.q.name()) + ")"
				}
				return at("Y value", fmt.Errorf("Y %s %w: YUNITS=%s is a fraction, want -0.05..1.05%s", fmtNum(y), errOutOfRange, msg.Cut(yu.written), hint))
			}
		}
		v[i] = y
		values++
	}
	if values < 2 {
		return j.errAt(0, fmt.Errorf("%w: fewer than 2 Y values", ErrNoData))
	}
	g.Values[yu.q] = v
	j.s.Segments = []Segment{g}
	applyConstantUncertainty(j.s, &j.meta.consts)
	j.s.Measurements = []Measurement{j.meta.measurement(j.file, xu.String(), j.s)}
	if w := axisUnitWarning(j.file, [...]axis{xNM: axisNM, xUM: axisUM, xWavenumber: axisWavenumber}[xu], j.s); w != "" {
		j.s.Warnings = append(j.s.Warnings, w)
	}
	if yu.percent {
		j.s.Warnings = append(j.s.Warnings, percentWarnings(j.file, []column{{q: yu.q, percent: true, name: "YUNITS=" + yu.written}}, []float64{maxPct})...)
	}
	j.s.Warnings = append(j.s.Warnings, constUncertaintyWarnings(j.file, &j.meta.consts)...)
	if yu.absorbance {
		j.s.Notes = append(j.s.Notes, fmt.Sprintf("%s gives absorbance (decadic); converted to transmittance as T = 10^(−A).", j.file))
	}
	return nil
}

// tokKind is the kind of an ASDF token.
type tokKind int8

const (
	tokAbs     tokKind = iota + 1 // an ordinate (AFFN, PAC or SQZ)
	tokDif                        // a difference from the previous ordinate
	tokDup                        // a repeat count of the previous token
	tokMissing                    // "?": no value
)

type token struct {
	kind  tokKind
	v     float64 // value of tokAbs and tokDif
	count int     // repeat count of tokDup
	res   float64 // place value of the last digit written
	col   int
}

type tokenError struct {
	col int
	err error
}

func (e *tokenError) Error() string { return e.err.Error() }

// wordRE matches a field made of letters only, with an optional sign.
var wordRE = regexp.MustCompile(`^[+-]?[A-Za-z]+$`)

// wordInNumbers returns a field of a data line that is a word standing
// where a number should be: "NaN", "Inf" or "Infinity" (any case, any
// sign) anywhere, or any word of letters in a line whose ordinates are
// otherwise written as plain numbers. The ASDF characters are letters, so
// without this check "NaN" would decode as a DIF, a SQZ and a DIF ordinate
// and give wrong values silently. A line in ASDF form (SQZ, DIF, DUP) writes
// no ordinate as a plain number after its X value, so it is not affected.
func wordInNumbers(fs []field) (field, bool) {
	plain := false
	for _, f := range fs[1:] {
		plain = plain || affnRE.MatchString(f.text)
	}
	for _, f := range fs {
		switch strings.ToLower(strings.TrimLeft(f.text, "+-")) {
		case "nan", "inf", "infinity":
			return f, true
		}
		if plain && wordRE.MatchString(f.text) {
			return f, true
		}
	}
	return field{}, false
}

// tokenize splits one line of (X++(Y..Y)) data. A line whose fields are all
// plain AFFN numbers (exponents allowed) is read as such; otherwise the ASDF
// characters are decoded (JCAMP-DX 4.24 ASDF tables, from memory, checked
// against a general-purpose JCAMP-DX library in TestJCAMPCrossCheck):
//
//	SQZ  @ A-I a-i  = 0, +1..+9, −1..−9 (first digit and sign of an ordinate)
//	DIF  % J-R j-r  = 0, +1..+9, −1..−9 (first digit and sign of a difference)
//	DUP  S-Z s      = 1..9 (first digit of a repeat count)
//	PAC  + -        = sign of an ordinate
func tokenize(line string) ([]token, error) {
	fs := fieldsAt(line, " \t,;")
	if len(fs) == 0 {
		return nil, nil
	}
	affn := true
	for _, f := range fs {
		if f.text != "?" && !affnRE.MatchString(f.text) {
			affn = false
			break
		}
	}
	if !affn {
		if f, ok := wordInNumbers(fs); ok {
			return nil, &tokenError{f.col, fmt.Errorf("%s %w: a data line of plain numbers holds a word; write \"?\" for a missing value", msg.Quote(f.text), errNotNumber)}
		}
	}
	var toks []token
	if affn {
		for _, f := range fs {
			if f.text == "?" {
				toks = append(toks, token{kind: tokMissing, col: f.col})
				continue
			}
			x, err := strconv.ParseFloat(f.text, 64)
			if err != nil || math.IsInf(x, 0) {
				return nil, &tokenError{f.col, fmt.Errorf("%s %w", msg.Quote(f.text), errNotFinite)}
			}
			toks = append(toks, token{kind: tokAbs, v: x, res: resolution(f.text), col: f.col})
		}
		return toks, nil
	}
	isNum := func(c byte) bool { return c >= '0' && c <= '9' || c == '.' }
	for i := 0; i < len(line); {
		c := line[i]
		start := i
		var kind tokKind
		lead, sign := "", 1.0
		switch {
		case c == ' ' || c == '\t' || c == ',' || c == ';':
			i++
			continue
		case c == '?':
			toks = append(toks, token{kind: tokMissing, col: i + 1})
			i++
			continue
		case c == '+' || c == '-':
			kind = tokAbs
			if c == '-' {
				sign = -1
			}
			i++
		case isNum(c):
			kind = tokAbs
		case c == '@':
			kind, lead = tokAbs, "0"
			i++
		case c >= 'A' && c <= 'I':
			kind, lead = tokAbs, string('1'+c-'A')
			i++
		case c >= 'a' && c <= 'i':
			kind, lead, sign = tokAbs, string('1'+c-'a'), -1
			i++
		case c == '%':
			kind, lead = tokDif, "0"
			i++
		case c >= 'J' && c <= 'R':
			kind, lead = tokDif, string('1'+c-'J')
			i++
		case c >= 'j' && c <= 'r':
			kind, lead, sign = tokDif, string('1'+c-'j'), -1
			i++
		case c >= 'S' && c <= 'Z':
			kind, lead = tokDup, string('1'+c-'S')
			i++
		case c == 's':
			kind, lead = tokDup, "9"
			i++
		default:
			r, _ := utf8.DecodeRuneInString(line[i:])
			return nil, &tokenError{i + 1, fmt.Errorf("%w: unexpected character %q", errASDF, r)}
		}
		j := i
		for j < len(line) && isNum(line[j]) {
			j++
		}
		digits := lead + line[i:j]
		i = j
		if kind == tokDup {
			n, err := strconv.Atoi(digits)
			if err != nil || n < 1 || n > maxPoints {
				return nil, &tokenError{start + 1, fmt.Errorf("%w: %s is not a repeat count", errASDF, msg.Quote(line[start:j]))}
			}
			toks = append(toks, token{kind: tokDup, count: n, col: start + 1})
			continue
		}
		if strings.Count(digits, ".") > 1 || strings.Trim(digits, ".") == "" {
			return nil, &tokenError{start + 1, fmt.Errorf("%w: %s is not a number", errASDF, msg.Quote(line[start:j]))}
		}
		x, err := strconv.ParseFloat(digits, 64)
		if err != nil || math.IsInf(x, 0) {
			return nil, &tokenError{start + 1, fmt.Errorf("%w: %s is not a finite number", errASDF, msg.Quote(line[start:j]))}
		}
		toks = append(toks, token{kind: kind, v: sign * x, res: resolution(digits), col: start + 1})
	}
	return toks, nil
}
