// Tests of the long-lag branch (malags.go): the least-squares break date
// of a broken trend from updated cross-products against its brute-force
// twin (a core.LS fit per candidate), at ordinary and 1e6 scale, without
// allocation; the first-order autocorrelation of the differences against
// the MA(1) value ρ_1 = θ/(1+θ²) (Box & Jenkins 1976, section 3.3); and the
// branch choice on the processes it is meant to separate.
package decide

import (
	"math"
	"math/rand/v2"
	"strconv"
	"testing"

	"github.com/rootshift/rootshift/core"
)

// bruteTrendBreakDate is the twin of trendBreak.date: a QR fit per candidate.
func bruteTrendBreakDate(y []float64) (int, float64) {
	T := len(y)
	lo, hi := breakRange(T)
	var ls core.LS
	cols := make([][]float64, 4)
	for j := range cols {
		cols[j] = make([]float64, T)
	}
	best, bestSSR := 0, math.Inf(1)
	for tb := lo; tb <= hi; tb++ {
		for i := range T {
			t := float64(i + 1)
			cols[0][i], cols[1][i], cols[2][i], cols[3][i] = 1, t, 0, 0
			if i+1 > tb {
				cols[2][i], cols[3][i] = 1, t-float64(tb)
			}
		}
		f, err := ls.Fit(cols, y)
		if err == nil && f.SSR < bestSSR*(1-1e-12) {
			best, bestSSR = tb, f.SSR
		}
	}
	return best, bestSSR
}

func TestTrendBreakDateMatchesBrute(t *testing.T) {
	cases := []struct {
		name  string
		T     int
		shift float64 // level added at 0.6T
		scale float64
		walk  bool
	}{
		{"stationary with a shift", 120, 5, 1, false},
		{"random walk", 200, 0, 1, true},
		{"shift at 1e6", 150, 4, 1e6, false},
		{"random walk at 1e6 offset", 90, 0, 1, true},
	}
	var tb trendBreak
	for i, c := range cases {
		r := rand.New(rand.NewPCG(31, uint64(i)))
		y := make([]float64, c.T)
		u := 0.0
		for j := range y {
			e := r.NormFloat64()
			if c.walk {
				u += e
			} else {
				u = 0.5*u + e
			}
			y[j] = u + 0.02*float64(j)
			if j >= c.T*6/10 {
				y[j] += c.shift
			}
			y[j] = c.scale*y[j] + 1e6*c.scale
		}
		got := tb.date(y)
		want, ssr := bruteTrendBreakDate(y)
		if got != want {
			// A tie within rounding is acceptable: compare the SSRs.
			_, gs := bruteTrendBreakDateAt(y, got)
			if math.Abs(gs-ssr) > 1e-9*ssr {
				t.Errorf("%s: date %d, brute force %d (SSR %g vs %g)", c.name, got, want, gs, ssr)
			}
		}
		if c.shift > 3 && math.Abs(float64(got-c.T*6/10)) > 3 {
			t.Errorf("%s: date %d, shift after %d", c.name, got, c.T*6/10)
		}
	}
}

func bruteTrendBreakDateAt(y []float64, tb int) (int, float64) {
	T := len(y)
	cols := make([][]float64, 4)
	for j := range cols {
		cols[j] = make([]float64, T)
	}
	for i := range T {
		t := float64(i + 1)
		cols[0][i], cols[1][i] = 1, t
		if i+1 > tb {
			cols[2][i], cols[3][i] = 1, t-float64(tb)
		}
	}
	var ls core.LS
	f, _ := ls.Fit(cols, y)
	return tb, f.SSR
}

func TestTrendBreakDateNoAlloc(t *testing.T) {
	y := make([]float64, 300)
	core.RandomWalk(y, rand.New(rand.NewPCG(1, 2)))
	var tb trendBreak
	tb.date(y)
	if a := testing.AllocsPerRun(20, func() { tb.date(y) }); a != 0 {
		t.Errorf("date allocates %v times per call", a)
	}
}

func TestDiffAutocorrMA1(t *testing.T) {
	for _, th := range []float64{-0.8, -0.5, 0, 0.5} {
		r := rand.New(rand.NewPCG(5, uint64(100*(th+1))))
		const T = 40000
		y := make([]float64, T)
		prev := r.NormFloat64()
		for i := 1; i < T; i++ {
			e := r.NormFloat64()
			y[i] = y[i-1] + e + th*prev
			prev = e
		}
		want := th / (1 + th*th) // Box & Jenkins (1976), section 3.3
		if got := diffAutocorr(y); math.Abs(got-want) > 0.02 {
			t.Errorf("θ = %v: r1 = %.3f, want %.3f", th, got, want)
		}
	}
}

// The branch is chosen for a random walk with MA(1) errors θ = -0.8 in
// most samples, and for a random walk or a stationary AR(1) with a level
// shift in almost none (our simulation: 200 draws, T = 200; tolerances
// about four binomial standard errors).
func TestLongLagBranchChoice(t *testing.T) {
	cases := []struct {
		key    string
		lo, hi float64
	}{
		{"rw-ma", 0.85, 1},
		{"rw", 0, 0.03},
		{"ar-shift5", 0, 0.05},
		{"ts-turns", 0, 0.05},
	}
	const T, n = 200, 200
	y := make([]float64, T)
	for _, c := range cases {
		p, ok := ProcessByKey(c.key)
		if !ok {
			t.Fatalf("no process %q", c.key)
		}
		long := 0
		for b := range n {
			p.Gen(y, rand.New(rand.NewPCG(404, uint64(b))))
			if longLags(y) {
				long++
			}
		}
		if f := float64(long) / n; f < c.lo || f > c.hi {
			t.Errorf("%s: long-lag branch in %.1f%% of samples, want %.0f-%.0f%%", c.key, 100*f, 100*c.lo, 100*c.hi)
		}
	}
}

func BenchmarkTrendBreakDate(b *testing.B) {
	for _, T := range []int{100, 1000} {
		y := make([]float64, T)
		core.RandomWalk(y, rand.New(rand.NewPCG(1, 2)))
		var tb trendBreak
		b.Run("fast/T="+strconv.Itoa(T), func(b *testing.B) {
			for range b.N {
				tb.date(y)
			}
		})
		b.Run("brute/T="+strconv.Itoa(T), func(b *testing.B) {
			for range b.N {
				bruteTrendBreakDate(y)
			}
		})
	}
}

// bruteLagAt is the twin of trendBreak.lagAt: y itself detrended by a
// Householder QR fit (core.LS), then core.SelectLags.
func bruteLagAt(y []float64, tb int, rule core.LagRule, kmax int) int {
	T := len(y)
	cols := make([][]float64, 4)
	for j := range cols {
		cols[j] = make([]float64, T)
	}
	for i := range T {
		t := float64(i + 1)
		cols[0][i], cols[1][i] = 1, t
		if tb > 0 && i+1 > tb {
			cols[2][i], cols[3][i] = 1, t-float64(tb)
		}
	}
	if tb <= 0 {
		cols = cols[:2]
	}
	var ls core.LS
	f, err := ls.Fit(cols, y)
	if err != nil {
		return 0
	}
	var c core.Config
	km := c.MaxLagsFor(T, 4)
	if kmax >= 0 {
		km = min(km, kmax)
	}
	var dw core.DFWork
	k, err := dw.SelectLags(f.Resid, core.TrendNone, rule, km)
	if err != nil {
		return 0
	}
	return k
}

func TestLagAtMatchesBrute(t *testing.T) {
	var tb trendBreak
	keys := []string{"rw", "rw-ma", "ar-shift5", "ts-turns"}
	for _, key := range keys {
		p, _ := ProcessByKey(key)
		for b := range 25 {
			T := 80 + 40*b
			y := make([]float64, T)
			p.Gen(y, rand.New(rand.NewPCG(606, uint64(b))))
			for i := range y {
				y[i] = 1e6 + 10*y[i] // far from zero: the fast path standardises
			}
			date := tb.date(y)
			for _, c := range []struct {
				rule core.LagRule
				kmax int
			}{{core.LagBIC, zaMaxLags}, {core.LagMAIC, -1}} {
				for _, at := range []int{date, 0} {
					if got, want := tb.lagAt(y, at, c.rule, c.kmax), bruteLagAt(y, at, c.rule, c.kmax); got != want {
						t.Errorf("%s T=%d rule %v tb=%d: lag %d, QR twin %d", key, T, c.rule, at, got, want)
					}
				}
			}
		}
	}
	y := make([]float64, 300)
	core.RandomWalk(y, rand.New(rand.NewPCG(1, 2)))
	tb.lagAt(y, 150, core.LagBIC, zaMaxLags)
	if a := testing.AllocsPerRun(10, func() { tb.lagAt(y, 150, core.LagBIC, zaMaxLags) }); a != 0 {
		t.Errorf("lagAt allocates %v times per call", a)
	}
}

// The union statistic, computed once per bootstrap draw, does not allocate
// once its branch's members have been prepared.
func TestUnionRawNoAlloc(t *testing.T) {
	const T = 200
	u := newUnionCalc(T)
	y := make([]float64, T)
	core.RandomWalk(y, rand.New(rand.NewPCG(3, 4)))
	for _, long := range []bool{false, true} {
		if _, err := u.raw(y, long); err != nil {
			t.Fatal(err)
		}
		if a := testing.AllocsPerRun(10, func() { _, _ = u.raw(y, long) }); a != 0 {
			t.Errorf("long=%v: the union statistic allocates %v times per draw", long, a)
		}
	}
}

// lagAt is lagAtZ on y: the standardisation date would leave in b.z, then
// the order at tb (the entry of the tests, at any date).
func (b *trendBreak) lagAt(y []float64, tb int, rule core.LagRule, kmax int) int {
	b.z, _, _ = core.Standardize(b.z, y)
	return b.lagAtZ(tb, rule, kmax)
}
