// Tests of the ERS point-optimal test P_T: recalled ERS (1996) Table 1
// values reproduced by our simulation, the Result fields, fuzzing and
// benchmarks (size and power are in dfgls_test.go, TestGLSTestsSizeAndPower).
package core

import (
	"testing"
)

// ERS (1996) Table 1, P_T rows, asymptotic (shared reference §4b, MEMORY
// (m)): reproduced by our simulation of ERS eq. (9) with σ² = 1 known,
// S(ᾱ) - ᾱ S(1), at T = 500, 20,000 replications, seed 4242 (the row is
// evidently a long-T simulation of that statistic). Tolerances: about 4
// Monte Carlo standard errors plus half a unit in the last digit. The
// feasible statistic (ω̂² estimated) has the same limit; our surface's b∞
// for it is 1.95 / 3.28 / 4.52 (constant) and 4.02 / 5.73 / 7.01 (trend).
//
// Not reproduced, and so not asserted: the finite-sample rows (T = 50, 100,
// 200) of P_T, e.g. trend T = 100: 4.26 / 5.64 / 6.79 recalled, against
// our 4.57 / 6.07 / 7.27 (ω̂² estimated, k = 0) and 3.79 / 5.25 / 6.44
// (σ² known); the recalled rows evidently use another variance estimate.
func TestERSPublishedValues(t *testing.T) {
	glsCheckPublished(t, []glsPublished{
		{"ERS Table 1, P_T constant, ∞, 1%", glsPT, TrendConstant, 0.01, 1.99, 500, 0.08, true},
		{"ERS Table 1, P_T constant, ∞, 5%", glsPT, TrendConstant, 0.05, 3.26, 500, 0.08, true},
		{"ERS Table 1, P_T constant, ∞, 10%", glsPT, TrendConstant, 0.10, 4.48, 500, 0.10, true},
		{"ERS Table 1, P_T trend, ∞, 1%", glsPT, TrendLinear, 0.01, 3.96, 500, 0.10, true},
		{"ERS Table 1, P_T trend, ∞, 5%", glsPT, TrendLinear, 0.05, 5.62, 500, 0.10, true},
		{"ERS Table 1, P_T trend, ∞, 10%", glsPT, TrendLinear, 0.10, 6.89, 500, 0.12, true},
	})
}

// The Result carries every field the conventions require.
func TestERSResultFields(t *testing.T) {
	y := glsTestRW(150, 8)
	for _, det := range []Trend{TrendNone, TrendConstant, TrendLinear} {
		res, err := RunERS(t.Context(), y, &Config{Trend: det, Level: 0.10})
		if err != nil {
			t.Fatal(err)
		}
		if res.Test != "ers" || res.Trend != det.String() || res.Tail != "left" || res.Null == "" ||
			res.PValue == nil || res.PValueMethod == "" || res.CriticalSource == "" || res.Level != 0.10 ||
			res.Statistic == nil || *res.Statistic <= 0 {
			t.Fatalf("%v: incomplete result %+v", det, res)
		}
		cv := res.CriticalValues
		if !(cv["0.01"] < cv["0.025"] && cv["0.025"] < cv["0.05"] && cv["0.05"] < cv["0.10"]) {
			t.Errorf("%v: critical values not ordered: %v", det, cv)
		}
		if res.Reject != (*res.PValue < 0.10) {
			t.Errorf("%v: reject %v with p %v", det, res.Reject, *res.PValue)
		}
		var w GLSTester
		st, _ := w.Compute(y, &Config{Trend: det})
		info, _ := Lookup("ers")
		if v, err := info.NewStat(150, &Config{Trend: det})(y); err != nil || v != st.PT || *res.Statistic != st.PT {
			t.Errorf("%v: NewStat %v %v, Run %v, Compute %v", det, v, err, *res.Statistic, st.PT)
		}
	}
}

// FuzzERS: arbitrary series never panic and never report NaN.
func FuzzERS(f *testing.F) { glsFuzz(f, "ers") }

// BenchmarkERS times the statistic with MAIC lag selection.
func BenchmarkERS(b *testing.B) { benchmarkGLS(b, "ers") }
