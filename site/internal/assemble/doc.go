// Command assemble writes the offline page: it reads the gzipped engine and
// wasm_exec.js and calls site.Assemble. scripts/build-page.sh runs it.
//
// Usage:
//
//	go run ./site/internal/assemble -wasm engine.wasm.gz -raw-size N -exec wasm_exec.js -o site/dist/rootshift.html
package main
