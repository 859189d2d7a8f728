package batch

import (
	"context"
	"fmt"
	"math"
	"strings"

	"github.com/rootshift/rootshift/breaks/battery"
	"github.com/rootshift/rootshift/core/dataset"
	"github.com/rootshift/rootshift/core/schema"
)

// Magnitudes outside [2^-100, 2^100] are rescaled before testing: squares
// and cross-products of values near 1e308 overflow and those of values near
// 1e-300 underflow to zero, so that tests fail or a series is taken for a
// constant.
const (
	rescaleAbove = 0x1p100
	rescaleBelow = 0x1p-100
)

// coreTests are the standard tests without which no verdict is issued.
var coreTests = []string{"adf", "kpss"}

// AnalyzeSeries runs the battery on one prepared series, as
// battery.AnalyzeSeries does, with two guards shared by `test` and `batch`:
//
//   - A series whose largest absolute value lies outside [2^-100, 2^100] is
//     multiplied by a power of two that brings it into [1, 2) before testing
//     (exact in binary floating point). Unit-root and stationarity
//     statistics are invariant to the scale of the series; the warning says
//     so and that estimates in data units (break sizes) are in the rescaled
//     units.
//   - No verdict is issued when one of the core tests (adf, kpss) was run
//     and failed: the verdict is dropped and a warning says why.
func AnalyzeSeries(ctx context.Context, in dataset.Series, s schema.Settings, opt *battery.Options) (schema.Series, error) {
	var note string
	if k, m := rescaleExponent(in.Values); k != 0 {
		scaled := make([]float64, len(in.Values))
		for i, v := range in.Values {
			scaled[i] = math.Ldexp(v, k)
		}
		in.Values = scaled
		note = fmt.Sprintf("values rescaled by 2^%d before testing (largest magnitude %.3g): unit-root and stationarity statistics do not depend on the scale, but estimates in data units (break sizes, plotted values) are in the rescaled units", k, m)
	}
	sr, err := battery.AnalyzeSeries(ctx, in, s, opt)
	if err != nil {
		return sr, err
	}
	if note != "" {
		sr.Warnings = append(sr.Warnings, note)
	}
	if sr.Verdict != nil {
		var failed []string
		for _, e := range sr.Errors {
			for _, id := range coreTests {
				if e.Test == id {
					failed = append(failed, id+": "+e.Message)
				}
			}
		}
		if len(failed) > 0 {
			sr.Verdict = nil
			sr.Warnings = append(sr.Warnings, "no verdict: the core tests failed on this series ("+strings.Join(failed, "; ")+")")
		}
	}
	return sr, nil
}

// rescaleExponent returns k such that 2^k * max|y| lies in [1, 2) when
// max|y| (over finite values) is outside [rescaleBelow, rescaleAbove], and
// 0 otherwise; m is max|y|.
func rescaleExponent(y []float64) (int, float64) {
	m := 0.0
	for _, v := range y {
		if a := math.Abs(v); a > m && !math.IsInf(a, 0) {
			m = a
		}
	}
	if m == 0 || (m >= rescaleBelow && m <= rescaleAbove) {
		return 0, m
	}
	_, e := math.Frexp(m) // m = f * 2^e, f in [0.5, 1)
	return 1 - e, m
}

// CompactArrays replaces the candidate paths and two-break surface rows of
// sr by their compact runs (schema.Run) where their indices form an
// arithmetic run; other lists stay as they are.
func CompactArrays(sr *schema.Series) {
	do := func(r *schema.Result) {
		if c := schema.CompactPoints(r.Path); c != nil {
			r.Path, r.PathCompact = nil, c
		}
		if r.Surface != nil {
			if c := schema.CompactPoints(r.Surface.Rows); c != nil {
				r.Surface.Rows, r.Surface.RowsCompact = nil, c
			}
		}
	}
	for i := range sr.Results {
		do(&sr.Results[i])
	}
	if v := sr.Verdict; v != nil && v.Window != nil && v.Window.Known != nil {
		do(v.Window.Known)
	}
}
