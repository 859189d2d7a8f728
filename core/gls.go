package core

// Local-to-unity GLS detrending, shared by the DF-GLS test (dfgls.go), the
// point-optimal test P_T (ers.go) and the Ng-Perron M-tests (mtests.go).
//
// Elliott, Rothenberg & Stock (1996), Econometrica 64, 813-836, section 3
// and section 5: for a deterministic part z_t = 1 (TrendConstant) or
// z_t = (1, t)' (TrendLinear), t = 1..T, and a ≤ 1, quasi-difference
//
//	y_a = (y_1, y_2 - a y_1, ..., y_T - a y_{T-1})',
//	z_a = (z_1, z_2 - a z_1, ..., z_T - a z_{T-1})',
//
// regress y_a on z_a by least squares to get β̂(a), and let S(a) be the sum
// of squared residuals. At ᾱ = 1 + c̄/T, with c̄ = -7 for a constant and
// c̄ = -13.5 for a constant and trend (ERS 1996, section 3, where these
// values give the 50%-power envelope point), the GLS-detrended series is
// ỹ_t = y_t - z_t'β̂(ᾱ). The point-optimal statistic needs both S(ᾱ) and
// S(1) (ERS 1996, eq. (12) with ω̂² in place of σ²).
//
// TrendNone: no detrending, ỹ = y, and the quasi-differences use y_0 = 0, so
// S(a) = y_1² + Σ (y_t - a y_{t-1})². ᾱ then uses c̄ = -7, under which the
// limits of P_T and MPT coincide with the constant case (ERS 1996, section 3:
// the GLS estimate of the mean does not affect the limit).

import (
	"context"
	"fmt"
	"math"

	"github.com/rootshift/rootshift/core/schema"
)

// CBar returns the local-to-unity constant c̄ of ERS (1996, section 3):
// -13.5 for TrendLinear and -7 otherwise.
func CBar(det Trend) float64 {
	if det == TrendLinear {
		return -13.5
	}
	return -7
}

// GLSFit is the outcome of a GLS detrending.
type GLSFit struct {
	// Detrended is ỹ = y - z'β̂(ᾱ), of the same length as y. It is owned
	// by the GLSWork and valid until its next call.
	Detrended []float64
	// CBar is c̄ and Alpha is ᾱ = 1 + c̄/T.
	CBar, Alpha float64
	// Beta holds β̂(ᾱ): the constant and (for TrendLinear) the trend
	// coefficient; unused entries are zero.
	Beta [2]float64
	// SSRAlpha is S(ᾱ) and SSR1 is S(1), the sums of squared residuals of
	// the quasi-differenced regressions at ᾱ and at 1.
	SSRAlpha, SSR1 float64
}

// GLSWork performs local-to-unity GLS detrending reusing its storage. The
// zero value is ready to use; a GLSWork is not safe for concurrent use and
// Detrend does not allocate once it has seen a series of the same length.
type GLSWork struct {
	fit GLSFit
}

// Detrend GLS-detrends y with the deterministic part det (see the file
// comment). It returns ErrTooShort when T < det.NumDet()+2 and ErrSingular
// when the quasi-differenced regressors are collinear (never for a valid T).
// The input is not modified. Callers wanting scale-free cross-products
// standardise y first: every statistic built on ỹ with a constant is
// invariant to affine changes of y.
func (w *GLSWork) Detrend(y []float64, det Trend) (*GLSFit, error) {
	T := len(y)
	nd := det.NumDet()
	if T < nd+2 {
		return nil, fmt.Errorf("%w: %d observations for GLS detrending with %d deterministic terms", ErrTooShort, T, nd)
	}
	f := &w.fit
	f.CBar = CBar(det)
	f.Alpha = 1 + f.CBar/float64(T)
	f.Detrended = grow(f.Detrended, T)
	var err error
	if f.SSR1, _, err = glsRegress(y, det, 1, nil); err != nil {
		return nil, err
	}
	if f.SSRAlpha, f.Beta, err = glsRegress(y, det, f.Alpha, f.Detrended); err != nil {
		return nil, err
	}
	return f, nil
}

// glsRegress regresses the a-quasi-differences of y on those of z (1 or 2
// columns) and returns S(a) and β̂(a); when dst is not nil it receives
// ỹ_t = y_t - z_t'β̂. The normal equations are at most 2x2 and are solved
// in closed form after scaling by their diagonal; S(a) is accumulated from
// the residuals in a second pass, not from y'y - b'X'y.
func glsRegress(y []float64, det Trend, a float64, dst []float64) (ssr float64, beta [2]float64, err error) {
	T := len(y)
	nd := det.NumDet()
	switch nd {
	case 0:
		prev := 0.0
		for _, v := range y {
			e := v - a*prev
			ssr += e * e
			prev = v
		}
		if dst != nil {
			copy(dst, y)
		}
		return ssr, beta, nil
	case 1:
		// q_1 = 1, q_t = 1 - a.
		q := 1 - a
		sqq := 1 + float64(T-1)*q*q
		sqy := y[0]
		for t := 1; t < T; t++ {
			sqy += q * (y[t] - a*y[t-1])
		}
		b := sqy / sqq
		e := y[0] - b
		ssr = e * e
		for t := 1; t < T; t++ {
			e = y[t] - a*y[t-1] - q*b
			ssr += e * e
		}
		beta[0] = b
		if dst != nil {
			for t, v := range y {
				dst[t] = v - b
			}
		}
		return ssr, beta, nil
	}
	// Linear trend: column 1 is q (as above), column 2 is r_1 = 1,
	// r_t = t - a (t-1) with t counted from 1.
	q := 1 - a
	s11, s12, s22 := 1.0, 1.0, 1.0
	b1, b2 := y[0], y[0]
	for t := 1; t < T; t++ {
		r := float64(t+1) - a*float64(t)
		ya := y[t] - a*y[t-1]
		s11 += q * q
		s12 += q * r
		s22 += r * r
		b1 += q * ya
		b2 += r * ya
	}
	// Jacobi scaling, then the 2x2 inverse.
	d1, d2 := 1/math.Sqrt(s11), 1/math.Sqrt(s22)
	c12 := s12 * d1 * d2
	det2 := 1 - c12*c12
	if !(det2 > 1e-12) {
		return 0, beta, ErrSingular
	}
	u1, u2 := b1*d1, b2*d2
	beta[0] = (u1 - c12*u2) / det2 * d1
	beta[1] = (u2 - c12*u1) / det2 * d2
	e := y[0] - beta[0] - beta[1]
	ssr = e * e
	for t := 1; t < T; t++ {
		r := float64(t+1) - a*float64(t)
		e = y[t] - a*y[t-1] - q*beta[0] - r*beta[1]
		ssr += e * e
	}
	if dst != nil {
		for t, v := range y {
			dst[t] = v - beta[0] - beta[1]*float64(t+1)
		}
	}
	return ssr, beta, nil
}

// glsMinT is the shortest series the GLS-based tests accept.
const glsMinT = 10

// GLSStats holds every statistic that one GLS detrending yields: the
// DF-GLS t-ratio (ERS 1996, section 5), the point-optimal P_T (ERS 1996,
// eq. (12) with the autoregressive ω̂²) and the Ng & Perron (2001) M-tests.
type GLSStats struct {
	// Trend is the deterministic part, T the series length.
	Trend Trend
	T     int
	// Lags is the augmentation order k of the DF-GLS regression, LagRule
	// how it was chosen, NObs the observations in that regression
	// (t = k+2..T).
	Lags    int
	LagRule LagRule
	NObs    int
	// CBar and Alpha are c̄ and ᾱ = 1 + c̄/T.
	CBar, Alpha float64
	// TStat is the DF-GLS t-ratio on ỹ_{t-1}, Rho its coefficient.
	TStat, Rho float64
	// S2AR is the autoregressive spectral density estimate at frequency
	// zero s²_AR = σ̂²_k/(1 - Σγ̂_i)², σ̂²_k = SSR/NObs (Ng & Perron 2001,
	// p. 1524), from the DF-GLS regression on the standardised series.
	S2AR float64
	// SSRAlpha and SSR1 are S(ᾱ) and S(1), on the standardised series.
	SSRAlpha, SSR1 float64
	// PT is the ERS point-optimal statistic (S(ᾱ) - ᾱ S(1))/s²_AR.
	PT float64
	// MZa, MZt, MSB and MPT are the Ng & Perron (2001) M statistics.
	MZa, MZt, MSB, MPT float64
}

// GLSTester computes GLSStats reusing its storage; the zero value is ready
// to use and a GLSTester is not safe for concurrent use. With fixed lags it
// does not allocate once it has seen a series of the same length.
type GLSTester struct {
	gls GLSWork
	df  DFWork
	std []float64
	out GLSStats
}

// Compute GLS-detrends y (cfg.Trend; TrendNone: none), chooses the lag
// order (cfg.LagRule, default MAIC (Ng & Perron 2001) computed on the
// OLS-detrended series as Perron & Qu (2007) propose; maximum
// cfg.MaxLagsFor(T, cfg.Trend.NumDet())), fits the
// DF-GLS regression Δỹ_t = ρ ỹ_{t-1} + Σ γ_i Δỹ_{t-i} + e_t on t = k+2..T
// and forms the statistics. y is first centred and scaled (TrendNone:
// scaled only), which changes none of the statistics. A nil cfg means the
// defaults. Errors wrap ErrTooShort, ErrNonFinite, ErrConstant,
// ErrSingular, ErrSettings or ErrNoEstimate. The returned *GLSStats is
// owned by the GLSTester and valid until its next call.
func (w *GLSTester) Compute(y []float64, cfg *Config) (*GLSStats, error) {
	if cfg == nil {
		cfg = &Config{}
	}
	T := len(y)
	if T < glsMinT {
		return nil, fmt.Errorf("%w: %d observations, the GLS-based tests need at least %d", ErrTooShort, T, glsMinT)
	}
	det := cfg.Trend
	if det != TrendNone && det != TrendConstant && det != TrendLinear {
		return nil, fmt.Errorf("%w: unknown trend %d", ErrSettings, det)
	}
	constant := true
	for _, v := range y {
		if v != v || math.IsInf(v, 0) {
			return nil, fmt.Errorf("%w: in the series", ErrNonFinite)
		}
		if v != y[0] {
			constant = false
		}
	}
	if constant {
		return nil, fmt.Errorf("%w: every observation equals %g", ErrConstant, y[0])
	}
	if det == TrendNone {
		// Scale only: without deterministic terms a shift changes the test.
		w.std = grow(w.std, T)
		s := 0.0
		for _, v := range y {
			s = math.Hypot(s, v)
		}
		s /= math.Sqrt(float64(T))
		for i, v := range y {
			w.std[i] = v / s
		}
	} else {
		w.std, _, _ = Standardize(w.std, y)
	}
	g, err := w.gls.Detrend(w.std, det)
	if err != nil {
		return nil, err
	}
	yd := g.Detrended
	// The standardised series has Σ y² = T; a detrended series that is
	// rounding noise means the deterministic terms fit y exactly.
	ss := 0.0
	for _, v := range yd {
		ss += v * v
	}
	if !(ss > 1e-20*float64(T)) {
		return nil, fmt.Errorf("%w: the deterministic terms fit the series exactly", ErrNoEstimate)
	}
	rule := cfg.LagRule.Or(LagMAIC)
	k := 0
	if rule == LagFixed {
		k = cfg.Lags
		if k < 0 {
			return nil, fmt.Errorf("%w: negative lag order %d", ErrSettings, k)
		}
	} else {
		kmax := cfg.MaxLagsFor(T, det.NumDet())
		// MAIC is computed on the OLS-detrended series (Perron & Qu 2007,
		// "A simple modification to improve the finite sample properties of
		// Ng and Perron's unit root tests", Economics Letters 94, 12-19):
		// on the GLS-detrended series it picks long lags far from the null
		// and costs much power (measured: 37-49% against 80% for a
		// stationary AR(1), phi = 0.5, T = 200). The other rules use the
		// GLS-detrended series.
		sel, selDet := yd, TrendNone
		if rule == LagMAIC && det != TrendNone {
			sel, selDet = w.std, det
		}
		if k, err = w.df.SelectLags(sel, selDet, rule, kmax); err != nil {
			return nil, err
		}
	}
	f, err := w.df.Regress(yd, TrendNone, k, 0)
	if err != nil {
		return nil, err
	}
	o := &w.out
	*o = GLSStats{Trend: det, T: T, Lags: k, LagRule: rule, NObs: f.NObs, CBar: g.CBar, Alpha: g.Alpha,
		TStat: f.TStat, Rho: f.Rho, SSRAlpha: g.SSRAlpha, SSR1: g.SSR1}
	b1 := 1 - f.SumGamma
	o.S2AR = f.SSR / float64(f.NObs) / (b1 * b1)
	if !(o.S2AR > 0) || math.IsInf(o.S2AR, 0) {
		return nil, fmt.Errorf("%w: the autoregressive spectral estimate is not positive and finite (1 - sum of lag coefficients = %g)", ErrNoEstimate, b1)
	}
	glsStatistics(o, yd)
	for _, v := range [...]float64{o.TStat, o.PT, o.MZa, o.MZt, o.MSB, o.MPT} {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, fmt.Errorf("%w: a GLS-based statistic is not finite", ErrNoEstimate)
		}
	}
	return o, nil
}

// glsStatistics fills P_T and the M statistics from ỹ and o.S2AR:
//
//	P_T  = (S(ᾱ) - ᾱ S(1)) / s²_AR                     (ERS 1996, eq. (12))
//	κ    = T⁻² Σ_{t=2..T} ỹ²_{t-1}
//	MZa  = (T⁻¹ ỹ_T² - s²_AR) / (2κ)                    (Ng & Perron 2001, eq. (4))
//	MSB  = (κ / s²_AR)^{1/2}                            (eq. (5))
//	MZt  = MZa · MSB                                    (eq. (6))
//	MPT  = (c̄² κ - c̄ T⁻¹ ỹ_T²) / s²_AR         constant  (Ng & Perron 2001, p. 1524)
//	MPT  = (c̄² κ + (1 - c̄) T⁻¹ ỹ_T²) / s²_AR   trend
//
// (Perron & Ng 1996 for MZa, MSB and MZt with a kernel estimate.)
func glsStatistics(o *GLSStats, yd []float64) {
	T := float64(o.T)
	s2 := o.S2AR
	o.PT = (o.SSRAlpha - o.Alpha*o.SSR1) / s2
	sum := 0.0
	for _, v := range yd[:len(yd)-1] {
		sum += v * v
	}
	kappa := sum / (T * T)
	yT := yd[len(yd)-1]
	last := yT * yT / T
	o.MZa = (last - s2) / (2 * kappa)
	o.MSB = math.Sqrt(kappa / s2)
	o.MZt = o.MZa * o.MSB
	c := o.CBar
	if o.Trend == TrendLinear {
		o.MPT = (c*c*kappa + (1-c)*last) / s2
	} else {
		o.MPT = (c*c*kappa - c*last) / s2
	}
}

//go:generate go run gls_tables_gen.go

// glsStat indexes the statistics in the generated tables (gls_tables.go).
type glsStat int

const (
	glsDFGLS glsStat = iota
	glsPT
	glsMZa
	glsMZt
	glsMSB
	glsMPT
	glsNumStats
)

// glsQuantile returns the fitted quantile at probability glsProbs[i] of
// statistic s for deterministic part det and series length T, from the
// response surface q(T) = b∞ + b1/T + b2/T² + b3/T³ of gls_tables.go (our
// simulation; T below the smallest simulated length is clamped to it).
func glsQuantile(s glsStat, det Trend, T, i int) float64 {
	x := 1 / float64(max(T, glsTableLengths[0]))
	c := &glsSurface[s][det][i]
	return c[0] + x*(c[1]+x*(c[2]+x*c[3]))
}

// glsCritical returns the left-tail critical values at 1%, 2.5%, 5% and
// 10% of statistic s from the response surfaces.
func glsCritical(s glsStat, det Trend, T int) map[string]float64 {
	out := make(map[string]float64, 4)
	for i, p := range glsProbs {
		switch p {
		case 0.01, 0.025, 0.05, 0.10:
			out[schema.LevelKey(p)] = glsQuantile(s, det, T, i)
		}
	}
	return out
}

// glsPValue returns P(S ≤ stat) under the null for the left-tailed
// statistic s, interpolating the tabulated quantiles linearly in the normal
// score Φ⁻¹(p). Outside the table it returns the smallest or largest
// tabulated probability and clip = -1 or +1.
func glsPValue(s glsStat, det Trend, T int, stat float64) (p float64, clip int) {
	n := len(glsProbs)
	prevQ := glsQuantile(s, det, T, 0)
	if stat < prevQ {
		return glsProbs[0], -1
	}
	for i := 1; i < n; i++ {
		q := glsQuantile(s, det, T, i)
		if stat < q {
			z0, z1 := normalScore(glsProbs[i-1]), normalScore(glsProbs[i])
			z := z0 + (stat-prevQ)/(q-prevQ)*(z1-z0)
			return 0.5 * math.Erfc(-z/math.Sqrt2), 0
		}
		prevQ = q
	}
	return glsProbs[n-1], 1
}

// normalScore is the standard normal quantile Φ⁻¹(p).
func normalScore(p float64) float64 { return math.Sqrt2 * math.Erfinv(2*p-1) }

// glsRun computes the GLS statistics of y for test id and a Result with the
// fields every GLS-based test shares, for statistic s with value pick(st).
func glsRun(ctx context.Context, id string, s glsStat, y []float64, cfg *Config, pick func(*GLSStats) float64) (*schema.Result, *GLSStats, error) {
	if cfg == nil {
		cfg = &Config{}
	}
	if err := ctx.Err(); err != nil {
		return nil, nil, &Error{Test: id, Err: fmt.Errorf("%w: %v", ErrCancelled, err)}
	}
	if err := CheckFinite(id, y); err != nil {
		return nil, nil, err
	}
	var w GLSTester
	st, err := w.Compute(y, cfg)
	if err != nil {
		return nil, nil, &Error{Test: id, Err: err}
	}
	stat := pick(st)
	level := cfg.LevelOr()
	res := &schema.Result{
		Test:      id,
		Trend:     cfg.Trend.String(),
		Statistic: schema.F(stat),
		Tail:      "left",
		Lags:      st.Lags,
		LagRule:   st.LagRule.String(),
		NObs:      st.NObs,
		Level:     level,
		Estimates: map[string]float64{"rho": st.Rho, "c_bar": st.CBar, "alpha_bar": st.Alpha},
	}
	res.CriticalValues = glsCritical(s, cfg.Trend, st.T)
	res.CriticalSource = glsTableSource(st.T)
	p, clip := glsPValue(s, cfg.Trend, st.T, stat)
	res.PValue = &p
	res.PValueMethod = "interpolated (in the normal score) in the quantile response surfaces of our simulation of the null distribution at T = " +
		fmt.Sprint(st.T) + " " + glsTableNote()
	res.Reject = p < level
	res.Warnings = glsWarnings(st.T, clip)
	return res, st, nil
}

// glsTableNote describes the simulated tables.
func glsTableNote() string {
	return fmt.Sprintf("(gls_tables.go: Gaussian random walk, k = 0, %d replications at each of T = %v, seed %d; q(T) = b∞ + b1/T + b2/T² + b3/T³)",
		glsTableReps, glsTableLengths, glsTableSeed)
}

func glsTableSource(T int) string {
	return fmt.Sprintf("our simulation, response surface evaluated at T = %d %s", max(T, glsTableLengths[0]), glsTableNote())
}

// glsWarnings reports table clamping and p-values beyond the table.
func glsWarnings(T, clip int) []string {
	var w []string
	if T < glsTableLengths[0] {
		w = append(w, fmt.Sprintf("T = %d is below the shortest simulated length %d: critical values and p-value are those at T = %d", T, glsTableLengths[0], glsTableLengths[0]))
	}
	switch clip {
	case -1:
		w = append(w, fmt.Sprintf("statistic below the table's %.4g quantile: the p-value is at most %.4g and is reported as that bound", glsProbs[0], glsProbs[0]))
	case 1:
		w = append(w, fmt.Sprintf("statistic above the table's %.4g quantile: the p-value is reported as %.4g", glsProbs[len(glsProbs)-1], glsProbs[len(glsProbs)-1]))
	}
	return w
}

// glsNewStat returns a NewStat function for the statistic pick.
func glsNewStat(pick func(*GLSStats) float64) func(T int, cfg *Config) StatFunc {
	return func(T int, cfg *Config) StatFunc {
		c := Config{}
		if cfg != nil {
			c = *cfg
		}
		c.Progress, c.Dates, c.Sims = nil, nil, 0
		var w GLSTester
		return func(y []float64) (float64, error) {
			st, err := w.Compute(y, &c)
			if err != nil {
				return 0, err
			}
			return pick(st), nil
		}
	}
}
