package report

import (
	"fmt"
	"io"
	"math/rand/v2"
	"testing"

	"github.com/rootshift/rootshift/core/dataset"
	"github.com/rootshift/rootshift/core/schema"
)

// benchSeries is a seeded random walk of length n with a path over every
// candidate date, as a break search of that length would give.
func benchSeries(n int) (dataset.Series, schema.Result) {
	r := rand.New(rand.NewPCG(1, uint64(n)))
	s := dataset.Series{Name: "rw", Values: make([]float64, n)}
	y := 0.0
	for i := range s.Values {
		y += r.NormFloat64()
		s.Values[i] = y
	}
	res := schema.Result{Test: "za", Statistic: fp(-4), CriticalValues: map[string]float64{"0.05": -4.8},
		Breaks: []schema.Break{{Index: n / 2, Lower: n/2 - 3, Upper: n/2 + 3, CILevel: 0.9}}}
	for i := n * 15 / 100; i <= n*85/100; i++ {
		res.Path = append(res.Path, schema.PathPoint{Index: i, Statistic: r.NormFloat64() - 3})
	}
	return s, res
}

var sizes = []int{100, 1000, 10000}

func BenchmarkSeriesSVG(b *testing.B) {
	for _, n := range sizes {
		s, res := benchSeries(n)
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				_ = SeriesSVG(s, res.Breaks, nil)
			}
		})
	}
}

func BenchmarkPathSVG(b *testing.B) {
	for _, n := range sizes {
		_, res := benchSeries(n)
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				_ = PathSVG(res)
			}
		})
	}
}

// BenchmarkACF times the O(T·lags) autocorrelations with the default
// 10 log10 T lags.
func BenchmarkACF(b *testing.B) {
	for _, n := range sizes {
		s, _ := benchSeries(n)
		lags := acfDefaultLags(n)
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				_ = ACF(s.Values, lags)
			}
		})
	}
}

// BenchmarkWriteHTML times the whole report for one series of length n
// with a break search.
func BenchmarkWriteHTML(b *testing.B) {
	for _, n := range sizes {
		s, res := benchSeries(n)
		doc := &schema.Document{Series: []schema.Series{{Name: "rw", N: n, Results: []schema.Result{res}}}}
		in := []dataset.Series{s}
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if err := WriteHTML(io.Discard, doc, in); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkWriteTable times the terminal table of a batch of series.
func BenchmarkWriteTable(b *testing.B) {
	for _, k := range []int{1, 100} {
		doc := fixtureDoc()
		for len(doc.Series) < k {
			doc.Series = append(doc.Series, doc.Series[0])
		}
		doc.Series = doc.Series[:k]
		b.Run(fmt.Sprintf("series=%d", k), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if err := WriteTable(io.Discard, doc); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// TestACFNoAllocBeyondResult: ACF allocates only its result.
func TestACFNoAllocBeyondResult(t *testing.T) {
	s, _ := benchSeries(1000)
	if n := testing.AllocsPerRun(20, func() { _ = ACF(s.Values, 30) }); n > 1 {
		t.Errorf("ACF allocates %v times per call, want 1", n)
	}
}
