// Tests of the forecast of `test` (issue 12, item 4): the cost model's
// power law between its pilot lengths, the estimate of a small real run
// within a factor of 3 of its measured time, and the refusal of work
// estimated above the limit without --force. The demo data is invented
// (see battery).
package main

import (
	"bytes"
	"context"
	"math"
	"os"
	"strings"
	"testing"
	"time"

	"github.com/rootshift/rootshift/breaks/batch"
	"github.com/rootshift/rootshift/breaks/battery"
	"github.com/rootshift/rootshift/core/dataset"
	"github.com/rootshift/rootshift/core/schema"
)

func TestCostModelPowerLaw(t *testing.T) {
	// Base cost grows as T^2 between the pilot lengths, a replication as T.
	m := &costModel{sims: 10, points: []costPoint{{T: 100, base: 1, rep: 0.1}, {T: 200, base: 4, rep: 0.2}}}
	for _, tc := range []struct {
		T    int
		want float64
	}{
		{100, 1 + 10*0.1},
		{200, 4 + 10*0.2},
		{150, 2.25 + 10*0.15},
		{400, 16 + 10*0.4}, // beyond the longest pilot: the same powers
	} {
		if got := m.at(tc.T); math.Abs(got-tc.want) > 1e-9 {
			t.Errorf("T=%d: %g, want %g", tc.T, got, tc.want)
		}
	}
	// One pilot length: the break searches' order, T^2.
	one := &costModel{points: []costPoint{{T: 100, base: 1}}}
	if got := one.at(300); math.Abs(got-9) > 1e-9 {
		t.Errorf("one pilot length, T=300: %g, want 9", got)
	}
}

func demoJobs(t *testing.T, s schema.Settings) []seriesJob {
	t.Helper()
	data, err := os.ReadFile("../../testdata/demo.csv")
	if err != nil {
		t.Fatal(err)
	}
	tab, err := dataset.Parse("demo.csv", data, dataset.OptionsFor(s))
	if err != nil {
		t.Fatal(err)
	}
	jobs, err := planSeries(tab, s)
	if err != nil {
		t.Fatal(err)
	}
	return jobs
}

// TestEstimateWithinFactor3 forecasts a small run (the 7 demo series, adf
// and za with 999 simulated replications each, one worker) and then runs
// it: the forecast is within a factor of 3 of the time measured.
func TestEstimateWithinFactor3(t *testing.T) {
	s := schema.Settings{Tests: []string{"adf", "za"}, Sims: 999, Seed: 3}
	jobs := demoJobs(t, s)
	model := pilotCost(context.Background(), jobs, s, false)
	if model == nil {
		t.Fatal("no pilot for a run with simulations")
	}
	est := estimateRun(model, jobs, 1, false)
	if est.series != 7 {
		t.Fatalf("%d series forecast, want 7", est.series)
	}
	start := time.Now()
	opt := &battery.Options{Workers: 1}
	for _, j := range jobs {
		if _, err := batch.AnalyzeSeries(context.Background(), j.in, s, opt); err != nil {
			t.Fatal(err)
		}
	}
	took := time.Since(start).Seconds()
	ratio := est.seconds / took
	t.Logf("forecast %.2f s, measured %.2f s (ratio %.2f); %s; trial %+v", est.seconds, took, ratio, est.describe(s.Sims), model.points)
	if ratio < 1.0/3 || ratio > 3 {
		t.Errorf("forecast %.2f s, measured %.2f s: off by more than a factor of 3", est.seconds, took)
	}
}

// TestTestRefusesHoursLong: a request estimated above the limit is a usage
// error that names the estimate and --force, before any output.
func TestTestRefusesHoursLong(t *testing.T) {
	// Bounded: a forecast that failed to refuse would otherwise run for hours.
	ctx, cancel := context.WithTimeout(context.Background(), 30*time.Second)
	defer cancel()
	var stdout, errb bytes.Buffer
	code := run(ctx, []string{"test", "../../testdata/demo.csv", "--tests", "za,pio,p89", "--sims", "10000000"}, strings.NewReader(""), &stdout, &errb)
	out, stderr := stdout.String(), errb.String()
	if code != exitUsage || out != "" || !strings.Contains(stderr, "above the limit") || !strings.Contains(stderr, "--force") || !strings.Contains(stderr, "7 series") {
		t.Errorf("exit %d, stdout %.40q, stderr %q", code, out, stderr)
	}
}
