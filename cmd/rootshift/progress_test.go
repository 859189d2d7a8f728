// Tests of the overall progress of `test` and `batch` (issue 12, item 2):
// the plain lines are overall (series done of the total, the step in work,
// the time spent and to go), the count of finished series never goes down,
// the time to go is the work left at the rate measured, and an interrupted
// `test` writes the series finished before the signal. The demo data is
// invented (see battery).
package main

import (
	"bytes"
	"context"
	"encoding/json"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/rootshift/rootshift/breaks/battery"
	"github.com/rootshift/rootshift/core/schema"
)

// fakeClock is a clock moved by hand.
type fakeClock struct{ t time.Time }

func (c *fakeClock) now() time.Time      { return c.t }
func (c *fakeClock) add(d time.Duration) { c.t = c.t.Add(d) }
func newFakeClock() *fakeClock           { return &fakeClock{time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC)} }

// parseShort reads a shortDuration back ("3 min 20 s", "1 h 5 min", "42 s").
func parseShort(t *testing.T, s string) float64 {
	t.Helper()
	f := strings.Fields(s)
	total := 0.0
	for i := 0; i+1 < len(f); i += 2 {
		v, err := strconv.Atoi(f[i])
		if err != nil {
			t.Fatalf("duration %q: %v", s, err)
		}
		switch f[i+1] {
		case "s":
			total += float64(v)
		case "min":
			total += 60 * float64(v)
		case "h":
			total += 3600 * float64(v)
		default:
			t.Fatalf("duration %q: unit %q", s, f[i+1])
		}
	}
	return total
}

var progressLine = regexp.MustCompile(`^rootshift: progress: (\d+) of (\d+) series done(?: \((\d+) failed\))?(; working on .*)?; (.+) spent, (?:about (.+) to go|time to go not known yet)$`)

type parsedLine struct {
	done, total int
	spent, left float64
	working     string
}

func parseProgress(t *testing.T, stderr string) []parsedLine {
	t.Helper()
	var out []parsedLine
	for _, l := range strings.Split(stderr, "\n") {
		if !strings.HasPrefix(l, "rootshift: progress:") {
			continue
		}
		m := progressLine.FindStringSubmatch(l)
		if m == nil {
			t.Fatalf("progress line not in the expected form: %q", l)
		}
		d, _ := strconv.Atoi(m[1])
		n, _ := strconv.Atoi(m[2])
		p := parsedLine{done: d, total: n, spent: parseShort(t, m[5]), left: -1, working: m[4]}
		if m[6] != "" {
			p.left = parseShort(t, m[6])
		}
		out = append(out, p)
	}
	return out
}

// TestMeterHonest drives the meter with a fake clock: four series of equal
// cost done at a steady 10 s each. Lines come every 2 series (and when 30
// s have passed), the count never goes down, and the time to go is the
// cost of the series left at the measured rate.
func TestMeterHonest(t *testing.T) {
	clk := newFakeClock()
	var b bytes.Buffer
	m := newMeter(&b, false, clk.now)
	m.every, m.first, m.period = 2, time.Hour, time.Hour
	m.plan([]float64{1, 1, 1, 1}, 4, 0)
	for i := 1; i <= 4; i++ {
		m.step(battery.Progress{Stage: "test", Series: "s" + strconv.Itoa(i), Test: "adf", Index: i, Count: 4})
		clk.add(10 * time.Second)
		m.finished(i, false)
	}
	lines := parseProgress(t, b.String())
	if len(lines) != 2 {
		t.Fatalf("%d lines, want 2 (every 2 series):\n%s", len(lines), b.String())
	}
	for i, l := range lines {
		if l.total != 4 || l.done != 2*(i+1) {
			t.Errorf("line %d: %d of %d done", i, l.done, l.total)
		}
		// 10 s per series of equal cost: the time to go is 10 s per series left.
		want := 10 * float64(4-l.done)
		if l.left != want || l.spent != 10*float64(l.done) {
			t.Errorf("line %d: %v spent, %v to go; want %v spent, %v to go", i, l.spent, l.left, 10*float64(l.done), want)
		}
	}
}

// TestMeterPartialAndWeights: a series in work counts for the share of its
// replications done, weights follow the costs, and the count of finished
// series and the share of a series never go down, even when replication
// counts arrive out of order.
func TestMeterPartialAndWeights(t *testing.T) {
	clk := newFakeClock()
	var b bytes.Buffer
	m := newMeter(&b, false, clk.now)
	m.every, m.first, m.period = 1, time.Second, time.Second
	// Series 1 costs 3 units, series 2 one: one test with 100 replications each.
	m.plan([]float64{3, 1}, 4, 100)
	m.step(battery.Progress{Stage: "test", Test: "za", Index: 1})
	clk.add(15 * time.Second)
	m.step(battery.Progress{Stage: "simulation", Test: "za", Index: 1, Done: 50, Total: 100})
	clk.add(time.Second)
	m.step(battery.Progress{Stage: "simulation", Test: "za", Index: 1, Done: 40, Total: 100}) // late report
	lines := parseProgress(t, b.String())
	if len(lines) != 2 {
		t.Fatalf("%d lines:\n%s", len(lines), b.String())
	}
	// Half of series 1 done (1.5 of 4 units) in 15 s: 25 s to go; a
	// second later the share is kept (not 40%): 1.5 units in 16 s.
	if lines[0].left != 25 {
		t.Errorf("after half of series 1: %v s to go, want 25", lines[0].left)
	}
	if want := 16 * 2.5 / 1.5; lines[1].left != float64(int(want+0.5)) {
		t.Errorf("after a late report: %v s to go, want %.0f", lines[1].left, want)
	}
	if !strings.Contains(b.String(), "working on za") || !strings.Contains(b.String(), "replication 50 of 100") {
		t.Errorf("the step in work is not shown:\n%s", b.String())
	}
	clk.add(14 * time.Second)
	m.finished(1, false)
	clk.add(10 * time.Second)
	m.finished(2, true)
	lines = parseProgress(t, b.String())
	last := lines[len(lines)-1]
	if last.done != 2 || last.left != 0 || !strings.Contains(b.String(), "(1 failed)") {
		t.Errorf("last line %+v:\n%s", last, b.String())
	}
	for i := 1; i < len(lines); i++ {
		if lines[i].done < lines[i-1].done {
			t.Errorf("done went down: %d then %d", lines[i-1].done, lines[i].done)
		}
	}
}

// TestMeterTerminal: on a terminal the line is redrawn in place ("\r", no
// newline) and cleared at the end.
func TestMeterTerminal(t *testing.T) {
	clk := newFakeClock()
	var b bytes.Buffer
	m := newMeter(&b, true, clk.now)
	m.setTotal(3)
	for i := 1; i <= 3; i++ {
		clk.add(time.Second)
		m.finished(i, false)
	}
	m.close()
	s := b.String()
	if strings.Contains(s, "\n") || strings.Count(s, "\r") < 4 || !strings.Contains(s, "3 of 3 series done") || !strings.HasSuffix(s, "\r") {
		t.Errorf("terminal output %q", s)
	}
	// A line wider than the terminal is cut to fit.
	b.Reset()
	m = newMeter(&b, true, clk.now)
	m.cols = 30
	m.setTotal(3)
	m.step(battery.Progress{Stage: "test", Test: "za", Series: "a long series name", Index: 1})
	if l := strings.TrimPrefix(b.String(), "\r"); len(l) != 29 || !strings.HasSuffix(l, "...") {
		t.Errorf("line %q on a 30-column terminal", l)
	}
}

// TestTestProgressLines runs `test` on the demo with standard error not a
// terminal: a plain line every 2 series, overall and monotone.
func TestTestProgressLines(t *testing.T) {
	code, _, stderr := runCLI(t, "", "test", "../../testdata/demo.csv", "--tests", "adf,kpss", "--format", "json", "--progress-every", "2", "-j", "2")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	lines := parseProgress(t, stderr)
	if len(lines) < 2 {
		t.Fatalf("%d progress lines:\n%s", len(lines), stderr)
	}
	for i, l := range lines {
		if l.total != 7 {
			t.Errorf("line %d: total %d, want the 7 demo series", i, l.total)
		}
		if i > 0 && (l.done < lines[i-1].done || l.spent < lines[i-1].spent) {
			t.Errorf("line %d goes back: %+v after %+v", i, l, lines[i-1])
		}
	}
	code, _, stderr = runCLI(t, "", "test", "../../testdata/demo.csv", "--tests", "adf", "--quiet", "--progress-every", "1")
	if code != 0 || stderr != "" {
		t.Errorf("--quiet: exit %d, stderr %q", code, stderr)
	}
}

// cancelOnWrite cancels a context when a write contains a marker.
type cancelOnWrite struct {
	mu     sync.Mutex
	b      bytes.Buffer
	marker string
	cancel context.CancelCauseFunc
}

func (c *cancelOnWrite) Write(p []byte) (int, error) {
	c.mu.Lock()
	defer c.mu.Unlock()
	if bytes.Contains(p, []byte(c.marker)) {
		c.cancel(errSIGINT)
	}
	return c.b.Write(p)
}

// TestTestCancelKeepsFinished interrupts `test` once the first series is
// done: the exit status is 130 and the output file is a whole document
// holding the series finished before the signal.
func TestTestCancelKeepsFinished(t *testing.T) {
	ctx, cancel := context.WithCancelCause(context.Background())
	defer cancel(nil)
	errw := &cancelOnWrite{marker: "1 of 7 series done", cancel: cancel}
	out := filepath.Join(t.TempDir(), "out.json")
	var stdout bytes.Buffer
	code := run(ctx, []string{"test", "../../testdata/demo.csv", "--tests", "adf,za", "--sims", "199", "--json", "-j", "1", "--progress-every", "1", "--out", out},
		strings.NewReader(""), &stdout, errw)
	if code != exitCancel {
		t.Fatalf("exit %d, want %d: %s", code, exitCancel, errw.b.String())
	}
	data, err := os.ReadFile(out)
	if err != nil {
		t.Fatal(err)
	}
	var doc schema.Document
	if err := json.Unmarshal(data, &doc); err != nil {
		t.Fatalf("the output is not a whole document: %v", err)
	}
	if len(doc.Series) < 1 || len(doc.Series) >= 7 || doc.Series[0].Name != "freight_volume" {
		t.Errorf("%d series written after the interrupt, want the finished ones", len(doc.Series))
	}
	if !strings.Contains(errw.b.String(), "series finished before it") {
		t.Errorf("stderr does not say what was kept: %s", errw.b.String())
	}
}

// TestMeterForecast: batch's forecast is printed once, from the rate of
// the first series (5 of them, or those done in the first 5 s: here 3 at
// 2 s each), when the whole run exceeds the announcement threshold.
func TestMeterForecast(t *testing.T) {
	clk := newFakeClock()
	var b bytes.Buffer
	m := newMeter(&b, false, clk.now)
	m.every, m.forecast = 0, true
	for i := 1; i <= 10; i++ {
		clk.add(2 * time.Second)
		m.summary(i, i, 0, 100)
	}
	want := "rootshift: about 3 min 20 s in all for about 100 series (from the rate of the first 3)\n"
	if b.String() != want {
		t.Errorf("stderr %q, want %q", b.String(), want)
	}
}
