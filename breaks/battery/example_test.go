package battery_test

import (
	"context"
	"fmt"

	"github.com/rootshift/rootshift/breaks/battery"
	"github.com/rootshift/rootshift/core/schema"
)

// The demo data is invented: a stationary series around a constant mean.
func ExampleAnalyzeText() {
	s := schema.Settings{Tests: []string{"adf", "kpss"}, Columns: []string{"credit_spread"}}
	doc, _, err := battery.AnalyzeText(context.Background(), battery.DemoName, battery.DemoCSV(), s, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, r := range doc.Series[0].Results {
		fmt.Printf("%s %s: reject=%v\n", r.Test, r.Trend, r.Reject)
	}
	// Output:
	// adf constant: reject=true
	// kpss constant: reject=false
}
