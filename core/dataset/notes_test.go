// What the reader does to the cells is either reported in Table.Notes or
// is an error naming the row: rows longer than the header, blank rows,
// repeated or empty header names, index columns, guessed decimal marks,
// thousands separators, stray quotes and UTF-16 text. Conventions: common
// practice (RFC 4180 quoting; Unicode 15.0 section 23.8 for byte-order
// marks), no other source.
package dataset

import (
	"errors"
	"math"
	"strings"
	"testing"
	"unicode/utf16"
)

func hasNote(tb *Table, kind, text string) bool {
	for _, n := range tb.Notes {
		if n.Kind == kind && strings.Contains(n.String(), text) {
			return true
		}
	}
	return false
}

func names(tb *Table) string {
	var out []string
	for _, s := range tb.Series {
		out = append(out, s.Name)
	}
	return strings.Join(out, "|")
}

func TestNotes(t *testing.T) {
	cases := []struct {
		name   string
		data   string
		opt    *Options
		series string
		rows   int
		kind   string
		text   string
	}{
		{"blank row, one column", "y\n1\n\n3\n4\n", nil, "y", 4, "blank-row", "a blank row (line 3) read as missing"},
		{"blank row with dates", "date,y\n2000-01,1\n\n2000-02,2\n", nil, "y", 2, "blank-row", "the dates show"},
		{"repeated names keep every column", "date,x,x,x_2\n2000,1,2,3\n2001,4,5,6\n", nil, "x|x_3|x_2", 2, "renamed", `"x_3"`},
		{"empty header cell", "date,,y\n2000,1,2\n2001,3,4\n", nil, "column2|y", 2, "renamed", "column2"},
		{"index 1..N", "t,y\n1,5\n2,3\n3,4\n", nil, "y", 3, "index-column", "row index"},
		{"index 0..N-1", "n,y\n0,5\n1,3\n2,4\n", nil, "y", 3, "index-column", "row index"},
		{"unnamed index", ",x,y\n7,1,2\n3,3,4\n", nil, "x|y", 2, "index-column", "has no header"},
		{"obs 1000..1499", "obs,y\n1000,5\n1001,3\n1002,4\n", nil, "y", 3, "index-column", "row index"},
		{"index asked for", "t,y\n1,5\n2,3\n", &Options{Columns: []string{"t", "y"}}, "t|y", 2, "", ""},
		{"1.000 in a semicolon file", "d;y\n2000;1.000\n2001;2.000\n", nil, "y", 2, "decimal-mark", "either decimal mark"},
		{"thousands", "d,y\n2000,\"1,234.5\"\n2001,2\n", nil, "y", 2, "thousands", `"1,234.5"`},
		{"short row", "d,x,y\n2000,1,2\n2001,3\n", nil, "x|y", 2, "short-row", "line 3"},
		{"UTF-16", string(utf16le("d,y\n2000,1\n2001,2\n")), nil, "y", 2, "encoding", "UTF-16"},
		{"Windows-1252", "Jahr;Ums\xe4tze \x80\n2000;1\xa0234,5\n2001;2\n", nil, "Umsätze €", 2, "encoding", "Windows-1252"},
	}
	for _, c := range cases {
		tb, err := Parse(c.name, []byte(c.data), c.opt)
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		if names(tb) != c.series || tb.Rows != c.rows {
			t.Errorf("%s: series %s rows %d, want %s %d (notes %q)", c.name, names(tb), tb.Rows, c.series, c.rows, tb.Messages())
		}
		if c.kind != "" && !hasNote(tb, c.kind, c.text) {
			t.Errorf("%s: notes %q lack %s %q", c.name, tb.Messages(), c.kind, c.text)
		}
	}
	// Windows-1252: the no-break space 0xA0 groups thousands.
	if tb, err := Parse("w", []byte("Jahr;Ums\xe4tze\n2000;1\xa0234,5\n2001;2\n"), nil); err != nil || tb.Series[0].Values[0] != 1234.5 {
		t.Errorf("Windows-1252 value: %v %+v", err, tb)
	}
	// The blank row is a missing observation; the note about a column is
	// also in that series.
	tb, _ := Parse("b", []byte("y\n1\n\n3\n"), nil)
	if !math.IsNaN(tb.Series[0].Values[1]) || tb.Lines[1] != 3 {
		t.Errorf("blank row: %v lines %v", tb.Series[0].Values, tb.Lines)
	}
	tb, _ = Parse("r", []byte("date,x,x\n2000,1,2\n2001,4,5\n"), nil)
	if len(tb.Series[1].Notes) != 1 || tb.Series[1].Notes[0].Kind != "renamed" || len(tb.Series[0].Notes) != 0 {
		t.Errorf("series notes: %+v", tb.Series)
	}
}

func utf16le(s string) []byte {
	out := []byte{0xFF, 0xFE}
	for _, u := range utf16.Encode([]rune(s)) {
		out = append(out, byte(u), byte(u>>8))
	}
	return out
}

func TestReaderErrors(t *testing.T) {
	nobom := utf16le("d,y\n2000,1\n2001,2\n")[2:]
	cases := []struct {
		name string
		data string
		err  error
		row  int
		text string
	}{
		{"unquoted thousands comma", "date,x,y\n2000,1,234.5,7\n2001,1,2\n", ErrExtraCells, 2, "4 cells, the header 3"},
		{"stray quote", "d,y\n2000,1\n2001,\"2\n2002,3\n2003,4\n", ErrQuote, 3, "opened on line 3"},
		{"UTF-16 without BOM", string(nobom), ErrEncoding, 0, "UTF-16"},
		{"UTF-32", "\xFF\xFE\x00\x00d\x00\x00\x00", ErrEncoding, 0, "UTF-32"},
	}
	for _, c := range cases {
		_, err := Parse("f.csv", []byte(c.data), nil)
		var pe *ParseError
		if !errors.Is(err, c.err) || !errors.As(err, &pe) || pe.Row != c.row || !strings.Contains(err.Error(), c.text) {
			t.Errorf("%s: %v, want %v at line %d with %q", c.name, err, c.err, c.row, c.text)
		}
	}
}

// Row names without a header cell are an index; the same shape with a
// thousands comma in every row stays an error.
func TestRowNamesWithoutHeaderCell(t *testing.T) {
	tb, err := Parse("r", []byte("x,y\na,1,2\nb,3,4\nc,5,7\n"), nil)
	if err != nil || names(tb) != "x|y" || !hasNote(tb, "renamed", "row names") {
		t.Errorf("text row names: %v %+v", err, tb)
	}
	if _, err := Parse("r", []byte("year,revenue\n2001,1,234\n2002,1,300\n"), nil); !errors.Is(err, ErrExtraCells) {
		t.Errorf("thousands comma in every row: %v", err)
	}
}

// Settings the file cannot use are noted, never dropped silently.
func TestUnusedSettingsNoted(t *testing.T) {
	tb, err := Parse("s.csv", []byte("x,y\n5,1\n3,2\n"), &Options{Sheet: "Data", DateFormat: "dmy"})
	if err != nil || !hasNote(tb, "sheet-ignored", `"Data"`) || !hasNote(tb, "date-format", `"dmy" was given`) {
		t.Errorf("%v %q", err, tb.Messages())
	}
}
