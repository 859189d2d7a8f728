// Tests of stage 1, the scale rule (scale.go): the Box & Cox (1964)
// profile likelihood of the first-order autoregression on levels and logs,
// with a significant growth rate required for logs. The expected choices
// are behaviour checks on simulated series (common practice, no source).
package decide

import (
	"math"
	"math/rand/v2"
	"testing"
)

func TestScaleRule(t *testing.T) {
	gen := func(key string, seed uint64) []float64 {
		p, ok := ProcessByKey(key)
		if !ok {
			t.Fatalf("no process %s", key)
		}
		y := make([]float64, 200)
		p.Gen(y, rand.New(rand.NewPCG(seed, 1)))
		return y
	}
	shift := func(y []float64, c float64) []float64 {
		for i := range y {
			y[i] += c
		}
		return y
	}
	cases := []struct {
		name string
		y    func(seed uint64) []float64
		logs int // draws out of 20 expected in logs: at least (when > 0) or at most (when <= 0, -n means at most n)
	}{
		{"geometric growth, multiplicative noise: logs", func(s uint64) []float64 { return gen("geometric", s) }, 19},
		{"random walk with drift, additive noise, far from zero: levels", func(s uint64) []float64 { return shift(gen("rw-drift", s), 500) }, -1},
		{"stationary AR(1) around 100: levels (no growth)", func(s uint64) []float64 { return shift(gen("ar", s), 100) }, 0},
		{"explosive AR(1) 1.05, additive noise, kept positive: levels", func(s uint64) []float64 { return shift(gen("explosive-1.05", s), 1e3) }, -1},
	}
	for _, c := range cases {
		n := 0
		for s := uint64(0); s < 20; s++ {
			if ok, _ := chooseScale(c.y(s)); ok {
				n++
			}
		}
		switch {
		case c.logs > 0 && n < c.logs:
			t.Errorf("%s: logs in %d of 20 draws, want at least %d", c.name, n, c.logs)
		case c.logs <= 0 && n > -c.logs:
			t.Errorf("%s: logs in %d of 20 draws, want at most %d", c.name, n, -c.logs)
		}
	}
}

func TestScaleNotPositive(t *testing.T) {
	for _, y := range [][]float64{{1, 2, -1, 3, 4}, {0, 1, 2, 3}, {1, math.NaN(), 2, 3}} {
		if ok, d := chooseScale(y); ok || !math.IsNaN(d) {
			t.Errorf("%v: logs=%v diff=%v, want levels and NaN", y, ok, d)
		}
	}
}

// The likelihood difference is invariant to the scale of the data: changing
// the units (a positive multiple) adds the same constant to both
// log-likelihoods (Box & Cox 1964, section 3: the Jacobian term).
func TestScaleInvariantToUnits(t *testing.T) {
	y := make([]float64, 150)
	p, _ := ProcessByKey("geometric")
	p.Gen(y, rand.New(rand.NewPCG(3, 3)))
	_, d1 := chooseScale(y)
	z := make([]float64, len(y))
	for i := range y {
		z[i] = 1000 * y[i]
	}
	_, d2 := chooseScale(z)
	// Levels gain n log(1000) in σ̂²/2 terms and logs gain nothing but the
	// Jacobian adds -n log(1000): the difference is unchanged.
	if math.Abs(d1-d2) > 1e-6*math.Max(1, math.Abs(d1)) {
		t.Errorf("difference %v at unit scale, %v at 1000x", d1, d2)
	}
}
