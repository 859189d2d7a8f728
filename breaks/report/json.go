package report

import (
	"bytes"
	"encoding/json"
	"io"
	"math"
	"strconv"
	"sync"

	"github.com/rootshift/rootshift/core/schema"
)

// WriteJSON writes doc as exactly json.MarshalIndent(doc, "", "  ") followed
// by a newline: the v2 schema document, stable for diffs and golden files;
// the source is named by its base name and messages lose the folders of
// file paths (exportSource, exportSeries), and characters that hide or reorder text are
// written as \u escapes (JSONHidden). It streams: the series are encoded
// one at a time (see JSONStream), never the whole document at once.
// The error wraps ErrNoDocument, a *json.UnsupportedValueError (a NaN in a
// plain float field; pointer fields carry nil instead) or the writer's error.
func WriteJSON(w io.Writer, doc *schema.Document) error {
	return writeJSON(w, doc, true)
}

// WriteJSONCompact writes doc as exactly json.Marshal(doc) followed by a
// newline (one line), series by series.
func WriteJSONCompact(w io.Writer, doc *schema.Document) error {
	return writeJSON(w, doc, false)
}

func writeJSON(w io.Writer, doc *schema.Document, indent bool) error {
	if doc == nil {
		return ErrNoDocument
	}
	st, err := NewJSONStream(w, doc, indent)
	if err != nil {
		return err
	}
	for i := range doc.Series {
		if err := st.Series(&doc.Series[i]); err != nil {
			return err
		}
	}
	return st.Close()
}

// JSONStream writes one document series by series: NewJSONStream writes
// everything before the series array (from doc, whose Series are ignored),
// Series writes one element, Close the rest. The bytes equal
// json.MarshalIndent(doc, "", "  ") (indent) or json.Marshal(doc) (compact)
// of the document holding those series, as exported (exportSource, exportSeries: base name
// of the source, no folders in messages; JSONHidden: hidden characters as
// \u escapes), followed by a newline; memory is that of one series.
type JSONStream struct {
	w      io.Writer
	indent bool
	suffix []byte
	n      int
	err    error
}

// NewJSONStream starts a document on w.
func NewJSONStream(w io.Writer, doc *schema.Document, indent bool) (*JSONStream, error) {
	if doc == nil {
		return nil, ErrNoDocument
	}
	env := *doc
	env.Source = exportSource(doc.Source)
	env.Series = nil
	var b []byte
	var err error
	var mark []byte
	if indent {
		b, err = json.MarshalIndent(&env, "", "  ")
		mark = []byte("\n  \"series\": null")
	} else {
		b, err = json.Marshal(&env)
		mark = []byte("\"series\":null")
	}
	if err != nil {
		return nil, err
	}
	b = JSONHidden(b)
	// The marker cannot occur inside a string (quotes and newlines are
	// escaped there); the envelope has exactly one "series" member.
	i := bytes.Index(b, mark)
	if i < 0 {
		return nil, &json.UnsupportedValueError{Str: "document without a series member"}
	}
	cut := i + len(mark) - len("null")
	s := &JSONStream{w: w, indent: indent, suffix: append(append([]byte(nil), b[cut+len("null"):]...), '\n')}
	_, s.err = w.Write(b[:cut])
	return s, s.err
}

// Series writes one element of the series array.
func (s *JSONStream) Series(sr *schema.Series) error {
	if s.err != nil {
		return s.err
	}
	b, err := s.Encode(sr)
	if err != nil {
		s.err = err
		return err
	}
	return s.SeriesEncoded(b)
}

// Encode returns the bytes Series would write for sr (without the
// separator). It reads nothing of the stream but its indentation, so
// several goroutines may encode series at once and hand the bytes, in
// order, to SeriesEncoded.
func (s *JSONStream) Encode(sr *schema.Series) ([]byte, error) {
	sr = exportSeries(sr)
	if s.indent {
		b, err := json.MarshalIndent(sr, "    ", "  ")
		if err != nil {
			return nil, err
		}
		return JSONHidden(b), nil
	}
	return marshalSeries(sr)
}

// SeriesEncoded writes one element of the series array from the bytes of
// Encode. It takes b over: b must not be used afterwards (its storage may
// serve the next Encode).
func (s *JSONStream) SeriesEncoded(b []byte) error {
	defer putEncoded(b)
	if s.err != nil {
		return s.err
	}
	var sep string
	switch {
	case s.n == 0 && s.indent:
		sep = "[\n    "
	case s.n == 0:
		sep = "["
	case s.indent:
		sep = ",\n    "
	default:
		sep = ","
	}
	s.n++
	if _, s.err = io.WriteString(s.w, sep); s.err == nil {
		_, s.err = s.w.Write(b)
	}
	return s.err
}

// minFastPath is the shortest candidate path that marshalSeries writes by
// hand.
const minFastPath = 16

// marshalSeries is JSONHidden(json.Marshal(sr)) with the long candidate
// paths written by appendPath instead of by reflection, element by element
// (on a one-break search over 1,000 observations the path is most of the
// series' bytes and of its encoding time). Each long path is replaced by a
// one-point marker path whose index (math.MinInt64 + result number) no
// statistic's candidate can have, and the marker's bytes by the path's. A
// marker cannot be matched inside a string: encoding/json escapes the
// quotes there. A path with a non-finite statistic, which encoding/json
// refuses, is left to encoding/json for its error.
func marshalSeries(sr *schema.Series) ([]byte, error) {
	fast := 0
	for i := range sr.Results {
		if p := sr.Results[i].Path; len(p) >= minFastPath && finitePath(p) {
			fast++
		}
	}
	if fast == 0 {
		b, err := json.Marshal(sr)
		if err != nil {
			return nil, err
		}
		return JSONHidden(b), nil
	}
	cp := *sr
	cp.Results = append([]schema.Result(nil), sr.Results...)
	marks := make([]schema.PathPoint, len(cp.Results))
	replaced := make([]bool, len(cp.Results))
	size := 0
	for i := range cp.Results {
		r := &cp.Results[i]
		if len(r.Path) >= minFastPath && finitePath(r.Path) {
			marks[i] = schema.PathPoint{Index: math.MinInt64 + i}
			size += 48 * len(r.Path)
			r.Path = marks[i : i+1]
			replaced[i] = true
		}
	}
	b, err := json.Marshal(&cp)
	if err != nil {
		return nil, err
	}
	b = JSONHidden(b)
	out := getEncoded(len(b) + size)
	var mark []byte
	for i := range cp.Results {
		if !replaced[i] {
			continue
		}
		mark = appendPath(mark[:0], marks[i:i+1])
		j := bytes.Index(b, mark)
		if j < 0 {
			return nil, &json.UnsupportedValueError{Str: "candidate path marker not found"}
		}
		out = append(out, b[:j]...)
		out = appendPath(out, sr.Results[i].Path)
		b = b[j+len(mark):]
	}
	return append(out, b...), nil
}

// encodedPool keeps the buffers of marshalSeries that SeriesEncoded has
// written: a series with a long path is tens of kilobytes, and fresh
// buffers for every series cost page faults and collections.
var encodedPool sync.Pool

func getEncoded(n int) []byte {
	if p, ok := encodedPool.Get().(*[]byte); ok && cap(*p) >= n {
		return (*p)[:0]
	}
	return make([]byte, 0, n)
}

// putEncoded returns b to the pool when it is large enough to be worth
// keeping (small encodings come from encoding/json and are left to the
// collector).
func putEncoded(b []byte) {
	if cap(b) >= 1<<14 {
		b = b[:0]
		encodedPool.Put(&b)
	}
}

func finitePath(p []schema.PathPoint) bool {
	for _, q := range p {
		if math.IsInf(q.Statistic, 0) || math.IsNaN(q.Statistic) {
			return false
		}
	}
	return true
}

// appendPath appends ps as encoding/json writes a []schema.PathPoint
// (compact); every statistic must be finite.
func appendPath(b []byte, ps []schema.PathPoint) []byte {
	b = append(b, '[')
	for i, p := range ps {
		if i > 0 {
			b = append(b, ',')
		}
		b = append(b, `{"index":`...)
		b = strconv.AppendInt(b, int64(p.Index), 10)
		b = append(b, `,"statistic":`...)
		b = appendJSONFloat(b, p.Statistic)
		b = append(b, '}')
	}
	return append(b, ']')
}

// appendJSONFloat appends a finite float64 as encoding/json writes it
// (ES6 number formatting: shortest representation, exponent form below
// 1e-6 and from 1e21, exponent without a leading zero).
func appendJSONFloat(b []byte, f float64) []byte {
	abs := math.Abs(f)
	format := byte('f')
	if abs != 0 && (abs < 1e-6 || abs >= 1e21) {
		format = 'e'
	}
	b = strconv.AppendFloat(b, f, format, -1, 64)
	if format == 'e' {
		n := len(b)
		if n >= 4 && b[n-4] == 'e' && b[n-3] == '-' && b[n-2] == '0' {
			b[n-2] = b[n-1]
			b = b[:n-1]
		}
	}
	return b
}

// Close ends the series array and the document.
func (s *JSONStream) Close() error {
	if s.err != nil {
		return s.err
	}
	var end string
	switch {
	case s.n == 0:
		end = "[]"
	case s.indent:
		end = "\n  ]"
	default:
		end = "]"
	}
	if _, s.err = io.WriteString(s.w, end); s.err != nil {
		return s.err
	}
	_, s.err = s.w.Write(s.suffix)
	return s.err
}
