package main

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"runtime"
	"sync/atomic"
	"time"

	"github.com/rootshift/rootshift/breaks"
	"github.com/rootshift/rootshift/breaks/battery"
	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/schema"
)

// criticalLevels are the significance levels of `rootshift critical`, and
// the lower quantiles it reports (the keys of quantiles are a contract).
var criticalLevels = []float64{0.01, 0.025, 0.05, 0.10}

// criticalDoc is the JSON written by `rootshift critical --json`.
type criticalDoc struct {
	Schema  string `json:"schema"`
	Version string `json:"version"`
	Test    string `json:"test"`
	N       int    `json:"n"`
	Trend   string `json:"trend"`
	Shift   string `json:"shift,omitempty"`
	// LagRule is the lag rule the test resolves under the settings: "bic",
	// "aic", "maic", "tsig", "fixed" (then Lags holds the order) or "none"
	// (the test has no augmentation lags).
	LagRule string `json:"lag_rule"`
	Lags    *int   `json:"lags,omitempty"`
	// MaxLags is the largest lag order the rule considers at T = n (null
	// when no search takes place); MaxLagsSource says where it comes from
	// ("test default (Schwert): ...", "test default (8), ...", "--max-lags 4")
	// or, without a search, why there is none.
	MaxLags       *int   `json:"max_lags"`
	MaxLagsSource string `json:"max_lags_source"`
	// Trim is the trimming fraction of a break-date search (break tests only).
	Trim     *float64        `json:"trim,omitempty"`
	Sims     int             `json:"sims"`
	Seed     uint64          `json:"seed"`
	Failed   int             `json:"failed"`
	Tail     string          `json:"tail"`
	Settings schema.Settings `json:"settings"`
	// Quantiles are the LOWER quantiles 0.01, 0.025, 0.05, 0.10 of the
	// simulated statistic, whatever the tail.
	Quantiles map[string]float64 `json:"quantiles"`
	// StdErrors are the Monte Carlo standard errors of Quantiles.
	StdErrors map[string]float64 `json:"std_errors"`
	// CriticalValues are keyed by significance level ("0.05" is the 5%
	// critical value): the lower quantiles for a left-tailed test, the upper
	// quantiles 0.99, 0.975, 0.95, 0.90 for a right-tailed one.
	CriticalValues    map[string]float64 `json:"critical_values"`
	CriticalStdErrors map[string]float64 `json:"critical_std_errors"`
	// Upper quantiles (0.90 .. 0.99) for right-tailed tests.
	UpperQuantiles map[string]float64 `json:"upper_quantiles,omitempty"`
	UpperStdErrors map[string]float64 `json:"upper_std_errors,omitempty"`
	Method         string             `json:"method"`
	Seconds        float64            `json:"seconds"`
}

func (e *env) critical(args []string) int {
	var s schema.Settings
	var id string
	var n int
	var asJSON, quiet, force bool
	fs := newFlagSet("critical", e.stdout, "Usage: rootshift critical --test ID [--shift ...] [--trend ...] --n T --sims N --seed S [--json]\n\nSimulates the test's null distribution at sample size T (Gaussian random walk\nunless the test defines its own null) and prints its quantiles and critical values\nwith Monte Carlo standard errors, under the lag rule, maximum lag and trimming it states.")
	settingsFlags(fs, &s)
	fs.StringVar(&id, "test", "", "test `id` (required; \"rootshift tests\" lists them)")
	fs.IntVar(&n, "n", 0, "sample size `T` (required)")
	fs.BoolVar(&asJSON, "json", false, "print JSON")
	fs.BoolVar(&quiet, "quiet", false, "no progress on standard error")
	fs.BoolVar(&force, "force", false, fmt.Sprintf("run even when the estimate exceeds the limits (%.0f GB of memory, %s)", criticalMemLimit/(1<<30), criticalTimeLimit))
	if _, err := parseInterleaved(fs, args); err != nil {
		return e.usageExit(err)
	}
	if err := checkGivenZeros(fs); err != nil {
		return e.usageExit(err)
	}
	if s.Sims == 0 {
		s.Sims = 10000
	}
	if id == "" || n < 10 {
		return e.usageExit(fmt.Errorf("critical: --test ID and --n T (at least 10) are required"))
	}
	if err := battery.Validate(s); err != nil {
		return e.usageExit(err)
	}
	info, err := core.Lookup(id)
	if err != nil {
		return e.usageExit(err)
	}
	cfg := battery.Config(s, id, nil)
	workers := runtime.GOMAXPROCS(0)
	if est := criticalMemory(n, workers); est > criticalMemLimit && !force {
		return e.usageExit(fmt.Errorf("critical: --n %d needs about %.1f GB of memory (%d workers x T x %d bytes); the limit is %.0f GB: a smaller --n, or --force to run anyway",
			n, est/(1<<30), workers, criticalBytesPerObs, criticalMemLimit/(1<<30)))
	}
	var printed int64 = -1
	var done atomic.Int64
	onTerminal := !quiet && isTerminal(e.stderr)
	cfg.Progress = func(d, total int) {
		done.Store(int64(d))
		switch {
		case onTerminal:
			// "\r" progress only on a terminal: in a log file or a pipe it
			// would leave a run of overwritten lines.
			if d == total || d%(max(total/20, 64)) < 64 {
				fmt.Fprintf(e.stderr, "\rsimulating %s, T=%d: %d/%d", id, n, d, total)
			}
			if d == total {
				fmt.Fprintln(e.stderr)
			}
		case !quiet && atomic.LoadInt64(&printed) >= 0:
			// Plain lines at every tenth once the work was announced.
			if step := int64(10 * d / total); step > atomic.LoadInt64(&printed) {
				atomic.StoreInt64(&printed, step)
				fmt.Fprintf(e.stderr, "rootshift: simulating %s, T=%d: %d/%d replications\n", id, n, d, total)
			}
		}
	}
	start := time.Now()
	ctx, cancel := context.WithCancelCause(e.ctx)
	defer cancel(nil)
	// The watchdog estimates the run time from the progress after 2 s:
	// above 5 s it prints the estimate; above the limit it stops the run
	// unless --force.
	watchDone := make(chan struct{})
	defer close(watchDone)
	go func() {
		tick := time.NewTicker(2 * time.Second)
		defer tick.Stop()
		for {
			select {
			case <-watchDone:
				return
			case <-tick.C:
			}
			el := time.Since(start).Seconds()
			d := done.Load()
			est, lower := 0.0, false
			if d > 0 {
				est = el * float64(s.Sims) / float64(d)
			} else {
				// Not one replication per worker yet: a lower bound.
				est, lower = el*float64(s.Sims)/float64(workers), true
			}
			if est > criticalTimeLimit.Seconds() && !force {
				cancel(fmt.Errorf("%w: estimated %s for %d replications at T=%d, above the limit of %s: fewer --sims, a smaller --n, or --force to run anyway",
					errTooLong, fmtDuration(est, lower), s.Sims, n, criticalTimeLimit))
				return
			}
			if !lower && atomic.LoadInt64(&printed) < 0 {
				if est > 5 && !quiet {
					fmt.Fprintf(e.stderr, "rootshift: critical %s at T=%d: estimated %s for %d replications\n", id, n, fmtDuration(est, false), s.Sims)
				}
				atomic.StoreInt64(&printed, int64(10*d/int64(s.Sims)))
				return
			}
		}
	}()
	d, err := core.SimulateTest(ctx, info, n, cfg, core.SimSpec{Reps: s.Sims, Seed: s.Seed, Progress: cfg.Progress})
	if err != nil {
		if cause := context.Cause(ctx); errors.Is(cause, errTooLong) {
			e.errorf("critical: %v", cause)
			return exitUsage
		}
		e.errorf("critical: %v", err)
		if e.ctx.Err() != nil {
			return e.cancelStatus()
		}
		return exitFailed
	}
	tail := info.Tail
	if id == "adf" && cfg.RightTail {
		tail = "right"
	}
	plan := resolveLags(id, cfg, n)
	out := criticalDoc{
		Schema: "rootshift.critical/v1", Version: battery.Version, Test: id, N: n,
		Trend: cfg.Trend.String(), LagRule: plan.Rule, Lags: plan.Lags, MaxLags: plan.MaxLags, MaxLagsSource: plan.Source,
		Sims: s.Sims, Seed: s.Seed, Failed: d.Failed, Tail: tail, Settings: s,
		Quantiles: map[string]float64{}, StdErrors: map[string]float64{},
		CriticalValues: map[string]float64{}, CriticalStdErrors: map[string]float64{},
		Method:  "Monte Carlo under the null: " + nullDGP(info) + "; quantiles by linear interpolation of order statistics; standard errors from the asymptotic variance of a sample quantile with the density estimated by order-statistic spacings",
		Seconds: time.Since(start).Seconds(),
	}
	if isBreakTest(id) {
		out.Shift = cfg.Shift.String()
	}
	if searchesBreaks(id) {
		tr := cfg.TrimOr()
		out.Trim = &tr
	}
	for _, p := range criticalLevels {
		k := schema.LevelKey(p)
		out.Quantiles[k] = d.Quantile(p)
		out.StdErrors[k] = d.QuantileSE(p)
		q := p
		if tail == "right" {
			q = 1 - p
		}
		out.CriticalValues[k] = d.Quantile(q)
		out.CriticalStdErrors[k] = d.QuantileSE(q)
	}
	if tail == "right" {
		out.UpperQuantiles, out.UpperStdErrors = map[string]float64{}, map[string]float64{}
		for _, p := range []float64{0.90, 0.95, 0.975, 0.99} {
			k := fmt.Sprintf("%.3g", p)
			out.UpperQuantiles[k] = d.Quantile(p)
			out.UpperStdErrors[k] = d.QuantileSE(p)
		}
	}
	if asJSON {
		enc := json.NewEncoder(e.stdout)
		enc.SetEscapeHTML(false)
		enc.SetIndent("", "  ")
		if err := enc.Encode(out); err != nil {
			e.errorf("critical: %v", err)
			return exitFailed
		}
		return exitOK
	}
	fmt.Fprintf(e.stdout, "%s (%s): simulated null distribution, T=%d, trend %s", info.Name, id, n, out.Trend)
	if out.Shift != "" {
		fmt.Fprintf(e.stdout, ", shift %s", out.Shift)
	}
	fmt.Fprintf(e.stdout, "\nlags: %s", plan.text())
	if out.Trim != nil {
		fmt.Fprintf(e.stdout, "; trimming %g", *out.Trim)
	} else if id == "p89" {
		fmt.Fprintf(e.stdout, "; known break date (no search, no trimming)")
	}
	fmt.Fprintf(e.stdout, "\n%d replications, seed %d, %.1f s", s.Sims, s.Seed, out.Seconds)
	if d.Failed > 0 {
		fmt.Fprintf(e.stdout, ", %d failed replications dropped", d.Failed)
	}
	fmt.Fprintf(e.stdout, "\n\n  quantile   value      MC s.e.\n")
	for _, p := range criticalLevels {
		fmt.Fprintf(e.stdout, "  %-8s %9.4f   %8.4f\n", schema.LevelKey(p), d.Quantile(p), d.QuantileSE(p))
	}
	if tail == "right" {
		for _, p := range []float64{0.90, 0.95, 0.975, 0.99} {
			fmt.Fprintf(e.stdout, "  %-8.3g %9.4f   %8.4f\n", p, d.Quantile(p), d.QuantileSE(p))
		}
	}
	if tail == "right" {
		fmt.Fprintf(e.stdout, "\nCritical values (right-tailed: reject H0 when the statistic is ABOVE the value;\nthe 5%% critical value is the 0.95 quantile):\n")
	} else {
		fmt.Fprintf(e.stdout, "\nCritical values (left-tailed: reject H0 when the statistic is BELOW the value;\nthe 5%% critical value is the 0.05 quantile):\n")
	}
	fmt.Fprintf(e.stdout, "  level    critical   MC s.e.\n")
	for _, p := range criticalLevels {
		k := schema.LevelKey(p)
		fmt.Fprintf(e.stdout, "  %-6s %10.4f   %8.4f\n", fmt.Sprintf("%g%%", 100*p), out.CriticalValues[k], out.CriticalStdErrors[k])
	}
	return exitOK
}

// Limits of `critical` without --force.
const (
	criticalMemLimit  = 2.0 * (1 << 30) // bytes
	criticalTimeLimit = time.Hour
	// criticalBytesPerObs bounds the memory of one replication per
	// observation (the simulated series, its differences and the test's
	// work space; measured at T = 20000: 115 B for adf, 330 B for za with 2
	// workers, so this is about twice the largest).
	criticalBytesPerObs = 256
)

var errTooLong = errors.New("too long")

// criticalMemory estimates the memory of a simulation at sample size n.
func criticalMemory(n, workers int) float64 {
	return float64(workers) * float64(n) * criticalBytesPerObs
}

func fmtDuration(sec float64, atLeast bool) string {
	s := (time.Duration(sec) * time.Second).Round(time.Second).String()
	if atLeast {
		return "at least " + s
	}
	return s
}

func nullDGP(info core.Info) string {
	if info.NullDGP != "" {
		return info.NullDGP
	}
	if info.Generate == nil {
		return "Gaussian random walk y_t = y_{t-1} + e_t, y_0 = 0, e_t ~ N(0,1)"
	}
	return "the null model defined by the test (" + info.Null + ")"
}

func isBreakTest(id string) bool {
	switch id {
	case "za", "p89", "pio", "pao", "ls1", "ls2", "lp", "meanshift", "py":
		return true
	}
	return false
}

// searchesBreaks reports whether test id searches break dates over a
// trimmed range (cfg.TrimOr()): the break tests except p89 (a known
// date), and bp.
func searchesBreaks(id string) bool {
	return id == "bp" || (isBreakTest(id) && id != "p89")
}

// lagPlan is how a test chooses its augmentation lags at T observations.
type lagPlan struct {
	// Rule is "bic", "aic", "maic", "tsig", "fixed" or "none".
	Rule string
	// Lags is the order when Rule is "fixed".
	Lags *int
	// MaxLags is the largest order a rule considers; nil without a search.
	MaxLags *int
	// Source says where MaxLags comes from, or why there is none.
	Source string
}

// text is the plan in words for the text header: "bic, maximum 12 (test
// default (Schwert) ...)", "fixed 0", "none (...)".
func (p lagPlan) text() string {
	switch {
	case p.Rule == "fixed" && p.Lags != nil:
		return fmt.Sprintf("fixed %d", *p.Lags)
	case p.MaxLags != nil:
		return fmt.Sprintf("%s, maximum %d (%s)", p.Rule, *p.MaxLags, p.Source)
	}
	return p.Rule + " (" + p.Source + ")"
}

// resolveLags states the lag rule and the maximum lag that test id uses
// under cfg at T observations, as the test's code resolves them (core/adf.go
// dfLags, core/gls.go, core/explosive.go resolveExpl, breaks/za.go
// ioLagPlan, breaks/ls.go lmLagSpecFor, breaks/py.go). TestResolveLags
// checks the rule against the tests' own results.
func resolveLags(id string, cfg *core.Config, T int) lagPlan {
	switch id {
	case "pp", "kpss":
		bw := cfg.BandwidthRule.String()
		if cfg.BandwidthRule == core.BandwidthFixed {
			bw = fmt.Sprintf("fixed at %g", cfg.Bandwidth)
		}
		return lagPlan{Rule: "none", Source: fmt.Sprintf("no augmentation lags: long-run variance by the %s kernel, bandwidth %s", cfg.Kernel, bw)}
	case "bp":
		return lagPlan{Rule: "none", Source: "no augmentation lags in the break regression"}
	}
	if cfg.LagRule == core.LagFixed {
		k := cfg.Lags
		return lagPlan{Rule: "fixed", Lags: &k, Source: "fixed order, no search"}
	}
	// Schwert's rule (or --max-lags), lowered as core.Config.MaxLagsFor
	// does for a regression with extra regressors besides the lags.
	schwert := func(rule core.LagRule, extra int, note string) lagPlan {
		k := cfg.MaxLagsFor(T, extra)
		var src string
		if cfg.MaxLags > 0 {
			src = fmt.Sprintf("--max-lags %d", cfg.MaxLags)
		} else {
			src = fmt.Sprintf("test default (Schwert): floor(12 (T/100)^(1/4)) = %d, Schwert 1989", core.SchwertMax(T))
		}
		asked := core.SchwertMax(T)
		if cfg.MaxLags > 0 {
			asked = cfg.MaxLags
		}
		if k < asked {
			src += fmt.Sprintf(", lowered to %d so the regression keeps 10 degrees of freedom", k)
		}
		return lagPlan{Rule: rule.String(), MaxLags: &k, Source: src + note}
	}
	switch id {
	case "adf":
		return schwert(cfg.LagRule.Or(core.LagBIC), cfg.Trend.NumDet(), "")
	case "dfgls", "ers", "mtests":
		return schwert(cfg.LagRule.Or(core.LagMAIC), cfg.Trend.NumDet(), "")
	case "py":
		return schwert(cfg.LagRule.Or(core.LagBIC), 2+breaks.TermsOf(cfg.Shift, false).Count(), "")
	case "sadf", "gsadf":
		if cfg.LagRule == core.LagAuto {
			k := 0
			return lagPlan{Rule: "fixed", Lags: &k, Source: "test default: lag 0 in every window"}
		}
		return schwert(cfg.LagRule, cfg.Trend.NumDet(), "; further capped so the minimum window keeps 3 degrees of freedom")
	case "za", "p89", "pio", "pao", "ls1", "ls2", "lp", "meanshift":
		k := breaks.DefaultMaxLags
		src := fmt.Sprintf("test default (%d), as in Perron 1989, Zivot & Andrews 1992, Lee & Strazicich 2003", k)
		if cfg.MaxLags > 0 {
			k = cfg.MaxLags
			src = fmt.Sprintf("--max-lags %d", k)
		}
		return lagPlan{Rule: cfg.LagRule.Or(core.LagTSig).String(), MaxLags: &k,
			Source: src + "; lowered only if T leaves fewer than 10 degrees of freedom"}
	}
	rule := "test default"
	if cfg.LagRule != core.LagAuto {
		rule = cfg.LagRule.String()
	}
	src := "test default"
	if cfg.MaxLags > 0 {
		src = fmt.Sprintf("--max-lags %d", cfg.MaxLags)
	}
	return lagPlan{Rule: rule, Source: src}
}
