package decide

import (
	"context"
	"errors"
	"fmt"
	"hash/fnv"
	"math"
	"strings"

	// Registers the break-aware tests with core's registry.
	_ "github.com/rootshift/rootshift/breaks"
	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/schema"
)

// Classes of the verdict.
const (
	ClassStationary      = "stationary"
	ClassTrendStationary = "trend-stationary"
	ClassBreakStationary = "break-stationary"
	ClassUnitRoot        = "unit-root"
	ClassUnitRootBreaks  = "unit-root-breaks"
	ClassExplosive       = "explosive"
	ClassInconclusive    = "inconclusive"
)

// Recommended transformations.
const (
	TransformNone         = "none"
	TransformDetrend      = "detrend"
	TransformShiftDummies = "shift-dummies"
	TransformDifference   = "difference"
	TransformLogDiff      = "log-difference"
	TransformSecondDiff   = "second-difference"
)

// Tests lists the test ids the procedure runs, for Verdict.Tests.
var Tests = []string{"sadf", "adf", "za", "bp", "kpss"}

// Input is one series for the procedure.
type Input struct {
	// Name labels the series in errors.
	Name string
	// Y are the observations (levels, or as transformed by the analyst).
	Y []float64
	// Dates label the observations (optional; len(Dates) == len(Y)).
	Dates []string
	// Frequency is the dataset frequency ("monthly", ...), optional.
	Frequency string
	// Transformed reports that the analyst already transformed Y (logs,
	// differences): the scale stage then keeps Y as it is.
	Transformed bool
	// Settings are the analyst's settings: Level, Seed, Window, Shift (the
	// window's test), Sims (the window's simulated null) and RateDraws
	// (RateDraws > 0 recomputes the reliability at the series' length with
	// that many draws per process) are read.
	Settings schema.Settings
	// Progress, if set, reports long work (the reliability simulation).
	Progress func(done, total int)

	// lean skips the context tests and the reliability (inside the rate
	// simulation, where only the class is counted).
	lean bool
}

// Outcome is what the procedure decided and every result it computed.
type Outcome struct {
	Verdict *schema.Verdict
	// Results are the results of the tests the stages ran, in order.
	Results []schema.Result
	// Errors are failures of single tests (the verdict may still stand).
	Errors []schema.Error
}

// WindowError is a crisis window that cannot be placed in the series (a
// usage error: reversed, empty or outside the sample).
type WindowError struct {
	Window string
	Err    error
}

func (e *WindowError) Error() string { return fmt.Sprintf("window %q: %v", e.Window, e.Err) }
func (e *WindowError) Unwrap() error { return e.Err }

// work is the state shared by the stages of one run.
type work struct {
	in      *Input
	y       []float64 // as given
	z       []float64 // on the chosen scale
	logs    bool
	alpha   float64
	seed    uint64
	results []*schema.Result
	errs    []schema.Error
	lastErr error // the error of the last test that failed in run
}

// Run applies the procedure to one series. The error is non-nil only for
// cancellation and for a window that cannot be placed (*WindowError); a
// test that fails is recorded in Outcome.Errors and the stages go on with
// what they have.
func Run(ctx context.Context, in Input) (*Outcome, error) {
	w := &work{in: &in, y: in.Y, alpha: in.Settings.Level}
	if !(w.alpha > 0) {
		w.alpha = 0.05
	}
	w.seed = seriesSeed(in.Settings.Seed, in.Y)
	v := &schema.Verdict{Breaks: []schema.Break{}, Tests: Tests}

	// Stage 1: the scale.
	v.Stages = append(v.Stages, w.scale())
	v.Scale = "levels"
	if w.logs {
		v.Scale = "logs"
	}
	// The window is checked before any work: a window that cannot be placed
	// is the analyst's error, not the series'.
	win, err := w.placeWindow()
	if err != nil {
		return nil, err
	}

	// Stage 3: explosive?
	ex, err := w.explosive(ctx)
	if err != nil {
		return nil, err
	}
	v.Stages = append(v.Stages, ex.stage)
	if ex.explosive {
		w.explosiveVerdict(v, ex)
		return w.finish(ctx, v, win)
	}

	// Stage 4: the order, from the top (Dickey & Pantula 1987).
	ord, err := w.order(ctx)
	if err != nil {
		return nil, err
	}
	v.Stages = append(v.Stages, ord.stage)
	if ord.i2 {
		w.i2Verdict(v, ord)
		return w.finish(ctx, v, win)
	}

	// Stage 5: one unit-root decision, size controlled as a whole.
	ur, err := w.unitRoot(ctx)
	if err != nil {
		return nil, err
	}
	v.Stages = append(v.Stages, ur.stage)
	if ur.missing {
		v.Class, v.Transform = ClassInconclusive, TransformNone
		v.Explanation = "No verdict: the unit-root tests could not be computed on this series (see errors)."
		return w.finish(ctx, v, win)
	}

	// Stage 6: breaks and trend, on the scale where their inference holds.
	det, err := w.deterministic(ctx, ur.stationary, ur)
	if err != nil {
		return nil, err
	}
	v.Stages = append(v.Stages, det.stage)
	if ur.stationary {
		w.stationaryVerdict(v, ur, det)
	} else {
		w.integratedVerdict(v, ur, det)
	}
	return w.finish(ctx, v, win)
}

// finish adds the context tests, the window answer and the reliability, and
// assembles the outcome.
func (w *work) finish(ctx context.Context, v *schema.Verdict, win *window) (*Outcome, error) {
	if w.in.lean {
		return &Outcome{Verdict: v}, nil
	}
	if v.Class != ClassExplosive && v.Class != ClassInconclusive {
		s, err := w.seasonality(ctx)
		if err != nil {
			return nil, err
		}
		w.applySeasonality(v, s)
	}
	if err := w.context(ctx, v); err != nil {
		return nil, err
	}
	if win != nil {
		wc, err := w.windowTest(ctx, win, v)
		if err != nil {
			return nil, err
		}
		v.Window = wc // its answer is in the window, which every report shows beside the explanation
	}
	rel, err := w.reliability(ctx, v)
	if err != nil {
		return nil, err
	}
	v.Reliability = rel
	out := &Outcome{Verdict: v, Errors: w.errs}
	for _, r := range w.results {
		out.Results = append(out.Results, *r)
	}
	return out, nil
}

// scale runs stage 1.
func (w *work) scale() schema.Stage {
	st := schema.Stage{Name: "scale", Method: "logs for a positive series with significant geometric growth whose Box & Cox (1964) likelihood (first-order autoregression) prefers logs by more than 1.92"}
	if w.in.Transformed {
		w.z = w.y
		st.Decision = "as given"
		st.Evidence = []string{"the series was transformed by the analyst and is analysed as given"}
		return st
	}
	useLogs, diff := chooseScale(w.y)
	w.logs = useLogs
	w.z = w.y
	switch {
	case math.IsNaN(diff):
		st.Decision = "levels"
		st.Evidence = []string{"levels: the series is not positive throughout, so logs are not an option"}
	case useLogs:
		w.z = make([]float64, len(w.y))
		for i, x := range w.y {
			w.z[i] = math.Log(x)
		}
		st.Decision = "logs"
		st.Statistic = schema.F(diff)
		st.Evidence = []string{fmt.Sprintf("logs: the series grows geometrically (significant mean growth rate) and the Box-Cox log-likelihood is higher in logs by %.1f (more than 1.92): changes grow with the level", diff)}
	case diff > scaleMargin:
		st.Decision = "levels"
		st.Statistic = schema.F(diff)
		st.Evidence = []string{fmt.Sprintf("levels: logs fit the changes better (by %.1f) but the series has no significant growth rate, so it is not growing geometrically", diff)}
	default:
		st.Decision = "levels"
		st.Statistic = schema.F(diff)
		st.Evidence = []string{fmt.Sprintf("levels: logs do not fit the changes better by more than 1.92 (difference %.1f)", diff)}
	}
	return st
}

func (w *work) scaleWords() string {
	if w.logs {
		return "log levels"
	}
	return ""
}

func (w *work) driftWords(m *nullModel) string {
	if len(m.breaks) == 0 {
		return "a constant drift"
	}
	var parts []string
	for _, b := range m.breaks {
		parts = append(parts, w.dateOf(b))
	}
	return "a drift that changes after " + strings.Join(parts, " and ")
}

func (w *work) dateOf(i int) string {
	if i >= 1 && i <= len(w.in.Dates) {
		return w.in.Dates[i-1]
	}
	return fmt.Sprintf("observation %d", i)
}

// config returns the base configuration of a test run by the procedure.
func (w *work) config(trend core.Trend) *core.Config {
	c := &core.Config{Trend: trend, Level: w.alpha, Seed: w.in.Settings.Seed, Workers: 1}
	if len(w.in.Dates) == len(w.y) {
		c.Dates = w.in.Dates
	}
	return c
}

// run runs a registered test and records its result (or its error). It
// returns nil, nil when the test failed; only cancellation is an error.
func (w *work) run(ctx context.Context, id string, y []float64, cfg *core.Config) (res *schema.Result, err error) {
	info, lerr := core.Lookup(id)
	if lerr != nil {
		w.errs = append(w.errs, schema.Error{Test: id, Message: lerr.Error()})
		return nil, nil
	}
	switch {
	case len(y) == len(w.y)-1 && len(w.in.Dates) == len(w.y):
		// The first difference Δy_t is dated at t.
		cfg.Dates = w.in.Dates[1:]
	case len(y) != len(w.y):
		cfg.Dates = nil
	}
	defer func() {
		if p := recover(); p != nil {
			w.errs = append(w.errs, schema.Error{Test: id, Message: fmt.Sprintf("internal error (please report): %v", p)})
			res, err = nil, nil
		}
	}()
	r, rerr := info.Run(ctx, y, cfg)
	if rerr != nil {
		if errors.Is(rerr, core.ErrCancelled) || ctx.Err() != nil {
			return nil, fmt.Errorf("%w: %v", core.ErrCancelled, ctx.Err())
		}
		w.errs = append(w.errs, schema.Error{Test: id, Message: rerr.Error()})
		w.lastErr = rerr
		return nil, nil
	}
	w.results = append(w.results, r)
	return r, nil
}

// seriesSeed derives the bootstrap seed from the analyst's seed and the
// series' values (FNV-1a of their bits), so that two series get different
// draws and one series always the same.
func seriesSeed(seed uint64, y []float64) uint64 {
	h := fnv.New64a()
	var b [8]byte
	for _, x := range y {
		u := math.Float64bits(x)
		for i := range b {
			b[i] = byte(u >> (8 * i))
		}
		h.Write(b[:])
	}
	return h.Sum64() ^ (seed * 0x9e3779b97f4a7c15)
}

func pText(p float64) string {
	switch {
	case p < 0.001:
		return "<0.001"
	case p > 0.999:
		return ">0.999"
	}
	return fmt.Sprintf("%.3f", p)
}
