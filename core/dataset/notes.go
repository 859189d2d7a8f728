package dataset

import "fmt"

// Note is one finding of the reader: something it did to the data or
// decided about it that the analyst should be able to see (a column renamed,
// a decimal mark guessed, a blank row read as a missing observation, an
// index column left out, calendar gaps ...). Every Note of a table is in
// Table.Notes; those about one column are also in that Series' Notes.
type Note struct {
	// Kind is one of the NoteKinds.
	Kind    string
	Message string
	// Row is the 1-based line in the file (sheet row for .xlsx), 0 when the
	// note is not about one row.
	Row int
	// Column is the 1-based column and ColumnName its header, when the
	// note is about one column.
	Column     int
	ColumnName string
}

// NoteKinds lists the kinds of Note, with what each reports:
//
//	decimal-mark    the decimal mark was chosen from the cells, or cells read either way
//	thousands       cells with thousands separators were read as grouped numbers
//	renamed         a header cell was empty or repeated and the column renamed
//	short-row       rows with fewer cells than the header: the missing cells are missing values
//	blank-row       blank rows inside the data: missing observations (no dates) or dropped (dates decide)
//	skipped-column  a column with a cell that is neither a number nor a missing marker is not a series
//	empty-column    a named column without a single value is not a series
//	index-column    the leading column numbers the rows (or is unnamed) and is not a series
//	not-years       whole numbers not read as years (outside 1800-2200 or not counting up)
//	date-format     how the day-month order or the century of two-digit years was decided
//	date-period     daily dates read as months, quarters or years
//	irregular       dates without a regular frequency
//	gap             calendar gaps in regular dates
//	gap-kept        a series tested across its calendar gaps (gaps = keep)
//	gap-split       a series cut to its longest stretch without gaps (gaps = split)
//	trimmed         leading or trailing missing values left out of a series
//	header-row      rows above the header row were skipped (workbooks)
//	sheet-ignored   another sheet of the workbook holds data that was not read
//	encoding        the file was converted from another encoding
//	sorted          rows of a long file were grouped by id or sorted by date
//	formula         workbook cells with a formula but no saved value, read as empty
var NoteKinds = []string{"decimal-mark", "thousands", "renamed", "short-row", "blank-row", "skipped-column",
	"empty-column", "index-column", "not-years", "date-format", "date-period", "irregular", "gap", "gap-kept",
	"gap-split", "trimmed", "header-row", "sheet-ignored", "encoding", "sorted", "formula"}

// String formats a note for a report line: "line 4, column 2 ("x"): message".
func (n Note) String() string {
	s := ""
	if n.Row > 0 {
		s = fmt.Sprintf("line %d", n.Row)
	}
	if n.Column > 0 || n.ColumnName != "" {
		if s != "" {
			s += ", "
		}
		switch {
		case n.Column > 0 && n.ColumnName != "":
			s += fmt.Sprintf("column %d (%q)", n.Column, n.ColumnName)
		case n.Column > 0:
			s += fmt.Sprintf("column %d", n.Column)
		default:
			s += fmt.Sprintf("column %q", n.ColumnName)
		}
	}
	if s != "" {
		s += ": "
	}
	return s + n.Message
}

// Messages returns the table's notes formatted one per line.
func (t *Table) Messages() []string {
	out := make([]string, len(t.Notes))
	for i, n := range t.Notes {
		out[i] = n.String()
	}
	return out
}

// attachNotes copies every note about a series' column into that series.
func (t *Table) attachNotes() {
	for i := range t.Series {
		t.Series[i].Notes = nil
		for _, n := range t.Notes {
			if n.Column > 0 && n.Column == t.Series[i].Column {
				t.Series[i].Notes = append(t.Series[i].Notes, n)
			}
		}
	}
}

// dateNotes adds the notes of a parsed date column (in column col, named
// colName; lines maps cell indexes to file lines, nil when unknown).
func (t *Table) dateNotes(dc *dateColumn, col int, colName string, lines []int) {
	row := func(i int) int {
		if i >= 0 && i < len(lines) {
			return lines[i]
		}
		return 0
	}
	for _, n := range dc.notes {
		t.Notes = append(t.Notes, Note{Kind: n.kind, Message: n.msg, Row: row(n.i), Column: col, ColumnName: colName})
	}
	if dc.warn != "" {
		t.Notes = append(t.Notes, Note{Kind: "irregular", Column: col, ColumnName: colName, Message: dc.warn})
	}
	if len(dc.gaps) > 0 {
		t.Notes = append(t.Notes, Note{Kind: "gap", Column: col, ColumnName: colName, Row: row(dc.gaps[0].i),
			Message: "calendar gaps: " + describeGaps(dc.gaps, dc.freq) + "; the gaps setting decides what the tests see (stop, keep or split)"})
	}
}
