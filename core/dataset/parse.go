package dataset

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"math"
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
	Warnings  []string
	// Skipped lists the columns that are not series (a cell is neither a
	// number nor a missing marker), with the first offending cell.
	Skipped []*ParseError
	// Delimiter is the field delimiter used (0 for .xlsx).
	Delimiter rune
	// DecimalComma reports that numbers were read with a decimal comma.
	DecimalComma bool
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
}

// Options steer Parse and ReadXLSX. The zero value (or nil) detects everything.
type Options struct {
	// DateColumn names the date column; "" detects it.
	DateColumn string
	// Delimiter is the field delimiter; 0 detects it.
	Delimiter rune
	// Columns keeps only these columns, in this order; a column that is
	// unknown or not numeric is then an error.
	Columns []string
}

// Parse reads delimited text with a header row (see the package
// documentation for the formats, markers and detection rules). Problems that
// stop reading are returned as *ParseError; a non-numeric column that was not
// asked for is skipped and reported in Table.Skipped and Table.Warnings.
func Parse(name string, data []byte, opt *Options) (*Table, error) {
	if opt == nil {
		opt = &Options{}
	}
	delim := byte(0)
	if opt.Delimiter != 0 {
		if opt.Delimiter >= utf8.RuneSelf || opt.Delimiter == '"' || opt.Delimiter == '\n' || opt.Delimiter == '\r' {
			return nil, &ParseError{File: name, Err: wrapf(ErrBadNumber, "delimiter %q is not supported", opt.Delimiter)}
		}
		delim = byte(opt.Delimiter)
	} else {
		delim = detectDelimiter(sampleLines(data, 50, false))
	}
	rr := newRecordReader(bytes.NewReader(data), delim)
	var recs []record
	for {
		rec, err := rr.next()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, &ParseError{File: name, Row: rr.line, Err: err}
		}
		recs = append(recs, rec)
	}
	dec := decPoint
	var warn string
	if delim != ',' {
		dec, warn = detectDecimal(recs, delim)
	}
	t, err := build(name, recs, opt, dec, false)
	if err != nil {
		return nil, err
	}
	t.Delimiter = rune(delim)
	if warn != "" {
		t.Warnings = append([]string{warn}, t.Warnings...)
	}
	return t, nil
}

// detectDecimal votes on the decimal mark over every data cell.
func detectDecimal(recs []record, delim byte) (decimal, string) {
	comma, point, amb := 0, 0, 0
	example := ""
	for _, r := range recs[min(1, len(recs)):] {
		for _, f := range r.fields {
			c, p, a := decimalVote(f)
			switch {
			case c:
				comma++
			case p:
				point++
			case a:
				amb++
				if example == "" {
					example = trimSpace(f)
				}
			}
		}
	}
	switch {
	case comma > 0 && point > 0:
		if comma >= point {
			return decComma, fmt.Sprintf("numbers mix decimal marks (%d cells read as decimal comma, %d as decimal point); using the comma", comma, point)
		}
		return decPoint, fmt.Sprintf("numbers mix decimal marks (%d cells read as decimal point, %d as decimal comma); using the point", point, comma)
	case comma > 0:
		return decComma, ""
	case point > 0:
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

// build turns records (the first is the header) into a Table.
func build(name string, recs []record, opt *Options, dec decimal, xlsx bool) (*Table, error) {
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
	t := &Table{Name: name, Rows: len(recs) - 1, DecimalComma: dec == decComma}
	ncol := len(head.fields)
	names := make([]string, ncol)
	seen := map[string]int{}
	for j, h := range head.fields {
		h = trimSpace(h)
		if h == "" {
			h = fmt.Sprintf("column%d", j+1)
		}
		if n := seen[h]; n > 0 {
			nh := fmt.Sprintf("%s_%d", h, n+1)
			t.Warnings = append(t.Warnings, fmt.Sprintf("column %d: duplicate name %q renamed %q", j+1, h, nh))
			seen[h] = n + 1
			h = nh
		} else {
			seen[h] = 1
		}
		names[j] = h
	}
	short, long := 0, 0
	for _, r := range recs[1:] {
		if len(r.fields) < ncol {
			if short == 0 {
				t.Warnings = append(t.Warnings, fmt.Sprintf("line %d has %d fields, the header %d: the missing cells are missing values", r.line, len(r.fields), ncol))
			}
			short++
		}
		if len(r.fields) > ncol {
			for _, f := range r.fields[ncol:] {
				if trimSpace(f) != "" {
					if long == 0 {
						t.Warnings = append(t.Warnings, fmt.Sprintf("line %d has %d fields, the header %d: the extra cells are ignored", r.line, len(r.fields), ncol))
					}
					long++
					break
				}
			}
		}
	}
	cell := func(i, j int) string { // i: data row index 0.., j: column 0..
		f := recs[i+1].fields
		if j < len(f) {
			return f[j]
		}
		return ""
	}
	column := func(j int) []string {
		c := make([]string, t.Rows)
		for i := range c {
			c[i] = trimSpace(cell(i, j))
		}
		return c
	}
	perr := func(i, j int, err error) *ParseError {
		pe := &ParseError{File: name, Column: j + 1, ColumnName: names[j], Err: err}
		if i >= 0 && i < t.Rows {
			pe.Row = recs[i+1].line
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

	// Date column.
	dcol := -1
	var dc *dateColumn
	tryDates := func(j int) (*dateColumn, *dateColumnError) {
		c := column(j)
		if xlsx && dateNamed(names[j]) {
			c = serialDates(c)
		}
		return parseDates(c)
	}
	if opt.DateColumn != "" {
		j := find(opt.DateColumn)
		if j < 0 {
			return nil, &ParseError{File: name, Row: head.line, ColumnName: opt.DateColumn, Err: wrapf(ErrUnknownColumn, "date column %q not in the header", opt.DateColumn)}
		}
		d, e := tryDates(j)
		if e != nil {
			return nil, perr(e.i, j, e.err)
		}
		dcol, dc = j, d
	} else if t.Rows > 0 {
		for j := range names {
			if !dateNamed(names[j]) {
				continue
			}
			d, e := tryDates(j)
			if e != nil {
				if errors.Is(e.err, ErrDateOrder) {
					return nil, perr(e.i, j, e.err)
				}
				continue
			}
			dcol, dc = j, d
			break
		}
		for j := 0; j < ncol && dcol < 0; j++ {
			first, ok := parseDate(cell(0, j))
			if !ok || (first.k == kYear && j > 0) {
				continue
			}
			d, e := tryDates(j)
			if e != nil {
				if errors.Is(e.err, ErrDateOrder) && first.k != kYear && j == 0 {
					return nil, perr(e.i, j, e.err)
				}
				continue
			}
			if first.k == kYear && d.freq != Annual {
				continue
			}
			dcol, dc = j, d
		}
	}
	if dc != nil {
		t.DateColumn = names[dcol]
		t.Dates = dc.labels
		t.Frequency = dc.freq
		if dc.warn != "" {
			t.Warnings = append(t.Warnings, dc.warn)
		}
	}

	// Series.
	parseCol := func(j int) ([]float64, *ParseError) {
		v := make([]float64, t.Rows)
		for i := range v {
			s := cell(i, j)
			if IsMissing(s) {
				v[i] = math.NaN()
				continue
			}
			x, ok := parseNumber(s, dec)
			if !ok {
				return nil, perr(i, j, ErrBadNumber)
			}
			v[i] = x
		}
		return v, nil
	}
	add := func(j int, v []float64) {
		t.Series = append(t.Series, Series{Name: names[j], Column: j + 1, Values: v, Dates: t.Dates, Frequency: t.Frequency, First: 1})
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
			v, e := parseCol(j)
			if e != nil {
				return nil, e
			}
			add(j, v)
		}
	} else {
		for j := range names {
			if j == dcol {
				continue
			}
			v, e := parseCol(j)
			if e != nil {
				t.Skipped = append(t.Skipped, e)
				t.Warnings = append(t.Warnings, "column skipped: "+e.Error())
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
				// delimiter) is only a warning.
				if trimSpace(head.fields[j]) != "" {
					e := &ParseError{File: name, Row: head.line, Column: j + 1, ColumnName: names[j], Err: wrapf(ErrTooShort, "the column has no values")}
					t.Skipped = append(t.Skipped, e)
					t.Warnings = append(t.Warnings, fmt.Sprintf("column %d (%q) has no values: skipped", j+1, names[j]))
				}
				continue
			}
			add(j, v)
		}
	}
	if len(t.Series) == 0 {
		return nil, &ParseError{File: name, Row: head.line, Err: ErrNoSeries}
	}
	return t, nil
}
