package main

import (
	"bytes"
	"context"
	"flag"
	"fmt"
	"os"
	"time"

	"github.com/rootshift/rootshift/breaks/battery"
	"github.com/rootshift/rootshift/core/schema"
)

func main() {
	draws := flag.Int("draws", 500, "draws per process")
	T := flag.Int("n", 200, "series length")
	seed := flag.Uint64("seed", 2026, "seed")
	lagRule := flag.String("lag-rule", "", "lag rule for every test (default: each test's own)")
	out := flag.String("o", "", "write the Markdown table here (default standard output)")
	flag.Parse()
	start := time.Now()
	rows, err := battery.Study(context.Background(), *draws, *T, *seed, schema.Settings{LagRule: *lagRule}, func(done, total int) {
		if done%100 == 0 || done == total {
			fmt.Fprintf(os.Stderr, "\r%d/%d series", done, total)
		}
	})
	fmt.Fprintln(os.Stderr)
	if err != nil {
		fmt.Fprintln(os.Stderr, "confusion:", err)
		os.Exit(1)
	}
	var b bytes.Buffer
	battery.WriteStudy(&b, rows, *T, *seed)
	fmt.Fprintf(os.Stderr, "%.0f s\n", time.Since(start).Seconds())
	if *out == "" {
		os.Stdout.Write(b.Bytes())
		return
	}
	if err := os.WriteFile(*out, b.Bytes(), 0o644); err != nil {
		fmt.Fprintln(os.Stderr, "confusion:", err)
		os.Exit(1)
	}
}
