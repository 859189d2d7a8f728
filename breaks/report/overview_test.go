package report

import (
	"bytes"
	"regexp"
	"strings"
	"testing"

	"github.com/rootshift/rootshift/core/schema"
)

// Overview first (issue 12, item 1): the table and HTML reports give one
// row per series before any detail, and each series' detail shows the
// verdict's stages, error rate and window answer. The fixture's values are
// invented (common practice, no source).

func TestOverviewTable(t *testing.T) {
	var buf bytes.Buffer
	if err := WriteTable(&buf, fixtureDoc()); err != nil {
		t.Fatal(err)
	}
	out := buf.String()
	ov, first := strings.Index(out, "Overview (2 series"), strings.Index(out, "\n== ")
	if ov < 0 || ov > first {
		t.Fatalf("overview at %d, first detail at %d", ov, first)
	}
	lines := strings.Split(out[ov:first], "\n")
	if len(lines) < 4 {
		t.Fatalf("overview %q", out[ov:first])
	}
	for _, f := range []string{"series", "class", "order", "transform", "breaks", "window", "error rate"} {
		if !strings.Contains(lines[1], f) {
			t.Errorf("overview header %q lacks %q", lines[1], f)
		}
	}
	row := regexp.MustCompile(`^GDP_real & co %\s+break-stationary\s+I\(0\)\s+shift-dummies\s+1997Q2\s+yes: a break at 1997Q2\s+7\.0%$`)
	if !row.MatchString(lines[2]) {
		t.Errorf("first row %q", lines[2])
	}
	if !strings.HasPrefix(lines[3], "CPI #2 {x}$") || !strings.Contains(lines[3], "error") {
		t.Errorf("second row %q", lines[3])
	}
	for _, want := range []string{
		"stage 1, trend: trending (t-test on the trend term, statistic 6.2500, p<0.001)",
		"stage 3, breaks: one break (bp sequential)",
		"error rate: At T=60",
		"yes: a break at 1997Q2",
		"context: gsadf finds",
		"Caution: " + schema.Caution[:30],
	} {
		if !strings.Contains(strings.Join(strings.Fields(out), " "), want) {
			t.Errorf("table lacks %q", want)
		}
	}
}

// TestOverviewFitsWidth: long names are cut to keep the overview within
// the table's width; the detail keeps them whole.
func TestOverviewFitsWidth(t *testing.T) {
	doc, _ := hostileDoc()
	long := strings.Repeat("very_long_series_name_", 6)
	doc.Series[0].Name = long
	var buf bytes.Buffer
	if err := WriteTable(&buf, doc); err != nil {
		t.Fatal(err)
	}
	out := buf.String()
	ov, first := strings.Index(out, "Overview ("), strings.Index(out, "\n== ")
	for _, l := range strings.Split(out[ov:first], "\n") {
		if n := len([]rune(l)); n > tableWidth {
			t.Errorf("overview line of %d runes: %q", n, l)
		}
	}
	if !strings.Contains(out[ov:first], "…") || !strings.Contains(out[first:], "== "+long) {
		t.Error("long name not cut in the overview or not whole in the detail")
	}
}

func TestOverviewHTML(t *testing.T) {
	var buf bytes.Buffer
	if err := WriteHTML(&buf, fixtureDoc(), fixtureInputs()); err != nil {
		t.Fatal(err)
	}
	page := buf.String()
	ov, first := strings.Index(page, `<table class="overview">`), strings.Index(page, `<section id="series-1">`)
	if ov < 0 || ov > first {
		t.Fatalf("overview at %d, first series at %d", ov, first)
	}
	overview := page[ov : strings.Index(page[ov:], "</table>")+ov]
	if n := strings.Count(overview, "<tr>"); n != 3 {
		t.Errorf("%d overview rows with the header, want 3", n)
	}
	for _, want := range []string{`<a href="#series-1">GDP_real &amp; co %</a>`, "<th>window</th>", "<th>error rate</th>", ">7.0%<", ">yes: a break at 1997Q2<"} {
		if !strings.Contains(overview, want) {
			t.Errorf("overview lacks %q", want)
		}
	}
	for _, want := range []string{`<table class="stages">`, "<td>1. trend</td>", ">&lt;0.001<", ">0.031<", "Error rate:", "Context (computed"} {
		if !strings.Contains(page[first:], want) {
			t.Errorf("detail lacks %q", want)
		}
	}
	if !strings.Contains(page, `<p class="caution">`) {
		t.Error("no caution")
	}
	checkHTMLSafe(t, page)
}
