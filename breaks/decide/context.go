package decide

// Context: results that did not decide the class but that an analyst will
// want to see beside it. KPSS (Kwiatkowski, Phillips, Schmidt & Shin 1992)
// with the deterministic terms of the verdict is computed; it points to the
// other class when it rejects stationarity for a series called stationary,
// or does not reject for one called integrated, and only then is it listed
// against the verdict, with one sentence saying so. The members of the
// unit-root union that did not lead are context too: the union decides as a
// whole.

import (
	"context"
	"fmt"
	"strings"

	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/schema"
)

func (w *work) context(ctx context.Context, v *schema.Verdict) error {
	stationaryClass := v.Class == ClassStationary || v.Class == ClassTrendStationary || v.Class == ClassBreakStationary
	integratedClass := v.Class == ClassUnitRoot || v.Class == ClassUnitRootBreaks
	listed := map[string]bool{}
	for _, s := range v.Supporting {
		listed[s] = true
	}
	for _, r := range w.results {
		if d := describe(r); !listed[d] {
			v.Context = append(v.Context, d)
			listed[d] = true
		}
	}
	if !stationaryClass && !integratedClass {
		return nil
	}
	trend := core.TrendConstant
	if v.Class == ClassTrendStationary || (integratedClass && v.Drift) {
		trend = core.TrendLinear
	}
	x, variant := w.z, w.scaleWords()
	if v.Order != nil && *v.Order == 2 {
		// For an I(2) verdict the question is whether the first difference
		// is stationary.
		x, trend, variant = diff(w.z), core.TrendConstant, "first difference"
	}
	res, err := w.run(ctx, "kpss", x, w.config(trend))
	if err != nil || res == nil {
		return err
	}
	if variant != "" {
		res.Variant = strings.TrimPrefix(res.Variant+", "+variant, ", ")
	}
	d := describe(res)
	pointsOther := (stationaryClass && res.Reject) || (integratedClass && !res.Reject)
	if v.Order != nil && *v.Order == 2 && !res.Reject {
		v.Against = append(v.Against, d)
		v.Explanation += " KPSS does not reject stationarity of the first difference at the same level, which points to I(1); with limited power on both sides, read the stages and the plots before differencing twice."
		return nil
	}
	if v.Class == ClassBreakStationary && res.Reject {
		// A stationary series around shifts rejects KPSS without breaks:
		// that is what the shifts do, not a contradiction.
		v.Context = append(v.Context, d+" (expected: KPSS without breaks rejects around level shifts)")
		return nil
	}
	if pointsOther {
		v.Against = append(v.Against, d)
		v.Explanation += fmt.Sprintf(" KPSS, with the null of stationarity, points the other way at the same level (%s); with limited power on both sides, read the stages and the plots before relying on the class.", decisionWords(res))
	} else {
		v.Supporting = append(v.Supporting, d)
	}
	return nil
}
