// Bounded resources and settings that say what they mean (issue "Nothing
// lost, nothing injected", items 3, 4 and 6): a simulation whose memory
// estimate exceeds the limit is refused before it starts, with --force
// named; zero values that would mean "the default" are refused with their
// range; the bandwidth message states its range.
package main

import (
	"strings"
	"testing"
)

func TestCriticalRefusesHugeN(t *testing.T) {
	code, _, stderr := runCLI(t, "", "critical", "--test", "adf", "--n", "1000000000", "--sims", "10")
	if code != exitUsage || !strings.Contains(stderr, "GB of memory") || !strings.Contains(stderr, "--force") {
		t.Fatalf("exit %d, %q: want a refusal with the estimate and --force", code, stderr)
	}
}

func TestCriticalRefusesHoursOfWork(t *testing.T) {
	if testing.Short() {
		t.Skip("waits for the 2 s estimate")
	}
	// za at T = 3000 takes milliseconds per replication: 10 million of them
	// are hours of work.
	code, _, stderr := runCLI(t, "", "critical", "--test", "za", "--n", "3000", "--sims", "10000000")
	if code != exitUsage || !strings.Contains(stderr, "estimated") || !strings.Contains(stderr, "--force") {
		t.Fatalf("exit %d, %q: want a refusal with the estimate", code, stderr)
	}
}

func TestGivenZerosRefused(t *testing.T) {
	for _, tc := range []struct{ flag, want string }{
		{"--trim", "0.01"},
		{"--level", "0.5"},
		{"--max-breaks", "1..10"},
		{"--min-window", "fraction"},
	} {
		for _, cmd := range []string{"test", "batch"} {
			code, _, stderr := runCLI(t, "", cmd, tc.flag, "0", "../../testdata/demo.csv")
			if code != exitUsage || !strings.Contains(stderr, tc.flag+" 0") || !strings.Contains(stderr, tc.want) {
				t.Errorf("%s %s 0: exit %d, %q: want a refusal with the valid range", cmd, tc.flag, code, stderr)
			}
		}
	}
	// Given as their defaults, they run.
	code, _, stderr := runCLI(t, "", "test", "--tests", "adf", "--trim", "0.15", "--level", "0.05", "--quiet", "../../testdata/demo.csv")
	if code != exitOK {
		t.Errorf("explicit defaults: exit %d: %s", code, stderr)
	}
	code, _, stderr = runCLI(t, "", "test", "--bandwidth", "1e9", "../../testdata/demo.csv")
	if code != exitUsage || !strings.Contains(stderr, "0 to 1e6") {
		t.Errorf("--bandwidth 1e9: exit %d, %q", code, stderr)
	}
}

func TestTestNothingToProcess(t *testing.T) {
	for _, in := range []string{"", "\n \n"} {
		code, _, stderr := runCLI(t, in, "test", "-")
		if code != exitNothing || !strings.Contains(stderr, "nothing to process") {
			t.Errorf("stdin %q: exit %d, %q", in, code, stderr)
		}
	}
}

// TestBatchTooLongRecordFailsAlone: a record longer than --max-obs fails
// with a message; the records around it are tested and the batch goes on.
func TestBatchTooLongRecordFailsAlone(t *testing.T) {
	in := smallJSONL(2, 60)
	long := make([]string, 3000)
	for i := range long {
		long[i] = "1.5"
	}
	in = `{"id":"huge","values":[` + strings.Join(long, ",") + "]}\n" + in
	code, out, stderr := runCLI(t, in, "batch", "--jsonl", "--tests", "kpss", "--lean", "--quiet", "--max-obs", "1000", "-")
	if code != exitFailed {
		t.Fatalf("exit %d, want 1: %s", code, stderr)
	}
	lines := strings.Split(strings.TrimSpace(out), "\n")
	if len(lines) != 4 || !strings.Contains(lines[0], "limit is 1000") {
		t.Fatalf("%d records; first: %.200s", len(lines), lines[0])
	}
	if strings.Contains(lines[1], `"errors":[{`) || strings.Contains(lines[2], `"errors":[{`) {
		t.Error("the records after the long one must be tested")
	}
}
