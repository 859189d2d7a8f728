package breaks

import (
	"context"
	"errors"
	"fmt"
	"math"
	"testing"

	"github.com/rootshift/rootshift/core"
)

// paoBruteCandidate is the brute-force twin of aoSearcher.at: step 1 by
// core.LS on the raw series with DeterministicColumns (t = 1..T, DT = t-TB),
// step 2 by core.LS on explicitly built columns, same lag rule.
func paoBruteCandidate(y []float64, spec *Spec, tb int) (Candidate, fitStatus) {
	T := len(y)
	var ls core.LS
	terms := Terms{Level: spec.Terms.Level, Slope: spec.Terms.Slope}
	X := DeterministicColumns(nil, core.TrendLinear, terms, tb, 1, T)
	f1, err := ls.Fit(X, y)
	if err != nil {
		return Candidate{}, fitSkip
	}
	// Exact-fit rule of step 1 (a levels regression with an intercept):
	// the centred sum of squares of y is the scale.
	if f1.SSR <= ExactFitTol*centredSS(y) {
		return Candidate{}, fitExact
	}
	c := Candidate{TB: tb, TLevel: math.NaN(), TSlope: math.NaN(), TDummy: math.NaN()}
	j := 2
	if terms.Level {
		c.TLevel = f1.TStat(j)
		j++
	}
	if terms.Slope {
		c.TSlope = f1.TStat(j)
	}
	r := append([]float64(nil), f1.Resid...) // ỹ_t, index t-1
	dummies := terms.Level
	design := func(k, s int, ylagFirst bool) ([][]float64, []float64) {
		n := T - s + 1
		col := func(f func(t int) float64) []float64 {
			v := make([]float64, n)
			for i := range v {
				v[i] = f(s + i)
			}
			return v
		}
		ylag := col(func(t int) float64 { return r[t-2] })
		lag := func(j int) []float64 { return col(func(t int) float64 { return r[t-j-1] - r[t-j-2] }) }
		dum := func(j int) []float64 { return col(func(t int) float64 { return indicator(t == tb+1+j) }) }
		var X [][]float64
		if ylagFirst {
			X = append(X, ylag)
			if dummies {
				X = append(X, dum(0))
			}
			for j := 1; j <= k; j++ {
				if dummies {
					X = append(X, dum(j))
				}
				X = append(X, lag(j))
			}
		} else {
			if dummies {
				for j := 0; j <= k; j++ {
					X = append(X, dum(j))
				}
			}
			for j := 1; j <= k; j++ {
				X = append(X, lag(j))
			}
			X = append(X, ylag)
		}
		return X, col(func(t int) float64 { return r[t-1] - r[t-2] })
	}
	k := spec.Lags
	if spec.LagRule != core.LagFixed {
		kk := spec.MaxLags
		n := float64(T - kk - 1)
		k = 0
		switch spec.LagRule {
		case core.LagAIC, core.LagBIC:
			pen := 2.0
			if spec.LagRule == core.LagBIC {
				pen = math.Log(n)
			}
			best := math.Inf(1)
			for kc := 0; kc <= kk; kc++ {
				X, dy := design(kc, kk+2, true)
				f, err := ls.Fit(X, dy)
				if err != nil {
					break
				}
				if f.SSR <= ExactFitTol*sumSq(dy) {
					return Candidate{}, fitExact
				}
				if ic := math.Log(f.SSR/n) + pen*float64(len(X))/n; ic < best {
					best, k = ic, kc
				}
			}
		default:
			for kc := kk; kc >= 1; kc-- {
				X, dy := design(kc, kk+2, true)
				f, err := ls.Fit(X, dy)
				if err == nil && f.SSR <= ExactFitTol*sumSq(dy) {
					return Candidate{}, fitExact
				}
				if err == nil && math.Abs(f.TStat(len(X)-1)) > TSigCritical {
					k = kc
					break
				}
			}
		}
	}
	X2, dy := design(k, k+2, false)
	f2, err := ls.Fit(X2, dy)
	if err != nil {
		return Candidate{}, fitSkip
	}
	if f2.SSR <= ExactFitTol*sumSq(dy) {
		return Candidate{}, fitExact
	}
	K := len(X2)
	c.Lags, c.NObs = k, f2.N
	c.Alpha, c.TAlpha = 1+f2.Coef[K-1], f2.TStat(K-1)
	return c, fitOK
}

// TestPAOMatchesBrute checks the AO search (suffix-sum detrending, prefix
// lag selection) against the two-step core.LS refit at every candidate
// (common practice: differential testing).
func TestPAOMatchesBrute(t *testing.T) {
	var w aoSearcher
	for ci, c := range []struct {
		shift core.Shift
		rule  core.LagRule
		lags  int
		brule BreakRule
		level float64
	}{
		{core.ShiftLevel, core.LagFixed, 2, MinTAlpha, 0},
		{core.ShiftLevel, core.LagTSig, 0, MaxAbsTLevel, 1e6},
		{core.ShiftSlope, core.LagAIC, 0, MinTAlpha, 0},
		{core.ShiftSlope, core.LagTSig, 0, MaxAbsTSlope, 0},
		{core.ShiftBoth, core.LagBIC, 0, MinTAlpha, 1e6},
		{core.ShiftBoth, core.LagTSig, 0, MinTAlpha, 0},
		{core.ShiftBoth, core.LagFixed, 1, MaxAbsTSlope, 0},
	} {
		t.Run(fmt.Sprintf("%s/%s/%s", c.shift, c.rule, c.brule), func(t *testing.T) {
			T := 90
			y := ioSimI1AR2(T, uint64(300+ci))
			for i := T / 2; i < T; i++ {
				y[i] += 4 + c.level
			}
			for i := 0; i < T/2; i++ {
				y[i] += c.level
			}
			lo, hi, _ := Candidates(T, 0.15)
			spec := Spec{Trend: core.TrendLinear, Terms: TermsOf(c.shift, c.shift != core.ShiftSlope), LagRule: c.rule,
				Lags: c.lags, MaxLags: 5, Lo: lo, Hi: hi, Rule: c.brule}
			got, path, err := w.search(y, &spec, true)
			if err != nil {
				t.Fatal(err)
			}
			lo = max(lo, spec.kmax()+2)
			if len(path) != hi-lo+1 {
				t.Fatalf("path has %d candidates, want %d", len(path), hi-lo+1)
			}
			for i, p := range path {
				want, st := paoBruteCandidate(y, &spec, p.TB)
				if st != fitOK {
					t.Fatalf("brute failed at %d", p.TB)
				}
				if p.Lags != want.Lags || !ioClose9(p.TAlpha, want.TAlpha) || !ioClose9(p.TLevel, want.TLevel) ||
					!ioClose9(p.TSlope, want.TSlope) || !ioClose9(p.Alpha, want.Alpha) {
					t.Fatalf("path[%d]: fast %+v brute %+v", i, p, want)
				}
			}
			if got.TB < lo || got.TB > hi {
				t.Fatalf("break %d outside %d..%d", got.TB, lo, hi)
			}
		})
	}
}

// TestPAORun checks the registered pao entry point end to end: a
// stationary series with a large level shift is rejected with the break
// found near the true date (common practice: behaviour on simulated data).
func TestPAORun(t *testing.T) {
	info, err := core.Lookup("pao")
	if err != nil {
		t.Fatal(err)
	}
	y := ioSimSeries(200, 0.5, 6, 100, 0, 11)
	res, err := info.Run(context.Background(), y, &core.Config{})
	if err != nil {
		t.Fatal(err)
	}
	if res.Statistic == nil || len(res.Breaks) != 1 {
		t.Fatalf("no statistic or break: %+v", res)
	}
	if d := res.Breaks[0].Index - 100; d < -3 || d > 3 {
		t.Errorf("break at %d, want 100±3", res.Breaks[0].Index)
	}
	if len(ioTables) > 0 && !res.Reject {
		t.Errorf("stationary series with a 6 sigma shift not rejected: %+v", res)
	}
	// Settings errors.
	for _, cfg := range []core.Config{{BreakRule: 2}, {BreakRule: 7}, {Shift: core.ShiftSlope, BreakRule: 1}} {
		_, err := info.Run(context.Background(), y, &cfg)
		if !errors.Is(err, core.ErrSettings) {
			t.Errorf("%+v: err %v, want ErrSettings", cfg, err)
		}
	}
}
