// Reading time with a stray quote, a large file and 20,000 columns (issue
// 11: "reading time grows linearly"). Each stray-quote size has the same
// file without the quote beside it (the twin); figures are in
// doc/reading-benchmarks.md. Our own measurements, no outside source.
package dataset

import (
	"bytes"
	"errors"
	"fmt"
	"testing"
	"time"
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

// The stray quote fails with its line, and reading it takes about as long
// per byte as the clean file: four times the rows take well under the
// sixteen times a quadratic reader needs (the bound 10 leaves room for a
// busy machine).
func TestStrayQuoteLinear(t *testing.T) {
	if testing.Short() {
		t.Skip("timing")
	}
	_, err := Parse("q", strayQuote(100), nil)
	var pe *ParseError
	if !errors.As(err, &pe) || pe.Row != 2 || !errors.Is(err, ErrQuote) {
		t.Fatalf("%v", err)
	}
	timeOf := func(data []byte) time.Duration {
		best := time.Duration(1 << 62)
		for range 3 {
			start := time.Now()
			Parse("q", data, nil)
			best = min(best, time.Since(start))
		}
		return best
	}
	small, large := timeOf(strayQuote(20000)), timeOf(strayQuote(80000))
	if r := float64(large) / float64(small); r > 10 {
		t.Errorf("80,000 rows take %.1f times as long as 20,000 (%v, %v)", r, large, small)
	}
}
