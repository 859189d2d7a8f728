package dataset

import (
	"bytes"
	"encoding/csv"
	"fmt"
	"math/rand/v2"
	"strconv"
	"testing"
	"time"
)

// wideCSV is a seeded file of rows x cols numbers with a daily date column.
func wideCSV(rows, cols int) []byte {
	rng := rand.New(rand.NewPCG(1, 2))
	var b bytes.Buffer
	b.WriteString("date")
	for j := 0; j < cols; j++ {
		fmt.Fprintf(&b, ",x%d", j+1)
	}
	b.WriteByte('\n')
	day := time.Date(1990, 1, 1, 0, 0, 0, 0, time.UTC)
	for i := 0; i < rows; i++ {
		b.WriteString(day.AddDate(0, 0, i).Format("2006-01-02"))
		for j := 0; j < cols; j++ {
			b.WriteByte(',')
			b.WriteString(strconv.FormatFloat(100*rng.NormFloat64(), 'f', 4, 64))
		}
		b.WriteByte('\n')
	}
	return b.Bytes()
}

// stdlibParse is the brute-force twin of Parse for plain CSV: encoding/csv
// and strconv.ParseFloat on every cell.
func stdlibParse(data []byte) ([][]float64, error) {
	recs, err := csv.NewReader(bytes.NewReader(data)).ReadAll()
	if err != nil {
		return nil, err
	}
	cols := make([][]float64, len(recs[0])-1)
	for _, r := range recs[1:] {
		for j := 1; j < len(r); j++ {
			v, err := strconv.ParseFloat(r[j], 64)
			if err != nil {
				return nil, err
			}
			cols[j-1] = append(cols[j-1], v)
		}
	}
	return cols, nil
}

// Parse agrees exactly with the standard-library twin on plain CSV.
func TestParseMatchesStdlib(t *testing.T) {
	data := wideCSV(500, 7)
	tb, err := Parse("wide", data, nil)
	if err != nil {
		t.Fatal(err)
	}
	want, err := stdlibParse(data)
	if err != nil {
		t.Fatal(err)
	}
	if tb.Frequency != Daily || tb.Dates[0] != "1990-01-01" || len(tb.Series) != len(want) {
		t.Fatalf("table %q %v %d", tb.Frequency, tb.Dates[:1], len(tb.Series))
	}
	for j, s := range tb.Series {
		for i, v := range s.Values {
			if v != want[j][i] {
				t.Fatalf("x%d[%d] = %v, want %v", j+1, i, v, want[j][i])
			}
		}
	}
}

// Reading a number does not allocate.
func TestParseNumberAllocs(t *testing.T) {
	for _, c := range []struct {
		s   string
		dec decimal
	}{{"1394.46", decPoint}, {"1,234.5", decPoint}, {"1.234,5", decComma}, {"-0,25", decComma}} {
		if a := testing.AllocsPerRun(100, func() { parseNumber(c.s, c.dec) }); a != 0 {
			t.Errorf("parseNumber(%q) allocates %v times", c.s, a)
		}
	}
	if a := testing.AllocsPerRun(100, func() { IsMissing("#N/A") }); a != 0 {
		t.Errorf("IsMissing allocates %v times", a)
	}
}

func BenchmarkParse(b *testing.B) {
	for _, n := range []int{1000, 10000} {
		data := wideCSV(n, 20)
		b.Run(fmt.Sprintf("rows=%d/cols=20", n), func(b *testing.B) {
			b.SetBytes(int64(len(data)))
			b.ReportAllocs()
			for b.Loop() {
				if _, err := Parse("wide", data, nil); err != nil {
					b.Fatal(err)
				}
			}
		})
		b.Run(fmt.Sprintf("stdlib-twin/rows=%d/cols=20", n), func(b *testing.B) {
			b.SetBytes(int64(len(data)))
			b.ReportAllocs()
			for b.Loop() {
				if _, err := stdlibParse(data); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func BenchmarkParseDecimalComma(b *testing.B) {
	data := bytes.ReplaceAll(bytes.ReplaceAll(wideCSV(10000, 20), []byte(","), []byte(";")), []byte("."), []byte(","))
	b.Run("rows=10000/cols=20", func(b *testing.B) {
		b.SetBytes(int64(len(data)))
		b.ReportAllocs()
		for b.Loop() {
			tb, err := Parse("wide", data, nil)
			if err != nil || !tb.DecimalComma {
				b.Fatal(err)
			}
		}
	})
}

func BenchmarkLongReader(b *testing.B) {
	var buf bytes.Buffer
	buf.WriteString("id,date,value\n")
	for g := 0; g < 100; g++ {
		for m := 0; m < 100; m++ {
			fmt.Fprintf(&buf, "s%d,%d-%02d,%d.5\n", g, 1950+m/12, m%12+1, g*m)
		}
	}
	data := buf.Bytes()
	b.Run("ids=100/rows=100", func(b *testing.B) {
		b.SetBytes(int64(len(data)))
		b.ReportAllocs()
		for b.Loop() {
			lr, err := NewLongReader(bytes.NewReader(data), LongOptions{})
			if err != nil {
				b.Fatal(err)
			}
			for {
				if _, err := lr.Next(); err != nil {
					break
				}
			}
		}
	})
}
