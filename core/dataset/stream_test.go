// The streaming reader (ReadColumns) against the whole-file reader (Parse):
// over every file of the reader corpus and the other test files, with
// several column selections, both give the same table (dates, rows, lines,
// header, notes, skipped columns, the kept series' values bit for bit) or the
// same error, and Select gives the same series and errors on both (issues 11
// and 14: the streaming path must change nothing but the memory). The
// reference is our own whole-file reader; no outside source.
package dataset

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"testing/iotest"

	"github.com/rootshift/rootshift/core/schema"
)

// opener returns the input for ReadColumns; chunk 1 reads a byte at a
// time, 2 half of what is asked (characters and lines cut across reads).
func opener(data []byte, chunk int) func() (io.ReadCloser, error) {
	return func() (io.ReadCloser, error) {
		var r io.Reader = bytes.NewReader(data)
		switch chunk {
		case 1:
			r = iotest.OneByteReader(r)
		case 2:
			r = iotest.HalfReader(r)
		}
		return io.NopCloser(r), nil
	}
}

// sameError reports whether two errors say the same thing at the same
// place.
func sameError(a, b error) string {
	if (a == nil) != (b == nil) {
		return fmt.Sprintf("error %v, streaming %v", a, b)
	}
	if a == nil {
		return ""
	}
	if a.Error() != b.Error() {
		return fmt.Sprintf("error %q, streaming %q", a, b)
	}
	var pa, pb *ParseError
	if errors.As(a, &pa) != errors.As(b, &pb) {
		return fmt.Sprintf("error types %T, %T", a, b)
	}
	if pa != nil && (pa.Row != pb.Row || pa.Column != pb.Column || pa.ColumnName != pb.ColumnName || pa.Value != pb.Value || errors.Unwrap(pa.Err) != errors.Unwrap(pb.Err)) {
		return fmt.Sprintf("error %+v, streaming %+v", *pa, *pb)
	}
	return ""
}

func sameValues(a, b []float64) bool {
	if len(a) != len(b) || (a == nil) != (b == nil) {
		return false
	}
	for i := range a {
		if math.Float64bits(a[i]) != math.Float64bits(b[i]) {
			return false
		}
	}
	return true
}

// sameTable compares every field of two tables.
func sameTable(a, b *Table) string {
	switch {
	case a.Name != b.Name || a.DateColumn != b.DateColumn || a.Frequency != b.Frequency || a.Rows != b.Rows ||
		a.Delimiter != b.Delimiter || a.DecimalComma != b.DecimalComma:
		return fmt.Sprintf("table %q %q %q %d %q %v, streaming %q %q %q %d %q %v", a.Name, a.DateColumn, a.Frequency, a.Rows, a.Delimiter, a.DecimalComma,
			b.Name, b.DateColumn, b.Frequency, b.Rows, b.Delimiter, b.DecimalComma)
	case !slices.Equal(a.Dates, b.Dates) || (a.Dates == nil) != (b.Dates == nil):
		return fmt.Sprintf("dates %q, streaming %q", a.Dates, b.Dates)
	case !slices.Equal(a.Lines, b.Lines):
		return fmt.Sprintf("lines %v, streaming %v", a.Lines, b.Lines)
	case !slices.Equal(a.Header, b.Header):
		return fmt.Sprintf("header %q, streaming %q", a.Header, b.Header)
	case !slices.Equal(a.allSeries, b.allSeries):
		return fmt.Sprintf("series names %q, streaming %q", a.allSeries, b.allSeries)
	case !slices.Equal(a.Notes, b.Notes):
		return fmt.Sprintf("notes\n%q\nstreaming\n%q", a.Messages(), b.Messages())
	case len(a.Skipped) != len(b.Skipped):
		return fmt.Sprintf("%d skipped, streaming %d", len(a.Skipped), len(b.Skipped))
	case len(a.Series) != len(b.Series):
		return fmt.Sprintf("%d series, streaming %d", len(a.Series), len(b.Series))
	}
	for i := range a.Skipped {
		if d := sameError(a.Skipped[i], b.Skipped[i]); d != "" {
			return "skipped: " + d
		}
	}
	for i := range a.Series {
		x, y := a.Series[i], b.Series[i]
		if x.Name != y.Name || x.Column != y.Column || x.Frequency != y.Frequency || x.First != y.First ||
			!slices.Equal(x.Notes, y.Notes) || !slices.Equal(x.Dates, y.Dates) || !sameValues(x.Values, y.Values) {
			return fmt.Sprintf("series %d: %+v\nstreaming %+v", i, x, y)
		}
	}
	return ""
}

// compareReaders reads data both ways with opt and keep (nil: every
// series) and returns the first difference, "" when there is none.
func compareReaders(name string, data []byte, opt Options, keep []string, chunk int) string {
	whole, err := Parse(name, data, &opt)
	got, gerr := ReadColumns(name, opener(data, chunk), &opt, keep)
	if d := sameError(err, gerr); d != "" || err != nil {
		return d
	}
	full := *whole
	if len(opt.Columns) == 0 && keep != nil {
		whole.restrict(keep)
	}
	if d := sameTable(whole, got); d != "" {
		return d
	}
	// Select on both: the same series and errors.
	set := schema.Settings{Columns: keep, DateColumn: opt.DateColumn, Gaps: "keep"}
	sa, ea := Select(&full, set)
	sb, eb := Select(got, set)
	if len(sa) != len(sb) || len(ea) != len(eb) {
		return fmt.Sprintf("select: %d series %v, streaming %d series %v", len(sa), ea, len(sb), eb)
	}
	for i := range ea {
		if ea[i].Error() != eb[i].Error() {
			return fmt.Sprintf("select error %q, streaming %q", ea[i].Error(), eb[i].Error())
		}
	}
	for i := range sa {
		if sa[i].Name != sb[i].Name || sa[i].First != sb[i].First || !sameValues(sa[i].Values, sb[i].Values) ||
			!slices.Equal(sa[i].Dates, sb[i].Dates) || !slices.Equal(sa[i].Notes, sb[i].Notes) {
			return fmt.Sprintf("select series %d: %+v, streaming %+v", i, sa[i], sb[i])
		}
	}
	return ""
}

// selections lists the column selections tried on a file: every series,
// each series alone, each series by another case, the first and last
// together, a column that is not numeric, the date column, and a name the
// file does not have.
func selections(t *Table) [][]string {
	out := [][]string{nil, {"no such column"}}
	for _, s := range t.Series {
		out = append(out, []string{s.Name}, []string{" " + strings.ToUpper(s.Name)})
	}
	if n := len(t.Series); n > 1 {
		out = append(out, []string{t.Series[n-1].Name, t.Series[0].Name})
	}
	for _, sk := range t.Skipped {
		out = append(out, []string{sk.ColumnName})
	}
	if t.DateColumn != "" {
		out = append(out, []string{t.DateColumn})
	}
	return out
}

func TestReadColumnsMatchesParse(t *testing.T) {
	type input struct {
		file string
		opt  Options
	}
	var inputs []input
	for _, c := range loadCorpus(t) {
		inputs = append(inputs, input{filepath.Join("testdata", "corpus", c.File), Options{DateFormat: c.Options["date_format"], DateColumn: c.Options["date_column"]}})
	}
	files, _ := filepath.Glob(filepath.Join("testdata", "*.*sv"))
	for _, f := range files {
		inputs = append(inputs, input{f, Options{}})
	}
	if len(inputs) < 50 {
		t.Fatalf("%d inputs", len(inputs))
	}
	compared := 0
	for _, in := range inputs {
		data, err := os.ReadFile(in.file)
		if err != nil {
			t.Fatal(err)
		}
		name := filepath.Base(in.file)
		sels := [][]string{nil, {"y"}}
		if tb, err := Parse(name, data, &in.opt); err == nil {
			sels = selections(tb)
		}
		for _, keep := range sels {
			for chunk := 0; chunk < 3; chunk++ {
				if d := compareReaders(name, data, in.opt, keep, chunk); d != "" {
					t.Errorf("%s, columns %q, reads of %d: %s", in.file, keep, chunk, d)
				}
				compared++
			}
			// The same selection as Options.Columns (Parse's meaning).
			if keep != nil {
				opt := in.opt
				opt.Columns = keep
				if d := compareReaders(name, data, opt, nil, 0); d != "" {
					t.Errorf("%s, Options.Columns %q: %s", in.file, keep, d)
				}
				compared++
			}
		}
	}
	t.Logf("%d comparisons over %d files", compared, len(inputs))
}

// Cases the files above do not reach: text that is not UTF-8 (read again
// as Windows-1252), an invalid byte cut across reads, a header longer than
// the delimiter sample, blank rows with and without dates, errors found
// after the data (a stray quote at the end wins over an earlier row with
// extra cells), a header of numbers, a semicolon file whose decimal mark
// is decided by the last row, rows with names but no header cell.
func TestReadColumnsEdgeCases(t *testing.T) {
	wide := wideCSV(4, 9000)
	cases := map[string]string{
		"latin1":        "date;Umsatz \xe9t\xe9;x\n2009-01;1,5;2\n2009-02;2,5;3\n2009-03;3;4\n",
		"latin1-late":   "date,y,z\n2009-01,1,2\n2009-02,2,3\n2009-03,3,4\n2009-04,4,caf\xe9\n",
		"utf8-late":     "date,y,z\n2009-01,1,2\n2009-02,2,3\n2009-03,3,4\n2009-04,4,caf\u00e9\n",
		"bad-utf8-end":  "date,y\n2009-01,1\n2009-02,2\n2009-03,3\xe2\x82",
		"blank-dated":   "date,y,z\n2009-01,1,2\n\n2009-03,3,4\n\n\n2009-04,4,5\n\n",
		"blank-undated": "a,y,z\n1,1,2\n\n3,3,4\n\n\n4,4,5\n\n",
		"extra-then-q":  "date,y\n2009-01,1,2\n2009-02,2\n2009-03,\"3\n",
		"numbers-head":  "1,2,3\n4,5,6\n",
		"empty":         " \n\n",
		"semicolon":     "t;y;z\n1;1.234;2\n2;2.345;3\n3;3,5;4\n",
		"rownames":      "gdp,cpi\nAT,1,2\nBE,2,3\nCH,3,4\n",
		"title":         "Exports\n\ndate,north,south\n2009-01,1,2\n2009-02,2,3\n",
		"title-only":    "Exports\n\n",
		"index":         "obs,y\n1000,1\n1001,2\n1002,3\n",
		"short":         "date,y,z\n2009-01,1\n2009-02,2,3\n2009-03\n",
		"bom-crlf":      "\xef\xbb\xbfdate,y\r\n2009-01,1\r\n2009-02,2\r\n",
		"cr":            "date,y\r2009-01,1\r2009-02,2\r",
		"utf16":         "\xff\xfed\x00,\x00y\x00\n\x001\x00,\x002\x00\n\x00",
		"blank-index":   "n,y\n1,5\n2,6\n\n3,7\n4,8\n",
		"index-0":       ",y\n0,5\n1,6\n2,7\n",
		"mixed-ok":      "date,y,v\n2009-01,1,a\n2009-02,x,2\n2009-03,3,3\n",
		"dup-names":     "date,y,y,Y,column4,\n2009-01,1,2,3,4,5\n2009-02,2,3,4,5,6\n",
		"quoted":        "date,y,z\n2009-01,\"1,234.5\",2\n2009-02,\"2,000\",\"a\"\"b\"\n2009-03,3,\"4\n5\"\n",
		"bad-date":      "date,y\n2009-01,1\n2009-02,2\nfoo,3\n2009-04,4\n",
		"bad-date-2":    "when,y\n2009-01,1\nbar,2\n2009-03,3\n",
		"month-numbers": "a,y\n1.2345,1\n2.2009,2\n-3.1999,3\n4.5,4\n",
		"wide":          string(wide),
	}
	for name, data := range cases {
		for _, keep := range [][]string{nil, {"y"}, {"Y", "z"}, {"x9000"}, {"north"}} {
			for chunk := 0; chunk < 3; chunk++ {
				if name == "wide" && chunk == 1 {
					continue
				}
				if d := compareReaders(name, []byte(data), Options{}, keep, chunk); d != "" {
					t.Errorf("%s, columns %q, reads of %d: %s", name, keep, chunk, d)
				}
			}
		}
	}
	for _, opt := range []Options{{Delimiter: '"'}, {Delimiter: ';'}, {DateColumn: "nope"}, {DateColumn: "a"}, {DateFormat: "bogus"}, {DateFormat: "yyyymm"}, {Sheet: "one"}} {
		for name, data := range cases {
			if d := compareReaders(name, []byte(data), opt, []string{"y"}, 0); d != "" {
				t.Errorf("%s with %+v: %s", name, opt, d)
			}
		}
	}
}

// The reader's input is opened once per pass; an error opening it is
// returned as it is.
func TestReadColumnsOpenError(t *testing.T) {
	boom := errors.New("boom")
	_, err := ReadColumns("x", func() (io.ReadCloser, error) { return nil, boom }, nil, nil)
	if !errors.Is(err, boom) {
		t.Fatalf("%v", err)
	}
}

// FuzzReadColumns: on any input, the streaming reader and the whole-file
// reader agree, for every series and for one picked column.
func FuzzReadColumns(f *testing.F) {
	for _, c := range []string{
		"date,y\n2009-01,1\n2009-02,2\n",
		"date;y\n2009-01;1,5\n2009-02;2,5\n",
		"a\tb\n1\t2\n\n3\t4\n",
		"t\n\"1\n2\"\n",
		"x,x,\n1,2,\n",
		"Title\n\ndate,y\n2000,1\n2001,2\n",
	} {
		f.Add([]byte(c), "y", false)
	}
	f.Fuzz(func(t *testing.T, data []byte, col string, explicit bool) {
		if len(data) > 4096 {
			return
		}
		opt := Options{}
		keep := []string{col}
		if explicit {
			opt.Columns, keep = keep, nil
		}
		if d := compareReaders("fuzz", data, opt, keep, 2); d != "" {
			t.Fatalf("columns %q (explicit %v): %s", col, explicit, d)
		}
		if d := compareReaders("fuzz", data, Options{}, nil, 0); d != "" {
			t.Fatalf("every series: %s", d)
		}
	})
}
