package decide

// Stage 7: the analyst's crisis window.
//
// The question "is there a break inside this window?" is answered by a
// break-aware unit-root test whose break search is restricted to the
// window: Zivot & Andrews (1992) with the candidate dates TB limited to the
// window (and to the usual 15% trimming), model A (a level shift) unless the
// analyst chose another shift. Restricting the search changes the null
// distribution (fewer candidates: a less negative minimum), so its critical
// values and p-value are simulated for that restricted search at the
// series' length and the window's position: driftless Gaussian random walks
// of the same length, the same lag rule, 999 replications (or Settings.Sims)
// seeded from Settings.Seed (our own simulation). break_inside is true only
// when that test rejects: a significant result dating a break inside the
// window.

import (
	"context"
	"errors"
	"fmt"
	"strconv"
	"strings"

	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/dataset"
	"github.com/rootshift/rootshift/core/schema"
)

// windowSims is the default number of simulations of the restricted search.
const windowSims = 999

type window struct {
	from, to string
	lo, hi   int
}

// placeWindow resolves Settings.Window on this series, or returns a
// *WindowError.
func (w *work) placeWindow() (*window, error) {
	spec := strings.TrimSpace(w.in.Settings.Window)
	if spec == "" {
		return nil, nil
	}
	from, to, ok := strings.Cut(spec, ":")
	if !ok {
		return nil, &WindowError{Window: spec, Err: errors.New("want FROM:TO")}
	}
	win := &window{from: strings.TrimSpace(from), to: strings.TrimSpace(to)}
	T := len(w.y)
	resolve := func(s string) (int, error) {
		if len(w.in.Dates) == T && T > 0 {
			if i, err := dataset.IndexOf(w.in.Dates, w.in.Frequency, s); err == nil {
				return i, nil
			}
		}
		i, err := strconv.Atoi(s)
		if err != nil || i < 1 || i > T {
			first, last := "1", strconv.Itoa(T)
			if len(w.in.Dates) == T && T > 0 {
				first, last = w.in.Dates[0], w.in.Dates[T-1]
			}
			return 0, fmt.Errorf("%q is not a date or observation of this series (it runs from %s to %s)", s, first, last)
		}
		return i, nil
	}
	var err error
	if win.lo, err = resolve(win.from); err != nil {
		return nil, &WindowError{Window: spec, Err: err}
	}
	if win.hi, err = resolve(win.to); err != nil {
		return nil, &WindowError{Window: spec, Err: err}
	}
	if win.lo > win.hi {
		return nil, &WindowError{Window: spec, Err: fmt.Errorf("reversed: %s comes after %s; write FROM:TO with the earlier date first", win.from, win.to)}
	}
	return win, nil
}

func (w *work) windowTest(ctx context.Context, win *window, v *schema.Verdict) (*schema.WindowCheck, error) {
	wc := &schema.WindowCheck{From: win.from, To: win.to, FromIndex: win.lo, ToIndex: win.hi}
	T := len(w.z)
	cfg := w.config(core.TrendLinear)
	cfg.Shift = core.ShiftLevel
	if s := w.in.Settings.Shift; s != "" {
		if sh, err := core.ParseShift(s); err == nil {
			cfg.Shift = sh
		}
	}
	cfg.BreakFrom, cfg.BreakTo = win.lo, win.hi
	info, _ := core.Lookup("za")
	res, err := info.Run(ctx, w.z, cfg)
	if err != nil {
		if ctx.Err() != nil {
			return nil, fmt.Errorf("%w: %v", core.ErrCancelled, ctx.Err())
		}
		wc.Answer = fmt.Sprintf("Crisis window %s to %s: the restricted break search could not run (%v).", win.from, win.to, err)
		return wc, nil
	}
	reps := windowSims
	if w.in.Settings.Sims > 0 {
		reps = w.in.Settings.Sims
	}
	scfg := *cfg
	scfg.Dates, scfg.NoPath, scfg.Sims, scfg.Progress = nil, true, 0, nil
	dist, err := core.SimulateTest(ctx, info, T, &scfg, core.SimSpec{Reps: reps, Seed: w.in.Settings.Seed ^ 0x3d, Workers: 1})
	if err != nil {
		if ctx.Err() != nil {
			return nil, err
		}
		wc.Answer = fmt.Sprintf("Crisis window %s to %s: the restricted search's null could not be simulated (%v).", win.from, win.to, err)
		return wc, nil
	}
	core.ApplyDistribution(dist, T, res)
	res.Variant = fmt.Sprintf("break searched in observations %d-%d only", win.lo, win.hi)
	p := 1.0
	if res.PValueSim != nil {
		p = *res.PValueSim
	}
	res.PValue, res.PValueMethod = res.PValueSim, fmt.Sprintf("simulated for the search restricted to the window (%d random walks of length %d)", reps, T)
	res.Reject = p <= w.alpha
	if res.CriticalValuesSim != nil {
		res.CriticalValues, res.CriticalSource = res.CriticalValuesSim, "simulated for the search restricted to the window (our simulation)"
	}
	wc.Test = res
	wc.BreakInside = res.Reject
	when := ""
	if len(res.Breaks) > 0 {
		when = breakList(res.Breaks[:1])
	}
	if res.Reject {
		wc.Answer = fmt.Sprintf("Crisis window %s to %s: allowing one break inside it, Zivot-Andrews rejects a unit root (t = %.2f, p = %s simulated for this restricted search), with the break at %s.", win.from, win.to, deref(res.Statistic), pText(p), when)
	} else {
		wc.Answer = fmt.Sprintf("Crisis window %s to %s: allowing one break inside it does not reject a unit root (Zivot-Andrews t = %.2f, p = %s simulated for this restricted search; best date %s): no evidence that a break in the window explains the persistence.", win.from, win.to, deref(res.Statistic), pText(p), when)
	}
	for _, b := range v.Breaks {
		if b.Index >= win.lo && b.Index <= win.hi {
			wc.Answer += " The verdict's break at " + breakList([]schema.Break{b}) + " falls inside the window."
		}
	}
	return wc, nil
}
