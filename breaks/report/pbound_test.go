// Tests of the display of p-values at the end of a table ("<0.001",
// ">0.999") in every text format and of the CSV columns id and
// p_value_bound. The phrases are the ones the tests write (core/pvalue.go,
// core/explosive.go, core/gls.go, breaks/za.go, breaks/lm_tables.go); the
// series are seeded simulations (common practice, no source).
package report

import (
	"bytes"
	"context"
	"encoding/csv"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/schema"
)

func TestPBound(t *testing.T) {
	for _, tc := range []struct {
		p        float64
		method   string
		warnings []string
		bound    string
		shown    string
	}{
		// Rule 1: the test says the p-value is a table bound.
		{0.0005, "DF table; the statistic lies beyond the table, p-value bounded at 0.0005", nil, "<", "<0.001"},
		{0.9995, "DF table; the statistic lies beyond the table, p-value bounded at 0.9995", nil, ">", ">0.999"},
		{0.005, "LM table; the statistic lies outside the table, p-value clamped to 0.005", nil, "<", "<0.005"},
		{0.99, "LM table; the statistic lies outside the table, p-value clamped to 0.99", nil, ">", ">0.99"},
		{0.001, "io table", []string{"the statistic lies beyond the simulated table: p-value reported at the table end (0.001)"}, "<", "<0.001"},
		{0.999, "io table", []string{"the statistic lies beyond the simulated table: p-value reported at the table end (0.999)"}, ">", ">0.999"},
		{0.01, "explosive table; the statistic lies beyond the tabulated quantiles, so the p-value is the table's bound (the true value is below 0.01)", nil, "<", "<0.01"},
		{0.001, "GLS surface", []string{"statistic below the table's 0.001 quantile: the p-value is at most 0.001 and is reported as that bound"}, "<", "<0.001"},
		{0.999, "GLS surface", []string{"statistic above the table's 0.999 quantile: the p-value is reported as 0.999"}, ">", ">0.999"},
		// Rule 2: display limits without any text.
		{0.0004, "simulation", nil, "<", "<0.001"},
		{0.001, "simulation", nil, "<", "<0.001"},
		{0.9992, "simulation", nil, ">", ">0.999"},
		// Point values.
		// Point values: three decimals, as in the verdict's sentences.
		{0.0012, "simulation", nil, "", "0.001"},
		{0.01, "response surface", []string{"T = 5000 is beyond the table (T <= 1600)"}, "", "0.010"},
		{0.5, "response surface", nil, "", "0.500"},
		{0.62014, "response surface", nil, "", "0.620"},
	} {
		r := schema.Result{PValue: fp(tc.p), PValueMethod: tc.method, Warnings: tc.warnings}
		if b := resultPBound(&r); b != tc.bound {
			t.Errorf("p=%g %q %q: bound %q, want %q", tc.p, tc.method, tc.warnings, b, tc.bound)
		}
		if s := resultP(&r, "n/a"); s != tc.shown {
			t.Errorf("p=%g %q: shown %q, want %q", tc.p, tc.method, s, tc.shown)
		}
	}
	if s := resultP(&schema.Result{PValueMethod: "none"}, "n/a"); s != "n/a" {
		t.Errorf("nil p-value shown as %q", s)
	}
}

// TestPBoundFromTests runs adf on white noise, whose t-ratio lies far below
// the Dickey-Fuller table, left- and right-tailed: the p-values are table
// bounds and every text format must say so.
func TestPBoundFromTests(t *testing.T) {
	r := rand.New(rand.NewPCG(11, 3))
	y := make([]float64, 300)
	for i := range y {
		y[i] = r.NormFloat64()
	}
	info, err := core.Lookup("adf")
	if err != nil {
		t.Fatal(err)
	}
	left, err := info.Run(context.Background(), y, &core.Config{LagRule: core.LagFixed})
	if err != nil {
		t.Fatal(err)
	}
	right, err := info.Run(context.Background(), y, &core.Config{LagRule: core.LagFixed, RightTail: true})
	if err != nil {
		t.Fatal(err)
	}
	if b := resultPBound(left); b != "<" {
		t.Fatalf("left-tailed adf on white noise: bound %q (p %v, %q)", b, *left.PValue, left.PValueMethod)
	}
	if b := resultPBound(right); b != ">" {
		t.Fatalf("right-tailed adf on white noise: bound %q (p %v, %q)", b, *right.PValue, right.PValueMethod)
	}
	doc := &schema.Document{Schema: schema.ID, Version: "test",
		Series: []schema.Series{{Name: "noise", N: len(y), Results: []schema.Result{*left, *right}, Errors: []schema.Error{}}}}
	for format, want := range map[string][]string{
		"table": {"<0.001", ">0.999"},
		"md":    {"| <0.001 |", "| >0.999 |"},
		"latex": {"$<0.001$", "$>0.999$"},
		"html":  {"&lt;0.001", "&gt;0.999"},
	} {
		var buf bytes.Buffer
		if err := Write(&buf, format, doc, nil); err != nil {
			t.Fatal(err)
		}
		for _, w := range want {
			if !strings.Contains(buf.String(), w) {
				t.Errorf("%s output lacks %q", format, w)
			}
		}
	}
	var buf bytes.Buffer
	if err := WriteCSV(&buf, doc); err != nil {
		t.Fatal(err)
	}
	recs, err := csv.NewReader(&buf).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	col := map[string]int{}
	for i, h := range recs[0] {
		col[h] = i
	}
	if len(recs) != 3 || recs[1][col["p_value_bound"]] != "<" || recs[2][col["p_value_bound"]] != ">" {
		t.Fatalf("p_value_bound column: %v", recs)
	}
	if recs[1][col["p_value"]] != csvNum(left.PValue) {
		t.Errorf("p_value %q must keep the number %v", recs[1][col["p_value"]], *left.PValue)
	}
}

// TestCSVID: the id column is SOURCE:SERIES with a named source (the batch
// summary CSV concatenates documents from many files), else the series name;
// SOURCE is the file's base name only, never its folders.
func TestCSVID(t *testing.T) {
	stat := -2.0
	mk := func(src *schema.Source) *schema.Document {
		return &schema.Document{Schema: schema.ID, Source: src, Series: []schema.Series{
			{Name: "gdp", Results: []schema.Result{{Test: "adf", Statistic: &stat}}, Errors: []schema.Error{}},
			{Name: "cpi", Errors: []schema.Error{{Message: "too short"}}},
		}}
	}
	for _, tc := range []struct {
		src  *schema.Source
		want []string
	}{
		{&schema.Source{Name: "data/a.csv"}, []string{"a.csv:gdp", "a.csv:cpi"}},
		{&schema.Source{Name: `C:\Users\me\secret\a.csv`}, []string{"a.csv:gdp", "a.csv:cpi"}},
		{&schema.Source{}, []string{"gdp", "cpi"}},
		{nil, []string{"gdp", "cpi"}},
	} {
		var buf bytes.Buffer
		if err := WriteCSV(&buf, mk(tc.src)); err != nil {
			t.Fatal(err)
		}
		recs, _ := csv.NewReader(&buf).ReadAll()
		if len(recs) != 3 || recs[0][1] != "id" || recs[1][1] != tc.want[0] || recs[2][1] != tc.want[1] {
			t.Errorf("source %+v: rows %v, want ids %v", tc.src, recs, tc.want)
		}
	}
}
