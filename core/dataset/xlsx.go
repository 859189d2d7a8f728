package dataset

import (
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"time"

	"github.com/thedatashed/xlsxreader"
)

// maxXLSXColumns bounds the columns read from a sheet (the .xlsx limit).
const maxXLSXColumns = 16384

// ReadFile reads a data file: .xlsx files with ReadXLSX, anything else with
// Parse. The table is named after the file's base name.
func ReadFile(path string, opt *Options) (*Table, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, err
	}
	name := filepath.Base(path)
	if strings.EqualFold(filepath.Ext(path), ".xlsx") {
		return ReadXLSX(name, data, opt)
	}
	return Parse(name, data, opt)
}

// ReadXLSX reads the first sheet of an .xlsx workbook with the same rules as
// Parse (header row, date column, numeric columns; numbers use a decimal
// point). Cells with a date format arrive as ISO dates; a date-named column of
// whole numbers above 3000 is read as spreadsheet serial day numbers (days
// since 1899-12-30). Row numbers in errors are sheet rows.
func ReadXLSX(name string, data []byte, opt *Options) (t *Table, err error) {
	if opt == nil {
		opt = &Options{}
	}
	defer func() {
		if r := recover(); r != nil {
			t, err = nil, &ParseError{File: name, Err: fmt.Errorf("%w: unreadable workbook: %v", ErrNoHeader, r)}
		}
	}()
	x, err := xlsxreader.NewReader(data)
	if err != nil {
		return nil, &ParseError{File: name, Err: fmt.Errorf("%w: not an .xlsx workbook: %v", ErrNoHeader, err)}
	}
	if len(x.Sheets) == 0 {
		return nil, &ParseError{File: name, Err: wrapf(ErrNoHeader, "the workbook has no sheet")}
	}
	var recs []record
	var rowErr error
	for row := range x.ReadRows(x.Sheets[0]) {
		if row.Error != nil {
			if rowErr == nil {
				rowErr = &ParseError{File: name, Row: row.Index, Err: fmt.Errorf("%w: %v", ErrBadNumber, row.Error)}
			}
			continue
		}
		if rowErr != nil {
			continue
		}
		n := 0
		for _, c := range row.Cells {
			if k := c.ColumnIndex(); k >= 0 && k < maxXLSXColumns {
				n = max(n, k+1)
			}
		}
		if n == 0 {
			continue
		}
		fields := make([]string, n)
		blank := true
		for _, c := range row.Cells {
			if k := c.ColumnIndex(); k >= 0 && k < maxXLSXColumns {
				fields[k] = c.Value
				blank = blank && trimSpace(c.Value) == ""
			}
		}
		if !blank {
			recs = append(recs, record{line: row.Index, fields: fields})
		}
	}
	if rowErr != nil {
		return nil, rowErr
	}
	return build(name, recs, opt, decPoint, true)
}

// serialEpoch is day 0 of spreadsheet serial dates.
var serialEpoch = time.Date(1899, 12, 30, 0, 0, 0, 0, time.UTC)

// serialDates converts a column of whole numbers in (3000, 2958466) (the
// years 1908 to 9999) from serial day numbers to ISO dates; any other column
// is returned unchanged.
func serialDates(c []string) []string {
	if len(c) == 0 {
		return c
	}
	out := make([]string, len(c))
	for i, s := range c {
		v, err := strconv.ParseFloat(trimSpace(s), 64)
		if err != nil || v != math.Trunc(v) || v <= 3000 || v >= 2958466 {
			return c
		}
		out[i] = serialEpoch.AddDate(0, 0, int(v)).Format("2006-01-02")
	}
	return out
}
