package breaks

// Lumsdaine & Papell (1997) unit-root test with two endogenous breaks:
// Lumsdaine, R.L. & Papell, D.H. (1997), "Multiple Trend Breaks and the
// Unit-Root Hypothesis", Review of Economics and Statistics 79(2), 212-218,
// extending Zivot & Andrews (1992) eq. (3) to two breaks:
//
//	Δy_t = μ + β t + θ_1 DU1_t + γ_1 DT1_t + θ_2 DU2_t + γ_2 DT2_t
//	       + α y_{t-1} + Σ_{i=1}^{k} c_i Δy_{t-i} + e_t,
//
// with DUj_t = 1(t > TB_j) and DTj_t = (t - TB_j) 1(t > TB_j). Model AA has
// the two level shifts only (cfg.Shift level), model CC level and slope
// shifts (cfg.Shift level+slope); a slope-only model is not in the paper
// and is refused. The statistic is the t-ratio on α minimised jointly over
// the pairs lo <= TB_1, TB_1 + 2 <= TB_2 <= hi (trimming cfg.TrimOr(),
// default 15%), with the lag order chosen per pair by the t-sig rule with
// kmax = 8 (Lumsdaine & Papell 1997) or fixed. The deterministic part is
// always a constant and a linear trend.
//
// The search reuses the data cross-products built once per series and
// changes only the break atoms per pair (see ls.go).

import (
	"context"
	"math"

	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/schema"
)

func init() {
	core.Register(core.Info{
		ID:       "lp",
		Name:     "Lumsdaine-Papell test, two breaks",
		Null:     "unit root without breaks (breaks only under the alternative)",
		Tail:     "left",
		Citation: "Lumsdaine & Papell (1997), Review of Economics and Statistics 79(2); Zivot & Andrews (1992) eq. (3) with two breaks",
		Run:      runLP,
		NewStat:  func(T int, cfg *core.Config) core.StatFunc { return newStatADF("lp", cfg) },
	})
}

// adfForm is the regression form of an ADF-type break test.
type adfForm int

const (
	formLP adfForm = iota // Lumsdaine-Papell: constant, trend, DU (, DT)
	formIO                // innovational outlier: constant, DU, D(TB)
	formAO                // additive outlier: two steps, D(TB) lags
)

// adfTest describes one ADF-type break test.
type adfTest struct {
	id    string
	form  adfForm
	nb    int
	slope bool
}

// adfWork is the per-goroutine scratch of the ADF-type statistics. Per
// candidate the columns are described as atoms (see ls.go) and rowGram
// gives their cross-products in a time independent of T: the
// candidate-independent atoms (constant, trend, y_{t-1}, Δy_t and its
// lags) are tabulated once per series for every window start, steps and
// ramps at the break dates come from prefix sums, and the one-time dummies
// D(TB)_{t-i} are single rows added to the smooth part.
type adfWork struct {
	// aoColumns makes the AO form carry its dummies as columns of the
	// regression (the general path, kept for the tests) instead of
	// deleting their rows (aoSelectAndTest).
	aoColumns bool
	gs        lmGram
	xr        []float64
	selSSR    []float64
	selT      []float64
	selOK     []bool
	e         rowGram
	d         *lmXData
	g         lmGram
	cols      []lmColumn
	dep       lmColumn
	ys        []float64
	kmax      int
}

func (w *adfWork) setup(y []float64, kmax int) {
	w.ys, _, _ = core.Standardize(w.ys, y)
	w.e.setup(w.ys, kmax, nil)
	w.d = &w.e.d
	w.dep = append(w.dep[:0], lmTerm{lmAtom{lmKData, lmDy}, 1})
	w.kmax = kmax
}

// nDet is the number of deterministic regressors of the one-step forms.
func (a adfTest) nDet() int {
	switch a.form {
	case formLP:
		if a.slope {
			return 2 + 2*a.nb
		}
		return 2 + a.nb
	case formIO:
		return 1 + 2*a.nb
	}
	return a.nb // AO: the D(TB_j)_t dummies
}

// stat computes the t-ratio on y_{t-1} at break dates tbs.
func (w *adfWork) stat(a adfTest, tbs []int, spec lmLagSpec) (float64, int, int, error) {
	kmax := spec.k
	var ds lmDesign
	var ncol int
	if a.form == formAO {
		ds = lmDesign{base: 1 + a.nb, group: 1 + a.nb, stat: 0}
	} else {
		nd := a.nDet()
		ds = lmDesign{base: nd + 1, group: 1, stat: nd}
	}
	ncol = ds.width(kmax)
	if cap(w.cols) < ncol {
		w.cols = make([]lmColumn, ncol)
	}
	cols := w.cols[:ncol]
	set := func(i int, ts ...lmTerm) { cols[i] = append(cols[i][:0], ts...) }
	one := func(kind, v int) lmTerm { return lmTerm{lmAtom{kind, v}, 1} }
	switch a.form {
	case formLP:
		i := 0
		set(i, one(lmKStep, 0))
		set(i+1, one(lmKRamp, 0))
		i += 2
		for _, tb := range tbs {
			set(i, one(lmKStep, tb))
			i++
		}
		if a.slope {
			for _, tb := range tbs {
				set(i, one(lmKRamp, tb))
				i++
			}
		}
		set(i, one(lmKData, lmYlag))
		for l := 1; l <= kmax; l++ {
			set(i+l, one(lmKData, lmDy+l))
		}
	case formIO:
		i := 0
		set(i, one(lmKStep, 0))
		i++
		for _, tb := range tbs {
			set(i, one(lmKStep, tb))
			set(i+1, one(lmKPulse, tb+1))
			i += 2
		}
		set(i, one(lmKData, lmYlag))
		for l := 1; l <= kmax; l++ {
			set(i+l, one(lmKData, lmDy+l))
		}
	case formAO:
		// Step 1 (Perron & Vogelsang 1992): ỹ_t = y_t - μ̂ - Σ δ̂_j DU_jt,
		// i.e. y minus its regime means. In the second step
		// ỹ_{t-1} = y_{t-1} - μ̂ - Σ δ̂_j 1(t > TB_j + 1), while Δỹ_t and
		// Δỹ_{t-i} differ from Δy_t and Δy_{t-i} only by the pulses
		// D(TB_j)_{t-i}, i = 0..k, which are regressors: they are replaced
		// by Δy without changing the fit.
		py := w.d.py
		T := w.d.T
		prev := 0
		var means [3]float64
		ssr1 := 0.0 // Σ (y_t - regime mean)², the SSR of step 1
		for j := 0; j <= len(tbs); j++ {
			end := T
			if j < len(tbs) {
				end = tbs[j]
			}
			n := float64(end - prev)
			means[j] = (py[end] - py[prev]) / n
			ssr1 += (w.d.py2[end] - w.d.py2[prev]) - n*means[j]*means[j]
			prev = end
		}
		// Exact-fit rule of the levels regression with an intercept: the
		// scale is the centred Σ (y_t - ȳ)² of the standardised series.
		if tss := w.d.py2[T] - py[T]*py[T]/float64(T); ssr1 <= ExactFitTol*tss {
			return math.NaN(), 0, 0, errExactFit
		}
		c := cols[0][:0]
		c = append(c, one(lmKData, lmYlag), lmTerm{lmAtom{lmKStep, 0}, -means[0]})
		for j, tb := range tbs {
			c = append(c, lmTerm{lmAtom{lmKStep, tb + 1}, -(means[j+1] - means[j])})
		}
		cols[0] = c
		if !w.aoColumns {
			return w.aoSelectAndTest(a, tbs, spec, ds)
		}
		for j, tb := range tbs {
			set(1+j, one(lmKPulse, tb+1))
		}
		for l := 1; l <= kmax; l++ {
			// Group l: the dummies D(TB_j)_{t-l}, then the lag Δy_{t-l}
			// last (the column the t-sig rule tests).
			b := ds.base + (l-1)*ds.group
			for j, tb := range tbs {
				set(b+j, one(lmKPulse, tb+1+l))
			}
			set(b+a.nb, one(lmKData, lmDy+l))
		}
	}
	w.e.load(cols, w.dep)
	return lmSelectAndTest(&w.e, &w.g, ds, spec)
}

// adfPrepare validates input and settings of an ADF-type break test and
// returns the lag spec and the candidate range.
func adfPrepare(a adfTest, y []float64, cfg *core.Config) (spec lmLagSpec, lo, hi, gap int, err error) {
	if err = CheckSeries(a.id, y, 20); err != nil {
		return
	}
	T := len(y)
	extra := a.nDet() + 1
	if a.form == formAO {
		extra = 1 + 2*a.nb // the D(TB) lag dummies are counted by hand below
	}
	if spec, err = lmLagSpecFor(a.id, cfg, T, extra); err != nil {
		return
	}
	if a.form == formAO {
		// k more dummies per break.
		for spec.k > 0 && T-spec.k-1-(spec.k*(1+a.nb)+1+a.nb+1) < 10 {
			spec.k--
			if spec.rule == core.LagFixed {
				err = core.Errorf(a.id, core.ErrTooShort, "%d lags leave too few observations for T=%d", cfg.Lags, T)
				return
			}
		}
	}
	lo, hi, err = Candidates(T, cfg.TrimOr())
	if err != nil {
		err = WrapError(a.id, err)
		return
	}
	// Every break regressor must vary inside the regression sample t >= k+2.
	lo = max(lo, spec.k+3)
	gap = lmMinGap
	if a.form == formAO {
		// The dummies D(TB)_{t-i}, i = 0..k, must stay in the sample and
		// must not coincide between the two breaks.
		hi = min(hi, T-spec.k-2)
		gap = max(gap, spec.k+2)
	}
	if lo+(a.nb-1)*gap > hi {
		err = core.Errorf(a.id, core.ErrTooShort, "no break candidate left with T=%d, trimming %g and %d lags", T, cfg.TrimOr(), spec.k)
	}
	return
}

// adfTestOf resolves the form and model of test id under cfg.
func adfTestOf(id string, cfg *core.Config) (adfTest, error) {
	switch id {
	case "lp":
		switch cfg.Shift {
		case core.ShiftLevel:
			return adfTest{id: id, form: formLP, nb: 2}, nil
		case core.ShiftBoth:
			return adfTest{id: id, form: formLP, nb: 2, slope: true}, nil
		}
		return adfTest{}, core.Errorf(id, core.ErrSettings, "shift %q: Lumsdaine & Papell define model AA (level) and model CC (level+slope) only", cfg.Shift)
	case "meanshift":
		if cfg.Shift != core.ShiftLevel {
			return adfTest{}, core.Errorf(id, core.ErrSettings, "shift %q: the mean-shift test (Perron & Vogelsang; Clemente, Montanes & Reyes) allows shifts in the mean (level) only", cfg.Shift)
		}
		a := adfTest{id: id, form: formIO, nb: cfg.ShiftsOr()}
		if cfg.Outlier == core.OutlierAdditive {
			a.form = formAO
		}
		if a.nb > 2 {
			return adfTest{}, core.Errorf(id, core.ErrSettings, "%d shifts: want 1 or 2", a.nb)
		}
		return a, nil
	}
	return adfTest{}, core.Errorf(id, core.ErrUnknown, "not an ADF-type break test")
}

// adfSearch runs the minimum-t search of an ADF-type break test.
func adfSearch(ctx context.Context, w *adfWork, a adfTest, y []float64, cfg *core.Config, path bool) (lmSearchResult, lmLagSpec, error) {
	spec, lo, hi, gap, err := adfPrepare(a, y, cfg)
	if err != nil {
		return lmSearchResult{}, spec, err
	}
	w.setup(y, spec.k)
	f := func(tbs []int) (float64, int, int, error) { return w.stat(a, tbs, spec) }
	var r lmSearchResult
	if a.nb == 1 {
		r, err = lmSearch1(ctx, lo, hi, f, path)
	} else {
		r, err = lmSearch2Gap(ctx, lo, hi, gap, f, path)
	}
	if e := lmSearchError(a.id, r, err); e != nil {
		return r, spec, e
	}
	return r, spec, nil
}

func newStatADF(id string, cfg *core.Config) core.StatFunc {
	var w adfWork
	return func(y []float64) (float64, error) {
		a, err := adfTestOf(id, cfg)
		if err != nil {
			return 0, err
		}
		r, _, err := adfSearch(nil, &w, a, y, cfg, false)
		if err != nil {
			return 0, err
		}
		return r.tau, nil
	}
}

// runADF runs an ADF-type break test and fills the common result fields.
func runADF(ctx context.Context, id string, y []float64, cfg *core.Config) (*schema.Result, adfTest, lmSearchResult, error) {
	if cfg == nil {
		cfg = &core.Config{}
	}
	a, err := adfTestOf(id, cfg)
	if err != nil {
		return nil, a, lmSearchResult{}, err
	}
	var w adfWork
	r, spec, err := adfSearch(ctx, &w, a, y, cfg, !cfg.NoPath)
	if err != nil {
		return nil, a, r, err
	}
	T := len(y)
	res := &schema.Result{
		Test:      id,
		Statistic: schema.F(r.tau),
		Tail:      "left",
		Lags:      r.k,
		LagRule:   lmLagRuleName(spec),
		NObs:      r.nobs,
		Level:     cfg.LevelOr(),
		Shift:     core.ShiftLevel.String(),
	}
	for j := 0; j < a.nb; j++ {
		res.Breaks = append(res.Breaks, BreakAt(r.tbs[j], T, cfg))
	}
	if a.nb == 1 {
		res.Path = r.path
	} else {
		res.Surface = lmSurface(r, cfg)
	}
	return res, a, r, nil
}

func runLP(ctx context.Context, y []float64, cfg *core.Config) (*schema.Result, error) {
	if cfg == nil {
		cfg = &core.Config{}
	}
	res, a, _, err := runADF(ctx, "lp", y, cfg)
	if err != nil {
		return nil, err
	}
	res.Trend = core.TrendLinear.String()
	res.Null = "unit root without structural breaks (the breaks are allowed under the alternative only)"
	variant := "lp/AA"
	res.Variant = "model AA"
	if a.slope {
		variant, res.Variant, res.Shift = "lp/CC", "model CC", core.ShiftBoth.String()
	}
	if cfg.Trend == core.TrendNone {
		res.Warnings = append(res.Warnings, "lp always includes a constant and a linear trend; the trend setting was ignored")
	}
	applySearchInference(res, variant, "the minimum t statistic", cfg, nil)
	if info, e := core.Lookup("lp"); e == nil {
		if err := core.AddSimulated(ctx, info, len(y), cfg, res); err != nil {
			return nil, WrapError("lp", err)
		}
	}
	return res, nil
}

// lmSearch2Gap is lmSearch2 with a minimum distance gap between the breaks.
func lmSearch2Gap(ctx context.Context, lo, hi, gap int, f lmCandStat, rows bool) (lmSearchResult, error) {
	r := lmSearchResult{tau: math.Inf(1), lo: math.Inf(1), hi: math.Inf(-1)}
	buf := lmDatesPool.Get().(*[2]int) // f's argument escapes: reuse it
	defer lmDatesPool.Put(buf)
	tbs := buf[:]
	for t1 := lo; t1+gap <= hi; t1++ {
		if ctx != nil && ctx.Err() != nil {
			return r, ctx.Err()
		}
		best := math.Inf(1)
		for t2 := t1 + gap; t2 <= hi; t2++ {
			tbs[0], tbs[1] = t1, t2
			tau, k, nobs, err := f(tbs[:])
			if err != nil {
				if IsExactFit(err) {
					r.exact.add(tbs[:])
					continue
				}
				r.lastErr = err
				continue
			}
			r.ncand++
			r.lo, r.hi = math.Min(r.lo, tau), math.Max(r.hi, tau)
			best = math.Min(best, tau)
			if tau < r.tau {
				r.tau, r.tbs, r.k, r.nobs = tau, *buf, k, nobs
			}
		}
		if rows && !math.IsInf(best, 1) {
			r.rows = append(r.rows, schema.PathPoint{Index: t1, Statistic: best})
		}
	}
	return r, nil
}

// aoSelectAndTest is the additive-outlier second step with its one-time
// dummies D(TB_j)_{t-i}, i = 0..k, taken out as rows: a dummy for row r
// in a regression makes row r fit exactly and leaves every other
// coefficient, its standard error (with the dummy counted in the degrees
// of freedom) and the SSR as in the regression without row r (Frisch-Waugh-
// Lovell). The order-k regression is then ỹ_{t-1} and Δy_{t-1..t-k} over the
// window without the rows TB_j+1..TB_j+1+k: the cross-products over the
// whole window (rowGram, time independent of T) minus those rows, one small
// Cholesky factorisation per order instead of one of the (1+nb)(k+1)+1
// columns with the dummies. The lag rule is the one of lmSelectAndTest, on
// the same widths (dummies counted).
func (w *adfWork) aoSelectAndTest(a adfTest, tbs []int, spec lmLagSpec, ds lmDesign) (float64, int, int, error) {
	kmax := spec.k
	e := &w.e
	nd := 1 + kmax
	e.begin(nd)
	for _, t := range w.cols[0] {
		e.smooth(0, t.a, t.c)
	}
	for l := 1; l <= kmax; l++ {
		e.smooth(l, lmAtom{lmKData, lmDy + l}, 1)
	}
	e.finish(lmDy)
	g, gs := &w.g, &w.gs
	// remove subtracts the rows TB_j+1+i of the leading n columns.
	w.xr = searchGrow(w.xr, nd)
	remove := func(i, n int) {
		for _, tb := range tbs {
			r := tb + 1 + i
			yr := e.rowValues(r, n, w.xr)
			x := w.xr[:n]
			for c := 0; c < n; c++ {
				row := g.a[c*g.n : c*g.n+c+1]
				xc := x[c]
				for j := range row {
					row[j] -= xc * x[j]
				}
				g.b[c] -= xc * yr
			}
			g.yy -= yr * yr
		}
	}
	k := kmax
	if spec.rule != core.LagFixed && kmax > 0 {
		e.fillTo(g, nd, kmax+2)
		best := math.Inf(1)
		k = 0
		// Orders are tried from kmax down (as lmSelectAndTest); the rows of
		// order kk are those of the smaller orders plus TB_j+1+kk, so the
		// per-order results are computed upwards first.
		w.selSSR = searchGrow(w.selSSR, kmax+1)
		w.selT = searchGrow(w.selT, kmax+1)
		if cap(w.selOK) < kmax+1 {
			w.selOK = make([]bool, kmax+1)
		}
		ssrs, tl, ok := w.selSSR, w.selT, w.selOK[:kmax+1]
		for kk := 0; kk <= kmax; kk++ {
			remove(kk, nd)
			n := kk + 1
			gs.n = n
			gs.a = lmGrow(gs.a, n*n)
			gs.b = lmGrow(gs.b, n)
			for i := 0; i < n; i++ {
				copy(gs.a[i*n:i*n+i+1], g.a[i*g.n:i*g.n+i+1])
				gs.b[i] = g.b[i]
			}
			gs.yy = g.yy
			ok[kk] = gs.nested(n) == n
			if ok[kk] {
				ssrs[kk] = gs.yy - gs.cum[n]
				tl[kk] = gs.z[n-1]
			}
		}
		obs := g.obs
		for kk := kmax; kk >= 0; kk-- {
			if !ok[kk] {
				continue
			}
			wd := ds.width(kk)
			ssr := ssrs[kk]
			if ssr <= ExactFitTol*g.scale {
				return math.NaN(), kk, obs, errExactFit
			}
			if spec.rule == core.LagTSig {
				if kk == 0 {
					k = 0
					break
				}
				if ssr > 0 && math.Abs(tl[kk]/math.Sqrt(ssr/float64(obs-wd))) > lmTSig {
					k = kk
					break
				}
				continue
			}
			if !(ssr > 0) {
				continue
			}
			nn := float64(obs)
			pen := 2.0
			if spec.rule == core.LagBIC {
				pen = math.Log(nn)
			}
			ic := math.Log(ssr/nn) + pen*float64(wd)/nn
			if ic <= best {
				best, k = ic, kk
			}
		}
	}
	// Final regression of order k on t = k+2..T without its dummy rows.
	e.fillTo(g, k+1, k+2)
	for i := 0; i <= k; i++ {
		remove(i, k+1)
	}
	wd := ds.width(k)
	nm := &g.nm
	n := k + 1
	nm.Reset(n)
	for i := 0; i < n; i++ {
		copy(nm.A[i*n:i*n+i+1], g.a[i*n:i*n+i+1])
		nm.B[i] = g.b[i]
	}
	nm.YY, nm.N = g.yy, g.obs
	if g.obs <= wd {
		return math.NaN(), k, g.obs, core.ErrTooShort
	}
	ssr, err := nm.Solve()
	if err != nil {
		return math.NaN(), k, g.obs, err
	}
	if ssr <= ExactFitTol*g.scale {
		return math.NaN(), k, g.obs, errExactFit
	}
	v := ssr / float64(g.obs-wd) * nm.InvDiag(0)
	tau := math.NaN()
	if v > 0 {
		tau = nm.Coef[0] / math.Sqrt(v)
	}
	if math.IsNaN(tau) || math.IsInf(tau, 0) {
		return math.NaN(), k, g.obs, core.ErrSingular
	}
	return tau, k, g.obs, nil
}
