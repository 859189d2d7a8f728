package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestTestLong checks "rootshift test --long": a long table made from two
// columns of testdata/us-employment.csv gives one series per id, and
// without --long the error points to the long reading with the columns found.
func TestTestLong(t *testing.T) {
	wide, err := os.ReadFile(filepath.Join("..", "..", "testdata", "us-employment.csv"))
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSpace(string(wide)), "\n")
	head := strings.Split(lines[0], ",")
	var b strings.Builder
	b.WriteString("series,month,employed\n")
	for _, c := range []string{"construction", "utilities"} {
		j := 0
		for k, h := range head {
			if h == c {
				j = k
			}
		}
		for _, l := range lines[1:] {
			f := strings.Split(l, ",")
			b.WriteString(c + "," + f[0] + "," + f[j] + "\n")
		}
	}
	path := filepath.Join(t.TempDir(), "long.csv")
	if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	code, _, stderr := runCLI(t, "", "test", "--quiet", path)
	if code == 0 || !strings.Contains(stderr, "--long --id-col series --date-col month --value-col employed") {
		t.Errorf("without --long: exit %d, %s", code, stderr)
	}
	code, stdout, stderr := runCLI(t, "", "test", "--quiet", "--long", "--id-col", "series", "--date-col", "month", "--value-col", "employed", path)
	if code != 0 || !strings.Contains(stdout, "construction") || !strings.Contains(stdout, "utilities") || !strings.Contains(stdout, "Overview (2 series") {
		t.Errorf("with --long: exit %d\n%s\n%s", code, stdout, stderr)
	}
}
