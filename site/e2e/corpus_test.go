// The corpus of input layouts (core/dataset/testdata/corpus, written by us,
// see its README.md) read by the offline page in headless Chromium the way a
// person reads it: each file is chosen with the page's file control (input
// #file), one after another in one page load, and what the preview shows is
// compared with the same expectations.json that core/dataset's TestCorpus and
// wasm/bridge's TestCorpusInPage read, so the three cannot drift apart:
//
//   - the file's name, rows, date column, frequency, first and last date and
//     number of series in the preview's line of facts;
//   - the series names, in order, in the table of series;
//   - the reader's notes as listed under the table, line for line the
//     reader's own (dataset.ReadFile, run natively here), and the kinds of
//     those notes equal to the expected kinds;
//   - for a file that cannot be read, the error shown, which names the line
//     (and column) of expectations.json and reads exactly as the native
//     reader's error.
//
// A file whose expectation has options (date_format, date_column) is chosen
// after setting the matching control of the advanced settings, which is reset
// afterwards. The expectations are the project's own contract (issue 11),
// written by hand from the files' cells; no outside source.
package e2e

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"net/url"
	"os"
	"path/filepath"
	"slices"
	"sort"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"

	"github.com/rootshift/rootshift/core/dataset"
)

// browserCorpusCase is one entry of expectations.json. Unknown fields fail
// the decoding: a new expectation must be checked here too.
type browserCorpusCase struct {
	File       string            `json:"file"`
	Options    map[string]string `json:"options"`
	DateColumn string            `json:"date_column"`
	Frequency  string            `json:"frequency"`
	First      string            `json:"first"`
	Last       string            `json:"last"`
	Rows       int               `json:"rows"`
	Series     []string          `json:"series"`
	Notes      []string          `json:"notes"`
	Error      string            `json:"error"`
	ErrorRow   int               `json:"error_row"`
}

// shownPreview is what #preview shows after a file was chosen.
type shownPreview struct {
	Name   string   `json:"name"`   // the file name tag of the heading
	Facts  string   `json:"facts"`  // the line of facts under the heading
	Series []string `json:"series"` // the names in the table of series
	Notes  []string `json:"notes"`  // the reader's notes under the table
	Errors []string `json:"errors"` // error paragraphs
	Run    bool     `json:"run"`    // whether "Find out" is enabled
}

// watchPreviewJS resolves, as JSON, the preview shown after the next change
// of #preview (the page replaces its children once per reading), or
// {"timeout": true} after 15 s. It is evaluated before the file is chosen.
const watchPreviewJS = `window.__corpusNext = new Promise((resolve) => {
	const box = document.getElementById('preview');
	const done = () => {
		obs.disconnect();
		clearTimeout(timer);
		// The page renders synchronously after the engine answers; read on the next frame.
		requestAnimationFrame(() => resolve(JSON.stringify({
			name: (box.querySelector('h3 .tag') || {}).textContent || '',
			facts: (box.querySelector('h3 + p.small') || {}).textContent || '',
			series: [...box.querySelectorAll('input[data-col]')].map((e) => e.closest('label').textContent),
			notes: [...box.querySelectorAll('ul li')].map((e) => e.textContent),
			errors: [...box.querySelectorAll('p.errors')].map((e) => e.textContent),
			run: !document.getElementById('run').disabled,
		})));
	};
	const obs = new MutationObserver(done);
	obs.observe(box, { childList: true });
	const timer = setTimeout(() => { obs.disconnect(); resolve(JSON.stringify({ timeout: true })); }, 15000);
}), 'watching'`

// expectedFacts is the preview's line of facts for an expectation, in the
// page's wording (renderPreview in site/src/app.js).
func expectedFacts(c browserCorpusCase) string {
	facts := []string{fmt.Sprintf("%d rows", c.Rows)}
	if c.DateColumn != "" {
		facts = append(facts, "date column “"+c.DateColumn+"”")
	} else {
		facts = append(facts, "no date column (observations are numbered)")
	}
	if c.Frequency != "" {
		facts = append(facts, "frequency: "+c.Frequency)
	}
	if c.First != "" {
		facts = append(facts, c.First+" to "+c.Last)
	}
	facts = append(facts, fmt.Sprintf("%d series", len(c.Series)))
	return strings.Join(facts, " · ")
}

// TestCorpusInBrowser feeds every corpus file to the page's file control in
// one page load and checks the preview against expectations.json.
func TestCorpusInBrowser(t *testing.T) {
	chromium(t)
	path := page(t)
	dir := filepath.Join(repoRoot(t), "core", "dataset", "testdata", "corpus")
	raw, err := os.ReadFile(filepath.Join(dir, "expectations.json"))
	if err != nil {
		t.Fatal(err)
	}
	dec := json.NewDecoder(bytes.NewReader(raw))
	dec.DisallowUnknownFields()
	var cs []browserCorpusCase
	if err := dec.Decode(&cs); err != nil {
		t.Fatalf("expectations.json: %v", err)
	}
	if len(cs) < 40 {
		t.Fatalf("%d corpus files, want at least 40", len(cs))
	}

	b := newBrowser(t)
	pageURL := (&url.URL{Scheme: "file", Path: path}).String()
	if err := chromedp.Do(b.ctx, chromedp.Navigate(pageURL)); err != nil {
		t.Fatalf("opening %s: %v", pageURL, err)
	}
	var ready string
	b.eval(t, `window.rootshift.ready.then(() => JSON.stringify('ready'))`, &ready)
	// The advanced settings hold the input options; open them as a person would.
	if err := chromedp.Do(b.ctx, chromedp.Evaluate[chromedp.Void](`document.getElementById('advanced').open = true`)); err != nil {
		t.Fatal(err)
	}

	start := time.Now()
	var checked, failedReads int
	for _, c := range cs {
		file := filepath.Join(dir, c.File)
		if _, err := os.Stat(file); err != nil {
			t.Errorf("%s: %v", c.File, err)
			continue
		}
		// Input options: set the control as a person picks it (an input
		// event), and let the page's delayed re-reading of the previous file
		// pass before choosing the next.
		setOptions(t, b, c.Options, false)
		var watching string
		b.eval(t, `JSON.stringify((`+watchPreviewJS+`))`, &watching)
		if err := chromedp.Do(b.ctx, chromedp.SetUploadFiles(chromedp.ID("file"), []string{file})); err != nil {
			t.Fatalf("%s: choosing the file: %v", c.File, err)
		}
		var shown shownPreview
		var timedOut struct {
			Timeout bool `json:"timeout"`
		}
		var rawShown json.RawMessage
		b.eval(t, `window.__corpusNext`, &rawShown)
		if json.Unmarshal(rawShown, &timedOut) == nil && timedOut.Timeout {
			t.Errorf("%s: the preview did not change within 15 s of choosing the file", c.File)
			setOptions(t, b, c.Options, true)
			continue
		}
		if err := json.Unmarshal(rawShown, &shown); err != nil {
			t.Fatalf("%s: %v", c.File, err)
		}
		checkShown(t, dir, c, shown)
		if c.Error != "" {
			failedReads++
		}
		checked++
		setOptions(t, b, c.Options, true)
	}
	t.Logf("%d corpus files chosen with the file control and checked in one page load (%d refused with their error) in %v",
		checked, failedReads, time.Since(start).Round(time.Millisecond))

	// Reading files makes no request and writes no console error.
	requests, _, console := b.snapshot()
	for _, u := range requests {
		if u != pageURL && !strings.HasPrefix(u, "blob:") && !strings.HasPrefix(u, "data:") {
			t.Errorf("the page made a network request: %s", u)
		}
	}
	if len(console) > 0 {
		t.Errorf("console errors: %v", console)
	}
}

// setOptions sets (or, with reset, clears) the advanced-settings controls
// named by an expectation's options: option date_format is control
// #s-date-format. It fires the input event a person's choice fires and
// waits out the page's 350 ms delay before it re-reads the data.
func setOptions(t *testing.T, b *browser, opts map[string]string, reset bool) {
	t.Helper()
	if len(opts) == 0 {
		return
	}
	keys := make([]string, 0, len(opts))
	for k := range opts {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	for _, k := range keys {
		v := opts[k]
		if reset {
			v = ""
		}
		id := "s-" + strings.ReplaceAll(k, "_", "-")
		var ok bool
		b.eval(t, fmt.Sprintf(`(() => {
			const e = document.getElementById(%s);
			if (!e) return JSON.stringify(false);
			e.value = %s;
			e.dispatchEvent(new Event('input', { bubbles: true }));
			return JSON.stringify(e.value === %s);
		})()`, jsString(id), jsString(v), jsString(v)), &ok)
		if !ok {
			t.Fatalf("option %s=%q: the page has no control #%s taking that value", k, v, id)
		}
	}
	time.Sleep(600 * time.Millisecond)
}

// checkShown compares one file's preview with its expectation and with the
// native reader's notes or error.
func checkShown(t *testing.T, dir string, c browserCorpusCase, shown shownPreview) {
	t.Helper()
	tb, nativeErr := dataset.ReadFile(filepath.Join(dir, c.File),
		&dataset.Options{DateFormat: c.Options["date_format"], DateColumn: c.Options["date_column"]})
	if c.Error != "" {
		want := fmt.Sprintf("line %d:", c.ErrorRow)
		if len(shown.Errors) != 1 {
			t.Errorf("%s: error paragraphs %q, want one with %q at %s", c.File, shown.Errors, c.Error, want)
			return
		}
		msg := shown.Errors[0]
		if !strings.Contains(msg, c.Error) || !strings.Contains(msg, want) {
			t.Errorf("%s: the page shows %q, want %q at %s", c.File, msg, c.Error, want)
		}
		var pe *dataset.ParseError
		if nativeErr == nil || !errors.As(nativeErr, &pe) {
			t.Errorf("%s: the native reader gave %v, want a ParseError", c.File, nativeErr)
		} else {
			if pe.Column > 0 && !strings.Contains(msg, fmt.Sprintf("column %d", pe.Column)) {
				t.Errorf("%s: the page shows %q without the column %d the reader names", c.File, msg, pe.Column)
			}
			if msg != "Could not read the data: "+nativeErr.Error() {
				t.Errorf("%s: the page shows %q, the native reader says %q", c.File, msg, nativeErr.Error())
			}
		}
		if shown.Run {
			t.Errorf("%s: “Find out” is enabled after a failed reading", c.File)
		}
		return
	}
	if nativeErr != nil {
		t.Errorf("%s: the native reader fails: %v", c.File, nativeErr)
		return
	}
	if len(shown.Errors) > 0 {
		t.Errorf("%s: the page shows errors %q", c.File, shown.Errors)
	}
	if shown.Name != c.File {
		t.Errorf("%s: the preview is titled %q", c.File, shown.Name)
	}
	if want := expectedFacts(c); shown.Facts != want {
		t.Errorf("%s: the preview says %q, want %q", c.File, shown.Facts, want)
	}
	if !slices.Equal(shown.Series, c.Series) {
		t.Errorf("%s: series shown %q, want %q", c.File, shown.Series, c.Series)
	}
	if !shown.Run {
		t.Errorf("%s: “Find out” stays disabled with %d series", c.File, len(shown.Series))
	}
	// The notes shown are the reader's, in its order; each has a kind.
	if !slices.Equal(shown.Notes, tb.Messages()) {
		t.Errorf("%s: notes shown %q, the reader's %q", c.File, shown.Notes, tb.Messages())
	}
	var kinds []string
	for _, line := range shown.Notes {
		kind := ""
		for _, n := range tb.Notes {
			if n.String() == line {
				kind = n.Kind
				break
			}
		}
		if kind == "" {
			t.Errorf("%s: the note shown %q is none of the reader's", c.File, line)
			continue
		}
		if !slices.Contains(kinds, kind) {
			kinds = append(kinds, kind)
		}
	}
	want := append([]string(nil), c.Notes...)
	slices.Sort(kinds)
	slices.Sort(want)
	if !slices.Equal(kinds, want) {
		t.Errorf("%s: kinds of the notes shown %v, want %v (notes %q)", c.File, kinds, want, shown.Notes)
	}
}
