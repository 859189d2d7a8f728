package core

// KPSS stationarity test (id "kpss").
//
// Kwiatkowski, D., Phillips, P.C.B., Schmidt, P. & Shin, Y. (1992), "Testing
// the null hypothesis of stationarity against the alternative of a unit
// root", J. Econometrics 54, 159-178. With e_t the OLS residuals of y on a
// constant (η_μ, level stationarity) or on a constant and t (η_τ, trend
// stationarity) and S_t = Σ_{i≤t} e_i (eq. 8),
//
//	η = T⁻² Σ_t S_t² / s²(l),
//
// s²(l) the long-run variance of e (eq. 10: Bartlett weights 1 - s/(l+1)).
// The bandwidth l is cfg.Bandwidth with BandwidthFixed, otherwise automatic
// (Newey & West 1994 by default, Andrews 1991 on request; see lrv.go).
// TrendNone is not defined for KPSS and is treated as the level case.
//
// Critical values: KPSS (1992) Table 1. p-value: interpolation in rootshift's
// simulated asymptotic distribution table (pvalue.go), upper tail.

import (
	"context"
	"math"
	"math/rand/v2"

	"github.com/rootshift/rootshift/core/schema"
)

const (
	kpssNullLevel = "the series is stationary around a constant level"
	kpssNullTrend = "the series is stationary around a linear trend"
)

// KPSSSource cites the KPSS critical values.
const KPSSSource = "Kwiatkowski, Phillips, Schmidt & Shin (1992), J. Econometrics 54, Table 1 (asymptotic)"

// kpssTable1 is KPSS (1992) Table 1, upper-tail asymptotic critical values
// (shared reference §4a, SEEN-S).
var kpssTable1 = map[bool]map[string]float64{
	false: {"0.10": 0.347, "0.05": 0.463, "0.025": 0.574, "0.01": 0.739}, // η_μ
	true:  {"0.10": 0.119, "0.05": 0.146, "0.025": 0.176, "0.01": 0.216}, // η_τ
}

func init() {
	Register(Info{
		ID:       "kpss",
		Name:     "KPSS stationarity test",
		Null:     kpssNullLevel + " (or a linear trend with trend=linear)",
		Tail:     "right",
		Citation: "Kwiatkowski, Phillips, Schmidt & Shin (1992), J. Econometrics 54, eqs. (8)-(10)",
		Run:      runKPSS,
		NewStat:  newKPSSStat,
		Generate: WhiteNoise,
	})
}

// WhiteNoise fills dst with independent standard normal draws (the KPSS
// null data-generating process for simulation).
func WhiteNoise(dst []float64, r *rand.Rand) {
	for i := range dst {
		dst[i] = r.NormFloat64()
	}
}

// KPSSWork computes KPSS statistics reusing storage.
type KPSSWork struct {
	e []float64
}

// Stat returns η and the bandwidth used for y with trend (TrendLinear: η_τ,
// otherwise η_μ). Errors wrap ErrTooShort, ErrSettings, ErrNonFinite or
// ErrNoEstimate.
func (w *KPSSWork) Stat(y []float64, trend Trend, kernel Kernel, rule BandwidthRule, bw float64) (eta, used float64, err error) {
	det := TrendConstant
	if trend == TrendLinear {
		det = TrendLinear
	}
	w.e = Detrend(w.e, y, det)
	lrv, used, err := LongRunVariance(w.e, kernel, rule, bw)
	if err != nil {
		return 0, used, err
	}
	T := float64(len(y))
	// Σ S_t² with S_t the partial sums, unrolled by four (the same
	// additions in the same order; see DotFrom).
	s, ss := 0.0, 0.0
	e := w.e
	for len(e) >= 4 {
		a := (*[4]float64)(e)
		s += a[0]
		ss += s * s
		s += a[1]
		ss += s * s
		s += a[2]
		ss += s * s
		s += a[3]
		ss += s * s
		e = e[4:]
	}
	for _, v := range e {
		s += v
		ss += s * s
	}
	eta = ss / (T * T * lrv)
	if math.IsNaN(eta) || math.IsInf(eta, 0) {
		return 0, used, ErrNoEstimate
	}
	return eta, used, nil
}

func runKPSS(ctx context.Context, y []float64, cfg *Config) (*schema.Result, error) {
	const id = "kpss"
	if cfg == nil {
		cfg = &Config{}
	}
	if err := dfCheck(id, y, minDFObs); err != nil {
		return nil, err
	}
	var w KPSSWork
	eta, bw, err := w.Stat(y, cfg.Trend, cfg.Kernel, cfg.BandwidthRule, cfg.Bandwidth)
	if err != nil {
		return nil, dfWrap(id, err)
	}
	trendCase := cfg.Trend == TrendLinear
	level := cfg.LevelOr()
	res := &schema.Result{
		Test:      id,
		Trend:     "constant",
		Statistic: schema.F(eta),
		Tail:      "right",
		NObs:      len(y),
		Null:      kpssNullLevel,
		Level:     level,
		Bandwidth: &bw,
		Kernel:    cfg.Kernel.String(),
	}
	tab := "kpss/constant"
	if trendCase {
		res.Trend, res.Null, tab = "linear", kpssNullTrend, "kpss/linear"
	}
	if cfg.Trend == TrendNone {
		res.Warnings = append(res.Warnings, "trend none is not defined for KPSS; the level-stationarity statistic η_μ (constant) was computed")
	}
	if cfg.Kernel == KernelBartlett {
		res.Lags = int(bw) // the lag truncation l of KPSS (1992)
	}
	p, bounded := TablePValue(tab, eta, true)
	res.PValue = schema.F(p)
	res.PValueMethod = boundedNote(TableMethod("the KPSS statistic (white-noise null)"), bounded, p)
	res.CriticalValues = map[string]float64{}
	for k, v := range kpssTable1[trendCase] {
		res.CriticalValues[k] = v
	}
	res.CriticalSource = KPSSSource
	res.Reject = res.PValue != nil && p < level
	res.Estimates = map[string]float64{"bandwidth": bw}
	if err := AddSimulated(ctx, dfInfo(id), len(y), cfg, res); err != nil {
		return nil, dfWrap(id, err)
	}
	return res, nil
}

func newKPSSStat(T int, cfg *Config) StatFunc {
	c := *cfg
	var w KPSSWork
	return func(y []float64) (float64, error) {
		eta, _, err := w.Stat(y, c.Trend, c.Kernel, c.BandwidthRule, c.Bandwidth)
		return eta, err
	}
}
