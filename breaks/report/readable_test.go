package report

import (
	"sort"
	"strings"
	"testing"
)

// Readable reports (issue 12, item 6): natural order of estimate names,
// counts printed as integers, short variant labels with their details in the
// notes. Expected values are written by hand from the rules (common
// practice, no source); the long bp label is the one breaks/bp.go writes.

func TestNaturalOrder(t *testing.T) {
	got := []string{"gamma10", "rho", "gamma2", "gamma1", "gamma11", "const", "gamma02", "x9y", "x10y", "se_rho"}
	sort.Slice(got, func(i, j int) bool { return naturalLess(got[i], got[j]) })
	want := "const gamma1 gamma02 gamma2 gamma10 gamma11 rho se_rho x9y x10y"
	if s := strings.Join(got, " "); s != want {
		t.Errorf("order %q, want %q", s, want)
	}
	if s := estimatesText(map[string]float64{"gamma10": 0.5, "gamma2": 1, "h": 18, "lambda": 0.25}); s != "gamma2=1, gamma10=0.5000, h=18, lambda=0.2500" {
		t.Errorf("estimatesText = %q", s)
	}
}

func TestValueIntegers(t *testing.T) {
	for _, tc := range []struct {
		x    float64
		want string
	}{
		{4, "4"}, {0, "0"}, {-3, "-3"}, {18, "18"}, {0.25, "0.2500"}, {4.00001, "4.0000"}, {1e20, "100000000000000000000.0000"},
	} {
		if got := value(tc.x, "n/a"); got != tc.want {
			t.Errorf("value(%g) = %q, want %q", tc.x, got, tc.want)
		}
	}
}

func TestShortVariant(t *testing.T) {
	for _, tc := range []struct{ in, short, detail string }{
		{"right-tailed", "right-tailed", ""},
		{"crash (model A)", "crash (model A)", ""},
		{"statistic = UDmax (q=1, pure structural change, trimming 0.15, M=5)", "UDmax", "q=1, pure structural change, trimming 0.15, M=5"},
		{"log levels, right-tailed with trend, observations 1-42", "log levels", "right-tailed with trend, observations 1-42"},
		{"additive outlier, model A, break by t-sig", "additive outlier", "model A, break by t-sig"},
	} {
		s, d := shortVariant(tc.in)
		if s != tc.short || d != tc.detail {
			t.Errorf("shortVariant(%q) = %q, %q; want %q, %q", tc.in, s, d, tc.short, tc.detail)
		}
		if len([]rune(s)) > variantMax {
			t.Errorf("%q longer than %d", s, variantMax)
		}
	}
}
