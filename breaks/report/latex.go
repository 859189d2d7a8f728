package report

import (
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/rootshift/rootshift/core/schema"
)

// WriteLaTeX writes doc as a LaTeX table fragment for \input: a table
// environment holding one plain tabular (no packages needed: \hline rules,
// no booktabs) with a block per series (its name and sample, then one row
// per test and per component: test, variant, trend, statistic with stars,
// p-value, 5% critical value, lags, break dates), the verdict of the series,
// and a notes line on the settings (trend, lag rule, max lags, trimming,
// level, simulation). Stars mark significance at 10% (*), 5% (**) and 1%
// (***). Text is escaped; numbers are in math mode so minus signs typeset
// correctly. The error wraps ErrNoDocument or the writer's error.
func WriteLaTeX(w io.Writer, doc *schema.Document) error {
	if doc == nil {
		return ErrNoDocument
	}
	e := &errWriter{w: w}
	e.print("% rootshift results table. Include with \\input; needs no extra packages.\n")
	e.print("% Stars: * p < 0.10, ** p < 0.05, *** p < 0.01.\n")
	e.print("\\begin{table}[htbp]\n\\centering\n")
	caption := "Unit-root and structural-break tests"
	if n := sourceName(doc); n != "" {
		caption += ": " + texEscape(n)
	}
	e.print("\\caption{" + caption + "}\n")
	sim := false
	for i := range doc.Series {
		for j := range doc.Series[i].Results {
			if doc.Series[i].Results[j].PValueSim != nil {
				sim = true
			}
		}
	}
	t := &texTable{e: e, sim: sim, cols: 8}
	spec, head := "lllrr", "Test & Variant & Trend & Statistic & $p$-value"
	if sim {
		t.cols++
		spec += "r"
		head += " & Sim. $p$"
	}
	spec += "rrl"
	head += " & 5\\% c.v. & Lags & Breaks"
	e.print("\\begin{tabular}{" + spec + "}\n\\hline\n")
	e.print(head + " \\\\\n\\hline\n")
	for i := range doc.Series {
		if i > 0 {
			e.print("\\hline\n")
		}
		t.series(&doc.Series[i])
	}
	e.print("\\hline\n")
	notes := "Notes: " + texEscape(strings.Join(settingsNotes(&doc.Settings), "; ")) +
		". Stars: * $p<0.10$, ** $p<0.05$, *** $p<0.01$ (simulated $p$-value or critical values when there is no asymptotic one)."
	if in := inputNotes(doc); len(in) > 0 {
		notes += " Input: " + texEscape(strings.Join(in, "; ")) + "."
	}
	notes += " Caution: " + texEscape(caution(doc))
	t.span(texWide, "\\footnotesize "+notes)
	e.print("\\end{tabular}\n\\end{table}\n")
	return e.err
}

// texWide is the column type of the rows that span the table: a paragraph
// column, so long verdicts and notes wrap instead of widening the table.
const texWide = `p{0.9\linewidth}`

// texTable writes the rows of the LaTeX tabular.
type texTable struct {
	e    *errWriter
	sim  bool // a simulated p-value column is present
	cols int
}

// span is a row with one cell spanning every column.
func (t *texTable) span(align, text string) {
	t.e.print("\\multicolumn{" + strconv.Itoa(t.cols) + "}{" + align + "}{" + text + "} \\\\\n")
}

func (t *texTable) series(s *schema.Series) {
	e := t.e
	head := "\\textit{" + texEscape(s.Name) + "} (" + texEscape(seriesMeta(s)) + ")"
	t.span("l", head)
	for i := range s.Results {
		r := &s.Results[i]
		variant, _ := variantText(r)
		stat := texNum(r.Statistic, stars(starsP(r.PValue, resultPBound(r)), r.PValueSim, r.Statistic, r.CriticalValues, r.Tail))
		cv5 := "--"
		if c, ok := cv(r.CriticalValues, "0.05"); ok {
			cv5 = texNum(&c, "")
		}
		var br []string
		if len(r.Breaks) > 0 {
			br = append(br, strings.Join(breakDates(r.Breaks), ", "))
		}
		if len(r.Episodes) > 0 {
			br = append(br, "explosive "+episodeText(r.Episodes))
		}
		cells := []string{texEscape(r.Test), texEscape(variant), texEscape(r.Trend), stat, texP(r.PValue, resultPBound(r))}
		if t.sim {
			cells = append(cells, texP(r.PValueSim, pBound(r.PValueSim, false)))
		}
		cells = append(cells, cv5, strconv.Itoa(r.Lags), texEscape(strings.Join(br, "; ")))
		e.print(strings.Join(cells, " & ") + " \\\\\n")
		comps := append(append([]schema.Component(nil), r.Components...), r.BreakTests...)
		for j := range comps {
			c := &comps[j]
			tail := c.Tail
			if tail == "" {
				tail = r.Tail
			}
			ccv := "--"
			if v, ok := cv(c.CriticalValues, "0.05"); ok {
				ccv = texNum(&v, "")
			}
			cc := []string{"", "\\quad " + texEscape(c.Name), "",
				texNum(c.Statistic, stars(c.PValue, nil, c.Statistic, c.CriticalValues, tail)), texP(c.PValue, pBound(c.PValue, false))}
			if t.sim {
				cc = append(cc, "")
			}
			cc = append(cc, ccv, "", "")
			e.print(strings.Join(cc, " & ") + " \\\\\n")
		}
	}
	if v := s.Verdict; v != nil {
		t.span(texWide, "Verdict: "+texEscape(verdictHeadline(v)))
	}
	for _, er := range s.Errors {
		t.span(texWide, "Error: "+texEscape(errorText(er)))
	}
}

// texNum formats *p in math mode with optional stars as a superscript, or
// "--" when p is nil or not finite.
func texNum(p *float64, stars string) string {
	if p == nil || !finite(*p) {
		return "--"
	}
	s := "$" + num(*p, "")
	if stars != "" {
		s += "^{" + stars + "}"
	}
	return s + "$"
}

// texReplacer escapes LaTeX special characters in text.
var texReplacer = strings.NewReplacer(
	`\`, `\textbackslash{}`, "&", `\&`, "%", `\%`, "$", `\$`, "#", `\#`, "_", `\_`,
	"{", `\{`, "}", `\}`, "~", `\textasciitilde{}`, "^", `\textasciicircum{}`,
	"<", `\textless{}`, ">", `\textgreater{}`, "|", `\textbar{}`, "\n", " ", "\r", " ",
)

// texEscape escapes text for LaTeX: control characters shown visibly,
// special characters replaced, and characters that a LaTeX run with the
// default fonts cannot typeset (anything beyond Latin-1 but a few
// typographic marks, and the six Latin-1 letters and guillemets the default
// encoding lacks) written as their code point, "[U+FF1D]", so that the
// fragment compiles with pdflatex and no extra package.
func texEscape(s string) string { return texReplacer.Replace(texChars(outText(s))) }

// texMissing are the Latin-1 characters the default OT1 font encoding lacks
// (found by running pdflatex on each character of U+00A1..U+00FF).
const texMissing = "«»ÐÞðþ"

// texExtra are characters beyond Latin-1 that pdflatex typesets by default.
const texExtra = "–—‘’“”…€•™"

// texChars writes every character outside what pdflatex typesets by default
// as "[U+XXXX]".
func texChars(s string) string {
	ok := func(r rune) bool {
		if r < 0x80 {
			return true
		}
		if r >= 0xa0 && r <= 0xff {
			return !strings.ContainsRune(texMissing, r)
		}
		return strings.ContainsRune(texExtra, r)
	}
	clean := true
	for _, r := range s {
		if !ok(r) {
			clean = false
			break
		}
	}
	if clean {
		return s
	}
	var b strings.Builder
	for _, r := range s {
		if ok(r) {
			b.WriteRune(r)
		} else {
			b.WriteString(fmt.Sprintf("[U+%04X]", r))
		}
	}
	return b.String()
}

// texP formats a p-value in math mode as schema.FormatP writes it
// ("$0.620$", "$<0.001$"), or "--" when p is nil or not finite.
func texP(p *float64, bound string) string {
	if p == nil || !finite(*p) {
		return "--"
	}
	return "$" + schema.FormatP(p, bound) + "$"
}

// starsP is the p-value the stars read: a lower-end bound "<p" means the
// true p-value is below p (the statistic lies beyond the table's p
// quantile), so it counts as just below p.
func starsP(p *float64, bound string) *float64 {
	if p == nil || bound != "<" {
		return p
	}
	x := math.Nextafter(*p, 0)
	return &x
}
