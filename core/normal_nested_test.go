// Tests of Normal.NestedSSR (normal.go): the sums of squared residuals of
// every leading block of regressors from one Cholesky factorisation equal
// those of Solve on each block (the nesting property of the Cholesky
// factor; Golub & Van Loan 2013, section 4.2), including a design whose
// columns differ in scale by 1e6, and a singular design is refused.
package core

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"
)

func normalFromDesign(X [][]float64, y []float64) *Normal {
	k := len(X)
	var m Normal
	m.Reset(k)
	for i := range k {
		for j := 0; j <= i; j++ {
			s := 0.0
			for t := range y {
				s += X[i][t] * X[j][t]
			}
			m.A[i*k+j] = s
		}
		s := 0.0
		for t := range y {
			s += X[i][t] * y[t]
		}
		m.B[i] = s
	}
	for _, v := range y {
		m.YY += v * v
	}
	m.N = len(y)
	return &m
}

func TestNestedSSRMatchesSolve(t *testing.T) {
	for _, c := range []struct {
		name  string
		k, n  int
		scale float64 // the last column's scale
	}{
		{"six regressors", 6, 80, 1},
		{"eighteen regressors", 18, 300, 1},
		{"a column at 1e6", 5, 120, 1e6},
	} {
		r := rand.New(rand.NewPCG(12, uint64(c.k)))
		X := make([][]float64, c.k)
		for i := range X {
			X[i] = make([]float64, c.n)
			for t := range X[i] {
				X[i][t] = r.NormFloat64()
				if i == c.k-1 {
					X[i][t] *= c.scale
				}
			}
		}
		y := make([]float64, c.n)
		for t := range y {
			y[t] = 0.5*X[0][t] + r.NormFloat64()
		}
		full := normalFromDesign(X, y)
		out := make([]float64, c.k)
		if err := full.NestedSSR(out); err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		for p := 1; p <= c.k; p++ {
			sub := normalFromDesign(X[:p], y)
			want, err := sub.Solve()
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(out[p-1]-want) > 1e-10*full.YY {
				t.Errorf("%s: SSR of the first %d regressors %v, Solve %v", c.name, p, out[p-1], want)
			}
		}
		if a := testing.AllocsPerRun(10, func() { _ = full.NestedSSR(out) }); a != 0 {
			t.Errorf("%s: NestedSSR allocates %v times", c.name, a)
		}
	}
	// Two equal columns: singular.
	X := [][]float64{{1, 2, 3, 4, 5}, {1, 2, 3, 4, 5}}
	m := normalFromDesign(X, []float64{1, 0, 1, 0, 1})
	if err := m.NestedSSR(make([]float64, 2)); !errors.Is(err, ErrSingular) {
		t.Errorf("singular design: %v, want ErrSingular", err)
	}
}
