package batch

import (
	"bufio"
	"bytes"
	"context"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"hash/fnv"
	"io"
	"io/fs"
	"os"
	"path/filepath"
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
	// Skip holds the series already done (resume): keys (Key, canonical
	// path) or, for records of earlier versions, ids (ID, path as given).
	Skip map[string]bool
	// Cache reuses simulated null distributions across series.
	Cache *battery.DistCache
	// Progress is called with the running summary after each series (then
	// Current.Stage is empty) and as the series in work advance (Current
	// holds the latest test or simulation step, with Current.Index the
	// series' position in reading order). Calls are serialised.
	Progress func(Summary)
	// Stdin is read for the input "-".
	Stdin io.Reader
	// Exclude lists canonical paths (see Canonical) never read as inputs:
	// the run's own output files. A directory input skips them by name; an
	// explicit input among them is skipped with a note.
	Exclude []string
	// Note receives one line per input skipped without a record: a
	// non-regular file (pipe, socket, device), an output of this tool
	// (recognised by its schema marker) or an excluded output path.
	Note func(string)
	// MaxObs fails, alone, a series longer than this many observations
	// (0: DefaultMaxObs; negative: no limit). It bounds the memory and time
	// one series may take; the batch goes on with the next.
	MaxObs int
	// CompactArrays writes candidate paths and surface rows as compact
	// runs (see CompactArrays).
	CompactArrays bool
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
	// The reading position, for an estimate of the series still to come:
	// InputBytes is the size of every input file (Sized is false when some
	// input has no size known in advance, such as standard input or a
	// pipe), BytesRead how much of them the series read so far came from,
	// and ReadAll is set once every input has been read (Read is then the
	// number of series in the run).
	InputBytes, BytesRead int64 `json:"-"`
	Sized, ReadAll        bool  `json:"-"`
	// Current is the latest step of a series in work (progress calls
	// only; see Config.Progress).
	Current battery.Progress `json:"-"`
	// Last is the reading index (from 1) of the series just written, in a
	// progress call after a series.
	Last int `json:"-"`
}

// Pending estimates the series still to test or fail: exact once every
// input is read; before, the series read so far scaled by the share of
// the input bytes they came from; -1 when no estimate is possible yet.
func (s Summary) Pending() int {
	done := s.Tested + s.Failed
	switch {
	case s.ReadAll:
		return max(0, s.Read-s.Skipped-done)
	case !s.Sized || s.BytesRead <= 0 || s.InputBytes <= 0 || s.Read == 0:
		return -1
	}
	total := float64(s.Read-s.Skipped) * float64(s.InputBytes) / float64(s.BytesRead)
	return max(0, int(total+0.5)-done, s.Read-s.Skipped-done)
}

// DefaultMaxObs is the default Config.MaxObs: about 1 GB and several
// minutes for the default battery on one series (measured on 2 cores;
// README "Batch runs").
const DefaultMaxObs = 200_000

// ErrTooLong is wrapped by the error of a series longer than Config.MaxObs.
var ErrTooLong = errors.New("series too long for the configured limit")

// Record is one output line, written by Sink.
type Record struct {
	ID string
	// Key identifies the series for resume: the input's canonical path (or
	// "stdin") and the series name (see Key).
	Key string
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

// ID returns the series id used for sharding and in the side files: the
// input path as given and the series name.
func ID(source, name string) string { return source + ":" + name }

// Key returns the series key used for resume: the input's canonical path
// (Canonical) and the series name. The same file named by an absolute or a
// relative path, or through a symbolic link, gives the same key.
func Key(canonicalPath, name string) string { return canonicalPath + ":" + name }

// Canonical returns the absolute path of p with symbolic links resolved
// (the absolute path alone when p does not exist); "-" stays "-".
func Canonical(p string) string {
	if p == "-" {
		return p
	}
	a, err := filepath.Abs(p)
	if err != nil {
		return p
	}
	if r, err := filepath.EvalSymlinks(a); err == nil {
		return r
	}
	return a
}

// Fingerprint returns "sha256:" and the hex SHA-256 of data.
func Fingerprint(data []byte) string {
	h := sha256.Sum256(data)
	return "sha256:" + hex.EncodeToString(h[:])
}

// FingerprintFile returns the fingerprint of the file at path, read in a
// streaming pass.
func FingerprintFile(path string) (string, error) {
	f, err := os.Open(path)
	if err != nil {
		return "", err
	}
	defer f.Close()
	h := sha256.New()
	if _, err := io.Copy(h, f); err != nil {
		return "", err
	}
	return "sha256:" + hex.EncodeToString(h.Sum(nil)), nil
}

// IsOwnOutput reports whether head, the first bytes of a file, carries the
// schema marker of a rootshift document (a record of a previous run).
func IsOwnOutput(head []byte) bool {
	if len(head) > 4096 {
		head = head[:4096]
	}
	return bytes.Contains(head, []byte(`"schema":"rootshift.`)) || bytes.Contains(head, []byte(`"schema": "rootshift.`))
}

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
	index  int // 1-based position among every series read
	source string
	path   string // canonical path ("stdin" for standard input)
	fp     string
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
	var sum Summary
	var sumMu sync.Mutex
	prod := func(ctx context.Context, emit func(task) bool) error {
		return produce(ctx, cfg, func(t task) bool {
			id := ID(t.source, t.in.Name)
			sumMu.Lock()
			sum.Read++
			t.index = sum.Read
			// Records of earlier versions carry no canonical path: they
			// match by the path as given (ID).
			skip := !InShard(id, cfg.Shard, cfg.Shards) || cfg.Skip[Key(t.path, t.in.Name)] || cfg.Skip[id]
			if skip {
				sum.Skipped++
			}
			sumMu.Unlock()
			return skip || emit(t)
		}, &sum, &sumMu)
	}
	opt := &battery.Options{Cache: cfg.Cache, Workers: 1}
	var progMu sync.Mutex // serialises cfg.Progress
	report := func(cur battery.Progress, last int) {
		sumMu.Lock()
		s := sum
		sumMu.Unlock()
		s.Current, s.Last, s.Elapsed = cur, last, time.Since(start)
		progMu.Lock()
		cfg.Progress(s)
		progMu.Unlock()
	}
	maxObs := cfg.MaxObs
	if maxObs == 0 {
		maxObs = DefaultMaxObs
	}
	work := func(ctx context.Context, t task) (Record, error) {
		doc := battery.NewDocument(cfg.Settings)
		doc.Source = &schema.Source{Name: t.source, Rows: len(t.in.Values), Frequency: t.freq, Notes: battery.SchemaNotes(t.notes), Fingerprint: t.fp, Index: t.index}
		if t.path != "stdin" {
			doc.Source.Path = t.path
		}
		if t.fail == nil && maxObs > 0 && len(t.in.Values) > maxObs {
			t.fail = &dataset.SeriesError{Series: t.in.Name, Err: fmt.Errorf("%w: %d observations, the limit is %d (raise it with --max-obs)", ErrTooLong, len(t.in.Values), maxObs)}
			t.in.Values, t.in.Dates = nil, nil
		}
		var sr schema.Series
		if t.fail != nil {
			sr = battery.FailedSeries(t.in.Name, t.freq, cfg.Settings, t.fail)
			sr.Notes = battery.SchemaNotes(t.in.Notes)
		} else {
			topt := opt
			if cfg.Progress != nil {
				o := *opt
				index := t.index
				o.Progress = func(p battery.Progress) {
					p.Index = index
					report(p, 0)
				}
				topt = &o
			}
			var err error
			sr, err = AnalyzeSeries(ctx, t.in, cfg.Settings, topt)
			if err != nil {
				return Record{}, err
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
		if cfg.CompactArrays {
			CompactArrays(&sr)
		}
		doc.Series = []schema.Series{sr}
		return Record{ID: ID(t.source, t.in.Name), Key: Key(t.path, t.in.Name), Doc: doc, Input: t.in}, nil
	}
	write := func(r Record) error {
		if err := sink(r); err != nil {
			return err
		}
		index := 0
		if r.Doc.Source != nil {
			index = r.Doc.Source.Index
		}
		sumMu.Lock()
		if len(r.Doc.Series[0].Errors) > 0 {
			sum.Failed++
		} else {
			sum.Tested++
		}
		sumMu.Unlock()
		if cfg.Progress != nil {
			report(battery.Progress{}, index)
		}
		return nil
	}
	err := Pool(ctx, cfg.Jobs, cfg.Completed, prod, work, write)
	sum.Elapsed = time.Since(start)
	if cerr := ctx.Err(); cerr != nil && (err == nil || errors.Is(err, core.ErrCancelled) || errors.Is(err, context.Canceled)) {
		return sum, fmt.Errorf("%w: %v", core.ErrCancelled, cerr)
	}
	return sum, err
}

// produce reads the inputs in order and emits one task per series (or per
// unreadable input). It returns only for cancellation or standard-input
// errors; unreadable files become failure records.
func produce(ctx context.Context, cfg Config, emit func(task) bool, sum *Summary, mu *sync.Mutex) error {
	note := cfg.Note
	if note == nil {
		note = func(string) {}
	}
	paths, err := Expand(cfg.Inputs, cfg.Exclude, note)
	if err != nil {
		return err
	}
	sizes := make([]int64, len(paths))
	sized := true
	var total int64
	for i, p := range paths {
		st, err := os.Stat(p)
		if p == "-" || err != nil || !st.Mode().IsRegular() {
			sized = false
			continue
		}
		sizes[i] = st.Size()
		total += st.Size()
	}
	mu.Lock()
	sum.InputBytes, sum.Sized = total, sized
	mu.Unlock()
	var base int64 // bytes of the inputs read in full
	for i, p := range paths {
		if ctx.Err() != nil {
			return nil
		}
		// at records how far into this input the series emitted come from.
		at := func(n int64) {
			mu.Lock()
			sum.BytesRead = base + min(n, sizes[i])
			mu.Unlock()
		}
		name, canon, fp := p, Canonical(p), ""
		badInput := func(err error) bool {
			mu.Lock()
			sum.BadInputs++
			mu.Unlock()
			return emit(task{source: name, path: canon, fp: fp, in: dataset.Series{Name: filepath.Base(name)}, fail: err})
		}
		var counted *countingReader // long and JSON Lines files: bytes consumed
		emitT := func(t task) bool {
			t.path, t.fp = canon, fp
			if counted != nil {
				at(counted.n)
			}
			return emit(t)
		}
		var r io.Reader
		var f *os.File
		var data []byte
		stream := cfg.Kind != KindLong && cfg.Kind != KindJSONL && Streamable(p, cfg.Settings)
		if p == "-" {
			r, name, canon = cfg.Stdin, "stdin", "stdin"
			if r == nil {
				r = os.Stdin
			}
		} else {
			if cfg.Kind == KindLong || cfg.Kind == KindJSONL {
				// A streaming pass for the fingerprint, then the reading pass:
				// memory stays bounded by the series in flight.
				fp, err = FingerprintFile(p)
				if err == nil {
					f, err = os.Open(p)
				}
				if err == nil {
					counted = &countingReader{r: f}
					br := bufio.NewReaderSize(counted, 1<<16)
					head, _ := br.Peek(4096)
					if IsOwnOutput(head) {
						f.Close()
						note(fmt.Sprintf("%s: skipped, it is an output of rootshift (schema marker)", p))
						continue
					}
					r = br
				}
			} else if stream {
				// Selected columns: a streaming pass for the fingerprint, the
				// reading passes below keep only those columns.
				fp, err = FingerprintFile(p)
				if err == nil {
					var head []byte
					if head, err = readHead(p, 4096); err == nil && IsOwnOutput(head) {
						note(fmt.Sprintf("%s: skipped, it is an output of rootshift (schema marker)", p))
						continue
					}
				}
			} else {
				data, err = os.ReadFile(p)
				if err == nil {
					fp = Fingerprint(data)
					if IsOwnOutput(data) {
						note(fmt.Sprintf("%s: skipped, it is an output of rootshift (schema marker)", p))
						continue
					}
				}
			}
			if err != nil {
				if !badInput(err) {
					return nil
				}
				continue
			}
		}
		var ok bool
		switch cfg.Kind {
		case KindLong:
			ok = streamTables(ctx, name, cfg, emitT, badInput, r, true)
		case KindJSONL:
			ok = streamTables(ctx, name, cfg, emitT, badInput, r, false)
		default:
			if p == "-" {
				var rerr error
				data, rerr = io.ReadAll(r)
				if rerr != nil {
					return rerr
				}
			}
			var t *dataset.Table
			opt := dataset.OptionsFor(cfg.Settings)
			if stream {
				t, err = ReadSelected(filepath.Base(p), p, cfg.Settings)
			} else if p != "-" && strings.EqualFold(filepath.Ext(p), ".xlsx") {
				t, err = dataset.ReadXLSX(filepath.Base(p), data, opt)
			} else {
				base := name
				if p != "-" {
					base = filepath.Base(p)
				}
				t, err = dataset.Parse(base, data, opt)
			}
			data = nil
			if err != nil {
				ok = badInput(err)
			} else {
				// A wide file is read at once: its series count for equal
				// shares of its size.
				n, k := max(1, len(t.Skipped)+len(t.Series)), 0
				ok = emitTable(name, t, cfg, func(t task) bool {
					k++
					at(sizes[i] * int64(k) / int64(n))
					return emitT(t)
				})
			}
		}
		if f != nil {
			f.Close()
		}
		if !ok {
			return nil
		}
		base += sizes[i]
		at(0)
	}
	mu.Lock()
	sum.ReadAll = ctx.Err() == nil
	mu.Unlock()
	return nil
}

// countingReader counts the bytes read through it.
type countingReader struct {
	r io.Reader
	n int64
}

func (c *countingReader) Read(p []byte) (int, error) {
	n, err := c.r.Read(p)
	c.n += int64(n)
	return n, err
}

// streamTables reads one-series tables from a long or JSON Lines stream.
func streamTables(ctx context.Context, name string, cfg Config, emit func(task) bool, bad func(error) bool, r io.Reader, long bool) bool {
	var next func() (*dataset.Table, error)
	if long {
		lo := cfg.Long
		if lo.DateFormat == "" {
			lo.DateFormat = cfg.Settings.DateFormat
		}
		lr, err := dataset.NewLongReader(r, lo)
		if err != nil {
			return bad(err)
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

// Expand replaces directories by their data files (.csv, .tsv, .txt,
// .xlsx, .jsonl), in name order. It leaves out, with a note: paths whose
// canonical form is in exclude (the run's own outputs), and non-regular
// files in a directory (named pipes, sockets, devices), which could block
// the run or never end; a pipe or character device named explicitly (such
// as /dev/fd/N from a shell's process substitution) is read, a socket is
// not. A path that cannot be examined stays in the list: reading it yields
// a failure record.
func Expand(inputs, exclude []string, note func(string)) ([]string, error) {
	if note == nil {
		note = func(string) {}
	}
	excluded := func(p string) bool {
		if len(exclude) == 0 {
			return false
		}
		c := Canonical(p)
		for _, x := range exclude {
			if c == x {
				return true
			}
		}
		return false
	}
	keep := func(p string, st fs.FileInfo) bool {
		switch {
		case excluded(p):
			note(fmt.Sprintf("%s: skipped, it is an output of this run", p))
			return false
		case !st.Mode().IsRegular():
			note(fmt.Sprintf("%s: skipped, not a regular file (%s)", p, kindOf(st.Mode())))
			return false
		}
		return true
	}
	var out []string
	for _, in := range inputs {
		if in == "-" {
			out = append(out, in)
			continue
		}
		st, err := os.Stat(in)
		if err != nil {
			// A path Stat cannot see into (missing paths were refused by
			// CheckInputs): reading it yields a failure record.
			out = append(out, in)
			continue
		}
		if !st.IsDir() {
			// A pipe or a character device named explicitly is read: the
			// user asked for it ("batch <(command)" passes /dev/fd/N).
			// Sockets cannot be read as files.
			m := st.Mode()
			if named := m&fs.ModeNamedPipe != 0 || m&fs.ModeCharDevice != 0; named && !excluded(in) {
				out = append(out, in)
			} else if keep(in, st) {
				out = append(out, in)
			}
			continue
		}
		ents, err := os.ReadDir(in)
		if err != nil {
			return nil, err
		}
		for _, e := range ents {
			ext := strings.ToLower(filepath.Ext(e.Name()))
			if e.IsDir() || !(ext == ".csv" || ext == ".tsv" || ext == ".txt" || ext == ".xlsx" || ext == ".jsonl") {
				continue
			}
			p := filepath.Join(in, e.Name())
			st, err := os.Stat(p)
			if err != nil {
				out = append(out, p)
				continue
			}
			if !st.IsDir() && keep(p, st) {
				out = append(out, p)
			}
		}
	}
	return out, nil
}

func kindOf(m fs.FileMode) string {
	switch {
	case m&fs.ModeNamedPipe != 0:
		return "a named pipe"
	case m&fs.ModeSocket != 0:
		return "a socket"
	case m&fs.ModeDevice != 0 || m&fs.ModeCharDevice != 0:
		return "a device"
	}
	return "special file"
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

// DoneIDs reads an existing JSON Lines output and returns the keys (Key;
// records without a path use the source name) of the series it holds, and
// the byte length of its complete lines (a run killed mid-write can leave a
// partial last line, which the caller truncates).
func DoneIDs(r io.Reader) (map[string]bool, int64, error) {
	ex, err := ReadExisting(r, nil)
	return ex.Keys, ex.Good, err
}

// Existing describes the records already in an output file.
type Existing struct {
	// Keys of the series held (Key).
	Keys map[string]bool
	// Good is the byte length of the complete, valid lines.
	Good int64
	// Records is the number of complete records.
	Records int
	// Settings of the first record (nil for an empty file).
	Settings *schema.Settings
	// Fingerprints maps each input's canonical path to the fingerprint its
	// records carry.
	Fingerprints map[string]string
}

// ReadExisting reads an existing JSON Lines output (see DoneIDs). Each
// complete line is passed to line, when not nil, with its parsed document.
func ReadExisting(r io.Reader, line func(raw []byte, doc *schema.Document) error) (Existing, error) {
	ex := Existing{Keys: map[string]bool{}, Fingerprints: map[string]string{}}
	br := bufio.NewReaderSize(r, 1<<16)
	for {
		raw, err := br.ReadBytes('\n')
		if len(raw) > 0 && raw[len(raw)-1] == '\n' {
			var doc schema.Document
			if jerr := json.Unmarshal(bytes.TrimSpace(raw), &doc); jerr != nil || doc.Source == nil || len(doc.Series) != 1 || !strings.HasPrefix(doc.Schema, "rootshift.results/") {
				return ex, fmt.Errorf("resume: output line at byte %d is not a rootshift record", ex.Good)
			}
			src := doc.Source
			path := src.Path
			if path == "" {
				path = src.Name
			}
			ex.Keys[Key(path, doc.Series[0].Name)] = true
			if src.Path != "" && src.Fingerprint != "" {
				ex.Fingerprints[src.Path] = src.Fingerprint
			}
			if ex.Settings == nil {
				st := doc.Settings
				ex.Settings = &st
			}
			if line != nil {
				if err := line(raw, &doc); err != nil {
					return ex, err
				}
			}
			ex.Good += int64(len(raw))
			ex.Records++
		}
		if err == io.EOF {
			return ex, nil
		}
		if err != nil {
			return ex, err
		}
	}
}
