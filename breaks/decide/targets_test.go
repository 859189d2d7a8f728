// The procedure's error rates against the targets it was built to
// (issue "the verdict as a decision procedure"), re-measured at reduced
// draws: 40 draws per process at T = 200, seed 7 (the committed tables use
// 500 draws and seed 2026; doc/confusion.md). Each bound allows the
// sampling error of 40 draws: a rate target p is checked as
// p + 2.5·sqrt(p(1-p)/40) (about +10 points at 7%, +6 at 3%, -9 at 95%).
// Targets the procedure does not meet at T = 200 are checked against the
// level it does reach, marked "target missed" with the target beside it,
// so that they cannot get worse unnoticed. Processes and targets: our own
// (common practice, no source); see processes.go.
package decide

import (
	"context"
	"math"
	"testing"

	"github.com/rootshift/rootshift/core/schema"
)

func TestProcedureTargets(t *testing.T) {
	if testing.Short() {
		t.Skip("simulation (about half a minute on two cores)")
	}
	const T, draws = 200, 40
	tab, err := SimulateRates(context.Background(), T, draws, 7, schema.Settings{}, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	row := map[string]RateRow{}
	for _, r := range tab.Rows {
		row[r.Key] = r
	}
	slack := func(p float64) float64 { return 2.5 * math.Sqrt(p*(1-p)/draws) }
	type check struct {
		key, outcome string
		atMost       bool    // rate <= bound (else >=)
		target       float64 // the target
		missed       float64 // when the target is missed: the level reached, checked instead
	}
	var checks []check
	for _, k := range []string{"rw", "rw-drift", "rw-jump5", "rw-jump10", "rw-drift-turns", "rw-trough", "rw-garch", "rw-burst"} {
		checks = append(checks, check{k, DirStationary, true, 0.07, 0}, check{k, DirExplosive, true, 0.03, 0})
	}
	checks = append(checks,
		check{"rw-ma", DirStationary, true, 0.30, 0},
		check{"ar-shift3", DirStationary, false, 0.95, 0},
		check{"ar-shift5", DirStationary, false, 0.95, 0},
		check{"ar-shift10", DirStationary, false, 0.95, 0},
		check{"ts-slows", DirStationary, false, 0.90, 0},
		check{"ts-turns", DirStationary, false, 0.90, 0},
		check{"explosive-1.02", DirExplosive, false, 0.95, 0.70}, // target missed: 85% (500 draws); a right-tailed DF with a constant and no lags, the correctly specified test for this process, rejects in 94% at the stage's level 2.5% (our simulation, 2000 draws): 95% is beyond reach at that level
		check{"explosive-1.05", DirExplosive, false, 0.95, 0},
		check{"bubble", DirExplosive, false, 0.80, 0},
	)
	for _, c := range checks {
		r, ok := row[c.key]
		if !ok {
			t.Fatalf("no process %s", c.key)
		}
		got := r.Share(c.outcome)
		bound := c.target
		note := "target"
		if c.missed > 0 {
			bound, note = c.missed, "target missed, level reached"
		}
		if c.atMost {
			bound += slack(bound)
		} else {
			bound -= slack(bound)
		}
		t.Logf("%-16s called %-9s %5.1f%%  (target %s %.0f%%; %s, bound %.1f%%)", c.key, c.outcome, 100*got, map[bool]string{true: "<=", false: ">="}[c.atMost], 100*c.target, note, 100*bound)
		if (c.atMost && got > bound) || (!c.atMost && got < bound) {
			t.Errorf("%s called %s in %.1f%% of %d draws; bound %.1f%% (%s)", c.key, c.outcome, 100*got, r.Total(), 100*bound, note)
		}
	}
	// Geometric growth: the log difference is recommended in at least 90%.
	if r := row["geometric"]; float64(r.LogDiff)/float64(r.Total()) < 0.90-slack(0.90) {
		t.Errorf("geometric growth: log difference in %d of %d draws, want at least 90%%", r.LogDiff, r.Total())
	}
}
