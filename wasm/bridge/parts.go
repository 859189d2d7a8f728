package bridge

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"time"

	"github.com/rootshift/rootshift/breaks/battery"
	"github.com/rootshift/rootshift/breaks/report"
	"github.com/rootshift/rootshift/core/dataset"
	"github.com/rootshift/rootshift/core/schema"
)

// One document, several engine instances. The page spreads the series of
// one analysis over several Web Workers, each with its own instance of the
// engine: Plan counts the series (and estimates the work), AnalyzePart
// analyses the series of given indices, and Session.Assemble puts the parts
// back into the document that Session.Analyze would have returned. Every
// instance reads the same data with the same settings, so that the
// indices agree; a series' results depend on nothing but the series and
// the settings (simulation replication r of a test is seeded with
// rand.NewPCG(seed, r)), so that the document is the same for any number of
// workers and any distribution of the series.

// Part is the analysis of one unit of work: series Index (counting the
// analysed series in document order from 0; series that fail before
// testing are not counted) or, when the tests are picked without the
// verdict (see Units), the Test-th of those tests on it. Series is the
// schema v2 series object as JSON text, kept opaque by the page.
type Part struct {
	Index  int    `json:"index"`
	Test   int    `json:"test"`
	Series string `json:"series"`
}

// Units returns the number of units of work per series: the number of
// tests when they are picked without the verdict and without a known break
// date (each test's results depend on nothing but the series and the
// settings, and AnalyzeSeries appends them in the order of the tests), and
// 1 otherwise (the verdict's stages depend on each other). Unit u is test
// u mod Units of series u / Units.
func Units(s schema.Settings) int {
	if len(s.Tests) > 1 && !s.Verdict && s.BreakDate == "" {
		return len(s.Tests)
	}
	return 1
}

// analyzeUnit analyses test j of series in (all tests when m is 1).
func analyzeUnit(ctx context.Context, in dataset.Series, s schema.Settings, m, j int, opt *battery.Options) (schema.Series, error) {
	if m > 1 {
		s.Tests = []string{s.Tests[j]}
	}
	return battery.AnalyzeSeries(ctx, in, s, opt)
}

// mergeUnits is the series that AnalyzeSeries gives with every test: the
// first unit with the results and errors of the others appended in order.
func mergeUnits(units []schema.Series) schema.Series {
	sr := units[0]
	for _, u := range units[1:] {
		sr.Results = append(sr.Results, u.Results...)
		sr.Errors = append(sr.Errors, u.Errors...)
	}
	return sr
}

// Plan describes an analysis before it runs.
type Plan struct {
	// Series is the number of series to analyse: the parts' indices are
	// 0..Series-1.
	Series int `json:"series"`
	// Units is the number of units of work per series (see Units): the
	// page hands out units 0..Series*Units-1.
	Units int `json:"units"`
	// Names and Lengths are those series' names and numbers of observations.
	Names   []string `json:"names"`
	Lengths []int    `json:"lengths"`
	// EstimateMs is the estimated time of the whole analysis in one engine
	// instance, in milliseconds (0 without a pilot), and PerSeriesMs that of
	// each series. The cost model: t(k) = b + c k for the first series with
	// its replications (sims, the window's search, rate_draws) cut to k,
	// fitted on pilot runs at k = PilotReps/3 and PilotReps (after a
	// warm-up run), extrapolated to the replications asked for, and scaled
	// by (T_i/T_1)^2 for the length of series i (the break searches' order).
	EstimateMs  float64   `json:"estimate_ms"`
	PerSeriesMs []float64 `json:"per_series_ms,omitempty"`
	// PilotMs is the time the pilot took.
	PilotMs float64 `json:"pilot_ms"`
	// First is the first series' parts (units 0..Units-1) when the pilot
	// was its full analysis (nothing cut), for the page to use instead of
	// analysing it again.
	First []Part `json:"first,omitempty"`
}

// PilotReps is the largest number of replications a pilot run keeps.
const PilotReps = 30

// windowReps is the number of replications of the window's restricted
// search when sims is 0 (decide's default, documented in breaks/decide).
const windowReps = 999

// errPart stops a parse-only pass early: not an error of the analysis.
var errPart = errors.New("part: stop")

// placeholder stands for a series another instance analyses.
func placeholder(in dataset.Series) schema.Series {
	return schema.Series{Name: in.Name, Results: []schema.Result{}}
}

// pilotSettings cuts the replications of s to at most k; it returns the
// settings and the number of replications asked for (0 when nothing was
// cut).
func pilotSettings(s schema.Settings, k int) (schema.Settings, int) {
	p := s
	reps := s.Sims
	if reps == 0 && s.Window != "" {
		reps = windowReps
	}
	cut := 0
	if reps > PilotReps {
		p.Sims = k
		cut = reps
	}
	if s.RateDraws > PilotReps {
		p.RateDraws = k
		cut = max(cut, s.RateDraws)
	}
	return p, cut
}

// PlanAnalysis reads data with settings and returns the envelope of the
// Plan. With pilot it also analyses the first series (with the
// replications cut, see Plan) to estimate the time.
func PlanAnalysis(ctx context.Context, name string, data []byte, settings string, pilot bool) string {
	return Call(func() (any, error) {
		st, err := DecodeSettings(settings)
		if err != nil {
			return nil, err
		}
		if name == "" {
			name = "pasted"
		}
		plan := Plan{Names: []string{}, Lengths: []int{}, Units: Units(st)}
		var first dataset.Series
		var firstSettings schema.Settings
		opt := &battery.Options{Series: func(_ context.Context, in dataset.Series, s schema.Settings) (schema.Series, error) {
			if plan.Series == 0 {
				first, firstSettings = in, s
			}
			plan.Series++
			plan.Names = append(plan.Names, in.Name)
			plan.Lengths = append(plan.Lengths, len(in.Values))
			return placeholder(in), nil
		}}
		if _, _, err := battery.AnalyzeText(ctx, name, data, st, opt); err != nil {
			return nil, err
		}
		if !pilot || plan.Series == 0 {
			return plan, nil
		}
		timed := func(k int) (schema.Series, float64, error) {
			ps, _ := pilotSettings(firstSettings, k)
			start := time.Now()
			sr, err := battery.AnalyzeSeries(ctx, first, ps, &battery.Options{})
			ms := float64(time.Since(start).Microseconds()) / 1000
			plan.PilotMs += ms
			return sr, ms, err
		}
		var first1 float64 // the first series' estimate
		if _, reps := pilotSettings(firstSettings, PilotReps); reps == 0 {
			// Nothing to cut: the pilot is the first series' analysis.
			start := time.Now()
			for j := 0; j < plan.Units; j++ {
				sr, err := analyzeUnit(ctx, first, firstSettings, plan.Units, j, &battery.Options{})
				if err != nil {
					return nil, err
				}
				b, err := json.Marshal(sr)
				if err != nil {
					return nil, &callError{kind: KindInternal, err: err}
				}
				plan.First = append(plan.First, Part{Index: 0, Test: j, Series: string(b)})
			}
			first1 = float64(time.Since(start).Microseconds()) / 1000
			plan.PilotMs = first1
		} else {
			k1, k2 := PilotReps/3, PilotReps
			var t1, t2 float64
			var err error
			if _, _, err = timed(k1); err == nil { // warm-up
				if _, t2, err = timed(k2); err == nil {
					_, t1, err = timed(k1)
				}
			}
			if err != nil {
				return nil, err
			}
			c := max(0, (t2-t1)/float64(k2-k1))
			b := max(0, t1-c*float64(k1))
			first1 = b + c*float64(reps)
			if c == 0 { // too fast to tell: scale the larger run
				first1 = t2 * float64(1+reps) / float64(1+k2)
			}
		}
		n1 := float64(max(1, plan.Lengths[0]))
		plan.PerSeriesMs = make([]float64, plan.Series)
		for i, n := range plan.Lengths {
			r := float64(max(1, n)) / n1
			plan.PerSeriesMs[i] = first1 * r * r
			plan.EstimateMs += plan.PerSeriesMs[i]
		}
		return plan, nil
	})
}

// AnalyzePart analyses the given units of work (see Units: series
// u / Units, test u mod Units) of the analysis of data with settings and
// returns the envelope of their parts, in the order of the units. progress
// (may be nil) receives the progress of those units only: stage "series"
// once each is done, with Done counting them and Total the number of units.
func AnalyzePart(ctx context.Context, name string, data []byte, settings string, units []int, progress func(battery.Progress)) string {
	return Call(func() (any, error) {
		st, err := DecodeSettings(settings)
		if err != nil {
			return nil, err
		}
		if name == "" {
			name = "pasted"
		}
		m := Units(st)
		want := map[int][]int{} // series -> positions in units
		last := -1
		seen := map[int]bool{}
		for k, u := range units {
			if u < 0 {
				return nil, usageErr("part: unit %d is negative", u)
			}
			if seen[u] {
				return nil, usageErr("part: unit %d given twice", u)
			}
			seen[u] = true
			want[u/m] = append(want[u/m], k)
			last = max(last, u/m)
		}
		parts := make([]Part, len(units))
		next, done := 0, 0
		opt := &battery.Options{Series: func(ctx context.Context, in dataset.Series, s schema.Settings) (schema.Series, error) {
			i := next
			next++
			ks, ok := want[i]
			if !ok {
				if i > last {
					return schema.Series{}, errPart // the rest belongs to other instances
				}
				return placeholder(in), nil
			}
			for _, k := range ks {
				j := units[k] % m
				sr, err := analyzeUnit(ctx, in, s, m, j, &battery.Options{Progress: progress})
				if err != nil {
					return sr, err
				}
				b, err := json.Marshal(sr)
				if err != nil {
					return sr, &callError{kind: KindInternal, err: err}
				}
				parts[k] = Part{Index: i, Test: j, Series: string(b)}
				done++
				if progress != nil {
					var test string
					if m > 1 {
						test = s.Tests[j]
					}
					progress(battery.Progress{Stage: "series", Series: in.Name, Test: test, Done: done, Total: len(units)})
				}
			}
			return placeholder(in), nil
		}}
		if _, _, err := battery.AnalyzeText(ctx, name, data, st, opt); err != nil && !errors.Is(err, errPart) {
			return nil, err
		}
		if done != len(units) {
			return nil, usageErr("part: %d of the units are beyond the %d to do", len(units)-done, next*m)
		}
		return parts, nil
	})
}

// Assemble puts parts (the JSON array of the parts of every unit of work)
// back into the document of the analysis of data with settings, keeps it
// for Export and Plots, and returns the envelope of the document, the same
// text as Analyze. With partial (a cancelled run), series with a missing
// part are reported as not analysed; without it a missing part is an
// internal error.
func (s *Session) Assemble(name string, data []byte, settings, parts string, partial bool) string {
	return Call(func() (any, error) {
		st, err := DecodeSettings(settings)
		if err != nil {
			return nil, err
		}
		if name == "" {
			name = "pasted"
		}
		var list []Part
		if err := json.Unmarshal([]byte(parts), &list); err != nil {
			return nil, usageErr("assemble: parts: %v", err)
		}
		m := Units(st)
		type key struct{ i, j int }
		byUnit := map[key]string{}
		for _, p := range list {
			if p.Test < 0 || p.Test >= m {
				return nil, usageErr("assemble: part %d has test %d, want 0..%d", p.Index, p.Test, m-1)
			}
			byUnit[key{p.Index, p.Test}] = p.Series
		}
		next, used := 0, 0
		opt := &battery.Options{Series: func(_ context.Context, in dataset.Series, s schema.Settings) (schema.Series, error) {
			i := next
			next++
			units := make([]schema.Series, m)
			for j := range units {
				text, ok := byUnit[key{i, j}]
				if !ok {
					if partial {
						sr := battery.FailedSeries(in.Name, in.Frequency, s, errors.New("not analysed: the analysis was cancelled before this series was done"))
						sr.Notes = battery.SchemaNotes(in.Notes)
						return sr, nil
					}
					return schema.Series{}, &callError{kind: KindInternal, err: fmt.Errorf("assemble: no part for series %d (%s), test %d", i, in.Name, j)}
				}
				if err := json.Unmarshal([]byte(text), &units[j]); err != nil {
					return schema.Series{}, &callError{kind: KindInternal, err: fmt.Errorf("assemble: part %d (%s): %v", i, in.Name, err)}
				}
			}
			used += m
			return mergeUnits(units), nil
		}}
		doc, inputs, err := battery.AnalyzeText(context.Background(), name, data, st, opt)
		if err != nil {
			return nil, err
		}
		if n := len(byUnit); n > used && !(partial && n <= next*m) {
			return nil, usageErr("assemble: %d parts for %d series of %d units", n, next, m)
		}
		return s.keep(doc, inputs, name)
	})
}

// keep encodes doc with report.WriteJSON and keeps it for Export and Plots.
func (s *Session) keep(doc *schema.Document, inputs []dataset.Series, name string) (any, error) {
	var b bytes.Buffer
	if err := report.WriteJSON(&b, doc); err != nil {
		return nil, &callError{kind: KindInternal, err: err}
	}
	s.mu.Lock()
	s.doc, s.inputs, s.name = doc, inputs, name
	s.mu.Unlock()
	return json.RawMessage(b.Bytes()), nil
}
