// Package site holds the offline page: its sources (src/: HTML, styles, the
// page script and the worker script), the assembler that turns them, the
// gzipped WebAssembly engine and the Go distribution's wasm_exec.js into one
// self-contained HTML file, and the built page itself, embedded from
// dist/rootshift.html when scripts/build-page.sh has been run before the
// binary was built.
//
// The page inlines everything (no external fonts, scripts or styles) and
// carries a Content-Security-Policy meta tag that forbids every connection:
// default-src 'none', connect-src 'none', scripts only by the SHA-256 hash of
// each inline script (computed here) plus 'wasm-unsafe-eval', workers only
// from blob: URLs, styles only by hash.
package site
