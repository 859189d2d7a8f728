package report

// Decision words for the seasonal unit-root test (core/hegy.go; Hylleberg,
// Engle, Granger & Yoo 1990): its F statistics are right-tailed but test
// unit roots at seasonal frequencies, not an explosive root.

import (
	"testing"

	"github.com/rootshift/rootshift/core/schema"
)

func TestSeasonalDecisionWords(t *testing.T) {
	r := &schema.Result{Test: "seasonal", Tail: "right", Statistic: schema.F(12), Reject: true,
		Null: "the series has unit roots at every seasonal frequency (the seasonal difference is needed)"}
	for _, tc := range []struct {
		got, want string
	}{
		{resultDecision(r), "rejects seasonal unit roots"},
		{componentDecision(r, &schema.Component{Name: "F (frequency π/2, 4-quarter cycle)", Statistic: schema.F(9), Tail: "right", Reject: true}), "rejects unit root"},
		{componentDecision(r, &schema.Component{Name: "t1 (zero frequency)", Statistic: schema.F(-1), Tail: "left"}), "cannot reject unit root"},
	} {
		if tc.got != tc.want {
			t.Errorf("got %q, want %q", tc.got, tc.want)
		}
	}
	r.Reject = false
	if got := resultDecision(r); got != "cannot reject seasonal unit roots" {
		t.Errorf("not rejected: %q", got)
	}
}
