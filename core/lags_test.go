package core

import (
	"errors"
	"math"
	"math/rand/v2"
	"strconv"
	"testing"
)

// dfARDiff returns y with Δy_t = Σ_{i=1..p} phi_i Δy_{t-i} + e_t (a unit
// root with AR(p) differences), y_1 = 0, after a burn-in.
func dfARDiff(T int, phi []float64, seed uint64) []float64 {
	r := rand.New(rand.NewPCG(seed, 1))
	burn := 200
	d := make([]float64, T+burn)
	for t := range d {
		v := r.NormFloat64()
		for i, p := range phi {
			if t-1-i >= 0 {
				v += p * d[t-1-i]
			}
		}
		d[t] = v
	}
	y := make([]float64, T)
	for t := 1; t < T; t++ {
		y[t] = y[t-1] + d[burn+t]
	}
	return y
}

// dfBruteDesign builds the ADF design by hand for rows t = start..T.
func dfBruteDesign(y []float64, det Trend, k, start int) ([][]float64, []float64) {
	T := len(y)
	var X [][]float64
	var dep []float64
	nc := 1 + k + det.NumDet()
	X = make([][]float64, nc)
	for t := start; t <= T; t++ {
		dep = append(dep, y[t-1]-y[t-2])
		X[0] = append(X[0], y[t-2])
		for i := 1; i <= k; i++ {
			X[i] = append(X[i], y[t-1-i]-y[t-2-i])
		}
		if det != TrendNone {
			X[k+1] = append(X[k+1], 1)
		}
		if det == TrendLinear {
			X[k+2] = append(X[k+2], float64(t))
		}
	}
	return X, dep
}

// TestLagsRegressMatchesHandDesign: the reusable DFWork fit equals a fresh
// core.LS fit of a design built row by row (common practice, no source).
func TestLagsRegressMatchesHandDesign(t *testing.T) {
	y := dfARDiff(150, []float64{0.4, -0.2}, 3)
	for i := range y {
		y[i] += 1000 // a large level, as in price data
	}
	var w DFWork
	for _, det := range []Trend{TrendNone, TrendConstant, TrendLinear} {
		for _, k := range []int{0, 1, 3, 6} {
			for _, start := range []int{0, 10} {
				f, err := w.Regress(y, det, k, start)
				if err != nil {
					t.Fatal(err)
				}
				s := start
				if s == 0 {
					s = k + 2
				}
				X, dep := dfBruteDesign(y, det, k, s)
				ref, err := Leastsq(X, dep)
				if err != nil {
					t.Fatal(err)
				}
				if f.NObs != len(dep) || f.Start != s || f.K != k {
					t.Fatalf("det=%v k=%d: nobs %d start %d, want %d %d", det, k, f.NObs, f.Start, len(dep), s)
				}
				for j := range ref.Coef {
					if math.Abs(f.Fit.Coef[j]-ref.Coef[j]) > 1e-9*(1+math.Abs(ref.Coef[j])) {
						t.Errorf("det=%v k=%d coef %d: %g vs %g", det, k, j, f.Fit.Coef[j], ref.Coef[j])
					}
				}
				if math.Abs(f.TStat-ref.TStat(0)) > 1e-9*(1+math.Abs(f.TStat)) {
					t.Errorf("det=%v k=%d t %g vs %g", det, k, f.TStat, ref.TStat(0))
				}
				sg := 0.0
				for i := 1; i <= k; i++ {
					sg += ref.Coef[i]
				}
				if math.Abs(f.SumGamma-sg) > 1e-9 {
					t.Errorf("SumGamma %g vs %g", f.SumGamma, sg)
				}
			}
		}
	}
}

// TestLagsRegressNoAlloc: repeated fits of one shape do not allocate.
func TestLagsRegressNoAlloc(t *testing.T) {
	y := dfARDiff(300, []float64{0.3}, 5)
	var w DFWork
	if _, err := w.Regress(y, TrendLinear, 4, 0); err != nil {
		t.Fatal(err)
	}
	a := testing.AllocsPerRun(20, func() { _, _ = w.Regress(y, TrendLinear, 4, 0) })
	if a != 0 {
		t.Errorf("Regress allocates %v times per call", a)
	}
	a = testing.AllocsPerRun(5, func() { _, _ = w.SelectLags(y, TrendLinear, LagMAIC, 8) })
	if a != 0 {
		t.Errorf("SelectLags allocates %v times per call", a)
	}
}

// TestLagsBICPicksTrueOrder: AR(3) in levels = AR(2) in differences, so k = 2
// under BIC at large T in most draws (common practice: BIC is consistent).
func TestLagsBICPicksTrueOrder(t *testing.T) {
	var w DFWork
	hits := 0
	const draws = 20
	for s := range draws {
		y := dfARDiff(2000, []float64{0.5, -0.3}, uint64(100+s))
		k, err := w.SelectLags(y, TrendConstant, LagBIC, 10)
		if err != nil {
			t.Fatal(err)
		}
		if k == 2 {
			hits++
		}
	}
	if hits < 17 {
		t.Errorf("BIC picked k=2 in %d/%d draws", hits, draws)
	}
}

// TestLagsTSigDropsInsignificant: with no serial correlation, the
// general-to-specific rule mostly ends at 0; with a strong AR(2) in
// differences it keeps at least 2 (common practice).
func TestLagsTSigDropsInsignificant(t *testing.T) {
	var w DFWork
	zero, two := 0, 0
	for s := range 20 {
		y := dfARDiff(400, nil, uint64(200+s))
		k, err := w.SelectLags(y, TrendConstant, LagTSig, 8)
		if err != nil {
			t.Fatal(err)
		}
		if k == 0 {
			zero++
		}
		y = dfARDiff(400, []float64{0.4, 0.3}, uint64(300+s))
		k, err = w.SelectLags(y, TrendConstant, LagTSig, 8)
		if err != nil {
			t.Fatal(err)
		}
		if k >= 2 {
			two++
		}
	}
	// Each step has a 10% false-keep probability; 8 steps ⇒ P(k=0) ≈ 0.43 at
	// worst, typically higher; require a clear majority not at kmax.
	if zero < 6 {
		t.Errorf("TSig ended at 0 in only %d/20 white-noise draws", zero)
	}
	if two < 19 {
		t.Errorf("TSig kept >= 2 lags in %d/20 AR(2) draws", two)
	}
	// The rule is exactly: the kept lag is significant and it is the largest.
	y := dfARDiff(400, []float64{0.4, 0.3}, 7)
	k, _ := w.SelectLags(y, TrendConstant, LagTSig, 8)
	f, _ := w.Regress(y, TrendConstant, k, 10)
	if math.Abs(f.Fit.TStat(k)) < 1.645 {
		t.Errorf("kept lag %d has |t| = %g", k, math.Abs(f.Fit.TStat(k)))
	}
	for j := 8; j > k; j-- {
		f, _ := w.Regress(y, TrendConstant, j, 10)
		if math.Abs(f.Fit.TStat(j)) >= 1.645 {
			t.Errorf("lag %d significant but TSig stopped at %d", j, k)
		}
	}
}

// TestLagsCommonSample: every candidate is compared on t = kmax+2..T, so the
// criterion values equal hand computations on that sample; choosing a larger
// kmax changes the sample, not the rule (Ng & Perron 2001, p. 1529).
func TestLagsCommonSample(t *testing.T) {
	y := dfARDiff(200, []float64{0.3, 0.2}, 11)
	var w DFWork
	for _, kmax := range []int{4, 8, 12} {
		k, err := w.SelectLags(y, TrendConstant, LagAIC, kmax)
		if err != nil {
			t.Fatal(err)
		}
		best, bestK := math.Inf(1), -1
		for j := 0; j <= kmax; j++ {
			X, dep := dfBruteDesign(y, TrendConstant, j, kmax+2)
			if len(dep) != len(y)-kmax-1 {
				t.Fatalf("sample size %d", len(dep))
			}
			f, err := Leastsq(X, dep)
			if err != nil {
				t.Fatal(err)
			}
			N := float64(len(dep))
			v := math.Log(f.SSR/N) + 2*float64(j)/N
			if v < best {
				best, bestK = v, j
			}
		}
		if k != bestK {
			t.Errorf("kmax=%d: AIC picked %d, hand computation %d", kmax, k, bestK)
		}
	}
}

// TestLagsMAICByHand: MAIC (Ng & Perron 2001, eq. 9) on OLS-detrended data
// (Perron & Qu 2007) equals a hand computation.
func TestLagsMAICByHand(t *testing.T) {
	y := dfARDiff(250, []float64{0.5}, 13)
	for i := range y {
		y[i] += 0.02 * float64(i)
	}
	var w DFWork
	for _, det := range []Trend{TrendConstant, TrendLinear, TrendNone} {
		kmax := 10
		k, err := w.SelectLags(y, det, LagMAIC, kmax)
		if err != nil {
			t.Fatal(err)
		}
		yt := Detrend(nil, y, det)
		best, bestK := math.Inf(1), -1
		for j := 0; j <= kmax; j++ {
			X, dep := dfBruteDesign(yt, TrendNone, j, kmax+2)
			f, err := Leastsq(X, dep)
			if err != nil {
				t.Fatal(err)
			}
			N := float64(len(dep))
			s2 := f.SSR / N
			sy := 0.0
			for _, v := range X[0] {
				sy += v * v
			}
			tau := f.Coef[0] * f.Coef[0] * sy / s2
			v := math.Log(s2) + 2*(tau+float64(j))/N
			if v < best {
				best, bestK = v, j
			}
		}
		if k != bestK {
			t.Errorf("det=%v: MAIC picked %d, hand computation %d", det, k, bestK)
		}
	}
}

// TestLagsDetrend: residuals are orthogonal to the deterministic terms.
func TestLagsDetrend(t *testing.T) {
	y := dfARDiff(97, []float64{0.2}, 17)
	e := Detrend(nil, y, TrendLinear)
	s0, s1 := 0.0, 0.0
	for i, v := range e {
		s0 += v
		s1 += v * float64(i+1)
	}
	if math.Abs(s0) > 1e-9 || math.Abs(s1) > 1e-7 {
		t.Errorf("linear detrend not orthogonal: %g %g", s0, s1)
	}
	X := [][]float64{make([]float64, len(y)), make([]float64, len(y))}
	for i := range y {
		X[0][i], X[1][i] = 1, float64(i+1)
	}
	ref, _ := Leastsq(X, y)
	for i := range e {
		if math.Abs(e[i]-ref.Resid[i]) > 1e-9 {
			t.Fatalf("residual %d: %g vs %g", i, e[i], ref.Resid[i])
		}
	}
}

// TestLagsErrors: bad settings and degenerate data give sentinel errors.
func TestLagsErrors(t *testing.T) {
	var w DFWork
	y := dfARDiff(30, nil, 1)
	cases := []struct {
		name string
		run  func() error
		want error
	}{
		{"negative k", func() error { _, err := w.Regress(y, TrendConstant, -1, 0); return err }, ErrSettings},
		{"start too early", func() error { _, err := w.Regress(y, TrendConstant, 3, 2); return err }, ErrSettings},
		{"too short", func() error { _, err := w.Regress(y[:5], TrendLinear, 2, 0); return err }, ErrTooShort},
		{"constant", func() error { _, err := w.Regress([]float64{1, 1, 1, 1, 1, 1, 1, 1}, TrendConstant, 0, 0); return err }, ErrConstant},
		{"linear trend exact", func() error {
			z := make([]float64, 20)
			for i := range z {
				z[i] = float64(i)
			}
			_, err := w.Regress(z, TrendLinear, 0, 0)
			return err
		}, ErrSingular},
		{"perfect fit", func() error {
			z := make([]float64, 20)
			for i := range z {
				z[i] = float64(i)
			}
			_, err := w.Regress(z, TrendConstant, 0, 0)
			return err
		}, ErrNoEstimate},
		{"bad rule", func() error { _, err := w.SelectLags(y, TrendConstant, LagFixed, 3); return err }, ErrSettings},
		{"NaN", func() error {
			z := append([]float64(nil), y...)
			z[10] = math.NaN()
			_, err := w.Regress(z, TrendConstant, 0, 0)
			return err
		}, ErrNonFinite},
	}
	for _, c := range cases {
		err := c.run()
		if !errors.Is(err, c.want) {
			t.Errorf("%s: got %v, want %v", c.name, err, c.want)
		}
	}
}

func BenchmarkLagsRegress(b *testing.B) {
	for _, n := range []int{100, 1000, 10000} {
		y := dfARDiff(n, []float64{0.3}, 1)
		b.Run("n="+strconv.Itoa(n), func(b *testing.B) {
			var w DFWork
			for b.Loop() {
				_, _ = w.Regress(y, TrendLinear, 4, 0)
			}
		})
		b.Run("brute/n="+strconv.Itoa(n), func(b *testing.B) {
			for b.Loop() {
				X, dep := dfBruteDesign(y, TrendLinear, 4, 6)
				_, _ = Leastsq(X, dep)
			}
		})
	}
}

func BenchmarkLagsSelectMAIC(b *testing.B) {
	for _, n := range []int{100, 1000, 10000} {
		y := dfARDiff(n, []float64{0.3}, 1)
		kmax := SchwertMax(n)
		b.Run("n="+strconv.Itoa(n), func(b *testing.B) {
			var w DFWork
			for b.Loop() {
				_, _ = w.SelectLags(y, TrendConstant, LagMAIC, kmax)
			}
		})
	}
}

// TestLagsFastPathMatchesQR: the cross-product selection path agrees with its
// brute-force twin (a Householder QR fit per order) to 1e-9 in every
// criterion value and in the order chosen, for every rule and deterministic
// case, on random walks, stationary AR data and a series at a large level
// with a trend (common practice, no source).
func TestLagsFastPathMatchesQR(t *testing.T) {
	var fast, brute DFWork
	rules := []LagRule{LagAIC, LagBIC, LagMAIC, LagTSig}
	n := 0
	for s := range 12 {
		var y []float64
		switch s % 3 {
		case 0:
			y = dfARDiff(80+40*s, []float64{0.4, -0.2}, uint64(s))
		case 1:
			y = dfAR1(80+40*s, 0.6, uint64(s))
		default:
			y = dfARDiff(80+40*s, []float64{0.3}, uint64(s))
			for i := range y {
				y[i] = 5e4 + 3*float64(i) + 10*y[i]
			}
		}
		for _, det := range []Trend{TrendNone, TrendConstant, TrendLinear} {
			for _, rule := range rules {
				kmax := 3 + s%7
				k1, ok := fast.selectLagsFast(y, det, rule, kmax)
				if !ok {
					t.Fatalf("seed %d det %v rule %v: fast path failed", s, det, rule)
				}
				c1 := append([]float64(nil), fast.crit[:kmax+1]...)
				k2, err := brute.selectLagsQR(y, det, rule, kmax)
				if err != nil {
					t.Fatal(err)
				}
				if k1 != k2 {
					t.Errorf("seed %d det %v rule %v: fast k=%d, QR k=%d", s, det, rule, k1, k2)
				}
				for k := range c1 {
					if rule == LagTSig && k < k2 {
						continue // QR stops at the first significant lag
					}
					if d := math.Abs(c1[k] - brute.crit[k]); d > 1e-9*math.Max(1, math.Abs(brute.crit[k])) {
						t.Errorf("seed %d det %v rule %v k=%d: %.15g vs %.15g", s, det, rule, k, c1[k], brute.crit[k])
					}
					n++
				}
			}
		}
	}
	if n < 500 {
		t.Fatalf("only %d comparisons", n)
	}
}

func BenchmarkLagsSelectQR(b *testing.B) {
	for _, n := range []int{100, 1000, 10000} {
		y := dfARDiff(n, []float64{0.3}, 1)
		kmax := SchwertMax(n)
		b.Run("n="+strconv.Itoa(n), func(b *testing.B) {
			var w DFWork
			for b.Loop() {
				_, _ = w.selectLagsQR(y, TrendConstant, LagMAIC, kmax)
			}
		})
	}
}
