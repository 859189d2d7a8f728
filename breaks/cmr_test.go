package breaks

import (
	"context"
	"testing"

	"github.com/rootshift/rootshift/core"
)

func FuzzCMR(f *testing.F) {
	lmFuzzSeed(f, 40)
	ids := []string{"meanshift/innovational-1", "meanshift/additive-1", "meanshift/innovational-2", "meanshift/additive-2", "lp"}
	f.Fuzz(func(t *testing.T, data []byte, shift, lags uint8) {
		id := ids[int(shift)%len(ids)]
		lmFuzzRun(t, id, data, 0, lags, 50)
	})
}

func BenchmarkCMR(b *testing.B) {
	for _, T := range []int{100, 200} {
		y := lmSim(T, 1, 1, 0)
		for _, id := range []string{"meanshift/innovational-1", "meanshift/additive-1", "meanshift/innovational-2", "meanshift/additive-2"} {
			tid, cfg := msCase(id, &core.Config{NoPath: true})
			info, _ := core.Lookup(tid)
			b.Run("T="+lmItoa(T)+"/"+id, func(b *testing.B) {
				for b.Loop() {
					if _, err := info.Run(context.Background(), y, cfg); err != nil {
						b.Fatal(err)
					}
				}
			})
		}
	}
}

func BenchmarkLP(b *testing.B) {
	for _, T := range []int{100, 200} {
		y := lmSim(T, 1, 1, 0)
		info, _ := core.Lookup("lp")
		for _, shift := range []core.Shift{core.ShiftLevel, core.ShiftBoth} {
			b.Run(lmBenchName(T, shift), func(b *testing.B) {
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
