package report

import (
	"bytes"
	"encoding/json"
	"io"

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
	var b []byte
	var err error
	sr = exportSeries(sr)
	if s.indent {
		b, err = json.MarshalIndent(sr, "    ", "  ")
	} else {
		b, err = json.Marshal(sr)
	}
	if err != nil {
		s.err = err
		return err
	}
	b = JSONHidden(b)
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
