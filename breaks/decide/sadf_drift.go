package decide

// The SADF statistic with the null's drift breaks in every window.
//
// SADF (Phillips, Wu & Yu 2011, eq. 6) is the supremum over window ends
// r2 = w0..T of the right-tailed ADF t-ratio on observations 1..r2. Under
// an integrated null whose drift changes, the t-ratio of a constant-only
// regression is pushed up wherever a window holds a drift (West 1988: with
// a non-negligible drift the ratio is asymptotically normal, far above the
// Dickey-Fuller right tail). Here each window regression also holds a level
// dummy DU_jt = 1(t > TB_j) in Δy for every drift break TB_j of the fitted
// null that lies inside the window with at least minAfter observations
// after it:
//
//	Δy_t = a + Σ_j δ_j DU_jt + ρ y_{t-1} + Σ_{i=1..k} φ_i Δy_{t-i} + e_t,
//
// so a drift that changes at those dates is part of the regression and the
// t-ratio of ρ no longer reads it as explosive. With no drift break this is
// the usual SADF with a constant. The statistic's null distribution depends
// on the break dates; it is only ever used with the wild bootstrap of
// null.go, which draws from a null with drift changes at the same dates.
//
// Cross-products of the regressors are accumulated once (prefix sums, on
// the series standardised first) and each window solved from them by
// core.Normal: O(T K^2) to accumulate and O(K^3) per window; no allocation
// after the first call of a given size.

import (
	"math"

	"github.com/rootshift/rootshift/core"
)

// minAfter is the fewest observations after a break for its dummy to enter
// a window regression.
const minAfter = 5

// sadfDrift computes the statistic with its own scratch space.
type sadfDrift struct {
	k      int
	breaks []int
	w0     int
	// scratch
	z    []float64
	pre  []float64 // prefix cross-products, (T+1) x (K+1)^2 (regressors then Δy)
	nm   core.Normal
	keep []int
	// argmax is the window end (1-based) where the last stat peaked.
	argmax int
}

func newSADFDrift(T, k int, breaks []int) *sadfDrift {
	w0 := int(math.Floor(core.ExplosiveR0(T)*float64(T) + 1e-9))
	K := 2 + len(breaks) + k
	w0 = max(w0, k+2+K+4)
	return &sadfDrift{k: k, breaks: breaks, w0: w0}
}

// stat returns SADF with drift dummies on y.
func (s *sadfDrift) stat(y []float64) (float64, error) {
	T := len(y)
	k, m := s.k, len(s.breaks)
	K := 2 + m + k // const, DU..., y_{t-1}, lags
	if T < s.w0 {
		return 0, core.ErrTooShort
	}
	z, _, sd := core.Standardize(s.z, y)
	s.z = z
	if !(sd > 0) {
		return 0, core.ErrConstant
	}
	D := K + 1
	s.pre = growF(s.pre, (T+1)*D*D)
	for i := range s.pre[:D*D] {
		s.pre[i] = 0
	}
	var x [64]float64
	xv := x[:D]
	start := k + 2
	// rows t = 1..start-1 contribute nothing
	for t := 1; t <= T; t++ {
		cur := s.pre[t*D*D : (t+1)*D*D]
		copy(cur, s.pre[(t-1)*D*D:t*D*D])
		if t < start {
			continue
		}
		xv[0] = 1
		for j, tb := range s.breaks {
			if t > tb {
				xv[1+j] = 1
			} else {
				xv[1+j] = 0
			}
		}
		xv[1+m] = z[t-2]
		for i := 1; i <= k; i++ {
			xv[1+m+i] = z[t-1-i] - z[t-2-i]
		}
		xv[K] = z[t-1] - z[t-2]
		for a := 0; a < D; a++ {
			xa := xv[a]
			row := cur[a*D:]
			for b := 0; b <= a; b++ {
				row[b] += xa * xv[b]
			}
		}
	}
	best := math.Inf(-1)
	rhoCol := 1 + m
	for e := s.w0; e <= T; e++ {
		n := e - start + 1
		cur := s.pre[e*D*D : (e+1)*D*D]
		// Columns in this window: const, the dummies with enough
		// observations after their break, y_{t-1}, the lags.
		s.keep = s.keep[:0]
		s.keep = append(s.keep, 0)
		for j, tb := range s.breaks {
			if tb >= start && e-tb >= minAfter {
				s.keep = append(s.keep, 1+j)
			}
		}
		ri := len(s.keep)
		s.keep = append(s.keep, rhoCol)
		for i := 1; i <= k; i++ {
			s.keep = append(s.keep, 1+m+i)
		}
		kk := len(s.keep)
		if n <= kk+2 {
			continue
		}
		s.nm.Reset(kk)
		for a, ca := range s.keep {
			for b, cb := range s.keep[:a+1] {
				v := cur[ca*D+cb]
				if cb > ca {
					v = cur[cb*D+ca]
				}
				s.nm.A[a*kk+b] = v
				s.nm.A[b*kk+a] = v
			}
			s.nm.B[a] = cur[K*D+ca]
		}
		s.nm.YY = cur[K*D+K]
		s.nm.N = n
		ssr, err := s.nm.Solve()
		if err != nil || !(ssr > 0) {
			continue
		}
		v := ssr / float64(n-kk) * s.nm.InvDiag(ri)
		if !(v > 0) {
			continue
		}
		if t := s.nm.Coef[ri] / math.Sqrt(v); t > best {
			best, s.argmax = t, e
		}
	}
	if math.IsInf(best, -1) {
		return 0, core.ErrNoEstimate
	}
	return best, nil
}

func growF(s []float64, n int) []float64 {
	if cap(s) < n {
		return make([]float64, n)
	}
	return s[:n]
}
