// Package bridge decodes the arguments and encodes the results of the calls
// that the offline page makes into the WebAssembly engine. It carries no
// build tag, so everything the page relies on (settings decoding, error
// envelopes, panic recovery, previews, exports, plots) is tested natively;
// package wasm only moves strings and bytes between JavaScript and these
// functions.
//
// Every call returns one JSON text, the envelope
//
//	{"ok": true,  "result": ...}
//	{"ok": false, "error": {"kind": "usage"|"input"|"cancelled"|"internal", "message": "..."}}
//
// and never panics: a panic inside a call is recovered into an "internal"
// error, because a panic that reaches the JavaScript boundary would stop the
// Go program for good.
//
// The analysis goes through exactly the entry point of the command-line tool,
// battery.AnalyzeText, with a schema.Settings decoded from the same JSON
// object the tool writes under "settings"; the document is encoded with
// report.WriteJSON, the tool's --json writer, so the page and the tool give
// the same document for the same input and settings.
package bridge
