package weather

import (
	"bytes"
	"crypto/sha256"
	"encoding/csv"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math"
	"path"
	"strconv"
	"strings"
	"time"
	"unicode/utf8"

	"skysheet/spectra"
	"skysheet/spectra/msg"
)

// The errors [Parse] may return, wrapped in a *[spectra.ParseError].
var (
	ErrTooLarge        = errors.New("is larger than 64 MiB")
	ErrEncoding        = errors.New("is not valid UTF-8")
	ErrSyntax          = errors.New("CSV syntax error")
	ErrNoHeader        = errors.New("no header line")
	ErrBadHeader       = errors.New("is not a header cell of the form name (unit)")
	ErrUnknownColumn   = errors.New("is not a known column")
	ErrNoUnit          = errors.New("has no unit")
	ErrUnit            = errors.New("is not a known unit")
	ErrDuplicateColumn = errors.New("appears twice")
	ErrMissingColumn   = errors.New("missing column")
	ErrMetadata        = errors.New("bad metadata")
	ErrFieldCount      = errors.New("wrong number of columns")
	ErrEmptyCell       = errors.New("empty cell")
	ErrNotNumber       = errors.New("is not a number")
	ErrNotFinite       = errors.New("is not finite")
	ErrOutOfRange      = errors.New("is out of range")
	ErrDewPoint        = errors.New("is above the air temperature")
	ErrTime            = errors.New("is not a time with a UTC offset")
	ErrDuplicateHour   = errors.New("duplicate hour")
	ErrNotIncreasing   = errors.New("is earlier than the row before")
	ErrGap             = errors.New("is not one hour after the row before")
	ErrNoData          = errors.New("no data")
)

// Read reads the series file name from fsys with [Parse].
func Read(fsys fs.FS, name string) (*Series, error) {
	f, err := fsys.Open(name)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	return Parse(f, name)
}

// Parse reads an hourly weather series (docs/format.md, "Hourly weather
// series") from r; name is used in errors and recorded in the series' Input.
// It reads at most [MaxSize] bytes. Every problem is a *[spectra.ParseError]
// naming the line and, where one is at fault, the column.
func Parse(r io.Reader, name string) (*Series, error) {
	data, err := readLimited(r)
	if err == nil && int64(len(data)) > maxSize {
		err = errTooLarge
	}
	if err != nil {
		return nil, &spectra.ParseError{File: name, Err: err}
	}
	sum := sha256.Sum256(data)
	p := parser{file: name, data: data, s: &Series{Input: spectra.Input{Name: name, SHA256: hex.EncodeToString(sum[:])}}}
	if err := p.run(); err != nil {
		return nil, err
	}
	return p.s, nil
}

// readLimited reads r to its end or to maxSize+1 bytes; in one allocation
// when r tells its length, and not at all when that length is over maxSize.
func readLimited(r io.Reader) ([]byte, error) {
	size := int64(-1)
	switch v := r.(type) {
	case interface{ Len() int }:
		size = int64(v.Len())
	case fs.File:
		if st, err := v.Stat(); err == nil && st.Mode().IsRegular() {
			size = st.Size()
		}
	}
	if size > maxSize {
		return nil, errTooLarge
	}
	if size < 0 {
		return io.ReadAll(io.LimitReader(r, maxSize+1))
	}
	var buf bytes.Buffer
	buf.Grow(int(size) + bytes.MinRead)
	_, err := buf.ReadFrom(io.LimitReader(r, maxSize+1))
	return buf.Bytes(), err
}

// maxSize is MaxSize; tests lower it.
var maxSize int64 = MaxSize

var errTooLarge = fmt.Errorf("the file %w", ErrTooLarge)

// parser reads one file in three steps: the preamble (comments, metadata
// and blank lines, read line by line), the header (the first other line,
// and from there on encoding/csv splits the fields), then one hour per
// record. The preamble is read by hand because encoding/csv drops comment
// lines, and metadata lives in them.
type parser struct {
	file string
	data []byte
	s    *Series

	base  int // lines before the header line
	csv   *csv.Reader
	cells []cell             // the header
	idx   [numQuantities]int // column index of each quantity, -1 if absent
	lines []int              // line of each hour, for messages
	zones map[int]*time.Location
}

// errAt returns a ParseError at line (absolute) and column index i (0-based;
// -1 for none).
func (p *parser) errAt(line, i int, err error) error {
	pe := &spectra.ParseError{File: p.file, Line: line, Err: err}
	if i >= 0 {
		pe.Column = i + 1
		if i < len(p.cells) {
			pe.Name = msg.Cut(p.cells[i].col.Header)
		}
	}
	return pe
}

// fieldLine returns the line of field i of the record just read.
func (p *parser) fieldLine(i int) int {
	l, _ := p.csv.FieldPos(i)
	return p.base + l
}

func (p *parser) run() error {
	data := bytes.TrimPrefix(p.data, []byte("\uFEFF"))
	if !utf8.Valid(data) {
		line := 1 + bytes.Count(data[:invalidAt(data)], []byte("\n"))
		return p.errAt(line, -1, fmt.Errorf("line %w", ErrEncoding))
	}
	// The preamble.
	pos, line := 0, 0
	for pos < len(data) {
		line++
		end := bytes.IndexByte(data[pos:], '\n')
		next := len(data)
		if end >= 0 {
			end += pos
			next = end + 1
		} else {
			end = len(data)
		}
		text := strings.TrimSpace(string(data[pos:end]))
		if text != "" && text[0] != '#' {
			break
		}
		if text != "" {
			if err := p.meta(strings.TrimSpace(text[1:]), line); err != nil {
				return err
			}
		}
		pos = next
	}
	if pos >= len(data) {
		return p.errAt(0, -1, fmt.Errorf("%w: the file holds only comments and blank lines", ErrNoHeader))
	}
	p.base = line - 1
	p.csv = csv.NewReader(bytes.NewReader(data[pos:]))
	p.csv.Comment = '#'
	p.csv.FieldsPerRecord = -1
	p.csv.TrimLeadingSpace = true
	rec, err := p.csv.Read()
	if err != nil {
		return p.csvError(err, data[pos:])
	}
	if err := p.header(rec, line); err != nil {
		return err
	}
	p.csv.ReuseRecord = true
	// Room for the rows: one per line, a row being at least 24 bytes
	// ("2026-07-01T13:00Z,0,0,0" and its line end); at most eleven years
	// ahead, so that a file of blank lines allocates nothing large.
	p.s.Hours = make([]Hour, 0, min(bytes.Count(data[pos:], []byte("\n"))+1, (len(data)-pos)/24+1, 100_000))
	p.lines = make([]int, 0, cap(p.s.Hours))
	p.zones = map[int]*time.Location{}
	for {
		rec, err := p.csv.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return p.csvError(err, data[pos:])
		}
		if err := p.row(rec); err != nil {
			return err
		}
	}
	if len(p.s.Hours) == 0 {
		return p.errAt(0, -1, fmt.Errorf("%w: the header is followed by no rows", ErrNoData))
	}
	if p.s.Name == "" {
		base := path.Base(strings.ReplaceAll(p.file, `\`, "/"))
		p.s.Name = strings.TrimSuffix(base, path.Ext(base))
	}
	return nil
}

// invalidAt returns the offset of the first byte of data that is not valid
// UTF-8.
func invalidAt(data []byte) int {
	for i := 0; i < len(data); {
		r, n := utf8.DecodeRune(data[i:])
		if r == utf8.RuneError && n <= 1 {
			return i
		}
		i += n
	}
	return len(data)
}

// csvError turns an encoding/csv error into a ParseError; body is the text
// the csv reader reads, for the character position.
func (p *parser) csvError(err error, body []byte) error {
	var ce *csv.ParseError
	if !errors.As(err, &ce) {
		return p.errAt(0, -1, err)
	}
	// ce.Column is a 1-based byte index into its line; say characters.
	lines := bytes.SplitN(body, []byte("\n"), ce.Line+1)
	col := ce.Column
	if ce.Line-1 < len(lines) {
		l := lines[ce.Line-1]
		if col-1 <= len(l) && col >= 1 {
			col = utf8.RuneCount(l[:col-1]) + 1
		}
	}
	return p.errAt(p.base+ce.Line, -1, fmt.Errorf("%w at character %d: %w", ErrSyntax, col, ce.Err))
}

// meta reads a comment line of the preamble (without its "#"). A line
// "key: value" whose key is a short name (a letter, then up to 39 letters,
// digits, spaces, ".", "_" or "-") is metadata; any other is a plain comment.
func (p *parser) meta(s string, line int) error {
	k, v, ok := strings.Cut(s, ":")
	if !ok || !isMetaKey(strings.TrimSpace(k)) {
		return nil
	}
	k, v = strings.TrimSpace(k), strings.TrimSpace(v)
	if normName(k) == "name" {
		if v == "" {
			return p.errAt(line, -1, fmt.Errorf("%w: name is empty", ErrMetadata))
		}
		if p.s.Name != "" {
			return p.errAt(line, -1, fmt.Errorf("%w: name given twice (first %q)", ErrMetadata, msg.Cut(p.s.Name)))
		}
		p.s.Name = v
		return nil
	}
	p.s.Meta = append(p.s.Meta, spectra.Field{Key: k, Value: v})
	return nil
}

func isMetaKey(k string) bool {
	if k == "" || len(k) > 40 {
		return false
	}
	for i, r := range k {
		letter := r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z'
		if i == 0 && !letter {
			return false
		}
		if !letter && !(r >= '0' && r <= '9') && !strings.ContainsRune(" ._-", r) {
			return false
		}
	}
	return true
}

// header reads the header record, found on line.
func (p *parser) header(rec []string, line int) error {
	for len(rec) > 0 && strings.TrimSpace(rec[len(rec)-1]) == "" {
		rec = rec[:len(rec)-1]
	}
	for i := range p.idx {
		p.idx[i] = -1
	}
	if len(rec) == 1 && strings.ContainsAny(rec[0], ";\t") {
		return p.errAt(line, 0, fmt.Errorf("%q %w: fields are separated by commas, this header by semicolons or tabs", msg.Cut(rec[0]), ErrBadHeader))
	}
	for i, h := range rec {
		if strings.TrimSpace(h) == "" {
			p.cells = append(p.cells, cell{q: -1})
			return p.errAt(line, i, fmt.Errorf("empty header cell %w: every column needs a name", ErrBadHeader))
		}
		c, err := parseHeaderCell(h)
		p.cells = append(p.cells, c)
		if err != nil {
			return p.errAt(line, i, err)
		}
		if j := p.idx[c.q]; j >= 0 {
			return p.errAt(line, i, fmt.Errorf("%s %w (also column %d)", c.q, ErrDuplicateColumn, j+1))
		}
		p.idx[c.q] = i
		p.s.Columns = append(p.s.Columns, c.col)
	}
	var have, missing []string
	for _, c := range p.cells {
		have = append(have, c.q.String())
	}
	for q := Time; q <= GlobalHorizontal; q++ {
		if p.idx[q] < 0 {
			missing = append(missing, q.String())
		}
	}
	if len(missing) > 0 {
		verb := "is"
		if len(missing) > 1 {
			verb = "are"
		}
		return p.errAt(line, -1, fmt.Errorf("%w: %s %s required; the header has %s", ErrMissingColumn,
			strings.Join(missing, ", "), verb, strings.Join(have, ", ")))
	}
	return nil
}

// row reads one data record.
func (p *parser) row(rec []string) error {
	for i := range rec {
		rec[i] = strings.TrimSpace(rec[i])
	}
	if len(rec) == 1 && rec[0] == "" || strings.HasPrefix(rec[0], "#") {
		return nil // a blank line, or a comment indented by spaces
	}
	want := len(p.cells)
	for len(rec) > want && rec[len(rec)-1] == "" {
		rec = rec[:len(rec)-1]
	}
	if len(rec) != want {
		return p.errAt(p.fieldLine(0), -1, fmt.Errorf("%w: expected %d, found %d", ErrFieldCount, want, len(rec)))
	}
	h := Hour{WindMS: math.NaN(), CloudFraction: math.NaN(), PressureHPa: math.NaN()}
	for i, s := range rec {
		c := &p.cells[i]
		if c.q == Time {
			t, err := p.parseTime(s, i)
			if err != nil {
				return err
			}
			h.Time = t
			continue
		}
		if s == "" {
			return p.errAt(p.fieldLine(i), i, fmt.Errorf("%w: every hour needs a value (fill the gap or leave the column out)", ErrEmptyCell))
		}
		v, err := p.number(s, i)
		if err != nil {
			return err
		}
		d := &quantityInfo[c.q]
		v = c.unit.internal(v)
		if v < d.lo || v > d.hi {
			return p.errAt(p.fieldLine(i), i, fmt.Errorf("%q %w: want %s%s", msg.Cut(s), ErrOutOfRange, rangeIn(d, c.unit), hint(c, v)))
		}
		switch c.q {
		case AirTemperature:
			h.AirC = v
		case DewPoint:
			h.DewPointC = v
		case GlobalHorizontal:
			h.GlobalWm2 = v
		case WindSpeed:
			h.WindMS = v
		case CloudFraction:
			h.CloudFraction = v
		case StationPressure:
			h.PressureHPa = v
		}
	}
	if h.DewPointC > h.AirC+DewPointSlackK {
		i := p.idx[DewPoint]
		return p.errAt(p.fieldLine(i), i, fmt.Errorf("%q %w: dew point %s °C, air %s °C; the dew point may exceed the air temperature by %g K at most",
			msg.Cut(rec[i]), ErrDewPoint, fmtG(h.DewPointC), fmtG(h.AirC), DewPointSlackK))
	}
	if err := p.sequence(h.Time, rec[p.idx[Time]]); err != nil {
		return err
	}
	p.s.Hours = append(p.s.Hours, h)
	p.lines = append(p.lines, p.fieldLine(0))
	return nil
}

// sequence checks that t, written as raw, comes one hour after the last
// hour read.
func (p *parser) sequence(t time.Time, raw string) error {
	n := len(p.s.Hours)
	if n == 0 {
		return nil
	}
	i := p.idx[Time]
	line := p.fieldLine(i)
	prev := p.s.Hours[n-1].Time
	d := t.Sub(prev)
	if d == time.Hour {
		return nil
	}
	prevAt := fmt.Sprintf("line %d, %s", p.lines[n-1], fmtTime(prev))
	if d <= 0 {
		// The hours so far are exactly hourly from the first, so an
		// earlier instant repeats hour k if it lies a whole number k of
		// hours after the first.
		since := t.Sub(p.s.Hours[0].Time)
		if since >= 0 && since%time.Hour == 0 {
			k := int(since / time.Hour)
			first := p.s.Hours[k].Time
			same := ""
			if fmtTime(first) != fmtTime(t) {
				same = " as " + fmtTime(first)
			}
			return p.errAt(line, i, fmt.Errorf("%w %s, first on line %d%s", ErrDuplicateHour, msg.Cut(raw), p.lines[k], same))
		}
		return p.errAt(line, i, fmt.Errorf("%q %w (%s): times must increase by one hour a row", msg.Cut(raw), ErrNotIncreasing, prevAt))
	}
	if d > time.Hour && d%time.Hour == 0 {
		missing := int(d/time.Hour) - 1
		plural := "s"
		if missing == 1 {
			plural = ""
		}
		return p.errAt(line, i, fmt.Errorf("%q %w: a gap of %s after %s, %d hour%s missing", msg.Cut(raw), ErrGap, fmtDuration(d), prevAt, missing, plural))
	}
	return p.errAt(line, i, fmt.Errorf("%q %w: a step of %s after %s; rows must be exactly one hour apart", msg.Cut(raw), ErrGap, fmtDuration(d), prevAt))
}

// The time layouts: RFC 3339 with seconds (a fraction may follow them), and
// the same without seconds.
const (
	layoutSeconds = "2006-01-02T15:04:05Z07:00"
	layoutMinutes = "2006-01-02T15:04Z07:00"
)

// maxOffset is the largest UTC offset in use (+14:00).
const maxOffset = 14 * 3600

// parseTime reads an ISO 8601 date and time with a UTC offset. The result
// keeps the offset in a fixed zone, whatever the machine's time zone.
func (p *parser) parseTime(s string, i int) (time.Time, error) {
	t, err := time.Parse(layoutSeconds, s)
	if err != nil {
		t, err = time.Parse(layoutMinutes, s)
	}
	if err != nil {
		why := "write e.g. 2026-07-01T13:00:00+02:00 or 2026-07-01T11:00Z"
		switch {
		case s == "":
			why = "every hour needs a time; " + why
		case parses(strings.Replace(s, " ", "T", 1)):
			why = "write T between the date and the time, e.g. 2026-07-01T13:00:00+02:00"
		case parsesLocal(s):
			why = "add the UTC offset, e.g. 2026-07-01T13:00:00+02:00, or Z for UTC"
		}
		return t, p.errAt(p.fieldLine(i), i, fmt.Errorf("%q %w: %s", msg.Cut(s), ErrTime, why))
	}
	_, off := t.Zone()
	if off > maxOffset || off < -maxOffset {
		return t, p.errAt(p.fieldLine(i), i, fmt.Errorf("%q %w: the UTC offset must lie within −14:00..+14:00", msg.Cut(s), ErrOutOfRange))
	}
	loc := p.zones[off]
	if loc == nil {
		loc = time.FixedZone("", off)
		p.zones[off] = loc
	}
	return t.In(loc), nil
}

func parses(s string) bool {
	_, err1 := time.Parse(layoutSeconds, s)
	_, err2 := time.Parse(layoutMinutes, s)
	return err1 == nil || err2 == nil
}

func parsesLocal(s string) bool {
	_, err1 := time.Parse("2006-01-02T15:04:05", s)
	_, err2 := time.Parse("2006-01-02T15:04", s)
	return err1 == nil || err2 == nil
}

// number reads a decimal number: an optional sign, digits with an optional
// decimal point, and an optional exponent. Hexadecimal, underscores, NaN and
// infinities are refused.
func (p *parser) number(s string, i int) (float64, error) {
	if !isDecimal(s) {
		low := strings.ToLower(strings.TrimLeft(s, "+-"))
		switch {
		case low == "nan" || low == "inf" || low == "infinity":
			return 0, p.errAt(p.fieldLine(i), i, fmt.Errorf("%q %w", msg.Cut(s), ErrNotFinite))
		case strings.Count(s, ",") == 1 && isDecimal(strings.Replace(s, ",", ".", 1)):
			return 0, p.errAt(p.fieldLine(i), i, fmt.Errorf("%q %w: write a decimal point, e.g. %s", msg.Cut(s), ErrNotNumber, msg.Cut(strings.Replace(s, ",", ".", 1))))
		}
		return 0, p.errAt(p.fieldLine(i), i, fmt.Errorf("%q %w", msg.Cut(s), ErrNotNumber))
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil || math.IsInf(v, 0) {
		return 0, p.errAt(p.fieldLine(i), i, fmt.Errorf("%q %w", msg.Cut(s), ErrNotFinite))
	}
	return v, nil
}

func isDecimal(s string) bool {
	i := 0
	if i < len(s) && (s[i] == '+' || s[i] == '-') {
		i++
	}
	digits := 0
	for ; i < len(s) && s[i] >= '0' && s[i] <= '9'; i++ {
		digits++
	}
	if i < len(s) && s[i] == '.' {
		i++
		for ; i < len(s) && s[i] >= '0' && s[i] <= '9'; i++ {
			digits++
		}
	}
	if digits == 0 {
		return false
	}
	if i < len(s) && (s[i] == 'e' || s[i] == 'E') {
		i++
		if i < len(s) && (s[i] == '+' || s[i] == '-') {
			i++
		}
		exp := 0
		for ; i < len(s) && s[i] >= '0' && s[i] <= '9'; i++ {
			exp++
		}
		if exp == 0 {
			return false
		}
	}
	return i == len(s)
}

// rangeIn writes a quantity's accepted range in the unit u of its column.
func rangeIn(d *quantityDef, u unit) string {
	lo, hi := u.external(d.lo), u.external(d.hi)
	unit := u.name
	switch unit {
	case "":
		unit = " (a fraction)"
	case "%":
	default:
		unit = " " + unit
	}
	return fmtG(lo) + ".." + fmtG(hi) + unit
}

// hint guesses a wrong unit from a value v (internal unit) out of range.
func hint(c *cell, v float64) string {
	raw := c.unit.external(v)
	switch {
	case c.q == GlobalHorizontal && v < 0:
		return " (a pyranometer's night-time offset? write 0)"
	case (c.q == AirTemperature || c.q == DewPoint) && c.unit.name == "K" && raw >= -90 && raw <= 60:
		return " (degrees Celsius? write the header with (°C))"
	case (c.q == AirTemperature || c.q == DewPoint) && c.unit.name == "°C" && raw >= 180 && raw <= 335:
		return " (kelvin? write the header with (K))"
	case c.q == CloudFraction && c.unit.name == "" && raw > 1 && raw <= 100:
		return " (percent? write the header as \"cloud fraction (%)\")"
	case c.q == StationPressure && c.unit.name == "hPa" && raw >= 30 && raw <= 110:
		return " (kilopascals? write the header with (kPa))"
	}
	return ""
}

// fmtTime writes t in RFC 3339, its seconds left out when zero.
func fmtTime(t time.Time) string {
	if t.Second() == 0 && t.Nanosecond() == 0 {
		return t.Format(layoutMinutes)
	}
	return t.Format(time.RFC3339Nano)
}

// fmtDuration writes d in days, hours, minutes and seconds, e.g. "3 h" or
// "1 h 30 min".
func fmtDuration(d time.Duration) string {
	var parts []string
	if days := d / (24 * time.Hour); days >= 2 {
		parts = append(parts, strconv.Itoa(int(days))+" days")
		d -= days * 24 * time.Hour
	}
	for _, u := range []struct {
		d    time.Duration
		name string
	}{{time.Hour, "h"}, {time.Minute, "min"}, {time.Second, "s"}} {
		if n := d / u.d; n > 0 {
			parts = append(parts, strconv.Itoa(int(n))+" "+u.name)
			d -= n * u.d
		}
	}
	if d > 0 || len(parts) == 0 {
		parts = append(parts, d.String())
	}
	return strings.Join(parts, " ")
}

func fmtG(x float64) string { return strconv.FormatFloat(x, 'g', 6, 64) }
