// The verdict on open data (testdata/README.md gives provenance and
// licences): the monthly US employment file of vega-datasets 3.2.1
// (23 columns, 2006-2015) and its monthly S&P 500 file (2000-2010). What is
// expected is common practice, no published source: a smooth employment
// series through a recession is not explosive (a downturn and recovery is a
// turn in drift, not a bubble), and no employment level is stationary in
// levels around a constant mean with a recession inside; a stock price
// index in levels is integrated. The monthly CO2 file of the same package
// (co2-concentration.csv, with three calendar gaps) is strongly seasonal
// with a stable pattern (common practice): its verdict names the
// seasonality, with the gaps reported by the reader.
package decide_test

import (
	"context"
	"fmt"
	"os"
	"strings"
	"testing"

	"github.com/rootshift/rootshift/breaks/battery"
	"github.com/rootshift/rootshift/breaks/decide"
	"github.com/rootshift/rootshift/core/schema"
)

func analyzeFile(t *testing.T, path string) *schema.Document {
	return analyzeWith(t, path, schema.Settings{})
}

func analyzeWith(t *testing.T, path string, s schema.Settings) *schema.Document {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	doc, _, err := battery.AnalyzeText(context.Background(), path, b, s, nil)
	if err != nil {
		t.Fatal(err)
	}
	return doc
}

func TestEmploymentNoColumnExplosive(t *testing.T) {
	doc := analyzeFile(t, "../../testdata/us-employment.csv")
	if len(doc.Series) != 23 {
		t.Fatalf("%d series, want 23", len(doc.Series))
	}
	for _, s := range doc.Series {
		v := s.Verdict
		if v == nil {
			t.Errorf("%s: no verdict (%v)", s.Name, s.Errors)
			continue
		}
		if v.Reliability == nil || v.Reliability.Headline == "" || len(v.Stages) < 3 {
			t.Errorf("%s: verdict without stages or reliability", s.Name)
			continue
		}
		t.Logf("%-36s %-18s transform %-18s %s", s.Name, v.Class, v.Transform, v.Reliability.Headline)
		if v.Class == decide.ClassExplosive {
			t.Errorf("%s: called explosive: %s", s.Name, v.Explanation)
		}
		// Stationary around a constant mean, with the 2008-09 recession
		// inside, is not a reading of an employment level anyone would sign.
		if v.Class == decide.ClassStationary {
			t.Errorf("%s: called stationary around a constant mean: %s", s.Name, v.Explanation)
		}
		if s.Name == "nonfarm" && decide.Direction(v.Class) != decide.DirIntegrated {
			t.Errorf("nonfarm: class %s, want an integrated class", v.Class)
		}
	}
}

func TestStockIndexIntegrated(t *testing.T) {
	doc := analyzeFile(t, "../../testdata/sp500.csv")
	v := doc.Series[0].Verdict
	if v == nil || decide.Direction(v.Class) != decide.DirIntegrated {
		t.Fatalf("S&P 500: verdict %+v, want an integrated class", v)
	}
	t.Logf("S&P 500 2000-2010: %s, %s", v.Class, v.Explanation)
}

func TestCO2SeasonalityNamed(t *testing.T) {
	doc := analyzeWith(t, "../../testdata/co2-concentration.csv", schema.Settings{Gaps: "split"})
	var s *schema.Series
	for i := range doc.Series {
		if doc.Series[i].Name == "CO2" {
			s = &doc.Series[i]
		}
	}
	if s == nil || s.Verdict == nil {
		t.Fatalf("no verdict for the CO2 column: %+v", doc.Series)
	}
	if len(s.Notes) == 0 || !strings.Contains(fmt.Sprint(s.Notes), "gap") {
		t.Errorf("the calendar gaps are not in the series' notes: %+v", s.Notes)
	}
	var stage *schema.Stage
	for i := range s.Verdict.Stages {
		if s.Verdict.Stages[i].Name == "seasonality" {
			stage = &s.Verdict.Stages[i]
		}
	}
	if stage == nil || strings.HasPrefix(stage.Decision, "no seasonality") || !strings.Contains(s.Verdict.Explanation, "seasonal") {
		t.Errorf("seasonality not named: stage %+v, explanation %q", stage, s.Verdict.Explanation)
	}
	t.Logf("CO2: %s, %s; %s", s.Verdict.Class, s.Verdict.Transform, s.Verdict.Explanation)
}
