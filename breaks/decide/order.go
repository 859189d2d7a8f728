package decide

// Stage 4: the order of integration, from the top.
//
// Dickey & Pantula (1987) test the largest plausible order first: a unit
// root in the first difference (I(2) against I(1)), and only when it is
// rejected is the level tested (stage 5); testing upwards instead would let
// a level test with no power stand in for evidence about the difference.
// The first difference is tested by ADF with a constant (BIC lags); when
// that does not reject, by the union of stage 5 applied to Δy, because a
// recession that turns the drift of a series is a shift in the mean of its
// first difference, which ADF without a break reads as a unit root (Perron
// 1989 one order up). I(2) is concluded only when neither rejects, so the
// chance of calling an I(1) series I(2) is at most that of either test.

import (
	"context"
	"fmt"
	"strings"

	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/schema"
)

type orderOut struct {
	i2    bool
	stage schema.Stage
	dADF  *schema.Result
	union *unitRootOut // the union on the first difference, when it ran
}

func (w *work) order(ctx context.Context) (*orderOut, error) {
	out := &orderOut{stage: schema.Stage{Name: "order", Level: w.alpha,
		Method: "Dickey & Pantula (1987): ADF with a constant on the first difference (BIC lags), before the level"}}
	dz := diff(w.z)
	cfg := w.config(core.TrendConstant)
	cfg.LagRule = core.LagBIC
	res, err := w.run(ctx, "adf", dz, cfg)
	if err != nil {
		return nil, err
	}
	if res == nil || res.Statistic == nil {
		out.stage.Decision = "at most I(1) (not tested)"
		out.stage.Evidence = []string{"ADF on the first difference could not be computed; the order is taken to be at most one"}
		return out, nil
	}
	res.Variant = "first difference"
	if w.logs {
		res.Variant = "first difference of logs"
	}
	out.dADF = res
	out.stage.Statistic, out.stage.PValue = res.Statistic, res.PValue
	if res.Reject {
		out.stage.Decision = "at most I(1)"
		out.stage.Evidence = []string{fmt.Sprintf("ADF on the first difference rejects a unit root (t = %.2f%s): the difference is stationary", *res.Statistic, pSuffix(res.PValue))}
		return out, nil
	}
	out.stage.Evidence = []string{fmt.Sprintf("ADF on the first difference does not reject a unit root (t = %.2f%s)", *res.Statistic, pSuffix(res.PValue))}
	variant := "first difference"
	if w.logs {
		variant = "first difference of logs"
	}
	u, err := w.union(ctx, dz, variant)
	if err != nil {
		return nil, err
	}
	out.union = u
	w.dropDuplicate(res)
	out.stage.Evidence = append(out.stage.Evidence, "with breaks allowed in the mean and trend of the difference: "+strings.Join(u.stage.Evidence, "; "))
	if !u.missing && u.stationary {
		out.stage.Decision = "at most I(1), with a changing drift"
		out.stage.Method += "; then the union of stage 5 on the first difference"
		out.stage.Statistic, out.stage.PValue = u.stage.Statistic, u.stage.PValue
		return out, nil
	}
	out.i2 = true
	out.stage.Decision = "I(2)"
	out.stage.Evidence = append(out.stage.Evidence, "neither rejects: the difference itself looks integrated")
	return out, nil
}

// dropDuplicate removes from the run's results a later result that repeats
// r (the union's ADF with a constant and BIC lags on the first difference
// is the Dickey-Pantula test itself): one test, one row.
func (w *work) dropDuplicate(r *schema.Result) {
	for i, o := range w.results {
		if o == r || o == nil || o.Test != r.Test || o.Trend != r.Trend || o.Lags != r.Lags ||
			o.Statistic == nil || r.Statistic == nil || *o.Statistic != *r.Statistic || o.NObs != r.NObs {
			continue
		}
		w.results = append(w.results[:i], w.results[i+1:]...)
		return
	}
}

func diff(y []float64) []float64 {
	if len(y) < 2 {
		return nil
	}
	d := make([]float64, len(y)-1)
	for i := range d {
		d[i] = y[i+1] - y[i]
	}
	return d
}

func pSuffix(p *float64) string {
	if p == nil {
		return ""
	}
	switch {
	case *p < 0.001:
		return ", p < 0.001"
	case *p > 0.999:
		return ", p > 0.999"
	}
	return fmt.Sprintf(", p = %.3f", *p)
}
