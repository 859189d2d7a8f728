// Scale-out on job-array schedulers (issue "The CLI as fast as its engine",
// item 3): --shard auto reads a Slurm array's or a Kubernetes Indexed Job's
// variables; the example job script and manifest in doc/scale-out run here
// with those variables set locally, and `batch merge` joins their parts into
// exactly the output of one run, or reports missing and duplicated series.
// Simulated series (common practice, no source).
package main

import (
	"encoding/json"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/rootshift/rootshift/breaks/batch"
)

func TestParseShardAuto(t *testing.T) {
	for _, tc := range []struct {
		env    map[string]string
		flag   int
		i, n   int
		errSub string
	}{
		{env: map[string]string{"SLURM_ARRAY_TASK_ID": "3", "SLURM_ARRAY_TASK_MIN": "1", "SLURM_ARRAY_TASK_MAX": "8"}, i: 3, n: 8},
		{env: map[string]string{"SLURM_ARRAY_TASK_ID": "0", "SLURM_ARRAY_TASK_MIN": "0", "SLURM_ARRAY_TASK_MAX": "4"}, i: 1, n: 5},
		{env: map[string]string{"SLURM_ARRAY_TASK_ID": "14", "SLURM_ARRAY_TASK_MIN": "10", "SLURM_ARRAY_TASK_MAX": "18", "SLURM_ARRAY_TASK_STEP": "2"}, i: 3, n: 5},
		{env: map[string]string{"SLURM_ARRAY_TASK_ID": "2", "SLURM_ARRAY_TASK_COUNT": "4"}, i: 3, n: 4},
		{env: map[string]string{"SLURM_ARRAY_TASK_ID": "2"}, errSub: "SLURM_ARRAY_TASK_COUNT"},
		{env: map[string]string{"SLURM_ARRAY_TASK_ID": "x", "SLURM_ARRAY_TASK_COUNT": "4"}, errSub: "not a whole number"},
		{env: map[string]string{"JOB_COMPLETION_INDEX": "0"}, flag: 6, i: 1, n: 6},
		{env: map[string]string{"JOB_COMPLETION_INDEX": "5", "ROOTSHIFT_SHARDS": "6"}, i: 6, n: 6},
		{env: map[string]string{"JOB_COMPLETION_INDEX": "6", "ROOTSHIFT_SHARDS": "6"}, errSub: "want 1 <= i <= n"},
		{env: map[string]string{"JOB_COMPLETION_INDEX": "1"}, errSub: "--shards"},
		{env: map[string]string{}, errSub: "no job-array variables"},
	} {
		i, n, _, err := parseShard("auto", tc.flag, func(k string) string { return tc.env[k] })
		if tc.errSub != "" {
			if err == nil || !strings.Contains(err.Error(), tc.errSub) {
				t.Errorf("%v: error %v, want one mentioning %q", tc.env, err, tc.errSub)
			}
			continue
		}
		if err != nil || i != tc.i || n != tc.n {
			t.Errorf("%v: shard %d/%d (%v), want %d/%d", tc.env, i, n, err, tc.i, tc.n)
		}
	}
}

// scaleoutInput writes a directory of wide files and returns it with the
// output of one unsharded run.
func scaleoutInput(t *testing.T) (string, string) {
	t.Helper()
	dir := filepath.Join(t.TempDir(), "series")
	os.MkdirAll(dir, 0o755)
	for f := 0; f < 6; f++ {
		writeWide(t, filepath.Join(dir, fmt.Sprintf("f%d.csv", f)), 4+f%3, 60)
	}
	os.WriteFile(filepath.Join(dir, "broken.csv"), []byte("a,b\n1,x\n"), 0o644)
	full := filepath.Join(t.TempDir(), "full.jsonl")
	code, _, stderr := runCLI(t, "", "batch", "--quiet", "-o", full, dir)
	if code != exitFailed {
		t.Fatalf("single run: exit %d: %s", code, stderr)
	}
	return dir, full
}

// cliOnPath puts a "rootshift" wrapper around the test binary on PATH.
func cliOnPath(t *testing.T) []string {
	t.Helper()
	exe, err := os.Executable()
	if err != nil {
		t.Fatal(err)
	}
	bin := t.TempDir()
	script := "#!/bin/sh\nROOTSHIFT_AS_CLI=1 exec " + exe + " \"$@\"\n"
	if err := os.WriteFile(filepath.Join(bin, "rootshift"), []byte(script), 0o755); err != nil {
		t.Fatal(err)
	}
	return append(os.Environ(), "PATH="+bin+string(os.PathListSeparator)+os.Getenv("PATH"))
}

func mergeAndCompare(t *testing.T, parts []string, full string) {
	t.Helper()
	merged := filepath.Join(t.TempDir(), "merged.jsonl")
	code, _, stderr := runCLI(t, "", append(append([]string{"batch", "merge", "-o", merged}, parts...), "--quiet")...)
	if code != exitOK {
		t.Fatalf("merge: exit %d: %s", code, stderr)
	}
	a, _ := os.ReadFile(full)
	b, _ := os.ReadFile(merged)
	if string(a) != string(b) {
		t.Fatalf("merged parts (%d bytes) differ from the single run (%d bytes)", len(b), len(a))
	}
}

func TestSlurmArrayScript(t *testing.T) {
	if _, err := exec.LookPath("bash"); err != nil {
		t.Skip("no bash")
	}
	dir, full := scaleoutInput(t)
	env := cliOnPath(t)
	out := t.TempDir()
	const tasks = 4
	var parts []string
	for id := 1; id <= tasks; id++ {
		cmd := exec.Command("bash", "../../doc/scale-out/slurm-array.sh")
		cmd.Env = append(env, "INPUT="+dir, "OUT="+out, "SLURM_ARRAY_TASK_ID="+strconv.Itoa(id),
			"SLURM_ARRAY_TASK_MIN=1", "SLURM_ARRAY_TASK_MAX="+strconv.Itoa(tasks), "SLURM_CPUS_PER_TASK=1")
		if b, err := cmd.CombinedOutput(); err != nil {
			t.Fatalf("task %d: %v: %s", id, err, b)
		}
		parts = append(parts, filepath.Join(out, fmt.Sprintf("part-%d.jsonl", id)))
	}
	mergeAndCompare(t, parts, full)
}

func TestIndexedJobManifest(t *testing.T) {
	manifest, err := os.ReadFile("../../doc/scale-out/indexed-job.yaml")
	if err != nil {
		t.Fatal(err)
	}
	completions := regexp.MustCompile(`(?m)^\s+completions: (\d+)$`).FindSubmatch(manifest)
	shards := regexp.MustCompile(`(?m)name: ROOTSHIFT_SHARDS\s+value: "(\d+)"`).FindSubmatch(manifest)
	command := regexp.MustCompile(`(?m)^\s+args:\n\s+- (.+)$`).FindSubmatch(manifest)
	if completions == nil || shards == nil || command == nil {
		t.Fatal("the manifest lost its completions, ROOTSHIFT_SHARDS or args")
	}
	if string(completions[1]) != string(shards[1]) {
		t.Fatalf("completions %s but ROOTSHIFT_SHARDS %s", completions[1], shards[1])
	}
	n, _ := strconv.Atoi(string(shards[1]))
	series, full := scaleoutInput(t)
	data := filepath.Dir(series)
	env := cliOnPath(t)
	var parts []string
	for idx := 0; idx < n; idx++ {
		cmd := exec.Command("sh", "-c", string(command[1]))
		cmd.Env = append(env, "DATA="+data, "ROOTSHIFT_SHARDS="+string(shards[1]), "JOB_COMPLETION_INDEX="+strconv.Itoa(idx))
		if b, err := cmd.CombinedOutput(); err != nil {
			t.Fatalf("pod %d: %v: %s", idx, err, b)
		}
		parts = append(parts, filepath.Join(data, "parts", fmt.Sprintf("part-%d.jsonl", idx)))
	}
	mergeAndCompare(t, parts, full)
}

func TestMergeMissingAndDuplicated(t *testing.T) {
	dir, full := scaleoutInput(t)
	out := t.TempDir()
	var parts []string
	for i := 1; i <= 3; i++ {
		p := filepath.Join(out, fmt.Sprintf("p%d.jsonl", i))
		code, _, stderr := runCLI(t, "", "batch", "--quiet", "--shard", fmt.Sprintf("%d/3", i), "-o", p, dir)
		if code > exitFailed {
			t.Fatalf("shard %d: exit %d: %s", i, code, stderr)
		}
		parts = append(parts, p)
	}
	mergeAndCompare(t, parts, full)
	merged := filepath.Join(out, "m.jsonl")
	// A part left out: its series are missing (with --total, also at the end).
	total := countLines(t, full)
	code, _, stderr := runCLI(t, "", "batch", "merge", "--total", strconv.Itoa(total), "-o", merged, parts[0], parts[1])
	if code != exitFailed || !strings.Contains(stderr, "series missing") {
		t.Errorf("a missing part: exit %d, %q", code, stderr)
	}
	// A part given twice: every one of its series is duplicated.
	code, _, stderr = runCLI(t, "", "batch", "merge", "-o", merged, parts[0], parts[1], parts[2], parts[1])
	if code != exitFailed || !strings.Contains(stderr, "more than once") {
		t.Errorf("a duplicated part: exit %d, %q", code, stderr)
	}
	if _, err := os.Stat(merged); err == nil {
		t.Error("a failed merge wrote its output")
	}
}

// TestMergeSpeed: 16 shard files of 10,000 series in all are merged in
// under 2 s (issue target). The records are real batch records (lean, two
// tests) of simulated series.
func TestMergeSpeed(t *testing.T) {
	if testing.Short() {
		t.Skip("10,000-series run skipped in -short mode")
	}
	dir := t.TempDir()
	in := filepath.Join(dir, "in.jsonl")
	os.WriteFile(in, []byte(smallJSONL(9999, 100)), 0o644)
	var parts []string
	for i := 1; i <= 16; i++ {
		parts = append(parts, filepath.Join(dir, fmt.Sprintf("p%02d.jsonl", i)))
	}
	full := filepath.Join(dir, "full.jsonl")
	if code, _, stderr := runCLI(t, "", "batch", "--jsonl", "--tests", "adf,kpss", "--quiet", "-o", full, in); code != exitFailed {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	// Split the single run's records as 16 shards would.
	splitByShard(t, full, parts)
	start := time.Now()
	merged := filepath.Join(dir, "merged.jsonl")
	code, _, stderr := runCLI(t, "", append([]string{"batch", "merge", "--quiet", "-o", merged}, parts...)...)
	el := time.Since(start)
	if code != exitOK {
		t.Fatalf("merge: exit %d: %s", code, stderr)
	}
	st, _ := os.Stat(merged)
	t.Logf("merged 16 parts, %d records, %.1f MB in %.2f s", countLines(t, merged), float64(st.Size())/(1<<20), el.Seconds())
	if el > 2*time.Second {
		t.Errorf("merge took %.2f s, target under 2 s", el.Seconds())
	}
}

func splitByShard(t *testing.T, full string, parts []string) {
	t.Helper()
	lines := readLines(t, full)
	files := make([][]byte, len(parts))
	for _, l := range lines {
		var rec struct {
			Source struct{ Name string }   `json:"source"`
			Series []struct{ Name string } `json:"series"`
		}
		if err := json.Unmarshal([]byte(l), &rec); err != nil {
			t.Fatal(err)
		}
		for i := range parts {
			if batch.InShard(batch.ID(rec.Source.Name, rec.Series[0].Name), i+1, len(parts)) {
				files[i] = append(files[i], l+"\n"...)
			}
		}
	}
	for i, p := range parts {
		if err := os.WriteFile(p, files[i], 0o644); err != nil {
			t.Fatal(err)
		}
	}
}
