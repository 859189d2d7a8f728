// Tests of the lag-structured cross-products of the Dickey-Fuller lag
// search (lags.go, crossLagged; Said & Dickey 1984 augmentation, Ng &
// Perron 2001 common sample): equal to the row-by-row sweep, their
// brute-force twin, for every maximum lag and deterministic case, and
// free of allocation; benchmarks of both.
package core

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"
)

func crossSetup(T, kmax, nd int, seed uint64) (*DFWork, []float64, int, float64, float64) {
	r := rand.New(rand.NewPCG(seed, 9))
	z := make([]float64, T)
	for i := 1; i < T; i++ {
		z[i] = 0.9*z[i-1] + r.NormFloat64()
	}
	start := kmax + 2
	n := T - start + 1
	tbar := float64(start+T) / 2
	tsd := math.Sqrt((float64(n)*float64(n) - 1) / 12)
	m := 1 + kmax + nd
	w := &DFWork{}
	w.xx = grow(w.xx, m*m)
	w.xy = grow(w.xy, m)
	w.dz = grow(w.dz, T) // the differences crossLagged reads (scaleInto's)
	for i := 1; i < T; i++ {
		w.dz[i] = z[i] - z[i-1]
	}
	return w, z, start, tbar, tsd
}

func TestCrossLaggedMatchesRowSweep(t *testing.T) {
	for _, T := range []int{30, 200, 1000} {
		for _, kmax := range []int{0, 1, 2, 5, 15} {
			for nd := 0; nd <= 2; nd++ {
				w, z, start, tbar, tsd := crossSetup(T, kmax, nd, uint64(T+kmax))
				m := 1 + kmax + nd
				yy := w.crossLagged(z, T, kmax, nd, start, tbar, tsd)
				xx := append([]float64(nil), w.xx[:m*m]...)
				xy := append([]float64(nil), w.xy[:m]...)
				yy2 := w.crossRowSweep(z, T, kmax, nd, start, tbar, tsd)
				scale := yy2
				if math.Abs(yy-yy2) > 1e-12*scale {
					t.Errorf("T=%d kmax=%d nd=%d: yy %v vs %v", T, kmax, nd, yy, yy2)
				}
				for i := range m {
					if d := math.Abs(xy[i] - w.xy[i]); d > 1e-9*(1+math.Abs(w.xy[i])) {
						t.Errorf("T=%d kmax=%d nd=%d: xy[%d] %v vs %v", T, kmax, nd, i, xy[i], w.xy[i])
					}
					for j := 0; j <= i; j++ {
						a, b := xx[i*m+j], w.xx[i*m+j]
						if math.Abs(a-b) > 1e-9*(1+math.Abs(b)) {
							t.Errorf("T=%d kmax=%d nd=%d: xx[%d,%d] %v vs %v", T, kmax, nd, i, j, a, b)
						}
					}
				}
			}
		}
	}
}

func TestCrossLaggedNoAlloc(t *testing.T) {
	w, z, start, tbar, tsd := crossSetup(500, 12, 2, 1)
	if a := testing.AllocsPerRun(20, func() { w.crossLagged(z, 500, 12, 2, start, tbar, tsd) }); a != 0 {
		t.Errorf("crossLagged allocates %v times per call", a)
	}
}

func BenchmarkCrossLagged(b *testing.B) {
	for _, T := range []int{300, 10000} {
		kmax := SchwertMax(T)
		w, z, start, tbar, tsd := crossSetup(T, kmax, 2, 1)
		b.Run(fmt.Sprintf("lagged/T=%d", T), func(b *testing.B) {
			for range b.N {
				w.crossLagged(z, T, kmax, 2, start, tbar, tsd)
			}
		})
		b.Run(fmt.Sprintf("rowsweep/T=%d", T), func(b *testing.B) {
			for range b.N {
				w.crossRowSweep(z, T, kmax, 2, start, tbar, tsd)
			}
		})
	}
}
