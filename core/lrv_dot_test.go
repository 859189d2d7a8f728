// Tests of the unrolled in-order sum behind Autocov (the sample
// autocovariances of Newey & West 1987 and Andrews 1991 used by the
// long-run variances): it must equal the plain loop it replaced,
// autocovLoop, bit for bit (our own check against the previous code, no
// external source).
package core

import (
	"math"
	"math/rand/v2"
	"testing"
)

// autocovLoop is Autocov as it was: the plain loop.
func autocovLoop(u []float64, j int) float64 {
	n := len(u)
	if j < 0 {
		j = -j
	}
	if j >= n || n == 0 {
		return 0
	}
	s := 0.0
	for t := j; t < n; t++ {
		s += u[t] * u[t-j]
	}
	return s / float64(n)
}

// TestAutocovMatchesLoop: Autocov equals the plain loop bit for bit for
// every length 0..70 and lag -n..n, on Gaussian, heavy-tailed and
// wildly scaled data.
func TestAutocovMatchesLoop(t *testing.T) {
	r := rand.New(rand.NewPCG(8, 13))
	for n := 0; n <= 70; n++ {
		for kind := 0; kind < 3; kind++ {
			u := make([]float64, n)
			for i := range u {
				switch kind {
				case 0:
					u[i] = r.NormFloat64()
				case 1:
					u[i] = r.NormFloat64() / (r.Float64() + 1e-3)
				default:
					u[i] = r.NormFloat64() * math.Pow(10, float64(r.IntN(30)-15))
				}
			}
			for j := -n; j <= n; j++ {
				if a, b := Autocov(u, j), autocovLoop(u, j); math.Float64bits(a) != math.Float64bits(b) {
					t.Fatalf("n=%d kind=%d j=%d: Autocov %v, loop %v", n, kind, j, a, b)
				}
			}
		}
	}
}

// BenchmarkAutocov times the 13 autocovariances of a Bartlett long-run
// variance at T = 240 (the demo's KPSS) beside the plain loop, its twin.
func BenchmarkAutocov(b *testing.B) {
	r := rand.New(rand.NewPCG(1, 2))
	u := make([]float64, 240)
	for i := range u {
		u[i] = r.NormFloat64()
	}
	var sink float64
	b.Run("unrolled", func(b *testing.B) {
		for i := 0; i < b.N; i++ {
			for j := 0; j <= 12; j++ {
				sink += Autocov(u, j)
			}
		}
	})
	b.Run("loop", func(b *testing.B) {
		for i := 0; i < b.N; i++ {
			for j := 0; j <= 12; j++ {
				sink += autocovLoop(u, j)
			}
		}
	})
	_ = sink
}
