// The lag search of the augmented Dickey-Fuller regression (Said & Dickey
// 1984, eq. 1.2; lag rules of Ng & Perron 2001, p. 1529) needs no T x kmax
// design: its memory is O(T + kmax^2). The search validates the sample
// with the errors of a QR fit at kmax (the former first step, kept as the
// reference) without building it. Simulated series (common practice, no
// source).
package core

import (
	"errors"
	"math"
	"runtime"
	"testing"
)

// TestSelectLagsMemory: at T = 1e6 with kmax = 20 the former validating fit
// allocated a 1e6 x 23 design twice (about 370 MB); the search now stays
// under 40 MB, and chooses the order the QR twin chooses.
func TestSelectLagsMemory(t *testing.T) {
	if testing.Short() {
		t.Skip("T = 1e6 skipped in -short mode")
	}
	const T, kmax = 1_000_000, 20
	y := dfARDiff(T, []float64{0.4}, 3)
	var w DFWork
	var before, after runtime.MemStats
	runtime.GC()
	runtime.ReadMemStats(&before)
	k, err := w.SelectLags(y, TrendConstant, LagBIC, kmax)
	runtime.ReadMemStats(&after)
	if err != nil {
		t.Fatal(err)
	}
	alloc := float64(after.TotalAlloc-before.TotalAlloc) / (1 << 20)
	t.Logf("T = %d, kmax = %d: chose k = %d, allocated %.1f MB", T, kmax, k, alloc)
	if alloc > 40 {
		t.Errorf("the lag search allocated %.0f MB: a T x kmax design is back", alloc)
	}
	var brute DFWork
	k2, err := brute.selectLagsQR(y[:100_000], TrendConstant, LagBIC, kmax)
	k1, err1 := w.SelectLags(y[:100_000], TrendConstant, LagBIC, kmax)
	if err != nil || err1 != nil || k1 != k2 {
		t.Errorf("T = 1e5: SelectLags k=%d (%v), QR twin k=%d (%v)", k1, err1, k2, err)
	}
}

// TestSelectLagsErrorsAsQR: the cheap validation gives the errors the QR
// fit at kmax gives, on the samples that fail it.
func TestSelectLagsErrorsAsQR(t *testing.T) {
	line := make([]float64, 40)
	for i := range line {
		line[i] = float64(i)
	}
	ar := make([]float64, 60) // y_t = 0.5 y_{t-1} + 1 exactly: a perfect fit
	ar[0] = 3
	for i := 1; i < len(ar); i++ {
		ar[i] = 0.5*ar[i-1] + 1
	}
	huge := dfARDiff(60, nil, 2)
	for i := range huge {
		huge[i] *= 1e160
	}
	nan := dfARDiff(60, nil, 4)
	nan[0] = math.NaN()
	for _, tc := range []struct {
		name string
		y    []float64
		det  Trend
	}{
		{"short", dfARDiff(12, nil, 1), TrendLinear},
		{"line, constant", line, TrendConstant},
		{"line, trend", line, TrendLinear},
		{"exact AR(1)", ar, TrendConstant},
		{"squares overflow", huge, TrendConstant},
		{"NaN first", nan, TrendConstant},
	} {
		for _, rule := range []LagRule{LagAIC, LagBIC, LagMAIC, LagTSig} {
			var w, ref DFWork
			_, err := w.SelectLags(tc.y, tc.det, rule, 4)
			_, want := ref.Regress(tc.y, tc.det, 4, 6)
			if want == nil {
				continue // the sample is valid: nothing to compare
			}
			if err == nil || !errors.Is(err, errors.Unwrap(want)) && err.Error() != want.Error() {
				t.Errorf("%s, %v: SelectLags error %v, the QR fit at kmax gives %v", tc.name, rule, err, want)
			}
		}
	}
}
