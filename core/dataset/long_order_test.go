// Long and JSON Lines records: rows in any order are grouped by id and
// sorted by date, and a failed record keeps its id. The project's own
// contract (issue 11), no outside source.
package dataset

import (
	"errors"
	"strings"
	"testing"
)

func TestLongAnyOrderAndIDs(t *testing.T) {
	// Sorted by date, ids interleaved, one id's dates out of order.
	data := "id,date,value\nb,2000-02,4\na,2000-01,1\nb,2000-01,2\na,2000-02,3\na,2000-03,x\n"
	lr, err := NewLongReader(strings.NewReader(data), LongOptions{Name: "l.csv"})
	if err != nil {
		t.Fatal(err)
	}
	tb, err := lr.Next()
	if err != nil || tb.Name != "b" || tb.Dates[0] != "2000-01" || tb.Series[0].Values[0] != 2 {
		t.Fatalf("b: %v %+v", err, tb)
	}
	kinds := ""
	for _, n := range tb.Notes {
		kinds += n.Kind + " "
	}
	if strings.Count(kinds, "sorted") != 2 {
		t.Errorf("b notes: %q", tb.Messages())
	}
	_, err = lr.Next()
	var pe *ParseError
	if !errors.As(err, &pe) || pe.ID != "a" || pe.Row != 6 || !errors.Is(err, ErrBadNumber) || !strings.Contains(err.Error(), `id "a"`) {
		t.Errorf("a: %v", err)
	}
	// JSON Lines: the id of a bad record is kept.
	jr := NewJSONLReader(strings.NewReader(`{"id":"gdp","values":[1,"x"]}` + "\n"))
	if _, err := jr.Next(); !errors.As(err, &pe) || pe.ID != "gdp" {
		t.Errorf("jsonl: %v", err)
	}
}
