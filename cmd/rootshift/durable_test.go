// Fault-injection tests of batch output (issue "Nothing lost, nothing
// injected", item 1): an output that fails at its k-th byte, for every k
// over a small run, leaves files of whole lines that agree with each other,
// with the summary line and with the exit status. The series are simulated
// here (common practice, no source).
package main

import (
	"bytes"
	"errors"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"syscall"
	"testing"
)

// failingFile is an output file that accepts budget bytes in all (shared
// with the other outputs of the run), then fails like a full disk.
type failingFile struct {
	*os.File
	budget *int
}

// Sync is a no-op: durability against power loss is not what is tested,
// and syncing thousands of small files would dominate the test's time.
func (f failingFile) Sync() error { return nil }

func (f failingFile) Write(b []byte) (int, error) {
	if *f.budget >= len(b) {
		*f.budget -= len(b)
		return f.File.Write(b)
	}
	n := *f.budget
	*f.budget = 0
	f.File.Write(b[:n])
	return n, &os.PathError{Op: "write", Path: f.Name(), Err: syscall.ENOSPC}
}

// failingWriter is standard output failing after budget bytes.
type failingWriter struct {
	bytes.Buffer
	budget int
}

func (w *failingWriter) Write(b []byte) (int, error) {
	if w.budget >= len(b) {
		w.budget -= len(b)
		return w.Buffer.Write(b)
	}
	n := w.budget
	w.budget = 0
	w.Buffer.Write(b[:n])
	return n, errors.New("broken pipe")
}

func smallJSONL(n, T int) string {
	r := rand.New(rand.NewPCG(11, 4))
	var b strings.Builder
	for k := 0; k < n; k++ {
		vals := make([]string, T)
		s := 0.0
		for i := range vals {
			s += r.NormFloat64()
			vals[i] = fmt.Sprintf("%.3f", s)
		}
		fmt.Fprintf(&b, `{"id":"s%d","values":[%s]}`+"\n", k, strings.Join(vals, ","))
	}
	b.WriteString(`{"id":"bad","values":[1,2,"x"]}` + "\n")
	return b.String()
}

var summaryRE = regexp.MustCompile(`(\d+) series read, (\d+) tested, (\d+) failed`)

func summaryCount(t *testing.T, stderr string) int {
	t.Helper()
	m := summaryRE.FindStringSubmatch(stderr)
	if m == nil {
		t.Fatalf("no summary line in %q", stderr)
	}
	a, _ := strconv.Atoi(m[2])
	b, _ := strconv.Atoi(m[3])
	return a + b
}

func wholeLines(t *testing.T, what string, b []byte) int {
	t.Helper()
	if len(b) > 0 && b[len(b)-1] != '\n' {
		t.Fatalf("%s ends with a partial line: %q", what, b[max(0, len(b)-40):])
	}
	return bytes.Count(b, []byte("\n"))
}

func TestBatchFaultInjection(t *testing.T) {
	dir := t.TempDir()
	in := filepath.Join(dir, "in.jsonl")
	if err := os.WriteFile(in, []byte(smallJSONL(2, 30)), 0o644); err != nil {
		t.Fatal(err)
	}
	old, oldGroup := openOutFile, groupBytesDefault
	defer func() { openOutFile, groupBytesDefault = old, oldGroup }()
	groupBytesDefault = 1 // every record its own group
	args := func(o string) []string {
		return []string{"batch", "--jsonl", "--tests", "kpss", "--lean", "--progress-every", "0", "-j", "1",
			"-o", o + ".jsonl", "--csv", o + ".csv", "--verdicts", o + ".v.csv", in}
	}
	// The full run: its total size bounds k.
	budget := 1 << 30
	openOutFile = func(path string, fresh bool) (outFile, error) {
		f, err := old(path, fresh)
		if err != nil {
			return nil, err
		}
		return failingFile{f.(*os.File), &budget}, nil
	}
	full := filepath.Join(dir, "full")
	if code, _, stderr := runCLI(t, "", args(full)...); code != exitFailed {
		t.Fatalf("full run: exit %d, want 1 (one bad record): %s", code, stderr)
	}
	fullJSONL, _ := os.ReadFile(full + ".jsonl")
	fullCSV, _ := os.ReadFile(full + ".csv")
	fullV, _ := os.ReadFile(full + ".v.csv")
	total := len(fullJSONL) + len(fullCSV) + len(fullV)
	records := wholeLines(t, "full", fullJSONL)
	if records != 3 {
		t.Fatalf("full run: %d records, want 3", records)
	}
	csvPerRecord := (wholeLines(t, "csv", fullCSV) - 1) / records
	for k := 0; k <= total; k++ {
		budget = k
		o := filepath.Join(dir, fmt.Sprintf("k%d", k))
		code, _, stderr := runCLI(t, "", args(o)...)
		j, _ := os.ReadFile(o + ".jsonl")
		c, _ := os.ReadFile(o + ".csv")
		v, _ := os.ReadFile(o + ".v.csv")
		n := wholeLines(t, "records", j)
		if got := summaryCount(t, stderr); got != n {
			t.Fatalf("k=%d: summary counts %d records, the file holds %d", k, got, n)
		}
		if !bytes.HasPrefix(fullJSONL, j) {
			t.Fatalf("k=%d: the records are not a prefix of the full run's", k)
		}
		if nc := wholeLines(t, "csv", c); n > 0 && nc != 1+n*csvPerRecord || n == 0 && nc != 0 {
			t.Fatalf("k=%d: %d records but %d summary CSV lines", k, n, nc)
		}
		if nv := wholeLines(t, "verdicts", v); n > 0 && nv != 1+n || n == 0 && nv != 0 {
			t.Fatalf("k=%d: %d records but %d verdict lines", k, n, nv)
		}
		switch {
		case k < total && code != exitOutput:
			t.Fatalf("k=%d of %d: exit %d, want %d (output failed): %s", k, total, code, exitOutput, stderr)
		case k == total && code != exitFailed:
			t.Fatalf("k=%d (everything fits): exit %d, want 1", k, code)
		}
		os.Remove(o + ".jsonl")
		os.Remove(o + ".csv")
		os.Remove(o + ".v.csv")
	}
	t.Logf("%d failure points checked", total+1)

	// Standard output failing at byte k: the summary counts only whole
	// records that were accepted.
	openOutFile = old
	stdArgs := []string{"batch", "--jsonl", "--tests", "kpss", "--lean", "-j", "1", "-"}
	_, stdFull, _ := runCLI(t, smallJSONL(2, 30), stdArgs...)
	for k := 0; k <= len(stdFull); k += 3 {
		w := &failingWriter{budget: k}
		var errb bytes.Buffer
		code := run(t.Context(), stdArgs, strings.NewReader(smallJSONL(2, 30)), w, &errb)
		complete := bytes.Count(w.Bytes(), []byte("\n"))
		if got := summaryCount(t, errb.String()); got != complete {
			t.Fatalf("stdout k=%d: summary counts %d, %d whole lines written", k, got, complete)
		}
		if k < len(stdFull) && code != exitOutput {
			t.Fatalf("stdout k=%d: exit %d, want %d", k, code, exitOutput)
		}
	}
}

// TestBatchDiskFull writes to /dev/full (every write fails with "no space
// left on device"), the closest to a full disk a test can get without
// mounting a filesystem: exit status 3 and a summary of zero records.
func TestBatchDiskFull(t *testing.T) {
	if _, err := os.Stat("/dev/full"); err != nil {
		t.Skip("no /dev/full here")
	}
	in := filepath.Join(t.TempDir(), "in.jsonl")
	os.WriteFile(in, []byte(smallJSONL(5, 40)), 0o644)
	code, _, stderr := runCLI(t, "", "batch", "--jsonl", "--tests", "kpss", "-o", "/dev/full", in)
	if code != exitOutput || summaryCount(t, stderr) != 0 || !strings.Contains(stderr, "no space left") {
		t.Fatalf("exit %d, stderr %q: want %d, zero records counted and the cause", code, stderr, exitOutput)
	}
	f, err := os.OpenFile("/dev/full", os.O_WRONLY, 0)
	if err != nil {
		t.Skip(err)
	}
	defer f.Close()
	code = run(t.Context(), []string{"test", "--json", "--tests", "adf", "../../testdata/demo.csv"}, strings.NewReader(""), f, &bytes.Buffer{})
	if code != exitOutput {
		t.Errorf("test --json to a full disk: exit %d, want %d", code, exitOutput)
	}
}
