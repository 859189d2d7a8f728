// Package battery is the one entry point that every front end of rootshift
// calls: the CLI (`rootshift test`, `rootshift demo`), the batch mode and
// the offline page (through package wasm/bridge). It turns the analyst's
// schema.Settings into per-test core.Config values, runs the chosen tests —
// or the default battery — on every selected series, and forms the verdict:
// one defensible class, order of integration and recommended transformation
// per series, with the results that support and contradict it.
//
// # Conventions
//
//   - Settings are validated once (Validate); usage errors are returned as
//     errors, problems with one series are recorded in that series' Errors
//     and never stop the others.
//   - Break dates, windows and sample ranges given as dates are resolved
//     against the series' own date labels; observation numbers count from 1.
//   - Everything is deterministic for a given input, settings and seed.
//
// # The default battery
//
// Without Settings.Tests the battery runs, on the series in the levels the
// analyst chose: ADF with a constant and with a linear trend; KPSS for level
// and trend stationarity (both nulls, so that the verdict can see agreement
// and contradiction); the Zivot-Andrews and Lee-Strazicich one-break tests
// (the latter keeps its size when a break exists under the null); Bai-Perron
// break dating; the right-tailed SADF for explosive episodes; and ADF on the
// first difference for the order of integration (Dickey & Pantula 1987
// order: the higher order is examined before accepting the lower). See
// verdict.go for the decision rules.
package battery
