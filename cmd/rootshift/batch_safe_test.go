package main

import (
	"encoding/csv"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"unicode/utf8"
)

// TestBatchSideFilesSafe: hostile column and file names (spreadsheet
// formula prefixes, a terminal escape sequence; the corpus of
// breaks/report/hostile_test.go, common practice, no source) reach neither
// the summary CSV (--csv) nor the verdict table (--verdicts) as formulas or
// control characters (issue 14, item 5).
func TestBatchSideFilesSafe(t *testing.T) {
	dir := t.TempDir()
	r := rand.New(rand.NewPCG(14, 5))
	var b strings.Builder
	b.WriteString("\"=HYPERLINK(\"\"http://x\"\",\"\"y\"\")\",+cmd,-2+3,@SUM(1),\"red \x1b[31mx\"\n")
	s := [5]float64{}
	for i := 0; i < 60; i++ {
		for j := range s {
			s[j] += r.NormFloat64()
		}
		fmt.Fprintf(&b, "%.4f,%.4f,%.4f,%.4f,%.4f\n", s[0], s[1], s[2], s[3], s[4])
	}
	if err := os.WriteFile(filepath.Join(dir, "=evil.csv"), []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	out := t.TempDir()
	sum, ver := filepath.Join(out, "summary.csv"), filepath.Join(out, "verdicts.csv")
	code, _, stderr := runCLI(t, "", "batch", "--tests", "adf", "--quiet", "-o", filepath.Join(out, "r.jsonl"), "--csv", sum, "--verdicts", ver, dir)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	for _, path := range []string{sum, ver} {
		data, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		if strings.Contains(string(data), "\x1b") {
			t.Errorf("%s: escape character written", filepath.Base(path))
		}
		recs, err := csv.NewReader(strings.NewReader(string(data))).ReadAll()
		if err != nil {
			t.Fatal(err)
		}
		if len(recs) < 6 {
			t.Fatalf("%s: %d rows", filepath.Base(path), len(recs))
		}
		for _, rec := range recs[1:] {
			for _, cell := range rec {
				if cell == "" {
					continue
				}
				first, _ := utf8.DecodeRuneInString(strings.TrimLeft(cell, " "))
				if strings.ContainsRune("=+@\t\r", first) || (first == '-' && !numeric(cell)) {
					t.Errorf("%s: cell %q can be read as a formula", filepath.Base(path), cell)
				}
			}
		}
	}
}

// numeric reports a cell that is a plain number (which a spreadsheet reads
// as a number, not a formula).
func numeric(cell string) bool {
	_, err := fmt.Sscanf(cell, "%g", new(float64))
	return err == nil && !strings.ContainsAny(cell, "+*/()!|")
}
