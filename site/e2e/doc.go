// Package e2e drives the built offline page through real headless Chromium
// from a file:// URL: it runs analyses through the page (both the
// window.rootshift automation API and the visible controls), compares the
// documents with the command-line tool's code path (battery.AnalyzeText +
// report.WriteJSON, called natively here) to 1e-9, checks that the page and
// its worker make no network request, that a fetch is blocked by the
// Content-Security-Policy, that the console stays free of errors, and
// measures the budgets (page size, load-to-ready time, WebAssembly over
// native time of the same one-break search). Screenshots at 1280x800 and
// 390x844 go to $ROOTSHIFT_ARTIFACTS (default: artifacts/ in the repository).
// TestCorpusInBrowser chooses every file of the reader's corpus
// (core/dataset/testdata/corpus) with the page's file control and compares the
// preview with the corpus's expectations.json.
//
// The test builds the page with scripts/build-page.sh into a temporary
// directory, or uses $ROOTSHIFT_PAGE when set. It skips when Chromium is not
// installed (/usr/bin/chromium or $ROOTSHIFT_CHROMIUM); CI installs it.
// Budgets are printed with t.Logf; gross violations fail, and
// ROOTSHIFT_BUDGETS=strict makes the targets themselves fail.
package e2e
