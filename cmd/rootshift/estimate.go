package main

import (
	"context"
	"fmt"
	"math"
	"slices"
	"time"

	"github.com/rootshift/rootshift/breaks/batch"
	"github.com/rootshift/rootshift/breaks/battery"
	"github.com/rootshift/rootshift/core/dataset"
	"github.com/rootshift/rootshift/core/schema"
)

// The cost model of `test` and `demo`: a short pilot of the actual work on
// this machine, scaled to every series.
//
// The pilot analyses the shortest and the longest series of the run (cut
// to pilotMaxObs observations) with the run's settings, once without
// simulated p-values (the base cost) and, with --sims, once more with a few
// replications, which gives the cost of one replication of the tests
// asked for; with --rate-draws, once more with one draw of the verdict's
// error rates, which gives the cost of a draw. When the longest series
// is cut, or is not much longer than the shortest, the second pilot length
// is the longest series cut to half the first, so that there are two
// lengths whenever the run holds series longer than the pilot. Between
// (and beyond) the pilot lengths the cost follows a power of T fitted
// through them (its exponent held to [1, 3]; exponent 2, the break
// searches' order, when there is one pilot length); a series' cost is
// base(T) + sims x replication(T) + rate draws x draw(T). The run's time
// is the sum over series divided by the workers that run at once.
const (
	pilotMaxObs = 600
	// pilotMinTime is how long a pilot measurement runs at least (it is
	// repeated up to pilotMaxRepeat times), so that the clock's
	// resolution and noise do not dominate it.
	pilotMinTime = 30 * time.Millisecond
	// pilotRepTime is how long the trial's replications run at least (or
	// all of them, or 4096): long enough to average out short bursts of
	// other work on a shared machine.
	pilotRepTime   = 100 * time.Millisecond
	pilotMaxRepeat = 5
	// pilotSkipObs: runs without simulations whose series hold fewer
	// observations than this in total take seconds at most (the slowest
	// test, ls2, about 4 s at T = 2000 on one core); no pilot.
	pilotSkipObs = 2000
	// pilotLongRun: a trial run this long is timed once (a stall of the
	// machine is small beside it, and the trial must stay short beside
	// the work).
	pilotLongRun = 250 * time.Millisecond
	// estimateLimit is the estimate above which `test` refuses to start
	// without --force (as `critical` does).
	estimateLimit = time.Hour
	// announceAbove is the estimate above which it is printed.
	announceAbove = 3 * time.Second
)

// costPoint is the measured cost at one pilot length.
type costPoint struct {
	T         int
	base, rep float64 // seconds: the analysis without simulations; one replication of every test simulated
	draw      float64 // seconds: one draw of the verdict's error rates (--rate-draws)
}

// costModel gives the seconds one series of length T takes on one core.
type costModel struct {
	points    []costPoint // by increasing T
	sims      int
	rateDraws int
}

// at interpolates (or extrapolates) the cost at T.
func (c *costModel) at(T int) float64 {
	if len(c.points) == 0 || T <= 0 {
		return 0
	}
	a, b := c.points[0], c.points[len(c.points)-1]
	scale := func(va, vb float64) float64 {
		p := 2.0
		if b.T > a.T && va > 0 && vb > 0 {
			p = math.Log(vb/va) / math.Log(float64(b.T)/float64(a.T))
			p = min(3, max(1, p))
		}
		ref, v := a, va
		if T >= b.T || a.T == b.T {
			ref, v = b, vb
		}
		return v * math.Pow(float64(T)/float64(ref.T), p)
	}
	return scale(a.base, b.base) + float64(c.sims)*scale(a.rep, b.rep) + float64(c.rateDraws)*scale(a.draw, b.draw)
}

// runEstimate is the forecast of a `test` run.
type runEstimate struct {
	costs   []float64 // seconds per series on one core (0 for failed series)
	seconds float64   // wall time with the run's workers
	series  int       // series analysed
	// rateDraws is the run's --rate-draws (said in the announcement).
	rateDraws int
}

// timeOnce runs f three times, and again until pilotMinTime has passed
// (at most pilotMaxRepeat times; once when the first run takes
// pilotLongRun), and returns the median time of one run:
// on a shared machine one run can stall for other work (the mean would
// follow it) and the shortest is more favourable than the run will be.
func timeOnce(f func() error) (float64, error) {
	start := time.Now()
	var ts []float64
	for n := 0; n < pilotMaxRepeat; n++ {
		t0 := time.Now()
		if err := f(); err != nil {
			return 0, err
		}
		ts = append(ts, time.Since(t0).Seconds())
		if (n >= 2 && time.Since(start) >= pilotMinTime) || (n == 0 && ts[0] >= pilotLongRun.Seconds()) {
			break
		}
	}
	slices.Sort(ts)
	return ts[len(ts)/2], nil
}

// pilotCost measures the cost model on the series of the run. It returns
// nil when the run is small enough to need none, or when the pilot could
// not run (cancellation).
func pilotCost(ctx context.Context, jobs []seriesJob, s schema.Settings, force bool) *costModel {
	var short, long *dataset.Series
	total, count := 0, 0
	for i := range jobs {
		j := &jobs[i]
		n := len(j.in.Values)
		if j.fail != nil || n == 0 || (!force && n > batch.DefaultMaxObs) {
			continue
		}
		total += n
		count++
		if short == nil || n < len(short.Values) {
			short = &j.in
		}
		if long == nil || n > len(long.Values) {
			long = &j.in
		}
	}
	if short == nil || (s.Sims == 0 && s.RateDraws == 0 && total < pilotSkipObs) {
		return nil
	}
	m := &costModel{sims: s.Sims, rateDraws: s.RateDraws}
	opt := &battery.Options{Workers: 1}
	if count == 1 {
		// One series: its simulations use every core, in the run and in
		// the pilot.
		opt.Workers = 0
	}
	cut := func(in dataset.Series, n int) dataset.Series {
		if len(in.Values) <= n {
			return in
		}
		in.Values = in.Values[:n]
		if len(in.Dates) > n {
			in.Dates = in.Dates[:n]
		}
		return in
	}
	type pilot struct {
		in *dataset.Series
		n  int
	}
	a := pilot{short, min(len(short.Values), pilotMaxObs)}
	b := pilot{long, min(len(long.Values), pilotMaxObs)}
	pilots := []pilot{a}
	switch {
	case len(long.Values) > b.n && 2*a.n > b.n:
		// Series longer than the pilot and no shorter length measured:
		// the longest also at half the pilot's length.
		pilots = []pilot{{long, b.n / 2}, b}
	case b.n > a.n:
		pilots = append(pilots, b)
	}
	for _, p := range pilots {
		pin := cut(*p.in, p.n)
		ps := s
		ps.Sims, ps.RateDraws = 0, 0
		base, err := timeOnce(func() error { _, err := battery.AnalyzeSeries(ctx, pin, ps, opt); return err })
		if err != nil {
			return nil
		}
		pt := costPoint{T: len(pin.Values), base: base}
		if s.Sims > 0 {
			// A few replications, more until they take as long as the
			// base analysis and pilotRepTime (or all of them are done).
			for k := 4; ; k *= 4 {
				k = min(k, s.Sims)
				ps.Sims = k
				t, err := timeOnce(func() error { _, err := battery.AnalyzeSeries(ctx, pin, ps, opt); return err })
				if err != nil {
					return nil
				}
				if t-base >= max(base, pilotRepTime.Seconds()) || k == s.Sims || k >= 4096 {
					pt.rep = (t - base) / float64(k)
					if t-base < 0.1*t {
						// The replications are lost in the noise of the
						// base analysis: their whole run bounds them.
						pt.rep = t / float64(k)
					}
					break
				}
			}
		}
		if s.RateDraws > 0 {
			ps.Sims, ps.RateDraws = 0, 1
			t, err := timeOnce(func() error { _, err := battery.AnalyzeSeries(ctx, pin, ps, opt); return err })
			if err != nil {
				return nil
			}
			pt.draw = t - base
			if t-base < 0.1*t {
				pt.draw = t // lost in the noise: bounded by the whole run
			}
		}
		m.points = append(m.points, pt)
	}
	return m
}

// estimateRun applies the model to every series of the run with the
// number of workers that will run at once.
func estimateRun(m *costModel, jobs []seriesJob, workers int, force bool) runEstimate {
	r := runEstimate{rateDraws: m.rateDraws}
	r.costs = make([]float64, len(jobs))
	sum := 0.0
	for i, j := range jobs {
		n := len(j.in.Values)
		if j.fail != nil || n == 0 || (!force && n > batch.DefaultMaxObs) {
			continue
		}
		r.series++
		r.costs[i] = m.at(n)
		sum += r.costs[i]
	}
	// One series: its simulations used every core in the pilot too.
	par := min(max(1, workers), max(1, r.series))
	r.seconds = sum / float64(par)
	return r
}

// describe is the announcement: "about 3 min for 23 series with 999
// replications each".
func (r runEstimate) describe(sims int) string {
	what := fmt.Sprintf("%d series", r.series)
	if r.series == 1 {
		what = "1 series"
	}
	if sims > 0 {
		what += fmt.Sprintf(" with %d simulated replications per test", sims)
	}
	if r.rateDraws > 0 {
		what += fmt.Sprintf(", error rates recomputed with %d draws", r.rateDraws)
	}
	return fmt.Sprintf("about %s for %s (measured by a short trial run on this machine)", shortDuration(r.seconds), what)
}
