package core

// DF-GLS test of Elliott, Rothenberg & Stock (1996), Econometrica 64,
// 813-836, section 5: the Dickey-Fuller regression without deterministic
// terms on the GLS-detrended series ỹ (gls.go),
//
//	Δỹ_t = ρ ỹ_{t-1} + Σ_{i=1..k} γ_i Δỹ_{t-i} + e_t,   t = k+2..T,   (ERS eq. (6))
//
// with the t-ratio of ρ as the statistic (left tail). The lag order k
// defaults to the modified AIC of Ng & Perron (2001, eq. (9)) computed on the
// GLS-detrended series, with Schwert's maximum.
//
// Inference: with a constant the DF-GLS t has the Dickey-Fuller
// no-constant limit (ERS 1996, section 5), and the reported critical values
// are those of MacKinnon's (2010, Table 2) τ_nc response surface at the
// number of observations in the regression. With a linear trend they come
// from our simulation, whose asymptotic and T = 100 rows reproduce ERS (1996)
// Table 1 (see dfgls_test.go). The p-value is interpolated in our simulated
// quantile response surfaces (gls_tables.go) in both cases.

import (
	"context"

	"github.com/rootshift/rootshift/core/schema"
)

func init() {
	Register(Info{
		ID:       "dfgls",
		Name:     "DF-GLS (Elliott-Rothenberg-Stock)",
		Null:     dfglsNull,
		Tail:     "left",
		Citation: "Elliott, Rothenberg & Stock (1996), Econometrica 64, 813-836, section 5, eq. (6); lags by MAIC, Ng & Perron (2001), Econometrica 69, 1519-1554, eq. (9)",
		Run:      RunDFGLS,
		NewStat:  glsNewStat(func(s *GLSStats) float64 { return s.TStat }),
	})
}

const dfglsNull = "the series has a unit root (ρ = 0 in the DF-GLS regression on the GLS-detrended series)"

// RunDFGLS runs the DF-GLS test on y with cfg (nil: defaults). Errors are
// *Error with Test "dfgls" wrapping ErrTooShort, ErrNonFinite, ErrConstant,
// ErrSingular, ErrSettings, ErrNoEstimate or ErrCancelled.
func RunDFGLS(ctx context.Context, y []float64, cfg *Config) (*schema.Result, error) {
	if cfg == nil {
		cfg = &Config{}
	}
	res, st, err := glsRun(ctx, "dfgls", glsDFGLS, y, cfg, func(s *GLSStats) float64 { return s.TStat })
	if err != nil {
		return nil, err
	}
	res.Null = dfglsNull
	if cv, src, ok := dfglsMacKinnon(cfg.Trend, st.NObs); ok {
		res.CriticalValues, res.CriticalSource = cv, src
	}
	info, _ := Lookup("dfgls")
	if err := AddSimulated(ctx, info, len(y), cfg, res); err != nil {
		return nil, &Error{Test: "dfgls", Err: err}
	}
	return res, nil
}

// dfglsMacKinnon returns, for a constant (or no deterministic term), the
// MacKinnon (2010) τ_nc critical values at nobs observations in the
// regression; ok is false for a linear trend.
func dfglsMacKinnon(det Trend, nobs int) (cv map[string]float64, src string, ok bool) {
	if det == TrendLinear {
		return nil, "", false
	}
	return MacKinnonCriticalValues(TrendNone, nobs),
		"Dickey-Fuller no-constant case (ERS 1996, section 5): " + MacKinnonSource + " (case nc)", true
}
