package report

import (
	"io"
	"strconv"
	"strings"

	"github.com/rootshift/rootshift/core/dataset"
	"github.com/rootshift/rootshift/core/schema"
)

// htmlStyle is the report's only styling: inline, no fonts or images.
const htmlStyle = `
body{font-family:system-ui,-apple-system,"Segoe UI",Roboto,Helvetica,Arial,sans-serif;color:#222;background:#fff;max-width:980px;margin:1.5em auto;padding:0 1em;line-height:1.45}
h1{font-size:1.5em;margin-bottom:.2em}
h2{font-size:1.25em;border-bottom:1px solid #ccc;padding-bottom:.2em;margin-top:2em}
h3{font-size:1.05em;margin:1.2em 0 .4em}
.caution{background:#fff8e1;border-left:4px solid #f0b400;padding:.6em .9em}
.settings,.meta{color:#555;font-size:.92em}
.verdict{border:1px solid #bbb;border-left:6px solid #888;padding:.5em .9em;margin:.8em 0;background:#fafafa}
.verdict .headline{font-weight:bold;font-size:1.08em;margin:.2em 0}
.v-stationary,.v-trend-stationary,.v-break-stationary{border-left-color:#2e7d32}
.v-unit-root,.v-unit-root-breaks{border-left-color:#1565c0}
.v-explosive{border-left-color:#c62828}
.v-inconclusive{border-left-color:#9e9e9e}
table{border-collapse:collapse;margin:.6em 0;font-size:.92em}
th,td{border-bottom:1px solid #ddd;padding:.25em .6em;text-align:left;vertical-align:top}
th{background:#f2f2f2}
td.num{text-align:right;font-variant-numeric:tabular-nums;white-space:nowrap}
tr.component td{color:#444;font-size:.95em}
tr.component td.name{padding-left:1.6em}
.reject{font-weight:bold}
.errors li{color:#b71c1c}
.warnings li{color:#8d6e00}
figure{margin:1em 0}
figure svg{max-width:100%;height:auto;border:1px solid #eee}
figcaption{color:#555;font-size:.9em}
.scroll{max-width:100%;overflow-x:auto}
table.overview td.class{font-weight:bold}
table.stages{font-size:.9em;margin:.4em 0}
.reliability{font-size:.95em}
@media (max-width:600px){body{padding:0 .5em;margin:.8em auto}th,td{padding:.2em .35em}}
`

// WriteHTML writes doc as one self-contained HTML page: inline CSS only,
// no scripts, fonts, images or links to anything outside the page. It opens
// with the caution and the settings, then gives per series the verdict with
// its explanation, the results table, errors and warnings, and the plots:
// the series with its breaks and episodes (SeriesSVG), its autocorrelations
// (ACFSVG) and every search path or sequence (PathSVG). inputs are the
// prepared series aligned with doc.Series by index; a series without input
// values gets no series or ACF plot. The page is also well-formed XML.
// The error wraps ErrNoDocument or the writer's error.
func WriteHTML(w io.Writer, doc *schema.Document, inputs []dataset.Series) error {
	if doc == nil {
		return ErrNoDocument
	}
	e := &errWriter{w: w}
	title := "rootshift results"
	if n := sourceName(doc); n != "" {
		title += ": " + n
	}
	e.print("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\"/>\n" +
		"<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\"/>\n")
	e.print("<title>" + esc(title) + "</title>\n<style>" + htmlStyle + "</style>\n</head>\n<body>\n")
	e.print("<h1>" + esc(title) + "</h1>\n")
	caution := doc.Caution
	if caution == "" {
		caution = schema.Caution
	}
	e.print("<p class=\"caution\"><strong>Caution.</strong> " + esc(caution) + "</p>\n")
	meta := ""
	if doc.Version != "" {
		meta = "rootshift " + doc.Version + ". "
	}
	if doc.Source != nil && doc.Source.Rows > 0 {
		meta += strconv.Itoa(doc.Source.Rows) + " rows"
		if doc.Source.DateColumn != "" {
			meta += ", dates in column " + doc.Source.DateColumn
		}
		if doc.Source.Frequency != "" {
			meta += ", " + doc.Source.Frequency
		}
		meta += ". "
	}
	e.print("<p class=\"settings\">" + esc(meta+"Settings: "+strings.Join(settingsNotes(&doc.Settings), "; ")+".") + "</p>\n")
	htmlList(e, "Notes on the input", "notes", inputNotes(doc))
	if len(doc.Series) > 1 {
		htmlOverview(e, doc)
	}
	for i := range doc.Series {
		var in *dataset.Series
		if i < len(inputs) && inputs[i].Values != nil {
			in = &inputs[i]
		}
		htmlSeries(e, i+1, &doc.Series[i], in)
	}
	e.print("</body>\n</html>\n")
	return e.err
}

func htmlSeries(e *errWriter, num1 int, s *schema.Series, in *dataset.Series) {
	e.print("<section id=\"series-" + strconv.Itoa(num1) + "\">\n")
	e.print("<h2>" + esc(s.Name) + "</h2>\n")
	e.print("<p class=\"meta\">" + esc(seriesMeta(s)) + "</p>\n")
	if v := s.Verdict; v != nil {
		e.print("<div class=\"verdict v-" + esc(cssClass(v.Class)) + "\">\n")
		e.print("<p class=\"headline\">Verdict: " + esc(verdictHeadline(v)) + "</p>\n")
		if v.Explanation != "" {
			e.print("<p>" + esc(v.Explanation) + "</p>\n")
		}
		if len(v.Breaks) > 0 {
			e.print("<p>Breaks: " + esc(breaksText(v.Breaks)) + "</p>\n")
		}
		if v.Window != nil {
			e.print("<p>" + esc(upperFirst(windowText(v.Window))) + "</p>\n")
		}
		if v.Reliability != nil {
			e.print("<p class=\"reliability\"><strong>Error rate:</strong> " + esc(reliabilityText(v.Reliability)) + "</p>\n")
		}
		htmlStages(e, v.Stages)
		htmlList(e, "Context (computed, did not decide the class)", "", v.Context)
		htmlList(e, "Evidence for", "", v.Supporting)
		htmlList(e, "Evidence against", "", v.Against)
		if len(v.Tests) > 0 {
			e.print("<p class=\"meta\">Tests used: " + esc(strings.Join(v.Tests, ", ")) + "</p>\n")
		}
		e.print("</div>\n")
	}
	if len(s.Results) > 0 {
		htmlResults(e, s)
	}
	var errs []string
	for _, er := range s.Errors {
		errs = append(errs, errorText(er))
	}
	htmlList(e, "Errors", "errors", errs)
	htmlList(e, "Warnings", "warnings", s.Warnings)
	htmlPlots(e, s, in)
	e.print("</section>\n")
}

func htmlResults(e *errWriter, s *schema.Series) {
	hasSim := false
	for i := range s.Results {
		if s.Results[i].PValueSim != nil {
			hasSim = true
		}
	}
	e.print("<div class=\"scroll\"><table>\n<thead><tr><th>test</th><th>variant</th><th>trend</th><th>statistic</th><th>p-value</th>")
	if hasSim {
		e.print("<th>p-value (simulated)</th>")
	}
	e.print("<th>5% critical value</th><th>lags</th><th>obs.</th><th>decision</th><th>breaks and notes</th></tr></thead>\n<tbody>\n")
	td := func(class, text string) {
		if class != "" {
			e.print("<td class=\"" + class + "\">" + esc(text) + "</td>")
		} else {
			e.print("<td>" + esc(text) + "</td>")
		}
	}
	for i := range s.Results {
		r := &s.Results[i]
		e.print("<tr>")
		td("", r.Test)
		variant, vdetail := variantText(r)
		td("", variant)
		td("", r.Trend)
		td("num", numP(r.Statistic, "n/a"))
		td("num", resultP(r, "n/a"))
		if hasSim {
			td("num", simP(r, "n/a"))
		}
		cv5 := "n/a"
		if c, ok := cv(r.CriticalValues, "0.05"); ok {
			cv5 = num(c, "n/a")
		}
		td("num", cv5)
		td("num", strconv.Itoa(r.Lags))
		td("num", strconv.Itoa(r.NObs))
		cls := ""
		if r.Reject {
			cls = "reject"
		}
		td(cls, resultDecision(r))
		var notes []string
		if vdetail != "" {
			notes = append(notes, vdetail)
		}
		if len(r.Breaks) > 0 {
			notes = append(notes, "breaks: "+breaksText(r.Breaks))
		}
		if len(r.Episodes) > 0 {
			notes = append(notes, "explosive episodes: "+episodeText(r.Episodes))
		}
		if r.Surface != nil {
			notes = append(notes, "two-break search: "+surfaceText(r.Surface))
		}
		if r.Bandwidth != nil {
			notes = append(notes, strings.TrimSpace("bandwidth "+value(*r.Bandwidth, "n/a")+" "+r.Kernel))
		}
		if len(r.Estimates) > 0 {
			notes = append(notes, "estimates: "+estimatesText(r.Estimates))
		}
		notes = append(notes, r.Warnings...)
		if r.PValueMethod != "" {
			notes = append(notes, "p-value: "+r.PValueMethod)
		}
		td("", strings.Join(notes, "; "))
		e.print("</tr>\n")
		comps := append(append([]schema.Component(nil), r.Components...), r.BreakTests...)
		for j := range comps {
			c := &comps[j]
			e.print("<tr class=\"component\">")
			td("", "")
			td("name", c.Name)
			td("", "")
			td("num", numP(c.Statistic, "n/a"))
			td("num", compP(c, "n/a"))
			if hasSim {
				td("", "")
			}
			ccv := "n/a"
			if v, ok := cv(c.CriticalValues, "0.05"); ok {
				ccv = num(v, "n/a")
			}
			td("num", ccv)
			td("", "")
			td("", "")
			cls := ""
			if c.Reject {
				cls = "reject"
			}
			td(cls, componentDecision(r, c))
			td("", "")
			e.print("</tr>\n")
		}
	}
	e.print("</tbody>\n</table></div>\n")
}

// htmlOverview writes one row per series before any detail: name (a link
// to the series), class, order, transform, breaks, the window's answer and
// the verdict's error rate (these two only when some series has them).
func htmlOverview(e *errWriter, doc *schema.Document) {
	rows, hasWindow, hasRate := overviewRows(doc)
	e.print("<h2 id=\"overview\">Overview</h2>\n<div class=\"scroll\"><table class=\"overview\">\n<thead><tr><th>series</th><th>class</th><th>order</th><th>transform</th><th>breaks</th>")
	if hasWindow {
		e.print("<th>window</th>")
	}
	if hasRate {
		e.print("<th>error rate</th>")
	}
	e.print("</tr></thead>\n<tbody>\n")
	for i, r := range rows {
		e.print("<tr><td><a href=\"#series-" + strconv.Itoa(i+1) + "\">" + esc(r.name) + "</a></td>")
		e.print("<td class=\"class\">" + esc(r.class) + "</td><td class=\"num\">" + esc(r.order) + "</td><td>" +
			esc(r.transform) + "</td><td>" + esc(r.breaks) + "</td>")
		if hasWindow {
			e.print("<td>" + esc(r.window) + "</td>")
		}
		if hasRate {
			e.print("<td class=\"num\">" + esc(r.errRate) + "</td>")
		}
		e.print("</tr>\n")
	}
	e.print("</tbody>\n</table></div>\n")
}

// htmlStages writes the stages of the verdict as a small table.
func htmlStages(e *errWriter, stages []schema.Stage) {
	if len(stages) == 0 {
		return
	}
	e.print("<div class=\"scroll\"><table class=\"stages\">\n<thead><tr><th>stage</th><th>decision</th><th>method</th><th>statistic</th><th>p-value</th></tr></thead>\n<tbody>\n")
	for k := range stages {
		st := &stages[k]
		stat := ""
		if st.Statistic != nil && finite(*st.Statistic) {
			stat = num(*st.Statistic, "")
		}
		e.print("<tr><td>" + esc(strconv.Itoa(k+1)+". "+st.Name) + "</td><td>" + esc(st.Decision) + "</td><td>" + esc(st.Method) +
			"</td><td class=\"num\">" + esc(stat) + "</td><td class=\"num\">" + esc(stageP(st)) + "</td></tr>\n")
	}
	e.print("</tbody>\n</table></div>\n")
}

// htmlPlots writes the figures of a series.
func htmlPlots(e *errWriter, s *schema.Series, in *dataset.Series) {
	var figs []string
	var caps []string
	if in != nil {
		figs = append(figs, SeriesPlot(*in, s))
		caps = append(caps, "The series; dashed lines fall between the last observation of the old regime and the first of the new; shaded: confidence intervals of the breaks, explosive episodes and the suspected window.")
		figs = append(figs, ACFSVG(*in, 0))
		caps = append(caps, "Autocorrelations of the level and of the first difference, with the approximate 95% band under white noise. A slowly decaying level ACF is typical of a unit root, and also of a stationary series with a level shift.")
	}
	for i := range s.Results {
		r := &s.Results[i]
		if len(r.Path) > 0 || (r.Sequence != nil && len(r.Sequence.Index) > 0) || (r.Surface != nil && len(r.Surface.Rows) > 0) {
			figs = append(figs, ResultPlot(*r, in))
			caps = append(caps, "Search statistic of "+r.Test+" and its critical value.")
		}
	}
	if len(figs) == 0 {
		return
	}
	e.print("<h3>Plots</h3>\n")
	for i, f := range figs {
		e.print("<figure>\n" + inlineSVG(f) + "\n<figcaption>" + esc(caps[i]) + "</figcaption>\n</figure>\n")
	}
}

// PlotBreaks are the breaks drawn on a series plot: with a verdict, the
// verdict's (possibly none: a break a test only searched for, without
// finding it significant, is not drawn as if it were real); without one,
// those of the first result that rejects and dates breaks.
func PlotBreaks(s *schema.Series) []schema.Break {
	if s.Verdict != nil {
		return s.Verdict.Breaks
	}
	for i := range s.Results {
		if s.Results[i].Reject && len(s.Results[i].Breaks) > 0 {
			return s.Results[i].Breaks
		}
	}
	return nil
}

// inlineSVG drops the namespace declaration, which HTML does not need for
// inline SVG, so that the page names no outside address at all.
func inlineSVG(svg string) string {
	return strings.Replace(svg, ` xmlns="http://www.w3.org/2000/svg"`, "", 1)
}

func htmlList(e *errWriter, heading, class string, items []string) {
	if len(items) == 0 {
		return
	}
	if class != "" {
		e.print("<div class=\"" + class + "\">")
	} else {
		e.print("<div>")
	}
	e.print("<p>" + esc(heading) + ":</p>\n<ul>\n")
	for _, it := range items {
		e.print("<li>" + esc(it) + "</li>\n")
	}
	e.print("</ul></div>\n")
}

// cssClass keeps letters, digits and '-' of s.
func cssClass(s string) string {
	var b strings.Builder
	for _, r := range s {
		if r == '-' || (r >= 'a' && r <= 'z') || (r >= 'A' && r <= 'Z') || (r >= '0' && r <= '9') {
			b.WriteRune(r)
		}
	}
	return b.String()
}

func upperFirst(s string) string {
	if s == "" {
		return s
	}
	return strings.ToUpper(s[:1]) + s[1:]
}
