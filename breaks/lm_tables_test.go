package breaks

//go:generate go test -run TestGenerateLMTables -genlm -timeout 60m

import (
	"bytes"
	"context"
	"flag"
	"fmt"
	"go/format"
	"math"
	"math/rand/v2"
	"os"
	"strings"
	"testing"

	"github.com/rootshift/rootshift/core"
)

var (
	genLM     = flag.Bool("genlm", false, "regenerate lm_simtables.go (slow)")
	genLMOnly = flag.String("genlmonly", "", "with -genlm: simulate only these comma-separated keys (grid tables as key@T<T>, e.g. ls1/A@T200), copy the others from the current lm_simtables.go")
)

// lmTableSpec is one simulated table: the statistic under the Gaussian
// random-walk null at length T, with the default lag rule (t-sig, kmax 8)
// or lags fixed at 0.
type lmTableSpec struct {
	key  string
	reps int
	trim float64
	lags string
	// stat returns a fresh statistic function (one per worker).
	stat func(T int) func(y []float64) (float64, error)
}

const (
	lmTableT    = 100
	lmTableSeed = 20030601
)

// lmGridSpec adds tables of the default-settings spec key at the sample
// sizes Ts (besides lmTableT) to lmSimGrids; the lookup interpolates them
// linearly in 1/T (lmAtT). Replication r of the table at T of spec i (its
// index in lmTableSpecs) draws from rand.NewPCG(lmTableSeed+1000*T+i, r).
// With -genlmonly a grid table is named key@T<T>, e.g. ls1/A@T200.
type lmGridSpec struct {
	key  string
	reps int
	Ts   []int
}

var lmGridSpecs = []lmGridSpec{
	{"ls1/A", 10000, []int{50, 200, 400}},
	{"ls1/C", 10000, []int{50, 200, 400}},
	// ls2 is O(T^2) per replication (about 0.5 s at T=400): grid 50-200.
	{"ls2/A", 2000, []int{50, 200}},
	{"ls2/C", 2000, []int{50, 200}},
}

func lmGridSeed(T, i int) uint64 { return uint64(lmTableSeed + 1000*T + i) }

// writeLMTable writes one generated table literal.
func writeLMTable(b *bytes.Buffer, prefix string, t lmSimTable) {
	fmt.Fprintf(b, "\t%s{T: %d, Reps: %d, Seed: %d, Trim: %g, Lags: %q, Q: []float64{", prefix, t.T, t.Reps, t.Seed, t.Trim, t.Lags)
	for j, q := range t.Q {
		if j > 0 {
			b.WriteString(", ")
		}
		fmt.Fprintf(b, "%.4f", q)
	}
	b.WriteString("}},\n")
}

// genLMTable simulates spec sp at T and returns the table.
func genLMTable(t *testing.T, sp lmTableSpec, T, reps int, seed uint64) lmSimTable {
	d, err := simulateLMTable(sp, T, reps, seed)
	if err != nil {
		t.Fatal(sp.key, err)
	}
	tb := lmSimTable{T: T, Reps: reps, Seed: seed, Trim: sp.trim, Lags: sp.lags}
	for _, p := range lmSimProbs {
		tb.Q = append(tb.Q, d.Quantile(p))
	}
	t.Logf("%s T=%d: 1%% %.3f (se %.3f) 5%% %.3f (se %.3f) 10%% %.3f (se %.3f), failed %d", sp.key, T,
		d.Quantile(0.01), d.QuantileSE(0.01), d.Quantile(0.05), d.QuantileSE(0.05), d.Quantile(0.10), d.QuantileSE(0.10), d.Failed)
	return tb
}

func lmRegistered(id string, shift core.Shift, trim float64, lags string) func(T int) func(y []float64) (float64, error) {
	return func(T int) func(y []float64) (float64, error) {
		id, cfg := msCase(id, &core.Config{Shift: shift, Trim: trim})
		info, err := core.Lookup(id)
		if err != nil {
			panic(err)
		}
		if lags == "0" {
			cfg.LagRule = core.LagFixed
		}
		f := info.NewStat(T, cfg)
		return func(y []float64) (float64, error) { return f(y) }
	}
}

func lmTableSpecs() []lmTableSpec {
	s := []lmTableSpec{
		{"ls1/A", 10000, 0.15, "tsig", lmRegistered("ls1", core.ShiftLevel, 0.15, "tsig")},
		{"ls1/A@0.10", 20000, 0.10, "0", lmRegistered("ls1", core.ShiftLevel, 0.10, "0")},
		{"ls2/A", 2000, 0.15, "tsig", lmRegistered("ls2", core.ShiftLevel, 0.15, "tsig")},
		{"ls2/A@0.10", 2000, 0.10, "0", lmRegistered("ls2", core.ShiftLevel, 0.10, "0")},
		{"lp/AA", 2000, 0.15, "tsig", lmRegistered("lp", core.ShiftLevel, 0.15, "tsig")},
		{"lp/CC", 2000, 0.15, "tsig", lmRegistered("lp", core.ShiftBoth, 0.15, "tsig")},
		{"meanshift/innovational-1", 10000, 0.15, "tsig", lmRegistered("meanshift/innovational-1", core.ShiftLevel, 0.15, "tsig")},
		{"meanshift/additive-1", 10000, 0.15, "tsig", lmRegistered("meanshift/additive-1", core.ShiftLevel, 0.15, "tsig")},
		{"meanshift/innovational-2", 2000, 0.15, "tsig", lmRegistered("meanshift/innovational-2", core.ShiftLevel, 0.15, "tsig")},
		{"meanshift/additive-2", 2000, 0.15, "tsig", lmRegistered("meanshift/additive-2", core.ShiftLevel, 0.15, "tsig")},
	}
	// Break model: the minimum LM statistic under the no-break null.
	s = append(s,
		lmTableSpec{"ls1/C", 10000, 0.15, "tsig", lmRegistered("ls1", core.ShiftBoth, 0.15, "tsig")},
		lmTableSpec{"ls1/C@0.10", 10000, 0.10, "0", lmRegistered("ls1", core.ShiftBoth, 0.10, "0")},
		lmTableSpec{"ls2/C", 2000, 0.15, "tsig", lmRegistered("ls2", core.ShiftBoth, 0.15, "tsig")},
		lmTableSpec{"ls2/C@0.10", 2000, 0.10, "0", lmRegistered("ls2", core.ShiftBoth, 0.10, "0")},
	)
	return s
}

// simulateLMTable runs one table's simulation.
func simulateLMTable(sp lmTableSpec, T, reps int, seed uint64) (*core.Distribution, error) {
	return core.Simulate(context.Background(), core.SimSpec{Reps: reps, Seed: seed}, func() func(r *rand.Rand) (float64, error) {
		f := sp.stat(T)
		y := make([]float64, T)
		return func(r *rand.Rand) (float64, error) {
			core.RandomWalk(y, r)
			return f(y)
		}
	})
}

// TestGenerateLMTables regenerates lm_simtables.go with -genlm. It is the
// in-repo generator of the simulated null quantiles.
func TestGenerateLMTables(t *testing.T) {
	if !*genLM {
		t.Skip("run with -genlm to regenerate lm_simtables.go")
	}
	var b bytes.Buffer
	b.WriteString("// Code generated by TestGenerateLMTables (go test ./breaks -run TestGenerateLMTables -genlm); DO NOT EDIT.\n\n")
	b.WriteString("package breaks\n\n")
	fmt.Fprintf(&b, "// lmSimTables holds null quantiles at lmSimProbs simulated under a Gaussian\n// random walk of length %d (lag rule in Lags); replication r of table i\n// draws from rand.NewPCG(%d+i, r).\n", lmTableT, lmTableSeed)
	b.WriteString("var lmSimTables = map[string]lmSimTable{\n")
	specs := lmTableSpecs()
	only := map[string]bool{}
	for _, k := range strings.Split(*genLMOnly, ",") {
		if k != "" {
			only[k] = true
		}
	}
	index := map[string]int{}
	for i, sp := range specs {
		index[sp.key] = i
		seed := uint64(lmTableSeed + i)
		if old, ok := lmSimTables[sp.key]; ok && len(only) > 0 && !only[sp.key] {
			if old.Seed != seed || old.Reps != sp.reps {
				t.Fatalf("%s: stored table has seed %d reps %d, spec wants %d, %d: regenerate it", sp.key, old.Seed, old.Reps, seed, sp.reps)
			}
			writeLMTable(&b, fmt.Sprintf("%q: ", sp.key), old)
			continue
		}
		writeLMTable(&b, fmt.Sprintf("%q: ", sp.key), genLMTable(t, sp, lmTableT, sp.reps, seed))
	}
	b.WriteString("}\n\n")
	b.WriteString("// lmSimGrids holds, for the variants with a T-grid, the tables of the same\n// statistic and settings as lmSimTables at other sample sizes T; replication\n// r of the table at T of the spec with index i in lmTableSpecs draws from\n")
	fmt.Fprintf(&b, "// rand.NewPCG(%d+1000*T+i, r).\n", lmTableSeed)
	b.WriteString("var lmSimGrids = map[string][]lmSimTable{\n")
	for _, g := range lmGridSpecs {
		i, ok := index[g.key]
		if !ok {
			t.Fatalf("grid spec %s has no table spec", g.key)
		}
		sp := specs[i]
		fmt.Fprintf(&b, "\t%q: {\n", g.key)
		for _, T := range g.Ts {
			seed := lmGridSeed(T, i)
			name := fmt.Sprintf("%s@T%d", g.key, T)
			if len(only) > 0 && !only[name] {
				var old *lmSimTable
				for _, o := range lmSimGrids[g.key] {
					if o.T == T {
						old = &o
					}
				}
				if old == nil || old.Seed != seed || old.Reps != g.reps {
					t.Fatalf("%s: stored grid table missing or with other seed/reps: regenerate it", name)
				}
				writeLMTable(&b, "", *old)
				continue
			}
			writeLMTable(&b, "", genLMTable(t, sp, T, g.reps, seed))
		}
		b.WriteString("\t},\n")
	}
	b.WriteString("}\n")
	src, err := format.Source(b.Bytes())
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile("lm_simtables.go", src, 0o644); err != nil {
		t.Fatal(err)
	}
}

// TestRecalledValues pins every recalled critical value used by ls1, ls2,
// lp and meanshift to its source. All are MEMORY values (not checked against
// the papers); see lm_tables.go and TestLMTablesReproduce for which ones
// our simulation reproduces.
func TestRecalledValues(t *testing.T) {
	cases := []struct {
		name string
		got  []float64
		want []float64
	}{
		// Lee & Strazicich (2013), Economics Bulletin 33(4), crash model, T=100, 1/5/10%: MEMORY (l/m).
		{"ls1 crash", ls1CrashCV[:], []float64{-4.239, -3.566, -3.211}},
		// Lee & Strazicich (2013), break model, T=100, λ = 0.1..0.5: MEMORY (l/m).
		{"ls1 break λ=0.1", ls1BreakCV[0][:], []float64{-5.11, -4.50, -4.21}},
		{"ls1 break λ=0.2", ls1BreakCV[1][:], []float64{-5.07, -4.47, -4.20}},
		{"ls1 break λ=0.3", ls1BreakCV[2][:], []float64{-5.15, -4.45, -4.18}},
		{"ls1 break λ=0.4", ls1BreakCV[3][:], []float64{-5.05, -4.50, -4.18}},
		{"ls1 break λ=0.5", ls1BreakCV[4][:], []float64{-5.11, -4.51, -4.17}},
		// Lee & Strazicich (2003), REStat 85(4), Table 2, crash model, T=100: MEMORY (m/h).
		{"ls2 crash", ls2CrashCV[:], []float64{-4.545, -3.842, -3.504}},
		// Lee & Strazicich (2003), Table 2, break model, T=100, by (λ1, λ2): MEMORY (m).
		{"ls2 break 0.2/0.4", ls2BreakCV[0].cv[:], []float64{-6.16, -5.59, -5.27}},
		{"ls2 break 0.2/0.6", ls2BreakCV[1].cv[:], []float64{-6.41, -5.74, -5.32}},
		{"ls2 break 0.2/0.8", ls2BreakCV[2].cv[:], []float64{-6.33, -5.71, -5.33}},
		{"ls2 break 0.4/0.6", ls2BreakCV[3].cv[:], []float64{-6.45, -5.67, -5.31}},
		{"ls2 break 0.4/0.8", ls2BreakCV[4].cv[:], []float64{-6.42, -5.65, -5.32}},
		{"ls2 break 0.6/0.8", ls2BreakCV[5].cv[:], []float64{-6.32, -5.73, -5.32}},
		// Lumsdaine & Papell (1997), REStat 79(2), model AA and CC, T=100: MEMORY (l; l/m).
		{"lp AA", lpAACV[:], []float64{-6.74, -6.16, -5.89}},
		{"lp CC", lpCCCV[:], []float64{-7.34, -6.82, -6.49}},
		// Clemente, Montanes & Reyes (1998), Economics Letters 59(2), two mean shifts, 5%: MEMORY (m).
		{"meanshift 2 shifts 5%", []float64{twoShiftCV5}, []float64{-5.490}},
		// Perron & Vogelsang (1992), JBES 10(3), non-trending, one shift, 5%, IO and AO: MEMORY (l/m).
		{"pv IO 5%", []float64{pvIO1CV5}, []float64{-4.27}},
		{"pv AO 5%", []float64{pvAO1CV5}, []float64{-3.56}},
	}
	for _, c := range cases {
		for i := range c.want {
			if c.got[i] != c.want[i] {
				t.Errorf("%s[%d] = %v, want %v", c.name, i, c.got[i], c.want[i])
			}
		}
	}
	for i, p := range ls2Pairs {
		if ls2BreakCV[i].l1 != p[0] || ls2BreakCV[i].l2 != p[1] {
			t.Errorf("ls2 break table row %d at (%v, %v), grid (%v, %v)", i, ls2BreakCV[i].l1, ls2BreakCV[i].l2, p[0], p[1])
		}
	}
}

// TestSimTablePValue: the p-value interpolation inverts the tabulated
// quantiles and is monotone (common practice).
func TestSimTablePValue(t *testing.T) {
	for key, tb := range lmSimTables {
		if len(tb.Q) != len(lmSimProbs) {
			t.Fatalf("%s: %d quantiles", key, len(tb.Q))
		}
		for i, p := range lmSimProbs {
			if i > 0 && tb.Q[i] < tb.Q[i-1] {
				t.Errorf("%s: quantiles not increasing at %v", key, p)
			}
			if got, _ := tb.pvalue(tb.Q[i]); i > 0 && tb.Q[i] > tb.Q[i-1] && math.Abs(got-p) > 1e-12 {
				t.Errorf("%s: pvalue(q(%v)) = %v", key, p, got)
			}
		}
		prev := 0.0
		for x := tb.Q[0] - 1; x < tb.Q[len(tb.Q)-1]+1; x += 0.01 {
			p, _ := tb.pvalue(x)
			if p < prev {
				t.Fatalf("%s: p-value decreases at %v", key, x)
			}
			prev = p
		}
	}
}

// lmQuantileSE approximates the Monte Carlo standard error of the
// tabulated quantile at probability index i: sqrt(p(1-p)/n) / f, with the
// density f from the neighbouring tabulated quantiles.
func lmQuantileSE(t lmSimTable, i int) float64 {
	lo, hi := max(i-1, 0), min(i+1, len(lmSimProbs)-1)
	f := (lmSimProbs[hi] - lmSimProbs[lo]) / (t.Q[hi] - t.Q[lo])
	p := lmSimProbs[i]
	return math.Sqrt(p*(1-p)/float64(t.Reps)) / f
}

func lmProbIndex(p float64) int {
	for i, q := range lmSimProbs {
		if q == p {
			return i
		}
	}
	panic("probability not tabulated")
}

// lmAgrees reports whether the recalled row pub agrees with table t within
// 3 Monte Carlo standard errors plus 0.01 for the rounding of the recalled
// values, at every level pub has.
func lmAgrees(pub lmCV, t lmSimTable) (bool, string) {
	ok := true
	msg := ""
	for j, p := range lmLevels3 {
		if math.IsNaN(pub[j]) {
			continue
		}
		i := lmProbIndex(p)
		se := lmQuantileSE(t, i)
		d := math.Abs(pub[j] - t.Q[i])
		if d > 3*se+0.01 {
			ok = false
		}
		msg += fmt.Sprintf(" %g%%: recalled %.3f ours %.3f (se %.3f)", 100*p, pub[j], t.Q[i], se)
	}
	return ok, msg
}

// TestLMTablesReproduce checks the reproduction status claimed for every
// recalled table against our simulated tables (lm_simtables.go): a row is
// cited as published only when our simulation at the paper's settings
// agrees with it within Monte Carlo error, and the claim must stay true.
// Current outcome (T=100): Lee & Strazicich (2003) crash model and
// Lumsdaine & Papell (1997) AA and CC are reproduced; Lee & Strazicich
// (2013) crash model, Perron & Vogelsang (1992) and Clemente, Montanes &
// Reyes (1998) are not (see the log).
func TestLMTablesReproduce(t *testing.T) {
	for variant, pub := range lmPubs {
		tb, ok := lmSimTables[pub.key]
		if !ok {
			t.Errorf("%s: no simulated table %s", variant, pub.key)
			continue
		}
		agree, msg := lmAgrees(pub.cv, tb)
		t.Logf("%s vs %s (%s):%s", pub.cite, pub.key, tb.describe(), msg)
		if agree != pub.reproduced {
			t.Errorf("%s: reproduction claimed %v, simulation says %v:%s", variant, pub.reproduced, agree, msg)
		}
	}
	for _, id := range []string{"ls1", "ls2"} {
		tb, ok := lmSimTables[id+"/C@0.10"]
		if !ok {
			t.Errorf("no break-model table for %s", id)
			continue
		}
		// The minimum LM statistic under the no-break null does not depend
		// on λ; compare each recalled λ row with it.
		var rows []lmCV
		if id == "ls1" {
			rows = ls1BreakCV
		} else {
			for _, r := range ls2BreakCV {
				rows = append(rows, r.cv)
			}
		}
		all := true
		for i, r := range rows {
			agree, msg := lmAgrees(r, tb)
			all = all && agree
			t.Logf("%s break model row %d vs %s/C@0.10:%s", id, i, id, msg)
		}
		if all != lmBreakReproduced[id] {
			t.Errorf("%s break model: reproduction claimed %v, simulation says %v", id, lmBreakReproduced[id], all)
		}
	}
}

// TestLS1CrashSimulation re-simulates the one-break crash-model table at
// T=100 (lags 0, trimming 0.10, the setting of Lee & Strazicich 2013) with a
// fresh seed: it must agree with lm_simtables.go within Monte Carlo error
// (the generated file is what the code computes). Against the recalled Lee
// & Strazicich (2013) values (-4.239, -3.566, -3.211; MEMORY) our values
// are 0.03-0.09 less negative, more than 3 standard errors at 1% and 5%:
// the recalled values are not reproduced, and not cited as published.
func TestLS1CrashSimulation(t *testing.T) {
	if testing.Short() {
		t.Skip("simulation")
	}
	sp := lmTableSpec{"ls1/A@0.10", 4000, 0.10, "0", lmRegistered("ls1", core.ShiftLevel, 0.10, "0")}
	d, err := simulateLMTable(sp, lmTableT, sp.reps, 777)
	if err != nil {
		t.Fatal(err)
	}
	tb := lmSimTables["ls1/A@0.10"]
	for _, p := range lmLevels3 {
		i := lmProbIndex(p)
		q, se := d.Quantile(p), d.QuantileSE(p)
		t.Logf("%g%%: live %.3f (se %.3f), table %.3f, recalled Lee & Strazicich (2013) %.3f", 100*p, q, se, tb.Q[i], ls1CrashCV[lmProbIndex3(p)])
		if math.Abs(q-tb.Q[i]) > 4*math.Hypot(se, lmQuantileSE(tb, i)) {
			t.Errorf("%g%%: live simulation %.3f disagrees with the table %.3f", 100*p, q, tb.Q[i])
		}
	}
}

func lmProbIndex3(p float64) int {
	for i, q := range lmLevels3 {
		if q == p {
			return i
		}
	}
	panic("level")
}
