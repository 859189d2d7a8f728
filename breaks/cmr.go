package breaks

// Clemente, Montanes & Reyes (1998) unit-root tests with one or two shifts
// in the mean: Clemente, J., Montanes, A. & Reyes, M. (1998), "Testing for a
// unit root in variables with a double change in the mean", Economics
// Letters 59(2), 175-182, extending Perron & Vogelsang (1992), "Nonstationarity
// and Level Shifts With an Application to Purchasing Power Parity", JBES
// 10(3), 301-320, from one to two breaks. Only a constant is allowed (the
// series are non-trending; the trend setting is ignored with a warning).
//
// The test id is "meanshift"; the outlier type (core.Config.Outlier) and the
// number of shifts (core.Config.Shifts, 1 or 2) are settings.
//
// Innovational outlier (the default; Perron & Vogelsang 1992 eq. (2),
// Clemente et al. 1998 eq. (3)), one step:
//
//	y_t = μ + Σ_j δ_j DU_jt + Σ_j θ_j D(TB_j)_t + ρ y_{t-1} + Σ_{i=1}^{k} c_i Δy_{t-i} + e_t.
//
// Additive outlier ( Perron & Vogelsang 1992 eqs. (3)-(4),
// Clemente et al. 1998 eqs. (1)-(2)), two steps: ỹ_t are the residuals of
// y_t on [1, DU_jt]; then
//
//	ỹ_t = Σ_j Σ_{i=0}^{k} ω_ji D(TB_j)_{t-i} + ρ ỹ_{t-1} + Σ_{i=1}^{k} c_i Δỹ_{t-i} + e_t.
//
// DU_jt = 1(t > TB_j), D(TB_j)_t = 1(t = TB_j + 1). The statistic is the
// t-ratio for ρ = 1, minimised over the break dates (two breaks jointly;
// TB_2 >= TB_1 + 2, and TB_2 >= TB_1 + k + 2 in the AO form so that the
// dummies of the two breaks never coincide), with k chosen per candidate by
// the t-sig rule with kmax = 8 or fixed. Trimming is cfg.TrimOr(), default
// 15%.

import (
	"context"
	"fmt"

	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/schema"
)

func init() {
	core.Register(core.Info{
		ID:       "meanshift",
		Name:     "Mean-shift unit-root test (Perron-Vogelsang one shift, Clemente-Montanes-Reyes two shifts; innovational or additive outlier)",
		Null:     "unit root; the mean shifts enter the null as one-time jumps",
		Tail:     "left",
		Citation: "Perron & Vogelsang (1992), JBES 10(3), eqs. (2)-(4); Clemente, Montanes & Reyes (1998), Economics Letters 59(2), eqs. (1)-(3)",
		Run: func(ctx context.Context, y []float64, cfg *core.Config) (*schema.Result, error) {
			return runCMR(ctx, "meanshift", y, cfg)
		},
		NewStat: func(T int, cfg *core.Config) core.StatFunc { return newStatADF("meanshift", cfg) },
	})
}

// meanShiftKey is the key of the meanshift test's tables under its
// settings: "meanshift/innovational-1", "meanshift/additive-2", ...
func meanShiftKey(a adfTest) string {
	form := core.OutlierInnovational
	if a.form == formAO {
		form = core.OutlierAdditive
	}
	return fmt.Sprintf("meanshift/%s-%d", form, a.nb)
}

func runCMR(ctx context.Context, id string, y []float64, cfg *core.Config) (*schema.Result, error) {
	if cfg == nil {
		cfg = &core.Config{}
	}
	res, a, _, err := runADF(ctx, id, y, cfg)
	if err != nil {
		return nil, err
	}
	res.Trend = core.TrendConstant.String()
	res.Null = "unit root with one-time jumps at the break dates (mean shifts under the alternative)"
	form := "innovational outlier"
	if a.form == formAO {
		form = "additive outlier"
	}
	res.Variant = fmt.Sprintf("%s, %d mean shift(s)", form, a.nb)
	if cfg.Trend != core.TrendConstant {
		res.Warnings = append(res.Warnings, fmt.Sprintf("%s allows a constant only (Clemente, Montanes & Reyes 1998); the trend setting %q was ignored", id, cfg.Trend))
	}
	applySearchInference(res, meanShiftKey(a), "the minimum t statistic", cfg, nil)
	if info, e := core.Lookup(id); e == nil {
		if err := core.AddSimulated(ctx, info, len(y), cfg, res); err != nil {
			return nil, WrapError(id, err)
		}
	}
	return res, nil
}
