package decide

// Stage 5: one unit-root decision whose size is controlled as a whole.
//
// Four tests answer the same question under different deterministic
// alternatives: ADF with a constant, ADF with a linear trend (both with BIC
// lags; Said & Dickey 1984), and Zivot & Andrews (1992) with a level shift
// (model A) and with a level and slope shift (model C), each with a trend,
// trimming 0.15 and t-sig lags (at most 8). Running each at 5% and taking any
// rejection would reject a random walk far more often than 5%. Following
// the union-of-rejections principle of Harvey, Leybourne & Taylor (2009,
// 2012), each statistic is divided by its own asymptotic 5% critical value
// and the union statistic is the largest ratio,
//
//	R = max_i τ_i / cv_i,
//
// which rejects for large values. Two steps, both at α:
//
//  1. R against its null quantile under a Gaussian random walk at the
//     series' length (our own simulation, union_table.go; the scaling
//     constant λ(T) = q_{1-α}(T) plays the role of HLT's scaling constant);
//  2. when step 1 rejects, the wild bootstrap of R under the fitted I(1)
//     null (null.go), which carries the series' own changing drift, jumps,
//     autocorrelation and volatility (Cavaliere & Taylor 2008 for the wild
//     bootstrap of unit-root tests under non-stationary volatility).
//
// The unit root is rejected only when both reject; the p-value reported is
// the larger of the two.

import (
	"context"
	"fmt"
	"math"
	"strings"

	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/schema"
)

// unitRootDraws is the number of bootstrap samples of the unit-root stage.
const unitRootDraws = 99

// member is one test of the union.
type member struct {
	id    string
	trend core.Trend
	shift core.Shift
	// cv is the asymptotic 5% critical value that scales the statistic:
	// MacKinnon (2010) Table 2 (β∞, 5%) for ADF; Zivot & Andrews (1992)
	// Tables 2 and 4 (5%, model A -4.80, model C -5.08) for za.
	cv    float64
	label string
}

var members = []member{
	{"adf", core.TrendConstant, 0, -2.86154, "ADF with a constant"},
	{"adf", core.TrendLinear, 0, -3.41049, "ADF with a trend"},
	{"za", core.TrendLinear, core.ShiftLevel, -4.80, "Zivot-Andrews with a level shift"},
	{"za", core.TrendLinear, core.ShiftBoth, -5.08, "Zivot-Andrews with a level and slope shift"},
}

// memberConfig is the configuration of member m: BIC lags for ADF (Said &
// Dickey 1984 augmentation, Schwert's maximum), t-sig lags chosen per
// candidate date for Zivot-Andrews (at most 8; Zivot & Andrews 1992 use a
// t-sig rule). These rules keep the power of the tests; their size under
// strongly negative moving-average errors is restored by the bootstrap,
// whose null takes its short-run dynamics from a long autoregression
// (leadSpec).
func memberConfig(m member) *core.Config {
	c := &core.Config{Trend: m.trend, Shift: m.shift, Workers: 1}
	if m.id == "adf" {
		c.LagRule = core.LagBIC
	}
	return c
}

// maicBroken is the MAIC lag order (Ng & Perron 2001, eq. 9) on the series
// OLS-detrended with a constant, a trend and the level and slope shift at
// the date Zivot-Andrews (level and slope) found, in the manner of Perron &
// Qu (2007) with the break added: MAIC picks a long autoregression when the
// errors have a large negative moving-average root, and a short one for a
// stationary series around a broken trend (without the break terms it would
// read the unmodelled break as persistence). Schwert's maximum; 0 when it
// cannot be computed.
func maicBroken(y []float64, za *schema.Result) int {
	T := len(y)
	if za == nil || len(za.Breaks) == 0 {
		return 0
	}
	tb := za.Breaks[0].Index
	cols := make([][]float64, 4)
	for j := range cols {
		cols[j] = make([]float64, T)
	}
	for i := range T {
		t := float64(i + 1)
		cols[0][i], cols[1][i] = 1, t
		if i+1 > tb {
			cols[2][i], cols[3][i] = 1, t-float64(tb)
		}
	}
	var ls core.LS
	f, err := ls.Fit(cols, y)
	if err != nil {
		return 0
	}
	var c core.Config
	var dw core.DFWork
	k, err := dw.SelectLags(f.Resid, core.TrendNone, core.LagMAIC, c.MaxLagsFor(T, 4))
	if err != nil {
		return 0
	}
	return k
}

// unionStat returns a function computing R on series of length T with its
// own scratch space.
func unionStat(T int) func([]float64) (float64, error) {
	fs := make([]core.StatFunc, len(members))
	for i, m := range members {
		info, err := core.Lookup(m.id)
		if err != nil {
			return func([]float64) (float64, error) { return 0, err }
		}
		c := memberConfig(m)
		c.NoPath = true
		fs[i] = info.StatOf(T, c)
	}
	return func(y []float64) (float64, error) {
		r := math.Inf(-1)
		for i, f := range fs {
			s, err := f(y)
			if err != nil {
				return 0, err
			}
			r = max(r, s/members[i].cv)
		}
		return r, nil
	}
}

type unitRootOut struct {
	stationary bool
	missing    bool
	stage      schema.Stage
	tests      []*schema.Result // by member, nil when failed
	lead       *schema.Result   // the member with the largest ratio
	leadIdx    int
}

func (w *work) unitRoot(ctx context.Context) (*unitRootOut, error) {
	return w.union(ctx, w.z, "")
}

// union runs the union test on x (the series on its scale, or its first
// difference for the order stage, then variant names it).
func (w *work) union(ctx context.Context, x []float64, variant string) (*unitRootOut, error) {
	T := len(x)
	out := &unitRootOut{stage: schema.Stage{Name: "unit-root", Level: w.alpha,
		Method: "union of rejections (Harvey, Leybourne & Taylor 2009, 2012) of ADF (constant; trend) and Zivot-Andrews (level; level and slope), scaled by a simulated constant and confirmed by the wild bootstrap under the fitted I(1) null (Cavaliere & Taylor 2008)"}}
	R := math.Inf(-1)
	for i, m := range members {
		cfg := w.config(m.trend)
		mc := memberConfig(m)
		cfg.Shift, cfg.LagRule = mc.Shift, mc.LagRule
		res, err := w.run(ctx, m.id, x, cfg)
		if err != nil {
			return nil, err
		}
		if res != nil && variant != "" {
			res.Variant = strings.TrimPrefix(res.Variant+", "+variant, ", ")
		} else if res != nil && w.logs {
			res.Variant = strings.TrimPrefix(res.Variant+", log levels", ", ")
		}
		out.tests = append(out.tests, res)
		if res == nil || res.Statistic == nil {
			out.missing = true
			continue
		}
		ratio := *res.Statistic / m.cv
		out.stage.Evidence = append(out.stage.Evidence, fmt.Sprintf("%s: t = %.2f (%.2f of its 5%% critical value %.2f)", m.label, *res.Statistic, ratio, m.cv))
		if ratio > R {
			R, out.lead, out.leadIdx = ratio, res, i
		}
	}
	if out.missing {
		out.stage.Decision = "not computed"
		return out, nil
	}
	out.stage.Statistic = schema.F(R)
	lam := unionQuantile(T, 1-w.alpha)
	pTab := unionP(T, R)
	if pTab < 0.5 {
		out.stage.PValue = schema.F(pTab) // 0.5 is the table's bound: p >= 0.5
	}
	if !(R > lam) {
		out.stage.Decision = "unit root not rejected"
		out.stage.Evidence = append(out.stage.Evidence, fmt.Sprintf("union statistic R = %.3f does not exceed its scaled critical value %.3f at T = %d (p %s)", R, lam, T, pWords(pTab)))
		return out, nil
	}
	mu, db := driftPath(diff(x), 2, 0.15)
	rich := len(members) - 1 // Zivot-Andrews with a level and slope shift nests the others
	kLong := maicBroken(x, out.tests[rich])
	null, err := fitNull(x, leadSpec(members[rich], out.tests[rich], kLong), mu, db)
	if err != nil {
		out.stage.Decision = "unit root not rejected"
		out.stage.Evidence = append(out.stage.Evidence, "the I(1) null could not be fitted for the bootstrap ("+err.Error()+"); the union is not confirmed")
		return out, nil
	}
	p, failed, err := bootstrapP(ctx, null, T, unitRootDraws, w.seed^0x0e1, R, unionStat(T))
	if err != nil {
		if ctx.Err() != nil {
			return nil, err
		}
		out.stage.Decision = "unit root not rejected"
		out.stage.Evidence = append(out.stage.Evidence, "the bootstrap failed: "+err.Error())
		return out, nil
	}
	p = max(p, pTab)
	out.stage.PValue = schema.F(p)
	ev := fmt.Sprintf("union statistic R = %.3f exceeds its scaled critical value %.3f at T = %d; wild bootstrap under an I(1) null with %s: p = %s (%d draws)", R, lam, T, w.driftWords(null), pText(p), unitRootDraws)
	if failed > 0 {
		ev += fmt.Sprintf("; %d draws failed and were left out", failed)
	}
	out.stage.Evidence = append(out.stage.Evidence, ev)
	if p <= w.alpha {
		out.stationary = true
		out.stage.Decision = "unit root rejected"
	} else {
		out.stage.Decision = "unit root not rejected"
	}
	return out, nil
}

func pWords(p float64) string {
	switch {
	case p >= 0.5:
		return ">= 0.5"
	case p < 0.001:
		return "< 0.001"
	}
	return fmt.Sprintf("= %.3f", p)
}

// leadSpec is the regression whose dynamics the bootstrap null takes
// (null.go): the deterministic terms and break date of a member (the
// procedure passes Zivot-Andrews with a level and slope shift, whose
// regression nests those of the other members, so that whatever level or
// trend change the series has is in the regression and not in the γ_j),
// with the larger of its own lag order and kLong, the order MAIC chooses.
// MAIC picks long autoregressions exactly when the errors have a large
// negative moving-average root, so the recoloured bootstrap samples carry
// that root and the bootstrap distribution of R shifts with it (the
// members' own short lag rules over-reject there); for a stationary series
// the unrestricted regression puts the persistence in ρ, not in the γ_j,
// and the bootstrap keeps its power (Palm, Smeekes & Urbain 2008).
func leadSpec(m member, r *schema.Result, kLong int) dynSpec {
	s := dynSpec{k: max(r.Lags, kLong), trend: m.trend}
	if m.id == "za" && len(r.Breaks) > 0 {
		tb := r.Breaks[0].Index
		s.du = []int{tb}
		if m.shift == core.ShiftBoth || m.shift == core.ShiftSlope {
			s.dt = []int{tb}
		}
		if m.shift == core.ShiftSlope {
			s.du = nil
		}
	}
	return s
}
