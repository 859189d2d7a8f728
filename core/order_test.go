package core

import (
	"context"
	"testing"
)

// TestOrderDickeyPantula: white noise is I(0), a random walk I(1), a cumulated
// random walk I(2) in most draws (common practice).
func TestOrderDickeyPantula(t *testing.T) {
	cum := func(y []float64) []float64 {
		out := make([]float64, len(y))
		s := 0.0
		for i, v := range y {
			s += v
			out[i] = s
		}
		return out
	}
	gens := []struct {
		want int
		gen  func(i int) []float64
	}{
		{0, func(i int) []float64 { return dfAR1(200, 0.3, uint64(i)) }},
		{1, func(i int) []float64 { return dfRW(200, 0, uint64(i)) }},
		{2, func(i int) []float64 { return cum(dfRW(200, 0, uint64(i))) }},
	}
	for _, g := range gens {
		hits := 0
		for i := range 40 {
			ord, res, err := TestOrder(context.Background(), g.gen(i), &Config{})
			if err != nil {
				t.Fatal(err)
			}
			if len(res) == 0 || res[0].Test != "adf" {
				t.Fatal("missing results")
			}
			if ord == 2 && len(res) != 1 || ord < 2 && len(res) != 2 {
				t.Errorf("order %d with %d results", ord, len(res))
			}
			if ord == g.want {
				hits++
			}
		}
		if hits < 32 {
			t.Errorf("I(%d): identified in %d/40 draws", g.want, hits)
		}
	}
	if _, _, err := TestOrder(context.Background(), []float64{1, 2}, nil); err == nil {
		t.Error("short series accepted")
	}
}
