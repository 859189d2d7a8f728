// Tests of SimulateRows, the engine for simulations whose replications
// return several statistics (Bai-Perron's sup-F(1..M), Perron-Yabu's
// tables): rows in replication order, identical for any number of workers,
// equal to Simulate's draws for a one-number row, and cancellable
// (engine properties, no external source).
package core

import (
	"context"
	"errors"
	"math/rand/v2"
	"slices"
	"testing"
)

func TestSimulateRowsDeterministic(t *testing.T) {
	rep := func() func(r *rand.Rand) []float64 {
		return func(r *rand.Rand) []float64 { return []float64{r.NormFloat64(), r.Float64()} }
	}
	one, err := SimulateRows(context.Background(), SimSpec{Reps: 500, Seed: 11, Workers: 1}, rep)
	if err != nil {
		t.Fatal(err)
	}
	for _, w := range []int{2, 3, 7} {
		many, err := SimulateRows(context.Background(), SimSpec{Reps: 500, Seed: 11, Workers: w}, rep)
		if err != nil {
			t.Fatal(err)
		}
		for i := range one {
			if !slices.Equal(one[i], many[i]) {
				t.Fatalf("workers=%d: row %d differs", w, i)
			}
		}
	}
	// Same seeding rule as Simulate.
	d, err := Simulate(context.Background(), SimSpec{Reps: 500, Seed: 11}, func() func(r *rand.Rand) (float64, error) {
		return func(r *rand.Rand) (float64, error) { return r.NormFloat64(), nil }
	})
	if err != nil {
		t.Fatal(err)
	}
	first := make([]float64, len(one))
	for i, row := range one {
		first[i] = row[0]
	}
	slices.Sort(first)
	if !slices.Equal(first, d.Sorted) {
		t.Fatal("SimulateRows and Simulate draw differently for the same seed")
	}
}

func TestSimulateRowsCancel(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	n := 0
	_, err := SimulateRows(ctx, SimSpec{Reps: 100000, Workers: 1}, func() func(r *rand.Rand) []float64 {
		return func(r *rand.Rand) []float64 {
			if n++; n == 10 {
				cancel()
			}
			return []float64{1}
		}
	})
	if !errors.Is(err, ErrCancelled) {
		t.Fatalf("err %v, want ErrCancelled", err)
	}
	if _, err := SimulateRows(context.Background(), SimSpec{}, nil); !errors.Is(err, ErrSettings) {
		t.Fatalf("zero replications: err %v", err)
	}
}
