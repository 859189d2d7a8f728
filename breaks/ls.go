package breaks

// Shared machinery of the Lee-Strazicich LM tests (ls1, ls2), the
// Lumsdaine-Papell test (lp) and the mean-shift test (meanshift, Clemente-Montanes-Reyes).
//
// Cross-product engine (ADF-type tests and the LM δ̃ step): every regressor
// is a short linear combination of "atoms" — fixed data columns (y_{t-1},
// Δy_t, Δy_{t-i}) and break atoms (steps 1(t > b), ramps (t - b) 1(t > b),
// pulses 1(t = p); the constant is the step at b = 0 and the trend t the
// ramp at b = 0). The cross-product of two atoms over a window t = t0..T is
// O(1): data x data from prefix sums of products built once per series,
// data x break from prefix (suffix) sums of the data and of t times the
// data, break x break in closed form. A candidate break date changes only
// the break atoms and the combination weights; nothing is refitted.
//
// LM regression (Lee & Strazicich 2003, eqs. (2)-(3); Schmidt & Phillips
// 1992): with Z_t = [t, D_jt, DT_jt] (the constant is absorbed by ψ), δ̃
// from Δy_t on ΔZ_t = [1, B_jt, D_jt] over t = 2..T (B_jt = 1(t = TB_j+1),
// D_jt = 1(t > TB_j)) comes from the atom engine; S̃_t and ΔS̃_t are then
// formed in O(T) and every cross-product of Δy_t on [ΔZ_t, S̃_{t-1},
// ΔS̃_{t-1..t-k}] is read from prefix sums of lagged products (see lmWork).
//
// Lag selection (t-sig, AIC, BIC) factors the Gram of the largest order
// once: the nested regressions are leading blocks of one Cholesky factor
// (see lmGram.nested). Every fast path is checked against a full Householder
// QR refit (core.LS) per candidate and lag order in the tests.

import (
	"context"
	"fmt"
	"math"

	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/schema"
)

// Atom kinds, in the order used by atomDot.
const (
	lmKData  = iota // data column v
	lmKStep         // 1(t > v); the constant is step 0
	lmKRamp         // (t - v) 1(t > v); the trend t is ramp 0
	lmKPulse        // 1(t == v)
)

type lmAtom struct{ kind, v int }

type lmTerm struct {
	a lmAtom
	c float64
}

// column is a regressor: a linear combination of atoms.
type lmColumn []lmTerm

// Data column indexes built by lmXData.build: y_{t-1}, Δy_t, Δy_{t-i}.
const (
	lmYlag = 0
	lmDy   = 1 // Δy_{t-i} is lmDy + i
)

// lmXData holds the fixed data columns of one series over t = 1..T with the
// prefix sums that make every atom cross-product O(1).
type lmXData struct {
	T, nc int
	col   [][]float64 // col[j][t], t = 0..T (entries where a column is undefined are 0)
	s1    [][]float64 // s1[j][t] = Σ_{s<=t} col[j][s]
	st    [][]float64 // st[j][t] = Σ_{s<=t} s col[j][s]
	pp    [][]float64 // pp[lmTri(i,j)][t] = Σ_{s<=t} col[i][s] col[j][s]
	y     []float64   // the (standardised) series, y[t] for t = 1..T
	py    []float64   // prefix sums of y
	py2   []float64   // prefix sums of y²
}

func lmTri(i, j int) int {
	if i < j {
		i, j = j, i
	}
	return i*(i+1)/2 + j
}

func lmGrow(s []float64, n int) []float64 {
	if cap(s) < n {
		return make([]float64, n)
	}
	s = s[:n]
	clear(s)
	return s
}

func lmGrow2(s [][]float64, n int) [][]float64 {
	if cap(s) < n {
		return make([][]float64, n)
	}
	return s[:n]
}

// build fills the data columns for series y (1-based in the formulas) with
// lags up to kmax: y_{t-1} (t >= 2), Δy_t (t >= 2), Δy_{t-i} (t >= i+2).
func (d *lmXData) build(y []float64, kmax int) {
	T := len(y)
	d.T = T
	d.nc = 2 + kmax
	nc := d.nc
	d.y = lmGrow(d.y, T+1)
	d.py = lmGrow(d.py, T+1)
	d.py2 = lmGrow(d.py2, T+1)
	for t := 1; t <= T; t++ {
		d.y[t] = y[t-1]
		d.py[t] = d.py[t-1] + y[t-1]
		d.py2[t] = d.py2[t-1] + y[t-1]*y[t-1]
	}
	d.col = lmGrow2(d.col, nc)
	d.s1 = lmGrow2(d.s1, nc)
	d.st = lmGrow2(d.st, nc)
	for j := 0; j < nc; j++ {
		c := lmGrow(d.col[j], T+1)
		switch j {
		case lmYlag:
			for t := 2; t <= T; t++ {
				c[t] = y[t-2]
			}
		default:
			i := j - lmDy
			for t := i + 2; t <= T; t++ {
				c[t] = y[t-1-i] - y[t-2-i]
			}
		}
		d.col[j] = c
		s1 := lmGrow(d.s1[j], T+1)
		st := lmGrow(d.st[j], T+1)
		for t := 1; t <= T; t++ {
			s1[t] = s1[t-1] + c[t]
			st[t] = st[t-1] + float64(t)*c[t]
		}
		d.s1[j], d.st[j] = s1, st
	}
	np := nc * (nc + 1) / 2
	d.pp = lmGrow2(d.pp, np)
	for i := 0; i < nc; i++ {
		for j := 0; j <= i; j++ {
			k := lmTri(i, j)
			p := lmGrow(d.pp[k], T+1)
			ci, cj := d.col[i], d.col[j]
			for t := 1; t <= T; t++ {
				p[t] = p[t-1] + ci[t]*cj[t]
			}
			d.pp[k] = p
		}
	}
}

// lmSumT returns Σ_{t=m}^{T} t and Σ t^2 (0 when m > T).
func lmSumT(m, T int) (n, s1, s2 float64) {
	if m > T {
		return 0, 0, 0
	}
	a, b := float64(m-1), float64(T)
	n = b - a
	s1 = (b*(b+1) - a*(a+1)) / 2
	s2 = (b*(b+1)*(2*b+1) - a*(a+1)*(2*a+1)) / 6
	return
}

// atomDot returns Σ_{t=t0}^{T} a_t b_t.
func (d *lmXData) atomDot(a, b lmAtom, t0 int) float64 {
	if a.kind > b.kind {
		a, b = b, a
	}
	T := d.T
	switch a.kind {
	case lmKData:
		j := a.v
		switch b.kind {
		case lmKData:
			p := d.pp[lmTri(j, b.v)]
			return p[T] - p[t0-1]
		case lmKStep:
			m := max(t0, b.v+1)
			if m > T {
				return 0
			}
			return d.s1[j][T] - d.s1[j][m-1]
		case lmKRamp:
			m := max(t0, b.v+1)
			if m > T {
				return 0
			}
			return (d.st[j][T] - d.st[j][m-1]) - float64(b.v)*(d.s1[j][T]-d.s1[j][m-1])
		default:
			if b.v < t0 || b.v > T {
				return 0
			}
			return d.col[j][b.v]
		}
	case lmKStep:
		switch b.kind {
		case lmKStep:
			n, _, _ := lmSumT(max(t0, a.v+1, b.v+1), T)
			return n
		case lmKRamp:
			n, s1, _ := lmSumT(max(t0, a.v+1, b.v+1), T)
			return s1 - float64(b.v)*n
		default:
			if b.v < t0 || b.v > T || b.v <= a.v {
				return 0
			}
			return 1
		}
	case lmKRamp:
		switch b.kind {
		case lmKRamp:
			n, s1, s2 := lmSumT(max(t0, a.v+1, b.v+1), T)
			fa, fb := float64(a.v), float64(b.v)
			return s2 - (fa+fb)*s1 + fa*fb*n
		default:
			if b.v < t0 || b.v > T || b.v <= a.v {
				return 0
			}
			return float64(b.v - a.v)
		}
	}
	if a.v != b.v || a.v < t0 || a.v > T {
		return 0
	}
	return 1
}

// colDot returns Σ_{t=t0}^{T} x_t z_t for two combinations.
func (d *lmXData) colDot(x, z lmColumn, t0 int) float64 {
	s := 0.0
	for _, p := range x {
		for _, q := range z {
			s += p.c * q.c * d.atomDot(p.a, q.a, t0)
		}
	}
	return s
}

// lmGram holds the cross-products of up to n regressors and a dependent
// variable over one window, from which nested leading subsets are solved.
type lmGram struct {
	n   int
	a   []float64 // n*n, lower triangle, row-major
	b   []float64
	yy  float64
	obs int
	nm  core.Normal
	// nested factorisation (see nested)
	l, dd, z, cum []float64
}

// fill computes the cross-products of cols (all of them) and dep over t0..T.
func (g *lmGram) fill(d *lmXData, cols []lmColumn, dep lmColumn, t0 int) {
	n := len(cols)
	g.n = n
	g.a = lmGrow(g.a, n*n)
	g.b = lmGrow(g.b, n)
	for i := 0; i < n; i++ {
		for j := 0; j <= i; j++ {
			g.a[i*n+j] = d.colDot(cols[i], cols[j], t0)
		}
		g.b[i] = d.colDot(cols[i], dep, t0)
	}
	g.yy = d.colDot(dep, dep, t0)
	g.obs = d.T - t0 + 1
}

// solve fits the leading k regressors; it returns the SSR. Coefficients are
// in g.nm.Coef and g.nm.InvDiag gives (X'X)^-1_jj.
func (g *lmGram) solve(k int) (float64, error) {
	nm := &g.nm
	nm.Reset(k)
	for i := 0; i < k; i++ {
		for j := 0; j <= i; j++ {
			nm.A[i*k+j] = g.a[i*g.n+j]
		}
		nm.B[i] = g.b[i]
	}
	nm.YY, nm.N = g.yy, g.obs
	if g.obs <= k {
		return 0, core.ErrTooShort
	}
	return nm.Solve()
}

// tstat returns the t-ratio of coefficient j after solve(k) with SSR ssr.
func (g *lmGram) tstat(j, k int, ssr float64) float64 {
	df := float64(g.obs - k)
	s2 := ssr / df
	v := s2 * g.nm.InvDiag(j)
	if !(v > 0) {
		return math.NaN()
	}
	return g.nm.Coef[j] / math.Sqrt(v)
}

// lmLagSpec says how lag selection runs: rule (LagFixed, LagTSig, LagAIC,
// LagBIC), the fixed order k or the maximum kmax.
type lmLagSpec struct {
	rule core.LagRule
	k    int // fixed order, or kmax for a rule
}

// lmDesign describes a regression whose columns are nested in the lag
// order: base regressors, then for i = 1..k a group of g columns with the
// lag of the differenced series last (the column the t-sig rule tests).
// stat is the index of the tested coefficient.
type lmDesign struct {
	base, group, stat int
}

func (ds lmDesign) width(k int) int { return ds.base + k*ds.group }

// lmTSig is the general-to-specific threshold: the 10% two-sided normal
// value (Ng & Perron 1995; Perron 1989, p. 1384).
const lmTSig = 1.645

// lmSelectAndTest chooses the lag order per spec on the common sample
// t = kmax+2..T (a rule) and returns the t-ratio of the tested coefficient
// re-estimated on t = k+2..T, with k and the number of observations.
// f fills the columns for an order; a smaller order uses a leading subset.
// lmFiller fills g with the cross-products of the leading w regressors and
// the dependent variable over t = t0..T.
type lmFiller interface {
	fillTo(g *lmGram, w, t0 int)
}

func lmSelectAndTest(f lmFiller, g *lmGram, ds lmDesign, spec lmLagSpec) (tau float64, k, nobs int, err error) {
	k = spec.k
	if spec.rule != core.LagFixed && spec.k > 0 {
		kmax := spec.k
		f.fillTo(g, ds.width(kmax), kmax+2)
		valid := g.nested(ds.width(kmax))
		best := math.Inf(1)
		k = 0
		for kk := kmax; kk >= 0; kk-- {
			w := ds.width(kk)
			if w > valid {
				continue
			}
			ssr := g.yy - g.cum[w]
			if ssr <= ExactFitTol*g.yy {
				// The largest valid order fits exactly (the orders are
				// nested on one sample, so none is a statistic).
				return math.NaN(), kk, g.obs, errExactFit
			}
			if spec.rule == core.LagTSig {
				if kk == 0 {
					k = 0
					break
				}
				// The tested lag is the last column: t = z_w / s.
				if ssr > 0 && math.Abs(g.z[w-1]/math.Sqrt(ssr/float64(g.obs-w))) > lmTSig {
					k = kk
					break
				}
				continue
			}
			if !(ssr > 0) {
				continue
			}
			n := float64(g.obs)
			pen := 2.0
			if spec.rule == core.LagBIC {
				pen = math.Log(n)
			}
			ic := math.Log(ssr/n) + pen*float64(w)/n
			if ic <= best {
				best, k = ic, kk
			}
		}
	}
	w := ds.width(k)
	f.fillTo(g, w, k+2)
	ssr, err := g.solve(w)
	if err != nil {
		return math.NaN(), k, g.obs, err
	}
	if ssr <= ExactFitTol*g.yy {
		return math.NaN(), k, g.obs, errExactFit
	}
	tau = g.tstat(ds.stat, w, ssr)
	if math.IsNaN(tau) || math.IsInf(tau, 0) {
		return math.NaN(), k, g.obs, core.ErrSingular
	}
	return tau, k, g.obs, nil
}

// nested factors the Jacobi-scaled Gram of the first n regressors once
// (the Cholesky factor of a leading block is the leading block of the
// factor) and stores z = L^-1 D b and cum[w] = Σ_{i<w} z_i^2, so that the
// regression on the leading w columns has SSR yy - cum[w] and its last
// coefficient has t-ratio z_{w-1} / s_w: every nested lag order from one
// factorisation. It returns the largest w for which this is valid (the
// factorisation stops at the first numerically singular pivot, with the
// threshold of core.Normal.Solve).
func (g *lmGram) nested(n int) int {
	g.l = lmGrow(g.l, n*n)
	g.dd = lmGrow(g.dd, n)
	g.z = lmGrow(g.z, n)
	g.cum = lmGrow(g.cum, n+1)
	a, L, d := g.a, g.l, g.dd
	for i := 0; i < n; i++ {
		v := a[i*g.n+i]
		if !(v > 0) {
			return 0
		}
		d[i] = 1 / math.Sqrt(v)
	}
	for j := 0; j < n; j++ {
		s := a[j*g.n+j]*d[j]*d[j] - lmDotRow(L, n, j, j, j)
		if s <= 1e-12 {
			return j
		}
		ljj := math.Sqrt(s)
		L[j*n+j] = ljj
		for i := j + 1; i < n; i++ {
			L[i*n+j] = (a[i*g.n+j]*d[i]*d[j] - lmDotRow(L, n, i, j, j)) / ljj
		}
		zs := g.b[j] * d[j]
		for l := 0; l < j; l++ {
			zs -= L[j*n+l] * g.z[l]
		}
		g.z[j] = zs / ljj
		g.cum[j+1] = g.cum[j] + g.z[j]*g.z[j]
	}
	return n
}

func lmDotRow(L []float64, k, i, j, n int) float64 {
	s := 0.0
	ri, rj := L[i*k:i*k+n], L[j*k:j*k+n]
	for l := range ri {
		s += ri[l] * rj[l]
	}
	return s
}

// lmWork is the per-goroutine scratch of the LM statistic. Per candidate,
// δ̃ comes from the atom cross-products (O(1) each); S̃ and ΔS̃ are formed in
// O(T) and every cross-product of the LM regression is then read from
// prefix sums of lagged products (Σ_t ΔS̃_{t-i} ΔS̃_{t-l} depends on i-l
// only up to the window ends), so one pass of O(T kmax) serves the whole
// lag selection, instead of a refit per lag order.
type lmWork struct {
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

// lmModel is the LM test's break model: nb breaks, slope (model C) or not
// (crash model A).
type lmModel struct {
	nb    int
	slope bool
}

func (m lmModel) nz() int {
	if m.slope {
		return 1 + 2*m.nb
	}
	return 1 + m.nb
}

func (w *lmWork) setup(y []float64, kmax int) {
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
func (w *lmWork) lmStat(m lmModel, tbs []int, spec lmLagSpec) (tau float64, k, nobs int, err error) {
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
func (w *lmWork) detWindow(c, t0 int) (a, b int) {
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
func (w *lmWork) dataSum(c, nz, a, b int) float64 {
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
func (w *lmWork) dataDot(c1, c2, nz, t0 int) float64 {
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
func (w *lmWork) p(a, r int) float64 { return w.pre[r*w.na+a] }

// fillTo fills g for the leading n columns of the LM regression over t0..T.
func (w *lmWork) fillTo(g *lmGram, n, t0 int) {
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
	g.obs = w.T - t0 + 1
}

// lmLagSpecFor resolves the lag settings of a break test: the method's own
// rule is the general-to-specific t-sig rule with kmax = 8 (Lee &
// Strazicich 2003; Lumsdaine & Papell 1997; Clemente, Montanes & Reyes
// 1998), or cfg.MaxLags, capped so that the regression with extra other
// regressors keeps at least 10 degrees of freedom.
func lmLagSpecFor(id string, cfg *core.Config, T, extra int) (lmLagSpec, error) {
	rule := cfg.LagRule.Or(core.LagTSig)
	switch rule {
	case core.LagFixed:
		if cfg.Lags < 0 {
			return lmLagSpec{}, core.Errorf(id, core.ErrSettings, "negative lag order %d", cfg.Lags)
		}
		k := cfg.Lags
		if T-k-1-(k+extra+1) < 10 {
			return lmLagSpec{}, core.Errorf(id, core.ErrTooShort, "%d lags leave too few observations for T=%d", k, T)
		}
		return lmLagSpec{rule: rule, k: k}, nil
	case core.LagTSig, core.LagAIC, core.LagBIC:
	default:
		return lmLagSpec{}, core.Errorf(id, core.ErrSettings, "lag rule %s is not available for this test (use tsig, aic, bic or fixed)", rule)
	}
	k := 8
	if cfg.MaxLags > 0 {
		k = cfg.MaxLags
	}
	for k > 0 && T-k-1-(k+extra+1) < 10 {
		k--
	}
	return lmLagSpec{rule: rule, k: k}, nil
}

// lmMinGap is the smallest distance TB2 - TB1 in two-break searches: with
// TB2 = TB1 + 1 the slope-shift designs are collinear (DT_1 - DT_2 = DU_1).
const lmMinGap = 2

// lmCandStat computes a test's statistic at candidate break dates tbs.
type lmCandStat func(tbs []int) (tau float64, k, nobs int, err error)

// lmSearchResult is the outcome of a minimum-t break search.
type lmSearchResult struct {
	tau     float64
	tbs     [2]int
	k, nobs int
	path    []schema.PathPoint // one-break searches
	rows    []schema.PathPoint // two-break searches: best per first break
	ncand   int
	lo, hi  float64 // smallest and largest statistic over candidates
	lastErr error
	exact   exactSet // candidates that fit exactly (ExactFitTol): the search fails
}

// lmSearch1 evaluates f at TB = lo..hi and keeps the minimum.
func lmSearch1(ctx context.Context, lo, hi int, f lmCandStat, path bool) (lmSearchResult, error) {
	r := lmSearchResult{tau: math.Inf(1), lo: math.Inf(1), hi: math.Inf(-1)}
	if path {
		r.path = make([]schema.PathPoint, 0, hi-lo+1)
	}
	var tbs [1]int
	for tb := lo; tb <= hi; tb++ {
		if ctx != nil && (tb-lo)%64 == 0 && ctx.Err() != nil {
			return r, ctx.Err()
		}
		tbs[0] = tb
		tau, k, nobs, err := f(tbs[:])
		if err != nil {
			if IsExactFit(err) {
				r.exact.add(tbs[:])
				continue
			}
			r.lastErr = err
			continue
		}
		r.ncand++
		r.lo, r.hi = math.Min(r.lo, tau), math.Max(r.hi, tau)
		if path {
			r.path = append(r.path, schema.PathPoint{Index: tb, Statistic: tau})
		}
		if tau < r.tau {
			r.tau, r.tbs[0], r.k, r.nobs = tau, tb, k, nobs
		}
	}
	return r, nil
}

// lmSearch2 evaluates f at every pair lo <= TB1, TB1+lmMinGap <= TB2 <= hi
// and keeps the minimum; rows holds the best statistic per TB1.
func lmSearch2(ctx context.Context, lo, hi int, f lmCandStat, rows bool) (lmSearchResult, error) {
	return lmSearch2Gap(ctx, lo, hi, lmMinGap, f, rows)
}

// lmSearchError turns an empty search into an error for test id.
func lmSearchError(id string, r lmSearchResult, err error) error {
	if err != nil {
		return &core.Error{Test: id, Err: fmt.Errorf("%w: %v", core.ErrCancelled, err)}
	}
	if e := r.exact.err(); e != nil {
		return WrapError(id, e)
	}
	if r.ncand == 0 {
		if r.lastErr != nil {
			return core.Errorf(id, core.ErrNoEstimate, "no break candidate gave a statistic (%v)", r.lastErr)
		}
		return core.Errorf(id, core.ErrNoEstimate, "no break candidate gave a statistic")
	}
	return nil
}

// lmLagRuleName is the LagRule string reported in results.
func lmLagRuleName(s lmLagSpec) string {
	if s.rule == core.LagFixed {
		return "fixed"
	}
	return s.rule.String()
}
