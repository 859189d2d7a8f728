// The note kinds documented in package dataset and in the JSON Schema are
// the same list. The project's own contract, no outside source.
package dataset

import (
	"encoding/json"
	"slices"
	"testing"

	"github.com/rootshift/rootshift/core/schema"
)

func TestNoteKindsMatchSchema(t *testing.T) {
	var js struct {
		Defs map[string]json.RawMessage `json:"$defs"`
	}
	var note struct {
		Properties map[string]struct {
			Enum []string `json:"enum"`
		} `json:"properties"`
	}
	if err := json.Unmarshal(schema.SchemaJSON, &js); err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(js.Defs["note"], &note); err != nil {
		t.Fatal(err)
	}
	if got := note.Properties["kind"].Enum; !slices.Equal(got, NoteKinds) {
		t.Errorf("schema kinds %v, dataset %v", got, NoteKinds)
	}
}
