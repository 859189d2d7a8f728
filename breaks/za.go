package breaks

// Zivot & Andrews (1992): a unit-root test against trend stationarity with
// one break at an unknown date. For every candidate TB the regression
//
//	Model A (level):  Δy_t = c + b t + θ DU_t         + (α-1) y_{t-1} + Σ_{j=1..k} c_j Δy_{t-j} + e_t   (ZA eq. (1))
//	Model B (slope):  Δy_t = c + b t + γ DT_t         + (α-1) y_{t-1} + Σ c_j Δy_{t-j} + e_t           (ZA eq. (2))
//	Model C (both):   Δy_t = c + b t + θ DU_t + γ DT_t + (α-1) y_{t-1} + Σ c_j Δy_{t-j} + e_t           (ZA eq. (3))
//
// is estimated (written in differences: the t-ratio of α-1 equals ZA's
// t-ratio for α = 1 in the levels form), with DU_t = 1(t > TB) and
// DT_t = (t - TB) 1(t > TB) and no one-time dummy; the statistic is
// inf_TB t_α (ZA eq. (4)), over TB in the trimmed range. The lag order k is
// chosen for each TB by the general-to-specific t-sig rule with kmax = 8
// (ZA section 3, following Perron 1989), or fixed, or by AIC/BIC.

import (
	"context"
	"fmt"
	"math"

	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/schema"
)

// DefaultMaxLags is kmax of the t-sig rule in Perron (1989), Zivot & Andrews
// (1992) and Perron (1997) when core.Config.MaxLags is 0.
const DefaultMaxLags = 8

// ioMinObs is the shortest series any test of this file accepts.
const ioMinObs = 20

func init() {
	core.Register(core.Info{
		ID:       "za",
		Name:     "Zivot-Andrews unit-root test with one endogenous break",
		Null:     zaNull,
		Tail:     "left",
		Citation: "Zivot, E. & Andrews, D.W.K. (1992), JBES 10(3), 251-270, eqs. (1)-(4)",
		Run:      runZA,
		NewStat:  newZAStat,
	})
}

const zaNull = "unit root (with drift) and no structural break: y_t = mu + y_{t-1} + e_t"

// ioLagPlan resolves the lag settings of a break regression with extra
// deterministic and break columns: the rule (core.LagTSig by default), the
// fixed order, and kmax (cfg.MaxLags, else DefaultMaxLags, reduced so that
// the kmax regression keeps at least 10 degrees of freedom, as
// core.Config.MaxLagsFor does).
func ioLagPlan(id string, cfg *core.Config, T, extra int) (rule core.LagRule, lags, kmax int, err error) {
	rule = cfg.LagRule.Or(core.LagTSig)
	switch rule {
	case core.LagFixed:
		if cfg.Lags < 0 {
			return 0, 0, 0, core.Errorf(id, core.ErrSettings, "negative lag order %d", cfg.Lags)
		}
		lags = cfg.Lags
		if T-lags-1-(lags+extra+1) < 5 {
			return 0, 0, 0, core.Errorf(id, core.ErrTooShort, "%d observations are too few for %d lags", T, lags)
		}
		return rule, lags, lags, nil
	case core.LagTSig, core.LagAIC, core.LagBIC:
	default:
		return 0, 0, 0, core.Errorf(id, core.ErrSettings, "lag rule %s is not available here (use tsig, aic, bic or fixed)", rule)
	}
	kmax = DefaultMaxLags
	if cfg.MaxLags > 0 {
		kmax = cfg.MaxLags
	}
	for kmax > 0 && T-kmax-1-(kmax+extra+1) < 10 {
		kmax--
	}
	return rule, 0, kmax, nil
}

// ioSpec builds the search specification of za (dummy false) and pio
// (dummy true) from cfg for a series of length T.
func ioSpec(id string, cfg *core.Config, T int, dummy bool) (Spec, error) {
	if cfg.Shift < core.ShiftLevel || cfg.Shift > core.ShiftBoth {
		return Spec{}, core.Errorf(id, core.ErrSettings, "unknown shift %d", cfg.Shift)
	}
	terms := TermsOf(cfg.Shift, dummy)
	rule, lags, kmax, err := ioLagPlan(id, cfg, T, 2+terms.Count())
	if err != nil {
		return Spec{}, err
	}
	lo, hi, err := Candidates(T, cfg.TrimOr())
	if err != nil {
		return Spec{}, WrapError(id, err)
	}
	if lo, hi, err = restrictCandidates(lo, hi, cfg); err != nil {
		return Spec{}, WrapError(id, err)
	}
	return Spec{Trend: core.TrendLinear, Terms: terms, LagRule: rule, Lags: lags, MaxLags: kmax, Lo: lo, Hi: hi}, nil
}

func runZA(ctx context.Context, y []float64, cfg *core.Config) (*schema.Result, error) {
	if cfg == nil {
		cfg = &core.Config{}
	}
	const id = "za"
	if err := CheckSeries(id, y, ioMinObs); err != nil {
		return nil, err
	}
	spec, err := ioSpec(id, cfg, len(y), false)
	if err != nil {
		return nil, err
	}
	w := getSearcher()
	best, path, err := w.Search(y, &spec, !cfg.NoPath)
	if err != nil {
		putSearcher(w)
		return nil, WrapError(id, err)
	}
	res := ioResult(id, y, cfg, &spec, best, path) // copies the path
	putSearcher(w)
	res.Null = zaNull
	res.Variant = "model " + modelName(cfg.Shift)
	res.CriticalValues = ZACritical(cfg.Shift)
	res.CriticalSource = zaSource
	ioApplyTable(res, findIOTable(id, cfg.Shift, MinTAlpha), cfg)
	if err := ctx.Err(); err != nil {
		return nil, core.Errorf(id, core.ErrCancelled, "%v", err)
	}
	if info, err := core.Lookup(id); err == nil {
		if err := core.AddSimulated(ctx, info, len(y), cfg, res); err != nil {
			return nil, WrapError(id, err)
		}
	}
	return res, nil
}

// newZAStat is the statistic-only path of za for the simulation engine.
func newZAStat(T int, cfg *core.Config) core.StatFunc {
	return newIOStat("za", T, cfg, false, MinTAlpha)
}

// newIOStat returns a StatFunc running the za/pio search with its own scratch.
func newIOStat(id string, T int, cfg *core.Config, dummy bool, rule BreakRule) core.StatFunc {
	if cfg == nil {
		cfg = &core.Config{}
	}
	spec, err := ioSpec(id, cfg, T, dummy)
	spec.Rule = rule
	spec.OnlyTAlpha = true
	var w Searcher
	return func(y []float64) (float64, error) {
		if err != nil {
			return 0, err
		}
		if len(y) != T {
			return 0, core.Errorf(id, core.ErrSettings, "series length %d, statistic prepared for %d", len(y), T)
		}
		if err := CheckSeries(id, y, ioMinObs); err != nil {
			return 0, err
		}
		c, _, err := w.Search(y, &spec, false)
		if err != nil {
			return 0, WrapError(id, err)
		}
		return c.TAlpha, nil
	}
}

// ioResult fills the parts of a result common to the IO searches.
func ioResult(id string, y []float64, cfg *core.Config, spec *Spec, best Candidate, path []Candidate) *schema.Result {
	T := len(y)
	res := &schema.Result{
		Test:      id,
		Trend:     core.TrendLinear.String(),
		Shift:     cfg.Shift.String(),
		Statistic: schema.F(best.TAlpha),
		Tail:      "left",
		Lags:      best.Lags,
		LagRule:   spec.LagRule.String(),
		NObs:      best.NObs,
		Level:     cfg.LevelOr(),
		Breaks:    []schema.Break{BreakAt(best.TB, T, cfg)},
		Estimates: map[string]float64{"alpha": best.Alpha, "lambda": float64(best.TB) / float64(T)},
	}
	for name, v := range map[string]float64{"t_level": best.TLevel, "t_slope": best.TSlope, "t_dummy": best.TDummy} {
		if !math.IsNaN(v) && !math.IsInf(v, 0) {
			res.Estimates[name] = v
		}
	}
	if spec.LagRule != core.LagFixed {
		res.Estimates["max_lags"] = float64(spec.MaxLags)
	}
	if cfg.Trend != core.TrendLinear && cfg.Trend != core.TrendConstant {
		// TrendConstant is the zero value (not set); an explicit "none"
		// cannot apply: these models contain a constant and a trend.
		res.Warnings = append(res.Warnings, fmt.Sprintf("trend %q ignored: the %s regression contains a constant and a linear trend by construction", cfg.Trend.String(), id))
	}
	if len(path) > 0 {
		res.Path = make([]schema.PathPoint, len(path))
		for i, c := range path {
			res.Path[i] = schema.PathPoint{Index: c.TB, Statistic: c.TAlpha}
		}
	}
	lo := max(spec.Lo, spec.kmax()+2)
	if best.TB == lo || best.TB == spec.Hi {
		res.Warnings = append(res.Warnings, fmt.Sprintf("the break date %d is at the edge of the candidate range %d..%d: "+
			"the break may lie outside the trimmed window", best.TB, lo, spec.Hi))
	}
	return res
}

// ioApplyTable sets the p-value from a simulated table (or states that
// there is none) and the decision.
func ioApplyTable(res *schema.Result, t *ioTable, cfg *core.Config) {
	if t == nil || res.Statistic == nil {
		res.PValueMethod = "none: no simulated table for this model; decision from the critical values"
	} else {
		p, clamped := t.pValue(*res.Statistic)
		res.PValue = &p
		res.PValueMethod = "interpolated in the quantiles of " + t.source() +
			"; a large-sample approximation: with lag selection in short samples the finite-sample p-value (--sims) is more reliable"
		if clamped {
			res.Warnings = append(res.Warnings, fmt.Sprintf("the statistic lies beyond the simulated table: "+
				"p-value reported at the table end (%g)", p))
		}
	}
	if res.Statistic != nil {
		res.Reject = Decide(*res.Statistic, res.PValue, res.CriticalValues, res.Tail, cfg.LevelOr())
	}
}
