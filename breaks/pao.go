package breaks

// Vogelsang & Perron (1998) / Perron (1997): the additive-outlier test with
// one break at an unknown date, in two steps (Perron & Vogelsang 1992,
// eqs. (5)-(6); Perron 1997, eqs. (3)-(4); Vogelsang & Perron 1998, section 2).
// For every candidate TB:
//
//	step 1 (detrend):  y_t = μ + β t + θ DU_t + γ DT_t + ỹ_t,   t = 1..T
//	                   (level: DU only; slope: DT only; both: DU and DT)
//	step 2 (ADF):      Δỹ_t = (α-1) ỹ_{t-1} + Σ_{j=0..k} ω_j D(TB)_{t-j} + Σ_{i=1..k} c_i Δỹ_{t-i} + e_t,   t = k+2..T
//
// with D(TB)_{t-j} = 1(t = TB+1+j). The one-time dummies remove the jump of
// Δỹ at the break (they are needed for the level models; a slope change is
// continuous and has none, Perron 1997 eq. (4) with the DT* detrending). The
// statistic is t_α of step 2 at the break chosen by core.Config.BreakRule:
// 0 minimises t_α, 1 maximises |t_θ| and 2 maximises |t_γ|, the t-ratios of
// step 1 (conventional OLS standard errors). The lag order is chosen at each
// TB by the t-sig rule with kmax = 8 (orders compared on t = kmax+2..T, the
// chosen order re-estimated on t = k+2..T), or fixed, or by AIC/BIC.
// Critical values and p-values come from our own simulation (gen_tables.go):
// the published tables are not available to the project.
//
// Step 1 uses suffix sums (O(1) per candidate); step 2 forms its
// cross-products directly (O(T k²) per candidate).

import (
	"context"
	"math"

	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/schema"
)

func init() {
	core.Register(core.Info{
		ID:       "pao",
		Name:     "Vogelsang-Perron (1998) additive-outlier unit-root test with one endogenous break",
		Null:     paoNull,
		Tail:     "left",
		Citation: "Vogelsang & Perron (1998), Int. Econ. Review 39(4), 1073-1100; Perron (1997), eqs. (3)-(4); Perron & Vogelsang (1992), eqs. (5)-(6)",
		Run:      runPAO,
		NewStat:  newPAOStat,
	})
}

const paoNull = "unit root (with drift) and no structural break: y_t = mu + y_{t-1} + e_t " +
	"(the critical values assume no break under the null)"

// aoSearcher runs the two-step additive-outlier search; scratch is reused.
type aoSearcher struct {
	T                  int
	ys, tau, res       []float64
	s1y, sty, s1t, stt []float64 // suffix sums of y, τy, τ, τ²
	a, b, l, d, z      []float64
	codes              []int
	cols               [][]float64
	nrm                core.Normal
	path               []Candidate
}

func (w *aoSearcher) prepare(y []float64) {
	T := len(y)
	w.T = T
	w.ys = standardize(w.ys, y)
	w.tau = searchGrow(w.tau, T+2)
	w.res = searchGrow(w.res, T+2)
	for _, p := range []*[]float64{&w.s1y, &w.sty, &w.s1t, &w.stt} {
		*p = searchGrow(*p, T+2)
		(*p)[T+1] = 0
	}
	for t := T; t >= 1; t-- {
		tt := (float64(t) - float64(T+1)/2) / float64(T)
		w.tau[t] = tt
		yt := w.ys[t-1]
		w.s1y[t] = w.s1y[t+1] + yt
		w.sty[t] = w.sty[t+1] + tt*yt
		w.s1t[t] = w.s1t[t+1] + tt
		w.stt[t] = w.stt[t+1] + tt*tt
	}
}

// detrend runs step 1 at tb, writes ỹ_t into w.res[1..T] and returns the
// t-ratios of θ and γ (NaN when absent); ok is false for a singular design.
func (w *aoSearcher) detrend(terms Terms, tb int) (tLevel, tSlope float64, st fitStatus) {
	T := w.T
	m := tb + 1
	ftb := (float64(tb) - float64(T+1)/2) / float64(T)
	// Columns: 1, τ, [DU], [DT'] with DT'_t = (τ_t - τ_TB) 1(t > TB).
	codes := [4]int{0, 1, -1, -1}
	K := 2
	iDU, iDT := -1, -1
	if terms.Level {
		iDU = K
		codes[K] = 2
		K++
	}
	if terms.Slope {
		iDT = K
		codes[K] = 3
		K++
	}
	nr := &w.nrm
	nr.Reset(K)
	for i := 0; i < K; i++ {
		for j := 0; j <= i; j++ {
			nr.A[i*K+j] = w.cross(codes[i], codes[j], m, ftb)
		}
		nr.B[i] = w.cross(codes[i], 4, m, ftb)
	}
	nr.YY = 0
	for t := 1; t <= T; t++ {
		nr.YY += w.ys[t-1] * w.ys[t-1]
	}
	nr.N = T
	ssr, err := nr.Solve()
	if err != nil {
		return 0, 0, fitSkip
	}
	if ssr <= ExactFitTol*nr.YY {
		// y is exactly a broken trend: the residuals are rounding noise.
		return 0, 0, fitExact
	}
	c := nr.Coef
	for t := 1; t <= T; t++ {
		f := c[0] + c[1]*w.tau[t]
		if t > tb {
			if iDU >= 0 {
				f += c[iDU]
			}
			if iDT >= 0 {
				f += c[iDT] * (w.tau[t] - ftb)
			}
		}
		w.res[t] = w.ys[t-1] - f
	}
	s2 := ssr / float64(T-K)
	tLevel, tSlope = math.NaN(), math.NaN()
	if iDU >= 0 {
		tLevel = c[iDU] / math.Sqrt(s2*nr.InvDiag(iDU))
	}
	if iDT >= 0 {
		tSlope = c[iDT] / math.Sqrt(s2*nr.InvDiag(iDT))
	}
	return tLevel, tSlope, fitOK
}

// cross returns a cross-product over t = 1..T of the step-1 columns
// (codes 0 const, 1 τ, 2 DU, 3 DT' = (τ_t - τ_TB) 1(t > TB), 4 y) from the
// suffix sums, for a break at TB = m-1 with ftb = τ_TB.
func (w *aoSearcher) cross(a, b, m int, ftb float64) float64 {
	if a > b {
		a, b = b, a
	}
	nm := float64(w.T - m + 1)
	// s1x and stx are Σ_{t>TB} x_t and Σ_{t>TB} τ_t x_t for x = const, τ, y.
	s1x := func(c int) float64 {
		switch c {
		case 0:
			return nm
		case 1:
			return w.s1t[m]
		}
		return w.s1y[m]
	}
	stx := func(c int) float64 {
		switch c {
		case 0:
			return w.s1t[m]
		case 1:
			return w.stt[m]
		}
		return w.sty[m]
	}
	switch {
	case a == 0 && b == 0:
		return float64(w.T)
	case a == 0 && b == 1:
		return w.s1t[1]
	case a == 1 && b == 1:
		return w.stt[1]
	case a == 0 && b == 4:
		return w.s1y[1]
	case a == 1 && b == 4:
		return w.sty[1]
	case a == 2 && b == 2:
		return nm
	case a == 2 && b == 3:
		return w.s1t[m] - ftb*nm
	case a == 3 && b == 3:
		return w.stt[m] - 2*ftb*w.s1t[m] + ftb*ftb*nm
	case a == 2: // DU × y
		return s1x(b)
	case a == 3: // DT' × y
		return stx(b) - ftb*s1x(b)
	case b == 2: // const or τ × DU
		return s1x(a)
	default: // const or τ × DT'
		return stx(a) - ftb*s1x(a)
	}
}

// aoCol fills dst with the step-2 column code over t = s..T: code 0 is
// ỹ_{t-1}, code j >= 1 is Δỹ_{t-j}, code -1-j is D(TB)_{t-j}, and code
// aoDep is Δỹ_t.
const aoDep = 1 << 20

func (w *aoSearcher) fillCol(dst []float64, code, s, tb int) {
	r := w.res
	for i := range dst {
		t := s + i
		switch {
		case code == aoDep:
			dst[i] = r[t] - r[t-1]
		case code == 0:
			dst[i] = r[t-1]
		case code > 0:
			dst[i] = r[t-code] - r[t-code-1]
		default:
			dst[i] = indicator(t == tb+1+(-code-1))
		}
	}
}

// aoCodes lists the step-2 columns: with lagsLast the order is ỹ_{t-1},
// D_0, then (D_j, Δỹ_{t-j}) for j = 1..k, so that each order is a leading
// block ending with its last lag; otherwise dummies, lags, then ỹ_{t-1}.
func aoCodes(dst []int, dummies bool, k int, lagsLast bool) []int {
	dst = dst[:0]
	if lagsLast {
		dst = append(dst, 0)
		if dummies {
			dst = append(dst, -1)
		}
		for j := 1; j <= k; j++ {
			if dummies {
				dst = append(dst, -1-j)
			}
			dst = append(dst, j)
		}
		return dst
	}
	if dummies {
		for j := 0; j <= k; j++ {
			dst = append(dst, -1-j)
		}
	}
	for j := 1; j <= k; j++ {
		dst = append(dst, j)
	}
	return append(dst, 0)
}

// system fills a (lower triangle) and b with the cross-products of the
// columns codes with each other and with Δỹ_t over t = s..T, and returns y'y.
func (w *aoSearcher) system(a, b []float64, codes []int, s, tb int) float64 {
	n := w.T - s + 1
	K := len(codes)
	if len(w.cols) < K+1 {
		w.cols = append(w.cols, make([][]float64, K+1-len(w.cols))...)
	}
	for i := 0; i <= K; i++ {
		w.cols[i] = searchGrow(w.cols[i], n)
		code := aoDep
		if i < K {
			code = codes[i]
		}
		w.fillCol(w.cols[i], code, s, tb)
	}
	dep := w.cols[K]
	for i := 0; i < K; i++ {
		for j := 0; j <= i; j++ {
			a[i*K+j] = searchDot(w.cols[i], w.cols[j])
		}
		b[i] = searchDot(w.cols[i], dep)
	}
	return searchDot(dep, dep)
}

// at runs both steps at tb.
func (w *aoSearcher) at(spec *Spec, tb int) (Candidate, fitStatus) {
	tl, ts, st := w.detrend(spec.Terms, tb)
	if st != fitOK {
		return Candidate{}, st
	}
	dummies := spec.Terms.Level
	codes := w.codes
	k := spec.Lags
	if spec.LagRule != core.LagFixed {
		kk := spec.MaxLags
		codes = aoCodes(codes, dummies, kk, true)
		K := len(codes)
		w.a, w.b = searchGrow(w.a, K*K), searchGrow(w.b, K)
		w.l, w.d, w.z = searchGrow(w.l, K*K), searchGrow(w.d, K), searchGrow(w.z, K)
		yy := w.system(w.a, w.b, codes, kk+2, tb)
		rank := cholPrefix(w.a, w.b, K, w.l, w.d, w.z)
		per := 1
		i0 := 0 // position of the last column of order 0
		if dummies {
			per, i0 = 2, 1
		}
		if rank <= i0 {
			return Candidate{}, fitSkip
		}
		kTop := min((rank-1-i0)/per, kk)
		n := float64(w.T - kk - 1)
		z := w.z
		k = 0
		switch spec.LagRule {
		case core.LagAIC, core.LagBIC:
			pen := 2.0
			if spec.LagRule == core.LagBIC {
				pen = math.Log(n)
			}
			ssr, best := yy, math.Inf(1)
			for j := 0; j <= i0; j++ {
				ssr -= z[j] * z[j]
			}
			for kc := 0; kc <= kTop; kc++ {
				if kc > 0 {
					for j := i0 + per*(kc-1) + 1; j <= i0+per*kc; j++ {
						ssr -= z[j] * z[j]
					}
				}
				if ssr <= ExactFitTol*yy {
					return Candidate{}, fitExact
				}
				if ic := math.Log(ssr/n) + pen*float64(i0+per*kc+1)/n; ic < best {
					best, k = ic, kc
				}
			}
		default:
			ssr := yy
			for j := 0; j <= i0+per*kTop; j++ {
				ssr -= z[j] * z[j]
			}
			if ssr <= ExactFitTol*yy {
				// The largest order fits exactly, hence (nested) the t-ratios
				// of the orders tested first are not statistics.
				return Candidate{}, fitExact
			}
			for kc := kTop; kc >= 1; kc-- {
				i := i0 + per*kc
				df := n - float64(i+1)
				if ssr > 0 && df > 0 && math.Abs(z[i])/math.Sqrt(ssr/df) > TSigCritical {
					k = kc
					break
				}
				for j := i0 + per*(kc-1) + 1; j <= i; j++ {
					ssr += z[j] * z[j]
				}
			}
		}
	}
	codes = aoCodes(codes, dummies, k, false)
	w.codes = codes
	K := len(codes)
	nr := &w.nrm
	nr.Reset(K)
	nr.YY = w.system(nr.A, nr.B, codes, k+2, tb)
	nr.N = w.T - k - 1
	ssr, err := nr.Solve()
	df := float64(nr.N - K)
	if err != nil || df <= 0 {
		return Candidate{}, fitSkip
	}
	if ssr <= ExactFitTol*nr.YY {
		return Candidate{}, fitExact
	}
	tA := nr.Coef[K-1] / math.Sqrt(ssr/df*nr.InvDiag(K-1))
	if math.IsNaN(tA) || math.IsInf(tA, 0) {
		return Candidate{}, fitSkip
	}
	return Candidate{TB: tb, Lags: k, NObs: nr.N, Alpha: 1 + nr.Coef[K-1], TAlpha: tA,
		TLevel: tl, TSlope: ts, TDummy: math.NaN()}, fitOK
}

// search runs the AO search over the candidates of spec (TB >= kmax+2).
func (w *aoSearcher) search(y []float64, spec *Spec, path bool) (Candidate, []Candidate, error) {
	w.prepare(y)
	T := w.T
	lo, hi := max(spec.Lo, spec.kmax()+2, MinHead), min(spec.Hi, T-MinTail)
	w.path = w.path[:0]
	best := Candidate{TB: -1}
	if lo > hi {
		return best, nil, core.Errorf("", core.ErrTooShort, "no break candidate with T=%d and %d lags (first %d, last %d)", T, spec.kmax(), lo, hi)
	}
	bestScore := math.Inf(1)
	var exact exactSet
	for tb := lo; tb <= hi; tb++ {
		c, st := w.at(spec, tb)
		if st == fitExact {
			exact.add([]int{tb})
			continue
		}
		if st != fitOK {
			continue
		}
		if path {
			w.path = append(w.path, c)
		}
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
		return best, nil, core.Errorf("", core.ErrSingular, "the regression is singular at every break candidate")
	}
	if path {
		return best, w.path, nil
	}
	return best, nil, nil
}

func paoSpec(cfg *core.Config, T int) (Spec, error) {
	const id = "pao"
	rule, err := breakRuleOf(id, cfg)
	if err != nil {
		return Spec{}, err
	}
	spec, err := ioSpec(id, cfg, T, cfg.Shift != core.ShiftSlope)
	spec.Rule = rule
	return spec, err
}

func runPAO(ctx context.Context, y []float64, cfg *core.Config) (*schema.Result, error) {
	if cfg == nil {
		cfg = &core.Config{}
	}
	const id = "pao"
	if err := CheckSeries(id, y, ioMinObs); err != nil {
		return nil, err
	}
	spec, err := paoSpec(cfg, len(y))
	if err != nil {
		return nil, err
	}
	var w aoSearcher
	best, path, err := w.search(y, &spec, !cfg.NoPath)
	if err != nil {
		return nil, WrapError(id, err)
	}
	res := ioResult(id, y, cfg, &spec, best, path)
	delete(res.Estimates, "t_dummy")
	res.Null = paoNull
	res.Variant = "additive outlier, model " + modelName(cfg.Shift) + ", break by " + spec.Rule.String()
	finishSimulated(res, id, cfg, spec.Rule)
	if err := ctx.Err(); err != nil {
		return nil, core.Errorf(id, core.ErrCancelled, "%v", err)
	}
	if info, err := core.Lookup(id); err == nil {
		if err := core.AddSimulated(ctx, info, len(y), cfg, res); err != nil {
			return nil, WrapError(id, err)
		}
	}
	return res, nil
}

func newPAOStat(T int, cfg *core.Config) core.StatFunc {
	if cfg == nil {
		cfg = &core.Config{}
	}
	spec, err := paoSpec(cfg, T)
	var w aoSearcher
	return func(y []float64) (float64, error) {
		if err != nil {
			return 0, err
		}
		if len(y) != T {
			return 0, core.Errorf("pao", core.ErrSettings, "series length %d, statistic prepared for %d", len(y), T)
		}
		if err := CheckSeries("pao", y, ioMinObs); err != nil {
			return 0, err
		}
		c, _, err := w.search(y, &spec, false)
		if err != nil {
			return 0, WrapError("pao", err)
		}
		return c.TAlpha, nil
	}
}
