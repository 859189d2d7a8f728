package report

import (
	"github.com/rootshift/rootshift/core/schema"
)

// P-values at the end of a table: the rules are schema.PBound's (see
// core/schema/pvalue.go), shared with the verdict's sentences so that a
// table and a verdict line print the same p-value the same way. The table,
// Markdown, LaTeX and HTML writers print schema.FormatP ("0.620", "<0.001",
// ">0.999", "<0.005"); the CSV keeps the number in p_value and writes "<" or
// ">" in p_value_bound.

// pBound is schema.PBound.
func pBound(p *float64, flagged bool) string { return schema.PBound(p, flagged) }

// resultPBound is pBound for the asymptotic p-value of a result.
func resultPBound(r *schema.Result) string { return schema.ResultPBound(r) }

// pText formats a p-value for the text writers (schema.FormatP), or na when
// p is nil or not finite.
func pText(p *float64, bound, na string) string {
	if s := schema.FormatP(p, bound); s != "" {
		return s
	}
	return na
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
