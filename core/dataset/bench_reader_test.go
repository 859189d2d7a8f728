// Reading time with a stray quote, a large file and 20,000 columns (issue
// 11: "reading time grows linearly"). Each stray-quote size has the same
// file without the quote beside it (the twin); figures are in
// doc/reading-benchmarks.md. Our own measurements, no outside source.
package dataset

import (
	"bytes"
	"errors"
	"fmt"
	"runtime"
	"testing"
)

// strayQuote is a daily file of n rows with one unbalanced quote in row 2.
func strayQuote(n int) []byte {
	data := wideCSV(n, 3)
	k := bytes.IndexByte(data, '\n')
	k += bytes.IndexByte(data[k+1:], ',') + 2
	return append(append(append([]byte(nil), data[:k]...), '"'), data[k:]...)
}

func BenchmarkStrayQuote(b *testing.B) {
	for _, n := range []int{20000, 40000, 80000} {
		bad, clean := strayQuote(n), wideCSV(n, 3)
		b.Run(fmt.Sprintf("quote/rows=%d", n), func(b *testing.B) {
			b.SetBytes(int64(len(bad)))
			for b.Loop() {
				if _, err := Parse("q", bad, nil); !errors.Is(err, ErrQuote) {
					b.Fatal(err)
				}
			}
		})
		b.Run(fmt.Sprintf("clean-twin/rows=%d", n), func(b *testing.B) {
			b.SetBytes(int64(len(clean)))
			for b.Loop() {
				if _, err := Parse("c", clean, nil); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// A large file: 1,000,000 rows of 3 numbers (about 30 MB), and the stdlib
// twin.
func BenchmarkLargeFile(b *testing.B) {
	data := wideCSV(1_000_000, 3)
	b.Run(fmt.Sprintf("parse/MB=%d", len(data)>>20), func(b *testing.B) {
		b.SetBytes(int64(len(data)))
		for b.Loop() {
			if _, err := Parse("large", data, nil); err != nil {
				b.Fatal(err)
			}
		}
	})
	b.Run(fmt.Sprintf("stdlib-twin/MB=%d", len(data)>>20), func(b *testing.B) {
		b.SetBytes(int64(len(data)))
		for b.Loop() {
			if _, err := stdlibParse(data); err != nil {
				b.Fatal(err)
			}
		}
	})
}

// 20,000 columns of 100 rows, and the stdlib twin.
func BenchmarkWideFile(b *testing.B) {
	data := wideCSV(100, 20000)
	b.Run("parse/cols=20000", func(b *testing.B) {
		b.SetBytes(int64(len(data)))
		for b.Loop() {
			tb, err := Parse("wide", data, nil)
			if err != nil || len(tb.Series) != 20000 {
				b.Fatal(err)
			}
		}
	})
	b.Run("stdlib-twin/cols=20000", func(b *testing.B) {
		b.SetBytes(int64(len(data)))
		for b.Loop() {
			if _, err := stdlibParse(data); err != nil {
				b.Fatal(err)
			}
		}
	})
}

// The stray quote fails with its line, and the work of reading it grows
// linearly: four times the rows allocate about four times the bytes (a reader
// that joins the swallowed lines by concatenation allocates sixteen times as
// much). Bytes allocated are counted rather than time, which a busy machine
// blurs; the benchmark above gives the times.
func TestStrayQuoteLinear(t *testing.T) {
	_, err := Parse("q", strayQuote(100), nil)
	var pe *ParseError
	if !errors.As(err, &pe) || pe.Row != 2 || !errors.Is(err, ErrQuote) {
		t.Fatalf("%v", err)
	}
	alloc := func(data []byte) uint64 {
		var a, b runtime.MemStats
		runtime.ReadMemStats(&a)
		Parse("q", data, nil)
		runtime.ReadMemStats(&b)
		return b.TotalAlloc - a.TotalAlloc
	}
	small, large := alloc(strayQuote(20000)), alloc(strayQuote(80000))
	if r := float64(large) / float64(small); r > 6 {
		t.Errorf("80,000 rows allocate %.1f times as much as 20,000 (%d, %d bytes)", r, large, small)
	}
}

// A header longer than the 64 KiB delimiter sample is still sampled whole.
func TestWideHeader(t *testing.T) {
	tb, err := Parse("wide", wideCSV(3, 20000), nil)
	if err != nil || len(tb.Series) != 20000 || tb.Delimiter != ',' {
		t.Fatalf("%v", err)
	}
}
