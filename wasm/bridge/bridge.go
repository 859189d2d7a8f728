package bridge

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"runtime/debug"
	"strings"
	"sync"

	"github.com/rootshift/rootshift/breaks/battery"
	"github.com/rootshift/rootshift/breaks/decide"
	"github.com/rootshift/rootshift/breaks/report"
	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/dataset"
	"github.com/rootshift/rootshift/core/schema"
)

// Error kinds of the envelope.
const (
	KindUsage     = "usage"     // the settings or the call are wrong
	KindInput     = "input"     // the data could not be read
	KindCancelled = "cancelled" // the work was cancelled
	KindInternal  = "internal"  // a bug: a recovered panic or an encoding failure
)

// Reply is the envelope every call returns (encoded as JSON).
type Reply struct {
	OK     bool            `json:"ok"`
	Result json.RawMessage `json:"result,omitempty"`
	Error  *ErrorInfo      `json:"error,omitempty"`
}

// ErrorInfo describes a failed call.
type ErrorInfo struct {
	Kind    string `json:"kind"`
	Message string `json:"message"`
}

// callError is an error with its envelope kind.
type callError struct {
	kind string
	err  error
}

func (e *callError) Error() string { return e.err.Error() }
func (e *callError) Unwrap() error { return e.err }

// usageErr marks err as a usage error.
func usageErr(format string, args ...any) error {
	return &callError{kind: KindUsage, err: fmt.Errorf(format, args...)}
}

// kindOf classifies err for the envelope.
func kindOf(err error) string {
	var ce *callError
	var ue *battery.UsageError
	var pe *dataset.ParseError
	switch {
	case errors.As(err, &ce):
		return ce.kind
	case errors.Is(err, core.ErrCancelled), errors.Is(err, context.Canceled), errors.Is(err, context.DeadlineExceeded):
		return KindCancelled
	case errors.As(err, &ue):
		return KindUsage
	case errors.As(err, &pe):
		return KindInput
	}
	return KindInput
}

// Call runs fn, recovers a panic into an internal error and encodes the
// envelope. fn returns either raw JSON (json.RawMessage), or any value that
// encoding/json can marshal.
func Call(fn func() (any, error)) (out string) {
	defer func() {
		if p := recover(); p != nil {
			out = encodeError(KindInternal, fmt.Sprintf("internal error (please report): %v\n%s", p, firstFrames(debug.Stack(), 12)))
		}
	}()
	v, err := fn()
	if err != nil {
		return encodeError(kindOf(err), err.Error())
	}
	var raw json.RawMessage
	if r, ok := v.(json.RawMessage); ok {
		raw = r
	} else {
		b, merr := json.Marshal(v)
		if merr != nil {
			return encodeError(KindInternal, "encoding the result: "+merr.Error())
		}
		raw = b
	}
	b, merr := json.Marshal(Reply{OK: true, Result: raw})
	if merr != nil {
		return encodeError(KindInternal, "encoding the result: "+merr.Error())
	}
	return string(b)
}

// firstFrames keeps the first n lines of a stack trace.
func firstFrames(stack []byte, n int) string {
	lines := strings.SplitN(string(stack), "\n", n+1)
	if len(lines) > n {
		lines = lines[:n]
	}
	return strings.Join(lines, "\n")
}

func encodeError(kind, msg string) string {
	b, err := json.Marshal(Reply{Error: &ErrorInfo{Kind: kind, Message: msg}})
	if err != nil { // cannot happen for two strings; keep the boundary safe anyway
		return `{"ok":false,"error":{"kind":"internal","message":"unencodable error"}}`
	}
	return string(b)
}

// DecodeSettings decodes the JSON settings object (the "settings" object of
// a schema v2 document). An empty text or "null" is the zero value (every
// default). Unknown fields and wrong types are usage errors, and so is
// anything battery.Validate rejects.
func DecodeSettings(text string) (schema.Settings, error) {
	var s schema.Settings
	text = strings.TrimSpace(text)
	if text == "" || text == "null" || text == "undefined" {
		return s, nil
	}
	dec := json.NewDecoder(strings.NewReader(text))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&s); err != nil {
		return schema.Settings{}, usageErr("settings: %v", err)
	}
	if dec.More() {
		return schema.Settings{}, usageErr("settings: trailing data after the settings object")
	}
	if err := battery.Validate(s); err != nil {
		return schema.Settings{}, &callError{kind: KindUsage, err: err}
	}
	return s, nil
}

// Session keeps the last analysis of one engine instance, for exports and
// plots. Its methods are safe for concurrent use.
type Session struct {
	mu     sync.Mutex
	doc    *schema.Document
	inputs []dataset.Series
	name   string
}

// NewSession returns an empty session.
func NewSession() *Session { return &Session{} }

// Analyze parses data (named name; .xlsx by extension), runs
// battery.AnalyzeText with the decoded settings and returns the envelope
// whose result is the schema v2 document, byte for byte the text that
// report.WriteJSON writes (compacted). progress may be nil.
func (s *Session) Analyze(ctx context.Context, name string, data []byte, settings string, progress func(battery.Progress)) string {
	return Call(func() (any, error) {
		st, err := DecodeSettings(settings)
		if err != nil {
			return nil, err
		}
		if name == "" {
			name = "pasted"
		}
		doc, inputs, err := battery.AnalyzeText(ctx, name, data, st, &battery.Options{Progress: progress})
		if err != nil {
			return nil, err
		}
		return s.keep(doc, inputs, name)
	})
}

// Export is what the export call returns: the report text, a file name and
// its media type.
type Export struct {
	Format   string `json:"format"`
	FileName string `json:"file_name"`
	MIME     string `json:"mime"`
	Text     string `json:"text"`
}

var exportTypes = map[string]struct{ ext, mime string }{
	"json":  {"json", "application/json"},
	"csv":   {"csv", "text/csv"},
	"md":    {"md", "text/markdown"},
	"latex": {"tex", "application/x-tex"},
	"html":  {"html", "text/html"},
	"table": {"txt", "text/plain"},
}

// Export writes the last analysis in format (one of report.Formats; "markdown"
// and "tex" are accepted) with report.Write.
func (s *Session) Export(format string) string {
	return Call(func() (any, error) {
		f := strings.ToLower(strings.TrimSpace(format))
		switch f {
		case "markdown":
			f = "md"
		case "tex":
			f = "latex"
		}
		t, ok := exportTypes[f]
		if !ok {
			return nil, usageErr("export: unknown format %q (want json, csv, md, latex, html or table)", format)
		}
		s.mu.Lock()
		doc, inputs, name := s.doc, s.inputs, s.name
		s.mu.Unlock()
		if doc == nil {
			return nil, usageErr("export: nothing analysed yet")
		}
		var b bytes.Buffer
		if err := report.Write(&b, f, doc, inputs); err != nil {
			return nil, &callError{kind: KindInternal, err: err}
		}
		return Export{Format: f, FileName: exportName(name) + "." + t.ext, MIME: t.mime, Text: b.String()}, nil
	})
}

// exportName derives a download file name from the input's name.
func exportName(name string) string {
	base := name
	if i := strings.LastIndexAny(base, `/\`); i >= 0 {
		base = base[i+1:]
	}
	if i := strings.LastIndexByte(base, '.'); i > 0 {
		base = base[:i]
	}
	var b strings.Builder
	for _, r := range base {
		switch {
		case r >= 'a' && r <= 'z', r >= 'A' && r <= 'Z', r >= '0' && r <= '9', r == '-', r == '_':
			b.WriteRune(r)
		default:
			b.WriteByte('-')
		}
	}
	if b.Len() == 0 {
		return "rootshift-findings"
	}
	return "rootshift-" + b.String()
}

// Plot is one drawing of a series.
type Plot struct {
	// Kind is "series", "acf" or "path".
	Kind string `json:"kind"`
	// Test is the test id, for path plots.
	Test  string `json:"test,omitempty"`
	Title string `json:"title"`
	SVG   string `json:"svg"`
}

// Plots draws series i (0-based, in document order) of the last analysis:
// the series with its breaks, episodes and window (report.SeriesPlot), its autocorrelations
// (report.ACFSVG) and every search path or sequence (report.PathSVG).
func (s *Session) Plots(i int) string {
	return Call(func() (any, error) {
		s.mu.Lock()
		doc, inputs := s.doc, s.inputs
		s.mu.Unlock()
		if doc == nil {
			return nil, usageErr("plots: nothing analysed yet")
		}
		if i < 0 || i >= len(doc.Series) {
			return nil, usageErr("plots: series %d out of range 0..%d", i, len(doc.Series)-1)
		}
		sr := &doc.Series[i]
		plots := []Plot{}
		if i < len(inputs) && inputs[i].Values != nil {
			in := inputs[i]
			plots = append(plots,
				Plot{Kind: "series", Title: "The series", SVG: inline(report.SeriesPlot(in, sr))},
				Plot{Kind: "acf", Title: "Autocorrelations", SVG: inline(report.ACFSVG(in, 0))})
		}
		var in *dataset.Series
		if i < len(inputs) && inputs[i].Values != nil {
			in = &inputs[i]
		}
		for _, r := range sr.Results {
			if len(r.Path) > 0 || (r.Sequence != nil && len(r.Sequence.Index) > 0) || (r.Surface != nil && len(r.Surface.Rows) > 0) {
				plots = append(plots, Plot{Kind: "path", Test: r.Test, Title: r.Test + " search", SVG: inline(report.ResultPlot(r, in))})
			}
		}
		return plots, nil
	})
}

// inline drops the SVG namespace declaration, which inline SVG in HTML does
// not need, so that the page's markup names no outside address.
func inline(svg string) string {
	return strings.Replace(svg, ` xmlns="http://www.w3.org/2000/svg"`, "", 1)
}

// TestInfo describes one registered test for the page's test picker.
type TestInfo struct {
	ID       string `json:"id"`
	Name     string `json:"name"`
	Null     string `json:"null"`
	Tail     string `json:"tail"`
	Citation string `json:"citation"`
	// Verdict reports that the test is in the verdict's default set.
	Verdict bool `json:"verdict"`
}

// About is what the about call returns: version, tests, demo data.
type About struct {
	Version         string     `json:"version"`
	Schema          string     `json:"schema"`
	Tests           []TestInfo `json:"tests"`
	VerdictTests    []string   `json:"verdict_tests"`
	Transforms      []string   `json:"transforms"`
	DemoName        string     `json:"demo_name"`
	DemoDescription string     `json:"demo_description"`
	Caution         string     `json:"caution"`
	// Settings describes every setting the page offers (labels, defaults,
	// choices, the tests each applies to): battery.SettingsDescription.
	Settings []battery.SettingInfo `json:"settings"`
}

// AboutInfo returns the engine's version, its tests and the demo data's
// description (the demo data itself comes from Demo).
func AboutInfo() string {
	return Call(func() (any, error) {
		a := About{
			Version: battery.Version, Schema: schema.ID,
			VerdictTests: decide.Tests, Transforms: battery.Transforms,
			DemoName: battery.DemoName, DemoDescription: battery.DemoDescription, Caution: schema.Caution,
			Tests: []TestInfo{}, Settings: battery.SettingsDescription(),
		}
		for _, id := range core.IDs() {
			info, err := core.Lookup(id)
			if err != nil {
				continue
			}
			in := false
			for _, v := range decide.Tests {
				in = in || v == id
			}
			a.Tests = append(a.Tests, TestInfo{ID: id, Name: info.Name, Null: info.Null, Tail: info.Tail, Citation: info.Citation, Verdict: in})
		}
		return a, nil
	})
}

// Demo returns the built-in invented demo data (battery.DemoCSV) as CSV text.
func Demo() string {
	return Call(func() (any, error) {
		return map[string]string{"name": battery.DemoName, "text": string(battery.DemoCSV()), "description": battery.DemoDescription}, nil
	})
}

// finitePtr returns a pointer to x when it is finite, else nil.
func finitePtr(x float64) *float64 {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return nil
	}
	return &x
}

// ArgError marks err (a JavaScript argument of the wrong type) as a usage
// error for the envelope.
func ArgError(err error) error {
	return &callError{kind: KindUsage, err: fmt.Errorf("bad argument: %w", err)}
}
