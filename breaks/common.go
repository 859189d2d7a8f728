package breaks

import (
	"errors"
	"fmt"
	"math"
	"sort"

	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/schema"
)

// MinHead and MinTail bound every break candidate away from the ends of the
// sample whatever the trimming: TB >= MinHead leaves at least two
// observations in the old regime and TB <= T-MinTail at least two in the new.
const (
	MinHead = 2
	MinTail = 2
)

// Candidates returns the first and last admissible break date TB (1-based,
// inclusive) for a series of length T with trimming fraction trim:
//
//	lo = max(ceil(trim*T), MinHead)
//	hi = min(floor((1-trim)*T), T-MinTail)
//
// (the products are rounded to the nearest 1e-9 before ceil/floor, so that
// trim = 0.15 and T = 100 give exactly 15 and 85). A trimming fraction of 0
// means the default 0.15, as in core.Config.TrimOr. The error wraps
// core.ErrSettings when trim is outside [0, 0.5), and core.ErrTooShort when
// no candidate is left (lo > hi); callers attach their test id with WrapError.
func Candidates(T int, trim float64) (lo, hi int, err error) {
	if trim == 0 {
		trim = 0.15
	}
	if !(trim > 0 && trim < 0.5) {
		return 0, 0, fmt.Errorf("%w: trimming fraction %g (want 0 < trim < 0.5)", core.ErrSettings, trim)
	}
	const eps = 1e-9
	lo = max(int(math.Ceil(trim*float64(T)-eps)), MinHead)
	hi = min(int(math.Floor((1-trim)*float64(T)+eps)), T-MinTail)
	if lo > hi {
		return lo, hi, fmt.Errorf("%w: no break candidate left with T=%d and trimming %g (first %d, last %d)", core.ErrTooShort, T, trim, lo, hi)
	}
	return lo, hi, nil
}

// WrapError returns err as a *core.Error carrying the test id; an error that
// already is a *core.Error with a test id is returned unchanged, and nil stays nil.
func WrapError(test string, err error) error {
	if err == nil {
		return nil
	}
	var ce *core.Error
	if errors.As(err, &ce) {
		if ce.Test != "" {
			return err
		}
		return &core.Error{Test: test, Index: ce.Index, Err: ce.Err}
	}
	return &core.Error{Test: test, Err: err}
}

// BreakAt returns the schema.Break for break date tb in a series of length T:
// Index tb, Fraction tb/T and Date cfg.DateOf(tb) (empty without dates).
func BreakAt(tb, T int, cfg *core.Config) schema.Break {
	f := 0.0
	if T > 0 {
		f = float64(tb) / float64(T)
	}
	return schema.Break{Index: tb, Date: cfg.DateOf(tb), Fraction: f}
}

// InterpLambda linearly interpolates a critical-value table indexed by the
// break fraction λ = TB/T: values[i] belongs to lambdas[i] (increasing, e.g.
// 0.1, 0.2, ..., 0.9 as in Perron 1989). Outside the tabulated range the
// nearest end value is used (the tables are flat near their ends). It panics
// if the slices differ in length or are empty (a programming error).
func InterpLambda(lambdas []float64, values []float64, lambda float64) float64 {
	n := len(lambdas)
	if n == 0 || n != len(values) {
		panic("breaks: InterpLambda needs equal, non-empty tables")
	}
	if lambda <= lambdas[0] {
		return values[0]
	}
	if lambda >= lambdas[n-1] {
		return values[n-1]
	}
	i := sort.SearchFloat64s(lambdas, lambda) // lambdas[i-1] < lambda <= lambdas[i]
	w := (lambda - lambdas[i-1]) / (lambdas[i] - lambdas[i-1])
	return values[i-1] + w*(values[i]-values[i-1])
}

// Terms selects the break regressors of a model. Level adds
// DU_t = 1(t > TB), Slope adds DT_t = (t - TB) 1(t > TB), Dummy adds the
// one-time dummy D(TB)_t = 1(t = TB+1).
type Terms struct {
	Level, Slope, Dummy bool
}

// TermsOf returns the level/slope terms implied by a core.Shift, with the
// one-time dummy if dummy is true.
func TermsOf(s core.Shift, dummy bool) Terms {
	return Terms{Level: s != core.ShiftSlope, Slope: s != core.ShiftLevel, Dummy: dummy}
}

// Count is the number of break columns the terms add.
func (m Terms) Count() int {
	n := 0
	for _, b := range []bool{m.Level, m.Slope, m.Dummy} {
		if b {
			n++
		}
	}
	return n
}

// DeterministicColumns appends to dst the deterministic columns of a break
// regression over rows t = start..T (1-based, inclusive; each column has
// T-start+1 entries), in this order:
//
//	constant 1             (trend constant or linear)
//	t                      (trend linear)
//	DU_t = 1(t > tb)       (terms.Level)
//	DT_t = (t - tb) 1(t > tb) (terms.Slope)
//	D(TB)_t = 1(t = tb+1)  (terms.Dummy)
//
// With trend core.TrendNone only the break columns are appended, which is
// how a second break is added to a two-break design. Each column is a new
// slice. It panics if start < 1 or start > T (a programming error).
func DeterministicColumns(dst [][]float64, trend core.Trend, terms Terms, tb, start, T int) [][]float64 {
	if start < 1 || start > T {
		panic("breaks: DeterministicColumns start outside 1..T")
	}
	n := T - start + 1
	col := func(f func(t int) float64) {
		c := make([]float64, n)
		for i := range c {
			c[i] = f(start + i)
		}
		dst = append(dst, c)
	}
	if trend != core.TrendNone {
		col(func(int) float64 { return 1 })
	}
	if trend == core.TrendLinear {
		col(func(t int) float64 { return float64(t) })
	}
	if terms.Level {
		col(func(t int) float64 { return indicator(t > tb) })
	}
	if terms.Slope {
		col(func(t int) float64 {
			if t > tb {
				return float64(t - tb)
			}
			return 0
		})
	}
	if terms.Dummy {
		col(func(t int) float64 { return indicator(t == tb+1) })
	}
	return dst
}

// DeterministicNames returns the names of the columns DeterministicColumns
// appends, in the same order ("const", "trend", "DU", "DT", "D(TB)").
func DeterministicNames(trend core.Trend, terms Terms) []string {
	var s []string
	if trend != core.TrendNone {
		s = append(s, "const")
	}
	if trend == core.TrendLinear {
		s = append(s, "trend")
	}
	if terms.Level {
		s = append(s, "DU")
	}
	if terms.Slope {
		s = append(s, "DT")
	}
	if terms.Dummy {
		s = append(s, "D(TB)")
	}
	return s
}

func indicator(b bool) float64 {
	if b {
		return 1
	}
	return 0
}

// LevelsLeft are the significance levels of critical-value maps, in increasing order.
var LevelsLeft = []float64{0.01, 0.025, 0.05, 0.10}

// CriticalMap builds a schema critical-value map from parallel slices of
// levels and values, skipping NaN entries.
func CriticalMap(levels, values []float64) map[string]float64 {
	m := make(map[string]float64, len(levels))
	for i, p := range levels {
		if !math.IsNaN(values[i]) {
			m[schema.LevelKey(p)] = values[i]
		}
	}
	return m
}

// CriticalAt returns the critical value at significance level p from a
// schema critical-value map, interpolating linearly in p between tabulated
// levels (and using the nearest level outside their range). ok is false when
// the map is empty.
func CriticalAt(cv map[string]float64, p float64) (v float64, ok bool) {
	type pair struct{ p, v float64 }
	var ps []pair
	for _, q := range []float64{0.01, 0.025, 0.05, 0.10} {
		if x, found := cv[schema.LevelKey(q)]; found {
			ps = append(ps, pair{q, x})
		}
	}
	if len(ps) == 0 {
		return math.NaN(), false
	}
	if p <= ps[0].p {
		return ps[0].v, true
	}
	for i := 1; i < len(ps); i++ {
		if p <= ps[i].p {
			w := (p - ps[i-1].p) / (ps[i].p - ps[i-1].p)
			return ps[i-1].v + w*(ps[i].v-ps[i-1].v), true
		}
	}
	return ps[len(ps)-1].v, true
}

// Decide returns the decision at level p for statistic stat: from the
// p-value when pv is non-nil (reject when *pv <= p), otherwise from the
// critical value at p (interpolated by CriticalAt) in the given tail.
func Decide(stat float64, pv *float64, cv map[string]float64, tail string, p float64) bool {
	if pv != nil {
		return *pv <= p
	}
	c, ok := CriticalAt(cv, p)
	if !ok {
		return false
	}
	if tail == "right" {
		return stat >= c
	}
	return stat <= c
}

// CheckSeries returns a *core.Error for test when y is shorter than minT
// (core.ErrTooShort), holds a NaN or ±Inf (core.ErrNonFinite, with the
// observation) or is constant (core.ErrConstant).
func CheckSeries(test string, y []float64, minT int) error {
	if len(y) < minT {
		return core.Errorf(test, core.ErrTooShort, "%d observations, need at least %d", len(y), minT)
	}
	if err := core.CheckFinite(test, y); err != nil {
		return err
	}
	for _, v := range y[1:] {
		if v != y[0] {
			return nil
		}
	}
	return core.Errorf(test, core.ErrConstant, "all %d observations equal %g", len(y), y[0])
}

// restrictCandidates intersects the candidate range lo..hi with
// cfg.BreakFrom..cfg.BreakTo (each ignored when 0). The error wraps
// core.ErrSettings when the intersection is empty.
func restrictCandidates(lo, hi int, cfg *core.Config) (int, int, error) {
	if cfg == nil {
		return lo, hi, nil
	}
	if cfg.BreakFrom > 0 {
		lo = max(lo, cfg.BreakFrom)
	}
	if cfg.BreakTo > 0 {
		hi = min(hi, cfg.BreakTo)
	}
	if lo > hi {
		return lo, hi, fmt.Errorf("%w: no break candidate inside observations %d..%d after trimming", core.ErrSettings, cfg.BreakFrom, cfg.BreakTo)
	}
	return lo, hi, nil
}
