package dataset

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"
)

// Table is a parsed input file.
type Table struct {
	Name       string   // file name or "pasted"
	DateColumn string   // header of the detected date column, "" if none
	Dates      []string // canonical date label per row, nil without a date column
	// Frequency is "annual", "quarterly", "monthly", "weekly", "daily",
	// "irregular", or "" without dates.
	Frequency string
	Series    []Series
	Rows      int // data rows read
	// Notes lists everything the reader decided or changed (see Note and
	// NoteKinds); Messages formats them.
	Notes []Note
	// Skipped lists the columns that are not series (a cell is neither a
	// number nor a missing marker), with the first offending cell.
	Skipped []*ParseError
	// Delimiter is the field delimiter used (0 for .xlsx).
	Delimiter rune
	// DecimalComma reports that numbers were read with a decimal comma.
	DecimalComma bool
	// Lines is the 1-based file line (sheet row) of each data row; nil for
	// the long and JSON Lines readers.
	Lines []int
	// Header holds the column names as read (after renaming), one per
	// column of the file; nil for the long and JSON Lines readers.
	Header []string
	// allSeries names every series of the file when Series holds only
	// some of them (ReadColumns), for Select's messages.
	allSeries []string
}

// Series is one numeric column.
type Series struct {
	Name      string
	Column    int       // 1-based column in the file
	Values    []float64 // NaN marks a missing value
	Dates     []string  // same as Table.Dates (shared slice) or nil
	Frequency string
	// First is the 1-based table row of Values[0] (1 for a parsed table;
	// after Select, the first row kept).
	First int
	// Notes lists the table's notes about this column and, after Select,
	// what Select did (trimmed values, calendar gaps).
	Notes []Note
}

// Options steer Parse and ReadXLSX. The zero value (or nil) detects everything.
type Options struct {
	// DateColumn names the date column; "" detects it.
	DateColumn string
	// DateFormat fixes how ambiguous date cells are read; one of
	// DateFormats ("" detects).
	DateFormat string
	// Delimiter is the field delimiter; 0 detects it.
	Delimiter rune
	// Columns keeps only these columns, in this order; a column that is
	// unknown or not numeric is then an error.
	Columns []string
	// Sheet names the .xlsx sheet to read; "" reads the first sheet with
	// data.
	Sheet string
}

// Parse reads delimited text with a header row (see the package
// documentation for the formats, markers and detection rules). Problems that
// stop reading are returned as *ParseError; a non-numeric column that was not
// asked for is skipped and reported in Table.Skipped and Table.Notes.
func Parse(name string, data []byte, opt *Options) (*Table, error) {
	if opt == nil {
		opt = &Options{}
	}
	data, encNote, err := decodeText(name, data)
	if err != nil {
		return nil, err
	}
	delim := byte(0)
	if opt.Delimiter != 0 {
		if opt.Delimiter >= utf8.RuneSelf || opt.Delimiter == '"' || opt.Delimiter == '\n' || opt.Delimiter == '\r' {
			return nil, &ParseError{File: name, Err: wrapf(ErrBadNumber, "delimiter %q is not supported", opt.Delimiter)}
		}
		delim = byte(opt.Delimiter)
	} else {
		head := data[:sampleEnd(data)]
		delim = detectDelimiter(sampleLines(head, 50, len(head) < len(data)))
	}
	rr := newRecordReader(bytes.NewReader(data), delim)
	rr.keepBlank = true
	recs := make([]record, 0, bytes.Count(data, []byte{'\n'})+1)
	for {
		rec, err := rr.next()
		if err == io.EOF {
			break
		}
		if err != nil {
			var pe *ParseError
			if errors.As(err, &pe) {
				pe.File = name
				return nil, pe
			}
			return nil, &ParseError{File: name, Row: rr.line, Err: err}
		}
		recs = append(recs, rec)
	}
	dec := decPoint
	var warn string
	if delim != ',' {
		dec, warn = detectDecimal(recs, delim)
	}
	t, err := build(name, skipTitleRows(recs), opt, dec, false)
	if err != nil {
		return nil, err
	}
	t.Delimiter = rune(delim)
	if opt.Sheet != "" {
		t.Notes = append(t.Notes, Note{Kind: "sheet-ignored", Message: fmt.Sprintf("the sheet setting (%q) applies to .xlsx workbooks; this file is text and was read whole", opt.Sheet)})
	}
	var pre []Note
	if encNote != "" {
		pre = append(pre, Note{Kind: "encoding", Message: encNote})
	}
	if warn != "" {
		pre = append(pre, Note{Kind: "decimal-mark", Message: warn})
	}
	if len(pre) > 0 {
		t.Notes = append(pre, t.Notes...)
	}
	return t, nil
}

// sampleEnd is the end of the sample of data used to detect the delimiter:
// whole lines, up to 50 of them or 64 KiB, but at least the first three lines
// however long (a header of 20,000 columns).
func sampleEnd(data []byte) int {
	pos := 0
	for k := 0; k < 50 && pos < len(data); k++ {
		i := bytes.IndexAny(data[pos:], "\r\n")
		if i < 0 {
			return len(data)
		}
		pos += i + 1
		if pos >= 64<<10 && k >= 2 {
			break
		}
	}
	return pos
}

// detectDecimal votes on the decimal mark over every data cell.
func detectDecimal(recs []record, delim byte) (decimal, string) {
	var v decimalVotes
	for _, r := range recs[min(1, len(recs)):] {
		v.add(r.fields)
	}
	return v.decide(delim)
}

// decide picks the decimal mark from the votes, with the note to make.
func (v *decimalVotes) decide(delim byte) (decimal, string) {
	comma, point, amb, example := v.comma, v.point, v.amb, v.example
	switch {
	case comma > 0 && point > 0:
		if comma >= point {
			return decComma, fmt.Sprintf("numbers mix decimal marks (%d cells read as decimal comma, %d as decimal point); using the comma", comma, point)
		}
		return decPoint, fmt.Sprintf("numbers mix decimal marks (%d cells read as decimal point, %d as decimal comma); using the point", point, comma)
	case comma > 0:
		return decComma, fmt.Sprintf("numbers read with a decimal comma (%d cells such as \"1,5\" have no other reading)", comma)
	case point > 0:
		if delim == ';' {
			return decPoint, fmt.Sprintf("numbers read with a decimal point (%d cells such as \"1.5\" have no other reading)", point)
		}
		return decPoint, ""
	}
	d := decPoint
	if delim == ';' {
		d = decComma
	}
	if amb > 0 {
		mark := "point"
		if d == decComma {
			mark = "comma"
		}
		return d, fmt.Sprintf("cells such as %q could use either decimal mark; read with a decimal %s", example, mark)
	}
	return d, ""
}

var dateNames = map[string]bool{
	"date": true, "dates": true, "time": true, "period": true, "month": true, "months": true,
	"year": true, "years": true, "quarter": true, "quarters": true, "week": true, "day": true,
	"obs": true, "observation": true, "observationdate": true, "datetime": true, "timestamp": true,
	"yearmonth": true, "yearquarter": true, "yyyy": true, "ym": true, "yq": true, "t": true,
}

// dateNamed reports whether a header names a date column.
func dateNamed(h string) bool {
	var b strings.Builder
	for _, r := range strings.ToLower(h) {
		if r >= 'a' && r <= 'z' {
			b.WriteRune(r)
		}
	}
	n := b.String()
	return dateNames[n] || strings.Contains(n, "date") || strings.HasPrefix(n, "period")
}

// indexNames are headers of a leading column that numbers the rows.
var indexNames = map[string]bool{"": true, "obs": true, "observation": true, "observations": true, "index": true,
	"idx": true, "row": true, "rownames": true, "n": true, "no": true, "nr": true, "t": true, "id": true,
	"period": true, "time": true, "unnamed0": true}

// Year range read as years of data without an explicit date column.
const minDataYear, maxDataYear = 1800, 2200

// build turns records (the first non-blank one is the header) into a
// Table. Blank records (fields nil) inside the data are missing
// observations when there is no date column, and are dropped (with a note)
// when there is one: the dates then say which periods are missing.
func build(name string, recs []record, opt *Options, dec decimal, xlsx bool) (*Table, error) {
	for len(recs) > 0 && recs[0].fields == nil {
		recs = recs[1:]
	}
	for len(recs) > 0 && recs[len(recs)-1].fields == nil {
		recs = recs[:len(recs)-1]
	}
	if len(recs) == 0 {
		return nil, &ParseError{File: name, Err: wrapf(ErrNoHeader, "the input is empty")}
	}
	head := recs[0]
	text := false
	for _, h := range head.fields {
		h = trimSpace(h)
		if IsMissing(h) {
			continue
		}
		if _, ok := parseNumber(h, dec); ok {
			continue
		}
		if _, ok := parseDate(h); ok {
			continue
		}
		text = true
	}
	if !text {
		return nil, &ParseError{File: name, Row: head.line, Err: wrapf(ErrNoHeader, "the first row holds no column names")}
	}
	// Data rows and the blank rows between them.
	rows := make([]record, 0, len(recs)-1)
	var blanks []blankAt
	for _, r := range recs[1:] {
		if r.fields == nil {
			blanks = append(blanks, blankAt{len(rows), r.line})
			continue
		}
		rows = append(rows, r)
	}
	t := &Table{Name: name, DecimalComma: dec == decComma}
	// Row names written without a header cell: every data row has one cell
	// more than the header, and the last cells are not all empty.
	if len(rows) > 0 {
		// The row names must be 1..N or text that is not a number (so that a
		// column of unquoted "1,234" in every row stays an error).
		shifted, filledLast, count, text := true, false, true, true
		for i, r := range rows {
			if len(r.fields) != len(head.fields)+1 {
				shifted = false
				break
			}
			filledLast = filledLast || trimSpace(r.fields[len(r.fields)-1]) != ""
			f := trimSpace(r.fields[0])
			count = count && f == strconv.Itoa(i+1)
			_, num := parseNumber(f, dec)
			text = text && f != "" && !num
		}
		shifted = shifted && (count || text)
		if shifted && filledLast {
			head.fields = append([]string{""}, head.fields...)
			t.Notes = append(t.Notes, Note{Kind: "renamed", Row: head.line, Column: 1,
				Message: "every row has one cell more than the header: the first column is taken to be row names without a header cell"})
		}
	}
	if len(head.title) > 0 {
		t.Notes = append(t.Notes, Note{Kind: "header-row", Row: head.line,
			Message: fmt.Sprintf("the header is row %d; the title rows above it were skipped (%q)", head.line, strings.Join(head.title, " / "))})
	}
	ncol := len(head.fields)
	names, renamed := columnNames(head.fields, head.line)
	t.Notes = append(t.Notes, renamed...)
	short, shortFirst := 0, 0
	for _, r := range rows {
		if len(r.fields) < ncol {
			if short == 0 {
				shortFirst = r.line
			}
			short++
		}
		if len(r.fields) > ncol {
			for k, f := range r.fields[ncol:] {
				if trimSpace(f) != "" {
					return nil, &ParseError{File: name, Row: r.line, Column: ncol + k + 1, Value: trimSpace(f),
						Err: wrapf(ErrExtraCells, "the row has %d cells, the header %d (an unquoted thousands separator or delimiter inside a number shifts the cells; quote such cells or fix the row)", len(r.fields), ncol)}
				}
			}
		}
	}
	if short > 0 {
		t.Notes = append(t.Notes, Note{Kind: "short-row", Row: shortFirst,
			Message: fmt.Sprintf("%d rows have fewer cells than the header (the first is line %d): the missing cells are missing values", short, shortFirst)})
	}
	cell := func(i, j int) string { // i: data row index 0.., j: column 0..
		f := rows[i].fields
		if j < len(f) {
			return f[j]
		}
		return ""
	}
	column := func(j int) []string {
		c := make([]string, len(rows))
		for i := range c {
			c[i] = trimSpace(cell(i, j))
		}
		return c
	}
	perr := func(i, j int, err error) *ParseError {
		pe := &ParseError{File: name, Column: j + 1, ColumnName: names[j], Err: err}
		if i >= 0 && i < len(rows) {
			pe.Row = rows[i].line
			pe.Value = trimSpace(cell(i, j))
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
	numeric := func(j int) bool {
		for i := range rows {
			s := cell(i, j)
			if IsMissing(s) {
				continue
			}
			if _, ok := parseNumber(s, dec); !ok {
				return false
			}
		}
		return true
	}
	if _, err := parseDateFormat(opt.DateFormat, 0); err != nil {
		return nil, &ParseError{File: name, Err: err}
	}

	// Date column.
	dcol := -1
	var dc *dateColumn
	tryDates := func(j int, explicit bool) (*dateColumn, *dateColumnError) {
		c := column(j)
		named := explicit || dateNamed(names[j])
		if xlsx && named {
			c = serialDates(c)
		}
		ints := 0
		if named {
			ints = -1
		}
		o, _ := parseDateFormat(opt.DateFormat, ints)
		return parseDates(c, o)
	}
	// yearsOK applies the rule for 4-digit years read without an explicit
	// date column: all in 1800-2200, and counting up by one unless the
	// column is named like a date.
	notYears := func(j int, d *dateColumn, named bool) string {
		if d.kind != kYear || len(d.labels) == 0 {
			return ""
		}
		if v, ok := parseDate(column(j)[0]); !ok || v.k != kYear {
			return "" // years from daily or monthly dates
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
		if len(rows) > 0 {
			d, e := tryDates(j, true)
			if e != nil {
				return nil, perr(e.i, j, e.err)
			}
			dcol, dc = j, d
		}
	} else if len(rows) > 0 {
		var yearNotes []Note
		for j := range names {
			if !dateNamed(names[j]) {
				continue
			}
			d, e := tryDates(j, false)
			if e != nil {
				// A column of dates with one bad cell is an error naming
				// that cell; a column of other things is not a date column.
				if errors.Is(e.err, ErrDateOrder) || errors.Is(e.err, ErrAmbiguousDate) || (2*e.parsed > len(rows) && !numeric(j)) {
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
			if dateNamed(names[j]) {
				continue
			}
			fo, _ := parseDateFormat(opt.DateFormat, 0)
			first, ok := parseCell(cell(0, j), fo.ints)
			if !ok || (first.v.k == kYear && j > 0) {
				continue
			}
			d, e := tryDates(j, false)
			if e != nil {
				if first.v.k != kYear && (errors.Is(e.err, ErrDateOrder) && j == 0 || errors.Is(e.err, ErrAmbiguousDate) || (2*e.parsed > len(rows) && !numeric(j))) {
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
	// Blank rows inside the data.
	if len(blanks) > 0 {
		t.Notes = append(t.Notes, blankRowsNote(blanks, dc != nil))
		if dc == nil {
			full := make([]record, 0, len(rows)+len(blanks))
			k := 0
			for i := 0; i <= len(rows); i++ {
				for k < len(blanks) && blanks[k].pos == i {
					full = append(full, record{line: blanks[k].line, fields: []string{}})
					k++
				}
				if i < len(rows) {
					full = append(full, rows[i])
				}
			}
			rows = full
		}
	}
	if dc == nil && opt.DateFormat != "" {
		t.Notes = append(t.Notes, Note{Kind: "date-format", Row: head.line,
			Message: fmt.Sprintf("date_format %q was given but no column reads as dates with it: the file is read without dates", opt.DateFormat)})
	}
	t.Rows = len(rows)
	t.Header = names
	t.Lines = make([]int, len(rows))
	for i, r := range rows {
		t.Lines[i] = r.line
	}
	if dc != nil {
		t.DateColumn = names[dcol]
		t.Dates = dc.labels
		t.Frequency = dc.freq
		t.dateNotes(dc, dcol+1, names[dcol], t.Lines)
	}

	// Index column: the leading column, when it is unnamed or numbers the
	// rows (consecutive whole numbers from 0 or 1, or from anywhere under a
	// name such as obs, index or t), is not a series unless asked for.
	icol := -1
	if dcol != 0 && ncol > 1 && len(rows) > 0 && len(opt.Columns) == 0 {
		h := strings.ToLower(strings.Map(func(r rune) rune {
			if r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' {
				return r
			}
			return -1
		}, trimSpace(head.fields[0])))
		consec, start := true, 0
		for i := range rows {
			s := trimSpace(cell(i, 0))
			v := atoi(s)
			if v < 0 || (len(s) > 1 && s[0] == '0') {
				consec = false
				break
			}
			if i == 0 {
				start = v
			} else if v != start+i {
				consec = false
				break
			}
		}
		unnamed := trimSpace(head.fields[0]) == ""
		notYear := false
		for _, n := range t.Notes {
			notYear = notYear || n.Kind == "not-years" && n.Column == 1
		}
		if unnamed && numeric(0) || consec && (start <= 1 || indexNames[h] || notYear) {
			icol = 0
			what := "numbers the rows"
			if unnamed && !consec {
				what = "has no header"
			}
			t.Notes = append(t.Notes, Note{Kind: "index-column", Row: head.line, Column: 1, ColumnName: names[0],
				Message: fmt.Sprintf("the first column %s: read as a row index, not as a series (name it in columns to test it)", what)})
		}
	}

	// Series.
	parseCol := func(j int) ([]float64, int, string, *ParseError) {
		v := make([]float64, len(rows))
		grouped, example := 0, ""
		for i := range v {
			s := cell(i, j)
			if IsMissing(s) {
				v[i] = math.NaN()
				continue
			}
			x, ok := parseNumber(s, dec)
			if !ok {
				return nil, 0, "", perr(i, j, ErrBadNumber)
			}
			if hasGroups(trimSpace(s), dec) {
				if grouped == 0 {
					example = trimSpace(s)
				}
				grouped++
			}
			v[i] = x
		}
		return v, grouped, example, nil
	}
	add := func(j int, v []float64, grouped int, example string) {
		t.Series = append(t.Series, Series{Name: names[j], Column: j + 1, Values: v, Dates: t.Dates, Frequency: t.Frequency, First: 1})
		if grouped > 0 {
			mark := "point"
			if dec == decComma {
				mark = "comma"
			}
			t.Notes = append(t.Notes, Note{Kind: "thousands", Column: j + 1, ColumnName: names[j],
				Message: fmt.Sprintf("%d cells such as %q read with thousands separators (decimal %s)", grouped, example, mark)})
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
			v, g, ex, e := parseCol(j)
			if e != nil {
				return nil, e
			}
			add(j, v, g, ex)
		}
	} else {
		for j := range names {
			if j == dcol || j == icol {
				continue
			}
			v, g, ex, e := parseCol(j)
			if e != nil {
				t.Skipped = append(t.Skipped, e)
				t.Notes = append(t.Notes, Note{Kind: "skipped-column", Row: e.Row, Column: j + 1, ColumnName: names[j],
					Message: fmt.Sprintf("not a series: %v: %q", e.Err, e.Value)})
				continue
			}
			all := true
			for _, x := range v {
				if x == x {
					all = false
					break
				}
			}
			if all {
				// A named column without a single value is reported with
				// the skipped columns (batch runs must not drop it
				// silently); an unnamed empty column (a trailing
				// delimiter) is only a note.
				if trimSpace(head.fields[j]) != "" {
					e := &ParseError{File: name, Row: head.line, Column: j + 1, ColumnName: names[j], Err: wrapf(ErrTooShort, "the column has no values")}
					t.Skipped = append(t.Skipped, e)
				}
				t.Notes = append(t.Notes, Note{Kind: "empty-column", Row: head.line, Column: j + 1, ColumnName: names[j],
					Message: "the column has no values: not a series"})
				continue
			}
			add(j, v, g, ex)
		}
	}
	if len(t.Series) == 0 {
		return nil, &ParseError{File: name, Row: head.line, Err: ErrNoSeries}
	}
	t.attachNotes()
	return t, nil
}

// blankAt is a blank record inside the data: pos data rows come before it.
type blankAt struct{ pos, line int }

// blankRowsNote is the note on the blank rows inside the data: left out
// when the table has dates, read as missing observations otherwise.
func blankRowsNote(blanks []blankAt, dated bool) Note {
	lines := make([]string, 0, min(len(blanks), 10))
	for _, b := range blanks[:min(len(blanks), 10)] {
		lines = append(lines, fmt.Sprint(b.line))
	}
	list := "line " + strings.Join(lines, ", ")
	if len(blanks) > 1 {
		list = "lines " + strings.Join(lines, ", ")
	}
	if len(blanks) > 10 {
		list += fmt.Sprintf(" and %d more", len(blanks)-10)
	}
	what := "a blank row"
	if len(blanks) > 1 {
		what = fmt.Sprintf("%d blank rows", len(blanks))
	}
	if dated {
		return Note{Kind: "blank-row", Row: blanks[0].line,
			Message: fmt.Sprintf("%s (%s) left out: the dates show which periods are missing", what, list)}
	}
	return Note{Kind: "blank-row", Row: blanks[0].line,
		Message: fmt.Sprintf("%s (%s) read as missing observations", what, list)}
}

// columnNames names the columns of a header row (on file line line): empty
// headers become columnN, repeated ones get the first free suffix _2, _3 ...
// that no other header uses; each renaming is a note.
func columnNames(fields []string, line int) ([]string, []Note) {
	var notes []Note
	names := make([]string, len(fields))
	taken := map[string]bool{}
	for _, h := range fields {
		taken[trimSpace(h)] = true
	}
	used := map[string]bool{}
	for j, h := range fields {
		h = trimSpace(h)
		orig := h
		if h == "" {
			h = fmt.Sprintf("column%d", j+1)
			for k := 2; taken[h] || used[h]; k++ {
				h = fmt.Sprintf("column%d_%d", j+1, k)
			}
		}
		if used[h] {
			base := h
			for k := 2; used[h] || (taken[h] && h != base); k++ {
				h = fmt.Sprintf("%s_%d", base, k)
			}
			notes = append(notes, Note{Kind: "renamed", Row: line, Column: j + 1, ColumnName: h,
				Message: fmt.Sprintf("the header %q repeats an earlier column's: this column is named %q", orig, h)})
		} else if orig == "" {
			notes = append(notes, Note{Kind: "renamed", Row: line, Column: j + 1, ColumnName: h,
				Message: fmt.Sprintf("the header cell is empty: the column is named %q", h)})
		}
		used[h] = true
		names[j] = h
	}
	return names, notes
}

// hasGroups reports whether a cell that reads as a number uses thousands
// separators.
func hasGroups(s string, dec decimal) bool {
	if dec == decPoint && plainNumber(s) {
		return false
	}
	for i := 0; i < len(s); i++ {
		c := s[i]
		switch {
		case c == ' ' || c == '\'' || c >= 0x80:
			return true
		case c == ',' && dec == decPoint, c == '.' && dec == decComma:
			return true
		}
	}
	return false
}
