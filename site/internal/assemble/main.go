package main

import (
	"flag"
	"fmt"
	"os"

	"github.com/rootshift/rootshift/breaks/battery"
	"github.com/rootshift/rootshift/site"
)

func main() {
	wasm := flag.String("wasm", "", "gzipped engine (GOOS=js GOARCH=wasm build of ./wasm)")
	raw := flag.Int("raw-size", 0, "size of the engine before gzip, bytes")
	exec := flag.String("exec", "", "wasm_exec.js from $(go env GOROOT)/lib/wasm/")
	out := flag.String("o", "site/dist/rootshift.html", "output page")
	flag.Parse()
	if err := run(*wasm, *raw, *exec, *out); err != nil {
		fmt.Fprintln(os.Stderr, "assemble:", err)
		os.Exit(1)
	}
}

func run(wasmPath string, raw int, execPath, out string) error {
	gz, err := os.ReadFile(wasmPath)
	if err != nil {
		return err
	}
	ex, err := os.ReadFile(execPath)
	if err != nil {
		return err
	}
	page, err := site.Assemble(site.Assets{WasmGz: gz, WasmSize: raw, WasmExec: ex, Version: battery.Version})
	if err != nil {
		return err
	}
	tmp := out + ".tmp"
	if err := os.WriteFile(tmp, page, 0o644); err != nil {
		return err
	}
	if err := os.Rename(tmp, out); err != nil {
		return err
	}
	fmt.Fprintf(os.Stderr, "assemble: wrote %s (%.2f MB; engine %.2f MB raw, %.2f MB gzipped)\n",
		out, float64(len(page))/1e6, float64(raw)/1e6, float64(len(gz))/1e6)
	return nil
}
