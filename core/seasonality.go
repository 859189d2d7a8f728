package core

// Seasonality: is there a seasonal pattern, is it stochastic (seasonal unit
// roots) or deterministic (seasonal means), and which transform removes it.
//
// 1. The seasonal unit-root test (hegy.go: HEGY 1990 for S = 4, Beaulieu &
//    Miron 1993 for S = 12) with cfg's settings; by default a constant and
//    S-1 seasonal dummies, lags by BIC. Seasonal unit roots are declared
//    present when the joint F test on all seasonal frequencies (Ghysels, Lee
//    & Noh 1994) does not reject at cfg's level: H0 is exactly "every
//    seasonal root is there", the condition under which the seasonal
//    difference Δ_S is the right filter. The frequencies whose own test does
//    not reject are listed as well (RootsAt), for the reader.
// 2. Deterministic seasonality: the F test of the S-1 seasonal dummies in
//
//	z_t = c + Σ_{j=1..S-1} δ_j D_j,t [+ β t] + Σ_{i=1..p} φ_i z_{t-i} + e_t,
//
//    where z is the first difference Δy when the zero-frequency test (t1)
//    does not reject (the series has a unit root at frequency zero, so the
//    regression in levels would be spurious) and the level y otherwise (with
//    the trend when cfg.Trend is linear). p is chosen by BIC in 0..min(S,
//    kmax) on the common sample (kmax as in the seasonal test) so that serial
//    correlation does not inflate the F test. Under H0 (no seasonal means)
//    with stationary z the statistic is asymptotically F(S-1, n-p-regressors)
//    distributed; the p-value is from that F distribution (fdist.go).
// 3. Transform: "seasonal difference" when seasonal unit roots are present
//    (Δ_S also removes seasonal means); otherwise "seasonal dummies" when the
//    dummies are significant; otherwise "none".

import (
	"context"
	"fmt"
	"math"
	"strings"

	"github.com/rootshift/rootshift/core/schema"
)

// PeriodOf returns the number of observations per year for a frequency
// name of core/dataset ("quarterly" 4, "monthly" 12), and 0 for every other
// frequency (the seasonal test and Seasonality then do not apply).
func PeriodOf(frequency string) int {
	switch frequency {
	case "quarterly":
		return 4
	case "monthly":
		return 12
	}
	return 0
}

// Seasonal transforms recommended by Seasonality.
const (
	SeasonalTransformNone       = "none"
	SeasonalTransformDummies    = "seasonal dummies"
	SeasonalTransformDifference = "seasonal difference"
)

// SeasonalityReport is the seasonal diagnosis of one series.
type SeasonalityReport struct {
	// Period is S (4 or 12); Level the significance level of every decision.
	Period int
	Level  float64
	// Test is the seasonal unit-root test's result (id "seasonal").
	Test *schema.Result
	// UnitRoots: the F test on all seasonal frequencies does not reject, so
	// unit roots at every seasonal frequency are not rejected.
	UnitRoots bool
	// FSeasonal and PSeasonal are that F statistic and its p-value.
	FSeasonal, PSeasonal float64
	// RootsAt lists the seasonal frequencies whose own test (t2 at π, F per
	// complex pair) does not reject, e.g. "π", "π/2", "π/6".
	RootsAt []string
	// ZeroFrequencyRoot: t1 does not reject (a unit root at frequency zero).
	ZeroFrequencyRoot bool
	// Deterministic: the seasonal dummies are jointly significant.
	Deterministic bool
	// DummyF is the F statistic on the dummies, DummyP its p-value from
	// F(DummyDF1, DummyDF2); DummyOn is "levels" or "first differences";
	// DummyLags the autoregressive lags in that regression.
	DummyF, DummyP     float64
	DummyDF1, DummyDF2 int
	DummyOn            string
	DummyLags          int
	// DummyShare is the share of the residual variance without dummies that
	// the dummies explain, (SSR_r - SSR)/SSR_r, in [0, 1]: a measure of
	// strength.
	DummyShare float64
	// Transform is one of the SeasonalTransform* constants; Reason says why.
	Transform string
	Reason    string
}

// Seasonality diagnoses seasonality in y with period 4 or 12 under cfg (nil:
// defaults: constant and seasonal dummies, lags by BIC, 5% level). A
// non-zero cfg.Period must equal period. Errors are *Error with Test
// "seasonality" (or "seasonal" from the unit-root test).
func Seasonality(ctx context.Context, y []float64, period int, cfg *Config) (*SeasonalityReport, error) {
	const id = "seasonality"
	c := Config{}
	if cfg != nil {
		c = *cfg
	}
	if c.Period != 0 && c.Period != period {
		return nil, Errorf(id, ErrSettings, "period %d differs from the configured period %d", period, c.Period)
	}
	c.Period = period
	res, err := RunSeasonal(ctx, y, &c)
	if err != nil {
		return nil, err
	}
	S := period
	rep := &SeasonalityReport{Period: S, Level: c.LevelOr(), Test: res}
	for i, comp := range res.Components {
		switch {
		case i == 0:
			rep.ZeroFrequencyRoot = !comp.Reject
		case i == 1:
			if !comp.Reject {
				rep.RootsAt = append(rep.RootsAt, "π")
			}
		case i < seasIdxSeas(S):
			if !comp.Reject {
				rep.RootsAt = append(rep.RootsAt, piFraction(2*(i-1), S))
			}
		case i == seasIdxSeas(S):
			rep.UnitRoots = !comp.Reject
			rep.FSeasonal = *comp.Statistic
			rep.PSeasonal = *comp.PValue
		}
	}
	if err := rep.dummyTest(y, &c); err != nil {
		return nil, dfWrap(id, err)
	}
	switch {
	case rep.UnitRoots:
		rep.Transform = SeasonalTransformDifference
		rep.Reason = fmt.Sprintf("unit roots at the seasonal frequencies are not rejected (F = %.2f, p = %.3f)", rep.FSeasonal, rep.PSeasonal)
	case rep.Deterministic:
		rep.Transform = SeasonalTransformDummies
		rep.Reason = fmt.Sprintf("seasonal unit roots are rejected (F = %.2f, p = %.3f) and the seasonal means are significant in %s (F = %.2f, p = %.3g)", rep.FSeasonal, rep.PSeasonal, rep.DummyOn, rep.DummyF, rep.DummyP)
	default:
		rep.Transform = SeasonalTransformNone
		rep.Reason = fmt.Sprintf("seasonal unit roots are rejected (F = %.2f, p = %.3f) and the seasonal means are not significant in %s (F = %.2f, p = %.3g)", rep.FSeasonal, rep.PSeasonal, rep.DummyOn, rep.DummyF, rep.DummyP)
	}
	if rep.UnitRoots && !rep.ZeroFrequencyRoot {
		rep.Reason += "; the zero-frequency test rejects, so the seasonal difference also differences a series without a unit root at frequency zero"
	}
	if !rep.UnitRoots && len(rep.RootsAt) > 0 {
		rep.Reason += "; the test at " + strings.Join(rep.RootsAt, ", ") + " alone does not reject"
	}
	return rep, nil
}

// dummyTest runs step 2 of the file comment.
func (rep *SeasonalityReport) dummyTest(y []float64, cfg *Config) error {
	S := rep.Period
	z := y
	off := 0 // z[i] is observation i+1+off of y
	trend := cfg.Trend == TrendLinear
	rep.DummyOn = "levels"
	if rep.ZeroFrequencyRoot {
		d := make([]float64, len(y)-1)
		for i := range d {
			d[i] = y[i+1] - y[i]
		}
		z, off, trend = d, 1, false
		rep.DummyOn = "first differences"
	}
	T := len(z)
	ndet := S
	if trend {
		ndet++
	}
	pmax := min(S, seasMaxLags(cfg, len(y), S, seasCase{TrendConstant, true}))
	for pmax > 0 && T-pmax-(ndet+pmax) < 10 {
		pmax--
	}
	if T-pmax-(ndet+pmax) < 5 {
		return fmt.Errorf("%w: %d observations for the seasonal-dummy regression", ErrTooShort, T)
	}
	var w dummyWork
	best, p := math.Inf(1), 0
	// From the largest design down, so its storage serves the smaller ones;
	// "<=" keeps the smallest order on a tie.
	for k := pmax; k >= 0; k-- {
		ssr, n, err := w.fit(z, off, S, trend, k, pmax, true)
		if err != nil {
			return err
		}
		N := float64(n)
		if v := math.Log(ssr/N) + math.Log(N)*float64(k)/N; v <= best {
			best, p = v, k
		}
	}
	ssr, n, err := w.fit(z, off, S, trend, p, p, true)
	if err != nil {
		return err
	}
	ssrR, _, err := w.fit(z, off, S, trend, p, p, false)
	if err != nil {
		return err
	}
	df2 := n - (ndet + p)
	rep.DummyLags = p
	rep.DummyDF1, rep.DummyDF2 = S-1, df2
	rep.DummyF = math.Max(ssrR-ssr, 0) / float64(S-1) / (ssr / float64(df2))
	rep.DummyP = FUpper(rep.DummyF, float64(S-1), float64(df2))
	rep.DummyShare = math.Max(ssrR-ssr, 0) / ssrR
	rep.Deterministic = rep.DummyP < rep.Level
	if math.IsNaN(rep.DummyF) || math.IsInf(rep.DummyF, 0) || math.IsNaN(rep.DummyP) {
		return fmt.Errorf("%w: the seasonal-dummy F statistic is not finite", ErrNoEstimate)
	}
	return nil
}

// dummyWork fits the seasonal-dummy regression reusing storage.
type dummyWork struct {
	ls   LS
	back []float64
	cols [][]float64
	dep  []float64
}

// fit regresses z_t on a constant, the S-1 dummies (when dummies), the
// trend (when trend) and k lags of z, on t = kmax+1..T of z (0-based index
// i = kmax..T-1); off shifts the observation number used for the season
// and the trend. It returns SSR and the number of observations.
func (w *dummyWork) fit(z []float64, off, S int, trend bool, k, kmax int, dummies bool) (float64, int, error) {
	n := len(z) - kmax
	nc := 1 + k
	if dummies {
		nc += S - 1
	}
	if trend {
		nc++
	}
	if n <= nc {
		return 0, 0, fmt.Errorf("%w: %d observations for %d regressors", ErrTooShort, max(n, 0), nc)
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
	for r := range n {
		i := kmax + r
		t := i + 1 + off // observation number in y
		w.dep[r] = z[i]
		col := 0
		w.cols[col][r] = 1
		col++
		if dummies {
			season := (t - 1) % S
			for j := 1; j < S; j++ {
				v := 0.0
				if season == j {
					v = 1
				}
				w.cols[col][r] = v
				col++
			}
		}
		if trend {
			w.cols[col][r] = float64(t)
			col++
		}
		for l := 1; l <= k; l++ {
			w.cols[col][r] = z[i-l]
			col++
		}
	}
	f, err := w.ls.Fit(w.cols, w.dep)
	if err != nil {
		return 0, 0, err
	}
	if !(f.SSR > 0) {
		return 0, 0, fmt.Errorf("%w: the seasonal-dummy regression fits exactly", ErrNoEstimate)
	}
	return f.SSR, n, nil
}
