// Tests of the streaming JSON writer: its bytes equal the standard
// library's whole-document encoding, indented and compact (RFC 8259 text;
// encoding/json is the reference implementation here).
package report

import (
	"bytes"
	"encoding/json"
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
