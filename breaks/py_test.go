package breaks

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/rootshift/rootshift/core"
)

// pyBruteW recomputes W(TB) with a core.LS refit for every regression
// (brute-force twin of pyWork.at): raw trend t and DT_t = (t-TB)1(t>TB)
// columns, every lag order refitted separately.
func pyBruteW(t testing.TB, y []float64, shift core.Shift, kmax, tb int) (W, alpha float64, k int) {
	t.Helper()
	T := len(y)
	ys, _, _ := core.Standardize(nil, y)
	X := DeterministicColumns(nil, core.TrendLinear, TermsOf(shift, false), tb, 1, T)
	f, err := core.Leastsq(X, ys)
	if err != nil {
		t.Fatal(err)
	}
	u := f.Resid
	// AR for α: u_t on (u_{t-1}, Δu_{t-1..k}); t, 1-based, from start to T.
	adf := func(k, start int) core.Fit {
		var cols [][]float64
		dep := []float64{}
		c0 := []float64{}
		for s := start; s <= T; s++ {
			dep = append(dep, u[s-1])
			c0 = append(c0, u[s-2])
		}
		cols = append(cols, c0)
		for i := 1; i <= k; i++ {
			c := []float64{}
			for s := start; s <= T; s++ {
				c = append(c, u[s-1-i]-u[s-2-i])
			}
			cols = append(cols, c)
		}
		f, err := core.Leastsq(cols, dep)
		if err != nil {
			t.Fatal(err)
		}
		return f
	}
	best := math.Inf(1)
	for kk := 0; kk <= kmax; kk++ {
		f := adf(kk, kmax+2)
		n := float64(f.N)
		if c := math.Log(f.SSR/n) + float64(kk+1)*math.Log(n)/n; c < best {
			best, k = c, kk
		}
	}
	fa := adf(k, k+2)
	alpha = fa.Coef[0]
	aM := pyRoyFuller(alpha, fa.StdErr[0], T, len(X))
	aMS := aM
	if math.Abs(aM-1) <= 1/math.Sqrt(float64(T)) {
		aMS = 1
	}
	q := func(v []float64) []float64 {
		o := make([]float64, len(v))
		o[0] = v[0]
		for i := 1; i < len(v); i++ {
			o[i] = v[i] - aMS*v[i-1]
		}
		return o
	}
	var Xa [][]float64
	for _, c := range X {
		Xa = append(Xa, q(c))
	}
	ya := q(ys)
	fr, err := core.Leastsq(Xa[:2], ya)
	if err != nil {
		t.Fatal(err)
	}
	fu, err := core.Leastsq(Xa, ya)
	if err != nil {
		t.Fatal(err)
	}
	v := fu.Resid
	// AR(k) for ĥ_v: v_t on v_{t-1..k}, t from start to T.
	ar := func(k, start int) (ssr, sum float64, n int) {
		dep := []float64{}
		for s := start; s <= T; s++ {
			dep = append(dep, v[s-1])
		}
		if k == 0 {
			for _, d := range dep {
				ssr += d * d
			}
			return ssr, 0, len(dep)
		}
		var cols [][]float64
		for i := 1; i <= k; i++ {
			c := []float64{}
			for s := start; s <= T; s++ {
				c = append(c, v[s-1-i])
			}
			cols = append(cols, c)
		}
		f, err := core.Leastsq(cols, dep)
		if err != nil {
			t.Fatal(err)
		}
		for _, b := range f.Coef {
			sum += b
		}
		return f.SSR, sum, f.N
	}
	best, kv := math.Inf(1), 0
	for kk := 0; kk <= kmax; kk++ {
		ssr, _, n := ar(kk, kmax+1)
		nf := float64(n)
		if c := math.Log(ssr/nf) + float64(kk)*math.Log(nf)/nf; c < best {
			best, kv = c, kk
		}
	}
	ssr, sum, n := ar(kv, kv+1)
	hv := ssr / float64(n) / ((1 - sum) * (1 - sum))
	return (fr.SSR - fu.SSR) / hv, alpha, k
}

func pySeries(T int, seed uint64, i1 bool, slope float64, tb int) []float64 {
	r := rand.New(rand.NewPCG(seed, 3))
	y := make([]float64, T)
	u := 0.0
	for i := range y {
		e := r.NormFloat64()
		if i1 {
			u += e
		} else {
			u = 0.3*u + e
		}
		y[i] = 5 + 0.02*float64(i) + u
		if i+1 > tb {
			y[i] += slope * float64(i+1-tb)
		}
	}
	return y
}

// TestPYBruteForce: the cross-product path of W(TB) equals a full core.LS
// refit of every regression at every tested date (1e-9).
func TestPYBruteForce(t *testing.T) {
	for _, shift := range []core.Shift{core.ShiftLevel, core.ShiftSlope, core.ShiftBoth} {
		for _, i1 := range []bool{false, true} {
			y := pySeries(80, 4, i1, 0.05, 40)
			cfg := core.Config{Shift: shift, MaxLags: 3}
			s, err := pyResolve(y, &cfg, false)
			if err != nil {
				t.Fatal(err)
			}
			var w pyWork
			w.setup(len(y), s.terms, s.rule, s.lags, s.kmax)
			w.load(y)
			for _, tb := range []int{s.lo, 30, 41, s.hi} {
				o, err := w.at(tb)
				if err != nil {
					t.Fatal(err)
				}
				W, a, k := pyBruteW(t, y, shift, s.kmax, tb)
				if k != o.k || math.Abs(a-o.alpha) > 1e-9 || math.Abs(W-o.W) > 1e-9*math.Max(1, W) {
					t.Errorf("%v I(1)=%v TB=%d: fast W=%.12g α=%.12g k=%d; refit W=%.12g α=%.12g k=%d", shift, i1, tb, o.W, o.alpha, o.k, W, a, k)
				}
			}
		}
	}
}

// TestPYRoyFuller: C(τ) sets α̂_M = 1 above τ_pct, is continuous at τ_pct and
// at -c_r, and vanishes for very negative τ (checks of our transcription).
func TestPYRoyFuller(t *testing.T) {
	const T, p, se = 200, 3, 0.02
	at := func(tau float64) float64 { return pyRoyFuller(1+tau*se, se, T, p) }
	if a := at(-1); a != 1 {
		t.Errorf("τ=-1: α̂_M = %g, want 1", a)
	}
	for _, k := range []float64{pyTauPct, -pyCr} {
		if d := math.Abs(at(k+1e-9) - at(k-1e-9)); d > 1e-7 {
			t.Errorf("jump %g at τ=%g", d, k)
		}
	}
	if a := at(-20); a != 1-20*se {
		t.Errorf("τ=-20 (beyond -√T): α̂_M = %g, want α̂", a)
	}
	if a := at(-5); !(a > 1-5*se && a < 1) {
		t.Errorf("τ=-5: α̂_M = %g, want a correction towards 1", a)
	}
}

// TestPYSize: at 5% the rejection rate under the null with I(0) (AR(1),
// ρ=0.3) and I(1) noise is at most 0.10 for every model, and a clear slope
// change from TB = 100 (0.05σ per period with I(0) noise, 1σ per period with
// I(1) noise) is detected by Models II and III in at least 90% of the draws
// (common practice: bounds set for this check, no source; 200 draws each,
// T=200, BIC lags with kmax=4). Before step 0 and the tables by T, the same
// draws gave sizes up to 0.095 (Model I, I(1)) and Model III detected the
// I(0) change in 63 of 200 draws, the I(1) one in 139.
func TestPYSize(t *testing.T) {
	if testing.Short() {
		t.Skip("size simulation")
	}
	const T, draws = 200, 200
	cases := []struct {
		shift  core.Shift
		i1     bool
		slope  float64
		lo, hi float64 // bounds on the rejection share
	}{
		{core.ShiftLevel, false, 0, 0, 0.10},
		{core.ShiftLevel, true, 0, 0, 0.10},
		{core.ShiftSlope, false, 0, 0, 0.10},
		{core.ShiftSlope, true, 0, 0, 0.10},
		{core.ShiftBoth, false, 0, 0, 0.10},
		{core.ShiftBoth, true, 0, 0, 0.10},
		{core.ShiftSlope, false, 0.05, 0.9, 1},
		{core.ShiftSlope, true, 1, 0.9, 1},
		{core.ShiftBoth, false, 0.05, 0.9, 1},
		{core.ShiftBoth, true, 1, 0.9, 1},
	}
	for _, c := range cases {
		rej := 0
		cfg := core.Config{Shift: c.shift, MaxLags: 4, NoPath: true}
		for d := 0; d < draws; d++ {
			y := pySeries(T, uint64(7000+d), c.i1, c.slope, T/2)
			res, err := RunPY(context.Background(), y, &cfg)
			if err != nil {
				t.Fatal(err)
			}
			if res.Reject {
				rej++
			}
		}
		share := float64(rej) / draws
		t.Logf("%v, I(1)=%v, slope change %g: rejects %.3f", c.shift, c.i1, c.slope, share)
		if share < c.lo || share > c.hi {
			t.Errorf("%v, I(1)=%v, slope change %g: rejection share %.3f outside [%g, %g]", c.shift, c.i1, c.slope, share, c.lo, c.hi)
		}
	}
}

// TestPYPower: a large slope change from TB = 100 (T=200) is detected in most
// draws, 0.15σ per period with I(0) noise and 2σ per period with I(1) noise,
// and the date found is near the truth under I(0) (common practice).
func TestPYPower(t *testing.T) {
	const T, draws = 200, 20
	for _, i1 := range []bool{false, true} {
		rej, near := 0, 0
		for d := 0; d < draws; d++ {
			y := pySeries(T, uint64(2000+d), i1, 0.15, 100)
			if i1 {
				y = pySeries(T, uint64(2000+d), i1, 2, 100)
			}
			res, err := RunPY(context.Background(), y, &core.Config{Shift: core.ShiftSlope, MaxLags: 4})
			if err != nil {
				t.Fatal(err)
			}
			if res.Reject {
				rej++
			}
			if b := res.Breaks[0].Index; b >= 95 && b <= 105 {
				near++
			}
		}
		t.Logf("I(1)=%v: rejects %d of %d, date within ±5: %d", i1, rej, draws, near)
		if rej < draws*8/10 {
			t.Errorf("I(1)=%v: power %d of %d", i1, rej, draws)
		}
		if !i1 && near < draws*8/10 {
			t.Errorf("dates near the truth in %d of %d draws", near, draws)
		}
	}
}

// TestPYTables: the simulated I(0) and I(1) 5% values of Models II and III
// are close at T >= 200 (Perron & Yabu 2009 report that the limits nearly
// coincide; within 0.6 here, our simulation), every table increases with
// 1-α, and pyTableFor returns the grid at its own T, interpolates between
// grid points and keeps the nearest one outside.
func TestPYTables(t *testing.T) {
	for _, sh := range []core.Shift{core.ShiftLevel, core.ShiftSlope, core.ShiftBoth} {
		grid := pyTables[pyKey{sh, 15}]
		if len(grid) < 2 {
			t.Fatalf("%v: %d tables", sh, len(grid))
		}
		for _, g := range grid {
			for i := 1; i < 4; i++ {
				if !(g.Max[i] < g.Max[i-1]) {
					t.Errorf("%v T=%d: not decreasing in α: %v", sh, g.T, g.Max)
				}
			}
			for i := range g.Max {
				if g.Max[i] != math.Max(g.I0[i], g.I1[i]) {
					t.Errorf("%v T=%d: Max %v is not the larger of %v and %v", sh, g.T, g.Max, g.I0, g.I1)
				}
			}
			if sh != core.ShiftLevel && g.T >= 200 && math.Abs(g.I0[2]-g.I1[2]) > 0.6 {
				t.Errorf("%v T=%d: 5%% values I(0) %.3f and I(1) %.3f differ by more than 0.6", sh, g.T, g.I0[2], g.I1[2])
			}
		}
		tb, w := pyTableFor(sh, 0.15, grid[1].T)
		if tb != grid[1] || w != "" {
			t.Errorf("%v: T=%d not the grid table (%q)", sh, grid[1].T, w)
		}
		mid := (grid[1].T + grid[2].T) / 2
		tb, _ = pyTableFor(sh, 0.15, mid)
		lo, hi := math.Min(grid[1].Max[2], grid[2].Max[2]), math.Max(grid[1].Max[2], grid[2].Max[2])
		if tb.Max[2] < lo || tb.Max[2] > hi {
			t.Errorf("%v T=%d: 5%% value %.3f not between %.3f and %.3f", sh, mid, tb.Max[2], lo, hi)
		}
		if tb, w := pyTableFor(sh, 0.15, 35); tb != grid[0] || w == "" {
			t.Errorf("%v T=35: want the smallest table and a warning", sh)
		}
		if tb, _ := pyTableFor(sh, 0.15, 5000); tb != grid[len(grid)-1] {
			t.Errorf("%v T=5000: want the largest table", sh)
		}
	}
}

// TestPYStepZero: the no-break regression gives α̂_MS = 1 for most random
// walks and for few AR(1) series with ρ = 0.3 (T=200; common practice).
func TestPYStepZero(t *testing.T) {
	const T, draws = 200, 40
	for _, i1 := range []bool{false, true} {
		unit := 0
		for d := 0; d < draws; d++ {
			res, err := RunPY(context.Background(), pySeries(T, uint64(300+d), i1, 0, T), &core.Config{Shift: core.ShiftSlope, MaxLags: 4, NoPath: true})
			if err != nil {
				t.Fatal(err)
			}
			if res.Estimates["unit_root_no_break"] == 1 {
				unit++
			}
		}
		t.Logf("I(1)=%v: unit root without break in %d of %d", i1, unit, draws)
		if i1 && unit < draws*8/10 || !i1 && unit > draws/10 {
			t.Errorf("I(1)=%v: α̂_MS = 1 without break in %d of %d draws", i1, unit, draws)
		}
	}
}

// TestPYResult checks fields, invariance to y -> a + b y and the
// registered statistic.
func TestPYResult(t *testing.T) {
	y := pySeries(120, 8, false, 0.1, 60)
	cfg := core.Config{Shift: core.ShiftBoth}
	res, err := RunPY(context.Background(), y, &cfg)
	if err != nil {
		t.Fatal(err)
	}
	if res.Test != "py" || res.Tail != "right" || res.Null != "no break in the trend function (noise may be I(0) or I(1))" ||
		res.PValue != nil || res.PValueMethod == "" || len(res.Breaks) != 1 || len(res.CriticalValues) != 4 || res.Shift != "level+slope" {
		t.Errorf("fields: %+v", res)
	}
	lo, hi, _ := Candidates(120, 0.15)
	if len(res.Path) != hi-lo+1 {
		t.Errorf("path has %d points, want %d", len(res.Path), hi-lo+1)
	}
	z := make([]float64, len(y))
	for i, v := range y {
		z[i] = -3 + 40*v
	}
	r2, err := RunPY(context.Background(), z, &cfg)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(*r2.Statistic-*res.Statistic) > 1e-8*math.Max(1, math.Abs(*res.Statistic)) || r2.Breaks[0].Index != res.Breaks[0].Index {
		t.Errorf("not invariant: %v at %d vs %v at %d", *res.Statistic, res.Breaks[0].Index, *r2.Statistic, r2.Breaks[0].Index)
	}
	info, err := core.Lookup("py")
	if err != nil {
		t.Fatal(err)
	}
	v, err := info.StatOf(len(y), &cfg)(y)
	if err != nil || math.Abs(v-*res.Statistic) > 1e-12 {
		t.Errorf("NewStat %v (%v), RunPY %v", v, err, *res.Statistic)
	}
}

func TestPYErrors(t *testing.T) {
	good := pySeries(60, 1, false, 0, 60)
	inf := append([]float64(nil), good...)
	inf[3] = math.Inf(1)
	cases := []struct {
		name string
		y    []float64
		cfg  core.Config
		want error
	}{
		{"inf", inf, core.Config{}, core.ErrNonFinite},
		{"short", good[:20], core.Config{}, core.ErrTooShort},
		{"constant", make([]float64, 60), core.Config{}, core.ErrConstant},
		{"trim", good, core.Config{Trim: 0.2}, core.ErrSettings},
		{"lag rule", good, core.Config{LagRule: core.LagMAIC}, core.ErrSettings},
		{"too many lags", good, core.Config{LagRule: core.LagFixed, Lags: 30}, core.ErrTooShort},
	}
	for _, c := range cases {
		_, err := RunPY(context.Background(), c.y, &c.cfg)
		var ce *core.Error
		if !errors.Is(err, c.want) || !errors.As(err, &ce) || ce.Test != pyID {
			t.Errorf("%s: error %v, want *core.Error wrapping %v", c.name, err, c.want)
		}
	}
}

func FuzzPY(f *testing.F) {
	f.Add(make([]byte, 40), uint8(0))
	f.Add([]byte("a series of bytes that is long enough to run the test"), uint8(2))
	f.Fuzz(func(t *testing.T, data []byte, shift uint8) {
		if len(data) > 300 {
			data = data[:300]
		}
		y := make([]float64, len(data))
		for i, b := range data {
			y[i] = float64(b)
		}
		cfg := core.Config{Shift: core.Shift(shift % 3), MaxLags: 2}
		res, err := RunPY(context.Background(), y, &cfg)
		if err != nil {
			var ce *core.Error
			if !errors.As(err, &ce) {
				t.Fatalf("error %v is not a *core.Error", err)
			}
			return
		}
		if res.Statistic == nil || math.IsNaN(*res.Statistic) || math.IsInf(*res.Statistic, 0) {
			t.Fatalf("statistic %v", res.Statistic)
		}
	})
}

func BenchmarkPY(b *testing.B) {
	for _, T := range []int{100, 500} {
		y := pySeries(T, 1, true, 0, T)
		b.Run(fmt.Sprintf("T=%d", T), func(b *testing.B) {
			b.ReportAllocs()
			cfg := core.Config{Shift: core.ShiftBoth, NoPath: true}
			for i := 0; i < b.N; i++ {
				if _, err := RunPY(context.Background(), y, &cfg); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// TestPYNoAlloc: W(TB) does not allocate once the work space has been used.
func TestPYNoAlloc(t *testing.T) {
	y := pySeries(150, 2, true, 0, 150)
	cfg := core.Config{Shift: core.ShiftBoth}
	s, err := pyResolve(y, &cfg, false)
	if err != nil {
		t.Fatal(err)
	}
	var w pyWork
	w.setup(len(y), s.terms, s.rule, s.lags, s.kmax)
	w.load(y)
	if _, err := w.at(70); err != nil {
		t.Fatal(err)
	}
	if a := testing.AllocsPerRun(10, func() { w.at(71) }); a != 0 {
		t.Errorf("W(TB) allocates %v times", a)
	}
}

// BenchmarkPYAt compares W at one break date by cross-products with its
// brute-force twin (core.LS refit of every regression), T=100.
func BenchmarkPYAt(b *testing.B) {
	y := pySeries(100, 1, true, 0, 100)
	cfg := core.Config{Shift: core.ShiftBoth, MaxLags: 4}
	s, err := pyResolve(y, &cfg, false)
	if err != nil {
		b.Fatal(err)
	}
	b.Run("fast/T=100", func(b *testing.B) {
		var w pyWork
		w.setup(len(y), s.terms, s.rule, s.lags, s.kmax)
		w.load(y)
		for i := 0; i < b.N; i++ {
			w.at(50)
		}
	})
	b.Run("brute/T=100", func(b *testing.B) {
		for i := 0; i < b.N; i++ {
			pyBruteW(b, y, core.ShiftBoth, s.kmax, 50)
		}
	})
}
