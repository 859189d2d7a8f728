// Invariants of the reader on any input (issue 11): every column of the
// file is used (the date column or a series), reported in the notes (an
// index column, an empty column) or listed as skipped, so the number of
// series equals the number of value columns; and a read that fails names a
// row, unless the input has no header at all or is in an encoding that is
// refused. The project's own contract, no outside source.
package dataset

import (
	"errors"
	"os"
	"path/filepath"
	"testing"
)

func checkInvariants(t *testing.T, data []byte, opt *Options) {
	tb, err := Parse("fuzz", data, opt)
	if err != nil {
		var pe *ParseError
		if !errors.As(err, &pe) {
			t.Fatalf("error without position: %v", err)
		}
		if pe.Row == 0 && !errors.Is(err, ErrNoHeader) && !errors.Is(err, ErrEncoding) && !errors.Is(err, ErrBadNumber) && !errors.Is(err, ErrBadDate) {
			t.Fatalf("error names no row: %v", err)
		}
		return
	}
	if len(tb.Header) == 0 {
		t.Fatal("no header")
	}
	use := make([]string, len(tb.Header)+1)
	mark := func(col int, what string) {
		if col < 1 || col > len(tb.Header) {
			t.Fatalf("%s: column %d outside 1..%d", what, col, len(tb.Header))
		}
		if use[col] != "" {
			t.Fatalf("column %d is %s and %s", col, use[col], what)
		}
		use[col] = what
	}
	if tb.DateColumn != "" {
		for j, h := range tb.Header {
			if h == tb.DateColumn {
				mark(j+1, "the date column")
				break
			}
		}
	}
	for _, s := range tb.Series {
		mark(s.Column, "a series")
		if len(s.Values) != tb.Rows {
			t.Fatalf("series %q: %d values for %d rows", s.Name, len(s.Values), tb.Rows)
		}
	}
	for _, pe := range tb.Skipped {
		if use[pe.Column] != "empty" {
			mark(pe.Column, "skipped")
		}
	}
	for _, n := range tb.Notes {
		if (n.Kind == "index-column" || n.Kind == "empty-column") && use[n.Column] != "skipped" {
			mark(n.Column, n.Kind)
		}
	}
	for j := 1; j <= len(tb.Header); j++ {
		if use[j] == "" {
			t.Fatalf("column %d (%q) is neither used nor reported (notes %q)", j, tb.Header[j-1], tb.Messages())
		}
	}
	// Value columns: all but the date and index columns; each is a series,
	// a skipped column or an empty one.
	value := len(tb.Header) - countKind(tb, "index-column")
	if tb.DateColumn != "" {
		value--
	}
	nonNumeric := 0
	for _, pe := range tb.Skipped {
		if !errors.Is(pe, ErrTooShort) {
			nonNumeric++
		}
	}
	if len(tb.Series) != value-nonNumeric-countKind(tb, "empty-column") {
		t.Fatalf("%d series for %d value columns (%d not numeric, %d empty)", len(tb.Series), value, nonNumeric, countKind(tb, "empty-column"))
	}
	if len(tb.Lines) != tb.Rows {
		t.Fatalf("%d lines for %d rows", len(tb.Lines), tb.Rows)
	}
}

func countKind(tb *Table, kind string) int {
	n := 0
	for _, x := range tb.Notes {
		if x.Kind == kind {
			n++
		}
	}
	return n
}

func FuzzParseInvariants(f *testing.F) {
	addFixtureSeeds(f)
	files, _ := filepath.Glob(filepath.Join("testdata", "corpus", "*.*sv"))
	for _, p := range files {
		if b, err := os.ReadFile(p); err == nil {
			f.Add(b)
		}
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		checkInvariants(t, data, nil)
	})
}
