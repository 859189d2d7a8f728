package battery

import (
	"bytes"
	"context"
	"errors"
	"io"
	"slices"
	"strconv"
	"strings"

	"github.com/rootshift/rootshift/core/dataset"
	"github.com/rootshift/rootshift/core/schema"
)

// ReadLong reads a long table (one row per series id, date and value) into
// one single-series Table per id, in the file's order. A bad record of one
// id (a bad number or date) does not stop the reading: it is returned in
// failed, keyed by its id, and the other ids are read.
func ReadLong(name string, data []byte, s schema.Settings) (tables []*dataset.Table, failed []FailedID, err error) {
	lc := schema.LongColumns{}
	if s.Long != nil {
		lc = *s.Long
	}
	lr, err := dataset.NewLongReader(bytes.NewReader(data), dataset.LongOptions{ID: lc.ID, Date: lc.Date, Value: lc.Value, DateFormat: s.DateFormat, Name: name})
	if err != nil {
		return nil, nil, err
	}
	for {
		t, err := lr.Next()
		if err == io.EOF {
			return tables, failed, nil
		}
		var pe *dataset.ParseError
		if err != nil && errors.As(err, &pe) && pe.ID != "" {
			failed = append(failed, FailedID{ID: pe.ID, Err: err})
			continue
		}
		if err != nil {
			return nil, nil, err
		}
		tables = append(tables, t)
	}
}

// FailedID is an id of a long table whose records could not be read.
type FailedID struct {
	ID  string
	Err error
}

// analyzeLong is AnalyzeText for a long table: each id is analysed as its
// own series (with its own dates) and the documents are merged in the
// file's order; settings.columns picks ids.
func analyzeLong(ctx context.Context, name string, data []byte, s schema.Settings, opt *Options) (*schema.Document, []dataset.Series, error) {
	tables, failed, err := ReadLong(name, data, s)
	if err != nil {
		return nil, nil, err
	}
	pick := func(id string) bool { return len(s.Columns) == 0 || slices.Contains(s.Columns, id) }
	for _, c := range s.Columns {
		found := slices.ContainsFunc(tables, func(t *dataset.Table) bool { return len(t.Series) > 0 && t.Series[0].Name == c }) ||
			slices.ContainsFunc(failed, func(f FailedID) bool { return f.ID == c })
		if !found {
			return nil, nil, &UsageError{Field: "columns", Err: errors.New("no id " + quote(c) + " in the long table")}
		}
	}
	one := s
	one.Columns = nil
	doc := NewDocument(s)
	doc.Source = &schema.Source{Name: name}
	var inputs []dataset.Series
	for _, t := range tables {
		if len(t.Series) == 0 || !pick(t.Series[0].Name) {
			continue
		}
		d, in, err := Analyze(ctx, t, one, opt)
		if err != nil {
			return nil, nil, err
		}
		if doc.Source.Rows == 0 {
			doc.Source.DateColumn, doc.Source.Frequency = d.Source.DateColumn, d.Source.Frequency
		}
		doc.Source.Rows += d.Source.Rows
		for _, n := range d.Source.Notes {
			if !slices.ContainsFunc(doc.Source.Notes, func(m schema.Note) bool { return m.Kind == n.Kind && m.Message == n.Message }) {
				doc.Source.Notes = append(doc.Source.Notes, n)
			}
		}
		doc.Series = append(doc.Series, d.Series...)
		inputs = append(inputs, in...)
	}
	for _, f := range failed {
		if pick(f.ID) {
			doc.Series = append(doc.Series, FailedSeries(f.ID, "", s, f.Err))
			inputs = append(inputs, dataset.Series{Name: f.ID})
		}
	}
	return doc, inputs, nil
}

func quote(s string) string { return "\"" + s + "\"" }

// DetectLong looks at the start of data for a long table: a header with
// columns named id, date and value (ignoring case), or three columns of
// which one holds ids (text, in runs of equal values), one dates and one
// numbers. It returns the column names when the file then reads as a long
// table of at least two ids with at least 8 observations each, and nil
// otherwise. Nothing is decided for the user: the page offers the reading
// and the user confirms it.
func DetectLong(name string, data []byte, s schema.Settings) *schema.LongColumns {
	if strings.HasSuffix(strings.ToLower(name), ".xlsx") {
		return nil
	}
	sample := data[:min(len(data), 64<<10)]
	lines := strings.Split(strings.ReplaceAll(string(sample), "\r\n", "\n"), "\n")
	if len(lines) < 4 {
		return nil
	}
	delim := ","
	for _, d := range []string{"\t", ";", ","} {
		if strings.Count(lines[0], d) >= 2 {
			delim = d
			break
		}
	}
	head := strings.Split(lines[0], delim)
	for i := range head {
		head[i] = strings.Trim(strings.TrimSpace(head[i]), `"`)
	}
	try := func(lc schema.LongColumns) *schema.LongColumns {
		s2 := s
		s2.Long = &lc
		tables, _, err := ReadLong(name, data, s2)
		if err != nil || len(tables) < 2 {
			return nil
		}
		for _, t := range tables {
			if len(t.Series) != 1 || len(t.Series[0].Values) < 8 {
				return nil
			}
		}
		return &lc
	}
	has := func(n string) bool {
		return slices.ContainsFunc(head, func(h string) bool { return strings.EqualFold(h, n) })
	}
	if has("id") && has("value") {
		return try(schema.LongColumns{})
	}
	if len(head) != 3 {
		return nil
	}
	// Three columns: the ids come in runs (a value repeated on consecutive
	// rows, then another); the values are numbers; the dates are the rest.
	rows := [][]string{}
	for _, l := range lines[1:min(len(lines)-1, 400)] {
		if f := strings.Split(l, delim); len(f) == 3 {
			rows = append(rows, f)
		}
	}
	if len(rows) < 8 {
		return nil
	}
	numeric := func(j int) bool {
		for _, r := range rows {
			if _, err := strconv.ParseFloat(strings.TrimSpace(r[j]), 64); err != nil {
				return false
			}
		}
		return true
	}
	runs := func(j int) bool {
		changes := 0
		for i := 1; i < len(rows); i++ {
			if rows[i][j] != rows[i-1][j] {
				changes++
			}
		}
		return changes >= 1 && changes*4 < len(rows)
	}
	for id := 0; id < 3; id++ {
		if numeric(id) || !runs(id) {
			continue
		}
		for val := 0; val < 3; val++ {
			if val == id || !numeric(val) {
				continue
			}
			dt := 3 - id - val
			if lc := try(schema.LongColumns{ID: head[id], Date: head[dt], Value: head[val]}); lc != nil {
				return lc
			}
		}
	}
	return nil
}
