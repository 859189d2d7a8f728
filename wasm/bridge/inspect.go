package bridge

import (
	"math"
	"strings"

	"github.com/rootshift/rootshift/breaks/battery"
	"github.com/rootshift/rootshift/core/dataset"
	"github.com/rootshift/rootshift/core/schema"
)

// Preview is what the inspect call returns: what the engine read from the
// data, before any test runs, and what the current input settings (columns,
// sample range, transform) select from it.
type Preview struct {
	Name         string   `json:"name"`
	Rows         int      `json:"rows"`
	DateColumn   string   `json:"date_column"`
	Frequency    string   `json:"frequency"`
	FirstDate    string   `json:"first_date,omitempty"`
	LastDate     string   `json:"last_date,omitempty"`
	Delimiter    string   `json:"delimiter,omitempty"`
	DecimalComma bool     `json:"decimal_comma"`
	Warnings     []string `json:"warnings"` // the reader's notes, one line each
	// Series describes every numeric column as read.
	Series []ColumnPreview `json:"series"`
	// Selected describes what the analysis would use under the settings.
	Selected []SelectedPreview `json:"selected"`
	// SelectError concerns every series (a bad sample range); "" if none.
	SelectError string `json:"select_error,omitempty"`
	// Long is the long-table reading in use (settings.long), nil for a
	// wide table.
	Long *schema.LongColumns `json:"long,omitempty"`
	// LongDetected is set when the data look like a long table (one row
	// per id, date and value; battery.DetectLong) and are not read as one:
	// the page offers that reading for the user to confirm.
	LongDetected *schema.LongColumns `json:"long_detected,omitempty"`
}

// ColumnPreview summarises one numeric column of the file.
type ColumnPreview struct {
	Name    string     `json:"name"`
	Column  int        `json:"column"`
	N       int        `json:"n"`
	Missing int        `json:"missing"`
	Min     *float64   `json:"min"`
	Max     *float64   `json:"max"`
	Head    []*float64 `json:"head"`
}

// SelectedPreview is one series as the analysis would receive it.
type SelectedPreview struct {
	Name  string `json:"name"`
	N     int    `json:"n"`
	Start string `json:"start,omitempty"`
	End   string `json:"end,omitempty"`
	Error string `json:"error,omitempty"`
}

// Inspect parses data exactly as the analysis would (dataset.Parse, or
// dataset.ReadXLSX for a name ending in .xlsx, with the settings' date
// column) and returns the preview envelope.
func Inspect(name string, data []byte, settings string) string {
	return Call(func() (any, error) {
		st, err := DecodeSettings(settings)
		if err != nil {
			return nil, err
		}
		if name == "" {
			name = "pasted"
		}
		if st.Long != nil {
			return longPreview(name, data, st)
		}
		detected := battery.DetectLong(name, data, st)
		t, err := readTable(name, data, st)
		if err != nil {
			if detected != nil {
				// The wide reading fails; say why and offer the long one.
				return &Preview{Name: name, Warnings: []string{}, Series: []ColumnPreview{}, Selected: []SelectedPreview{},
					SelectError: err.Error(), LongDetected: detected}, nil
			}
			return nil, err
		}
		p := preview(t, st)
		p.LongDetected = detected
		return p, nil
	})
}

// longPreview is the preview of a long table: one entry per id, each with
// its own dates.
func longPreview(name string, data []byte, st schema.Settings) (*Preview, error) {
	tables, failed, err := battery.ReadLong(name, data, st)
	if err != nil {
		return nil, err
	}
	one := st
	one.Columns = nil
	p := &Preview{Name: name, Warnings: []string{}, Series: []ColumnPreview{}, Selected: []SelectedPreview{}, Long: st.Long}
	seen := map[string]bool{}
	for _, t := range tables {
		q := preview(t, one)
		if p.DateColumn == "" {
			p.DateColumn, p.Frequency, p.Delimiter, p.DecimalComma = q.DateColumn, q.Frequency, q.Delimiter, q.DecimalComma
		}
		p.Rows += q.Rows
		if q.FirstDate != "" && (p.FirstDate == "" || q.FirstDate < p.FirstDate) {
			p.FirstDate = q.FirstDate
		}
		if q.LastDate > p.LastDate {
			p.LastDate = q.LastDate
		}
		for _, w := range q.Warnings {
			if !seen[w] {
				seen[w] = true
				p.Warnings = append(p.Warnings, w)
			}
		}
		if q.SelectError != "" && p.SelectError == "" {
			p.SelectError = q.SelectError
		}
		p.Series = append(p.Series, q.Series...)
		p.Selected = append(p.Selected, q.Selected...)
	}
	for _, f := range failed {
		p.Series = append(p.Series, ColumnPreview{Name: f.ID, Head: []*float64{}})
		p.Selected = append(p.Selected, SelectedPreview{Name: f.ID, Error: f.Err.Error()})
	}
	return p, nil
}

// readTable reads data the way battery.AnalyzeText does.
func readTable(name string, data []byte, s schema.Settings) (*dataset.Table, error) {
	opt := dataset.OptionsFor(s)
	if strings.HasSuffix(strings.ToLower(name), ".xlsx") {
		return dataset.ReadXLSX(name, data, opt)
	}
	return dataset.Parse(name, data, opt)
}

func preview(t *dataset.Table, s schema.Settings) *Preview {
	p := &Preview{Name: t.Name, Rows: t.Rows, DateColumn: t.DateColumn, Frequency: t.Frequency,
		DecimalComma: t.DecimalComma, Warnings: append([]string{}, t.Messages()...),
		Series: []ColumnPreview{}, Selected: []SelectedPreview{}}
	switch t.Delimiter {
	case 0:
	case '\t':
		p.Delimiter = "tab"
	default:
		p.Delimiter = string(t.Delimiter)
	}
	if len(t.Dates) > 0 {
		p.FirstDate, p.LastDate = t.Dates[0], t.Dates[len(t.Dates)-1]
	}
	for _, c := range t.Series {
		cp := ColumnPreview{Name: c.Name, Column: c.Column, N: len(c.Values), Head: []*float64{}}
		lo, hi := math.Inf(1), math.Inf(-1)
		for i, v := range c.Values {
			if math.IsNaN(v) {
				cp.Missing++
			} else {
				lo, hi = math.Min(lo, v), math.Max(hi, v)
			}
			if i < 5 {
				cp.Head = append(cp.Head, finitePtr(v))
			}
		}
		cp.Min, cp.Max = finitePtr(lo), finitePtr(hi)
		p.Series = append(p.Series, cp)
	}
	sel, errs := dataset.Select(t, s)
	for _, e := range errs {
		if e.Series == "" {
			p.SelectError = e.Error()
			return p
		}
	}
	failed := map[string]string{}
	for _, e := range errs {
		failed[e.Series] = e.Error()
	}
	for _, x := range sel {
		sp := SelectedPreview{Name: x.Name, N: len(x.Values)}
		if len(x.Dates) == len(x.Values) && len(x.Values) > 0 {
			sp.Start, sp.End = x.Dates[0], x.Dates[len(x.Dates)-1]
		}
		p.Selected = append(p.Selected, sp)
	}
	for _, e := range errs {
		p.Selected = append(p.Selected, SelectedPreview{Name: e.Series, Error: failed[e.Series]})
	}
	return p
}
