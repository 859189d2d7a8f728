package dataset

import (
	"archive/zip"
	"bytes"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// makeXLSX writes a minimal one-sheet workbook. rows holds cell XML per row
// (without the <row> element); strings are the shared strings.
func makeXLSX(t testing.TB, strs []string, rows []string) []byte {
	t.Helper()
	const ns = `xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"`
	var sst strings.Builder
	fmt.Fprintf(&sst, `<?xml version="1.0" encoding="UTF-8"?><sst %s count="%d" uniqueCount="%d">`, ns, len(strs), len(strs))
	for _, s := range strs {
		fmt.Fprintf(&sst, "<si><t>%s</t></si>", s)
	}
	sst.WriteString("</sst>")
	var sheet strings.Builder
	fmt.Fprintf(&sheet, `<?xml version="1.0" encoding="UTF-8"?><worksheet %s><sheetData>`, ns)
	for i, r := range rows {
		fmt.Fprintf(&sheet, `<row r="%d">%s</row>`, i+1, r)
	}
	sheet.WriteString("</sheetData></worksheet>")
	files := []struct{ name, body string }{
		{"[Content_Types].xml", `<?xml version="1.0" encoding="UTF-8"?><Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types"><Default Extension="xml" ContentType="application/xml"/></Types>`},
		{"xl/workbook.xml", `<?xml version="1.0" encoding="UTF-8"?><workbook ` + ns + ` xmlns:r="http://schemas.openxmlformats.org/officeDocument/2006/relationships"><sheets><sheet name="Data" sheetId="1" r:id="rId1"/></sheets></workbook>`},
		{"xl/_rels/workbook.xml.rels", `<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships"><Relationship Id="rId1" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/worksheet" Target="worksheets/sheet1.xml"/></Relationships>`},
		{"xl/styles.xml", `<?xml version="1.0" encoding="UTF-8"?><styleSheet ` + ns + `><cellXfs count="2"><xf numFmtId="0"/><xf numFmtId="14"/></cellXfs></styleSheet>`},
		{"xl/sharedStrings.xml", sst.String()},
		{"xl/worksheets/sheet1.xml", sheet.String()},
	}
	var buf bytes.Buffer
	zw := zip.NewWriter(&buf)
	for _, f := range files {
		w, err := zw.Create(f.name)
		if err != nil {
			t.Fatal(err)
		}
		if _, err := w.Write([]byte(f.body)); err != nil {
			t.Fatal(err)
		}
	}
	if err := zw.Close(); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

// A workbook written by makeXLSX (ours). Serial 36526 is 2000-01-01 (days
// since 1899-12-30), 36557 is 2000-02-01 and 36586 is 2000-03-01.
func TestReadXLSX(t *testing.T) {
	strs := []string{"date", "gdp", "note", "rate"}
	header := `<c r="A1" t="s"><v>0</v></c><c r="B1" t="s"><v>1</v></c><c r="C1" t="s"><v>2</v></c><c r="D1" t="s"><v>3</v></c>`
	cases := []struct {
		name  string
		style string // s attribute of the date cells
	}{
		{"date-formatted cells", ` s="1"`},
		{"plain serial numbers", ""},
	}
	for _, c := range cases {
		rows := []string{header,
			`<c r="A2"` + c.style + `><v>36526</v></c><c r="B2"><v>1.5</v></c><c r="C2" t="inlineStr"><is><t>x</t></is></c><c r="D2"><v>0.25</v></c>`,
			`<c r="A3"` + c.style + `><v>36557</v></c><c r="C3" t="inlineStr"><is><t>y</t></is></c><c r="D3"><v>1.0000000000000001E-3</v></c>`,
			`<c r="A4"` + c.style + `><v>36586</v></c><c r="B4"><v>2.75</v></c><c r="D4"><v>-3</v></c>`,
		}
		data := makeXLSX(t, strs, rows)
		tb, err := ReadXLSX("book.xlsx", data, nil)
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		if tb.DateColumn != "date" || tb.Frequency != Monthly || strings.Join(tb.Dates, ",") != "2000-01,2000-02,2000-03" {
			t.Errorf("%s: dates %q %q %v", c.name, tb.DateColumn, tb.Frequency, tb.Dates)
		}
		if len(tb.Series) != 2 || tb.Series[0].Name != "gdp" || tb.Series[1].Name != "rate" || tb.Series[1].Column != 4 {
			t.Fatalf("%s: series %+v", c.name, tb.Series)
		}
		g, r := tb.Series[0].Values, tb.Series[1].Values
		if g[0] != 1.5 || !math.IsNaN(g[1]) || g[2] != 2.75 || r[1] != 0.001 || r[2] != -3 {
			t.Errorf("%s: values %v %v", c.name, g, r)
		}
		if len(tb.Skipped) != 1 || tb.Skipped[0].ColumnName != "note" || tb.Skipped[0].Row != 2 || tb.Skipped[0].Column != 3 {
			t.Errorf("%s: skipped %v", c.name, tb.Skipped)
		}
	}
	// ReadFile dispatches on the extension.
	path := filepath.Join(t.TempDir(), "Book.XLSX")
	if err := os.WriteFile(path, makeXLSX(t, strs, []string{header, `<c r="A2"><v>1990</v></c><c r="B2"><v>1</v></c>`, `<c r="A3"><v>1991</v></c><c r="B3"><v>2</v></c>`}), 0o644); err != nil {
		t.Fatal(err)
	}
	tb, err := ReadFile(path, &Options{Columns: []string{"gdp"}})
	if err != nil || tb.Name != "Book.XLSX" || tb.Frequency != Annual || tb.Series[0].Values[1] != 2 {
		t.Errorf("ReadFile: %+v %v", tb, err)
	}
	// Not a workbook.
	if _, err := ReadXLSX("bad.xlsx", []byte("date,y\n2000,1\n"), nil); !errors.Is(err, ErrNoHeader) {
		t.Errorf("not a workbook: %v", err)
	}
}

// FuzzReadXLSX: ReadXLSX never panics and returns consistent tables.
func FuzzReadXLSX(f *testing.F) {
	f.Add(makeXLSX(f, []string{"date", "y"}, []string{
		`<c r="A1" t="s"><v>0</v></c><c r="B1" t="s"><v>1</v></c>`,
		`<c r="A2" s="1"><v>36526</v></c><c r="B2"><v>1.5</v></c>`,
		`<c r="A3" s="1"><v>36557</v></c><c r="B3"><v>2</v></c>`,
	}))
	f.Add([]byte("PK\x03\x04"))
	f.Fuzz(func(t *testing.T, data []byte) {
		tb, err := ReadXLSX("fuzz.xlsx", data, nil)
		if err == nil {
			checkTable(t, tb)
		}
	})
}
