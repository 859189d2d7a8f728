// Tests of batch --resume and of SIGTERM (issue "Nothing lost, nothing
// injected", items 1 and 3): inputs are matched by canonical path and
// content fingerprint, side files are rebuilt from the records kept,
// changed settings or inputs are refused unless --start-over, and a
// terminated run leaves whole lines and a summary. Simulated series (common
// practice, no source).
package main

import (
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"syscall"
	"testing"
	"time"
)

func TestBatchResumeSideFilesAndSettings(t *testing.T) {
	dir := t.TempDir()
	in := filepath.Join(dir, "in.jsonl")
	if err := os.WriteFile(in, []byte(smallJSONL(30, 60)), 0o644); err != nil {
		t.Fatal(err)
	}
	base := []string{"batch", "--jsonl", "--tests", "kpss,adf", "--lean", "--quiet"}
	outs := func(o string) []string {
		return []string{"-o", o + ".jsonl", "--csv", o + ".csv", "--verdicts", o + ".v.csv"}
	}
	full := filepath.Join(dir, "full")
	if code, _, stderr := runCLI(t, "", append(append(slices.Clone(base), outs(full)...), in)...); code != exitFailed {
		t.Fatalf("full run: exit %d: %s", code, stderr)
	}
	read := func(p string) string { b, _ := os.ReadFile(p); return string(b) }

	// An interrupted run: 10 whole records and a partial one; side files
	// out of step (fewer rows, a partial row).
	part := filepath.Join(dir, "part")
	lines := strings.SplitAfter(read(full+".jsonl"), "\n")
	os.WriteFile(part+".jsonl", []byte(strings.Join(lines[:10], "")+lines[10][:50]), 0o644)
	csvLines := strings.SplitAfter(read(full+".csv"), "\n")
	os.WriteFile(part+".csv", []byte(strings.Join(csvLines[:5], "")+"partial,ro"), 0o644)
	os.WriteFile(part+".v.csv", nil, 0o644)

	// Resume naming the input by a relative path through a symbolic link:
	// the same file, so the 10 series are not run again.
	link := filepath.Join(dir, "link")
	if err := os.Symlink(dir, link); err != nil {
		t.Skip("no symbolic links here:", err)
	}
	wd, _ := os.Getwd()
	rel, err := filepath.Rel(wd, filepath.Join(link, "in.jsonl"))
	if err != nil {
		t.Fatal(err)
	}
	code, _, stderr := runCLI(t, "", append(append(append(slices.Clone(base), "--resume"), outs(part)...), rel)...)
	if code != exitFailed {
		t.Fatalf("resume: exit %d: %s", code, stderr)
	}
	// The records name the input as given (source.name), so compare
	// everything else: the canonical path, fingerprint and results.
	norm := func(s string) string {
		return strings.ReplaceAll(s, `"name":"`+rel+`"`, `"name":"`+in+`"`)
	}
	if got, want := norm(read(part+".jsonl")), read(full+".jsonl"); got != want {
		t.Fatalf("resumed records differ from the uninterrupted run (%d vs %d lines)", strings.Count(got, "\n"), strings.Count(want, "\n"))
	}
	if got, want := norm(strings.ReplaceAll(read(part+".csv"), rel+":", in+":")), read(full+".csv"); got != want {
		t.Errorf("resumed summary CSV differs from the uninterrupted run:\n%s\nwant\n%s", got, want)
	}
	if got, want := strings.ReplaceAll(read(part+".v.csv"), rel+":", in+":"), read(full+".v.csv"); got != want {
		t.Errorf("resumed verdict CSV differs from the uninterrupted run:\n%s\nwant\n%s", got, want)
	}

	// Changed settings: refused with the difference, output untouched.
	before := read(part + ".jsonl")
	code, _, stderr = runCLI(t, "", append(append([]string{"batch", "--jsonl", "--tests", "kpss,adf", "--lean", "--quiet", "--level", "0.1", "--resume"}, outs(part)...), in)...)
	if code != exitUsage || !strings.Contains(stderr, "level") || !strings.Contains(stderr, "--start-over") {
		t.Fatalf("changed settings: exit %d, stderr %q: want a refusal naming level and --start-over", code, stderr)
	}
	if read(part+".jsonl") != before {
		t.Fatal("a refused resume changed the output")
	}
	// Changed input content: refused.
	os.WriteFile(in, []byte(smallJSONL(31, 60)), 0o644)
	code, _, stderr = runCLI(t, "", append(append(append(slices.Clone(base), "--resume"), outs(part)...), in)...)
	if code != exitUsage || !strings.Contains(stderr, "changed") {
		t.Fatalf("changed input: exit %d, stderr %q", code, stderr)
	}
	// --start-over runs everything afresh.
	code, _, stderr = runCLI(t, "", append(append(append(slices.Clone(base), "--resume", "--start-over"), outs(part)...), in)...)
	if code != exitFailed || strings.Count(read(part+".jsonl"), "\n") != 32 {
		t.Fatalf("start over: exit %d, %d records: %s", code, strings.Count(read(part+".jsonl"), "\n"), stderr)
	}
}

// TestBatchSIGTERM: SIGTERM part way leaves whole lines, a summary and exit
// status 143; a resumed run completes the output to equal an uninterrupted
// one (after sorting).
func TestBatchSIGTERM(t *testing.T) {
	if testing.Short() {
		t.Skip("subprocess run skipped in -short mode")
	}
	dir := t.TempDir()
	in := filepath.Join(dir, "in.jsonl")
	if err := os.WriteFile(in, []byte(smallJSONL(400, 200)), 0o644); err != nil {
		t.Fatal(err)
	}
	args := []string{"batch", "--jsonl", "--tests", "adf,kpss,za", "-j", "2", "--progress-every", "50"}
	full := filepath.Join(dir, "full.jsonl")
	if code, _, stderr := runCLI(t, "", append(slices.Clone(args), "--quiet", "-o", full, in)...); code != exitFailed {
		t.Fatalf("full run: exit %d: %s", code, stderr)
	}
	out := filepath.Join(dir, "out.jsonl")
	exe, _ := os.Executable()
	cmd := exec.Command(exe, append(slices.Clone(args), "-o", out, in)...)
	cmd.Env = append(os.Environ(), "ROOTSHIFT_AS_CLI=1")
	var errb strings.Builder
	cmd.Stderr = &errb
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	deadline := time.Now().Add(30 * time.Second)
	for time.Now().Before(deadline) {
		time.Sleep(10 * time.Millisecond)
		if st, err := os.Stat(out); err == nil && st.Size() > 0 {
			break
		}
	}
	cmd.Process.Signal(syscall.SIGTERM)
	cmd.Wait()
	code := cmd.ProcessState.ExitCode()
	b, _ := os.ReadFile(out)
	n := strings.Count(string(b), "\n")
	if n >= 401 {
		t.Skipf("the run finished before SIGTERM arrived")
	}
	if code != exitTerm {
		t.Fatalf("exit %d after SIGTERM, want %d; stderr %s", code, exitTerm, errb.String())
	}
	if len(b) > 0 && b[len(b)-1] != '\n' {
		t.Fatal("partial line after SIGTERM")
	}
	if got := summaryCount(t, errb.String()); got != n {
		t.Fatalf("summary counts %d records, the file holds %d", got, n)
	}
	if code, _, stderr := runCLI(t, "", append(slices.Clone(args), "--quiet", "--resume", "-o", out, in)...); code != exitFailed {
		t.Fatalf("resume: exit %d: %s", code, stderr)
	}
	a, c := readLines(t, full), readLines(t, out)
	slices.Sort(a)
	slices.Sort(c)
	if !slices.Equal(a, c) {
		t.Fatalf("terminated after %d records and resumed: %d records differ from the uninterrupted run (%d)", n, len(c), len(a))
	}
	t.Logf("terminated after %d of 401 records", n)
}
