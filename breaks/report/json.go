package report

import (
	"encoding/json"
	"io"

	"github.com/rootshift/rootshift/core/schema"
)

// WriteJSON writes doc as exactly json.MarshalIndent(doc, "", "  ") followed
// by a newline: the v1 schema document, stable for diffs and golden files.
// The error wraps ErrNoDocument, a *json.UnsupportedValueError (a NaN in a
// plain float field; pointer fields carry nil instead) or the writer's error.
func WriteJSON(w io.Writer, doc *schema.Document) error {
	if doc == nil {
		return ErrNoDocument
	}
	b, err := json.MarshalIndent(doc, "", "  ")
	if err != nil {
		return err
	}
	b = append(JSONHidden(b), '\n')
	_, err = w.Write(b)
	return err
}
