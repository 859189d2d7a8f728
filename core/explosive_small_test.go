// Tests of the written-out two-regressor case (a constant and y_{t-1}, no
// lags) of the explosive-root engine's prefix sums and window sums (Phillips,
// Wu & Yu 2011, eq. 5: the ADF regression of each window) against the
// general loops over the columns, kept here as prefixLoops: the sums and
// the window t-ratios must be the same bit for bit (our own check against
// the previous code, no external source).
package core

import (
	"math"
	"math/rand/v2"
	"testing"
)

// prefixLoops fills g.pre with the general loops of explEngine.load (after
// g.ys is set), as they were before the two-regressor case was written out.
func prefixLoops(g *explEngine) {
	T, p, k, m := g.T, g.p, g.k, g.m
	ys, pre, x := g.ys, g.pre, g.x
	for i := 0; i < (p+2)*m && i < len(pre); i++ {
		pre[i] = 0
	}
	invT := 1 / float64(T)
	for t := p + 2; t <= T; t++ {
		j := 0
		if g.nd >= 1 {
			x[j] = 1
			j++
		}
		if g.nd == 2 {
			x[j] = float64(t) * invT
			j++
		}
		for i := 1; i <= p; i++ {
			x[j] = ys[t-1-i] - ys[t-2-i]
			j++
		}
		x[j] = ys[t-2]
		dy := ys[t-1] - ys[t-2]
		prev, cur := pre[(t-1)*m:t*m], pre[t*m:(t+1)*m]
		q := 0
		for a := 0; a < k; a++ {
			for b := 0; b <= a; b++ {
				cur[q] = prev[q] + x[a]*x[b]
				q++
			}
		}
		for a := 0; a < k; a++ {
			cur[q] = prev[q] + x[a]*dy
			q++
		}
		cur[q] = prev[q] + dy*dy
	}
}

// TestLoad2MatchesGeneral: for a constant and no lags, the written-out
// prefix sums equal the general loops bit for bit, and so do the window
// t-ratios computed from them (written-out window sums against the general
// ones, windowSums), on random walks, explosive paths and series with flat
// stretches.
func TestLoad2MatchesGeneral(t *testing.T) {
	r := rand.New(rand.NewPCG(21, 4))
	for trial := 0; trial < 60; trial++ {
		T := 20 + r.IntN(200)
		y := make([]float64, T)
		lev := 0.0
		for i := range y {
			switch trial % 3 {
			case 0:
				lev += r.NormFloat64()
			case 1:
				lev = 1.02*lev + r.NormFloat64()
			default:
				if i%9 < 4 {
					lev += r.NormFloat64()
				}
			}
			y[i] = lev
		}
		var a, b explEngine
		a.setup(T, 0, TrendConstant)
		b.setup(T, 0, TrendConstant)
		if a.k != 2 || a.m != 6 {
			t.Fatalf("k=%d m=%d, want the two-regressor case", a.k, a.m)
		}
		if err := a.load(y); err != nil {
			t.Fatal(err)
		}
		b.ys, _, _ = Standardize(b.ys, y)
		prefixLoops(&b)
		for i := range a.pre {
			if math.Float64bits(a.pre[i]) != math.Float64bits(b.pre[i]) {
				t.Fatalf("trial %d: pre[%d] = %v, general %v", trial, i, a.pre[i], b.pre[i])
			}
		}
		for e := 6; e <= T; e += 3 {
			for s := 1; s <= e-4; s += 5 {
				ta, oka := a.window(s, e)
				// The general window sums on b, then the same solve.
				n := e - s - b.p
				hi, lo := b.pre[e*b.m:(e+1)*b.m], b.pre[(s+b.p)*b.m:(s+b.p+1)*b.m]
				b.windowSums(hi, lo)
				b.nrm.N = n
				var tb float64
				okb := false
				if ssr, err := solveLoops(&b.nrm); err == nil && ssr > explExactTol*b.nrm.YY && n-b.k >= 1 {
					v := ssr / float64(n-b.k) * invDiagLoops(&b.nrm, b.k-1)
					if v > 0 {
						tb = b.nrm.Coef[b.k-1] / math.Sqrt(v)
						okb = !math.IsNaN(tb) && !math.IsInf(tb, 0)
					}
				}
				if oka != okb || (oka && math.Float64bits(ta) != math.Float64bits(tb)) {
					t.Fatalf("trial %d window %d..%d: %v %v, general %v %v", trial, s, e, ta, oka, tb, okb)
				}
			}
		}
	}
}
