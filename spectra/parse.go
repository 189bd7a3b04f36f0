package spectra

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"path"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"
	"unsafe"

	"skysheet/spectra/msg"
)

// The errors a reader may return, wrapped in a [ParseError].
var (
	errHeader         = errors.New("no header line")
	errUnknownUnit    = errors.New("is not a known spectral axis")
	errUnknownColumn  = errors.New("is not a known column")
	errDuplicateCol   = errors.New("appears twice")
	ErrNoValues       = errors.New("no R, T or A column")
	errFieldCount     = errors.New("wrong number of columns")
	errNotNumber      = errors.New("is not a number")
	errNotFinite      = errors.New("is not finite")
	errOutOfRange     = errors.New("is out of range")
	errDuplicate      = errors.New("repeats an earlier wavelength")
	errNotMonotonic   = errors.New("breaks the order of the spectral axis")
	ErrNoData         = errors.New("no data")
	errShortSegment   = errors.New("segment has fewer than 2 rows")
	errOverlap        = errors.New("ranges overlap")
	errUnknownFormat  = errors.New("unknown file format")
	errBadMetadata    = errors.New("bad metadata value")
	errEncoding       = errors.New("is not valid UTF-8")
	errEmptyAxisValue = errors.New("empty spectral axis value")
	errQuote          = errors.New("misplaced quote")
)

// ParseError reports bad input at a place in a file. Line and Column are
// 1-based; zero means unknown.
type ParseError struct {
	File   string
	Line   int
	Column int
	Name   string // column name, when Column is set
	Err    error
}

func (e *ParseError) Error() string {
	var b strings.Builder
	b.WriteString(e.File)
	if e.Line > 0 {
		fmt.Fprintf(&b, ":%d", e.Line)
	}
	b.WriteString(": ")
	if e.Column > 0 {
		fmt.Fprintf(&b, "column %d", e.Column)
		if e.Name != "" {
			fmt.Fprintf(&b, " (%s)", e.Name)
		}
		b.WriteString(": ")
	}
	b.WriteString(e.Err.Error())
	return b.String()
}

func (e *ParseError) Unwrap() error { return e.Err }

// Decode reads a spectrum from data, choosing the reader by name's
// extension: ".jdx", ".dx" and ".jcamp" are JCAMP-DX, everything else the
// neutral column format. The result's Inputs record name and the SHA-256
// of data.
func Decode(data []byte, name string) (*Spectrum, error) {
	s, err := decode(data, name)
	if err != nil {
		return nil, err
	}
	s.Inputs = []Input{inputOf(name, data)}
	return s, nil
}

func decode(data []byte, name string) (*Spectrum, error) {
	switch strings.ToLower(path.Ext(name)) {
	case ".jdx", ".dx", ".jcamp":
		if readJCAMP == nil {
			return nil, &ParseError{File: name, Err: fmt.Errorf("JCAMP-DX: %w", errUnknownFormat)}
		}
		return readJCAMP(bytes.NewReader(data), name)
	}
	return parseBytes(data, name)
}

// readJCAMP is set by the JCAMP-DX reader when it is built in.
var readJCAMP func(r io.Reader, name string) (*Spectrum, error)

// column describes one header cell of the neutral format.
type column struct {
	q       Quantity
	percent bool
	name    string // as written in the header
}

// axis is the unit of the spectral axis.
type axis int

const (
	axisNM axis = iota
	axisUM
	axisWavenumber
)

var (
	axisRE = regexp.MustCompile(`^(wavelength|lambda|wavenumber)\s*[_ ]?\s*[(\[]?\s*(nm|um|micron|microns|micrometers?|micrometres?|cm-1|1/cm|cm\^-1)\s*[)\]]?$`)
	pctRE  = regexp.MustCompile(`(\s*,?\s*[(\[]\s*%\s*[)\]]|\s*,?\s*%|_pct|_percent)$`)
)

// parseAxisHeader returns the unit named by the first header cell.
func parseAxisHeader(h string) (axis, bool) {
	h = strings.ToLower(strings.TrimSpace(h))
	h = strings.NewReplacer("µ", "u", "μ", "u", "⁻¹", "-1").Replace(h)
	m := axisRE.FindStringSubmatch(h)
	if m == nil {
		return 0, false
	}
	isWN := m[1] == "wavenumber"
	switch m[2] {
	case "nm":
		return axisNM, !isWN
	case "cm-1", "1/cm", "cm^-1":
		return axisWavenumber, isWN
	default:
		return axisUM, !isWN
	}
}

// parseColumnHeader returns the quantity named by a value header cell.
func parseColumnHeader(h string) (column, bool) {
	c := column{name: strings.Clone(strings.TrimSpace(h))} // h may be the caller's data (unsafeString)
	s := strings.ToLower(c.name)
	if loc := pctRE.FindStringIndex(s); loc != nil {
		c.percent = true
		s = strings.TrimSpace(s[:loc[0]])
	}
	switch s {
	case "r", "reflectance":
		c.q = R
	case "t", "transmittance":
		c.q = T
	case "a", "absorptance":
		c.q = A
	case "u_r", "u(r)", "ur":
		c.q = UR
	case "u_t", "u(t)", "ut":
		c.q = UT
	default:
		return c, false
	}
	return c, true
}

// Parse reads a spectrum in the neutral column format (see the README) from
// r; name is used in errors and recorded as the source.
func Parse(r io.Reader, name string) (*Spectrum, error) {
	data, err := readAll(r)
	if err != nil {
		return nil, &ParseError{File: name, Err: err}
	}
	return parseBytes(data, name)
}

// readAll is io.ReadAll, reading into one buffer of the right size when r
// knows how much is left (a bytes.Reader, strings.Reader or bytes.Buffer).
func readAll(r io.Reader) ([]byte, error) {
	sized, ok := r.(interface{ Len() int })
	if !ok {
		return io.ReadAll(r)
	}
	var b bytes.Buffer
	b.Grow(sized.Len() + bytes.MinRead)
	_, err := b.ReadFrom(r)
	return b.Bytes(), err
}

// parseBytes reads a spectrum in the neutral column format from data.
func parseBytes(data []byte, name string) (*Spectrum, error) {
	p := parser{file: name, s: &Spectrum{Sources: []string{name}}}
	if err := p.run(data); err != nil {
		return nil, err
	}
	return p.s, nil
}

// seekLine returns the line of the row whose spectral axis value is x,
// reading data again from the start with the parser that stopped there
// (p): rows are read the same way each time, so the first row read with x
// is the row p saw first. It is asked only when a row breaks the order of
// the axis, to tell a repeated value from a value out of order without
// keeping every value read; 0 means no earlier row has x.
func (p *parser) seekLine(data []byte, x float64) int {
	q := parser{file: p.file, s: &Spectrum{}, csvOnly: p.csvOnly, seek: true, seekX: x}
	if err := q.run(data); err != nil {
		var f *foundRow
		if errors.As(err, &f) {
			return f.line
		}
	}
	return 0
}

// foundRow stops a parser seeking a value (see seekLine) at its row.
type foundRow struct{ line int }

func (f *foundRow) Error() string { return fmt.Sprintf("found at line %d", f.line) }

type parser struct {
	file string
	s    *Spectrum
	line int

	delim   rune // 0 means runs of spaces
	unit    axis
	cols    []column
	pending *Segment // segment being filled
	rows    int      // rows read
	dir     int      // +1 ascending, -1 descending (in the file's own axis), 0 unknown
	lastX   float64
	lastLn  int
	fm      *fileMeta // what the metadata set
	grouped int       // axis values written like 2.500 (see thousandsWarning)
	maxAbs  []float64 // per value column, the largest |value| as written

	data    []byte // the whole file, for seekLine
	text    string // data after the header as text, read row by row
	lines   int    // lines in the file
	prevLen int    // rows of the last segment closed
	csvOnly bool   // split every delimited file with encoding/csv (tests)
	seek    bool   // stop at the first row whose axis value is seekX
	seekX   float64
}

func (p *parser) errf(col int, err error) error {
	pe := &ParseError{File: p.file, Line: p.line, Err: err}
	if col > 0 {
		pe.Column = col
		if col == 1 {
			pe.Name = "spectral axis"
		} else if col-2 < len(p.cols) {
			pe.Name = msg.Cut(p.cols[col-2].name)
		}
	}
	return pe
}

// run reads data in two states. Before the header, it reads line by line:
// "# key: value" lines are metadata, other "#" lines and blank lines are
// skipped, and the first other line is the header, whose first tab, else
// semicolon, else comma names the delimiter (none: runs of spaces). After
// the header, each line is a row or, when blank, the end of a segment;
// "#" lines are skipped. Delimited rows are split by encoding/csv, so that
// a quoted cell may hold the delimiter ("R, %"); space-separated rows by
// runs of spaces.
func (p *parser) run(data []byte) error {
	p.fm = newFileMeta()
	p.data, p.lines = data, bytes.Count(data, []byte{'\n'})+1
	pos, header := 0, false
	for pos < len(data) && !header {
		start := pos
		line, next := nextLine(data, pos)
		pos = next
		p.line++
		if p.line == 1 && bytes.HasPrefix(line, bom) {
			line, start = line[len(bom):], start+len(bom)
		}
		text := string(line)
		if !utf8.ValidString(text) {
			return p.errf(0, fmt.Errorf("line %w", errEncoding))
		}
		trimmed := strings.TrimSpace(text)
		switch {
		case strings.HasPrefix(trimmed, "#"):
			if err := p.meta(strings.TrimSpace(trimmed[1:])); err != nil {
				return err
			}
		case trimmed == "":
		default:
			header = true
			p.delim = delimiterOf(text)
			if p.delim != 0 {
				// The header is the first record encoding/csv reads.
				if err := p.delimited(data[start:]); err != nil {
					return err
				}
				pos = len(data)
				break
			}
			if err := p.header(fields(nil, text), text); err != nil {
				return err
			}
		}
	}
	if pos < len(data) {
		if err := p.spaced(unsafeString(data[pos:])); err != nil {
			return err
		}
	}
	p.line = 0
	if !header {
		return &ParseError{File: p.file, Err: errHeader}
	}
	if err := p.closeSegment(); err != nil {
		return err
	}
	if p.rows == 0 {
		return &ParseError{File: p.file, Err: fmt.Errorf("%w: the header is followed by no rows", ErrNoData)}
	}
	if (p.dir < 0) != (p.unit == axisWavenumber) {
		p.reverse()
	}
	applyConstantUncertainty(p.s, &p.fm.consts)
	p.s.Measurements = []Measurement{p.fm.measurement(p.file, p.unit.String(), p.s)}
	if w := thousandsWarning(p.file, p.grouped, p.rows, p.s); w != "" {
		p.s.Warnings = append(p.s.Warnings, w)
	} else if w := axisUnitWarning(p.file, p.unit, p.s); w != "" {
		p.s.Warnings = append(p.s.Warnings, w)
	}
	p.s.Warnings = append(p.s.Warnings, percentWarnings(p.file, p.cols, p.maxAbs)...)
	p.s.Warnings = append(p.s.Warnings, constUncertaintyWarnings(p.file, &p.fm.consts)...)
	return nil
}

var bom = []byte("\uFEFF")

// nextLine returns the line of data starting at pos, without its "\n" or
// "\r\n", and the position after it.
func nextLine(data []byte, pos int) (line []byte, next int) {
	end, next := len(data), len(data)
	if i := bytes.IndexByte(data[pos:], '\n'); i >= 0 {
		end, next = pos+i, pos+i+1
	}
	line = data[pos:end]
	if n := len(line); n > 0 && line[n-1] == '\r' {
		line = line[:n-1]
	}
	return line, next
}

// nextLineString is nextLine for text.
func nextLineString(text string, pos int) (line string, next int) {
	end, next := len(text), len(text)
	if i := strings.IndexByte(text[pos:], '\n'); i >= 0 {
		end, next = pos+i, pos+i+1
	}
	line = text[pos:end]
	if n := len(line); n > 0 && line[n-1] == '\r' {
		line = line[:n-1]
	}
	return line, next
}

// spaced reads the rows of a space-separated file, text starting after
// the header line: "#" lines are skipped, a blank line ends the segment.
func (p *parser) spaced(text string) error {
	var cells [8]string
	for pos := 0; pos < len(text); {
		line, next := nextLineString(text, pos)
		pos = next
		p.line++
		if !utf8.ValidString(line) {
			return p.errf(0, fmt.Errorf("line %w", errEncoding))
		}
		trimmed := strings.TrimSpace(line)
		switch {
		case strings.HasPrefix(trimmed, "#"):
		case trimmed == "":
			if err := p.closeSegment(); err != nil {
				return err
			}
		default:
			if err := p.row(fields(cells[:0], line)); err != nil {
				return err
			}
		}
	}
	return nil
}

// delimiterOf returns the delimiter a header line names: a tab, else a
// semicolon, else a comma; 0 for runs of spaces.
func delimiterOf(header string) rune {
	switch {
	case strings.Contains(header, "\t"):
		return '\t'
	case strings.Contains(header, ";"):
		return ';'
	case strings.Contains(header, ","):
		return ','
	}
	return 0
}

// delimited reads the header and rows of a delimited file, data starting
// at the header line (file line p.line). A file with a quote anywhere is
// read with encoding/csv (delimitedCSV); one without, line by line, giving
// the same cells: csv's rules for a line without quotes are that empty
// lines and lines starting with "#" are skipped (an empty one ends the
// segment), and each cell starts after the spaces following a delimiter
// (TrimLeadingSpace: with tabs as delimiters, a run of tabs is one).
func (p *parser) delimited(data []byte) error {
	if p.csvOnly || bytes.IndexByte(data, '"') >= 0 {
		return p.delimitedCSV(data)
	}
	text := unsafeString(data)
	base := p.line - 1 // line 1 of data is file line p.line
	delim := byte(p.delim)
	blank := false
	var cells [8]string
	for pos, ln := 0, 0; pos < len(text); {
		line, next := nextLineString(text, pos)
		pos = next
		ln++
		if line == "" {
			blank = true
			continue
		}
		if line[0] == '#' {
			continue
		}
		if blank {
			if err := p.closeSegment(); err != nil {
				return err
			}
			blank = false
		}
		first := ln == 1
		p.line = base + ln
		if !utf8.ValidString(line) {
			return p.errf(0, fmt.Errorf("line %w", errEncoding))
		}
		rec := split(cells[:0], line, delim)
		switch {
		case first:
			if err := p.header(rec, line); err != nil {
				return err
			}
		case len(rec) == 1 && rec[0] == "": // a line of spaces
			if err := p.closeSegment(); err != nil {
				return err
			}
		case strings.HasPrefix(rec[0], "#"): // a comment after spaces
		default:
			if err := p.row(rec); err != nil {
				return err
			}
		}
	}
	return nil
}

// split appends to c the cells of a line of a delimited file without
// quotes, each trimmed of spaces, as encoding/csv with TrimLeadingSpace
// and a TrimSpace of each cell would.
func split(c []string, line string, delim byte) []string {
	for {
		if delim == '\t' {
			line = trimLeftSpace(line)
		}
		i := strings.IndexByte(line, delim)
		if i < 0 {
			c = append(c, strings.TrimSpace(line))
			break
		}
		c = append(c, strings.TrimSpace(line[:i]))
		line = line[i+1:]
	}
	return c
}

// unsafeString returns data as a string without copying it. The parser
// reads data only while it runs and never changes it; every string it
// keeps afterwards (column names, messages, warnings) is a copy, so that
// the caller may reuse data.
func unsafeString(data []byte) string {
	return unsafe.String(unsafe.SliceData(data), len(data))
}

// trimLeftSpace is strings.TrimLeftFunc(s, unicode.IsSpace), quicker on
// ASCII.
func trimLeftSpace(s string) string {
	i := 0
	for i < len(s) && asciiSpace[s[i]] {
		i++
	}
	if i < len(s) && s[i] >= utf8.RuneSelf {
		return strings.TrimLeftFunc(s[i:], unicode.IsSpace)
	}
	return s[i:]
}

// asciiSpace marks the ASCII bytes unicode.IsSpace calls spaces.
var asciiSpace = [256]bool{'\t': true, '\n': true, '\v': true, '\f': true, '\r': true, ' ': true}

// delimitedCSV is delimited for a file with quotes, read with encoding/csv
// (a quoted cell may hold the delimiter or a line break). csv skips empty
// lines and lines starting with "#": where it skipped lines, they are
// looked at, and an empty one ends the segment.
func (p *parser) delimitedCSV(data []byte) error {
	r := csv.NewReader(bytes.NewReader(data))
	r.Comma, r.Comment = p.delim, '#'
	r.FieldsPerRecord, r.TrimLeadingSpace, r.ReuseRecord = -1, true, true
	base := p.line - 1 // csv's line 1 is file line p.line
	prevLine, prevEnd := 0, int64(0)
	for first := true; ; first = false {
		rec, err := r.Read()
		if err == io.EOF {
			return nil
		}
		if err != nil {
			var ce *csv.ParseError
			if errors.As(err, &ce) {
				p.line = base + ce.Line
				return p.errf(0, fmt.Errorf("%w at character %d: %v", errQuote, ce.Column, ce.Err))
			}
			return &ParseError{File: p.file, Line: p.line, Err: err}
		}
		line, _ := r.FieldPos(0)
		if skipped := line - prevLine - 1; !first && skipped > 0 && hasBlankLine(data[prevEnd:], skipped) {
			if err := p.closeSegment(); err != nil {
				return err
			}
		}
		prevEnd = r.InputOffset()
		prevLine, _ = r.FieldPos(len(rec) - 1)
		p.line = base + line
		for i, f := range rec {
			if !utf8.ValidString(f) {
				return p.errf(0, fmt.Errorf("line %w", errEncoding))
			}
			rec[i] = strings.TrimSpace(f)
		}
		switch {
		case first:
			headerLine, _ := nextLine(data, 0)
			if err := p.header(rec, string(headerLine)); err != nil {
				return err
			}
		case len(rec) == 1 && rec[0] == "": // a line of spaces
			if err := p.closeSegment(); err != nil {
				return err
			}
		case strings.HasPrefix(rec[0], "#"): // a comment after spaces
		default:
			if err := p.row(rec); err != nil {
				return err
			}
		}
	}
}

// hasBlankLine reports whether one of the first n lines of data is empty.
func hasBlankLine(data []byte, n int) bool {
	pos := 0
	for range n {
		if pos >= len(data) {
			return false
		}
		line, next := nextLine(data, pos)
		if len(bytes.TrimSpace(line)) == 0 {
			return true
		}
		pos = next
	}
	return false
}

// meta records a "# key: value" line before the header.
func (p *parser) meta(s string) error {
	k, v, ok := strings.Cut(s, ":")
	if !ok {
		return nil // a plain comment
	}
	k, v = strings.TrimSpace(k), strings.TrimSpace(v)
	if k == "" || strings.ContainsAny(k, " \t") && len(strings.Fields(k)) > 4 {
		return nil
	}
	if err := addMeta(p.s, p.fm, k, v); err != nil {
		return p.errf(0, err)
	}
	return nil
}

// addMeta records the metadata field k: v in s, giving their meaning to the
// keys that have one: u_R and u_T (a constant standard uncertainty, stored in
// m and kept as metadata), "resolution" and "emittance" (the file's
// [Measurement], stored in m and kept as metadata), "processing note"
// (appended to s.Notes) and "splice" (a [SpliceRecord] in JSON, appended to
// s.Splices). Readers of every format share it, so that [Write] and [Parse]
// round-trip all of them.
func addMeta(s *Spectrum, m *fileMeta, k, v string) error {
	switch normKey(k) {
	case normKey(noteKey):
		s.Notes = append(s.Notes, v)
		return nil
	case spliceKey:
		r, err := decodeSpliceRecord(v)
		if err != nil {
			return fmt.Errorf("%w: splice: %v", errBadMetadata, err)
		}
		s.Splices = append(s.Splices, r)
		return nil
	}
	s.Meta = append(s.Meta, Field{Key: k, Value: v})
	switch normKey(k) {
	case "u_r", "u(r)":
		return constU(&m.consts, UR, v)
	case "u_t", "u(t)":
		return constU(&m.consts, UT, v)
	case resolutionKey:
		return m.setResolution(v)
	case emittanceKey:
		b, err := ParseEmittanceBasis(v)
		if err != nil {
			return fmt.Errorf("%w: %v", errBadMetadata, err)
		}
		m.basis = b
	}
	return nil
}

// Metadata keys with a meaning of their own (see addMeta).
const (
	noteKey   = "processing note"
	spliceKey = "splice"
)

// constU reads a constant standard uncertainty from metadata: a fraction, or
// a number followed by "%".
func constU(consts *[numQuantities]float64, q Quantity, v string) error {
	s := strings.TrimSpace(v)
	scale := 1.0
	if strings.HasSuffix(s, "%") {
		scale, s = 0.01, strings.TrimSpace(strings.TrimSuffix(s, "%"))
	}
	x, err := strconv.ParseFloat(s, 64)
	if err != nil || math.IsNaN(x) || math.IsInf(x, 0) || x < 0 || x*scale > 1 {
		return fmt.Errorf("%w: %s: %s: want a standard uncertainty such as 0.005 or 0.5 %%", errBadMetadata, q, msg.Quote(v))
	}
	consts[q] = x * scale
	return nil
}

func normKey(k string) string {
	return strings.ReplaceAll(strings.ToLower(strings.TrimSpace(k)), " ", "_")
}

// fields splits a space-separated line into its cells, stripping quotes.
func fields(dst []string, text string) []string {
	f := appendFields(dst, text)
	for i := range f {
		f[i] = strings.Trim(f[i], `"`)
	}
	return f
}

// appendFields appends the cells of strings.Fields(s) to dst, without
// allocating on ASCII.
func appendFields(dst []string, s string) []string {
	n0, start := len(dst), -1
	for i := 0; i < len(s); i++ {
		c := s[i]
		if c >= utf8.RuneSelf {
			return append(dst[:n0], strings.Fields(s)...)
		}
		if asciiSpace[c] {
			if start >= 0 {
				dst = append(dst, s[start:i])
				start = -1
			}
		} else if start < 0 {
			start = i
		}
	}
	if start >= 0 {
		dst = append(dst, s[start:])
	}
	return dst
}

// header reads the header cells f (text is the header line, for messages).
func (p *parser) header(f []string, text string) error {
	f = slices.Clone(f)
	for len(f) > 0 && f[len(f)-1] == "" {
		f = f[:len(f)-1]
	}
	if len(f) == 0 {
		return p.errf(1, fmt.Errorf("%s %w: want wavelength_nm, wavelength_um or wavenumber_cm-1", msg.Quote(strings.TrimSpace(text)), errUnknownUnit))
	}
	u, ok := parseAxisHeader(f[0])
	if !ok {
		return p.errf(1, fmt.Errorf("%s %w: want wavelength_nm, wavelength_um or wavenumber_cm-1", msg.Quote(f[0]), errUnknownUnit))
	}
	p.unit = u
	seen := map[Quantity]int{}
	for i, h := range f[1:] {
		c, ok := parseColumnHeader(h)
		if !ok {
			p.cols = append(p.cols, c)
			return p.errf(i+2, fmt.Errorf("%s %w: want R, T, A, u_R or u_T, optionally with (%%) or _pct", msg.Quote(h), errUnknownColumn))
		}
		if j, dup := seen[c.q]; dup {
			p.cols = append(p.cols, c)
			return p.errf(i+2, fmt.Errorf("%s %w (also column %d)", c.q.name(), errDuplicateCol, j))
		}
		seen[c.q] = i + 2
		p.cols = append(p.cols, c)
	}
	// An uncertainty column without its own unit follows the unit of the
	// column it belongs to: a plain u_R beside R (%) is in percent.
	for i, c := range p.cols {
		if base, ok := uncertaintyOf[c.q]; ok && !c.percent {
			if j, has := seen[base]; has && p.cols[j-2].percent {
				p.cols[i].percent = true
			}
		}
	}
	if _, r := seen[R]; !r {
		if _, t := seen[T]; !t {
			if _, a := seen[A]; !a {
				return p.errf(0, fmt.Errorf("header %s: %w", msg.Quote(strings.TrimSpace(text)), ErrNoValues))
			}
		}
	}
	p.maxAbs = make([]float64, len(p.cols))
	return nil
}

// uncertaintyOf maps each uncertainty column to the column whose unit it
// follows when it carries none of its own.
var uncertaintyOf = map[Quantity]Quantity{UR: R, UT: T}

// decimal is a number read from a cell. A plain decimal (sign, at most 15
// significant digits, one point) keeps its digits m and the count of
// digits after the point, so that it is scaled by a power of ten exactly
// without being read again; any other keeps its decimal form dec for
// [scaled].
type decimal struct {
	x     float64
	dec   string // as read, a decimal comma made a point; set when !plain
	m     uint64
	frac  int
	neg   bool
	plain bool
}

// scaled returns the number times 10^exp, the double nearest the decimal
// value (see [scaled]).
func (d *decimal) scaled(exp int) float64 {
	if d.plain {
		if v, ok := exactDecimal(d.m, exp-d.frac, d.neg); ok {
			return v
		}
		return scaled(d.text(), d.x, exp)
	}
	return scaled(d.dec, d.x, exp)
}

// text writes a plain decimal back (only on the rare way where a scaled
// value leaves the exact powers of ten).
func (d *decimal) text() string {
	s := strconv.FormatUint(d.m, 10)
	if d.frac > 0 {
		if len(s) <= d.frac {
			s = strings.Repeat("0", d.frac-len(s)+1) + s
		}
		s = s[:len(s)-d.frac] + "." + s[len(s)-d.frac:]
	}
	if d.neg {
		s = "-" + s
	}
	return s
}

// number reads the cell orig of column col. In a file separated by tabs
// or semicolons, a cell with one comma and no point has a decimal comma.
// A plain decimal is read directly (exactDecimal gives the double
// strconv.ParseFloat gives); anything else by strconv.ParseFloat.
func (p *parser) number(orig string, col int) (decimal, error) {
	point := byte('.')
	if (p.delim == '\t' || p.delim == ';') && strings.Count(orig, ",") == 1 && !strings.Contains(orig, ".") {
		point = ','
	}
	if m, frac, neg, ok := plainDecimal(orig, point); ok {
		if x, ok := exactDecimal(m, -frac, neg); ok {
			return decimal{x: x, m: m, frac: frac, neg: neg, plain: true}, nil
		}
	}
	s := orig
	if point == ',' {
		s = strings.Replace(s, ",", ".", 1)
	}
	x, err := strconv.ParseFloat(s, 64)
	if err != nil {
		var ne *strconv.NumError
		if errors.As(err, &ne) && ne.Err == strconv.ErrRange {
			return decimal{}, p.errf(col, fmt.Errorf("%s %w", msg.Quote(orig), errNotFinite))
		}
		return decimal{}, p.errf(col, fmt.Errorf("%s %w%s", msg.Quote(orig), errNotNumber, thousandsHint(orig)))
	}
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return decimal{}, p.errf(col, fmt.Errorf("%s %w", msg.Quote(orig), errNotFinite))
	}
	return decimal{x: x, dec: s}, nil
}

// row reads the cells f of one row.
func (p *parser) row(f []string) error {
	want := len(p.cols) + 1
	for len(f) > want && f[len(f)-1] == "" {
		f = f[:len(f)-1]
	}
	if len(f) != want {
		return p.errf(0, fmt.Errorf("%w: expected %d, found %d", errFieldCount, want, len(f)))
	}
	if f[0] == "" {
		return p.errf(1, errEmptyAxisValue)
	}
	xd, err := p.number(f[0], 1)
	if err != nil {
		return err
	}
	x := xd.x
	var nm float64
	switch p.unit {
	case axisNM:
		nm = x
	case axisUM:
		nm = xd.scaled(3)
	case axisWavenumber:
		nm = 1e7 / x
	}
	if !(x > 0) || math.IsInf(nm, 0) || !(nm > 0) {
		return p.errf(1, fmt.Errorf("%s %w: the spectral axis must be positive", msg.Quote(f[0]), errOutOfRange))
	}
	// The axis is strictly monotonic up to the last row, so a repeated
	// value is the last one or breaks the order; only then are the earlier
	// rows looked at again (seekLine).
	if p.rows > 0 {
		if x == p.lastX {
			return p.errf(1, fmt.Errorf("%s %w (line %d)", msg.Cut(f[0]), errDuplicate, p.lastLn))
		}
		d := 1
		if x < p.lastX {
			d = -1
		}
		if p.dir == 0 {
			p.dir = d
		} else if d != p.dir {
			if !p.seek {
				if ln := p.seekLine(p.data, x); ln > 0 {
					return p.errf(1, fmt.Errorf("%s %w (line %d)", msg.Cut(f[0]), errDuplicate, ln))
				}
			}
			order := "ascending"
			if p.dir < 0 {
				order = "descending"
			}
			return p.errf(1, fmt.Errorf("%s %w: the axis is %s but line %d has %g", msg.Cut(f[0]), errNotMonotonic, order, p.lastLn, p.lastX))
		}
	}
	if p.seek && x == p.seekX {
		return &foundRow{line: p.line}
	}
	p.lastX, p.lastLn = x, p.line
	if isGrouped(f[0]) {
		p.grouped++
	}
	p.rows++
	if p.pending == nil {
		// Room for every line left, or for as many rows as the last
		// segment had; closeSegment gives back what is not used.
		n := max(p.lines-p.line+1, 2)
		if len(p.s.Segments) > 0 {
			n = min(n, max(p.prevLen, 16))
		}
		p.pending = &Segment{Source: p.file, NM: make([]float64, 0, n)}
		for _, c := range p.cols {
			p.pending.Values[c.q] = make([]float64, 0, n)
		}
	}
	g := p.pending
	g.NM = append(g.NM, nm)
	for i, c := range p.cols {
		s := f[i+1]
		v := math.NaN()
		if s != "" {
			d, err := p.number(s, i+2)
			if err != nil {
				return err
			}
			v = d.x
			if err := p.checkRange(v, c, s, i+2); err != nil {
				return err
			}
			p.maxAbs[i] = math.Max(p.maxAbs[i], math.Abs(v))
			if c.percent {
				v = d.scaled(-2) // 88.112 % is 0.88112, not 88.112/100 = 0.8811199999999999
			}
		}
		g.Values[c.q] = append(g.Values[c.q], v)
	}
	return nil
}

// scaled returns the number written dec (read as x) times 10^exp, read
// again from its decimal form with the exponent moved, so that no float
// noise enters: "88.112" with exp −2 is read as "88.112e-2", the double
// nearest 0.88112 (88.112/100 is 0.8811199999999999).
func scaled(dec string, x float64, exp int) float64 {
	if v, ok := scaledFast(dec, exp); ok {
		return v
	}
	if strings.ContainsAny(dec, "eEpPxX_") {
		return shiftDecimal(x, exp)
	}
	v, err := strconv.ParseFloat(dec+"e"+strconv.Itoa(exp), 64)
	if err != nil {
		return shiftDecimal(x, exp)
	}
	return v
}

// pow10 holds the powers of ten that float64 holds exactly.
var pow10 = [...]float64{1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11,
	1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22}

// scaledFast reads a plain decimal dec ("-88.112": sign, digits, one
// point) times 10^exp when its digits fit in 2^53 and the power of ten is
// exact (see exactDecimal). ok is false otherwise.
func scaledFast(dec string, exp int) (v float64, ok bool) {
	m, frac, neg, ok := plainDecimal(dec, '.')
	if !ok {
		return 0, false
	}
	return exactDecimal(m, exp-frac, neg)
}

// plainDecimal reads s as a plain decimal: an optional sign, digits with
// at most one point (the byte point) and at least one digit, at most 15
// significant digits. It returns the digits m and the count of digits
// after the point; ok is false for anything else (exponents, hex, words,
// more digits).
func plainDecimal(s string, point byte) (m uint64, frac int, neg, ok bool) {
	i := 0
	if i < len(s) && (s[i] == '-' || s[i] == '+') {
		neg = s[i] == '-'
		i++
	}
	digits, any, dot := 0, false, false
	for ; i < len(s); i++ {
		c := s[i]
		switch {
		case c >= '0' && c <= '9':
			if digits == 15 {
				return 0, 0, false, false
			}
			if m > 0 || c != '0' {
				digits++
			}
			m = m*10 + uint64(c-'0')
			any = true
			if dot {
				frac++
			}
		case c == point && !dot:
			dot = true
		default:
			return 0, 0, false, false
		}
	}
	return m, frac, neg, any
}

// exactDecimal returns ±m·10^e when the power of ten is exact in a double
// (|e| ≤ 22; m < 10^15 is exact too): then one division or multiplication
// of exact doubles gives the double nearest the decimal value, the one
// strconv.ParseFloat returns (the fast path of decimal-to-binary
// conversion, Clinger 1990, "How to read floating point numbers
// accurately", PLDI; from memory). ok is false for other e.
func exactDecimal(m uint64, e int, neg bool) (v float64, ok bool) {
	if e < -22 || e > 22 {
		return 0, false
	}
	v = float64(m)
	if e < 0 {
		v /= pow10[-e]
	} else {
		v *= pow10[e]
	}
	if neg {
		v = -v
	}
	return v, true
}

func (p *parser) checkRange(v float64, c column, s string, col int) error {
	lo, hi := -0.05, 1.05
	if c.q == UR || c.q == UT {
		lo, hi = 0, 1
	}
	if c.percent {
		lo, hi = lo*100, hi*100
	}
	if v >= lo && v <= hi {
		return nil
	}
	// The message, built only for a value out of range.
	unit := "a fraction within -0.05..1.05"
	if c.q == UR || c.q == UT {
		unit = "an uncertainty within 0..1"
	}
	if c.percent {
		unit = strings.Replace(unit, "a fraction", "a percentage", 1)
		unit = strings.Replace(unit, "-0.05..1.05", "-5..105", 1)
		unit = strings.Replace(unit, "0..1", "0..100", 1)
	}
	hint := ""
	if !c.percent && v > 1.05 && v <= 105 {
		hint = " (percent? mark the header, e.g. \"" + c.q.String() + " (%)\")"
	}
	return p.errf(col, fmt.Errorf("%s %w: want %s%s", msg.Quote(s), errOutOfRange, unit, hint))
}

// closeSegment ends the current segment at a blank line or at the end.
func (p *parser) closeSegment() error {
	g := p.pending
	if g == nil {
		return nil
	}
	p.pending = nil
	if len(g.NM) < 2 {
		return &ParseError{File: p.file, Line: p.lastLn, Err: fmt.Errorf("%w (segments are separated by blank lines)", errShortSegment)}
	}
	if n := len(g.NM); cap(g.NM) > n+n/4+16 { // lines of comments, or a longer segment before
		g.NM = slices.Clone(g.NM)
		for q, v := range g.Values {
			if v != nil {
				g.Values[q] = slices.Clone(v)
			}
		}
	}
	p.prevLen = len(g.NM)
	p.s.Segments = append(p.s.Segments, *g)
	return nil
}

// reverse puts a descending file into increasing wavelength order. A
// wavenumber axis that ascends is descending in wavelength, and vice versa.
func (p *parser) reverse() {
	segs := p.s.Segments
	for i, j := 0, len(segs)-1; i < j; i, j = i+1, j-1 {
		segs[i], segs[j] = segs[j], segs[i]
	}
	for i := range segs {
		flip(segs[i].NM)
		for _, v := range segs[i].Values {
			flip(v)
		}
	}
}

func flip(v []float64) {
	for i, j := 0, len(v)-1; i < j; i, j = i+1, j-1 {
		v[i], v[j] = v[j], v[i]
	}
}

// applyConstantUncertainty fills the u_R and u_T columns from constant
// uncertainties given in metadata, in segments that have R (or T) but no
// per-point uncertainty.
func applyConstantUncertainty(s *Spectrum, consts *[numQuantities]float64) {
	for _, q := range []Quantity{UR, UT} {
		if math.IsNaN(consts[q]) {
			continue
		}
		base := R
		if q == UT {
			base = T
		}
		for i := range s.Segments {
			g := &s.Segments[i]
			if g.Values[q] != nil || g.Values[base] == nil {
				continue
			}
			u := make([]float64, len(g.NM))
			for j := range u {
				u[j] = consts[q]
			}
			g.Values[q] = u
		}
	}
}
