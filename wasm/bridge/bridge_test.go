// Native tests of the bridge between the offline page and the engine. The
// reference for every analysis is the command-line tool's own code path
// (battery.AnalyzeText + report.WriteJSON): the page must give the same
// document. Other checks are common practice (no source): error envelopes,
// panic recovery, strict settings decoding.
package bridge

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/rootshift/rootshift/breaks/battery"
	"github.com/rootshift/rootshift/breaks/decide"
	"github.com/rootshift/rootshift/breaks/report"
	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/dataset"
	"github.com/rootshift/rootshift/core/schema"
)

// decode parses an envelope and fails the test when it is not one.
func decode(t *testing.T, out string) Reply {
	t.Helper()
	var r Reply
	dec := json.NewDecoder(strings.NewReader(out))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&r); err != nil {
		t.Fatalf("not an envelope: %v\n%.300s", err, out)
	}
	if r.OK == (r.Error != nil) {
		t.Fatalf("envelope must have exactly one of result and error: %.300s", out)
	}
	return r
}

func wantError(t *testing.T, out, kind, contains string) {
	t.Helper()
	r := decode(t, out)
	if r.OK {
		t.Fatalf("want a %s error, got success: %.200s", kind, out)
	}
	if r.Error.Kind != kind || !strings.Contains(r.Error.Message, contains) {
		t.Errorf("got error %s %q, want kind %s containing %q", r.Error.Kind, r.Error.Message, kind, contains)
	}
}

func testdata(t *testing.T, name string) []byte {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("..", "..", "testdata", name))
	if err != nil {
		t.Fatal(err)
	}
	return b
}

func TestDecodeSettings(t *testing.T) {
	lags := 3
	bw := 4.5
	cases := []struct {
		name, text string
		want       schema.Settings
		err        string // substring of the usage error; "" for success
	}{
		{"empty means defaults", "", schema.Settings{}, ""},
		{"null means defaults", "null", schema.Settings{}, ""},
		{"empty object", "{}", schema.Settings{}, ""},
		{"every kind of field",
			`{"tests":["adf","za"],"trend":"linear","lags":3,"bandwidth":4.5,"level":0.1,"shift":"level+slope","trim":0.1,` +
				`"window":"2008-01:2009-12","sims":100,"seed":7,"columns":["a"],"from":"2001","to":"2010","transform":"logdiff","right_tail":true}`,
			schema.Settings{Tests: []string{"adf", "za"}, Trend: "linear", Lags: &lags, Bandwidth: &bw, Level: 0.1,
				Shift: "level+slope", Trim: 0.1, Window: "2008-01:2009-12", Sims: 100, Seed: 7, Columns: []string{"a"},
				From: "2001", To: "2010", Transform: "logdiff", RightTail: true}, ""},
		{"unknown field", `{"lag":3}`, schema.Settings{}, `unknown field "lag"`},
		{"wrong type", `{"lags":"three"}`, schema.Settings{}, "lags"},
		{"not an object", `[1]`, schema.Settings{}, "settings"},
		{"trailing data", `{} {}`, schema.Settings{}, "trailing"},
		{"bad trend (battery.Validate)", `{"trend":"quadratic"}`, schema.Settings{}, "trend"},
		{"unknown test (battery.Validate)", `{"tests":["nope"]}`, schema.Settings{}, "nope"},
		{"level out of range (battery.Validate)", `{"level":0.7}`, schema.Settings{}, "level"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			got, err := DecodeSettings(c.text)
			if c.err != "" {
				if err == nil || !strings.Contains(err.Error(), c.err) || kindOf(err) != KindUsage {
					t.Fatalf("err = %v (kind %s), want a usage error containing %q", err, kindOf(err), c.err)
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			gb, _ := json.Marshal(got)
			wb, _ := json.Marshal(c.want)
			if !bytes.Equal(gb, wb) {
				t.Errorf("got %s\nwant %s", gb, wb)
			}
		})
	}
}

func TestCallEnvelopes(t *testing.T) {
	// Success with a value and with raw JSON.
	r := decode(t, Call(func() (any, error) { return map[string]int{"a": 1}, nil }))
	if string(r.Result) != `{"a":1}` {
		t.Errorf("result %s", r.Result)
	}
	r = decode(t, Call(func() (any, error) { return json.RawMessage("{\n  \"b\": [1, 2]\n}\n"), nil }))
	if string(r.Result) != `{"b":[1,2]}` {
		t.Errorf("raw result %s", r.Result)
	}
	// Panics, including runtime errors, are recovered into internal errors.
	wantError(t, Call(func() (any, error) { panic("boom") }), KindInternal, "boom")
	wantError(t, Call(func() (any, error) {
		var m map[string]int
		m["x"] = 1 // assignment to a nil map panics
		return nil, nil
	}), KindInternal, "nil map")
	wantError(t, Call(func() (any, error) {
		var s []int
		return s[3], nil
	}), KindInternal, "index out of range")
	// A value that cannot be encoded (NaN) is an internal error, not a crash.
	wantError(t, Call(func() (any, error) { return math.NaN(), nil }), KindInternal, "encoding")
	// Error kinds.
	kinds := []struct {
		err  error
		kind string
	}{
		{usageErr("x"), KindUsage},
		{&battery.UsageError{Field: "trend", Err: errors.New("bad")}, KindUsage},
		{&dataset.ParseError{File: "f", Err: dataset.ErrNoHeader}, KindInput},
		{core.ErrCancelled, KindCancelled},
		{context.Canceled, KindCancelled},
		{errors.New("anything else"), KindInput},
		{ArgError(errors.New("not a number")), KindUsage},
	}
	for _, k := range kinds {
		wantError(t, Call(func() (any, error) { return nil, k.err }), k.kind, "")
	}
}

// cliDocument is the command-line tool's document for the same input.
func cliDocument(t *testing.T, name string, data []byte, settings string) []byte {
	t.Helper()
	s, err := DecodeSettings(settings)
	if err != nil {
		t.Fatal(err)
	}
	doc, _, err := battery.AnalyzeText(context.Background(), name, data, s, nil)
	if err != nil {
		t.Fatal(err)
	}
	var b bytes.Buffer
	if err := report.WriteJSON(&b, doc); err != nil {
		t.Fatal(err)
	}
	var c bytes.Buffer
	if err := json.Compact(&c, b.Bytes()); err != nil {
		t.Fatal(err)
	}
	return c.Bytes()
}

func TestAnalyzeMatchesTool(t *testing.T) {
	sp := testdata(t, "sp500.csv")
	cases := []struct{ name, settings string }{
		{"sp500.csv", `{"tests":["adf","za"],"lags":2}`},
		{"sp500.csv", `{"tests":["kpss"],"transform":"log","from":"2003-01","to":"2009-12"}`},
	}
	for _, c := range cases {
		s := NewSession()
		var progress int
		r := decode(t, s.Analyze(context.Background(), c.name, sp, c.settings, func(battery.Progress) { progress++ }))
		if !r.OK {
			t.Fatalf("%s: %+v", c.settings, r.Error)
		}
		want := cliDocument(t, c.name, sp, c.settings)
		if !bytes.Equal(r.Result, want) {
			t.Errorf("%s: the bridge's document differs from the tool's\n got %.300s\nwant %.300s", c.settings, r.Result, want)
		}
		if progress == 0 {
			t.Errorf("%s: no progress reported", c.settings)
		}
	}
}

func TestAnalyzeErrors(t *testing.T) {
	s := NewSession()
	sp := testdata(t, "sp500.csv")
	wantError(t, s.Analyze(context.Background(), "x.csv", sp, `{"trend":"quadratic"}`, nil), KindUsage, "trend")
	wantError(t, s.Analyze(context.Background(), "x.csv", sp, `{"lags":`, nil), KindUsage, "settings")
	wantError(t, s.Analyze(context.Background(), "x.csv", []byte(""), "", nil), KindInput, "")
	wantError(t, s.Analyze(context.Background(), "x.xlsx", []byte("not a workbook"), "", nil), KindInput, "")
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	wantError(t, s.Analyze(ctx, "sp500.csv", sp, `{"tests":["adf"],"sims":1000}`, nil), KindCancelled, "")
	// Nothing analysed yet: export and plots are usage errors.
	wantError(t, s.Export("json"), KindUsage, "nothing analysed")
	wantError(t, s.Plots(0), KindUsage, "nothing analysed")
}

func TestExportAndPlots(t *testing.T) {
	s := NewSession()
	sp := testdata(t, "sp500.csv")
	settings := `{"tests":["adf","za"]}`
	if r := decode(t, s.Analyze(context.Background(), "data/sp500.csv", sp, settings, nil)); !r.OK {
		t.Fatal(r.Error)
	}
	st, _ := DecodeSettings(settings)
	doc, inputs, err := battery.AnalyzeText(context.Background(), "data/sp500.csv", sp, st, nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range []struct{ format, canon, file string }{
		{"json", "json", "rootshift-sp500.json"}, {"csv", "csv", "rootshift-sp500.csv"},
		{"md", "md", "rootshift-sp500.md"}, {"markdown", "md", "rootshift-sp500.md"},
		{"latex", "latex", "rootshift-sp500.tex"}, {"tex", "latex", "rootshift-sp500.tex"},
		{"html", "html", "rootshift-sp500.html"}, {"table", "table", "rootshift-sp500.txt"},
	} {
		r := decode(t, s.Export(f.format))
		if !r.OK {
			t.Fatalf("%s: %+v", f.format, r.Error)
		}
		var e Export
		if err := json.Unmarshal(r.Result, &e); err != nil {
			t.Fatal(err)
		}
		var want bytes.Buffer
		if err := report.Write(&want, f.canon, doc, inputs); err != nil {
			t.Fatal(err)
		}
		if e.Text != want.String() || e.FileName != f.file || e.Format != f.canon || e.MIME == "" {
			t.Errorf("%s: got %s %s %s (%d bytes), want report.Write's %d bytes as %s", f.format, e.Format, e.FileName, e.MIME, len(e.Text), want.Len(), f.file)
		}
	}
	wantError(t, s.Export("pdf"), KindUsage, "pdf")

	r := decode(t, s.Plots(0))
	if !r.OK {
		t.Fatal(r.Error)
	}
	var plots []Plot
	if err := json.Unmarshal(r.Result, &plots); err != nil {
		t.Fatal(err)
	}
	kinds := map[string]int{}
	for _, p := range plots {
		kinds[p.Kind]++
		if !strings.HasPrefix(p.SVG, "<svg") || strings.Contains(p.SVG, "http://") {
			t.Errorf("%s plot: not an inline SVG without outside addresses: %.80s", p.Kind, p.SVG)
		}
	}
	// za has a path over candidate break dates; adf has none.
	if kinds["series"] != 1 || kinds["acf"] != 1 || kinds["path"] != 1 {
		t.Errorf("plots by kind %v, want one series, one acf, one path", kinds)
	}
	wantError(t, s.Plots(1), KindUsage, "out of range")
	wantError(t, s.Plots(-1), KindUsage, "out of range")
}

func TestExportName(t *testing.T) {
	// Common practice, no source: safe download names.
	for in, want := range map[string]string{
		"sp500.csv": "rootshift-sp500", "C:\\data\\my file.xlsx": "rootshift-my-file", "pasted": "rootshift-pasted",
		"": "rootshift-findings", "a/b/.csv": "rootshift--csv", "dir/": "rootshift-findings",
	} {
		if got := exportName(in); got != want {
			t.Errorf("exportName(%q) = %q, want %q", in, got, want)
		}
	}
}

func TestInspect(t *testing.T) {
	sp := testdata(t, "sp500.csv")
	r := decode(t, Inspect("sp500.csv", sp, ""))
	if !r.OK {
		t.Fatal(r.Error)
	}
	var p Preview
	if err := json.Unmarshal(r.Result, &p); err != nil {
		t.Fatal(err)
	}
	// testdata/README.md: 123 monthly rows, Jan 2000 to Mar 2010, columns date and price.
	if p.Rows != 123 || p.DateColumn != "date" || p.Frequency != "monthly" || len(p.Series) != 1 ||
		p.Series[0].Name != "price" || p.Series[0].N != 123 || p.Series[0].Missing != 0 || len(p.Series[0].Head) != 5 ||
		p.Delimiter != "," || len(p.Selected) != 1 || p.Selected[0].N != 123 {
		t.Errorf("preview %+v", p)
	}
	if p.Series[0].Head[0] == nil || *p.Series[0].Head[0] != 1394.46 {
		t.Errorf("first value %v, want 1394.46 (first data row of the file)", p.Series[0].Head[0])
	}
	// The sample range and a difference shorten the selection: 2001-01..2001-12 is 12 rows, 11 differences.
	r = decode(t, Inspect("sp500.csv", sp, `{"from":"2001-01","to":"2001-12","transform":"diff"}`))
	if err := json.Unmarshal(r.Result, &p); err != nil {
		t.Fatal(err)
	}
	if len(p.Selected) != 1 || p.Selected[0].N != 11 || p.SelectError != "" {
		t.Errorf("selection %+v %q, want 11 observations", p.Selected, p.SelectError)
	}
	// A range outside the data concerns every series.
	r = decode(t, Inspect("sp500.csv", sp, `{"from":"1990-01","to":"1990-12"}`))
	if err := json.Unmarshal(r.Result, &p); err != nil {
		t.Fatal(err)
	}
	if p.SelectError == "" {
		t.Errorf("want a selection error for a sample outside the data, got %+v", p.Selected)
	}
	// Missing values and tab-separated pasted cells.
	pasted := "year\tx\ty\n2001\t1\t\n2002\t2\t5\n2003\tNA\t6\n2004\t4\t7\n"
	r = decode(t, Inspect("", []byte(pasted), ""))
	if !r.OK {
		t.Fatal(r.Error)
	}
	if err := json.Unmarshal(r.Result, &p); err != nil {
		t.Fatal(err)
	}
	if p.Name != "pasted" || p.Delimiter != "tab" || p.Frequency != "annual" || len(p.Series) != 2 ||
		p.Series[0].Missing != 1 || p.Series[1].Missing != 1 || p.Series[0].Head[2] != nil {
		t.Errorf("pasted preview %+v", p)
	}
	wantError(t, Inspect("x.csv", []byte("just one line"), ""), KindInput, "")
	wantError(t, Inspect("x.csv", sp, `{"bogus":1}`), KindUsage, "bogus")
}

func TestAboutAndDemo(t *testing.T) {
	r := decode(t, AboutInfo())
	var a About
	if err := json.Unmarshal(r.Result, &a); err != nil {
		t.Fatal(err)
	}
	if a.Version != battery.Version || a.Schema != schema.ID || len(a.Tests) != len(core.IDs()) {
		t.Errorf("about: %+v", a)
	}
	verdict := 0
	for _, ti := range a.Tests {
		if ti.Verdict {
			verdict++
		}
		if ti.Name == "" || ti.Null == "" {
			t.Errorf("test %s lacks a name or null", ti.ID)
		}
	}
	if len(a.Settings) != len(battery.SettingsDescription()) || len(a.Settings) == 0 {
		t.Errorf("about: %d settings described", len(a.Settings))
	}
	if verdict != len(decide.Tests) {
		t.Errorf("%d tests flagged for the verdict, want %d", verdict, len(decide.Tests))
	}
	r = decode(t, Demo())
	var d map[string]string
	if err := json.Unmarshal(r.Result, &d); err != nil {
		t.Fatal(err)
	}
	if d["text"] != string(battery.DemoCSV()) || d["name"] != battery.DemoName {
		t.Error("demo data differs from battery.DemoCSV")
	}
}

func TestBench(t *testing.T) {
	d, stat, err := BenchZA(2)
	if err != nil {
		t.Fatal(err)
	}
	if d <= 0 || math.IsNaN(stat) || math.IsInf(stat, 0) {
		t.Errorf("BenchZA: %v, statistic %v", d, stat)
	}
	r := decode(t, Bench(1))
	var b BenchResult
	if err := json.Unmarshal(r.Result, &b); err != nil {
		t.Fatal(err)
	}
	// The same seeded search gives the same statistic every time.
	if b.N != 1 || b.Millis <= 0 || b.Statistic != stat {
		t.Errorf("bench %+v, want statistic %v", b, stat)
	}
	wantError(t, Bench(0), KindUsage, "n = 0")
}

// FuzzDecodeSettings: any text gives settings or a usage error, never a panic.
func FuzzDecodeSettings(f *testing.F) {
	for _, s := range []string{"", "{}", `{"lags":3}`, `{"trend":"x"}`, `{"tests":["adf"],"level":0.01}`, "[", `{"seed":-1}`} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, text string) {
		s, err := DecodeSettings(text)
		if err != nil {
			if kindOf(err) != KindUsage {
				t.Fatalf("kind %s for %q", kindOf(err), text)
			}
			return
		}
		if err := battery.Validate(s); err != nil {
			t.Fatalf("decoded settings fail validation: %v", err)
		}
	})
}

// FuzzInspect: any bytes give a well-formed envelope, never a panic.
func FuzzInspect(f *testing.F) {
	f.Add("x.csv", []byte("date,a\n2001-01,1\n2001-02,2\n"), "")
	f.Add("pasted", []byte("a\tb\n1\t2\n"), `{"from":"1"}`)
	f.Add("x.xlsx", []byte("PK\x03\x04"), "")
	f.Fuzz(func(t *testing.T, name string, data []byte, settings string) {
		out := Inspect(name, data, settings)
		var r Reply
		if err := json.Unmarshal([]byte(out), &r); err != nil {
			t.Fatalf("not JSON: %v", err)
		}
		if r.OK == (r.Error != nil) {
			t.Fatalf("bad envelope %s", out)
		}
		if r.Error != nil && r.Error.Kind == KindInternal {
			t.Fatalf("internal error (a recovered panic) for %q: %s", data, r.Error.Message)
		}
	})
}

func BenchmarkBenchZA(b *testing.B) {
	for b.Loop() {
		if _, _, err := BenchZA(1); err != nil {
			b.Fatal(err)
		}
	}
}

// TestInspectLong checks that a long table is detected and offered (not
// assumed), and that with settings.long its preview lists one series per id.
func TestInspectLong(t *testing.T) {
	var b strings.Builder
	b.WriteString("region,quarter,sales\n")
	for _, id := range []string{"north", "south", "west"} {
		for y := 2001; y <= 2004; y++ {
			for q := 1; q <= 4; q++ {
				fmt.Fprintf(&b, "%s,%dQ%d,%d.5\n", id, y, q, (y*7+q*13+len(id))%50)
			}
		}
	}
	var p Preview
	if err := json.Unmarshal(decode(t, Inspect("sales.csv", []byte(b.String()), "")).Result, &p); err != nil {
		t.Fatal(err)
	}
	if p.LongDetected == nil || p.LongDetected.ID != "region" || p.LongDetected.Date != "quarter" || p.LongDetected.Value != "sales" || p.Long != nil {
		t.Fatalf("long table not offered: %+v", p)
	}
	r := decode(t, Inspect("sales.csv", []byte(b.String()), `{"long":{"id":"region","date":"quarter","value":"sales"}}`))
	p = Preview{}
	if err := json.Unmarshal(r.Result, &p); err != nil {
		t.Fatal(err)
	}
	if p.Long == nil || len(p.Series) != 3 || p.Series[1].Name != "south" || p.Series[1].N != 16 || p.Frequency != "quarterly" {
		t.Errorf("long preview: %+v", p)
	}
}
