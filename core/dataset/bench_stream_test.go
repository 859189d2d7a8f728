// The streaming reader over a wide file beside its twin, the whole-file
// read (Parse, then the same series kept): time, bytes and allocations per
// read (issue 14, item 3; figures in doc/reading-benchmarks.md). The
// streaming reader allocates per row (the row's text), not per cell. Our
// own measurements, no outside source.
package dataset

import (
	"fmt"
	"testing"
)

func BenchmarkReadColumns(b *testing.B) {
	const rows, cols = 500, 2000
	data := wideCSV(rows, cols)
	keep := []string{"x1"}
	b.Run(fmt.Sprintf("stream/rows=%d/cols=%d", rows, cols), func(b *testing.B) {
		b.SetBytes(int64(len(data)))
		b.ReportAllocs()
		for b.Loop() {
			t, err := ReadColumns("wide", opener(data, 0), nil, keep)
			if err != nil || len(t.Series) != 1 {
				b.Fatal(err)
			}
		}
	})
	b.Run(fmt.Sprintf("whole-twin/rows=%d/cols=%d", rows, cols), func(b *testing.B) {
		b.SetBytes(int64(len(data)))
		b.ReportAllocs()
		for b.Loop() {
			t, err := Parse("wide", data, nil)
			if err != nil {
				b.Fatal(err)
			}
			t.restrict(keep)
			if len(t.Series) != 1 {
				b.Fatal("series")
			}
		}
	})
}

// TestReadColumnsAllocsPerRow: reading twice the rows of a 2,000-column
// file for one column allocates a few times per added row, not per cell
// (2,000 allocations per row would be one per cell).
func TestReadColumnsAllocsPerRow(t *testing.T) {
	allocs := func(rows int) float64 {
		data := wideCSV(rows, 2000)
		return testing.AllocsPerRun(2, func() {
			if _, err := ReadColumns("wide", opener(data, 0), nil, []string{"x1"}); err != nil {
				t.Fatal(err)
			}
		})
	}
	a, b := allocs(50), allocs(150)
	perRow := (b - a) / 100
	t.Logf("50 rows: %.0f allocations, 150 rows: %.0f; %.1f per added row", a, b, perRow)
	if perRow > 8 {
		t.Errorf("%.1f allocations per row of 2,000 cells: the cells allocate", perRow)
	}
}
