// Package core holds rootshift's numerics: one least-squares kernel shared by
// every test, deterministic terms, augmentation-lag selection, long-run
// variance estimation, the standard unit-root and stationarity tests (ADF,
// Phillips-Perron, KPSS, DF-GLS, ERS point-optimal, Ng-Perron M-tests), the
// right-tailed explosive-root tests, the seasonal unit-root test (HEGY
// quarterly, Beaulieu-Miron monthly) and the Seasonality diagnosis,
// inference from published response surfaces, and the Monte Carlo engine
// that gives finite-sample p-values to every test, the break-aware ones in
// package breaks included.
//
// # Conventions
//
//   - Series are []float64 in time order; inputs are never modified.
//   - NaN or ±Inf in an input is an error, never a result: a statistic that
//     cannot be computed is reported as an error with context.
//   - Observations are counted from 1 in everything a user sees; the trend
//     regressor is the observation number t = 1..T of the series passed in.
//   - With fixed lags K a Dickey-Fuller-type regression uses every observation
//     for which all its terms exist: t = K+2..T.
//   - With a lag rule, candidate lag orders 0..kmax are compared on the common
//     sample t = kmax+2..T (Ng & Perron 2001, p. 1529), and the chosen order is
//     then re-estimated on t = k+2..T.
//   - Settings structs (Config) mean the documented default at their zero value.
//   - Results are schema.Result values, which marshal to the v1 JSON schema.
//   - Cross-product fast paths centre and scale their columns before forming
//     X'X and are checked against the Householder QR fit in the tests.
//
// # References
//
// Dickey, D.A. & Fuller, W.A. (1979), JASA 74, 427-431.
// Said, S.E. & Dickey, D.A. (1984), Biometrika 71, 599-607.
// Phillips, P.C.B. & Perron, P. (1988), Biometrika 75, 335-346.
// Kwiatkowski, D., Phillips, P.C.B., Schmidt, P. & Shin, Y. (1992), J. Econometrics 54, 159-178.
// Elliott, G., Rothenberg, T.J. & Stock, J.H. (1996), Econometrica 64, 813-836.
// Ng, S. & Perron, P. (1995), JASA 90, 268-281; (2001), Econometrica 69, 1519-1554.
// Schwert, G.W. (1989), JBES 7, 147-159.
// Newey, W.K. & West, K.D. (1994), Rev. Econ. Studies 61, 631-653.
// Andrews, D.W.K. (1991), Econometrica 59, 817-858.
// MacKinnon, J.G. (2010), Queen's Economics Department WP 1227.
// Phillips, P.C.B., Wu, Y. & Yu, J. (2011), Int. Econ. Review 52, 201-226.
// Phillips, P.C.B., Shi, S. & Yu, J. (2015), Int. Econ. Review 56, 1043-1078.
// Hylleberg, S., Engle, R.F., Granger, C.W.J. & Yoo, B.S. (1990), J. Econometrics 44, 215-238.
// Beaulieu, J.J. & Miron, J.A. (1993), J. Econometrics 55, 305-328.
// Ghysels, E., Lee, H.S. & Noh, J. (1994), J. Econometrics 62, 415-442.
package core
