// The page reads the corpus of input layouts (core/dataset/testdata/corpus)
// exactly as the command line does: Inspect gives the same date column,
// frequency, first and last date, rows and series as expectations.json,
// the same notes as the reader's (dataset.ReadFile), and the same failures.
// The project's own contract (issue 11), no outside source.
package bridge

import (
	"encoding/json"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/rootshift/rootshift/core/dataset"
)

func TestCorpusInPage(t *testing.T) {
	dir := filepath.Join("..", "..", "core", "dataset", "testdata", "corpus")
	b, err := os.ReadFile(filepath.Join(dir, "expectations.json"))
	if err != nil {
		t.Fatal(err)
	}
	var cs []struct {
		File       string            `json:"file"`
		Options    map[string]string `json:"options"`
		DateColumn string            `json:"date_column"`
		Frequency  string            `json:"frequency"`
		First      string            `json:"first"`
		Last       string            `json:"last"`
		Rows       int               `json:"rows"`
		Series     []string          `json:"series"`
		Error      string            `json:"error"`
	}
	if err := json.Unmarshal(b, &cs); err != nil {
		t.Fatal(err)
	}
	for _, c := range cs {
		data, err := os.ReadFile(filepath.Join(dir, c.File))
		if err != nil {
			t.Fatal(err)
		}
		settings, _ := json.Marshal(c.Options)
		r := decode(t, Inspect(c.File, data, string(settings)))
		if c.Error != "" {
			if r.OK || !strings.Contains(r.Error.Message, c.Error) {
				t.Errorf("%s: %+v, want the error %q", c.File, r, c.Error)
			}
			continue
		}
		if !r.OK {
			t.Errorf("%s: %s", c.File, r.Error.Message)
			continue
		}
		var p Preview
		if err := json.Unmarshal(r.Result, &p); err != nil {
			t.Fatal(err)
		}
		var names []string
		for _, s := range p.Series {
			names = append(names, s.Name)
		}
		if p.DateColumn != c.DateColumn || p.Frequency != c.Frequency || p.Rows != c.Rows || p.FirstDate != c.First || p.LastDate != c.Last || !slices.Equal(names, c.Series) {
			t.Errorf("%s: preview %+v", c.File, p)
		}
		tb, err := dataset.ReadFile(filepath.Join(dir, c.File), &dataset.Options{DateFormat: c.Options["date_format"]})
		if err != nil || !slices.Equal(p.Warnings, tb.Messages()) {
			t.Errorf("%s: page notes %q, reader's %q (%v)", c.File, p.Warnings, tb.Messages(), err)
		}
	}
}
