package dataset

import (
	"errors"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// Fixtures in testdata/ are ours (hand-made, see testdata/README.md); the
// expected values below are read off those files.
func TestParseFixtures(t *testing.T) {
	type val struct {
		series string
		row    int // 0-based data row
		want   float64
	}
	cases := []struct {
		file       string
		delim      rune
		comma      bool
		dateCol    string
		freq       string
		first      string
		last       string
		series     []string
		skipped    []string
		vals       []val
		nanAt      []val // want ignored
		warnSubstr string
	}{
		{file: "semicolon_decimal_comma.csv", delim: ';', comma: true, dateCol: "Periode", freq: Monthly,
			first: "2009-01", last: "2009-04", series: []string{"BIP", "Zins"}, skipped: []string{"Kommentar"},
			vals: []val{{"BIP", 0, 1234.5}, {"BIP", 1, 1250.75}, {"Zins", 2, -0.25}, {"Zins", 3, 0.75}}},
		{file: "pasted_bom_crlf.tsv", delim: '\t', dateCol: "date", freq: Daily,
			first: "2009-03-16", last: "2009-03-23", series: []string{"gdp", "cpi"},
			vals:  []val{{"gdp", 0, 100.5}, {"gdp", 5, 104.25}, {"cpi", 5, 2.25}},
			nanAt: []val{{"cpi", 1, 0}}},
		{file: "quarterly.csv", delim: ',', dateCol: "quarter", freq: Quarterly,
			first: "2008Q3", last: "2009Q3", series: []string{"gdp", "inflation, %"},
			vals: []val{{"gdp", 0, 100.1}, {"inflation, %", 0, 2345.5}, {"inflation, %", 4, 0.7}}},
		{file: "quarterly_colon.csv", delim: ';', comma: true, dateCol: "obs", freq: Quarterly,
			first: "2009Q1", last: "2010Q1", series: []string{"y"},
			vals: []val{{"y", 0, 1.5}, {"y", 4, 1.9}}},
		{file: "missing_markers.csv", delim: ',', dateCol: "year", freq: Annual,
			first: "1990", last: "1999", series: []string{"x", "y"},
			vals:  []val{{"x", 9, 2.5}, {"y", 0, 1}},
			nanAt: []val{{"x", 0, 0}, {"x", 1, 0}, {"x", 2, 0}, {"x", 3, 0}, {"x", 4, 0}, {"x", 5, 0}, {"x", 6, 0}, {"x", 7, 0}, {"x", 8, 0}}},
		{file: "bad_cells.csv", delim: ',', dateCol: "date", freq: Monthly,
			first: "2000-01", last: "2000-04", series: []string{"good"}, skipped: []string{"text", "malformed"},
			vals: []val{{"good", 3, 1.8}}, warnSubstr: `line 4, column 4 ("malformed")`},
	}
	for _, c := range cases {
		t.Run(c.file, func(t *testing.T) {
			tb, err := ReadFile(filepath.Join("testdata", c.file), nil)
			if err != nil {
				t.Fatal(err)
			}
			if tb.Delimiter != c.delim || tb.DecimalComma != c.comma {
				t.Errorf("delimiter %q comma %v, want %q %v", tb.Delimiter, tb.DecimalComma, c.delim, c.comma)
			}
			if tb.DateColumn != c.dateCol || tb.Frequency != c.freq {
				t.Errorf("date column %q freq %q, want %q %q", tb.DateColumn, tb.Frequency, c.dateCol, c.freq)
			}
			if len(tb.Dates) != tb.Rows || tb.Dates[0] != c.first || tb.Dates[len(tb.Dates)-1] != c.last {
				t.Errorf("dates %v, want %s..%s", tb.Dates, c.first, c.last)
			}
			var names []string
			byName := map[string]Series{}
			for _, s := range tb.Series {
				names = append(names, s.Name)
				byName[s.Name] = s
				if len(s.Values) != tb.Rows || &s.Dates[0] != &tb.Dates[0] || s.Frequency != tb.Frequency {
					t.Errorf("series %s not aligned with the table", s.Name)
				}
			}
			if strings.Join(names, "|") != strings.Join(c.series, "|") {
				t.Errorf("series %v, want %v", names, c.series)
			}
			var sk []string
			for _, s := range tb.Skipped {
				sk = append(sk, s.ColumnName)
				if s.Row == 0 || s.Column == 0 || !errors.Is(s, ErrBadNumber) {
					t.Errorf("skipped column without position: %v", s)
				}
			}
			if strings.Join(sk, "|") != strings.Join(c.skipped, "|") {
				t.Errorf("skipped %v, want %v", sk, c.skipped)
			}
			for _, v := range c.vals {
				if got := byName[v.series].Values[v.row]; math.Abs(got-v.want) > 1e-12 {
					t.Errorf("%s[%d] = %v, want %v", v.series, v.row, got, v.want)
				}
			}
			for _, v := range c.nanAt {
				if got := byName[v.series].Values[v.row]; !math.IsNaN(got) {
					t.Errorf("%s[%d] = %v, want missing", v.series, v.row, got)
				}
			}
			if c.warnSubstr != "" && !strings.Contains(strings.Join(tb.Messages(), "\n"), c.warnSubstr) {
				t.Errorf("warnings %q lack %q", tb.Messages(), c.warnSubstr)
			}
		})
	}
}

// The project's open data (vega-datasets 3.2.1, see /testdata/README.md); the
// expected numbers are the first and last rows of each file.
func TestParseOpenData(t *testing.T) {
	cases := []struct {
		file, dateCol, first, last string
		rows, nseries              int
		series                     string
		v0, vN                     float64
	}{
		{"sp500.csv", "date", "2000-01", "2010-03", 123, 1, "price", 1394.46, 1140.45},
		{"us-employment.csv", "month", "2006-01", "2015-12", 120, 23, "nonfarm", 135450, 143093},
	}
	for _, c := range cases {
		tb, err := ReadFile(filepath.Join("..", "..", "testdata", c.file), nil)
		if err != nil {
			t.Fatal(err)
		}
		if tb.Rows != c.rows || len(tb.Series) != c.nseries || tb.DateColumn != c.dateCol || tb.Frequency != Monthly {
			t.Errorf("%s: rows %d series %d date column %q freq %q", c.file, tb.Rows, len(tb.Series), tb.DateColumn, tb.Frequency)
		}
		if tb.Dates[0] != c.first || tb.Dates[tb.Rows-1] != c.last {
			t.Errorf("%s: dates %s..%s", c.file, tb.Dates[0], tb.Dates[tb.Rows-1])
		}
		s := tb.Series[0]
		if s.Name != c.series || s.Values[0] != c.v0 || s.Values[tb.Rows-1] != c.vN {
			t.Errorf("%s: %s = %v..%v", c.file, s.Name, s.Values[0], s.Values[tb.Rows-1])
		}
		if len(tb.Messages()) != 0 {
			t.Errorf("%s: warnings %v", c.file, tb.Messages())
		}
	}
}

// Date forms: common practice, no source (the forms analysts' files use).
func TestParseDate(t *testing.T) {
	cases := []struct {
		in    string
		ok    bool
		k     kind
		label string
	}{
		{"1990", true, kYear, "1990"},
		{"2009Q1", true, kQuarter, "2009Q1"},
		{"2009q4", true, kQuarter, "2009Q4"},
		{"2009-Q2", true, kQuarter, "2009Q2"},
		{"2009 Q3", true, kQuarter, "2009Q3"},
		{"2009.Q3", true, kQuarter, "2009Q3"},
		{"Q1 2009", true, kQuarter, "2009Q1"},
		{"Q4-2009", true, kQuarter, "2009Q4"},
		{"2009Q5", false, 0, ""},
		{"2009-03", true, kMonth, "2009-03"},
		{"2009-3", true, kMonth, "2009-03"},
		{"2009M03", true, kMonth, "2009-03"},
		{"2009m3", true, kMonth, "2009-03"},
		{"2009/03", true, kMonth, "2009-03"},
		{"03/2009", true, kMonth, "2009-03"},
		{"Mar 2009", true, kMonth, "2009-03"},
		{"March 2009", true, kMonth, "2009-03"},
		{"mar-2009", true, kMonth, "2009-03"},
		{"2009-Mar", true, kMonth, "2009-03"},
		{"2009-13", false, 0, ""},
		{"2009-03-17", true, kDay, "2009-03-17"},
		{"2009/03/17", true, kDay, "2009-03-17"},
		{"17.03.2009", true, kDay, "2009-03-17"},
		{"Jan 1 2000", true, kDay, "2000-01-01"},
		{"January 1, 2000", true, kDay, "2000-01-01"},
		{"1 Jan 2000", true, kDay, "2000-01-01"},
		{"17-Mar-2009", true, kDay, "2009-03-17"},
		{"2009-03-17T00:00:00Z", true, kDay, "2009-03-17"},
		{"2009-03-17 00:00", true, kDay, "2009-03-17"},
		{"2009-03-17T06:00:00Z", false, 0, ""},
		{"2009-02-29", false, 0, ""},
		{"2008-02-29", true, kDay, "2008-02-29"},
		{"2009:1", true, kColon, ""},
		{"1.5", false, 0, ""},
		{"1394.46", false, 0, ""},
		{"2009.5", false, 0, ""},
		{"12345", false, 0, ""},
		{"0999", false, 0, ""},
		{"abc", false, 0, ""},
		{"", false, 0, ""},
		{"1,234.5", false, 0, ""},
		{"1.234.567", false, 0, ""},
	}
	for _, c := range cases {
		v, ok := parseDate(c.in)
		if ok != c.ok || (ok && v.k != c.k) || (ok && c.label != "" && label(v) != c.label) {
			t.Errorf("parseDate(%q) = %+v %v (label %q), want ok=%v kind %d %q", c.in, v, ok, label(v), c.ok, c.k, c.label)
		}
	}
}

// Frequency detection from whole columns: common practice, no source.
func TestParseDatesFrequency(t *testing.T) {
	cases := []struct {
		name   string
		cells  []string
		freq   string
		labels string // first|last
		warn   bool
	}{
		{"annual", []string{"2000", "2001", "2002"}, Annual, "2000|2002", false},
		{"annual gap", []string{"2000", "2001", "2003"}, Annual, "2000|2003", false},
		{"quarterly", []string{"2000Q4", "2001Q1"}, Quarterly, "2000Q4|2001Q1", false},
		{"colon quarterly", []string{"2000:3", "2000:4", "2001:1"}, Quarterly, "2000Q3|2001Q1", false},
		{"colon monthly", []string{"2000:11", "2000:12", "2001:01"}, Monthly, "2000-11|2001-01", false},
		{"monthly", []string{"2000-11", "2000-12", "2001-01"}, Monthly, "2000-11|2001-01", false},
		{"first of month", []string{"Jan 1 2000", "Feb 1 2000", "Mar 1 2000"}, Monthly, "2000-01|2000-03", false},
		{"month ends", []string{"2000-01-31", "2000-02-29", "2000-03-31"}, Monthly, "2000-01|2000-03", false},
		{"first of quarter", []string{"2000-01-01", "2000-04-01", "2000-07-01"}, Quarterly, "2000Q1|2000Q3", false},
		{"quarter ends", []string{"2000-03-31", "2000-06-30", "2000-09-30"}, Quarterly, "2000Q1|2000Q3", false},
		{"yearly days", []string{"2000-07-01", "2001-07-01"}, Annual, "2000|2001", false},
		{"weekly", []string{"2009-03-02", "2009-03-09", "2009-03-16"}, Weekly, "2009-03-02|2009-03-16", false},
		{"calendar daily", []string{"2009-03-06", "2009-03-07", "2009-03-08", "2009-03-09"}, Daily, "2009-03-06|2009-03-09", false},
		{"business daily", []string{"2009-03-05", "2009-03-06", "2009-03-09", "2009-03-10"}, Daily, "2009-03-05|2009-03-10", false},
		{"irregular days", []string{"2009-03-05", "2009-03-21", "2009-04-02"}, Irregular, "2009-03-05|2009-04-02", true},
		{"monthly gap", []string{"2009-01", "2009-02", "2009-05"}, Monthly, "2009-01|2009-05", false},
		{"dotted", []string{"16.03.2009", "17.03.2009", "18.03.2009"}, Daily, "2009-03-16|2009-03-18", false},
	}
	for _, c := range cases {
		dc, e := parseDates(c.cells, dateOpts{})
		if e != nil {
			t.Errorf("%s: %v at %d", c.name, e.err, e.i)
			continue
		}
		got := dc.labels[0] + "|" + dc.labels[len(dc.labels)-1]
		if dc.freq != c.freq || got != c.labels || (dc.warn != "") != c.warn {
			t.Errorf("%s: freq %q labels %s warn %q, want %q %s warn=%v", c.name, dc.freq, got, dc.warn, c.freq, c.labels, c.warn)
		}
	}
	bad := []struct {
		name  string
		cells []string
		at    int
		err   error
	}{
		{"decreasing", []string{"2000Q1", "2000Q3", "2000Q2"}, 2, ErrDateOrder},
		{"repeated", []string{"2000-01", "2000-01"}, 1, ErrDateOrder},
		{"mixed forms", []string{"2000", "2000Q2"}, 1, ErrBadDate},
		{"not a date", []string{"2000-01", "x"}, 1, ErrBadDate},
		{"missing", []string{"2000-01", ""}, 1, ErrBadDate},
	}
	for _, c := range bad {
		_, e := parseDates(c.cells, dateOpts{})
		if e == nil || e.i != c.at || !errors.Is(e.err, c.err) {
			t.Errorf("%s: got %+v, want %v at %d", c.name, e, c.err, c.at)
		}
	}
}

// Every missing marker of the documented list, in any case.
func TestIsMissing(t *testing.T) {
	for _, m := range append(MissingMarkers, "", "  ", "na", "n/a", "NAN", "nan", "#n/a", "NULL", " . ", "\u00a0") {
		if !IsMissing(m) {
			t.Errorf("IsMissing(%q) = false", m)
		}
	}
	for _, m := range []string{"0", "NAs", "--", "none", "1", "n"} {
		if IsMissing(m) {
			t.Errorf("IsMissing(%q) = true", m)
		}
	}
}

// Number forms under each decimal mark: common practice, no source.
func TestParseNumber(t *testing.T) {
	cases := []struct {
		in   string
		dec  decimal
		ok   bool
		want float64
	}{
		{"1.5", decPoint, true, 1.5},
		{"-0.25", decPoint, true, -0.25},
		{"+3", decPoint, true, 3},
		{"1e3", decPoint, true, 1000},
		{"1.5E-2", decPoint, true, 0.015},
		{".5", decPoint, true, 0.5},
		{" 42 ", decPoint, true, 42},
		{"1,234.5", decPoint, true, 1234.5},
		{"1,234,567", decPoint, true, 1234567},
		{"1 234.5", decPoint, true, 1234.5},
		{"1\u00a0234.5", decPoint, true, 1234.5},
		{"1'234.5", decPoint, true, 1234.5},
		{"12,34.5", decPoint, false, 0},
		{"1,5", decPoint, false, 0},
		{"1,5", decComma, true, 1.5},
		{"-0,25", decComma, true, -0.25},
		{"1.234,5", decComma, true, 1234.5},
		{"1.234.567,89", decComma, true, 1234567.89},
		{"1 234,5", decComma, true, 1234.5},
		{"1,5e3", decComma, true, 1500},
		{"1.5", decComma, false, 0},
		{"0x1p3", decPoint, false, 0},
		{"Inf", decPoint, false, 0},
		{"NaN", decPoint, false, 0},
		{"1e999", decPoint, false, 0},
		{"1.2.3", decPoint, false, 0},
		{"abc", decPoint, false, 0},
		{"1e", decPoint, false, 0},
		{"-", decPoint, false, 0},
		{"5%", decPoint, false, 0},
		{"1_000", decPoint, false, 0},
	}
	for _, c := range cases {
		v, ok := parseNumber(c.in, c.dec)
		if ok != c.ok || (ok && math.Abs(v-c.want) > 1e-12*math.Abs(c.want)) {
			t.Errorf("parseNumber(%q, %d) = %v %v, want %v %v", c.in, c.dec, v, ok, c.want, c.ok)
		}
	}
}

// Decimal-mark detection over whole files: common practice, no source.
func TestDecimalDetection(t *testing.T) {
	cases := []struct {
		name  string
		data  string
		comma bool
		want  float64 // first value of column y
		warn  bool
	}{
		{"semicolon comma", "t;y\n1;1,5\n2;2,5\n", true, 1.5, false},
		{"semicolon point", "t;y\n1;1.5\n2;2.5\n", false, 1.5, false},
		{"semicolon grouped comma", "t;y\n1;1.234,5\n2;2.000\n", true, 1234.5, false},
		{"semicolon ambiguous", "t;y\n1;1,234\n2;2\n", true, 1.234, true},
		{"tab ambiguous", "t\ty\n1\t1,234\n2\t2\n", false, 1234, true},
		{"tab comma", "t\ty\n1\t0,5\n2\t2\n", true, 0.5, false},
		{"tab point grouped", "t\ty\n1\t1,234.5\n2\t2\n", false, 1234.5, false},
		{"mixed marks", "d;x;y\n2001;1;1,5\n2002;3;2,5\n2003;2;3.5\n", true, 1.5, true},
		{"one pasted column, comma", "y\n1,5\n2,25\n", true, 1.5, false},
		{"one column, point", "y\n1.5\n2.25\n", false, 1.5, false},
	}
	for _, c := range cases {
		tb, err := Parse("x", []byte(c.data), nil)
		if c.name == "mixed marks" {
			// 3.5 is then not a number with a decimal comma: column skipped.
			if err != nil || len(tb.Skipped) != 1 || tb.Skipped[0].ColumnName != "y" || tb.Skipped[0].Row != 4 || !strings.Contains(tb.Messages()[0], "mix") {
				t.Errorf("%s: err %v table %+v", c.name, err, tb)
			}
			continue
		}
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		y := tb.Series[len(tb.Series)-1]
		guessed := false
		for _, n := range tb.Notes {
			guessed = guessed || n.Kind == "decimal-mark" && (strings.Contains(n.Message, "either") || strings.Contains(n.Message, "mix"))
		}
		if tb.DecimalComma != c.comma || y.Values[0] != c.want || guessed != c.warn {
			t.Errorf("%s: comma %v y0 %v warnings %q", c.name, tb.DecimalComma, y.Values[0], tb.Messages())
		}
	}
}

// Delimiters, line ends, BOM and quoting: common practice (RFC 4180 quoting).
func TestParseLayout(t *testing.T) {
	cases := []struct {
		name string
		data string
		opt  *Options
		rows int
		y    []float64
	}{
		{"LF", "d,y\n2000,1\n2001,2\n", nil, 2, []float64{1, 2}},
		{"CRLF", "d,y\r\n2000,1\r\n2001,2\r\n", nil, 2, []float64{1, 2}},
		{"CR", "d,y\r2000,1\r2001,2\r", nil, 2, []float64{1, 2}},
		{"BOM", "\xEF\xBB\xBFd,y\n2000,1\n2001,2", nil, 2, []float64{1, 2}},
		{"blank lines", "\n\nd,y\n\n2000,1\n  \n2001,2\n\n", nil, 2, []float64{1, 2}},
		{"quoted", "\"d\",\"y\"\n\"2000\",\"1\"\n2001,\"2\"\n", nil, 2, []float64{1, 2}},
		{"quoted newline", "d,\"y\nline\"\n2000,1\n2001,2\n", nil, 2, []float64{1, 2}},
		{"pipe", "d|y\n2000|1\n2001|2\n", nil, 2, []float64{1, 2}},
		{"forced", "d;y\n2000;1\n2001;2\n", &Options{Delimiter: ';'}, 2, []float64{1, 2}},
		{"short row", "d,y,z\n2000,1,5\n2001,2\n", nil, 2, []float64{1, 2}},
		{"spaces", "d , y\n 2000 , 1 \n2001, 2\n", nil, 2, []float64{1, 2}},
	}
	for _, c := range cases {
		tb, err := Parse(c.name, []byte(c.data), c.opt)
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		if tb.Rows != c.rows || tb.Frequency != Annual || len(tb.Series) == 0 {
			t.Errorf("%s: rows %d freq %q series %d", c.name, tb.Rows, tb.Frequency, len(tb.Series))
			continue
		}
		y := tb.Series[0].Values
		if len(y) != len(c.y) || y[0] != c.y[0] || y[1] != c.y[1] {
			t.Errorf("%s: y = %v", c.name, y)
		}
	}
	tb, err := Parse("q", []byte("id,note,v\n1,\"he said \"\"hi\"\"\",2\n2,x,3\n"), nil)
	if err != nil || len(tb.Skipped) != 1 || tb.Skipped[0].Value != `he said "hi"` {
		t.Errorf("escaped quotes: %v %+v", err, tb)
	}
}

// Errors carry the sentinel and the position.
func TestParseErrors(t *testing.T) {
	cases := []struct {
		name     string
		data     string
		opt      *Options
		err      error
		row, col int
	}{
		{"empty", "", nil, ErrNoHeader, 0, 0},
		{"no header", "2000,1.5\n2001,1.6\n", nil, ErrNoHeader, 1, 0},
		{"header only", "d,y\n", nil, ErrNoSeries, 1, 0},
		{"no numeric column", "d,y\n2000,a\n2001,b\n", nil, ErrNoSeries, 1, 0},
		{"dates not increasing", "date,y\n2000-01,1\n2000-03,2\n2000-02,3\n", nil, ErrDateOrder, 4, 1},
		{"unknown date column", "d,y\n2000,1\n", &Options{DateColumn: "when"}, ErrUnknownColumn, 1, 0},
		{"bad explicit date", "when,y\n2000,1\nsoon,2\n", &Options{DateColumn: "when"}, ErrBadDate, 3, 1},
		{"unknown column", "d,y\n2000,1\n", &Options{Columns: []string{"z"}}, ErrUnknownColumn, 1, 0},
		{"requested text column", "d,y,z\n2000,1,2\n2001,2,oops\n", &Options{Columns: []string{"y", "z"}}, ErrBadNumber, 3, 3},
		{"requested date column", "d,y\n2000,1\n2001,2\n", &Options{Columns: []string{"d"}}, ErrBadNumber, 1, 1},
		{"bad delimiter", "d,y\n", &Options{Delimiter: '€'}, ErrBadNumber, 0, 0},
	}
	for _, c := range cases {
		_, err := Parse("f.csv", []byte(c.data), c.opt)
		var pe *ParseError
		if !errors.Is(err, c.err) || !errors.As(err, &pe) {
			t.Errorf("%s: err %v, want %v", c.name, err, c.err)
			continue
		}
		if pe.Row != c.row || pe.Column != c.col || pe.File != "f.csv" {
			t.Errorf("%s: position line %d column %d, want %d %d (%v)", c.name, pe.Row, pe.Column, c.row, c.col, err)
		}
	}
}

// Columns picks and orders series; the date column is found by name or form.
func TestParseColumnsAndDateDetection(t *testing.T) {
	data := "x,when,a,b\n5,2001Q1,1,2\n6,2001Q2,3,4\n"
	tb, err := Parse("p", []byte(data), &Options{Columns: []string{"B", "a"}})
	if err != nil {
		t.Fatal(err)
	}
	if tb.DateColumn != "when" || tb.Series[0].Name != "b" || tb.Series[1].Name != "a" || tb.Series[0].Column != 4 {
		t.Errorf("got %+v", tb)
	}
	// Years only count as dates by name or as the first column counting up.
	for _, c := range []struct {
		data, dateCol string
	}{
		{"price,y\n2001,1\n2002,2\n", "price"},
		{"price,y\n2001,1\n2005,2\n", ""},
		{"y,price\n1,2001\n2,2002\n", ""},
		{"y,Year\n5,2001\n3,2002\n", "Year"},
		{"v,observation_date\n4,2001-01-01\n2,2001-01-02\n", "observation_date"},
	} {
		tb, err := Parse("p", []byte(c.data), nil)
		if err != nil {
			t.Errorf("%q: %v", c.data, err)
			continue
		}
		if tb.DateColumn != c.dateCol {
			t.Errorf("%q: date column %q err %v, want %q", c.data, tb.DateColumn, err, c.dateCol)
		}
	}
}

func TestReadFileMissing(t *testing.T) {
	if _, err := ReadFile(filepath.Join(t.TempDir(), "none.csv"), nil); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("err %v", err)
	}
}
