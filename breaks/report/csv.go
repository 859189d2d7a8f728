package report

import (
	"encoding/csv"
	"io"
	"strconv"
	"strings"

	"github.com/rootshift/rootshift/core/schema"
)

// CSVHeader is the header row of WriteCSV. Every row has exactly these
// columns:
//
//	row_type           "result" (one per series and test), "component" (one per
//	                   M-test statistic or structural-change statistic, under its
//	                   result), "error", "warning", "series" (only for a series
//	                   that has no other row), or "note" (after every series: one
//	                   per reader note on the input, series empty for a note on
//	                   the whole file; the note in message)
//	id                 "SOURCE:SERIES" when the document names its source
//	                   (doc.Source.Name, e.g. the input file), else the series
//	                   name; it tells apart rows from different files in one
//	                   batch summary CSV
//	series             series name
//	test, variant      test id and sub-form
//	component          component name (component rows only)
//	trend, shift       deterministic terms and break kind
//	statistic          the test statistic
//	p_value            asymptotic or response-surface p-value (empty: none)
//	p_value_bound      "<" when p_value is an upper bound of the true p-value
//	                   (the statistic lies beyond the table's lower end), ">"
//	                   when it is a lower bound, empty when it is a point value;
//	                   set when the test says so (PValueMethod or a warning:
//	                   "p-value bounded at", "clamped", "table end", ...) and
//	                   always for p_value <= 0.001 ("<") and >= 0.999 (">");
//	                   see pbound.go
//	p_value_sim        simulated finite-sample p-value (empty: not simulated)
//	cv_1, cv_5, cv_10  critical values at 1%, 5% and 10%
//	tail               "left" or "right": which statistics reject
//	lags, lag_rule     augmentation lags and how they were chosen
//	nobs               observations in the test regression
//	level              significance level of the decision
//	reject             "true" or "false" at that level
//	decision           the decision in words ("rejects unit root", ...)
//	break_dates        break dates (observation numbers when undated), ";"-separated
//	break_indexes      break observation numbers TB, ";"-separated
//	verdict_class      the series' verdict class (repeated on every row of the series)
//	verdict_order      order of integration 0, 1, 2 (empty: undetermined)
//	verdict_transform  recommended transform
//	message            error or warning text; warnings of a result on its row
//
// Numbers are written with strconv 'g' at full precision; a missing number is
// an empty cell. Text cells go through CSVCell: control characters are shown
// visibly, and a cell starting with '=', '+', '-', '@', a tab or a carriage
// return gets a leading apostrophe so that spreadsheets do not read it as a
// formula. The id column carries the file's base name only.
var CSVHeader = []string{
	"row_type", "id", "series", "test", "variant", "component", "trend", "shift",
	"statistic", "p_value", "p_value_bound", "p_value_sim", "cv_1", "cv_5", "cv_10", "tail",
	"lags", "lag_rule", "nobs", "level", "reject", "decision",
	"break_dates", "break_indexes", "verdict_class", "verdict_order", "verdict_transform", "message",
}

// WriteCSV writes doc as CSV (RFC 4180, comma-separated, "\n" line ends)
// with the columns of CSVHeader, one row per series and test, designed to be
// filtered and pivoted in a spreadsheet. The error wraps ErrNoDocument or the
// writer's error.
func WriteCSV(w io.Writer, doc *schema.Document) error {
	if doc == nil {
		return ErrNoDocument
	}
	cw := csv.NewWriter(w)
	if err := cw.Write(CSVHeader); err != nil {
		return err
	}
	for i := range doc.Series {
		for _, rec := range csvSeries(csvID(doc, &doc.Series[i]), &doc.Series[i]) {
			if err := cw.Write(rec); err != nil {
				return err
			}
		}
	}
	for _, rec := range csvNoteRows(doc) {
		if err := cw.Write(rec); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
}

// csv column indexes, in CSVHeader order.
const (
	cRowType = iota
	cID
	cSeries
	cTest
	cVariant
	cComponent
	cTrend
	cShift
	cStatistic
	cPValue
	cPValueBound
	cPValueSim
	cCV1
	cCV5
	cCV10
	cTail
	cLags
	cLagRule
	cNObs
	cLevel
	cReject
	cDecision
	cBreakDates
	cBreakIndexes
	cVerdictClass
	cVerdictOrder
	cVerdictTransform
	cMessage
	cNumColumns
)

// csvID is the id column of series s in doc: "SOURCE:SERIES" when the
// document names its source, else the series name.
func csvID(doc *schema.Document, s *schema.Series) string {
	if n := sourceName(doc); n != "" {
		return n + ":" + s.Name
	}
	return s.Name
}

func csvSeries(id string, s *schema.Series) [][]string {
	var out [][]string
	row := func(kind string) []string {
		rec := make([]string, cNumColumns)
		rec[cRowType] = kind
		rec[cID] = csvText(id)
		rec[cSeries] = csvText(s.Name)
		if v := s.Verdict; v != nil {
			rec[cVerdictClass] = csvText(v.Class)
			if v.Order != nil {
				rec[cVerdictOrder] = strconv.Itoa(*v.Order)
			}
			rec[cVerdictTransform] = csvText(v.Transform)
		}
		return rec
	}
	for i := range s.Results {
		r := &s.Results[i]
		rec := row("result")
		rec[cTest] = csvText(r.Test)
		rec[cVariant] = csvText(r.Variant)
		rec[cTrend] = csvText(r.Trend)
		rec[cShift] = csvText(r.Shift)
		rec[cStatistic] = csvNum(r.Statistic)
		rec[cPValue] = csvNum(r.PValue)
		rec[cPValueBound] = resultPBound(r)
		rec[cPValueSim] = csvNum(r.PValueSim)
		csvCV(rec, r.CriticalValues)
		rec[cTail] = csvText(r.Tail)
		rec[cLags] = strconv.Itoa(r.Lags)
		rec[cLagRule] = csvText(r.LagRule)
		rec[cNObs] = strconv.Itoa(r.NObs)
		rec[cLevel] = csvFloat(r.Level)
		rec[cReject] = strconv.FormatBool(r.Reject)
		rec[cDecision] = csvText(resultDecision(r))
		rec[cBreakDates] = csvText(strings.Join(breakDates(r.Breaks), ";"))
		idx := make([]string, len(r.Breaks))
		for j, b := range r.Breaks {
			idx[j] = strconv.Itoa(b.Index)
		}
		rec[cBreakIndexes] = strings.Join(idx, ";")
		rec[cMessage] = csvText(strings.Join(r.Warnings, "; "))
		out = append(out, rec)
		comps := append(append([]schema.Component(nil), r.Components...), r.BreakTests...)
		for j := range comps {
			c := &comps[j]
			crec := row("component")
			crec[cTest] = rec[cTest]
			crec[cVariant] = rec[cVariant]
			crec[cComponent] = csvText(c.Name)
			crec[cTrend] = rec[cTrend]
			crec[cShift] = rec[cShift]
			crec[cStatistic] = csvNum(c.Statistic)
			crec[cPValue] = csvNum(c.PValue)
			crec[cPValueBound] = pBound(c.PValue, false)
			csvCV(crec, c.CriticalValues)
			crec[cTail] = csvText(c.Tail)
			if c.Tail == "" {
				crec[cTail] = rec[cTail]
			}
			crec[cLags] = rec[cLags]
			crec[cLagRule] = rec[cLagRule]
			crec[cNObs] = rec[cNObs]
			crec[cLevel] = rec[cLevel]
			crec[cReject] = strconv.FormatBool(c.Reject)
			crec[cDecision] = csvText(componentDecision(r, c))
			out = append(out, crec)
		}
	}
	for _, er := range s.Errors {
		rec := row("error")
		rec[cTest] = csvText(er.Test)
		rec[cMessage] = csvText(errorText(schema.Error{Row: er.Row, Column: er.Column, Message: er.Message}))
		out = append(out, rec)
	}
	for _, wmsg := range s.Warnings {
		rec := row("warning")
		rec[cMessage] = csvText(wmsg)
		out = append(out, rec)
	}
	if len(out) == 0 {
		out = append(out, row("series"))
	}
	return out
}

func csvCV(rec []string, m map[string]float64) {
	for key, col := range map[string]int{"0.01": cCV1, "0.05": cCV5, "0.10": cCV10} {
		if v, ok := cv(m, key); ok {
			rec[col] = csvFloat(v)
		}
	}
}

// csvFloat formats x at full precision, or "" when x is not finite.
func csvFloat(x float64) string {
	if !finite(x) {
		return ""
	}
	return strconv.FormatFloat(x, 'g', -1, 64)
}

// csvNum formats *p at full precision, or "" when p is nil or not finite.
func csvNum(p *float64) string {
	if p == nil {
		return ""
	}
	return csvFloat(*p)
}

// csvText guards a text cell (see CSVCell).
func csvText(s string) string { return CSVCell(s) }
