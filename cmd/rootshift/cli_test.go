// Tests of the command: exit statuses, the JSON contract of `test --json`
// on the demo and on a user CSV, usage errors naming the flag, `critical`,
// and flags after file names. The demo data is invented (see battery); the
// open data file is testdata/sp500.csv from the vega-datasets package
// (BSD-3-Clause, see testdata/README.md).
package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/rootshift/rootshift/core/schema"
)

func TestUsageErrors(t *testing.T) {
	for _, tc := range []struct {
		args []string
		want string // in stderr
	}{
		{nil, "Usage"},
		{[]string{"nosuch"}, "unknown command"},
		{[]string{"test"}, "no input file"},
		{[]string{"test", "--trend", "quadratic", "../../testdata/demo.csv"}, "trend"},
		{[]string{"test", "--lag-rule", "hq", "../../testdata/demo.csv"}, "lag_rule"},
		{[]string{"test", "--level", "1.5", "../../testdata/demo.csv"}, "level"},
		{[]string{"test", "--tests", "adf,nosuch", "../../testdata/demo.csv"}, "unknown test id"},
		{[]string{"test", "--format", "pdf", "../../testdata/demo.csv"}, "--format"},
		{[]string{"test", "--lags", "x", "../../testdata/demo.csv"}, "lags"},
		{[]string{"test", "no-such-file.csv"}, "no-such-file.csv"},
		{[]string{"critical", "--test", "za"}, "--n"},
	} {
		code, _, stderr := runCLI(t, "", tc.args...)
		if code != 2 {
			t.Errorf("%v: exit %d, want 2", tc.args, code)
		}
		if !strings.Contains(stderr, tc.want) {
			t.Errorf("%v: stderr %q does not mention %q", tc.args, stderr, tc.want)
		}
	}
}

func TestJSONContractOnDemo(t *testing.T) {
	code, out, stderr := runCLI(t, "", "demo", "--json", "--quiet", "--report", "")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	var doc map[string]any
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	// Field names are a contract (issue "Foundation", item 7).
	for _, k := range []string{"schema", "version", "settings", "series", "caution"} {
		if _, ok := doc[k]; !ok {
			t.Errorf("document lacks %q", k)
		}
	}
	if doc["schema"] != "rootshift.results/v2" {
		t.Errorf("schema %v", doc["schema"])
	}
	series := doc["series"].([]any)
	if len(series) != 7 {
		t.Fatalf("%d demo series, want 7", len(series))
	}
	s0 := series[0].(map[string]any)
	for _, k := range []string{"name", "n", "start", "end", "frequency", "results", "errors", "verdict"} {
		if _, ok := s0[k]; !ok {
			t.Errorf("series lacks %q", k)
		}
	}
	r0 := s0["results"].([]any)[0].(map[string]any)
	for _, k := range []string{"test", "trend", "statistic", "p_value", "p_value_method", "critical_values", "lags", "nobs", "null", "reject"} {
		if _, ok := r0[k]; !ok {
			t.Errorf("result lacks %q", k)
		}
	}
	cv := r0["critical_values"].(map[string]any)
	for _, k := range []string{"0.01", "0.05", "0.10"} {
		if _, ok := cv[k]; !ok {
			t.Errorf("critical_values lacks %q", k)
		}
	}
	v := s0["verdict"].(map[string]any)
	for _, k := range []string{"class", "order", "transform", "breaks", "explanation"} {
		if _, ok := v[k]; !ok {
			t.Errorf("verdict lacks %q", k)
		}
	}
}

func TestUserCSVWithFlagsAfterFile(t *testing.T) {
	code, out, stderr := runCLI(t, "", "test", "--tests", "adf,kpss,za", "../../testdata/sp500.csv", "--json", "--transform", "log")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	var doc schema.Document
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	if len(doc.Series) != 1 || doc.Series[0].Name != "price" || doc.Series[0].Frequency != "monthly" {
		t.Fatalf("series %+v", doc.Series)
	}
	sr := doc.Series[0]
	if sr.Start != "2000-01" || sr.Transform != "log" || len(sr.Results) != 3 {
		t.Errorf("start %s transform %s results %d", sr.Start, sr.Transform, len(sr.Results))
	}
	for _, r := range sr.Results {
		if r.Test == "za" && (len(r.Breaks) != 1 || r.Breaks[0].Date == "" || len(r.Path) == 0) {
			t.Errorf("za must report its break as a date and its path: %+v", r.Breaks)
		}
	}
}

func TestStdinAndFormats(t *testing.T) {
	data, err := os.ReadFile("../../testdata/demo.csv")
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range []string{"table", "csv", "md", "latex", "html"} {
		code, out, stderr := runCLI(t, string(data), "test", "--tests", "adf", "--columns", "credit_spread", "--format", f, "-")
		if code != 0 || len(out) == 0 {
			t.Errorf("format %s: exit %d, %d bytes, %s", f, code, len(out), stderr)
		}
	}
}

func TestFailedSeriesExitOne(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "x.csv")
	os.WriteFile(p, []byte("year,good,short\n"+yearsCSV(40)), 0o644)
	code, out, _ := runCLI(t, "", "test", "--tests", "adf", "--json", p)
	if code != 1 {
		t.Fatalf("exit %d, want 1 when a series fails", code)
	}
	var doc schema.Document
	json.Unmarshal([]byte(out), &doc)
	if len(doc.Series) != 2 || len(doc.Series[1].Errors) == 0 || doc.Series[0].Results == nil {
		t.Fatalf("want one tested and one failed series: %+v", doc.Series)
	}
}

func yearsCSV(n int) string {
	var b strings.Builder
	v := 1.0
	for i := 0; i < n; i++ {
		v = 0.5*v + float64((i*7919)%13)/13
		short := ""
		if i < 3 {
			short = "1.5"
		}
		b.WriteString(strings.Join([]string{strconv.Itoa(1950 + i), strconv.FormatFloat(v, 'f', 4, 64), short}, ",") + "\n")
	}
	return b.String()
}

func TestCriticalJSON(t *testing.T) {
	code, out, stderr := runCLI(t, "", "critical", "--test", "adf", "--trend", "constant", "--n", "100", "--sims", "2000", "--seed", "3", "--json", "--quiet")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	var doc struct {
		Quantiles map[string]float64 `json:"quantiles"`
		StdErrors map[string]float64 `json:"std_errors"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"0.01", "0.025", "0.05", "0.10"} {
		if _, ok := doc.Quantiles[k]; !ok {
			t.Errorf("quantiles lacks %q", k)
		}
	}
	// MacKinnon (2010) Table 2, constant, 5%, evaluated at T = 100 (DERIVED in
	// the shared reference): -2.8909; the simulation (2,000 replications, with
	// BIC lags) must be within 4 Monte Carlo standard errors plus 0.03.
	if q, se := doc.Quantiles["0.05"], doc.StdErrors["0.05"]; q < -2.8909-4*se-0.03 || q > -2.8909+4*se+0.03 {
		t.Errorf("simulated 5%% quantile %.4f (s.e. %.4f) far from MacKinnon's -2.8909", q, se)
	}
	// Same seed, same numbers.
	_, out2, _ := runCLI(t, "", "critical", "--test", "adf", "--trend", "constant", "--n", "100", "--sims", "2000", "--seed", "3", "--json", "--quiet")
	strip := func(s string) string { return s[:strings.Index(s, `"seconds"`)] }
	if strip(out) != strip(out2) {
		t.Error("critical is not reproducible for a fixed seed")
	}
}

// TestHelp: -h prints the options to standard output with exit 0, with
// readable placeholders (no "value", no sentence turned into a placeholder);
// a bad flag gives one short error, not the whole help.
func TestHelp(t *testing.T) {
	for _, cmd := range []string{"test", "demo", "batch", "critical", "page"} {
		code, out, stderr := runCLI(t, "", cmd, "-h")
		if code != 0 || stderr != "" || !strings.Contains(out, "Usage: rootshift "+cmd) || !strings.Contains(out, "Options:") {
			t.Errorf("%s -h: exit %d, stderr %q, stdout %.80q", cmd, code, stderr, out)
		}
		for _, l := range strings.Split(out, "\n") {
			if strings.HasPrefix(l, "  -") && (strings.HasSuffix(l, " value") || strings.Contains(l, "rootshift tests")) {
				t.Errorf("%s -h: odd flag line %q", cmd, l)
			}
		}
		if cmd != "page" && !strings.Contains(out, "  --tests ids\n") {
			t.Errorf("%s -h lacks the line \"--tests ids\"", cmd)
		}
	}
	code, out, stderr := runCLI(t, "", "test", "--nosuch", "x.csv")
	if code != 2 || out != "" || strings.Contains(stderr, "Options:") || !strings.Contains(stderr, "-nosuch") || !strings.Contains(stderr, "rootshift test -h") {
		t.Errorf("bad flag: exit %d, stderr %q", code, stderr)
	}
}
