package breaks

// Lee & Strazicich (2013) minimum LM unit-root test with one structural
// break: Lee, J. & Strazicich, M.C. (2013), "Minimum LM unit root test with
// one structural break", Economics Bulletin 33(4), 2483-2492, building on
// the LM (score) test of Schmidt & Phillips (1992), Oxford Bulletin of
// Economics and Statistics 54(3), 257-287.
//
// Data generating process: y_t = δ'Z_t + X_t, X_t = β X_{t-1} + ε_t, with
// Z_t = [1, t, D_t] (crash model A) or [1, t, D_t, DT_t] (break model C),
// D_t = 1(t >= TB+1), DT_t = (t - TB) 1(t >= TB+1); TB is the last
// observation of the old regime. The LM statistic is the t-ratio τ on φ in
//
//	Δy_t = δ'ΔZ_t + φ S̃_{t-1} + Σ_{i=1}^{k} γ_i ΔS̃_{t-i} + u_t,
//
// with S̃_t = y_t - ψ̃ - Z_t δ̃, δ̃ from the regression of Δy_t on ΔZ_t and
// ψ̃ = y_1 - Z_1 δ̃ (Lee & Strazicich 2013, eqs. (1)-(3)). The break date
// minimises τ over the candidates (Lee & Strazicich trim 10% at each end;
// here the trimming is cfg.TrimOr(), project default 15%, and TB >= k+3 so
// that every break regressor varies inside the regression sample t >= k+2). The lag
// order is chosen per candidate by the general-to-specific t-sig rule with
// kmax = 8, as Lee & Strazicich do, or fixed. The LM statistic is invariant
// to the level and slope of the series and, in the crash model, its
// null distribution does not depend on the break under the null.

import (
	"context"
	"fmt"

	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/schema"
)

const ls1Citation = "Lee & Strazicich (2013), Economics Bulletin 33(4), eqs. (1)-(3); Schmidt & Phillips (1992) LM test"

func init() {
	core.Register(core.Info{
		ID:       "ls1",
		Name:     "Lee-Strazicich minimum LM test, one break",
		Null:     "unit root with one break (level, or level and slope) under the null",
		Tail:     "left",
		Citation: ls1Citation,
		Run:      runLS1,
		NewStat:  newStatLS1,
	})
}

// lmModelOf maps cfg.Shift to the LM break model.
func lmModelOf(id string, s core.Shift, nb int) (lmModel, error) {
	switch s {
	case core.ShiftLevel:
		return lmModel{nb: nb}, nil
	case core.ShiftBoth:
		return lmModel{nb: nb, slope: true}, nil
	}
	return lmModel{}, core.Errorf(id, core.ErrSettings,
		"shift %q: Lee & Strazicich define the crash model (level) and the break model (level+slope) only", s)
}

// lmPrepare validates the input and resolves lags and candidates of an LM test.
func lmPrepare(id string, y []float64, cfg *core.Config, nb int) (m lmModel, spec lmLagSpec, lo, hi int, err error) {
	if cfg == nil {
		cfg = &core.Config{}
	}
	if err = CheckSeries(id, y, 20); err != nil {
		return
	}
	if m, err = lmModelOf(id, cfg.Shift, nb); err != nil {
		return
	}
	T := len(y)
	if spec, err = lmLagSpecFor(id, cfg, T, m.nz()+1); err != nil {
		return
	}
	lo, hi, err = Candidates(T, cfg.TrimOr())
	if err != nil {
		err = WrapError(id, err)
		return
	}
	lo = max(lo, spec.k+3) // every break regressor varies inside t >= k+2
	if lo+(nb-1)*lmMinGap > hi {
		err = core.Errorf(id, core.ErrTooShort, "no break candidate left with T=%d, trimming %g and %d lags", T, cfg.TrimOr(), spec.k)
	}
	return
}

func runLS1(ctx context.Context, y []float64, cfg *core.Config) (*schema.Result, error) {
	const id = "ls1"
	if cfg == nil {
		cfg = &core.Config{}
	}
	m, spec, lo, hi, err := lmPrepare(id, y, cfg, 1)
	if err != nil {
		return nil, err
	}
	var w lmWork
	w.setup(y, spec.k)
	f := func(tbs []int) (float64, int, int, error) { return w.lmStat(m, tbs, spec) }
	r, serr := lmSearch1(ctx, lo, hi, f, !cfg.NoPath)
	if err := lmSearchError(id, r, serr); err != nil {
		return nil, err
	}
	T := len(y)
	res := lmResult(id, cfg, m, spec, r, T)
	res.Breaks = []schema.Break{BreakAt(r.tbs[0], T, cfg)}
	res.Path = r.path
	lam := float64(r.tbs[0]) / float64(T)
	applyLMInference(res, id, m, []float64{lam}, cfg, T)
	if info, e := core.Lookup(id); e == nil {
		if err := core.AddSimulated(ctx, info, T, cfg, res); err != nil {
			return nil, WrapError(id, err)
		}
	}
	return res, nil
}

func newStatLS1(T int, cfg *core.Config) core.StatFunc {
	return newStatLM("ls1", 1, cfg)
}

// newStatLM returns the statistic-only closure of ls1/ls2.
func newStatLM(id string, nb int, cfg *core.Config) core.StatFunc {
	var w lmWork
	return func(y []float64) (float64, error) {
		m, spec, lo, hi, err := lmPrepare(id, y, cfg, nb)
		if err != nil {
			return 0, err
		}
		w.setup(y, spec.k)
		f := func(tbs []int) (float64, int, int, error) { return w.lmStat(m, tbs, spec) }
		var r lmSearchResult
		var serr error
		if nb == 1 {
			r, serr = lmSearch1(nil, lo, hi, f, false)
		} else {
			r, serr = lmSearch2(nil, lo, hi, f, false)
		}
		if err := lmSearchError(id, r, serr); err != nil {
			return 0, err
		}
		return r.tau, nil
	}
}

// lmResult fills the fields common to ls1 and ls2.
func lmResult(id string, cfg *core.Config, m lmModel, spec lmLagSpec, r lmSearchResult, T int) *schema.Result {
	variant := "crash (model A)"
	shift := core.ShiftLevel
	if m.slope {
		variant, shift = "break (model C)", core.ShiftBoth
	}
	res := &schema.Result{
		Test:      id,
		Variant:   variant,
		Trend:     core.TrendLinear.String(),
		Shift:     shift.String(),
		Statistic: schema.F(r.tau),
		Tail:      "left",
		Lags:      r.k,
		LagRule:   lmLagRuleName(spec),
		NObs:      r.nobs,
		Null:      fmt.Sprintf("unit root with %d break(s) under the null (LM test, breaks allowed under both hypotheses)", m.nb),
		Level:     cfg.LevelOr(),
	}
	if cfg.Trend != core.TrendLinear && cfg.Trend != core.TrendConstant {
		res.Warnings = append(res.Warnings, "the LM break tests always include a constant and a linear trend (Schmidt & Phillips 1992); the trend setting was ignored")
	}
	return res
}
