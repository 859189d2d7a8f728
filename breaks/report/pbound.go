package report

import (
	"strconv"
	"strings"

	"github.com/rootshift/rootshift/core/schema"
)

// P-values at the end of a table.
//
// A p-value read from a table of quantiles is only a bound when the
// statistic lies beyond the table: the test then reports the table's end
// probability (for example 0.0005, 0.001, 0.005 or 0.999) and says so in
// words. The tests mark this in PValueMethod or in a warning, with one of
// the phrases in boundPhrases (core/pvalue.go "p-value bounded at",
// core/explosive.go "the p-value is the table's bound", breaks/lm_tables.go
// "p-value clamped to", breaks/za.go "p-value reported at the table end",
// core/gls.go "reported as that bound" and "the p-value is reported as").
// There is no structured flag in the schema, so the writers use two rules:
//
//  1. a result whose PValueMethod or warnings contain one of those phrases
//     has a bounded p-value: a lower bound ("<") when p < 0.5, an upper
//     bound (">") otherwise;
//  2. whatever the text, p <= 0.001 is shown as "<0.001" and p >= 0.999 as
//     ">0.999" (also for components and simulated p-values, which carry no
//     text of their own).
//
// The table, Markdown, LaTeX and HTML writers then print "<0.001",
// ">0.999" or "<0.005" (the bound, with at most four decimals); the CSV
// keeps the number in p_value and writes "<" or ">" in p_value_bound.

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
	pLow  = 0.001
	pHigh = 0.999
)

// boundedText reports whether any of texts says the p-value is a table bound.
func boundedText(texts ...string) bool {
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

// pBound classifies p: "<" when the true p-value is at most p, ">" when it
// is at least p, "" when p is a point value. flagged says the test reported
// p as a table bound (rule 1); the display limits apply in any case (rule 2).
func pBound(p *float64, flagged bool) string {
	if p == nil || !finite(*p) {
		return ""
	}
	switch x := *p; {
	case x <= pLow:
		return "<"
	case x >= pHigh:
		return ">"
	case flagged && x < 0.5:
		return "<"
	case flagged:
		return ">"
	}
	return ""
}

// resultPBound is pBound for the asymptotic p-value of a result.
func resultPBound(r *schema.Result) string {
	return pBound(r.PValue, boundedText(append([]string{r.PValueMethod}, r.Warnings...)...))
}

// boundNum writes the bound p as "<0.001", ">0.999" or "<0.005": at most
// four decimals, trailing zeros dropped, and never beyond the display
// limits (a bound below 0.001 is still "<0.001").
func boundNum(p float64, bound string) string {
	switch {
	case bound == "<" && p <= pLow:
		p = pLow
	case bound == ">" && p >= pHigh:
		p = pHigh
	}
	s := strconv.FormatFloat(p, 'f', 4, 64)
	s = strings.TrimRight(strings.TrimRight(s, "0"), ".")
	return bound + s
}

// pText formats a p-value for the text writers: the bound form when bound
// is "<" or ">", else four decimals; na when p is nil or not finite.
func pText(p *float64, bound, na string) string {
	if p == nil || !finite(*p) {
		return na
	}
	if bound == "" {
		return num(*p, na)
	}
	return boundNum(*p, bound)
}

// resultP is the displayed asymptotic p-value of r.
func resultP(r *schema.Result, na string) string { return pText(r.PValue, resultPBound(r), na) }

// simP is the displayed simulated p-value of r (rule 2 only).
func simP(r *schema.Result, na string) string {
	return pText(r.PValueSim, pBound(r.PValueSim, false), na)
}

// compP is the displayed p-value of a component (rule 2 only).
func compP(c *schema.Component, na string) string {
	return pText(c.PValue, pBound(c.PValue, false), na)
}
