package breaks

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"sync"

	"github.com/rootshift/rootshift/core"
)

// This file is the fast single-break search shared by p89, za and pio: the
// innovational-outlier Dickey-Fuller regression
//
//	Δy_t = c + b t + θ DU_t + γ DT_t + δ D(TB)_t + (α-1) y_{t-1} + Σ_{j=1..k} c_j Δy_{t-j} + e_t
//
// (Perron 1989, eqs. (13)-(15); Zivot & Andrews 1992, eqs. (1)-(3) without
// D(TB); Perron 1997, eqs. (1)-(2)), estimated at every candidate TB from
// cross-products. Everything that does not depend on TB (the constant, the
// trend, y_{t-1}, the lagged differences and Δy_t) is accumulated once per
// series; the break regressors are zero for t <= TB, so their cross-products
// with every other column are suffix sums
//
//	Σ_{t>TB} x_t,   Σ_{t>TB} (t-TB) x_t = Σ_{t>TB} t x_t - TB Σ_{t>TB} x_t,
//
// precomputed once for all TB, and the one-time dummy contributes the single
// row t = TB+1. The series is standardised (core.Standardize) and the trend
// is used as τ_t = (t - (T+1)/2)/T, DT as (t-TB)/T: the same column spaces,
// hence the same t-ratios, with well-scaled cross-products.
//
// The TB-independent columns are factored once per series (Jacobi-scaled
// Cholesky, see pfactor); per candidate only the one to three break columns
// are residualised on them (Frisch-Waugh-Lovell) by one triangular solve,
// and the remaining (nb+1)-square system is solved by core.Normal (written
// out, with the same operations in the same order, for one and two break
// columns: final1, final2). Lag selection reads every order from one
// factorisation, the orders being leading blocks. Nothing is allocated in
// the candidate loop.

// ExactFitTol is the exact-fit rule shared by every break search of this
// package (common practice, no source): a regression whose sum of squared
// residuals satisfies
//
//	SSR <= ExactFitTol * Σ_t dep_t²
//
// (dep the dependent variable over the regression sample, uncentred, so the
// rule also holds for regressions without an intercept and for a constant
// dependent variable) fits the data exactly up to rounding: its t-ratios are
// ±Inf or 0/0, not statistics. Cross-product fast paths cannot resolve an
// SSR below about 1e-14 of Σ dep² anyway, so the fast paths and their
// brute-force twins classify a candidate the same way. An exact fit at any
// break candidate makes the whole search fail with an error from
// ExactFitError (wrapping core.ErrNoEstimate) rather than skipping the
// candidate: skipping it would silently move the break date (a noiseless
// step at TB = 60 would be reported at 59).
const ExactFitTol = 1e-12

// errExactFit marks a regression that fits the data exactly; searches turn
// it into ExactFitError with the break dates.
var errExactFit = fmt.Errorf("%w: the regression fits the data exactly", core.ErrNoEstimate)

// ExactFitError is the error of a break search that met an exact fit at
// break dates tbs (see ExactFitTol); callers attach the test id with
// WrapError. It wraps core.ErrNoEstimate.
func ExactFitError(tbs ...int) error {
	return &core.Error{Err: fmt.Errorf("%w at break date %s (SSR <= %g x the sum of squares of the dependent variable): "+
		"the series is, up to rounding, a deterministic level/trend path with that break, so no unit-root statistic is meaningful",
		errExactFit, datesText(tbs), ExactFitTol)}
}

// exactSet collects the candidates of a search that fit exactly (the first
// exactShow of them, and their number), so that the error names them all.
type exactSet struct {
	n     int
	dates [][]int
}

const exactShow = 8

func (e *exactSet) add(tbs []int) {
	e.n++
	if len(e.dates) < exactShow {
		e.dates = append(e.dates, append([]int(nil), tbs...))
	}
}

// err is nil when no candidate fitted exactly, else the ExactFitError
// naming the candidates.
func (e *exactSet) err() error {
	if e.n == 0 {
		return nil
	}
	if e.n == 1 {
		return ExactFitError(e.dates[0]...)
	}
	var b strings.Builder
	for i, d := range e.dates {
		if i > 0 {
			b.WriteString(", ")
		}
		if len(d) > 1 {
			b.WriteString("(" + datesText(d) + ")")
		} else {
			b.WriteString(datesText(d))
		}
	}
	if e.n > len(e.dates) {
		fmt.Fprintf(&b, ", ... (%d candidates in all;", e.n)
	} else {
		fmt.Fprintf(&b, " (%d candidates;", e.n)
	}
	return &core.Error{Err: fmt.Errorf("%w at break dates %s SSR <= %g x the sum of squares of the dependent variable): "+
		"the series is, up to rounding, a deterministic level/trend path with such a break, so no unit-root statistic is meaningful",
		errExactFit, b.String(), ExactFitTol)}
}

// IsExactFit reports whether err comes from an exact fit (see ExactFitTol).
func IsExactFit(err error) bool { return errors.Is(err, errExactFit) }

func datesText(tbs []int) string {
	switch len(tbs) {
	case 0:
		return "(none)"
	case 1:
		return fmt.Sprintf("TB=%d", tbs[0])
	}
	s := fmt.Sprintf("TB1=%d", tbs[0])
	for i, tb := range tbs[1:] {
		s += fmt.Sprintf(", TB%d=%d", i+2, tb)
	}
	return s
}

// fitStatus is the outcome of one candidate regression.
type fitStatus int8

const (
	fitOK    fitStatus = iota
	fitSkip            // singular design: the candidate is skipped
	fitExact           // exact fit (ExactFitTol): the search fails
)

// BreakRule is how a search picks the break date among the candidates.
type BreakRule int

const (
	// MinTAlpha picks the TB that minimises the unit-root t-ratio t_α
	// (Zivot & Andrews 1992; Perron 1997 "t_α̂" rule).
	MinTAlpha BreakRule = iota
	// MaxAbsTLevel picks the TB maximising |t_θ|, the t-ratio of the
	// level-shift coefficient (Perron 1997, "|t_θ̂|" rule).
	MaxAbsTLevel
	// MaxAbsTSlope picks the TB maximising |t_γ|, the t-ratio of the
	// slope-shift coefficient (Perron 1997, "|t_γ̂|" rule).
	MaxAbsTSlope
)

// String names the rule in words.
func (r BreakRule) String() string {
	switch r {
	case MaxAbsTLevel:
		return "max |t| on the level-shift coefficient"
	case MaxAbsTSlope:
		return "max |t| on the slope-shift coefficient"
	}
	return "min t on alpha"
}

// TSigCritical is the 10% two-sided normal value used by the t-sig lag rule
// (Ng & Perron 1995; the same value as core's LagTSig).
const TSigCritical = 1.645

// Spec describes one single-break search. Candidates run over TB = Lo..Hi,
// further restricted to TB >= kmax+2 so that both regimes are present in
// every regression sample (see Searcher.Search).
type Spec struct {
	// Trend is core.TrendConstant or core.TrendLinear (core.TrendNone is
	// treated as constant: a break model always has an intercept).
	Trend core.Trend
	// Terms are the break regressors.
	Terms Terms
	// LagRule is core.LagFixed (use Lags), core.LagTSig, core.LagAIC or
	// core.LagBIC (choose k in 0..MaxLags for each candidate); other values
	// are treated as core.LagTSig.
	LagRule core.LagRule
	Lags    int
	MaxLags int
	// Lo and Hi bound the candidates (1-based, inclusive).
	Lo, Hi int
	// Rule picks the break among candidates.
	Rule BreakRule
	// OnlyTAlpha computes only t_α (Candidate.Alpha and the t-ratios of the
	// break terms are NaN) when Rule is MinTAlpha: the statistic-only path
	// of the simulation engine.
	OnlyTAlpha bool
}

// Candidate is the regression at one break date.
type Candidate struct {
	// TB is the break date, Lags the augmentation order used, NObs the
	// number of observations of the regression (t = Lags+2..T).
	TB, Lags, NObs int
	// TAlpha is the t-ratio of α-1; Alpha is α̂.
	TAlpha, Alpha float64
	// TLevel, TSlope and TDummy are the t-ratios of θ, γ and δ (NaN when the
	// term is not in the model).
	TLevel, TSlope, TDummy float64
}

// Searcher runs single-break searches. It keeps its scratch space between
// calls so that repeated searches on series of the same length do not
// allocate. The zero value is ready to use; a Searcher is not safe for
// concurrent use.
type Searcher struct {
	T, kk, p int // series length, largest lag, index of Δy_t among the base columns
	ys       []float64
	x        []float64   // base columns, row-major by 1-based t (see prepare)
	s1, st   []float64   // suffix sums Σ_{u>=m} x_u and Σ_{u>=m} τ_u x_u, row-major by m = 1..T+1
	gram     [][]float64 // gram[k]: cross-products of the base columns over t = k+2..T, (p+1)^2, lower triangle only (see grams)
	acc      []float64   // the runs of grams
	sel      pfactor
	fin      []pfactor
	codesBuf []int
	maxK     int
	bcode    [3]int
	bv       []float64 // raw break × base cross-products, [break][base column]
	bb       [9]float64
	wb       []float64 // residualised break columns, [break][row of L]
	sbb      [9]float64
	sby, xb  [3]float64
	a, b, z  []float64 // scratch of pfactor.build
	nrm      core.Normal
	path     []Candidate
}

// searcherPool keeps the scratch of finished searches for the next series:
// a fresh Searcher allocates and clears about (T+2)·(k+4)·24 bytes, which in
// a run over many series costs as much as the candidate loop itself.
var searcherPool = sync.Pool{New: func() any { return new(Searcher) }}

// getSearcher returns a Searcher from the pool; putSearcher returns it once
// its path is no longer read.
func getSearcher() *Searcher { return searcherPool.Get().(*Searcher) }

func putSearcher(w *Searcher) {
	w.path = w.path[:0]
	searcherPool.Put(w)
}

// Column codes of a system: base columns are >= 0, break columns negative.
const (
	codeDU = -1
	codeDT = -2
	codeD  = -3
)

// prepare standardises y and builds the per-series sums for lags up to kk.
// All per-observation arrays are row-major: row t (1-based) holds the np
// base columns 0 const, 1 τ, 2 y_{t-1}, 2+j Δy_{t-j} (j = 1..kk), p = kk+3
// Δy_t (0 where a term does not exist).
func (w *Searcher) prepare(y []float64, kk int) {
	T := len(y)
	w.T, w.kk, w.p = T, kk, 3+kk
	np := w.p + 1
	w.ys = standardize(w.ys, y)
	ys := w.ys
	w.x = searchGrow(w.x, (T+2)*np)
	w.s1 = searchGrow(w.s1, (T+2)*np)
	w.st = searchGrow(w.st, (T+2)*np)
	x, s1, st := w.x, w.s1, w.st
	for c := 0; c < np; c++ {
		x[c], x[(T+1)*np+c] = 0, 0
		s1[(T+1)*np+c], st[(T+1)*np+c] = 0, 0
	}
	for t := 1; t <= T; t++ {
		row := x[t*np : (t+1)*np]
		row[0] = 1
		row[1] = (float64(t) - float64(T+1)/2) / float64(T)
		if t >= kk+2 && len(row) >= 3 {
			// Every term exists: no zeros to write, no conditions.
			row[2] = ys[t-2]
			row[w.p] = ys[t-1] - ys[t-2]
			lags := row[3 : 3+kk]   // Δy_{t-1}, ..., Δy_{t-kk}
			win := ys[t-kk-2 : t-1] // y_{t-kk-2}, ..., y_{t-2} (0-based ys[t-kk-2..t-2])
			for j := range lags {
				// lag j+1: ys[t-j-2] - ys[t-j-3] = win[kk-j] - win[kk-j-1]
				lags[j] = win[kk-j] - win[kk-j-1]
			}
			continue
		}
		for c := 2; c < np; c++ {
			row[c] = 0
		}
		if t >= 2 {
			row[2] = ys[t-2]
			row[w.p] = ys[t-1] - ys[t-2]
		}
		for j := 1; j <= kk && t >= j+2; j++ {
			row[2+j] = ys[t-j-1] - ys[t-j-2]
		}
	}
	for t := T; t >= 1; t-- {
		row := x[t*np : (t+1)*np]
		tt := row[1]
		a1, at := s1[(t+1)*np:(t+2)*np], st[(t+1)*np:(t+2)*np]
		b1, bt := s1[t*np:(t+1)*np], st[t*np:(t+1)*np]
		a1, at, b1, bt = a1[:len(row)], at[:len(row)], b1[:len(row)], bt[:len(row)]
		for len(row) >= 4 && len(a1) >= 4 && len(at) >= 4 && len(b1) >= 4 && len(bt) >= 4 { // unrolled by four (see searchDot)
			r, p1, pt, q1, qt := (*[4]float64)(row), (*[4]float64)(a1), (*[4]float64)(at), (*[4]float64)(b1), (*[4]float64)(bt)
			q1[0], qt[0] = p1[0]+r[0], pt[0]+tt*r[0]
			q1[1], qt[1] = p1[1]+r[1], pt[1]+tt*r[1]
			q1[2], qt[2] = p1[2]+r[2], pt[2]+tt*r[2]
			q1[3], qt[3] = p1[3]+r[3], pt[3]+tt*r[3]
			row, a1, at, b1, bt = row[4:], a1[4:], at[4:], b1[4:], bt[4:]
		}
		a1, at, b1, bt = a1[:len(row)], at[:len(row)], b1[:len(row)], bt[:len(row)]
		for c, v := range row {
			b1[c] = a1[c] + v
			bt[c] = at[c] + tt*v
		}
	}
	w.grams(kk)
}

// grams sets gram[k], the lower triangle of the cross-products of the base
// columns over t = k+2..T, for k = 0..kk. Each entry is the sum of its
// products in the order t = T, T-1, ..., k+2 (the order of a backward
// sweep over the rows), so the entries are the same bit for bit whichever
// loop computes them (TestGramsEqualSweep). The entries with the constant
// and the trend are the suffix sums s1 and st at m = k+2, already summed
// in that order (x·1 = x and τ·x = x·τ exactly). The others are products
// of y_{t-1} and the differences Δy_{t-j}, j = 0..kk, which are shifts of
// one vector: each entry is one dot product of two contiguous runs, summed
// in a register, instead of a read-modify-write of every entry at every
// row (several times dearer under WebAssembly than natively).
func (w *Searcher) grams(kk int) {
	T, np, ys := w.T, w.p+1, w.ys
	if len(w.gram) < kk+1 {
		w.gram = append(w.gram, make([][]float64, kk+1-len(w.gram))...)
	}
	w.gram = w.gram[:kk+1]
	for k := range w.gram {
		w.gram[k] = searchGrow(w.gram[k], np*np)
		g, s1, st := w.gram[k], w.s1[(k+2)*np:(k+3)*np], w.st[(k+2)*np:(k+3)*np]
		for i := 0; i < np; i++ {
			g[i*np] = s1[i]
			if i >= 1 {
				g[i*np+1] = st[i]
			}
		}
	}
	// Runs indexed by u = T - t (t = T..2, u = 0..T-2): ylag[u] = y_{t-1},
	// dys[u+j] = Δy_{t-j} (0 where t-j < 2, as in the rows).
	n := T - 1
	w.acc = searchGrow(w.acc, n+n+kk)
	ylag, dys := w.acc[:n], w.acc[n:n+n+kk]
	for u := 0; u < n; u++ {
		t := T - u
		ylag[u] = ys[t-2]
		dys[u] = ys[t-1] - ys[t-2]
	}
	for u := n; u < len(dys); u++ {
		dys[u] = 0
	}
	// col returns the run of base column c (2: y_{t-1}, 2+j: Δy_{t-j},
	// p: Δy_t).
	col := func(c int) []float64 {
		if c == 2 {
			return ylag
		}
		j := 0
		if c < w.p {
			j = c - 2
		}
		return dys[j : j+n]
	}
	head := max(0, T-kk-2) // rows t = T..kk+3 come before the first order's sample ends
	for i := 2; i < np; i++ {
		a := col(i)
		for j := 2; j <= i; j++ {
			b := col(j)
			s := core.DotFrom(0, a[:head], b[:head]) // unrolled, in order
			for u := head; u < n; u++ {
				s += a[u] * b[u]
				if k := T - u - 2; k <= kk {
					w.gram[k][i*np+j] = s
				}
			}
		}
	}
}

// pfactor is the TB-independent part of a regression: the columns P
// (codes; constant, trend, y_{t-1} and lags) over t = k+2..T, their
// Jacobi-scaled Cholesky factor L L' = D P'P D, and the projections
// ry = L^{-1} D P'Δy and, when the regression has a target column x outside
// P (y_{t-1} in the final regression), rx = L^{-1} D P'x. By the
// Frisch-Waugh-Lovell theorem a regression on [P, B, x] gives the same
// coefficients and standard errors of B and x as the regression of the
// residuals of Δy on the residuals of [B, x] after projecting on P; those
// residual cross-products follow from L and the raw cross-products of B, so
// per candidate only the break columns are residualised.
type pfactor struct {
	k      int // lag order: sample t = k+2..T
	codes  []int
	l, d   []float64
	linv   []float64 // 1/L_ii
	rank   int
	ry, rx []float64
	yy     float64 // Δy'Δy
	// Residual cross-products of the target x and Δy after P.
	xxRes, xyRes, yyRes float64
	xx                  float64 // raw x'x
	target              int     // code of x, or -1
}

// build factors P = codes over t = k+2..T from gram[k]; target is the code
// of the column kept outside P (-1: none).
func (f *pfactor) build(w *Searcher, codes []int, k, target int) {
	f.k, f.target = k, target
	f.codes = append(f.codes[:0], codes...)
	K := len(codes)
	g := w.gram[k]
	np := w.p + 1
	at := func(a, b int) float64 { return g[max(a, b)*np+min(a, b)] }
	a := searchGrow(w.a, K*K)
	by := searchGrow(w.b, K)
	bx := searchGrow(w.z, K)
	for i := 0; i < K; i++ {
		for j := 0; j <= i; j++ {
			a[i*K+j] = at(codes[i], codes[j])
		}
		by[i] = at(w.p, codes[i])
		if target >= 0 {
			bx[i] = at(target, codes[i])
		}
	}
	w.a, w.b, w.z = a, by, bx
	f.l = searchGrow(f.l, K*K)
	f.d = searchGrow(f.d, K)
	f.ry = searchGrow(f.ry, K)
	f.rx = searchGrow(f.rx, K)
	f.rank = cholPrefix(a, by, K, f.l, f.d, f.ry)
	f.linv = searchGrow(f.linv, K)
	for i := 0; i < f.rank; i++ {
		f.linv[i] = 1 / f.l[i*K+i]
	}
	f.yy = at(w.p, w.p)
	f.yyRes = f.yy
	for i := 0; i < f.rank; i++ {
		f.yyRes -= f.ry[i] * f.ry[i]
	}
	if target >= 0 && f.rank == K {
		forwardScaled(f.l, f.linv, f.d, bx, f.rx, K, K)
		f.xx = at(target, target)
		f.xxRes, f.xyRes = f.xx, at(w.p, target)
		for i := 0; i < K; i++ {
			f.xxRes -= f.rx[i] * f.rx[i]
			f.xyRes -= f.rx[i] * f.ry[i]
		}
	}
}

// forwardScaled solves L w = D v for the first n rows (L is K×K row-major,
// linv holds 1/L_ii).
func forwardScaled(l, linv, d, v, w []float64, K, n int) {
	for i := 0; i < n; i++ {
		w[i] = (v[i]*d[i] - searchDot(l[i*K:i*K+i], w[:i])) * linv[i]
	}
}

// breakVectors computes, for tb, the raw cross-products of each break
// column of spec with every base column (and Δy), and between break columns.
// It returns the number of break columns. The cross-products between break
// columns over t > TB are
//
//	DU·DU = n,  DU·DT = Σ τ_t - τ_TB n,  DT·DT = Σ τ_t² - 2 τ_TB Σ τ_t + τ_TB² n,
//	D·D = DU·D = 1,  DT·D = 1/T
//
// (n = T - TB; DT scaled by 1/T as τ).
func (w *Searcher) breakVectors(spec *Spec, tb int) int {
	T := w.T
	m := tb + 1
	tauTB := (float64(tb) - float64(T+1)/2) / float64(T)
	np := w.p + 1
	s1, st := w.s1[m*np:(m+1)*np], w.st[m*np:(m+1)*np]
	st = st[:len(s1)]
	n := s1[0]
	// cr[a][b], a >= b, by term: 0 DU, 1 DT, 2 D.
	var cr [3][3]float64
	var term [3]int
	nb := 0
	if spec.Terms.Level {
		w.bcode[nb], term[nb] = codeDU, 0
		copy(w.bv[:np], s1)
		cr[0][0] = n
		nb++
	}
	if spec.Terms.Slope {
		w.bcode[nb], term[nb] = codeDT, 1
		v := w.bv[nb*np : (nb+1)*np]
		v = v[:len(s1)]
		for c, a := range s1 {
			v[c] = st[c] - tauTB*a
		}
		cr[1][1] = st[1] - 2*tauTB*st[0] + tauTB*tauTB*n
		cr[1][0] = st[0] - tauTB*n
		nb++
	}
	if spec.Terms.Dummy {
		w.bcode[nb], term[nb] = codeD, 2
		copy(w.bv[nb*np:(nb+1)*np], w.x[m*np:(m+1)*np])
		cr[2][2], cr[2][0], cr[2][1] = 1, 1, 1/float64(T)
		nb++
	}
	// The lower triangle of bb, written out (nb <= 3).
	t0 := term[0]
	w.bb[0] = cr[t0][t0]
	if nb > 1 {
		t1 := term[1]
		w.bb[3], w.bb[4] = cr[t1][t0], cr[t1][t1]
		if nb > 2 {
			t2 := term[2]
			w.bb[6], w.bb[7], w.bb[8] = cr[t2][t0], cr[t2][t1], cr[t2][t2]
		}
	}
	return nb
}

// residualise forward-solves the break columns against factor f (first n
// rows) into w.wb[b*maxK : ...].
func (w *Searcher) residualise(f *pfactor, nb, n int) {
	np := w.p + 1
	K := len(f.codes)
	codes, d, linv := f.codes[:n], f.d[:n], f.linv[:n]
	for b := 0; b < nb; b++ {
		v := w.bv[b*np : (b+1)*np]
		out := w.wb[b*w.maxK : b*w.maxK+n]
		out = out[:len(codes)]
		// forwardScaled of the gathered column, with the gather and the
		// bounds checks out of the inner loop (they cost several times more
		// under WebAssembly than natively).
		for i, c := range codes {
			row := f.l[i*K : i*K+i]
			dot := searchDot(row, out[:i])
			out[i] = (v[c]*d[i] - dot) * linv[i]
		}
	}
}

// factors builds the TB-independent factors of the search: the selection
// block (when a lag rule is used) and the final block of every order needed.
func (w *Searcher) factors(spec *Spec) {
	kk := w.kk
	if len(w.fin) < kk+1 {
		w.fin = append(w.fin, make([]pfactor, kk+1-len(w.fin))...)
	}
	w.maxK = 2 + 1 + kk
	w.bv = searchGrow(w.bv, 3*(w.p+1))
	w.wb = searchGrow(w.wb, 3*w.maxK)
	w.codesBuf = append(w.codesBuf[:0], 0)
	if spec.Trend == core.TrendLinear {
		w.codesBuf = append(w.codesBuf, 1)
	}
	nd := len(w.codesBuf)
	// codes returns the deterministic codes followed by extra and lags 1..k.
	codes := func(extra bool, k int) []int {
		c := w.codesBuf[:nd]
		if extra {
			c = append(c, 2)
		}
		for j := 1; j <= k; j++ {
			c = append(c, 2+j)
		}
		w.codesBuf = c
		return c
	}
	if spec.LagRule == core.LagFixed {
		w.fin[kk].build(w, codes(false, kk), kk, 2)
		return
	}
	for k := 0; k <= kk; k++ {
		w.fin[k].build(w, codes(false, k), k, 2)
	}
	c := codes(true, kk)
	w.sel.build(w, c, kk, -1)
}

// kmax returns the largest lag order the search needs.
func (spec *Spec) kmax() int {
	if spec.LagRule == core.LagFixed {
		return spec.Lags
	}
	return spec.MaxLags
}

// Search runs the search on y and returns the chosen candidate. When path is
// true, the second result holds every candidate in order of TB (owned by
// the Searcher, valid until the next call). Candidates TB < kmax+2 are
// skipped (the regression sample must contain both regimes); candidates
// whose design is singular are skipped. Errors wrap core.ErrTooShort when no
// candidate is left and core.ErrSingular when every candidate is singular;
// an exact fit (ExactFitTol) at any candidate, in the final regression or in
// a lag-selection regression, stops the search with ExactFitError. y must be
// finite and non-constant (checked by the callers).
func (w *Searcher) Search(y []float64, spec *Spec, path bool) (Candidate, []Candidate, error) {
	kk := spec.kmax()
	w.prepare(y, kk)
	return w.search(spec, path)
}

func (w *Searcher) search(spec *Spec, path bool) (Candidate, []Candidate, error) {
	T, kk := w.T, w.kk
	lo, hi := max(spec.Lo, kk+2, MinHead), min(spec.Hi, T-MinTail)
	w.path = w.path[:0]
	best := Candidate{TB: -1}
	if lo > hi {
		return best, nil, core.Errorf("", core.ErrTooShort, "no break candidate with T=%d and %d lags (first %d, last %d)", T, kk, lo, hi)
	}
	w.factors(spec)
	bestScore := math.Inf(1)
	var exact exactSet
	var c Candidate
	for tb := lo; tb <= hi; tb++ {
		st := w.at(spec, tb, &c)
		if st == fitExact {
			exact.add([]int{tb})
			continue
		}
		if st != fitOK {
			continue
		}
		if path {
			w.path = append(w.path, c)
		}
		var score float64
		switch spec.Rule {
		case MaxAbsTLevel:
			score = -math.Abs(c.TLevel)
		case MaxAbsTSlope:
			score = -math.Abs(c.TSlope)
		default:
			score = c.TAlpha
		}
		if score < bestScore {
			bestScore, best = score, c
		}
	}
	if err := exact.err(); err != nil {
		return Candidate{TB: -1}, nil, err
	}
	if best.TB < 0 {
		return best, nil, core.Errorf("", core.ErrSingular, "the regression is singular at every break candidate")
	}
	if path {
		return best, w.path, nil
	}
	return best, nil, nil
}

// at estimates the regression at tb with the spec's lag rule into c (set
// when the status is fitOK).
func (w *Searcher) at(spec *Spec, tb int, c *Candidate) fitStatus {
	nb := w.breakVectors(spec, tb)
	k := spec.Lags
	if spec.LagRule != core.LagFixed {
		var st fitStatus
		if nb == 1 {
			k, st = w.selectLag1(spec)
		} else {
			k, st = w.selectLag(spec, nb)
		}
		if st != fitOK {
			return st
		}
	}
	return w.final(spec, tb, k, nb, c)
}

// smallSystem solves, with core.Normal, the regression of the residualised
// Δy on the residualised break columns (w.sbb, w.sby) and one more
// residualised column x (xb: its cross-products with the breaks, xx its
// norm, xy its cross-product with Δy; yy is the residual Δy'Δy). K is the
// total number of regressors of the full regression (for the degrees of
// freedom), n its number of observations, dd the raw Δy'Δy over the sample
// (the scale of the exact-fit rule). It returns the t-ratio of x and the SSR
// and leaves the solution in w.nrm; st is fitSkip for a singular system and
// fitExact for an exact fit.
func (w *Searcher) smallSystem(nb int, xb []float64, xx, xy, yy, dd float64, n, K int) (t, ssr float64, st fitStatus) {
	m := &w.nrm
	q := nb + 1
	m.Size(q) // every entry read by Solve is set below
	for i := 0; i < nb; i++ {
		for j := 0; j <= i; j++ {
			m.A[i*q+j] = w.sbb[i*3+j]
		}
		m.B[i] = w.sby[i]
		// A break column (almost) in the span of P is a singular candidate.
		if !(w.sbb[i*3+i] > 1e-10*w.bb[i*3+i]) {
			return 0, 0, fitSkip
		}
	}
	for j := 0; j < nb; j++ {
		m.A[nb*q+j] = xb[j]
	}
	m.A[nb*q+nb] = xx
	m.B[nb] = xy
	m.YY, m.N = yy, n
	ssr, err := m.Solve()
	df := float64(n - K)
	if err != nil || df <= 0 {
		return 0, 0, fitSkip
	}
	if ssr <= ExactFitTol*dd {
		return 0, 0, fitExact
	}
	t = m.Coef[nb] / math.Sqrt(ssr/df*m.InvDiag(nb))
	if math.IsNaN(t) || math.IsInf(t, 0) {
		return 0, 0, fitSkip
	}
	return t, ssr, fitOK
}

// tLast returns the squared t-ratio of the extra column x in the regression
// of the residualised Δy on the residualised [B, x] (w.sbb, w.sby, w.xb;
// x'x = xx, x'Δy = xy, Δy'Δy = yy) with df degrees of freedom, the sign of
// its coefficient and the SSR; dd is the raw Δy'Δy over the sample (the
// scale of the exact-fit rule). It writes out an LDL' factorisation of the
// (nb+1)-square system with x last (no square roots), the lag-selection
// twin of smallSystem (which uses core.Normal); st is fitSkip for a
// singular system and fitExact for an exact fit.
func (w *Searcher) tLast(nb int, xx, xy, yy, dd float64, df int) (t2, sign, ssr float64, st fitStatus) {
	if df <= 0 {
		return 0, 0, 0, fitSkip
	}
	qxx, qxy, qyy := 0.0, 0.0, 0.0
	if nb == 1 {
		// One break column: the loop below with scalars (same arithmetic).
		sii := w.sbb[0]
		if !(sii > 1e-10*w.bb[0]) || !(sii > 1e-12*sii) {
			return 0, 0, 0, fitSkip
		}
		a, b := w.xb[0], w.sby[0]
		qxx, qxy, qyy = a*a/sii, a*b/sii, b*b/sii
	} else {
		var l [9]float64
		var dg, ux, uy [3]float64
		for i := 0; i < nb; i++ {
			sii := w.sbb[i*3+i]
			if !(sii > 1e-10*w.bb[i*3+i]) {
				return 0, 0, 0, fitSkip
			}
			v := sii
			for j := 0; j < i; j++ {
				v -= l[i*3+j] * l[i*3+j] * dg[j]
			}
			if !(v > 1e-12*sii) {
				return 0, 0, 0, fitSkip
			}
			dg[i] = v
			for r := i + 1; r < nb; r++ {
				u := w.sbb[r*3+i]
				for j := 0; j < i; j++ {
					u -= l[r*3+j] * l[i*3+j] * dg[j]
				}
				l[r*3+i] = u / v
			}
			a, b := w.xb[i], w.sby[i]
			for j := 0; j < i; j++ {
				a -= l[i*3+j] * ux[j]
				b -= l[i*3+j] * uy[j]
			}
			ux[i], uy[i] = a, b
			qxx += a * a / v
			qxy += a * b / v
			qyy += b * b / v
		}
	}
	px := xx - qxx
	if !(px > 1e-12*xx) {
		return 0, 0, 0, fitSkip
	}
	zx := xy - qxy
	ssr = yy - qyy - zx*zx/px
	if ssr <= ExactFitTol*dd {
		return 0, 0, 0, fitExact
	}
	if math.IsNaN(ssr) {
		return 0, 0, 0, fitSkip
	}
	t2 = zx * zx / px / (ssr / float64(df))
	sign = 1
	if zx < 0 {
		sign = -1
	}
	return t2, sign, ssr, fitOK
}

// selectLag chooses k in 0..kk on the common sample t = kk+2..T. The
// factor of P = [const, trend, y_{t-1}, Δy_{t-1}, ..., Δy_{t-kk}] is computed
// once per series; every order k is the leading block of P of size
// i = nd+1+k plus the break columns, so one forward solve of the break
// columns against L gives all orders: for order k the last lag (column
// i-1 of P) is the extra column of a small system whose other columns are
// the breaks residualised on the first i-1 columns of P.
func (w *Searcher) selectLag(spec *Spec, nb int) (int, fitStatus) {
	f := &w.sel
	kk := w.kk
	nd := len(f.codes) - 1 - kk
	i0 := nd + 1 // size of the order-0 block
	if f.rank < i0 {
		return 0, fitSkip
	}
	kTop := min(f.rank-i0, kk)
	w.residualise(f, nb, i0+kTop)
	n := w.T - kk - 1
	K := len(f.codes)
	// Cumulative residual cross-products after the first r columns of P.
	for i := 0; i < nb; i++ {
		for j := 0; j <= i; j++ {
			w.sbb[i*3+j] = w.bb[i*3+j]
		}
		w.sby[i] = w.bv[i*(w.p+1)+w.p]
	}
	yy := f.yy
	add := func(r int) {
		if nb == 1 { // the common one-column case without the loops
			wi := w.wb[r]
			w.sbb[0] -= wi * wi
			w.sby[0] -= wi * f.ry[r]
			yy -= f.ry[r] * f.ry[r]
			return
		}
		for i := 0; i < nb; i++ {
			wi := w.wb[i*w.maxK+r]
			for j := 0; j <= i; j++ {
				w.sbb[i*3+j] -= wi * w.wb[j*w.maxK+r]
			}
			w.sby[i] -= wi * f.ry[r]
		}
		yy -= f.ry[r] * f.ry[r]
	}
	for r := 0; r < i0-1; r++ {
		add(r)
	}
	ic := spec.LagRule == core.LagAIC || spec.LagRule == core.LagBIC
	pen := 2.0
	if spec.LagRule == core.LagBIC {
		pen = math.Log(float64(n))
	}
	best, bestIC := 0, math.Inf(1)
	for k := 0; k <= kTop; k++ {
		// Column r = i0-1+k of P (y_{t-1} for k = 0, lag k otherwise) is the
		// extra column; the breaks are residualised on columns 0..r-1.
		r := i0 - 1 + k
		lrr := f.l[r*K+r]
		for i := 0; i < nb; i++ {
			w.xb[i] = w.wb[i*w.maxK+r] * lrr
		}
		t2, _, ssr, st := w.tLast(nb, lrr*lrr, f.ry[r]*lrr, yy, f.yy, n-(r+1+nb))
		if st == fitExact {
			// Every larger order fits exactly too (nested, same sample).
			return k, fitExact
		}
		if st != fitOK {
			if k == 0 {
				return 0, fitSkip
			}
			break
		}
		if ic {
			if v := math.Log(ssr/float64(n)) + pen*float64(r+1+nb)/float64(n); v < bestIC {
				best, bestIC = k, v
			}
		} else if k > 0 && t2 > TSigCritical*TSigCritical {
			best = k // the largest significant order wins
		}
		add(r)
	}
	return best, fitOK
}

// selectLag1 is selectLag for one break column written out with scalars
// (tLast's one-column case and the cumulative updates inline, no closure):
// the same operations in the same order, so the same order is chosen
// (TestSelectLag1EqualsGeneral).
func (w *Searcher) selectLag1(spec *Spec) (int, fitStatus) {
	f := &w.sel
	kk := w.kk
	nd := len(f.codes) - 1 - kk
	i0 := nd + 1
	if f.rank < i0 {
		return 0, fitSkip
	}
	kTop := min(f.rank-i0, kk)
	w.residualise(f, 1, i0+kTop)
	n := w.T - kk - 1
	K := len(f.codes)
	wb, ry := w.wb[:i0+kTop], f.ry[:i0+kTop]
	bb0 := w.bb[0]
	s00, sy, yy := bb0, w.bv[w.p], f.yy
	for r := 0; r < i0-1; r++ {
		wi := wb[r]
		s00 -= wi * wi
		sy -= wi * ry[r]
		yy -= ry[r] * ry[r]
	}
	ic := spec.LagRule == core.LagAIC || spec.LagRule == core.LagBIC
	pen := 2.0
	if spec.LagRule == core.LagBIC {
		pen = math.Log(float64(n))
	}
	best, bestIC := 0, math.Inf(1)
	for k := 0; k <= kTop; k++ {
		r := i0 - 1 + k
		lrr := f.l[r*K+r]
		a, b := wb[r]*lrr, sy
		xx, xy := lrr*lrr, ry[r]*lrr
		// tLast with one break column.
		df := n - (r + 2)
		ok := df > 0 && s00 > 1e-10*bb0 && s00 > 1e-12*s00
		var ssr, t2 float64
		if ok {
			qxx, qxy, qyy := a*a/s00, a*b/s00, b*b/s00
			px := xx - qxx
			ok = px > 1e-12*xx
			if ok {
				zx := xy - qxy
				ssr = yy - qyy - zx*zx/px
				if ssr <= ExactFitTol*f.yy {
					// Every larger order fits exactly too (nested, same sample).
					return k, fitExact
				}
				ok = !math.IsNaN(ssr)
				t2 = zx * zx / px / (ssr / float64(df))
			}
		}
		if !ok {
			if k == 0 {
				return 0, fitSkip
			}
			break
		}
		if ic {
			if v := math.Log(ssr/float64(n)) + pen*float64(r+2)/float64(n); v < bestIC {
				best, bestIC = k, v
			}
		} else if k > 0 && t2 > TSigCritical*TSigCritical {
			best = k // the largest significant order wins
		}
		wi := wb[r]
		s00 -= wi * wi
		sy -= wi * ry[r]
		yy -= ry[r] * ry[r]
	}
	return best, fitOK
}

// final estimates the k-lag regression at tb on t = k+2..T: P = [const,
// trend, lags 1..k] is factored once per series, y_{t-1} is the target
// column, and the breaks are residualised on P.
func (w *Searcher) final(spec *Spec, tb, k, nb int, c *Candidate) fitStatus {
	f := &w.fin[k]
	K := len(f.codes)
	if f.rank < K {
		return fitSkip
	}
	switch nb {
	case 1:
		w.finalResid1(f)
	case 2:
		w.finalResid2(f)
	default:
		w.finalResid(f, nb)
	}
	n := w.T - k - 1
	Ktot := K + nb + 1
	if spec.OnlyTAlpha && spec.Rule == MinTAlpha {
		// Statistic only: t_α from the written-out factorisation.
		t2, sign, _, st := w.tLast(nb, f.xxRes, f.xyRes, f.yyRes, f.yy, n-Ktot)
		*c = Candidate{TB: tb, Lags: k, NObs: n, Alpha: math.NaN(), TAlpha: sign * math.Sqrt(t2),
			TLevel: math.NaN(), TSlope: math.NaN(), TDummy: math.NaN()}
		return st
	}
	switch nb {
	case 1:
		return w.final1(tb, k, n, Ktot, f, c)
	case 2:
		return w.final2(tb, k, n, Ktot, f, c)
	}
	tA, ssr, st := w.smallSystem(nb, w.xb[:nb], f.xxRes, f.xyRes, f.yyRes, f.yy, n, Ktot)
	if st != fitOK {
		return st
	}
	m := &w.nrm
	*c = Candidate{TB: tb, Lags: k, NObs: n, Alpha: 1 + m.Coef[nb], TAlpha: tA,
		TLevel: math.NaN(), TSlope: math.NaN(), TDummy: math.NaN()}
	s2 := ssr / float64(n-Ktot)
	for i := 0; i < nb; i++ {
		w.setBreakT(c, i, m.Coef[i]/math.Sqrt(s2*m.InvDiag(i)))
	}
	return fitOK
}

// finalResid residualises the nb break columns on the final factor f and
// sets the residual cross-products w.sbb, w.sby (with Δy) and w.xb (with
// y_{t-1}): the general form of finalResid1 and finalResid2.
func (w *Searcher) finalResid(f *pfactor, nb int) {
	K := len(f.codes)
	w.residualise(f, nb, K)
	np := w.p + 1
	for i := 0; i < nb; i++ {
		for j := 0; j <= i; j++ {
			w.sbb[i*3+j] = w.bb[i*3+j]
		}
		w.sby[i] = w.bv[i*np+w.p]
		w.xb[i] = w.bv[i*np+2]
	}
	for r := 0; r < K; r++ {
		for i := 0; i < nb; i++ {
			wi := w.wb[i*w.maxK+r]
			for j := 0; j <= i; j++ {
				w.sbb[i*3+j] -= wi * w.wb[j*w.maxK+r]
			}
			w.sby[i] -= wi * f.ry[r]
			w.xb[i] -= wi * f.rx[r]
		}
	}
}

// finalResid1 is finalResid for one break column, written out with
// scalars and with the forward solve of residualise in the same loop: the
// same operations in the same order (the results are equal bit for bit,
// TestFinalFastEqualsGeneral), without the index arithmetic, bounds checks
// and stores of the general loops, which cost several times more under
// WebAssembly than natively.
func (w *Searcher) finalResid1(f *pfactor) {
	K := len(f.codes)
	np := w.p + 1
	codes, d, linv, ry, rx := f.codes[:K], f.d[:K], f.linv[:K], f.ry[:K], f.rx[:K]
	v0 := w.bv[:np]
	o0 := w.wb[:K]
	s00, y0, x0 := w.bb[0], v0[w.p], v0[2]
	for i, c := range codes {
		row := f.l[i*K : i*K+i]
		p0 := o0[:len(row)]
		a0 := 0.0
		for j, l := range row {
			a0 += l * p0[j]
		}
		r0 := (v0[c]*d[i] - a0) * linv[i]
		o0[i] = r0
		s00 -= r0 * r0
		y0 -= r0 * ry[i]
		x0 -= r0 * rx[i]
	}
	w.sbb[0], w.sby[0], w.xb[0] = s00, y0, x0
}

// finalResid2 is finalResid for two break columns (see finalResid1).
func (w *Searcher) finalResid2(f *pfactor) {
	K := len(f.codes)
	np := w.p + 1
	codes, d, linv, ry, rx := f.codes[:K], f.d[:K], f.linv[:K], f.ry[:K], f.rx[:K]
	v0, v1 := w.bv[:np], w.bv[np:2*np]
	o0, o1 := w.wb[:K], w.wb[w.maxK:w.maxK+K]
	s00, s10, s11 := w.bb[0], w.bb[3], w.bb[4]
	y0, y1, x0, x1 := v0[w.p], v1[w.p], v0[2], v1[2]
	for i, c := range codes {
		row := f.l[i*K : i*K+i]
		p0, p1 := o0[:len(row)], o1[:len(row)]
		a0, a1 := 0.0, 0.0
		for j, l := range row {
			a0 += l * p0[j]
			a1 += l * p1[j]
		}
		di, li := d[i], linv[i]
		r0 := (v0[c]*di - a0) * li
		r1 := (v1[c]*di - a1) * li
		o0[i], o1[i] = r0, r1
		s00 -= r0 * r0
		s10 -= r1 * r0
		s11 -= r1 * r1
		y0 -= r0 * ry[i]
		y1 -= r1 * ry[i]
		x0 -= r0 * rx[i]
		x1 -= r1 * rx[i]
	}
	w.sbb[0], w.sbb[3], w.sbb[4] = s00, s10, s11
	w.sby[0], w.sby[1], w.xb[0], w.xb[1] = y0, y1, x0, x1
}

// final1 is smallSystem and the t-ratios of final for one break column,
// with core.Normal's Jacobi-scaled Cholesky solve and InvDiag written out
// for the 2×2 system [break, y_{t-1}]: the same operations in the same
// order, so the candidate is equal bit for bit to the general path's
// (TestFinalFastEqualsGeneral). Everything is computed first and the
// conditions of smallSystem and core.Normal (a break column in the span of
// P, a non-positive diagonal or pivot, no degrees of freedom: fitSkip; an
// exact fit: fitExact; a non-finite t-ratio: fitSkip) are tested together
// at the end: the values of a valid candidate do not depend on it, and
// straight-line code avoids the block dispatch of every branch under
// WebAssembly. It writes the candidate into c when the status is fitOK.
func (w *Searcher) final1(tb, k, n, Ktot int, f *pfactor, c *Candidate) fitStatus {
	a00, b0 := w.sbb[0], w.sby[0]
	a10, a11, b1, yy := w.xb[0], f.xxRes, f.xyRes, f.yyRes
	d0, d1 := 1/math.Sqrt(a00), 1/math.Sqrt(a11)
	p0 := a00*d0*d0 - 0.0
	l00 := math.Sqrt(p0)
	l10 := (a10*d1*d0 - 0.0) / l00
	p1 := a11*d1*d1 - l10*l10
	l11 := math.Sqrt(p1)
	z0 := b0 * d0 / l00
	z1 := (b1*d1 - l10*z0) / l11
	c1 := z1 / l11
	c0 := (z0 - l10*c1) / l00
	ssr := yy - z0*z0 - z1*z1
	c0 *= d0
	c1 *= d1
	if ssr < 0 { // clamped at 0, as in core.Normal
		ssr = 0
	}
	df := float64(n - Ktot)
	// InvDiag(1) and InvDiag(0).
	w1 := 1 / l11
	inv1 := w1 * w1 * d1 * d1
	u0 := 1 / l00
	u1 := (0 - l10*u0) / l11
	inv0 := (u0*u0 + u1*u1) * d0 * d0
	tA := c1 / math.Sqrt(ssr/df*inv1)
	if !(a00 > 1e-10*w.bb[0] && a00 > 0 && a11 > 0 && !(p0 <= 1e-12) && !(p1 <= 1e-12) && n-Ktot > 0) {
		return fitSkip
	}
	if ssr <= ExactFitTol*f.yy {
		return fitExact
	}
	if math.IsNaN(tA) || math.IsInf(tA, 0) {
		return fitSkip
	}
	*c = Candidate{TB: tb, Lags: k, NObs: n, Alpha: 1 + c1, TAlpha: tA,
		TLevel: math.NaN(), TSlope: math.NaN(), TDummy: math.NaN()}
	w.setBreakT(c, 0, c0/math.Sqrt(ssr/df*inv0))
	return fitOK
}

// final2 is final1 for two break columns: the 3×3 system [break 1,
// break 2, y_{t-1}] written out.
func (w *Searcher) final2(tb, k, n, Ktot int, f *pfactor, c *Candidate) fitStatus {
	a00, a10, a11 := w.sbb[0], w.sbb[3], w.sbb[4]
	a20, a21, a22 := w.xb[0], w.xb[1], f.xxRes
	b0, b1, b2, yy := w.sby[0], w.sby[1], f.xyRes, f.yyRes
	d0, d1, d2 := 1/math.Sqrt(a00), 1/math.Sqrt(a11), 1/math.Sqrt(a22)
	p0 := a00*d0*d0 - 0.0
	l00 := math.Sqrt(p0)
	l10 := (a10*d1*d0 - 0.0) / l00
	l20 := (a20*d2*d0 - 0.0) / l00
	p1 := a11*d1*d1 - l10*l10
	l11 := math.Sqrt(p1)
	l21 := (a21*d2*d1 - (0 + l20*l10)) / l11 // "0 +": the sum of core.Normal, signed zeros included
	p2 := a22*d2*d2 - (l20*l20 + l21*l21)
	l22 := math.Sqrt(p2)
	z0 := b0 * d0 / l00
	z1 := (b1*d1 - l10*z0) / l11
	z2 := (b2*d2 - l20*z0 - l21*z1) / l22
	c2 := z2 / l22
	c1 := (z1 - l21*c2) / l11
	c0 := (z0 - l10*c1 - l20*c2) / l00
	ssr := yy - z0*z0 - z1*z1 - z2*z2
	c0 *= d0
	c1 *= d1
	c2 *= d2
	if ssr < 0 {
		ssr = 0
	}
	df := float64(n - Ktot)
	// InvDiag(2), InvDiag(0) and InvDiag(1).
	w2 := 1 / l22
	inv2 := w2 * w2 * d2 * d2
	u0 := 1 / l00
	u1 := (0 - l10*u0) / l11
	u2 := (0 - l20*u0 - l21*u1) / l22
	inv0 := (u0*u0 + u1*u1 + u2*u2) * d0 * d0
	v1 := 1 / l11
	v2 := (0 - l21*v1) / l22
	inv1 := (v1*v1 + v2*v2) * d1 * d1
	tA := c2 / math.Sqrt(ssr/df*inv2)
	if !(a00 > 1e-10*w.bb[0] && a11 > 1e-10*w.bb[4] && a00 > 0 && a11 > 0 && a22 > 0 &&
		!(p0 <= 1e-12) && !(p1 <= 1e-12) && !(p2 <= 1e-12) && n-Ktot > 0) {
		return fitSkip
	}
	if ssr <= ExactFitTol*f.yy {
		return fitExact
	}
	if math.IsNaN(tA) || math.IsInf(tA, 0) {
		return fitSkip
	}
	*c = Candidate{TB: tb, Lags: k, NObs: n, Alpha: 1 + c2, TAlpha: tA,
		TLevel: math.NaN(), TSlope: math.NaN(), TDummy: math.NaN()}
	s2 := ssr / df
	w.setBreakT(c, 0, c0/math.Sqrt(s2*inv0))
	w.setBreakT(c, 1, c1/math.Sqrt(s2*inv1))
	return fitOK
}

// setBreakT stores the t-ratio t of break column i in c.
func (w *Searcher) setBreakT(c *Candidate, i int, t float64) {
	switch w.bcode[i] {
	case codeDU:
		c.TLevel = t
	case codeDT:
		c.TSlope = t
	default:
		c.TDummy = t
	}
}

// cholPrefix factors the Jacobi-scaled K×K matrix D A D (lower triangle of
// a, row-major) as L L' and computes z = L^{-1} D b, stopping at the first
// pivot that is not numerically positive (relative 1e-12, as core.Normal).
// It returns the number of pivots completed: every leading block of that
// size or less is a valid factorisation of the corresponding sub-regression.
func cholPrefix(a, b []float64, K int, l, d, z []float64) int {
	for i := 0; i < K; i++ {
		v := a[i*K+i]
		if !(v > 0) {
			d[i] = 0
			continue
		}
		d[i] = 1 / math.Sqrt(v)
	}
	for j := 0; j < K; j++ {
		if d[j] == 0 {
			return j
		}
		lj := l[j*K : j*K+j]
		s := a[j*K+j]*d[j]*d[j] - searchDot(lj, lj)
		if s <= 1e-12 {
			return j
		}
		ljj := math.Sqrt(s)
		l[j*K+j] = ljj
		for i := j + 1; i < K; i++ {
			l[i*K+j] = (a[i*K+j]*d[i]*d[j] - searchDot(l[i*K:i*K+j], lj)) / ljj
		}
		z[j] = (b[j]*d[j] - searchDot(l[j*K:j*K+j], z[:j])) / ljj
	}
	return K
}

// searchDot is Σ x_i y_i summed in order from i = 0 (short vectors: it is
// inlined).
func searchDot(x, y []float64) float64 {
	s := 0.0
	y = y[:len(x)] // hoists the bounds check out of the loop
	for i, v := range x {
		s += v * y[i]
	}
	return s
}

// standardize writes (y - mean)/sd into dst (core.Standardize) after
// dividing y by its largest absolute value, so that neither tiny nor huge
// series under- or overflow in the sums of squares.
func standardize(dst, y []float64) []float64 {
	dst = searchGrow(dst, len(y))
	s := 0.0
	for _, v := range y {
		if a := math.Abs(v); !(a <= s) && s == s { // max(s, |v|) without the call; NaN wins, as in max
			s = a
		}
	}
	if s > 0 && !math.IsInf(s, 0) {
		for i, v := range y {
			dst[i] = v / s
		}
	} else {
		copy(dst, y)
	}
	dst, _, _ = core.Standardize(dst, dst)
	return dst
}

func searchGrow(s []float64, n int) []float64 {
	if cap(s) < n {
		return make([]float64, n)
	}
	return s[:n]
}
