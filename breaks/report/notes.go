package report

import (
	"strconv"

	"github.com/rootshift/rootshift/core/schema"
)

// noteText formats one reader note: "line 4, column "x": message".
func noteText(n schema.Note) string {
	s := ""
	if n.Row > 0 {
		s = "line " + strconv.Itoa(n.Row)
	}
	if n.Column != "" {
		if s != "" {
			s += ", "
		}
		s += "column " + strconv.Quote(n.Column)
	}
	if s != "" {
		s += ": "
	}
	return s + n.Message
}

// inputNotes lists what the reader decided or changed in the input, one
// line per note: the source's notes, then each series' own notes (those not
// already among the source's: values trimmed, calendar gaps handled),
// prefixed by the series name. Every output format shows these lines in a
// "notes on the input" section.
func inputNotes(doc *schema.Document) []string {
	var out []string
	seen := map[schema.Note]bool{}
	if doc.Source != nil {
		for _, n := range doc.Source.Notes {
			seen[n] = true
			out = append(out, noteText(n))
		}
	}
	for i := range doc.Series {
		s := &doc.Series[i]
		for _, n := range s.Notes {
			if !seen[n] {
				out = append(out, s.Name+": "+noteText(n))
			}
		}
	}
	return out
}

// csvNoteRows are the "note" rows of WriteCSV: one per source note (series
// empty) and per series' own note, the text in the message column.
func csvNoteRows(doc *schema.Document) [][]string {
	var out [][]string
	seen := map[schema.Note]bool{}
	row := func(id, series string, n schema.Note) []string {
		rec := make([]string, cNumColumns)
		rec[cRowType] = "note"
		rec[cID] = csvText(id)
		rec[cSeries] = csvText(series)
		rec[cMessage] = csvText(noteText(n))
		return rec
	}
	if doc.Source != nil {
		for _, n := range doc.Source.Notes {
			seen[n] = true
			out = append(out, row(doc.Source.Name, "", n))
		}
	}
	for i := range doc.Series {
		s := &doc.Series[i]
		for _, n := range s.Notes {
			if !seen[n] {
				out = append(out, row(csvID(doc, s), s.Name, n))
			}
		}
	}
	return out
}
