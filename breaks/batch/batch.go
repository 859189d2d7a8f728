package batch

import (
	"bufio"
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"hash/fnv"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"runtime"
	"sort"
	"strings"
	"sync"
	"time"

	"github.com/rootshift/rootshift/breaks/battery"
	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/dataset"
	"github.com/rootshift/rootshift/core/schema"
)

// Input kinds.
const (
	// KindFiles reads each input as a wide file (every numeric column a
	// series); a directory input contributes its .csv, .tsv, .txt and
	// .xlsx files in name order.
	KindFiles = "files"
	// KindLong reads long files: one row per observation with id, date and
	// value columns.
	KindLong = "long"
	// KindJSONL reads JSON Lines: {"id": ..., "dates": [...], "values": [...]}.
	KindJSONL = "jsonl"
)

// Config configures a batch run. The zero value of each field is its default.
type Config struct {
	// Inputs are file or directory paths; "-" is standard input.
	Inputs []string
	// Kind is KindFiles (default), KindLong or KindJSONL.
	Kind string
	// Long-format column names (defaults id, date, value).
	Long dataset.LongOptions
	// Settings apply to every series.
	Settings schema.Settings
	// Jobs is the number of parallel workers; 0: all cores.
	Jobs int
	// Completed writes records as they complete instead of in input order.
	Completed bool
	// Shard, of Shards, selects the series whose id hashes to Shard-1 mod
	// Shards (Shard counted from 1); Shards 0 or 1 takes everything.
	Shard, Shards int
	// Skip holds series ids already done (resume).
	Skip map[string]bool
	// Cache reuses simulated null distributions across series.
	Cache *battery.DistCache
	// Progress is called after each series with the running summary.
	Progress func(Summary)
	// Stdin is read for the input "-".
	Stdin io.Reader
	// Lean drops the plotting data (break-search paths, statistic
	// sequences, two-break surface rows) from the records, which are
	// otherwise about three times larger.
	Lean bool
}

// Summary counts what a run did. Nothing is dropped silently: every series
// read is either skipped (resume or another shard), tested or failed.
type Summary struct {
	Read    int `json:"read"`
	Skipped int `json:"skipped"`
	Tested  int `json:"tested"`
	Failed  int `json:"failed"`
	// Inputs that could not be read at all (each also yields a record).
	BadInputs int           `json:"bad_inputs"`
	Elapsed   time.Duration `json:"-"`
}

// Record is one output line, written by Sink.
type Record struct {
	ID  string
	Doc *schema.Document
	// Input is the prepared series (nil values for failed ones).
	Input dataset.Series
}

// Sink receives records in output order (one goroutine at a time).
type Sink func(Record) error

// ErrMissingInput is wrapped by CheckInputs and Run when an input path does
// not exist (it is neither a file nor a directory): a usage error, reported
// before the run starts. An input that exists but cannot be read or parsed
// is not an error of the run: it yields a failure record.
var ErrMissingInput = errors.New("no such file or directory")

// CheckInputs returns an error wrapping ErrMissingInput that names every
// input path that does not exist ("-", standard input, always exists).
// Paths that exist but cannot be opened or read pass: Run reports them as
// failure records.
func CheckInputs(inputs []string) error {
	var missing []string
	for _, in := range inputs {
		if in == "-" {
			continue
		}
		if _, err := os.Stat(in); errors.Is(err, fs.ErrNotExist) {
			missing = append(missing, fmt.Sprintf("%q", in))
		}
	}
	if len(missing) == 0 {
		return nil
	}
	word := "input"
	if len(missing) > 1 {
		word = "inputs"
	}
	return fmt.Errorf("%s %s: %w", word, strings.Join(missing, ", "), ErrMissingInput)
}

// ID returns the series id used for resume and sharding.
func ID(source, name string) string { return source + ":" + name }

// InShard reports whether id belongs to shard i (1-based) of n, by the
// 64-bit FNV-1a hash of the id.
func InShard(id string, i, n int) bool {
	if n <= 1 {
		return true
	}
	h := fnv.New64a()
	h.Write([]byte(id))
	return int(h.Sum64()%uint64(n)) == i-1
}

// task is one series to analyse, or one failure to report.
type task struct {
	seq    int
	source string
	freq   string
	in     dataset.Series
	fail   error
	notes  []dataset.Note // the reader's notes on the input (record's source notes)
}

// Run streams every series of cfg.Inputs through the battery with cfg.Jobs
// workers and hands one record per series to sink. It returns the summary;
// the error is non-nil for invalid settings, an input path that does not
// exist (ErrMissingInput, checked before any series is read), cancellation
// or a sink failure.
func Run(ctx context.Context, cfg Config, sink Sink) (Summary, error) {
	start := time.Now()
	if err := battery.Validate(cfg.Settings); err != nil {
		return Summary{}, err
	}
	if err := CheckInputs(cfg.Inputs); err != nil {
		return Summary{}, err
	}
	jobs := cfg.Jobs
	if jobs <= 0 {
		jobs = runtime.GOMAXPROCS(0)
	}
	parent := ctx
	ctx, cancel := context.WithCancel(ctx)
	defer cancel()
	// In-flight bound: the producer blocks when 4*jobs series are read but
	// not yet written, so memory does not grow with the input.
	inflight := make(chan struct{}, 4*jobs)
	tasks := make(chan task)
	type done struct {
		seq int
		rec Record
	}
	results := make(chan done, jobs)
	var sum Summary
	var sumMu sync.Mutex
	var prodErr error
	go func() {
		defer close(tasks)
		seq := 0
		emit := func(t task) bool {
			id := ID(t.source, t.in.Name)
			sumMu.Lock()
			sum.Read++
			skip := !InShard(id, cfg.Shard, cfg.Shards) || cfg.Skip[id]
			if skip {
				sum.Skipped++
			}
			sumMu.Unlock()
			if skip {
				return true
			}
			select {
			case inflight <- struct{}{}:
			case <-ctx.Done():
				return false
			}
			t.seq = seq
			seq++
			select {
			case tasks <- t:
				return true
			case <-ctx.Done():
				return false
			}
		}
		prodErr = produce(ctx, cfg, emit, &sum, &sumMu)
	}()
	var wg sync.WaitGroup
	opt := &battery.Options{Cache: cfg.Cache, Workers: 1}
	for w := 0; w < jobs; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for t := range tasks {
				doc := battery.NewDocument(cfg.Settings)
				doc.Source = &schema.Source{Name: t.source, Rows: len(t.in.Values), Frequency: t.freq, Notes: battery.SchemaNotes(t.notes)}
				var sr schema.Series
				if t.fail != nil {
					sr = battery.FailedSeries(t.in.Name, t.freq, cfg.Settings, t.fail)
					sr.Notes = battery.SchemaNotes(t.in.Notes)
				} else {
					var err error
					sr, err = battery.AnalyzeSeries(ctx, t.in, cfg.Settings, opt)
					if err != nil {
						cancel()
						continue
					}
				}
				if cfg.Lean {
					for i := range sr.Results {
						lean(&sr.Results[i])
					}
					if v := sr.Verdict; v != nil && v.Window != nil && v.Window.Known != nil {
						lean(v.Window.Known)
					}
				}
				doc.Series = []schema.Series{sr}
				rec := Record{ID: ID(t.source, t.in.Name), Doc: doc, Input: t.in}
				select {
				case results <- done{t.seq, rec}:
				case <-ctx.Done():
					return
				}
			}
		}()
	}
	go func() { wg.Wait(); close(results) }()

	// Writer: in input order (a small reorder buffer bounded by the
	// in-flight limit) or as completed.
	pending := map[int]Record{}
	next := 0
	var sinkErr error
	write := func(r Record) {
		<-inflight
		if sinkErr != nil {
			return
		}
		if err := sink(r); err != nil {
			sinkErr = err
			cancel()
			return
		}
		sumMu.Lock()
		if len(r.Doc.Series[0].Errors) > 0 {
			sum.Failed++
		} else {
			sum.Tested++
		}
		s := sum
		sumMu.Unlock()
		if cfg.Progress != nil {
			s.Elapsed = time.Since(start)
			cfg.Progress(s)
		}
	}
	for d := range results {
		if cfg.Completed {
			write(d.rec)
			continue
		}
		pending[d.seq] = d.rec
		for {
			p, ok := pending[next]
			if !ok {
				break
			}
			delete(pending, next)
			next++
			write(p)
		}
	}
	// Anything left (only after cancellation) in sequence order.
	keys := make([]int, 0, len(pending))
	for k := range pending {
		keys = append(keys, k)
	}
	sort.Ints(keys)
	for _, k := range keys {
		write(pending[k])
	}
	sum.Elapsed = time.Since(start)
	if sinkErr != nil {
		return sum, sinkErr
	}
	if err := parent.Err(); err != nil {
		return sum, fmt.Errorf("%w: %v", core.ErrCancelled, err)
	}
	return sum, prodErr
}

// produce reads the inputs in order and emits one task per series (or per
// unreadable input). It returns only for cancellation or standard-input
// errors; unreadable files become failure records.
func produce(ctx context.Context, cfg Config, emit func(task) bool, sum *Summary, mu *sync.Mutex) error {
	paths, err := expand(cfg.Inputs)
	if err != nil {
		return err
	}
	badInput := func(name string, err error) bool {
		mu.Lock()
		sum.BadInputs++
		mu.Unlock()
		return emit(task{source: name, in: dataset.Series{Name: filepath.Base(name)}, fail: err})
	}
	for _, p := range paths {
		if ctx.Err() != nil {
			return nil
		}
		var r io.Reader
		name := p
		var f *os.File
		if p == "-" {
			r, name = cfg.Stdin, "stdin"
			if r == nil {
				r = os.Stdin
			}
		} else if cfg.Kind == KindLong || cfg.Kind == KindJSONL {
			f, err = os.Open(p)
			if err != nil {
				if !badInput(p, err) {
					return nil
				}
				continue
			}
			r = bufio.NewReaderSize(f, 1<<16)
		}
		var ok bool
		switch cfg.Kind {
		case KindLong:
			ok = streamTables(ctx, name, cfg, emit, badInput, r, true)
		case KindJSONL:
			ok = streamTables(ctx, name, cfg, emit, badInput, r, false)
		default:
			var t *dataset.Table
			if p == "-" {
				data, rerr := io.ReadAll(r)
				if rerr != nil {
					return rerr
				}
				t, err = dataset.Parse(name, data, dataset.OptionsFor(cfg.Settings))
			} else {
				t, err = dataset.ReadFile(p, dataset.OptionsFor(cfg.Settings))
			}
			if err != nil {
				ok = badInput(name, err)
			} else {
				ok = emitTable(name, t, cfg, emit)
			}
		}
		if f != nil {
			f.Close()
		}
		if !ok {
			return nil
		}
	}
	return nil
}

// streamTables reads one-series tables from a long or JSON Lines stream.
func streamTables(ctx context.Context, name string, cfg Config, emit func(task) bool, bad func(string, error) bool, r io.Reader, long bool) bool {
	var next func() (*dataset.Table, error)
	if long {
		lo := cfg.Long
		if lo.DateFormat == "" {
			lo.DateFormat = cfg.Settings.DateFormat
		}
		lr, err := dataset.NewLongReader(r, lo)
		if err != nil {
			return bad(name, err)
		}
		next = lr.Next
	} else {
		jr := dataset.NewJSONLReader(r)
		jr.DateFormat = cfg.Settings.DateFormat
		next = jr.Next
	}
	for ctx.Err() == nil {
		t, err := next()
		if err == io.EOF {
			return true
		}
		if err != nil {
			// A bad record: report it as a failed series named after the
			// record, and go on with the next one.
			id := recordName(err)
			if !emit(task{source: name, in: dataset.Series{Name: id}, fail: err}) {
				return false
			}
			var pe *dataset.ParseError
			if !errors.As(err, &pe) {
				return true // the stream itself failed: stop this input
			}
			continue
		}
		if !emitTable(name, t, cfg, emit) {
			return false
		}
	}
	return false
}

func recordName(err error) string {
	var pe *dataset.ParseError
	if errors.As(err, &pe) && pe.ID != "" {
		return pe.ID
	}
	if errors.As(err, &pe) && pe.Row > 0 {
		return fmt.Sprintf("line %d", pe.Row)
	}
	return "input"
}

// emitTable selects the series of t (columns, sample, transform) and emits them.
func emitTable(source string, t *dataset.Table, cfg Config, emit func(task) bool) bool {
	prepared, errs := dataset.Select(t, cfg.Settings)
	failed := map[string]error{}
	for i := range errs {
		failed[errs[i].Series] = &errs[i]
	}
	byName := map[string]dataset.Series{}
	for _, p := range prepared {
		byName[p.Name] = p
	}
	for _, pe := range t.Skipped {
		if !emit(task{source: source, freq: t.Frequency, notes: t.Notes, in: dataset.Series{Name: pe.ColumnName, Column: pe.Column}, fail: pe}) {
			return false
		}
	}
	for _, col := range t.Series {
		if p, ok := byName[col.Name]; ok {
			if !emit(task{source: source, freq: t.Frequency, notes: t.Notes, in: p}) {
				return false
			}
		} else if e, ok := failed[col.Name]; ok {
			if !emit(task{source: source, freq: t.Frequency, notes: t.Notes, in: dataset.Series{Name: col.Name, Notes: col.Notes}, fail: e}) {
				return false
			}
		}
	}
	return true
}

// expand replaces directories by their data files, in name order.
func expand(inputs []string) ([]string, error) {
	var out []string
	for _, in := range inputs {
		if in == "-" {
			out = append(out, in)
			continue
		}
		st, err := os.Stat(in)
		if err != nil || !st.IsDir() {
			// A file, or a path Stat cannot see into (missing paths were
			// refused by CheckInputs): reading it yields a failure record.
			out = append(out, in)
			continue
		}
		ents, err := os.ReadDir(in)
		if err != nil {
			return nil, err
		}
		for _, e := range ents {
			ext := strings.ToLower(filepath.Ext(e.Name()))
			if !e.IsDir() && (ext == ".csv" || ext == ".tsv" || ext == ".txt" || ext == ".xlsx" || ext == ".jsonl") {
				out = append(out, filepath.Join(in, e.Name()))
			}
		}
	}
	return out, nil
}

func lean(r *schema.Result) {
	r.Path = nil
	r.Sequence = nil
	if r.Surface != nil {
		r.Surface.Rows = nil
	}
}

// JSONLSink writes each record as one compact JSON line.
func JSONLSink(w io.Writer) Sink {
	return func(r Record) error {
		b, err := json.Marshal(r.Doc)
		if err != nil {
			return err
		}
		b = append(b, '\n')
		_, err = w.Write(b)
		return err
	}
}

// DoneIDs reads an existing JSON Lines output and returns the ids of the
// series it holds, and the byte length of its complete lines (a run killed
// mid-write can leave a partial last line, which the caller truncates).
func DoneIDs(r io.Reader) (map[string]bool, int64, error) {
	done := map[string]bool{}
	br := bufio.NewReaderSize(r, 1<<16)
	var good int64
	for {
		line, err := br.ReadBytes('\n')
		if len(line) > 0 && line[len(line)-1] == '\n' {
			var rec struct {
				Source *schema.Source `json:"source"`
				Series []struct {
					Name string `json:"name"`
				} `json:"series"`
			}
			if jerr := json.Unmarshal(bytes.TrimSpace(line), &rec); jerr == nil && rec.Source != nil && len(rec.Series) == 1 {
				done[ID(rec.Source.Name, rec.Series[0].Name)] = true
				good += int64(len(line))
			} else {
				return done, good, fmt.Errorf("resume: output line at byte %d is not a rootshift record", good)
			}
		}
		if err == io.EOF {
			return done, good, nil
		}
		if err != nil {
			return done, good, err
		}
	}
}
