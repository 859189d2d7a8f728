// Workbooks as analysts send them: data on the second sheet, a title row
// above the header, a blank row inside the data, a sheet chosen by name.
// The workbooks are written by the test (ours); the Office Open XML
// SpreadsheetML layout follows ECMA-376 Part 1 (sheets, rows with r
// attributes, inline strings).
package dataset

import (
	"archive/zip"
	"bytes"
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"
)

type testSheet struct {
	name string
	rows []string // cell XML of each row; "" writes no row element (a blank row)
}

// makeWorkbook writes a workbook with the sheets in order.
func makeWorkbook(t testing.TB, sheets []testSheet) []byte {
	t.Helper()
	const ns = `xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"`
	var wb, rels strings.Builder
	files := map[string]string{
		"[Content_Types].xml": `<?xml version="1.0" encoding="UTF-8"?><Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types"><Default Extension="xml" ContentType="application/xml"/></Types>`,
		"xl/styles.xml":       `<?xml version="1.0" encoding="UTF-8"?><styleSheet ` + ns + `><cellXfs count="1"><xf numFmtId="0"/></cellXfs></styleSheet>`,
	}
	fmt.Fprintf(&wb, `<?xml version="1.0" encoding="UTF-8"?><workbook %s xmlns:r="http://schemas.openxmlformats.org/officeDocument/2006/relationships"><sheets>`, ns)
	rels.WriteString(`<?xml version="1.0" encoding="UTF-8"?><Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">`)
	for i, sh := range sheets {
		fmt.Fprintf(&wb, `<sheet name="%s" sheetId="%d" r:id="rId%d"/>`, sh.name, i+1, i+1)
		fmt.Fprintf(&rels, `<Relationship Id="rId%d" Type="http://schemas.openxmlformats.org/officeDocument/2006/relationships/worksheet" Target="worksheets/sheet%d.xml"/>`, i+1, i+1)
		var b strings.Builder
		fmt.Fprintf(&b, `<?xml version="1.0" encoding="UTF-8"?><worksheet %s><sheetData>`, ns)
		for r, cells := range sh.rows {
			if cells != "" {
				fmt.Fprintf(&b, `<row r="%d">%s</row>`, r+1, cells)
			}
		}
		b.WriteString("</sheetData></worksheet>")
		files[fmt.Sprintf("xl/worksheets/sheet%d.xml", i+1)] = b.String()
	}
	wb.WriteString("</sheets></workbook>")
	rels.WriteString("</Relationships>")
	files["xl/workbook.xml"] = wb.String()
	files["xl/_rels/workbook.xml.rels"] = rels.String()
	var buf bytes.Buffer
	zw := zip.NewWriter(&buf)
	for _, name := range []string{"[Content_Types].xml", "xl/workbook.xml", "xl/_rels/workbook.xml.rels", "xl/styles.xml"} {
		w, _ := zw.Create(name)
		w.Write([]byte(files[name]))
	}
	for i := range sheets {
		name := fmt.Sprintf("xl/worksheets/sheet%d.xml", i+1)
		w, _ := zw.Create(name)
		w.Write([]byte(files[name]))
	}
	if err := zw.Close(); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

// row builds the cell XML of one row from its values: numbers as numbers,
// other text as inline strings, "" as no cell.
func row(r int, vals ...string) string {
	var b strings.Builder
	for j, v := range vals {
		if v == "" {
			continue
		}
		ref := fmt.Sprintf("%c%d", 'A'+j, r)
		if _, ok := parseNumber(v, decPoint); ok {
			fmt.Fprintf(&b, `<c r="%s"><v>%s</v></c>`, ref, v)
		} else {
			fmt.Fprintf(&b, `<c r="%s" t="inlineStr"><is><t>%s</t></is></c>`, ref, v)
		}
	}
	return b.String()
}

func TestWorkbookSheets(t *testing.T) {
	readme := testSheet{"About", []string{row(1, "Exported from the ledger"), row(2, "see sheet Data")}}
	data := testSheet{"Data", []string{
		row(1, "Quarterly accounts, invented figures"),
		row(2, "quarter", "gdp", "cpi"),
		row(3, "2001Q1", "1.5", "2"),
		row(4, "2001Q2", "1.7", "2.1"),
		"",
		row(6, "2001Q3", "1.8", "2.2"),
	}}
	other := testSheet{"Annual", []string{row(1, "year", "x"), row(2, "2001", "5"), row(3, "2002", "6")}}
	book := makeWorkbook(t, []testSheet{readme, data, other})

	tb, err := ReadXLSX("book.xlsx", book, nil)
	if err != nil {
		t.Fatal(err)
	}
	if names(tb) != "gdp|cpi" || tb.Frequency != Quarterly || tb.Rows != 3 || tb.Dates[2] != "2001Q3" {
		t.Fatalf("series %s freq %q rows %d dates %v", names(tb), tb.Frequency, tb.Rows, tb.Dates)
	}
	for _, want := range []struct{ kind, text string }{
		{"header-row", "the header is row 2"},
		{"blank-row", "line 5"},
		{"sheet-ignored", `sheet "About"`},
		{"sheet-ignored", `sheet "Annual" (3 filled rows) was not read`},
	} {
		if !hasNote(tb, want.kind, want.text) {
			t.Errorf("notes %q lack %s %q", tb.Messages(), want.kind, want.text)
		}
	}
	// The sheet setting picks another sheet.
	tb, err = ReadXLSX("book.xlsx", book, &Options{Sheet: "annual"})
	if err != nil || names(tb) != "x" || tb.Frequency != Annual || !hasNote(tb, "sheet-ignored", `"Data"`) {
		t.Errorf("sheet Annual: %v %+v", err, tb)
	}
	// An unknown sheet lists the sheets; an error inside a sheet names it.
	if _, err := ReadXLSX("book.xlsx", book, &Options{Sheet: "Q"}); !errors.Is(err, ErrUnknownColumn) || !strings.Contains(err.Error(), "About, Data, Annual") {
		t.Errorf("unknown sheet: %v", err)
	}
	if _, err := ReadXLSX("book.xlsx", book, &Options{Sheet: "About"}); err == nil || !strings.Contains(err.Error(), `sheet "About"`) {
		t.Errorf("sheet without series: %v", err)
	}
	// A blank row without dates is a missing observation.
	plain := makeWorkbook(t, []testSheet{{"S", []string{row(1, "y"), row(2, "1"), "", row(4, "3")}}})
	tb, err = ReadXLSX("p.xlsx", plain, nil)
	if err != nil || tb.Rows != 3 || !math.IsNaN(tb.Series[0].Values[1]) {
		t.Errorf("blank row: %v %+v", err, tb)
	}
}

// A formula without a saved value (ECMA-376 Part 1, 18.3.1.4: a c element
// with an f child and no v child) is read as empty, and noted.
func TestWorkbookFormulaWithoutValue(t *testing.T) {
	book := makeWorkbook(t, []testSheet{{"S", []string{
		row(1, "year", "y", "z"),
		row(2, "2001", "1", "5"),
		row(3, "2002", "2", "") + `<c r="C3"><f>C2*2</f></c>`,
		row(4, "2003", "3", "") + `<c r="C4"><f>C3*2</f><v>20</v></c>`,
	}}})
	tb, err := ReadXLSX("f.xlsx", book, nil)
	if err != nil {
		t.Fatal(err)
	}
	if !hasNote(tb, "formula", "1 cell holds a formula without a saved value, read as empty (C3)") {
		t.Errorf("notes %q", tb.Messages())
	}
	if z := tb.Series[1].Values; !math.IsNaN(z[1]) || z[2] != 20 {
		t.Errorf("z = %v", z)
	}
}
