// Compact arrays (issue "The CLI as fast as its engine", item 1): a
// Zivot-Andrews search path (Zivot & Andrews 1992, eq. 1-3: the statistic at
// every candidate break) written as a run holds exactly the same numbers and
// takes well under half the bytes. Simulated series (common practice, no
// source).
package batch

import (
	"context"
	"encoding/json"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/rootshift/rootshift/core/dataset"
	"github.com/rootshift/rootshift/core/schema"
)

func TestCompactArraysRoundTrip(t *testing.T) {
	r := rand.New(rand.NewPCG(2, 2))
	y := make([]float64, 300)
	s := 0.0
	for i := range y {
		s += r.NormFloat64()
		y[i] = s
	}
	set := schema.Settings{Tests: []string{"za", "ls2"}}
	sr, err := AnalyzeSeries(context.Background(), dataset.Series{Name: "y", Values: y}, set, nil)
	if err != nil {
		t.Fatal(err)
	}
	full, _ := json.Marshal(sr)
	orig := make([][]schema.PathPoint, len(sr.Results))
	var rows []schema.PathPoint
	for i, res := range sr.Results {
		orig[i] = slices.Clone(res.Path)
		if res.Surface != nil {
			rows = slices.Clone(res.Surface.Rows)
		}
	}
	CompactArrays(&sr)
	compact, _ := json.Marshal(sr)
	paths := 0
	for i, res := range sr.Results {
		if len(orig[i]) == 0 {
			continue
		}
		paths++
		if res.Path != nil || res.PathCompact == nil {
			t.Fatalf("%s: path not compacted", res.Test)
		}
		if !slices.Equal(res.PathCompact.Points(), orig[i]) {
			t.Errorf("%s: the compact path does not expand to the original", res.Test)
		}
		if res.Surface != nil && !slices.Equal(res.Surface.RowsCompact.Points(), rows) {
			t.Errorf("%s: the compact surface rows do not expand to the original", res.Test)
		}
	}
	if paths == 0 {
		t.Fatal("no search path to compact")
	}
	t.Logf("series document %d bytes, %d with compact arrays", len(full), len(compact))
	if len(compact) > len(full)*3/4 {
		t.Errorf("compact arrays saved too little: %d -> %d bytes", len(full), len(compact))
	}
	if schema.CompactPoints([]schema.PathPoint{{Index: 1}, {Index: 2}, {Index: 4}}) != nil {
		t.Error("indices that are not a run must stay a list")
	}
}
