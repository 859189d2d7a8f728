package schema

import (
	_ "embed"
	"math"
	"strconv"
)

// ID is the value of Document.Schema for this version of the schema.
const ID = "rootshift.results/v2"

// SchemaJSON is the JSON Schema (draft 2020-12) of a Document (version 2).
//
//go:embed v2.json
var SchemaJSON []byte

// Caution is the short warning that every report carries.
const Caution = "Unit-root and break tests have limited power in samples of the size " +
	"analysts usually have, and their answers depend on settings (deterministic terms, " +
	"lags, trimming, the tests chosen). rootshift reports evidence; the analyst decides."

// Document is the top-level result of one analysis.
type Document struct {
	Schema   string   `json:"schema"`
	Version  string   `json:"version"`
	Settings Settings `json:"settings"`
	// Source describes the input file or text.
	Source  *Source  `json:"source,omitempty"`
	Series  []Series `json:"series"`
	Caution string   `json:"caution"`
}

// Source describes where the series came from.
type Source struct {
	Name       string `json:"name,omitempty"`
	Rows       int    `json:"rows"`
	DateColumn string `json:"date_column,omitempty"`
	Frequency  string `json:"frequency,omitempty"`
	// Notes lists everything the reader decided or changed in the input
	// (columns renamed, decimal mark guessed, blank rows, index columns,
	// calendar gaps, sheets not read ...).
	Notes []Note `json:"notes,omitempty"`
	// Path is the input file's canonical path (absolute, symbolic links
	// resolved); batch records only. With Fingerprint it identifies the
	// input when a run is resumed.
	Path string `json:"path,omitempty"`
	// Fingerprint is "sha256:" and the hex SHA-256 of the input file's
	// bytes (batch records only; empty for standard input).
	Fingerprint string `json:"fingerprint,omitempty"`
	// Index is the 1-based position of the series among every series read
	// from the inputs of a batch run, counted before sharding and resume
	// (batch records only): merging shard outputs sorts by it.
	Index int `json:"index,omitempty"`
}

// Note is one finding of the reader about the input.
type Note struct {
	// Kind names the finding: decimal-mark, thousands, renamed, short-row,
	// blank-row, skipped-column, empty-column, index-column, not-years,
	// date-format, date-period, irregular, gap, gap-kept, gap-split,
	// trimmed, header-row, sheet-ignored, encoding, sorted, formula.
	Kind    string `json:"kind"`
	Message string `json:"message"`
	// Row is the 1-based line of the input file (sheet row for a workbook)
	// and Column the column's header, when the note is about one.
	Row    int    `json:"row,omitempty"`
	Column string `json:"column,omitempty"`
}

// Series is the result for one series.
type Series struct {
	Name string `json:"name"`
	// N is the number of observations analysed (after sample range and transform).
	N         int    `json:"n"`
	Start     string `json:"start,omitempty"`
	End       string `json:"end,omitempty"`
	Frequency string `json:"frequency,omitempty"`
	// Transform applied before testing: "" (levels), "log", "diff", "diff2", "logdiff".
	Transform string   `json:"transform,omitempty"`
	Results   []Result `json:"results"`
	Verdict   *Verdict `json:"verdict,omitempty"`
	// Errors lists problems that stopped a test or the whole series.
	Errors []Error `json:"errors"`
	// Warnings lists problems that did not stop the analysis.
	Warnings []string `json:"warnings,omitempty"`
	// Notes lists what the reader decided or changed for this series' column
	// and what the input selection did (values trimmed, calendar gaps).
	Notes []Note `json:"notes,omitempty"`
}

// Error is one failure, with context.
type Error struct {
	Test    string `json:"test,omitempty"`
	Message string `json:"message"`
	// Row and Column locate input problems (1-based), when known.
	Row    int    `json:"row,omitempty"`
	Column string `json:"column,omitempty"`
}

// Result is the outcome of one test on one series.
type Result struct {
	// Test is the test id (adf, pp, kpss, dfgls, ers, mtests, za, ...).
	Test string `json:"test"`
	// Variant names a sub-form where a test has several (e.g. "Z(t)" for pp).
	Variant string `json:"variant,omitempty"`
	// Trend is the deterministic part: "none", "constant" or "linear".
	Trend string `json:"trend"`
	// Shift is set for break tests: "level", "slope" or "level+slope".
	Shift     string   `json:"shift,omitempty"`
	Statistic *float64 `json:"statistic"`
	// PValue is the asymptotic or response-surface p-value; nil when the
	// method has none (see PValueMethod).
	PValue       *float64 `json:"p_value"`
	PValueMethod string   `json:"p_value_method"`
	// PValueSim is the finite-sample p-value from Monte Carlo under the null.
	PValueSim *float64 `json:"p_value_sim,omitempty"`
	// SimMethod describes the simulation (replications, seed, DGP).
	SimMethod         string             `json:"p_value_sim_method,omitempty"`
	CriticalValues    map[string]float64 `json:"critical_values"`
	CriticalSource    string             `json:"critical_values_source,omitempty"`
	CriticalValuesSim map[string]float64 `json:"critical_values_sim,omitempty"`
	// Tail is "left" when small statistics reject, "right" when large ones do.
	Tail string `json:"tail"`
	Lags int    `json:"lags"`
	// LagRule is how Lags was chosen: "fixed", "aic", "bic", "maic", "tsig".
	LagRule string `json:"lag_rule,omitempty"`
	// Bandwidth is the kernel bandwidth, for kernel-based tests.
	Bandwidth *float64 `json:"bandwidth,omitempty"`
	Kernel    string   `json:"kernel,omitempty"`
	// NObs is the number of observations in the test regression.
	NObs int `json:"nobs"`
	// Null states H0 in words.
	Null string `json:"null"`
	// Reject is the decision at Settings.Level.
	Reject bool `json:"reject"`
	// Level is the significance level used for Reject.
	Level float64 `json:"level"`
	// Components holds several statistics reported together (the M-tests).
	Components []Component `json:"components,omitempty"`
	// Estimates holds named coefficients useful to the reader (e.g. "rho").
	Estimates map[string]float64 `json:"estimates,omitempty"`
	// Breaks are the break dates found or given.
	Breaks []Break `json:"breaks,omitempty"`
	// Path is the statistic at every candidate break (single-break searches).
	Path []PathPoint `json:"path,omitempty"`
	// PathCompact replaces Path when compact arrays are asked for (the
	// CLI's --compact-arrays): the same statistics by candidate, with the
	// candidates as an arithmetic run.
	PathCompact *Run `json:"path_compact,omitempty"`
	// Surface summarises a two-break search.
	Surface *Surface `json:"surface,omitempty"`
	// Episodes are explosive episodes (sadf/gsadf).
	Episodes []Episode `json:"episodes,omitempty"`
	// Sequence is a statistic sequence by observation with its critical
	// values (the BSADF sequence), for plotting.
	Sequence *Sequence `json:"sequence,omitempty"`
	// BreakTests holds structural-change statistics (bp, py).
	BreakTests []Component `json:"break_tests,omitempty"`
	Warnings   []string    `json:"warnings,omitempty"`
}

// Component is one named statistic inside a Result.
type Component struct {
	Name           string             `json:"name"`
	Statistic      *float64           `json:"statistic"`
	PValue         *float64           `json:"p_value,omitempty"`
	CriticalValues map[string]float64 `json:"critical_values,omitempty"`
	Tail           string             `json:"tail,omitempty"`
	Reject         bool               `json:"reject"`
}

// Break is one break date.
type Break struct {
	// Index is TB, the last observation of the old regime, counted from 1.
	Index int    `json:"index"`
	Date  string `json:"date,omitempty"`
	// Fraction is TB/T.
	Fraction float64 `json:"fraction"`
	// Lower and Upper bound a confidence interval for TB when one is computed
	// (Bai 1997), as observation indexes; Level is its coverage.
	Lower     int     `json:"lower,omitempty"`
	Upper     int     `json:"upper,omitempty"`
	LowerDate string  `json:"lower_date,omitempty"`
	UpperDate string  `json:"upper_date,omitempty"`
	CILevel   float64 `json:"ci_level,omitempty"`
}

// PathPoint is the statistic at one candidate break date.
type PathPoint struct {
	Index     int     `json:"index"`
	Statistic float64 `json:"statistic"`
}

// Surface summarises the statistic over all candidate pairs of a two-break search.
type Surface struct {
	Candidates int     `json:"candidates"`
	Min        float64 `json:"min"`
	Max        float64 `json:"max"`
	// Rows gives, for each first-break candidate, the best statistic over second breaks.
	Rows []PathPoint `json:"rows,omitempty"`
	// RowsCompact replaces Rows when compact arrays are asked for.
	RowsCompact *Run `json:"rows_compact,omitempty"`
}

// Run is a compact numeric array: Values[i] belongs to observation index
// First + i*Step (a PathPoint list whose indices form an arithmetic run,
// in about 40% of the bytes).
type Run struct {
	First  int       `json:"first"`
	Step   int       `json:"step"`
	Values []float64 `json:"values"`
}

// CompactPoints returns ps as a Run when their indices form an arithmetic
// run (at least two points), or nil.
func CompactPoints(ps []PathPoint) *Run {
	if len(ps) < 2 {
		return nil
	}
	step := ps[1].Index - ps[0].Index
	if step < 1 {
		return nil
	}
	r := &Run{First: ps[0].Index, Step: step, Values: make([]float64, len(ps))}
	for i, p := range ps {
		if p.Index != r.First+i*step {
			return nil
		}
		r.Values[i] = p.Statistic
	}
	return r
}

// Points expands r back to the PathPoint list it stands for.
func (r *Run) Points() []PathPoint {
	if r == nil {
		return nil
	}
	ps := make([]PathPoint, len(r.Values))
	for i, v := range r.Values {
		ps[i] = PathPoint{Index: r.First + i*r.Step, Statistic: v}
	}
	return ps
}

// Episode is one explosive episode.
type Episode struct {
	Start Point `json:"start"`
	End   Point `json:"end"`
}

// Point is an observation, by index from 1 and date when known.
type Point struct {
	Index int    `json:"index"`
	Date  string `json:"date,omitempty"`
}

// Sequence is a statistic sequence with its critical value sequence.
type Sequence struct {
	Name     string    `json:"name"`
	Index    []int     `json:"index"`
	Values   []float64 `json:"values"`
	Critical []float64 `json:"critical"`
	// Level of the critical value sequence.
	Level float64 `json:"level"`
}

// Verdict is the one answer for a series.
type Verdict struct {
	// Class is exactly one of: stationary, trend-stationary, break-stationary,
	// unit-root, unit-root-breaks, explosive, inconclusive.
	Class string `json:"class"`
	// Order of integration: 0, 1, 2 or nil when undetermined.
	Order *int `json:"order"`
	// Drift reports a unit root with drift.
	Drift bool `json:"drift,omitempty"`
	// Transform recommended: none, detrend, shift-dummies, difference,
	// log-difference, second-difference, seasonal-difference.
	Transform string  `json:"transform"`
	Breaks    []Break `json:"breaks"`
	// Window reports the suspected window and whether breaks fall inside it.
	Window      *WindowCheck `json:"window,omitempty"`
	Explanation string       `json:"explanation"`
	Supporting  []string     `json:"supporting,omitempty"`
	Against     []string     `json:"against,omitempty"`
	// Tests lists the test ids the verdict used.
	Tests []string `json:"tests,omitempty"`
	// Scale is the scale the procedure worked on: "levels" or "logs".
	Scale string `json:"scale,omitempty"`
	// Stages holds each stage of the decision procedure in the order it ran,
	// with its evidence and its decision.
	Stages []Stage `json:"stages,omitempty"`
	// Context lists results that were computed but did not decide the class
	// (shown for information only).
	Context []string `json:"context,omitempty"`
	// Reliability gives the procedure's own simulated error rates at the
	// series' length.
	Reliability *Reliability `json:"reliability,omitempty"`
}

// Stage is one stage of the verdict procedure.
type Stage struct {
	// Name is one of: scale, explosive, trend, unit-root, breaks, order, seasonality.
	Name string `json:"name"`
	// Decision is the stage's answer in a few words.
	Decision string `json:"decision"`
	// Method names the test and inference used, with its citation.
	Method string `json:"method,omitempty"`
	// Statistic and PValue of the stage's test, when it has one.
	Statistic *float64 `json:"statistic,omitempty"`
	PValue    *float64 `json:"p_value,omitempty"`
	// Level is the significance level the stage used.
	Level float64 `json:"level,omitempty"`
	// Evidence lists the results the stage read, in words.
	Evidence []string `json:"evidence,omitempty"`
}

// Reliability is the verdict procedure's simulated error rates at a sample size.
type Reliability struct {
	// T is the sample size the rates were simulated at (the nearest tabulated
	// size, or the series' own when recomputed).
	T int `json:"t"`
	// Source is "table" (committed, regenerable by one command) or "simulated"
	// (recomputed for this run).
	Source string `json:"source"`
	// Headline is one sentence a report can print beside the verdict.
	Headline string `json:"headline"`
	// WrongRate is the largest simulated rate at which a process of another
	// class receives this verdict's class (nil when not tabulated).
	WrongRate *float64 `json:"wrong_rate,omitempty"`
	// Rates lists the simulated rates behind the headline.
	Rates []Rate `json:"rates"`
}

// Rate is one simulated rate of the verdict procedure.
type Rate struct {
	// Process describes the simulated process.
	Process string `json:"process"`
	// Truth is the class the process was built to have.
	Truth string `json:"truth"`
	// Outcome is the verdict outcome counted (a class, or "right").
	Outcome string `json:"outcome"`
	// Rate is the share of draws with that outcome; Draws their number.
	Rate  float64 `json:"rate"`
	Draws int     `json:"draws"`
}

// WindowCheck reports the analyst's suspected window against the breaks found.
type WindowCheck struct {
	From        string  `json:"from"`
	To          string  `json:"to"`
	BreakInside bool    `json:"break_inside"`
	Known       *Result `json:"known_break_test,omitempty"`
	// FromIndex and ToIndex are the window's first and last observations (1-based).
	FromIndex int `json:"from_index,omitempty"`
	ToIndex   int `json:"to_index,omitempty"`
	// Test is the break-aware unit-root test whose break search was
	// restricted to the window, with a p-value from critical values simulated
	// for that restricted search.
	Test *Result `json:"test,omitempty"`
	// Answer says in words whether a break inside the window was found.
	Answer string `json:"answer,omitempty"`
}

// F returns a pointer to a finite x, or nil for NaN and ±Inf.
func F(x float64) *float64 {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return nil
	}
	return &x
}

// LevelKey formats a significance level as a critical-value key ("0.05").
func LevelKey(p float64) string {
	switch p {
	case 0.01:
		return "0.01"
	case 0.025:
		return "0.025"
	case 0.05:
		return "0.05"
	case 0.10:
		return "0.10"
	}
	return strconv.FormatFloat(p, 'f', -1, 64)
}
