package report

import (
	"io"
	"strconv"
	"strings"

	"github.com/rootshift/rootshift/core/schema"
)

// tableWidth is the line width of the table format.
const tableWidth = 100

// WriteTable writes doc as plain text for a terminal at least 100 columns
// wide: a settings line, then one block per series (a header line, the
// verdict with its explanation wrapped, one line per test with statistic,
// p-values, 5% critical value, lags and the decision in words, detail lines
// for components, breaks and episodes, then errors and warnings), and the
// caution at the end. The error wraps ErrNoDocument or the writer's error.
func WriteTable(w io.Writer, doc *schema.Document) error {
	if doc == nil {
		return ErrNoDocument
	}
	e := &errWriter{w: w, plain: true}
	title := "rootshift"
	if doc.Version != "" {
		title += " " + doc.Version
	}
	if n := sourceName(doc); n != "" {
		title += ": " + visible(n)
		if doc.Source.Rows > 0 {
			title += " (" + strconv.Itoa(doc.Source.Rows) + " rows)"
		}
	}
	e.print(title + "\n")
	for _, l := range wrap("settings: "+strings.Join(settingsNotes(&doc.Settings), "; "), tableWidth-2) {
		e.print(l + "\n")
	}
	if notes := inputNotes(doc); len(notes) > 0 {
		e.print("notes on the input:\n")
		for _, n := range notes {
			for k, l := range wrap(visible(n), tableWidth-6) {
				if k == 0 {
					e.print("  - " + l + "\n")
				} else {
					e.print("    " + l + "\n")
				}
			}
		}
	}
	if len(doc.Series) > 1 {
		e.print("\n")
		tableOverview(e, doc)
	}
	for i := range doc.Series {
		e.print("\n")
		tableSeries(e, &doc.Series[i])
	}
	e.print("\n")
	caution := doc.Caution
	if caution == "" {
		caution = schema.Caution
	}
	for _, l := range wrap("Caution: "+caution, tableWidth-2) {
		e.print(l + "\n")
	}
	return e.err
}

// tableRow is one line of a series' results block before padding.
type tableRow struct {
	test, variant, stat, p, psim, cv5, lags, decision string
	details                                           []string
}

func tableSeries(e *errWriter, s *schema.Series) {
	e.print("== " + s.Name + "  (" + seriesMeta(s) + ")\n")
	if v := s.Verdict; v != nil {
		for i, l := range wrap("Verdict: "+verdictHeadline(v), tableWidth-2) {
			if i > 0 {
				l = "  " + l
			}
			e.print(l + "\n")
		}
		para := func(prefix, text string) {
			for _, l := range wrap(prefix+text, tableWidth-4) {
				e.print("  " + l + "\n")
			}
		}
		if v.Explanation != "" {
			para("", v.Explanation)
		}
		if len(v.Breaks) > 0 {
			para("breaks: ", breaksText(v.Breaks))
		}
		if v.Window != nil {
			para("", windowText(v.Window))
		}
		if v.Reliability != nil {
			para("error rate: ", reliabilityText(v.Reliability))
		}
		for k := range v.Stages {
			para("stage "+strconv.Itoa(k+1)+", ", stageText(&v.Stages[k]))
		}
		for _, c := range v.Context {
			para("context: ", c)
		}
		for _, t := range v.Supporting {
			para("+ ", t)
		}
		for _, t := range v.Against {
			para("- ", t)
		}
		if len(v.Tests) > 0 {
			para("tests used: ", strings.Join(v.Tests, ", "))
		}
	}
	var rows []tableRow
	hasSim := false
	for i := range s.Results {
		r := &s.Results[i]
		if r.PValueSim != nil {
			hasSim = true
		}
		variant, vdetail := variantTrendText(r)
		row := tableRow{
			test:     visible(r.Test),
			variant:  variant,
			stat:     numP(r.Statistic, "n/a"),
			p:        resultP(r, "n/a"),
			psim:     simP(r, "-"),
			lags:     strconv.Itoa(r.Lags),
			decision: resultDecision(r),
		}
		if c, ok := cv(r.CriticalValues, "0.05"); ok {
			row.cv5 = num(c, "n/a")
		} else {
			row.cv5 = "n/a"
		}
		rows = append(rows, row)
		for j := range r.Components {
			rows = append(rows, componentRow(r, &r.Components[j]))
		}
		for j := range r.BreakTests {
			rows = append(rows, componentRow(r, &r.BreakTests[j]))
		}
		last := &rows[len(rows)-1]
		if vdetail != "" {
			last.details = append(last.details, "variant: "+vdetail)
		}
		if len(r.Breaks) > 0 {
			last.details = append(last.details, "breaks: "+breaksText(r.Breaks))
		}
		if len(r.Episodes) > 0 {
			last.details = append(last.details, "explosive episodes: "+episodeText(r.Episodes))
		}
		if r.Surface != nil {
			last.details = append(last.details, "two-break search: "+surfaceText(r.Surface))
		}
		if r.Bandwidth != nil {
			bw := "bandwidth " + value(*r.Bandwidth, "n/a")
			if r.Kernel != "" {
				bw += " (" + r.Kernel + " kernel)"
			}
			last.details = append(last.details, bw)
		}
		if len(r.Estimates) > 0 {
			last.details = append(last.details, "estimates: "+estimatesText(r.Estimates))
		}
		for _, wmsg := range r.Warnings {
			last.details = append(last.details, "warning: "+wmsg)
		}
	}
	if len(rows) > 0 {
		head := tableRow{test: "test", variant: "variant", stat: "statistic", p: "p-value",
			psim: "p (sim)", cv5: "5% cv", lags: "lags", decision: "decision"}
		wt, wv := len(head.test), len(head.variant)
		for _, r := range rows {
			wt = max(wt, len(r.test))
			wv = max(wv, len(r.variant))
		}
		line := func(r tableRow) string {
			var b strings.Builder
			b.WriteString(pad(r.test, wt, false))
			b.WriteString(" " + pad(r.variant, wv, false))
			b.WriteString(" " + pad(r.stat, 11, true))
			b.WriteString(" " + pad(r.p, 8, true))
			if hasSim {
				b.WriteString(" " + pad(r.psim, 8, true))
			}
			b.WriteString(" " + pad(r.cv5, 10, true))
			b.WriteString(" " + pad(r.lags, 4, true))
			b.WriteString("  " + r.decision)
			return strings.TrimRight(b.String(), " ")
		}
		e.print(line(head) + "\n")
		for _, r := range rows {
			e.print(line(r) + "\n")
			for _, d := range r.details {
				for _, l := range wrap(d, tableWidth-8) {
					e.print("      " + l + "\n")
				}
			}
		}
	}
	for _, er := range s.Errors {
		for _, l := range wrap("error: "+errorText(er), tableWidth-2) {
			e.print(l + "\n")
		}
	}
	for _, wmsg := range s.Warnings {
		for _, l := range wrap("warning: "+wmsg, tableWidth-2) {
			e.print(l + "\n")
		}
	}
}

// componentRow is the line of one component (an M-test statistic or a
// structural-change statistic) under its result.
func componentRow(r *schema.Result, c *schema.Component) tableRow {
	row := tableRow{
		test:     "",
		variant:  "  " + visible(c.Name),
		stat:     numP(c.Statistic, "n/a"),
		p:        compP(c, "n/a"),
		psim:     "-",
		lags:     "",
		decision: componentDecision(r, c),
	}
	if v, ok := cv(c.CriticalValues, "0.05"); ok {
		row.cv5 = num(v, "n/a")
	} else {
		row.cv5 = "n/a"
	}
	return row
}

// errorText is an error with its test and input location.
func errorText(er schema.Error) string {
	var parts []string
	if er.Test != "" {
		parts = append(parts, er.Test)
	}
	if er.Row > 0 {
		parts = append(parts, "row "+strconv.Itoa(er.Row))
	}
	if er.Column != "" {
		parts = append(parts, "column "+er.Column)
	}
	if len(parts) == 0 {
		return er.Message
	}
	return "[" + strings.Join(parts, ", ") + "] " + er.Message
}

// pad pads s with spaces to width runes, on the left when right is true.
func pad(s string, width int, right bool) string {
	n := len([]rune(s))
	if n >= width {
		return s
	}
	sp := strings.Repeat(" ", width-n)
	if right {
		return sp + s
	}
	return s + sp
}
