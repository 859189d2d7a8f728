// Every output format shows the reader's notes on the input (issue 11: "a
// user can see, in every output, everything the reader did to their data").
// The project's own contract, no outside source.
package report

import (
	"bytes"
	"strings"
	"testing"

	"github.com/rootshift/rootshift/core/schema"
)

func TestNotesInEveryFormat(t *testing.T) {
	doc := &schema.Document{Schema: schema.ID, Caution: schema.Caution,
		Source: &schema.Source{Name: "in.csv", Rows: 3, Notes: []schema.Note{
			{Kind: "index-column", Message: "the first column numbers the rows", Row: 1, Column: "obs"},
		}},
		Series: []schema.Series{{Name: "y", N: 3, Results: []schema.Result{}, Errors: []schema.Error{},
			Notes: []schema.Note{
				{Kind: "index-column", Message: "the first column numbers the rows", Row: 1, Column: "obs"},
				{Kind: "gap-kept", Message: "tested across calendar gaps", Row: 7, Column: "y"},
			}}},
	}
	for _, f := range Formats {
		var b bytes.Buffer
		if err := Write(&b, f, doc, nil); err != nil {
			t.Fatalf("%s: %v", f, err)
		}
		out := b.String()
		if f == "json" {
			// The document itself: the source's notes and each series'.
			if !strings.Contains(out, `"kind": "gap-kept"`) || !strings.Contains(out, `"kind": "index-column"`) {
				t.Errorf("json lacks notes:\n%s", out)
			}
			continue
		}
		// The source note appears once, the series' own note once.
		if c := strings.Count(out, "the first column numbers the rows"); c != 1 {
			t.Errorf("%s: source note %d times:\n%s", f, c, out)
		}
		if c := strings.Count(out, "tested across calendar gaps"); c != 1 {
			t.Errorf("%s: series note %d times:\n%s", f, c, out)
		}
		if !strings.Contains(out, "line 7") {
			t.Errorf("%s: the note's row is not shown:\n%s", f, out)
		}
	}
}
