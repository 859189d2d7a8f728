package core

// Phillips-Perron test (id "pp").
//
// Phillips, P.C.B. & Perron, P. (1988), "Testing for a unit root in time
// series regression", Biometrika 75, 335-346: the Dickey-Fuller regression
// without lagged differences,
//
//	Δy_t = det_t'δ + ρ y_{t-1} + u_t,   t = 2..T  (n = T-1 observations),
//
// with the t-ratio and normalized bias corrected nonparametrically for serial
// correlation in u (the paper's Z(α) and Z(t), written in the regression form
// with fitted deterministic terms):
//
//	Z(α) = n ρ̂ - ½ (n² σ̂²_ρ / s²) (λ̂² - γ̂0),
//	Z(t) = √(γ̂0/λ̂²) t_ρ - ½ (λ̂² - γ̂0)/λ̂ · n σ̂_ρ / s,
//
// where γ̂0 = (1/n) Σ û_t², s² = Σ û_t²/(n - K) (K regressors), σ̂_ρ the OLS
// standard error of ρ̂, t_ρ = ρ̂/σ̂_ρ, and λ̂² the long-run variance of û
// (lrv.go; Bartlett kernel with the Newey & West (1994) bandwidth unless cfg
// says otherwise).
//
// Z(t) has the Dickey-Fuller τ limit: critical values from MacKinnon (2010)
// and p-values as for ADF (pvalue.go). Z(α) has the Dickey-Fuller normalized
// bias limit; no source of its quantiles is available to the project, so its
// critical values and p-values come from rootshift's own simulated asymptotic
// table (disttables_gen.go).

import (
	"context"
	"fmt"
	"math"

	"github.com/rootshift/rootshift/core/schema"
)

const ppNull = "the series has a unit root (ρ = 0 in the Dickey-Fuller regression)"

func init() {
	Register(Info{
		ID:       "pp",
		Name:     "Phillips-Perron",
		Null:     ppNull,
		Tail:     "left",
		Citation: "Phillips & Perron (1988), Biometrika 75, 335-346: Z(α) and Z(t)",
		Run:      runPP,
		NewStat:  newPPStat,
	})
}

// PPStats holds the Phillips-Perron statistics and their ingredients.
type PPStats struct {
	// ZAlpha and ZT are the corrected normalized bias and t-ratio.
	ZAlpha, ZT float64
	// Rho is ρ̂, TStat the uncorrected t-ratio.
	Rho, TStat float64
	// Gamma0 is γ̂0 = SSR/n, LRV is λ̂², Bandwidth the bandwidth used.
	Gamma0, LRV, Bandwidth float64
	// NObs is n = T-1.
	NObs int
}

// PhillipsPerron computes the Phillips-Perron statistics of y with
// deterministic terms trend, using w for the regression. Errors wrap the
// sentinels of DFWork.Regress and LongRunVariance.
func PhillipsPerron(w *DFWork, y []float64, trend Trend, kernel Kernel, rule BandwidthRule, bw float64) (PPStats, error) {
	f, err := w.Regress(y, trend, 0, 0)
	if err != nil {
		return PPStats{}, err
	}
	u := f.Fit.Resid
	n := float64(f.NObs)
	g0 := f.SSR / n
	lrv, b, err := LongRunVariance(u, kernel, rule, bw)
	if err != nil {
		return PPStats{}, err
	}
	s := math.Sqrt(f.Sigma2)
	st := PPStats{Rho: f.Rho, TStat: f.TStat, Gamma0: g0, LRV: lrv, Bandwidth: b, NObs: f.NObs}
	st.ZAlpha = n*f.Rho - 0.5*(n*n*f.SE*f.SE/f.Sigma2)*(lrv-g0)
	st.ZT = math.Sqrt(g0/lrv)*f.TStat - 0.5*(lrv-g0)/math.Sqrt(lrv)*n*f.SE/s
	if math.IsNaN(st.ZT) || math.IsInf(st.ZT, 0) || math.IsNaN(st.ZAlpha) || math.IsInf(st.ZAlpha, 0) {
		return st, fmt.Errorf("%w: Phillips-Perron statistic is not finite", ErrNoEstimate)
	}
	return st, nil
}

// zaTableName is the generated normalized-bias table for trend.
func zaTableName(trend Trend) string {
	switch trend {
	case TrendNone:
		return "df-bias/none"
	case TrendLinear:
		return "df-bias/linear"
	}
	return "df-bias/constant"
}

func runPP(ctx context.Context, y []float64, cfg *Config) (*schema.Result, error) {
	const id = "pp"
	if cfg == nil {
		cfg = &Config{}
	}
	if err := dfCheck(id, y, minDFObs); err != nil {
		return nil, err
	}
	var w DFWork
	st, err := PhillipsPerron(&w, y, cfg.Trend, cfg.Kernel, cfg.BandwidthRule, cfg.Bandwidth)
	if err != nil {
		return nil, dfWrap(id, err)
	}
	level := cfg.LevelOr()
	bw := st.Bandwidth
	res := &schema.Result{
		Test:      id,
		Variant:   "Z(t)",
		Trend:     cfg.Trend.String(),
		Statistic: schema.F(st.ZT),
		Tail:      "left",
		Lags:      0,
		NObs:      st.NObs,
		Null:      ppNull,
		Level:     level,
		Bandwidth: &bw,
		Kernel:    cfg.Kernel.String(),
	}
	p, bounded := DFPValue(st.ZT, cfg.Trend, st.NObs, false)
	res.PValue = schema.F(p)
	res.PValueMethod = boundedNote(DFPValueMethod(false), bounded, p)
	res.CriticalValues = MacKinnonCriticalValues(cfg.Trend, st.NObs)
	res.CriticalSource = MacKinnonSource + " (Z(t) has the Dickey-Fuller τ limit)"
	res.Reject = res.PValue != nil && p < level

	za := zaTableName(cfg.Trend)
	pa, _ := TablePValue(za, st.ZAlpha, false)
	cva := map[string]float64{}
	for _, a := range []float64{0.01, 0.025, 0.05, 0.10} {
		cva[schema.LevelKey(a)] = TableQuantile(za, a)
	}
	res.Components = []schema.Component{
		{Name: "Z(alpha)", Statistic: schema.F(st.ZAlpha), PValue: schema.F(pa), CriticalValues: cva, Tail: "left", Reject: pa < level},
		{Name: "Z(t)", Statistic: schema.F(st.ZT), PValue: res.PValue, CriticalValues: res.CriticalValues, Tail: "left", Reject: res.Reject},
	}
	res.Estimates = map[string]float64{
		"rho":               1 + st.Rho,
		"rho_minus_1":       st.Rho,
		"t_rho":             st.TStat,
		"gamma0":            st.Gamma0,
		"long_run_variance": st.LRV,
	}
	res.PValueMethod += "; Z(alpha) component: " + TableMethod("the Dickey-Fuller normalized bias n·ρ̂") + " (its critical values too; no published source available to the project)"
	if err := AddSimulated(ctx, dfInfo(id), len(y), cfg, res); err != nil {
		return nil, dfWrap(id, err)
	}
	return res, nil
}

func newPPStat(T int, cfg *Config) StatFunc {
	c := *cfg
	var w DFWork
	return func(y []float64) (float64, error) {
		st, err := PhillipsPerron(&w, y, c.Trend, c.Kernel, c.BandwidthRule, c.Bandwidth)
		if err != nil {
			return 0, err
		}
		return st.ZT, nil
	}
}
