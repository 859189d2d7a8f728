// Package report writes rootshift's results in every output format: a plain
// text table for the terminal, indented JSON, CSV for spreadsheets,
// Markdown, a LaTeX table and one self-contained HTML report with SVG plots.
// The same code serves the command line, the batch mode and the offline page
// (through WebAssembly).
//
// # Conventions
//
//   - Every writer takes a *schema.Document and never modifies it.
//   - Numbers are printed with four decimals (strconv 'f', 4); a number that
//     could not be computed prints as "n/a" in the table and Markdown, as an
//     empty cell in CSV, as "--" in LaTeX and as "n/a" in HTML.
//   - Observations are counted from 1. A break date TB is the last
//     observation of the old regime, so plots draw a break line between
//     observation TB and TB+1.
//   - Decisions are put in words from Result.Reject and the kind of null
//     hypothesis: "rejects unit root", "cannot reject unit root", "rejects
//     stationarity", "cannot reject stationarity", "finds a break",
//     "no break found", for right-tailed unit-root tests "rejects unit
//     root (explosive)", and for the seasonal test "rejects seasonal unit
//     roots" / "cannot reject seasonal unit roots" (its components, one per
//     frequency, read "rejects unit root" / "cannot reject unit root").
//   - A p-value that is only a bound (the statistic lies beyond the table the
//     test reads it from, as the test says in p_value_method or a warning)
//     prints as "<0.001", ">0.999" or "<0.005" in the table, Markdown, HTML
//     and LaTeX ($<0.001$); any p-value <= 0.001 or >= 0.999 prints as
//     "<0.001" or ">0.999". The CSV keeps the number in p_value and adds
//     "<" or ">" in p_value_bound. See pbound.go for the phrases recognised.
//   - Significance stars in LaTeX mark p < 0.10 (*), p < 0.05 (**) and
//     p < 0.01 (***). They use the asymptotic p-value, else the simulated
//     one, else the critical values of the result.
//   - Plots are complete <svg> elements with a <title>, a viewBox, fixed
//     colours (no CSS variables, no external fonts or images), drawn for a
//     width of 640 pixels. Non-finite values are never printed.
//   - The HTML report is also well-formed XML, loads nothing from outside and
//     needs no script.
//
// # References
//
// The autocorrelation function plotted by ACFSVG is the sample ACF of
// Box, G.E.P. & Jenkins, G.M. (1976), Time Series Analysis: Forecasting and
// Control, eq. (2.1.12), with the approximate 95% band ±1.96/√T of
// Bartlett, M.S. (1946), JRSS Supplement 8, 27-41, under white noise.
package report
