package main

import (
	"encoding/json"
	"fmt"
	"time"

	"github.com/rootshift/rootshift/breaks/battery"
	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/schema"
)

// criticalDoc is the JSON written by `rootshift critical --json`.
type criticalDoc struct {
	Schema    string             `json:"schema"`
	Version   string             `json:"version"`
	Test      string             `json:"test"`
	N         int                `json:"n"`
	Trend     string             `json:"trend"`
	Shift     string             `json:"shift,omitempty"`
	Sims      int                `json:"sims"`
	Seed      uint64             `json:"seed"`
	Failed    int                `json:"failed"`
	Tail      string             `json:"tail"`
	Settings  schema.Settings    `json:"settings"`
	Quantiles map[string]float64 `json:"quantiles"`
	// StdErrors are the Monte Carlo standard errors of Quantiles.
	StdErrors map[string]float64 `json:"std_errors"`
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
	var asJSON, quiet bool
	fs := newFlagSet("critical", e.stderr, "Usage: rootshift critical --test ID [--shift ...] [--trend ...] --n T --sims N --seed S [--json]\n\nSimulates the test's null distribution at sample size T (Gaussian random walk\nunless the test defines its own null) and prints its quantiles with Monte Carlo standard errors.")
	settingsFlags(fs, &s)
	fs.StringVar(&id, "test", "", "test id (required)")
	fs.IntVar(&n, "n", 0, "sample size T (required)")
	fs.BoolVar(&asJSON, "json", false, "print JSON")
	fs.BoolVar(&quiet, "quiet", false, "no progress on standard error")
	if _, err := parseInterleaved(fs, args); err != nil {
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
	if !quiet {
		cfg.Progress = func(done, total int) {
			if done == total || done%(max(total/20, 64)) < 64 {
				fmt.Fprintf(e.stderr, "\rsimulating %s, T=%d: %d/%d", id, n, done, total)
			}
			if done == total {
				fmt.Fprintln(e.stderr)
			}
		}
	}
	start := time.Now()
	d, err := core.SimulateTest(e.ctx, info, n, cfg, core.SimSpec{Reps: s.Sims, Seed: s.Seed, Progress: cfg.Progress})
	if err != nil {
		e.errorf("critical: %v", err)
		if e.ctx.Err() != nil {
			return exitCancel
		}
		return exitFailed
	}
	out := criticalDoc{
		Schema: "rootshift.critical/v1", Version: battery.Version, Test: id, N: n,
		Trend: cfg.Trend.String(), Sims: s.Sims, Seed: s.Seed, Failed: d.Failed, Tail: info.Tail, Settings: s,
		Quantiles: map[string]float64{}, StdErrors: map[string]float64{},
		Method:  "Monte Carlo under the null: " + nullDGP(info) + "; quantiles by linear interpolation of order statistics; standard errors from the asymptotic variance of a sample quantile with the density estimated by order-statistic spacings",
		Seconds: time.Since(start).Seconds(),
	}
	if isBreakTest(id) {
		out.Shift = cfg.Shift.String()
	}
	for _, p := range []float64{0.01, 0.025, 0.05, 0.10} {
		out.Quantiles[schema.LevelKey(p)] = d.Quantile(p)
		out.StdErrors[schema.LevelKey(p)] = d.QuantileSE(p)
	}
	if info.Tail == "right" {
		out.UpperQuantiles, out.UpperStdErrors = map[string]float64{}, map[string]float64{}
		for _, p := range []float64{0.90, 0.95, 0.975, 0.99} {
			k := fmt.Sprintf("%.3g", p)
			out.UpperQuantiles[k] = d.Quantile(p)
			out.UpperStdErrors[k] = d.QuantileSE(p)
		}
	}
	if asJSON {
		b, _ := json.MarshalIndent(out, "", "  ")
		e.stdout.Write(append(b, '\n'))
		return exitOK
	}
	fmt.Fprintf(e.stdout, "%s (%s): simulated null distribution, T=%d, trend %s", info.Name, id, n, out.Trend)
	if out.Shift != "" {
		fmt.Fprintf(e.stdout, ", shift %s", out.Shift)
	}
	fmt.Fprintf(e.stdout, "\n%d replications, seed %d, %.1f s", s.Sims, s.Seed, out.Seconds)
	if d.Failed > 0 {
		fmt.Fprintf(e.stdout, ", %d failed replications dropped", d.Failed)
	}
	fmt.Fprintf(e.stdout, "\n\n  quantile   value      MC s.e.\n")
	for _, p := range []float64{0.01, 0.025, 0.05, 0.10} {
		fmt.Fprintf(e.stdout, "  %-8s %9.4f   %8.4f\n", schema.LevelKey(p), d.Quantile(p), d.QuantileSE(p))
	}
	if info.Tail == "right" {
		for _, p := range []float64{0.90, 0.95, 0.975, 0.99} {
			fmt.Fprintf(e.stdout, "  %-8.3g %9.4f   %8.4f\n", p, d.Quantile(p), d.QuantileSE(p))
		}
		fmt.Fprintf(e.stdout, "\nThis test rejects for large values: use the upper quantiles.\n")
	}
	return exitOK
}

func nullDGP(info core.Info) string {
	if info.Generate == nil {
		return "Gaussian random walk y_t = y_{t-1} + e_t, y_0 = 0, e_t ~ N(0,1)"
	}
	return "the null model defined by the test (" + info.Null + ")"
}

func isBreakTest(id string) bool {
	switch id {
	case "za", "p89", "pio", "pao", "ls1", "ls2", "lp", "cmrao1", "cmrio1", "cmrao2", "cmrio2", "py":
		return true
	}
	return false
}
