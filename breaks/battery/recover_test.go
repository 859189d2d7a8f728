// A panic inside a test must become that series' error and never stop the
// analysis (project rule: nothing panics across the API). The panicking
// test is registered here, in the test binary only.
package battery

import (
	"context"
	"strings"
	"testing"

	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/schema"
)

func init() {
	core.Register(core.Info{ID: "zzpanic", Name: "panics (test only)", Tail: "left",
		Run: func(context.Context, []float64, *core.Config) (*schema.Result, error) {
			var m map[string]int
			m["boom"]++ // nil map write: a runtime panic
			return nil, nil
		}})
}

func TestPanicBecomesSeriesError(t *testing.T) {
	s := schema.Settings{Tests: []string{"zzpanic", "adf"}, Columns: []string{"credit_spread"}}
	doc, _, err := AnalyzeText(context.Background(), DemoName, DemoCSV(), s, nil)
	if err != nil {
		t.Fatal(err)
	}
	sr := doc.Series[0]
	if len(sr.Errors) != 1 || sr.Errors[0].Test != "zzpanic" || !strings.Contains(sr.Errors[0].Message, "internal error") {
		t.Fatalf("errors %+v", sr.Errors)
	}
	if len(sr.Results) != 1 || sr.Results[0].Test != "adf" {
		t.Fatalf("the other test must still run: %+v", sr.Results)
	}
}
