package decide

// Stage 5: one unit-root decision whose size is controlled as a whole.
//
// Four tests answer the same question under different deterministic
// alternatives: ADF with a constant, ADF with a linear trend (both with BIC
// lags; Said & Dickey 1984), and Zivot & Andrews (1992) with a level shift
// (model A) and with a level and slope shift (model C), each with a trend,
// trimming 0.15 and one lag order for every candidate date (BIC, at most 8,
// at the least-squares broken-trend date; malags.go). When the differences carry the
// signature of a large negative moving-average root, every member takes
// long lags instead (MAIC; malags.go), with its own null table. Running each at 5% and taking any
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
//     series' length, for the branch of lag rules in use (our own
//     simulation, union_table.go; the scaling constant λ(T) = q_{1-α}(T)
//     plays the role of HLT's scaling constant);
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

	"github.com/rootshift/rootshift/breaks"
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
// Dickey 1984 augmentation, Schwert's maximum) in the short-lag branch and
// MAIC (Ng & Perron 2001) in the long-lag branch (malags.go: the
// differences carry the signature of a large negative moving-average root);
// Zivot-Andrews at the one order zaLag for every candidate date (malags.go,
// trendBreak.zaLag).
func memberConfig(m member, long bool, zaLag int) *core.Config {
	c := &core.Config{Trend: m.trend, Shift: m.shift, Workers: 1}
	switch {
	case m.id == "adf" && long:
		c.LagRule = core.LagMAIC
	case m.id == "adf":
		c.LagRule = core.LagBIC
	default:
		c.LagRule, c.Lags = core.LagFixed, zaLag
	}
	return c
}

// unionCalc computes the union statistic on series of length T with its
// own scratch space, in either branch.
type unionCalc struct {
	T     int
	short *core.ADFPair          // ADF members with BIC
	long  *core.ADFPair          // ADF members with MAIC
	zaAt  map[int]*breaks.ZAPair // both Zivot-Andrews members at a fixed order
	tb    trendBreak
	err   error
}

// newUnionCalc prepares the members for series of length T: the two ADF
// members as one core.ADFPair per branch and the Zivot-Andrews members as
// one breaks.ZAPair per order, each equal bit for bit to its members' own
// statistic functions (memberConfig).
func newUnionCalc(T int) *unionCalc {
	u := &unionCalc{T: T, zaAt: map[int]*breaks.ZAPair{}}
	if members[0].trend != core.TrendConstant || members[1].trend != core.TrendLinear ||
		members[2].shift != core.ShiftLevel || members[3].shift != core.ShiftBoth {
		u.err = fmt.Errorf("union: members are not ADF (constant, trend) and Zivot-Andrews (A, C)")
		return u
	}
	u.short = core.NewADFPair(T, memberConfig(members[0], false, 0))
	u.long = core.NewADFPair(T, memberConfig(members[0], true, 0))
	return u
}

// za returns the Zivot-Andrews members at fixed order k (models A and C
// from one preparation of the series; breaks.ZAPair gives the statistics
// of the members' own configurations, memberConfig, bit for bit).
func (u *unionCalc) za(k int) *breaks.ZAPair {
	if p, ok := u.zaAt[k]; ok {
		return p
	}
	c := memberConfig(members[2], false, k)
	p := breaks.NewZAPair(u.T, k, c)
	u.zaAt[k] = p
	return p
}

// raw returns R = max_i τ_i / cv_i in the given branch. It runs once per
// bootstrap draw and does not allocate.
func (u *unionCalc) raw(y []float64, long bool) (float64, error) {
	if u.err != nil {
		return 0, u.err
	}
	adf := u.short
	if long {
		adf = u.long
	}
	tc, tct, err := adf.Stats(y)
	if err != nil {
		return 0, err
	}
	r := max(tc/members[0].cv, tct/members[1].cv)
	tA, tC, err := u.za(u.tb.zaLag(y, long)).Stats(y)
	if err != nil {
		return 0, err
	}
	return max(r, tA/members[2].cv, tC/members[3].cv), nil
}

// scaled returns R divided by the 95% null quantile of its branch at T, the
// statistic the bootstrap compares, so that samples falling in different
// branches are on one scale. The branch is chosen on each sample as on the
// data.
func (u *unionCalc) scaled(y []float64) (float64, error) {
	long := longLags(y)
	r, err := u.raw(y, long)
	if err != nil {
		return 0, err
	}
	return r / unionQuantile(u.T, 0.95, long), nil
}

type unitRootOut struct {
	stationary bool
	missing    bool
	stage      schema.Stage
	tests      []*schema.Result // by member, nil when failed
	lead       *schema.Result   // the member with the largest ratio
	leadIdx    int
	// unconfirmed is set when R exceeds its table but the bootstrap does
	// not confirm the rejection (bootP is its p-value).
	unconfirmed bool
	bootP       float64
	// pFloor is set when the p-value is the smallest the bootstrap can give
	// (no draw reached the statistic): it is a bound, p <= 1/(B+1).
	pFloor bool
}

// pWithBound is "= 0.030", or "<= 0.010" for a p-value at the bootstrap's floor
// (ASCII, like pWords, so that every output format prints it as it is).
func pWithBound(p float64, floor bool) string {
	if floor {
		return "<= " + pText(p)
	}
	return "= " + pText(p)
}

// unconfirmedWords says, for a verdict that keeps the unit root, that the
// strongest member rejects by its tabulated values but the bootstrap does
// not confirm it ("" otherwise). what names the series tested ("", or "the
// first difference").
func (u *unitRootOut) unconfirmedWords(what string) string {
	if u == nil || !u.unconfirmed || u.lead == nil || u.lead.Statistic == nil {
		return ""
	}
	on := ""
	if what != "" {
		on = " on " + what
	}
	return fmt.Sprintf(" %s%s alone rejects by its tabulated critical values (t = %.2f), but the wild bootstrap under the fitted I(1) null, which keeps the series' own drift path, volatility and short-run dynamics, does not confirm it (p = %s): its rejection is what an integrated series like this one often produces.",
		members[u.leadIdx].label, on, *u.lead.Statistic, pText(u.bootP))
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
	calc := newUnionCalc(T)
	r1 := diffAutocorr(x)
	long := r1 <= maCut
	zaLag := calc.tb.zaLag(x, long)
	if long {
		out.stage.Evidence = append(out.stage.Evidence, fmt.Sprintf("the differences have first autocorrelation %.2f (at most %.2f): the signature of a large negative moving-average root, so every member takes long lags (MAIC, Ng & Perron 2001; Zivot-Andrews at %d lags for every date)", r1, maCut, zaLag))
	}
	for i, m := range members {
		cfg := w.config(m.trend)
		mc := memberConfig(m, long, zaLag)
		cfg.Shift, cfg.LagRule, cfg.Lags = mc.Shift, mc.LagRule, mc.Lags
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
	lam := unionQuantile(T, 1-w.alpha, long)
	pTab := unionP(T, R, long)
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
	spec := leadSpec(members[rich], out.tests[rich])
	d := diff(x)
	for i := range d {
		d[i] -= mu[i]
	}
	spec.sd = localSD(d)
	if !long {
		spec.k = nullOrder(x, spec, zaMaxLags)
	}
	null, err := fitNull(x, spec, mu, db)
	if err != nil {
		out.stage.Decision = "unit root not rejected"
		out.stage.Evidence = append(out.stage.Evidence, "the I(1) null could not be fitted for the bootstrap ("+err.Error()+"); the union is not confirmed")
		return out, nil
	}
	p, failed, err := bootstrapP(ctx, null, T, unitRootDraws, w.seed^0x0e1, R/unionQuantile(T, 0.95, long), calc.scaled)
	if err != nil {
		if ctx.Err() != nil {
			return nil, err
		}
		out.stage.Decision = "unit root not rejected"
		out.stage.Evidence = append(out.stage.Evidence, "the bootstrap failed: "+err.Error())
		return out, nil
	}
	out.pFloor = pTab < p && p <= 1/float64(1+unitRootDraws-failed)+1e-12
	p = max(p, pTab)
	out.stage.PValue = schema.F(p)
	ev := fmt.Sprintf("union statistic R = %.3f exceeds its scaled critical value %.3f at T = %d; wild bootstrap under an I(1) null with %s: p %s (%d draws)", R, lam, T, w.driftWords(null), pWithBound(p, out.pFloor), unitRootDraws)
	if out.pFloor {
		ev += ", none of which reached the statistic"
	}
	if failed > 0 {
		ev += fmt.Sprintf("; %d draws failed and were left out", failed)
	}
	out.stage.Evidence = append(out.stage.Evidence, ev)
	if p <= w.alpha {
		out.stationary = true
		out.stage.Decision = "unit root rejected"
	} else {
		out.stage.Decision = "unit root not rejected"
		out.unconfirmed, out.bootP = true, p
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
// (null.go): the deterministic terms, break date and lag order of a member
// (the procedure passes Zivot-Andrews with a level and slope shift, whose
// regression nests those of the other members, so that whatever level or
// trend change the series has is in the regression and not in the γ_j).
// Its lag order is chosen by BIC (nullOrder, at most zaMaxLags) in the
// short-lag branch and is the member's MAIC order in the long-lag branch
// (malags.go), where the recoloured bootstrap samples then carry a large
// negative moving-average root as the data do.
// Taking the dynamics from the unrestricted regression keeps the power of
// the bootstrap against stationary alternatives (Palm, Smeekes & Urbain
// 2008). A long MAIC order in the short-lag branch would not: on a
// trend-stationary series with a misdated break its many negative γ_j
// make the bootstrap samples look stationary too (our simulation).
func leadSpec(m member, r *schema.Result) dynSpec {
	s := dynSpec{k: r.Lags, trend: m.trend}
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
