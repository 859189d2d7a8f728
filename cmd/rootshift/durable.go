package main

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"time"

	"github.com/rootshift/rootshift/breaks/batch"
	"github.com/rootshift/rootshift/breaks/report"
	"github.com/rootshift/rootshift/core/schema"
)

// outFile is an output file of batch: written in whole record groups,
// truncated back after a failed write, synced after each group.
type outFile interface {
	io.Writer
	Truncate(size int64) error
	Sync() error
	Close() error
}

// openOutFile opens an output file for appending (after truncating it when
// fresh). A variable so that tests can inject write failures.
var openOutFile = func(path string, fresh bool) (outFile, error) {
	flags := os.O_CREATE | os.O_WRONLY | os.O_APPEND
	if fresh {
		flags |= os.O_TRUNC
	}
	return os.OpenFile(path, flags, 0o644)
}

// target is one output stream of a batch run: the records, the summary CSV
// or the verdict CSV.
type target struct {
	name string
	w    io.Writer
	f    outFile // nil for standard output (cannot be truncated)
	off  int64   // bytes committed
	buf  bytes.Buffer
}

// groupWriter writes records to the targets in groups: each group is
// written to every target, then synced; a failed write truncates every
// target back to the end of the last whole group, so the files hold whole
// lines and agree with each other. Only committed records are counted.
type groupWriter struct {
	jsonl, csv, verdicts *target
	csvHeader, vHeader   bool
	pendingTested        int
	pendingFailed        int
	tested, failed       int
	groupBytes           int
	every                time.Duration
	last                 time.Time
	err                  error
}

func (g *groupWriter) targets() []*target {
	var ts []*target
	for _, t := range []*target{g.jsonl, g.csv, g.verdicts} {
		if t != nil {
			ts = append(ts, t)
		}
	}
	return ts
}

// add renders r into every target's buffer and flushes when the group is
// large or old enough.
func (g *groupWriter) add(r batch.Record) error {
	if g.err != nil {
		return g.err
	}
	b, err := jsonLine(r.Doc)
	if err != nil {
		return err
	}
	g.jsonl.buf.Write(b)
	if g.csv != nil {
		if err := csvRows(&g.csv.buf, r, !g.csvHeader); err != nil {
			return err
		}
		g.csvHeader = true
	}
	if g.verdicts != nil {
		if err := verdictRow(&g.verdicts.buf, r, !g.vHeader); err != nil {
			return err
		}
		g.vHeader = true
	}
	if len(r.Doc.Series[0].Errors) > 0 {
		g.pendingFailed++
	} else {
		g.pendingTested++
	}
	if g.jsonl.buf.Len() >= g.groupBytes || time.Since(g.last) >= g.every {
		return g.flush()
	}
	return nil
}

// flush writes the pending group to every target; on failure it truncates
// the files back to the last whole group and keeps the error.
func (g *groupWriter) flush() error {
	if g.err != nil {
		return g.err
	}
	g.last = time.Now()
	if g.pendingTested+g.pendingFailed == 0 {
		return nil
	}
	var werr error
	for _, t := range g.targets() {
		if _, err := t.w.Write(t.buf.Bytes()); err != nil {
			werr = fmt.Errorf("writing %s: %w", t.name, err)
			break
		}
		if t.f != nil {
			if err := t.f.Sync(); err != nil && !errors.Is(err, os.ErrInvalid) {
				werr = fmt.Errorf("syncing %s: %w", t.name, err)
				break
			}
		}
	}
	if werr != nil {
		for _, t := range g.targets() {
			if t.f != nil {
				if err := t.f.Truncate(t.off); err != nil {
					werr = fmt.Errorf("%v; removing the partial group from %s also failed: %v", werr, t.name, err)
				}
			} else {
				werr = fmt.Errorf("%v (%s may end with a partial record)", werr, t.name)
			}
		}
		g.err = werr
		return werr
	}
	for _, t := range g.targets() {
		t.off += int64(t.buf.Len())
		t.buf.Reset()
	}
	g.tested += g.pendingTested
	g.failed += g.pendingFailed
	g.pendingTested, g.pendingFailed = 0, 0
	return nil
}

// close flushes the last group and closes the files; the first error wins.
func (g *groupWriter) close() error {
	err := g.flush()
	for _, t := range g.targets() {
		if t.f != nil {
			if cerr := t.f.Close(); cerr != nil && err == nil {
				err = fmt.Errorf("closing %s: %w", t.name, cerr)
				g.tested, g.failed = 0, 0 // nothing is known to be on disk
			}
		}
	}
	return err
}

func jsonLine(doc *schema.Document) ([]byte, error) {
	// Not report.WriteJSONCompact: a record keeps the source path as given
	// (sharding ids, the side files rebuilt on resume), where an export
	// names the file by its base name.
	b, err := json.Marshal(doc)
	if err != nil {
		return nil, err
	}
	return append(b, '\n'), nil
}

// csvRows appends the summary CSV rows (the report's CSV format) of r,
// with the header when header is true.
func csvRows(w *bytes.Buffer, r batch.Record, header bool) error {
	var b bytes.Buffer
	if err := report.Write(&b, "csv", r.Doc, nil); err != nil {
		return err
	}
	data := b.Bytes()
	if !header {
		if i := bytes.IndexByte(data, '\n'); i >= 0 {
			data = data[i+1:]
		}
	}
	w.Write(data)
	return nil
}

// verdictRow appends one CSV row per series: id, series, n, class, order,
// transform, breaks, explanation, errors (with the header when asked).
func verdictRow(w *bytes.Buffer, r batch.Record, header bool) error {
	cw := csv.NewWriter(w)
	if header {
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

// recordOf rebuilds the side-file view of a stored record.
func recordOf(doc *schema.Document) batch.Record {
	return batch.Record{ID: batch.ID(doc.Source.Name, doc.Series[0].Name), Doc: doc}
}

// settingsDiff lists the settings that differ between a and b as
// "name: old -> new" lines (by their JSON names).
func settingsDiff(old, cur schema.Settings) []string {
	var a, b map[string]any
	ja, _ := json.Marshal(old)
	jb, _ := json.Marshal(cur)
	json.Unmarshal(ja, &a)
	json.Unmarshal(jb, &b)
	keys := map[string]bool{}
	for k := range a {
		keys[k] = true
	}
	for k := range b {
		keys[k] = true
	}
	var out []string
	names := make([]string, 0, len(keys))
	for k := range keys {
		names = append(names, k)
	}
	sort.Strings(names)
	for _, k := range names {
		x, _ := json.Marshal(a[k])
		y, _ := json.Marshal(b[k])
		if !bytes.Equal(x, y) {
			out = append(out, fmt.Sprintf("%s: %s in the output, %s now", k, x, y))
		}
	}
	return out
}

// sameFile reports whether a and b name the same file (by canonical path).
func sameFile(a, b string) bool { return batch.Canonical(a) == batch.Canonical(b) }

// inside reports whether the canonical path p lies inside directory dir.
func inside(p, dir string) bool {
	rel, err := filepath.Rel(dir, p)
	return err == nil && rel != "." && !strings.HasPrefix(rel, "..")
}
