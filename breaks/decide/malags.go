package decide

// The long-lag branch of the unit-root union (unitroot.go).
//
// A large negative moving-average root in the differences,
//
//	Δy_t = ε_t + θ ε_{t-1},  θ near -1,
//
// nearly cancels the unit root, and Dickey-Fuller type tests whose lag
// order is short reject it far too often (Schwert 1989, Table 5): with
// θ = -0.8 and BIC or per-candidate t-sig lags, the union rejected a random
// walk in about 80% of samples of length 200 (our simulation). MAIC, the
// modified information criterion of Ng & Perron (2001, eq. 9), chooses long
// autoregressions exactly then, and restores much of the size; but it also
// chooses longer lags than needed for a stationary series, which costs
// power against the break-stationary alternatives the union is there for.
//
// The union therefore takes its lags from MAIC only when the differences
// carry the signature of such a root: a first-order autocorrelation of the
// demeaned Δy of at most maCut = -0.4, the value of an MA(1) with θ = -0.5
// (ρ_1 = θ / (1 + θ²); Box & Jenkins 1976, section 3.3). A random walk has
// ρ_1 = 0, a stationary AR(1) with φ = 0.5 seen in differences has
// ρ_1 = (φ - 1)/2 = -0.25; θ = -0.8 gives -0.49. The cut-off is ours
// (common practice, no source); the union's null table is simulated for
// each branch separately (union_table.go), and the whole procedure's error
// rates, branch choice included, are measured (reliability.go).
//
// In the long-lag branch the ADF members use MAIC on the OLS-detrended
// series (Perron & Qu 2007); in the short-lag branch, BIC. In both, the
// Zivot-Andrews members use one lag order for every candidate date, chosen
// (MAIC, or BIC with at most 8 lags) on the series detrended with the level
// and slope break at the date that fits a broken trend best by least
// squares (consistent for the break date whether the noise is I(0) or
// I(1): Bai 1997; Perron & Zhu 2005). One order for all candidates removes
// the lag shopping of a per-candidate rule, whose minimum over dates picks
// the candidate where a short order happened to win, and costs one
// regression per candidate instead of one per candidate and order (the
// bootstrap recomputes the union 99 times).

import (
	"math"
	"slices"

	"github.com/rootshift/rootshift/core"
)

// maCut is the first-order autocorrelation of the demeaned differences at
// or below which the union takes its lags from MAIC.
const maCut = -0.4

// diffAutocorr returns the first-order autocorrelation of the first
// difference of y around its mean (NaN when it cannot be computed).
func diffAutocorr(y []float64) float64 {
	n := len(y) - 1
	if n < 3 {
		return math.NaN()
	}
	m := (y[n] - y[0]) / float64(n)
	var c0, c1, prev float64
	for i := 1; i <= n; i++ {
		d := y[i] - y[i-1] - m
		c0 += d * d
		if i > 1 {
			c1 += d * prev
		}
		prev = d
	}
	if !(c0 > 0) {
		return math.NaN()
	}
	return c1 / c0
}

// longLags reports whether the union on y uses the long-lag branch.
func longLags(y []float64) bool { return diffAutocorr(y) <= maCut }

// trendBreak dates a level and slope break in a linear trend by least
// squares and chooses the MAIC lag order around it. It keeps its scratch
// space; date does not allocate once the length has been seen.
type trendBreak struct {
	z, res []float64
	nrm    core.Normal
	dw     core.DFWork
}

// trendBreakTrim is the trimming of the break date (that of Zivot-Andrews).
const trendBreakTrim = 0.15

// breakRange returns the candidate dates TB = lo..hi (1-based, the last
// observation of the old regime).
func breakRange(T int) (lo, hi int) {
	lo = max(int(math.Ceil(trendBreakTrim*float64(T))), 2)
	hi = min(int(math.Floor((1-trendBreakTrim)*float64(T))), T-2)
	return lo, hi
}

// date returns the TB minimising the sum of squared residuals of
//
//	y_t = a + b t + c DU_t + d DT_t,  DU_t = 1(t > TB), DT_t = (t - TB)1(t > TB),
//
// over breakRange, from cross-products updated per candidate (suffix sums
// of 1, s, s², z and s z with s = t/T and z the standardised series): by
// Frisch-Waugh-Lovell, the fit of [1, s] is fixed and each candidate only
// adds the 2x2 system of DU and DT residualised on it, so the SSR falls by
// c'A⁻¹c with A and c from the sums in closed form. 0 when no candidate can
// be fitted. Its brute-force twin (a core.LS fit per candidate) is in the
// tests.
func (b *trendBreak) date(y []float64) int {
	T := len(y)
	lo, hi := breakRange(T)
	b.z, _, _ = core.Standardize(b.z, y)
	if lo > hi {
		return 0
	}
	z := b.z
	fT := float64(T)
	var Ss, Sss, Sz, Ssz float64
	for i, v := range z {
		s := float64(i+1) / fT
		Ss += s
		Sss += s * s
		Sz += v
		Ssz += s * v
	}
	// G = ([1 s]'[1 s])⁻¹.
	det0 := fT*Sss - Ss*Ss
	if !(det0 > 0) {
		return 0
	}
	g11, g12, g22 := Sss/det0, -Ss/det0, fT/det0
	// quad returns u'Gv for u = (u1, u2), v = (v1, v2).
	quad := func(u1, u2, v1, v2 float64) float64 {
		return u1*(g11*v1+g12*v2) + u2*(g12*v1+g22*v2)
	}
	var N1, S1, S2, Y1, Y2 float64
	best, bestRed := 0, math.Inf(-1)
	for tb := T - 1; tb >= lo; tb-- {
		// Observation t = tb+1 (index tb) joins the new regime.
		s := float64(tb+1) / fT
		N1++
		S1 += s
		S2 += s * s
		Y1 += z[tb]
		Y2 += s * z[tb]
		if tb > hi {
			continue
		}
		tau := float64(tb) / fT
		// X0'DU = (N1, S1), X0'DT = (S1 - τN1, S2 - τS1), X0'z = (Sz, Ssz).
		du1, du2 := N1, S1
		dt1, dt2 := S1-tau*N1, S2-tau*S1
		a11 := N1 - quad(du1, du2, du1, du2)
		a12 := S1 - tau*N1 - quad(du1, du2, dt1, dt2)
		a22 := S2 - 2*tau*S1 + tau*tau*N1 - quad(dt1, dt2, dt1, dt2)
		c1 := Y1 - quad(du1, du2, Sz, Ssz)
		c2 := Y2 - tau*Y1 - quad(dt1, dt2, Sz, Ssz)
		d := a11*a22 - a12*a12
		if !(d > 1e-12*a11*a22) {
			continue
		}
		if red := (a22*c1*c1 - 2*a12*c1*c2 + a11*c2*c2) / d; red >= bestRed {
			best, bestRed = tb, red
		}
	}
	return best
}

// lagAtZ returns the lag order chosen by rule (core.SelectLags) for the series
// detrended by least squares on a constant, a trend and the level and
// slope break at tb (no break when tb <= 0), with Schwert's maximum or kmax
// when smaller (kmax >= 0); 0 when it cannot be computed. The detrending
// runs on the standardised series (the lag criteria do not depend on the
// scale) from its cross-products with s = t/T (core.Normal); its twin, a
// core.LS fit of the series itself, is in the tests.
//
// It reads the standardised series from b.z (date leaves it there). The
// cross-products of [1, s, DU, DT] and z are sums over the whole sample and
// over the new regime, in straight-line loops.
func (b *trendBreak) lagAtZ(tb int, rule core.LagRule, kmax int) int {
	z := b.z
	T := len(z)
	fT := float64(T)
	tau := float64(tb) / fT
	q := 4
	if tb <= 0 || tb >= T {
		// No break: every observation is in the one regime.
		q, tb = 2, T
	}
	var Ss, Sss, Sz, Ssz float64
	var N1, S1, Sd, Ssd, Sdd, Y1, Yd float64
	for i, v := range z[:tb] {
		s := float64(i+1) / fT
		Ss += s
		Sss += s * s
		Sz += v
		Ssz += s * v
	}
	if q == 4 {
		for i, v := range z[tb:] {
			s := float64(tb+i+1) / fT
			d := s - tau
			Ss += s
			Sss += s * s
			Sz += v
			Ssz += s * v
			N1++
			S1 += s
			Sd += d
			Ssd += s * d
			Sdd += d * d
			Y1 += v
			Yd += d * v
		}
	}
	m := &b.nrm
	m.Size(q) // every entry Solve reads is set below
	m.A[0] = fT
	m.A[q] = Ss
	m.A[q+1] = Sss
	m.B[0], m.B[1] = Sz, Ssz
	if q == 4 {
		m.A[8], m.A[9], m.A[10] = N1, S1, N1
		m.A[12], m.A[13], m.A[14], m.A[15] = Sd, Ssd, Sd, Sdd
		m.B[2], m.B[3] = Y1, Yd
	}
	var yy float64
	for _, v := range z {
		yy += v * v
	}
	m.YY, m.N = yy, T
	if _, err := m.Solve(); err != nil {
		return 0
	}
	b.res = slices.Grow(b.res[:0], T)[:T]
	c0, c1 := m.Coef[0], m.Coef[1]
	for i, v := range z[:tb] {
		s := float64(i+1) / fT
		b.res[i] = v - (c0 + c1*s)
	}
	if q == 4 {
		c2, c3 := m.Coef[2], m.Coef[3]
		for i, v := range z[tb:] {
			s := float64(tb+i+1) / fT
			b.res[tb+i] = v - (c0 + c1*s + c2 + c3*(s-tau))
		}
	}
	var c core.Config
	km := c.MaxLagsFor(T, 4)
	if kmax >= 0 {
		km = min(km, kmax)
	}
	k, err := b.dw.SelectLags(b.res, core.TrendNone, rule, km)
	if err != nil {
		return 0
	}
	return k
}

// zaMaxLags is the largest order of the Zivot-Andrews members in the
// short-lag branch: that of Zivot & Andrews (1992) and Perron (1997).
const zaMaxLags = 8

// zaLag returns the one lag order of the Zivot-Andrews members for every
// candidate date: MAIC (Schwert's maximum) in the long-lag branch, BIC (at
// most zaMaxLags) in the short-lag branch, each on the series detrended at
// the least-squares broken-trend date.
func (b *trendBreak) zaLag(y []float64, long bool) int {
	tb := b.date(y) // leaves the standardised series in b.z
	if long {
		return b.lagAtZ(tb, core.LagMAIC, -1)
	}
	return b.lagAtZ(tb, core.LagBIC, zaMaxLags)
}
