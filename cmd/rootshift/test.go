package main

import (
	"bufio"
	"bytes"
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"time"

	"github.com/rootshift/rootshift/breaks/batch"
	"github.com/rootshift/rootshift/breaks/battery"
	"github.com/rootshift/rootshift/breaks/report"
	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/dataset"
	"github.com/rootshift/rootshift/core/schema"
)

type outputOpts struct {
	json     bool
	format   string
	out      string
	progress bool
	quiet    bool
	jobs     int
	// progressEvery: a plain progress line every N series when standard
	// error is not a terminal (0: none).
	progressEvery int
	indent        bool
	compact       bool
	force         bool
	// compactArrays writes paths as schema.Run (JSON output).
	compactArrays bool
}

// outputFlags binds the output and resource flags shared by test and demo.
func outputFlags(fs *flag.FlagSet, o *outputOpts) {
	fs.IntVar(&o.jobs, "j", 0, "`number` of series analysed in parallel (default: all cores); the output is the same for any number")
	fs.BoolVar(&o.indent, "indent", false, "JSON: indented (the default when standard output is a terminal)")
	fs.BoolVar(&o.compact, "compact", false, "JSON: one line (the default when the output is a file or a pipe)")
	fs.BoolVar(&o.compactArrays, "compact-arrays", false, "JSON: candidate paths and surface rows as compact runs (path_compact: first, step, values)")
	fs.BoolVar(&o.force, "force", false, fmt.Sprintf("test series longer than %d observations (slow and memory-hungry: about 1 GB and minutes each), and start work estimated above %s", batch.DefaultMaxObs, shortDuration(estimateLimit.Seconds())))
	fs.IntVar(&o.progressEvery, "progress-every", 1000, "when standard error is not a terminal: a progress line every `N` series, and every 30 s after the first 5 (0: none)")
}

func (e *env) test(args []string) int {
	var s schema.Settings
	var o outputOpts
	fs := newFlagSet("test", e.stdout, "Usage: rootshift test [options] FILE...\n\nTests every numeric column of each file (CSV, TSV, semicolon-separated, .xlsx; \"-\" is standard input).\nThe series are analysed in parallel; the output is in input order, the same for any -j.\n\nExit status: 0 every series tested, 1 some failed, 2 usage errors, 3 the output could not\nbe written, 4 nothing to process (empty input), 130 interrupted, 143 terminated (SIGTERM); after an\ninterruption the series finished before it are written.\n\nWork estimated above 3 s is announced on standard error, and work above an hour needs --force.")
	settingsFlags(fs, &s)
	fs.BoolVar(&o.json, "json", false, "print the JSON document (schema rootshift.results/v2); same as --format json")
	fs.StringVar(&o.format, "format", "table", "output: "+strings.Join(report.Formats, ", "))
	fs.StringVar(&o.out, "out", "", "write the output to this `file` instead of standard output")
	fs.BoolVar(&o.quiet, "quiet", false, "no progress messages on standard error")
	outputFlags(fs, &o)
	var long bool
	var lc schema.LongColumns
	fs.BoolVar(&long, "long", false, "the files are long tables: one row per series id, date and value")
	fs.StringVar(&lc.ID, "id-col", "id", "long tables: series id `column`")
	fs.StringVar(&lc.Date, "date-col", "date", "long tables: date `column`")
	fs.StringVar(&lc.Value, "value-col", "value", "long tables: value `column`")
	files, err := parseInterleaved(fs, args)
	if err != nil {
		return e.usageExit(err)
	}
	if err := checkGivenZeros(fs); err != nil {
		return e.usageExit(err)
	}
	if long {
		s.Long = &lc
	}
	if len(files) == 0 {
		e.errorf("test: no input file (try rootshift demo for the built-in data)")
		return exitUsage
	}
	return e.analyzeFiles(files, s, o, nil)
}

func (e *env) demo(args []string) int {
	var s schema.Settings
	var o outputOpts
	var reportPath string
	fs := newFlagSet("demo", e.stdout, "Usage: rootshift demo [options]\n\nRuns the battery and the verdict on the built-in demo data.\n"+battery.DemoDescription)
	settingsFlags(fs, &s)
	fs.BoolVar(&o.json, "json", false, "print the JSON document instead of the table")
	fs.StringVar(&o.format, "format", "table", "output: "+strings.Join(report.Formats, ", "))
	fs.StringVar(&reportPath, "report", "rootshift-demo-report.html", "also write the self-contained HTML report to this `file` (\"\" for none)")
	fs.BoolVar(&o.quiet, "quiet", false, "no progress messages on standard error")
	outputFlags(fs, &o)
	var data bool
	fs.BoolVar(&data, "data", false, "print the demo data as CSV and exit")
	if _, err := parseInterleaved(fs, args); err != nil {
		return e.usageExit(err)
	}
	if err := checkGivenZeros(fs); err != nil {
		return e.usageExit(err)
	}
	if data {
		e.stdout.Write(battery.DemoCSV())
		return exitOK
	}
	if !o.quiet {
		fmt.Fprintf(e.stderr, "%s\n\n", battery.DemoDescription)
	}
	return e.analyzeFiles([]string{"demo:"}, s, o, func(doc *schema.Document, inputs []dataset.Series) error {
		if reportPath == "" {
			return nil
		}
		var b bytes.Buffer
		if err := report.Write(&b, "html", doc, inputs); err != nil {
			return err
		}
		if err := os.WriteFile(reportPath, b.Bytes(), 0o644); err != nil {
			return err
		}
		if !o.quiet {
			fmt.Fprintf(e.stderr, "rootshift: HTML report written to %s\n", reportPath)
		}
		return nil
	})
}

// seriesJob is one series of a `test` call: analysed, or failed before
// testing (fail set).
type seriesJob struct {
	name string // as written (file prefix added for several files)
	in   dataset.Series
	freq string
	fail error
	// source, for several files, is the series' file (its reader notes go
	// into the series: the document has no source).
	source *schema.Source
}

// parsedFile is one input of a `test` call, parsed.
type parsedFile struct {
	name  string
	table *dataset.Table
}

// analyzeFiles analyses the series of every file with a worker pool
// (batch.Pool, the pool of `batch`) and writes one document (the series of
// every file, in input order). JSON is streamed series by series; the other
// formats are written once every series is done.
func (e *env) analyzeFiles(files []string, s schema.Settings, o outputOpts, after func(*schema.Document, []dataset.Series) error) int {
	if o.json {
		o.format = "json"
	}
	if err := checkFormat(o.format); err != nil {
		return e.usageExit(err)
	}
	if o.compactArrays && o.format != "json" {
		return e.usageExit(errors.New("--compact-arrays applies to JSON output (--json); the other formats plot the paths"))
	}
	if o.indent && o.compact {
		return e.usageExit(errors.New("--indent and --compact exclude each other"))
	}
	if err := battery.Validate(s); err != nil {
		return e.usageExit(err)
	}
	if o.out != "" {
		for _, f := range files {
			if f != "-" && f != "demo:" && sameFile(f, o.out) {
				return e.usageExit(fmt.Errorf("--out %s is also an input: it would be overwritten", o.out))
			}
		}
	}
	opt := &battery.Options{Workers: 1}
	// Every file is read and parsed before the analysis starts, so that a
	// bad file is a usage error before any output.
	var parsed []parsedFile
	for _, f := range files {
		if f != "demo:" && batch.Streamable(f, s) {
			// Selected columns of a file: read by streaming, memory that of
			// the columns. A file that fails is read again whole below, for
			// the message (and the long-table hint) of the whole-file reader.
			if t, err := batch.ReadSelected(f, f, s); err == nil {
				parsed = append(parsed, parsedFile{f, t})
				continue
			}
		}
		name, data, err := e.readInput(f)
		if err != nil {
			e.errorf("%v", err)
			return exitUsage
		}
		if len(bytes.TrimSpace(data)) == 0 {
			e.errorf("%s: nothing to process: the input is empty (exit status %d)", name, exitNothing)
			return exitNothing
		}
		if s.Long != nil {
			// A long table: one series per id, each with its own dates.
			tables, failed, err := battery.ReadLong(name, data, s)
			if err != nil {
				e.errorf("%s: %v", name, err)
				return exitUsage
			}
			for _, f := range failed {
				e.errorf("%s: series %s: %v", name, f.ID, f.Err)
			}
			for _, t := range tables {
				parsed = append(parsed, parsedFile{name, t})
			}
			continue
		}
		dopt := dataset.OptionsFor(s)
		var t *dataset.Table
		if strings.HasSuffix(strings.ToLower(name), ".xlsx") {
			t, err = dataset.ReadXLSX(name, data, dopt)
		} else {
			t, err = dataset.Parse(name, data, dopt)
		}
		if err != nil {
			if lc := battery.DetectLong(name, data, s); lc != nil && s.Long == nil {
				e.errorf("%s: %v\n  this looks like a long table (ids in %q, dates in %q, values in %q): add --long --id-col %s --date-col %s --value-col %s",
					name, err, or(lc.ID, "id"), or(lc.Date, "date"), or(lc.Value, "value"), or(lc.ID, "id"), or(lc.Date, "date"), or(lc.Value, "value"))
				return exitUsage
			}
			e.errorf("%s: %v", name, err)
			return exitUsage
		}
		parsed = append(parsed, parsedFile{name, t})
	}
	doc := battery.NewDocument(s)
	if len(files) == 1 {
		t := parsed[0].table
		doc.Source = &schema.Source{Name: t.Name, Rows: t.Rows, DateColumn: t.DateColumn, Frequency: t.Frequency, Notes: battery.SchemaNotes(t.Notes)}
	}
	var jobsList []seriesJob
	for _, pf := range parsed {
		js, err := planSeries(pf.table, s)
		if err != nil {
			e.errorf("%s: %v", pf.name, err)
			return exitUsage
		}
		if len(files) > 1 {
			src := &schema.Source{Notes: battery.SchemaNotes(pf.table.Notes)}
			for i := range js {
				js[i].name = filepath.Base(pf.name) + ":" + js[i].name
				js[i].source = src // the document has no source: each series carries the file's notes
			}
		}
		jobsList = append(jobsList, js...)
	}
	if len(jobsList) == 0 {
		e.errorf("nothing to process: no series in the input (exit status %d)", exitNothing)
		return exitNothing
	}

	if len(jobsList) == 1 {
		opt.Workers = 0 // one series: its simulations use every core
	}
	// The forecast: announced when long, refused above the limit unless
	// --force; it also weighs the series for the time left.
	var est *runEstimate
	if model := pilotCost(e.ctx, jobsList, s, o.force); model != nil {
		r := estimateRun(model, jobsList, poolJobs(o.jobs), o.force)
		est = &r
		if r.seconds > estimateLimit.Seconds() && !o.force {
			return e.usageExit(fmt.Errorf("%s, above the limit of %s: fewer --sims, fewer or shorter series (--columns, --from, --to), or --force to run anyway",
				r.describe(s.Sims), shortDuration(estimateLimit.Seconds())))
		}
		if !o.quiet && r.seconds > announceAbove.Seconds() {
			fmt.Fprintf(e.stderr, "rootshift: %s\n", r.describe(s.Sims))
		}
	}
	var m *meter
	if !o.quiet && o.progressEvery >= 0 {
		m = newMeter(e.stderr, isTerminal(e.stderr), nil)
		m.every = o.progressEvery
		if est != nil {
			reps := 0
			if len(s.Tests) > 0 {
				reps = len(s.Tests) * s.Sims
			}
			m.plan(est.costs, est.seconds, reps)
		} else {
			m.setTotal(len(jobsList))
		}
		stop := m.ticker(time.Second)
		defer func() { stop(); m.close() }()
	}
	// Output: JSON streams series by series; compact unless indented on
	// request or shown on a terminal.
	var w io.Writer = bufio.NewWriterSize(e.stdout, 1<<16)
	var outFile *os.File
	if o.out != "" {
		f, err := os.CreateTemp(filepath.Dir(o.out), "."+filepath.Base(o.out)+".tmp*")
		if err != nil {
			e.errorf("%v", err)
			return exitOutput
		}
		outFile = f
		defer func() {
			if outFile != nil {
				outFile.Close()
				os.Remove(outFile.Name())
			}
		}()
		w = bufio.NewWriterSize(f, 1<<16)
	}
	streaming := o.format == "json" && after == nil
	var stream *report.JSONStream
	if streaming {
		indent := o.indent || (!o.compact && o.out == "" && isTerminal(e.stdout))
		var err error
		if stream, err = report.NewJSONStream(w, doc, indent); err != nil {
			e.errorf("%v", err)
			return exitOutput
		}
	}
	var inputs []dataset.Series
	failed := 0
	produce := func(ctx context.Context, emit func(int) bool) error {
		for i := range jobsList {
			if !emit(i) {
				return nil
			}
		}
		return nil
	}
	type done struct {
		sr schema.Series
		in dataset.Series
		// enc is the series' JSON element, encoded by the worker when the
		// output streams (the writer only writes the bytes, in order).
		enc []byte
	}
	work := func(ctx context.Context, i int) (done, error) {
		j := jobsList[i]
		if j.fail == nil && !o.force && len(j.in.Values) > batch.DefaultMaxObs {
			j.fail = fmt.Errorf("%w: %d observations, the limit is %d (add --force to test it anyway)", batch.ErrTooLong, len(j.in.Values), batch.DefaultMaxObs)
		}
		if j.fail != nil {
			sr := battery.FailedSeries(j.in.Name, j.freq, s, j.fail)
			sr.Name = j.name
			sr.Notes = battery.WithSourceNotes(j.source, battery.SchemaNotes(j.in.Notes))
			if m != nil {
				m.finished(i+1, true)
			}
			return done{sr, dataset.Series{Name: j.name, Column: j.in.Column}, nil}, nil
		}
		jopt := opt
		if m != nil {
			o := *opt
			o.Progress = func(p battery.Progress) {
				p.Index, p.Count = i+1, len(jobsList)
				m.step(p)
			}
			jopt = &o
		}
		sr, err := batch.AnalyzeSeries(ctx, j.in, s, jopt)
		if err != nil {
			return done{}, err
		}
		if m != nil {
			m.finished(i+1, len(sr.Errors) > 0)
		}
		sr.Name = j.name
		sr.Notes = battery.WithSourceNotes(j.source, sr.Notes)
		if o.compactArrays {
			batch.CompactArrays(&sr)
		}
		in := j.in
		in.Name = j.name
		if stream != nil {
			b, err := stream.Encode(&sr)
			if err != nil {
				return done{}, err
			}
			return done{sr: schema.Series{Errors: sr.Errors}, in: in, enc: b}, nil
		}
		return done{sr, in, nil}, nil
	}
	n := 0
	sink := func(d done) error {
		n++
		if len(d.sr.Errors) > 0 {
			failed++
		}
		if stream != nil {
			if d.enc != nil {
				return stream.SeriesEncoded(d.enc)
			}
			return stream.Series(&d.sr)
		}
		doc.Series = append(doc.Series, d.sr)
		inputs = append(inputs, d.in)
		return nil
	}
	err := batch.Pool(e.ctx, o.jobs, false, produce, work, sink)
	if err == nil && e.ctx.Err() != nil {
		err = core.ErrCancelled
	}
	cancelled := err != nil && (errors.Is(err, core.ErrCancelled) || e.ctx.Err() != nil)
	if cancelled {
		// The series finished before the signal are written, as a whole
		// document, below.
		err = nil
	}
	if err != nil {
		var ue *battery.UsageError
		if errors.As(err, &ue) {
			e.errorf("%v", err)
			return exitUsage
		}
		e.errorf("%v", err)
		return exitOutput
	}
	var werr error
	if stream != nil {
		werr = stream.Close()
	} else {
		werr = report.Write(w, o.format, doc, inputs)
	}
	if bw, ok := w.(*bufio.Writer); ok && werr == nil {
		werr = bw.Flush()
	}
	if outFile != nil && werr == nil {
		if werr = outFile.Sync(); werr == nil {
			if werr = outFile.Close(); werr == nil {
				werr = os.Rename(outFile.Name(), o.out)
				if werr == nil {
					outFile = nil
				}
			}
		}
	}
	if werr != nil {
		e.errorf("writing the output: %v", werr)
		return exitOutput
	}
	if cancelled {
		if m != nil {
			m.close()
		}
		cause := context.Cause(e.ctx)
		if cause == nil {
			cause = core.ErrCancelled
		}
		e.errorf("%v: the output holds the %d of %d series finished before it", cause, n, len(jobsList))
		return e.cancelStatus()
	}
	if after != nil {
		if err := after(doc, inputs); err != nil {
			e.errorf("%v", err)
			return exitUsage
		}
	}
	if failed > 0 {
		return exitFailed
	}
	return exitOK
}

func poolJobs(j int) int {
	if j <= 0 {
		return runtime.GOMAXPROCS(0)
	}
	return j
}

// planSeries lists the series of t in the order of battery.Analyze: the
// selected columns (analysed, or failed at selection), then columns that
// are not series, then any other selection error.
func planSeries(t *dataset.Table, s schema.Settings) ([]seriesJob, error) {
	prepared, errs := dataset.Select(t, s)
	failed := map[string]error{}
	for i := range errs {
		if errs[i].Series == "" {
			return nil, &battery.UsageError{Field: "input selection", Err: &errs[i]}
		}
		failed[errs[i].Series] = &errs[i]
	}
	byName := map[string]dataset.Series{}
	for _, p := range prepared {
		byName[p.Name] = p
	}
	var out []seriesJob
	seen := map[string]bool{}
	for _, col := range t.Series {
		if seen[col.Name] {
			continue
		}
		if p, ok := byName[col.Name]; ok {
			seen[col.Name] = true
			out = append(out, seriesJob{name: p.Name, in: p})
		} else if e, ok := failed[col.Name]; ok {
			seen[col.Name] = true
			out = append(out, seriesJob{name: col.Name, in: dataset.Series{Name: col.Name, Column: col.Column, Notes: col.Notes}, freq: col.Frequency, fail: e})
		}
	}
	for _, pe := range t.Skipped {
		if name := pe.ColumnName; name != "" && !seen[name] {
			seen[name] = true
			out = append(out, seriesJob{name: name, in: dataset.Series{Name: name, Column: pe.Column}, freq: t.Frequency, fail: pe})
		}
	}
	for i := range errs {
		if name := errs[i].Series; !seen[name] {
			seen[name] = true
			out = append(out, seriesJob{name: name, in: dataset.Series{Name: name}, fail: &errs[i]})
		}
	}
	return out, nil
}

func (e *env) readInput(f string) (string, []byte, error) {
	switch f {
	case "demo:":
		return battery.DemoName, battery.DemoCSV(), nil
	case "-":
		b, err := io.ReadAll(e.stdin)
		return "stdin", b, err
	}
	b, err := os.ReadFile(f)
	if err != nil {
		return f, nil, err
	}
	return f, b, nil
}

func (e *env) listTests() int {
	for _, id := range core.IDs() {
		info, _ := core.Lookup(id)
		fmt.Fprintf(e.stdout, "%-8s %s\n         H0: %s\n         %s\n", id, info.Name, info.Null, info.Citation)
	}
	return exitOK
}

// or returns s, or def when s is empty.
func or(s, def string) string {
	if s == "" {
		return def
	}
	return s
}
