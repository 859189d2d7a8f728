package bridge

import (
	"context"
	"errors"
	"math/rand/v2"
	"time"

	"github.com/rootshift/rootshift/breaks/battery"
	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/schema"
)

// BenchT is the length of the series of the benchmark search.
const BenchT = 200

// BenchSeries is the benchmark's data: a Gaussian random walk of length
// BenchT from rand.NewPCG(2026, 7), the same on every platform.
func BenchSeries() []float64 {
	r := rand.New(rand.NewPCG(2026, 7))
	y := make([]float64, BenchT)
	s := 0.0
	for i := range y {
		s += r.NormFloat64()
		y[i] = s
	}
	return y
}

// BenchZA runs the one-break search of test "za" (with the settings the
// battery gives it by default) n times on BenchSeries and returns the
// elapsed time and the last statistic. The page runs the same function
// compiled to WebAssembly (the bench call), the tests run it natively, and
// the ratio of the two times is the WebAssembly slowdown.
func BenchZA(n int) (time.Duration, float64, error) {
	if n < 1 || n > 100000 {
		return 0, 0, usageErr("bench: n = %d, want 1..100000", n)
	}
	info, err := core.Lookup("za")
	if err != nil {
		return 0, 0, err
	}
	y := BenchSeries()
	cfg := battery.Config(schema.Settings{}, "za", nil)
	var stat float64
	start := time.Now()
	for range n {
		res, err := info.Run(context.Background(), y, cfg)
		if err != nil {
			return 0, 0, err
		}
		if res.Statistic == nil {
			return 0, 0, errors.New("bench: za returned no statistic")
		}
		stat = *res.Statistic
	}
	return time.Since(start), stat, nil
}

// BenchResult is what the bench call returns.
type BenchResult struct {
	N         int     `json:"n"`
	Millis    float64 `json:"ms"`
	Statistic float64 `json:"statistic"`
}

// Bench runs BenchZA(n) and returns the envelope with the milliseconds.
func Bench(n int) string {
	return Call(func() (any, error) {
		d, stat, err := BenchZA(n)
		if err != nil {
			return nil, err
		}
		return BenchResult{N: n, Millis: float64(d.Nanoseconds()) / 1e6, Statistic: stat}, nil
	})
}
