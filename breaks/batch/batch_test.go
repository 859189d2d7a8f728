// Unit tests of the batch library: shard assignment, resume bookkeeping
// with a partial last line, input-order output and the distribution cache
// shared across series. Data are simulated or written here (ours).
package batch

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/rootshift/rootshift/breaks/battery"
	"github.com/rootshift/rootshift/core/schema"
)

func TestInShardPartitions(t *testing.T) {
	// Every id lands in exactly one of n shards, and the shares are even
	// (within 5 binomial standard deviations; common practice).
	const ids, n = 3000, 3
	counts := make([]int, n)
	for k := 0; k < ids; k++ {
		id := ID("file.csv", fmt.Sprintf("series%d", k))
		in := 0
		for i := 1; i <= n; i++ {
			if InShard(id, i, n) {
				in++
				counts[i-1]++
			}
		}
		if in != 1 {
			t.Fatalf("%s is in %d shards", id, in)
		}
	}
	for i, c := range counts {
		if d := float64(c) - ids/float64(n); d*d > 25*ids*(1.0/n)*(1-1.0/n) {
			t.Errorf("shard %d holds %d of %d ids", i+1, c, ids)
		}
	}
	if !InShard("x", 1, 1) || !InShard("x", 0, 0) {
		t.Error("a single shard must take everything")
	}
}

func TestDoneIDsPartialLine(t *testing.T) {
	rec := func(src, name string) string {
		b, _ := json.Marshal(schema.Document{Schema: schema.ID, Source: &schema.Source{Name: src}, Series: []schema.Series{{Name: name}}})
		return string(b) + "\n"
	}
	full := rec("a.csv", "x") + rec("a.csv", "y")
	done, good, err := DoneIDs(strings.NewReader(full + `{"schema":"rootshift.res`))
	if err != nil {
		t.Fatal(err)
	}
	if len(done) != 2 || !done["a.csv:x"] || !done["a.csv:y"] || good != int64(len(full)) {
		t.Fatalf("done %v, complete bytes %d (want %d)", done, good, len(full))
	}
	if _, _, err := DoneIDs(strings.NewReader("not json\n")); err == nil {
		t.Error("a foreign file must not be taken for a rootshift output")
	}
}

func writeSeries(t *testing.T, dir string, files, cols, T int) {
	r := rand.New(rand.NewPCG(9, 9))
	for f := 0; f < files; f++ {
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
		os.WriteFile(filepath.Join(dir, fmt.Sprintf("f%02d.csv", f)), []byte(b.String()), 0o644)
	}
}

func TestRunOrderAndCache(t *testing.T) {
	dir := t.TempDir()
	writeSeries(t, dir, 4, 5, 60)
	var inOrder []string
	cache := battery.NewDistCache()
	cfg := Config{Inputs: []string{dir}, Jobs: 3, Cache: cache,
		Settings: schema.Settings{Tests: []string{"adf"}, Sims: 200, Seed: 1}}
	sum, err := Run(context.Background(), cfg, func(r Record) error {
		inOrder = append(inOrder, r.ID)
		if res := r.Doc.Series[0].Results; len(res) != 1 || res[0].PValueSim == nil {
			return fmt.Errorf("%s: no simulated p-value", r.ID)
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if sum.Read != 20 || sum.Tested != 20 || sum.Failed != 0 {
		t.Fatalf("summary %+v", sum)
	}
	for i, id := range inOrder {
		want := ID(filepath.Join(dir, fmt.Sprintf("f%02d.csv", i/5)), fmt.Sprintf("c%d", i%5))
		if id != want {
			t.Fatalf("record %d is %s, want %s (input order)", i, id, want)
		}
	}
	// All 20 series have the same length and settings: one distribution.
	if cache.Len() != 1 {
		t.Errorf("cache holds %d distributions, want 1", cache.Len())
	}
	var buf bytes.Buffer
	if err := cache.Save(&buf); err != nil {
		t.Fatal(err)
	}
	c2 := battery.NewDistCache()
	if err := c2.Load(&buf); err != nil || c2.Len() != 1 {
		t.Fatalf("reload: %v, %d entries", err, c2.Len())
	}
}

func TestRunCancel(t *testing.T) {
	dir := t.TempDir()
	writeSeries(t, dir, 3, 4, 80)
	ctx, cancel := context.WithCancel(context.Background())
	n := 0
	_, err := Run(ctx, Config{Inputs: []string{dir}, Jobs: 2, Settings: schema.Settings{Tests: []string{"adf"}}}, func(Record) error {
		n++
		if n == 2 {
			cancel()
		}
		return nil
	})
	if err == nil {
		t.Fatal("a cancelled run must say so")
	}
	if n >= 12 {
		t.Errorf("cancelled run still wrote all %d records", n)
	}
}

// TestRunMissingInput: an input path that does not exist is refused before
// the run starts (ErrMissingInput, naming the path, no record written); an
// input that exists but cannot be read or parsed stays a failure record
// (common practice: usage errors up front, data errors per series).
func TestRunMissingInput(t *testing.T) {
	dir := t.TempDir()
	writeSeries(t, dir, 1, 2, 80)
	broken := filepath.Join(dir, "broken.csv")
	if err := os.WriteFile(broken, []byte("\x00\x01\x02binary"), 0o644); err != nil {
		t.Fatal(err)
	}
	inputs := []string{dir}
	if os.Geteuid() != 0 { // root reads a mode-000 file anyway
		locked := filepath.Join(t.TempDir(), "locked.csv")
		if err := os.WriteFile(locked, []byte("x\n1\n"), 0o000); err != nil {
			t.Fatal(err)
		}
		inputs = append(inputs, locked)
	}
	missing := filepath.Join(dir, "no-such-file.csv")
	set := schema.Settings{Tests: []string{"adf"}}

	if err := CheckInputs(append(inputs, "-")); err != nil {
		t.Fatalf("existing inputs and stdin must pass: %v", err)
	}
	calls := 0
	_, err := Run(context.Background(), Config{Inputs: append(append([]string{}, inputs...), missing, "/no/such/dir"), Settings: set},
		func(Record) error { calls++; return nil })
	if !errors.Is(err, ErrMissingInput) {
		t.Fatalf("err = %v, want ErrMissingInput", err)
	}
	for _, p := range []string{missing, "/no/such/dir"} {
		if !strings.Contains(err.Error(), p) {
			t.Errorf("error %q does not name %s", err, p)
		}
	}
	if calls != 0 {
		t.Errorf("%d records written before the usage error", calls)
	}

	var recs []Record
	sum, err := Run(context.Background(), Config{Inputs: inputs, Settings: set}, func(r Record) error { recs = append(recs, r); return nil })
	if err != nil {
		t.Fatal(err)
	}
	wantBad := len(inputs) // broken.csv, and locked.csv when not root
	if sum.BadInputs != wantBad || sum.Failed != wantBad || sum.Tested != 2 || len(recs) != 2+wantBad {
		t.Fatalf("summary %+v with %d records, want %d failure records and 2 tested series", sum, len(recs), wantBad)
	}
	for _, r := range recs {
		if r.Doc.Source.Name == broken && len(r.Doc.Series[0].Errors) == 0 {
			t.Errorf("the unreadable file's record carries no error: %+v", r.Doc.Series[0])
		}
	}
}
