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
// ρ=0.3) and I(1) noise stays at most 0.12 (common practice; 200 draws
// each, T=200, BIC lags with kmax=4).
func TestPYSize(t *testing.T) {
	if testing.Short() {
		t.Skip("size simulation")
	}
	const T, draws = 200, 200
	for _, shift := range []core.Shift{core.ShiftSlope, core.ShiftBoth} {
		for _, i1 := range []bool{false, true} {
			rej := 0
			cfg := core.Config{Shift: shift, MaxLags: 4, NoPath: true}
			for d := 0; d < draws; d++ {
				y := pySeries(T, uint64(1000+d), i1, 0, T)
				res, err := RunPY(context.Background(), y, &cfg)
				if err != nil {
					t.Fatal(err)
				}
				if res.Reject {
					rej++
				}
			}
			size := float64(rej) / draws
			t.Logf("%v, I(1)=%v: size %.3f", shift, i1, size)
			if size > 0.12 {
				t.Errorf("%v, I(1)=%v: size %.3f > 0.12", shift, i1, size)
			}
		}
	}
}

// TestPYPower: a large slope change from TB = 100 (T=200) is detected in most
// draws, 0.15σ per period with I(0) noise and 2σ per period with I(1) noise,
// and the date found is near the truth under I(0) (common practice). With
// I(1) noise the robust critical values (the larger of the I(0) and I(1)
// quantiles) are large for Model II, so smaller changes are often missed:
// 0.6σ per period is detected in about half of the draws.
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
