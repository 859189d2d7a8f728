// Tests of the progress a batch run reports (issue 12, item 2): the steps
// of the series in work carry their reading index, and the estimate of the
// series still to come is exact once every input is read and never below
// what is known to remain. Data are simulated here (writeSeries).
package batch

import (
	"context"
	"testing"

	"github.com/rootshift/rootshift/core/schema"
)

func TestRunProgressPosition(t *testing.T) {
	dir := t.TempDir()
	writeSeries(t, dir, 4, 3, 80) // 4 files of 3 series each
	var after []Summary
	steps := 0
	cfg := Config{Inputs: []string{dir}, Jobs: 2, Settings: schema.Settings{Tests: []string{"adf"}},
		Progress: func(s Summary) {
			if s.Current.Stage != "" {
				steps++
				if s.Current.Index < 1 || s.Current.Index > 12 || s.Current.Test != "adf" {
					t.Errorf("step %+v: no reading index or test", s.Current)
				}
				return
			}
			after = append(after, s)
		}}
	sum, err := Run(context.Background(), cfg, func(Record) error { return nil })
	if err != nil {
		t.Fatal(err)
	}
	if len(after) != 12 || steps == 0 {
		t.Fatalf("%d progress calls after a series, %d steps", len(after), steps)
	}
	seen := map[int]bool{}
	for i, s := range after {
		done := s.Tested + s.Failed
		if done != i+1 || s.Last < 1 || seen[s.Last] {
			t.Errorf("call %d: %d done, last %d", i, done, s.Last)
		}
		seen[s.Last] = true
		if !s.Sized || s.InputBytes <= 0 {
			t.Errorf("call %d: input size not known: %+v", i, s)
		}
		p := s.Pending()
		if p >= 0 && p < s.Read-done {
			t.Errorf("call %d: %d pending, but %d read and not done", i, p, s.Read-done)
		}
	}
	// The last series may be written before the reader marks the end of
	// the inputs (ReadAll): the bytes read then equal the input's size and
	// the estimate is exact.
	last := after[len(after)-1]
	if last.Pending() != 0 || last.BytesRead != last.InputBytes {
		t.Errorf("last call: %+v, pending %d", last, last.Pending())
	}
	if !sum.ReadAll || sum.Read != 12 {
		t.Errorf("returned summary: %+v", sum)
	}
}

// TestPending checks the estimate on hand-made summaries.
func TestPending(t *testing.T) {
	for _, tc := range []struct {
		s    Summary
		want int
	}{
		// A quarter of the bytes gave 10 series: 40 in all, 5 done.
		{Summary{Read: 10, Tested: 5, Sized: true, InputBytes: 400, BytesRead: 100}, 35},
		// Skipped series (resume, shards) are not pending.
		{Summary{Read: 10, Skipped: 2, Tested: 5, Sized: true, InputBytes: 400, BytesRead: 100}, 27},
		// Every input read: exact.
		{Summary{Read: 10, Tested: 4, Failed: 1, ReadAll: true}, 5},
		// Standard input: no size, no estimate.
		{Summary{Read: 10, Tested: 5}, -1},
	} {
		if got := tc.s.Pending(); got != tc.want {
			t.Errorf("%+v: pending %d, want %d", tc.s, got, tc.want)
		}
	}
}
