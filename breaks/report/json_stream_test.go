// Tests of the streaming JSON writer: its bytes equal the standard
// library's whole-document encoding, indented and compact (RFC 8259 text;
// encoding/json is the reference implementation here).
package report

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"reflect"
	"testing"

	"github.com/rootshift/rootshift/core/schema"
)

func TestJSONStreamEqualsMarshal(t *testing.T) {
	doc := fixtureDoc()
	for _, n := range []int{0, 1, len(doc.Series)} {
		d := *doc
		d.Series = doc.Series[:n]
		if n == 0 {
			d.Series = []schema.Series{}
		}
		want, err := json.MarshalIndent(&d, "", "  ")
		if err != nil {
			t.Fatal(err)
		}
		var got bytes.Buffer
		if err := WriteJSON(&got, &d); err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(got.Bytes(), append(want, '\n')) {
			t.Errorf("%d series: indented stream differs from MarshalIndent", n)
		}
		want, _ = json.Marshal(&d)
		got.Reset()
		if err := WriteJSONCompact(&got, &d); err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(got.Bytes(), append(want, '\n')) {
			t.Errorf("%d series: compact stream differs from Marshal:\n%s\n%s", n, got.Bytes(), want)
		}
	}
}

// TestJSONStreamHostile feeds the hostile corpus (hostile_test.go) to the
// stream series by series, as `rootshift test` does, indented and compact:
// the bytes equal the golden export (testdata/hostile.json.golden, which the
// whole-document writer also matches) and its compact form, so the stream
// names the source by its base name, drops folders from messages and writes
// hidden characters as \u escapes (common practice, no source).
func TestJSONStreamHostile(t *testing.T) {
	want, err := os.ReadFile(filepath.Join("testdata", "hostile.json.golden"))
	if err != nil {
		t.Fatal(err)
	}
	var compact bytes.Buffer
	if err := json.Compact(&compact, want); err != nil {
		t.Fatal(err)
	}
	compact.WriteByte('\n')
	for _, indent := range []bool{true, false} {
		doc, _ := hostileDoc()
		var got bytes.Buffer
		st, err := NewJSONStream(&got, doc, indent)
		if err != nil {
			t.Fatal(err)
		}
		for i := range doc.Series {
			if err := st.Series(&doc.Series[i]); err != nil {
				t.Fatal(err)
			}
		}
		if err := st.Close(); err != nil {
			t.Fatal(err)
		}
		exp := want
		if !indent {
			exp = compact.Bytes()
		}
		if !bytes.Equal(got.Bytes(), exp) {
			t.Errorf("indent %v: stream differs from the golden export", indent)
		}
		fresh, _ := hostileDoc()
		if !reflect.DeepEqual(doc, fresh) {
			t.Errorf("indent %v: the stream modified the document", indent)
		}
	}
}
