package decide

// Stage 9 (monthly and quarterly series): seasonality.
//
// The seasonal unit-root test of Hylleberg, Engle, Granger & Yoo (1990) for
// quarterly data and Beaulieu & Miron (1993) for monthly data, with the
// seasonal-dummy F test, as diagnosed by core.Seasonality. The verdict's
// transform becomes a seasonal difference only when seasonal unit roots are
// not rejected and the seasonal pattern is visible (the seasonal dummies
// are significant or explain at least a fifth of the residual variance):
// with no visible pattern, a failure to reject in a short sample is read as
// low power, not as seasonal unit roots (common practice, no source). The
// stage informs and, for an integrated series, may change the transform;
// it never changes the class.

import (
	"context"
	"fmt"

	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/schema"
)

// TransformSeasonalDiff is the seasonal difference y_t - y_{t-S}.
const TransformSeasonalDiff = "seasonal-difference"

type seasonOut struct {
	stage       schema.Stage
	period      int
	seasonalDif bool // seasonal unit roots with a visible pattern
	dummies     bool // deterministic seasonality
	ran         bool
}

func (w *work) seasonality(ctx context.Context) (*seasonOut, error) {
	S := core.PeriodOf(w.in.Frequency)
	out := &seasonOut{period: S}
	if S == 0 || len(w.z) < 5*S {
		return out, nil
	}
	out.ran = true
	out.stage = schema.Stage{Name: "seasonality", Level: w.alpha,
		Method: "joint F test of the seasonal unit roots by HEGY (Hylleberg, Engle, Granger & Yoo 1990) for quarterly, Beaulieu & Miron (1993) for monthly data (the statistic shown), and an F test of the seasonal dummies for a stable pattern"}
	rep, err := core.Seasonality(ctx, w.z, S, &core.Config{Level: w.alpha})
	if err != nil {
		if ctx.Err() != nil {
			return nil, fmt.Errorf("%w: %v", core.ErrCancelled, ctx.Err())
		}
		out.stage.Decision = "not tested"
		out.stage.Evidence = []string{err.Error()}
		return out, nil
	}
	if rep.Test != nil {
		w.results = append(w.results, rep.Test)
	}
	out.stage.Statistic, out.stage.PValue = schema.F(rep.FSeasonal), schema.F(rep.PSeasonal)
	visible := rep.Deterministic || rep.DummyShare >= 0.2
	switch {
	case rep.UnitRoots && visible:
		out.seasonalDif = true
		out.stage.Decision = "seasonal unit roots"
	case rep.UnitRoots:
		out.stage.Decision = "no visible seasonality"
		rep.Reason += fmt.Sprintf("; but the seasonal dummies explain only %.0f%% of the variance, so this is read as low power, not as seasonal unit roots", 100*rep.DummyShare)
	case rep.Deterministic:
		out.dummies = true
		out.stage.Decision = "deterministic seasonality"
	default:
		// The statistic shown is the seasonal unit-root F test's, which
		// rejected: say so, or its small p-value reads as a finding of
		// seasonality.
		out.stage.Decision = "no seasonality (seasonal unit roots rejected, no stable pattern)"
	}
	out.stage.Evidence = []string{rep.Reason}
	return out, nil
}

// applySeasonality adds the seasonal finding to the verdict.
func (w *work) applySeasonality(v *schema.Verdict, s *seasonOut) {
	if s == nil || !s.ran {
		return
	}
	v.Stages = append(v.Stages, s.stage)
	switch {
	case s.seasonalDif && v.Class == ClassUnitRoot && v.Order != nil && *v.Order == 1:
		v.Transform = TransformSeasonalDiff
		v.Explanation += fmt.Sprintf(" Seasonal unit roots are not rejected either and the seasonal pattern is visible: a seasonal difference (y_t - y_{t-%d}) removes them together with the unit root at frequency zero.", s.period)
	case s.seasonalDif:
		v.Explanation += " Seasonal unit roots are not rejected and the seasonal pattern is visible: consider a seasonal difference beside the recommended transform."
	case s.dummies:
		v.Explanation += " The series is seasonal with a stable pattern (seasonal unit roots rejected, seasonal means significant): add seasonal dummies to the model."
	}
}
