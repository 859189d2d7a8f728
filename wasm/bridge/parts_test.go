// Tests of the spreading of one analysis over several engine instances
// (parts.go). The reference is the one-instance document (Session.Analyze,
// which is battery.AnalyzeText + report.WriteJSON, the command-line tool's
// code path): the assembled document must be the same text for any number
// of workers and any distribution of the series, with seeded simulations
// (replication r of a test seeded with rand.NewPCG(seed, r), Dickey and
// Fuller 1979 style Monte Carlo p-values) included. Common practice, no
// published source.
package bridge

import (
	"context"
	"encoding/json"
	"fmt"
	"strings"
	"testing"
	"time"

	"github.com/rootshift/rootshift/breaks/battery"
)

// spread analyses every series with w instances: series i goes to instance
// (i/chunk) mod w, each instance analyses its indices in one call, and a
// fresh session assembles the parts.
func spread(t *testing.T, name string, data []byte, settings string, w, chunk int) (string, int) {
	t.Helper()
	var plan Plan
	r := decode(t, PlanAnalysis(context.Background(), name, data, settings, false))
	if !r.OK {
		t.Fatalf("plan %s: %+v", settings, r.Error)
	}
	if err := json.Unmarshal(r.Result, &plan); err != nil {
		t.Fatal(err)
	}
	if plan.Units < 1 {
		t.Fatalf("plan %s: %d units per series", settings, plan.Units)
	}
	own := make([][]int, w)
	for i := 0; i < plan.Series*plan.Units; i++ {
		k := (i / chunk) % w
		own[k] = append(own[k], i)
	}
	var parts []Part
	progress := 0
	for k := range own {
		if len(own[k]) == 0 {
			continue
		}
		r := decode(t, AnalyzePart(context.Background(), name, data, settings, own[k], func(p battery.Progress) {
			if p.Stage == "series" {
				progress++
			}
		}))
		if !r.OK {
			t.Fatalf("part %v %s: %+v", own[k], settings, r.Error)
		}
		var ps []Part
		if err := json.Unmarshal(r.Result, &ps); err != nil {
			t.Fatal(err)
		}
		for j, p := range ps {
			if u := own[k][j]; p.Index != u/plan.Units || p.Test != u%plan.Units {
				t.Fatalf("part %d is series %d test %d, want unit %d", j, p.Index, p.Test, u)
			}
		}
		parts = append(parts, ps...)
	}
	if progress != plan.Series*plan.Units {
		t.Errorf("%d units done by progress, %d planned", progress, plan.Series*plan.Units)
	}
	b, err := json.Marshal(parts)
	if err != nil {
		t.Fatal(err)
	}
	s := NewSession()
	r = decode(t, s.Assemble(name, data, settings, string(b), false))
	if !r.OK {
		t.Fatalf("assemble %s: %+v", settings, r.Error)
	}
	if w == 2 {
		// The assembled document is the session's last analysis.
		if x := decode(t, s.Export("json")); !x.OK {
			t.Errorf("export after assemble: %+v", x.Error)
		}
	}
	return string(r.Result), plan.Series
}

func longTable() []byte {
	var b strings.Builder
	b.WriteString("region,quarter,sales\n")
	for _, id := range []string{"north", "south", "west"} {
		for y := 2001; y <= 2010; y++ {
			for q := 1; q <= 4; q++ {
				fmt.Fprintf(&b, "%s,%dQ%d,%d.5\n", id, y, q, (y*7+q*13+len(id)*y)%50)
			}
		}
	}
	return []byte(b.String())
}

func TestPartsGiveTheSameDocument(t *testing.T) {
	cases := []struct {
		name     string
		data     []byte
		settings string
	}{
		// Seeded simulated p-values on the invented demo data, one test per unit.
		{"demo.csv", battery.DemoCSV(), `{"tests":["adf","za","kpss"],"sims":19,"seed":7}`},
		// Tests picked with the verdict: one series per unit.
		{"demo.csv", battery.DemoCSV(), `{"tests":["adf","kpss"],"verdict":true,"columns":["jobless_rate","housing_index"]}`},
		// Tests that fail on short series (errors between results).
		{"short.csv", []byte("t,a,b\n1,8,5\n2,5,10\n3,6,2\n4,10,7\n5,6,12\n6,14,4\n7,14,9\n8,16,1\n"), `{"tests":["adf","ls2","kpss","bp"]}`},
		// A known break date: one series per unit.
		{"demo.csv", battery.DemoCSV(), `{"tests":["adf","p89"],"break_date":"2009-02","columns":["jobless_rate","credit_spread"]}`},
		// The default battery and the verdict.
		{"demo.csv", battery.DemoCSV(), `{"columns":["jobless_rate","freight_volume","credit_spread"]}`},
		// Open data, a sample range and a transform (testdata/us-employment.csv, vega-datasets 3.2.1).
		{"us-employment.csv", testdata(t, "us-employment.csv"), `{"columns":["nonfarm","construction","manufacturing"],"from":"2007-01","to":"2014-12","transform":"logdiff","tests":["adf","kpss"]}`},
		// A long table: one series per id.
		{"sales.csv", longTable(), `{"long":{"id":"region","date":"quarter","value":"sales"},"tests":["adf","kpss"]}`},
		// A column that is not a series is reported in place, not counted as a part.
		{"mixed.csv", []byte("t,a,b,c\n1,1,x,3\n2,2,y,1\n3,4,z,4\n4,3,w,1\n5,5,v,5\n6,7,u,9\n7,6,s,2\n8,8,r,6\n9,9,q,5\n10,11,p,3\n11,10,o,5\n12,12,n,8\n"), `{"tests":["adf"]}`},
	}
	for _, c := range cases {
		one := decode(t, NewSession().Analyze(context.Background(), c.name, c.data, c.settings, nil))
		if !one.OK {
			t.Fatalf("%s %s: %+v", c.name, c.settings, one.Error)
		}
		for _, wc := range [][2]int{{1, 1}, {2, 1}, {3, 1}, {2, 2}, {5, 1}} {
			got, n := spread(t, c.name, c.data, c.settings, wc[0], wc[1])
			if got != string(one.Result) {
				t.Errorf("%s %s: %d workers (chunks of %d, %d series): the document differs from one instance's\n got %.400s\nwant %.400s",
					c.name, c.settings, wc[0], wc[1], n, got, one.Result)
			}
		}
	}
}

func TestAssemblePartial(t *testing.T) {
	data := battery.DemoCSV()
	const settings = `{"tests":["adf"],"columns":["freight_volume","power_demand","jobless_rate"]}`
	r := decode(t, AnalyzePart(context.Background(), "demo.csv", data, settings, []int{1}, nil))
	if !r.OK {
		t.Fatal(r.Error)
	}
	s := NewSession()
	wantError(t, s.Assemble("demo.csv", data, settings, string(r.Result), false), KindInternal, "no part for series 0")
	a := decode(t, s.Assemble("demo.csv", data, settings, string(r.Result), true))
	if !a.OK {
		t.Fatal(a.Error)
	}
	var doc struct {
		Series []struct {
			Name    string            `json:"name"`
			Results []json.RawMessage `json:"results"`
			Errors  []struct {
				Message string `json:"message"`
			} `json:"errors"`
		} `json:"series"`
	}
	if err := json.Unmarshal(a.Result, &doc); err != nil {
		t.Fatal(err)
	}
	if len(doc.Series) != 3 || len(doc.Series[1].Results) != 1 || len(doc.Series[0].Errors) != 1 ||
		!strings.Contains(doc.Series[0].Errors[0].Message, "cancelled") || len(doc.Series[2].Errors) != 1 {
		t.Errorf("partial document: %s", a.Result)
	}
	// Units of tests: a series is kept only with all its tests.
	const two = `{"tests":["adf","kpss"],"columns":["freight_volume","power_demand"]}`
	r = decode(t, AnalyzePart(context.Background(), "demo.csv", data, two, []int{0, 1, 3}, nil))
	if !r.OK {
		t.Fatal(r.Error)
	}
	a = decode(t, s.Assemble("demo.csv", data, two, string(r.Result), true))
	doc.Series = nil
	if err := json.Unmarshal(a.Result, &doc); err != nil {
		t.Fatal(err)
	}
	if len(doc.Series) != 2 || len(doc.Series[0].Results) != 2 || len(doc.Series[1].Results) != 0 || len(doc.Series[1].Errors) != 1 {
		t.Errorf("partial document with test units: %s", a.Result)
	}
	wantError(t, AnalyzePart(context.Background(), "demo.csv", data, settings, []int{3}, nil), KindUsage, "beyond")
	wantError(t, AnalyzePart(context.Background(), "demo.csv", data, settings, []int{1, 1}, nil), KindUsage, "twice")
}

func TestPlanEstimate(t *testing.T) {
	data := battery.DemoCSV()
	var p Plan
	const settings = `{"tests":["adf","za"],"sims":199}`
	r := decode(t, PlanAnalysis(context.Background(), "demo.csv", data, settings, true))
	if err := json.Unmarshal(r.Result, &p); err != nil || !r.OK {
		t.Fatalf("%v %+v", err, r.Error)
	}
	if p.Series != 7 || len(p.Lengths) != 7 || p.Lengths[0] != 240 || p.First != nil || p.PilotMs <= 0 || len(p.PerSeriesMs) != 7 {
		t.Fatalf("plan: %+v", p)
	}
	// Seven series of equal length: seven times the first one's estimate.
	if want := 7 * p.PerSeriesMs[0]; p.EstimateMs < 0.999*want || p.EstimateMs > 1.001*want || p.EstimateMs <= 0 {
		t.Errorf("estimate %.1f ms, want 7 x %.1f ms", p.EstimateMs, p.PerSeriesMs[0])
	}
	// The estimate against the first series' actual time (loose: the
	// machine may be busy).
	one := `{"tests":["adf","za"],"sims":199,"columns":["freight_volume"]}`
	start := time.Now()
	if r := decode(t, NewSession().Analyze(context.Background(), "demo.csv", data, one, nil)); !r.OK {
		t.Fatal(r.Error)
	}
	actual := float64(time.Since(start).Microseconds()) / 1000
	t.Logf("first series: estimated %.1f ms (pilot %.1f ms), took %.1f ms", p.PerSeriesMs[0], p.PilotMs, actual)
	if ratio := p.PerSeriesMs[0] / actual; ratio < 0.2 || ratio > 5 {
		t.Errorf("estimate %.1f ms for a series that took %.1f ms", p.PerSeriesMs[0], actual)
	}
	// Without replications to cut, the pilot is the first series' analysis.
	r = decode(t, PlanAnalysis(context.Background(), "demo.csv", data, `{"tests":["adf"]}`, true))
	p = Plan{}
	if err := json.Unmarshal(r.Result, &p); err != nil || !r.OK || p.First == nil {
		t.Fatalf("plan without simulation: %+v %v", p, err)
	}
	part := decode(t, AnalyzePart(context.Background(), "demo.csv", data, `{"tests":["adf"]}`, []int{0}, nil))
	var ps []Part
	if err := json.Unmarshal(part.Result, &ps); err != nil || len(ps) != 1 || len(p.First) != 1 || ps[0].Series != p.First[0].Series {
		t.Errorf("the pilot's part differs from the analysis of series 0: %v", err)
	}
}

// FuzzAssemble: any parts text gives a well-formed envelope, never a
// recovered panic.
func FuzzAssemble(f *testing.F) {
	const data = "t,a,b\n1,1,2\n2,3,1\n3,2,4\n4,5,3\n5,4,6\n6,6,5\n7,8,7\n8,7,9\n9,9,8\n10,11,10\n"
	const settings = `{"tests":["kpss"]}`
	f.Add(`[]`, true)
	f.Add(`[{"index":0,"series":"{\"name\":\"a\",\"results\":[]}"}]`, true)
	f.Add(`[{"index":1,"series":"{}"},{"index":0,"series":"{\"n\":3}"}]`, false)
	f.Add(`[{"index":7,"series":"null"}]`, false)
	f.Add(`{`, false)
	f.Fuzz(func(t *testing.T, parts string, partial bool) {
		out := NewSession().Assemble("x.csv", []byte(data), settings, parts, partial)
		var r Reply
		if err := json.Unmarshal([]byte(out), &r); err != nil {
			t.Fatalf("not JSON: %v", err)
		}
		if r.OK == (r.Error != nil) {
			t.Fatalf("bad envelope %s", out)
		}
		if r.Error != nil && strings.Contains(r.Error.Message, "please report") {
			t.Fatalf("recovered panic for %q: %s", parts, r.Error.Message)
		}
	})
}
