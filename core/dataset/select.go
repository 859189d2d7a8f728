package dataset

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/rootshift/rootshift/core/schema"
)

// Transforms lists the accepted values of schema.Settings.Transform.
var Transforms = []string{"", "log", "diff", "diff2", "logdiff"}

// Transform writes the transform kind of y into dst (reused when large
// enough) and returns it: "" copies, "log" takes natural logs, "diff" and
// "diff2" take first and second differences, "logdiff" the first difference
// of the logs. Differences are one (two) values shorter than y: element i of
// the result belongs to observation i+1 (i+2) of y. NaN stays NaN (and spreads
// to the differences that use it). The log of a value <= 0 is a *SeriesError
// wrapping ErrNonPositive whose Row is the 1-based index into y.
func Transform(dst, y []float64, kind string) ([]float64, error) {
	lag := 0
	switch kind {
	case "", "level", "levels", "log":
	case "diff", "logdiff":
		lag = 1
	case "diff2":
		lag = 2
	default:
		return nil, &SeriesError{Err: wrapf(ErrBadTransform, "%q (want one of log, diff, diff2, logdiff)", kind)}
	}
	n := max(len(y)-lag, 0)
	if cap(dst) < n {
		dst = make([]float64, n)
	}
	dst = dst[:n]
	if kind == "log" || kind == "logdiff" {
		for i, v := range y {
			if v <= 0 {
				return nil, &SeriesError{Row: i + 1, Err: wrapf(ErrNonPositive, "log(%g)", v)}
			}
		}
	}
	switch kind {
	case "", "level", "levels":
		copy(dst, y)
	case "log":
		for i, v := range y {
			dst[i] = math.Log(v)
		}
	case "diff":
		for i := range dst {
			dst[i] = y[i+1] - y[i]
		}
	case "logdiff":
		for i := range dst {
			dst[i] = math.Log(y[i+1]) - math.Log(y[i])
		}
	case "diff2":
		for i := range dst {
			dst[i] = y[i+2] - 2*y[i+1] + y[i]
		}
	}
	return dst, nil
}

// GapRules lists the accepted values of schema.Settings.Gaps ("" is
// "stop").
var GapRules = []string{"", "stop", "keep", "split"}

// OptionsFor returns the reading options held in the settings (date column,
// date format, sheet); the CLI, the batch mode and the page all read with it.
func OptionsFor(s schema.Settings) *Options {
	return &Options{DateColumn: s.DateColumn, DateFormat: s.DateFormat, Sheet: s.Sheet}
}

// MinObs is the fewest observations Select keeps for a series.
const MinObs = 2

// Select applies the analyst's input settings to a table, in this order:
// columns by name (s.Columns; empty: every series), the sample range
// s.From..s.To (dates in any accepted form, or observation numbers 1..Rows,
// inclusive; From picks the first date at or after the start of the period it
// names, To the last at or before its end), the transform s.Transform
// (differences drop the first observation(s) of the range, and the dates stay
// aligned with the values), then leading and trailing missing values are
// trimmed (with a note), then calendar gaps are handled by s.Gaps (see
// schema.Settings.Gaps; the default stops the series with ErrGap naming the
// missing periods). A missing value left inside the sample is an error for that series
// (ErrInteriorMissing with its row): nothing is interpolated. Each returned
// Series owns its Values and Dates; First is the table row of Values[0].
// Errors that concern every series (unknown date column, bad range) have
// Series "" and then no series are returned.
func Select(t *Table, s schema.Settings) (series []Series, errs []SeriesError) {
	if t == nil {
		return nil, []SeriesError{{Err: wrapf(ErrNoSeries, "no table")}}
	}
	if s.DateColumn != "" && !strings.EqualFold(s.DateColumn, t.DateColumn) {
		return nil, []SeriesError{{Err: wrapf(ErrUnknownColumn, "date column %q: the table was read with date column %q", s.DateColumn, t.DateColumn)}}
	}
	okTransform := false
	for _, k := range Transforms {
		okTransform = okTransform || k == s.Transform
	}
	if !okTransform {
		return nil, []SeriesError{{Err: wrapf(ErrBadTransform, "%q (want one of log, diff, diff2, logdiff)", s.Transform)}}
	}
	// Sample range (1-based, inclusive).
	a, b := 1, t.Rows
	var err error
	if s.From != "" {
		if a, err = resolve(t.Rows, t.Dates, t.Frequency, s.From, atOrAfter); err != nil {
			return nil, []SeriesError{{Err: fmt.Errorf("from: %w", err)}}
		}
	}
	if s.To != "" {
		if b, err = resolve(t.Rows, t.Dates, t.Frequency, s.To, atOrBefore); err != nil {
			return nil, []SeriesError{{Err: fmt.Errorf("to: %w", err)}}
		}
	}
	if a > b {
		return nil, []SeriesError{{Err: wrapf(ErrBadRange, "the sample %s..%s is empty", s.From, s.To)}}
	}
	// Columns.
	var picked []*Series
	if len(s.Columns) == 0 {
		for i := range t.Series {
			picked = append(picked, &t.Series[i])
		}
	} else {
		for _, c := range s.Columns {
			var p *Series
			for i := range t.Series {
				if t.Series[i].Name == c {
					p = &t.Series[i]
					break
				}
			}
			for i := range t.Series {
				if p == nil && strings.EqualFold(t.Series[i].Name, strings.TrimSpace(c)) {
					p = &t.Series[i]
				}
			}
			if p == nil {
				e := SeriesError{Series: c, Err: wrapf(ErrUnknownColumn, "%q is not a numeric column of %s (%s)", c, t.Name, validColumns(t))}
				for _, sk := range t.Skipped {
					if strings.EqualFold(sk.ColumnName, c) {
						e.Err = fmt.Errorf("%w: %q is not numeric: %v", ErrUnknownColumn, c, sk)
					}
				}
				if strings.EqualFold(c, t.DateColumn) && t.DateColumn != "" {
					e.Err = wrapf(ErrUnknownColumn, "%q is the date column", c)
				}
				errs = append(errs, e)
				continue
			}
			picked = append(picked, p)
		}
	}
	okGaps := false
	for _, g := range GapRules {
		okGaps = okGaps || g == s.Gaps
	}
	if !okGaps {
		return nil, []SeriesError{{Err: wrapf(ErrGap, "gaps %q: want stop, keep or split", s.Gaps)}}
	}
	lag := map[string]int{"diff": 1, "logdiff": 1, "diff2": 2}[s.Transform]
	for _, p := range picked {
		out, e := selectOne(t, p, a, b, s.Transform, lag, s.Gaps)
		if e != nil {
			errs = append(errs, *e)
			continue
		}
		series = append(series, out)
	}
	return series, errs
}

// selectOne cuts rows a..b of one series, transforms and trims it.
func selectOne(t *Table, p *Series, a, b int, kind string, lag int, gaps string) (Series, *SeriesError) {
	base := p.First
	if base < 1 {
		base = 1
	}
	// Rows of p.Values are base..base+len-1; clip a..b to them.
	lo, hi := max(a, base), min(b, base+len(p.Values)-1)
	fail := func(row int, err error) *SeriesError {
		e := &SeriesError{Series: p.Name, Row: row, Err: err}
		if row > 0 && p.Dates != nil && row-base < len(p.Dates) && row-base >= 0 {
			e.Date = p.Dates[row-base]
		}
		return e
	}
	if lo > hi {
		return Series{}, fail(0, wrapf(ErrTooShort, "no observations in the sample"))
	}
	notes := append([]Note(nil), p.Notes...)
	line := func(row int) int { // file line of table row
		if row >= 1 && row <= len(t.Lines) {
			return t.Lines[row-1]
		}
		return 0
	}
	// Leading and trailing missing values of the raw window.
	i0, j0 := lo, hi
	for i0 <= j0 && math.IsNaN(p.Values[i0-base]) {
		i0++
	}
	for j0 >= i0 && math.IsNaN(p.Values[j0-base]) {
		j0--
	}
	if i0 > j0 {
		return Series{}, fail(0, wrapf(ErrTooShort, "no values in the sample"))
	}
	if i0 > lo || j0 < hi {
		msg := fmt.Sprintf("%d leading and %d trailing rows without a value left out", i0-lo, hi-j0)
		if p.Dates != nil {
			msg += fmt.Sprintf(": the series runs from %s to %s", p.Dates[i0-base], p.Dates[j0-base])
		}
		notes = append(notes, Note{Kind: "trimmed", Row: line(i0), Column: p.Column, ColumnName: p.Name, Message: msg})
	}
	lo, hi = i0, j0
	if p.Dates != nil {
		if gs := seriesGaps(p.Dates[lo-base:hi-base+1], p.Frequency); len(gs) > 0 {
			desc := describeGaps(gs, p.Frequency)
			switch gaps {
			case "", "stop":
				r := lo + gs[0].i
				return Series{}, fail(r, wrapf(ErrGap, "the %s dates skip %s: the tests would treat non-adjacent periods as adjacent; set gaps (--gaps) to split (test the longest stretch without gaps), keep (test the observations as if consecutive) or choose from/to inside one stretch", p.Frequency, desc))
			case "keep":
				notes = append(notes, Note{Kind: "gap-kept", Row: line(lo + gs[0].i), Column: p.Column, ColumnName: p.Name,
					Message: "tested across calendar gaps (gaps = keep): the observations on either side of " + desc + " are treated as adjacent"})
			case "split":
				// Stretches: [lo, lo+g0.i-1], [lo+g0.i, lo+g1.i-1], ...
				bestLo, bestHi := 0, -1
				start := lo
				for k := 0; k <= len(gs); k++ {
					end := hi
					if k < len(gs) {
						end = lo + gs[k].i - 1
					}
					if end-start >= bestHi-bestLo {
						bestLo, bestHi = start, end
					}
					if k < len(gs) {
						start = lo + gs[k].i
					}
				}
				notes = append(notes, Note{Kind: "gap-split", Row: line(bestLo), Column: p.Column, ColumnName: p.Name,
					Message: fmt.Sprintf("calendar gaps %s: the longest stretch without gaps is tested (gaps = split), %s to %s, %d of %d observations",
						desc, p.Dates[bestLo-base], p.Dates[bestHi-base], bestHi-bestLo+1, hi-lo+1)})
				lo, hi = bestLo, bestHi
			}
		}
	}
	win := p.Values[lo-base : hi-base+1]
	v, err := Transform(nil, win, kind)
	if err != nil {
		se := err.(*SeriesError)
		return Series{}, fail(lo+se.Row-1, se.Err)
	}
	first := lo + lag // table row of v[0]
	i, j := 0, len(v)
	for i < j && math.IsNaN(v[i]) {
		i++
	}
	for j > i && math.IsNaN(v[j-1]) {
		j--
	}
	for k := i; k < j; k++ {
		if math.IsNaN(v[k]) {
			return Series{}, fail(first+k, wrapf(ErrInteriorMissing, "no interpolation is done; shorten the sample with from/to"))
		}
	}
	if j-i < MinObs {
		return Series{}, fail(0, wrapf(ErrTooShort, "%d observations in the sample", j-i))
	}
	out := Series{Name: p.Name, Column: p.Column, Frequency: p.Frequency, First: first + i, Notes: notes}
	out.Values = append([]float64(nil), v[i:j]...)
	if p.Dates != nil {
		out.Dates = append([]string(nil), p.Dates[first+i-base:first+j-base]...)
	}
	return out, nil
}

// validColumns lists the numeric columns of t for an unknown-column error:
// "columns: a, b, c", the first 30 when there are more.
func validColumns(t *Table) string {
	const most = 30
	all := t.allSeries
	if all == nil {
		all = make([]string, len(t.Series))
		for i := range t.Series {
			all[i] = t.Series[i].Name
		}
	}
	names := make([]string, 0, min(len(all), most))
	for i, n := range all {
		if i == most {
			break
		}
		names = append(names, strconv.Quote(n))
	}
	if len(names) == 0 {
		return "it has no numeric column"
	}
	list := "valid columns: " + strings.Join(names, ", ")
	if more := len(all) - most; more > 0 {
		list += fmt.Sprintf(" and %d more", more)
	}
	return list
}
