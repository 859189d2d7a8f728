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
// (kmax 8) at T = 200, fast (cross-products) and brute (a QR refit per pair
// and lag order, the brute-force twin).
func BenchmarkLS2(b *testing.B) {
	const T = 200
	y := lmSim(T, 1, 1, 0)
	for _, shift := range []core.Shift{core.ShiftLevel, core.ShiftBoth} {
		m := lmModel{nb: 2, slope: shift == core.ShiftBoth}
		b.Run("T=200/"+shift.String()+"/fast", func(b *testing.B) {
			info, _ := core.Lookup("ls2")
			cfg := &core.Config{Shift: shift, NoPath: true}
			for b.Loop() {
				if _, err := info.Run(context.Background(), y, cfg); err != nil {
					b.Fatal(err)
				}
			}
		})
		b.Run("T=200/"+shift.String()+"/brute", func(b *testing.B) {
			lo, hi, _ := Candidates(T, 0.15)
			spec := lmLagSpec{core.LagTSig, 8}
			for b.Loop() {
				s, _ := lmBruteSearch(2, lo, hi, func(tbs []int) (float64, int, error) { return lmBrute(y, m, tbs, spec) })
				if math.IsInf(s, 0) {
					b.Fatal("no statistic")
				}
			}
		})
	}
}
