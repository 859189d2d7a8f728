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

// MinObs is the fewest observations Select keeps for a series.
const MinObs = 2

// Select applies the analyst's input settings to a table, in this order:
// columns by name (s.Columns; empty: every series), the sample range
// s.From..s.To (dates in any accepted form, or observation numbers 1..Rows,
// inclusive; From picks the first date at or after the start of the period it
// names, To the last at or before its end), the transform s.Transform
// (differences drop the first observation(s) of the range, and the dates stay
// aligned with the values), then leading and trailing missing values are
// trimmed. A missing value left inside the sample is an error for that series
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
	lag := map[string]int{"diff": 1, "logdiff": 1, "diff2": 2}[s.Transform]
	for _, p := range picked {
		out, e := selectOne(t, p, a, b, s.Transform, lag)
		if e != nil {
			errs = append(errs, *e)
			continue
		}
		series = append(series, out)
	}
	return series, errs
}

// selectOne cuts rows a..b of one series, transforms and trims it.
func selectOne(t *Table, p *Series, a, b int, kind string, lag int) (Series, *SeriesError) {
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
	out := Series{Name: p.Name, Column: p.Column, Frequency: p.Frequency, First: first + i}
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
	names := make([]string, 0, min(len(t.Series), most))
	for i := range t.Series {
		if i == most {
			break
		}
		names = append(names, strconv.Quote(t.Series[i].Name))
	}
	if len(names) == 0 {
		return "it has no numeric column"
	}
	list := "valid columns: " + strings.Join(names, ", ")
	if more := len(t.Series) - most; more > 0 {
		list += fmt.Sprintf(" and %d more", more)
	}
	return list
}
