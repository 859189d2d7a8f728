package breaks

import (
	"context"
	"encoding/binary"
	"errors"
	"math"
	"testing"

	"github.com/rootshift/rootshift/core"
)

// lmFuzzSeries decodes up to max float64 values from raw bytes.
func lmFuzzSeries(data []byte, max int) []float64 {
	var y []float64
	for len(data) >= 8 && len(y) < max {
		y = append(y, math.Float64frombits(binary.LittleEndian.Uint64(data)))
		data = data[8:]
	}
	return y
}

func lmFuzzSeed(f *testing.F, T int) {
	for s := uint64(0); s < 3; s++ {
		y := lmSim(T, s, 0.9, 2, 0.5)
		b := make([]byte, 8*len(y))
		for i, v := range y {
			binary.LittleEndian.PutUint64(b[8*i:], math.Float64bits(v))
		}
		f.Add(b, uint8(s), uint8(s))
	}
	f.Add([]byte{1, 2, 3}, uint8(0), uint8(0))
}

// lmFuzzRun runs test id on fuzzed data: it must return an error or a finite
// statistic, never panic (common practice).
func lmFuzzRun(t *testing.T, id string, data []byte, shift, lags uint8, max int) {
	y := lmFuzzSeries(data, max)
	cfg := &core.Config{Shift: core.Shift(shift % 3)}
	if lags%4 == 1 {
		cfg.LagRule, cfg.Lags = core.LagFixed, int(lags%5)
	}
	id, cfg = msCase(id, cfg)
	info, err := core.Lookup(id)
	if err != nil {
		t.Fatal(err)
	}
	res, err := info.Run(context.Background(), y, cfg)
	if err != nil {
		var ce *core.Error
		if !errors.As(err, &ce) || ce.Test != id {
			t.Fatalf("error %v is not a *core.Error for %s", err, id)
		}
		return
	}
	if res.Statistic == nil || math.IsNaN(*res.Statistic) || math.IsInf(*res.Statistic, 0) {
		t.Fatalf("non-finite statistic %v", res.Statistic)
	}
	if res.PValue != nil && (*res.PValue < 0 || *res.PValue > 1) {
		t.Fatalf("p-value %v", *res.PValue)
	}
}

func FuzzLS1(f *testing.F) {
	lmFuzzSeed(f, 60)
	f.Fuzz(func(t *testing.T, data []byte, shift, lags uint8) { lmFuzzRun(t, "ls1", data, shift, lags, 120) })
}

// BenchmarkLS1 times the one-break LM search (t-sig, kmax 8) through Run
// at T = 100, 1000, 10000; BenchmarkLS1Scan is the previous O(T) per
// candidate path and BenchmarkLS1Brute the QR refit per candidate and lag
// order (the brute-force twin), beside it at the sizes where they finish.
func BenchmarkLS1(b *testing.B) {
	for _, T := range []int{100, 1000, 10000} {
		y := lmSim(T, 1, 1, 0)
		info, _ := core.Lookup("ls1")
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

func BenchmarkLS1Scan(b *testing.B) {
	for _, T := range []int{100, 1000} {
		y := lmSim(T, 1, 1, 0)
		for _, shift := range []core.Shift{core.ShiftLevel, core.ShiftBoth} {
			b.Run(lmBenchName(T, shift), func(b *testing.B) {
				m := lmModel{nb: 1, slope: shift == core.ShiftBoth}
				spec := lmLagSpec{core.LagTSig, 8}
				lo, hi, _ := Candidates(T, 0.15)
				var w lmScanWork
				for b.Loop() {
					w.setup(y, spec.k)
					f := func(tbs []int) (float64, int, int, error) { return w.lmStat(m, tbs, spec) }
					if r, _ := lmSearch1(nil, max(lo, spec.k+3), hi, f, false); r.ncand == 0 {
						b.Fatal("no statistic")
					}
				}
			})
		}
	}
}

func BenchmarkLS1Brute(b *testing.B) {
	const T = 100
	y := lmSim(T, 1, 1, 0)
	for _, shift := range []core.Shift{core.ShiftLevel, core.ShiftBoth} {
		b.Run(lmBenchName(T, shift), func(b *testing.B) {
			m := lmModel{nb: 1, slope: shift == core.ShiftBoth}
			spec := lmLagSpec{core.LagTSig, 8}
			lo, hi, _ := Candidates(T, 0.15)
			for b.Loop() {
				s, _ := lmBruteSearch(1, max(lo, spec.k+3), hi, func(tbs []int) (float64, int, error) { return lmBrute(y, m, tbs, spec) })
				if math.IsInf(s, 0) {
					b.Fatal("no statistic")
				}
			}
		})
	}
}

func lmBenchName(T int, s core.Shift) string {
	return "T=" + lmItoa(T) + "/" + s.String()
}

func lmItoa(n int) string {
	if n == 0 {
		return "0"
	}
	var b []byte
	for n > 0 {
		b = append([]byte{byte('0' + n%10)}, b...)
		n /= 10
	}
	return string(b)
}
