package report

import (
	"bytes"
	"encoding/csv"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"

	"github.com/rootshift/rootshift/core/dataset"
	"github.com/rootshift/rootshift/core/schema"
)

// randomDoc builds a document from a seed and three chosen floats: every
// float field draws from those, NaN, ±Inf, huge, tiny and Gaussian values.
// Pointer fields go through schema.F as producers do, except that now and
// then a pointer to a raw non-finite value slips through.
func randomDoc(seed uint64, a, b, c float64, name string) (*schema.Document, []dataset.Series) {
	r := rand.New(rand.NewPCG(seed, 17))
	pool := []float64{a, b, c, math.NaN(), math.Inf(1), math.Inf(-1), 0, -math.MaxFloat64, 1e-300}
	fl := func() float64 {
		if r.IntN(3) == 0 {
			return r.NormFloat64() * 3
		}
		return pool[r.IntN(len(pool))]
	}
	pf := func() *float64 {
		switch r.IntN(6) {
		case 0:
			return nil
		case 1:
			x := fl()
			return &x // possibly a raw NaN
		}
		return schema.F(fl())
	}
	str := func() string {
		if r.IntN(3) == 0 {
			return name
		}
		return []string{"", "adf", "x_y&z%#$", "<b>", "1990Q1", "a\"b,c\nd"}[r.IntN(6)]
	}
	cvs := func() map[string]float64 {
		if r.IntN(4) == 0 {
			return nil
		}
		return map[string]float64{"0.01": fl(), "0.05": fl(), "0.10": fl()}
	}
	idx := func() int { return r.IntN(80) - 10 }
	brk := func() []schema.Break {
		out := make([]schema.Break, r.IntN(3))
		for i := range out {
			out[i] = schema.Break{Index: idx(), Date: str(), Fraction: fl(), Lower: idx(), Upper: idx(), CILevel: fl()}
		}
		return out
	}
	comps := func() []schema.Component {
		out := make([]schema.Component, r.IntN(4))
		for i := range out {
			out[i] = schema.Component{Name: str(), Statistic: pf(), PValue: pf(), CriticalValues: cvs(),
				Tail: []string{"", "left", "right"}[r.IntN(3)], Reject: r.IntN(2) == 0}
		}
		return out
	}
	doc := &schema.Document{Schema: schema.ID, Version: str(), Source: &schema.Source{Name: str(), Rows: r.IntN(100)},
		Settings: schema.Settings{Trend: str(), Level: fl(), Trim: fl(), Sims: r.IntN(3) * 99, LagRule: str()}}
	if r.IntN(3) == 0 {
		k := idx()
		doc.Settings.Lags, doc.Settings.MaxLags = &k, &k
	}
	var inputs []dataset.Series
	for range r.IntN(4) {
		s := schema.Series{Name: str(), N: r.IntN(100), Start: str(), End: str(), Transform: str()}
		for range r.IntN(5) {
			res := schema.Result{Test: []string{"adf", "kpss", "za", "bp", "gsadf", "mtests", str()}[r.IntN(7)],
				Variant: str(), Trend: str(), Shift: str(), Statistic: pf(), PValue: pf(), PValueSim: pf(),
				CriticalValues: cvs(), Tail: []string{"left", "right", ""}[r.IntN(3)], Lags: idx(), NObs: idx(),
				Null: []string{"unit root", "stationary", "no break", str()}[r.IntN(4)], Reject: r.IntN(2) == 0,
				Level: fl(), Components: comps(), BreakTests: comps(), Breaks: brk(), Bandwidth: pf(), Kernel: str()}
			if r.IntN(2) == 0 {
				for range r.IntN(40) {
					res.Path = append(res.Path, schema.PathPoint{Index: idx(), Statistic: fl()})
				}
			}
			if r.IntN(3) == 0 {
				sq := &schema.Sequence{Name: str(), Level: fl()}
				for range r.IntN(30) {
					sq.Index = append(sq.Index, idx())
					sq.Values = append(sq.Values, fl())
				}
				for range r.IntN(30) {
					sq.Critical = append(sq.Critical, fl())
				}
				res.Sequence = sq
				res.Episodes = []schema.Episode{{Start: schema.Point{Index: idx(), Date: str()}, End: schema.Point{Index: idx()}}}
			}
			if r.IntN(4) == 0 {
				res.Surface = &schema.Surface{Candidates: idx(), Min: fl(), Max: fl(), Rows: []schema.PathPoint{{Index: idx(), Statistic: fl()}}}
			}
			if r.IntN(3) == 0 {
				res.Estimates = map[string]float64{str(): fl()}
				res.Warnings = []string{str()}
			}
			s.Results = append(s.Results, res)
		}
		if r.IntN(2) == 0 {
			o := r.IntN(4) - 1
			v := &schema.Verdict{Class: str(), Transform: str(), Explanation: str(), Breaks: brk(),
				Supporting: []string{str()}, Against: []string{str()}, Tests: []string{str()}}
			if o >= 0 {
				v.Order = &o
			}
			if r.IntN(2) == 0 {
				v.Window = &schema.WindowCheck{From: str(), To: str(), BreakInside: r.IntN(2) == 0}
			}
			s.Verdict = v
		}
		if r.IntN(2) == 0 {
			s.Errors = []schema.Error{{Test: str(), Message: str(), Row: idx(), Column: str()}}
			s.Warnings = []string{str()}
		}
		doc.Series = append(doc.Series, s)
		in := dataset.Series{Name: str()}
		if r.IntN(4) != 0 {
			n := r.IntN(60)
			in.Values = make([]float64, n)
			for i := range in.Values {
				in.Values[i] = fl()
			}
			if r.IntN(2) == 0 {
				in.Dates = make([]string, n+r.IntN(2))
				for i := range in.Dates {
					in.Dates[i] = strconv.Itoa(2000 + i)
				}
			}
		}
		inputs = append(inputs, in)
	}
	return doc, inputs
}

// FuzzWrite feeds random documents into every format: no panic, no error
// except from JSON (which rejects a raw NaN in a plain float field), CSV
// with the same columns on every row, well-formed HTML and plots, and no
// NaN or Inf printed where the fuzzer did not write it into a name.
func FuzzWrite(f *testing.F) {
	f.Add(uint64(1), 1.5, -2.0, 0.0, "x")
	f.Add(uint64(2), math.NaN(), math.Inf(1), math.Inf(-1), "")
	f.Add(uint64(3), 1e308, -1e308, 5e-324, "GDP & <co>")
	f.Add(uint64(4), 0.05, 0.01, 0.10, "\x00\xff")
	f.Fuzz(func(t *testing.T, seed uint64, a, b, c float64, name string) {
		doc, inputs := randomDoc(seed, a, b, c, name)
		clean := !strings.Contains(name, "NaN") && !strings.Contains(name, "Inf")
		for _, format := range Formats {
			var buf bytes.Buffer
			err := Write(&buf, format, doc, inputs)
			if err != nil && format != "json" {
				t.Fatalf("%s: %v", format, err)
			}
			out := buf.String()
			if clean && format != "json" && (strings.Contains(out, "NaN") || strings.Contains(out, "Inf")) {
				t.Fatalf("%s prints NaN or Inf", format)
			}
			switch format {
			case "csv":
				if _, err := csv.NewReader(strings.NewReader(out)).ReadAll(); err != nil {
					t.Fatalf("csv does not parse back: %v", err)
				}
			case "html":
				if err := xmlWellFormed(strings.TrimPrefix(out, "<!DOCTYPE html>\n")); err != nil {
					t.Fatalf("html not well-formed: %v", err)
				}
			}
		}
		for i := range inputs {
			for _, svg := range []string{SeriesSVG(inputs[i], PlotBreaks(&doc.Series[i]), nil), ACFSVG(inputs[i], int(seed%50))} {
				if err := xmlWellFormed(svg); err != nil {
					t.Fatalf("svg: %v", err)
				}
			}
		}
	})
}
