package core

import (
	"context"
	"math"
	"testing"
)

// TestKPSSByHand: η for a short series with l = 1, from eqs. (8)-(10) of
// Kwiatkowski et al. (1992) written out.
func TestKPSSByHand(t *testing.T) {
	y := []float64{1, 3, 2, 5, 4, 6, 5, 8, 7, 9}
	T := float64(len(y))
	mean := 0.0
	for _, v := range y {
		mean += v
	}
	mean /= T
	e := make([]float64, len(y))
	for i, v := range y {
		e[i] = v - mean
	}
	g0, g1 := 0.0, 0.0
	for i := range e {
		g0 += e[i] * e[i]
		if i > 0 {
			g1 += e[i] * e[i-1]
		}
	}
	s2 := g0/T + 2*(1-1.0/2)*g1/T
	S, ss := 0.0, 0.0
	for _, v := range e {
		S += v
		ss += S * S
	}
	want := ss / (T * T * s2)
	res, err := runKPSS(context.Background(), y, &Config{BandwidthRule: BandwidthFixed, Bandwidth: 1})
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(*res.Statistic-want) > 1e-12 {
		t.Errorf("η = %.15g, want %.15g", *res.Statistic, want)
	}
}

// TestKPSSCriticalValues: the reported critical values are KPSS (1992)
// Table 1 (shared reference §4a, SEEN-S).
func TestKPSSCriticalValues(t *testing.T) {
	want := map[Trend]map[string]float64{
		TrendConstant: {"0.10": 0.347, "0.05": 0.463, "0.025": 0.574, "0.01": 0.739}, // η_μ
		TrendLinear:   {"0.10": 0.119, "0.05": 0.146, "0.025": 0.176, "0.01": 0.216}, // η_τ
	}
	for tr, cv := range want {
		res, err := runKPSS(context.Background(), dfAR1(100, 0.2, 1), &Config{Trend: tr})
		if err != nil {
			t.Fatal(err)
		}
		for k, v := range cv {
			if res.CriticalValues[k] != v {
				t.Errorf("%v %s: %g, want %g", tr, k, res.CriticalValues[k], v)
			}
		}
		if res.Tail != "right" || res.CriticalSource == "" || res.Bandwidth == nil {
			t.Errorf("fields %+v", res)
		}
	}
}

// TestKPSSBehaviour: KPSS rejects a random walk and accepts white noise
// (common practice), with the default Newey-West bandwidth (which grows on a
// random walk's residuals and costs some power: ~80% at T = 200).
func TestKPSSBehaviour(t *testing.T) {
	for _, tr := range []Trend{TrendConstant, TrendLinear} {
		c := &Config{Trend: tr}
		if r := dfRejectRate(t, "kpss", c, 100, func(i int) []float64 { return dfRW(200, 0, uint64(i)) }); r < 0.7 {
			t.Errorf("%v: random walk rejected in only %.0f%%", tr, 100*r)
		}
		if r := dfRejectRate(t, "kpss", c, 200, func(i int) []float64 { return dfAR1(200, 0, uint64(i)) }); r > 0.10 {
			t.Errorf("%v: white noise rejected in %.0f%%", tr, 100*r)
		}
	}
	res, err := runKPSS(context.Background(), dfRW(50, 0, 1), &Config{Trend: TrendNone})
	if err != nil || res.Trend != "constant" || len(res.Warnings) == 0 {
		t.Errorf("trend none should run η_μ with a warning: %v %+v", err, res)
	}
}

func BenchmarkKPSS(b *testing.B) { dfBenchRun(b, "kpss", &Config{}) }
