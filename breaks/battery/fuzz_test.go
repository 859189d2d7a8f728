// Fuzz test of the public entry point AnalyzeText: arbitrary file text and
// a few settings never panic, and any document returned marshals to JSON
// (no NaN leaks into the schema). Seeds come from the demo data and small
// hand-made files (ours).
package battery

import (
	"context"
	"encoding/json"
	"testing"

	"github.com/rootshift/rootshift/core/schema"
)

func FuzzAnalyzeText(f *testing.F) {
	demo := DemoCSV()
	f.Add(demo[:2000], uint8(0))
	f.Add([]byte("year,x\n2001,1\n2002,2\n2003,1\n2004,3\n2005,2\n2006,4\n2007,3\n2008,5\n2009,4\n2010,6\n2011,5\n2012,7\n"), uint8(1))
	f.Add([]byte("a;b\n1,5;2\n2,5;NA\n"), uint8(2))
	f.Add([]byte("x\n1\n1\n1\n1\n1\n1\n1\n1\n1\n1\n1\n1\n1\n1\n1\n1\n1\n1\n1\n1\n"), uint8(3))
	f.Add([]byte("q,v\n2001Q1,1e308\n2001Q2,-1e308\n2001Q3,1e308\n2001Q4,0\n2002Q1,1\n2002Q2,2\n2002Q3,3\n2002Q4,4\n2003Q1,5\n2003Q2,6\n2003Q3,7\n2003Q4,8\n"), uint8(4))
	sets := []schema.Settings{
		{Tests: []string{"adf", "kpss", "za"}},
		{Tests: []string{"pp", "dfgls", "ls1"}, Transform: "diff"},
		{Tests: []string{"mtests", "sadf", "bp"}, Transform: "log"},
		{Tests: []string{"p89", "meanshift"}, BreakDate: "5", Outlier: "additive", Shifts: 2},
		{},
	}
	f.Fuzz(func(t *testing.T, data []byte, which uint8) {
		if len(data) > 1<<14 {
			return
		}
		s := sets[int(which)%len(sets)]
		doc, _, err := AnalyzeText(context.Background(), "fuzz.csv", data, s, nil)
		if err != nil {
			return
		}
		if _, err := json.Marshal(doc); err != nil {
			t.Fatalf("document does not marshal: %v", err)
		}
		for _, sr := range doc.Series {
			for _, r := range sr.Results {
				if r.Statistic == nil && len(r.Components) == 0 && len(r.BreakTests) == 0 {
					t.Fatalf("%s: result without a statistic", r.Test)
				}
			}
		}
	})
}
