// Tests of the default battery and the verdict on the built-in demo data.
// The demo data is invented (see DemoDescription); the expected classes are
// the ones its generator builds in — behaviour checks, common practice, no
// published source.
package battery

import (
	"bytes"
	"context"
	"encoding/json"
	"os"
	"testing"

	"github.com/rootshift/rootshift/breaks/decide"
	"github.com/rootshift/rootshift/core/schema"
)

func TestDemoFileMatchesGenerator(t *testing.T) {
	b, err := os.ReadFile("../../testdata/demo.csv")
	if err != nil {
		t.Fatalf("testdata/demo.csv: %v (regenerate with: go run ./cmd/rootshift demo --data > testdata/demo.csv)", err)
	}
	if !bytes.Equal(b, DemoCSV()) {
		t.Fatal("testdata/demo.csv differs from DemoCSV(): regenerate it with go run ./cmd/rootshift demo --data > testdata/demo.csv")
	}
}

func TestDemoVerdicts(t *testing.T) {
	doc, inputs, err := AnalyzeText(context.Background(), DemoName, DemoCSV(), schema.Settings{}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if len(doc.Series) != 7 || len(inputs) != 7 {
		t.Fatalf("want 7 demo series, got %d", len(doc.Series))
	}
	if doc.Schema != schema.ID || doc.Caution == "" {
		t.Errorf("document header: %q %q", doc.Schema, doc.Caution)
	}
	// The class each invented series was generated to have.
	want := map[string][]string{
		"freight_volume":  {decide.ClassUnitRoot},
		"consumer_prices": {decide.ClassUnitRoot},
		"power_demand":    {decide.ClassTrendStationary},
		"jobless_rate":    {decide.ClassBreakStationary},
		"credit_spread":   {decide.ClassStationary},
		"housing_index":   {decide.ClassExplosive},
		"visitor_nights":  {decide.ClassUnitRootBreaks},
	}
	for _, sr := range doc.Series {
		if len(sr.Errors) > 0 {
			t.Errorf("%s: errors %+v", sr.Name, sr.Errors)
		}
		v := sr.Verdict
		if v == nil {
			t.Errorf("%s: no verdict", sr.Name)
			continue
		}
		t.Logf("%-16s %-18s order=%v transform=%-16s breaks=%v\n    %s", sr.Name, v.Class, deref(v.Order), v.Transform, v.Breaks, v.Explanation)
		ok := false
		for _, c := range want[sr.Name] {
			ok = ok || c == v.Class
		}
		if !ok {
			t.Errorf("%s: class %s, want one of %v", sr.Name, v.Class, want[sr.Name])
		}
		if (sr.Name == "jobless_rate" || sr.Name == "visitor_nights") && v.Class == want[sr.Name][0] {
			found := false
			for _, b := range v.Breaks {
				found = found || (b.Index >= 106 && b.Index <= 114)
			}
			if !found {
				t.Errorf("%s: breaks %v, want one near observation 110 (2009-02)", sr.Name, v.Breaks)
			}
		}
	}
	if _, err := json.Marshal(doc); err != nil {
		t.Fatalf("document does not marshal: %v", err)
	}
}

func deref(p *int) any {
	if p == nil {
		return nil
	}
	return *p
}
