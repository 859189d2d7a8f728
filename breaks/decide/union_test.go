// Tests of the union of rejections (unitroot.go, union.go): the committed
// null quantiles of R (both branches of lag rules) reproduce under a fresh simulation (our own
// simulation, a different seed; tolerance three Monte Carlo standard errors
// of a quantile), the scaling constants are the published asymptotic 5%
// critical values (MacKinnon 2010, Table 2; Zivot & Andrews 1992, Tables 2
// and 4), and the p-value function inverts the quantile function.
package decide

import (
	"context"
	"math"
	"testing"

	"github.com/rootshift/rootshift/core"
)

func TestUnionScalingConstants(t *testing.T) {
	want := []struct {
		label string
		cv    float64
		src   string
	}{
		{"ADF with a constant", -2.86154, "MacKinnon (2010) Table 2, constant, 5%, beta_inf"},
		{"ADF with a trend", -3.41049, "MacKinnon (2010) Table 2, constant + trend, 5%, beta_inf"},
		{"Zivot-Andrews with a level shift", -4.80, "Zivot & Andrews (1992) Table 2 (model A), 5%"},
		{"Zivot-Andrews with a level and slope shift", -5.08, "Zivot & Andrews (1992) Table 4 (model C), 5%"},
	}
	for i, w := range want {
		if members[i].label != w.label || members[i].cv != w.cv {
			t.Errorf("member %d: %s %v, want %s %v (%s)", i, members[i].label, members[i].cv, w.label, w.cv, w.src)
		}
	}
	// The ADF constants are the project's MacKinnon surface at T = infinity.
	if d := math.Abs(core.MacKinnonCritical(core.TrendConstant, 0.05, 0) - members[0].cv); d > 1e-5 {
		t.Errorf("ADF constant differs from core's MacKinnon table by %g", d)
	}
}

func TestUnionTableReproduces(t *testing.T) {
	if testing.Short() {
		t.Skip("simulation")
	}
	const T, reps = 100, 1500
	for _, long := range []bool{false, true} {
		s, err := SimulateUnion(context.Background(), T, reps, 777, long)
		if err != nil {
			t.Fatal(err)
		}
		for _, p := range []float64{0.90, 0.95} {
			got := QuantileOf(s, p)
			want := unionQuantile(T, p, long)
			// Standard error of a sample quantile: sqrt(p(1-p)/n)/f(q), with the
			// density f estimated from the sample's spacing around q.
			h := 0.02
			f := 2 * h / (QuantileOf(s, p+h) - QuantileOf(s, p-h))
			se := math.Sqrt(p*(1-p)/float64(len(s))) / f
			// The table's own error (4000 draws) adds about half as much again.
			if math.Abs(got-want) > 3*se*1.25 {
				t.Errorf("T=%d p=%.2f long=%v: fresh %.4f, table %.4f (3 s.e. = %.4f)", T, p, long, got, want, 3*se*1.25)
			}
		}
	}
}

func TestUnionPInvertsQuantile(t *testing.T) {
	for _, T := range []int{60, 150, 300, 1000} {
		for _, p := range []float64{0.80, 0.90, 0.95, 0.975, 0.99} {
			q := unionQuantile(T, p, false)
			if back := 1 - unionP(T, q, false); math.Abs(back-p) > 1e-9 {
				t.Errorf("T=%d: P(R <= q(%.3f)) = %.6f", T, p, back)
			}
		}
		if unionP(T, -10, false) != 0.5 || math.Abs(unionP(T, 100, false)-0.005) > 1e-12 {
			t.Errorf("T=%d: bounds %v %v, want 0.5 and 0.005", T, unionP(T, -10, false), unionP(T, 100, false))
		}
	}
}
