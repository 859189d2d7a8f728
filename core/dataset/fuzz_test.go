package dataset

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"io"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

func addFixtureSeeds(f *testing.F) {
	files, _ := filepath.Glob(filepath.Join("testdata", "*.*sv"))
	for _, p := range files {
		if b, err := os.ReadFile(p); err == nil {
			f.Add(b)
		}
	}
}

func formatValue(v float64) string {
	if math.IsNaN(v) {
		return "NA"
	}
	return strconv.FormatFloat(v, 'g', -1, 64)
}

func sameValue(a, b float64) bool {
	return a == b || math.IsNaN(a) && math.IsNaN(b)
}

// checkTable asserts the invariants of every returned table.
func checkTable(t *testing.T, tb *Table) {
	t.Helper()
	if len(tb.Series) == 0 {
		t.Fatal("table without series")
	}
	if tb.Dates != nil && (len(tb.Dates) != tb.Rows || tb.Frequency == "") {
		t.Fatalf("dates %d for %d rows, frequency %q", len(tb.Dates), tb.Rows, tb.Frequency)
	}
	for _, s := range tb.Series {
		if len(s.Values) != tb.Rows {
			t.Fatalf("series %q has %d values for %d rows", s.Name, len(s.Values), tb.Rows)
		}
		for _, v := range s.Values {
			if math.IsInf(v, 0) {
				t.Fatalf("series %q holds %v", s.Name, v)
			}
		}
	}
}

// FuzzParse: Parse never panics, never returns infinite values, and a table
// written back as CSV reads back to the same values, dates and frequency.
func FuzzParse(f *testing.F) {
	addFixtureSeeds(f)
	for _, s := range []string{
		"d,y\n2000,1\n2001,2\n", "a;b\n1,5;2\n", "x\ty\n\"1\"\t2\n", "date,v\nJan 1 2000,1\n", "\xEF\xBB\xBFq,v\r2001:1,1\r2001:2,2\r",
		"d,\"y\n\"\n2000Q1,NA\n2000Q2,.\n2000Q3,1e308\n", "m|v\n2000-01|1 234\n2000-02|-\n",
	} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		tb, err := Parse("fuzz", data, nil)
		if err != nil {
			if tb != nil {
				t.Fatal("table and error")
			}
			return
		}
		checkTable(t, tb)
		var buf bytes.Buffer
		w := csv.NewWriter(&buf)
		head := []string{"id"}
		if tb.Dates != nil {
			head[0] = "date"
		}
		for i := range tb.Series {
			head = append(head, "s"+strconv.Itoa(i+1))
		}
		w.Write(head)
		for r := 0; r < tb.Rows; r++ {
			row := []string{"r" + strconv.Itoa(r)}
			if tb.Dates != nil {
				row[0] = tb.Dates[r]
			}
			for _, s := range tb.Series {
				row = append(row, formatValue(s.Values[r]))
			}
			w.Write(row)
		}
		w.Flush()
		var bopt *Options
		if tb.Dates != nil {
			bopt = &Options{DateColumn: "date"}
		}
		back, err := Parse("back", buf.Bytes(), bopt)
		if err != nil {
			t.Fatalf("re-parse: %v\n%s", err, buf.String())
		}
		if len(back.Series) != len(tb.Series) || back.Rows != tb.Rows || back.Frequency != tb.Frequency {
			t.Fatalf("re-parse: %d series %d rows %q, want %d %d %q", len(back.Series), back.Rows, back.Frequency, len(tb.Series), tb.Rows, tb.Frequency)
		}
		for i, s := range tb.Series {
			for r, v := range s.Values {
				if !sameValue(v, back.Series[i].Values[r]) {
					t.Fatalf("series %d row %d: %v then %v", i, r, v, back.Series[i].Values[r])
				}
			}
		}
		for r := range tb.Dates {
			if tb.Dates[r] != back.Dates[r] {
				t.Fatalf("date %d: %q then %q", r, tb.Dates[r], back.Dates[r])
			}
		}
	})
}

// FuzzLongReader: no panic, Next always ends, and the groups written back in
// long form read back the same.
func FuzzLongReader(f *testing.F) {
	for _, s := range []string{
		"id,date,value\na,2000Q1,1\na,2000Q2,2\nb,2001-01,3\n",
		"id;value\nx;1,5\nx;NA\ny;2\n",
		"id,date,value\na,2000,1\nb,2000,2\na,2001,3\n",
		"value\tid\n1\t\"a\nb\"\n",
	} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		lr, err := NewLongReader(bytes.NewReader(data), LongOptions{})
		if err != nil {
			return
		}
		var tables []*Table
		for i := 0; ; i++ {
			if i > len(data)+2 {
				t.Fatal("Next does not end")
			}
			tb, err := lr.Next()
			if err == io.EOF {
				break
			}
			if err != nil {
				if _, ok := err.(*ParseError); !ok {
					t.Fatalf("error %T %v", err, err)
				}
				continue
			}
			checkTable(t, tb)
			tables = append(tables, tb)
		}
		if len(tables) == 0 {
			return
		}
		var buf bytes.Buffer
		w := csv.NewWriter(&buf)
		dated := tables[0].Dates != nil
		if dated {
			w.Write([]string{"id", "date", "value"})
		} else {
			w.Write([]string{"id", "value"})
		}
		for _, tb := range tables {
			for r, v := range tb.Series[0].Values {
				if dated {
					w.Write([]string{tb.Name, tb.Dates[r], formatValue(v)})
				} else {
					w.Write([]string{tb.Name, formatValue(v)})
				}
			}
		}
		w.Flush()
		back, err := NewLongReader(&buf, LongOptions{})
		if err != nil {
			t.Fatal(err)
		}
		for _, tb := range tables {
			b, err := back.Next()
			if err != nil {
				t.Fatalf("re-read %q: %v", tb.Name, err)
			}
			if b.Name != tb.Name || b.Rows != tb.Rows || b.Frequency != tb.Frequency {
				t.Fatalf("re-read %q %d %q, want %q %d %q", b.Name, b.Rows, b.Frequency, tb.Name, tb.Rows, tb.Frequency)
			}
			for r, v := range tb.Series[0].Values {
				if !sameValue(v, b.Series[0].Values[r]) {
					t.Fatalf("%q row %d: %v then %v", tb.Name, r, v, b.Series[0].Values[r])
				}
			}
		}
	})
}

// FuzzJSONLReader: no panic, Next always ends, and records written back read
// back the same.
func FuzzJSONLReader(f *testing.F) {
	for _, s := range []string{
		`{"id":"a","dates":["2000Q1","2000Q2"],"values":[1,null]}` + "\n" + `{"id":2,"values":["1.5","NA"]}`,
		"{\"id\":\"x\",\"values\":[1e999]}\nnot json\n\n{}",
	} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		jr := NewJSONLReader(bytes.NewReader(data))
		var buf bytes.Buffer
		var tables []*Table
		for i := 0; ; i++ {
			if i > len(data)+2 {
				t.Fatal("Next does not end")
			}
			tb, err := jr.Next()
			if err == io.EOF {
				break
			}
			if err != nil {
				if _, ok := err.(*ParseError); !ok {
					t.Fatalf("error %T %v", err, err)
				}
				continue
			}
			checkTable(t, tb)
			tables = append(tables, tb)
			vals := make([]any, tb.Rows)
			for r, v := range tb.Series[0].Values {
				if !math.IsNaN(v) {
					vals[r] = v
				}
			}
			line, err := json.Marshal(map[string]any{"id": tb.Name, "dates": tb.Dates, "values": vals})
			if err != nil {
				t.Fatal(err)
			}
			buf.Write(line)
			buf.WriteByte('\n')
		}
		back := NewJSONLReader(&buf)
		for _, tb := range tables {
			b, err := back.Next()
			if err != nil {
				t.Fatalf("re-read %q: %v", tb.Name, err)
			}
			if b.Name != tb.Name || b.Rows != tb.Rows || b.Frequency != tb.Frequency || strings.Join(b.Dates, ",") != strings.Join(tb.Dates, ",") {
				t.Fatalf("re-read %+v, want %+v", b, tb)
			}
			for r, v := range tb.Series[0].Values {
				if !sameValue(v, b.Series[0].Values[r]) {
					t.Fatalf("%q row %d: %v then %v", tb.Name, r, v, b.Series[0].Values[r])
				}
			}
		}
	})
}
