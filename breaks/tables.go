//go:generate go run gen_tables.go

package breaks

import (
	"fmt"
	"math"

	"github.com/rootshift/rootshift/core"
)

// Published critical-value tables for p89 and za. Every number below is
// copied from the cited table; the marks follow the project's reference file
// (SEEN-S: checked against a typed secondary copy of the published table;
// MEMORY: recalled, kept only where our own simulation reproduces it — see
// tables_test.go).

// perronLambdas are the break fractions λ = TB/T of Perron (1989), Tables
// IV.B, V.B and VI.B.
var perronLambdas = []float64{0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9}

// perronLevels are the lower-tail levels tabulated by Perron (1989).
var perronLevels = []float64{0.01, 0.025, 0.05, 0.10}

// perron89 holds the asymptotic percentiles of t_α in Perron (1989), indexed
// [model][level][λ], model 0 = A (crash, Table IV.B), 1 = B (changing
// growth, Table V.B), 2 = C (both, Table VI.B); levels 1%, 2.5%, 5%, 10%.
// Status: SEEN-S (shared reference §3).
var perron89 = [3][4][9]float64{
	{ // Model A
		{-4.30, -4.39, -4.39, -4.34, -4.32, -4.45, -4.42, -4.33, -4.27}, // 1%
		{-3.93, -4.08, -4.03, -4.01, -4.01, -4.09, -4.07, -3.99, -3.97}, // 2.5%
		{-3.68, -3.77, -3.76, -3.72, -3.76, -3.76, -3.80, -3.75, -3.69}, // 5%
		{-3.40, -3.47, -3.46, -3.44, -3.46, -3.47, -3.51, -3.46, -3.38}, // 10%
	},
	{ // Model B
		{-4.27, -4.41, -4.51, -4.55, -4.56, -4.57, -4.51, -4.38, -4.26},
		{-3.94, -4.08, -4.17, -4.20, -4.26, -4.20, -4.13, -4.07, -3.96},
		{-3.65, -3.80, -3.87, -3.94, -3.96, -3.95, -3.85, -3.82, -3.68},
		{-3.36, -3.49, -3.58, -3.66, -3.68, -3.66, -3.57, -3.50, -3.35},
	},
	{ // Model C
		{-4.38, -4.65, -4.78, -4.81, -4.90, -4.88, -4.75, -4.70, -4.41},
		{-4.01, -4.32, -4.46, -4.48, -4.53, -4.49, -4.44, -4.31, -4.10},
		{-3.75, -3.99, -4.17, -4.22, -4.24, -4.24, -4.18, -4.04, -3.80},
		{-3.45, -3.66, -3.87, -3.95, -3.96, -3.95, -3.86, -3.69, -3.46},
	},
}

// modelIndex maps a shift to the model row of the tables: 0 = A (level),
// 1 = B (slope), 2 = C (level and slope).
func modelIndex(s core.Shift) int {
	switch s {
	case core.ShiftSlope:
		return 1
	case core.ShiftBoth:
		return 2
	}
	return 0
}

// modelName is "A", "B" or "C".
func modelName(s core.Shift) string { return [3]string{"A", "B", "C"}[modelIndex(s)] }

// Perron89Critical returns Perron's (1989) asymptotic critical values of t_α
// for model A (shift level), B (slope) or C (both) at break fraction λ,
// interpolated linearly in λ between the tabulated 0.1, ..., 0.9 (the end
// rows are used outside that range), keyed by level.
func Perron89Critical(shift core.Shift, lambda float64) map[string]float64 {
	t := &perron89[modelIndex(shift)]
	v := make([]float64, 4)
	for i := range v {
		v[i] = InterpLambda(perronLambdas, t[i][:], lambda)
	}
	return CriticalMap(perronLevels, v)
}

// perron89Source cites the table used by Perron89Critical.
const perron89Source = "Perron (1989), Econometrica 57, Tables IV.B (model A), V.B (model B), VI.B (model C): " +
	"asymptotic percentiles of t_alpha, interpolated linearly in lambda = TB/T"

// zaCritical holds the asymptotic critical values of inf_λ t_α of Zivot &
// Andrews (1992), indexed [model] and by level 1%, 2.5%, 5%, 10%.
// 1%, 5%, 10%: Zivot & Andrews (1992), asymptotic tables for models A, B, C
// (SEEN-S, shared reference §2). 2.5%: MEMORY (m), kept because our
// simulation at T=1000 reproduces it (tables_test.go, TestZAAsymptoticCritical).
var zaCritical = [3][4]float64{
	{-5.34, -5.02, -4.80, -4.58}, // A
	{-4.93, -4.67, -4.42, -4.11}, // B
	{-5.57, -5.30, -5.08, -4.82}, // C
}

// ZACritical returns the Zivot & Andrews (1992) asymptotic critical values
// for model A (level), B (slope) or C (both), keyed by level.
func ZACritical(shift core.Shift) map[string]float64 {
	return CriticalMap(perronLevels, zaCritical[modelIndex(shift)][:])
}

const zaSource = "Zivot & Andrews (1992), JBES 10, asymptotic critical values of inf t_alpha " +
	"(1%, 5%, 10%; the 2.5% value is a recalled figure that our own simulation at T=1000 reproduces)"

// ioTable is a null distribution simulated with this package's own
// statistic functions (gen_tables.go), summarised by its quantiles at P.
type ioTable struct {
	Test  string    // test id
	Model string    // "A", "B", "C"
	Rule  BreakRule // break-date rule
	T     int       // series length of the simulation
	Reps  int
	Seed  uint64
	P     []float64 // probabilities, increasing
	Q     []float64 // quantiles at P
}

// findIOTable returns the simulated table for test, model and rule, or nil.
func findIOTable(test string, shift core.Shift, rule BreakRule) *ioTable {
	m := modelName(shift)
	for i := range ioTables {
		t := &ioTables[i]
		if t.Test == test && t.Model == m && t.Rule == rule {
			return t
		}
	}
	return nil
}

// pValue returns the left-tail p-value of stat by linear interpolation of
// the quantile function; outside the tabulated range it returns the end
// probability (0.001 or 0.999) and clamped = true.
func (t *ioTable) pValue(stat float64) (p float64, clamped bool) {
	q := t.Q
	n := len(q)
	if stat <= q[0] {
		return t.P[0], true
	}
	if stat >= q[n-1] {
		return t.P[n-1], true
	}
	for i := 1; i < n; i++ {
		if stat <= q[i] {
			if q[i] == q[i-1] {
				return t.P[i], false
			}
			w := (stat - q[i-1]) / (q[i] - q[i-1])
			return t.P[i-1] + w*(t.P[i]-t.P[i-1]), false
		}
	}
	return t.P[n-1], true
}

// critical returns the left-tail critical values at 1%, 2.5%, 5%, 10%.
func (t *ioTable) critical() map[string]float64 {
	v := make([]float64, len(LevelsLeft))
	for i, p := range LevelsLeft {
		v[i] = math.NaN()
		for j, q := range t.P {
			if q == p {
				v[i] = t.Q[j]
			}
		}
	}
	return CriticalMap(LevelsLeft, v)
}

// source describes how the table was made, for PValueMethod and CriticalSource.
func (t *ioTable) source() string {
	return fmt.Sprintf("our own simulation of the null distribution (Gaussian random walk, T=%d, lags fixed at 0, "+
		"%d replications, seed %d; gen_tables.go)", t.T, t.Reps, t.Seed)
}
