package report

import (
	"fmt"
	"math"
	"math/rand/v2"

	"github.com/rootshift/rootshift/core/dataset"
	"github.com/rootshift/rootshift/core/schema"
)

// The fixture is a hand-built document: every number in it is invented to
// exercise the writers (common practice, no source); none is a published
// value and none is claimed to be the output of a test.

func fp(x float64) *float64 { return &x }
func ip(i int) *int         { return &i }

// quarters returns n quarterly labels starting at 1990Q1.
func quarters(n int) []string {
	out := make([]string, n)
	for i := range out {
		out[i] = fmt.Sprintf("%dQ%d", 1990+i/4, i%4+1)
	}
	return out
}

// fixtureInputs returns the two prepared series of the fixture: a trending
// series with a level shift after observation 30 (quarterly dates) and an
// undated series with one missing value. Seeded PCG, so stable.
func fixtureInputs() []dataset.Series {
	r := rand.New(rand.NewPCG(8, 1))
	a := make([]float64, 60)
	for i := range a {
		a[i] = 100 + 0.5*float64(i+1) + r.NormFloat64()
		if i+1 > 30 {
			a[i] += 8
		}
	}
	b := make([]float64, 40)
	level := 2.0
	for i := range b {
		level += r.NormFloat64() * 0.3
		b[i] = level
	}
	b[12] = math.NaN()
	return []dataset.Series{
		{Name: "GDP_real & co %", Column: 1, Values: a, Dates: quarters(60), Frequency: "quarterly"},
		{Name: "CPI #2 {x}$", Column: 2, Values: b},
	}
}

// fixtureDoc returns the document matching fixtureInputs: a plain test, an
// M-tests result with components, a break test with path and a break with a
// confidence interval, a two-break test with a surface, a bp result with
// break tests, an explosive result with episodes and sequence, a kernel
// test, a verdict, simulated p-values, errors and warnings.
func fixtureDoc() *schema.Document {
	dates := quarters(60)
	path := make([]schema.PathPoint, 0, 33)
	for i := 10; i <= 51; i++ {
		d := float64(i-30) / 5
		path = append(path, schema.PathPoint{Index: i, Statistic: -3 - 2.2345*math.Exp(-d*d)})
	}
	rows := make([]schema.PathPoint, 0, 30)
	for i := 10; i <= 40; i++ {
		d := float64(i-30) / 6
		rows = append(rows, schema.PathPoint{Index: i, Statistic: -3.5 - 2.4*math.Exp(-d*d)})
	}
	seq := &schema.Sequence{Name: "BSADF", Level: 0.05}
	for i := 15; i <= 60; i++ {
		v := -1.2 + 0.01*float64(i)
		if i >= 40 && i <= 46 {
			v = 1.9 + 0.1*float64(i-40)
		}
		seq.Index = append(seq.Index, i)
		seq.Values = append(seq.Values, v)
		seq.Critical = append(seq.Critical, 1.2+0.005*float64(i))
	}
	za := schema.Break{Index: 30, Date: dates[29], Fraction: 0.5, Lower: 27, Upper: 33,
		LowerDate: dates[26], UpperDate: dates[32], CILevel: 0.9}
	a := schema.Series{
		Name: "GDP_real & co %", N: 60, Start: dates[0], End: dates[59], Frequency: "quarterly",
		Transform: "log",
		Results: []schema.Result{
			{
				Test: "adf", Trend: "constant", Statistic: fp(-1.81234), PValue: fp(0.37121),
				PValueMethod:   "MacKinnon (2010) response surface",
				CriticalValues: map[string]float64{"0.01": -3.5461, "0.05": -2.9117, "0.10": -2.5935},
				CriticalSource: "MacKinnon (2010)", Tail: "left", Lags: 2, LagRule: "maic", NObs: 57,
				Null: "unit root", Level: 0.05, Estimates: map[string]float64{"rho": 0.94321},
			},
			{
				Test: "mtests", Variant: "GLS", Trend: "constant", Statistic: fp(-9.1234),
				PValueMethod:   "no p-value; critical values from Ng & Perron (2001), Table 1",
				CriticalValues: map[string]float64{"0.01": -13.8, "0.05": -8.1, "0.10": -5.7},
				Tail:           "left", Lags: 1, LagRule: "maic", NObs: 58, Null: "unit root", Reject: true, Level: 0.05,
				Components: []schema.Component{
					{Name: "MZa", Statistic: fp(-9.1234), CriticalValues: map[string]float64{"0.01": -13.8, "0.05": -8.1, "0.10": -5.7}, Tail: "left", Reject: true},
					{Name: "MZt", Statistic: fp(-2.0456), CriticalValues: map[string]float64{"0.01": -2.58, "0.05": -1.98, "0.10": -1.62}, Tail: "left", Reject: true},
					{Name: "MSB", Statistic: fp(0.2234), CriticalValues: map[string]float64{"0.01": 0.174, "0.05": 0.233, "0.10": 0.275}, Tail: "left", Reject: true},
					{Name: "MPT", Statistic: schema.F(math.NaN()), Tail: "left"},
				},
			},
			{
				Test: "za", Trend: "constant", Shift: "level", Statistic: fp(-5.2345),
				PValueMethod:   "none: critical values only (Zivot & Andrews 1992, Table 2)",
				CriticalValues: map[string]float64{"0.01": -5.34, "0.05": -4.80, "0.10": -4.58},
				CriticalSource: "Zivot & Andrews (1992), Table 2", Tail: "left", Lags: 3, LagRule: "tsig", NObs: 56,
				Null: "unit root without break", Reject: true, Level: 0.05,
				Breaks: []schema.Break{za}, Path: path,
				Warnings: []string{"break close to the trimming bound"},
			},
			{
				Test: "ls2", Trend: "constant", Shift: "level", Statistic: fp(-5.9), PValueMethod: "none",
				CriticalValues: map[string]float64{"0.01": -4.545, "0.05": -3.842, "0.10": -3.504},
				Tail:           "left", Lags: 4, LagRule: "tsig", NObs: 55, Null: "unit root with breaks", Reject: true, Level: 0.05,
				Breaks: []schema.Break{
					{Index: 30, Date: dates[29], Fraction: 0.5},
					{Index: 44, Date: dates[43], Fraction: 44.0 / 60},
				},
				Surface: &schema.Surface{Candidates: 465, Min: -5.9, Max: -2.1234, Rows: rows},
			},
			{
				Test: "bp", Trend: "constant", PValueMethod: "Bai & Perron (2003) critical values",
				CriticalValues: map[string]float64{}, Tail: "right", NObs: 60,
				Null: "no structural break", Reject: true, Level: 0.05,
				BreakTests: []schema.Component{
					{Name: "supF(1|0)", Statistic: fp(42.5), PValue: fp(0.0004), CriticalValues: map[string]float64{"0.05": 8.58}, Tail: "right", Reject: true},
					{Name: "supF(2|1)", Statistic: fp(3.1), CriticalValues: map[string]float64{"0.05": 10.13}, Tail: "right"},
				},
				Breaks: []schema.Break{{Index: 30, Date: dates[29], Fraction: 0.5, Lower: 28, Upper: 31, LowerDate: dates[27], UpperDate: dates[30], CILevel: 0.95}},
			},
			{
				Test: "gsadf", Trend: "constant", Statistic: fp(2.4567), PValue: fp(0.012),
				PValueMethod:   "our simulation",
				CriticalValues: map[string]float64{"0.01": 2.71, "0.05": 2.05, "0.10": 1.78},
				Tail:           "right", Lags: 0, LagRule: "fixed", NObs: 60,
				Null: "unit root (no explosive episode)", Reject: true, Level: 0.05,
				Episodes: []schema.Episode{{Start: schema.Point{Index: 40, Date: dates[39]}, End: schema.Point{Index: 46, Date: dates[45]}}},
				Sequence: seq,
			},
			{
				Test: "kpss", Trend: "constant", Statistic: fp(0.8512), PValue: fp(0.01),
				PValueMethod:   "response surface; the statistic lies beyond the table, p-value bounded at 0.01",
				CriticalValues: map[string]float64{"0.01": 0.739, "0.05": 0.463, "0.10": 0.347},
				Tail:           "right", Lags: 4, NObs: 60, Null: "stationary", Reject: true, Level: 0.05,
				Bandwidth: fp(4), Kernel: "bartlett",
			},
		},
		Verdict: &schema.Verdict{
			Class: "break-stationary", Order: ip(0), Transform: "shift-dummies",
			Breaks: []schema.Break{za},
			Window: &schema.WindowCheck{From: "1996Q1", To: "1998Q4", BreakInside: true, FromIndex: 25, ToIndex: 36,
				Answer: "yes: a break at 1997Q2"},
			Stages: []schema.Stage{
				{Name: "trend", Decision: "trending", Method: "t-test on the trend term", Statistic: fp(6.25), PValue: fp(0.00002), Level: 0.05},
				{Name: "unit-root", Decision: "no unit root once the break is allowed", Method: "za, level shift, table critical values", Statistic: fp(-5.2345), PValue: fp(0.0312), Level: 0.05},
				{Name: "breaks", Decision: "one break", Method: "bp sequential"},
			},
			Context:     []string{"gsadf finds an explosive episode 1999Q4..2001Q2 (not used for the class)"},
			Reliability: &schema.Reliability{T: 60, Source: "table", Headline: "At T=60 the procedure gives a stationary-with-breaks process another class in 18% of draws, and calls another process break-stationary in at most 7%.", WrongRate: fp(0.07)},
			Explanation: "The tests that allow a level shift reject a unit root, while the tests that ignore it do not: " +
				"the series looks persistent only because its level moved up once, in 1997Q2. Treat it as stationary " +
				"around a shifted mean and model the shift with a dummy rather than differencing.",
			Supporting: []string{"za rejects a unit root at 5% with a break at 1997Q2", "bp finds one break at 1997Q2"},
			Against:    []string{"adf cannot reject a unit root (it ignores the break)", "kpss rejects stationarity (it ignores the break)"},
			Tests:      []string{"adf", "kpss", "za", "bp"},
		},
		Errors: []schema.Error{},
	}
	b := schema.Series{
		Name: "CPI #2 {x}$", N: 40, Transform: "",
		Results: []schema.Result{
			{
				Test: "pp", Variant: "Z(t)", Trend: "linear", Statistic: fp(-2.1), PValue: fp(0.5312),
				PValueMethod: "MacKinnon (2010) response surface", PValueSim: fp(0.499),
				SimMethod:         "999 replications, seed 42, Gaussian random walk",
				CriticalValues:    map[string]float64{"0.01": -4.2191, "0.05": -3.5331, "0.10": -3.1983},
				CriticalValuesSim: map[string]float64{"0.01": -4.30, "0.05": -3.56, "0.10": -3.21},
				Tail:              "left", Lags: 3, NObs: 39, Null: "unit root", Level: 0.05,
				Bandwidth: fp(3.25), Kernel: "bartlett",
			},
		},
		Errors: []schema.Error{
			{Test: "za", Message: "za: series too short: 39 observations, need 40"},
			{Row: 13, Column: "CPI #2 {x}$", Message: "cell \"n.a.\" is not a number; treated as missing"},
		},
		Warnings: []string{"1 missing value (row 13) left out of the tests"},
	}
	return &schema.Document{
		Schema: schema.ID, Version: "0.1.0",
		Settings: schema.Settings{Tests: []string{"adf", "mtests", "za", "ls2", "bp", "gsadf", "kpss", "pp"},
			Sims: 999, Seed: 42, Level: 0.05, Window: "1996Q1:1998Q4"},
		Source:  &schema.Source{Name: "macro_data.csv", Rows: 60, DateColumn: "date", Frequency: "quarterly"},
		Series:  []schema.Series{a, b},
		Caution: schema.Caution,
	}
}
