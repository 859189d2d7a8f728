package core

// Augmented Dickey-Fuller regressions and the choice of their augmentation
// order.
//
// The regression (Dickey & Fuller 1979; Said & Dickey 1984, eq. 1.2) is
//
//	Δy_t = det_t'δ + ρ y_{t-1} + Σ_{i=1..k} γ_i Δy_{t-i} + e_t,
//
// with det_t empty (TrendNone), 1 (TrendConstant) or (1, t) (TrendLinear),
// t = 1..T the observation number in the series passed in.
//
// Lag rules (all compared on the common sample t = kmax+2..T, Ng & Perron
// 2001, p. 1529):
//   - AIC / BIC: log(σ̂²_k) + C_T k / N with C_T = 2 or log N, σ̂²_k = SSR_k/N,
//     N = T - kmax - 1.
//   - MAIC (Ng & Perron 2001, eq. 9): log(σ̂²_k) + 2(τ_T(k) + k)/N with
//     τ_T(k) = ρ̂² Σ ỹ_{t-1}² / σ̂²_k. When det is TrendNone the criterion uses
//     the series as passed (the DF-GLS caller passes GLS-detrended data).
//     Otherwise, following Perron & Qu (2007), the whole criterion (σ̂²_k, ρ̂
//     and Σ ỹ²_{t-1}) is computed from the regression without deterministic
//     terms on the OLS-detrended series ỹ (residuals of y on det over t=1..T).
//   - TSig (Ng & Perron 1995): start at kmax and drop the last lag while its
//     |t| < 1.645 (10% two-sided normal).
//
// References: Dickey & Fuller (1979), JASA 74; Said & Dickey (1984),
// Biometrika 71; Ng & Perron (1995), JASA 90; Ng & Perron (2001),
// Econometrica 69; Perron & Qu (2007), Economics Letters 94, 12-19.

import (
	"fmt"
	"math"
)

// DFFit is the outcome of one augmented Dickey-Fuller regression. The full
// fit Fit has its coefficients in the order [ρ, γ_1..γ_k, det...] where det
// is (1) for TrendConstant and (1, t) for TrendLinear.
type DFFit struct {
	// Rho is the coefficient on y_{t-1} (ρ = α - 1), SE its standard error,
	// TStat the Dickey-Fuller t-ratio ρ/SE.
	Rho, SE, TStat float64
	// K is the number of lagged differences, NObs the observations used and
	// Start the first t used (1-based; the last is T).
	K, NObs, Start int
	// SSR is the sum of squared residuals; Sigma2 = SSR/(NObs - regressors).
	SSR, Sigma2 float64
	// Fit is the full fit (valid until the next call on the same DFWork).
	Fit *Fit
	// SumGamma is Σ γ_i, the AR sum b(1) for the M-tests' spectral estimate.
	SumGamma float64
	// Det is the number of deterministic columns (after the k lags in Fit).
	Det int
}

// DFWork fits augmented Dickey-Fuller regressions
// Δy_t = det_t'δ + ρ y_{t-1} + Σ_{i=1..k} γ_i Δy_{t-i} + e_t reusing storage.
// det is TrendNone / TrendConstant / TrendLinear (t = 1..T, the observation
// number in y). The zero value is ready to use; a DFWork is not safe for
// concurrent use. After the first call of a given size, Regress does not
// allocate.
type DFWork struct {
	ls   LS
	cols [][]float64
	back []float64
	dep  []float64
	tr   []float64 // OLS-detrended copy for MAIC
	fit  DFFit

	// Cross-product fast path of SelectLags.
	nm   Normal
	z    []float64 // scaled (and, with a constant, centred) series
	xr   []float64 // one row of the kmax design
	xx   []float64 // X'X of the kmax design (m*m, lower triangle)
	xy   []float64 // X'Δz
	dz   []float64 // differences of z (crossLagged)
	idx  []int
	ssrs []float64 // SSR by number of leading regressors (selectNested)
	crit []float64 // criterion by k from the last selection (tests)
	// nearExact is set by the fast path when the fit at kmax leaves almost
	// no residual (SSR below 1e-10 of the total): only the QR fit can tell
	// an exact fit (ErrNoEstimate) from a very good one.
	nearExact bool
}

// Regress fits with k lags on t = start..T; start = 0 means k+2 (all
// observations where the terms exist). Errors wrap ErrSettings (bad k or
// start), ErrTooShort, ErrSingular, ErrNonFinite or ErrNoEstimate (perfect
// fit: the t-ratio is undefined).
func (w *DFWork) Regress(y []float64, det Trend, k, start int) (*DFFit, error) {
	T := len(y)
	if k < 0 {
		return nil, fmt.Errorf("%w: negative lag order %d", ErrSettings, k)
	}
	if start == 0 {
		start = k + 2
	}
	if start < k+2 {
		return nil, fmt.Errorf("%w: sample start %d before first usable observation %d", ErrSettings, start, k+2)
	}
	nd := det.NumDet()
	nc := 1 + k + nd
	n := T - start + 1
	if n <= nc {
		return nil, fmt.Errorf("%w: %d observations for %d regressors", ErrTooShort, max(n, 0), nc)
	}
	w.back = grow(w.back, n*nc)
	if cap(w.cols) < nc {
		w.cols = make([][]float64, nc)
	}
	w.cols = w.cols[:nc]
	for j := range nc {
		w.cols[j] = w.back[j*n : (j+1)*n]
	}
	w.dep = grow(w.dep, n)
	// Row r corresponds to t = start + r (1-based), i.e. y[t-1] in Go indexing.
	tss := 0.0
	for r := range n {
		t := start + r
		d := y[t-1] - y[t-2]
		w.dep[r] = d
		tss += d * d
		w.cols[0][r] = y[t-2]
		for i := 1; i <= k; i++ {
			w.cols[i][r] = y[t-1-i] - y[t-2-i]
		}
		if nd >= 1 {
			w.cols[k+1][r] = 1
		}
		if nd == 2 {
			w.cols[k+2][r] = float64(t)
		}
	}
	if math.IsNaN(tss) || math.IsInf(tss, 0) {
		return nil, fmt.Errorf("%w: in the differences of the series", ErrNonFinite)
	}
	if tss == 0 {
		return nil, fmt.Errorf("%w: the series does not change over the sample", ErrConstant)
	}
	f, err := w.ls.Fit(w.cols, w.dep)
	if err != nil {
		return nil, err
	}
	if !(f.SSR > 1e-26*tss) {
		return nil, fmt.Errorf("%w: the regression fits exactly (deterministic series)", ErrNoEstimate)
	}
	o := &w.fit
	o.Rho, o.SE = f.Coef[0], f.StdErr[0]
	o.TStat = o.Rho / o.SE
	o.K, o.NObs, o.Start, o.Det = k, n, start, nd
	o.SSR, o.Sigma2 = f.SSR, f.Sigma2
	o.Fit = f
	o.SumGamma = 0
	for i := 1; i <= k; i++ {
		o.SumGamma += f.Coef[i]
	}
	if math.IsNaN(o.TStat) || math.IsInf(o.TStat, 0) {
		return nil, fmt.Errorf("%w: Dickey-Fuller t-ratio is not finite", ErrNoEstimate)
	}
	return o, nil
}

// SelectLags chooses k in 0..kmax by rule on the common sample
// t = kmax+2..T (Ng & Perron 2001 p.1529) and returns k. See the file
// comment for the criteria; LagFixed and LagAuto are not rules here
// (ErrSettings). The fits it makes may overwrite the DFWork's last fit.
//
// It uses a cross-product fast path: the series is scaled (and centred when
// det has a constant, with the trend centred and scaled too, which leaves
// every criterion's argmin unchanged), X'X of the kmax design is formed once
// and each order is solved from its sub-matrix (core.Normal). When that
// factorisation is numerically singular it falls back to Householder QR
// fits (selectLagsQR, also the brute-force twin in the tests). It does not
// allocate once the sizes have been seen.
func (w *DFWork) SelectLags(y []float64, det Trend, rule LagRule, kmax int) (int, error) {
	if kmax < 0 {
		return 0, fmt.Errorf("%w: negative maximum lag %d", ErrSettings, kmax)
	}
	switch rule {
	case LagAIC, LagBIC, LagMAIC, LagTSig:
	default:
		return 0, fmt.Errorf("%w: lag rule %v is not a selection rule", ErrSettings, rule)
	}
	// The sample is validated (length, finiteness, constant or exactly
	// fitted series) with the same errors as Regress at kmax. That QR fit
	// holds a T x (kmax+3) design (2 GB at T = 1e6), so it is made only
	// when cheap O(T) checks cannot vouch for the sample: a short or
	// non-finite sample, differences or levels whose squares overflow, the
	// MAIC criterion on a detrended copy, or a fast-path fit at kmax so close
	// to exact that only the QR fit can tell.
	validated := false
	if !w.plainSample(y, det, kmax) || (rule == LagMAIC && det != TrendNone) {
		if _, err := w.Regress(y, det, kmax, kmax+2); err != nil {
			return 0, err
		}
		validated = true
	}
	if k, ok := w.selectLagsFast(y, det, rule, kmax); ok {
		if w.nearExact && !validated {
			if _, err := w.Regress(y, det, kmax, kmax+2); err != nil {
				return 0, err
			}
		}
		return k, nil
	}
	return w.selectLagsQR(y, det, rule, kmax)
}

// plainSample reports whether the Dickey-Fuller sample t = kmax+2..T of y
// passes the checks of Regress at kmax that need no fit: more observations
// than regressors, finite values, finite sums of squares of the levels and
// differences, and differences that are not all zero.
func (w *DFWork) plainSample(y []float64, det Trend, kmax int) bool {
	T := len(y)
	n := T - kmax - 1
	if n <= 1+kmax+det.NumDet() {
		return false
	}
	tss, lss := 0.0, 0.0
	for i, v := range y {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return false
		}
		lss += v * v
		if i >= kmax+1 {
			d := v - y[i-1]
			tss += d * d
		}
	}
	return tss > 0 && !math.IsInf(tss, 0) && !math.IsInf(lss, 0)
}

// lagColumnsLive reports whether the lagged-difference block of the
// cross-products in xx (row stride stride, lags 1..k, over the sample
// t = start..T) can be trusted. crossLagged forms it by adding and
// removing end terms, the differences before the sample among them, so
//   - a pre-sample difference much larger than the sample's (an outlier
//     among the first observations) leaves its square's rounding in every
//     entry: declined when its square exceeds preSampleShare of Σ Δz_t²;
//   - a column of exact zeros (a run of equal values) comes out as rounding
//     noise, which the Jacobi scaling of Normal would turn into a
//     regressor: declined when a column's sum of squares is below
//     deadColumn of Σ Δz_t².
//
// Such designs go to the QR fit, which sees the columns as they are.
func (w *DFWork) lagColumnsLive(xx []float64, stride, k, start int, yy float64) bool {
	for s := max(start-k, 2); s < start; s++ {
		if d := w.dz[s-1]; !(d*d <= preSampleShare*yy) {
			return false
		}
	}
	for i := 1; i <= k; i++ {
		if !(xx[i*stride+i] > deadColumn*yy) {
			return false
		}
	}
	return true
}

// preSampleShare bounds the square of a difference before the sample
// relative to Σ Δz_t² over it (lagColumnsLive): the cross-products then
// keep about ten digits (common practice, no source; found by
// FuzzTStatFast, a spike 65,000 times the series' level before the sample).
const preSampleShare = 1e6

// deadColumn: a lagged-difference column whose sum of squares is below
// this share of Σ Δz_t² comes from adding and removing terms up to that
// much larger than itself (a burst just outside the column's window, or a
// run of equal values), so it carries few correct digits; such a design
// goes to the QR fit (common practice, no source; found by FuzzTStatFast).
// Data reach it only with a burst a thousand times the other changes at
// the sample's ends.
const deadColumn = 1e-8

// gather sets w.nm to the normal equations of the regressors idx (columns
// of a design whose X'X lower triangle is xx, row stride stride, and X'y is
// xy) in the order given, with y'y = yy over n observations, and returns
// it. Every entry Solve and NestedSSR read is set.
func (w *DFWork) gather(xx, xy []float64, stride int, idx []int, yy float64, n int) *Normal {
	p := len(idx)
	nm := &w.nm
	nm.Size(p)
	for i, a := range idx {
		nm.B[i] = xy[a]
		for j := 0; j <= i; j++ {
			b := idx[j]
			if a >= b {
				nm.A[i*p+j] = xx[a*stride+b]
			} else {
				nm.A[i*p+j] = xx[b*stride+a]
			}
		}
	}
	nm.YY, nm.N = yy, n
	return nm
}

// selectNested is the AIC/BIC part of selectLagsFast: with the columns in
// the order [deterministic terms, y_{t-1}, Δy_{t-1}, ..., Δy_{t-kmax}] the
// design at k lags is a leading block of the design at kmax, so one
// Cholesky factorisation gives every order's SSR (Normal.NestedSSR)
// instead of one factorisation per order. The criteria are those of the
// loop in selectLagsFast.
func (w *DFWork) selectNested(xx, xy []float64, yy float64, m, kmax, nd, n int, rule LagRule, logScale float64) (int, bool) {
	return w.selectNestedIn(xx, xy, yy, m, m, kmax, nd, n, rule, logScale)
}

// selectNestedIn is selectNested reading X'X with row stride stride >= m:
// the cross-products of a design with more deterministic columns (the
// trend after the constant), of which this design's columns are a subset
// (ADFPair).
func (w *DFWork) selectNestedIn(xx, xy []float64, yy float64, stride, m, kmax, nd, n int, rule LagRule, logScale float64) (int, bool) {
	if !w.lagColumnsLive(xx, stride, kmax, kmax+2, yy) {
		return 0, false
	}
	if cap(w.idx) < m {
		w.idx = make([]int, m)
	}
	idx := w.idx[:m]
	for i := 0; i < nd; i++ {
		idx[i] = kmax + 1 + i
	}
	for i := 0; i <= kmax; i++ {
		idx[nd+i] = i
	}
	nm := w.gather(xx, xy, stride, idx, yy, n)
	w.ssrs = grow(w.ssrs, m)
	if err := nm.NestedSSR(w.ssrs); err != nil {
		return 0, false
	}
	N := float64(n)
	c := 2.0
	if rule == LagBIC {
		c = math.Log(N)
	}
	best, bestK := math.Inf(1), 0
	for kk := 0; kk <= kmax; kk++ {
		ssr := w.ssrs[nd+kk]
		if !(ssr > 0) {
			return 0, false
		}
		if kk == kmax && !(ssr > 1e-10*yy) {
			w.nearExact = true
		}
		v := math.Log(ssr/N) + logScale + c*float64(kk)/N
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return 0, false
		}
		w.crit[kk] = v
		if v < best {
			best, bestK = v, kk
		}
	}
	return bestK, true
}

// scaleInto puts src, scaled to unit root mean square (and centred when
// the design has nd > 0 deterministic terms), into w.z, its differences
// into w.dz, and returns the scale; ok is false when the scale is zero or
// not finite, or, with a constant, below collinearLevel of the mean.
func (w *DFWork) scaleInto(src []float64, nd int) (scale float64, ok bool) {
	T := len(src)
	w.z = grow(w.z, T)
	mean := 0.0
	if nd > 0 {
		for _, v := range src {
			mean += v
		}
		mean /= float64(T)
	}
	ss := 0.0
	for _, v := range src {
		ss += (v - mean) * (v - mean)
	}
	scale = math.Sqrt(ss / float64(T))
	if !(scale > 0) || math.IsInf(scale, 0) {
		return 0, false
	}
	// A level that varies only in its last digits is, to the QR fit of the
	// raw columns, the constant column again (ErrSingular); centring would
	// hide that, so such a series is left to the QR fit.
	if nd > 0 && !(scale > collinearLevel*math.Abs(mean)) {
		return 0, false
	}
	inv := 1 / scale
	for i, v := range src {
		w.z[i] = (v - mean) * inv
	}
	// The differences from src itself: differencing z would lose the digits
	// of a series far from its mean relative to its changes (a design
	// without a constant is not centred), which the QR fit keeps.
	w.dz = grow(w.dz, T)
	w.dz[0] = 0
	for i := 1; i < T; i++ {
		w.dz[i] = (src[i] - src[i-1]) * inv
	}
	return scale, true
}

// minPivot bounds the Jacobi-scaled Cholesky pivots that TStatFast accepts:
// a pivot is 1 - R² of a column on the columns before it, and the t-ratio
// from the normal equations carries a relative error of about the unit
// roundoff over the smallest pivot, so 1e-6 keeps it near 1e-10 (common
// practice, no source: the usual loss of digits of the normal equations).
const minPivot = 1e-6

// collinearLevel: scaleInto declines a series whose standard deviation is
// below this share of its mean. To the QR fit of the uncentred columns
// such a level is nearly the constant column again: it loses about
// log10(mean/sd) digits and, below 1e-10, judges the design singular.
// Centring would hide that, so the cross-product paths leave such series
// to the QR fit and both give the same answer (common practice, no
// source; found by FuzzTStatFast).
const collinearLevel = 1e-6

// fastAccuracy bounds the product of the share of Δz'Δz left in the
// residuals and the smallest pivot that TStatFast accepts (see tSolve): at
// 1e-6 the t-ratio from the normal equations keeps about nine digits
// (common practice, no source; FuzzTStatFast found a fit with t = -75,675
// at a share of 3.5e-10 and one with t = -2,408 and a small pivot that
// differed from QR in the sixth digit). Fits of data are far from it: a
// t-ratio of -5 leaves most of Δz'Δz in the residuals.
const fastAccuracy = 1e-6

// TStatFast returns the Dickey-Fuller t-ratio of the regression with k
// lags on its own sample t = k+2..T, as Regress(y, det, k, 0).TStat, from
// the cross-products of the scaled (and, with a constant, centred) series
// instead of a QR fit: the regressors are ordered [deterministic terms,
// lagged differences, y_{t-1}] so that the last step of one Cholesky
// factorisation gives it, t = z_p / σ with z = L⁻¹Db the forward
// substitution and σ² = SSR/(n - p). ok is false, and the caller must fit
// by QR, when the sample is too short, not finite, constant in its
// differences, nearly exactly fitted or nearly collinear (a pivot below
// minPivot): the cases where only the QR fit can answer, with its errors.
// The statistic is invariant to the scaling, so it agrees with the QR fit
// up to rounding (tests: lags_fast_test.go). It does not allocate once the
// sizes have been seen.
func (w *DFWork) TStatFast(y []float64, det Trend, k int) (t float64, ok bool) {
	nd := det.NumDet()
	if k < 0 || len(y)-k-1 <= 1+k+nd {
		return 0, false
	}
	if _, ok := w.scaleInto(y, nd); !ok {
		return 0, false
	}
	yy, n, ok := w.crossAt(len(y), k, nd)
	if !ok {
		return 0, false
	}
	return w.tSolve(1+k+nd, k, nd, yy, n)
}

// crossAt fills w.xx, w.xy with the cross-products of the k-lag design with
// nd deterministic terms on its own sample t = k+2..T from the scaled
// series in w.z, and returns Σ Δz_t² and the number of observations.
func (w *DFWork) crossAt(T, k, nd int) (yy float64, n int, ok bool) {
	start := k + 2
	n = T - start + 1
	m := 1 + k + nd
	tbar := float64(start+T) / 2
	tsd := math.Sqrt((float64(n)*float64(n) - 1) / 12)
	if tsd == 0 {
		tsd = 1
	}
	w.xx = grow(w.xx, m*m)
	w.xy = grow(w.xy, m)
	yy = w.crossLagged(w.z, T, k, nd, start, tbar, tsd)
	return yy, n, yy > 0 && !math.IsInf(yy, 0)
}

// tSolve returns the t-ratio of y_{t-1} in the k-lag design with nd
// deterministic terms from the cross-products in w.xx (row stride stride,
// a design with at least nd deterministic columns after the lags) and
// w.xy: the regressors in the order [deterministic terms, lagged
// differences, y_{t-1}], one Cholesky factorisation, t = z_p / σ. See
// TStatFast for when ok is false.
func (w *DFWork) tSolve(stride, k, nd int, yy float64, n int) (t float64, ok bool) {
	p := 1 + k + nd
	if cap(w.idx) < p {
		w.idx = make([]int, p)
	}
	idx := w.idx[:p]
	for i := 0; i < nd; i++ {
		idx[i] = k + 1 + i
	}
	for i := 1; i <= k; i++ {
		idx[nd+i-1] = i
	}
	idx[p-1] = 0
	if !w.lagColumnsLive(w.xx, stride, k, k+2, yy) {
		return 0, false
	}
	nm := w.gather(w.xx, w.xy, stride, idx, yy, n)
	ssr, err := nm.Solve()
	if err != nil {
		return 0, false
	}
	// The t-ratio's relative error is about the unit roundoff times
	// YY/SSR (SSR = YY - z'z loses those digits to the subtraction) times
	// the design's conditioning, 1/(smallest pivot), times the lag block's
	// own loss (below): accept only while that product stays below
	// 1/fastAccuracy, else only the QR fit is accurate enough (an almost
	// exact fit, |t| in the thousands, nearly collinear columns, a burst
	// at the sample's ends).
	piv := math.Inf(1)
	for j := 0; j < p; j++ {
		l := nm.l[j*p+j]
		piv = min(piv, l*l)
	}
	// The lag block's entries carry rounding of about the unit roundoff
	// times Σ Δz_t² (crossLagged's end-term updates): relative to the
	// smallest lag column that is the share below.
	share := 1.0
	for i := 1; i <= k; i++ {
		share = min(share, w.xx[i*stride+i]/yy)
	}
	if !(piv >= minPivot) || !(ssr*piv*share > fastAccuracy*yy) {
		return 0, false
	}
	t = nm.z[p-1] / math.Sqrt(ssr/float64(n-p))
	if math.IsNaN(t) || math.IsInf(t, 0) {
		return 0, false
	}
	return t, true
}

// crossLagged fills w.xx (lower triangle) and w.xy with the cross-products
// of the Dickey-Fuller design at kmax lags over t = start..T, columns
// [z_{t-1}, Δz_{t-1}, ..., Δz_{t-kmax}, (1), (trend)], against Δz_t, and
// returns Σ Δz_t². The lagged-difference block is Toeplitz up to its ends:
// G(i,j) = Σ_t Δz_{t-i} Δz_{t-j} equals G(i-1,j-1) plus the product that
// enters at the start and minus the one that leaves at the end, so only
// the lag products against Δz_t are summed (O(n·kmax) instead of
// O(n·kmax²)), and G(i,1) follows from the product at lag i-1 the same
// way. The sums of the lagged differences telescope (Σ_t Δz_{t-i} =
// z_{T-i} - z_{start-1-i}), so one pass per lag accumulates three products
// over the differences, which it reads from w.dz (scaleInto computes them
// from the series itself). crossRowSweep, the row-by-row sweep, is its
// brute-force twin in the tests.
func (w *DFWork) crossLagged(z []float64, T, kmax, nd, start int, tbar, tsd float64) float64 {
	m := 1 + kmax + nd
	xx, xy := w.xx[:m*m], w.xy[:m]
	for i := range xx {
		xx[i] = 0
	}
	for i := range xy {
		xy[i] = 0
	}
	// w.dz[j] = Δz at 0-based j (dz[0] unused), as scaleInto leaves it: Δz
	// at 1-based time s is dz[s-1].
	dz := w.dz[:T]
	D := func(s int) float64 { return dz[s-1] }
	c, tr := kmax+1, kmax+2
	n := T - start + 1
	// Rows t = start..T: Δz_t = dt[r], z_{t-2} = lev[r] (r = t - start).
	dt := dz[start-1 : T]
	lev := z[start-2 : T-1]
	var yy, sl, ll, sd, sum float64
	for r, d := range dt {
		v := lev[r]
		yy += d * d
		sl += v * d
		ll += v * v
		sum += v
		sd += d
	}
	xy[0], xx[0] = sl, ll
	if nd >= 1 {
		xy[c] = sd
		xx[c*m] = sum
		xx[c*m+c] = float64(n)
	}
	if nd == 2 {
		var std, stl, stt, st float64
		inv := 1 / tsd
		for r, d := range dt {
			tau := (float64(start+r) - tbar) * inv
			std += tau * d
			stl += tau * lev[r]
			st += tau
			stt += tau * tau
		}
		xy[tr], xx[tr*m], xx[tr*m+c], xx[tr*m+tr] = std, stl, st, stt
	}
	prev := yy // Σ_t Δz_{t-(i-1)} Δz_t at i-1
	for i := 1; i <= kmax; i++ {
		a := dz[start-1-i : T-i] // Δz_{t-i}
		a = a[:len(dt)]
		var sy, s0, st float64
		for r, v := range a {
			sy += v * dt[r]
			s0 += v * lev[r]
			st += v * float64(r)
		}
		xy[i] = sy
		xx[i*m] = s0
		// G(i,1) = Σ_t Δz_{t-i} Δz_{t-1}: the lag-(i-1) product over
		// t-1 = start-1..T-1.
		xx[i*m+1] = prev + D(start-i)*D(start-1) - D(T-i+1)*D(T)
		prev = sy
		sc := z[T-1-i] - z[start-2-i]
		if nd >= 1 {
			xx[c*m+i] = sc
		}
		if nd == 2 {
			// Σ_t τ_t Δz_{t-i} with t = start + r.
			xx[tr*m+i] = (st + (float64(start)-tbar)*sc) / tsd
		}
	}
	for j := 2; j <= kmax; j++ {
		for i := j; i <= kmax; i++ {
			xx[i*m+j] = xx[(i-1)*m+j-1] + D(start-i)*D(start-j) - D(T-i+1)*D(T-j+1)
		}
	}
	return yy
}

// crossRowSweep is the brute-force twin of crossLagged: the same
// cross-products summed row by row of the design.
func (w *DFWork) crossRowSweep(z []float64, T, kmax, nd, start int, tbar, tsd float64) float64 {
	m := 1 + kmax + nd
	w.xr = grow(w.xr, m)
	xx, xy, xr := w.xx[:m*m], w.xy[:m], w.xr
	for i := range xx {
		xx[i] = 0
	}
	for i := range xy {
		xy[i] = 0
	}
	yy := 0.0
	for t := start; t <= T; t++ {
		d := z[t-1] - z[t-2]
		xr[0] = z[t-2]
		for i := 1; i <= kmax; i++ {
			xr[i] = z[t-1-i] - z[t-2-i]
		}
		if nd >= 1 {
			xr[kmax+1] = 1
		}
		if nd == 2 {
			xr[kmax+2] = (float64(t) - tbar) / tsd
		}
		yy += d * d
		for i := range m {
			v := xr[i]
			xy[i] += v * d
			row := xx[i*m : i*m+i+1]
			for j := range row {
				row[j] += v * xr[j]
			}
		}
	}
	return yy
}

// selectLagsFast is the cross-product path of SelectLags; ok is false when
// the normal equations are numerically singular.
func (w *DFWork) selectLagsFast(y []float64, det Trend, rule LagRule, kmax int) (k int, ok bool) {
	src := y
	if rule == LagMAIC && det != TrendNone {
		w.tr = Detrend(w.tr, y, det)
		src, det = w.tr, TrendNone
	}
	T := len(src)
	nd := det.NumDet()
	m := 1 + kmax + nd
	start := kmax + 2
	n := T - start + 1
	scale, ok := w.scaleInto(src, nd)
	if !ok {
		return 0, false
	}
	z := w.z
	// Centred, scaled trend over the sample rows.
	tbar := float64(start+T) / 2
	tsd := math.Sqrt((float64(n)*float64(n) - 1) / 12)
	if tsd == 0 {
		tsd = 1
	}
	w.xx = grow(w.xx, m*m)
	w.xy = grow(w.xy, m)
	yy := w.crossLagged(z, T, kmax, nd, start, tbar, tsd)
	xx, xy := w.xx, w.xy
	if cap(w.idx) < m {
		w.idx = make([]int, m)
	}
	w.crit = grow(w.crit, kmax+1)
	w.nearExact = false
	N := float64(n)
	logScale := 2 * math.Log(scale)
	best, bestK := math.Inf(1), 0
	if rule == LagAIC || rule == LagBIC {
		return w.selectNested(xx, xy, yy, m, kmax, nd, n, rule, logScale)
	}
	if !w.lagColumnsLive(xx, m, kmax, start, yy) {
		return 0, false
	}
	for kk := 0; kk <= kmax; kk++ {
		p := 1 + kk + nd
		idx := w.idx[:p]
		for i := 0; i <= kk; i++ {
			idx[i] = i
		}
		for i := 0; i < nd; i++ {
			idx[kk+1+i] = kmax + 1 + i
		}
		nm := w.gather(xx, xy, m, idx, yy, n)
		ssr, err := nm.Solve()
		if err != nil || !(ssr > 0) {
			return 0, false
		}
		if kk == kmax && !(ssr > 1e-10*yy) {
			w.nearExact = true
		}
		var v float64
		switch rule {
		case LagAIC, LagBIC:
			c := 2.0
			if rule == LagBIC {
				c = math.Log(N)
			}
			v = math.Log(ssr/N) + logScale + c*float64(kk)/N
		case LagMAIC:
			s2 := ssr / N
			rho := nm.Coef[0]
			tau := rho * rho * xx[0] / s2
			v = math.Log(s2) + logScale + 2*(tau+float64(kk))/N
		case LagTSig:
			// |t| of the last lag; the rule keeps the largest significant k.
			if kk == 0 {
				v = 0
			} else {
				se := math.Sqrt(ssr / float64(n-p) * nm.InvDiag(kk))
				v = math.Abs(nm.Coef[kk] / se)
			}
		}
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return 0, false
		}
		w.crit[kk] = v
		if rule != LagTSig && v < best {
			best, bestK = v, kk
		}
	}
	if rule == LagTSig {
		for kk := kmax; kk > 0; kk-- {
			if w.crit[kk] >= 1.645 {
				return kk, true
			}
		}
		return 0, true
	}
	return bestK, true
}

// selectLagsQR is SelectLags by a full Householder QR fit per order: the
// brute-force twin of the cross-product path and its fallback. It records
// the criteria in w.crit like the fast path (TSig: |t| of the last lag, 0
// for k = 0; only orders visited are set).
func (w *DFWork) selectLagsQR(y []float64, det Trend, rule LagRule, kmax int) (int, error) {
	if kmax < 0 {
		return 0, fmt.Errorf("%w: negative maximum lag %d", ErrSettings, kmax)
	}
	start := kmax + 2
	w.crit = grow(w.crit, kmax+1)
	// Fit kmax first so the storage has its largest size (no reallocation).
	if _, err := w.Regress(y, det, kmax, start); err != nil {
		return 0, err
	}
	switch rule {
	case LagAIC, LagBIC:
		best, bestK := math.Inf(1), 0
		for k := 0; k <= kmax; k++ {
			f, err := w.Regress(y, det, k, start)
			if err != nil {
				return 0, err
			}
			N := float64(f.NObs)
			c := 2.0
			if rule == LagBIC {
				c = math.Log(N)
			}
			v := math.Log(f.SSR/N) + c*float64(k)/N
			w.crit[k] = v
			if v < best {
				best, bestK = v, k
			}
		}
		return bestK, nil
	case LagMAIC:
		src := y
		if det != TrendNone {
			w.tr = Detrend(w.tr, y, det)
			src = w.tr
		}
		best, bestK := math.Inf(1), 0
		for k := 0; k <= kmax; k++ {
			f, err := w.Regress(src, TrendNone, k, start)
			if err != nil {
				return 0, err
			}
			N := float64(f.NObs)
			s2 := f.SSR / N
			sy := 0.0
			for _, v := range w.cols[0] {
				sy += v * v
			}
			tau := f.Rho * f.Rho * sy / s2
			v := math.Log(s2) + 2*(tau+float64(k))/N
			w.crit[k] = v
			if v < best {
				best, bestK = v, k
			}
		}
		return bestK, nil
	case LagTSig:
		w.crit[0] = 0
		for k := kmax; k > 0; k-- {
			f, err := w.Regress(y, det, k, start)
			if err != nil {
				return 0, err
			}
			w.crit[k] = math.Abs(f.Fit.TStat(k))
			if w.crit[k] >= 1.645 {
				return k, nil
			}
		}
		// Check the sample is usable at all, so k = 0 is not returned for a bad series.
		if _, err := w.Regress(y, det, 0, start); err != nil {
			return 0, err
		}
		return 0, nil
	}
	return 0, fmt.Errorf("%w: lag rule %v is not a selection rule", ErrSettings, rule)
}

// Detrend returns the OLS residuals of y on the deterministic terms det
// (nothing, a constant, or a constant and t = 1..T) in dst (grown as
// needed). It uses closed forms with the trend centred, so it does not
// allocate when dst has room.
func Detrend(dst, y []float64, det Trend) []float64 {
	n := len(y)
	dst = grow(dst, n)
	switch det {
	case TrendNone:
		copy(dst, y)
		return dst
	}
	mean := sumInOrder(y)
	if n > 0 {
		mean /= float64(n)
	}
	if det == TrendLinear && n > 1 {
		tbar := float64(n+1) / 2
		sxy, sxx := 0.0, 0.0
		for i, v := range y {
			d := float64(i+1) - tbar
			sxy += d * (v - mean)
			sxx += d * d
		}
		b := sxy / sxx
		for i, v := range y {
			dst[i] = v - mean - b*(float64(i+1)-tbar)
		}
		return dst
	}
	d, x := dst[:n], y[:n]
	for len(d) >= 4 && len(x) >= 4 { // unrolled by four (see DotFrom)
		a, b := (*[4]float64)(d), (*[4]float64)(x)
		a[0], a[1], a[2], a[3] = b[0]-mean, b[1]-mean, b[2]-mean, b[3]-mean
		d, x = d[4:], x[4:]
	}
	x = x[:len(d)]
	for i := range d {
		d[i] = x[i] - mean
	}
	return dst
}

// sumInOrder returns Σ x_i summed in order from i = 0 into one
// accumulator, as the plain loop does (the same sum bit for bit), with the
// loop unrolled by four (see DotFrom).
func sumInOrder(x []float64) float64 {
	s := 0.0
	for len(x) >= 4 {
		a := (*[4]float64)(x)
		s += a[0]
		s += a[1]
		s += a[2]
		s += a[3]
		x = x[4:]
	}
	for _, v := range x {
		s += v
	}
	return s
}
