package bridge

import (
	"math"
	"strings"

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
		t, err := readTable(name, data, st)
		if err != nil {
			return nil, err
		}
		return preview(t, st), nil
	})
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
