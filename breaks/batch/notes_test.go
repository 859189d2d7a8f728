// Batch records carry the reader's notes: the file's notes in the record's
// source, the series' own notes (here a calendar gap handled by the gaps
// setting) in the series, and a failed long record keeps its id. Data are
// written here (ours, invented).
package batch

import (
	"context"
	"fmt"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/rootshift/rootshift/core/schema"
)

func TestRecordsCarryNotes(t *testing.T) {
	dir := t.TempDir()
	var b strings.Builder
	b.WriteString("obs,date,y\n")
	for i := 0; i < 40; i++ {
		m := i + 1
		if i >= 20 {
			m++ // 2001-09 is missing
		}
		b.WriteString(strings.Join([]string{itoa(i + 1), dateOf(m), itoa(100 + (i*7)%13)}, ",") + "\n")
	}
	path := filepath.Join(dir, "m.csv")
	if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	var recs []Record
	_, err := Run(context.Background(), Config{Inputs: []string{path}, Settings: schema.Settings{Tests: []string{"adf"}, Gaps: "split"}},
		func(r Record) error { recs = append(recs, r); return nil })
	if err != nil {
		t.Fatal(err)
	}
	if len(recs) != 1 {
		t.Fatalf("%d records", len(recs))
	}
	doc := recs[0].Doc
	kinds := ""
	for _, n := range doc.Source.Notes {
		kinds += n.Kind + " "
	}
	if !strings.Contains(kinds, "index-column") || !strings.Contains(kinds, "gap") {
		t.Errorf("source notes %+v", doc.Source.Notes)
	}
	s := doc.Series[0]
	if len(s.Notes) != 1 || s.Notes[0].Kind != "gap-split" || s.N != 20 {
		t.Errorf("series n %d notes %+v", s.N, s.Notes)
	}

	// A long file whose record fails keeps the record's id.
	long := filepath.Join(dir, "l.csv")
	if err := os.WriteFile(long, []byte("id,date,value\na,2000,1\na,2001,x\nb,2000,3\nb,2001,4\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	recs = nil
	if _, err := Run(context.Background(), Config{Inputs: []string{long}, Kind: KindLong, Settings: schema.Settings{Tests: []string{"adf"}}},
		func(r Record) error { recs = append(recs, r); return nil }); err != nil {
		t.Fatal(err)
	}
	if len(recs) != 2 || recs[0].Doc.Series[0].Name != "a" || len(recs[0].Doc.Series[0].Errors) == 0 {
		t.Errorf("long records: %+v", recs)
	}
}

func itoa(i int) string { return strconv.Itoa(i) }

// dateOf is the m-th month from 2000-01 (m = 1).
func dateOf(m int) string {
	return fmt.Sprintf("%04d-%02d", 2000+(m-1)/12, (m-1)%12+1)
}
