// End-to-end tests of `rootshift batch` (issue "Batch runs"): a generated
// directory of 2,000 mixed series with broken files; one record per series;
// exit status 1 with clear errors; three shards merged equal one run; a run
// killed part way and resumed equals an uninterrupted one. The data are
// simulated here (common practice, no source).
package main

import (
	"bufio"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"time"

	"github.com/rootshift/rootshift/core/schema"
)

const (
	batchFiles   = 199 // wide files of 10 columns each
	batchBroken  = 10  // unreadable files, one record each
	batchRecords = batchFiles*10 + batchBroken
)

// makeBatchDir writes the mixed directory and returns it with the number of
// series expected to fail.
func makeBatchDir(t *testing.T) (string, int) {
	t.Helper()
	dir := t.TempDir()
	r := rand.New(rand.NewPCG(42, 6))
	failures := 0
	for f := 0; f < batchFiles; f++ {
		T := 60 + r.IntN(40)
		cols := make([][]string, 10)
		for j := range cols {
			cols[j] = make([]string, T)
			s, u := 0.0, 0.0
			for i := 0; i < T; i++ {
				e := r.NormFloat64()
				s += e
				u = 0.5*u + e
				v := s
				if j%2 == 1 {
					v = u
				}
				cols[j][i] = fmt.Sprintf("%.5f", 100+v)
			}
		}
		switch {
		case f%20 == 3: // a text cell: the column is not a series
			cols[9][T/2] = "n/a?"
			failures++
		case f%25 == 7: // all missing
			for i := range cols[8] {
				cols[8][i] = "NA"
			}
			failures++
		case f%30 == 11: // too short: only 3 observations
			for i := 3; i < T; i++ {
				cols[7][i] = ""
			}
			failures++
		case f%40 == 13: // a gap inside the sample
			cols[6][T/2] = "."
			failures++
		}
		var b strings.Builder
		b.WriteString("month")
		for j := range cols {
			fmt.Fprintf(&b, ",s%d", j)
		}
		b.WriteString("\n")
		for i := 0; i < T; i++ {
			fmt.Fprintf(&b, "%04d-%02d", 2000+i/12, i%12+1)
			for j := range cols {
				b.WriteString("," + cols[j][i])
			}
			b.WriteString("\n")
		}
		if err := os.WriteFile(filepath.Join(dir, fmt.Sprintf("f%03d.csv", f)), []byte(b.String()), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	broken := [][]byte{{}, []byte("\x00\x01\x02binary"), []byte("only,a,header\n"), []byte("month,x\n2001-01,abc\n2001-02,def\n"),
		[]byte("\"unterminated,quote\n1,2\n"), []byte("a\n"), []byte("x;y\n\n"), []byte(";;;\n"), []byte("PK\x03\x04 not a zip"), []byte("\n\n\n")}
	for i, b := range broken[:batchBroken] {
		name := fmt.Sprintf("z%02d.csv", i)
		if i == 8 {
			name = "z08.xlsx"
		}
		if err := os.WriteFile(filepath.Join(dir, name), b, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	return dir, failures + batchBroken
}

func readLines(t *testing.T, path string) []string {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimRight(string(b), "\n"), "\n")
	if len(lines) == 1 && lines[0] == "" {
		return nil
	}
	return lines
}

func TestBatchEndToEnd(t *testing.T) {
	if testing.Short() {
		t.Skip("end-to-end batch run (about a minute) skipped in -short mode")
	}
	dir, wantFailed := makeBatchDir(t)
	out := filepath.Join(t.TempDir(), "full.jsonl")
	start := time.Now()
	code, _, stderr := runCLI(t, "", "batch", "-j", "2", "--quiet", "-o", out, "--csv", out+".csv", "--verdicts", out+".v.csv", dir)
	t.Logf("full run: %.1f s", time.Since(start).Seconds())
	if code != 1 {
		t.Fatalf("exit status %d, want 1 (some series fail); stderr: %s", code, stderr)
	}
	full := readLines(t, out)
	if len(full) != batchRecords {
		t.Fatalf("%d records, want exactly %d (one per series and per unreadable file)", len(full), batchRecords)
	}
	failed := 0
	ids := map[string]bool{}
	for i, line := range full {
		var doc schema.Document
		if err := json.Unmarshal([]byte(line), &doc); err != nil {
			t.Fatalf("line %d: not JSON: %v", i+1, err)
		}
		if doc.Schema != schema.ID || len(doc.Series) != 1 || doc.Source == nil {
			t.Fatalf("line %d: not a one-series v1 document", i+1)
		}
		id := doc.Source.Name + ":" + doc.Series[0].Name
		if ids[id] {
			t.Fatalf("line %d: series %s written twice", i+1, id)
		}
		ids[id] = true
		sr := doc.Series[0]
		if len(sr.Errors) > 0 {
			failed++
			if sr.Errors[0].Message == "" {
				t.Errorf("line %d: empty error message", i+1)
			}
			continue
		}
		if sr.Verdict == nil || len(sr.Results) == 0 {
			t.Errorf("line %d (%s): tested series without results or verdict", i+1, id)
		}
	}
	if failed != wantFailed {
		t.Errorf("%d failed records, want %d (bad columns and broken files)", failed, wantFailed)
	}

	t.Run("shards", func(t *testing.T) {
		var merged []string
		for i := 1; i <= 3; i++ {
			p := filepath.Join(t.TempDir(), fmt.Sprintf("s%d.jsonl", i))
			runCLI(t, "", "batch", "-j", "2", "--quiet", "--shard", fmt.Sprintf("%d/3", i), "-o", p, dir)
			part := readLines(t, p)
			if len(part) == 0 || len(part) == batchRecords {
				t.Errorf("shard %d/3 holds %d records: the split is degenerate", i, len(part))
			}
			merged = append(merged, part...)
		}
		a, b := slices.Clone(full), merged
		slices.Sort(a)
		slices.Sort(b)
		if !slices.Equal(a, b) {
			t.Fatalf("3 shards merged (%d records) differ from the single run (%d)", len(b), len(a))
		}
	})

	t.Run("resume after kill", func(t *testing.T) {
		p := filepath.Join(t.TempDir(), "resumed.jsonl")
		exe, err := os.Executable()
		if err != nil {
			t.Fatal(err)
		}
		cmd := exec.Command(exe, "batch", "-j", "2", "--quiet", "-o", p, "--csv", p+".csv", "--verdicts", p+".v.csv", dir)
		cmd.Env = append(os.Environ(), "ROOTSHIFT_AS_CLI=1")
		if err := cmd.Start(); err != nil {
			t.Fatal(err)
		}
		// Kill it once part of the output is on disk (not all of it).
		deadline := time.Now().Add(60 * time.Second)
		for time.Now().Before(deadline) {
			time.Sleep(20 * time.Millisecond)
			if st, err := os.Stat(p); err == nil && st.Size() > 1500<<10 {
				break
			}
		}
		cmd.Process.Kill()
		cmd.Wait()
		partial := countLines(t, p)
		if partial >= batchRecords {
			t.Skipf("the run finished before it could be killed (%d records)", partial)
		}
		code, _, stderr := runCLI(t, "", "batch", "-j", "2", "--quiet", "--resume", "-o", p, "--csv", p+".csv", "--verdicts", p+".v.csv", dir)
		if code != 1 {
			t.Fatalf("resumed run: exit status %d, want 1; %s", code, stderr)
		}
		got := readLines(t, p)
		a := slices.Clone(full)
		slices.Sort(a)
		slices.Sort(got)
		if !slices.Equal(a, got) {
			t.Fatalf("killed after %d records and resumed: %d records, differ from the uninterrupted run", partial, len(got))
		}
		// The side files are rebuilt from the records kept, then extended:
		// they equal the uninterrupted run's (after sorting).
		for _, ext := range []string{".csv", ".v.csv"} {
			a, b := readLines(t, out+ext), readLines(t, p+ext)
			slices.Sort(a)
			slices.Sort(b)
			if !slices.Equal(a, b) {
				t.Errorf("%s after kill and resume: %d lines, the uninterrupted run has %d", ext, len(b), len(a))
			}
		}
		t.Logf("killed after %d complete records; resumed run completed the rest", partial)
	})
}

func countLines(t *testing.T, path string) int {
	f, err := os.Open(path)
	if err != nil {
		return 0
	}
	defer f.Close()
	n := 0
	sc := bufio.NewScanner(f)
	sc.Buffer(make([]byte, 1<<20), 1<<24)
	for sc.Scan() {
		n++
	}
	return n
}

func TestBatchUsageErrors(t *testing.T) {
	const in = "../../testdata/demo.csv" // exists: each case fails on its flag
	for _, tc := range []struct {
		args []string
		want string // in stderr
	}{
		{[]string{"batch"}, "no input"},
		{[]string{"batch", "--shard", "4/3", in}, "--shard"},
		{[]string{"batch", "--resume", in}, "--resume"},
		{[]string{"batch", "--order", "random", in}, "--order"},
		{[]string{"batch", "--long", "--jsonl", in}, "--long"},
		{[]string{"batch", "--tests", "nosuch", in}, "nosuch"},
		{[]string{"batch", "--tests", "adf", in, "no-such-dir/none.csv"}, `"no-such-dir/none.csv": no such file or directory`},
	} {
		code, _, stderr := runCLI(t, "", tc.args...)
		if code != 2 {
			t.Errorf("%v: exit status %d, want 2", tc.args, code)
		}
		if !strings.Contains(stderr, tc.want) {
			t.Errorf("%v: stderr %q does not mention %q", tc.args, stderr, tc.want)
		}
	}
}

// TestBatchMissingInputKeepsOutput: a missing input is refused before the
// output file is touched, so a previous run's output survives a typo.
func TestBatchMissingInputKeepsOutput(t *testing.T) {
	out := filepath.Join(t.TempDir(), "out.jsonl")
	if err := os.WriteFile(out, []byte("previous run\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	code, stdout, stderr := runCLI(t, "", "batch", "--tests", "adf", "-o", out, "--quiet", "no-such-file.csv")
	if code != 2 || stdout != "" || !strings.Contains(stderr, "no-such-file.csv") {
		t.Fatalf("exit %d, stdout %q, stderr %q: want a usage error naming the path", code, stdout, stderr)
	}
	if b, _ := os.ReadFile(out); string(b) != "previous run\n" {
		t.Errorf("output file changed to %q", b)
	}
}

func TestBatchJSONLStdin(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 3))
	var b strings.Builder
	for k := 0; k < 5; k++ {
		vals := make([]string, 80)
		s := 0.0
		for i := range vals {
			s += r.NormFloat64()
			vals[i] = fmt.Sprintf("%.4f", s)
		}
		fmt.Fprintf(&b, `{"id":"s%d","values":[%s]}`+"\n", k, strings.Join(vals, ","))
	}
	b.WriteString(`{"id":"bad","values":[1,2,"x"]}` + "\n")
	code, out, stderr := runCLI(t, b.String(), "batch", "--jsonl", "--tests", "adf,kpss", "--quiet", "-")
	if code != 1 {
		t.Fatalf("exit %d, want 1 (one bad record); %s", code, stderr)
	}
	lines := strings.Split(strings.TrimSpace(out), "\n")
	if len(lines) != 6 {
		t.Fatalf("%d records, want 6", len(lines))
	}
	var last schema.Document
	json.Unmarshal([]byte(lines[5]), &last)
	if len(last.Series) != 1 || len(last.Series[0].Errors) == 0 {
		t.Errorf("the bad record must carry its error: %s", lines[5])
	}
}

// TestBatchSummaryCSVID: two files with the same column name give rows that
// the summary CSV's id column (SOURCE:SERIES) tells apart; one header only.
func TestBatchSummaryCSVID(t *testing.T) {
	dir := t.TempDir()
	r := rand.New(rand.NewPCG(9, 9))
	for _, name := range []string{"a.csv", "b.csv"} {
		var b strings.Builder
		b.WriteString("x\n")
		s := 0.0
		for i := 0; i < 80; i++ {
			s += r.NormFloat64()
			fmt.Fprintf(&b, "%.4f\n", s)
		}
		if err := os.WriteFile(filepath.Join(dir, name), []byte(b.String()), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	sum := filepath.Join(t.TempDir(), "summary.csv")
	code, _, stderr := runCLI(t, "", "batch", "--tests", "adf", "--quiet", "--csv", sum, dir)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	f, err := os.Open(sum)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if len(recs) != 3 || recs[0][1] != "id" {
		t.Fatalf("want a header and two rows with an id column: %v", recs)
	}
	ids := []string{recs[1][1], recs[2][1]}
	// The id names the file by its base name: no report carries the folders
	// of the machine that ran it (issue 12).
	want := []string{"a.csv:x", "b.csv:x"}
	if !slices.Equal(ids, want) {
		t.Errorf("ids %v, want %v", ids, want)
	}
}
