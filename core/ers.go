package core

// Point-optimal unit-root test P_T of Elliott, Rothenberg & Stock (1996),
// Econometrica 64, 813-836, eq. (9) with the long-run variance in place of
// σ² (their eq. (12)):
//
//	P_T = [S(ᾱ) - ᾱ S(1)] / ω̂²,   ᾱ = 1 + c̄/T,
//
// where S(a) is the sum of squared residuals of the a-quasi-differenced
// regression of y on its deterministic terms (gls.go; c̄ = -7 with a
// constant, -13.5 with a linear trend) and ω̂² is the autoregressive
// spectral density estimate at frequency zero σ̂²_k/(1 - Σγ̂_i)² from the
// DF-GLS regression with k chosen by MAIC (Ng & Perron 2001, p. 1524).
// Small values reject the unit root (left tail).
//
// Inference: critical values and p-value from our simulated quantile
// response surfaces (gls_tables.go); their asymptotic rows reproduce ERS
// (1996) Table 1 (see ers_test.go).

import (
	"context"

	"github.com/rootshift/rootshift/core/schema"
)

func init() {
	Register(Info{
		ID:       "ers",
		Name:     "ERS point-optimal P_T",
		Null:     ersNull,
		Tail:     "left",
		Citation: "Elliott, Rothenberg & Stock (1996), Econometrica 64, 813-836, eqs. (9) and (12); spectral estimate and MAIC lags, Ng & Perron (2001), Econometrica 69, 1519-1554",
		Run:      RunERS,
		NewStat:  glsNewStat(func(s *GLSStats) float64 { return s.PT }),
	})
}

const ersNull = "the series has a unit root (α = 1 against the point alternative ᾱ = 1 + c̄/T)"

// RunERS runs the ERS point-optimal test on y with cfg (nil: defaults).
// Errors are *Error with Test "ers" wrapping ErrTooShort, ErrNonFinite,
// ErrConstant, ErrSingular, ErrSettings, ErrNoEstimate or ErrCancelled.
func RunERS(ctx context.Context, y []float64, cfg *Config) (*schema.Result, error) {
	if cfg == nil {
		cfg = &Config{}
	}
	res, st, err := glsRun(ctx, "ers", glsPT, y, cfg, func(s *GLSStats) float64 { return s.PT })
	if err != nil {
		return nil, err
	}
	res.Null = ersNull
	res.Estimates["s_alpha_over_s_1"] = st.SSRAlpha / st.SSR1
	info, _ := Lookup("ers")
	if err := AddSimulated(ctx, info, len(y), cfg, res); err != nil {
		return nil, &Error{Test: "ers", Err: err}
	}
	return res, nil
}
