package core

// P-values for the Dickey-Fuller family (ADF τ, Phillips-Perron Z(t) and
// Z(α)) and KPSS η from rootshift's own simulated asymptotic distributions.
//
// MacKinnon's (1994, 1996) p-value functions are not available to the
// project, so the generator in internal/gen/disttables simulates, with the
// project's Monte Carlo engine (core.Simulate, fixed seed), the distribution
// of each statistic at a large T and writes quantiles at a fine grid of
// probabilities to disttables_gen.go.
//
// Dickey-Fuller τ (ADF, PP Z(t)): the p-value is the piecewise-linear
// interpolation of the CDF through the tabulated quantiles after a
// finite-sample shift δ(p) added to each quantile, chosen so that the
// shifted quantiles at 1%, 5% and 10% equal the MacKinnon (2010) response
// surface at the regression's T. δ is interpolated linearly in p between
// 1%, 5% and 10%, held at δ(1%) below 1%, and tapered linearly to zero
// between 10% and 50% (the finite-sample correction of central and upper
// quantiles is not published; above 10% p-values are approximate, which does
// not affect any decision at conventional levels). Right-tailed (explosive)
// p-values therefore use the simulated distribution without adjustment.
//
// Z(α) and KPSS η: the p-value is interpolated in the simulated asymptotic
// table without a finite-sample adjustment.
//
// Beyond the table's first and last probabilities the p-value is bounded at
// that probability and the method string says so.

import (
	"fmt"
	"math"
	"sort"
)

//go:generate go run ./internal/gen/disttables -reps 100000 -T 2000 -seed 20100227 -o disttables_gen.go

// distTable is a tabulated distribution: quantiles Q at probabilities Probs
// (increasing), with Monte Carlo standard errors SE.
type distTable struct {
	Name string
	Q    []float64
	SE   []float64
}

// asymTable returns the generated table with that name, or nil.
func asymTable(name string) *distTable {
	for i := range genTables {
		if genTables[i].Name == name {
			return &genTables[i]
		}
	}
	return nil
}

// probIndex returns the index of p in genProbs, or -1.
func probIndex(p float64) int {
	for i, q := range genProbs {
		if math.Abs(q-p) < 1e-12 {
			return i
		}
	}
	return -1
}

// cdfFrom interpolates the CDF through increasing quantiles q at genProbs.
// bounded reports a statistic outside the table.
func cdfFrom(q []float64, x float64) (p float64, bounded bool) {
	n := len(q)
	if n == 0 || math.IsNaN(x) {
		return math.NaN(), true
	}
	if x <= q[0] {
		return genProbs[0], x < q[0]
	}
	if x >= q[n-1] {
		return genProbs[n-1], x > q[n-1]
	}
	i := sort.SearchFloat64s(q, x) // q[i-1] < x <= q[i]
	lo, hi := q[i-1], q[i]
	if hi <= lo {
		return genProbs[i], false
	}
	f := (x - lo) / (hi - lo)
	return genProbs[i-1] + f*(genProbs[i]-genProbs[i-1]), false
}

// quantileFrom interpolates the quantile function through q at genProbs.
func quantileFrom(q []float64, p float64) float64 {
	n := len(q)
	if p <= genProbs[0] {
		return q[0]
	}
	if p >= genProbs[n-1] {
		return q[n-1]
	}
	i := sort.SearchFloat64s(genProbs, p)
	lo, hi := genProbs[i-1], genProbs[i]
	f := (p - lo) / (hi - lo)
	return q[i-1] + f*(q[i]-q[i-1])
}

// dfTableName is the generated table for τ with those deterministic terms.
func dfTableName(trend Trend) string {
	switch trend {
	case TrendNone:
		return "df-t/none"
	case TrendLinear:
		return "df-t/linear"
	}
	return "df-t/constant"
}

// dfShiftedQuantiles returns the τ quantiles shifted to agree with the
// MacKinnon (2010) surface at T at 1%, 5% and 10% (T ≤ 0: asymptotic β∞).
func dfShiftedQuantiles(trend Trend, T int) []float64 {
	tab := asymTable(dfTableName(trend))
	if tab == nil {
		return nil
	}
	var d [3]float64
	levels := [3]float64{0.01, 0.05, 0.10}
	for i, p := range levels {
		d[i] = MacKinnonCritical(trend, p, T) - tab.Q[probIndex(p)]
	}
	out := make([]float64, len(tab.Q))
	for i, q := range tab.Q {
		p := genProbs[i]
		var delta float64
		switch {
		case p <= 0.01:
			delta = d[0]
		case p <= 0.05:
			delta = d[0] + (p-0.01)/0.04*(d[1]-d[0])
		case p <= 0.10:
			delta = d[1] + (p-0.05)/0.05*(d[2]-d[1])
		case p < 0.5:
			delta = d[2] * (0.5 - p) / 0.4
		}
		out[i] = q + delta
		if i > 0 && out[i] < out[i-1] {
			out[i] = out[i-1]
		}
	}
	return out
}

// DFPValue returns the p-value of a Dickey-Fuller τ statistic (ADF, PP Z(t))
// with deterministic terms trend and T observations in the test regression:
// the lower-tail probability, or the upper-tail one when right is true.
// bounded reports that the statistic lies beyond the table and p is the
// table's end probability.
func DFPValue(stat float64, trend Trend, T int, right bool) (p float64, bounded bool) {
	q := dfShiftedQuantiles(trend, T)
	if q == nil {
		return math.NaN(), true
	}
	p, bounded = cdfFrom(q, stat)
	if right {
		p = 1 - p
	}
	return p, bounded
}

// DFPValueMethod describes how DFPValue obtains p-values, for PValueMethod.
func DFPValueMethod(right bool) string {
	if right {
		return fmt.Sprintf("upper tail of rootshift's simulated asymptotic Dickey-Fuller distribution (Gaussian random walk, T=%d, %d replications, seed %d), linear interpolation in a quantile table", genT, genReps, genSeed)
	}
	return fmt.Sprintf("rootshift's simulated asymptotic Dickey-Fuller distribution (Gaussian random walk, T=%d, %d replications, seed %d), quantiles shifted to agree with the MacKinnon (2010) response surface at the regression's T at 1/5/10%%, linear interpolation", genT, genReps, genSeed)
}

// TablePValue returns the p-value of stat in the generated asymptotic table
// name ("df-t/none", "df-t/constant", "df-t/linear", "df-bias/none", "df-bias/constant", "df-bias/linear", "kpss/constant",
// "kpss/linear"), lower tail or upper tail when right is true.
func TablePValue(name string, stat float64, right bool) (p float64, bounded bool) {
	tab := asymTable(name)
	if tab == nil {
		return math.NaN(), true
	}
	p, bounded = cdfFrom(tab.Q, stat)
	if right {
		p = 1 - p
	}
	return p, bounded
}

// TableQuantile returns the p-quantile of the generated asymptotic table
// name (NaN for an unknown name).
func TableQuantile(name string, p float64) float64 {
	tab := asymTable(name)
	if tab == nil {
		return math.NaN()
	}
	return quantileFrom(tab.Q, p)
}

// TableMethod describes a generated-table p-value, for PValueMethod.
func TableMethod(what string) string {
	return fmt.Sprintf("rootshift's simulated asymptotic distribution of %s (T=%d, %d replications, seed %d), linear interpolation in a quantile table", what, genT, genReps, genSeed)
}

// boundedNote is appended to a method string when the p-value is bounded.
func boundedNote(method string, bounded bool, p float64) string {
	if !bounded {
		return method
	}
	return method + fmt.Sprintf("; the statistic lies beyond the table, p-value bounded at %g", p)
}
