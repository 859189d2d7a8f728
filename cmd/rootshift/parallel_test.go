// `test` analyses the series of its files in parallel (issue "The CLI as
// fast as its engine", item 2): the output is in input order and equal byte
// for byte to a one-worker run, on the invented demo data and on the open
// data file testdata/us-employment.csv (see testdata/README.md).
package main

import (
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestParallelTestEqualsOneWorker(t *testing.T) {
	for _, tc := range []struct {
		name string
		args []string
	}{
		{"demo json", []string{"test", "--json", "../../testdata/demo.csv"}},
		{"demo table", []string{"test", "--tests", "adf,kpss,za", "../../testdata/demo.csv"}},
		{"employment json indented", []string{"test", "--json", "--indent", "--sims", "200", "--seed", "3", "--tests", "adf,za", "../../testdata/us-employment.csv"}},
		{"two files csv", []string{"test", "--format", "csv", "--tests", "adf,kpss,ls1", "../../testdata/demo.csv", "../../testdata/us-employment.csv"}},
	} {
		code1, one, err1 := runCLI(t, "", append(tc.args, "-j", "1", "--quiet")...)
		code2, par, err2 := runCLI(t, "", append(tc.args, "-j", "4", "--quiet")...)
		if code1 != code2 || code1 > 1 {
			t.Fatalf("%s: exit %d and %d: %s %s", tc.name, code1, code2, err1, err2)
		}
		if one != par {
			t.Errorf("%s: the 4-worker output differs from the one-worker output", tc.name)
		}
		if len(one) < 100 {
			t.Errorf("%s: output too short: %q", tc.name, one)
		}
	}
}

// BenchmarkCLITestZA is the CLI path (parse, analyse, encode) of the issue's
// measurement: 40 random walks of length 1000, `test --json --tests za
// --shift level+slope --lags 4`. Reported per series.
func BenchmarkCLITestZA(b *testing.B) {
	r := rand.New(rand.NewPCG(1, 40))
	var sb strings.Builder
	for j := 0; j < 40; j++ {
		if j > 0 {
			sb.WriteString(",")
		}
		fmt.Fprintf(&sb, "s%d", j)
	}
	sb.WriteString("\n")
	s := make([]float64, 40)
	for i := 0; i < 1000; i++ {
		for j := range s {
			s[j] += r.NormFloat64()
			if j > 0 {
				sb.WriteString(",")
			}
			fmt.Fprintf(&sb, "%.6f", s[j])
		}
		sb.WriteString("\n")
	}
	p := filepath.Join(b.TempDir(), "rw40.csv")
	os.WriteFile(p, []byte(sb.String()), 0o644)
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		code, out, stderr := runCLIb("test", "--json", "--tests", "za", "--shift", "level+slope", "--lags", "4", "--quiet", p)
		if code != 0 || out == 0 {
			b.Fatalf("exit %d: %s", code, stderr)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/40/1e6, "ms/series")
}
