package main

import (
	"bytes"
	"context"
	"os"
	"strings"
	"testing"
)

// TestMain lets the test binary act as the command when ROOTSHIFT_AS_CLI=1,
// so end-to-end tests can run it as a separate process (and kill it).
func TestMain(m *testing.M) {
	if os.Getenv("ROOTSHIFT_AS_CLI") == "1" {
		os.Exit(run(signalContext(), os.Args[1:], os.Stdin, os.Stdout, os.Stderr))
	}
	os.Exit(m.Run())
}

// runCLI runs the command in-process and returns its exit status and outputs.
func runCLI(t *testing.T, stdin string, args ...string) (int, string, string) {
	t.Helper()
	var out, errb bytes.Buffer
	code := run(context.Background(), args, strings.NewReader(stdin), &out, &errb)
	return code, out.String(), errb.String()
}

// runCLIb is runCLI for benchmarks: standard output is counted, not kept.
func runCLIb(args ...string) (int, int64, string) {
	var out countWriter
	var errb bytes.Buffer
	code := run(context.Background(), args, strings.NewReader(""), &out, &errb)
	return code, int64(out), errb.String()
}

type countWriter int64

func (c *countWriter) Write(b []byte) (int, error) { *c += countWriter(len(b)); return len(b), nil }
