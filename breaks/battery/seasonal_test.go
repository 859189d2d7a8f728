package battery

// The seasonal unit-root test (core/hegy.go: Hylleberg, Engle, Granger &
// Yoo 1990; Beaulieu & Miron 1993) run through the battery takes its period
// from the series' frequency.

import (
	"context"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/dataset"
	"github.com/rootshift/rootshift/core/schema"
)

func TestSeasonalPeriodFromFrequency(t *testing.T) {
	y := make([]float64, 120)
	core.SeasonalRandomWalk(y, 12, rand.New(rand.NewPCG(4, 5)))
	for _, tc := range []struct {
		freq    string
		variant string // "" means the test must fail with a settings error
	}{
		{"monthly", "Beaulieu-Miron monthly"},
		{"quarterly", "HEGY quarterly"},
		{"annual", ""},
	} {
		sr, err := AnalyzeSeries(context.Background(), dataset.Series{Name: "x", Values: y, Frequency: tc.freq}, schema.Settings{Tests: []string{"seasonal"}}, nil)
		if err != nil {
			t.Fatal(err)
		}
		if tc.variant == "" {
			if len(sr.Results) != 0 || len(sr.Errors) != 1 || !strings.Contains(sr.Errors[0].Message, "period") {
				t.Errorf("%s: want one error naming the period, got results %d errors %+v", tc.freq, len(sr.Results), sr.Errors)
			}
			continue
		}
		if len(sr.Results) != 1 || !strings.HasPrefix(sr.Results[0].Variant, tc.variant) {
			t.Errorf("%s: results %+v errors %+v", tc.freq, sr.Results, sr.Errors)
		}
	}
}
