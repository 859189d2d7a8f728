package main

import (
	"bufio"
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"sort"
	"strings"

	"github.com/rootshift/rootshift/breaks/batch"
)

const mergeUsage = `Usage: rootshift batch merge [options] PART... -o FILE

Joins the JSON Lines outputs of shard runs (batch --shard) into one file in
input order (by each record's source.index). Every input series must appear
exactly once: missing positions and series written more than once are listed
and nothing is written (exit status 1). All parts must hold records made with
the same settings. The series after the last one found cannot be known missing
unless --total gives the number of series read (any shard's summary line).

Exit status: 0 merged, 1 missing or duplicated series or mixed settings (no
output), 2 usage errors, 3 the output could not be written.`

// mergeLine is where one record lies in the parts.
type mergeLine struct {
	index  int
	part   int
	off    int64
	length int
	key    string
}

func (e *env) batchMerge(args []string) int {
	var out string
	var total int
	var quiet bool
	fs := newFlagSet("batch merge", e.stdout, mergeUsage)
	fs.StringVar(&out, "o", "", "merged output `file` (required)")
	fs.IntVar(&total, "total", 0, "number `N` of series read by each shard run: also detects missing series at the end")
	fs.BoolVar(&quiet, "quiet", false, "no summary on standard error")
	parts, err := parseInterleaved(fs, args)
	if err != nil {
		return e.usageExit(err)
	}
	if out == "" || len(parts) == 0 {
		return e.usageExit(errors.New("batch merge: want PART... and -o FILE"))
	}
	if total < 0 {
		return e.usageExit(fmt.Errorf("batch merge: --total %d: want a positive number", total))
	}
	files := make([]*os.File, len(parts))
	defer func() {
		for _, f := range files {
			if f != nil {
				f.Close()
			}
		}
	}()
	var lines []mergeLine
	var settings []byte
	settingsFrom := ""
	for pi, p := range parts {
		f, err := os.Open(p)
		if err != nil {
			return e.usageExit(fmt.Errorf("batch merge: %v", err))
		}
		files[pi] = f
		br := bufio.NewReaderSize(f, 1<<20)
		var off int64
		for n := 1; ; n++ {
			raw, rerr := br.ReadSlice('\n')
			if rerr == bufio.ErrBufferFull {
				// A long record: collect it whole.
				buf := append([]byte(nil), raw...)
				for rerr == bufio.ErrBufferFull {
					raw, rerr = br.ReadSlice('\n')
					buf = append(buf, raw...)
				}
				raw = buf
			}
			if len(raw) > 0 {
				if raw[len(raw)-1] != '\n' {
					e.errorf("batch merge: %s: line %d is incomplete (an interrupted run? resume it first)", p, n)
					return exitFailed
				}
				rec, err := recordHead(raw)
				if err != nil {
					e.errorf("batch merge: %s: line %d is not a rootshift batch record (%v)", p, n, err)
					return exitUsage
				}
				if rec.Source.Index < 1 {
					e.errorf("batch merge: %s: line %d has no source.index (written by an older version): rerun that shard", p, n)
					return exitUsage
				}
				if settings == nil {
					settings, settingsFrom = append([]byte(nil), rec.Settings...), p
				} else if !bytes.Equal(settings, rec.Settings) {
					e.errorf("batch merge: %s line %d was made with other settings than %s:\n  %s\n  %s", p, n, settingsFrom, rec.Settings, settings)
					return exitFailed
				}
				path := rec.Source.Path
				if path == "" {
					path = rec.Source.Name
				}
				lines = append(lines, mergeLine{index: rec.Source.Index, part: pi, off: off, length: len(raw), key: batch.Key(path, rec.Name)})
				off += int64(len(raw))
			}
			if rerr == io.EOF {
				break
			}
			if rerr != nil {
				e.errorf("batch merge: %s: %v", p, rerr)
				return exitFailed
			}
		}
	}
	sort.SliceStable(lines, func(i, j int) bool { return lines[i].index < lines[j].index })
	// Every position once, every series once.
	var dups, missing []string
	seenKey := make(map[string]int, len(lines))
	last := 0
	for i, l := range lines {
		if i > 0 && l.index == lines[i-1].index {
			dups = append(dups, fmt.Sprintf("series %d (%s) in %s and %s", l.index, l.key, parts[lines[i-1].part], parts[l.part]))
			continue
		}
		if j, ok := seenKey[l.key]; ok {
			dups = append(dups, fmt.Sprintf("%s at positions %d and %d", l.key, j, l.index))
		}
		seenKey[l.key] = l.index
		for k := last + 1; k < l.index; k++ {
			missing = append(missing, fmt.Sprint(k))
		}
		last = l.index
	}
	if total > 0 {
		if last > total {
			dups = append(dups, fmt.Sprintf("positions up to %d, beyond --total %d", last, total))
		}
		for k := last + 1; k <= total; k++ {
			missing = append(missing, fmt.Sprint(k))
		}
	}
	if len(dups) > 0 || len(missing) > 0 {
		if len(missing) > 0 {
			e.errorf("batch merge: %d series missing (positions in the input): %s", len(missing), abbreviate(missing, 20))
		}
		if len(dups) > 0 {
			e.errorf("batch merge: %d series written more than once: %s", len(dups), abbreviate(dups, 20))
		}
		e.errorf("batch merge: nothing written")
		return exitFailed
	}
	// Write to a temporary file beside the output, then rename: a part may
	// be the output itself.
	tmp, err := os.CreateTemp(filepath.Dir(out), "."+filepath.Base(out)+".tmp*")
	if err != nil {
		e.errorf("batch merge: %v", err)
		return exitOutput
	}
	bw := bufio.NewWriterSize(tmp, 1<<20)
	buf := make([]byte, 0, 1<<16)
	var werr error
	for _, l := range lines {
		if cap(buf) < l.length {
			buf = make([]byte, l.length)
		}
		b := buf[:l.length]
		if _, err := files[l.part].ReadAt(b, l.off); err != nil {
			werr = fmt.Errorf("%s: %v", parts[l.part], err)
			break
		}
		if _, err := bw.Write(b); err != nil {
			werr = err
			break
		}
	}
	if werr == nil {
		werr = bw.Flush()
	}
	if werr == nil {
		werr = tmp.Sync()
	}
	if cerr := tmp.Close(); werr == nil {
		werr = cerr
	}
	if werr == nil {
		werr = os.Rename(tmp.Name(), out)
	}
	if werr != nil {
		os.Remove(tmp.Name())
		e.errorf("batch merge: %v", werr)
		return exitOutput
	}
	if !quiet {
		fmt.Fprintf(e.stderr, "rootshift: merged %d records from %d parts into %s, in input order\n", len(lines), len(parts), out)
	}
	return exitOK
}

func abbreviate(list []string, n int) string {
	if len(list) <= n {
		return strings.Join(list, ", ")
	}
	return strings.Join(list[:n], ", ") + fmt.Sprintf(", ... (%d more)", len(list)-n)
}

// head is what merge needs of a record: its settings, source and series
// name.
type head struct {
	Settings json.RawMessage
	Source   struct {
		Name  string `json:"name"`
		Path  string `json:"path"`
		Index int    `json:"index"`
	}
	Name string
}

// recordHead reads the members of a batch record up to its series' name,
// without decoding the results that follow (most of the record).
func recordHead(raw []byte) (head, error) {
	var h head
	dec := json.NewDecoder(bytes.NewReader(raw))
	if t, err := dec.Token(); err != nil || t != json.Delim('{') {
		return h, errors.New("not a JSON object")
	}
	var schemaID string
	haveSource := false
	for dec.More() {
		t, err := dec.Token()
		if err != nil {
			return h, err
		}
		key, _ := t.(string)
		switch key {
		case "schema":
			err = dec.Decode(&schemaID)
		case "settings":
			err = dec.Decode(&h.Settings)
		case "source":
			err = dec.Decode(&h.Source)
			haveSource = true
		case "series":
			if !strings.HasPrefix(schemaID, "rootshift.results/") || !haveSource {
				return h, errors.New("no schema marker or no source before the series")
			}
			if t, err := dec.Token(); err != nil || t != json.Delim('[') {
				return h, errors.New("series is not an array")
			}
			if t, err := dec.Token(); err != nil || t != json.Delim('{') {
				return h, errors.New("no series")
			}
			for dec.More() {
				t, err := dec.Token()
				if err != nil {
					return h, err
				}
				if t == "name" {
					err := dec.Decode(&h.Name)
					return h, err
				}
				var skip json.RawMessage
				if err := dec.Decode(&skip); err != nil {
					return h, err
				}
			}
			return h, errors.New("series without a name")
		default:
			var skip json.RawMessage
			err = dec.Decode(&skip)
		}
		if err != nil {
			return h, err
		}
	}
	return h, errors.New("no series")
}
