// The corpus: one small file per layout analysts' exports use (testdata/
// corpus, written by us, see its README.md), each with its expected date
// column, frequency, first and last date, rows, series and the kinds of the
// reader's notes (or the error and its line) in testdata/corpus/
// expectations.json. The expectations were written by hand from the files'
// cells (common practice for each layout, no outside source).
package dataset

import (
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
)

type corpusCase struct {
	File       string            `json:"file"`
	Options    map[string]string `json:"options"`
	DateColumn string            `json:"date_column"`
	Frequency  string            `json:"frequency"`
	First      string            `json:"first"`
	Last       string            `json:"last"`
	Rows       int               `json:"rows"`
	Series     []string          `json:"series"`
	Notes      []string          `json:"notes"`
	Error      string            `json:"error"`
	ErrorRow   int               `json:"error_row"`
}

func loadCorpus(t testing.TB) []corpusCase {
	b, err := os.ReadFile(filepath.Join("testdata", "corpus", "expectations.json"))
	if err != nil {
		t.Fatal(err)
	}
	var cs []corpusCase
	if err := json.Unmarshal(b, &cs); err != nil {
		t.Fatal(err)
	}
	return cs
}

func TestCorpus(t *testing.T) {
	cs := loadCorpus(t)
	if len(cs) < 40 {
		t.Fatalf("%d corpus files, want at least 40", len(cs))
	}
	files, _ := filepath.Glob(filepath.Join("testdata", "corpus", "*.*sv"))
	if len(files) != len(cs) {
		t.Errorf("%d files in the corpus, %d expectations", len(files), len(cs))
	}
	for _, c := range cs {
		t.Run(c.File, func(t *testing.T) {
			opt := &Options{DateFormat: c.Options["date_format"], DateColumn: c.Options["date_column"]}
			tb, err := ReadFile(filepath.Join("testdata", "corpus", c.File), opt)
			if c.Error != "" {
				var pe *ParseError
				if err == nil || !strings.Contains(err.Error(), c.Error) || !errors.As(err, &pe) || pe.Row != c.ErrorRow {
					t.Fatalf("err %v, want %q at line %d", err, c.Error, c.ErrorRow)
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			if tb.DateColumn != c.DateColumn || tb.Frequency != c.Frequency || tb.Rows != c.Rows {
				t.Errorf("date column %q freq %q rows %d, want %q %q %d", tb.DateColumn, tb.Frequency, tb.Rows, c.DateColumn, c.Frequency, c.Rows)
			}
			if c.First != "" && (len(tb.Dates) == 0 || tb.Dates[0] != c.First || tb.Dates[len(tb.Dates)-1] != c.Last) {
				t.Errorf("dates %v, want %s..%s", tb.Dates, c.First, c.Last)
			}
			if got := strings.Split(names(tb), "|"); !slices.Equal(got, c.Series) {
				t.Errorf("series %v, want %v", got, c.Series)
			}
			var kinds []string
			for _, n := range tb.Notes {
				if !slices.Contains(kinds, n.Kind) {
					kinds = append(kinds, n.Kind)
				}
			}
			want := append([]string(nil), c.Notes...)
			slices.Sort(kinds)
			slices.Sort(want)
			if !slices.Equal(kinds, want) {
				t.Errorf("note kinds %v, want %v (notes %q)", kinds, want, tb.Messages())
			}
		})
	}
}
