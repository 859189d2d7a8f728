package e2e

import (
	"encoding/json"
	"net/url"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"

	"github.com/rootshift/rootshift/breaks/battery"
)

// overflowJS lists the visible elements that reach beyond the viewport's
// width (left or right), by tag, class and width.
const overflowJS = `JSON.stringify([...document.querySelectorAll('body *')].filter(e => {
	// Contents of a closed detail are not shown (its summary is).
	const closed = e.closest('details:not([open])');
	if (closed && !e.closest('summary')) return false;
	const r = e.getBoundingClientRect();
	return r.width > 0 && r.height > 0 && (r.right > window.innerWidth + 1 || r.left < -1);
}).slice(0, 10).map(e => e.tagName + '.' + e.className + ' ' + Math.round(e.getBoundingClientRect().width)))`

// runEmployment loads testdata/us-employment.csv (23 series; vega-datasets
// 3.2.1, public data of the U.S. Bureau of Labor Statistics) with the file
// control at the given viewport, presses "Find out" and waits for the
// overview.
func runEmployment(t *testing.T, b *browser, root string, w, h int64, mobile bool) {
	t.Helper()
	var opts []chromedp.EmulateViewportOption
	if mobile {
		opts = append(opts, chromedp.EmulateMobile)
	}
	err := chromedp.Do(b.ctx,
		chromedp.EmulateViewport(w, h, opts...),
		chromedp.Evaluate[chromedp.Void](`window.scrollTo(0, 0)`),
		chromedp.SetUploadFiles(chromedp.ID("file"), []string{filepath.Join(root, "testdata", "us-employment.csv")}),
	)
	if err != nil {
		t.Fatalf("choosing the file: %v", err)
	}
	var seen bool
	for i := 0; i < 100 && !seen; i++ {
		b.eval(t, `JSON.stringify(document.getElementById('preview').innerText.includes('us-employment.csv') && !document.getElementById('run').disabled)`, &seen)
		time.Sleep(100 * time.Millisecond)
	}
	if !seen {
		t.Fatal("the preview of us-employment.csv did not appear")
	}
	err = chromedp.Do(b.ctx,
		chromedp.Evaluate[chromedp.Void](`document.getElementById('results').replaceChildren()`),
		chromedp.Click(chromedp.ID("run")),
		chromedp.WaitVisible(chromedp.CSS("#overview table")),
		chromedp.Sleep(300*time.Millisecond),
	)
	if err != nil {
		t.Fatalf("running us-employment.csv: %v", err)
	}
}

// TestOverviewInBrowser checks the overview of a 23-series file (issue 12):
// one row per series before any detail, every detail closed, the whole page
// under three screens at 1280x800, the first verdict on screen after the run
// at 390x844 without scrolling past the exports, nothing wider than the
// viewport, and select all/none and the class filter working.
func TestOverviewInBrowser(t *testing.T) {
	chromium(t)
	path := page(t)
	root := repoRoot(t)
	b := newBrowser(t)
	if err := chromedp.Do(b.ctx, chromedp.Navigate((&url.URL{Scheme: "file", Path: path}).String())); err != nil {
		t.Fatal(err)
	}
	var v string
	b.eval(t, `window.rootshift.ready.then(v => JSON.stringify(v))`, &v)
	dir := artifactsDir(t)

	runEmployment(t, b, root, 1280, 800, false)
	var o struct {
		Rows, Articles, Open int
		OverviewFirst        bool
		Height, Screen       float64
		Names                []string
	}
	b.eval(t, `(() => {
		const ov = document.getElementById('overview');
		const first = document.querySelector('#results article');
		return JSON.stringify({
			Rows: ov.querySelectorAll('tbody tr').length,
			Articles: document.querySelectorAll('#results article').length,
			Open: document.querySelectorAll('#results article details[open]').length,
			OverviewFirst: !!first && !!(ov.compareDocumentPosition(first) & Node.DOCUMENT_POSITION_FOLLOWING),
			Height: document.documentElement.scrollHeight, Screen: window.innerHeight,
			Names: [...ov.querySelectorAll('tbody th')].map(e => e.textContent)});
	})()`, &o)
	t.Logf("us-employment.csv at 1280x800: %d overview rows, %d details (%d open), page height %.0f px = %.2f screens",
		o.Rows, o.Articles, o.Open, o.Height, o.Height/o.Screen)
	if o.Rows != 23 || o.Articles != 23 || !o.OverviewFirst {
		t.Errorf("overview: %d rows, %d details, overview before the details: %v", o.Rows, o.Articles, o.OverviewFirst)
	}
	if len(o.Names) == 23 && (o.Names[0] != "nonfarm" || o.Names[22] != "nonfarm_change") {
		t.Errorf("overview rows %v", o.Names)
	}
	if o.Open != 0 {
		t.Errorf("%d details open; with more than 3 series they start closed", o.Open)
	}
	var parts map[string]float64
	b.eval(t, `JSON.stringify(Object.fromEntries(['header.top', '#data-card', '#settings-card', '#overview', '.series-list', '#exports', 'footer'].map(q => [q, Math.round(document.querySelector(q).getBoundingClientRect().height)])))`, &parts)
	t.Logf("heights at 1280x800 (px): %v", parts)
	if o.Height >= 3*o.Screen {
		t.Errorf("page height %.0f px with every detail closed, want under 3 screens (%.0f px)", o.Height, 3*o.Screen)
	}
	var wide []string
	b.eval(t, overflowJS, &wide)
	if len(wide) > 0 {
		t.Errorf("at 1280 px, elements wider than the viewport: %v", wide)
	}
	shot(t, b, filepath.Join(dir, "overview-1280x800-top.png"), `window.scrollTo(0, 0)`)
	shot(t, b, filepath.Join(dir, "overview-1280x800-settings.png"), `document.getElementById('settings-card').scrollIntoView()`)
	shot(t, b, filepath.Join(dir, "overview-1280x800.png"), `document.getElementById('findings-h').scrollIntoView()`)

	// The class filter and select none/all.
	var f struct{ Shown, Details, Total int }
	b.eval(t, `(() => { const s = document.getElementById('class-filter'); s.value = [...s.options].map(o => o.value).filter(v => v)[0]; s.dispatchEvent(new Event('change'));
		const r = {Shown: [...document.querySelectorAll('#overview tbody tr')].filter(e => !e.hidden).length,
			Details: [...document.querySelectorAll('#results article')].filter(e => !e.hidden).length, Total: 23};
		s.value = ''; s.dispatchEvent(new Event('change')); return JSON.stringify(r); })()`, &f)
	if f.Shown < 1 || f.Shown >= f.Total || f.Details != f.Shown {
		t.Errorf("class filter (first class listed): %d rows, %d details shown", f.Shown, f.Details)
	}
	var sel struct{ None, All int }
	b.eval(t, `(() => { document.getElementById('cols-none').click(); const none = document.querySelectorAll('#preview input[data-col]:checked').length;
		document.getElementById('cols-all').click(); const all = document.querySelectorAll('#preview input[data-col]:checked').length;
		return JSON.stringify({None: none, All: all}); })()`, &sel)
	if sel.None != 0 || sel.All != 23 {
		t.Errorf("select none/all: %d / %d checked, want 0 / 23", sel.None, sel.All)
	}

	// Phone: the first verdict is on screen right after the run.
	runEmployment(t, b, root, 390, 844, true)
	var ph struct {
		Top, Bottom, Inner, ExportsTop, RowTop float64
		Text                                   string
	}
	b.eval(t, `(() => { const row = document.querySelector('#overview tbody tr'); const r = row.getBoundingClientRect();
		return JSON.stringify({Top: r.top, Bottom: r.bottom, Inner: window.innerHeight, RowTop: r.top + window.scrollY,
			ExportsTop: document.getElementById('exports').getBoundingClientRect().top + window.scrollY, Text: row.innerText}); })()`, &ph)
	t.Logf("390x844 after the run: first overview row at %.0f-%.0f px of %.0f (%q)", ph.Top, ph.Bottom, ph.Inner, strings.ReplaceAll(ph.Text, "\n", " | "))
	if ph.Top < 0 || ph.Bottom > ph.Inner {
		t.Errorf("at 390x844 the first verdict is not on screen after the run: row at %.0f-%.0f, viewport %.0f", ph.Top, ph.Bottom, ph.Inner)
	}
	if ph.ExportsTop < ph.RowTop {
		t.Errorf("the exports (%.0f px) come before the first verdict (%.0f px)", ph.ExportsTop, ph.RowTop)
	}
	shot(t, b, filepath.Join(dir, "overview-390x844.png"), ``)
	b.eval(t, overflowJS, &wide)
	if len(wide) > 0 {
		t.Errorf("at 390 px, elements wider than the viewport: %v", wide)
	}
	// Open every detail: still nothing wider than the phone's screen.
	if err := chromedp.Do(b.ctx, chromedp.Click(chromedp.ID("expand-all")), chromedp.Sleep(1500*time.Millisecond)); err != nil {
		t.Fatal(err)
	}
	b.eval(t, overflowJS, &wide)
	if len(wide) > 0 {
		t.Errorf("at 390 px with every detail open, elements wider than the viewport: %v", wide)
	}
	shot(t, b, filepath.Join(dir, "overview-390x844-detail.png"), `document.querySelector('#results article').scrollIntoView()`)
}

// shot scrolls with the script, then saves a screenshot of the viewport.
func shot(t *testing.T, b *browser, path, scroll string) {
	t.Helper()
	if scroll != "" {
		if err := chromedp.Do(b.ctx, chromedp.Evaluate[chromedp.Void](scroll), chromedp.Sleep(200*time.Millisecond)); err != nil {
			t.Error(err)
			return
		}
	}
	png, err := chromedp.Run(b.ctx, chromedp.CaptureScreenshot())
	if err != nil {
		t.Errorf("screenshot %s: %v", path, err)
		return
	}
	if err := os.WriteFile(path, png, 0o644); err != nil {
		t.Error(err)
	}
}

// TestSettingsLabelsFromEngine checks that every label, default and choice
// the settings form shows is the engine's (battery.SettingsDescription): the
// form has one field per described setting, each label starts with the
// described label and shows its default, and each list's options are the
// described choices in order.
func TestSettingsLabelsFromEngine(t *testing.T) {
	chromium(t)
	path := page(t)
	b := newBrowser(t)
	if err := chromedp.Do(b.ctx, chromedp.Navigate((&url.URL{Scheme: "file", Path: path}).String())); err != nil {
		t.Fatal(err)
	}
	var v string
	b.eval(t, `window.rootshift.ready.then(v => new Promise(r => setTimeout(() => r(JSON.stringify(v)), 300)))`, &v)
	type shown struct {
		Field, Label, Hint string
		Options            []string
	}
	var fields []shown
	b.eval(t, `JSON.stringify([...document.querySelectorAll('#settings-card [data-setting]')].map(f => {
		const l = f.querySelector('label');
		const sel = f.querySelector('select');
		return {Field: f.dataset.setting, Label: (l.querySelector('span:not(.hint)') || l.firstChild).textContent.trim(),
			Hint: (l.querySelector('.hint') || {textContent: ''}).textContent + ' ' + (f.querySelector('.applies') || {textContent: ''}).textContent + ' ' + (f.title || ''),
			Options: sel ? [...sel.options].map(o => o.textContent) : null};
	}))`, &fields)
	// Every label element in the settings card outside the described fields
	// belongs to the test picker (test names from the engine's registry).
	var stray []string
	b.eval(t, `JSON.stringify([...document.querySelectorAll('#settings-card label')].filter(l => !l.closest('[data-setting]') && !l.closest('#tests-grid') && !l.querySelector('input[name="s-mode"]')).map(l => l.textContent))`, &stray)
	if len(stray) > 0 {
		t.Errorf("settings labels not from the engine's description: %q", stray)
	}
	desc := battery.SettingsDescription()
	if len(fields) != len(desc) {
		t.Fatalf("the form shows %d settings, the engine describes %d", len(fields), len(desc))
	}
	for i, d := range desc {
		f := fields[i]
		if f.Field != d.Field || f.Label != d.Label {
			t.Errorf("setting %d: shown %s %q, described %s %q", i, f.Field, f.Label, d.Field, d.Label)
		}
		if d.Kind != "flag" && !strings.Contains(f.Hint, d.Default) || !strings.Contains(f.Hint, d.AppliesTo) {
			t.Errorf("%s: hint %q lacks the default %q or what it applies to %q", d.Field, f.Hint, d.Default, d.AppliesTo)
		}
		var want []string
		for _, c := range d.Choices {
			want = append(want, c.Label)
		}
		if strings.Join(f.Options, "\n") != strings.Join(want, "\n") {
			t.Errorf("%s: options %q, described %q", d.Field, f.Options, want)
		}
	}
	for _, d := range desc {
		switch d.Field {
		case "lag_rule":
			for _, w := range []string{"BIC for adf", "MAIC for dfgls", "t-sig", "sadf and gsadf use 0 lags"} {
				if !strings.Contains(d.Default, w) {
					t.Errorf("lag rule default %q does not say %q", d.Default, w)
				}
			}
		case "shift":
			if !strings.Contains(d.Default, "the verdict chooses its own") {
				t.Errorf("shift default %q does not say that the verdict chooses its own break tests", d.Default)
			}
		}
	}
}

// TestLongTableInBrowser pastes a long table made from three columns of
// testdata/us-employment.csv (one row per series, month and value), checks
// that the page offers the long reading, and that after the user confirms
// it the findings are the command-line engine's for settings.long.
func TestLongTableInBrowser(t *testing.T) {
	chromium(t)
	path := page(t)
	root := repoRoot(t)
	wide, err := os.ReadFile(filepath.Join(root, "testdata", "us-employment.csv"))
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSpace(string(wide)), "\n")
	head := strings.Split(lines[0], ",")
	var long strings.Builder
	long.WriteString("series,month,employed\n")
	for _, c := range []string{"construction", "utilities", "other_services"} {
		j := 0
		for k, h := range head {
			if h == c {
				j = k
			}
		}
		for _, l := range lines[1:] {
			f := strings.Split(l, ",")
			long.WriteString(c + "," + f[0] + "," + f[j] + "\n")
		}
	}
	b := newBrowser(t)
	if err := chromedp.Do(b.ctx, chromedp.Navigate((&url.URL{Scheme: "file", Path: path}).String())); err != nil {
		t.Fatal(err)
	}
	var v string
	b.eval(t, `window.rootshift.ready.then(v => new Promise(r => setTimeout(() => r(JSON.stringify(v)), 300)))`, &v)
	err = chromedp.Do(b.ctx,
		chromedp.Evaluate[chromedp.Void](`document.getElementById('paste-box').open = true; document.getElementById('paste').value = `+jsString(long.String())),
		chromedp.Click(chromedp.ID("use-paste")),
		chromedp.WaitVisible(chromedp.ID("read-long")),
	)
	if err != nil {
		t.Fatalf("the long reading was not offered: %v", err)
	}
	var offer string
	b.eval(t, `JSON.stringify(document.getElementById('long-offer').innerText)`, &offer)
	t.Logf("offer: %s", offer)
	for _, want := range []string{"“series”", "“month”", "“employed”"} {
		if !strings.Contains(offer, want) {
			t.Errorf("offer %q does not name %s", offer, want)
		}
	}
	err = chromedp.Do(b.ctx,
		chromedp.Click(chromedp.ID("read-long")),
		chromedp.WaitVisible(chromedp.ID("read-wide")),
		chromedp.WaitEnabled(chromedp.ID("run")),
		chromedp.Click(chromedp.ID("run")),
		chromedp.WaitVisible(chromedp.CSS("#overview table")),
	)
	if err != nil {
		t.Fatalf("running the long table: %v", err)
	}
	var rows int
	b.eval(t, `JSON.stringify(document.querySelectorAll('#overview tbody tr').length)`, &rows)
	if rows != 3 {
		t.Errorf("%d overview rows, want 3", rows)
	}
	var exp struct {
		Text string `json:"text"`
	}
	b.eval(t, `window.rootshift.exportReport('json').then(x => JSON.stringify(x))`, &exp)
	var got any
	if err := json.Unmarshal([]byte(exp.Text), &got); err != nil {
		t.Fatal(err)
	}
	want, _ := nativeJSON(t, "pasted", []byte(long.String()), `{"long":{"id":"series","date":"month","value":"employed"}}`)
	sameDocument(t, "long table through the page", got, want)
}

// TestProgressInBrowser runs simulated p-values on three demo series and
// checks that the one overall progress never goes back, names the series
// position ("Series k of 3") and the replications, and reaches the end.
func TestProgressInBrowser(t *testing.T) {
	chromium(t)
	path := page(t)
	b := newBrowser(t)
	if err := chromedp.Do(b.ctx, chromedp.Navigate((&url.URL{Scheme: "file", Path: path}).String())); err != nil {
		t.Fatal(err)
	}
	var v string
	b.eval(t, `window.rootshift.ready.then(v => new Promise(r => setTimeout(() => r(JSON.stringify(v)), 300)))`, &v)
	err := chromedp.Do(b.ctx,
		chromedp.Click(chromedp.ID("use-demo")),
		chromedp.WaitVisible(chromedp.CSS("#preview table")),
		chromedp.WaitEnabled(chromedp.ID("run")),
		chromedp.Evaluate[chromedp.Void](`(() => {
			const cols = [...document.querySelectorAll('#preview input[data-col]')];
			cols.forEach((c, i) => { c.checked = i < 3; });
			document.getElementById('s-mode-pick').click();
			for (const c of document.querySelectorAll('#tests-grid input')) c.checked = c.value === 'adf' || c.value === 'za';
			document.getElementById('s-sims').value = '199';
			window.__seen = [];
			const box = document.getElementById('progress'), txt = document.getElementById('progress-text');
			new MutationObserver(() => window.__seen.push([Number(box.dataset.overall || 0), txt.textContent]))
				.observe(txt, {childList: true, characterData: true, subtree: true});
		})()`),
		chromedp.Click(chromedp.ID("run")),
		chromedp.WaitVisible(chromedp.CSS("#overview table")),
	)
	if err != nil {
		t.Fatalf("running with simulation: %v", err)
	}
	var seen [][2]any
	b.eval(t, `JSON.stringify(window.__seen)`, &seen)
	if len(seen) < 3 {
		t.Fatalf("%d progress updates", len(seen))
	}
	last, reps, third := -1.0, false, false
	for _, s := range seen {
		f, text := s[0].(float64), s[1].(string)
		if f < last {
			t.Errorf("progress went back from %.3f to %.3f (%s)", last, f, text)
		}
		last = f
		reps = reps || strings.Contains(text, "replications")
		third = third || strings.Contains(text, "of 3 series done")
		if !seriesPosition.MatchString(text) {
			t.Errorf("progress text %q does not start with the series position", text)
		}
	}
	t.Logf("%d progress updates, last %.2f: first %q, last %q", len(seen), last, seen[0][1], seen[len(seen)-1][1])
	if !reps || !third || last < 0.99 {
		t.Errorf("progress: replications shown %v, position among 3 series shown %v, ended at %.2f", reps, third, last)
	}
}

// seriesPosition is the start of the page's overall progress text: how
// many of the series are done.
var seriesPosition = regexp.MustCompile(`^(\d+ of \d+ series done|Series \d+ of \d+)`)
