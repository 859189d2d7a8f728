// Tests of the Dickey-Fuller t-ratio from cross-products (lags.go,
// DFWork.TStatFast): the t-ratio of ρ in Δy_t = det_t'δ + ρ y_{t-1} +
// Σ_{i=1..k} γ_i Δy_{t-i} + e_t (Said & Dickey 1984, eq. 1.3; Dickey &
// Fuller 1979), computed from one Cholesky factorisation with y_{t-1} last,
// must equal the Householder QR fit (Regress), its brute-force twin, on
// every deterministic case and order, for series far from the origin, with
// strong drifts and short samples; it must decline the samples only the QR
// fit can judge; it does not allocate. The ADF statistic function used by
// the simulated nulls and the bootstrap must give the test's own statistic.
package core

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"testing"
)

func fastSeries(kind string, T int, seed uint64) []float64 {
	r := rand.New(rand.NewPCG(seed, 41))
	y := make([]float64, T)
	s, u := 0.0, 0.0
	for i := range y {
		e := r.NormFloat64()
		switch kind {
		case "walk":
			s += e
			y[i] = s
		case "ar":
			u = 0.5*u + e
			y[i] = u
		case "drift":
			// A random walk with a drift of 5 standard deviations a step:
			// y_{t-1} and the trend are nearly collinear.
			s += 5 + e
			y[i] = s
		case "far":
			// A walk around 1e6 (eight digits lost without centring).
			s += e
			y[i] = 1e6 + s
		case "ma":
			// Δy an MA(1) with θ = -0.8.
			s += e - 0.8*u
			u = e
			y[i] = s
		}
	}
	return y
}

func TestTStatFastMatchesQR(t *testing.T) {
	for _, kind := range []string{"walk", "ar", "drift", "far", "ma"} {
		for _, T := range []int{20, 100, 300, 1000} {
			for _, det := range []Trend{TrendNone, TrendConstant, TrendLinear} {
				for _, k := range []int{0, 1, 3, 8, 15} {
					if T-k-1 <= 1+k+det.NumDet()+2 {
						continue
					}
					y := fastSeries(kind, T, uint64(T*31+k))
					var w, q DFWork
					f, err := q.Regress(y, det, k, 0)
					if err != nil {
						t.Fatalf("%s T=%d %v k=%d: QR: %v", kind, T, det, k, err)
					}
					got, ok := w.TStatFast(y, det, k)
					if !ok {
						// Declining is allowed only for a nearly collinear
						// design, which none of these is except the
						// strong drift with a trend.
						if kind != "drift" || det != TrendLinear {
							t.Errorf("%s T=%d %v k=%d: fast path declined", kind, T, det, k)
						}
						continue
					}
					if d := math.Abs(got - f.TStat); d > 1e-9*(1+math.Abs(f.TStat)) {
						t.Errorf("%s T=%d %v k=%d: fast t %.15g, QR t %.15g", kind, T, det, k, got, f.TStat)
					}
				}
			}
		}
	}
}

// TestTStatFastDeclines lists samples whose answer only the QR fit gives
// (an error or an exact fit), which the fast path must leave to it.
func TestTStatFastDeclines(t *testing.T) {
	lin := make([]float64, 50)
	for i := range lin {
		lin[i] = 3 + 0.5*float64(i)
	}
	cst := make([]float64, 50)
	for i := range cst {
		cst[i] = 7
	}
	nan := fastSeries("walk", 50, 1)
	nan[20] = math.NaN()
	cases := []struct {
		name string
		y    []float64
		det  Trend
		k    int
	}{
		{"linear trend, constant differences", lin, TrendConstant, 1},
		{"constant series", cst, TrendConstant, 0},
		{"missing value", nan, TrendLinear, 2},
		{"too short", fastSeries("walk", 8, 2), TrendLinear, 3},
	}
	for _, c := range cases {
		var w DFWork
		if v, ok := w.TStatFast(c.y, c.det, c.k); ok {
			t.Errorf("%s: fast path answered %v", c.name, v)
		}
	}
}

// TestADFStatFuncMatchesTest checks that the statistic function of adf
// (simulated nulls, the verdict's bootstrap) returns the statistic the
// test reports, with lags chosen by each rule.
func TestADFStatFuncMatchesTest(t *testing.T) {
	info, err := Lookup("adf")
	if err != nil {
		t.Fatal(err)
	}
	for _, kind := range []string{"walk", "ar", "far", "ma"} {
		for _, rule := range []LagRule{LagBIC, LagAIC, LagMAIC, LagTSig} {
			for _, det := range []Trend{TrendConstant, TrendLinear} {
				y := fastSeries(kind, 250, 7)
				cfg := &Config{Trend: det, LagRule: rule}
				res, err := info.Run(context.Background(), y, cfg)
				if err != nil {
					t.Fatal(err)
				}
				c := *cfg
				c.NoPath = true
				got, err := info.StatOf(len(y), &c)(y)
				if err != nil {
					t.Fatal(err)
				}
				if d := math.Abs(got - *res.Statistic); d > 1e-9*(1+math.Abs(got)) {
					t.Errorf("%s %v %v: statistic function %.15g, test %.15g", kind, rule, det, got, *res.Statistic)
				}
			}
		}
	}
}

func TestTStatFastNoAlloc(t *testing.T) {
	y := fastSeries("walk", 300, 3)
	var w DFWork
	w.TStatFast(y, TrendLinear, 4)
	if a := testing.AllocsPerRun(20, func() { w.TStatFast(y, TrendLinear, 4) }); a != 0 {
		t.Errorf("TStatFast allocates %v times per call", a)
	}
}

// BenchmarkTStatFast times the t-ratio from cross-products beside its
// brute-force twin, the QR fit.
func BenchmarkTStatFast(b *testing.B) {
	for _, k := range []int{0, 4} {
		y := fastSeries("walk", 300, 3)
		var w DFWork
		b.Run(fmt.Sprintf("cross/T=300/k=%d", k), func(b *testing.B) {
			for range b.N {
				w.TStatFast(y, TrendLinear, k)
			}
		})
		b.Run(fmt.Sprintf("qr/T=300/k=%d", k), func(b *testing.B) {
			for range b.N {
				if _, err := w.Regress(y, TrendLinear, k, 0); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// FuzzTStatFast feeds series built from arbitrary bytes (random-walk-like
// steps of a few units, around a level of 0, 1e3 or 1e6, and a burst of
// steps up to 1,000 times larger) with any trend and order to the fast
// t-ratio: whenever it answers, the QR fit must succeed and agree with it
// (relative 1e-7: the acceptance rules keep about seven digits in the
// worst designs they accept, a burst at the sample's end; statistics of
// data are compared at far coarser scales). The decoded
// series stay in the range of data (the raw-float inputs of FuzzADF and
// FuzzADFPair reach the extremes: there the fast path must only agree
// with the statistic functions and never panic).
func FuzzTStatFast(f *testing.F) {
	f.Add([]byte("the quick brown fox jumps over the lazy dog 0123456789"), uint8(0), uint8(2))
	f.Add([]byte{0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 1, 0, 0, 0, 0}, uint8(1), uint8(3))
	f.Add([]byte{200, 3, 250, 7, 100, 9, 1, 128, 255, 0, 77, 31, 64, 90, 12, 201, 33, 45, 19, 80, 150, 6, 99}, uint8(2), uint8(5))
	f.Fuzz(func(t *testing.T, b []byte, trend, lags uint8) {
		if len(b) < 2 {
			return
		}
		level := []float64{0, 1e3, 1e6}[int(b[0])%3]
		y := make([]float64, len(b)-1)
		s := level
		for i, v := range b[1:] {
			step := float64(int(v)-128) / 32
			if v >= 250 {
				step *= 1000 // a burst
			}
			s += step
			y[i] = s
		}
		det, k := Trend(trend%3), int(lags%6)
		var w, q DFWork
		got, ok := w.TStatFast(y, det, k)
		if !ok {
			return
		}
		fit, err := q.Regress(y, det, k, 0)
		if err != nil {
			t.Fatalf("fast path answered %v where the QR fit fails: %v", got, err)
		}
		if d := math.Abs(got - fit.TStat); d > 1e-7*(1+math.Abs(fit.TStat)) {
			t.Fatalf("fast t %.15g, QR t %.15g", got, fit.TStat)
		}
	})
}
