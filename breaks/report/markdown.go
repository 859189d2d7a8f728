package report

import (
	"io"
	"strconv"
	"strings"

	"github.com/rootshift/rootshift/core/schema"
)

// WriteMarkdown writes doc as Markdown (CommonMark with pipe tables): a
// title, the settings, then per series a heading, the verdict and its
// explanation, a results table (one row per test and per component), the
// breaks and episodes found, errors and warnings; the caution closes the
// document as a quotation. The error wraps ErrNoDocument or the writer's error.
func WriteMarkdown(w io.Writer, doc *schema.Document) error {
	if doc == nil {
		return ErrNoDocument
	}
	e := &errWriter{w: w}
	title := "# rootshift results"
	if n := sourceName(doc); n != "" {
		title += ": " + mdText(n)
	}
	e.print(title + "\n\n")
	if doc.Version != "" {
		e.print("Version " + mdText(doc.Version) + ". ")
	}
	e.print("Settings: " + mdText(strings.Join(settingsNotes(&doc.Settings), "; ")) + ".\n")
	if notes := inputNotes(doc); len(notes) > 0 {
		e.print("\nNotes on the input:\n\n")
		for _, n := range notes {
			e.print("- " + mdText(n) + "\n")
		}
	}
	for i := range doc.Series {
		mdSeries(e, &doc.Series[i])
	}
	caution := doc.Caution
	if caution == "" {
		caution = schema.Caution
	}
	e.print("\n> **Caution.** " + mdText(caution) + "\n")
	return e.err
}

func mdSeries(e *errWriter, s *schema.Series) {
	e.print("\n## " + mdText(s.Name) + "\n\n")
	e.print(mdText(seriesMeta(s)) + "\n")
	if v := s.Verdict; v != nil {
		e.print("\n**Verdict: " + mdText(verdictHeadline(v)) + ".**\n")
		if v.Explanation != "" {
			e.print("\n" + mdText(v.Explanation) + "\n")
		}
		var items []string
		if len(v.Breaks) > 0 {
			items = append(items, "Breaks: "+breaksText(v.Breaks))
		}
		if v.Window != nil {
			items = append(items, "Window: "+windowText(v.Window))
		}
		if v.Reliability != nil {
			items = append(items, "Error rate: "+reliabilityText(v.Reliability))
		}
		for k := range v.Stages {
			items = append(items, "Stage "+strconv.Itoa(k+1)+", "+stageText(&v.Stages[k]))
		}
		for _, c := range v.Context {
			items = append(items, "Context: "+c)
		}
		for _, t := range v.Supporting {
			items = append(items, "For: "+t)
		}
		for _, t := range v.Against {
			items = append(items, "Against: "+t)
		}
		if len(v.Tests) > 0 {
			items = append(items, "Tests used: "+strings.Join(v.Tests, ", "))
		}
		if len(items) > 0 {
			e.print("\n")
			for _, it := range items {
				e.print("- " + mdText(it) + "\n")
			}
		}
	}
	hasSim := false
	for i := range s.Results {
		if s.Results[i].PValueSim != nil {
			hasSim = true
		}
	}
	if len(s.Results) > 0 {
		e.print("\n| test | variant | statistic | p-value |")
		if hasSim {
			e.print(" p (sim) |")
		}
		e.print(" 5% cv | lags | decision | breaks |\n|---|---|--:|--:|")
		if hasSim {
			e.print("--:|")
		}
		e.print("--:|--:|---|---|\n")
		cell := func(cells ...string) {
			e.print("|")
			for _, c := range cells {
				e.print(" " + c + " |")
			}
			e.print("\n")
		}
		for i := range s.Results {
			r := &s.Results[i]
			variant, vdetail := variantTrendText(r)
			cv5 := "n/a"
			if c, ok := cv(r.CriticalValues, "0.05"); ok {
				cv5 = num(c, "n/a")
			}
			cells := []string{mdCell(r.Test), mdCell(variant), numP(r.Statistic, "n/a"), resultP(r, "n/a")}
			if hasSim {
				cells = append(cells, simP(r, "n/a"))
			}
			var extra []string
			if vdetail != "" {
				extra = append(extra, vdetail)
			}
			if len(r.Breaks) > 0 {
				extra = append(extra, breaksText(r.Breaks))
			}
			if len(r.Episodes) > 0 {
				extra = append(extra, "explosive: "+episodeText(r.Episodes))
			}
			if r.Surface != nil {
				extra = append(extra, surfaceText(r.Surface))
			}
			cells = append(cells, cv5, strconv.Itoa(r.Lags), mdCell(resultDecision(r)), mdCell(strings.Join(extra, "; ")))
			cell(cells...)
			comps := append(append([]schema.Component(nil), r.Components...), r.BreakTests...)
			for j := range comps {
				c := &comps[j]
				ccv := "n/a"
				if v, ok := cv(c.CriticalValues, "0.05"); ok {
					ccv = num(v, "n/a")
				}
				cc := []string{"", mdCell("↳ " + c.Name), numP(c.Statistic, "n/a"), compP(c, "n/a")}
				if hasSim {
					cc = append(cc, "")
				}
				cc = append(cc, ccv, "", mdCell(componentDecision(r, c)), "")
				cell(cc...)
			}
		}
		var notes []string
		for i := range s.Results {
			r := &s.Results[i]
			for _, wmsg := range r.Warnings {
				notes = append(notes, r.Test+": "+wmsg)
			}
		}
		if len(notes) > 0 {
			e.print("\n")
			for _, n := range notes {
				e.print("- Note: " + mdText(n) + "\n")
			}
		}
	}
	if len(s.Errors) > 0 || len(s.Warnings) > 0 {
		e.print("\n")
		for _, er := range s.Errors {
			e.print("- **Error:** " + mdText(errorText(er)) + "\n")
		}
		for _, wmsg := range s.Warnings {
			e.print("- Warning: " + mdText(wmsg) + "\n")
		}
	}
}

// mdText escapes running text for Markdown (CommonMark with the common
// table, strikethrough and math extensions): control characters are shown
// visibly, the characters that start emphasis, code, links, headings, table
// cells, strikethrough or math get a backslash, and "<" and "&" get one only
// where they could open an HTML tag, an autolink or an entity (before a
// letter, '/', '!', '?' or '#'), so that "p<0.001" reads as written. A ">"
// that begins the text is escaped (a quotation); elsewhere it is plain.
func mdText(s string) string {
	s = outText(s)
	var b strings.Builder
	b.Grow(len(s) + 8)
	for i := 0; i < len(s); i++ {
		c := s[i]
		switch c {
		case '\\', '`', '*', '_', '[', ']', '#', '|', '$', '~':
			b.WriteByte('\\')
		case '<':
			if i+1 < len(s) && opensMarkup(s[i+1]) {
				b.WriteByte('\\')
			}
		case '&':
			if i+1 < len(s) && (isLetter(s[i+1]) || s[i+1] == '#') {
				b.WriteByte('\\')
			}
		case '>':
			if strings.TrimLeft(s[:i], " ") == "" {
				b.WriteByte('\\')
			}
		}
		b.WriteByte(c)
	}
	return b.String()
}

// opensMarkup reports whether c after "<" could start an HTML tag, a
// comment, a declaration, a processing instruction or an autolink.
func opensMarkup(c byte) bool { return isLetter(c) || c == '/' || c == '!' || c == '?' }

func isLetter(c byte) bool { return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') }

// mdCell escapes a table cell.
func mdCell(s string) string { return mdText(s) }
