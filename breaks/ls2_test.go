package breaks

import (
	"context"
	"math"
	"testing"

	"github.com/rootshift/rootshift/core"
)

func FuzzLS2(f *testing.F) {
	lmFuzzSeed(f, 40)
	f.Fuzz(func(t *testing.T, data []byte, shift, lags uint8) { lmFuzzRun(t, "ls2", data, shift, lags, 50) })
}

// BenchmarkLS2 times the two-break LM search with t-sig lag selection
// (kmax 8) through Run at T = 100, 200, 1000; BenchmarkLS2Brute is its
// brute-force twin (a QR refit per pair and lag order) at T = 100, 200.
func BenchmarkLS2(b *testing.B) {
	for _, T := range []int{100, 200, 1000} {
		y := lmSim(T, 1, 1, 0)
		for _, shift := range []core.Shift{core.ShiftLevel, core.ShiftBoth} {
			b.Run(lmBenchName(T, shift), func(b *testing.B) {
				info, _ := core.Lookup("ls2")
				cfg := &core.Config{Shift: shift, NoPath: true}
				for b.Loop() {
					if _, err := info.Run(context.Background(), y, cfg); err != nil {
						b.Fatal(err)
					}
				}
			})
		}
	}
}

func BenchmarkLS2Brute(b *testing.B) {
	for _, T := range []int{100, 200} {
		y := lmSim(T, 1, 1, 0)
		for _, shift := range []core.Shift{core.ShiftLevel, core.ShiftBoth} {
			m := lmModel{nb: 2, slope: shift == core.ShiftBoth}
			b.Run(lmBenchName(T, shift), func(b *testing.B) {
				lo, hi, _ := Candidates(T, 0.15)
				spec := lmLagSpec{core.LagTSig, 8}
				for b.Loop() {
					s, _ := lmBruteSearch(2, max(lo, spec.k+3), hi, func(tbs []int) (float64, int, error) { return lmBrute(y, m, tbs, spec) })
					if math.IsInf(s, 0) {
						b.Fatal("no statistic")
					}
				}
			})
		}
	}
}
