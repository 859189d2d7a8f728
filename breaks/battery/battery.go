package battery

import (
	"context"
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"

	// Registers the break-aware tests with core's registry.
	_ "github.com/rootshift/rootshift/breaks"
	"github.com/rootshift/rootshift/breaks/decide"
	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/dataset"
	"github.com/rootshift/rootshift/core/schema"
)

// Progress reports how far an analysis has come.
type Progress struct {
	// Stage is "test" when a test starts, "simulation" as its simulated
	// replications advance and "series" when a series is finished.
	Stage string
	// Series is the series being analysed and Test the test running.
	Series string
	Test   string
	// Done of Total are finished: series for Stage "series", replications
	// for Stage "simulation".
	Done, Total int
	// Index and Count place the series in the whole run: it is the
	// Index-th (from 1) of Count series. Analyze sets them; a caller that
	// runs series one by one (AnalyzeSeries) sets them in its own callback,
	// and leaves Count 0 while the number of series is not known.
	Index, Count int
}

// Options are run-time options that do not change results.
type Options struct {
	// Progress, if set, is called as the analysis advances.
	Progress func(Progress)
	// Workers bounds simulation parallelism; 0: all cores.
	Workers int
	// Cache, if set, reuses simulated null distributions across series with
	// the same test, length and settings (batch mode).
	Cache *DistCache
	// Series, if set, is called by Analyze (and AnalyzeText) in place of
	// AnalyzeSeries(ctx, in, s, opt) for every prepared series, in document
	// order, with the settings that AnalyzeSeries would get. The page uses
	// it to spread the series of one document over several engine
	// instances and to put their results back in place; it must return
	// what AnalyzeSeries returns for the document to be the same.
	Series func(ctx context.Context, in dataset.Series, s schema.Settings) (schema.Series, error)
}

// AnalyzeText parses data (CSV, TSV, pasted cells; .xlsx when name ends in
// .xlsx) and calls Analyze.
func AnalyzeText(ctx context.Context, name string, data []byte, s schema.Settings, opt *Options) (*schema.Document, []dataset.Series, error) {
	if err := Validate(s); err != nil {
		return nil, nil, err
	}
	dopt := dataset.OptionsFor(s)
	var t *dataset.Table
	var err error
	if s.Long != nil {
		return analyzeLong(ctx, name, data, s, opt)
	}
	if strings.HasSuffix(strings.ToLower(name), ".xlsx") {
		t, err = dataset.ReadXLSX(name, data, dopt)
	} else {
		t, err = dataset.Parse(name, data, dopt)
	}
	if err != nil {
		return nil, nil, err
	}
	return Analyze(ctx, t, s, opt)
}

// Analyze runs the tests in s (or the default battery and the verdict) on
// every series selected from t. It returns the document and the prepared
// input series, aligned with doc.Series by index (a series that failed
// before testing has Values nil). The error is non-nil only for usage
// errors and cancellation; failures of one series are in its Errors.
func Analyze(ctx context.Context, t *dataset.Table, s schema.Settings, opt *Options) (*schema.Document, []dataset.Series, error) {
	if err := Validate(s); err != nil {
		return nil, nil, err
	}
	if opt == nil {
		opt = &Options{}
	}
	doc := NewDocument(s)
	doc.Source = &schema.Source{Name: t.Name, Rows: t.Rows, DateColumn: t.DateColumn, Frequency: t.Frequency, Notes: SchemaNotes(t.Notes)}
	prepared, errs := dataset.Select(t, s)
	failed := map[string]error{}
	for i := range errs {
		if errs[i].Series == "" {
			// Concerns every series (a sample range outside the data, an unknown column).
			return nil, nil, &UsageError{Field: "input selection", Err: &errs[i]}
		}
		failed[errs[i].Series] = &errs[i]
	}
	var inputs []dataset.Series
	byName := map[string]dataset.Series{}
	for _, p := range prepared {
		byName[p.Name] = p
	}
	total := len(prepared) + len(errs)
	done := 0
	emit := func(sr schema.Series, in dataset.Series) {
		doc.Series = append(doc.Series, sr)
		inputs = append(inputs, in)
		done++
		if opt.Progress != nil {
			opt.Progress(Progress{Stage: "series", Series: sr.Name, Done: done, Total: total, Index: done, Count: total})
		}
	}
	// Each series' own progress carries its place in the run.
	sopt := *opt
	if opt.Progress != nil {
		sopt.Progress = func(p Progress) {
			p.Index, p.Count = done+1, total
			opt.Progress(p)
		}
	}
	seen := map[string]bool{}
	for _, col := range t.Series {
		if seen[col.Name] {
			continue
		}
		if p, ok := byName[col.Name]; ok {
			seen[col.Name] = true
			var sr schema.Series
			var err error
			if opt.Series != nil {
				sr, err = opt.Series(ctx, p, s)
			} else {
				sr, err = AnalyzeSeries(ctx, p, s, &sopt)
			}
			if err != nil {
				return nil, nil, err
			}
			emit(sr, p)
		} else if e, ok := failed[col.Name]; ok {
			seen[col.Name] = true
			sr := FailedSeries(col.Name, col.Frequency, s, e)
			sr.Notes = SchemaNotes(col.Notes)
			emit(sr, dataset.Series{Name: col.Name, Column: col.Column})
		}
	}
	// Columns that are not series (a cell that is neither a number nor a
	// missing marker) are reported, never dropped silently.
	for _, pe := range t.Skipped {
		if name := pe.ColumnName; name != "" && !seen[name] {
			seen[name] = true
			emit(FailedSeries(name, t.Frequency, s, pe), dataset.Series{Name: name, Column: pe.Column})
		}
	}
	// Errors not tied to a column of t (none expected) still appear.
	for i := range errs {
		if name := errs[i].Series; !seen[name] {
			seen[name] = true
			emit(FailedSeries(name, "", s, &errs[i]), dataset.Series{Name: name})
		}
	}
	if len(doc.Series) == 0 {
		return nil, nil, fmt.Errorf("%s: no series to analyse", t.Name)
	}
	return doc, inputs, nil
}

// SchemaNotes converts the reader's notes for the document.
func SchemaNotes(ns []dataset.Note) []schema.Note {
	if len(ns) == 0 {
		return nil
	}
	out := make([]schema.Note, len(ns))
	for i, n := range ns {
		out[i] = schema.Note{Kind: n.Kind, Message: n.Message, Row: n.Row, Column: n.ColumnName}
		if out[i].Column == "" && n.Column > 0 {
			out[i].Column = strconv.Itoa(n.Column)
		}
	}
	return out
}

// WithSourceNotes returns the source's notes followed by those of notes
// that are not among them: a series' complete list of the reader's notes,
// for documents that carry no source (several files in one document).
func WithSourceNotes(src *schema.Source, notes []schema.Note) []schema.Note {
	if src == nil || len(src.Notes) == 0 {
		return notes
	}
	out := append([]schema.Note(nil), src.Notes...)
	seen := map[schema.Note]bool{}
	for _, n := range src.Notes {
		seen[n] = true
	}
	for _, n := range notes {
		if !seen[n] {
			out = append(out, n)
		}
	}
	return out
}

// NewDocument returns an empty document for settings s.
func NewDocument(s schema.Settings) *schema.Document {
	return &schema.Document{Schema: schema.ID, Version: Version, Settings: s, Series: []schema.Series{}, Caution: schema.Caution}
}

// FailedSeries is the entry of a series that could not be analysed.
func FailedSeries(name, freq string, s schema.Settings, err error) schema.Series {
	sr := schema.Series{Name: name, Frequency: freq, Transform: s.Transform, Results: []schema.Result{}}
	e := schema.Error{Message: err.Error()}
	var se *dataset.SeriesError
	var pe *dataset.ParseError
	if errors.As(err, &se) {
		e.Row = se.Row
		e.Column = se.Series
	} else if errors.As(err, &pe) {
		e.Row = pe.Row
		e.Column = pe.ColumnName
	}
	sr.Errors = []schema.Error{e}
	return sr
}

// AnalyzeSeries runs the tests on one prepared series. Only cancellation
// returns an error; every other failure is recorded in the series' Errors.
func AnalyzeSeries(ctx context.Context, in dataset.Series, s schema.Settings, opt *Options) (schema.Series, error) {
	if opt == nil {
		opt = &Options{}
	}
	y := in.Values
	sr := schema.Series{
		Name: in.Name, N: len(y), Frequency: in.Frequency, Transform: s.Transform,
		Results: []schema.Result{}, Errors: []schema.Error{}, Notes: SchemaNotes(in.Notes),
	}
	if len(in.Dates) == len(y) && len(y) > 0 {
		sr.Start, sr.End = in.Dates[0], in.Dates[len(y)-1]
	} else if len(y) > 0 {
		sr.Start, sr.End = "1", strconv.Itoa(len(y))
	}
	dates := in.Dates
	if len(dates) != len(y) {
		dates = nil
	}
	r := &runner{ctx: ctx, s: s, opt: opt, y: y, dates: dates, freq: in.Frequency, series: &sr}
	if s.BreakDate != "" {
		idx, err := resolveIndex(dates, in.Frequency, s.BreakDate, len(y))
		if err != nil {
			sr.Errors = append(sr.Errors, schema.Error{Test: "p89", Message: "break_date: " + err.Error()})
		}
		r.breakIndex = idx
	}
	if len(s.Tests) > 0 {
		for _, id := range s.Tests {
			if _, err := r.run(id, r.trendFor(id), nil); err != nil {
				return sr, err
			}
		}
	}
	if len(s.Tests) == 0 || s.Verdict {
		if err := r.verdict(); err != nil {
			return sr, err
		}
	}
	return sr, nil
}

// verdict runs the staged decision procedure (package decide) and records
// its results, errors and verdict in the series.
func (r *runner) verdict() error {
	var prog func(done, total int)
	if r.opt.Progress != nil {
		name := r.series.Name
		prog = func(done, total int) {
			r.opt.Progress(Progress{Stage: "simulation", Series: name, Test: "verdict reliability", Done: done, Total: total})
		}
		r.opt.Progress(Progress{Stage: "test", Series: name, Test: "verdict"})
	}
	out, err := decide.Run(r.ctx, decide.Input{
		Name: r.series.Name, Y: r.y, Dates: r.dates, Frequency: r.freq,
		Transformed: r.s.Transform != "", Settings: r.s, Progress: prog,
	})
	if err != nil {
		var we *decide.WindowError
		if errors.As(err, &we) {
			return &UsageError{Field: "window", Err: err}
		}
		if errors.Is(err, core.ErrCancelled) || r.ctx.Err() != nil {
			return fmt.Errorf("%w: %v", core.ErrCancelled, r.ctx.Err())
		}
		r.series.Errors = append(r.series.Errors, schema.Error{Test: "verdict", Message: err.Error()})
		return nil
	}
	for i := range out.Results {
		sanitize(&out.Results[i])
		r.series.Results = append(r.series.Results, out.Results[i])
	}
	r.series.Errors = append(r.series.Errors, out.Errors...)
	if v := out.Verdict; v != nil && v.Window != nil && v.Window.Test != nil {
		sanitize(v.Window.Test)
	}
	r.series.Verdict = out.Verdict
	return nil
}

// runner runs tests on one series and keeps what the verdict needs.
type runner struct {
	ctx        context.Context
	s          schema.Settings
	opt        *Options
	y          []float64
	dates      []string
	freq       string
	breakIndex int
	series     *schema.Series
}

// defaultTrend is the deterministic part each test uses when the analyst
// leaves trend on auto: the break tests' models contain a trend by
// construction; the others take a constant.
func defaultTrend(id string) core.Trend {
	switch id {
	case "za", "p89", "pio", "pao", "ls1", "ls2", "lp", "py":
		return core.TrendLinear
	}
	return core.TrendConstant
}

func (r *runner) trendFor(id string) core.Trend {
	if r.s.Trend == "" || r.s.Trend == "auto" {
		return defaultTrend(id)
	}
	t, _ := core.ParseTrend(r.s.Trend)
	return t
}

// run runs test id with trend on y (or on r.y when y is nil) and appends its
// result (or error) to the series. It returns the result, nil on failure.
// Only cancellation is returned as an error.
func (r *runner) run(id string, trend core.Trend, y []float64) (res *schema.Result, err error) {
	return r.runWith(id, trend, y, nil)
}

// runWith is run with a last change to the test's configuration.
func (r *runner) runWith(id string, trend core.Trend, y []float64, mod func(*core.Config)) (res *schema.Result, err error) {
	if y == nil {
		y = r.y
	}
	info, lerr := core.Lookup(id)
	if lerr != nil {
		r.series.Errors = append(r.series.Errors, schema.Error{Test: id, Message: lerr.Error()})
		return nil, nil
	}
	cfg := baseConfig(r.s, r.dates)
	if len(y) != len(r.y) {
		cfg.Dates = nil
	}
	cfg.Trend = trend
	cfg.BreakIndex = r.breakIndex
	cfg.Workers = r.opt.Workers
	cfg.Period = core.PeriodOf(r.freq) // the seasonal test's S; 0 when not quarterly or monthly
	if mod != nil {
		mod(cfg)
	}
	sims := cfg.Sims
	if r.opt.Cache != nil {
		cfg.Sims = 0 // simulated below from the shared cache
	}
	if r.opt.Progress != nil {
		name := r.series.Name
		cfg.Progress = func(done, total int) {
			r.opt.Progress(Progress{Stage: "simulation", Series: name, Test: id, Done: done, Total: total})
		}
		r.opt.Progress(Progress{Stage: "test", Series: name, Test: id})
	}
	defer func() {
		if p := recover(); p != nil {
			r.series.Errors = append(r.series.Errors, schema.Error{Test: id,
				Message: fmt.Sprintf("internal error (please report): %v", p)})
			res, err = nil, nil
		}
	}()
	res, rerr := info.Run(r.ctx, y, cfg)
	if rerr != nil {
		if errors.Is(rerr, core.ErrCancelled) || r.ctx.Err() != nil {
			return nil, fmt.Errorf("%w: %v", core.ErrCancelled, r.ctx.Err())
		}
		r.series.Errors = append(r.series.Errors, schema.Error{Test: id, Message: rerr.Error()})
		return nil, nil
	}
	if res.Statistic == nil && len(res.Components) == 0 && len(res.BreakTests) == 0 {
		r.series.Errors = append(r.series.Errors, schema.Error{Test: id, Message: core.ErrNoEstimate.Error()})
		return nil, nil
	}
	if r.opt.Cache != nil && sims > 0 && res.Statistic != nil {
		cfg.Sims = sims
		if err := r.opt.Cache.Apply(r.ctx, info, len(y), cfg, res); err != nil {
			if r.ctx.Err() != nil {
				return nil, fmt.Errorf("%w: %v", core.ErrCancelled, r.ctx.Err())
			}
			res.Warnings = append(res.Warnings, "simulated p-value: "+err.Error())
		}
	}
	sanitize(res)
	r.series.Results = append(r.series.Results, *res)
	return res, nil
}

// resolveIndex turns a date label or an observation number into a 1-based index.
func resolveIndex(dates []string, freq, spec string, n int) (int, error) {
	spec = strings.TrimSpace(spec)
	if len(dates) > 0 {
		if i, err := dataset.IndexOf(dates, freq, spec); err == nil {
			return i, nil
		}
	}
	i, err := strconv.Atoi(spec)
	if err != nil || i < 1 || i > n {
		return 0, fmt.Errorf("%q is neither a date in the series nor an observation number 1..%d", spec, n)
	}
	return i, nil
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
