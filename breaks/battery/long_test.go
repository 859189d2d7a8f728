package battery

import (
	"context"
	"encoding/json"
	"os"
	"strings"
	"testing"

	"github.com/rootshift/rootshift/core/schema"
)

// TestAnalyzeLong checks that a long table (one row per id, date, value)
// gives, id by id, the same series results as the wide table it was made
// from (testdata/us-employment.csv, three of its columns: open data of the
// U.S. Bureau of Labor Statistics via vega-datasets), that settings.columns
// picks ids and that an unknown id is a usage error naming it.
func TestAnalyzeLong(t *testing.T) {
	wide, err := os.ReadFile("../../testdata/us-employment.csv")
	if err != nil {
		t.Fatal(err)
	}
	cols := []string{"construction", "utilities", "other_services"}
	lines := strings.Split(strings.TrimSpace(string(wide)), "\n")
	head := strings.Split(lines[0], ",")
	var long strings.Builder
	long.WriteString("series,month,employed\n")
	for _, c := range cols {
		j := -1
		for k, h := range head {
			if h == c {
				j = k
			}
		}
		for _, l := range lines[1:] {
			f := strings.Split(l, ",")
			long.WriteString(c + "," + f[0] + "," + f[j] + "\n")
		}
	}
	ctx := context.Background()
	ws := schema.Settings{Columns: cols}
	wdoc, _, err := AnalyzeText(ctx, "wide.csv", wide, ws, nil)
	if err != nil {
		t.Fatal(err)
	}
	ls := schema.Settings{Long: &schema.LongColumns{ID: "series", Date: "month", Value: "employed"}}
	ldoc, in, err := AnalyzeText(ctx, "long.csv", []byte(long.String()), ls, nil)
	if err != nil {
		t.Fatal(err)
	}
	if len(ldoc.Series) != 3 || len(in) != 3 {
		t.Fatalf("%d series from the long table, want 3", len(ldoc.Series))
	}
	for i := range cols {
		a, _ := json.Marshal(wdoc.Series[i])
		b, _ := json.Marshal(ldoc.Series[i])
		if string(a) != string(b) {
			t.Errorf("%s: long and wide results differ:\n%.300s\n%.300s", cols[i], a, b)
		}
	}
	ls.Columns = []string{"utilities"}
	ldoc, _, err = AnalyzeText(ctx, "long.csv", []byte(long.String()), ls, nil)
	if err != nil || len(ldoc.Series) != 1 || ldoc.Series[0].Name != "utilities" {
		t.Errorf("columns picking one id: %v", err)
	}
	ls.Columns = []string{"mining"}
	if _, _, err := AnalyzeText(ctx, "long.csv", []byte(long.String()), ls, nil); err == nil || !strings.Contains(err.Error(), "mining") {
		t.Errorf("unknown id: %v", err)
	}
}

// TestDetectLong checks the detection of long tables: named columns,
// three unnamed columns in any order, and no detection on a wide table.
func TestDetectLong(t *testing.T) {
	var a, b strings.Builder
	a.WriteString("ID,Date,Value\n")
	b.WriteString("amount;who;when\n")
	for _, id := range []string{"north", "south"} {
		for m := 1; m <= 12; m++ {
			d := "2020-" + string(rune('0'+m/10)) + string(rune('0'+m%10))
			a.WriteString(id + "," + d + ",1." + string(rune('0'+m%10)) + "\n")
			b.WriteString("2." + string(rune('0'+m%10)) + ";" + id + ";" + d + "\n")
		}
	}
	if lc := DetectLong("a.csv", []byte(a.String()), schema.Settings{}); lc == nil || *lc != (schema.LongColumns{}) {
		t.Errorf("named columns: %+v", lc)
	}
	if lc := DetectLong("b.csv", []byte(b.String()), schema.Settings{}); lc == nil || lc.ID != "who" || lc.Date != "when" || lc.Value != "amount" {
		t.Errorf("three columns: %+v", lc)
	}
	wide, err := os.ReadFile("../../testdata/us-employment.csv")
	if err != nil {
		t.Fatal(err)
	}
	if lc := DetectLong("us-employment.csv", wide, schema.Settings{}); lc != nil {
		t.Errorf("wide table read as long: %+v", lc)
	}
}
