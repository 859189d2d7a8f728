package breaks

// Critical values of the Lee-Strazicich, Lumsdaine-Papell and
// Clemente-Montanes-Reyes tests, and the p-values interpolated in the
// simulated null quantile tables of lm_simtables.go (generated in-repo by
// TestGenerateLMTables; see lm_tables_test.go). The tables are at T=100;
// for ls1 (and ls2 when lmSimGrids has it) at default settings a T-grid
// (lmSimGrids) is interpolated linearly in 1/T at the sample size.
//
// The published values below are recalled (marked MEMORY in the project's
// reference notes), not checked against the papers. They are only called
// published where our own simulation reproduces them within Monte Carlo
// error (TestLMTablesReproduce and lm_simtables.go); the CriticalSource
// strings say which.

import (
	"fmt"
	"math"
	"slices"

	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/schema"
)

// lmCV is a row of critical values at 1%, 5%, 10%.
type lmCV [3]float64

var lmLevels3 = []float64{0.01, 0.05, 0.10}

func (c lmCV) m() map[string]float64 { return CriticalMap(lmLevels3, c[:]) }

// Lee & Strazicich (2013), one break, T = 100 (MEMORY, low/medium confidence).
var (
	ls1CrashCV     = lmCV{-4.239, -3.566, -3.211}
	ls1BreakLambda = []float64{0.1, 0.2, 0.3, 0.4, 0.5} // symmetric in λ and 1-λ
	ls1BreakCV     = []lmCV{
		{-5.11, -4.50, -4.21},
		{-5.07, -4.47, -4.20},
		{-5.15, -4.45, -4.18},
		{-5.05, -4.50, -4.18},
		{-5.11, -4.51, -4.17},
	}
)

// Lee & Strazicich (2003), Table 2, two breaks, T = 100 (MEMORY).
var (
	ls2CrashCV = lmCV{-4.545, -3.842, -3.504}
	ls2BreakCV = []struct {
		l1, l2 float64
		cv     lmCV
	}{
		{0.2, 0.4, lmCV{-6.16, -5.59, -5.27}},
		{0.2, 0.6, lmCV{-6.41, -5.74, -5.32}},
		{0.2, 0.8, lmCV{-6.33, -5.71, -5.33}},
		{0.4, 0.6, lmCV{-6.45, -5.67, -5.31}},
		{0.4, 0.8, lmCV{-6.42, -5.65, -5.32}},
		{0.6, 0.8, lmCV{-6.32, -5.73, -5.32}},
	}
)

// Lumsdaine & Papell (1997), T = 100 (MEMORY, low confidence).
var (
	lpAACV = lmCV{-6.74, -6.16, -5.89}
	lpCCCV = lmCV{-7.34, -6.82, -6.49}
)

// Clemente, Montanes & Reyes (1998), two mean shifts, 5% (MEMORY, medium);
// Perron & Vogelsang (1992), one mean shift, 5%, IO and AO (MEMORY, low/medium).
const (
	twoShiftCV5 = -5.490
	pvIO1CV5    = -4.27
	pvAO1CV5    = -3.56
)

// lmSimTable is a simulated null distribution summarised by its quantiles at
// lmSimProbs.
type lmSimTable struct {
	T, Reps int
	Seed    uint64
	Trim    float64
	// Lags is the lag rule of the simulated statistic: "tsig" (the default
	// rule, kmax = 8) or "0".
	Lags string
	Q    []float64
	// interp, set only on a table built by lmAtT from a T-grid, says at
	// which T and from which grid tables the quantiles were obtained.
	interp string
}

// lmSimProbs are the probabilities of the tabulated quantiles.
var lmSimProbs = []float64{0.005, 0.01, 0.025, 0.05, 0.075, 0.10, 0.15, 0.20, 0.25, 0.30, 0.40, 0.50, 0.60, 0.70, 0.80, 0.90, 0.95, 0.99}

// pvalue interpolates the left-tail p-value of stat linearly between
// tabulated quantiles; outside the table it returns the end probability
// and clamped = true.
func (s lmSimTable) pvalue(stat float64) (p float64, clamped bool) {
	q := s.Q
	n := len(q)
	if stat <= q[0] {
		return lmSimProbs[0], stat < q[0]
	}
	if stat >= q[n-1] {
		return lmSimProbs[n-1], stat > q[n-1]
	}
	for i := 1; i < n; i++ {
		if stat <= q[i] {
			if q[i] == q[i-1] {
				return lmSimProbs[i], false
			}
			w := (stat - q[i-1]) / (q[i] - q[i-1])
			return lmSimProbs[i-1] + w*(lmSimProbs[i]-lmSimProbs[i-1]), false
		}
	}
	return lmSimProbs[n-1], true
}

// crit returns the quantiles at 1%, 2.5%, 5% and 10% as a schema map.
func (s lmSimTable) crit() map[string]float64 {
	out := map[string]float64{}
	for i, p := range lmSimProbs {
		switch p {
		case 0.01, 0.025, 0.05, 0.10:
			out[schema.LevelKey(p)] = s.Q[i]
		}
	}
	return out
}

func (s lmSimTable) describe() string {
	if s.interp != "" {
		return fmt.Sprintf("%s; Gaussian random walk, lags %s, trimming %g", s.interp, s.lagText(), s.Trim)
	}
	if s.Trim == 0 {
		return fmt.Sprintf("T=%d, %d replications, seed %d, Gaussian random walk, lags %s, breaks at the tabulated fractions", s.T, s.Reps, s.Seed, s.lagText())
	}
	return fmt.Sprintf("T=%d, %d replications, seed %d, Gaussian random walk, lags %s, trimming %g", s.T, s.Reps, s.Seed, s.lagText(), s.Trim)
}

func (s lmSimTable) lagText() string {
	if s.Lags == "tsig" {
		return "by the t-sig rule with kmax 8"
	}
	return s.Lags
}

// ls2Pairs are the (λ1, λ2) grid of the two-break break-model tables.
var ls2Pairs = [][2]float64{{0.2, 0.4}, {0.2, 0.6}, {0.2, 0.8}, {0.4, 0.6}, {0.4, 0.8}, {0.6, 0.8}}

// lmIDW returns inverse-squared-distance weights of (l1, l2) to ls2Pairs
// (weight 1 on an exact grid point).
func lmIDW(l1, l2 float64) []float64 {
	w := make([]float64, len(ls2Pairs))
	s := 0.0
	for i, p := range ls2Pairs {
		d := (p[0]-l1)*(p[0]-l1) + (p[1]-l2)*(p[1]-l2)
		if d < 1e-12 {
			clear(w)
			w[i] = 1
			return w
		}
		w[i] = 1 / d
		s += w[i]
	}
	for i := range w {
		w[i] /= s
	}
	return w
}

// lmPub is a recalled published row of critical values, the simulated
// table at the paper's settings it was compared with, and whether our
// simulation reproduced it within Monte Carlo error (see
// TestLMTablesReproduce and the generator log in lm_simtables.go's header).
type lmPub struct {
	cv         lmCV
	cite       string
	key        string
	reproduced bool
}

// complete reports whether the row has all three levels.
func (p *lmPub) complete() bool {
	for _, v := range p.cv {
		if math.IsNaN(v) {
			return false
		}
	}
	return true
}

// lmPubs holds the recalled rows by test variant.
var lmPubs = map[string]lmPub{
	"ls1/A":                    {cv: ls1CrashCV, cite: "Lee & Strazicich (2013), crash model, T=100", key: "ls1/A@0.10"},
	"ls2/A":                    {cv: ls2CrashCV, cite: "Lee & Strazicich (2003), Table 2, crash model, T=100", key: "ls2/A@0.10", reproduced: true},
	"lp/AA":                    {cv: lpAACV, cite: "Lumsdaine & Papell (1997), model AA, T=100", key: "lp/AA", reproduced: true},
	"lp/CC":                    {cv: lpCCCV, cite: "Lumsdaine & Papell (1997), model CC, T=100", key: "lp/CC", reproduced: true},
	"meanshift/innovational-1": {cv: lmCV{math.NaN(), pvIO1CV5, math.NaN()}, cite: "Perron & Vogelsang (1992), IO, non-trending, 5%", key: "meanshift/innovational-1"},
	"meanshift/additive-1":     {cv: lmCV{math.NaN(), pvAO1CV5, math.NaN()}, cite: "Perron & Vogelsang (1992), AO, non-trending, 5%", key: "meanshift/additive-1"},
	"meanshift/innovational-2": {cv: lmCV{math.NaN(), twoShiftCV5, math.NaN()}, cite: "Clemente, Montanes & Reyes (1998), two mean shifts, 5%", key: "meanshift/innovational-2"},
	"meanshift/additive-2":     {cv: lmCV{math.NaN(), twoShiftCV5, math.NaN()}, cite: "Clemente, Montanes & Reyes (1998), two mean shifts, 5%", key: "meanshift/additive-2", reproduced: true},
}

// lmLagsOf classifies the lag settings: "tsig" (the default rule with
// kmax 8), "0" (fixed at zero) or "" (anything else).
func lmLagsOf(cfg *core.Config) string {
	switch r := cfg.LagRule.Or(core.LagTSig); {
	case r == core.LagTSig && (cfg.MaxLags == 0 || cfg.MaxLags == 8):
		return "tsig"
	case r == core.LagFixed && cfg.Lags == 0:
		return "0"
	}
	return ""
}

// lmGrid returns the default-settings tables of variant at every simulated
// T (lmSimTables at lmTableT and lmSimGrids at the other T), sorted by T;
// nil when the variant has no T-grid.
func lmGrid(variant string) []lmSimTable {
	g, ok := lmSimGrids[variant]
	if !ok {
		return nil
	}
	out := append([]lmSimTable(nil), g...)
	if t, ok := lmSimTables[variant]; ok {
		out = append(out, t)
	}
	slices.SortFunc(out, func(a, b lmSimTable) int { return a.T - b.T })
	return out
}

func lmGridText(g []lmSimTable) string {
	s := ""
	for i, t := range g {
		if i > 0 {
			s += ", "
		}
		s += fmt.Sprint(t.T)
	}
	return s
}

// lmAtT returns the quantiles of grid g (sorted by T) at sample size T,
// interpolated linearly in 1/T between the neighbouring grid points; at a
// grid point it returns that table's quantiles exactly. Outside the grid
// the nearest end is used and outside is true.
func lmAtT(g []lmSimTable, T int) (t lmSimTable, outside bool) {
	n := len(g)
	reps := func(t lmSimTable) string {
		return fmt.Sprintf("T=%d (%d replications, seed %d)", t.T, t.Reps, t.Seed)
	}
	grid := "T-grid " + lmGridText(g)
	pick := func(t lmSimTable, how string) lmSimTable {
		t.Q = slices.Clone(t.Q)
		t.interp = fmt.Sprintf("%s %s; table %s", how, grid, reps(t))
		return t
	}
	switch {
	case T <= g[0].T:
		if T == g[0].T {
			return pick(g[0], fmt.Sprintf("T=%d on the", T)), false
		}
		return pick(g[0], fmt.Sprintf("T=%d below the grid, nearest end of the", T)), true
	case T >= g[n-1].T:
		if T == g[n-1].T {
			return pick(g[n-1], fmt.Sprintf("T=%d on the", T)), false
		}
		return pick(g[n-1], fmt.Sprintf("T=%d above the grid, nearest end of the", T)), true
	}
	i := 1
	for g[i].T < T {
		i++
	}
	a, b := g[i-1], g[i]
	if b.T == T {
		return pick(b, fmt.Sprintf("T=%d on the", T)), false
	}
	w := (1/float64(T) - 1/float64(a.T)) / (1/float64(b.T) - 1/float64(a.T))
	t = a
	t.T, t.Reps, t.Seed = T, min(a.Reps, b.Reps), 0
	t.Q = make([]float64, len(a.Q))
	for j := range t.Q {
		t.Q[j] = (1-w)*a.Q[j] + w*b.Q[j]
	}
	t.interp = fmt.Sprintf("T=%d interpolated linearly in 1/T on the %s between tables %s and %s", T, grid, reps(a), reps(b))
	return t, false
}

// lmTableFor returns the simulated table for a minimum-t search variant
// under cfg: the paper-settings table (lags 0, trimming 0.10) when cfg
// matches it, else the default-settings table (t-sig lags, trimming 0.15),
// which for variants with a T-grid (lmSimGrids) is interpolated at sample
// size T (T = 0: the T=lmTableT table). exact is false when cfg matches
// neither; warn is set when T lies outside the grid.
func lmTableFor(variant string, cfg *core.Config, T int) (key string, t lmSimTable, ok, exact bool, warn string) {
	lags, trim := lmLagsOf(cfg), cfg.TrimOr()
	if lags == "0" && math.Abs(trim-0.10) < 1e-12 {
		if t, ok = lmSimTables[variant+"@0.10"]; ok {
			return variant + "@0.10", t, true, true, ""
		}
	}
	t, ok = lmSimTables[variant]
	exact = ok && lags == t.Lags && math.Abs(trim-t.Trim) < 1e-12
	if g := lmGrid(variant); T > 0 && len(g) > 0 {
		var outside bool
		t, outside = lmAtT(g, T)
		ok = true
		if outside {
			warn = fmt.Sprintf("sample size T=%d lies outside the simulated T-grid %s of the null table; the table at the nearest end T=%d was used (use --sims for a Monte Carlo p-value at this T)", T, lmGridText(g), t.T)
		}
	}
	return variant, t, ok, exact, warn
}

// lmInference is what a test writes into its result.
type lmInference struct {
	cv       map[string]float64
	cvSource string
	pv       float64
	hasPV    bool
	pvMethod string
	warnings []string
}

func (inf lmInference) apply(res *schema.Result, cfg *core.Config) {
	res.CriticalValues = inf.cv
	res.CriticalSource = inf.cvSource
	res.PValueMethod = inf.pvMethod
	if inf.hasPV {
		res.PValue = schema.F(inf.pv)
	}
	res.Warnings = append(res.Warnings, inf.warnings...)
	if res.Statistic != nil {
		res.Reject = Decide(*res.Statistic, res.PValue, res.CriticalValues, "left", cfg.LevelOr())
	}
}

func lmCVText(c lmCV) string {
	s := ""
	for i, v := range c {
		if math.IsNaN(v) {
			continue
		}
		if s != "" {
			s += ", "
		}
		s += fmt.Sprintf("%g%% %.3f", 100*lmLevels3[i], v)
	}
	return s
}

func lmQText(t lmSimTable) string {
	m := t.crit()
	return fmt.Sprintf("1%% %.3f, 5%% %.3f, 10%% %.3f", m["0.01"], m["0.05"], m["0.10"])
}

// fromTable fills the inference from simulated table t (called key) and
// the recalled row pub, if any: the critical values are pub's when our
// simulation reproduced them at exactly these settings, otherwise the
// simulated quantiles, with pub quoted for reference.
func (inf *lmInference) fromTable(stat float64, key string, t lmSimTable, exact bool, what string, pub *lmPub) {
	inf.cv = t.crit()
	inf.cvSource = fmt.Sprintf("our simulation of %s (%s; lm_simtables.go, %s)", what, t.describe(), key)
	if pub != nil {
		switch {
		case pub.reproduced && pub.key == key && pub.complete():
			inf.cv = pub.cv.m()
			inf.cvSource = fmt.Sprintf("%s (from memory), reproduced by our simulation (%s: %s)", pub.cite, t.describe(), lmQText(t))
		case pub.reproduced && pub.key == key:
			inf.cvSource += fmt.Sprintf("; agrees with %s: %s (from memory), reproduced within Monte Carlo error", pub.cite, lmCVText(pub.cv))
		case pub.reproduced:
			inf.cvSource += fmt.Sprintf("; %s: %s (from memory), reproduced by our simulation at its own settings (%s), applies to other settings than these", pub.cite, lmCVText(pub.cv), lmSimTables[pub.key].describe())
		default:
			inf.cvSource += fmt.Sprintf("; %s recalled as %s (from memory) is not reproduced by our simulation (see lm_tables_test.go)", pub.cite, lmCVText(pub.cv))
		}
	}
	p, clamped := t.pvalue(stat)
	inf.pv, inf.hasPV = p, true
	inf.pvMethod = fmt.Sprintf("interpolated in our simulated null quantiles of %s (%s; lm_simtables.go)", what, t.describe())
	if clamped {
		inf.pvMethod += fmt.Sprintf("; the statistic lies outside the table, p-value clamped to %g", p)
	}
	if !exact {
		inf.warnings = append(inf.warnings, "critical values and p-value are simulated for other settings (t-sig lags with kmax 8 and trimming 0.15, or lags 0 and trimming 0.10); use --sims for a Monte Carlo p-value at these settings")
	}
}

// lmNoTable fills the inference when no simulated table exists.
func (inf *lmInference) lmNoTable(pub *lmPub) {
	inf.pvMethod = "none: no simulated table for this variant; use --sims for a Monte Carlo p-value"
	if pub != nil {
		inf.cv = pub.cv.m()
		inf.cvSource = pub.cite + " (from memory, not confirmed)"
	}
}

// applySearchInference sets critical values, p-value and decision of a
// minimum-t search variant; pub overrides the recalled row of lmPubs.
func applySearchInference(res *schema.Result, variant, what string, cfg *core.Config, pub *lmPub) {
	applySearchInferenceT(res, variant, what, cfg, pub, 0)
}

// applySearchInferenceT is applySearchInference at sample size T, used by
// variants whose default-settings table has a T-grid (lmSimGrids).
func applySearchInferenceT(res *schema.Result, variant, what string, cfg *core.Config, pub *lmPub, T int) {
	var inf lmInference
	if p, ok := lmPubs[variant]; ok && pub == nil {
		pub = &p
	}
	key, t, ok, exact, warn := lmTableFor(variant, cfg, T)
	if ok && res.Statistic != nil {
		inf.fromTable(*res.Statistic, key, t, exact, what, pub)
		if warn != "" {
			inf.warnings = append(inf.warnings, warn)
		}
	} else {
		inf.lmNoTable(pub)
	}
	inf.apply(res, cfg)
}

// lmBreakReproduced records whether the recalled break-model tables of Lee
// & Strazicich were reproduced by our simulation of the minimum LM
// statistic (lags 0, trimming 0.10; see TestLMTablesReproduce).
var lmBreakReproduced = map[string]bool{}

// applyLMInference sets critical values, p-value and decision of ls1/ls2
// from our simulated null distribution of the minimum LM statistic (a
// random walk without breaks). Lee & Strazicich tabulate the break model by
// the break fractions λ; their recalled values, interpolated at the
// estimated fractions (linearly in λ, or by inverse squared distance on the
// (λ1, λ2) grid), are quoted with their reproduction status.
func applyLMInference(res *schema.Result, id string, m lmModel, lams []float64, cfg *core.Config, T int) {
	if !m.slope {
		applySearchInferenceT(res, id+"/A", "the minimum LM statistic", cfg, nil, T)
		return
	}
	var pub lmCV
	var cite string
	if id == "ls1" {
		l := math.Min(lams[0], 1-lams[0])
		for j := range pub {
			col := make([]float64, len(ls1BreakCV))
			for i, r := range ls1BreakCV {
				col[i] = r[j]
			}
			pub[j] = InterpLambda(ls1BreakLambda, col, l)
		}
		cite = fmt.Sprintf("Lee & Strazicich (2013), break model, T=100, interpolated at λ=%.3f", lams[0])
	} else {
		w := lmIDW(lams[0], lams[1])
		for i, r := range ls2BreakCV {
			for j := range pub {
				pub[j] += w[i] * r.cv[j]
			}
		}
		cite = fmt.Sprintf("Lee & Strazicich (2003), Table 2, break model, T=100, interpolated at (λ1, λ2) = (%.3f, %.3f)", lams[0], lams[1])
	}
	p := &lmPub{cv: pub, cite: cite, key: id + "/C@0.10", reproduced: lmBreakReproduced[id]}
	applySearchInferenceT(res, id+"/C", "the minimum LM statistic", cfg, p, T)
}
