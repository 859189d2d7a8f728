package decide

// Stage 6: breaks and trend, on the scale where their inference holds.
//
// Once stage 5 has decided, breaks are dated by Bai & Perron (1998, 2003)
// where the Bai-Perron tests are valid:
//
//   - a series found stationary: breaks in the level (and, for a trending
//     series, the slope) of the series itself; the trend is judged by the
//     HAC t-ratio of the slope in y_t = a + b t + u_t (Newey & West 1987
//     Bartlett weights with the Newey & West 1994 bandwidth), valid for
//     stationary u;
//   - a series found integrated: breaks in the mean of the first difference,
//     i.e. changes in drift (a crisis that turns growth into decline); the
//     drift is judged by the HAC t-ratio of the mean of Δy, valid for an
//     integrated series.
//
// Dating level breaks in the levels of an integrated series would find
// spurious breaks (Nunes, Kuan & Newbold 1995); this is why the stage comes
// after the unit-root decision and not before.

import (
	"context"
	"fmt"
	"math"
	"strings"

	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/schema"
)

type detOut struct {
	stage    schema.Stage
	breaks   []schema.Break
	trending bool // a significant slope (stationary) or drift (integrated)
	tstat    float64
	bp       *schema.Result
	// fromUnitRoot is set when the break is the date of the Zivot-Andrews
	// member whose rejection decided stage 5 (Bai-Perron dated none).
	fromUnitRoot bool
	slopeShift   bool // that member's model has a slope shift too
}

// unitRootBreak returns the break of the Zivot-Andrews member that led the
// union's rejection, if it led: the rejection holds only for its model,
// a stationary series around a trend with a shift at that date, so the
// verdict keeps the shift even when Bai-Perron, whose tests lose power when
// the stationary noise is persistent, dates none (the coherence rule is
// ours, common practice, no source; the date is the one minimising the
// Zivot-Andrews t-ratio, Zivot & Andrews 1992).
func unitRootBreak(ur *unitRootOut) (schema.Break, bool, bool) {
	if ur == nil || ur.leadIdx < 2 || ur.lead == nil || len(ur.lead.Breaks) == 0 {
		return schema.Break{}, false, false
	}
	m := members[ur.leadIdx]
	return ur.lead.Breaks[0], true, m.shift == core.ShiftBoth
}

// zCrit is the two-sided normal critical value at level a.
func zCrit(a float64) float64 { return math.Sqrt2 * math.Erfinv(1-a) }

func (w *work) deterministic(ctx context.Context, stationary bool, ur *unitRootOut) (*detOut, error) {
	out := &detOut{stage: schema.Stage{Name: "breaks", Level: w.alpha}}
	zc := zCrit(w.alpha)
	var target []float64
	trend := core.TrendConstant
	if stationary {
		out.stage.Method = "Bai & Perron (1998, 2003) on the levels of a stationary series; slope by a HAC t-ratio (Newey & West 1987, 1994) with the level breaks in the regression"
		// Level breaks first: a level shift alone would make the slope
		// look significant. The slope is then judged with them in the
		// regression, and only a trending series is dated again with
		// breaks in level and slope.
		lvl, err := w.run(ctx, "bp", w.z, w.config(core.TrendConstant))
		if err != nil {
			return nil, err
		}
		var tbs []int
		if lvl != nil && lvl.Reject {
			for _, b := range lvl.Breaks {
				tbs = append(tbs, b.Index)
			}
		}
		if zb, zaLed, _ := unitRootBreak(ur); len(tbs) == 0 && zaLed {
			tbs = []int{zb.Index}
		}
		out.tstat = hacSlopeT(w.z, tbs)
		out.trending = math.Abs(out.tstat) > zc
		out.stage.Evidence = append(out.stage.Evidence, fmt.Sprintf("slope HAC t = %.2f with %d level break(s) in the regression (%s at %g)", out.tstat, len(tbs), signif(out.trending), w.alpha))
		if !out.trending {
			if lvl != nil {
				lvl.Variant = strings.TrimPrefix(lvl.Variant+", "+w.scaleWords(), ", ")
			}
			return w.keepUnitRootBreak(w.finishBreaks(out, lvl, stationary, core.TrendConstant), ur), nil
		}
		trend = core.TrendLinear
		target = w.z
	} else {
		out.stage.Method = "Bai & Perron (1998, 2003) on the first difference of an integrated series (changes in drift); drift by a HAC t-ratio of the mean difference (Newey & West 1987, 1994)"
		target = diff(w.z)
		out.tstat = hacMeanT(target)
		out.trending = math.Abs(out.tstat) > zc
		out.stage.Evidence = append(out.stage.Evidence, fmt.Sprintf("drift HAC t = %.2f (%s at %g)", out.tstat, signif(out.trending), w.alpha))
	}
	cfg := w.config(trend)
	res, err := w.run(ctx, "bp", target, cfg)
	if err != nil {
		return nil, err
	}
	out = w.finishBreaks(out, res, stationary, trend)
	if stationary {
		out = w.keepUnitRootBreak(out, ur)
	}
	return out, nil
}

// keepUnitRootBreak adds the break of the Zivot-Andrews member that led the
// union's rejection (unitRootBreak) when Bai-Perron dated none.
func (w *work) keepUnitRootBreak(out *detOut, ur *unitRootOut) *detOut {
	zb, zaLed, zaSlope := unitRootBreak(ur)
	if len(out.breaks) > 0 || !zaLed {
		return out
	}
	out.breaks = []schema.Break{zb}
	out.fromUnitRoot, out.slopeShift = true, zaSlope
	what := "level shift"
	if zaSlope {
		what = "level and slope shift"
		out.trending = true
	}
	out.stage.Decision = "1 break (the unit-root test's date)"
	out.stage.Evidence = append(out.stage.Evidence, fmt.Sprintf("the unit root was rejected by %s, whose model is a stationary series around a trend with a %s at %s: that break stays in the model although Bai-Perron does not date it on its own", members[ur.leadIdx].label, what, breakList(out.breaks)))
	return out
}

// finishBreaks reads the Bai-Perron result res into the stage.
func (w *work) finishBreaks(out *detOut, res *schema.Result, stationary bool, trend core.Trend) *detOut {
	if res == nil {
		out.stage.Decision = "breaks not tested"
		return out
	}
	if !stationary {
		res.Variant = "first difference"
		if w.logs {
			res.Variant = "first difference of logs"
		}
		// Break dates in Δy at position i (t = i+2) are TB = i+1 in the
		// levels: the last observation of the old regime.
		for i := range res.Breaks {
			res.Breaks[i] = shiftBreak(res.Breaks[i], 1, len(w.z), w.in.Dates)
		}
	} else if w.logs && !strings.Contains(res.Variant, "log") {
		res.Variant = strings.TrimPrefix(res.Variant+", log levels", ", ")
	}
	out.bp = res
	if res.Reject && len(res.Breaks) > 0 {
		out.breaks = append(out.breaks, res.Breaks...)
		what := "breaks in level"
		if trend == core.TrendLinear {
			what = "breaks in level and slope"
		}
		if !stationary {
			what = "changes in drift"
		}
		out.stage.Decision = fmt.Sprintf("%d %s", len(res.Breaks), what)
		if len(res.Breaks) == 1 {
			out.stage.Decision = strings.Replace(out.stage.Decision, "breaks", "break", 1)
			out.stage.Decision = strings.Replace(out.stage.Decision, "changes", "change", 1)
		}
		out.stage.Evidence = append(out.stage.Evidence, fmt.Sprintf("Bai-Perron finds %s at %s", what, breakList(out.breaks)))
	} else {
		out.stage.Decision = "no break"
		out.stage.Evidence = append(out.stage.Evidence, "Bai-Perron finds no break at this level")
	}
	return out
}

func signif(b bool) string {
	if b {
		return "significant"
	}
	return "not significant"
}

// shiftBreak moves a break found on the first difference to the levels'
// numbering.
func shiftBreak(b schema.Break, by, T int, dates []string) schema.Break {
	b.Index += by
	if b.Lower > 0 {
		b.Lower += by
	}
	if b.Upper > 0 {
		b.Upper += by
	}
	b.Fraction = float64(b.Index) / float64(T)
	b.Date, b.LowerDate, b.UpperDate = "", "", ""
	if len(dates) == T {
		at := func(i int) string {
			if i >= 1 && i <= T {
				return dates[i-1]
			}
			return ""
		}
		b.Date = at(b.Index)
		if b.Lower > 0 {
			b.LowerDate = at(b.Lower)
		}
		if b.Upper > 0 {
			b.UpperDate = at(b.Upper)
		}
	}
	return b
}

// hacSlopeT is the t-ratio of b in y_t = a + b t + Σ_j δ_j DU_jt + u_t
// (DU_jt = 1(t > TB_j)) with the long-run variance of u from a Bartlett
// kernel (Newey-West bandwidth): se(b)² = ω̂² [(X'X)^-1]_bb, the HAC variance
// for deterministic regressors.
func hacSlopeT(y []float64, tbs []int) float64 {
	T := len(y)
	if T < 8+len(tbs) {
		return 0
	}
	cols := make([][]float64, 2+len(tbs))
	for j := range cols {
		cols[j] = make([]float64, T)
	}
	for i := range T {
		cols[0][i], cols[1][i] = 1, float64(i+1)
		for j, tb := range tbs {
			if i+1 > tb {
				cols[2+j][i] = 1
			}
		}
	}
	var ls core.LS
	f, err := ls.Fit(cols, y)
	if err != nil || !(f.Sigma2 > 0) {
		return 0
	}
	lrv, _, err := core.LongRunVariance(f.Resid, core.KernelBartlett, core.BandwidthNeweyWest, 0)
	if err != nil || !(lrv > 0) {
		return 0
	}
	inv := f.StdErr[1] * f.StdErr[1] / f.Sigma2
	return f.Coef[1] / math.Sqrt(lrv*inv)
}

// hacMeanT is the t-ratio of the mean of d with a Bartlett long-run
// variance (Newey-West bandwidth).
func hacMeanT(d []float64) float64 {
	n := len(d)
	if n < 8 {
		return 0
	}
	m := 0.0
	for _, v := range d {
		m += v
	}
	m /= float64(n)
	u := make([]float64, n)
	for i, v := range d {
		u[i] = v - m
	}
	lrv, _, err := core.LongRunVariance(u, core.KernelBartlett, core.BandwidthNeweyWest, 0)
	if err != nil || !(lrv > 0) {
		if m != 0 {
			return math.Inf(int(math.Copysign(1, m)))
		}
		return 0
	}
	return m / math.Sqrt(lrv/float64(n))
}
