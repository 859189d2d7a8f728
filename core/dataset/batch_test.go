package dataset

import (
	"errors"
	"io"
	"math"
	"strings"
	"testing"
	"testing/iotest"
)

type got struct {
	id    string
	n     int
	freq  string
	first string
	err   error
	line  int
}

func drain(t *testing.T, next func() (*Table, error)) []got {
	t.Helper()
	var out []got
	for i := 0; i < 100; i++ {
		tb, err := next()
		if err == io.EOF {
			return out
		}
		if err != nil {
			var pe *ParseError
			if !errors.As(err, &pe) {
				t.Fatalf("error %v is not a *ParseError", err)
			}
			out = append(out, got{err: err, line: pe.Row})
			continue
		}
		g := got{id: tb.Name, n: tb.Rows, freq: tb.Frequency}
		if len(tb.Series) != 1 || tb.Series[0].Name != tb.Name || len(tb.Series[0].Values) != tb.Rows {
			t.Errorf("table %s malformed", tb.Name)
		}
		if tb.Dates != nil {
			g.first = tb.Dates[0]
		}
		out = append(out, g)
	}
	t.Fatal("reader does not end")
	return nil
}

// Long files: common practice, no source; expectations read off the inputs.
func TestLongReader(t *testing.T) {
	cases := []struct {
		name string
		data string
		opt  LongOptions
		want []got
	}{
		{"basic", "id,date,value\na,2000Q1,1\na,2000Q2,2\nb,2001-01,3\nb,2001-02,NA\nb,2001-03,5\n", LongOptions{},
			[]got{{id: "a", n: 2, freq: Quarterly, first: "2000Q1"}, {id: "b", n: 3, freq: Monthly, first: "2001-01"}}},
		{"other order and names, semicolon, decimal comma", "wert;serie;zeit\n1,5;x;1990\n2,5;x;1991\n", LongOptions{ID: "serie", Date: "zeit", Value: "wert"},
			[]got{{id: "x", n: 2, freq: Annual, first: "1990"}}},
		{"no date column", "ID\tVALUE\nu\t1\nu\t2\nv\t3\n", LongOptions{},
			[]got{{id: "u", n: 2}, {id: "v", n: 1}}},
		{"bad number then continue", "id,date,value\na,2000,1\na,2001,x\na,2002,3\nb,2000,4\n", LongOptions{},
			[]got{{err: ErrBadNumber, line: 3}, {id: "b", n: 1, freq: Annual, first: "2000"}}},
		{"not contiguous: grouped by id", "id,date,value\na,2000,1\nb,2000,2\na,2001,3\nc,2000,4\n", LongOptions{},
			[]got{{id: "a", n: 2, freq: Annual, first: "2000"}, {id: "b", n: 1, freq: Annual, first: "2000"}, {id: "c", n: 1, freq: Annual, first: "2000"}}},
		{"sorted by date", "id,date,value\na,2000-01,1\nb,2000-01,2\na,2000-02,3\nb,2000-02,4\na,2000-03,5\n", LongOptions{},
			[]got{{id: "a", n: 3, freq: Monthly, first: "2000-01"}, {id: "b", n: 2, freq: Monthly, first: "2000-01"}}},
		{"dates out of order: sorted", "id,date,value\na,2001,1\na,2000,2\nb,2000,3\nb,2001,4\n", LongOptions{},
			[]got{{id: "a", n: 2, freq: Annual, first: "2000"}, {id: "b", n: 2, freq: Annual, first: "2000"}}},
		{"repeated date", "id,date,value\na,2000,1\na,2000,2\nb,2000,3\nb,2001,4\n", LongOptions{},
			[]got{{err: ErrDateOrder, line: 3}, {id: "b", n: 2, freq: Annual, first: "2000"}}},
		{"empty id", "id,value\n,1\nz,2\n", LongOptions{},
			[]got{{err: ErrBadNumber, line: 2}, {id: "z", n: 1}}},
		{"CRLF and BOM", "\xEF\xBB\xBFid,date,value\r\na,Jan 1 2000,1\r\na,Feb 1 2000,2\r\n", LongOptions{},
			[]got{{id: "a", n: 2, freq: Monthly, first: "2000-01"}}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			lr, err := NewLongReader(strings.NewReader(c.data), c.opt)
			if err != nil {
				t.Fatal(err)
			}
			out := drain(t, lr.Next)
			if len(out) != len(c.want) {
				t.Fatalf("got %+v, want %+v", out, c.want)
			}
			for i, w := range c.want {
				g := out[i]
				if w.err != nil {
					if !errors.Is(g.err, w.err) || g.line != w.line {
						t.Errorf("#%d: %v (line %d), want %v at line %d", i, g.err, g.line, w.err, w.line)
					}
					continue
				}
				if g.err != nil || g.id != w.id || g.n != w.n || g.freq != w.freq || g.first != w.first {
					t.Errorf("#%d: %+v, want %+v", i, g, w)
				}
			}
		})
	}
	for _, bad := range []string{"", "a,b\n1,2\n", "id,date\nx,2000\n"} {
		if _, err := NewLongReader(strings.NewReader(bad), LongOptions{Name: "l.csv"}); !errors.Is(err, ErrNoHeader) {
			t.Errorf("header %q: %v", bad, err)
		}
	}
}

// The long reader streams: a large input is read group by group.
func TestLongReaderStreams(t *testing.T) {
	var b strings.Builder
	b.WriteString("id,date,value\n")
	for g := 0; g < 300; g++ {
		for m := 1; m <= 12; m++ {
			b.WriteString("s")
			b.WriteString(strings.Repeat("x", g%7))
			b.WriteString(string(rune('a' + g%26)))
			b.WriteString(itoa(g))
			b.WriteString(",2000-")
			b.WriteString(itoa2(m))
			b.WriteString(",")
			b.WriteString(itoa(g*m + 1))
			b.WriteString("\n")
		}
	}
	lr, err := NewLongReader(strings.NewReader(b.String()), LongOptions{})
	if err != nil {
		t.Fatal(err)
	}
	n := 0
	for {
		tb, err := lr.Next()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatal(err)
		}
		if tb.Rows != 12 || tb.Frequency != Monthly || tb.Series[0].Values[11] != float64(n*12+1) {
			t.Fatalf("group %d: %+v", n, tb)
		}
		n++
	}
	if n != 300 {
		t.Errorf("%d groups", n)
	}
}

func itoa(i int) string {
	if i == 0 {
		return "0"
	}
	s := ""
	for ; i > 0; i /= 10 {
		s = string(rune('0'+i%10)) + s
	}
	return s
}

func itoa2(i int) string {
	if i < 10 {
		return "0" + itoa(i)
	}
	return itoa(i)
}

// JSON Lines: common practice, no source; expectations read off the inputs.
func TestJSONLReader(t *testing.T) {
	data := `{"id": "gdp", "dates": ["2000Q1","2000Q2","2000Q3"], "values": [1.5, null, 2]}

{"id": 7, "values": [1, "NA", "2.5", 3e2]}
{"id": "bad", "values": [1, "x"]}
not json
{"id": "late", "dates": ["2000","1999"], "values": [1, 2]}
{"id": "short", "dates": ["2000"], "values": [1, 2]}
{"values": [1]}
{"id": "big", "values": [1e999]}
{"id": "empty", "values": []}
{"id": "obj", "values": [{"a":1}]}
{"id": "last", "dates": ["Jan 1 2000", "Feb 1 2000"], "values": [0, -1]}`
	jr := NewJSONLReader(strings.NewReader(data))
	jr.Name = "s.jsonl"
	out := drain(t, jr.Next)
	want := []got{
		{id: "gdp", n: 3, freq: Quarterly, first: "2000Q1"},
		{id: "7", n: 4},
		{err: ErrBadNumber, line: 4},
		{err: ErrBadNumber, line: 5},
		{err: ErrDateOrder, line: 6},
		{err: ErrBadDate, line: 7},
		{err: ErrBadNumber, line: 8},
		{err: ErrBadNumber, line: 9},
		{err: ErrTooShort, line: 10},
		{err: ErrBadNumber, line: 11},
		{id: "last", n: 2, freq: Monthly, first: "2000-01"},
	}
	if len(out) != len(want) {
		t.Fatalf("got %+v", out)
	}
	for i, w := range want {
		g := out[i]
		if w.err != nil {
			if !errors.Is(g.err, w.err) || g.line != w.line {
				t.Errorf("#%d: %v (line %d), want %v at line %d", i, g.err, g.line, w.err, w.line)
			}
			continue
		}
		if g.err != nil || g.id != w.id || g.n != w.n || g.freq != w.freq || g.first != w.first {
			t.Errorf("#%d: %+v, want %+v", i, g, w)
		}
	}
	// Values and the position of a bad value.
	jr = NewJSONLReader(strings.NewReader(`{"id":"a","values":[1,null,"n/a",2.5]}` + "\n" + `{"id":"b","values":[1,true]}`))
	tb, err := jr.Next()
	if err != nil || tb.Series[0].Values[0] != 1 || !math.IsNaN(tb.Series[0].Values[1]) || !math.IsNaN(tb.Series[0].Values[2]) || tb.Series[0].Values[3] != 2.5 {
		t.Errorf("values %+v %v", tb, err)
	}
	_, err = jr.Next()
	var pe *ParseError
	if !errors.As(err, &pe) || pe.Row != 2 || pe.Column != 2 || pe.ColumnName != "values" || pe.Value != "true" {
		t.Errorf("bad value: %v", err)
	}
	if _, err := jr.Next(); err != io.EOF {
		t.Errorf("end: %v", err)
	}
}

// The record reader copes with any read sizes, CR at buffer ends, and lines
// longer than its buffer.
func TestRecordReaderBoundaries(t *testing.T) {
	long := strings.Repeat("x", 200_000)
	data := "id,date,value\r\n\"" + long + "\",2000,1\r\n\"" + long + "\",2001,2\r" + "b,2000,\"3\"\r\nb,2001,4"
	for _, r := range []io.Reader{strings.NewReader(data), iotest.OneByteReader(strings.NewReader(data)), iotest.HalfReader(strings.NewReader(data))} {
		lr, err := NewLongReader(r, LongOptions{})
		if err != nil {
			t.Fatal(err)
		}
		a, err := lr.Next()
		if err != nil || a.Name != long || a.Rows != 2 || a.Series[0].Values[1] != 2 {
			t.Fatalf("first group: %v", err)
		}
		b, err := lr.Next()
		if err != nil || b.Name != "b" || b.Rows != 2 || b.Series[0].Values[0] != 3 || b.Series[0].Values[1] != 4 {
			t.Fatalf("second group: %+v %v", b, err)
		}
		if _, err := lr.Next(); err != io.EOF {
			t.Fatalf("end: %v", err)
		}
	}
	// Physical line numbers count every line end and quoted line breaks.
	tb, err := Parse("l", []byte("d,y,z\r\n2000,1,\"a\nb\"\r2001,2,x\r\n2002,3,bad\n"), &Options{})
	if err != nil || tb.Rows != 3 || len(tb.Skipped) != 1 || tb.Skipped[0].Row != 2 {
		t.Fatalf("%+v %v", tb, err)
	}
	_, err = Parse("l", []byte("d,y\r\n2000,1\r\"2001\",x\r\n"), &Options{Columns: []string{"y"}})
	var pe *ParseError
	if !errors.As(err, &pe) || pe.Row != 3 || pe.Column != 2 {
		t.Fatalf("line numbers: %v", err)
	}
}
