package report

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"encoding/xml"
	"errors"
	"flag"
	"io"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
	"unicode/utf8"

	"github.com/rootshift/rootshift/core/schema"
)

var update = flag.Bool("update", false, "rewrite the golden files in testdata/")

// goldenExt maps each format to the extension of its golden file.
var goldenExt = map[string]string{
	"table": "txt", "json": "json", "csv": "csv", "md": "md", "latex": "tex", "html": "html",
}

// TestGolden writes the fixture document in every format and compares the
// output with testdata/fixture.<format>.golden (common practice: golden
// files reviewed by hand; regenerate with go test -run TestGolden -update).
func TestGolden(t *testing.T) {
	for _, format := range Formats {
		t.Run(format, func(t *testing.T) {
			var buf bytes.Buffer
			if err := Write(&buf, format, fixtureDoc(), fixtureInputs()); err != nil {
				t.Fatal(err)
			}
			path := filepath.Join("testdata", "fixture."+goldenExt[format]+".golden")
			if *update {
				if err := os.WriteFile(path, buf.Bytes(), 0o644); err != nil {
					t.Fatal(err)
				}
				return
			}
			want, err := os.ReadFile(path)
			if err != nil {
				t.Fatalf("%v (run go test -run TestGolden -update)", err)
			}
			if !bytes.Equal(buf.Bytes(), want) {
				got := path + ".got"
				_ = os.WriteFile(got, buf.Bytes(), 0o644)
				t.Errorf("output differs from %s; wrote %s", path, got)
			}
		})
	}
}

// TestEveryFormatHasItsFunction checks that Write dispatches each name in
// Formats to the same bytes as the format's own function.
func TestEveryFormatHasItsFunction(t *testing.T) {
	doc, in := fixtureDoc(), fixtureInputs()
	own := map[string]func(io.Writer) error{
		"table": func(w io.Writer) error { return WriteTable(w, doc) },
		"json":  func(w io.Writer) error { return WriteJSON(w, doc) },
		"csv":   func(w io.Writer) error { return WriteCSV(w, doc) },
		"md":    func(w io.Writer) error { return WriteMarkdown(w, doc) },
		"latex": func(w io.Writer) error { return WriteLaTeX(w, doc) },
		"html":  func(w io.Writer) error { return WriteHTML(w, doc, in) },
	}
	if len(own) != len(Formats) {
		t.Fatalf("Formats has %d names, test knows %d", len(Formats), len(own))
	}
	for _, f := range Formats {
		var a, b bytes.Buffer
		if err := Write(&a, f, doc, in); err != nil {
			t.Fatal(err)
		}
		if err := own[f](&b); err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(a.Bytes(), b.Bytes()) {
			t.Errorf("%s: Write differs from the format's function", f)
		}
		if a.Len() == 0 {
			t.Errorf("%s: empty output", f)
		}
	}
}

func TestWriteErrors(t *testing.T) {
	if err := Write(io.Discard, "pdf", fixtureDoc(), nil); !errors.Is(err, ErrFormat) {
		t.Errorf("unknown format: got %v, want ErrFormat", err)
	}
	for _, f := range Formats {
		if err := Write(io.Discard, f, nil, nil); !errors.Is(err, ErrNoDocument) {
			t.Errorf("%s: nil document: got %v, want ErrNoDocument", f, err)
		}
	}
	// The default format is the table.
	var a, b bytes.Buffer
	_ = Write(&a, "", fixtureDoc(), nil)
	_ = WriteTable(&b, fixtureDoc())
	if a.String() != b.String() {
		t.Error(`Write with format "" is not the table`)
	}
	// A failing writer reports its error.
	werr := errors.New("disk full")
	for _, f := range Formats {
		if err := Write(failWriter{werr}, f, fixtureDoc(), fixtureInputs()); !errors.Is(err, werr) {
			t.Errorf("%s: failing writer: got %v", f, err)
		}
	}
}

type failWriter struct{ err error }

func (f failWriter) Write([]byte) (int, error) { return 0, f.err }

// TestJSONExact checks the contract: exactly json.MarshalIndent(doc, "", "  ")
// plus a newline, and that it reads back to the same document.
func TestJSONExact(t *testing.T) {
	doc := fixtureDoc()
	var buf bytes.Buffer
	if err := WriteJSON(&buf, doc); err != nil {
		t.Fatal(err)
	}
	want, _ := json.MarshalIndent(doc, "", "  ")
	want = append(want, '\n')
	if !bytes.Equal(buf.Bytes(), want) {
		t.Fatal("WriteJSON is not MarshalIndent + newline")
	}
	var back schema.Document
	if err := json.Unmarshal(buf.Bytes(), &back); err != nil {
		t.Fatal(err)
	}
	// NaN statistics are not representable: the fixture's MPT is NaN, which
	// marshals as null only if it was nil; schema.F turns NaN into nil.
	if !reflect.DeepEqual(back.Series[0].Results[0], doc.Series[0].Results[0]) {
		t.Error("adf result does not round-trip")
	}
}

// TestTable checks the terminal layout: lines fit in 100 columns, each
// block starts with the series header, decisions are in words, nil
// p-values print as n/a, and the caution closes the output.
func TestTable(t *testing.T) {
	var buf bytes.Buffer
	if err := WriteTable(&buf, fixtureDoc()); err != nil {
		t.Fatal(err)
	}
	out := buf.String()
	for i, l := range strings.Split(out, "\n") {
		if n := utf8.RuneCountInString(l); n > tableWidth {
			t.Errorf("line %d has %d columns: %q", i+1, n, l)
		}
	}
	for _, want := range []string{
		"== GDP_real & co %  (n=60, 1990Q1..2004Q4, quarterly, transform: log)",
		"Verdict: stationary around structural breaks, I(0); recommended transform: add shift dummies at\n  the breaks\n",
		"cannot reject unit root", "rejects unit root", "rejects stationarity", "finds a break", "no break found",
		"rejects unit root (explosive)",
		"breaks: 1997Q2 (obs 30; 90% CI 1996Q3..1998Q1)",
		"explosive episodes: 1999Q4..2001Q2",
		"error: [za] za: series too short",
		"error: [row 13, column CPI #2 {x}$]",
		"warning: 1 missing value",
		"p (sim)",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("table lacks %q", want)
		}
	}
	za := lineWith(out, "za ")
	if !strings.Contains(za, "n/a") || !strings.Contains(za, "-5.2345") || !strings.Contains(za, "-4.8000") {
		t.Errorf("za line %q: want statistic -5.2345, p n/a, cv -4.8000", za)
	}
	if !strings.HasSuffix(strings.TrimSpace(out), strings.TrimSpace(wrap(schema.Caution, 98)[len(wrap(schema.Caution, 98))-1])) {
		t.Error("table does not end with the caution")
	}
	if strings.Contains(out, "NaN") {
		t.Error("table prints NaN")
	}
}

func lineWith(out, prefix string) string {
	for _, l := range strings.Split(out, "\n") {
		if strings.HasPrefix(l, prefix) {
			return l
		}
	}
	return ""
}

// TestCSVParsesBack reads the CSV with encoding/csv (which insists on the
// same number of fields on every row) and checks rows and cells.
func TestCSVParsesBack(t *testing.T) {
	doc := fixtureDoc()
	doc.Series[1].Name = "=SUM(A1:A9)" // a formula must not reach a spreadsheet
	var buf bytes.Buffer
	if err := WriteCSV(&buf, doc); err != nil {
		t.Fatal(err)
	}
	recs, err := csv.NewReader(&buf).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(recs[0], CSVHeader) {
		t.Fatalf("header %v", recs[0])
	}
	col := map[string]int{}
	for i, h := range CSVHeader {
		col[h] = i
	}
	// 7 results + 4 M-test components + 2 bp statistics; 1 result + 2 errors + 1 warning.
	if want := 1 + 7 + 4 + 2 + 1 + 2 + 1; len(recs) != want {
		t.Fatalf("%d rows, want %d", len(recs), want)
	}
	find := func(kind, test, comp string) []string {
		for _, r := range recs[1:] {
			if r[col["row_type"]] == kind && r[col["test"]] == test && r[col["component"]] == comp {
				return r
			}
		}
		t.Fatalf("no %s row for %s %s", kind, test, comp)
		return nil
	}
	za := find("result", "za", "")
	for k, want := range map[string]string{
		"statistic": "-5.2345", "p_value": "", "cv_5": "-4.8", "cv_1": "-5.34", "break_dates": "1997Q2",
		"break_indexes": "30", "reject": "true", "decision": "rejects unit root", "verdict_class": "break-stationary",
		"verdict_order": "0", "verdict_transform": "shift-dummies", "shift": "level", "lags": "3", "nobs": "56",
	} {
		if got := za[col[k]]; got != want {
			t.Errorf("za %s = %q, want %q", k, got, want)
		}
	}
	if got := find("result", "ls2", "")[col["break_dates"]]; got != "1997Q2;2000Q4" {
		t.Errorf("ls2 break_dates %q", got)
	}
	if got := find("component", "mtests", "MPT")[col["statistic"]]; got != "" {
		t.Errorf("NaN MPT printed as %q", got)
	}
	if got := find("component", "bp", "supF(1|0)")[col["p_value"]]; got != "0.0004" {
		t.Errorf("supF p %q", got)
	}
	pp := find("result", "pp", "")
	if pp[col["p_value_sim"]] != "0.499" || pp[col["series"]] != "'=SUM(A1:A9)" || pp[col["verdict_class"]] != "" {
		t.Errorf("pp row %v", pp)
	}
	if e := find("error", "za", ""); !strings.Contains(e[col["message"]], "too short") {
		t.Errorf("error row %v", e)
	}
}

// TestCSVEmptySeries: a series with nothing to report still has a row.
func TestCSVEmptySeries(t *testing.T) {
	doc := &schema.Document{Series: []schema.Series{{Name: "x"}}}
	var buf bytes.Buffer
	if err := WriteCSV(&buf, doc); err != nil {
		t.Fatal(err)
	}
	recs, err := csv.NewReader(&buf).ReadAll()
	if err != nil || len(recs) != 2 || recs[1][0] != "series" {
		t.Fatalf("%v %v", recs, err)
	}
}

func TestMarkdown(t *testing.T) {
	var buf bytes.Buffer
	if err := WriteMarkdown(&buf, fixtureDoc()); err != nil {
		t.Fatal(err)
	}
	out := buf.String()
	for _, want := range []string{
		`## GDP\_real & co %`, `## CPI \#2 {x}\$`, "| za | level | -5.2345 | n/a |", "> **Caution.**",
		`|  | ↳ supF(1\|0) | 42.5000 | <0.001 |`, "| kpss | constant | 0.8512 | <0.01 |",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("markdown lacks %q", want)
		}
	}
	// Every table row of a block has the same number of unescaped pipes.
	var pipes int
	for _, l := range strings.Split(out, "\n") {
		if !strings.HasPrefix(l, "|") {
			pipes = 0
			continue
		}
		n := strings.Count(l, "|") - strings.Count(l, `\|`)
		if pipes == 0 {
			pipes = n
		} else if n != pipes {
			t.Errorf("row %q has %d cells separators, want %d", l, n, pipes)
		}
	}
}

// xmlWellFormed decodes s with encoding/xml in strict mode.
func xmlWellFormed(s string) error {
	d := xml.NewDecoder(strings.NewReader(s))
	d.Strict = true
	for {
		_, err := d.Token()
		if err == io.EOF {
			return nil
		}
		if err != nil {
			return err
		}
	}
}
