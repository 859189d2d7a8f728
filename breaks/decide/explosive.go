package decide

// Stage 3: is the series explosive?
//
// The statistic is SADF, the supremum of right-tailed ADF t-ratios over
// forward-expanding windows starting at the first observation (Phillips,
// Wu & Yu 2011, eq. 6), with a constant, the minimum window of Phillips, Shi
// & Yu (2015) (r0 = 0.01 + 1.8/√T), and a lag order chosen once by BIC on the
// full sample (at most 4: recursive windows can be short; common practice,
// no source) and used in every window.
//
// Inference is in two steps that must both reject at α/2:
//
//  1. the tabulated null of SADF (a driftless Gaussian random walk, our own
//     simulation in core) screens out series far from explosive at no cost;
//  2. the wild bootstrap of SADF under the fitted I(1) null (null.go: drift
//     with up to two breaks, short-run dynamics, residuals at their own
//     dates; Harvey, Leybourne, Sollis & Taylor 2016 for the wild bootstrap
//     of these statistics) decides. A drift that rises and then falls, a
//     trough and recovery, a jump or a burst of volatility are in the null
//     and so no longer read as a bubble.
//
// Rejecting only when both reject keeps the size at most that of the
// bootstrap test (an intersection of two rejection regions); the p-value
// reported is the larger of the two.

import (
	"context"
	"errors"
	"fmt"
	"math"

	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/schema"
)

// explosiveDraws is the number of bootstrap samples of the explosive stage.
const explosiveDraws = 199

// nullKmax bounds the order of the explosive stage's sieve: Schwert's rule,
// at most 12.
func nullKmax(T int) int { return min(core.SchwertMax(T), 12) }

// explosiveKmax bounds the lag order of the recursive regressions.
const explosiveKmax = 4

// The explosive stage's null allows one turn of the drift (a boom that
// turns to bust, a downturn that turns to recovery): one break in the mean
// of Δy (driftPath, 15% trimming), kept only when the drifts before and
// after it have opposite signs and each is at least two standard errors
// from zero. A drift that only grows is not put in the null: that is what
// an explosive root itself looks like, and a staircase of growing drifts
// would absorb it.
func turningDrift(d []float64) ([]float64, []int) {
	mu, b := driftPath(d, 1, 0.15)
	if len(b) == 1 {
		cut := b[0] - 1 // d[:cut] before, d[cut:] after
		m1, s1 := meanSE(d[:cut])
		m2, s2 := meanSE(d[cut:])
		if m1*m2 < 0 && math.Abs(m1) >= 2*s1 && math.Abs(m2) >= 2*s2 {
			return mu, b
		}
	}
	mu, _ = driftPath(d, 0, 0.15)
	return mu, nil
}

// meanSE returns the mean of d and its standard error sd/√n.
func meanSE(d []float64) (m, se float64) {
	n := float64(len(d))
	for _, v := range d {
		m += v
	}
	m /= n
	s := 0.0
	for _, v := range d {
		s += (v - m) * (v - m)
	}
	return m, math.Sqrt(s / (n - 1) / n)
}

type explosiveOut struct {
	pFloor    bool // the p-value is the bootstrap's smallest, a bound
	explosive bool
	stage     schema.Stage
	sadf      *schema.Result
}

func (w *work) explosive(ctx context.Context) (*explosiveOut, error) {
	alpha := w.alpha / 2
	out := &explosiveOut{stage: schema.Stage{Name: "explosive", Level: alpha,
		Method: "SADF (Phillips, Wu & Yu 2011) with BIC lags; wild bootstrap under the fitted I(1) null with changing drift (Harvey, Leybourne, Sollis & Taylor 2016)"}}
	T := len(w.z)
	var dw core.DFWork
	kmax := min(explosiveKmax, max(T/20, 0))
	k, err := dw.SelectLags(w.z, core.TrendConstant, core.LagBIC, kmax)
	if err != nil {
		k = 0
	}
	cfg := w.config(core.TrendConstant)
	cfg.LagRule, cfg.Lags = core.LagFixed, k
	cfg.Level = alpha
	res, err := w.run(ctx, "sadf", w.z, cfg)
	if err != nil {
		return nil, err
	}
	if res == nil && errors.Is(w.lastErr, core.ErrExplosiveFit) {
		// Window regressions fit exactly with an explosive coefficient: the
		// series is, up to rounding, a deterministic explosive path (a large
		// explosive root swamps the noise). That is the clearest evidence
		// of an explosive root there is; no bootstrap can add to it.
		w.errs = w.errs[:len(w.errs)-1]
		out.explosive = true
		out.stage.Decision = "explosive"
		out.stage.Evidence = append(out.stage.Evidence, "the SADF window regressions fit exactly with an explosive coefficient: up to rounding the series is a deterministic explosive path")
		return out, nil
	}
	if res == nil || res.Statistic == nil {
		out.stage.Decision = "not computed"
		return out, nil
	}
	res.Variant = w.scaleWords()
	out.sadf = res
	stat := *res.Statistic
	out.stage.Statistic = schema.F(stat)
	out.stage.PValue = res.PValue
	screen := res.Reject
	if !screen {
		res.Episodes = nil // dated episodes only for an explosive verdict
		out.stage.Decision = "not explosive"
		out.stage.Evidence = append(out.stage.Evidence, fmt.Sprintf("SADF = %.3f does not reach the %g critical value of its tabulated null, so no bootstrap was needed", stat, alpha))
		return out, nil
	}
	mu, db := turningDrift(diff(w.z))
	obs := stat
	// The window end where the forward ADF sequence peaks (res.Sequence
	// holds ADF(1, e) for every window end e).
	peak, w0 := 0, T
	if sq := res.Sequence; sq != nil {
		best := math.Inf(-1)
		for i, v := range sq.Values {
			if v > best {
				best, peak = v, sq.Index[i]
			}
		}
		if len(sq.Index) > 0 {
			w0 = sq.Index[0]
		}
	}
	bcfg := *cfg
	bcfg.NoPath, bcfg.Dates, bcfg.Sims, bcfg.Progress = true, nil, 0, nil
	info, err := core.Lookup("sadf")
	if err != nil {
		return nil, err
	}
	sf := info.StatOf(T, &bcfg)
	null, err := fitSieve(w.z, nullKmax(T), mu, db)
	if err != nil {
		out.stage.Decision = "not explosive"
		out.stage.Evidence = append(out.stage.Evidence, "the I(1) null could not be fitted for the bootstrap ("+err.Error()+"); without it a rejection by the tabulated null is not trusted")
		return out, nil
	}
	p, failed, err := bootstrapP(ctx, null, T, explosiveDraws, w.seed^0x5ad5, obs, sf)
	if err != nil {
		if ctx.Err() != nil {
			return nil, err
		}
		out.stage.Decision = "not explosive"
		out.stage.Evidence = append(out.stage.Evidence, "the bootstrap failed: "+err.Error())
		return out, nil
	}
	out.pFloor = p <= 1/float64(1+explosiveDraws-failed)+1e-12 && (res.PValue == nil || *res.PValue < p)
	if res.PValue != nil {
		p = max(p, *res.PValue)
	}
	out.stage.PValue = schema.F(p)
	out.explosive = p <= alpha
	// Direction: explosive growth, or an accelerating fall that is still
	// accelerating at the end of the sample. An accelerating fall that
	// reverses within the sample (a downturn and recovery) is a turn in the
	// drift, not an explosive root (common practice, no source: the bubble
	// tests' alternative is exuberant growth, Phillips, Wu & Yu 2011).
	if e := peak; out.explosive && e >= 1 {
		h := max(w0/2, 3)
		rising := w.z[e-1] > w.z[max(e-1-h, 0)]
		if !rising && e < T-h {
			out.explosive = false
			res.Reject, res.Episodes = false, nil
			res.Warnings = append(res.Warnings, "the verdict does not read this as explosive: the stretch where the statistic peaks is an accelerating fall that reverses before the end of the sample")
			out.stage.Evidence = append(out.stage.Evidence, fmt.Sprintf("the explosive-looking stretch ending at %s is an accelerating fall that reverses before the end of the sample: a downturn and recovery, not an explosive root", w.dateOf(e)))
		}
	}
	ev := fmt.Sprintf("SADF = %.3f exceeds its tabulated %g critical value; wild bootstrap p %s under an I(1) null with %s (%d draws", stat, alpha, pWithBound(p, out.pFloor), w.driftWords(null), explosiveDraws)
	if failed > 0 {
		ev += fmt.Sprintf(", %d failed", failed)
	}
	out.stage.Evidence = append(out.stage.Evidence, ev+")")
	if out.explosive {
		out.stage.Decision = "explosive"
	} else {
		res.Episodes = nil
		out.stage.Decision = "not explosive"
		res.Reject = false
		res.Warnings = append(res.Warnings, fmt.Sprintf("the tabulated null rejects, but the wild bootstrap under the fitted I(1) null does not (p = %s): the rise is what an integrated series with this drift path and volatility produces", pText(p)))
		res.Episodes = nil
	}
	return out, nil
}
