package core

// Ng & Perron (2001) M-tests on GLS-detrended data: Ng, S. & Perron, P.
// (2001), "Lag length selection and the construction of unit root tests
// with good size and power", Econometrica 69, 1519-1554, eqs. (4)-(6) and
// the MPT formula on p. 1524; the M statistics are those of Perron & Ng
// (1996), Review of Economic Studies 63, 435-463, built here on ỹ and the
// autoregressive spectral estimate s²_AR. With κ = T⁻² Σ_{t=2..T} ỹ²_{t-1}:
//
//	MZa = (T⁻¹ ỹ_T² - s²_AR) / (2κ)
//	MSB = (κ / s²_AR)^{1/2}
//	MZt = MZa · MSB
//	MPT = (c̄² κ - c̄ T⁻¹ ỹ_T²) / s²_AR          (constant, c̄ = -7)
//	MPT = (c̄² κ + (1 - c̄) T⁻¹ ỹ_T²) / s²_AR    (linear trend, c̄ = -13.5)
//
// s²_AR = σ̂²_k/(1 - Σγ̂_i)² from the DF-GLS regression with k chosen by
// MAIC (Ng & Perron 2001, eq. (9)). All four reject for small values.
//
// The Result's Statistic is MZt (Variant "MZt"); Components carry all four
// with their own critical values, p-values and decisions. Inference is from
// our simulated quantile response surfaces (gls_tables.go), whose
// asymptotic rows reproduce Ng & Perron (2001) Table 1 (see mtests_test.go).

import (
	"context"

	"github.com/rootshift/rootshift/core/schema"
)

func init() {
	Register(Info{
		ID:       "mtests",
		Name:     "Ng-Perron M-tests (MZa, MZt, MSB, MPT)",
		Null:     mtestsNull,
		Tail:     "left",
		Citation: "Ng & Perron (2001), Econometrica 69, 1519-1554, eqs. (4)-(6), (9) and p. 1524; Perron & Ng (1996), Review of Economic Studies 63, 435-463",
		Run:      RunMTests,
		NewStat:  glsNewStat(func(s *GLSStats) float64 { return s.MZt }),
	})
}

const mtestsNull = "the series has a unit root (M statistics on the GLS-detrended series)"

// RunMTests runs the Ng-Perron M-tests on y with cfg (nil: defaults). The
// Result's Statistic, p-value and decision are those of MZt; Components
// holds MZa, MZt, MSB and MPT. Errors are *Error with Test "mtests"
// wrapping ErrTooShort, ErrNonFinite, ErrConstant, ErrSingular,
// ErrSettings, ErrNoEstimate or ErrCancelled.
func RunMTests(ctx context.Context, y []float64, cfg *Config) (*schema.Result, error) {
	if cfg == nil {
		cfg = &Config{}
	}
	res, st, err := glsRun(ctx, "mtests", glsMZt, y, cfg, func(s *GLSStats) float64 { return s.MZt })
	if err != nil {
		return nil, err
	}
	res.Null = mtestsNull
	res.Variant = "MZt"
	res.PValueMethod = "MZt: " + res.PValueMethod
	level := res.Level
	for _, c := range []struct {
		name string
		s    glsStat
		v    float64
	}{{"MZa", glsMZa, st.MZa}, {"MZt", glsMZt, st.MZt}, {"MSB", glsMSB, st.MSB}, {"MPT", glsMPT, st.MPT}} {
		p, clip := glsPValue(c.s, cfg.Trend, st.T, c.v)
		comp := schema.Component{
			Name:           c.name,
			Statistic:      schema.F(c.v),
			PValue:         &p,
			CriticalValues: glsCritical(c.s, cfg.Trend, st.T),
			Tail:           "left",
			Reject:         p < level,
		}
		if clip != 0 && c.s != glsMZt {
			for _, w := range glsWarnings(glsTableLengths[0], clip) {
				res.Warnings = append(res.Warnings, c.name+": "+w)
			}
		}
		res.Components = append(res.Components, comp)
	}
	info, _ := Lookup("mtests")
	if err := AddSimulated(ctx, info, len(y), cfg, res); err != nil {
		return nil, &Error{Test: "mtests", Err: err}
	}
	return res, nil
}
