package main

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"runtime/debug"
	"strings"
	"time"

	"github.com/rootshift/rootshift/breaks/batch"
	"github.com/rootshift/rootshift/breaks/battery"
	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/schema"
	"golang.org/x/term"
)

const batchUsage = `Usage: rootshift batch [options] INPUT...
       rootshift batch merge [--inputs-only] PART... -o FILE

Runs the analysis on many series and writes one JSON Lines record per series
(a schema v2 document holding that one series). INPUT is a file, a directory
(its .csv, .tsv, .txt, .xlsx, .jsonl files) or "-" for standard input.
Named pipes, sockets and devices in a directory are skipped with a note, and
so are files this tool wrote (recognised by their schema marker) and the
run's own output files; an output that is one of the INPUT files is a usage
error.

Input shapes:
  wide files (default)  every numeric column of each file is a series
  --long                rows of id, date, value (column names set by --id-col, --date-col, --value-col)
  --jsonl               JSON Lines: {"id": "...", "dates": [...], "values": [...]}

Output is written in whole record groups: a failed write removes the partial
group, so the files hold whole lines, and the summary counts only records
that reached the files. --resume matches inputs by canonical path and content
fingerprint, rebuilds --csv and --verdicts from the records kept, and refuses
changed settings or changed inputs (it prints the difference) unless
--start-over is given.

Exit status: 0 when every series was tested, 1 when some failed (their
records carry the errors; a file that exists but cannot be read or parsed is
one failed record), 2 for usage errors (including an INPUT path that does not
exist, checked before anything runs or is written), 3 when an output could not
be written in full (the summary says how many records were), 4 when there was
nothing to process (no series read), 130 after an interrupt (Ctrl-C, SIGINT),
143 after SIGTERM (both: whole lines written, then the summary).`

// Garbage collection of a batch run: its live heap is a few megabytes
// (the series in flight and their records), so with Go's default the
// collector runs every few series and took about 15% of the run's time
// (10,000 series of length 300: 5.9-7.1 s against 7.2-8.5 s for 2,000
// series with GOGC=400 against 100, peak memory 26 MB against 13 MB). A
// batch run collects at batchGCPercent, with a soft limit of
// batchMemoryLimit that brings the default back when a large input makes
// the heap grow; the GOGC and GOMEMLIMIT environment variables, when set,
// win.
const (
	batchGCPercent   = 400
	batchMemoryLimit = 512 << 20
)

// batchGC applies the batch run's collection settings and returns the
// function that restores the previous ones.
func batchGC() func() {
	restore := []func(){}
	if os.Getenv("GOGC") == "" {
		old := debug.SetGCPercent(batchGCPercent)
		restore = append(restore, func() { debug.SetGCPercent(old) })
	}
	if os.Getenv("GOMEMLIMIT") == "" {
		old := debug.SetMemoryLimit(batchMemoryLimit)
		restore = append(restore, func() { debug.SetMemoryLimit(old) })
	}
	return func() {
		for _, f := range restore {
			f()
		}
	}
}

func (e *env) batch(args []string) int {
	if len(args) > 0 && args[0] == "merge" {
		return e.batchMerge(args[1:])
	}
	defer batchGC()()
	var cfg batch.Config
	var out, shard, order, cachePath, csvPath, verdictPath string
	var long, jsonl, resume, startOver, quiet bool
	var shardsFlag, progressEvery int
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
	fs.BoolVar(&startOver, "start-over", false, "with --resume: discard the output (and side files) when settings or inputs changed, and run everything")
	fs.StringVar(&shard, "shard", "", "take shard `i/n` (i from 1 to n) by a stable hash of the series id, e.g. 3/8; \"auto\" reads a job array's index and count from the environment (README \"Scaling out\")")
	fs.IntVar(&shardsFlag, "shards", 0, "with --shard auto on an indexed job that gives no count: the number of shards `n` (or set ROOTSHIFT_SHARDS)")
	fs.StringVar(&cachePath, "dist-cache", "", "load and save simulated null distributions in this `file` (with --sims)")
	fs.StringVar(&csvPath, "csv", "", "also write the summary CSV (one row per series and test) to this `file`")
	fs.StringVar(&verdictPath, "verdicts", "", "also write the verdict table (CSV, one row per series) to this `file`")
	fs.BoolVar(&quiet, "quiet", false, "no progress on standard error")
	fs.IntVar(&progressEvery, "progress-every", 1000, "when standard error is not a terminal: a progress line every `N` series, and every 30 s after the first 5 (0: none)")
	fs.IntVar(&cfg.MaxObs, "max-obs", batch.DefaultMaxObs, "a series longer than `N` observations fails alone (about 1 GB and minutes each at the limit; -1: no limit)")
	fs.BoolVar(&cfg.CompactArrays, "compact-arrays", false, "write candidate paths and surface rows as compact runs (path_compact: first, step, values): about 40% of their size")
	fs.BoolVar(&cfg.Lean, "lean", false, "leave out plotting data (search paths, sequences): records about a third the size")
	inputs, err := parseInterleaved(fs, args)
	if err != nil {
		return e.usageExit(err)
	}
	if err := checkGivenZeros(fs); err != nil {
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
	if cfg.MaxObs == 0 || cfg.MaxObs < -1 {
		return e.usageExit(fmt.Errorf("batch: --max-obs %d: want a positive number of observations, or -1 for no limit", cfg.MaxObs))
	}
	if shard != "" {
		i, n, from, err := parseShard(shard, shardsFlag, os.Getenv)
		if err != nil {
			return e.usageExit(fmt.Errorf("batch: %w", err))
		}
		cfg.Shard, cfg.Shards = i, n
		if from != "" && !quiet {
			fmt.Fprintf(e.stderr, "rootshift: shard %d/%d (%s)\n", i, n, from)
		}
	}
	if resume && out == "" {
		return e.usageExit(errors.New("batch: --resume needs -o FILE"))
	}
	if startOver && !resume {
		return e.usageExit(errors.New("batch: --start-over goes with --resume"))
	}
	if err := battery.Validate(cfg.Settings); err != nil {
		return e.usageExit(err)
	}
	// Before the output file is created or truncated.
	if err := batch.CheckInputs(inputs); err != nil {
		return e.usageExit(fmt.Errorf("batch: %w", err))
	}
	outputs := map[string]string{"-o": out, "--csv": csvPath, "--verdicts": verdictPath, "--dist-cache": cachePath}
	for _, flagName := range []string{"-o", "--csv", "--verdicts", "--dist-cache"} {
		o := outputs[flagName]
		if o == "" {
			continue
		}
		for _, in := range inputs {
			if in != "-" && sameFile(o, in) {
				return e.usageExit(fmt.Errorf("batch: %s %s is also an input: it would be overwritten before it is read", flagName, o))
			}
		}
		if flagName != "--dist-cache" {
			cfg.Exclude = append(cfg.Exclude, batch.Canonical(o))
		}
		for _, other := range []string{"-o", "--csv", "--verdicts", "--dist-cache"} {
			if other != flagName && outputs[other] != "" && flagName < other && sameFile(o, outputs[other]) {
				return e.usageExit(fmt.Errorf("batch: %s and %s name the same file %s", flagName, other, o))
			}
		}
	}
	if !quiet {
		cfg.Note = func(s string) { fmt.Fprintf(e.stderr, "rootshift: note: %s\n", s) }
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

	g := &groupWriter{groupBytes: groupBytesDefault, every: time.Second, last: time.Now()}
	fresh := !resume || startOver
	if resume && !startOver {
		ex, side, code := e.prepareResume(out, csvPath, verdictPath, cfg, quiet)
		if code >= 0 {
			return code
		}
		cfg.Skip = ex.Keys
		g.csvHeader, g.vHeader = side.csv, side.verdicts
	}
	open := func(path, name string, fresh bool) (*target, error) {
		f, err := openOutFile(path, fresh)
		if err != nil {
			return nil, err
		}
		t := &target{name: name, w: f, f: f}
		if st, ok := f.(interface{ Stat() (os.FileInfo, error) }); ok {
			if fi, err := st.Stat(); err == nil {
				t.off = fi.Size()
			}
		}
		return t, nil
	}
	if out != "" {
		if g.jsonl, err = open(out, out, fresh); err != nil {
			e.errorf("batch: %v", err)
			return exitUsage
		}
	} else {
		g.jsonl = &target{name: "standard output", w: e.stdout}
	}
	if csvPath != "" {
		if g.csv, err = open(csvPath, csvPath, fresh); err != nil {
			g.close()
			e.errorf("batch: %v", err)
			return exitUsage
		}
	}
	if verdictPath != "" {
		if g.verdicts, err = open(verdictPath, verdictPath, fresh); err != nil {
			g.close()
			e.errorf("batch: %v", err)
			return exitUsage
		}
	}
	var m *meter
	if !quiet && (progressEvery > 0 || isTerminal(e.stderr)) {
		m = newMeter(e.stderr, isTerminal(e.stderr), nil)
		m.every, m.forecast = progressEvery, true
		cfg.Progress = func(s batch.Summary) {
			if s.Current.Stage != "" {
				m.step(s.Current)
				return
			}
			total := -1
			if p := s.Pending(); p >= 0 {
				total = s.Tested + s.Failed + p
			}
			m.summary(s.Last, s.Tested+s.Failed, s.Failed, total)
		}
		stop := m.ticker(time.Second)
		defer func() { stop(); m.close() }()
	}
	sum, err := batch.Run(e.ctx, cfg, g.add)
	if m != nil {
		m.close()
	}
	werr := g.close()
	if werr != nil && err == nil {
		err = werr
	}
	cacheFailed := false
	if cfg.Cache != nil && cachePath != "" {
		if err := cfg.Cache.SaveFile(cachePath); err != nil {
			e.errorf("batch: saving the distribution cache: %v", err)
			cacheFailed = true
		}
	}
	produced := sum.Tested + sum.Failed
	written := g.tested + g.failed
	if !quiet {
		rate := float64(written) / sum.Elapsed.Seconds()
		fmt.Fprintf(e.stderr, "rootshift: %d series read, %d tested, %d failed, %d skipped (resume or other shards); %.1f s, %.0f series/s, peak memory %.0f MB\n",
			sum.Read, g.tested, g.failed, sum.Skipped, sum.Elapsed.Seconds(), rate, peakMemoryMB())
		if lost := produced - written; lost > 0 {
			fmt.Fprintf(e.stderr, "rootshift: %d analysed series were not written (see the error); the outputs hold the %d records counted above\n", lost, written)
		}
	}
	if werr != nil {
		e.errorf("batch: %v", werr)
		return exitOutput
	}
	if err != nil {
		e.errorf("batch: %v", err)
		if errors.Is(err, core.ErrCancelled) {
			return e.cancelStatus()
		}
		var ue *battery.UsageError
		if errors.As(err, &ue) || errors.Is(err, batch.ErrMissingInput) {
			return exitUsage
		}
		return exitFailed
	}
	if cacheFailed {
		return exitOutput
	}
	if sum.Read == 0 {
		e.errorf("batch: nothing to process: no series in the input (exit status %d)", exitNothing)
		return exitNothing
	}
	if g.failed > 0 {
		return exitFailed
	}
	return exitOK
}

// groupBytesDefault is the size of a record group: the outputs are written
// and synced once per group (or per second).
var groupBytesDefault = 256 << 10

type sideState struct{ csv, verdicts bool }

// prepareResume checks an existing output against the run (settings and
// input fingerprints), truncates a partial last line and rebuilds the side
// files from the records kept. code >= 0 means stop with that exit status.
func (e *env) prepareResume(out, csvPath, verdictPath string, cfg batch.Config, quiet bool) (batch.Existing, sideState, int) {
	var side sideState
	f, err := os.Open(out)
	if errors.Is(err, os.ErrNotExist) {
		// Nothing to resume: side files start empty too.
		for _, p := range []string{csvPath, verdictPath} {
			if p != "" {
				if err := writeFileAtomic(p, nil); err != nil {
					e.errorf("batch: %v", err)
					return batch.Existing{}, side, exitOutput
				}
			}
		}
		return batch.Existing{Keys: map[string]bool{}}, side, -1
	}
	if err != nil {
		e.errorf("batch: %v", err)
		return batch.Existing{}, side, exitUsage
	}
	var csvBuf, vBuf bytes.Buffer
	ex, err := batch.ReadExisting(bufio.NewReaderSize(f, 1<<16), func(_ []byte, doc *schema.Document) error {
		r := recordOf(doc)
		if csvPath != "" {
			if err := csvRows(&csvBuf, r, !side.csv); err != nil {
				return err
			}
			side.csv = true
		}
		if verdictPath != "" {
			if err := verdictRow(&vBuf, r, !side.verdicts); err != nil {
				return err
			}
			side.verdicts = true
		}
		return nil
	})
	f.Close()
	if err != nil {
		e.errorf("batch: %s: %v", out, err)
		return ex, side, exitUsage
	}
	if ex.Settings != nil {
		if diff := settingsDiff(*ex.Settings, battery.NewDocument(cfg.Settings).Settings); len(diff) > 0 {
			e.errorf("batch: --resume: the settings differ from those of the records in %s:\n  %s\n(run with the same settings, or add --start-over to discard %s and run everything)",
				out, strings.Join(diff, "\n  "), out)
			return ex, side, exitUsage
		}
	}
	if len(ex.Fingerprints) > 0 {
		paths, _ := batch.Expand(cfg.Inputs, cfg.Exclude, nil)
		var changed []string
		for _, p := range paths {
			if p == "-" {
				continue
			}
			c := batch.Canonical(p)
			old, ok := ex.Fingerprints[c]
			if !ok {
				continue
			}
			if cur, err := batch.FingerprintFile(p); err == nil && cur != old {
				changed = append(changed, p)
			}
		}
		if len(changed) > 0 {
			e.errorf("batch: --resume: these inputs changed since their records in %s were written:\n  %s\n(add --start-over to discard %s and run everything)",
				out, strings.Join(changed, "\n  "), out)
			return ex, side, exitUsage
		}
	}
	// Drop a partial last line left by an interrupted run.
	if err := os.Truncate(out, ex.Good); err != nil {
		e.errorf("batch: %v", err)
		return ex, side, exitUsage
	}
	// The side files are a function of the records: rebuilt from those kept.
	for _, sf := range []struct {
		path string
		b    *bytes.Buffer
	}{{csvPath, &csvBuf}, {verdictPath, &vBuf}} {
		if sf.path == "" {
			continue
		}
		if err := writeFileAtomic(sf.path, sf.b.Bytes()); err != nil {
			e.errorf("batch: %v", err)
			return ex, side, exitOutput
		}
	}
	if !quiet {
		fmt.Fprintf(e.stderr, "rootshift: resuming: %d series already in %s\n", ex.Records, out)
	}
	return ex, side, -1
}

// writeFileAtomic writes data to a temporary file beside path, syncs it and
// renames it over path.
func writeFileAtomic(path string, data []byte) error {
	f, err := os.CreateTemp(filepath.Dir(path), "."+filepath.Base(path)+".tmp*")
	if err != nil {
		return err
	}
	tmp := f.Name()
	_, err = f.Write(data)
	if err == nil {
		err = f.Sync()
	}
	if cerr := f.Close(); err == nil {
		err = cerr
	}
	if err == nil {
		err = os.Rename(tmp, path)
	}
	if err != nil {
		os.Remove(tmp)
	}
	return err
}

func isTerminal(w io.Writer) bool {
	f, ok := w.(*os.File)
	return ok && term.IsTerminal(int(f.Fd()))
}
