package decide

// The verdict in words: the class, the order, the recommended
// transformation, the breaks and an explanation that names what decided it.

import (
	"fmt"
	"strings"

	"github.com/rootshift/rootshift/core/schema"
)

func intp(i int) *int { return &i }

func breakList(b []schema.Break) string {
	var parts []string
	for _, x := range b {
		if x.Date != "" {
			parts = append(parts, x.Date)
		} else {
			parts = append(parts, fmt.Sprintf("observation %d", x.Index))
		}
	}
	return strings.Join(parts, ", ")
}

func (w *work) onScale() string {
	if w.logs {
		return " (in logs)"
	}
	return ""
}

func (w *work) explosiveVerdict(v *schema.Verdict, ex *explosiveOut) {
	v.Class, v.Order, v.Transform = ClassExplosive, nil, TransformNone
	eps := ""
	if ex.sadf != nil && len(ex.sadf.Episodes) > 0 {
		var parts []string
		for _, e := range ex.sadf.Episodes {
			a, b := e.Start.Date, e.End.Date
			if a == "" {
				a, b = fmt.Sprint(e.Start.Index), fmt.Sprint(e.End.Index)
			}
			parts = append(parts, a+" to "+b)
		}
		eps = " (dated episodes: " + strings.Join(parts, "; ") + ")"
	}
	if ex.sadf == nil {
		v.Explanation = fmt.Sprintf("Explosive%s: the recursive regressions of SADF fit the series exactly with an explosive coefficient, so up to rounding it is a deterministic explosive path (the explosive root swamps the noise). No differencing removes an explosive root; model it directly.", w.onScale())
		return
	}
	v.Explanation = fmt.Sprintf("Explosive%s: SADF rejects the unit root in favour of an explosive root, and the rejection survives the wild bootstrap under an integrated null with the series' own drift path and volatility (p %s)%s. No differencing removes an explosive root; model the episode itself and treat the other tests with caution.",
		w.onScale(), pWithBound(deref(ex.stage.PValue), ex.pFloor), eps)
	if ex.sadf != nil {
		v.Supporting = append(v.Supporting, describe(ex.sadf))
	}
}

func (w *work) i2Verdict(v *schema.Verdict, ord *orderOut) {
	v.Class, v.Order, v.Transform = ClassUnitRoot, intp(2), TransformSecondDiff
	v.Explanation = fmt.Sprintf("Integrated of order two%s: the change itself is persistent. Neither ADF nor the union of unit-root tests with a break in the mean or trend of the first difference rejects a unit root in the first difference, and the order is tested from the top (Dickey & Pantula 1987), so the data do not support treating the first difference as stationary in this sample. The tests indicate differencing twice; if theory says the growth rate is stationary (as it usually is for activity and employment series), difference once and model the persistence of the changes explicitly, or use a longer sample.", w.onScale())
	v.Explanation += ord.union.unconfirmedWords("the first difference")
	if ord.dADF != nil {
		v.Supporting = append(v.Supporting, describe(ord.dADF))
	}
}

func (w *work) stationaryVerdict(v *schema.Verdict, ur *unitRootOut, det *detOut) {
	v.Order = intp(0)
	lead := members[ur.leadIdx].label
	p := pWithBound(deref(ur.stage.PValue), ur.pFloor)
	switch {
	case len(det.breaks) > 0:
		v.Class, v.Transform = ClassBreakStationary, TransformShiftDummies
		v.Breaks = append(v.Breaks, det.breaks...)
		what := "a level"
		if det.trending {
			what = "a trend"
		}
		v.Explanation = fmt.Sprintf("Stationary around %s with breaks at %s%s: the unit root is rejected by the union of unit-root tests (strongest: %s; p %s, confirmed by the wild bootstrap), and Bai-Perron dates the breaks on the levels. Model it in levels with shift dummies at the break dates; do not difference.",
			what, breakList(det.breaks), w.onScale(), lead, p)
		if det.fromUnitRoot {
			shift := "a level shift"
			if det.slopeShift {
				shift = "a shift in level and slope"
			}
			v.Explanation = fmt.Sprintf("Stationary around %s with %s at %s%s: the unit root is rejected by the union of unit-root tests (strongest: %s; p %s, confirmed by the wild bootstrap), whose model has that shift at that date. Bai-Perron does not date it on its own (its tests lose power when the stationary noise is this persistent), so the date rests on the unit-root test: check it against the plot and what is known of the period. Model it in levels with a shift dummy at that date; do not difference.",
				what, shift, breakList(det.breaks), w.onScale(), lead, p)
		}
		if ur.leadIdx < 2 {
			v.Explanation += " A test without breaks already rejects; the breaks still belong in the model."
		} else {
			v.Explanation += " Tests without breaks are weaker here: a shift in the level or slope makes a stationary series look integrated (Perron 1989)."
		}
	case det.trending:
		v.Class, v.Transform = ClassTrendStationary, TransformDetrend
		v.Explanation = fmt.Sprintf("Stationary around a linear trend%s: the unit root is rejected by the union of unit-root tests (strongest: %s; p %s, confirmed by the wild bootstrap) and the slope is significant. Model it in levels with a deterministic trend; differencing would over-difference.", w.onScale(), lead, p)
	default:
		v.Class, v.Transform = ClassStationary, TransformNone
		v.Explanation = fmt.Sprintf("Stationary%s: the unit root is rejected by the union of unit-root tests (strongest: %s; p %s, confirmed by the wild bootstrap), with no significant slope and no break. Model it in levels.", w.onScale(), lead, p)
	}
	if len(det.breaks) == 0 && ur.leadIdx >= 2 {
		v.Explanation += " The rejection came from a test that allows a break, but Bai-Perron finds no break at this level: the shift, if any, is too small to date; check the plot before leaving it out of the model."
	}
	if ur.lead != nil {
		v.Supporting = append(v.Supporting, describe(ur.lead))
	}
	if det.bp != nil && len(det.breaks) > 0 {
		v.Supporting = append(v.Supporting, describe(det.bp))
	}
}

func (w *work) integratedVerdict(v *schema.Verdict, ur *unitRootOut, det *detOut) {
	v.Order = intp(1)
	v.Drift = det.trending
	v.Transform = TransformDifference
	if w.logs {
		v.Transform = TransformLogDiff
	}
	drift := "without drift"
	if det.trending {
		drift = "with drift"
	}
	how := "Difference it"
	if w.logs {
		how = "Take log differences (growth rates)"
	}
	if len(det.breaks) > 0 {
		v.Class = ClassUnitRootBreaks
		v.Breaks = append(v.Breaks, det.breaks...)
		v.Explanation = fmt.Sprintf("A unit root%s whose drift changes at %s: the union of unit-root tests, with and without a break, does not reject (p %s), and Bai-Perron dates changes in the mean of the first difference. %s, with shift dummies for the drift in the differenced model.",
			w.onScale(), breakList(det.breaks), pWords(deref(ur.stage.PValue)), how)
	} else {
		v.Class = ClassUnitRoot
		v.Explanation = fmt.Sprintf("A unit root %s%s: the union of unit-root tests, with and without a break, does not reject (p %s); allowing a level or slope shift does not change that. %s.",
			drift, w.onScale(), pWords(deref(ur.stage.PValue)), how)
	}
	v.Explanation += ur.unconfirmedWords("")
	for _, r := range ur.tests {
		if r != nil && r == ur.lead {
			v.Supporting = append(v.Supporting, describe(r))
		}
	}
}

func deref(p *float64) float64 {
	if p == nil {
		return 1
	}
	return *p
}

// describe states one result in a line.
func describe(r *schema.Result) string {
	if r == nil {
		return ""
	}
	name := map[string]string{"adf": "ADF", "kpss": "KPSS", "za": "Zivot-Andrews", "bp": "Bai-Perron", "sadf": "SADF", "gsadf": "GSADF", "seasonal": "seasonal unit-root test"}[r.Test]
	if name == "" {
		name = r.Test
	}
	spec := r.Trend
	if r.Shift != "" {
		spec += ", " + r.Shift + " shift"
	}
	if r.Variant != "" && !strings.HasPrefix(r.Variant, "model") && r.Test != "bp" {
		spec += ", " + r.Variant
	} else if r.Test == "bp" && strings.Contains(r.Variant, "first difference") {
		spec += ", " + r.Variant
	}
	stat := "n/a"
	if r.Statistic != nil {
		stat = fmt.Sprintf("%.3f", *r.Statistic)
	}
	return fmt.Sprintf("%s (%s): %s at %g (statistic %s%s)", name, spec, decisionWords(r), r.Level, stat, pSuffix(r.PValue))
}

func decisionWords(r *schema.Result) string {
	switch r.Test {
	case "kpss":
		if r.Reject {
			return "rejects stationarity"
		}
		return "does not reject stationarity"
	case "bp":
		if r.Reject {
			return "finds a break"
		}
		return "finds no break"
	case "sadf", "gsadf":
		if r.Reject {
			return "finds explosive behaviour"
		}
		return "finds no explosive behaviour"
	case "seasonal":
		if r.Reject {
			return "rejects seasonal unit roots"
		}
		return "does not reject seasonal unit roots"
	}
	if r.Reject {
		return "rejects a unit root"
	}
	return "does not reject a unit root"
}
