package main

import (
	"fmt"
	"io"
	"os"
	"strings"
	"sync"
	"time"

	"github.com/rootshift/rootshift/breaks/battery"
	"golang.org/x/term"
)

// meter shows the overall progress of `test`, `demo` and `batch` on
// standard error: series finished of the total, the step in work (test,
// series, replications), the time spent and an estimate of the time left.
// On a terminal it is one line redrawn in place (at most ten times a
// second); otherwise it prints a plain line every `every` series and at
// least every `period` (the first after `first`).
//
// The estimate of the time left comes from work units: each series weighs
// its cost under the calibrated model (estimate.go) when one is given
// (`test`), or one unit (`batch`, whose series are not known in advance).
// Finished series count in full; a series in work counts for the share of
// its simulated replications done. The count of finished series never
// goes down: it only moves when a series is finished.
type meter struct {
	w   io.Writer
	tty bool
	now func() time.Time
	// cols is the terminal's width: a longer line is cut to fit, since a
	// line that wraps cannot be redrawn in place (0: no limit).
	cols int

	every         int
	first, period time.Duration

	mu       sync.Mutex
	start    time.Time
	lastLine time.Time // plain mode: last line printed
	lastDraw time.Time // terminal mode: last redraw
	width    int       // terminal mode: length of the line on screen
	lines    int       // plain lines printed

	done, failed int
	total        int // -1: not known yet
	cur          battery.Progress
	// weights[i] is the cost of series i+1 (test); nil: one unit each.
	weights []float64
	// workDone is the weight of the finished series; partial the share done
	// of the series in work, by series index.
	workDone, workTotal float64
	partial             map[int]float64
	// perSeries is the expected number of simulated replications of one
	// series (tests x sims), to turn replication counts into shares.
	perSeries int
	simsDone  map[int]int // replications done in finished tests, by series
	completed map[int]map[string]bool
	// model is the calibrated estimate of the whole run in seconds (0: none).
	model float64
	// forecast (batch, which has no forecast before work) prints once, as
	// soon as the measured rate gives one, the length of the whole run
	// when it exceeds announceAbove.
	forecast, forecastDone bool
}

func newMeter(w io.Writer, tty bool, now func() time.Time) *meter {
	if now == nil {
		now = time.Now
	}
	cols := 0
	if f, ok := w.(*os.File); ok && tty {
		if c, _, err := term.GetSize(int(f.Fd())); err == nil {
			cols = c
		}
	}
	return &meter{w: w, cols: cols, tty: tty, now: now, start: now(), lastLine: now(), total: -1,
		every: 1000, first: 5 * time.Second, period: 30 * time.Second,
		partial: map[int]float64{}, simsDone: map[int]int{}, completed: map[int]map[string]bool{}}
}

// plan sets the series of the run, their costs (seconds on one core, from
// the model), the forecast of the whole run (seconds with its workers) and
// the replications one series simulates.
func (m *meter) plan(costs []float64, forecast float64, reps int) {
	m.mu.Lock()
	defer m.mu.Unlock()
	m.total = len(costs)
	m.weights = costs
	m.workTotal = 0
	for _, c := range costs {
		m.workTotal += c
	}
	m.model = forecast
	m.perSeries = reps
}

// step records a step of series index (from 1): a test started or
// replications done.
func (m *meter) step(p battery.Progress) {
	m.mu.Lock()
	defer m.mu.Unlock()
	if p.Stage == "series" {
		return
	}
	if p.Stage == "simulation" && p.Total > 0 && (m.perSeries == 0 || p.Test == "verdict reliability") && m.weights != nil {
		// Replications not counted in advance (the verdict's error rates
		// recomputed): the share of the simulation in work.
		m.partial[p.Index] = max(m.partial[p.Index], min(float64(p.Done)/float64(p.Total), 0.95))
	} else if p.Stage == "simulation" && p.Total > 0 && m.perSeries > 0 {
		// Replication counts of one simulation may arrive out of order: a
		// simulation counts in full once, when its last replication is
		// reported.
		if m.completed[p.Index] == nil {
			m.completed[p.Index] = map[string]bool{}
		}
		if p.Done >= p.Total && !m.completed[p.Index][p.Test] {
			m.completed[p.Index][p.Test] = true
			m.simsDone[p.Index] += p.Total
		}
		share := float64(m.simsDone[p.Index]) / float64(m.perSeries)
		if !m.completed[p.Index][p.Test] {
			share += float64(p.Done) / float64(m.perSeries)
		}
		// A share never goes down and never reaches the whole series (its
		// last steps are not replications).
		m.partial[p.Index] = max(m.partial[p.Index], min(share, 0.95))
	}
	m.cur = p
	m.show(false, false)
}

// finished records that series index (from 1) is done.
func (m *meter) finished(index int, failed bool) {
	m.mu.Lock()
	defer m.mu.Unlock()
	m.done++
	if failed {
		m.failed++
	}
	if m.weights != nil && index >= 1 && index <= len(m.weights) {
		m.workDone += m.weights[index-1]
	} else {
		m.workDone++
	}
	delete(m.partial, index)
	delete(m.simsDone, index)
	delete(m.completed, index)
	if m.cur.Index == index {
		m.cur = battery.Progress{}
	}
	m.show(false, true)
}

// summary records the counts of a batch run after series index (from 1)
// was written: done and failed so far, the total (-1: not known yet).
func (m *meter) summary(index, done, failed, total int) {
	m.mu.Lock()
	defer m.mu.Unlock()
	more := done > m.done
	m.done, m.failed = max(m.done, done), max(m.failed, failed)
	m.workDone = float64(m.done)
	m.total = total
	if total >= 0 {
		m.workTotal = float64(total)
	}
	delete(m.partial, index)
	delete(m.simsDone, index)
	delete(m.completed, index)
	if m.cur.Index == index {
		m.cur = battery.Progress{}
	}
	m.show(false, more)
}

// setTotal sets the number of series in the run (batch: estimated as
// reading goes; -1 unknown) with the work done so far in units of one
// series.
func (m *meter) setTotal(total int) {
	m.mu.Lock()
	defer m.mu.Unlock()
	m.total = total
	if m.weights == nil && total >= 0 {
		m.workTotal = float64(total)
	}
}

// left estimates the seconds left; ok is false when there is no basis yet.
func (m *meter) left(elapsed float64) (float64, bool) {
	if m.total < 0 || m.workTotal <= 0 {
		return 0, false
	}
	done := m.workDone
	for i, s := range m.partial {
		w := 1.0
		if m.weights != nil && i >= 1 && i <= len(m.weights) {
			w = m.weights[i-1]
		}
		done += s * w
	}
	f := min(1, done/m.workTotal)
	var measured float64
	haveMeasured := f > 0 && elapsed > 0
	if haveMeasured {
		measured = elapsed * (1 - f) / f
	}
	switch {
	case m.model > 0 && !haveMeasured:
		return max(0, m.model-elapsed), true
	case m.model > 0 && f < 0.2:
		// Early on the measured rate rests on little work: blend it with
		// the model, giving the measure more weight as work is done.
		w := f / 0.2
		return w*measured + (1-w)*max(0, m.model*(1-f)), true
	case haveMeasured:
		return measured, true
	}
	return 0, false
}

// line is the progress text.
func (m *meter) line() string {
	el := m.now().Sub(m.start).Seconds()
	var b strings.Builder
	if m.total >= 0 {
		fmt.Fprintf(&b, "%d of %d series done", m.done, m.total)
	} else {
		fmt.Fprintf(&b, "%d series done", m.done)
	}
	if m.failed > 0 {
		fmt.Fprintf(&b, " (%d failed)", m.failed)
	}
	if c := m.cur; c.Test != "" {
		fmt.Fprintf(&b, "; working on %s", c.Test)
		if c.Series != "" {
			fmt.Fprintf(&b, " for %s", c.Series)
		}
		if c.Index > 0 && m.total > 0 {
			fmt.Fprintf(&b, " (series %d of %d)", c.Index, m.total)
		}
		if c.Stage == "simulation" && c.Total > 0 {
			fmt.Fprintf(&b, ", replication %d of %d", c.Done, c.Total)
		}
	}
	fmt.Fprintf(&b, "; %s spent", shortDuration(el))
	if left, ok := m.left(el); ok {
		fmt.Fprintf(&b, ", about %s to go", shortDuration(left))
	} else {
		b.WriteString(", time to go not known yet")
	}
	return b.String()
}

// show prints the line when due (plain: every `every` series finished,
// and when `period` has passed); final forces it (plain) or clears it
// (terminal). Called with mu held.
func (m *meter) show(final, finishedNow bool) {
	t := m.now()
	if m.forecast && !m.forecastDone && m.done > 0 && m.total >= 0 && (m.done >= 5 || t.Sub(m.start) >= 5*time.Second) {
		m.forecastDone = true
		el := t.Sub(m.start).Seconds()
		if left, ok := m.left(el); ok && el+left > announceAbove.Seconds() {
			if m.tty && m.width > 0 {
				fmt.Fprintf(m.w, "\r%s\r", strings.Repeat(" ", m.width))
				m.width = 0
			}
			fmt.Fprintf(m.w, "rootshift: about %s in all for about %d series (from the rate of the first %d)\n", shortDuration(el+left), m.total, m.done)
		}
	}
	if m.tty {
		if final {
			if m.width > 0 {
				fmt.Fprintf(m.w, "\r%s\r", strings.Repeat(" ", m.width))
				m.width = 0
			}
			return
		}
		if t.Sub(m.lastDraw) < 100*time.Millisecond && !m.lastDraw.IsZero() {
			return
		}
		m.lastDraw = t
		s := m.line()
		if m.cols > 1 && len(s) > m.cols-1 {
			s = s[:m.cols-4] + "..."
		}
		pad := ""
		if len(s) < m.width {
			pad = strings.Repeat(" ", m.width-len(s))
		}
		fmt.Fprintf(m.w, "\r%s%s", s, pad)
		m.width = len(s)
		return
	}
	wait := m.period
	if m.lines == 0 {
		wait = m.first
	}
	byCount := finishedNow && m.every > 0 && m.done%m.every == 0
	if final || byCount || (m.every > 0 && t.Sub(m.lastLine) >= wait) {
		m.lastLine = t
		m.lines++
		fmt.Fprintf(m.w, "rootshift: progress: %s\n", m.line())
	}
}

// ticker redraws the line (terminal) or checks whether a plain line is
// due every interval, so that a long step still shows the time passing.
// The returned function stops it.
func (m *meter) ticker(interval time.Duration) func() {
	stop := make(chan struct{})
	done := make(chan struct{})
	go func() {
		defer close(done)
		t := time.NewTicker(interval)
		defer t.Stop()
		for {
			select {
			case <-stop:
				return
			case <-t.C:
				m.mu.Lock()
				m.show(false, false)
				m.mu.Unlock()
			}
		}
	}()
	var once sync.Once
	return func() { once.Do(func() { close(stop); <-done }) }
}

// close ends the display: the terminal line is cleared.
func (m *meter) close() {
	m.mu.Lock()
	defer m.mu.Unlock()
	if m.tty {
		m.show(true, false)
	}
}

// shortDuration writes seconds as "42 s", "3 min 20 s" or "2 h 5 min".
func shortDuration(sec float64) string {
	s := int(sec + 0.5)
	switch {
	case s < 60:
		return fmt.Sprintf("%d s", s)
	case s < 3600:
		if s%60 == 0 {
			return fmt.Sprintf("%d min", s/60)
		}
		return fmt.Sprintf("%d min %d s", s/60, s%60)
	}
	if (s%3600)/60 == 0 {
		return fmt.Sprintf("%d h", s/3600)
	}
	return fmt.Sprintf("%d h %d min", s/3600, (s%3600)/60)
}
