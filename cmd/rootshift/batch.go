package main

import (
	"bufio"
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"os"
	"strconv"
	"strings"

	"github.com/rootshift/rootshift/breaks/batch"
	"github.com/rootshift/rootshift/breaks/battery"
	"github.com/rootshift/rootshift/breaks/report"
	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/schema"
	"github.com/schollz/progressbar/v3"
	"golang.org/x/term"
)

const batchUsage = `Usage: rootshift batch [options] INPUT...

Runs the analysis on many series and writes one JSON Lines record per series
(a schema v1 document holding that one series). INPUT is a file, a directory
(its .csv, .tsv, .txt, .xlsx, .jsonl files) or "-" for standard input.

Input shapes:
  wide files (default)  every numeric column of each file is a series
  --long                rows of id, date, value (column names set by --id-col, --date-col, --value-col)
  --jsonl               JSON Lines: {"id": "...", "dates": [...], "values": [...]}

Exit status: 0 when every series was tested, 1 when some failed (their
records carry the errors; a file that exists but cannot be read or parsed is
one failed record), 2 for usage errors (including an INPUT path that does not
exist, checked before anything runs or is written).`

func (e *env) batch(args []string) int {
	var cfg batch.Config
	var out, shard, order, cachePath, csvPath, verdictPath string
	var long, jsonl, resume, quiet bool
	fs := newFlagSet("batch", e.stdout, batchUsage)
	settingsFlags(fs, &cfg.Settings)
	fs.BoolVar(&long, "long", false, "inputs are long files (id, date, value)")
	fs.BoolVar(&jsonl, "jsonl", false, "inputs are JSON Lines (one series per line)")
	fs.StringVar(&cfg.Long.ID, "id-col", "id", "long files: series id `column`")
	fs.StringVar(&cfg.Long.Date, "date-col", "date", "long files: date `column`")
	fs.StringVar(&cfg.Long.Value, "value-col", "value", "long files: value `column`")
	fs.IntVar(&cfg.Jobs, "j", 0, "`number` of parallel workers (default: all cores)")
	fs.StringVar(&order, "order", "input", "record order `mode`: input (same as the input) or completed (as they finish)")
	fs.StringVar(&out, "o", "", "output `file` (default: standard output); needed for --resume")
	fs.BoolVar(&resume, "resume", false, "skip series already in the output file and append the rest")
	fs.StringVar(&shard, "shard", "", "take shard `i/n` (i from 1 to n) by a stable hash of the series id, e.g. 3/8")
	fs.StringVar(&cachePath, "dist-cache", "", "load and save simulated null distributions in this `file` (with --sims)")
	fs.StringVar(&csvPath, "csv", "", "also write the summary CSV (one row per series and test) to this `file`")
	fs.StringVar(&verdictPath, "verdicts", "", "also write the verdict table (CSV, one row per series) to this `file`")
	fs.BoolVar(&quiet, "quiet", false, "no progress on standard error")
	fs.BoolVar(&cfg.Lean, "lean", false, "leave out plotting data (search paths, sequences): records about a third the size")
	inputs, err := parseInterleaved(fs, args)
	if err != nil {
		return e.usageExit(err)
	}
	if len(inputs) == 0 {
		return e.usageExit(errors.New("batch: no input (a file, a directory or - for standard input)"))
	}
	cfg.Inputs, cfg.Stdin = inputs, e.stdin
	switch {
	case long && jsonl:
		return e.usageExit(errors.New("batch: --long and --jsonl exclude each other"))
	case long:
		cfg.Kind = batch.KindLong
	case jsonl:
		cfg.Kind = batch.KindJSONL
	}
	switch order {
	case "input":
	case "completed":
		cfg.Completed = true
	default:
		return e.usageExit(fmt.Errorf("batch: --order %q: want input or completed", order))
	}
	if shard != "" {
		a, b, ok := strings.Cut(shard, "/")
		i, err1 := strconv.Atoi(a)
		n, err2 := strconv.Atoi(b)
		if !ok || err1 != nil || err2 != nil || n < 1 || i < 1 || i > n {
			return e.usageExit(fmt.Errorf("batch: --shard %q: want i/n with 1 <= i <= n", shard))
		}
		cfg.Shard, cfg.Shards = i, n
	}
	if resume && out == "" {
		return e.usageExit(errors.New("batch: --resume needs -o FILE"))
	}
	if err := battery.Validate(cfg.Settings); err != nil {
		return e.usageExit(err)
	}
	// Before the output file is created or truncated.
	if err := batch.CheckInputs(inputs); err != nil {
		return e.usageExit(fmt.Errorf("batch: %w", err))
	}
	if cfg.Settings.Sims > 0 || cachePath != "" {
		cfg.Cache = battery.NewDistCache()
		if cachePath != "" {
			if err := cfg.Cache.LoadFile(cachePath); err != nil {
				e.errorf("batch: %v", err)
				return exitUsage
			}
		}
	}

	var w io.Writer = e.stdout
	if out != "" {
		flags := os.O_CREATE | os.O_WRONLY | os.O_TRUNC
		if resume {
			flags = os.O_CREATE | os.O_RDWR
		}
		f, err := os.OpenFile(out, flags, 0o644)
		if err != nil {
			e.errorf("batch: %v", err)
			return exitUsage
		}
		defer f.Close()
		if resume {
			done, good, err := batch.DoneIDs(f)
			if err != nil {
				e.errorf("batch: %s: %v", out, err)
				return exitUsage
			}
			// Drop a partial last line left by an interrupted run.
			if err := f.Truncate(good); err != nil {
				e.errorf("batch: %v", err)
				return exitUsage
			}
			if _, err := f.Seek(good, io.SeekStart); err != nil {
				e.errorf("batch: %v", err)
				return exitUsage
			}
			cfg.Skip = done
			if !quiet {
				fmt.Fprintf(e.stderr, "rootshift: resuming: %d series already in %s\n", len(done), out)
			}
		}
		bw := bufio.NewWriterSize(f, 1<<16)
		defer bw.Flush()
		w = bw
	}
	sinks := []batch.Sink{batch.JSONLSink(w)}
	var csvBuf, verdictBuf *os.File
	if csvPath != "" {
		if csvBuf, err = os.Create(csvPath); err != nil {
			e.errorf("batch: %v", err)
			return exitUsage
		}
		defer csvBuf.Close()
		sinks = append(sinks, csvSink(csvBuf))
	}
	if verdictPath != "" {
		if verdictBuf, err = os.Create(verdictPath); err != nil {
			e.errorf("batch: %v", err)
			return exitUsage
		}
		defer verdictBuf.Close()
		sinks = append(sinks, verdictSink(verdictBuf))
	}
	var bar *progressbar.ProgressBar
	if !quiet && isTerminal(e.stderr) {
		bar = progressbar.NewOptions(-1,
			progressbar.OptionSetWriter(e.stderr),
			progressbar.OptionSetDescription("series"),
			progressbar.OptionShowCount(),
			progressbar.OptionShowIts(),
			progressbar.OptionSetItsString("series"),
			progressbar.OptionThrottle(100_000_000),
			progressbar.OptionClearOnFinish(),
		)
		cfg.Progress = func(batch.Summary) { bar.Add(1) }
	}
	sum, err := batch.Run(e.ctx, cfg, func(r batch.Record) error {
		for _, s := range sinks {
			if err := s(r); err != nil {
				return err
			}
		}
		return nil
	})
	if bar != nil {
		bar.Finish()
	}
	if cfg.Cache != nil && cachePath != "" {
		if err := cfg.Cache.SaveFile(cachePath); err != nil {
			e.errorf("batch: saving the distribution cache: %v", err)
		}
	}
	if !quiet {
		rate := float64(sum.Tested+sum.Failed) / sum.Elapsed.Seconds()
		fmt.Fprintf(e.stderr, "rootshift: %d series read, %d tested, %d failed, %d skipped (resume or other shards); %.1f s, %.0f series/s, peak memory %.0f MB\n",
			sum.Read, sum.Tested, sum.Failed, sum.Skipped, sum.Elapsed.Seconds(), rate, peakMemoryMB())
	}
	if err != nil {
		e.errorf("batch: %v", err)
		if errors.Is(err, core.ErrCancelled) {
			return exitCancel
		}
		var ue *battery.UsageError
		if errors.As(err, &ue) || errors.Is(err, batch.ErrMissingInput) {
			return exitUsage
		}
		return exitFailed
	}
	if sum.Failed > 0 {
		return exitFailed
	}
	return exitOK
}

func isTerminal(w io.Writer) bool {
	f, ok := w.(*os.File)
	return ok && term.IsTerminal(int(f.Fd()))
}

// csvSink writes the summary CSV (the report's CSV format) with one header.
func csvSink(w io.Writer) batch.Sink {
	first := true
	return func(r batch.Record) error {
		var b bytes.Buffer
		if err := report.Write(&b, "csv", r.Doc, nil); err != nil {
			return err
		}
		data := b.Bytes()
		if !first {
			if i := bytes.IndexByte(data, '\n'); i >= 0 {
				data = data[i+1:]
			}
		}
		first = false
		_, err := w.Write(data)
		return err
	}
}

// verdictSink writes one CSV row per series: id, class, order, transform,
// breaks, explanation, errors.
func verdictSink(w io.Writer) batch.Sink {
	cw := csv.NewWriter(w)
	header := false
	return func(r batch.Record) error {
		if !header {
			header = true
			cw.Write([]string{"id", "series", "n", "class", "order", "transform", "breaks", "explanation", "errors"})
		}
		s := r.Doc.Series[0]
		row := []string{r.ID, s.Name, strconv.Itoa(s.N), "", "", "", "", "", ""}
		if v := s.Verdict; v != nil {
			row[3], row[5], row[7] = v.Class, v.Transform, v.Explanation
			if v.Order != nil {
				row[4] = strconv.Itoa(*v.Order)
			}
			row[6] = breakList(v.Breaks)
		}
		var msgs []string
		for _, e := range s.Errors {
			msgs = append(msgs, e.Message)
		}
		row[8] = strings.Join(msgs, "; ")
		for i := range row {
			row[i] = report.CSVCell(row[i]) // no formula, no control character
		}
		cw.Write(row)
		cw.Flush()
		return cw.Error()
	}
}

func breakList(bs []schema.Break) string {
	var parts []string
	for _, b := range bs {
		if b.Date != "" {
			parts = append(parts, b.Date)
		} else {
			parts = append(parts, strconv.Itoa(b.Index))
		}
	}
	return strings.Join(parts, " ")
}
