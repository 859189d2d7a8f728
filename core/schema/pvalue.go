package schema

import (
	"math"
	"strconv"
	"strings"
)

// P-values at the end of a table, and the one way every output prints a
// p-value (the reports' tables and the verdict's sentences alike).
//
// A p-value read from a table of quantiles is only a bound when the
// statistic lies beyond the table: the test then reports the table's end
// probability (for example 0.0005, 0.001, 0.005 or 0.999) and says so in
// words, in PValueMethod or in a warning, with one of the phrases in
// boundPhrases (core/pvalue.go "p-value bounded at", core/explosive.go "the
// p-value is the table's bound", breaks/lm_tables.go "p-value clamped to",
// breaks/za.go "p-value reported at the table end", core/gls.go "reported as
// that bound" and "the p-value is reported as"). Two rules classify a
// p-value:
//
//  1. a result whose PValueMethod or warnings contain one of those phrases
//     has a bounded p-value: an upper bound on the true p-value ("<") when
//     p < 0.5, a lower bound (">") otherwise;
//  2. whatever the text, p <= 0.001 is a "<0.001" and p >= 0.999 a ">0.999"
//     (also for components, stages and simulated p-values, which carry no
//     text of their own).
//
// FormatP then prints a point value with three decimals ("0.620") and a
// bound as a bound ("<0.001", ">0.999", "<0.005", "<0.01").

// boundPhrases are the words with which tests say that their p-value is the
// end of a table (lower case).
var boundPhrases = []string{
	"p-value bounded at",
	"p-value is the table's bound",
	"p-value clamped to",
	"p-value reported at the table end",
	"reported as that bound",
	"the p-value is reported as",
}

// Display limits of rule 2.
const (
	PLow  = 0.001
	PHigh = 0.999
)

// BoundedText reports whether any of texts says the p-value is a table bound.
func BoundedText(texts ...string) bool {
	for _, t := range texts {
		t = strings.ToLower(t)
		for _, ph := range boundPhrases {
			if strings.Contains(t, ph) {
				return true
			}
		}
	}
	return false
}

func finiteP(p *float64) bool { return p != nil && !math.IsNaN(*p) && !math.IsInf(*p, 0) }

// PBound classifies p: "<" when the true p-value is at most p, ">" when it
// is at least p, "" when p is a point value or nil. flagged says the test
// reported p as a table bound (rule 1); the display limits apply in any
// case (rule 2).
func PBound(p *float64, flagged bool) string {
	if !finiteP(p) {
		return ""
	}
	switch x := *p; {
	case x <= PLow:
		return "<"
	case x >= PHigh:
		return ">"
	case flagged && x < 0.5:
		return "<"
	case flagged:
		return ">"
	}
	return ""
}

// ResultPBound is PBound for the asymptotic p-value of r, flagged by its
// PValueMethod and warnings.
func ResultPBound(r *Result) string {
	return PBound(r.PValue, BoundedText(append([]string{r.PValueMethod}, r.Warnings...)...))
}

// FormatP writes p for a reader: "" when p is nil or not finite; the bound
// form "<0.001", ">0.999", "<0.005" (at most four decimals, trailing zeros
// dropped, never beyond the display limits) when bound is "<" or ">"; else
// three decimals.
func FormatP(p *float64, bound string) string {
	if !finiteP(p) {
		return ""
	}
	x := *p
	switch bound {
	case "<", ">":
		switch {
		case bound == "<" && x <= PLow:
			x = PLow
		case bound == ">" && x >= PHigh:
			x = PHigh
		}
		s := strconv.FormatFloat(x, 'f', 4, 64)
		return bound + strings.TrimRight(strings.TrimRight(s, "0"), ".")
	}
	if x == 0 {
		x = 0 // no "-0.000"
	}
	return strconv.FormatFloat(x, 'f', 3, 64)
}

// ResultP is the displayed asymptotic p-value of r ("" when it has none).
func ResultP(r *Result) string { return FormatP(r.PValue, ResultPBound(r)) }

// PClause writes a p-value for a sentence: "p=0.620", "p<0.001", "p>0.999";
// "" when p is nil or not finite. The verdict's sentences and the reports
// use it so that a sentence and a table print the same p-value alike.
func PClause(p *float64, bound string) string {
	s := FormatP(p, bound)
	switch {
	case s == "":
		return ""
	case s[0] == '<' || s[0] == '>':
		return "p" + s
	}
	return "p=" + s
}
