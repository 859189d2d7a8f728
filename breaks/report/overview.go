package report

import (
	"strconv"
	"strings"

	"github.com/rootshift/rootshift/core/schema"
)

// Overview first (issue 12, item 1): the table and HTML reports open with
// one row per series (name, class, order, transform, breaks, the answer for
// the suspected window, the verdict's simulated error rate), and each
// series' detail below shows the stages of the verdict.

// overviewRow is one series in the overview.
type overviewRow struct {
	name, class, order, transform, breaks, window, errRate string
}

// overviewRows are the rows of doc's overview, and whether any series has a
// window answer and an error rate (columns without content are left out).
func overviewRows(doc *schema.Document) (rows []overviewRow, hasWindow, hasRate bool) {
	for i := range doc.Series {
		s := &doc.Series[i]
		row := overviewRow{name: visible(s.Name), class: "no verdict", order: "-", transform: "-", breaks: "-", window: "", errRate: ""}
		if len(s.Errors) > 0 && s.Verdict == nil {
			row.class = "error"
		}
		if v := s.Verdict; v != nil {
			row.class = visible(v.Class)
			if row.class == "" {
				row.class = "none"
			}
			row.order = "?"
			if v.Order != nil {
				row.order = "I(" + strconv.Itoa(*v.Order) + ")"
			}
			if v.Transform != "" {
				row.transform = visible(v.Transform)
			}
			if len(v.Breaks) > 0 {
				row.breaks = visible(strings.Join(breakDates(v.Breaks), " "))
			} else {
				row.breaks = "none"
			}
			if a := windowAnswer(v.Window); a != "" {
				row.window = a
				hasWindow = true
			}
			if r := errorRate(v.Reliability); r != "" {
				row.errRate = r
				hasRate = true
			}
		}
		rows = append(rows, row)
	}
	return rows, hasWindow, hasRate
}

// windowAnswer is the verdict's answer for the suspected window in a few
// words: its Answer when it gives one, else whether a break falls inside.
func windowAnswer(w *schema.WindowCheck) string {
	switch {
	case w == nil:
		return ""
	case w.Answer != "":
		return visible(w.Answer)
	case w.BreakInside:
		return "break inside"
	}
	return "no break inside"
}

// errorRate is the verdict's simulated error rate at its sample size as a
// percentage ("4.1%"), "n/a" when the table has no rate for the class, or
// "" without reliability figures.
func errorRate(r *schema.Reliability) string {
	if r == nil {
		return ""
	}
	if r.WrongRate == nil || !finite(*r.WrongRate) {
		return "n/a"
	}
	return strconv.FormatFloat(100**r.WrongRate, 'f', 1, 64) + "%"
}

// reliabilityText is the reliability sentence with the sample size it was
// simulated at.
func reliabilityText(r *schema.Reliability) string {
	s := visible(r.Headline)
	var at []string
	if r.T > 0 {
		at = append(at, "T="+strconv.Itoa(r.T))
	}
	if r.Source != "" {
		at = append(at, visible(r.Source))
	}
	if len(at) > 0 {
		s = strings.TrimSpace(s + " (" + strings.Join(at, ", ") + ")")
	}
	return s
}

// stageText describes one stage of the verdict: "unit-root: no unit root
// (ADF ..., p=0.012)".
func stageText(st *schema.Stage) string {
	s := visible(st.Name) + ": " + visible(st.Decision)
	var ev []string
	if st.Method != "" {
		ev = append(ev, visible(st.Method))
	}
	if st.Statistic != nil && finite(*st.Statistic) {
		ev = append(ev, "statistic "+num(*st.Statistic, "n/a"))
	}
	if p := schema.PClause(st.PValue, schema.PBound(st.PValue, false)); p != "" {
		ev = append(ev, p)
	}
	if len(ev) > 0 {
		s += " (" + strings.Join(ev, ", ") + ")"
	}
	return s
}

// stageP is the p-value of a stage in the one format (schema.FormatP).
func stageP(st *schema.Stage) string {
	return schema.FormatP(st.PValue, schema.PBound(st.PValue, false))
}

// windowTestText describes the test whose break search was restricted to
// the window.
func windowTestText(r *schema.Result) string {
	s := "restricted search in the window: " + visible(r.Test)
	if r.Statistic != nil && finite(*r.Statistic) {
		s += " statistic " + num(*r.Statistic, "n/a")
	}
	if p := schema.PClause(r.PValue, resultPBound(r)); p != "" {
		s += ", " + p
	}
	if d := resultDecision(r); d != "" {
		s += " (" + d + ")"
	}
	if len(r.Breaks) > 0 {
		s += ", break " + breaksText(r.Breaks)
	}
	return s
}

// clip cuts s to width runes, marking the cut with "…".
func clip(s string, width int) string {
	r := []rune(s)
	if len(r) <= width {
		return s
	}
	if width <= 1 {
		return "…"
	}
	return string(r[:width-1]) + "…"
}

// tableOverview writes the overview of doc in at most tableWidth columns:
// the name, breaks and window columns are cut (with "…") when the rows are
// too wide; the detail below gives them in full.
func tableOverview(e *errWriter, doc *schema.Document) {
	rows, hasWindow, hasRate := overviewRows(doc)
	head := overviewRow{name: "series", class: "class", order: "order", transform: "transform", breaks: "breaks", window: "window", errRate: "error rate"}
	cols := func(r overviewRow) []string {
		c := []string{r.name, r.class, r.order, r.transform, r.breaks}
		if hasWindow {
			c = append(c, r.window)
		}
		if hasRate {
			c = append(c, r.errRate)
		}
		return c
	}
	widths := make([]int, len(cols(head)))
	for _, r := range append([]overviewRow{head}, rows...) {
		for j, c := range cols(r) {
			widths[j] = max(widths[j], len([]rune(c)))
		}
	}
	// Shrink the cuttable columns (name 0, breaks 4, window 5), widest first.
	cuttable := []int{0, 4}
	if hasWindow {
		cuttable = append(cuttable, 5)
	}
	total := func() int {
		t := 2 * (len(widths) - 1)
		for _, w := range widths {
			t += w
		}
		return t
	}
	for total() > tableWidth {
		j := cuttable[0]
		for _, k := range cuttable {
			if widths[k] > widths[j] {
				j = k
			}
		}
		if widths[j] <= 10 {
			break
		}
		widths[j]--
	}
	line := func(r overviewRow) string {
		var b strings.Builder
		for j, c := range cols(r) {
			if j > 0 {
				b.WriteString("  ")
			}
			b.WriteString(pad(clip(c, widths[j]), widths[j], j == 2 || j == len(widths)-1 && hasRate))
		}
		return strings.TrimRight(b.String(), " ")
	}
	e.print("Overview (" + strconv.Itoa(len(rows)) + " series; details below)\n")
	e.print(line(head) + "\n")
	for _, r := range rows {
		e.print(line(r) + "\n")
	}
}
