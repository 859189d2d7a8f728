package core

// Critical values of the Dickey-Fuller τ statistics from the response
// surfaces of MacKinnon, J.G. (2010), "Critical Values for Cointegration
// Tests", Queen's Economics Department Working Paper No. 1227, Table 2
// (unit-root case N = 1):
//
//	C(T) = β∞ + β1/T + β2/T² + β3/T³.
//
// Convention: T is the number of observations in the test regression (the
// observations actually used, after differencing and lagging), as MacKinnon's
// simulations define it. Lagged differences are therefore already removed
// from T; no further degrees-of-freedom adjustment is made.

import (
	"fmt"
	"math"

	"github.com/rootshift/rootshift/core/schema"
)

// mkRow is one response-surface row: β∞, β1, β2, β3.
type mkRow [4]float64

// mackinnon2010 holds Table 2 of MacKinnon (2010) for N = 1, keyed by case
// (nc, c, ct, ctt) and level (1%, 5%, 10%). Source: shared reference §1a
// (SEEN-S transcription of Table 2).
var mackinnon2010 = map[string]map[float64]mkRow{
	"nc": {
		0.01: {-2.56574, -2.2358, -3.627, 0},
		0.05: {-1.94100, -0.2686, -3.365, 31.223},
		0.10: {-1.61682, 0.2656, -2.714, 25.364},
	},
	"c": {
		0.01: {-3.43035, -6.5393, -16.786, -79.433},
		0.05: {-2.86154, -2.8903, -4.234, -40.040},
		0.10: {-2.56677, -1.5384, -2.809, 0},
	},
	"ct": {
		0.01: {-3.95877, -9.0531, -28.428, -134.155},
		0.05: {-3.41049, -4.3904, -9.036, -45.374},
		0.10: {-3.12705, -2.5856, -3.925, -22.380},
	},
	"ctt": {
		0.01: {-4.37113, -11.5882, -35.819, -334.047},
		0.05: {-3.83239, -5.9057, -12.490, -118.284},
		0.10: {-3.55326, -3.6596, -5.293, -63.559},
	},
}

// MacKinnonSource is the citation for critical values from MacKinnon (2010).
const MacKinnonSource = "MacKinnon (2010), Queen's Economics Department WP 1227, Table 2 response surface (N=1), T = observations in the test regression"

// mkCase maps a Trend to the MacKinnon case name.
func mkCase(trend Trend) string {
	switch trend {
	case TrendNone:
		return "nc"
	case TrendLinear:
		return "ct"
	}
	return "c"
}

// MacKinnonSurface evaluates the MacKinnon (2010) Table 2 surface for case
// ("nc", "c", "ct" or "ctt") at level 0.01, 0.05 or 0.10 and T observations
// (T ≤ 0 gives β∞, the asymptotic value). It returns an ErrSettings error
// for an unknown case or level.
func MacKinnonSurface(caseName string, level float64, T int) (float64, error) {
	rows, ok := mackinnon2010[caseName]
	if !ok {
		return math.NaN(), fmt.Errorf("%w: MacKinnon case %q", ErrSettings, caseName)
	}
	r, ok := rows[level]
	if !ok {
		return math.NaN(), fmt.Errorf("%w: MacKinnon level %v (want 0.01, 0.05 or 0.10)", ErrSettings, level)
	}
	if T <= 0 {
		return r[0], nil
	}
	x := 1 / float64(T)
	return r[0] + x*(r[1]+x*(r[2]+x*r[3])), nil
}

// MacKinnonCritical returns the left-tail critical value of the
// Dickey-Fuller τ statistic for the deterministic terms trend at level
// (0.01, 0.05 or 0.10) with T observations in the test regression
// (MacKinnon 2010, Table 2, N = 1). T ≤ 0 gives the asymptotic value. An
// unsupported level gives NaN.
func MacKinnonCritical(trend Trend, level float64, T int) float64 {
	v, err := MacKinnonSurface(mkCase(trend), level, T)
	if err != nil {
		return math.NaN()
	}
	return v
}

// MacKinnonCriticalValues returns the 1%, 5% and 10% critical values keyed
// as in the schema ("0.01", "0.05", "0.10").
func MacKinnonCriticalValues(trend Trend, T int) map[string]float64 {
	out := make(map[string]float64, 3)
	for _, p := range []float64{0.01, 0.05, 0.10} {
		out[schema.LevelKey(p)] = MacKinnonCritical(trend, p, T)
	}
	return out
}
