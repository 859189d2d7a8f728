// Calendar gaps: missing periods in annual, quarterly, monthly and weekly
// dates are found per series and handled by the gaps setting (stop, keep,
// split). The open-data case is the monthly Mauna Loa CO2 file of
// vega-datasets 3.2.1 (testdata/co2-concentration.csv, see
// /testdata/README.md): its gaps (1958-06, 1958-10, 1964-02..1964-04, five
// months in three gaps) were read off the file.
package dataset

import (
	"errors"
	"path/filepath"
	"strings"
	"testing"

	"github.com/rootshift/rootshift/core/schema"
)

func TestCO2Gaps(t *testing.T) {
	tb, err := ReadFile(filepath.Join("..", "..", "testdata", "co2-concentration.csv"), nil)
	if err != nil {
		t.Fatal(err)
	}
	if tb.Frequency != Monthly || tb.Rows != 741 || tb.DateColumn != "Date" || names(tb) != "CO2|adjusted CO2" {
		t.Fatalf("freq %q rows %d date column %q series %s", tb.Frequency, tb.Rows, tb.DateColumn, names(tb))
	}
	want := "1958-06, 1958-10, 1964-02..1964-04 (5 missing months in 3 gaps)"
	if !hasNote(tb, "gap", want) {
		t.Errorf("notes %q lack %q", tb.Messages(), want)
	}
	// Default (stop): every series fails, naming the missing months and
	// the ways on; the row is the first observation after the first gap.
	_, errs := Select(tb, schema.Settings{})
	if len(errs) != 2 {
		t.Fatalf("stop: %d errors", len(errs))
	}
	for _, e := range errs {
		if !errors.Is(e, ErrGap) || e.Row != 4 || e.Date != "1958-07" || !strings.Contains(e.Error(), want) || !strings.Contains(e.Error(), "split") {
			t.Errorf("stop: %v (row %d)", e, e.Row)
		}
	}
	// keep: all 741 observations, with a note.
	ss, errs := Select(tb, schema.Settings{Gaps: "keep", Columns: []string{"CO2"}})
	if len(errs) != 0 || len(ss[0].Values) != 741 || !noteOf(ss[0], "gap-kept") {
		t.Errorf("keep: %v %d %+v", errs, len(ss[0].Values), ss[0].Notes)
	}
	// split: the longest stretch, 1964-05 to 2020-04 (741-3-3-63 = 672).
	ss, errs = Select(tb, schema.Settings{Gaps: "split", Columns: []string{"CO2"}})
	if len(errs) != 0 || len(ss[0].Values) != 672 || ss[0].Dates[0] != "1964-05" || ss[0].Dates[671] != "2020-04" || !noteOf(ss[0], "gap-split") {
		t.Errorf("split: %v %d %v..%v", errs, len(ss[0].Values), ss[0].Dates[0], ss[0].Dates[len(ss[0].Dates)-1])
	}
	// A sample inside one stretch has no gap.
	ss, errs = Select(tb, schema.Settings{From: "1970-01", To: "1979-12", Columns: []string{"CO2"}})
	if len(errs) != 0 || len(ss[0].Values) != 120 {
		t.Errorf("from/to inside a stretch: %v", errs)
	}
}

func noteOf(s Series, kind string) bool {
	for _, n := range s.Notes {
		if n.Kind == kind {
			return true
		}
	}
	return false
}

// Gaps are per series: a series that starts after the gap has none.
func TestGapsPerSeries(t *testing.T) {
	data := "date,a,b\n2000-01,1,\n2000-02,2,\n2000-04,3,5\n2000-05,4,6\n2000-06,5,7\n"
	tb, err := Parse("g", []byte(data), nil)
	if err != nil {
		t.Fatal(err)
	}
	ss, errs := Select(tb, schema.Settings{})
	if len(errs) != 1 || errs[0].Series != "a" || !strings.Contains(errs[0].Error(), "2000-03") {
		t.Errorf("errors %v", errs)
	}
	if len(ss) != 1 || ss[0].Name != "b" || len(ss[0].Values) != 3 || !noteOf(ss[0], "trimmed") {
		t.Errorf("series %+v", ss)
	}
	// Weekly and quarterly gaps, and a bad gaps setting.
	for _, c := range []struct{ data, want string }{
		{"date,y\n2009-03-02,1\n2009-03-09,2\n2009-03-23,3\n", "2009-03-16 (1 missing week in 1 gap)"},
		{"q,y\n2009Q1,1\n2009Q4,2\n2010Q1,3\n", "2009Q2..2009Q3 (2 missing quarters in 1 gap)"},
	} {
		tb, err := Parse("w", []byte(c.data), nil)
		if err != nil {
			t.Fatal(err)
		}
		if _, errs := Select(tb, schema.Settings{}); len(errs) != 1 || !strings.Contains(errs[0].Error(), c.want) {
			t.Errorf("%q: %v", c.data, errs)
		}
	}
	if _, errs := Select(tb, schema.Settings{Gaps: "fill"}); len(errs) != 1 || errs[0].Series != "" || !errors.Is(errs[0], ErrGap) {
		t.Errorf("bad setting: %v", errs)
	}
}
