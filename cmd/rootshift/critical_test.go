// Tests of `rootshift critical` beyond the JSON contract in cli_test.go: the
// resolved lag rule, maximum lag and trimming in the header and the JSON;
// critical values keyed by significance level for both tails; no "\r"
// progress when standard error is not a terminal. The simulated series are
// seeded Gaussian random walks (common practice, no source).
package main

import (
	"context"
	"encoding/json"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/rootshift/rootshift/breaks/battery"
	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/schema"
)

// criticalJSON runs `rootshift critical ... --json --quiet` and decodes it.
func criticalJSON(t *testing.T, args ...string) criticalDoc {
	t.Helper()
	code, out, stderr := runCLI(t, "", append(append([]string{"critical"}, args...), "--json", "--quiet")...)
	if code != 0 {
		t.Fatalf("%v: exit %d: %s", args, code, stderr)
	}
	var doc criticalDoc
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	return doc
}

func sameKeys(t *testing.T, what string, m map[string]float64) {
	t.Helper()
	want := []string{"0.01", "0.025", "0.05", "0.10"} // the contract
	if len(m) != len(want) {
		t.Errorf("%s has keys %v, want exactly %v", what, m, want)
	}
	for _, k := range want {
		if _, ok := m[k]; !ok {
			t.Errorf("%s lacks %q", what, k)
		}
	}
}

func TestCriticalLeftTail(t *testing.T) {
	doc := criticalJSON(t, "--test", "adf", "--n", "100", "--sims", "500", "--seed", "1")
	sameKeys(t, "quantiles", doc.Quantiles)
	sameKeys(t, "critical_values", doc.CriticalValues)
	sameKeys(t, "critical_std_errors", doc.CriticalStdErrors)
	for k, q := range doc.Quantiles {
		if doc.CriticalValues[k] != q || doc.CriticalStdErrors[k] != doc.StdErrors[k] {
			t.Errorf("left tail: critical value %s = %g, want the lower quantile %g", k, doc.CriticalValues[k], q)
		}
	}
	// adf: BIC with Schwert's maximum floor(12 (100/100)^(1/4)) = 12 (core/adf.go).
	if doc.LagRule != "bic" || doc.MaxLags == nil || *doc.MaxLags != 12 || !strings.Contains(doc.MaxLagsSource, "test default (Schwert)") {
		t.Errorf("lag rule %q, max lags %v (%q): want bic, 12, test default (Schwert)", doc.LagRule, doc.MaxLags, doc.MaxLagsSource)
	}
	if doc.Trim != nil || doc.Tail != "left" {
		t.Errorf("adf: trim %v tail %q, want no trimming and left", doc.Trim, doc.Tail)
	}
}

func TestCriticalRightTail(t *testing.T) {
	doc := criticalJSON(t, "--test", "kpss", "--n", "100", "--sims", "1000", "--seed", "2")
	sameKeys(t, "quantiles", doc.Quantiles)
	sameKeys(t, "critical_values", doc.CriticalValues)
	for lv, up := range map[string]string{"0.01": "0.99", "0.025": "0.975", "0.05": "0.95", "0.10": "0.9"} {
		if doc.CriticalValues[lv] != doc.UpperQuantiles[up] || doc.CriticalStdErrors[lv] != doc.UpperStdErrors[up] {
			t.Errorf("right tail: critical value %s = %g, want the %s quantile %g", lv, doc.CriticalValues[lv], up, doc.UpperQuantiles[up])
		}
		if doc.CriticalValues[lv] <= doc.Quantiles[lv] {
			t.Errorf("right tail: critical value %s = %g not above the lower quantile %g", lv, doc.CriticalValues[lv], doc.Quantiles[lv])
		}
	}
	// The 1% critical value rejects less often than the 10% one: larger.
	if !(doc.CriticalValues["0.01"] > doc.CriticalValues["0.05"] && doc.CriticalValues["0.05"] > doc.CriticalValues["0.10"]) {
		t.Errorf("right-tailed critical values not decreasing in the level: %v", doc.CriticalValues)
	}
	if doc.LagRule != "none" || doc.MaxLags != nil {
		t.Errorf("kpss has no augmentation lags: rule %q max %v", doc.LagRule, doc.MaxLags)
	}
	code, out, _ := runCLI(t, "", "critical", "--test", "kpss", "--n", "100", "--sims", "1000", "--seed", "2", "--quiet")
	if code != 0 || !strings.Contains(out, "right-tailed: reject H0 when the statistic is ABOVE") ||
		!strings.Contains(out, "the 5% critical value is the 0.95 quantile") {
		t.Errorf("text output lacks the right-tail line:\n%s", out)
	}
}

func TestCriticalBreakTestHeader(t *testing.T) {
	doc := criticalJSON(t, "--test", "za", "--n", "80", "--sims", "200", "--seed", "4", "--trim", "0.1", "--max-lags", "4")
	if doc.LagRule != "tsig" || doc.MaxLags == nil || *doc.MaxLags != 4 || doc.MaxLagsSource == "" || doc.Trim == nil || *doc.Trim != 0.1 {
		t.Errorf("za: rule %q, max %v (%q), trim %v; want tsig, 4 (--max-lags), 0.1", doc.LagRule, doc.MaxLags, doc.MaxLagsSource, doc.Trim)
	}
	doc = criticalJSON(t, "--test", "za", "--n", "80", "--sims", "200", "--seed", "4")
	if doc.MaxLags == nil || *doc.MaxLags != 8 || !strings.HasPrefix(doc.MaxLagsSource, "test default (8)") || doc.Trim == nil || *doc.Trim != 0.15 {
		t.Errorf("za defaults: max %v (%q), trim %v; want 8 (test default), 0.15", doc.MaxLags, doc.MaxLagsSource, doc.Trim)
	}
	code, out, stderr := runCLI(t, "", "critical", "--test", "za", "--n", "80", "--sims", "200", "--seed", "4", "--lags", "0", "--quiet")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	if !strings.Contains(out, "lags: fixed 0; trimming 0.15") {
		t.Errorf("header lacks the lag rule and trimming:\n%s", out)
	}
}

// TestCriticalNoCarriageReturn: standard error here is a buffer, not a
// terminal, so no "\r" progress may be written (nor by test --sims).
func TestCriticalNoCarriageReturn(t *testing.T) {
	code, _, stderr := runCLI(t, "", "critical", "--test", "adf", "--n", "60", "--sims", "300", "--seed", "5")
	if code != 0 || strings.Contains(stderr, "\r") {
		t.Errorf("exit %d, stderr %q: no carriage returns off a terminal", code, stderr)
	}
	code, _, stderr = runCLI(t, "", "test", "--tests", "adf", "--sims", "200", "--columns", "credit_spread", "../../testdata/demo.csv")
	if code != 0 || strings.Contains(stderr, "\r") {
		t.Errorf("test --sims: exit %d, stderr %q", code, stderr)
	}
}

// TestResolveLags checks resolveLags against the tests themselves: the lag
// rule each registered test reports in its result (lag_rule) on a random
// walk must be the one `critical` states, and a chosen order never exceeds
// the stated maximum.
func TestResolveLags(t *testing.T) {
	const T = 150
	r := rand.New(rand.NewPCG(7, 7))
	y := make([]float64, T)
	for i := 1; i < T; i++ {
		y[i] = y[i-1] + r.NormFloat64()
	}
	four, two := 4, 2
	checked := 0
	for _, set := range []schema.Settings{
		{},
		{LagRule: "aic"},
		{LagRule: "bic", MaxLags: &four},
		{Lags: &two},
	} {
		for _, id := range core.IDs() {
			info, _ := core.Lookup(id)
			s := set
			if id == "p89" {
				s.BreakDate = "75"
			}
			cfg := battery.Config(s, id, nil)
			res, err := info.Run(context.Background(), y, cfg)
			if err != nil {
				continue // a rule the test does not offer: critical fails the same way
			}
			checked++
			plan := resolveLags(id, cfg, T)
			got := res.LagRule
			if got == "" {
				got = "none"
			}
			if got != plan.Rule {
				t.Errorf("%s %+v: test reports lag rule %q, critical states %q", id, set, got, plan.Rule)
			}
			if plan.Rule == "fixed" && (plan.Lags == nil || *plan.Lags != res.Lags) {
				t.Errorf("%s %+v: fixed %v, test used %d", id, set, plan.Lags, res.Lags)
			}
			if plan.MaxLags != nil && res.Lags > *plan.MaxLags {
				t.Errorf("%s %+v: %d lags chosen above the stated maximum %d", id, set, res.Lags, *plan.MaxLags)
			}
		}
	}
	// Every test runs under the defaults and with fixed lags; some refuse aic.
	if want := 2 * len(core.IDs()); checked < want {
		t.Errorf("only %d test runs compared, want at least %d", checked, want)
	}
	t.Logf("%d test runs compared", checked)
}
