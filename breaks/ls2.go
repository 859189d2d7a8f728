package breaks

// Lee & Strazicich (2003) minimum LM unit-root test with two structural
// breaks: Lee, J. & Strazicich, M.C. (2003), "Minimum Lagrange Multiplier
// Unit Root Test with Two Structural Breaks", Review of Economics and
// Statistics 85(4), 1082-1089, eqs. (1)-(3) and (5).
//
// As ls1 (see ls1.go) with Z_t = [1, t, D_1t, D_2t] (crash model A) or
// [1, t, D_1t, D_2t, DT_1t, DT_2t] (break model C), D_jt = 1(t >= TB_j+1),
// DT_jt = (t - TB_j) 1(t >= TB_j+1). The pair (TB_1, TB_2) minimises the
// t-ratio on φ over the grid lo <= TB_1, TB_1 + 2 <= TB_2 <= hi (the smallest
// gap with a non-singular break model; trimming cfg.TrimOr(), project
// default 15%, where Lee & Strazicich trim 10%). The lag order is chosen
// per pair by the t-sig rule with kmax = 8 or fixed.
//
// Every pair reuses the data cross-products built once per series (see
// ls.go): a pair only changes break atoms and combination weights, so the
// cost per pair does not grow with T.

import (
	"context"
	"math"

	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/schema"
)

func init() {
	core.Register(core.Info{
		ID:       "ls2",
		Name:     "Lee-Strazicich minimum LM test, two breaks",
		Null:     "unit root with two breaks (level, or level and slope) under the null",
		Tail:     "left",
		Citation: "Lee & Strazicich (2003), Review of Economics and Statistics 85(4), eqs. (1)-(3), (5)",
		Run:      runLS2,
		NewStat:  func(T int, cfg *core.Config) core.StatFunc { return newStatLM("ls2", 2, cfg) },
	})
}

func runLS2(ctx context.Context, y []float64, cfg *core.Config) (*schema.Result, error) {
	const id = "ls2"
	if cfg == nil {
		cfg = &core.Config{}
	}
	m, spec, lo, hi, err := lmPrepare(id, y, cfg, 2)
	if err != nil {
		return nil, err
	}
	var w lmWork
	w.setup(y, spec.k)
	f := func(tbs []int) (float64, int, int, error) { return w.lmStat(m, tbs, spec) }
	r, serr := lmSearch2(ctx, lo, hi, f, !cfg.NoPath)
	if err := lmSearchError(id, r, serr); err != nil {
		return nil, err
	}
	T := len(y)
	res := lmResult(id, cfg, m, spec, r, T)
	res.Breaks = []schema.Break{BreakAt(r.tbs[0], T, cfg), BreakAt(r.tbs[1], T, cfg)}
	res.Surface = lmSurface(r, cfg)
	lams := []float64{float64(r.tbs[0]) / float64(T), float64(r.tbs[1]) / float64(T)}
	applyLMInference(res, id, m, lams, cfg, T)
	if info, e := core.Lookup(id); e == nil {
		if err := core.AddSimulated(ctx, info, T, cfg, res); err != nil {
			return nil, WrapError(id, err)
		}
	}
	return res, nil
}

// lmSurface summarises a two-break search.
func lmSurface(r lmSearchResult, cfg *core.Config) *schema.Surface {
	s := &schema.Surface{Candidates: r.ncand, Min: r.lo, Max: r.hi}
	if math.IsInf(s.Min, 0) || math.IsInf(s.Max, 0) {
		s.Min, s.Max = 0, 0
	}
	if !cfg.NoPath {
		s.Rows = r.rows
	}
	return s
}
