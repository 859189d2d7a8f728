// Tests of the unrolled loops of the KPSS statistic (Kwiatkowski, Phillips,
// Schmidt & Shin 1992, eq. 13: η = T⁻² Σ S_t² / λ̂², S_t the partial sums of
// the residuals) and of Detrend: they must equal the plain loops they
// replaced, kept here (detrendLoops, kpssLoops), bit for bit (our own check
// against the previous code, no external source).
package core

import (
	"math"
	"math/rand/v2"
	"testing"
)

// detrendLoops is Detrend as it was: plain loops.
func detrendLoops(y []float64, det Trend) []float64 {
	n := len(y)
	dst := make([]float64, n)
	if det == TrendNone {
		copy(dst, y)
		return dst
	}
	mean := 0.0
	for _, v := range y {
		mean += v
	}
	if n > 0 {
		mean /= float64(n)
	}
	if det == TrendLinear && n > 1 {
		tbar := float64(n+1) / 2
		sxy, sxx := 0.0, 0.0
		for i, v := range y {
			d := float64(i+1) - tbar
			sxy += d * (v - mean)
			sxx += d * d
		}
		b := sxy / sxx
		for i, v := range y {
			dst[i] = v - mean - b*(float64(i+1)-tbar)
		}
		return dst
	}
	for i, v := range y {
		dst[i] = v - mean
	}
	return dst
}

// kpssLoops is KPSSWork.Stat as it was, from the previous Detrend and the
// plain partial-sum loop.
func kpssLoops(y []float64, trend Trend, kernel Kernel, rule BandwidthRule, bw float64) (float64, float64, error) {
	det := TrendConstant
	if trend == TrendLinear {
		det = TrendLinear
	}
	e := detrendLoops(y, det)
	lrv, used, err := LongRunVariance(e, kernel, rule, bw)
	if err != nil {
		return 0, used, err
	}
	T := float64(len(y))
	s, ss := 0.0, 0.0
	for _, v := range e {
		s += v
		ss += s * s
	}
	return ss / (T * T * lrv), used, nil
}

// TestKPSSLoopsUnchanged: Detrend (none, constant, linear) and the KPSS
// statistic with every kernel and bandwidth rule equal the plain loops bit
// for bit at lengths 0..60 and 240.
func TestKPSSLoopsUnchanged(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 9))
	same := func(a, b float64) bool { return math.Float64bits(a) == math.Float64bits(b) }
	lengths := []int{240}
	for n := 0; n <= 60; n++ {
		lengths = append(lengths, n)
	}
	for _, n := range lengths {
		y := make([]float64, n)
		lev := 0.0
		for i := range y {
			lev += r.NormFloat64()
			y[i] = 1e3 + lev*math.Pow(10, float64(n%5-2))
		}
		for _, det := range []Trend{TrendNone, TrendConstant, TrendLinear} {
			a, b := Detrend(nil, y, det), detrendLoops(y, det)
			for i := range b {
				if !same(a[i], b[i]) {
					t.Fatalf("n=%d det=%v: Detrend[%d] = %v, loops %v", n, det, i, a[i], b[i])
				}
			}
		}
		if n < 10 {
			continue
		}
		for _, trend := range []Trend{TrendConstant, TrendLinear} {
			for _, kernel := range []Kernel{KernelBartlett, KernelQS} {
				for _, rule := range []BandwidthRule{BandwidthNeweyWest, BandwidthAndrews, BandwidthFixed} {
					var w KPSSWork
					ea, ua, erra := w.Stat(y, trend, kernel, rule, 3)
					eb, ub, errb := kpssLoops(y, trend, kernel, rule, 3)
					if (erra == nil) != (errb == nil) || (erra == nil && (!same(ea, eb) || !same(ua, ub))) {
						t.Fatalf("n=%d %v %v %v: η %v (bw %v, %v), loops %v (%v, %v)", n, trend, kernel, rule, ea, ua, erra, eb, ub, errb)
					}
				}
			}
		}
	}
}
