//go:build !js

// Checks the rule for package wasm (issue "offline page"): every Go file in
// wasm/ except this test carries the js && wasm build constraint, and none
// imports syscall/js directly (the glue uses github.com/hack-pad/safejs,
// whose calls return errors instead of panicking). Source: project rule,
// common practice (the same check as safejs's own wasm_tags_test.go).
package main

import (
	"go/build/constraint"
	"go/parser"
	"go/token"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

func isJSWasm(expr constraint.Expr) bool {
	// The constraint must require both js and wasm: only the js/wasm target satisfies it.
	ok := func(tag string) bool { return tag == "js" || tag == "wasm" }
	return expr.Eval(func(tag string) bool { return ok(tag) }) &&
		!expr.Eval(func(tag string) bool { return tag == "js" }) &&
		!expr.Eval(func(tag string) bool { return tag == "wasm" }) &&
		!expr.Eval(func(tag string) bool { return tag == "linux" || tag == "amd64" })
}

func TestAllWasmTags(t *testing.T) {
	files, err := filepath.Glob("*.go")
	if err != nil {
		t.Fatal(err)
	}
	seen := 0
	for _, path := range files {
		if path == "wasm_tags_test.go" {
			continue
		}
		seen++
		src, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		tagged := false
		for _, line := range strings.Split(string(src), "\n") {
			line = strings.TrimSpace(line)
			if line == "" {
				continue
			}
			if !strings.HasPrefix(line, "//") {
				break
			}
			if expr, err := constraint.Parse(line); err == nil && isJSWasm(expr) {
				tagged = true
			}
		}
		if !tagged {
			t.Errorf("%s lacks the //go:build js && wasm constraint", path)
		}
		f, err := parser.ParseFile(token.NewFileSet(), path, src, parser.ImportsOnly)
		if err != nil {
			t.Fatal(err)
		}
		for _, imp := range f.Imports {
			if p, _ := strconv.Unquote(imp.Path.Value); p == "syscall/js" {
				t.Errorf("%s imports syscall/js; use github.com/hack-pad/safejs", path)
			}
		}
	}
	if seen == 0 {
		t.Error("no Go files found in wasm/")
	}
}

func TestConstraintCheck(t *testing.T) {
	// The checker itself: common practice, no source.
	for line, want := range map[string]bool{
		"//go:build js && wasm": true,
		"//go:build wasm && js": true,
		"//go:build js":         false,
		"//go:build js || wasm": false,
		"//go:build !js":        false,
		"//go:build linux":      false,
	} {
		expr, err := constraint.Parse(line)
		if err != nil {
			t.Fatal(err)
		}
		if got := isJSWasm(expr); got != want {
			t.Errorf("isJSWasm(%q) = %v, want %v", line, got, want)
		}
	}
}
