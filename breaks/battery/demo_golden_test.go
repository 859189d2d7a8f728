// Golden test of the verdicts on the invented demo data: class, order,
// transform, breaks and the explanation of every series, as the analyst
// reads them. The expected text is the procedure's own output, reviewed
// by hand when it changes (regenerate with: go test ./breaks/battery -run
// DemoVerdictsGolden -update); no published source.
package battery

import (
	"context"
	"flag"
	"fmt"
	"os"
	"strings"
	"testing"

	"github.com/rootshift/rootshift/core/schema"
)

var update = flag.Bool("update", false, "rewrite golden files")

func TestDemoVerdictsGolden(t *testing.T) {
	doc, _, err := AnalyzeText(context.Background(), DemoName, DemoCSV(), schema.Settings{}, nil)
	if err != nil {
		t.Fatal(err)
	}
	var b strings.Builder
	for _, s := range doc.Series {
		v := s.Verdict
		if v == nil {
			t.Fatalf("%s: no verdict", s.Name)
		}
		order := "undetermined"
		if v.Order != nil {
			order = fmt.Sprint(*v.Order)
		}
		var br []string
		for _, x := range v.Breaks {
			br = append(br, x.Date)
		}
		fmt.Fprintf(&b, "== %s\nclass: %s\norder: %s\ntransform: %s\nscale: %s\nbreaks: %s\nexplanation: %s\n", s.Name, v.Class, order, v.Transform, v.Scale, strings.Join(br, " "), v.Explanation)
		for _, st := range v.Stages {
			fmt.Fprintf(&b, "stage %s: %s\n", st.Name, st.Decision)
		}
		b.WriteString("\n")
	}
	const path = "testdata/demo_verdicts.golden"
	if *update {
		if err := os.MkdirAll("testdata", 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run with -update)", err)
	}
	if got := b.String(); got != string(want) {
		t.Errorf("demo verdicts differ from %s; run with -update and review the diff\n%s", path, got)
	}
}
