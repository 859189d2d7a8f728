// Tests of the weighted fit of the bootstrap null (null.go: localSD,
// dynSpec.weigh), the adaptive estimation of Xu & Phillips (2008, J.
// Econometrics 142, section 3) for autoregressions whose innovation
// variance changes over time: with a burst of volatility (sigma x4 over a
// tenth of the sample, as in processes.go) the weighted estimate of an
// autoregressive coefficient of the differences has a smaller
// root-mean-square error than ordinary least squares, and without one the
// two agree closely. Our simulation: 300 draws, T = 200, seed 8.
package decide

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/rootshift/rootshift/core"
)

func TestWeightedNullFit(t *testing.T) {
	const T, draws, gamma = 200, 300, 0.4
	cases := []struct {
		name  string
		burst bool
		// want: WLS RMSE / OLS RMSE at most (burst) or within (no burst)
		ratioMax float64
	}{
		{"burst of volatility", true, 0.9},
		{"constant volatility", false, 1.1},
	}
	for _, c := range cases {
		var seOLS, seWLS float64
		y := make([]float64, T)
		for b := range draws {
			r := rand.New(rand.NewPCG(8, uint64(b)))
			u := 0.0
			for i := 1; i < T; i++ {
				sd := 1.0
				if c.burst && i >= T/2 && i < T/2+T/10 {
					sd = 4
				}
				u = gamma*u + sd*r.NormFloat64()
				y[i] = y[i-1] + u
			}
			mu := make([]float64, T-1)
			spec := dynSpec{k: 1, trend: core.TrendConstant}
			ols, err := fitNull(y, spec, mu, nil)
			if err != nil {
				t.Fatal(err)
			}
			spec.sd = localSD(diff(y))
			wls, err := fitNull(y, spec, mu, nil)
			if err != nil {
				t.Fatal(err)
			}
			seOLS += (ols.gamma[0] - gamma) * (ols.gamma[0] - gamma)
			seWLS += (wls.gamma[0] - gamma) * (wls.gamma[0] - gamma)
		}
		ratio := math.Sqrt(seWLS / seOLS)
		t.Logf("%s: RMSE OLS %.4f, WLS %.4f (ratio %.3f)", c.name, math.Sqrt(seOLS/draws), math.Sqrt(seWLS/draws), ratio)
		if ratio > c.ratioMax || (!c.burst && ratio < 0.9) {
			t.Errorf("%s: WLS/OLS RMSE ratio %.3f, want at most %.2f", c.name, ratio, c.ratioMax)
		}
	}
}

func TestLocalSD(t *testing.T) {
	d := make([]float64, 200)
	for i := range d {
		d[i] = 1
		if i >= 100 && i < 130 {
			d[i] = 4
		}
	}
	sd := localSD(d)
	// h = max(5, 10) = 10: an observation whose window lies inside the
	// burst has sd 4, one far from it sd 1 (exact, by construction).
	for _, c := range []struct {
		i    int
		want float64
	}{{0, 1}, {50, 1}, {115, 4}, {199, 1}} {
		if math.Abs(sd[c.i]-c.want) > 1e-12 {
			t.Errorf("sd[%d] = %v, want %v", c.i, sd[c.i], c.want)
		}
	}
}
