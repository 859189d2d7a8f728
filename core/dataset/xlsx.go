package dataset

import (
	"errors"
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

// ReadXLSX reads one sheet of an .xlsx workbook with the same rules as
// Parse (header row, date column, numeric columns; numbers use a decimal
// point): the sheet named by Options.Sheet, else the first sheet that reads
// as a table. Every other sheet holding data is named in a "sheet-ignored"
// note, and title rows above the header (rows with one filled cell above a
// row with several) are skipped with a "header-row" note. Blank sheet rows
// inside the data count as blank rows (see Parse). Cells with a date format
// arrive as ISO dates; a date-named column of whole numbers above 3000 is
// read as spreadsheet serial day numbers (days since 1899-12-30). Row
// numbers in errors are sheet rows, and errors name the sheet.
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
	sheets := x.Sheets
	if opt.Sheet != "" {
		found := ""
		for _, sh := range x.Sheets {
			if sh == opt.Sheet || (found == "" && strings.EqualFold(sh, trimSpace(opt.Sheet))) {
				found = sh
			}
		}
		if found == "" {
			return nil, &ParseError{File: name, Err: wrapf(ErrUnknownColumn, "no sheet %q in the workbook (sheets: %s)", opt.Sheet, strings.Join(x.Sheets, ", "))}
		}
		sheets = []string{found}
	}
	type read struct {
		sheet string
		recs  []record
		rows  int
		err   error
	}
	var all []read
	for _, sh := range x.Sheets {
		recs, n, err := sheetRecords(x, name, sh)
		all = append(all, read{sh, recs, n, err})
	}
	var firstErr error
	var chosen string
	for _, sh := range sheets {
		for _, r := range all {
			if r.sheet != sh {
				continue
			}
			label := fmt.Sprintf("%s (sheet %q)", name, sh)
			if r.err != nil {
				if firstErr == nil {
					firstErr = withFile(r.err, label)
				}
				continue
			}
			if r.rows == 0 {
				continue
			}
			tb, err := build(label, skipTitleRows(r.recs), opt, decPoint, true)
			if err != nil {
				if firstErr == nil {
					firstErr = err
				}
				continue
			}
			t, chosen = tb, sh
		}
		if t != nil {
			break
		}
	}
	if t == nil {
		if firstErr == nil {
			firstErr = &ParseError{File: name, Err: wrapf(ErrNoSeries, "no sheet holds data (sheets: %s)", strings.Join(x.Sheets, ", "))}
		}
		return nil, firstErr
	}
	t.Name = name
	if refs := formulaCells(data, chosen); len(refs) > 0 {
		list := strings.Join(refs[:min(len(refs), 10)], ", ")
		if len(refs) > 10 {
			list += fmt.Sprintf(" and %d more", len(refs)-10)
		}
		t.Notes = append(t.Notes, Note{Kind: "formula",
			Message: fmt.Sprintf("%s a formula without a saved value, read as empty (%s); open and save the workbook in a spreadsheet program to store the values", plural(len(refs), "cell holds", "cells hold"), list)})
	}
	for _, r := range all {
		if r.sheet != chosen && r.rows > 0 {
			t.Notes = append(t.Notes, Note{Kind: "sheet-ignored",
				Message: fmt.Sprintf("sheet %q (%d filled rows) was not read; sheet %q was (set sheet, --sheet, to choose)", r.sheet, r.rows, chosen)})
		}
	}
	return t, nil
}

// withFile sets the file name of a *ParseError.
func withFile(err error, file string) error {
	var pe *ParseError
	if errors.As(err, &pe) {
		pe.File = file
	}
	return err
}

// sheetRecords reads one sheet into records; blank rows inside the sheet
// (absent or all cells empty) are blank records. n counts rows with data.
func sheetRecords(x *xlsxreader.XlsxFile, name, sheet string) ([]record, int, error) {
	var recs []record
	var rowErr error
	n, prev := 0, 0
	for row := range x.ReadRows(sheet) {
		if row.Error != nil {
			if rowErr == nil {
				rowErr = &ParseError{File: name, Row: row.Index, Err: fmt.Errorf("%w: %v", ErrBadNumber, row.Error)}
			}
			continue
		}
		if rowErr != nil {
			continue
		}
		width := 0
		for _, c := range row.Cells {
			if k := c.ColumnIndex(); k >= 0 && k < maxXLSXColumns {
				width = max(width, k+1)
			}
		}
		fields := make([]string, width)
		blank := true
		for _, c := range row.Cells {
			if k := c.ColumnIndex(); k >= 0 && k < maxXLSXColumns {
				fields[k] = c.Value
				blank = blank && trimSpace(c.Value) == ""
			}
		}
		if prev > 0 {
			for r := prev + 1; r < row.Index && r-prev < 1<<20; r++ {
				recs = append(recs, record{line: r})
			}
		}
		prev = max(prev, row.Index)
		if blank {
			recs = append(recs, record{line: row.Index})
			continue
		}
		n++
		recs = append(recs, record{line: row.Index, fields: fields})
	}
	return recs, n, rowErr
}

// skipTitleRows drops title rows above the header: leading rows whose only
// filled cell is the first, holding text (not a number or a date), followed
// by a row with several filled cells. The header record then lists the
// titles, and build notes them.
func skipTitleRows(recs []record) []record {
	filled := func(r record) int {
		n := 0
		for _, f := range r.fields {
			if trimSpace(f) != "" {
				n++
			}
		}
		return n
	}
	title := func(r record) bool {
		if filled(r) != 1 || len(r.fields) == 0 {
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
	i := 0
	var titles []string
	for {
		for i < len(recs) && recs[i].fields == nil {
			i++
		}
		j := i + 1
		for j < len(recs) && recs[j].fields == nil {
			j++
		}
		if i >= len(recs) || j >= len(recs) || !title(recs[i]) || filled(recs[j]) < 2 {
			break
		}
		titles = append(titles, trimSpace(recs[i].fields[0]))
		i = j
	}
	if len(titles) == 0 {
		return recs
	}
	out := append([]record(nil), recs[i:]...)
	out[0].title = titles
	return out
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

// plural is "1 one" or "n many".
func plural(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return fmt.Sprintf("%d %s", n, many)
}
