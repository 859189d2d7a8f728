package report

import (
	"bytes"
	"encoding/xml"
	"regexp"
	"strings"
	"testing"

	"github.com/rootshift/rootshift/core/dataset"
	"github.com/rootshift/rootshift/core/schema"
)

// svgElements returns every <svg>...</svg> element of page.
func svgElements(page string) []string {
	var out []string
	for {
		i := strings.Index(page, "<svg")
		if i < 0 {
			return out
		}
		j := strings.Index(page[i:], "</svg>")
		if j < 0 {
			return append(out, page[i:])
		}
		out = append(out, page[i:i+j+len("</svg>")])
		page = page[i+j+len("</svg>"):]
	}
}

// firstChildIsTitle reports whether the root element's first child element
// is a non-empty <title>.
func firstChildIsTitle(svg string) bool {
	d := xml.NewDecoder(strings.NewReader(svg))
	depth := 0
	for {
		tok, err := d.Token()
		if err != nil {
			return false
		}
		switch tk := tok.(type) {
		case xml.StartElement:
			depth++
			if depth == 2 {
				if tk.Name.Local != "title" {
					return false
				}
				var text string
				t2, err := d.Token()
				if err != nil {
					return false
				}
				if cd, ok := t2.(xml.CharData); ok {
					text = string(cd)
				}
				return strings.TrimSpace(text) != ""
			}
		case xml.EndElement:
			depth--
		}
	}
}

// TestHTMLSelfContained checks the report for the offline page: no address
// outside the page, no script, well-formed (the page is XML too), every
// plot a well-formed <svg> with a <title>, and the order caution, verdict,
// results table, plots within each series.
func TestHTMLSelfContained(t *testing.T) {
	var buf bytes.Buffer
	if err := WriteHTML(&buf, fixtureDoc(), fixtureInputs()); err != nil {
		t.Fatal(err)
	}
	page := buf.String()
	for _, bad := range []string{"http://", "https://", "src=", "<script", "url(", "@import", "<link", "<img", "NaN"} {
		if strings.Contains(strings.ToLower(page), strings.ToLower(bad)) {
			t.Errorf("page contains %q", bad)
		}
	}
	// Every href points inside the page.
	for _, m := range regexp.MustCompile(`href="([^"]*)"`).FindAllStringSubmatch(page, -1) {
		if !strings.HasPrefix(m[1], "#") {
			t.Errorf("href %q leaves the page", m[1])
		}
	}
	if err := xmlWellFormed(strings.TrimPrefix(page, "<!DOCTYPE html>\n")); err != nil {
		t.Errorf("page is not well-formed: %v", err)
	}
	svgs := svgElements(page)
	// Series 1: series, ACF, za path, ls2 surface, gsadf sequence; series 2: series, ACF.
	if len(svgs) != 7 {
		t.Errorf("%d plots, want 7", len(svgs))
	}
	for i, s := range svgs {
		if err := xmlWellFormed(s); err != nil {
			t.Errorf("plot %d: %v", i, err)
		}
		if !firstChildIsTitle(s) {
			t.Errorf("plot %d has no <title> first", i)
		}
	}
	if !strings.Contains(page, `<p class="caution"><strong>Caution.</strong> `+esc(schema.Caution)) {
		t.Error("no caution paragraph")
	}
	first := page[strings.Index(page, `<section id="series-1">`):strings.Index(page, `<section id="series-2">`)]
	iv, it, ip := strings.Index(first, `class="verdict`), strings.Index(first, "<table>"), strings.Index(first, "<svg")
	if !(iv >= 0 && iv < it && it < ip) {
		t.Errorf("order verdict %d, table %d, plots %d", iv, it, ip)
	}
	for _, want := range []string{
		"<h2>GDP_real &amp; co %</h2>", "<h2>CPI #2 {x}$</h2>", `class="verdict v-break-stationary"`,
		"za: series too short", "rejects unit root (explosive)", "Evidence against",
	} {
		if !strings.Contains(page, want) {
			t.Errorf("page lacks %q", want)
		}
	}
}

// TestHTMLWithoutInputs: with no inputs only the result plots remain.
func TestHTMLWithoutInputs(t *testing.T) {
	for _, in := range [][]dataset.Series{nil, {{Name: "a"}, {Name: "b"}}, {fixtureInputs()[0]}} {
		var buf bytes.Buffer
		if err := WriteHTML(&buf, fixtureDoc(), in); err != nil {
			t.Fatal(err)
		}
		want := 3
		if len(in) == 1 {
			want = 5 // series and ACF for the first series only
		}
		if n := len(svgElements(buf.String())); n != want {
			t.Errorf("%d inputs: %d plots, want %d", len(in), n, want)
		}
	}
}

// TestHTMLEscapes: markup in names and messages is escaped.
func TestHTMLEscapes(t *testing.T) {
	doc := &schema.Document{Series: []schema.Series{{
		Name:     `<script>alert("x")</script>`,
		Errors:   []schema.Error{{Message: "bad <b>cell</b> & \x00 control"}},
		Warnings: []string{`"quoted" 'single'`},
	}}}
	var buf bytes.Buffer
	if err := WriteHTML(&buf, doc, []dataset.Series{{Name: `<script>`, Values: []float64{1, 2, 3}}}); err != nil {
		t.Fatal(err)
	}
	page := buf.String()
	if strings.Contains(page, "<script") || strings.Contains(page, "<b>") {
		t.Error("markup not escaped")
	}
	if err := xmlWellFormed(strings.TrimPrefix(page, "<!DOCTYPE html>\n")); err != nil {
		t.Errorf("page is not well-formed: %v", err)
	}
}
