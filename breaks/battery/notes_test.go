// The reader's notes reach the document: the file's notes in the source,
// a series' own notes (trimmed values, calendar gaps) in the series, and
// WithSourceNotes gives one complete list per series when the source is
// dropped. The project's own contract (issue 11), no outside source.
package battery

import (
	"context"
	"strconv"
	"strings"
	"testing"

	"github.com/rootshift/rootshift/core/schema"
)

func TestNotesInDocument(t *testing.T) {
	var b strings.Builder
	b.WriteString("t,date,y,z\n")
	for i := 0; i < 30; i++ {
		z := ""
		if i >= 3 {
			z = "1." + string(rune('0'+i%10))
		}
		b.WriteString(strings.Join([]string{strconv.Itoa(i + 1), strconv.Itoa(2000 + i), "1" + strconv.Itoa(i%7), z}, ",") + "\n")
	}
	doc, _, err := AnalyzeText(context.Background(), "n.csv", []byte(b.String()), schema.Settings{Tests: []string{"adf"}}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if len(doc.Source.Notes) != 1 || doc.Source.Notes[0].Kind != "index-column" || doc.Source.Notes[0].Column != "t" || doc.Source.Notes[0].Row != 1 {
		t.Errorf("source notes %+v", doc.Source.Notes)
	}
	z := doc.Series[1]
	if z.Name != "z" || len(z.Notes) != 1 || z.Notes[0].Kind != "trimmed" || z.Notes[0].Row != 5 {
		t.Errorf("series z notes %+v", z.Notes)
	}
	all := WithSourceNotes(doc.Source, z.Notes)
	if len(all) != 2 || all[0].Kind != "index-column" || all[1].Kind != "trimmed" {
		t.Errorf("with source notes %+v", all)
	}
	if again := WithSourceNotes(doc.Source, all); len(again) != 2 {
		t.Errorf("notes repeated: %+v", again)
	}
}
