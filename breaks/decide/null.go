package decide

// The fitted I(1) null from which every bootstrap of the procedure draws.
//
// Under the null the series is integrated with a drift that may change:
//
//	Δy_t = μ_t + u_t,   u_t = Σ_{j=1..k} γ_j u_{t-j} + ε_t.
//
// Two fits of it are used:
//
//   - fitNull (the unit-root stage): μ_t piecewise constant with at most two
//     breaks (driftPath: BIC among 0, 1 and 2 breaks of the mean of Δy, 15%
//     trimming; Bai & Perron 1998, 2003; BIC as in Yao 1988); γ_j the
//     coefficients on the lagged differences in an unrestricted regression
//     (the Zivot-Andrews level-and-slope regression at its break date, with
//     its order chosen by BIC, nullOrder, or in the long-lag branch the
//     member's MAIC order: unitroot.go, leadSpec), and ε_t the residuals
//     under the null with those γ_j. Taking the short-run dynamics from the
//     unrestricted regression, not from a model fitted to Δy under the null,
//     keeps the power of the bootstrap tests against stationary alternatives
//     (Palm, Smeekes & Urbain 2008, "residual-based" sieve bootstrap;
//     Paparoditis & Politis 2005), while the residuals under the null keep
//     what the alternative's break dummies would absorb (a one-time jump).
//   - fitSieve (the explosive stage): μ_t with at most one turn
//     (turningDrift), γ_j from an autoregression of Δy - μ_t (BIC), the
//     restricted sieve of Chang & Park (2003), which carries the persistence
//     of the differences themselves.
//
// A bootstrap sample is
//
//	y*_1 = y_1,  y*_t = y*_{t-1} + μ_t + u*_t,
//	u*_t = Σ γ_j u*_{t-j} + w_t ε̂_t,  w_t = ±1 with probability 1/2,
//
// the wild bootstrap (Rademacher weights) keeping each residual at its own
// date, so that a crisis burst of volatility or a one-time jump appears in
// every bootstrap sample at the date it has in the data (Cavaliere & Taylor
// 2008; Harvey, Leybourne, Sollis & Taylor 2016).

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"

	"github.com/rootshift/rootshift/core"
	"gonum.org/v1/gonum/mat"
)

// nullModel is a fitted I(1) null.
type nullModel struct {
	y1     float64
	mu     []float64 // drift at t = 2..T (index t-2)
	gamma  []float64 // short-run AR coefficients
	resid  []float64 // centred residuals at t = 2..T (index t-2); pre-sample slots filled by draws
	fitted []bool    // whether resid[i] is an observed residual (false: draw one)
	keep   []bool    // residuals far out in the tails keep their sign (jumps)
	breaks []int     // drift breaks: TB in the series' 1-based numbering
	k      int
}

// dynSpec is the unrestricted regression whose lagged-difference
// coefficients and residuals the null takes: k lags and the deterministic
// terms of the test that is to be bootstrapped (constant, trend, level
// dummies DU_t = 1(t > TB) and slope dummies DT_t = (t - TB)1(t > TB)).
type dynSpec struct {
	k      int
	trend  core.Trend
	du, dt []int
	// sd, when set, is the local standard deviation of the differences
	// (index t-2 for Δy_t, localSD): the regression is then fitted by
	// weighted least squares, each row divided by sd.
	sd []float64
}

// weigh divides row i (time t = start+i) of dep and of every column by
// s.sd[t-2], when s.sd is set.
func (s dynSpec) weigh(start int, dep []float64, cols [][]float64) {
	if s.sd == nil {
		return
	}
	for i := range dep {
		w := 1 / s.sd[start+i-2]
		dep[i] *= w
		for _, c := range cols {
			c[i] *= w
		}
	}
}

// localSD returns the local standard deviation of d (the differences less
// their drift path): the root mean square of d over the centred window of
// h = max(5, ⌈T/20⌉) observations either side, floored at a tenth of the
// overall root mean square. Weighting the null's regression by it is the
// adaptive estimation of Xu & Phillips (2008) for autoregressions whose
// innovation variance changes over time (their kernel estimate with a
// uniform kernel and our fixed bandwidth): under a crisis burst of
// volatility, ordinary least squares lets the few burst observations
// dominate the lag coefficients, and the spurious lags it keeps make the
// recoloured bootstrap samples less like the data.
func localSD(d []float64) []float64 {
	n := len(d)
	h := max(5, (n+19)/20)
	cum := make([]float64, n+1)
	for i, v := range d {
		cum[i+1] = cum[i] + v*v
	}
	floor := 0.01 * cum[n] / float64(max(n, 1))
	sd := make([]float64, n)
	for i := range d {
		a, b := max(0, i-h), min(n, i+h+1)
		sd[i] = math.Sqrt(max((cum[b]-cum[a])/float64(b-a), floor))
		if !(sd[i] > 0) {
			sd[i] = 1
		}
	}
	return sd
}

// fitSieve fits the I(1) null by the restricted sieve: an autoregression
// of order k (BIC, at most kmax) to u_t = Δy_t - μ_t, whose coefficients
// recolour and whose residuals are resampled (Chang & Park 2003). Under the
// null it captures the persistence of the differences themselves (a drift
// that changes smoothly over a recession), which the unrestricted
// regression hands to ρ instead.
func fitSieve(y []float64, kmax int, mu []float64, driftBreaks []int) (*nullModel, error) {
	T := len(y)
	n := T - 1
	u := make([]float64, n)
	for i := range u {
		u[i] = y[i+1] - y[i] - mu[i]
	}
	var ls core.LS
	bestK, bestBIC := 0, math.Inf(1)
	var bestFit *core.Fit
	for k := 0; k <= kmax; k++ {
		// Common sample i = kmax..n-1 for the comparison.
		rows := n - kmax
		if rows <= k+10 {
			break
		}
		dep := u[kmax:]
		var cols [][]float64
		for j := 1; j <= k; j++ {
			cols = append(cols, u[kmax-j:n-j])
		}
		var ssr float64
		var f *core.Fit
		if k == 0 {
			for _, v := range dep {
				ssr += v * v
			}
		} else {
			var err error
			if f, err = ls.Fit(cols, dep); err != nil {
				continue
			}
			ssr = f.SSR
		}
		if !(ssr > 0) {
			continue
		}
		if b := math.Log(ssr/float64(rows)) + float64(k)*math.Log(float64(rows))/float64(rows); b < bestBIC {
			bestK, bestBIC = k, b
			if f != nil {
				c := *f
				c.Coef = append([]float64(nil), f.Coef...)
				bestFit = &c
			} else {
				bestFit = nil
			}
		}
	}
	m := &nullModel{y1: y[0], k: bestK, mu: mu, breaks: driftBreaks}
	if bestFit != nil {
		m.gamma = stabilise(append([]float64(nil), bestFit.Coef...))
	}
	m.resid = make([]float64, n)
	m.fitted = make([]bool, n)
	var res []float64
	for i := bestK; i < n; i++ {
		e := u[i]
		for j := 1; j <= bestK; j++ {
			e -= m.gamma[j-1] * u[i-j]
		}
		res = append(res, e)
	}
	mean := 0.0
	for _, e := range res {
		mean += e
	}
	mean /= float64(len(res))
	for r, e := range res {
		m.resid[bestK+r] = e - mean
		m.fitted[bestK+r] = true
	}
	if len(res) < 10 {
		return nil, fmt.Errorf("%w: %d observations", core.ErrTooShort, T)
	}
	m.markJumps()
	return m, nil
}

// markJumps marks isolated residuals beyond 4 robust standard deviations
// (1.4826 times the median absolute deviation), whose neighbours are within
// 2, as jumps: the wild bootstrap keeps their sign, so a one-time jump of the data appears in every bootstrap
// sample as it is, not half the time reversed (a refinement of our own,
// common practice for outliers, no source; the Rademacher weights flip every
// other residual as in Cavaliere & Taylor 2008). A run of large residuals
// (a burst of volatility, the rise of a bubble) is not a jump and keeps
// the wild bootstrap's random signs.
func (m *nullModel) markJumps() {
	var a []float64
	for i, e := range m.resid {
		if m.fitted[i] {
			a = append(a, math.Abs(e))
		}
	}
	if len(a) < 10 {
		return
	}
	slices.Sort(a)
	mad := a[len(a)/2]
	if !(mad > 0) {
		return
	}
	sd := 1.4826 * mad
	m.keep = make([]bool, len(m.resid))
	quiet := func(j int) bool { return j < 0 || j >= len(m.resid) || !m.fitted[j] || math.Abs(m.resid[j]) <= 2*sd }
	for i, e := range m.resid {
		m.keep[i] = m.fitted[i] && math.Abs(e) > 4*sd && quiet(i-1) && quiet(i+1)
	}
}

// fitNull fits the I(1) null to y: the drift path mu (from driftPath on the
// first difference, with its breaks), the dynamics and residuals from the
// regression
//
//	Δy_t = det_t'δ + ρ y_{t-1} + Σ_{j=1..k} γ_j Δy_{t-j} + ε_t,  t = k+2..T.
func fitNull(y []float64, spec dynSpec, mu []float64, driftBreaks []int) (*nullModel, error) {
	T := len(y)
	k := spec.k
	start := k + 2
	n0 := T - start + 1
	var cols [][]float64
	col := func(f func(t int) float64) {
		c := make([]float64, n0)
		for i := range c {
			c[i] = f(start + i)
		}
		cols = append(cols, c)
	}
	col(func(t int) float64 { return y[t-2] })
	for j := 1; j <= k; j++ {
		col(func(t int) float64 { return y[t-1-j] - y[t-2-j] })
	}
	if spec.trend != core.TrendNone {
		col(func(int) float64 { return 1 })
	}
	if spec.trend == core.TrendLinear {
		col(func(t int) float64 { return float64(t) })
	}
	for _, tb := range spec.du {
		col(func(t int) float64 {
			if t > tb {
				return 1
			}
			return 0
		})
	}
	for _, tb := range spec.dt {
		col(func(t int) float64 {
			if t > tb {
				return float64(t - tb)
			}
			return 0
		})
	}
	if n0 <= len(cols)+5 {
		return nil, fmt.Errorf("%w: %d observations for %d regressors", core.ErrTooShort, n0, len(cols))
	}
	dep := make([]float64, n0)
	for i := range dep {
		t := start + i
		dep[i] = y[t-1] - y[t-2]
	}
	spec.weigh(start, dep, cols)
	var ls core.LS
	f, err := ls.Fit(cols, dep)
	if err != nil {
		return nil, err
	}
	m := &nullModel{y1: y[0], k: k}
	m.gamma = stabilise(append([]float64(nil), f.Coef[1:1+k]...))
	n := T - 1
	m.resid = make([]float64, n)
	m.fitted = make([]bool, n)
	// The residuals under the null, with the unrestricted γ̂:
	// ε̂_t = (Δy_t - μ_t) - Σ γ̂_j (Δy_{t-j} - μ_{t-j}), so that what the
	// alternative's break dummies absorb (a one-time jump in a random walk)
	// stays in the residuals and so in every bootstrap sample. Index i of
	// Δy is t = i+2; residuals exist for i >= k.
	res := make([]float64, n-k)
	for i := k; i < n; i++ {
		e := y[i+1] - y[i] - mu[i]
		for j := 1; j <= k; j++ {
			e -= m.gamma[j-1] * (y[i+1-j] - y[i-j] - mu[i-j])
		}
		res[i-k] = e
	}
	mean := 0.0
	for _, e := range res {
		mean += e
	}
	mean /= float64(len(res))
	// res[r] belongs to t = start + r, i.e. index t-2.
	for r, e := range res {
		i := start + r - 2
		m.resid[i] = e - mean
		m.fitted[i] = true
	}
	m.mu, m.breaks = mu, driftBreaks
	m.markJumps()
	return m, nil
}

// nullOrder chooses the lag order of spec's unrestricted regression by BIC
// (Schwarz 1978) among 0..kmax on the common sample t = kmax+2..T. The
// bootstrap null recolours with the γ_j of that order: an order chosen by
// the t-sig rule of the member itself keeps spurious lags (their sum of
// about 0.3-0.5 on a random walk with a burst of volatility, our
// simulation), whose recolouring makes the bootstrap samples look more
// integrated than the data and the bootstrap over-reject.
func nullOrder(y []float64, spec dynSpec, kmax int) int {
	T := len(y)
	start := kmax + 2
	n0 := T - start + 1
	if kmax <= 0 || n0 <= kmax+len(spec.du)+len(spec.dt)+8 {
		return max(kmax, 0)
	}
	col := func(f func(t int) float64) []float64 {
		c := make([]float64, n0)
		for i := range c {
			c[i] = f(start + i)
		}
		return c
	}
	var det [][]float64
	if spec.trend != core.TrendNone {
		det = append(det, col(func(int) float64 { return 1 }))
	}
	if spec.trend == core.TrendLinear {
		det = append(det, col(func(t int) float64 { return float64(t) }))
	}
	for _, tb := range spec.du {
		det = append(det, col(func(t int) float64 {
			if t > tb {
				return 1
			}
			return 0
		}))
	}
	for _, tb := range spec.dt {
		det = append(det, col(func(t int) float64 {
			if t > tb {
				return float64(t - tb)
			}
			return 0
		}))
	}
	lev := col(func(t int) float64 { return y[t-2] })
	lags := make([][]float64, kmax)
	for j := 1; j <= kmax; j++ {
		lags[j-1] = col(func(t int) float64 { return y[t-1-j] - y[t-2-j] })
	}
	dep := col(func(t int) float64 { return y[t-1] - y[t-2] })
	spec.weigh(start, dep, append(append([][]float64{lev}, lags...), det...))
	var ls core.LS
	best, bestBIC := kmax, math.Inf(1)
	for k := 0; k <= kmax; k++ {
		cols := append(append([][]float64{lev}, lags[:k]...), det...)
		f, err := ls.Fit(cols, dep)
		if err != nil || !(f.SSR > 0) {
			continue
		}
		n := float64(n0)
		if b := math.Log(f.SSR/n) + float64(len(cols))*math.Log(n)/n; b < bestBIC {
			best, bestBIC = k, b
		}
	}
	return best
}

// stabilise shrinks an AR polynomial until its largest root modulus is
// below 0.98, so that the recoloured differences are stationary: γ_j is
// multiplied by c^j (c < 1) as often as needed.
func stabilise(g []float64) []float64 {
	k := len(g)
	if k == 0 {
		return g
	}
	for iter := 0; iter < 60 && arRadius(g) >= 0.98; iter++ {
		c := 0.95
		f := c
		for j := range g {
			g[j] *= f
			f *= c
		}
	}
	return g
}

// arRadius is the largest modulus of the eigenvalues of the companion
// matrix of u_t = Σ g_j u_{t-j}.
func arRadius(g []float64) float64 {
	k := len(g)
	if k == 1 {
		return math.Abs(g[0])
	}
	c := mat.NewDense(k, k, nil)
	for j := range k {
		c.Set(0, j, g[j])
	}
	for i := 1; i < k; i++ {
		c.Set(i, i-1, 1)
	}
	var e mat.Eigen
	if !e.Factorize(c, mat.EigenNone) {
		return 1
	}
	r := 0.0
	for _, v := range e.Values(nil) {
		r = max(r, math.Hypot(real(v), imag(v)))
	}
	return r
}

// driftPath fits a piecewise-constant mean to d with at most maxBreaks (0, 1
// or 2) breaks and segments of at least max(trim of the sample, 8)
// observations, the number of
// breaks chosen by BIC: n log(SSR/n) + p log n with p = 2m + 1 parameters.
// It returns the fitted mean at every observation of d and the breaks as
// TB in the numbering of the levels (d[i] is Δy at t = i+2, so a break after
// d[b-1] is TB = b+1).
func driftPath(d []float64, maxBreaks int, trim float64) (mu []float64, breaks []int) {
	n := len(d)
	s1 := make([]float64, n+1)
	s2 := make([]float64, n+1)
	for i, v := range d {
		s1[i+1] = s1[i] + v
		s2[i+1] = s2[i] + v*v
	}
	ssr := func(a, b int) float64 { // segment d[a:b]
		l := float64(b - a)
		s := s1[b] - s1[a]
		return max(s2[b]-s2[a]-s*s/l, 0)
	}
	h := max(int(math.Ceil(trim*float64(n))), 8)
	fn := float64(n)
	bic := func(s float64, m int) float64 {
		return fn*math.Log(max(s, 1e-300)/fn) + float64(2*m+1)*math.Log(fn)
	}
	best := bic(ssr(0, n), 0)
	var cuts []int
	if maxBreaks >= 1 && n >= 2*h {
		b1, s := 0, math.Inf(1)
		for b := h; b <= n-h; b++ {
			if v := ssr(0, b) + ssr(b, n); v < s {
				b1, s = b, v
			}
		}
		if v := bic(s, 1); v < best {
			best, cuts = v, []int{b1}
		}
	}
	if maxBreaks >= 2 && n >= 3*h {
		c1, c2, s := 0, 0, math.Inf(1)
		for a := h; a <= n-2*h; a++ {
			head := ssr(0, a)
			for b := a + h; b <= n-h; b++ {
				if v := head + ssr(a, b) + ssr(b, n); v < s {
					c1, c2, s = a, b, v
				}
			}
		}
		if v := bic(s, 2); v < best {
			cuts = []int{c1, c2}
		}
	}
	mu = make([]float64, n)
	prev := 0
	for _, c := range append(cuts, n) {
		m := (s1[c] - s1[prev]) / float64(c-prev)
		for i := prev; i < c; i++ {
			mu[i] = m
		}
		prev = c
	}
	for _, c := range cuts {
		breaks = append(breaks, c+1)
	}
	return mu, breaks
}

// draw fills dst (length T) with one bootstrap sample; u is scratch of
// length T. It does not allocate.
func (m *nullModel) draw(dst, u []float64, r *rand.Rand) {
	T := len(dst)
	k := m.k
	dst[0] = m.y1
	u[0] = 0
	n := T - 1
	for t := 1; t < T; t++ {
		i := t - 1
		e := m.resid[i]
		if !m.fitted[i] {
			// Pre-sample: a residual drawn at random from the observed ones.
			for {
				j := r.IntN(n)
				if m.fitted[j] {
					e = m.resid[j]
					break
				}
			}
		}
		if r.Uint64()&1 == 0 && (m.keep == nil || !m.keep[i] || !m.fitted[i]) {
			e = -e
		}
		v := e
		for j := 1; j <= k && t-j >= 1; j++ {
			v += m.gamma[j-1] * u[t-j]
		}
		u[t] = v
		dst[t] = dst[t-1] + m.mu[i] + v
	}
}
