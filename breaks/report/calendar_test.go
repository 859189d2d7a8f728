package report

import (
	"fmt"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/rootshift/rootshift/core/dataset"
	"github.com/rootshift/rootshift/core/schema"
)

// Plots for real samples (issue 12, item 6): date ticks at calendar
// boundaries, the suspected window shaded, text readable at phone width.
// Expected ticks are worked out by hand from the calendar (common practice,
// no source).

func months(y, m, n int) []string {
	out := make([]string, n)
	for i := range out {
		k := m - 1 + i
		out[i] = fmt.Sprintf("%04d-%02d", y+k/12, k%12+1)
	}
	return out
}

func TestCalendarTicks(t *testing.T) {
	for _, tc := range []struct {
		name   string
		dates  []string
		ticks  string // observation:label pairs
		nTicks int
	}{
		// 120 months from 2006-01: a tick every two years fits 6 labels.
		{"monthly 10 years", months(2006, 1, 120), "1:2006 25:2008 49:2010 73:2012 97:2014", 6},
		// Starting mid-year: the first year boundary is 2006-01 at observation 7.
		{"monthly from July", months(2005, 7, 60), "7:2006 19:2007 31:2008 43:2009 55:2010", 6},
		// 18 months: only one year start inside, so quarters; six fit.
		{"monthly short", months(2006, 2, 18), "3:2006-04 6:2006-07 9:2006-10 12:2007-01 15:2007-04 18:2007-07", 6},
		// With room for four only, half years (January and July).
		{"monthly short, narrow", months(2006, 2, 18), "6:2006-07 12:2007-01 18:2007-07", 4},
		{"quarterly short", quarters(8), "1:1990Q1 3:1990Q3 5:1991Q1 7:1991Q3", 6},
		{"quarterly long", quarters(60), "1:1990 9:1992 17:1994 25:1996 33:1998 41:2000 49:2002 57:2004", 8},
		{"annual", []string{"1950", "1951", "1952", "1953", "1954", "1955", "1956", "1957", "1958", "1959", "1960"}, "1:1950 3:1952 5:1954 7:1956 9:1958 11:1960", 6},
		{"annual, narrow", []string{"1950", "1951", "1952", "1953", "1954", "1955", "1956", "1957", "1958", "1959", "1960"}, "1:1950 6:1955 11:1960", 4},
		{"daily", []string{"2020-01-30", "2020-01-31", "2020-02-03", "2020-03-02", "2020-04-01", "2020-07-01", "2020-10-01"}, "5:2020-04 6:2020-07 7:2020-10", 6},
		{"not dates", []string{"a", "b", "c"}, "", 6},
	} {
		ts, ls := calendarTicks(tc.dates, tc.nTicks)
		var parts []string
		for i := range ts {
			parts = append(parts, strconv.Itoa(int(ts[i]))+":"+ls[i])
		}
		if got := strings.Join(parts, " "); got != tc.ticks {
			t.Errorf("%s: ticks %q, want %q", tc.name, got, tc.ticks)
		}
	}
}

// TestSeriesPlotWindow: the suspected window is shaded over observations
// FromIndex..ToIndex, and the year ticks reach the plot.
func TestSeriesPlotWindow(t *testing.T) {
	d := months(2006, 1, 120)
	v := make([]float64, 120)
	for i := range v {
		v[i] = float64(i % 7)
	}
	sr := &schema.Series{Name: "x", Verdict: &schema.Verdict{Window: &schema.WindowCheck{From: "2008-07", To: "2009-06", FromIndex: 31, ToIndex: 42}}}
	svg := SeriesPlot(dataset.Series{Name: "x", Values: v, Dates: d}, sr)
	checkSVG(t, "window", svg)
	if !strings.Contains(svg, "suspected window") || !strings.Contains(svg, `fill="`+colWindow+`"`) {
		t.Error("no shaded window")
	}
	for _, y := range []string{">2006<", ">2008<", ">2014<"} {
		if !strings.Contains(svg, y) {
			t.Errorf("no tick label %s", y)
		}
	}
	sr.Verdict.Window.FromIndex, sr.Verdict.Window.ToIndex = 0, 0
	if svg := SeriesPlot(dataset.Series{Name: "x", Values: v, Dates: d}, sr); strings.Contains(svg, "suspected window") {
		t.Error("window shaded without its observations")
	}
}

// TestPhoneReadable: every text in every plot, scaled from the viewBox to
// a phone's 360 CSS pixels of content, is at least phoneMinFont pixels.
func TestPhoneReadable(t *testing.T) {
	doc, in := fixtureDoc(), fixtureInputs()
	svgs := []string{SeriesPlot(in[0], &doc.Series[0]), ACFSVG(in[0], 0)}
	for _, r := range doc.Series[0].Results {
		svgs = append(svgs, PathSVG(r))
	}
	size := regexp.MustCompile(`font-size="([0-9.]+)"`)
	for i, svg := range svgs {
		if !strings.Contains(svg, `viewBox="0 0 `+strconv.Itoa(svgWidth)+" ") {
			t.Errorf("plot %d: no viewBox", i)
		}
		for _, m := range size.FindAllStringSubmatch(svg, -1) {
			fs, _ := strconv.ParseFloat(m[1], 64)
			if px := fs * phoneWidth / svgWidth; px < phoneMinFont {
				t.Errorf("plot %d: font-size %s renders at %.1f px on a phone", i, m[1], px)
			}
		}
	}
}

// TestResultPlotDates: a search path of a dated series is drawn against
// calendar dates (year ticks), and a result on the first difference is
// dated one observation later (its index i is Δy at i+1).
func TestResultPlotDates(t *testing.T) {
	d := months(2000, 1, 120)
	in := dataset.Series{Name: "x", Values: make([]float64, 120), Dates: d}
	var path []schema.PathPoint
	for i := 18; i <= 102; i++ {
		path = append(path, schema.PathPoint{Index: i, Statistic: -float64(i % 7)})
	}
	r := schema.Result{Test: "za", Path: path, CriticalValues: map[string]float64{"0.05": -4.8}}
	svg := ResultPlot(r, &in)
	checkSVG(t, "dated path", svg)
	for _, want := range []string{">2002<", ">2006<", "last observation of the old regime"} {
		if !strings.Contains(svg, want) {
			t.Errorf("dated path plot lacks %q", want)
		}
	}
	if plain := ResultPlot(r, nil); strings.Contains(plain, ">2002<") || !strings.Contains(plain, "(observation)") {
		t.Error("without dates the axis should count observations")
	}
	// On the first difference, index i is Δy dated at observation i+1: the
	// 2004 tick sits one index earlier than on the levels.
	r.Variant = "first difference"
	x := regexp.MustCompile(`<text x="([0-9.]+)"[^>]*>2004<`)
	diff, lev := x.FindStringSubmatch(ResultPlot(r, &in)), x.FindStringSubmatch(PathPlot(r, d))
	if diff == nil || lev == nil {
		t.Fatalf("no 2004 tick: %v %v", diff, lev)
	}
	if a, _ := strconv.ParseFloat(diff[1], 64); a >= func() float64 { b, _ := strconv.ParseFloat(lev[1], 64); return b }() {
		t.Errorf("first-difference path: 2004 tick at x %s, levels at %s; want it earlier", diff[1], lev[1])
	}
}
