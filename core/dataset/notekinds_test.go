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
		Defs map[string]struct {
			Properties map[string]struct {
				Enum []string `json:"enum"`
			} `json:"properties"`
		} `json:"$defs"`
	}
	if err := json.Unmarshal(schema.SchemaJSON, &js); err != nil {
		t.Fatal(err)
	}
	if got := js.Defs["note"].Properties["kind"].Enum; !slices.Equal(got, NoteKinds) {
		t.Errorf("schema kinds %v, dataset %v", got, NoteKinds)
	}
}
