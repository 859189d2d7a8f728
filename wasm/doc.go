//go:build js && wasm

// Command wasm is the engine of the offline page: the same analysis as the
// command-line tool (battery.AnalyzeText with schema.Settings), compiled to
// WebAssembly and run inside a Web Worker.
//
// It is thin glue written with github.com/hack-pad/safejs: it copies the
// arguments out of JavaScript, calls package bridge (which decodes settings,
// runs the analysis and encodes every result as a JSON envelope) and hands
// the JSON text back. Every export recovers panics into an error envelope,
// because a panic or an unconvertible value at the boundary would end the Go
// program. The exports live on globalThis.rootshiftEngine:
//
//	analyze(name, bytes, settingsJSON, onProgress) -> JSON envelope (schema v2 document)
//	inspect(name, bytes, settingsJSON)             -> JSON envelope (preview)
//	export(format)                                 -> JSON envelope (report text)
//	plots(seriesIndex)                             -> JSON envelope (SVG drawings)
//	bench(n)                                       -> JSON envelope (milliseconds)
//	about()                                        -> JSON envelope (version, tests)
//	demo()                                         -> JSON envelope (demo CSV)
//
// When the exports are in place it calls globalThis.rootshiftReady() if that
// exists, then blocks forever.
package main
