// Date columns as analysts' exports write them: day/month/year and
// month/day/year decided from the whole column, month names, year-month and
// year-quarter integers, quarterly forms, end-of-period daily dates, and the
// errors that name the offending row. The forms are common practice (no
// outside source); the expected labels are read off the cells by hand.
package dataset

import (
	"errors"
	"strings"
	"testing"
)

func TestDateColumns(t *testing.T) {
	cases := []struct {
		name   string
		data   string
		opt    *Options
		freq   string
		labels string // first|last
		note   string // substring of a date-format or date-period note, "" none
	}{
		{"mdy slashes", "date,y\n01/31/2005,1\n02/28/2005,2\n03/31/2005,3\n", nil, Monthly, "2005-01|2005-03", "month/day/year"},
		{"dmy slashes", "date,y\n31/01/2005,1\n28/02/2005,2\n31/03/2005,3\n", nil, Monthly, "2005-01|2005-03", "day/month/year"},
		{"dmy dashes daily", "date,y\n13-01-2005,1\n14-01-2005,2\n15-01-2005,3\n", nil, Daily, "2005-01-13|2005-01-15", "day/month/year"},
		{"mdy dots", "date,y\n01.13.2005,1\n01.14.2005,2\n", nil, Daily, "2005-01-13|2005-01-14", "month/day/year"},
		{"ambiguous decided by regularity", "date,y\n01/02/2005,1\n01/03/2005,2\n01/04/2005,3\n01/05/2005,4\n01/06/2005,5\n01/07/2005,6\n01/08/2005,7\n01/09/2005,8\n01/10/2005,9\n01/11/2005,10\n01/12/2005,11\n01/01/2006,12\n01/02/2006,13\n",
			nil, Monthly, "2005-02|2006-02", "only order that gives regular dates"},
		{"forced dmy", "date,y\n01/02/2005,1\n02/02/2005,2\n", &Options{DateFormat: "dmy"}, Daily, "2005-02-01|2005-02-02", ""},
		{"forced mdy", "date,y\n01/02/2005,1\n01/03/2005,2\n", &Options{DateFormat: "mdy"}, Daily, "2005-01-02|2005-01-03", ""},
		{"Jan-05", "month,y\nJan-05,1\nFeb-05,2\nMar-05,3\n", nil, Monthly, "2005-01|2005-03", ""},
		{"Jan-99 to Feb-00", "month,y\nNov-99,1\nDec-99,2\nJan-00,3\n", nil, Monthly, "1999-11|2000-01", ""},
		{"Jan-50 to 2020", "month,y\nDec-50,1\nDec-51,2\nDec-20,3\n", &Options{}, Annual, "1950|2020", ""},
		{"Jan 2005", "d,y\nJan 2005,1\nFeb 2005,2\n", nil, Monthly, "2005-01|2005-02", ""},
		{"January 2005", "d,y\nJanuary 2005,1\nFebruary 2005,2\n", nil, Monthly, "2005-01|2005-02", ""},
		{"2005-Jan", "d,y\n2005-Jan,1\n2005-Feb,2\n", nil, Monthly, "2005-01|2005-02", ""},
		{"Jan 1 2000 (the S&P file's form)", "date,price\nJan 1 2000,1394.46\nFeb 1 2000,1366.42\n", nil, Monthly, "2000-01|2000-02", ""},
		{"yyyymm in a date column", "period,y\n200511,1\n200512,2\n200601,3\n", nil, Monthly, "2005-11|2006-01", ""},
		{"yyyyq in a date column", "date,y\n20053,1\n20054,2\n20061,3\n", nil, Quarterly, "2005Q3|2006Q1", ""},
		{"yyyymmdd in a date column", "date,y\n20050103,1\n20050104,2\n", nil, Daily, "2005-01-03|2005-01-04", ""},
		{"yyyymm forced", "when,y\n200511,1\n200512,2\n", &Options{DateFormat: "yyyymm"}, Monthly, "2005-11|2005-12", ""},
		{"2005Q1", "q,y\n2005Q1,1\n2005Q2,2\n", nil, Quarterly, "2005Q1|2005Q2", ""},
		{"Q1 2005", "q,y\nQ4 2005,1\nQ1 2006,2\n", nil, Quarterly, "2005Q4|2006Q1", ""},
		{"2005-Q1", "q,y\n2005-Q1,1\n2005-Q2,2\n", nil, Quarterly, "2005Q1|2005Q2", ""},
		{"2005:1", "q,y\n2005:1,1\n2005:2,2\n2005:3,3\n", nil, Quarterly, "2005Q1|2005Q3", ""},
		{"quarter ends", "date,y\n2005-03-31,1\n2005-06-30,2\n2005-09-30,3\n", nil, Quarterly, "2005Q1|2005Q3", "last day"},
		{"month ends mdy", "date,y\n1/31/2005,1\n2/28/2005,2\n3/31/2005,3\n", nil, Monthly, "2005-01|2005-03", "last day"},
		{"mid-month", "date,y\n2005-01-15,1\n2005-02-15,2\n2005-03-15,3\n", nil, Monthly, "2005-01|2005-03", "day 15"},
	}
	for _, c := range cases {
		tb, err := Parse(c.name, []byte(c.data), c.opt)
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		if tb.Dates == nil {
			t.Errorf("%s: no date column (notes %q)", c.name, tb.Messages())
			continue
		}
		got := tb.Dates[0] + "|" + tb.Dates[len(tb.Dates)-1]
		if tb.Frequency != c.freq || got != c.labels {
			t.Errorf("%s: %s %s, want %s %s", c.name, tb.Frequency, got, c.freq, c.labels)
		}
		if c.note != "" && !strings.Contains(strings.Join(tb.Messages(), "\n"), c.note) {
			t.Errorf("%s: notes %q lack %q", c.name, tb.Messages(), c.note)
		}
	}
}

func TestDateColumnErrors(t *testing.T) {
	cases := []struct {
		name string
		data string
		opt  *Options
		err  error
		row  int
		text string
	}{
		{"ambiguous", "date,y\n01/02/2005,1\n02/03/2005,2\n", nil, ErrAmbiguousDate, 2, "date_format"},
		{"mixed orders", "date,y\n13/01/2005,1\n01/14/2005,2\n", nil, ErrBadDate, 3, "mixes"},
		{"forced order contradicted", "date,y\n01/02/2005,1\n01/13/2005,2\n", &Options{DateFormat: "dmy"}, ErrBadDate, 3, "dmy"},
		{"one daily among monthly", "date,y\n2005-01,1\n2005-02,2\n2005-03,3\n2005-04-17,4\n2005-05,5\n", nil, ErrBadDate, 5, "a daily date among monthly dates"},
		{"one daily among monthly, unnamed column", "when,y\n2005-01,1\n2005-02,2\n2005-03-17,3\n2005-04,4\n", nil, ErrBadDate, 4, "daily date"},
		{"unparsable cell lists the forms", "date,y\n2005-01,1\nsoon,2\n2005-03,3\n", nil, ErrBadDate, 3, "accepted forms"},
		{"bad date format setting", "date,y\n2005-01,1\n", &Options{DateFormat: "ddmmyy"}, ErrBadDate, 0, "want one of"},
	}
	for _, c := range cases {
		_, err := Parse("f.csv", []byte(c.data), c.opt)
		var pe *ParseError
		if !errors.Is(err, c.err) || !errors.As(err, &pe) {
			t.Errorf("%s: err %v, want %v", c.name, err, c.err)
			continue
		}
		if pe.Row != c.row || !strings.Contains(err.Error(), c.text) {
			t.Errorf("%s: line %d, %v; want line %d and %q", c.name, pe.Row, err, c.row, c.text)
		}
	}
}

// Years: whole numbers are years only in 1800-2200, and only counting up by
// one unless the column is named like a date (the documented rule).
func TestYearRule(t *testing.T) {
	cases := []struct {
		name, data, dateCol, note string
		series                    int
	}{
		{"obs 1000..", "obs,y\n1000,5\n1001,6\n1002,4\n", "", "index", 1},
		{"year with a gap", "year,y\n2000,5\n2001,6\n2003,4\n", "year", "gap", 1},
		{"first column counting up", "x,y\n1990,5\n1991,6\n1992,4\n", "x", "", 1},
		{"first column not counting up", "x,y\n1990,5\n1992,6\n1993,4\n", "", "not read as years", 2},
		{"old years named", "year,y\n1500,5\n1501,6\n", "", "outside 1800-2200", 1},
	}
	for _, c := range cases {
		tb, err := Parse(c.name, []byte(c.data), nil)
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		if tb.DateColumn != c.dateCol || len(tb.Series) != c.series {
			t.Errorf("%s: date column %q, %d series; want %q, %d (notes %q)", c.name, tb.DateColumn, len(tb.Series), c.dateCol, c.series, tb.Messages())
		}
		if c.note != "" && !strings.Contains(strings.Join(tb.Messages(), "\n"), c.note) {
			t.Errorf("%s: notes %q lack %q", c.name, tb.Messages(), c.note)
		}
	}
	// An explicit date column reads any 4-digit years.
	tb, err := Parse("old", []byte("year,y\n1500,5\n1501,6\n"), &Options{DateColumn: "year"})
	if err != nil || tb.Frequency != Annual || tb.Dates[0] != "1500" {
		t.Errorf("explicit old years: %v %+v", err, tb)
	}
}
