// Tests that inputs and outputs never collide (issue "Nothing lost, nothing
// injected", item 2) and that an empty input is its own exit status (item
// 6). Simulated series (common practice, no source).
package main

import (
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
)

func writeWide(t *testing.T, path string, cols, T int) {
	t.Helper()
	r := rand.New(rand.NewPCG(5, uint64(cols)))
	var b strings.Builder
	for j := 0; j < cols; j++ {
		if j > 0 {
			b.WriteString(",")
		}
		fmt.Fprintf(&b, "c%d", j)
	}
	b.WriteString("\n")
	s := make([]float64, cols)
	for i := 0; i < T; i++ {
		for j := range s {
			s[j] += r.NormFloat64()
			if j > 0 {
				b.WriteString(",")
			}
			fmt.Fprintf(&b, "%.4f", s[j])
		}
		b.WriteString("\n")
	}
	if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
}

func TestBatchOutputIsInput(t *testing.T) {
	dir := t.TempDir()
	in := filepath.Join(dir, "mine.csv")
	writeWide(t, in, 2, 50)
	before, _ := os.ReadFile(in)
	for _, flagName := range []string{"-o", "--csv", "--verdicts"} {
		code, _, stderr := runCLI(t, "", "batch", "--tests", "kpss", "--quiet", flagName, in, in)
		if code != exitUsage || !strings.Contains(stderr, "also an input") {
			t.Errorf("%s equal to the input: exit %d, %q", flagName, code, stderr)
		}
	}
	// The same file by another spelling.
	code, _, _ := runCLI(t, "", "batch", "--tests", "kpss", "--quiet", "-o", filepath.Join(dir, ".", "mine.csv"), in)
	if code != exitUsage {
		t.Errorf("output equal to the input by another path: exit %d, want 2", code)
	}
	if after, _ := os.ReadFile(in); string(after) != string(before) {
		t.Fatal("the input was changed")
	}
}

func TestBatchOutputsInsideInputDir(t *testing.T) {
	dir := t.TempDir()
	writeWide(t, filepath.Join(dir, "a.csv"), 3, 50)
	writeWide(t, filepath.Join(dir, "b.csv"), 2, 50)
	if err := syscall.Mkfifo(filepath.Join(dir, "pipe.csv"), 0o644); err != nil {
		t.Log("no named pipe here:", err)
	}
	args := []string{"batch", "--tests", "kpss", "-o", filepath.Join(dir, "out.jsonl"), "--csv", filepath.Join(dir, "sum.csv"),
		"--verdicts", filepath.Join(dir, "v.csv"), dir}
	for run := 1; run <= 2; run++ {
		code, _, stderr := runCLI(t, "", args...)
		if code != exitOK {
			t.Fatalf("run %d: exit %d: %s", run, code, stderr)
		}
		if n := countLines(t, filepath.Join(dir, "out.jsonl")); n != 5 {
			t.Fatalf("run %d: %d records, want 5 (the outputs are never read back): %s", run, n, stderr)
		}
		if run == 2 && !strings.Contains(stderr, "out.jsonl: skipped") {
			t.Errorf("run 2: no note about the skipped output: %s", stderr)
		}
		if _, err := os.Stat(filepath.Join(dir, "pipe.csv")); err == nil && !strings.Contains(stderr, "not a regular file") {
			t.Errorf("run %d: the named pipe was not noted: %s", run, stderr)
		}
	}
	// An earlier output under another name is recognised by its marker.
	os.Rename(filepath.Join(dir, "out.jsonl"), filepath.Join(dir, "old.jsonl"))
	code, _, stderr := runCLI(t, "", append(args[:len(args)-1:len(args)-1], dir)...)
	if code != exitOK || !strings.Contains(stderr, "old.jsonl: skipped, it is an output of rootshift") {
		t.Fatalf("a previous output in the input directory: exit %d: %s", code, stderr)
	}
}

func TestNothingToProcess(t *testing.T) {
	dir := t.TempDir()
	for _, tc := range []struct {
		name  string
		stdin string
		args  []string
	}{
		{"empty stdin", "", []string{"batch", "--jsonl", "--tests", "kpss", "-"}},
		{"blank stdin", "\n\n", []string{"batch", "--jsonl", "--tests", "kpss", "-"}},
		{"no matching files", "", []string{"batch", "--tests", "kpss", dir}},
	} {
		code, _, stderr := runCLI(t, tc.stdin, tc.args...)
		if code != exitNothing || !strings.Contains(stderr, "nothing to process") {
			t.Errorf("%s: exit %d, stderr %q: want %d and a message", tc.name, code, stderr, exitNothing)
		}
	}
}
