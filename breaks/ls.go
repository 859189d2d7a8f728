package breaks

// Shared machinery of the Lee-Strazicich LM tests (ls1, ls2), the
// Lumsdaine-Papell test (lp) and the mean-shift test (meanshift, Clemente-Montanes-Reyes).
//
// Cross-product engine: every regressor is a short linear combination of
// "atoms" — fixed data columns (y_{t-1}, Δy_t, Δy_{t-i}) and break atoms
// (steps 1(t > b), ramps (t - b) 1(t > b), pulses 1(t = p); the constant is
// the step at b = 0 and the trend t the ramp at b = 0). The cross-product of
// two smooth atoms over a window t = t0..T is O(1): data x data from a table
// built once per series for every window start, data x break from prefix
// (suffix) sums of the data and of t times the data, break x break in
// closed form; pulses touch single rows, which are added to the smooth part
// (rowGram, rowgram.go). A candidate break date changes only the break atoms,
// the pulse rows and the combination weights; nothing is refitted and
// nothing depends on T per candidate.
//
// LM regression (Lee & Strazicich 2003, eqs. (2)-(3); Schmidt & Phillips
// 1992): with Z_t = [t, D_jt, DT_jt] (the constant is absorbed by ψ), δ̃
// from Δy_t on ΔZ_t = [1, B_jt, D_jt] over t = 2..T (B_jt = 1(t = TB_j+1),
// D_jt = 1(t > TB_j)) is a mean per regime without the rows TB_j+1; then
// S̃_{t-1} and ΔS̃_{t-i} are themselves atom combinations, modulo the
// columns of ΔZ_t (see lmWork), so the LM regression of Δy_t on [ΔZ_t,
// S̃_{t-1}, ΔS̃_{t-1..t-k}] has its cross-products from the same engine.
//
// Lag selection (t-sig, AIC, BIC) factors the Gram of the largest order
// once: the nested regressions are leading blocks of one Cholesky factor
// (see lmGram.nested). Every fast path is checked against a full Householder
// QR refit (core.LS) per candidate and lag order in the tests.

import (
	"context"
	"fmt"
	"math"
	"sync"

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
	n  int
	a  []float64 // n*n, lower triangle, row-major
	b  []float64
	yy float64
	// scale is the sum of squares of the dependent variable of the
	// original regression over the window (the exact-fit rule's scale;
	// equal to yy unless the engine works on a shifted dependent variable).
	scale float64
	obs   int
	nm    core.Normal
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
	g.scale = g.yy
	g.obs = d.T - t0 + 1
}

// solve fits the leading k regressors; it returns the SSR. Coefficients are
// in g.nm.Coef and g.nm.InvDiag gives (X'X)^-1_jj.
func (g *lmGram) solve(k int) (float64, error) {
	nm := &g.nm
	nm.Size(k) // the lower triangle of A, B, YY and N are set below
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

// lmExtender is a filler that can derive the final regression's
// cross-products from those of the selection (a leading subset of the
// columns over a longer window).
type lmExtender interface {
	extend(g *lmGram, w, t0 int)
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
			if ssr <= ExactFitTol*g.scale {
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
	if x, ok := f.(lmExtender); ok && spec.rule != core.LagFixed && spec.k > 0 {
		x.extend(g, w, k+2)
	} else {
		f.fillTo(g, w, k+2)
	}
	ssr, err := g.solve(w)
	if err != nil {
		return math.NaN(), k, g.obs, err
	}
	if ssr <= ExactFitTol*g.scale {
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

// lmWork is the per-goroutine scratch of the LM statistic; per candidate
// nothing depends on T. The series is standardised and detrended by the
// no-break drift, z_t = y_t - y_1 - δ_r (t-1) with δ_r = (y_T - y_1)/(T-1)
// (so that S̃ is a small correction of z_{t-1} and its cross-products keep
// their digits); the regression of Δz_t on ΔZ_t gives δ̃ - δ_r and the break
// coefficients in O(1) (atom engine). Then, modulo the columns of ΔZ_t
// (adding them to another regressor changes neither φ̂, its t-ratio, the
// t-ratios of the lags nor the SSR; the dependent variable Δz_t differs
// from Δy_t by a constant), with a = δ̃_0 - δ_r, c_j and g_j the
// coefficients of B_jt and D_jt:
//
//	S̃_{t-1} ≡ z_{t-1} - a t - Σ_j c_j 1(t > TB_j)                   (crash)
//	S̃_{t-1} ≡ z_{t-1} - a t - Σ_j g_j (t - TB_j) 1(t > TB_j)        (break)
//	ΔS̃_{t-i} ≡ Δz_{t-i} - Σ_j c_j 1(t = TB_j+1+i)
//	           [+ Σ_j g_j Σ_{l=1..i} 1(t = TB_j+l)]                    (break)
//
// since ΔS̃_s = Δz_s - a - Σ_j c_j 1(s = TB_j+1) - Σ_j g_j 1(s > TB_j) and
// 1(t-i > TB_j) = 1(t > TB_j) - Σ_{l=1..i} 1(t = TB_j+l). Every column is a
// combination of fixed atoms, steps, ramps and pulses, and rowGram gives the
// cross-products in a time independent of T.
type lmWork struct {
	e    rowGram
	g    lmGram
	ys   []float64
	z    []float64
	kmax int
	T    int
}

func (w *lmWork) setup(y []float64, kmax int) {
	w.ys, _, _ = core.Standardize(w.ys, y)
	T := len(y)
	w.T, w.kmax = T, kmax
	w.z = searchGrow(w.z, T)
	dr := (w.ys[T-1] - w.ys[0]) / float64(T-1)
	for t := range w.z {
		w.z[t] = w.ys[t] - w.ys[0] - dr*float64(t)
	}
	w.e.setup(w.z, kmax, w.ys)
}

// lmStat computes the LM t-statistic at break dates tbs (increasing, at
// least lmMinGap apart) with lag spec (spec.k <= the kmax given to setup).
func (w *lmWork) lmStat(m lmModel, tbs []int, spec lmLagSpec) (tau float64, k, nobs int, err error) {
	d := &w.e.d
	nz := m.nz()
	T := w.T
	// δ̃ from Δz_t on ΔZ_t = [1, B_jt, D_jt] over t = 2..T in closed form:
	// the pulses B_jt take out the rows TB_j+1, the constant and the steps
	// D_jt (break model) fit one mean per regime (crash model: one mean).
	// dl = [δ̃_0 - δ_r, c_1..c_nb (B), g_1..g_nb (D)].
	var dl [5]float64
	s1, s2, dz := d.s1[lmDy], d.pp[lmTri(lmDy, lmDy)], d.col[lmDy]
	ssr0 := 0.0
	if !m.slope {
		n := float64(T - 1 - len(tbs))
		sum, sq := s1[T]-s1[1], s2[T]-s2[1]
		for _, tb := range tbs {
			v := dz[tb+1]
			sum -= v
			sq -= v * v
		}
		mean := sum / n
		dl[0] = mean
		for j, tb := range tbs {
			dl[1+j] = dz[tb+1] - mean
		}
		ssr0 = sq - n*mean*mean
	} else {
		start, prev := 1, 0.0 // regime rows start+1..end, first row a pulse for j > 0
		for j := 0; j <= len(tbs); j++ {
			end := T
			if j < len(tbs) {
				end = tbs[j]
			}
			n := float64(end - start)
			sum, sq := s1[end]-s1[start], s2[end]-s2[start]
			if j > 0 {
				v := dz[start+1]
				n--
				sum -= v
				sq -= v * v
			}
			mean := sum / n
			ssr0 += sq - n*mean*mean
			if j == 0 {
				dl[0] = mean
			} else {
				dl[j] = dz[start+1] - mean
				dl[m.nb+j] = mean - prev
			}
			prev = mean
			start = end
		}
	}
	if ssr0 <= ExactFitTol*(w.e.ss[T]-w.e.ss[1]) {
		// Δy is exactly a constant plus the break terms: S̃ is rounding
		// noise, and its t-ratio would be meaningless.
		return math.NaN(), 0, 0, errExactFit
	}
	// Columns of the LM regression: ΔZ_t, S̃_{t-1}, ΔS̃_{t-1..t-kmax}.
	e := &w.e
	e.begin(nz + 1 + w.kmax)
	e.smooth(0, lmAtom{lmKStep, 0}, 1)
	for j, tb := range tbs {
		e.pulse(1+j, tb+1, 1)
		if m.slope {
			e.smooth(1+m.nb+j, lmAtom{lmKStep, tb}, 1)
		}
	}
	e.smooth(nz, lmAtom{lmKData, lmYlag}, 1)
	e.smooth(nz, lmAtom{lmKRamp, 0}, -dl[0])
	for j, tb := range tbs {
		if m.slope {
			e.smooth(nz, lmAtom{lmKRamp, tb}, -dl[1+m.nb+j])
		} else {
			e.smooth(nz, lmAtom{lmKStep, tb}, -dl[1+j])
		}
	}
	for i := 1; i <= w.kmax; i++ {
		e.smooth(nz+i, lmAtom{lmKData, lmDy + i}, 1)
		for j, tb := range tbs {
			e.pulse(nz+i, tb+1+i, -dl[1+j])
			if m.slope {
				for l := 1; l <= i; l++ {
					e.pulse(nz+i, tb+l, dl[1+m.nb+j])
				}
			}
		}
	}
	e.finish(lmDy)
	return lmSelectAndTest(e, &w.g, lmDesign{base: nz + 1, group: 1, stat: nz}, spec)
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

// lmDatesPool holds the break-date buffers of the searches, so that a
// search does not allocate.
var lmDatesPool = sync.Pool{New: func() any { return new([2]int) }}

// lmSearch1 evaluates f at TB = lo..hi and keeps the minimum.
func lmSearch1(ctx context.Context, lo, hi int, f lmCandStat, path bool) (lmSearchResult, error) {
	r := lmSearchResult{tau: math.Inf(1), lo: math.Inf(1), hi: math.Inf(-1)}
	if path {
		r.path = make([]schema.PathPoint, 0, hi-lo+1)
	}
	buf := lmDatesPool.Get().(*[2]int) // f's argument escapes: reuse it
	defer lmDatesPool.Put(buf)
	tbs := buf[:1]
	for tb := lo; tb <= hi; tb++ {
		if ctx != nil && (tb-lo)%64 == 0 && ctx.Err() != nil {
			return r, ctx.Err()
		}
		tbs[0] = tb
		tau, k, nobs, err := f(tbs)
		if err != nil {
			if IsExactFit(err) {
				r.exact.add(tbs)
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
