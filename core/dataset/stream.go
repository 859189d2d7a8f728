package dataset

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"math"
	"slices"
	"strconv"
	"strings"
	"unicode/utf8"
)

// ReadColumns reads delimited text as Parse does, streaming it row by row
// and keeping the values of only some columns: memory is the kept values, the
// date column, a few numbers per column and one row, not the file (a 205 MB
// file of 2,000 columns read for one column: 16 MB at peak, against 1 GB read
// whole; doc/reading-benchmarks.md). open is called once per pass over the
// input and must return it from the start each time.
//
// The columns kept are those Select would pick for keep (Settings.Columns:
// an exact name, else the first name equal ignoring case); keep nil keeps
// every series. Options.Columns, when set, takes the place of keep with
// Parse's meaning (an unknown or non-numeric column is an error). Everything
// else about the returned table is what Parse returns for the whole file:
// date column, dates, rows, lines, header, notes (about every column, kept or
// not), skipped columns and errors, with the same rows and columns; Select on
// it gives what Select gives on Parse's table, unknown-column messages
// included. Equality is tested on the reader corpus and by fuzzing
// (stream_test.go).
//
// What needs the whole file is reproduced with passes that keep statistics,
// not cells:
//   - the delimiter is detected on the same sample as Parse (the first 50
//     lines or 64 KiB, at least three lines);
//   - the decimal mark of semicolon- and tab-separated text is voted over every
//     cell, in a first pass that keeps only the counts (comma-separated text
//     is read in one pass);
//   - text that turns out not to be UTF-8 is read again as Windows-1252 from
//     the start (the check runs while reading, so UTF-8 files are read once);
//   - which column holds the dates and whether the first column is an index
//     or the rows have names without a header cell are decided at the end,
//     from per-column counts and, for the columns that may hold dates (named
//     like dates, or whose first cell reads as a date), their cells, which
//     are kept as text until the decision.
//
// UTF-16 and UTF-32 input (recognised in its first KiB) is read whole with
// Parse and then restricted to the kept columns.
func ReadColumns(name string, open func() (io.ReadCloser, error), opt *Options, keep []string) (*Table, error) {
	if opt == nil {
		opt = &Options{}
	}
	rc, err := open()
	if err != nil {
		return nil, err
	}
	var head [1024]byte
	n, err := io.ReadFull(rc, head[:])
	rc.Close()
	if err != nil && err != io.EOF && err != io.ErrUnexpectedEOF {
		return nil, err
	}
	if wideEncoding(head[:n]) {
		rc, err := open()
		if err != nil {
			return nil, err
		}
		data, err := io.ReadAll(rc)
		rc.Close()
		if err != nil {
			return nil, err
		}
		t, err := Parse(name, data, opt)
		if err != nil {
			return nil, err
		}
		if len(opt.Columns) == 0 && keep != nil {
			t.restrict(keep)
		}
		return t, nil
	}
	t, err := streamParse(name, open, opt, keep, false)
	if errors.Is(err, errNotUTF8) {
		t, err = streamParse(name, open, opt, keep, true)
	}
	return t, err
}

// wideEncoding reports whether decodeText would convert or refuse the text
// whose first KiB is head for a reason other than invalid UTF-8: a UTF-16 or
// UTF-32 byte-order mark, or zero bytes.
func wideEncoding(head []byte) bool {
	return bytes.HasPrefix(head, []byte{0xFF, 0xFE}) || bytes.HasPrefix(head, []byte{0xFE, 0xFF}) ||
		bytes.HasPrefix(head, []byte{0, 0, 0xFE, 0xFF}) || bytes.IndexByte(head, 0) >= 0
}

// restrict keeps the series Select would pick for keep, and remembers the
// names of all of them for Select's messages.
func (t *Table) restrict(keep []string) {
	all := make([]string, len(t.Series))
	for i := range t.Series {
		all[i] = t.Series[i].Name
	}
	picked := pickSeries(all, keep)
	var out []Series
	for i, s := range t.Series {
		if picked[i] {
			out = append(out, s)
		}
	}
	t.Series = out
	t.allSeries = all
}

// pickSeries marks the names Select picks for the columns cols: for each,
// the first name equal to it, else the first equal ignoring case and spaces
// around it.
func pickSeries(names, cols []string) []bool {
	picked := make([]bool, len(names))
	for _, c := range cols {
		k := -1
		for i, n := range names {
			if n == c {
				k = i
				break
			}
		}
		if k < 0 {
			for i, n := range names {
				if strings.EqualFold(n, strings.TrimSpace(c)) {
					k = i
					break
				}
			}
		}
		if k >= 0 {
			picked[k] = true
		}
	}
	return picked
}

// errNotUTF8 stops a pass that met text which is not UTF-8.
var errNotUTF8 = errors.New("dataset: input is not UTF-8")

// utf8Check passes its input through and fails with errNotUTF8 at the first
// byte that is not UTF-8 (checked across reads).
type utf8Check struct {
	r     io.Reader
	carry []byte // the start of a character cut by the last read
}

func (u *utf8Check) Read(p []byte) (int, error) {
	n, err := u.r.Read(p)
	b := p[:n]
	for len(u.carry) > 0 && len(b) > 0 {
		u.carry = append(u.carry, b[0])
		b = b[1:]
		if utf8.FullRune(u.carry) {
			if !utf8.Valid(u.carry) {
				return 0, errNotUTF8
			}
			u.carry = u.carry[:0]
		}
	}
	cut := len(b)
	for i := len(b) - 1; i >= 0 && i >= len(b)-3; i-- {
		if b[i]&0xC0 != 0x80 {
			if !utf8.FullRune(b[i:]) {
				cut = i
			}
			break
		}
	}
	if !utf8.Valid(b[:cut]) {
		return 0, errNotUTF8
	}
	u.carry = append(u.carry, b[cut:]...)
	if err == io.EOF && len(u.carry) > 0 {
		return 0, errNotUTF8
	}
	return n, err
}

// cp1252Reader converts Windows-1252 input to UTF-8 (as cp1252To8).
type cp1252Reader struct {
	r    io.Reader
	in   []byte
	out  []byte
	rest []byte
}

func (c *cp1252Reader) Read(p []byte) (int, error) {
	for len(c.rest) == 0 {
		if c.in == nil {
			c.in = make([]byte, 32<<10)
		}
		n, err := c.r.Read(c.in)
		c.out = c.out[:0]
		for _, b := range c.in[:n] {
			switch {
			case b < 0x80:
				c.out = append(c.out, b)
			case b < 0xA0:
				r := cp1252High[b-0x80]
				if r == 0 {
					r = utf8.RuneError
				}
				c.out = utf8.AppendRune(c.out, r)
			default:
				c.out = utf8.AppendRune(c.out, rune(b))
			}
		}
		c.rest = c.out
		if err != nil && len(c.rest) == 0 {
			return 0, err
		}
	}
	k := copy(p, c.rest)
	c.rest = c.rest[k:]
	return k, nil
}

// cell is the trimmed cell of data row i of a column that may hold dates:
// a kept cell, or the first cell that is not a date.
func (c *colStats) cell(i int) string {
	if i < len(c.text) && c.text != nil {
		return c.text[i]
	}
	for _, d := range c.dates {
		if d.bad == i {
			return d.badVal
		}
	}
	return ""
}

// colStats is what the streaming reader keeps about one column: the
// figures Parse's per-column decisions use, and the column's values or
// cells when it is kept.
type colStats struct {
	bad      int // data row of the first cell that is neither a number nor missing, -1 none
	badLine  int
	badVal   string
	grouped  int // cells with thousands separators
	example  string
	hasValue bool
	keepVals bool
	keepText bool
	vals     []float64
	text     []string // trimmed cells, while the column may hold dates
	first    string   // the first cell, trimmed, of a column that may hold dates
	// The date reading of a column that may hold dates, for each way it may
	// be read (named like a date or not, as the names are not final): a
	// cell that is not a date settles what parseDates returns, and the
	// cells are then dropped.
	dates []dateTrack
}

// dateTrack follows parseDates' first pass over a column: the cells read
// as date cells with ints, and the first that is not one.
type dateTrack struct {
	ints   int
	parsed int
	bad    int // data row, -1 none
	badVal string
}

// streamParse is one attempt of ReadColumns, reading the input as UTF-8
// (failing with errNotUTF8 when it is not) or as Windows-1252.
func streamParse(name string, open func() (io.ReadCloser, error), opt *Options, keep []string, cp1252 bool) (*Table, error) {
	// source opens the input for one pass and returns it decoded.
	var closers []io.Closer
	defer func() {
		for _, c := range closers {
			c.Close()
		}
	}()
	source := func() (io.Reader, error) {
		rc, err := open()
		if err != nil {
			return nil, err
		}
		closers = append(closers, rc)
		if cp1252 {
			return &cp1252Reader{r: rc}, nil
		}
		return &utf8Check{r: rc}, nil
	}
	readErr := func(rr *recordReader, err error) error {
		if errors.Is(err, errNotUTF8) {
			return err
		}
		var pe *ParseError
		if errors.As(err, &pe) {
			pe.File = name
			return pe
		}
		return &ParseError{File: name, Row: rr.line, Err: err}
	}
	delim := byte(0)
	if opt.Delimiter != 0 {
		if opt.Delimiter >= utf8.RuneSelf || opt.Delimiter == '"' || opt.Delimiter == '\n' || opt.Delimiter == '\r' {
			return nil, &ParseError{File: name, Err: wrapf(ErrBadNumber, "delimiter %q is not supported", opt.Delimiter)}
		}
		delim = byte(opt.Delimiter)
	}
	src, err := source()
	if err != nil {
		return nil, err
	}
	if delim == 0 {
		// The sample of Parse: read until its end is known.
		pre := make([]byte, 0, 64<<10)
		eof := false
		for empty := 0; ; {
			end := sampleEnd(pre)
			if end < len(pre) || eof {
				delim = detectDelimiter(sampleLines(pre[:end], 50, end < len(pre)))
				break
			}
			if len(pre) == cap(pre) {
				pre = append(pre, 0)[:len(pre)]
			}
			n, err := src.Read(pre[len(pre):cap(pre)])
			pre = pre[:len(pre)+n]
			if err == io.EOF {
				eof = true
			} else if err != nil {
				return nil, err
			} else if n == 0 {
				if empty++; empty > 100 {
					return nil, io.ErrNoProgress
				}
			}
		}
		src = io.MultiReader(bytes.NewReader(pre), src)
	}
	dec := decPoint
	var warn string
	if delim != ',' {
		// First pass: the decimal-mark vote over every cell but those of the
		// first record (as detectDecimal).
		var v decimalVotes
		rr := newRecordReader(src, delim)
		rr.keepBlank = true
		var fields []string
		for first := true; ; first = false {
			rec, err := rr.nextInto(fields)
			if err == io.EOF {
				break
			}
			if err != nil {
				return nil, readErr(rr, err)
			}
			if rec.fields != nil {
				fields = rec.fields
			}
			if !first {
				v.add(rec.fields)
			}
		}
		dec, warn = v.decide(delim)
		if src, err = source(); err != nil {
			return nil, err
		}
	}
	s := &streamer{name: name, opt: opt, keep: keep, dec: dec}
	rr := newRecordReader(src, delim)
	rr.keepBlank = true
	if err := s.read(rr); err != nil {
		return nil, readErr(rr, err)
	}
	t, err := s.finish()
	if err != nil {
		return nil, err
	}
	t.Delimiter = rune(delim)
	if opt.Sheet != "" {
		t.Notes = append(t.Notes, Note{Kind: "sheet-ignored", Message: fmt.Sprintf("the sheet setting (%q) applies to .xlsx workbooks; this file is text and was read whole", opt.Sheet)})
	}
	var pre []Note
	if cp1252 {
		pre = append(pre, Note{Kind: "encoding", Message: cp1252Note})
	}
	if warn != "" {
		pre = append(pre, Note{Kind: "decimal-mark", Message: warn})
	}
	if len(pre) > 0 {
		t.Notes = append(pre, t.Notes...)
	}
	return t, nil
}

// decimalVotes counts the decimal-mark evidence of detectDecimal.
type decimalVotes struct {
	comma, point, amb int
	example           string
}

func (v *decimalVotes) add(fields []string) {
	for _, f := range fields {
		c, p, a := decimalVote(f)
		switch {
		case c:
			v.comma++
		case p:
			v.point++
		case a:
			v.amb++
			if v.example == "" {
				v.example = strings.Clone(trimSpace(f))
			}
		}
	}
}

// streamer holds the state of the streaming reader's main pass.
type streamer struct {
	name string
	opt  *Options
	keep []string
	dec  decimal

	head   record // header row (fields owned), title rows in head.title
	failed error  // a header error, returned once the input is read
	namesA []string
	namesB []string // names if the rows turn out to have names without a header cell
	nh     int

	rows   int
	lines  []int
	blanks []blankAt
	// Row names without a header cell (see build): every row has one cell
	// more than the header, the last cells are not all empty, the first
	// cells count 1..N or are text.
	shiftOK, filledLast, count, text bool
	short, shortFirst                int
	extra                            *ParseError
	// The first column as a row index: consecutive whole numbers from start.
	consec bool
	start  int
	cols   []colStats
	kept   []int // columns with keepVals or keepText
}

// read consumes every record: the title rows and header, then the data.
func (s *streamer) read(rr *recordReader) error {
	nextNonBlank := func(blanks *[]int) (record, bool, error) {
		for {
			r, err := rr.next()
			if err == io.EOF {
				return record{}, false, nil
			}
			if err != nil {
				return record{}, false, err
			}
			if r.fields != nil {
				return r, true, nil
			}
			if blanks != nil {
				*blanks = append(*blanks, r.line)
			}
		}
	}
	cur, ok, err := nextNonBlank(nil)
	if err != nil {
		return err
	}
	if !ok {
		s.failed = &ParseError{File: s.name, Err: wrapf(ErrNoHeader, "the input is empty")}
		return nil
	}
	// Title rows (skipTitleRows): a row with one text cell above a row with
	// two or more filled cells.
	var titles []string
	var pending []int // blank lines after the header
	var first *record // the first data row, read while looking for the header
	for titleRow(cur) {
		var bl []int
		nxt, ok, err := nextNonBlank(&bl)
		if err != nil {
			return err
		}
		if !ok {
			break
		}
		if filledCells(nxt) >= 2 {
			titles = append(titles, trimSpace(cur.fields[0]))
			cur = nxt
			continue
		}
		pending, first = bl, &nxt
		break
	}
	cur.title = titles
	s.head = cur
	if err := s.header(); err != nil {
		s.failed = err
	}
	for _, l := range pending {
		s.blank(l)
	}
	if first != nil {
		s.row(*first)
	}
	var fields []string
	for {
		r, err := rr.nextInto(fields)
		if err == io.EOF {
			break
		}
		if err != nil {
			return err
		}
		if r.fields == nil {
			s.blank(r.line)
			continue
		}
		fields = r.fields
		s.row(r)
	}
	// Blank records after the last data row are not blank rows of the data.
	for len(s.blanks) > 0 && s.blanks[len(s.blanks)-1].pos == s.rows {
		s.blanks = s.blanks[:len(s.blanks)-1]
	}
	return nil
}

func filledCells(r record) int {
	n := 0
	for _, f := range r.fields {
		if trimSpace(f) != "" {
			n++
		}
	}
	return n
}

// titleRow is skipTitleRows' test of a title row.
func titleRow(r record) bool {
	if filledCells(r) != 1 || len(r.fields) == 0 {
		return false
	}
	f := trimSpace(r.fields[0])
	if f == "" {
		return false
	}
	_, num := parseNumber(f, decPoint)
	_, date := parseDate(f)
	return !num && !date
}

// header checks the header row and names the columns both ways.
func (s *streamer) header() error {
	h := &s.head
	for i, f := range h.fields {
		h.fields[i] = strings.Clone(f)
	}
	text := false
	for _, f := range h.fields {
		f = trimSpace(f)
		if IsMissing(f) {
			continue
		}
		if _, ok := parseNumber(f, s.dec); ok {
			continue
		}
		if _, ok := parseDate(f); ok {
			continue
		}
		text = true
	}
	if !text {
		return &ParseError{File: s.name, Row: h.line, Err: wrapf(ErrNoHeader, "the first row holds no column names")}
	}
	s.nh = len(h.fields)
	s.namesA, _ = columnNames(h.fields, h.line)
	s.namesB, _ = columnNames(append([]string{""}, h.fields...), h.line)
	s.cols = make([]colStats, s.nh+1)
	for j := range s.cols {
		s.cols[j].bad = -1
	}
	s.shiftOK, s.count, s.text, s.consec = true, true, true, true
	return nil
}

func (s *streamer) blank(line int) {
	s.blanks = append(s.blanks, blankAt{s.rows, line})
}

// choose decides, at the first data row, which columns to keep: those the
// selection may pick and those that may hold the dates, under either naming.
func (s *streamer) choose(f []string) {
	name := func(j int) []string {
		if j < s.nh {
			return []string{s.namesA[j], s.namesB[j]}
		}
		return []string{s.namesB[j]}
	}
	matches := func(n, c string) bool {
		return n == c || strings.EqualFold(n, trimSpace(c)) || strings.EqualFold(n, strings.TrimSpace(c))
	}
	sel := s.keep
	if len(s.opt.Columns) > 0 {
		sel = s.opt.Columns
	}
	all := len(s.opt.Columns) == 0 && s.keep == nil
	fo, _ := parseDateFormat(s.opt.DateFormat, 0)
	for j := range s.cols {
		c := &s.cols[j]
		for _, n := range name(j) {
			for _, k := range sel {
				c.keepVals = c.keepVals || matches(n, k)
			}
			if s.opt.DateColumn != "" {
				c.keepText = c.keepText || matches(n, s.opt.DateColumn)
			} else {
				c.keepText = c.keepText || dateNamed(n)
			}
		}
		c.keepVals = c.keepVals || all
		cell := ""
		if j < len(f) {
			cell = f[j]
		}
		if s.opt.DateColumn == "" && !c.keepText {
			first, ok := parseCell(cell, fo.ints)
			c.keepText = ok && !(first.v.k == kYear && j > 0)
		}
		if c.keepText {
			c.first = strings.Clone(trimSpace(cell))
			for _, n := range name(j) {
				ints := 0
				if s.opt.DateColumn != "" || dateNamed(n) {
					ints = -1
				}
				o, _ := parseDateFormat(s.opt.DateFormat, ints)
				if !slices.ContainsFunc(c.dates, func(d dateTrack) bool { return d.ints == o.ints }) {
					c.dates = append(c.dates, dateTrack{ints: o.ints, bad: -1})
				}
			}
		}
		if c.keepVals || c.keepText {
			s.kept = append(s.kept, j)
		}
	}
}

// row takes one data row.
func (s *streamer) row(r record) {
	if s.failed != nil {
		return
	}
	f := r.fields
	i := s.rows
	if i == 0 {
		s.choose(f)
	}
	s.rows++
	s.lines = append(s.lines, r.line)
	// Row names without a header cell.
	if s.shiftOK {
		if len(f) != s.nh+1 {
			s.shiftOK = false
		} else {
			s.filledLast = s.filledLast || trimSpace(f[len(f)-1]) != ""
			c := trimSpace(f[0])
			var buf [20]byte
			s.count = s.count && c == string(strconv.AppendInt(buf[:0], int64(i+1), 10))
			_, num := parseNumber(c, s.dec)
			s.text = s.text && c != "" && !num
		}
	}
	// Short rows and extra cells, for the header as read.
	if len(f) < s.nh {
		if s.short == 0 {
			s.shortFirst = r.line
		}
		s.short++
	}
	if len(f) > s.nh && s.extra == nil {
		for k, c := range f[s.nh:] {
			if c = trimSpace(c); c != "" {
				s.extra = &ParseError{File: s.name, Row: r.line, Column: s.nh + k + 1, Value: strings.Clone(c),
					Err: wrapf(ErrExtraCells, "the row has %d cells, the header %d (an unquoted thousands separator or delimiter inside a number shifts the cells; quote such cells or fix the row)", len(f), s.nh)}
				break
			}
		}
	}
	// The first column as a row index.
	if s.consec {
		c := ""
		if len(f) > 0 {
			c = trimSpace(f[0])
		}
		v := atoi(c)
		if v < 0 || (len(c) > 1 && c[0] == '0') {
			s.consec = false
		} else if i == 0 {
			s.start = v
		} else if v != s.start+i {
			s.consec = false
		}
	}
	// Every cell: the per-column figures.
	m := min(len(f), len(s.cols))
	for j := 0; j < m; j++ {
		c := &s.cols[j]
		t := trimSpace(f[j])
		if IsMissing(t) {
			if c.keepVals {
				c.vals = append(c.vals, math.NaN())
			}
		} else if x, ok := parseNumber(t, s.dec); ok {
			c.hasValue = true
			if hasGroups(t, s.dec) {
				if c.grouped == 0 {
					c.example = strings.Clone(t)
				}
				c.grouped++
			}
			if c.keepVals {
				c.vals = append(c.vals, x)
			}
		} else {
			if c.bad < 0 {
				c.bad, c.badLine, c.badVal = i, r.line, strings.Clone(t)
			}
			if c.keepVals {
				c.vals = append(c.vals, math.NaN())
			}
		}
		if c.keepText {
			s.date(c, i, t)
		}
	}
	// Kept columns this row does not reach are empty cells.
	for _, j := range s.kept {
		if j < m {
			continue
		}
		c := &s.cols[j]
		if c.keepVals {
			c.vals = append(c.vals, math.NaN())
		}
		if c.keepText {
			s.date(c, i, "")
		}
	}
}

// date takes cell t (trimmed) of data row i of a column that may hold
// dates: its cells are kept until one is not a date cell for every reading.
func (s *streamer) date(c *colStats, i int, t string) {
	open := false
	for k := range c.dates {
		d := &c.dates[k]
		if _, ok := parseCell(t, d.ints); ok {
			d.parsed++
		} else if d.bad < 0 {
			d.bad, d.badVal = i, strings.Clone(t)
		}
		open = open || d.bad < 0
	}
	if !open {
		c.text = nil
		return
	}
	c.text = append(c.text, strings.Clone(t))
}

// finish makes the table from what read kept, with build's decisions in
// build's order.
func (s *streamer) finish() (*Table, error) {
	if s.failed != nil {
		return nil, s.failed
	}
	name, opt, dec := s.name, s.opt, s.dec
	head := s.head
	t := &Table{Name: name, DecimalComma: dec == decComma}
	names := s.namesA
	shifted := false
	if s.rows > 0 && s.shiftOK && (s.count || s.text) && s.filledLast {
		shifted = true
		head.fields = append([]string{""}, head.fields...)
		names = s.namesB
		t.Notes = append(t.Notes, Note{Kind: "renamed", Row: head.line, Column: 1,
			Message: "every row has one cell more than the header: the first column is taken to be row names without a header cell"})
	}
	if len(head.title) > 0 {
		t.Notes = append(t.Notes, Note{Kind: "header-row", Row: head.line,
			Message: fmt.Sprintf("the header is row %d; the title rows above it were skipped (%q)", head.line, strings.Join(head.title, " / "))})
	}
	ncol := len(head.fields)
	_, renamed := columnNames(head.fields, head.line)
	t.Notes = append(t.Notes, renamed...)
	if !shifted {
		if s.extra != nil {
			return nil, s.extra
		}
		if s.short > 0 {
			t.Notes = append(t.Notes, Note{Kind: "short-row", Row: s.shortFirst,
				Message: fmt.Sprintf("%d rows have fewer cells than the header (the first is line %d): the missing cells are missing values", s.short, s.shortFirst)})
		}
	}
	rows := s.rows
	cols := s.cols[:ncol]
	perr := func(i, j int, err error) *ParseError {
		pe := &ParseError{File: name, Column: j + 1, ColumnName: names[j], Err: err}
		if i >= 0 && i < rows {
			pe.Row = s.lines[i]
			pe.Value = cols[j].cell(i)
		} else {
			pe.Row = head.line
		}
		return pe
	}
	find := func(n string) int {
		for j, h := range names {
			if h == n {
				return j
			}
		}
		for j, h := range names {
			if strings.EqualFold(h, trimSpace(n)) {
				return j
			}
		}
		return -1
	}
	numeric := func(j int) bool { return cols[j].bad < 0 }
	if _, err := parseDateFormat(opt.DateFormat, 0); err != nil {
		return nil, &ParseError{File: name, Err: err}
	}

	// Date column (as build; the candidates' cells were kept).
	dcol := -1
	var dc *dateColumn
	tryDates := func(j int, explicit bool) (*dateColumn, *dateColumnError) {
		named := explicit || dateNamed(names[j])
		ints := 0
		if named {
			ints = -1
		}
		o, _ := parseDateFormat(opt.DateFormat, ints)
		for _, d := range cols[j].dates {
			if d.ints == o.ints && d.bad >= 0 {
				// parseDates' answer for a column with a cell that is not a date.
				return nil, &dateColumnError{d.bad, fmt.Errorf("%w (accepted forms: %s)", ErrBadDate, AcceptedDateForms), d.parsed}
			}
		}
		return parseDates(cols[j].text, o)
	}
	notYears := func(j int, d *dateColumn, named bool) string {
		if d.kind != kYear || len(d.labels) == 0 {
			return ""
		}
		if v, ok := parseDate(cols[j].first); !ok || v.k != kYear {
			return ""
		}
		lo, hi := atoi(d.labels[0]), atoi(d.labels[len(d.labels)-1])
		if lo < minDataYear || hi > maxDataYear {
			return fmt.Sprintf("whole numbers %d..%d are not read as years (outside %d-%d); set date_column (--date-column) to read them as years", lo, hi, minDataYear, maxDataYear)
		}
		if !named && len(d.gaps) > 0 {
			return "whole numbers that do not count up by one are not read as years in a column not named like a date; set date_column (--date-column) to read them as years"
		}
		return ""
	}
	if opt.DateColumn != "" {
		j := find(opt.DateColumn)
		if j < 0 {
			return nil, &ParseError{File: name, Row: head.line, ColumnName: opt.DateColumn, Err: wrapf(ErrUnknownColumn, "date column %q not in the header", opt.DateColumn)}
		}
		if rows > 0 {
			d, e := tryDates(j, true)
			if e != nil {
				return nil, perr(e.i, j, e.err)
			}
			dcol, dc = j, d
		}
	} else if rows > 0 {
		var yearNotes []Note
		for j := range names {
			if !dateNamed(names[j]) {
				continue
			}
			d, e := tryDates(j, false)
			if e != nil {
				if errors.Is(e.err, ErrDateOrder) || errors.Is(e.err, ErrAmbiguousDate) || (2*e.parsed > rows && !numeric(j)) {
					return nil, perr(e.i, j, e.err)
				}
				continue
			}
			if msg := notYears(j, d, true); msg != "" {
				yearNotes = append(yearNotes, Note{Kind: "not-years", Column: j + 1, ColumnName: names[j], Message: msg})
				continue
			}
			dcol, dc = j, d
			break
		}
		for j := 0; j < ncol && dcol < 0; j++ {
			if dateNamed(names[j]) || !cols[j].keepText {
				continue
			}
			fo, _ := parseDateFormat(opt.DateFormat, 0)
			first, ok := parseCell(cols[j].first, fo.ints)
			if !ok || (first.v.k == kYear && j > 0) {
				continue
			}
			d, e := tryDates(j, false)
			if e != nil {
				if first.v.k != kYear && (errors.Is(e.err, ErrDateOrder) && j == 0 || errors.Is(e.err, ErrAmbiguousDate) || (2*e.parsed > rows && !numeric(j))) {
					return nil, perr(e.i, j, e.err)
				}
				continue
			}
			if msg := notYears(j, d, false); msg != "" {
				yearNotes = append(yearNotes, Note{Kind: "not-years", Column: j + 1, ColumnName: names[j], Message: msg})
				continue
			}
			dcol, dc = j, d
		}
		t.Notes = append(t.Notes, yearNotes...)
	}
	// Blank rows inside the data: without dates, missing observations.
	lines := s.lines
	insert := len(s.blanks) > 0 && dc == nil
	if len(s.blanks) > 0 {
		t.Notes = append(t.Notes, blankRowsNote(s.blanks, dc != nil))
	}
	if insert {
		full := make([]int, 0, rows+len(s.blanks))
		k := 0
		for i := 0; i <= rows; i++ {
			for k < len(s.blanks) && s.blanks[k].pos == i {
				full = append(full, s.blanks[k].line)
				k++
			}
			if i < rows {
				full = append(full, lines[i])
			}
		}
		lines = full
		for j := range cols {
			if v := cols[j].vals; cols[j].keepVals {
				out := make([]float64, 0, len(lines))
				k := 0
				for i := 0; i <= rows; i++ {
					for k < len(s.blanks) && s.blanks[k].pos == i {
						out = append(out, math.NaN())
						k++
					}
					if i < rows {
						out = append(out, v[i])
					}
				}
				cols[j].vals = out
			}
		}
	}
	if dc == nil && opt.DateFormat != "" {
		t.Notes = append(t.Notes, Note{Kind: "date-format", Row: head.line,
			Message: fmt.Sprintf("date_format %q was given but no column reads as dates with it: the file is read without dates", opt.DateFormat)})
	}
	t.Rows = len(lines)
	t.Header = names
	t.Lines = lines
	if dc != nil {
		t.DateColumn = names[dcol]
		t.Dates = dc.labels
		t.Frequency = dc.freq
		t.dateNotes(dc, dcol+1, names[dcol], t.Lines)
	}
	for j := range cols {
		cols[j].text = nil // the date labels are kept; the cells are not needed
	}

	// Index column (as build).
	icol := -1
	if dcol != 0 && ncol > 1 && t.Rows > 0 && len(opt.Columns) == 0 {
		h := strings.ToLower(strings.Map(func(r rune) rune {
			if r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' {
				return r
			}
			return -1
		}, trimSpace(head.fields[0])))
		consec := s.consec && !insert
		unnamed := trimSpace(head.fields[0]) == ""
		notYear := false
		for _, n := range t.Notes {
			notYear = notYear || n.Kind == "not-years" && n.Column == 1
		}
		if unnamed && numeric(0) || consec && (s.start <= 1 || indexNames[h] || notYear) {
			icol = 0
			what := "numbers the rows"
			if unnamed && !consec {
				what = "has no header"
			}
			t.Notes = append(t.Notes, Note{Kind: "index-column", Row: head.line, Column: 1, ColumnName: names[0],
				Message: fmt.Sprintf("the first column %s: read as a row index, not as a series (name it in columns to test it)", what)})
		}
	}

	// Series: notes and skipped columns for every column, values for the
	// kept ones.
	colErr := func(j int) *ParseError {
		c := &cols[j]
		if c.bad < 0 {
			return nil
		}
		return &ParseError{File: name, Row: c.badLine, Column: j + 1, ColumnName: names[j], Value: c.badVal, Err: ErrBadNumber}
	}
	given := map[int][]float64{}
	values := func(j int) []float64 {
		if v, ok := given[j]; ok {
			return append([]float64{}, v...) // a column asked for twice
		}
		v := cols[j].vals
		if v == nil {
			v = []float64{}
		}
		given[j] = v
		return v
	}
	var all []string
	var allCols []int
	add := func(j int) {
		all = append(all, names[j])
		allCols = append(allCols, j)
		if g := cols[j].grouped; g > 0 {
			mark := "point"
			if dec == decComma {
				mark = "comma"
			}
			t.Notes = append(t.Notes, Note{Kind: "thousands", Column: j + 1, ColumnName: names[j],
				Message: fmt.Sprintf("%d cells such as %q read with thousands separators (decimal %s)", g, cols[j].example, mark)})
		}
	}
	if len(opt.Columns) > 0 {
		for _, c := range opt.Columns {
			j := find(c)
			if j < 0 {
				return nil, &ParseError{File: name, Row: head.line, ColumnName: c, Err: wrapf(ErrUnknownColumn, "%q not in the header (%s)", c, strings.Join(names, ", "))}
			}
			if j == dcol {
				return nil, perr(-1, j, wrapf(ErrBadNumber, "%q is the date column", c))
			}
			if e := colErr(j); e != nil {
				return nil, e
			}
			add(j)
			t.Series = append(t.Series, Series{Name: names[j], Column: j + 1, Values: values(j), Dates: t.Dates, Frequency: t.Frequency, First: 1})
		}
	} else {
		for j := range names {
			if j == dcol || j == icol {
				continue
			}
			if e := colErr(j); e != nil {
				t.Skipped = append(t.Skipped, e)
				t.Notes = append(t.Notes, Note{Kind: "skipped-column", Row: e.Row, Column: j + 1, ColumnName: names[j],
					Message: fmt.Sprintf("not a series: %v: %q", e.Err, e.Value)})
				continue
			}
			if !cols[j].hasValue {
				if trimSpace(head.fields[j]) != "" {
					e := &ParseError{File: name, Row: head.line, Column: j + 1, ColumnName: names[j], Err: wrapf(ErrTooShort, "the column has no values")}
					t.Skipped = append(t.Skipped, e)
				}
				t.Notes = append(t.Notes, Note{Kind: "empty-column", Row: head.line, Column: j + 1, ColumnName: names[j],
					Message: "the column has no values: not a series"})
				continue
			}
			add(j)
		}
		picked := make([]bool, len(all))
		for i := range picked {
			picked[i] = true
		}
		if s.keep != nil {
			picked = pickSeries(all, s.keep)
			t.allSeries = all
		}
		for i, j := range allCols {
			if picked[i] {
				t.Series = append(t.Series, Series{Name: names[j], Column: j + 1, Values: values(j), Dates: t.Dates, Frequency: t.Frequency, First: 1})
			}
		}
	}
	if len(all) == 0 {
		return nil, &ParseError{File: name, Row: head.line, Err: ErrNoSeries}
	}
	t.attachNotes()
	return t, nil
}
