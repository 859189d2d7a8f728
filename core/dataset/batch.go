package dataset

import (
	"bufio"
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"sort"
	"strconv"
	"strings"
	"unicode/utf8"
)

// LongOptions name the columns of a long file. Empty names mean "id",
// "date", "value" (matched ignoring case). The date column may be absent
// from the file; id and value may not.
type LongOptions struct {
	ID, Date, Value string
	// Delimiter is the field delimiter; 0 detects it from the first 64 KiB.
	Delimiter rune
	// DateFormat is as in Options.
	DateFormat string
	// Name is the file name used in errors.
	Name string
}

// LongReader streams a long file (one row per id and date) and returns one
// single-series Table per id. A file whose rows of one id are contiguous is
// streamed; a file whose ids interleave within its first MiB (sorted by
// date, say) is read whole and grouped by id, in order of first appearance,
// with a "sorted" note. Rows of one id out of date order are sorted by date
// (noted) when every date reads on its own.
//
// Errors: a bad record (a bad number or date, an id seen again after the
// first MiB of a streamed file, an empty id) makes Next return a
// *ParseError with its line and the record's id after consuming the rest of
// that id's rows; calling Next again continues with the next id. Read errors
// and header errors are returned by every later call.
type LongReader struct {
	rr      *recordReader
	name    string
	dec     decimal
	id, dt  int // column indexes (dt -1: none)
	val     int
	names   []string
	pending *record
	seen    map[string]bool
	err     error
	dopt    dateOpts
	// unsorted: the ids interleave in the first MiB, so the whole file
	// is read and grouped by id; groups holds the groups not yet returned.
	unsorted bool
	groups   [][]*record
}

// longWindow is the start of a long file in which interleaved ids are
// looked for.
const longWindow = 1 << 20

// NewLongReader reads the header of a long file.
func NewLongReader(r io.Reader, opt LongOptions) (*LongReader, error) {
	br := bufio.NewReaderSize(r, longWindow)
	peek, _ := br.Peek(longWindow)
	partial := len(peek) == longWindow
	lines := sampleLines(peek[:min(len(peek), 64<<10)], 50, partial || len(peek) > 64<<10)
	delim := byte(0)
	if opt.Delimiter != 0 {
		if opt.Delimiter >= utf8.RuneSelf || opt.Delimiter == '"' || opt.Delimiter == '\n' || opt.Delimiter == '\r' {
			return nil, &ParseError{File: opt.Name, Err: wrapf(ErrBadNumber, "delimiter %q is not supported", opt.Delimiter)}
		}
		delim = byte(opt.Delimiter)
	} else {
		delim = detectDelimiter(lines)
	}
	dopt, err := parseDateFormat(opt.DateFormat, -1)
	if err != nil {
		return nil, &ParseError{File: opt.Name, Err: err}
	}
	lr := &LongReader{rr: newRecordReader(br, delim), name: opt.Name, seen: map[string]bool{}, dt: -1, dopt: dopt}
	if delim != ',' {
		recs := make([]record, len(lines))
		for i, l := range lines {
			recs[i] = record{fields: splitFields(l, delim)}
		}
		lr.dec, _ = detectDecimal(recs, delim)
	}
	head, err := lr.rr.next()
	if err == io.EOF {
		return nil, &ParseError{File: opt.Name, Err: wrapf(ErrNoHeader, "the input is empty")}
	}
	if err != nil {
		return nil, &ParseError{File: opt.Name, Err: err}
	}
	for _, f := range head.fields {
		lr.names = append(lr.names, trimSpace(f))
	}
	col := func(want, def string) int {
		if want == "" {
			want = def
		}
		for j, n := range lr.names {
			if strings.EqualFold(n, trimSpace(want)) {
				return j
			}
		}
		return -1
	}
	lr.id, lr.dt, lr.val = col(opt.ID, "id"), col(opt.Date, "date"), col(opt.Value, "value")
	if lr.id < 0 || lr.val < 0 {
		missing := opt.ID
		if lr.id >= 0 {
			missing = opt.Value
		}
		if missing == "" {
			missing = map[bool]string{true: "id", false: "value"}[lr.id < 0]
		}
		return nil, &ParseError{File: opt.Name, Row: head.line, ColumnName: missing,
			Err: wrapf(ErrNoHeader, "no column %q in the header (%s)", missing, strings.Join(lr.names, ", "))}
	}
	// Ids that interleave in the first MiB: read the whole file grouped.
	last, seen := "", map[string]bool{}
	for _, l := range sampleLines(peek, 1<<20, partial)[1:] {
		f := splitFields(l, delim)
		if lr.id >= len(f) {
			continue
		}
		id := trimSpace(f[lr.id])
		if id != last && seen[id] {
			lr.unsorted = true
			break
		}
		seen[id], last = true, id
	}
	return lr, nil
}

func (lr *LongReader) field(r *record, j int) string {
	if j < len(r.fields) {
		return trimSpace(r.fields[j])
	}
	return ""
}

func (lr *LongReader) perr(r *record, j int, err error) *ParseError {
	return &ParseError{File: lr.name, Row: r.line, Column: j + 1, ColumnName: lr.names[j], Value: lr.field(r, j), Err: err}
}

func (lr *LongReader) read() (*record, error) {
	if lr.pending != nil {
		r := lr.pending
		lr.pending = nil
		return r, nil
	}
	r, err := lr.rr.next()
	if err != nil {
		return nil, err
	}
	return &r, nil
}

// Next returns the next id's series, or io.EOF after the last.
func (lr *LongReader) Next() (*Table, error) {
	if lr.err != nil {
		return nil, lr.err
	}
	if lr.unsorted {
		return lr.nextGrouped()
	}
	first, err := lr.read()
	if err == io.EOF {
		return nil, io.EOF
	}
	if err != nil {
		return nil, lr.readErr(err)
	}
	id := lr.field(first, lr.id)
	recs := []*record{first}
	for {
		next, err := lr.read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, lr.readErr(err)
		}
		if lr.field(next, lr.id) != id {
			lr.pending = next
			break
		}
		recs = append(recs, next)
	}
	if lr.seen[id] && id != "" {
		return nil, &ParseError{File: lr.name, Row: first.line, Column: lr.id + 1, ColumnName: lr.names[lr.id], Value: id, ID: id,
			Err: wrapf(ErrNotContiguous, "id %q appeared before, after the first MiB of the file (files whose ids interleave there are grouped in memory): sort the file by id", id)}
	}
	lr.seen[id] = true
	return lr.table(id, recs, false)
}

// readErr records a read error: a quote left open (which consumed the rest
// of the input) is returned once and the reader then ends; other read errors
// are returned by every later call.
func (lr *LongReader) readErr(err error) error {
	var pe *ParseError
	if errors.As(err, &pe) {
		pe.File = lr.name
		lr.err = io.EOF
		return pe
	}
	lr.err = &ParseError{File: lr.name, Row: lr.rr.line, Err: err}
	return lr.err
}

// nextGrouped reads the whole file on the first call, groups its rows by id
// (in order of first appearance) and returns one group per call.
func (lr *LongReader) nextGrouped() (*Table, error) {
	if lr.groups == nil {
		index := map[string]int{}
		for {
			r, err := lr.read()
			if err == io.EOF {
				break
			}
			if err != nil {
				return nil, lr.readErr(err)
			}
			id := lr.field(r, lr.id)
			k, ok := index[id]
			if !ok {
				k = len(lr.groups)
				index[id] = k
				lr.groups = append(lr.groups, nil)
			}
			lr.groups[k] = append(lr.groups[k], r)
		}
		lr.groups = append(lr.groups, nil) // sentinel: read
	}
	if len(lr.groups) <= 1 {
		return nil, io.EOF
	}
	recs := lr.groups[0]
	lr.groups = lr.groups[1:]
	return lr.table(lr.field(recs[0], lr.id), recs, true)
}

// table turns the rows of one id into a one-series Table. Rows out of date
// order are sorted by date (with a note) when every date reads on its own.
func (lr *LongReader) table(id string, recs []*record, grouped bool) (*Table, error) {
	fail := func(pe *ParseError) (*Table, error) {
		pe.ID = id
		return nil, pe
	}
	if id == "" {
		return fail(lr.perr(recs[0], lr.id, wrapf(ErrBadNumber, "empty id")))
	}
	t := &Table{Name: id, Rows: len(recs), Delimiter: rune(lr.rr.delim), DecimalComma: lr.dec == decComma}
	if grouped {
		t.Notes = append(t.Notes, Note{Kind: "sorted", Row: recs[0].line, Column: lr.id + 1, ColumnName: lr.names[lr.id],
			Message: fmt.Sprintf("the rows of id %q are not contiguous in the file: read after grouping the file by id", id)})
	}
	if lr.dt >= 0 {
		dates := make([]string, len(recs))
		for i, r := range recs {
			dates[i] = lr.field(r, lr.dt)
		}
		if sorted, ok := sortByDate(recs, dates); ok {
			recs = sorted
			t.Notes = append(t.Notes, Note{Kind: "sorted", Column: lr.dt + 1, ColumnName: lr.names[lr.dt],
				Message: fmt.Sprintf("the rows of id %q are not in date order in the file: sorted by date", id)})
			for i, r := range recs {
				dates[i] = lr.field(r, lr.dt)
			}
		}
		lines := make([]int, len(recs))
		for i, r := range recs {
			lines[i] = r.line
		}
		dc, e := parseDates(dates, lr.dopt)
		if e != nil {
			return fail(&ParseError{File: lr.name, Row: lines[e.i], Column: lr.dt + 1, ColumnName: lr.names[lr.dt], Value: dates[e.i], Err: e.err})
		}
		t.DateColumn, t.Dates, t.Frequency = lr.names[lr.dt], dc.labels, dc.freq
		t.dateNotes(dc, lr.dt+1, lr.names[lr.dt], lines)
	}
	vals := make([]float64, len(recs))
	for i, r := range recs {
		s := lr.field(r, lr.val)
		vals[i] = math.NaN()
		if !IsMissing(s) {
			x, ok := parseNumber(s, lr.dec)
			if !ok {
				return fail(lr.perr(r, lr.val, ErrBadNumber))
			}
			vals[i] = x
		}
	}
	t.Series = []Series{{Name: id, Column: lr.val + 1, Values: vals, Dates: t.Dates, Frequency: t.Frequency, First: 1, Notes: t.Notes}}
	return t, nil
}

// sortByDate returns recs sorted by date when they are not in increasing
// order and every date reads on its own (parseDate); ok is false when they
// are in order or cannot be sorted (the date column's own errors then
// apply).
func sortByDate(recs []*record, dates []string) ([]*record, bool) {
	keys := make([]int, len(dates))
	inOrder := true
	for i, d := range dates {
		v, ok := parseDate(d)
		if !ok {
			return nil, false
		}
		f := firstDay(v)
		keys[i] = dayNumber(f.y, f.m, f.d)
		if i > 0 && keys[i] < keys[i-1] {
			inOrder = false
		}
	}
	if inOrder {
		return nil, false
	}
	idx := make([]int, len(recs))
	for i := range idx {
		idx[i] = i
	}
	sort.SliceStable(idx, func(a, b int) bool { return keys[idx[a]] < keys[idx[b]] })
	out := make([]*record, len(recs))
	for i, k := range idx {
		out[i] = recs[k]
	}
	return out, true
}

// JSONLReader streams JSON Lines, one series per line:
//
//	{"id": "gdp", "dates": ["2000Q1", ...], "values": [1.5, null, ...]}
//
// "dates" is optional and, when present, as long as "values". A value is a
// number, null, or a string holding a number or a missing marker. The id is a
// string or a number. Blank lines are skipped; other fields are ignored.
//
// Errors: a bad line makes Next return a *ParseError with its line number
// (Column is the 1-based position in "values" or "dates" when known); calling
// Next again continues with the next line. Read errors are returned by every
// later call.
type JSONLReader struct {
	br   *bufio.Reader
	line int
	err  error
	// Name is the file name used in errors.
	Name string
	// DateFormat is as in Options.
	DateFormat string
}

// NewJSONLReader returns a reader of JSON Lines.
func NewJSONLReader(r io.Reader) *JSONLReader {
	return &JSONLReader{br: bufio.NewReaderSize(r, 64<<10)}
}

type jsonlRecord struct {
	ID     json.RawMessage   `json:"id"`
	Dates  []string          `json:"dates"`
	Values []json.RawMessage `json:"values"`
}

// Next returns the next line's series, or io.EOF after the last.
func (jr *JSONLReader) Next() (*Table, error) {
	if jr.err != nil {
		return nil, jr.err
	}
	var line []byte
	for {
		b, err := jr.br.ReadBytes('\n')
		if len(b) > 0 {
			jr.line++
		}
		if err != nil && err != io.EOF {
			jr.err = &ParseError{File: jr.Name, Row: jr.line, Err: err}
			return nil, jr.err
		}
		if jr.line == 1 && len(b) > 0 {
			b = bytes.TrimPrefix(b, []byte("\xEF\xBB\xBF"))
		}
		if len(bytes.TrimSpace(b)) > 0 {
			line = b
			break
		}
		if err == io.EOF {
			jr.err = io.EOF
			return nil, io.EOF
		}
	}
	var id string
	perr := func(col int, name string, err error) *ParseError {
		return &ParseError{File: jr.Name, Row: jr.line, Column: col, ColumnName: name, ID: id, Err: err}
	}
	var rec jsonlRecord
	dec := json.NewDecoder(bytes.NewReader(line))
	if err := dec.Decode(&rec); err != nil {
		return nil, perr(0, "", fmt.Errorf("%w: invalid JSON: %v", ErrBadNumber, err))
	}
	if dec.More() {
		return nil, perr(0, "", wrapf(ErrBadNumber, "more than one JSON value on the line"))
	}
	switch {
	case len(rec.ID) == 0 || string(rec.ID) == "null":
		return nil, perr(0, "id", wrapf(ErrBadNumber, "no id"))
	case rec.ID[0] == '"':
		if err := json.Unmarshal(rec.ID, &id); err != nil {
			return nil, perr(0, "id", fmt.Errorf("%w: id: %v", ErrBadNumber, err))
		}
	default:
		var n json.Number
		if err := json.Unmarshal(rec.ID, &n); err != nil {
			return nil, perr(0, "id", wrapf(ErrBadNumber, "id must be a string or a number"))
		}
		id = n.String()
	}
	if strings.TrimSpace(id) == "" {
		return nil, perr(0, "id", wrapf(ErrBadNumber, "empty id"))
	}
	if len(rec.Values) == 0 {
		return nil, perr(0, "values", wrapf(ErrTooShort, "no values"))
	}
	vals := make([]float64, len(rec.Values))
	for k, raw := range rec.Values {
		v, err := jsonValue(raw)
		if err != nil {
			pe := perr(k+1, "values", err)
			pe.Value = string(raw)
			return nil, pe
		}
		vals[k] = v
	}
	t := &Table{Name: id, Rows: len(vals)}
	if rec.Dates != nil {
		if len(rec.Dates) != len(vals) {
			return nil, perr(0, "dates", wrapf(ErrBadDate, "%d dates for %d values", len(rec.Dates), len(vals)))
		}
		o, err := parseDateFormat(jr.DateFormat, -1)
		if err != nil {
			return nil, perr(0, "dates", err)
		}
		dc, e := parseDates(rec.Dates, o)
		if e != nil {
			pe := perr(e.i+1, "dates", e.err)
			pe.Value = rec.Dates[e.i]
			return nil, pe
		}
		t.DateColumn, t.Dates, t.Frequency = "dates", dc.labels, dc.freq
		t.dateNotes(dc, 0, "dates", nil)
	}
	t.Series = []Series{{Name: id, Column: 1, Values: vals, Dates: t.Dates, Frequency: t.Frequency, First: 1, Notes: t.Notes}}
	return t, nil
}

// jsonValue reads one element of "values".
func jsonValue(raw json.RawMessage) (float64, error) {
	s := string(bytes.TrimSpace(raw))
	switch {
	case s == "null":
		return math.NaN(), nil
	case strings.HasPrefix(s, `"`):
		var str string
		if err := json.Unmarshal(raw, &str); err != nil {
			return 0, ErrBadNumber
		}
		if IsMissing(str) {
			return math.NaN(), nil
		}
		if v, ok := parseNumber(str, decPoint); ok {
			return v, nil
		}
		return 0, ErrBadNumber
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		var ne *strconv.NumError
		if errors.As(err, &ne) && errors.Is(ne.Err, strconv.ErrRange) {
			return 0, wrapf(ErrBadNumber, "out of range")
		}
		return 0, ErrBadNumber
	}
	return v, nil
}
