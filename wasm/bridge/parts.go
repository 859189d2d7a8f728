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

// Part is the analysis of one series: Index counts the analysed series in
// document order from 0 (series that fail before testing are not counted)
// and Series is the schema v2 series object as JSON text, kept opaque by
// the page.
type Part struct {
	Index  int    `json:"index"`
	Series string `json:"series"`
}

// Plan describes an analysis before it runs.
type Plan struct {
	// Series is the number of series to analyse: the parts' indices are
	// 0..Series-1.
	Series int `json:"series"`
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
	// First is the first series' part when the pilot was its full analysis
	// (nothing cut), for the page to use instead of analysing it again.
	First *Part `json:"first,omitempty"`
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
		plan := Plan{Names: []string{}, Lengths: []int{}}
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
			sr, ms, err := timed(PilotReps)
			if err != nil {
				return nil, err
			}
			b, err := json.Marshal(sr)
			if err != nil {
				return nil, &callError{kind: KindInternal, err: err}
			}
			plan.First = &Part{Index: 0, Series: string(b)}
			first1 = ms
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

// AnalyzePart analyses the series of the given indices (see Part) of the
// analysis of data with settings and returns the envelope of their parts,
// in the order of the indices. progress (may be nil) receives the
// progress of those series only: stage "series" once each is done, with
// Done counting them and Total the number of indices.
func AnalyzePart(ctx context.Context, name string, data []byte, settings string, indices []int, progress func(battery.Progress)) string {
	return Call(func() (any, error) {
		st, err := DecodeSettings(settings)
		if err != nil {
			return nil, err
		}
		if name == "" {
			name = "pasted"
		}
		want := map[int]int{}
		last := -1
		for k, i := range indices {
			if i < 0 {
				return nil, usageErr("part: index %d is negative", i)
			}
			if _, dup := want[i]; dup {
				return nil, usageErr("part: index %d given twice", i)
			}
			want[i] = k
			last = max(last, i)
		}
		parts := make([]Part, len(indices))
		next, done := 0, 0
		opt := &battery.Options{Series: func(ctx context.Context, in dataset.Series, s schema.Settings) (schema.Series, error) {
			i := next
			next++
			k, ok := want[i]
			if !ok {
				if i > last {
					return schema.Series{}, errPart // the rest belongs to other instances
				}
				return placeholder(in), nil
			}
			sr, err := battery.AnalyzeSeries(ctx, in, s, &battery.Options{Progress: progress})
			if err != nil {
				return sr, err
			}
			b, err := json.Marshal(sr)
			if err != nil {
				return sr, &callError{kind: KindInternal, err: err}
			}
			parts[k] = Part{Index: i, Series: string(b)}
			done++
			if progress != nil {
				progress(battery.Progress{Stage: "series", Series: in.Name, Done: done, Total: len(indices)})
			}
			return sr, nil
		}}
		if _, _, err := battery.AnalyzeText(ctx, name, data, st, opt); err != nil && !errors.Is(err, errPart) {
			return nil, err
		}
		if done != len(indices) {
			return nil, usageErr("part: %d of the indices are beyond the %d series to analyse", len(indices)-done, next)
		}
		return parts, nil
	})
}

// Assemble puts parts (the JSON array of the parts of every analysed
// series) back into the document of the analysis of data with settings,
// keeps it for Export and Plots, and returns the envelope of the document,
// the same text as Analyze. With partial (a cancelled run), series without
// a part are reported as not analysed; without it a missing part is an
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
		byIndex := map[int]string{}
		for _, p := range list {
			byIndex[p.Index] = p.Series
		}
		next, used := 0, 0
		opt := &battery.Options{Series: func(_ context.Context, in dataset.Series, s schema.Settings) (schema.Series, error) {
			i := next
			next++
			text, ok := byIndex[i]
			if !ok {
				if partial {
					sr := battery.FailedSeries(in.Name, in.Frequency, s, errors.New("not analysed: the analysis was cancelled before this series was done"))
					sr.Notes = battery.SchemaNotes(in.Notes)
					return sr, nil
				}
				return schema.Series{}, &callError{kind: KindInternal, err: fmt.Errorf("assemble: no part for series %d (%s)", i, in.Name)}
			}
			used++
			var sr schema.Series
			if err := json.Unmarshal([]byte(text), &sr); err != nil {
				return sr, &callError{kind: KindInternal, err: fmt.Errorf("assemble: part %d (%s): %v", i, in.Name, err)}
			}
			return sr, nil
		}}
		doc, inputs, err := battery.AnalyzeText(context.Background(), name, data, st, opt)
		if err != nil {
			return nil, err
		}
		if used != len(byIndex) {
			return nil, usageErr("assemble: %d parts for %d series", len(byIndex), next)
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
