package breaks

import (
	"context"
	"fmt"
	"math/rand/v2"
	"testing"

	"github.com/rootshift/rootshift/core"
)

// zaBenchSpec is the ZA model A search with per-candidate t-sig lag
// selection, kmax 8, 15% trimming.
func zaBenchSpec(T int) Spec {
	lo, hi, _ := Candidates(T, 0.15)
	return Spec{Trend: core.TrendLinear, Terms: Terms{Level: true}, LagRule: core.LagTSig, MaxLags: 8, Lo: lo, Hi: hi}
}

func benchRW(T int) []float64 {
	y := make([]float64, T)
	core.RandomWalk(y, rand.New(rand.NewPCG(1, 2)))
	return y
}

// BenchmarkZA is the fast search (t-sig, kmax 8); BenchmarkZABrute is its
// brute-force twin (full core.LS refit of every lag order at every candidate).
func BenchmarkZA(b *testing.B) {
	for _, T := range []int{100, 1000} {
		b.Run(fmt.Sprintf("T=%d", T), func(b *testing.B) {
			y := benchRW(T)
			spec := zaBenchSpec(T)
			var w Searcher
			b.ReportAllocs()
			b.ResetTimer()
			for b.Loop() {
				if _, _, err := w.Search(y, &spec, false); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func BenchmarkZABrute(b *testing.B) {
	for _, T := range []int{100, 1000} {
		b.Run(fmt.Sprintf("T=%d", T), func(b *testing.B) {
			y := benchRW(T)
			spec := zaBenchSpec(T)
			b.ResetTimer()
			for b.Loop() {
				if _, _, err := ioBruteSearch(y, &spec); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// zaIssueSpec is the search of the CLI measurement `test --tests za --shift
// level+slope --lags 4`: model C (level and slope shift), four fixed lags,
// 15% trimming.
func zaIssueSpec(T int) Spec {
	lo, hi, _ := Candidates(T, 0.15)
	return Spec{Trend: core.TrendLinear, Terms: Terms{Level: true, Slope: true}, LagRule: core.LagFixed, Lags: 4, Lo: lo, Hi: hi}
}

// BenchmarkZAModelC is the fast search of model C with four fixed lags and
// its candidate path, as the CLI runs it; BenchmarkZAModelCBrute is its
// brute-force twin (a full core.LS refit at every candidate).
func BenchmarkZAModelC(b *testing.B) {
	for _, T := range []int{100, 1000} {
		b.Run(fmt.Sprintf("T=%d", T), func(b *testing.B) {
			y := benchRW(T)
			spec := zaIssueSpec(T)
			var w Searcher
			b.ReportAllocs()
			for b.Loop() {
				if _, _, err := w.Search(y, &spec, true); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func BenchmarkZAModelCBrute(b *testing.B) {
	for _, T := range []int{100, 1000} {
		b.Run(fmt.Sprintf("T=%d", T), func(b *testing.B) {
			y := benchRW(T)
			spec := zaIssueSpec(T)
			for b.Loop() {
				if _, _, err := ioBruteSearch(y, &spec); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkZASim is 10,000 replications of the za statistic (model A, lag
// 0) at T=250 through the simulation engine.
func BenchmarkZASim(b *testing.B) {
	info, err := core.Lookup("za")
	if err != nil {
		b.Fatal(err)
	}
	cfg := &core.Config{LagRule: core.LagFixed, Lags: 0}
	for b.Loop() {
		if _, err := core.SimulateTest(context.Background(), info, 250, cfg, core.SimSpec{Reps: 10000, Seed: 1}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkPAO is the additive-outlier search (t-sig, kmax 8).
func BenchmarkPAO(b *testing.B) {
	for _, T := range []int{100, 1000} {
		b.Run(fmt.Sprintf("T=%d", T), func(b *testing.B) {
			y := benchRW(T)
			spec := zaBenchSpec(T)
			spec.Terms.Dummy = true
			var w aoSearcher
			for b.Loop() {
				if _, _, err := w.search(y, &spec, false); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// TestSearchNoAlloc checks that a repeated search does not allocate (the
// candidate loop included).
func TestSearchNoAlloc(t *testing.T) {
	y := benchRW(300)
	for _, spec := range []Spec{zaBenchSpec(300), zaIssueSpec(300), {Trend: core.TrendLinear, Terms: Terms{Level: true, Slope: true, Dummy: true},
		LagRule: core.LagFixed, Lags: 2, Lo: 45, Hi: 255, Rule: MaxAbsTSlope}} {
		var w Searcher
		allocs := testing.AllocsPerRun(20, func() {
			if _, _, err := w.Search(y, &spec, false); err != nil {
				t.Fatal(err)
			}
		})
		if allocs != 0 {
			t.Errorf("%+v: %v allocations per search", spec, allocs)
		}
		var a aoSearcher
		allocs = testing.AllocsPerRun(5, func() {
			if _, _, err := a.search(y, &spec, false); err != nil {
				t.Fatal(err)
			}
		})
		if allocs != 0 {
			t.Errorf("ao %+v: %v allocations per search", spec, allocs)
		}
	}
}
