package schema

import "testing"

// TestFormatP: the one printed form of a p-value (core/schema/pvalue.go):
// three decimals for a point value, the bound for a value at the end of a
// table or beyond the display limits 0.001 and 0.999. Expected strings are
// written by hand from the rules (common practice, no source); the phrases
// are the ones the tests write (core/pvalue.go, breaks/lm_tables.go).
func TestFormatP(t *testing.T) {
	f := func(x float64) *float64 { return &x }
	for _, tc := range []struct {
		r      Result
		shown  string
		clause string
	}{
		{Result{PValue: f(0.62014)}, "0.620", "p=0.620"},
		{Result{PValue: f(0.0004)}, "<0.001", "p<0.001"},
		{Result{PValue: f(0.9995)}, ">0.999", "p>0.999"},
		{Result{PValue: f(0.99), PValueMethod: "LM table; p-value clamped to 0.99"}, ">0.99", "p>0.99"},
		{Result{PValue: f(0.005), Warnings: []string{"p-value bounded at 0.005"}}, "<0.005", "p<0.005"},
		{Result{PValue: f(0.0021)}, "0.002", "p=0.002"},
		{Result{PValue: f(-0.0)}, "<0.001", "p<0.001"},
		{Result{}, "", ""},
	} {
		if got := ResultP(&tc.r); got != tc.shown {
			t.Errorf("%+v: shown %q, want %q", tc.r.PValue, got, tc.shown)
		}
		if got := PClause(tc.r.PValue, ResultPBound(&tc.r)); got != tc.clause {
			t.Errorf("%+v: clause %q, want %q", tc.r.PValue, got, tc.clause)
		}
	}
}
