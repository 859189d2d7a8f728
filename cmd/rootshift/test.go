package main

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"

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
}

func (e *env) test(args []string) int {
	var s schema.Settings
	var o outputOpts
	fs := newFlagSet("test", e.stdout, "Usage: rootshift test [options] FILE...\n\nTests every numeric column of each file (CSV, TSV, semicolon-separated, .xlsx; \"-\" is standard input).")
	settingsFlags(fs, &s)
	fs.BoolVar(&o.json, "json", false, "print the JSON document (schema rootshift.results/v1); same as --format json")
	fs.StringVar(&o.format, "format", "table", "output: "+strings.Join(report.Formats, ", "))
	fs.StringVar(&o.out, "out", "", "write the output to this `file` instead of standard output")
	fs.BoolVar(&o.quiet, "quiet", false, "no progress messages on standard error")
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
	var data bool
	fs.BoolVar(&data, "data", false, "print the demo data as CSV and exit")
	if _, err := parseInterleaved(fs, args); err != nil {
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

// analyzeFiles runs the analysis on each file and writes one document (the
// series of every file, in order).
func (e *env) analyzeFiles(files []string, s schema.Settings, o outputOpts, after func(*schema.Document, []dataset.Series) error) int {
	if o.json {
		o.format = "json"
	}
	if err := checkFormat(o.format); err != nil {
		return e.usageExit(err)
	}
	if err := battery.Validate(s); err != nil {
		return e.usageExit(err)
	}
	opt := &battery.Options{}
	if !o.quiet && s.Sims > 0 && isTerminal(e.stderr) { // "\r" progress: terminals only
		opt.Progress = progressPrinter(e.stderr)
	}
	var doc *schema.Document
	var inputs []dataset.Series
	for _, f := range files {
		name, data, err := e.readInput(f)
		if err != nil {
			e.errorf("%v", err)
			return exitUsage
		}
		d, in, err := battery.AnalyzeText(e.ctx, name, data, s, opt)
		if err != nil {
			if errors.Is(err, core.ErrCancelled) || e.ctx.Err() != nil {
				e.errorf("cancelled")
				return exitCancel
			}
			if lc := battery.DetectLong(name, data, s); lc != nil && s.Long == nil {
				e.errorf("%s: %v\n  this looks like a long table (ids in %q, dates in %q, values in %q): add --long --id-col %s --date-col %s --value-col %s",
					name, err, or(lc.ID, "id"), or(lc.Date, "date"), or(lc.Value, "value"), or(lc.ID, "id"), or(lc.Date, "date"), or(lc.Value, "value"))
				return exitUsage
			}
			e.errorf("%s: %v", name, err)
			return exitUsage
		}
		if len(files) > 1 {
			for i := range d.Series {
				d.Series[i].Name = filepath.Base(name) + ":" + d.Series[i].Name
				in[i].Name = d.Series[i].Name
				d.Series[i].Notes = battery.WithSourceNotes(d.Source, d.Series[i].Notes) // the source is dropped below
			}
		}
		if doc == nil {
			doc = d
		} else {
			doc.Series = append(doc.Series, d.Series...)
		}
		inputs = append(inputs, in...)
	}
	if len(files) > 1 {
		doc.Source = nil // several files: each series name says where it came from
	}
	var w io.Writer = e.stdout
	var buf bytes.Buffer
	if o.out != "" {
		w = &buf
	}
	if err := report.Write(w, o.format, doc, inputs); err != nil {
		e.errorf("%v", err)
		return exitUsage
	}
	if o.out != "" {
		if err := os.WriteFile(o.out, buf.Bytes(), 0o644); err != nil {
			e.errorf("%v", err)
			return exitUsage
		}
	}
	if after != nil {
		if err := after(doc, inputs); err != nil {
			e.errorf("%v", err)
			return exitUsage
		}
	}
	for _, sr := range doc.Series {
		if len(sr.Errors) > 0 {
			return exitFailed
		}
	}
	return exitOK
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

func progressPrinter(w io.Writer) func(battery.Progress) {
	last := -1
	return func(p battery.Progress) {
		if p.Stage != "simulation" || p.Total == 0 {
			return
		}
		pct := 100 * p.Done / p.Total
		if pct/10 != last/10 || p.Done == p.Total {
			last = pct
			fmt.Fprintf(w, "\rsimulating %s for %s: %3d%%", p.Test, p.Series, pct)
			if p.Done == p.Total {
				fmt.Fprintln(w)
			}
		}
	}
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
