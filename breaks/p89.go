package breaks

// Perron (1989): a unit-root test with one break at a known date TB, in the
// innovational-outlier form of Perron's section 4 (eqs. (13)-(15)):
//
//	Model A (crash):           y_t = μ + θ DU_t + β t         + d D(TB)_t + α y_{t-1} + Σ_{i=1..k} c_i Δy_{t-i} + e_t   (13)
//	Model B (changing growth): y_t = μ + θ DU_t + β t + γ DT_t             + α y_{t-1} + Σ c_i Δy_{t-i} + e_t         (14)
//	Model C (both):            y_t = μ + θ DU_t + β t + γ DT_t + d D(TB)_t + α y_{t-1} + Σ c_i Δy_{t-i} + e_t         (15)
//
// with DU_t = 1(t > TB), DT_t = (t - TB) 1(t > TB) (Perron's DT*_t; with DU
// present it spans the same space as his DT_t = t 1(t > TB)) and
// D(TB)_t = 1(t = TB+1). The statistic is the t-ratio for α = 1, computed
// from the same regression written in differences. Critical values are
// Perron's asymptotic percentiles (Tables IV.B, V.B, VI.B) interpolated at
// λ = TB/T. The lag order is fixed, or chosen once at TB by the t-sig rule
// with kmax = 8 (Perron's section 5: the last lag significant at 10%).

import (
	"context"

	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/schema"
)

func init() {
	core.Register(core.Info{
		ID:       "p89",
		Name:     "Perron (1989) unit-root test with a known break",
		Null:     p89Null,
		Tail:     "left",
		Citation: "Perron, P. (1989), Econometrica 57(6), 1361-1401, eqs. (13)-(15), Tables IV.B, V.B, VI.B",
		Run:      runP89,
		NewStat:  newP89Stat,
	})
}

const p89Null = "unit root (with drift) with a change in the drift/level at the known date TB " +
	"(Perron 1989, null models (1)-(3))"

// p89Terms are the break regressors of Perron's IO models: A DU + D(TB),
// B DU + DT, C DU + DT + D(TB).
func p89Terms(s core.Shift) Terms {
	switch s {
	case core.ShiftSlope:
		return Terms{Level: true, Slope: true}
	case core.ShiftBoth:
		return Terms{Level: true, Slope: true, Dummy: true}
	}
	return Terms{Level: true, Dummy: true}
}

// p89Spec builds the one-candidate search of p89.
func p89Spec(cfg *core.Config, T int) (Spec, error) {
	const id = "p89"
	if cfg.Shift < core.ShiftLevel || cfg.Shift > core.ShiftBoth {
		return Spec{}, core.Errorf(id, core.ErrSettings, "unknown shift %d", cfg.Shift)
	}
	tb := cfg.BreakIndex
	if tb == 0 {
		return Spec{}, core.Errorf(id, core.ErrSettings, "p89 needs a known break date (--break-date, or break_date in the settings: a date or observation number, the last observation of the old regime)")
	}
	if tb < MinHead || tb > T-MinTail {
		return Spec{}, core.Errorf(id, core.ErrSettings, "break date %d outside %d..%d", tb, MinHead, T-MinTail)
	}
	terms := p89Terms(cfg.Shift)
	rule, lags, kmax, err := ioLagPlan(id, cfg, T, 2+terms.Count())
	if err != nil {
		return Spec{}, err
	}
	if rule == core.LagFixed {
		if tb < lags+2 {
			return Spec{}, core.Errorf(id, core.ErrSettings, "break date %d is too early for %d lags (need TB >= %d)", tb, lags, lags+2)
		}
	} else {
		kmax = min(kmax, tb-2)
	}
	return Spec{Trend: core.TrendLinear, Terms: terms, LagRule: rule, Lags: lags, MaxLags: kmax, Lo: tb, Hi: tb}, nil
}

func runP89(ctx context.Context, y []float64, cfg *core.Config) (*schema.Result, error) {
	if cfg == nil {
		cfg = &core.Config{}
	}
	const id = "p89"
	if err := CheckSeries(id, y, ioMinObs); err != nil {
		return nil, err
	}
	T := len(y)
	spec, err := p89Spec(cfg, T)
	if err != nil {
		return nil, err
	}
	w := getSearcher()
	best, _, err := w.Search(y, &spec, false)
	putSearcher(w)
	if err != nil {
		return nil, WrapError(id, err)
	}
	res := ioResult(id, y, cfg, &spec, best, nil)
	res.Warnings = nil // the date is given, not searched
	res.Null = p89Null
	res.Variant = "model " + modelName(cfg.Shift) + " (innovational outlier)"
	lambda := float64(best.TB) / float64(T)
	res.CriticalValues = Perron89Critical(cfg.Shift, lambda)
	res.CriticalSource = perron89Source
	res.PValueMethod = "none: Perron (1989) tabulates percentiles only; the decision uses his critical values " +
		"interpolated at lambda = TB/T and, between levels, linearly in the level"
	if res.Statistic != nil {
		res.Reject = Decide(*res.Statistic, nil, res.CriticalValues, "left", cfg.LevelOr())
	}
	if err := ctx.Err(); err != nil {
		return nil, core.Errorf(id, core.ErrCancelled, "%v", err)
	}
	if info, err := core.Lookup(id); err == nil {
		if err := core.AddSimulated(ctx, info, T, cfg, res); err != nil {
			return nil, WrapError(id, err)
		}
	}
	return res, nil
}

// newP89Stat is the statistic-only path of p89 for the simulation engine.
func newP89Stat(T int, cfg *core.Config) core.StatFunc {
	if cfg == nil {
		cfg = &core.Config{}
	}
	spec, err := p89Spec(cfg, T)
	spec.OnlyTAlpha = true
	var w Searcher
	return func(y []float64) (float64, error) {
		if err != nil {
			return 0, err
		}
		if len(y) != T {
			return 0, core.Errorf("p89", core.ErrSettings, "series length %d, statistic prepared for %d", len(y), T)
		}
		if err := CheckSeries("p89", y, ioMinObs); err != nil {
			return 0, err
		}
		c, _, err := w.Search(y, &spec, false)
		if err != nil {
			return 0, WrapError("p89", err)
		}
		return c.TAlpha, nil
	}
}
