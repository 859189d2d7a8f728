// The written-out final regression of the one-break search (finalResid1,
// finalResid2, final1, final2: the Frisch-Waugh-Lovell residualisation of
// the break columns and core.Normal's Jacobi-scaled Cholesky solve for two
// and three unknowns) performs the same floating-point operations in the
// same order as the general path (finalResid, smallSystem, core.Normal):
// every candidate statistic is equal bit for bit, so the output of the
// tests does not change. The general path itself is checked against the
// full core.LS refit in TestSearchMatchesBrute (Zivot & Andrews 1992,
// eqs. (1)-(3); Perron 1997, eqs. (1)-(2)).
package breaks

import (
	"fmt"
	"math"
	"testing"

	"github.com/rootshift/rootshift/core"
)

// finalGeneral is the general twin of Searcher.final for the last
// regression at tb with k lags and nb break columns (breakVectors already
// run): finalResid, smallSystem and core.Normal.InvDiag.
func finalGeneral(w *Searcher, tb, k, nb int) (Candidate, fitStatus) {
	f := &w.fin[k]
	K := len(f.codes)
	if f.rank < K {
		return Candidate{}, fitSkip
	}
	w.finalResid(f, nb)
	n := w.T - k - 1
	Ktot := K + nb + 1
	tA, ssr, st := w.smallSystem(nb, w.xb[:nb], f.xxRes, f.xyRes, f.yyRes, f.yy, n, Ktot)
	if st != fitOK {
		return Candidate{}, st
	}
	m := &w.nrm
	c := Candidate{TB: tb, Lags: k, NObs: n, Alpha: 1 + m.Coef[nb], TAlpha: tA,
		TLevel: math.NaN(), TSlope: math.NaN(), TDummy: math.NaN()}
	s2 := ssr / float64(n-Ktot)
	for i := 0; i < nb; i++ {
		w.setBreakT(&c, i, m.Coef[i]/math.Sqrt(s2*m.InvDiag(i)))
	}
	return c, fitOK
}

// same reports a and b equal bit for bit (NaN equal to NaN).
func same(a, b float64) bool { return math.Float64bits(a) == math.Float64bits(b) }

func TestFinalFastEqualsGeneral(t *testing.T) {
	models := []Terms{{Level: true}, {Slope: true}, {Level: true, Slope: true}, {Level: true, Dummy: true}}
	checked := 0
	for si, series := range []struct {
		T                 int
		phi, shift, level float64
		lagRule           core.LagRule
		lags              int
	}{
		{100, 1, 0, 0, core.LagFixed, 0},
		{300, 1, 0, 0, core.LagFixed, 4},
		{200, 0.5, 5, 1e6, core.LagTSig, 0},
		{150, 0.9, 3, 0, core.LagAIC, 0},
		{1000, 1, 0, 0, core.LagFixed, 4},
	} {
		y := ioSimSeries(series.T, series.phi, series.shift, series.T/3, series.level, uint64(700+si))
		lo, hi, _ := Candidates(series.T, 0.15)
		for _, terms := range models {
			name := fmt.Sprintf("T=%d/%s/%+v", series.T, series.lagRule, terms)
			spec := Spec{Trend: core.TrendLinear, Terms: terms, LagRule: series.lagRule, Lags: series.lags, MaxLags: 5, Lo: lo, Hi: hi}
			var w Searcher
			if _, _, err := w.Search(y, &spec, false); err != nil {
				t.Fatalf("%s: %v", name, err)
			}
			for tb := max(lo, spec.kmax()+2); tb <= hi; tb++ {
				nb := w.breakVectors(&spec, tb)
				k := spec.Lags
				if spec.LagRule != core.LagFixed {
					var st fitStatus
					if k, st = w.selectLag(&spec, nb); st != fitOK {
						continue
					}
				}
				var fast Candidate
				st1 := w.final(&spec, tb, k, nb, &fast)
				gen, st2 := finalGeneral(&w, tb, k, nb)
				if st1 != st2 || fast.TB != gen.TB || fast.Lags != gen.Lags || fast.NObs != gen.NObs ||
					!same(fast.TAlpha, gen.TAlpha) || !same(fast.Alpha, gen.Alpha) || !same(fast.TLevel, gen.TLevel) ||
					!same(fast.TSlope, gen.TSlope) || !same(fast.TDummy, gen.TDummy) {
					t.Fatalf("%s TB=%d: written-out %+v (%d), general %+v (%d)", name, tb, fast, st1, gen, st2)
				}
				checked++
			}
		}
	}
	if checked < 2000 {
		t.Errorf("only %d candidates compared", checked)
	}
}

// gramSweep is the twin of Searcher.grams: one backward sweep over the rows
// of the base columns, accumulating every lower-triangle entry and copying
// the accumulator when the sample of order k = t-2 is complete.
func gramSweep(w *Searcher) [][]float64 {
	T, np, kk := w.T, w.p+1, w.kk
	acc := make([]float64, np*np)
	out := make([][]float64, kk+1)
	for t := T; t >= 2; t-- {
		row := w.x[t*np : (t+1)*np]
		for i, xi := range row {
			for j := 0; j <= i; j++ {
				acc[i*np+j] += xi * row[j]
			}
		}
		if k := t - 2; k <= kk {
			out[k] = append([]float64(nil), acc...)
		}
	}
	return out
}

func TestGramsEqualSweep(t *testing.T) {
	for _, c := range []struct{ T, kk int }{{20, 0}, {20, 3}, {60, 8}, {300, 4}, {1000, 8}} {
		for seed := uint64(1); seed <= 3; seed++ {
			y := ioSimSeries(c.T, 1, 2, c.T/2, float64(seed-1)*1e6, seed)
			var w Searcher
			w.prepare(y, c.kk)
			want := gramSweep(&w)
			np := w.p + 1
			for k := 0; k <= c.kk; k++ {
				for i := 0; i < np; i++ {
					for j := 0; j <= i; j++ {
						if g, s := w.gram[k][i*np+j], want[k][i*np+j]; !same(g, s) {
							t.Fatalf("T=%d kk=%d seed %d: gram[%d][%d,%d] = %v, sweep %v", c.T, c.kk, seed, k, i, j, g, s)
						}
					}
				}
			}
		}
	}
}

func TestSelectLag1EqualsGeneral(t *testing.T) {
	checked := 0
	for si, rule := range []core.LagRule{core.LagTSig, core.LagAIC, core.LagBIC} {
		for _, terms := range []Terms{{Level: true}, {Slope: true}} {
			for _, c := range []struct {
				T      int
				phi    float64
				shift  float64
				level  float64
				maxLag int
			}{{60, 1, 0, 0, 8}, {250, 0.6, 4, 1e6, 8}, {1000, 1, 0, 0, 12}} {
				y := ioSimSeries(c.T, c.phi, c.shift, c.T/2, c.level, uint64(900+si))
				lo, hi, _ := Candidates(c.T, 0.15)
				spec := Spec{Trend: core.TrendLinear, Terms: terms, LagRule: rule, MaxLags: c.maxLag, Lo: lo, Hi: hi}
				var w Searcher
				if _, _, err := w.Search(y, &spec, false); err != nil {
					t.Fatal(err)
				}
				for tb := max(lo, spec.kmax()+2); tb <= hi; tb++ {
					w.breakVectors(&spec, tb)
					k1, st1 := w.selectLag1(&spec)
					k2, st2 := w.selectLag(&spec, 1)
					if k1 != k2 || st1 != st2 {
						t.Fatalf("%s %+v T=%d TB=%d: written-out k=%d (%d), general k=%d (%d)", rule, terms, c.T, tb, k1, st1, k2, st2)
					}
					checked++
				}
			}
		}
	}
	if checked < 3000 {
		t.Errorf("only %d candidates compared", checked)
	}
}
