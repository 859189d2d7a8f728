// Tests of the Bai & Perron (2003a, section 3) dynamic programme against
// its previous form: the inner loop over the last break was rewritten for
// WebAssembly (one loop per model, two candidates per pass, the clamp of a
// negative SSR to zero and the running minimum without a float branch), and
// the cells no partition of 1..T passes through are no longer computed; it
// must give the same minimal SSRs and break dates bit for bit, and the same
// statistics. dpRef is the loop as it was.
package breaks

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/rootshift/rootshift/core"
)

// dpRef is the dynamic programme before the rewrite (the reference): the
// same recursion opt[m][b] = min_p opt[m-1][p] + SSR(p, b), first minimiser
// kept, one loop for both models.
func (w *bpWork) dpRef(h, M int) int {
	T := w.T
	w.h = h
	if M > T/h-1 {
		M = T/h - 1
	}
	if M < 0 {
		M = 0
	}
	for len(w.opt) < M+1 {
		w.opt = append(w.opt, nil)
		w.arg = append(w.arg, nil)
	}
	for m := 0; m <= M; m++ {
		w.opt[m] = bpGrow(w.opt[m], T+1)
		if cap(w.arg[m]) < T+1 {
			w.arg[m] = make([]int32, T+1)
		}
		w.arg[m] = w.arg[m][:T+1]
	}
	o0 := w.opt[0]
	for b := 0; b <= T; b++ {
		if b >= h {
			o0[b] = w.ssr(0, b)
		} else {
			o0[b] = math.Inf(1)
		}
	}
	py, pyy, psy, invn, invss := w.py, w.pyy, w.psy, w.invn, w.invss
	q2 := w.q == 2
	Tf := float64(T)
	c := 0.5 * float64(T+1)
	for m := 1; m <= M; m++ {
		prev, cur, arg := w.opt[m-1], w.opt[m], w.arg[m]
		for b := 0; b < (m+1)*h && b <= T; b++ {
			cur[b] = math.Inf(1)
			arg[b] = -1
		}
		for b := (m + 1) * h; b <= T; b++ {
			best, bi := math.Inf(1), -1
			pyb, pyyb, psyb := py[b], pyy[b], psy[b]
			for p := m * h; p <= b-h; p++ {
				n := b - p
				sy := pyb - py[p]
				r := (pyyb - pyy[p]) - sy*sy*invn[n]
				if q2 {
					ms := (0.5*float64(p+1+b) - c) / Tf
					sc := (psyb - psy[p]) - ms*sy
					r -= sc * sc * invss[n]
				}
				if r < 0 {
					r = 0
				}
				if v := prev[p] + r; v < best {
					best, bi = v, p
				}
			}
			cur[b], arg[b] = best, int32(bi)
		}
	}
	return M
}

// dpSeries returns test series for the comparison: Gaussian noise with
// shifts, and series with constant stretches (segments whose SSR is zero
// up to rounding, where the clamp at zero acts) and ties.
func dpSeries(T int, seed uint64) []float64 {
	r := rand.New(rand.NewPCG(seed, 7))
	y := make([]float64, T)
	switch seed % 3 {
	case 0:
		for i := range y {
			y[i] = r.NormFloat64()
			if i > T/3 {
				y[i] += 2
			}
		}
	case 1:
		// Constant stretches at a large level: the SSR of a constant
		// segment rounds to a tiny negative or positive number.
		for i := range y {
			y[i] = 1e6 + float64(i/(T/4+1))
			if i%11 == 0 {
				y[i] += r.NormFloat64()
			}
		}
	default:
		// Integer steps: many equal SSRs (ties between candidates).
		for i := range y {
			y[i] = float64(r.IntN(3))
		}
	}
	return y
}

// TestBPDPMatchesReference: the rewritten dynamic programme equals dpRef
// bit for bit (every minimal SSR and last break that a partition of 1..T
// can pass through; dp leaves the others out) for both models, at
// several lengths, minimal segments and numbers of breaks (our own check
// against the previous code, no external source).
func TestBPDPMatchesReference(t *testing.T) {
	for _, q := range []int{1, 2} {
		for _, T := range []int{20, 41, 100, 240} {
			for _, h := range []int{2, 3, 5, 7, 36} {
				for _, M := range []int{1, 2, 5, 8} {
					if h*2 > T {
						continue
					}
					for seed := uint64(0); seed < 6; seed++ {
						y := dpSeries(T, seed)
						var a, b bpWork
						a.load(y, q)
						b.load(y, q)
						ma, mb := a.dp(h, M), b.dpRef(h, M)
						if ma != mb {
							t.Fatalf("q=%d T=%d h=%d M=%d seed=%d: M %d, reference %d", q, T, h, M, seed, ma, mb)
						}
						for m := 0; m <= ma; m++ {
							for i := 0; i <= T; i++ {
								if m > 0 && i < T && (m == ma || i > T-h) {
									continue // not computed: no partition of 1..T passes there
								}
								if math.Float64bits(a.opt[m][i]) != math.Float64bits(b.opt[m][i]) || (m > 0 && a.arg[m][i] != b.arg[m][i]) {
									t.Fatalf("q=%d T=%d h=%d M=%d seed=%d: opt[%d][%d] = %v (last break %d), reference %v (%d)",
										q, T, h, M, seed, m, i, a.opt[m][i], a.arg[m][i], b.opt[m][i], b.arg[m][i])
								}
							}
						}
					}
				}
			}
		}
	}
}

// BenchmarkBPDP times the dynamic programme at the demo's length (T = 240,
// trimming 0.15: h = 36, five breaks), beside its previous form dpRef.
func BenchmarkBPDP(b *testing.B) {
	y := bpTwoShift(240, 1)
	for _, q := range []int{1, 2} {
		var w bpWork
		w.load(y, q)
		b.Run(fmt.Sprintf("q=%d", q), func(b *testing.B) {
			for i := 0; i < b.N; i++ {
				w.dp(36, 5)
			}
		})
		b.Run(fmt.Sprintf("ref/q=%d", q), func(b *testing.B) {
			for i := 0; i < b.N; i++ {
				w.dpRef(36, 5)
			}
		})
	}
}

// TestBPDotFromMatchesLoop: core.DotFrom, behind the long-run variance of the
// Wald statistics (Bai & Perron 1998, section 4: the prewhitening, the
// bandwidth and the kernel sums), equals the plain in-order loop bit for bit
// for lengths 0..40 and several starting sums.
func TestBPDotFromMatchesLoop(t *testing.T) {
	r := rand.New(rand.NewPCG(17, 3))
	for n := 0; n <= 40; n++ {
		for _, s0 := range []float64{0, 1e-300, -3.5, 1e12} {
			x, y := make([]float64, n), make([]float64, n+3)
			for i := range x {
				x[i] = r.NormFloat64() * math.Pow(10, float64(r.IntN(9)-4))
			}
			for i := range y {
				y[i] = r.NormFloat64()
			}
			want := s0
			for i := range x {
				want += x[i] * y[i]
			}
			if got := core.DotFrom(s0, x, y); math.Float64bits(got) != math.Float64bits(want) {
				t.Fatalf("n=%d s0=%v: %v, loop %v", n, s0, got, want)
			}
		}
	}
}
