package dataset

import (
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/rootshift/rootshift/core/schema"
)

func mustParse(t *testing.T, data string) *Table {
	t.Helper()
	tb, err := Parse("t.csv", []byte(data), nil)
	if err != nil {
		t.Fatal(err)
	}
	return tb
}

// Transform definitions: common practice, no source (log, first and second
// differences).
func TestTransform(t *testing.T) {
	y := []float64{1, 2, 4, 8}
	l2 := math.Log(2)
	cases := []struct {
		kind string
		want []float64
	}{
		{"", []float64{1, 2, 4, 8}},
		{"log", []float64{0, l2, 2 * l2, 3 * l2}},
		{"diff", []float64{1, 2, 4}},
		{"diff2", []float64{1, 2}},
		{"logdiff", []float64{l2, l2, l2}},
	}
	for _, c := range cases {
		got, err := Transform(nil, y, c.kind)
		if err != nil || len(got) != len(c.want) {
			t.Errorf("%q: %v %v", c.kind, got, err)
			continue
		}
		for i := range got {
			if math.Abs(got[i]-c.want[i]) > 1e-15 {
				t.Errorf("%q[%d] = %v, want %v", c.kind, i, got[i], c.want[i])
			}
		}
	}
	var se *SeriesError
	if _, err := Transform(nil, []float64{1, 0, 3}, "log"); !errors.As(err, &se) || se.Row != 2 || !errors.Is(err, ErrNonPositive) {
		t.Errorf("log(0): %v", err)
	}
	if _, err := Transform(nil, y, "sqrt"); !errors.Is(err, ErrBadTransform) {
		t.Errorf("sqrt: %v", err)
	}
	if got, _ := Transform(nil, []float64{1}, "diff2"); len(got) != 0 {
		t.Errorf("diff2 of one value: %v", got)
	}
	// dst is reused without allocation.
	dst := make([]float64, 4)
	if a := testing.AllocsPerRun(100, func() { dst, _ = Transform(dst, y, "logdiff") }); a != 0 {
		t.Errorf("Transform allocates %v times", a)
	}
}

const quarterlyData = `date,gdp,cpi,text
2000Q1,100,NA,a
2000Q2,101,1.0,b
2000Q3,103,1.1,c
2000Q4,106,,d
2001Q1,110,1.3,e
2001Q2,115,1.4,f
2001Q3,121,NA,g
`

// Select: common practice, no source; expected values are read off the data above.
func TestSelect(t *testing.T) {
	tb := mustParse(t, quarterlyData)
	cases := []struct {
		name   string
		s      schema.Settings
		series string // series returned, "|"-joined
		first  string // dates of the first series, first|last
		vals   []float64
		errs   string // "|"-joined error series names
		errIs  error
		errRow int
	}{
		{name: "all", s: schema.Settings{}, series: "gdp", first: "2000Q1|2001Q3",
			vals: []float64{100, 101, 103, 106, 110, 115, 121}, errs: "cpi", errIs: ErrInteriorMissing, errRow: 4},
		{name: "range by dates", s: schema.Settings{From: "2000Q2", To: "2001Q1"}, series: "gdp", first: "2000Q2|2001Q1",
			vals: []float64{101, 103, 106, 110}, errs: "cpi", errIs: ErrInteriorMissing, errRow: 4},
		{name: "range excludes gap", s: schema.Settings{From: "2001Q1"}, series: "gdp|cpi", first: "2001Q1|2001Q3",
			vals: []float64{110, 115, 121}},
		{name: "range by numbers", s: schema.Settings{From: "5", To: "6"}, series: "gdp|cpi", first: "2001Q1|2001Q2",
			vals: []float64{110, 115}},
		{name: "year spans quarters", s: schema.Settings{From: "2001", To: "2001", Columns: []string{"gdp"}}, series: "gdp", first: "2001Q1|2001Q3",
			vals: []float64{110, 115, 121}},
		{name: "month inside a quarter", s: schema.Settings{From: "2000-05", To: "2000-12-31", Columns: []string{"gdp"}}, series: "gdp", first: "2000Q2|2000Q4",
			vals: []float64{101, 103, 106}},
		{name: "diff drops first date", s: schema.Settings{Columns: []string{"gdp"}, Transform: "diff"}, series: "gdp", first: "2000Q2|2001Q3",
			vals: []float64{1, 2, 3, 4, 5, 6}},
		{name: "diff2", s: schema.Settings{Columns: []string{"gdp"}, Transform: "diff2", To: "2001Q1"}, series: "gdp", first: "2000Q3|2001Q1",
			vals: []float64{1, 1, 1}},
		{name: "diff then trim leaves one value", s: schema.Settings{Columns: []string{"cpi"}, Transform: "diff", From: "2001Q1"}, series: "",
			errs: "cpi", errIs: ErrTooShort},
		{name: "unknown column", s: schema.Settings{Columns: []string{"gdp", "zzz"}}, series: "gdp", first: "2000Q1|2001Q3",
			vals: []float64{100, 101, 103, 106, 110, 115, 121}, errs: "zzz", errIs: ErrUnknownColumn},
		{name: "text column", s: schema.Settings{Columns: []string{"text"}}, errs: "text", errIs: ErrUnknownColumn},
		{name: "bad from", s: schema.Settings{From: "2009Q1"}, errs: "", errIs: ErrBadRange},
		{name: "empty range", s: schema.Settings{From: "2001Q1", To: "2000Q3"}, errs: "", errIs: ErrBadRange},
		{name: "bad transform", s: schema.Settings{Transform: "sqrt"}, errs: "", errIs: ErrBadTransform},
		{name: "other date column", s: schema.Settings{DateColumn: "text"}, errs: "", errIs: ErrUnknownColumn},
	}
	for _, c := range cases {
		got, errs := Select(tb, c.s)
		var names []string
		for _, s := range got {
			names = append(names, s.Name)
			if len(s.Dates) != len(s.Values) || (s.First >= 1 && tb.Dates[s.First-1] != s.Dates[0]) {
				t.Errorf("%s: %s dates not aligned: first %d %v", c.name, s.Name, s.First, s.Dates)
			}
		}
		if strings.Join(names, "|") != c.series {
			t.Errorf("%s: series %v, want %s", c.name, names, c.series)
		}
		if len(got) > 0 {
			s := got[0]
			if s.Dates[0]+"|"+s.Dates[len(s.Dates)-1] != c.first {
				t.Errorf("%s: dates %v, want %s", c.name, s.Dates, c.first)
			}
			if len(c.vals) > 0 && !equal(s.Values, c.vals) {
				t.Errorf("%s: values %v, want %v", c.name, s.Values, c.vals)
			}
		}
		var en []string
		for _, e := range errs {
			en = append(en, e.Series)
		}
		if c.errIs == nil && len(errs) > 0 || c.errIs != nil && (len(errs) != 1 || errs[0].Series != c.errs || !errors.Is(&errs[0], c.errIs)) {
			t.Errorf("%s: errors %v, want %v for %q", c.name, errs, c.errIs, c.errs)
		} else if c.errRow > 0 && errs[0].Row != c.errRow {
			t.Errorf("%s: error row %d, want %d (%v)", c.name, errs[0].Row, c.errRow, &errs[0])
		}
	}
	// The interior-missing error names the row and its date.
	_, errs := Select(tb, schema.Settings{Columns: []string{"cpi"}})
	if len(errs) != 1 || errs[0].Date != "2000Q4" || !strings.Contains(errs[0].Error(), "observation 4 (2000Q4)") {
		t.Errorf("interior missing: %v", errs)
	}
	// log of a non-positive value names the table row.
	tb2 := mustParse(t, "year,y\n2000,1\n2001,2\n2002,-1\n2003,4\n")
	_, errs = Select(tb2, schema.Settings{Transform: "logdiff"})
	if len(errs) != 1 || errs[0].Row != 3 || errs[0].Date != "2002" || !errors.Is(&errs[0], ErrNonPositive) {
		t.Errorf("log: %v", errs)
	}
	// Select works again on its own output (First keeps the rows).
	sub, _ := Select(tb, schema.Settings{From: "2000Q2", Columns: []string{"gdp"}})
	tb3 := &Table{Rows: tb.Rows, Dates: tb.Dates, Frequency: tb.Frequency, Series: sub}
	again, errs := Select(tb3, schema.Settings{From: "2001Q1"})
	if len(errs) != 0 || len(again) != 1 || again[0].Values[0] != 110 || again[0].First != 5 {
		t.Errorf("reselect: %+v %v", again, errs)
	}
}

func equal(a, b []float64) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if math.Abs(a[i]-b[i]) > 1e-12 {
			return false
		}
	}
	return true
}

// IndexOf: common practice, no source.
func TestIndexOf(t *testing.T) {
	monthly := []string{"1999-11", "1999-12", "2000-01", "2000-02"}
	annual := []string{"1990", "1991", "1992"}
	daily := []string{"2009-03-13", "2009-03-16", "2009-03-17"}
	quarterly := []string{"2000Q3", "2000Q4", "2001Q1"}
	cases := []struct {
		dates []string
		freq  string
		spec  string
		want  int
		err   error
	}{
		{monthly, Monthly, "2000-01", 3, nil},
		{monthly, Monthly, "Jan 2000", 3, nil},
		{monthly, Monthly, "2000M1", 3, nil},
		{monthly, Monthly, "2000-01-15", 3, nil},
		{monthly, Monthly, "2000:2", 4, nil},
		{monthly, Monthly, "2", 2, nil},
		{monthly, Monthly, "5", 0, ErrBadRange},
		{monthly, Monthly, "0", 0, ErrBadRange},
		{monthly, Monthly, "2000", 0, ErrBadRange},   // a year covers several months
		{monthly, Monthly, "2000Q1", 0, ErrBadRange}, // so does a quarter
		{monthly, Monthly, "2001-01", 0, ErrBadRange},
		{monthly, Monthly, "soon", 0, ErrBadRange},
		{annual, Annual, "1991", 2, nil},
		{annual, Annual, "2", 2, nil},
		{annual, Annual, "0002", 2, nil}, // 4 digits outside the years: an observation number
		{daily, Daily, "16.03.2009", 2, nil},
		{daily, Daily, "2009-03-14", 0, ErrBadRange},
		{quarterly, Quarterly, "2000:4", 2, nil},
		{quarterly, Quarterly, "Q1 2001", 3, nil},
		{quarterly, Quarterly, "2000-11", 2, nil},
		{nil, "", "7", 7, nil},
		{nil, "", "2000Q1", 0, ErrBadRange},
		{monthly, Monthly, "", 0, ErrBadRange},
	}
	for _, c := range cases {
		got, err := IndexOf(c.dates, c.freq, c.spec)
		if got != c.want || !errors.Is(err, c.err) || (c.err == nil) != (err == nil) {
			t.Errorf("IndexOf(%v, %q) = %d %v, want %d %v", c.dates, c.spec, got, err, c.want, c.err)
		}
	}
	// Range ends snap to the dates present.
	if i, err := resolve(3, daily, Daily, "2009-03-14", atOrAfter); i != 2 || err != nil {
		t.Errorf("from Saturday: %d %v", i, err)
	}
	if i, err := resolve(3, daily, Daily, "2009-03-15", atOrBefore); i != 1 || err != nil {
		t.Errorf("to Sunday: %d %v", i, err)
	}
	if i, err := resolve(3, daily, Daily, "2009-03", atOrBefore); i != 3 || err != nil {
		t.Errorf("to March: %d %v", i, err)
	}
	// A year before the data starts the range at the first observation.
	if i, err := resolve(3, annual, Annual, "1980", atOrAfter); i != 1 || err != nil {
		t.Errorf("from 1980: %d %v", i, err)
	}
	if _, err := resolve(3, annual, Annual, "1980", exact); !errors.Is(err, ErrBadRange) {
		t.Errorf("exact 1980: %v", err)
	}
}

// Leading and trailing missing values are trimmed after the transform.
func TestSelectTrim(t *testing.T) {
	tb := mustParse(t, "year,y\n2000,NA\n2001,1\n2002,3\n2003,6\n2004,\n")
	got, errs := Select(tb, schema.Settings{Transform: "diff"})
	if len(errs) != 0 || len(got) != 1 || !equal(got[0].Values, []float64{2, 3}) || got[0].Dates[0] != "2002" || got[0].First != 3 {
		t.Errorf("got %+v %v", got, errs)
	}
}
