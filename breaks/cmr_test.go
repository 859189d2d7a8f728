package breaks

import (
	"context"
	"math"
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

// BenchmarkCMR and BenchmarkLP time the searches through Run (t-sig, kmax
// 8) at T = 100, 200, 1000; BenchmarkADFBrute is their brute-force twin (a
// QR refit per candidate and lag order) at T = 100.
func BenchmarkCMR(b *testing.B) {
	for _, T := range []int{100, 200, 1000} {
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
	for _, T := range []int{100, 200, 1000} {
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

func BenchmarkADFBrute(b *testing.B) {
	const T = 100
	y := lmSim(T, 1, 1, 0)
	for _, c := range []struct {
		id    string
		shift core.Shift
	}{{"lp", core.ShiftLevel}, {"lp", core.ShiftBoth}, {"meanshift/innovational-1", core.ShiftLevel}, {"meanshift/additive-1", core.ShiftLevel}, {"meanshift/innovational-2", core.ShiftLevel}, {"meanshift/additive-2", core.ShiftLevel}} {
		id, cfg := msCase(c.id, &core.Config{Shift: c.shift})
		b.Run("T="+lmItoa(T)+"/"+c.id+"/"+c.shift.String(), func(b *testing.B) {
			a, _ := adfTestOf(id, cfg)
			spec, lo, hi, gap, err := adfPrepare(a, y, cfg)
			if err != nil {
				b.Fatal(err)
			}
			for b.Loop() {
				best := math.Inf(1)
				for t1 := lo; t1 <= hi; t1++ {
					if a.nb == 1 {
						if s, _, err := adfBrute(y, a, []int{t1}, spec); err == nil {
							best = math.Min(best, s)
						}
						continue
					}
					for t2 := t1 + gap; t2 <= hi; t2++ {
						if s, _, err := adfBrute(y, a, []int{t1, t2}, spec); err == nil {
							best = math.Min(best, s)
						}
					}
				}
				if math.IsInf(best, 0) {
					b.Fatal("no statistic")
				}
			}
		})
	}
}
