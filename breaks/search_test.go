package breaks

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/rootshift/rootshift/core"
)

// ioBruteCandidate is the brute-force twin of Searcher.at: every regression is
// built column by column on the raw series (DeterministicColumns with the
// trend t = 1..T and DT_t = t - TB) and fitted with core.LS, with the same lag
// rule (orders compared on the common sample t = kmax+2..T, the chosen order
// re-estimated on t = k+2..T).
func ioBruteCandidate(y []float64, spec *Spec, tb int) (Candidate, fitStatus) {
	T := len(y)
	kk := spec.kmax()
	var ls core.LS
	// design returns the columns [det, breaks, y_{t-1}, lags 1..k] (ylagFirst)
	// or [det, breaks, lags 1..k, y_{t-1}] and Δy over t = s..T.
	design := func(k, s int, ylagFirst bool) ([][]float64, []float64) {
		X := DeterministicColumns(nil, spec.Trend, spec.Terms, tb, s, T)
		n := T - s + 1
		ylag := make([]float64, n)
		dy := make([]float64, n)
		for i := range n {
			t := s + i // 1-based
			ylag[i] = y[t-2]
			dy[i] = y[t-1] - y[t-2]
		}
		lags := make([][]float64, k)
		for j := 1; j <= k; j++ {
			c := make([]float64, n)
			for i := range n {
				t := s + i
				c[i] = y[t-j-1] - y[t-j-2]
			}
			lags[j-1] = c
		}
		if ylagFirst {
			X = append(X, ylag)
			X = append(X, lags...)
		} else {
			X = append(X, lags...)
			X = append(X, ylag)
		}
		return X, dy
	}
	k := spec.Lags
	if spec.LagRule != core.LagFixed {
		s0 := kk + 2
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
				X, dy := design(kc, s0, true)
				f, err := ls.Fit(X, dy)
				if err != nil {
					break
				}
				if f.SSR <= ExactFitTol*sumSq(dy) {
					return Candidate{}, fitExact
				}
				ic := math.Log(f.SSR/n) + pen*float64(len(X))/n
				if ic < best {
					best, k = ic, kc
				}
			}
		default:
			for kc := kk; kc >= 1; kc-- {
				X, dy := design(kc, s0, true)
				f, err := ls.Fit(X, dy)
				if err != nil {
					continue
				}
				if f.SSR <= ExactFitTol*sumSq(dy) {
					return Candidate{}, fitExact
				}
				if math.Abs(f.TStat(len(X)-1)) > TSigCritical {
					k = kc
					break
				}
			}
		}
	}
	X, dy := design(k, k+2, false)
	f, err := ls.Fit(X, dy)
	if err != nil {
		return Candidate{}, fitSkip
	}
	if f.SSR <= ExactFitTol*sumSq(dy) {
		return Candidate{}, fitExact
	}
	K := len(X)
	c := Candidate{TB: tb, Lags: k, NObs: f.N, Alpha: 1 + f.Coef[K-1], TAlpha: f.TStat(K - 1),
		TLevel: math.NaN(), TSlope: math.NaN(), TDummy: math.NaN()}
	j := spec.Trend.NumDet()
	if spec.Trend == core.TrendNone {
		j = 1
	}
	if spec.Terms.Level {
		c.TLevel = f.TStat(j)
		j++
	}
	if spec.Terms.Slope {
		c.TSlope = f.TStat(j)
		j++
	}
	if spec.Terms.Dummy {
		c.TDummy = f.TStat(j)
	}
	return c, fitOK
}

// sumSq is Σ v², the scale of the exact-fit rule (ExactFitTol).
func sumSq(v []float64) float64 {
	s := 0.0
	for _, x := range v {
		s += x * x
	}
	return s
}

// centredSS is Σ (v - mean)², the exact-fit scale of a levels regression
// with an intercept.
func centredSS(v []float64) float64 {
	m := 0.0
	for _, x := range v {
		m += x
	}
	m /= float64(len(v))
	s := 0.0
	for _, x := range v {
		s += (x - m) * (x - m)
	}
	return s
}

// ioBruteSearch is the brute-force twin of Searcher.Search.
func ioBruteSearch(y []float64, spec *Spec) (Candidate, []Candidate, error) {
	T := len(y)
	lo, hi := max(spec.Lo, spec.kmax()+2, MinHead), min(spec.Hi, T-MinTail)
	best := Candidate{TB: -1}
	bestScore := math.Inf(1)
	var path []Candidate
	var exact exactSet
	for tb := lo; tb <= hi; tb++ {
		c, st := ioBruteCandidate(y, spec, tb)
		if st == fitExact {
			exact.add([]int{tb})
			continue
		}
		if st != fitOK {
			continue
		}
		path = append(path, c)
		score := c.TAlpha
		switch spec.Rule {
		case MaxAbsTLevel:
			score = -math.Abs(c.TLevel)
		case MaxAbsTSlope:
			score = -math.Abs(c.TSlope)
		}
		if score < bestScore {
			bestScore, best = score, c
		}
	}
	if err := exact.err(); err != nil {
		return Candidate{TB: -1}, nil, err
	}
	if best.TB < 0 {
		return best, nil, core.ErrSingular
	}
	return best, path, nil
}

// ioSimSeries draws a seeded series: a random walk (phi = 1) or a stationary
// AR(1) with coefficient phi, plus a level shift of size shift (in units of
// the innovation s.d.) after observation tb, plus level.
func ioSimSeries(T int, phi, shift float64, tb int, level float64, seed uint64) []float64 {
	r := rand.New(rand.NewPCG(seed, 7))
	y := make([]float64, T)
	u := 0.0
	for t := range T {
		u = phi*u + r.NormFloat64()
		y[t] = level + u
		if t+1 > tb {
			y[t] += shift
		}
	}
	return y
}

// ioSimI1AR2 draws an I(1) series whose differences are the AR(2)
// u_t = 0.6 u_{t-1} - 0.35 u_{t-2} + e_t, so that lag rules pick k > 0.
func ioSimI1AR2(T int, seed uint64) []float64 {
	r := rand.New(rand.NewPCG(seed, 9))
	y := make([]float64, T)
	u1, u2, s := 0.0, 0.0, 0.0
	for t := range T {
		u := 0.6*u1 - 0.35*u2 + r.NormFloat64()
		u2, u1 = u1, u
		s += u
		y[t] = s
	}
	return y
}

func ioClose9(a, b float64) bool {
	if math.IsNaN(a) && math.IsNaN(b) {
		return true
	}
	return math.Abs(a-b) <= 1e-9*math.Max(1, math.Abs(b))
}

// TestSearchMatchesBrute checks the fast search against the full core.LS
// refit at every candidate (common practice: differential testing), for
// every model, lag rule and break rule, on random walks and on a stationary
// series with a shift, including a series at level 1e6.
func TestSearchMatchesBrute(t *testing.T) {
	type tc struct {
		name  string
		T     int
		phi   float64
		shift float64
		level float64
		rule  core.LagRule
		lags  int
		brule BreakRule
	}
	var cases []tc
	for _, rule := range []core.LagRule{core.LagFixed, core.LagTSig, core.LagAIC, core.LagBIC} {
		cases = append(cases,
			tc{"rw", 80, 1, 0, 0, rule, 2, MinTAlpha},
			tc{"ar-shift", 120, 0.5, 5, 0, rule, 1, MinTAlpha},
			tc{"level1e6", 100, 1, 3, 1e6, rule, 3, MinTAlpha},
			tc{"i1-ar2", 150, 2, 0, 0, rule, 2, MinTAlpha},
		)
	}
	cases = append(cases,
		tc{"rule-level", 100, 0.7, 4, 0, core.LagTSig, 0, MaxAbsTLevel},
		tc{"rule-slope", 100, 0.7, 4, 0, core.LagFixed, 2, MaxAbsTSlope},
	)
	models := []struct {
		name  string
		terms Terms
	}{
		{"A", Terms{Level: true}},
		{"B", Terms{Slope: true}},
		{"C", Terms{Level: true, Slope: true}},
		{"A+D", Terms{Level: true, Dummy: true}},
		{"C+D", Terms{Level: true, Slope: true, Dummy: true}},
		{"B-p89", Terms{Level: true, Slope: true}},
	}
	var w Searcher
	lagsSeen := map[int]bool{}
	defer func() {
		// The cases must exercise lag selection, not only k = 0.
		if len(lagsSeen) < 3 {
			t.Errorf("only lag orders %v were chosen", lagsSeen)
		}
	}()
	for ci, c := range cases {
		for _, m := range models {
			if c.brule == MaxAbsTLevel && !m.terms.Level || c.brule == MaxAbsTSlope && !m.terms.Slope {
				continue
			}
			name := fmt.Sprintf("%s/%s/%s/%s", c.name, c.rule, m.name, c.brule)
			t.Run(name, func(t *testing.T) {
				y := ioSimSeries(c.T, c.phi, c.shift, c.T/2, c.level, uint64(100+ci))
				if c.phi == 2 { // marker: I(1) with AR(2) differences
					y = ioSimI1AR2(c.T, uint64(100+ci))
				}
				lo, hi, err := Candidates(c.T, 0.15)
				if err != nil {
					t.Fatal(err)
				}
				spec := Spec{Trend: core.TrendLinear, Terms: m.terms, LagRule: c.rule, Lags: c.lags, MaxLags: 6,
					Lo: lo, Hi: hi, Rule: c.brule}
				got, gpath, err := w.Search(y, &spec, true)
				if err != nil {
					t.Fatal(err)
				}
				want, wpath, err := ioBruteSearch(y, &spec)
				if err != nil {
					t.Fatal(err)
				}
				if got.TB != want.TB || got.Lags != want.Lags || got.NObs != want.NObs {
					t.Fatalf("fast TB=%d k=%d n=%d, brute TB=%d k=%d n=%d", got.TB, got.Lags, got.NObs, want.TB, want.Lags, want.NObs)
				}
				for _, p := range [][2]float64{{got.TAlpha, want.TAlpha}, {got.Alpha, want.Alpha}, {got.TLevel, want.TLevel},
					{got.TSlope, want.TSlope}, {got.TDummy, want.TDummy}} {
					if !ioClose9(p[0], p[1]) {
						t.Errorf("fast %v brute %v (diff %.3g)", got, want, p[0]-p[1])
					}
				}
				lagsSeen[got.Lags] = true
				if c.brule == MinTAlpha { // the statistic-only path gives the same answer
					fast := spec
					fast.OnlyTAlpha = true
					f, _, err := w.Search(y, &fast, false)
					if err != nil || f.TB != want.TB || f.Lags != want.Lags || !ioClose9(f.TAlpha, want.TAlpha) {
						t.Errorf("OnlyTAlpha: %+v, %v; brute %+v", f, err, want)
					}
				}
				if len(gpath) != len(wpath) {
					t.Fatalf("path length %d, brute %d", len(gpath), len(wpath))
				}
				for i := range gpath {
					if gpath[i].TB != wpath[i].TB || gpath[i].Lags != wpath[i].Lags || !ioClose9(gpath[i].TAlpha, wpath[i].TAlpha) {
						t.Fatalf("path[%d]: fast %+v brute %+v", i, gpath[i], wpath[i])
					}
				}
			})
		}
	}
}

// TestExactFitSeries runs every break test on noiseless series (common
// practice, no source): a 0/1 alternating series (T = 120 and T = 60), a step (0.25 for 60
// observations, then 1.00 for 60), a linear trend and a constant. Each test
// must return an error or a finite statistic with |stat| <= 1e6; an exact
// fit must be reported as such (ExactFitError), never skipped so that the
// break date moves.
func TestExactFitSeries(t *testing.T) {
	const n = 120
	alt, step, trend, cons := make([]float64, n), make([]float64, n), make([]float64, n), make([]float64, n)
	for i := range n {
		alt[i] = float64(i % 2)
		step[i] = 0.25
		if i >= 60 {
			step[i] = 1
		}
		trend[i] = 2 + 0.5*float64(i+1)
		cons[i] = 3
	}
	ids := []string{"p89", "za", "pio", "pao", "ls1", "ls2", "lp", "meanshift/additive-1", "meanshift/innovational-1", "meanshift/additive-2", "meanshift/innovational-2", "sadf", "gsadf"}
	for _, s := range []struct {
		name string
		y    []float64
	}{{"alternating", alt}, {"alternating60", alt[:60]}, {"step", step}, {"trend", trend}, {"constant", cons}} {
		for _, id := range ids {
			t.Run(s.name+"/"+id, func(t *testing.T) {
				tid, cfg := msCase(id, &core.Config{BreakIndex: 60})
				info, err := core.Lookup(tid)
				if err != nil {
					t.Fatal(err)
				}
				r, err := info.Run(context.Background(), s.y, cfg)
				if err != nil {
					var ce *core.Error
					if !errors.As(err, &ce) || ce.Test != tid {
						t.Errorf("error %v is not a *core.Error of %s", err, id)
					}
					if s.name == "constant" && !errors.Is(err, core.ErrConstant) {
						t.Errorf("constant series: %v", err)
					}
					return
				}
				if r.Statistic == nil || math.IsNaN(*r.Statistic) || math.Abs(*r.Statistic) > 1e6 {
					t.Fatalf("statistic %v reported as valid", r.Statistic)
				}
				if s.name == "step" {
					// A statistic on the noiseless step may only come from a
					// search that met no exact fit: at TB = 60 the IO and
					// LM regressions fit exactly, so they must fail.
					switch id {
					case "za", "pio", "ls1", "meanshift/innovational-1":
						t.Errorf("step: %s reported %v at %v instead of the exact-fit error", id, *r.Statistic, r.Breaks)
					}
				}
			})
		}
	}
}

// TestExactFitStepDate checks that the exact fit of a noiseless step at
// TB = 60 is reported as an error naming an exact-fit break date and
// wrapping core.ErrNoEstimate, for the fast search and its brute-force twin
// alike (common practice, no source).
func TestExactFitStepDate(t *testing.T) {
	y := make([]float64, 120)
	for i := range y {
		y[i] = 0.25
		if i >= 60 {
			y[i] = 1
		}
	}
	spec := Spec{Trend: core.TrendLinear, Terms: Terms{Level: true}, LagRule: core.LagFixed, Lags: 0, Lo: 18, Hi: 102}
	var w Searcher
	_, _, err := w.Search(y, &spec, false)
	if !IsExactFit(err) || !errors.Is(err, core.ErrNoEstimate) || !strings.Contains(err.Error(), "TB=60") {
		t.Errorf("fast search: %v", err)
	}
	_, _, err = ioBruteSearch(y, &spec)
	if !IsExactFit(err) || !strings.Contains(err.Error(), "TB=60") {
		t.Errorf("brute search: %v", err)
	}
	info, _ := core.Lookup("za")
	if _, err := info.Run(context.Background(), y, &core.Config{}); !IsExactFit(err) || !strings.Contains(err.Error(), "TB=60") {
		t.Errorf("za: %v", err)
	}
	info, _ = core.Lookup("ls1")
	if _, err := info.Run(context.Background(), y, &core.Config{}); !IsExactFit(err) || !strings.Contains(err.Error(), "TB=60") {
		t.Errorf("ls1: %v", err)
	}
}

// TestExactFitTwins checks that the fast searches (IO and AO) and their
// brute-force twins classify noiseless series alike: both fail with an
// exact-fit error naming the same candidates, or both succeed (common
// practice, no source).
func TestExactFitTwins(t *testing.T) {
	const n = 100
	alt, step, ar, near := make([]float64, n), make([]float64, n), make([]float64, n), make([]float64, n)
	prev := 1.0
	for i := range n {
		alt[i] = float64(i % 2)
		step[i] = 0.25
		if i >= 50 {
			step[i] = 1
		}
		// A noiseless AR(1) with a level shift: exactly model A at TB = 50.
		prev = 0.5*prev + indicator(i+1 > 50)
		ar[i] = prev
		// The step with a small deterministic wiggle: not an exact fit.
		near[i] = step[i] + 1e-3*math.Sin(1.7*float64(i))
	}
	var w Searcher
	var ao aoSearcher
	exactIO, exactAO, okIO := 0, 0, 0
	defer func() {
		// The cases must exercise both outcomes.
		if exactIO == 0 || exactAO == 0 || okIO == 0 {
			t.Errorf("exact fits: IO %d, AO %d; IO statistics %d", exactIO, exactAO, okIO)
		}
	}()
	for _, s := range []struct {
		name string
		y    []float64
	}{{"alternating", alt}, {"step", step}, {"ar-shift", ar}, {"near-step", near}} {
		for _, rule := range []core.LagRule{core.LagFixed, core.LagTSig, core.LagAIC} {
			for _, terms := range []Terms{{Level: true}, {Level: true, Dummy: true}, {Level: true, Slope: true}} {
				spec := Spec{Trend: core.TrendLinear, Terms: terms, LagRule: rule, Lags: 1, MaxLags: 3, Lo: 15, Hi: 85}
				name := fmt.Sprintf("%s/%s/%+v", s.name, rule, terms)
				got, _, gerr := w.Search(s.y, &spec, false)
				want, _, werr := ioBruteSearch(s.y, &spec)
				if IsExactFit(gerr) != IsExactFit(werr) || (gerr == nil) != (werr == nil) {
					t.Errorf("%s: fast %v, brute %v", name, gerr, werr)
				} else if IsExactFit(gerr) && gerr.Error() != werr.Error() {
					t.Errorf("%s: fast %q, brute %q", name, gerr, werr)
				} else if gerr == nil && got.TB != want.TB {
					t.Errorf("%s: fast TB=%d, brute TB=%d", name, got.TB, want.TB)
				}
				if IsExactFit(gerr) {
					exactIO++
				} else if gerr == nil {
					okIO++
				}
				if s.name == "ar-shift" && rule == core.LagFixed && terms.Dummy && !IsExactFit(gerr) {
					t.Errorf("%s: the noiseless AR(1) fits model A exactly, got %v", name, gerr)
				}
				aoSpec := spec
				aoSpec.Terms.Dummy = false
				aoSpec.Terms = TermsOf(map[bool]core.Shift{true: core.ShiftBoth, false: core.ShiftLevel}[terms.Slope], true)
				_, path, aerr := ao.search(s.y, &aoSpec, true)
				if IsExactFit(aerr) {
					exactAO++
					continue
				}
				for _, c := range path {
					if _, st := paoBruteCandidate(s.y, &aoSpec, c.TB); st == fitExact {
						t.Errorf("%s: AO candidate %d fits exactly by brute force but the fast search accepted it", name, c.TB)
					}
				}
			}
		}
	}
}
