package breaks

// Perron (1997), innovational-outlier tests with one break at an unknown
// date. For every candidate TB the regression (Perron 1997, eqs. (1) and
// (2); Perron 1989 eqs. (13) and (15))
//
//	IO1 (level): y_t = μ + θ DU_t + β t         + δ D(TB)_t + α y_{t-1} + Σ_{i=1..k} c_i Δy_{t-i} + e_t
//	IO2 (both):  y_t = μ + θ DU_t + β t + γ DT_t + δ D(TB)_t + α y_{t-1} + Σ c_i Δy_{t-i} + e_t
//
// is estimated (in differences), keeping the one-time dummy D(TB)_t that
// Zivot & Andrews drop. The break date is chosen by one of Perron's rules
// (core.Config.BreakRule): 0 minimises t_α, 1 maximises |t_θ|, 2 maximises
// |t_γ| (IO2 only). The lag order is chosen for each TB by the t-sig rule
// with kmax = 8 (Perron 1997, section 2), or fixed, or by AIC/BIC. A change
// in slope alone is handled in the additive-outlier form only (pao), as in
// Perron (1997). Critical values and p-values come from our own simulation
// (gen_tables.go): Perron's (1997) tables are not available to the project.

import (
	"context"

	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/schema"
)

func init() {
	core.Register(core.Info{
		ID:       "pio",
		Name:     "Perron (1997) innovational-outlier unit-root test with one endogenous break",
		Null:     pioNull,
		Tail:     "left",
		Citation: "Perron, P. (1997), J. Econometrics 80(2), 355-385, eqs. (1)-(2); Perron (1989) eqs. (13), (15)",
		Run:      runPIO,
		NewStat:  newPIOStat,
	})
}

const pioNull = "unit root (with drift) and no structural break: y_t = mu + y_{t-1} + e_t " +
	"(the critical values assume no break under the null)"

// breakRuleOf reads core.Config.BreakRule for a model and checks that the
// rule's coefficient is in it.
func breakRuleOf(id string, cfg *core.Config) (BreakRule, error) {
	r := BreakRule(cfg.BreakRule)
	switch r {
	case MinTAlpha:
	case MaxAbsTLevel:
		if cfg.Shift == core.ShiftSlope {
			return 0, core.Errorf(id, core.ErrSettings, "break rule 1 (max |t| on the level shift) needs a level shift in the model")
		}
	case MaxAbsTSlope:
		if cfg.Shift == core.ShiftLevel {
			return 0, core.Errorf(id, core.ErrSettings, "break rule 2 (max |t| on the slope shift) needs a slope shift in the model")
		}
	default:
		return 0, core.Errorf(id, core.ErrSettings, "unknown break rule %d (want 0, 1 or 2)", cfg.BreakRule)
	}
	return r, nil
}

func pioSpec(cfg *core.Config, T int) (Spec, error) {
	const id = "pio"
	if cfg.Shift == core.ShiftSlope {
		return Spec{}, core.Errorf(id, core.ErrSettings, "a slope change alone is tested in the additive-outlier form: use pao (Perron 1997)")
	}
	rule, err := breakRuleOf(id, cfg)
	if err != nil {
		return Spec{}, err
	}
	spec, err := ioSpec(id, cfg, T, true)
	spec.Rule = rule
	return spec, err
}

func runPIO(ctx context.Context, y []float64, cfg *core.Config) (*schema.Result, error) {
	if cfg == nil {
		cfg = &core.Config{}
	}
	const id = "pio"
	if err := CheckSeries(id, y, ioMinObs); err != nil {
		return nil, err
	}
	spec, err := pioSpec(cfg, len(y))
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
	res.Null = pioNull
	res.Variant = map[core.Shift]string{core.ShiftLevel: "IO1", core.ShiftBoth: "IO2"}[cfg.Shift] + ", break by " + spec.Rule.String()
	finishSimulated(res, id, cfg, spec.Rule)
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

// finishSimulated sets critical values, p-value and decision from our own
// simulated table for (test, model, rule).
func finishSimulated(res *schema.Result, id string, cfg *core.Config, rule BreakRule) {
	t := findIOTable(id, cfg.Shift, rule)
	if t != nil {
		res.CriticalValues = t.critical()
		res.CriticalSource = "not published values: quantiles of " + t.source()
	} else {
		res.CriticalValues = map[string]float64{}
	}
	ioApplyTable(res, t, cfg)
}

func newPIOStat(T int, cfg *core.Config) core.StatFunc {
	if cfg == nil {
		cfg = &core.Config{}
	}
	rule, err := breakRuleOf("pio", cfg)
	if err == nil && cfg.Shift == core.ShiftSlope {
		_, err = pioSpec(cfg, T)
	}
	if err != nil {
		return func([]float64) (float64, error) { return 0, err }
	}
	return newIOStat("pio", T, cfg, true, rule)
}
