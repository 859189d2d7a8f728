//go:build linux || darwin

// `test` and `batch` with --columns read a regular file by streaming
// (dataset.ReadColumns) and anything else whole (dataset.Parse): the output
// must be the same bytes either way (issue 14, item 3). The whole-file read
// is forced by serving the same path as a named pipe. Our own behaviour, no
// outside source.
package main

import (
	"fmt"
	"os"
	"path/filepath"
	"syscall"
	"testing"
)

// runBoth runs args (whose last argument is the input path p) once with p a
// regular file holding data and once with p a named pipe fed data, and
// returns the two standard outputs.
func runBoth(t *testing.T, p string, data []byte, args ...string) (stream, whole string) {
	t.Helper()
	if err := os.WriteFile(p, data, 0o644); err != nil {
		t.Fatal(err)
	}
	code, stream, stderr := runCLI(t, "", args...)
	if code > 1 {
		t.Fatalf("streaming: exit %d: %s", code, stderr)
	}
	os.Remove(p)
	if err := syscall.Mkfifo(p, 0o644); err != nil {
		t.Skipf("no named pipes: %v", err)
	}
	defer os.Remove(p)
	done := make(chan error, 1)
	go func() {
		f, err := os.OpenFile(p, os.O_WRONLY, 0)
		if err == nil {
			_, err = f.Write(data)
			f.Close()
		}
		done <- err
	}()
	code2, whole, stderr2 := runCLI(t, "", args...)
	if err := <-done; err != nil {
		t.Fatal(err)
	}
	if code2 != code {
		t.Fatalf("exit %d streaming, %d whole: %s", code, code2, stderr2)
	}
	return stream, whole
}

func TestColumnsStreamSameOutput(t *testing.T) {
	demo, err := os.ReadFile("../../testdata/demo.csv")
	if err != nil {
		t.Fatal(err)
	}
	// A file with notes about columns that are not selected: a text column,
	// thousands separators, a repeated header, a blank row, a short row.
	noted := []byte("date,y,label,big,y,z\n2001-01,1.5,a,\"1,200\",3,4\n2001-02,1.7,b,\"1,300\",4,5\n\n" +
		"2001-04,1.2,c,\"1,250\",5,6\n2001-05,1.9,d,\"1,280\",6\n2001-06,2.2,e,\"1,310\",7,8\n2001-07,2.0,f,\"1,290\",8,9\n" +
		"2001-08,2.4,g,\"1,330\",9,10\n2001-09,2.1,h,\"1,320\",10,11\n2001-10,2.6,i,\"1,350\",11,12\n2001-11,2.8,j,\"1,340\",12,13\n")
	// Semicolons and decimal commas (two passes), not UTF-8 (read again as
	// Windows-1252).
	var latin []byte
	latin = append(latin, "Datum;Umsatz \xe9t\xe9;Zins\n"...)
	for i := 0; i < 30; i++ {
		latin = append(latin, fmt.Sprintf("%02d.%02d.2009;%d,%d;%d,5\n", 1+i%28, 1+i/28, 100+i*i%17, i%10, i%7)...)
	}
	dir := t.TempDir()
	for _, c := range []struct {
		name string
		data []byte
		cols string
	}{
		{"demo.csv", demo, "credit_spread"},
		{"demo.csv", demo, "Power_Demand,jobless_rate,no_such"},
		{"noted.csv", noted, "y_2,big"},
		{"noted.csv", noted, "label"},
		{"latin.csv", latin, "Zins"},
	} {
		p := filepath.Join(dir, c.name)
		s, w := runBoth(t, p, c.data, "test", "--tests", "adf,kpss", "--json", "--columns", c.cols, p)
		if s != w || len(s) == 0 {
			t.Errorf("test %s --columns %s: outputs differ (%d and %d bytes)\n%.400s\n%.400s", c.name, c.cols, len(s), len(w), s, w)
		}
		s, w = runBoth(t, p, c.data, "test", "--tests", "adf", "--format", "table", "--columns", c.cols, p)
		if s != w || len(s) == 0 {
			t.Errorf("test --format table %s --columns %s: outputs differ", c.name, c.cols)
		}
		s, w = runBoth(t, p, c.data, "batch", "--tests", "adf", "--lean", "--quiet", "-j", "1", "--columns", c.cols, p)
		if s != w || len(s) == 0 {
			t.Errorf("batch %s --columns %s: outputs differ (%d and %d bytes)\n%.400s\n%.400s", c.name, c.cols, len(s), len(w), s, w)
		}
	}
}
