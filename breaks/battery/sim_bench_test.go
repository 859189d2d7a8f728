// Benchmarks of the work `rootshift demo --sims N` does for each of the
// verdict's tests: one demo series (invented data, T = 240) run with
// tests = [id] and simulated p-values, one worker, so that the native and
// the WebAssembly builds (GOOS=js GOARCH=wasm under node) compare the same
// single-core work (issue 12 item 3, issue 13 item 5). The test's own run
// is a small part of each operation; the replications are the rest.
package battery

import (
	"context"
	"testing"

	"github.com/rootshift/rootshift/breaks/decide"
	"github.com/rootshift/rootshift/core/dataset"
	"github.com/rootshift/rootshift/core/schema"
)

// demoSimReps is the replications per benchmark operation.
const demoSimReps = 99

// BenchmarkDemoSim times one demo series' run of each of the verdict's
// tests with demoSimReps simulated replications on one core.
func BenchmarkDemoSim(b *testing.B) {
	s := schema.Settings{}
	t, err := dataset.Parse(DemoName, DemoCSV(), dataset.OptionsFor(s))
	if err != nil {
		b.Fatal(err)
	}
	series, errs := dataset.Select(t, s)
	if len(errs) > 0 || len(series) == 0 {
		b.Fatalf("demo data: %v", errs)
	}
	in := series[0]
	for _, id := range decide.Tests {
		b.Run(id, func(b *testing.B) {
			st := schema.Settings{Tests: []string{id}, Sims: demoSimReps}
			for i := 0; i < b.N; i++ {
				sr, err := AnalyzeSeries(context.Background(), in, st, &Options{Workers: 1})
				if err != nil || len(sr.Errors) > 0 || len(sr.Results) != 1 || sr.Results[0].PValueSim == nil {
					b.Fatalf("%s: %v %+v", id, err, sr.Errors)
				}
			}
		})
	}
}
