// Package breaks holds rootshift's break-aware unit-root and structural-change
// tests: known-break and endogenous-break Dickey-Fuller-type tests, LM tests
// with breaks, and multiple-break estimation, with the fast cross-product
// break search they share.
//
// Each test registers itself with core.Register under its id (p89, za, pio,
// pao, ...) and returns a schema.Result.
//
// # Conventions
//
//   - Series are []float64 in time order; inputs are never modified. NaN or
//     ±Inf in an input, a constant series, a sample too short for the
//     trimming and lags, or a collinear design is returned as a *core.Error
//     carrying the test id and a core sentinel (ErrNonFinite, ErrConstant,
//     ErrTooShort, ErrSingular, ErrSettings); no NaN is reported as a statistic.
//   - Observations are counted from 1; the trend regressor is t = 1..T.
//   - A break date TB is the last observation of the old regime. The break
//     regressors are the level shift DU_t = 1(t > TB), the slope shift
//     DT_t = (t - TB) 1(t > TB) and the one-time dummy D(TB)_t = 1(t = TB+1).
//   - Trimming: break candidates run over TB = lo..hi with
//     lo = max(ceil(trim T), 2) and hi = min(floor((1-trim) T), T-2), trim
//     being core.Config.Trim (default 0.15); see Candidates. A
//     Dickey-Fuller-type search further starts at TB = kmax+2 so that both
//     regimes are in every regression sample.
//   - With fixed lags K (core.LagFixed) a Dickey-Fuller-type regression uses
//     every observation where all its terms exist: t = K+2..T.
//   - With a lag rule, the order is chosen per break candidate where the
//     paper does so (Zivot & Andrews 1992 and Perron 1997 choose k for each
//     TB by the general-to-specific t-sig rule with kmax = 8); orders 0..kmax
//     are compared on the common sample t = kmax+2..T, as in package core, and
//     the chosen order is re-estimated on t = k+2..T. A known-break test
//     (p89) chooses k once, at the given TB.
//   - Break searches run on the standardised series (core.Standardize): the
//     statistics are invariant to affine transforms of y when the model has a
//     constant. The fast search updates only the break columns of the
//     cross-products per candidate from suffix sums and is checked in the
//     tests against a full Householder QR refit at every candidate.
//
// # References
//
// Perron, P. (1989), "The Great Crash, the Oil Price Shock, and the Unit Root
// Hypothesis", Econometrica 57(6), 1361-1401.
// Zivot, E. & Andrews, D.W.K. (1992), "Further Evidence on the Great Crash,
// the Oil-Price Shock, and the Unit-Root Hypothesis", JBES 10(3), 251-270.
// Perron, P. & Vogelsang, T.J. (1992), "Nonstationarity and Level Shifts With
// an Application to Purchasing Power Parity", JBES 10(3), 301-320.
// Perron, P. (1997), "Further Evidence on Breaking Trend Functions in
// Macroeconomic Variables", J. Econometrics 80(2), 355-385.
// Vogelsang, T.J. & Perron, P. (1998), "Additional Tests for a Unit Root
// Allowing for a Break in the Trend Function at an Unknown Time", Int.
// Econ. Review 39(4), 1073-1100.
// Ng, S. & Perron, P. (1995), JASA 90, 268-281.
package breaks
