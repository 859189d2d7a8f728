package report

import (
	"encoding/json"
	"io"

	"github.com/rootshift/rootshift/core/schema"
)

// WriteJSON writes doc as exactly json.MarshalIndent(doc, "", "  ") followed
// by a newline: the v1 schema document, stable for diffs and golden files;
// the source is named by its base name and messages lose the folders of
// file paths (exportDoc), and characters that hide or reorder text are
// written as \u escapes (JSONHidden).
// The error wraps ErrNoDocument, a *json.UnsupportedValueError (a NaN in a
// plain float field; pointer fields carry nil instead) or the writer's error.
func WriteJSON(w io.Writer, doc *schema.Document) error {
	if doc == nil {
		return ErrNoDocument
	}
	b, err := json.MarshalIndent(exportDoc(doc), "", "  ")
	if err != nil {
		return err
	}
	b = append(JSONHidden(b), '\n')
	_, err = w.Write(b)
	return err
}
