// Tests of the magnitude guard (issue "Nothing lost, nothing injected",
// item 6): the Dickey-Fuller t-ratio (Dickey & Fuller 1979, eq. for τ) and
// the KPSS statistic (Kwiatkowski et al. 1992, eq. 12) are invariant to
// multiplying the series by a constant, so a series near 1e308 or 1e-300,
// rescaled by a power of two, gives the statistics of the same series at an
// ordinary scale, and a verdict. Simulated series (common practice, no
// source).
package batch

import (
	"context"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/rootshift/rootshift/core/dataset"
	"github.com/rootshift/rootshift/core/schema"
)

func TestExtremeMagnitudesRescaled(t *testing.T) {
	r := rand.New(rand.NewPCG(7, 1))
	y := make([]float64, 120)
	s := 0.0
	for i := range y {
		s += r.NormFloat64()
		y[i] = 50 + s
	}
	base, err := AnalyzeSeries(context.Background(), dataset.Series{Name: "y", Values: y}, schema.Settings{}, nil)
	if err != nil || len(base.Errors) > 0 || base.Verdict == nil {
		t.Fatalf("ordinary scale: %v %v", err, base.Errors)
	}
	for _, c := range []float64{1e306, -1e306, 1e-300, 3e-310} {
		z := make([]float64, len(y))
		for i := range y {
			z[i] = y[i] * c
		}
		got, err := AnalyzeSeries(context.Background(), dataset.Series{Name: "z", Values: z}, schema.Settings{}, nil)
		if err != nil {
			t.Fatal(err)
		}
		if len(got.Errors) > 0 {
			t.Errorf("scale %g: errors %v", c, got.Errors)
			continue
		}
		if got.Verdict == nil || got.Verdict.Class != base.Verdict.Class {
			t.Errorf("scale %g: verdict %v, want %s as at the ordinary scale", c, got.Verdict, base.Verdict.Class)
		}
		if len(got.Warnings) == 0 || !strings.Contains(strings.Join(got.Warnings, " "), "rescaled by 2^") {
			t.Errorf("scale %g: no rescaling warning: %v", c, got.Warnings)
		}
		if len(got.Results) != len(base.Results) {
			t.Fatalf("scale %g: %d results, %d at the ordinary scale", c, len(got.Results), len(base.Results))
		}
		for i, res := range got.Results {
			b := base.Results[i]
			if (res.Test != "adf" && res.Test != "kpss") || res.Statistic == nil || b.Statistic == nil || b.Test != res.Test {
				continue
			}
			want := *b.Statistic
			// 3e-310 is subnormal: its digits are rounded, so only close.
			tol := 1e-9
			if c < 1e-307 {
				tol = 1e-3
			}
			if d := math.Abs(*res.Statistic - want); d > tol*math.Max(1, math.Abs(want)) {
				t.Errorf("scale %g: %s statistic %g, %g at the ordinary scale", c, res.Test, *res.Statistic, want)
			}
		}
	}
}

func TestNoVerdictWhenCoreTestsFail(t *testing.T) {
	// Infinite values: every test fails, and no verdict is issued.
	y := make([]float64, 80)
	for i := range y {
		y[i] = float64(i%7) + 1
	}
	y[40] = math.Inf(1)
	got, err := AnalyzeSeries(context.Background(), dataset.Series{Name: "y", Values: y}, schema.Settings{}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if got.Verdict != nil {
		t.Fatalf("a verdict (%s) although: %v", got.Verdict.Class, got.Errors)
	}
	t.Logf("errors %v warnings %v", got.Errors, got.Warnings)
}
