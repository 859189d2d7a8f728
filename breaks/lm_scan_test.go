package breaks

// lmScanWork is the previous fast path of the LM statistic, kept as a
// second twin of lmWork: per candidate it forms S̃_t and ΔS̃_t explicitly
// (O(T)) and reads the LM cross-products from prefix sums of lagged
// products. It is exact in the same sense as lmWork but costs O(T kmax)
// per candidate, so it checks whole searches at sample sizes where the
// QR refit (lmBrute) is too slow.

import (
	"math"

	"github.com/rootshift/rootshift/core"
)

// lmScanWork is the per-goroutine scratch of the LM statistic. Per candidate,
// δ̃ comes from the atom cross-products (O(1) each); S̃ and ΔS̃ are formed in
// O(T) and every cross-product of the LM regression is then read from
// prefix sums of lagged products (Σ_t ΔS̃_{t-i} ΔS̃_{t-l} depends on i-l
// only up to the window ends), so one pass of O(T kmax) serves the whole
// lag selection, instead of a refit per lag order.
type lmScanWork struct {
	d    lmXData
	g    lmGram
	g0   lmGram
	zc   []lmColumn
	dep  lmColumn
	ys   []float64
	kmax int
	T    int

	m    lmModel
	tbs  [2]int
	s, u []float64 // S̃_t and ΔS̃_t, t = 0..T, zero-padded to T+kmax+1
	v    []float64 // Δy_t, zero-padded
	pv   []float64 // prefix sums of v = Δy
	pvv  []float64
	// pre[r*na+a] is the prefix sum up to r of array a: 0 S̃, 1 S̃^2, 2 u,
	// 3 v_t S̃_{t-1}, 4+d u_s u_{s+d} (d = 0..kmax), 5+kmax+i-1 S̃_{s+i-1} u_s
	// and 5+2kmax+i-1 v_{s+i} u_s (i = 1..kmax). The arrays are interleaved
	// so that one pass over r updates independent sums side by side.
	pre []float64
	na  int
}

func (w *lmScanWork) setup(y []float64, kmax int) {
	w.ys, _, _ = core.Standardize(w.ys, y)
	w.d.build(w.ys, 0)
	w.dep = append(w.dep[:0], lmTerm{lmAtom{lmKData, lmDy}, 1})
	T := len(y)
	w.T, w.kmax = T, kmax
	n := T + kmax + 2
	w.s = lmGrow(w.s, n)
	w.u = lmGrow(w.u, n)
	w.v = lmGrow(w.v, n)
	w.pv = lmGrow(w.pv, T+1)
	w.pvv = lmGrow(w.pvv, T+1)
	for t := 2; t <= T; t++ {
		v := w.ys[t-1] - w.ys[t-2]
		w.v[t] = v
		w.pv[t] = w.pv[t-1] + v
		w.pvv[t] = w.pvv[t-1] + v*v
	}
	w.na = 5 + 3*kmax
	w.pre = lmGrow(w.pre, w.na*(T+1))
}

// lmStat computes the LM t-statistic at break dates tbs with lag spec
// (spec.k <= the kmax given to setup).
func (w *lmScanWork) lmStat(m lmModel, tbs []int, spec lmLagSpec) (tau float64, k, nobs int, err error) {
	d := &w.d
	nz := m.nz()
	// ΔZ_t = [1, B_jt, D_jt]; δ̃ over t = 2..T.
	if cap(w.zc) < nz {
		w.zc = make([]lmColumn, nz)
	}
	zc := w.zc[:nz]
	zc[0] = append(zc[0][:0], lmTerm{lmAtom{lmKStep, 0}, 1})
	for j, tb := range tbs {
		zc[1+j] = append(zc[1+j][:0], lmTerm{lmAtom{lmKPulse, tb + 1}, 1})
		if m.slope {
			zc[1+m.nb+j] = append(zc[1+m.nb+j][:0], lmTerm{lmAtom{lmKStep, tb}, 1})
		}
	}
	w.g0.fill(d, zc, w.dep, 2)
	ssr0, err := w.g0.solve(nz)
	if err != nil {
		return math.NaN(), 0, 0, err
	}
	if ssr0 <= ExactFitTol*w.g0.yy {
		// Δy is exactly a constant plus the break terms: S̃ is rounding
		// noise, and its t-ratio would be meaningless.
		return math.NaN(), 0, 0, errExactFit
	}
	dl := w.g0.nm.Coef[:nz]
	w.m = m
	copy(w.tbs[:], tbs)
	// S̃_t = y_t - y_1 - (t-1) δ̃_0 - Σ_j [δ̃_Dj D_jt + δ̃_DTj DT_jt]; u_t = ΔS̃_t.
	T, y := w.T, w.ys
	s, u := w.s, w.u
	for t := 1; t <= T; t++ {
		v := y[t-1] - y[0] - float64(t-1)*dl[0]
		for j, tb := range tbs {
			if t > tb {
				v -= dl[1+j]
				if m.slope {
					v -= dl[1+m.nb+j] * float64(t-tb)
				}
			}
		}
		s[t] = v
		if t > 1 {
			u[t] = v - s[t-1]
		}
	}
	clear(s[T+1:])
	clear(u[T+1:])
	kmax, na := w.kmax, w.na
	v, pre := w.v, w.pre
	for r := 1; r <= T; r++ {
		prev := pre[(r-1)*na : r*na]
		cur := pre[r*na : (r+1)*na]
		sr, ur := s[r], u[r]
		cur[0] = prev[0] + sr
		cur[1] = prev[1] + sr*sr
		cur[2] = prev[2] + ur
		cur[3] = prev[3] + v[r]*s[r-1]
		uq := u[r : r+kmax+1]
		cq, pq := cur[4:5+kmax], prev[4:5+kmax]
		for dd, x := range uq {
			cq[dd] = pq[dd] + ur*x
		}
		sq := s[r : r+kmax]
		cr, pr := cur[5+kmax:5+2*kmax], prev[5+kmax:5+2*kmax]
		for i, x := range sq {
			cr[i] = pr[i] + x*ur
		}
		vq := v[r+1 : r+1+kmax]
		cv, pvq := cur[5+2*kmax:5+3*kmax], prev[5+2*kmax:5+3*kmax]
		for i, x := range vq {
			cv[i] = pvq[i] + x*ur
		}
	}
	_ = y
	return lmSelectAndTest(w, &w.g, lmDesign{base: nz + 1, group: 1, stat: nz}, spec)
}

// Column codes of the LM regression: deterministic columns first, then S̃
// and the lags; lmDep is the dependent variable Δy_t.
const lmDep = -1

// detWindow returns the rows [a, T] ∩ [t0, T] of deterministic column c
// (0: constant; 1..nb: pulse at TB_j+1, as [p, p]; nb+1..: step at TB_j).
func (w *lmScanWork) detWindow(c, t0 int) (a, b int) {
	nb := w.m.nb
	switch {
	case c == 0:
		return t0, w.T
	case c <= nb:
		p := w.tbs[c-1] + 1
		return max(p, t0), p
	default:
		return max(w.tbs[c-1-nb]+1, t0), w.T
	}
}

// dataSum returns Σ_{t=a}^{b} x_t of data column c (nz: S̃_{t-1}; nz+i: u_{t-i}; lmDep: v_t).
func (w *lmScanWork) dataSum(c, nz, a, b int) float64 {
	if a > b {
		return 0
	}
	switch {
	case c == lmDep:
		return w.pv[b] - w.pv[a-1]
	case c == nz:
		return w.p(0, b-1) - w.p(0, a-2)
	}
	i := c - nz
	return w.p(2, b-i) - w.p(2, a-1-i)
}

// dataDot returns Σ_{t=t0}^{T} x_t z_t for data columns c1 <= c2 (lmDep last).
func (w *lmScanWork) dataDot(c1, c2, nz, t0 int) float64 {
	T := w.T
	if c2 == lmDep {
		switch {
		case c1 == lmDep:
			return w.pvv[T] - w.pvv[t0-1]
		case c1 == nz:
			return w.p(3, T) - w.p(3, t0-1)
		}
		i := c1 - nz
		a := 4 + 2*w.kmax + i
		return w.p(a, T-i) - w.p(a, t0-i-1)
	}
	if c1 == nz {
		if c2 == nz {
			return w.p(1, T-1) - w.p(1, t0-2)
		}
		i := c2 - nz
		a := 4 + w.kmax + i
		return w.p(a, T-i) - w.p(a, t0-i-1)
	}
	i, l := c1-nz, c2-nz // i <= l
	a := 4 + l - i
	return w.p(a, T-l) - w.p(a, t0-l-1)
}

// p returns the prefix sum of array a up to r.
func (w *lmScanWork) p(a, r int) float64 { return w.pre[r*w.na+a] }

// fillTo fills g for the leading n columns of the LM regression over t0..T.
func (w *lmScanWork) fillTo(g *lmGram, n, t0 int) {
	nz := w.m.nz()
	g.n = n
	g.a = lmGrow(g.a, n*n)
	g.b = lmGrow(g.b, n)
	for i := 0; i < n; i++ {
		if i < nz {
			a1, b1 := w.detWindow(i, t0)
			for j := 0; j <= i; j++ {
				a2, b2 := w.detWindow(j, t0)
				g.a[i*n+j] = float64(max(0, min(b1, b2)-max(a1, a2)+1))
			}
			g.b[i] = w.dataSum(lmDep, nz, a1, b1)
			continue
		}
		for j := 0; j < nz; j++ {
			a2, b2 := w.detWindow(j, t0)
			g.a[i*n+j] = w.dataSum(i, nz, a2, b2)
		}
		for j := nz; j <= i; j++ {
			g.a[i*n+j] = w.dataDot(j, i, nz, t0)
		}
		g.b[i] = w.dataDot(i, lmDep, nz, t0)
	}
	g.yy = w.dataDot(lmDep, lmDep, nz, t0)
	g.scale = g.yy
	g.obs = w.T - t0 + 1
}
