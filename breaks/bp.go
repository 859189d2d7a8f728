// Bai & Perron multiple structural change tests ("bp").
//
// Pure structural change model (Bai & Perron 1998, eq. 1 with p = 0):
//
//	y_t = z_t'δ_j + u_t,  t = T_{j-1}+1..T_j,  j = 1..m+1,
//
// with z_t = 1 (core.TrendConstant, q = 1: shifts in the mean) or
// z_t = (1, τ_t) (core.TrendLinear, q = 2: intercept and trend slope both
// change; τ_t = (t - (T+1)/2)/T is the trend t = 1..T centred and scaled,
// which changes neither the fit nor any statistic). T_0 = 0, T_{m+1} = T; the
// break date T_j is the last observation of regime j, and every segment has
// at least h = floor(ε T) observations, ε = core.Config.Trim (default 0.15).
//
// Estimation (Bai & Perron 2003a, section 2). The break dates minimise the
// total sum of squared residuals S_T(T_1..T_m). The segment SSRs SSR(i, j)
// come in O(1) from prefix sums of the standardised series (core.Standardize)
// and of τ_t y_t, with the centred moment Σ(τ - τ̄)² = n(n²-1)/(12T²) of a
// run of n consecutive dates in closed form; the dynamic programme
//
//	S*(m, b) = min_{mh ≤ p ≤ b-h} [S*(m-1, p) + SSR(p+1, b)]
//
// (Bai & Perron 2003a, eq. 5) gives the global minimisers for every
// m = 1..M in O(M T²). The tests check it against an exhaustive search that
// refits every admissible partition with core.LS.
//
// Tests (Bai & Perron 1998, section 5; 2003a, section 4):
//
//   - supF(k) is F_T(λ̂_1..λ̂_k; q) = ((T-(k+1)q)/T) W/(kq), the Wald statistic
//     W = (Rδ̂)'(R V̂ R')^{-1}(Rδ̂) of δ_1 = ... = δ_{k+1} evaluated at the
//     SSR-minimising partition (Bai & Perron 1998, eq. 8 and the discussion
//     after it; 2003a, section 4.1). With homoskedastic, serially uncorrelated
//     errors this is the classical F ((S_0 - S_k)/(kq)) / (S_k/(T-(k+1)q)).
//   - UDmax = max_k supF(k); WDmax = max_k [c(1)/c(k)] supF(k) with c(k) the
//     critical value of supF(k) at the chosen level (Bai & Perron 1998, sec. 7).
//   - supF(l+1|l) = max_i F(τ̂_i) over the l+1 segments of the global l-break
//     partition, τ̂_i the SSR-minimising split of segment i with at least h
//     observations on either side, as every segment of the search (Bai &
//     Perron 1998, eq. 12; 2003a, section 4.3). Bai & Perron (1998,
//     Proposition 9) trim each segment by ε times its own length, giving the
//     limit G_{q,ε}(x)^{l+1} used for the critical values; the minimal length
//     h is at least that trimming, so the test is conservative with respect to
//     them (it avoids spurious splits on a few observations, where the
//     kernel variance is poor).
//
// Covariance V̂ (Bai & Perron 2003a, section 4, "allowing serial correlation
// and heterogeneous variances"): block diagonal over segments,
// V̂_j = (Z_j'Z_j)^{-1} n_j Ω̂_j (Z_j'Z_j)^{-1}, with Ω̂_j a kernel long-run
// variance of v_t = z_t û_t inside segment j. The regressors are
// deterministic, so Ω̂_j = ω̂² Z_j'Z_j/n_j with ω̂² a scalar long-run
// variance of the residuals û_t: segment j's own ω̂_j² for the mean model
// (q = 1: heterogeneous variances allowed), and for the trend model (q = 2)
// ω̂² pooled over the segments, V̂_j = ω̂² (Z_j'Z_j)^{-1}. Exactly:
//
//  1. Prewhitening (Andrews & Monahan 1992): ρ is the least-squares AR(1)
//     coefficient of û_t on û_{t-1} over pairs inside one segment; for
//     q = 2 it is corrected for the p = (k+1)q fitted coefficients,
//     ρ = (ρ̂ + p/n)/(1 - p/n) (derived in fitSegments); clipped to ±0.97
//     (common practice, no source), and e_t = û_t - ρ û_{t-1} (the first
//     date of each segment drops).
//  2. Bandwidth: Andrews (1991, eqs. 6.2-6.4) AR(1) plug-in on e: its AR(1)
//     coefficient r (pairs inside segments), then α(1) = 4r²/((1-r)²(1+r)²)
//     and b = 1.1447 (α(1) n)^{1/3} (Bartlett), or α(2) = 4r²/(1-r)⁴ and
//     b = 1.3221 (α(2) n)^{1/5} (quadratic spectral), n the sample size.
//     core.BandwidthFixed uses core.Config.Bandwidth and skips step 1.
//  3. ω̂*² = Γ̂_0 + 2 Σ_{i≥1} w(i) Γ̂_i from e inside segment j (divisor: its
//     number of e's; pooled: sums over segments over the total number), with
//     the Bartlett weights w(i) = 1 - i/(l+1), l = floor(b) (as
//     core.LongRunVarianceFixed) or the quadratic-spectral weights k(i/b)
//     (core.QSWeight); then ω̂² = ω̂*²/(1 - ρ)².
//
// Earlier versions estimated the 2×2 long-run covariance of (û_t, τ_t û_t)
// segment by segment for q = 2: with a minimal segment of 30 observations
// the sup statistics picked the partitions where it was smallest, and at
// T = 200 UDmax rejected about 16% of i.i.d. null draws at 5% (21% with
// AR(1) errors, ρ = 0.5) and WDmax 29% (39%).
//
// Critical values. For q = 1 they are the simulated asymptotic ones, which
// do not depend on V̂ (see bp_tables_gen.go). The tables for q = 2 are for
// the trend design z_t = (1, t), whose limits differ from the
// stationary-regressor case of Bai & Perron (2003b); those published q = 2
// values (recalled, not confirmed) also seem to be scaled as W/k rather
// than W/(kq), so they are not comparable with ours. For q = 1 the two
// scalings coincide and our values reproduce the recalled table
// (TestBPTableMemory). The trend model converges slowly (the kernel
// variance of residuals of up to 12 fitted coefficients is biased down, by
// more for more breaks), so RunBP uses finite-sample critical values for it:
// the statistics exactly as computed here on T i.i.d. N(0,1) errors,
// simulated for T = 50 .. 1000 and interpolated in 1/T (bpFiniteAt), with
// supF(l+1|l) simulated given l breaks at equally spaced dates and never
// below its asymptotic value. They are exact for the default kernel
// settings with i.i.d. errors and approximate otherwise.
//
// Number of breaks: the sequential procedure as Bai & Perron (2003a, section
// 5.3) recommend it: at least one break when UDmax or WDmax rejects at
// core.Config.Level (supF(1) alone loses power when several breaks offset
// each other), then supF(l+1|l) for l = 1, 2, ... on the global l-break
// partitions until a test does not reject (Bai & Perron 1998, section 8); BIC (Yao 1988) and LWZ (Liu, Wu
// & Zidek 1997) over m = 0..M:
//
//	BIC(m) = ln(S_m/T) + p* ln(T)/T,
//	LWZ(m) = ln(S_m/(T - p*)) + p* (c_0/T) (ln T)^{2+δ_0},  c_0 = 0.299, δ_0 = 0.1,
//
// with p* = (m+1)q + m (Bai & Perron 2003a, section 5.1).
//
// Confidence intervals for the break dates (Bai 1997, Proposition 3; Bai &
// Perron 1998, Proposition 8; 2003a, section 3): with Δ = δ̂_{j+1} - δ̂_j,
// Q_1, Q_2 the second moments of z on both sides and Ω_1, Ω_2 the long-run
// variances above,
//
//	(Δ'Q_1Δ)²/(Δ'Ω_1Δ) (T̂_j - T_j) ⇒ argmax_s Z(s),
//	Z(s) = W_1(-s) - |s|/2 (s ≤ 0),  √φ W_2(s) - ξ s/2 (s > 0),
//
// ξ = Δ'Q_2Δ/Δ'Q_1Δ, φ = Δ'Ω_2Δ/Δ'Ω_1Δ. The distribution function of the
// argmax is given in closed form in bpArgmaxCDF (derived in its comment; it
// reproduces the expression in Bai 1997, Appendix B). The theory assumes
// stationary regressors, so with the trend model (q = 2) no interval is
// reported (the result carries a warning): our checks found the intervals far
// too narrow for a change in the slope of a trend.
//
// References: Bai, J. & Perron, P. (1998), "Estimating and testing linear
// models with multiple structural changes", Econometrica 66(1), 47-78.
// Bai, J. & Perron, P. (2003a), "Computation and analysis of multiple
// structural change models", J. Applied Econometrics 18(1), 1-22.
// Bai, J. & Perron, P. (2003b), "Critical values for multiple structural
// change tests", Econometrics Journal 6(1), 72-78.
// Bai, J. (1997), "Estimation of a change point in multiple regression
// models", Review of Economics and Statistics 79(4), 551-563.
// Yao, Y.-C. (1988), "Estimating the number of change-points via Schwarz'
// criterion", Statistics & Probability Letters 6(3), 181-189.
// Liu, J., Wu, S. & Zidek, J.V. (1997), "On segmented multivariate
// regression", Statistica Sinica 7(2), 497-525.
// Andrews, D.W.K. (1991), Econometrica 59(3), 817-858.
// Andrews, D.W.K. & Monahan, J.C. (1992), Econometrica 60(4), 953-966.
package breaks

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"strings"

	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/schema"
)

const bpID = "bp"

// bpNull is H0 of the bp test in words.
const bpNull = "no structural change"

func init() {
	core.Register(core.Info{
		ID:   bpID,
		Name: "Bai-Perron multiple structural change tests (sup-F, UDmax, WDmax, sequential)",
		Null: bpNull,
		Tail: "right",
		Citation: "Bai & Perron (1998), Econometrica 66, 47-78, eqs. 5-12; Bai & Perron (2003), " +
			"J. Applied Econometrics 18, 1-22; Bai (1997), REStat 79, 551-563 (break-date intervals)",
		Run:      RunBP,
		NewStat:  newBPStat,
		Generate: core.WhiteNoise,
	})
}

// BPTrims are the trimming fractions ε with simulated critical values, and
// BPMaxBreaks the largest number of breaks tabulated for each (the limits of
// Bai & Perron 2003b, Table 1).
var (
	BPTrims     = []float64{0.05, 0.10, 0.15, 0.20, 0.25}
	BPMaxBreaks = []int{5, 5, 5, 3, 2}
)

// bpLevels are the levels of the critical-value tables, in this order.
var bpLevels = [4]float64{0.01, 0.025, 0.05, 0.10}

// bpTable holds simulated asymptotic critical values for one design (q) and
// trimming ε, indexed by bpLevels.
type bpTable struct {
	// T, Reps, SeqReps and Seed document the simulation.
	T, Reps, SeqReps int
	Seed             uint64
	// SupF[k-1] are the critical values of supF(k).
	SupF [][4]float64
	// UDmax and WDmax critical values; WDmax at level α uses the weights
	// c_α(1)/c_α(k).
	UDmax, WDmax [4]float64
	// Seq[l-1] are the critical values of supF(l+1|l).
	Seq [][4]float64
}

// bpKey indexes bpTables: q = 1 (mean) or 2 (intercept and trend), and
// the trimming in percent.
type bpKey struct{ q, trimPct int }

// bpTableFor returns the table for q and trim, or nil.
func bpTableFor(q int, trim float64) *bpTable {
	pct := int(math.Round(trim * 100))
	if math.Abs(trim*100-float64(pct)) > 1e-9 {
		return nil
	}
	return bpTables[bpKey{q, pct}]
}

// bpFiniteAt returns the critical values of the trend model (q = 2) at
// sample size T: linear interpolation in 1/T between the finite-sample
// tables bpFiniteTables (the statistics exactly as computed, pooled HAC
// variance included, on T i.i.d. N(0,1) errors) that bracket T, with the
// asymptotic table asy at 1/T = 0 beyond the largest simulated T. Below the
// smallest simulated T its table is used and a warning returned. desc says
// which tables were used.
//
// Why: the sup statistics of the trend model converge slowly. With a
// minimal segment of 30 observations (T = 200, ε = 0.15) and two
// coefficients per regime, the kernel variance of the residuals is biased
// down (the residuals of k+1 fitted segments are negatively autocorrelated)
// by more with more breaks, and the sup picks the partitions where it is
// smallest: against the asymptotic table UDmax rejected about 8% and WDmax
// 12% of i.i.d. null draws at 5% (T = 200), and more with AR(1) errors.
func bpFiniteAt(trim float64, T int, asy *bpTable) (tab *bpTable, desc, warn string) {
	pct := int(math.Round(trim * 100))
	grid := bpFiniteTables[bpKey{2, pct}]
	if len(grid) == 0 {
		return asy, "", ""
	}
	// Bracketing tables lo, hi and the weight lam of lo (linear in 1/T);
	// hi == asy stands for 1/T = 0.
	lo, hi, lam := grid[0], grid[0], 1.0
	switch {
	case T <= grid[0].T:
		if T < grid[0].T {
			warn = fmt.Sprintf("critical values of the trend model simulated for T >= %d; those of T=%d are used for T=%d", grid[0].T, grid[0].T, T)
		}
		desc = fmt.Sprintf("finite-sample table T=%d", grid[0].T)
	default:
		i := 0
		for i+1 < len(grid) && grid[i+1].T <= T {
			i++
		}
		lo = grid[i]
		x, x1, x2 := 1/float64(T), 1/float64(lo.T), 0.0
		if i+1 < len(grid) {
			hi = grid[i+1]
			x2 = 1 / float64(hi.T)
			desc = fmt.Sprintf("interpolated in 1/T between the finite-sample tables T=%d and T=%d", lo.T, hi.T)
		} else {
			hi = asy
			desc = fmt.Sprintf("interpolated in 1/T between the finite-sample table T=%d and the asymptotic one", lo.T)
		}
		lam = (x - x2) / (x1 - x2)
		if lo.T == T {
			hi, lam = lo, 1
			desc = fmt.Sprintf("finite-sample table T=%d", T)
		}
	}
	mix := func(a, b [4]float64) [4]float64 {
		var r [4]float64
		for l := range r {
			r[l] = lam*a[l] + (1-lam)*b[l]
		}
		return r
	}
	out := &bpTable{T: T, Reps: lo.Reps, Seed: lo.Seed, SeqReps: lo.SeqReps}
	for k := 0; k < min(len(lo.SupF), len(hi.SupF)); k++ {
		out.SupF = append(out.SupF, mix(lo.SupF[k], hi.SupF[k]))
	}
	out.UDmax, out.WDmax = mix(lo.UDmax, hi.UDmax), mix(lo.WDmax, hi.WDmax)
	// supF(l+1|l): the larger of the asymptotic value and the finite-sample
	// one (l breaks at equally spaced dates; -1 where no segment can be
	// split, so the asymptotic value applies).
	for l := 0; l < min(len(lo.Seq), len(hi.Seq), len(asy.Seq)); l++ {
		var r [4]float64
		for i := range r {
			a, b := lo.Seq[l][i], hi.Seq[l][i]
			v := asy.Seq[l][i]
			if a > 0 && b > 0 {
				v = math.Max(v, lam*a+(1-lam)*b)
			}
			r[i] = v
		}
		out.Seq = append(out.Seq, r)
	}
	return out, desc, warn
}

// bpSource describes the critical values of a run.
func bpSource(st *bpSetup) string {
	tab := st.table
	if st.finite != "" {
		return fmt.Sprintf("our simulation of the statistics as computed here (pooled kernel variance) on i.i.d. N(0,1) "+
			"errors at finite T, %s (%d replications per table, seed %d; see bp_tables_gen.go); the trend model "+
			"converges too slowly for the asymptotic values", st.finite, tab.Reps, tab.Seed)
	}
	return fmt.Sprintf("our simulation of the asymptotic distributions (Bai & Perron 1998, 2003b design: "+
		"partial sums of N(0,1), T=%d, %d replications, seed %d; sequential tests from %d draws of supF(1) "+
		"using the limit G(x)^(l+1), Bai & Perron 1998, Proposition 9)", tab.T, tab.Reps, tab.Seed, tab.SeqReps)
}

// bpMaxFor returns the tabulated maximum number of breaks for trim, 0 when
// trim is not tabulated.
func bpMaxFor(trim float64) int {
	for i, e := range BPTrims {
		if math.Abs(e-trim) < 1e-9 {
			return BPMaxBreaks[i]
		}
	}
	return 0
}

// bpLevelIndex returns the index of p in bpLevels, or -1.
func bpLevelIndex(p float64) int {
	for i, l := range bpLevels {
		if math.Abs(l-p) < 1e-12 {
			return i
		}
	}
	return -1
}

// bpWork computes segment SSRs, the dynamic programme and the test
// statistics for one series, reusing its storage. It is not safe for
// concurrent use.
type bpWork struct {
	T, q int
	ys   []float64
	// Prefix sums over t = 1..i at index i: y, y², τy.
	py, pyy, psy []float64
	// Per segment length n: 1/n and T²·12/(n(n²-1)) = 1/Σ(τ-τ̄)²; taus[i]
	// is τ_{i+1}. They depend on T only and are kept while T is tabT
	// (replications of one simulation share them).
	invn, invss []float64
	taus        []float64
	tabT        int
	// Dynamic programme: opt[m][b] is the minimal SSR of observations 1..b
	// with m breaks, arg[m][b] the last break of that partition; dp fills
	// only the cells a partition of 1..T can pass through (b = T, and
	// b <= T-h below the top level), the others are +Inf and -1.
	opt [][]float64
	arg [][]int32
	h   int
	// Scratch for the Wald statistics.
	res  []float64
	e    []float64
	segs []bpSeg
	mat  []float64
	vec  []float64
	// homosk replaces the HAC estimate by the common variance S/T (tests only).
	homosk bool
	kernel core.Kernel
	rule   core.BandwidthRule
	bwFix  float64
	lastBW float64
}

// bpSeg is one fitted regime.
type bpSeg struct {
	lo, hi int // observations lo+1..hi
	d      [2]float64
	zz     [2][2]float64
	om     [2][2]float64
	cov    [2][2]float64
}

// load standardises y and fills the prefix sums; q is 1 or 2.
func (w *bpWork) load(y []float64, q int) {
	T := len(y)
	w.T, w.q = T, q
	w.ys, _, _ = core.Standardize(w.ys, y)
	w.py = bpGrow(w.py, T+1)
	w.pyy = bpGrow(w.pyy, T+1)
	w.psy = bpGrow(w.psy, T+1)
	w.tables(T)
	var sy, syy, ssy float64
	ys, taus, py, pyy, psy := w.ys[:T], w.taus[:T], w.py[1:T+1], w.pyy[1:T+1], w.psy[1:T+1]
	for i, v := range ys {
		tau := taus[i] // (float64(i+1) - 0.5*float64(T+1)) / float64(T)
		sy += v
		syy += v * v
		ssy += tau * v
		py[i], pyy[i], psy[i] = sy, syy, ssy
	}
}

// tables fills invn, invss and taus for length T unless they are already
// those of T.
func (w *bpWork) tables(T int) {
	if w.tabT == T && len(w.invn) == T+1 && len(w.invss) == T+1 && len(w.taus) == T {
		return
	}
	Tf := float64(T)
	w.invn = bpGrow(w.invn, T+1)
	w.invss = bpGrow(w.invss, T+1)
	w.taus = bpGrow(w.taus, T)
	w.invn[0], w.invss[0] = 0, 0
	for n := 1; n <= T; n++ {
		nf := float64(n)
		w.invn[n] = 1 / nf
		if n > 1 {
			w.invss[n] = 12 * Tf * Tf / (nf * (nf*nf - 1))
		} else {
			w.invss[n] = 0
		}
	}
	for i := range w.taus {
		w.taus[i] = (float64(i+1) - 0.5*float64(T+1)) / Tf
	}
	w.tabT = T
}

// ssr is the SSR of regressing observations a+1..b on z_t (O(1)).
func (w *bpWork) ssr(a, b int) float64 {
	n := b - a
	sy := w.py[b] - w.py[a]
	r := (w.pyy[b] - w.pyy[a]) - sy*sy*w.invn[n]
	if w.q == 2 {
		ms := (0.5*float64(a+1+b) - 0.5*float64(w.T+1)) / float64(w.T)
		sc := (w.psy[b] - w.psy[a]) - ms*sy
		r -= sc * sc * w.invss[n]
	}
	if r < 0 {
		r = 0
	}
	return r
}

// segFit returns the coefficients (intercept, slope on τ) of observations
// a+1..b; the slope is 0 when q = 1.
func (w *bpWork) segFit(a, b int) (c0, c1 float64) {
	n := b - a
	sy := w.py[b] - w.py[a]
	my := sy * w.invn[n]
	if w.q == 1 {
		return my, 0
	}
	ms := (0.5*float64(a+1+b) - 0.5*float64(w.T+1)) / float64(w.T)
	sc := (w.psy[b] - w.psy[a]) - ms*sy
	c1 = sc * w.invss[n]
	return my - c1*ms, c1
}

// dp runs the dynamic programme for up to M breaks with minimal segment h.
// It returns the largest m for which a partition exists (≤ M).
func (w *bpWork) dp(h, M int) int {
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
	// Only the cells that the statistics read are computed: opt[m][T]
	// (the minimal SSR with m breaks, where every backtrack starts), and
	// opt[m][b] for b <= T-h, the possible last breaks of level m+1. The
	// cells T-h < b < T, and every b < T at the top level, stay +Inf with
	// last break -1: no partition of 1..T passes through them.
	for m := 1; m <= M; m++ {
		prev, cur, arg := w.opt[m-1], w.opt[m], w.arg[m]
		for b := range cur {
			cur[b] = math.Inf(1)
			arg[b] = -1
		}
		hi := T - h
		if m == M {
			hi = (m+1)*h - 1
		}
		for b := (m + 1) * h; b <= T; b++ {
			if b > hi && b < T {
				continue
			}
			var best float64
			var bi int
			if w.q == 2 {
				best, bi = w.dpMinTrend(prev, m*h, b-h, b)
			} else {
				best, bi = w.dpMinMean(prev, m*h, b-h, b)
			}
			cur[b], arg[b] = best, int32(bi)
		}
	}
	return M
}

// dpMinMean and dpMinTrend return the minimum over p = lo..hi of
// prev[p] + SSR(p, b) and the first p attaining it (-1 when none is below
// +Inf): the inner loop of the dynamic programme, for the mean-shift model
// (q = 1) and the trend model (q = 2). They are written for WebAssembly,
// where Go compiles every taken branch to a jump through the function's
// block dispatcher and keeps float compare-and-assign as a branch: one loop
// per model (no test of q per candidate), two candidates per pass (half
// the back edges), the clamp of a negative SSR to zero as a select on the
// float's bits, and the running minimum as an unsigned comparison of the
// bits, which is branch-free. The bits of non-negative floats (+0 up to
// +Inf) order as the floats do, and every candidate is one: prev holds
// sums of clamped SSRs or +Inf, and -0 cannot arise (a difference of equal
// prefix sums is +0); a NaN candidate (bits above +Inf) is never taken,
// as with a float comparison. The arithmetic and the order of the
// comparisons are those of the plain loop, so the results are the same bit
// for bit (TestBPDPMatchesReference).
func (w *bpWork) dpMinMean(prev []float64, lo, hi, b int) (float64, int) {
	n := hi - lo + 1
	if n <= 0 {
		return math.Inf(1), -1
	}
	pyb, pyyb := w.py[b], w.pyy[b]
	py, pyy, pv := w.py[lo:lo+n], w.pyy[lo:lo+n], prev[lo:lo+n]
	// inv[n-1-i] = 1/(b-lo-i), the segment length of candidate lo+i.
	inv := w.invn[b-hi : b-lo+1]
	best, bi := uint64(bpInfBits), -1
	i := 0
	for ; i+1 < len(py) && i+1 < len(pyy) && i+1 < len(pv) && i+1 < len(inv); i += 2 {
		sy0 := pyb - py[i]
		r0 := (pyyb - pyy[i]) - sy0*sy0*inv[len(inv)-1-i]
		sy1 := pyb - py[i+1]
		r1 := (pyyb - pyy[i+1]) - sy1*sy1*inv[len(inv)-2-i]
		v0 := math.Float64bits(pv[i] + bpClamp0(r0))
		v1 := math.Float64bits(pv[i+1] + bpClamp0(r1))
		if v0 < best {
			best, bi = v0, i
		}
		if v1 < best {
			best, bi = v1, i+1
		}
	}
	if i < n {
		sy := pyb - py[i]
		r := (pyyb - pyy[i]) - sy*sy*inv[len(inv)-1-i]
		if v := math.Float64bits(pv[i] + bpClamp0(r)); v < best {
			best, bi = v, i
		}
	}
	if bi >= 0 {
		bi += lo
	}
	return math.Float64frombits(best), bi
}

func (w *bpWork) dpMinTrend(prev []float64, lo, hi, b int) (float64, int) {
	n := hi - lo + 1
	if n <= 0 {
		return math.Inf(1), -1
	}
	pyb, pyyb, psyb := w.py[b], w.pyy[b], w.psy[b]
	py, pyy, psy, pv := w.py[lo:lo+n], w.pyy[lo:lo+n], w.psy[lo:lo+n], prev[lo:lo+n]
	inv, invs := w.invn[b-hi:b-lo+1], w.invss[b-hi:b-lo+1]
	Tf := float64(w.T)
	c := 0.5 * float64(w.T+1)
	best, bi := uint64(bpInfBits), -1
	i := 0
	for ; i+1 < len(py) && i+1 < len(pyy) && i+1 < len(psy) && i+1 < len(pv) && i+1 < len(inv) && len(invs) == len(inv); i += 2 {
		p := lo + i
		j0, j1 := len(inv)-1-i, len(inv)-2-i
		sy0 := pyb - py[i]
		r0 := (pyyb - pyy[i]) - sy0*sy0*inv[j0]
		ms0 := (0.5*float64(p+1+b) - c) / Tf
		sc0 := (psyb - psy[i]) - ms0*sy0
		r0 -= sc0 * sc0 * invs[j0]
		sy1 := pyb - py[i+1]
		r1 := (pyyb - pyy[i+1]) - sy1*sy1*inv[j1]
		ms1 := (0.5*float64(p+2+b) - c) / Tf
		sc1 := (psyb - psy[i+1]) - ms1*sy1
		r1 -= sc1 * sc1 * invs[j1]
		v0 := math.Float64bits(pv[i] + bpClamp0(r0))
		v1 := math.Float64bits(pv[i+1] + bpClamp0(r1))
		if v0 < best {
			best, bi = v0, i
		}
		if v1 < best {
			best, bi = v1, i+1
		}
	}
	if i < n {
		p := lo + i
		j := len(inv) - 1 - i
		sy := pyb - py[i]
		r := (pyyb - pyy[i]) - sy*sy*inv[j]
		ms := (0.5*float64(p+1+b) - c) / Tf
		sc := (psyb - psy[i]) - ms*sy
		r -= sc * sc * invs[j]
		if v := math.Float64bits(pv[i] + bpClamp0(r)); v < best {
			best, bi = v, i
		}
	}
	if bi >= 0 {
		bi += lo
	}
	return math.Float64frombits(best), bi
}

// bpInfBits is the bit pattern of +Inf.
const bpInfBits = 0x7FF0000000000000

// bpClamp0 returns r, or +0 when r < 0 (as if r < 0 { r = 0 }), without a
// float branch.
func bpClamp0(r float64) float64 {
	u := math.Float64bits(r)
	if r < 0 {
		u = 0
	}
	return math.Float64frombits(u)
}

// dates writes the m break dates of the global optimum over 1..T into dst.
func (w *bpWork) dates(dst []int, m int) []int {
	dst = dst[:0]
	for i := 0; i < m; i++ {
		dst = append(dst, 0)
	}
	b := w.T
	for j := m; j >= 1; j-- {
		p := int(w.arg[j][b])
		dst[j-1] = p
		b = p
	}
	return dst
}

// bestSplit returns the SSR-minimising single break in observations
// lo+1..hi with at least minSeg observations on each side, or -1.
func (w *bpWork) bestSplit(lo, hi, minSeg int) (tb int, s float64) {
	tb, s = -1, math.Inf(1)
	for b := lo + minSeg; b <= hi-minSeg; b++ {
		if v := w.ssr(lo, b) + w.ssr(b, hi); v < s {
			tb, s = b, v
		}
	}
	return tb, s
}

// wald returns the F statistic ((n-(k+1)q)/n) W/(kq) for equality of the
// coefficients of the k+1 regimes with boundaries bounds = [lo, T_1, ..., hi]
// (observations lo+1..hi), and fills w.segs. NaN when the covariance is not
// positive definite.
func (w *bpWork) wald(bounds []int) float64 {
	k := len(bounds) - 2
	q := w.q
	lo, hi := bounds[0], bounds[len(bounds)-1]
	n := hi - lo
	w.fitSegments(bounds)
	dim := k * q
	w.mat = bpGrow(w.mat, dim*dim)
	w.vec = bpGrow(w.vec, dim)
	A, r := w.mat, w.vec
	for i := range A {
		A[i] = 0
	}
	for j := 0; j < k; j++ {
		s0, s1 := &w.segs[j], &w.segs[j+1]
		for a := 0; a < q; a++ {
			r[j*q+a] = s1.d[a] - s0.d[a]
			for b := 0; b < q; b++ {
				A[(j*q+a)*dim+j*q+b] = s0.cov[a][b] + s1.cov[a][b]
				if j+1 < k {
					A[(j*q+a)*dim+(j+1)*q+b] = -s1.cov[a][b]
					A[((j+1)*q+b)*dim+j*q+a] = -s1.cov[a][b]
				}
			}
		}
	}
	W, ok := bpQuadInv(A, r, dim)
	if !ok {
		return math.NaN()
	}
	return float64(n-(k+1)*q) / float64(n) * W / float64(dim)
}

// bpQuadInv returns r'A^{-1}r for a symmetric positive definite A (dim×dim,
// row-major, overwritten) by a Jacobi-scaled Cholesky factorisation; ok is
// false when A is not numerically positive definite.
func bpQuadInv(A, r []float64, dim int) (float64, bool) {
	// Jacobi scaling: A_ij / sqrt(A_ii A_jj), r_i / sqrt(A_ii).
	var dbuf [16]float64
	d := dbuf[:0]
	if dim > len(dbuf) {
		d = make([]float64, 0, dim)
	}
	for i := 0; i < dim; i++ {
		a := A[i*dim+i]
		if !(a > 0) || math.IsInf(a, 0) {
			return 0, false
		}
		d = append(d, 1/math.Sqrt(a))
	}
	for i := 0; i < dim; i++ {
		for j := 0; j < dim; j++ {
			A[i*dim+j] *= d[i] * d[j]
		}
	}
	for j := 0; j < dim; j++ {
		s := A[j*dim+j]
		for l := 0; l < j; l++ {
			s -= A[j*dim+l] * A[j*dim+l]
		}
		if s <= 1e-12 {
			return 0, false
		}
		ljj := math.Sqrt(s)
		A[j*dim+j] = ljj
		for i := j + 1; i < dim; i++ {
			s := A[i*dim+j]
			for l := 0; l < j; l++ {
				s -= A[i*dim+l] * A[j*dim+l]
			}
			A[i*dim+j] = s / ljj
		}
	}
	// ‖L^{-1} D r‖².
	var zbuf [16]float64
	z := zbuf[:0]
	if dim > len(zbuf) {
		z = make([]float64, 0, dim)
	}
	out := 0.0
	for i := 0; i < dim; i++ {
		s := r[i] * d[i]
		for l := 0; l < i; l++ {
			s -= A[i*dim+l] * z[l]
		}
		zi := s / A[i*dim+i]
		z = append(z, zi)
		out += zi * zi
	}
	return out, true
}

// fitSegments fits every regime in bounds, computes residual-based long-run
// variances and the coefficient covariances into w.segs.
func (w *bpWork) fitSegments(bounds []int) {
	k1 := len(bounds) - 1
	q := w.q
	if cap(w.segs) < k1 {
		w.segs = make([]bpSeg, k1)
	}
	w.segs = w.segs[:k1]
	T := w.T
	w.res = bpGrow(w.res, T)
	w.e = bpGrow(w.e, T)
	ssrTot := 0.0
	for j := 0; j < k1; j++ {
		s := &w.segs[j]
		s.lo, s.hi = bounds[j], bounds[j+1]
		c0, c1 := w.segFit(s.lo, s.hi)
		s.d = [2]float64{c0, c1}
		// The sums in locals (the same additions in the same order as
		// into s.zz): stores through s in the loop cost a memory round
		// trip per observation, more so under WebAssembly.
		var z00, z01, z11 float64
		ys, res, taus := w.ys[s.lo:s.hi], w.res[s.lo:s.hi], w.taus[s.lo:s.hi]
		for i, y := range ys {
			tau := taus[i] // τ_t, t = s.lo+i+1
			u := y - c0 - c1*tau
			if i < len(res) {
				res[i] = u
			}
			ssrTot += u * u
			z00++
			z01 += tau
			z11 += tau * tau
		}
		s.zz = [2][2]float64{{z00, z01}, {z01, z11}}
	}
	lo, hi := bounds[0], bounds[k1]
	n := hi - lo
	if w.homosk {
		s2 := ssrTot / float64(n)
		for j := range w.segs {
			s := &w.segs[j]
			nj := float64(s.hi - s.lo)
			for a := 0; a < 2; a++ {
				for b := 0; b < 2; b++ {
					s.om[a][b] = s2 * s.zz[a][b] / nj
				}
			}
			w.sandwich(s)
		}
		return
	}
	// The long-run variance is that of the residuals u_t alone: with q = 1
	// v_t = u_t, and with q = 2 the regressors are deterministic, so the
	// long-run covariance of z_t u_t inside segment j is ω² Z_j'Z_j/n_j up to
	// o(1) when u is stationary. The trend model pools ω² over the segments
	// (see the file comment: estimating the 2×2 matrix of (u_t, τ_t u_t)
	// segment by segment made the sup statistics far too large).
	// Step 1: prewhitening coefficient (pairs inside one segment).
	var rho float64
	prewhiten := w.rule != core.BandwidthFixed
	if prewhiten {
		num, den := 0.0, 0.0
		for _, s := range w.segs {
			if s.hi-s.lo >= 2 {
				// Σ û_i û_{i-1} and Σ û²_{i-1}, i = lo+1..hi-1, in order.
				num = core.DotFrom(num, w.res[s.lo+1:s.hi], w.res[s.lo:s.hi-1])
				den = core.DotFrom(den, w.res[s.lo:s.hi-1], w.res[s.lo:s.hi-1])
			}
		}
		if den > 0 {
			rho = num / den
			if q == 2 {
				// Residuals of p = (k+1)q smooth regressors: E Σ û_t û_{t-1}
				// ≈ nγ_1 - pω² and E Σ û²_{t-1} ≈ nγ_0 - pω² (ω² the long-run
				// variance; the projection on smooth regressors keeps the
				// spectrum at frequency 0), so for an AR(1) ρ̂ ≈ (ρ - c g)/(1 - c g),
				// c = p/n, g = (1+ρ)/(1-ρ), which inverts to ρ = (ρ̂ + c)/(1 - c)
				// (our derivation; with many breaks the uncorrected ρ̂ is
				// far too small and the sup statistics too large).
				c := float64(k1*q) / float64(n)
				rho = (rho + c) / (1 - c)
			}
			rho = math.Max(-0.97, math.Min(0.97, rho))
		}
	}
	first := 0
	if prewhiten {
		first = 1
	}
	e := w.e
	for _, s := range w.segs {
		if prewhiten {
			for i := s.lo + 1; i < s.hi; i++ {
				e[i] = w.res[i] - rho*w.res[i-1]
			}
		} else {
			copy(e[s.lo:s.hi], w.res[s.lo:s.hi])
		}
	}
	// Step 2: bandwidth.
	bw := w.bwFix
	if w.rule != core.BandwidthFixed {
		var sxy, sxx, syy float64
		cnt := 0
		for _, s := range w.segs {
			if a := s.lo + first; s.hi-a >= 2 {
				// i = a+1..hi-1, each sum in order.
				sxy = core.DotFrom(sxy, e[a+1:s.hi], e[a:s.hi-1])
				sxx = core.DotFrom(sxx, e[a:s.hi-1], e[a:s.hi-1])
				syy = core.DotFrom(syy, e[a+1:s.hi], e[a+1:s.hi])
				cnt += s.hi - a - 1
			}
		}
		bw = 0
		if sxx > 0 && cnt >= 2 {
			r := math.Max(-0.97, math.Min(0.97, sxy/sxx))
			// With one component the variance s² cancels from α.
			var alpha float64
			if w.kernel == core.KernelQS {
				alpha = 4 * r * r / math.Pow(1-r, 4)
				bw = 1.3221 * math.Pow(alpha*float64(n), 0.2)
			} else {
				alpha = 4 * r * r / (math.Pow(1-r, 2) * (1 + r) * (1 + r))
				bw = 1.1447 * math.Pow(alpha*float64(n), 1.0/3)
			}
		}
		if math.IsNaN(bw) || math.IsInf(bw, 0) {
			bw = 0
		}
		bw = math.Min(bw, float64(n-1))
	}
	if w.kernel == core.KernelBartlett {
		bw = math.Floor(bw)
	}
	w.lastBW = bw
	// Step 3: kernel estimate inside each segment and recolouring.
	var pool, poolN float64
	for j := range w.segs {
		s := &w.segs[j]
		start := s.lo + first
		ne := s.hi - start
		om := 0.0
		if ne > 0 {
			for i := 0; i < ne; i++ {
				var wt float64
				if i == 0 {
					wt = 1
				} else if w.kernel == core.KernelQS {
					if bw <= 0 {
						break
					}
					wt = core.QSWeight(float64(i) / bw)
				} else {
					l := int(bw)
					if i > l {
						break
					}
					wt = 1 - float64(i)/float64(l+1)
				}
				g := core.DotFrom(0, e[start+i:s.hi], e[start:s.hi-i]) // Σ_t e_t e_{t-i} in order
				if i == 0 {
					om += g
				} else {
					om += 2 * wt * g
				}
			}
			pool += om
			poolN += float64(ne)
			om /= float64(ne) * (1 - rho) * (1 - rho)
		}
		s.om = [2][2]float64{{om}}
	}
	if q == 2 && poolN > 0 {
		o := pool / (poolN * (1 - rho) * (1 - rho))
		for j := range w.segs {
			w.segs[j].om[0][0] = o
		}
	}
	for j := range w.segs {
		s := &w.segs[j]
		if q == 2 {
			nj := float64(s.hi - s.lo)
			o := s.om[0][0]
			for a := 0; a < 2; a++ {
				for b := 0; b < 2; b++ {
					s.om[a][b] = o * s.zz[a][b] / nj
				}
			}
		}
		w.sandwich(s)
	}
}

// sandwich sets s.cov = (Z'Z)^{-1} n Ω (Z'Z)^{-1}.
func (w *bpWork) sandwich(s *bpSeg) {
	n := float64(s.hi - s.lo)
	if w.q == 1 {
		s.cov[0][0] = n * s.om[0][0] / (s.zz[0][0] * s.zz[0][0])
		return
	}
	a, b, d := s.zz[0][0], s.zz[0][1], s.zz[1][1]
	det := a*d - b*b
	inv := [2][2]float64{{d / det, -b / det}, {-b / det, a / det}}
	var t [2][2]float64
	for i := 0; i < 2; i++ {
		for j := 0; j < 2; j++ {
			for l := 0; l < 2; l++ {
				t[i][j] += inv[i][l] * s.om[l][j]
			}
		}
	}
	for i := 0; i < 2; i++ {
		for j := 0; j < 2; j++ {
			v := 0.0
			for l := 0; l < 2; l++ {
				v += t[i][l] * inv[l][j]
			}
			s.cov[i][j] = n * v
		}
	}
}

// bpSetup validates y and cfg and resolves q, trim, h and M.
type bpSetup struct {
	q, h, M int
	trim    float64
	table   *bpTable
	finite  string // non-empty: table interpolated from finite-sample tables (q = 2)
	level   int    // index in bpLevels
	warns   []string
}

func bpResolve(T int, cfg *core.Config) (bpSetup, error) {
	var s bpSetup
	switch cfg.Trend {
	case core.TrendConstant:
		s.q = 1
	case core.TrendLinear:
		s.q = 2
	default:
		return s, core.Errorf(bpID, core.ErrSettings, "trend %q: bp needs a constant (mean shifts) or a linear trend (intercept and slope shifts)", cfg.Trend)
	}
	s.trim = cfg.TrimOr()
	s.table = bpTableFor(s.q, s.trim)
	maxTab := bpMaxFor(s.trim)
	if s.table == nil || maxTab == 0 {
		return s, core.Errorf(bpID, core.ErrSettings, "trimming %g has no critical values (simulated only for 0.05, 0.10, 0.15, 0.20, 0.25)", s.trim)
	}
	if s.q == 2 {
		var w string
		s.table, s.finite, w = bpFiniteAt(s.trim, T, s.table)
		if M := len(s.table.SupF); M < maxTab {
			maxTab = M
		}
		if w != "" {
			s.warns = append(s.warns, w)
		}
	}
	s.level = bpLevelIndex(cfg.LevelOr())
	if s.level < 0 {
		return s, core.Errorf(bpID, core.ErrSettings, "level %g has no critical values (tabulated: 0.01, 0.025, 0.05, 0.10)", cfg.LevelOr())
	}
	s.h = int(math.Floor(s.trim*float64(T) + 1e-9))
	minSeg := s.q + 3
	if s.h < minSeg {
		return s, core.Errorf(bpID, core.ErrTooShort, "%d observations give segments of %d (need at least %d; minimum segment is floor(trim*T))", T, s.h, minSeg)
	}
	M := cfg.MaxBreaks
	if M <= 0 {
		M = 5
	}
	if M > maxTab {
		s.warns = append(s.warns, fmt.Sprintf("maximum number of breaks reduced from %d to %d, the largest tabulated for trimming %g", M, maxTab, s.trim))
		M = maxTab
	}
	if fit := T/s.h - 1; M > fit {
		s.warns = append(s.warns, fmt.Sprintf("maximum number of breaks reduced from %d to %d: segments must keep %d observations", M, fit, s.h))
		M = fit
	}
	if M < 1 {
		return s, core.Errorf(bpID, core.ErrTooShort, "%d observations leave no room for a break with trimming %g", T, s.trim)
	}
	s.M = M
	return s, nil
}

// bpCheck validates the data.
func bpCheck(y []float64) error {
	return CheckSeries(bpID, y, 20)
}

// bpStats are the statistics of one run.
type bpStats struct {
	supF  []float64 // supF(k), k = 1..M
	dates [][]int   // dates[k-1]: the global k-break partition
	ssr   []float64 // S_m, m = 0..M
	seq   []float64 // supF(l+1|l), l = 1..M-1 (NaN: no segment can be split)
	udmax float64
	wdmax float64
}

// compute runs the search and every statistic on y.
func (w *bpWork) compute(y []float64, st *bpSetup, withSeq bool) bpStats {
	w.load(y, st.q)
	M := w.dp(st.h, st.M)
	var out bpStats
	out.ssr = make([]float64, M+1)
	for m := 0; m <= M; m++ {
		out.ssr[m] = w.opt[m][w.T]
	}
	bounds := make([]int, 0, M+2)
	out.udmax, out.wdmax = math.NaN(), math.NaN()
	for k := 1; k <= M; k++ {
		d := w.dates(nil, k)
		out.dates = append(out.dates, d)
		bounds = append(bounds[:0], 0)
		bounds = append(bounds, d...)
		bounds = append(bounds, w.T)
		f := w.wald(bounds)
		out.supF = append(out.supF, f)
		if !math.IsNaN(f) {
			if math.IsNaN(out.udmax) || f > out.udmax {
				out.udmax = f
			}
			wf := f * st.table.SupF[0][st.level] / st.table.SupF[k-1][st.level]
			if math.IsNaN(out.wdmax) || wf > out.wdmax {
				out.wdmax = wf
			}
		}
	}
	if withSeq {
		for l := 1; l < M; l++ {
			out.seq = append(out.seq, w.seqStat(out.dates[l-1]))
		}
	}
	return out
}

// seqStat is supF(l+1|l) given the l break dates.
func (w *bpWork) seqStat(dates []int) float64 {
	best := math.NaN()
	prev := 0
	for i := 0; i <= len(dates); i++ {
		hi := w.T
		if i < len(dates) {
			hi = dates[i]
		}
		lo := prev
		prev = hi
		tb, _ := w.bestSplit(lo, hi, max(w.h, w.q+2))
		if tb < 0 {
			continue
		}
		f := w.wald([]int{lo, tb, hi})
		if !math.IsNaN(f) && (math.IsNaN(best) || f > best) {
			best = f
		}
	}
	return best
}

// lwzC0 and lwzD0 are the LWZ constants c_0 = 0.299 and δ_0 = 0.1 (Liu, Wu &
// Zidek 1997, as used by Bai & Perron 2003a, section 5.1).
const (
	lwzC0 = 0.299
	lwzD0 = 0.1
)

// bpCriteria returns the number of breaks chosen by BIC and LWZ.
func bpCriteria(ssr []float64, T, q int) (bic, lwz int) {
	Tf := float64(T)
	bb, bl := math.Inf(1), math.Inf(1)
	for m, s := range ssr {
		if !(s > 0) {
			continue
		}
		p := float64((m+1)*q + m)
		b := math.Log(s/Tf) + p*math.Log(Tf)/Tf
		l := math.Log(s/(Tf-p)) + p*lwzC0/Tf*math.Pow(math.Log(Tf), 2+lwzD0)
		if b < bb {
			bb, bic = b, m
		}
		if l < bl {
			bl, lwz = l, m
		}
	}
	return bic, lwz
}

func bpComponent(name string, stat float64, cv [4]float64, level int) schema.Component {
	c := schema.Component{
		Name:           name,
		Statistic:      schema.F(stat),
		CriticalValues: CriticalMap(bpLevels[:], cv[:]),
		Tail:           "right",
	}
	c.Reject = !math.IsNaN(stat) && stat >= cv[level]
	return c
}

// RunBP runs the Bai-Perron tests on y (see the file comment). The result's
// Statistic is UDmax; BreakTests holds supF(1..M), UDmax, WDmax and the
// sequential supF(l+1|l); Breaks are the dates of the global partition with
// the number of breaks chosen by the sequential procedure, with Bai (1997)
// confidence intervals. Errors are *core.Error wrapping ErrNonFinite,
// ErrTooShort, ErrConstant, ErrSettings (trend none, an untabulated trimming
// or level) or ErrNoEstimate.
func RunBP(ctx context.Context, y []float64, cfg *core.Config) (*schema.Result, error) {
	if cfg == nil {
		cfg = &core.Config{}
	}
	if err := bpCheck(y); err != nil {
		return nil, err
	}
	T := len(y)
	st, err := bpResolve(T, cfg)
	if err != nil {
		return nil, err
	}
	if err := ctx.Err(); err != nil {
		return nil, core.Errorf(bpID, core.ErrCancelled, "%v", err)
	}
	w := &bpWork{kernel: cfg.Kernel, rule: cfg.BandwidthRule, bwFix: cfg.Bandwidth}
	if w.rule == core.BandwidthFixed && (cfg.Bandwidth < 0 || math.IsNaN(cfg.Bandwidth) || math.IsInf(cfg.Bandwidth, 0)) {
		return nil, core.Errorf(bpID, core.ErrSettings, "bandwidth %v (want a finite value >= 0)", cfg.Bandwidth)
	}
	s := w.compute(y, &st, true)
	if math.IsNaN(s.udmax) {
		return nil, core.Errorf(bpID, core.ErrNoEstimate, "the covariance of the regime coefficients is singular (a segment is fitted exactly)")
	}
	tab, lv := st.table, st.level
	M := len(s.supF)
	res := &schema.Result{
		Test:      bpID,
		Variant:   fmt.Sprintf("statistic = UDmax (q=%d, pure structural change, trimming %g, M=%d)", st.q, st.trim, M),
		Trend:     cfg.Trend.String(),
		Shift:     "level",
		Statistic: schema.F(s.udmax),
		PValueMethod: "none: the sup-F, UDmax, WDmax and sequential statistics have no closed-form " +
			"p-values; decisions use simulated critical values (see critical_values_source)",
		CriticalValues: CriticalMap(bpLevels[:], tab.UDmax[:]),
		CriticalSource: bpSource(&st),
		Tail:           "right",
		NObs:           T,
		Null:           bpNull,
		Level:          cfg.LevelOr(),
		Kernel:         cfg.Kernel.String(),
		Warnings:       st.warns,
	}
	if st.q == 2 {
		res.Shift = "level+slope"
	}
	res.Reject = s.udmax >= tab.UDmax[lv]
	for k := 1; k <= M; k++ {
		res.BreakTests = append(res.BreakTests, bpComponent(fmt.Sprintf("supF(%d)", k), s.supF[k-1], tab.SupF[k-1], lv))
	}
	res.BreakTests = append(res.BreakTests, bpComponent("UDmax", s.udmax, tab.UDmax, lv))
	wd := bpComponent("WDmax", s.wdmax, tab.WDmax, lv)
	// WDmax weights depend on the level: only the chosen level's value applies.
	wd.CriticalValues = map[string]float64{schema.LevelKey(bpLevels[lv]): tab.WDmax[lv]}
	res.BreakTests = append(res.BreakTests, wd)
	for l := 1; l < M; l++ {
		res.BreakTests = append(res.BreakTests, bpComponent(fmt.Sprintf("supF(%d|%d)", l+1, l), s.seq[l-1], tab.Seq[l-1], lv))
	}
	// Sequential choice.
	mSeq := 0
	// At least one break when UDmax or WDmax rejects (Bai & Perron 2003a,
	// section 5.3), then supF(l+1|l), l = 1, 2, ... on the global partitions.
	if s.udmax >= tab.UDmax[lv] || (!math.IsNaN(s.wdmax) && s.wdmax >= tab.WDmax[lv]) {
		mSeq = 1
		for l := 1; l < M; l++ {
			f := s.seq[l-1]
			if math.IsNaN(f) || f < tab.Seq[l-1][lv] {
				break
			}
			mSeq = l + 1
		}
	}
	mBIC, mLWZ := bpCriteria(s.ssr, T, st.q)
	res.Estimates = map[string]float64{
		"breaks_sequential": float64(mSeq),
		"breaks_bic":        float64(mBIC),
		"breaks_lwz":        float64(mLWZ),
		"q":                 float64(st.q),
		"h":                 float64(st.h),
	}
	if mSeq > 0 {
		d := s.dates[mSeq-1]
		bounds := append(append([]int{0}, d...), T)
		w.wald(bounds)
		bw := w.lastBW
		res.Bandwidth = &bw
		ciLevel := 1 - cfg.LevelOr()
		for j, tb := range d {
			b := BreakAt(tb, T, cfg)
			if lo, hi, ok := w.breakCI(j, ciLevel); ok && st.q == 1 {
				b.Lower, b.Upper = lo, hi
				b.LowerDate, b.UpperDate = cfg.DateOf(lo), cfg.DateOf(hi)
				b.CILevel = ciLevel
			}
			res.Breaks = append(res.Breaks, b)
		}
		if st.q == 2 {
			res.Warnings = append(res.Warnings, "no confidence intervals for the break dates: the Bai (1997) "+
				"distribution assumes stationary regressors and does not hold with a trend regressor")
		}
	}
	if err := core.AddSimulated(ctx, core.Info{ID: bpID, Tail: "right", NewStat: newBPStat, Generate: core.WhiteNoise}, T, cfg, res); err != nil {
		return nil, WrapError(bpID, err)
	}
	// The null DGP of bp is i.i.d. N(0,1) noise, not the default random walk.
	res.SimMethod = strings.Replace(res.SimMethod, "Gaussian random walk", "i.i.d. N(0,1) noise, no structural change", 1)
	return res, nil
}

// breakCI returns the Bai (1997) interval at coverage level for break j of
// the partition last passed to wald (regimes j and j+1 of w.segs).
func (w *bpWork) breakCI(j int, level float64) (lo, hi int, ok bool) {
	s1, s2 := &w.segs[j], &w.segs[j+1]
	q := w.q
	var dl [2]float64
	for a := 0; a < q; a++ {
		dl[a] = s2.d[a] - s1.d[a]
	}
	quad := func(m [2][2]float64, scale float64) float64 {
		v := 0.0
		for a := 0; a < q; a++ {
			for b := 0; b < q; b++ {
				v += dl[a] * m[a][b] * dl[b]
			}
		}
		return v * scale
	}
	q1 := quad(s1.zz, 1/float64(s1.hi-s1.lo))
	q2 := quad(s2.zz, 1/float64(s2.hi-s2.lo))
	o1, o2 := quad(s1.om, 1), quad(s2.om, 1)
	if !(q1 > 0 && q2 > 0 && o1 > 0 && o2 > 0) {
		return 0, 0, false
	}
	L := q1 * q1 / o1
	xi, phi := q2/q1, o2/o1
	a := (1 - level) / 2
	xl := bpArgmaxQuantile(a, xi, phi)
	xh := bpArgmaxQuantile(1-a, xi, phi)
	if math.IsNaN(xl) || math.IsNaN(xh) {
		return 0, 0, false
	}
	tb := float64(s1.hi)
	lo = int(math.Floor(tb - xh/L))
	hi = int(math.Ceil(tb - xl/L))
	lo = max(lo, 1)
	hi = min(hi, w.T-1)
	return lo, hi, lo <= hi
}

// bpArgmaxCDF is P(argmax_s Z(s) ≤ x) for Z(s) = W_1(-s) - |s|/2 (s ≤ 0),
// √φ W_2(s) - ξ s/2 (s > 0) (Bai 1997, Appendix B).
//
// Derivation (ours; it reproduces Bai's expression). For x = -u < 0 write
// L(u) = W_1(u) - u/2. The argmax lies beyond u iff
// L(u) + M' > max(M_1, M_R), where M_1 = sup_{[0,u]} L, M' ~ Exp(1) is the
// maximum of the drifted path after u and M_R ~ Exp(θ), θ = ξ/φ, that of the
// right side. Integrating M' and M_R out and using the joint density of a
// drifted Brownian motion and its running maximum gives
//
//	G(-u) = -√(u/2π) e^{-u/8} - c e^{au} Φ(-b√u) + (d - 2 + u/2) Φ(-√u/2),
//
// a = θ(1+θ)/2, b = 1/2 + θ, c = (1+2θ)/(θ(1+θ)), d = (1+2θ)²/(θ(1+θ)). For
// x > 0, the time change s = (φ/ξ²) s' maps the right side onto the left one
// with (ξ, φ) replaced by (1/ξ, 1/φ): G(x) = 1 - G_{1/θ}(-x ξ²/φ). The tests
// check this against a direct simulation of the argmax.
func bpArgmaxCDF(x, xi, phi float64) float64 {
	if x < 0 {
		return bpArgmaxLeft(-x, xi/phi)
	}
	return 1 - bpArgmaxLeft(x*xi*xi/phi, phi/xi)
}

// bpArgmaxLeft is G(-u) for u ≥ 0 with θ = ξ/φ.
func bpArgmaxLeft(u, theta float64) float64 {
	if u <= 0 {
		return theta / (1 + theta)
	}
	b := 0.5 + theta
	c := (1 + 2*theta) / (theta * (1 + theta))
	d := (1 + 2*theta) * (1 + 2*theta) / (theta * (1 + theta))
	su := math.Sqrt(u)
	// e^{au} Φ(-b√u) = e^{-u/8} e^{(b√u)²/2} Φ(-b√u) since b²/2 - a = 1/8.
	g := -math.Sqrt(u/(2*math.Pi))*math.Exp(-u/8) - c*math.Exp(-u/8)*bpMills(b*su) + (d-2+u/2)*bpNormCDF(-su/2)
	return math.Max(0, math.Min(1, g))
}

// bpNormCDF is the standard normal distribution function.
func bpNormCDF(x float64) float64 { return 0.5 * math.Erfc(-x/math.Sqrt2) }

// bpMills returns e^{z²/2} Φ(-z) for z ≥ 0 without overflow.
func bpMills(z float64) float64 {
	if z < 6 {
		return math.Exp(z*z/2) * bpNormCDF(-z)
	}
	// Φ(-z) = φ(z) R(z), Mills ratio by its continued fraction
	// R(z) = 1/(z + 1/(z + 2/(z + 3/(z + ...)))).
	f := z
	for k := 60; k >= 1; k-- {
		f = z + float64(k)/f
	}
	return 1 / (math.Sqrt(2*math.Pi) * f)
}

// bpArgmaxQuantile inverts bpArgmaxCDF by bisection.
func bpArgmaxQuantile(p, xi, phi float64) float64 {
	lo, hi := -1.0, 1.0
	for bpArgmaxCDF(lo, xi, phi) > p {
		lo *= 2
		if lo < -1e9 {
			return math.NaN()
		}
	}
	for bpArgmaxCDF(hi, xi, phi) < p {
		hi *= 2
		if hi > 1e9 {
			return math.NaN()
		}
	}
	for i := 0; i < 100 && hi-lo > 1e-10*(1+math.Abs(lo)); i++ {
		m := 0.5 * (lo + hi)
		if bpArgmaxCDF(m, xi, phi) < p {
			lo = m
		} else {
			hi = m
		}
	}
	return 0.5 * (lo + hi)
}

// newBPStat returns the UDmax statistic for the simulation engine.
func newBPStat(T int, cfg *core.Config) core.StatFunc {
	c := cfg
	if c == nil {
		c = &core.Config{}
	}
	st, err := bpResolve(T, c)
	w := &bpWork{kernel: c.Kernel, rule: c.BandwidthRule, bwFix: c.Bandwidth}
	return func(y []float64) (float64, error) {
		if err != nil {
			return 0, err
		}
		if len(y) != T {
			return 0, core.Errorf(bpID, core.ErrSettings, "series length %d, statistic prepared for %d", len(y), T)
		}
		if err := bpCheck(y); err != nil {
			return 0, err
		}
		s := w.compute(y, &st, false)
		if math.IsNaN(s.udmax) {
			return 0, core.Errorf(bpID, core.ErrNoEstimate, "singular covariance")
		}
		return s.udmax, nil
	}
}

// BPLimitSpec configures BPSimulateLimit.
type BPLimitSpec struct {
	// Trend is core.TrendConstant (q = 1) or core.TrendLinear (q = 2).
	Trend core.Trend
	// Trim is ε; M the largest number of breaks; T the number of partial sums.
	Trim float64
	M, T int
	// Reps and Seed: replication r draws from rand.NewPCG(Seed, r).
	Reps    int
	Seed    uint64
	Workers int
	// SupF1Only computes only supF(1) (in O(T) per replication).
	SupF1Only bool
}

// BPSimulateLimit simulates the asymptotic null distributions of supF(k),
// k = 1..M, by the statistics on T i.i.d. N(0,1) errors with the error
// variance known: F(k) = (S_0 - S_k)/(kq), S_k the minimal SSR with k breaks
// and minimal segment floor(εT) (Bai & Perron 2003b use the same
// approximation of the Brownian functionals). It returns draws[r][k-1].
func BPSimulateLimit(ctx context.Context, spec BPLimitSpec) ([][]float64, error) {
	q := 1
	if spec.Trend == core.TrendLinear {
		q = 2
	}
	h := int(math.Floor(spec.Trim*float64(spec.T) + 1e-9))
	if h < q+1 || spec.Reps <= 0 || spec.M < 1 || (spec.M+1)*h > spec.T {
		return nil, fmt.Errorf("%w: bp limit simulation T=%d trim=%g M=%d reps=%d", core.ErrSettings, spec.T, spec.Trim, spec.M, spec.Reps)
	}
	return core.SimulateRows(ctx, core.SimSpec{Reps: spec.Reps, Seed: spec.Seed, Workers: spec.Workers}, func() func(r *rand.Rand) []float64 {
		var w bpWork
		y := make([]float64, spec.T)
		return func(r *rand.Rand) []float64 {
			for t := range y {
				y[t] = r.NormFloat64()
			}
			// Unit variance known: no standardisation of y.
			w.loadRaw(y, q)
			s0 := w.ssr(0, spec.T)
			if spec.SupF1Only {
				_, s1 := w.bestSplit(0, spec.T, h)
				return []float64{(s0 - s1) / float64(q)}
			}
			M := w.dp(h, spec.M)
			d := make([]float64, M)
			for k := 1; k <= M; k++ {
				d[k-1] = (s0 - w.opt[k][spec.T]) / float64(k*q)
			}
			return d
		}
	})
}

// BPSimulateFinite simulates the null distributions of the statistics
// exactly as RunBP computes them (kernel variance included, with cfg's
// kernel and bandwidth rule; ε = spec.Trim, at most spec.M breaks) on
// spec.T i.i.d. N(0,1) errors. Replication r draws from
// rand.NewPCG(spec.Seed, r). Row r holds supF(1..M) then supF(l+1|l),
// l = 1..M-1, given l breaks at the equally spaced dates round(jT/(l+1))
// (the finite-sample analogue of Bai & Perron 1998, Proposition 9; -Inf
// when no segment can be split), M as resolved for T.
func BPSimulateFinite(ctx context.Context, spec BPLimitSpec, cfg *core.Config) ([][]float64, error) {
	c := core.Config{}
	if cfg != nil {
		c = *cfg
	}
	c.Trend, c.Trim, c.MaxBreaks = spec.Trend, spec.Trim, spec.M
	c.Level = 0.05
	st, err := bpResolve(spec.T, &c)
	if err != nil {
		return nil, err
	}
	if spec.Reps <= 0 {
		return nil, fmt.Errorf("%w: bp finite simulation reps=%d", core.ErrSettings, spec.Reps)
	}
	return core.SimulateRows(ctx, core.SimSpec{Reps: spec.Reps, Seed: spec.Seed, Workers: spec.Workers}, func() func(r *rand.Rand) []float64 {
		w := &bpWork{kernel: c.Kernel, rule: c.BandwidthRule, bwFix: c.Bandwidth}
		y := make([]float64, spec.T)
		return func(r *rand.Rand) []float64 {
			for t := range y {
				y[t] = r.NormFloat64()
			}
			s := w.compute(y, &st, false)
			row := make([]float64, 0, 2*st.M-1)
			for _, v := range s.supF {
				if math.IsNaN(v) {
					v = math.Inf(-1)
				}
				row = append(row, v)
			}
			for l := 1; l < st.M; l++ {
				dates := make([]int, l)
				for j := range dates {
					dates[j] = int(math.Round(float64((j+1)*spec.T) / float64(l+1)))
				}
				v := w.seqStat(dates)
				if math.IsNaN(v) {
					v = math.Inf(-1)
				}
				row = append(row, v)
			}
			return row
		}
	})
}

// loadRaw fills the prefix sums from y as given (no standardisation).
func (w *bpWork) loadRaw(y []float64, q int) {
	w.load(y, q)
	T := len(y)
	c := 0.5 * float64(T+1)
	var sy, syy, ssy float64
	for i, v := range y {
		tau := (float64(i+1) - c) / float64(T)
		sy += v
		syy += v * v
		ssy += tau * v
		w.py[i+1], w.pyy[i+1], w.psy[i+1] = sy, syy, ssy
	}
	w.ys = append(w.ys[:0], y...)
}

func bpGrow(s []float64, n int) []float64 {
	if cap(s) < n {
		return make([]float64, n)
	}
	return s[:n]
}
