package main

import (
	"fmt"
	"os"

	"github.com/rootshift/rootshift/site"
)

func (e *env) page(args []string) int {
	var out string
	fs := newFlagSet("page", e.stdout, "Usage: rootshift page -o FILE\n\nWrites the offline page: one self-contained HTML file with the whole engine\ncompiled to WebAssembly. Open it by double-click; it never sends data anywhere.")
	fs.StringVar(&out, "o", "rootshift.html", "output `file`")
	if _, err := parseInterleaved(fs, args); err != nil {
		return e.usageExit(err)
	}
	b, err := site.Page()
	if err != nil {
		e.errorf("page: %v", err)
		return exitFailed
	}
	if err := os.WriteFile(out, b, 0o644); err != nil {
		e.errorf("page: %v", err)
		return exitUsage
	}
	fmt.Fprintf(e.stderr, "rootshift: wrote %s (%.1f MB); open it in a browser, no network needed\n", out, float64(len(b))/1e6)
	return exitOK
}
