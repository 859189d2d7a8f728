package battery

import (
	"math"

	"github.com/rootshift/rootshift/core/schema"
)

// sanitize removes non-finite numbers that a test left in plain float
// fields, so that the document always marshals (JSON has no NaN): path
// points, estimates and critical values that are not finite are dropped;
// a surface or sequence holding a non-finite value is dropped whole, with a
// warning in the result.
func sanitize(r *schema.Result) {
	bad := func(x float64) bool { return math.IsNaN(x) || math.IsInf(x, 0) }
	cleanMap := func(m map[string]float64) {
		for k, v := range m {
			if bad(v) {
				delete(m, k)
			}
		}
	}
	cleanMap(r.CriticalValues)
	cleanMap(r.CriticalValuesSim)
	cleanMap(r.Estimates)
	for i := range r.Components {
		cleanMap(r.Components[i].CriticalValues)
	}
	for i := range r.BreakTests {
		cleanMap(r.BreakTests[i].CriticalValues)
	}
	if len(r.Path) > 0 {
		p := r.Path[:0]
		for _, pt := range r.Path {
			if !bad(pt.Statistic) {
				p = append(p, pt)
			}
		}
		r.Path = p
	}
	for i := range r.Breaks {
		if bad(r.Breaks[i].Fraction) {
			r.Breaks[i].Fraction = 0
		}
	}
	if s := r.Surface; s != nil {
		if bad(s.Min) || bad(s.Max) {
			r.Surface = nil
			r.Warnings = append(r.Warnings, "surface summary dropped: not finite")
		} else {
			rows := s.Rows[:0]
			for _, pt := range s.Rows {
				if !bad(pt.Statistic) {
					rows = append(rows, pt)
				}
			}
			s.Rows = rows
		}
	}
	if q := r.Sequence; q != nil {
		for i := range q.Values {
			if bad(q.Values[i]) || (i < len(q.Critical) && bad(q.Critical[i])) {
				r.Sequence = nil
				r.Warnings = append(r.Warnings, "statistic sequence dropped: not finite")
				break
			}
		}
	}
	if bad(r.Level) {
		r.Level = 0.05
	}
}
