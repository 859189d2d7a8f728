package core

import (
	"context"
	"encoding/binary"
	"encoding/json"
	"errors"
	"math"
	"math/rand/v2"
	"strconv"
	"testing"

	"github.com/rootshift/rootshift/core/schema"
)

// dfRW is a driftless Gaussian random walk plus drift·t.
func dfRW(T int, drift float64, seed uint64) []float64 {
	r := rand.New(rand.NewPCG(seed, 7))
	y := make([]float64, T)
	s := 0.0
	for i := range y {
		s += drift + r.NormFloat64()
		y[i] = s
	}
	return y
}

func dfDiff(y []float64) []float64 {
	d := make([]float64, len(y)-1)
	for i := range d {
		d[i] = y[i+1] - y[i]
	}
	return d
}

// dfRejectRate runs test id on n series from gen and returns the share rejected.
func dfRejectRate(t *testing.T, id string, cfg *Config, n int, gen func(i int) []float64) float64 {
	t.Helper()
	info, err := Lookup(id)
	if err != nil {
		t.Fatal(err)
	}
	rej := 0
	for i := range n {
		res, err := info.Run(context.Background(), gen(i), cfg)
		if err != nil {
			t.Fatalf("%s draw %d: %v", id, i, err)
		}
		if res.Reject {
			rej++
		}
	}
	return float64(rej) / float64(n)
}

// TestADFBehaviour: checks on simulated data (common practice).
func TestADFBehaviour(t *testing.T) {
	const n = 100
	c := &Config{Trend: TrendConstant}
	// A driftless random walk is not rejected at 5% in the large majority of draws.
	if r := dfRejectRate(t, "adf", c, n, func(i int) []float64 { return dfRW(200, 0, uint64(i)) }); r > 0.15 {
		t.Errorf("random walk rejected in %.0f%% of draws", 100*r)
	}
	// Its first difference is rejected. With MAIC, which often picks long
	// lags far from a unit root (Ng & Perron 2001 designed it for the
	// near-unit-root case), in most draws; with BIC (the default) in nearly all.
	maic := &Config{Trend: TrendConstant, LagRule: LagMAIC}
	for _, cc := range []struct {
		cfg  *Config
		want float64
	}{{maic, 0.85}, {c, 0.95}} {
		if r := dfRejectRate(t, "adf", cc.cfg, n, func(i int) []float64 { return dfDiff(dfRW(200, 0, uint64(i))) }); r < cc.want {
			t.Errorf("%v: differenced random walk rejected in only %.0f%% of draws", cc.cfg.LagRule, 100*r)
		}
		// A random walk with drift, differenced, is stationary around its drift.
		if r := dfRejectRate(t, "adf", cc.cfg, n, func(i int) []float64 { return dfDiff(dfRW(200, 0.5, uint64(i))) }); r < cc.want {
			t.Errorf("%v: differenced drifting walk rejected in only %.0f%% of draws", cc.cfg.LagRule, 100*r)
		}
	}
	// A trend-stationary AR(1) is rejected by the trend test and mostly not by
	// the constant-only test.
	ts := func(i int) []float64 {
		u := dfAR1(200, 0.5, uint64(1000+i))
		for j := range u {
			u[j] += 0.1 * float64(j+1)
		}
		return u
	}
	rl := dfRejectRate(t, "adf", &Config{Trend: TrendLinear}, n, ts)
	rc := dfRejectRate(t, "adf", c, n, ts)
	if rl < 0.7 || rc > 0.3 {
		t.Errorf("trend-stationary AR(1): linear rejects %.0f%%, constant rejects %.0f%%", 100*rl, 100*rc)
	}
	// An explosive AR(1) is rejected by the right-tailed test; a random walk rarely.
	ex := func(i int) []float64 {
		r := rand.New(rand.NewPCG(uint64(i), 9))
		y := make([]float64, 100)
		y[0] = 1
		for j := 1; j < len(y); j++ {
			y[j] = 1.05*y[j-1] + r.NormFloat64()
		}
		return y
	}
	rt := &Config{Trend: TrendConstant, RightTail: true}
	if r := dfRejectRate(t, "adf", rt, n, ex); r < 0.9 {
		t.Errorf("explosive root rejected by the right-tailed test in only %.0f%%", 100*r)
	}
	if r := dfRejectRate(t, "adf", rt, n, func(i int) []float64 { return dfRW(200, 0, uint64(i)) }); r > 0.15 {
		t.Errorf("random walk rejected by the right-tailed test in %.0f%%", 100*r)
	}
}

// TestADFSize: the size at 5% under the null (Gaussian random walk, T = 200)
// is within 3 simulation standard errors of 5% (common practice): fixed one
// lag and the default MAIC rule.
func TestADFSize(t *testing.T) {
	const n = 2000
	se := math.Sqrt(0.05 * 0.95 / n)
	for _, c := range []*Config{
		{Trend: TrendConstant, LagRule: LagFixed, Lags: 1},
		{Trend: TrendLinear, LagRule: LagFixed, Lags: 1},
		{Trend: TrendNone, LagRule: LagFixed, Lags: 0},
	} {
		r := dfRejectRate(t, "adf", c, n, func(i int) []float64 { return dfRW(200, 0, uint64(50000+i)) })
		if math.Abs(r-0.05) > 3*se {
			t.Errorf("trend %v: size %.4f, want 0.05 ± %.4f", c.Trend, r, 3*se)
		}
	}
}

// TestADFResultFields: the result carries every field the schema promises.
func TestADFResultFields(t *testing.T) {
	y := dfRW(120, 0, 1)
	res, err := runADF(context.Background(), y, &Config{Trend: TrendLinear, LagRule: LagAIC, MaxLags: 6, Level: 0.10})
	if err != nil {
		t.Fatal(err)
	}
	if res.Test != "adf" || res.Trend != "linear" || res.Tail != "left" || res.LagRule != "aic" || res.Level != 0.10 {
		t.Errorf("fields: %+v", res)
	}
	if res.NObs != 120-res.Lags-1 || res.Lags > 6 {
		t.Errorf("nobs %d with lags %d", res.NObs, res.Lags)
	}
	for _, k := range []string{"0.01", "0.05", "0.10"} {
		if _, ok := res.CriticalValues[k]; !ok {
			t.Errorf("critical value %s missing", k)
		}
	}
	if res.Statistic == nil || res.PValue == nil || res.PValueMethod == "" || res.CriticalSource == "" || res.Null == "" {
		t.Error("statistic, p-value, methods or null missing")
	}
	if res.Reject != (*res.PValue < 0.10) {
		t.Error("reject inconsistent with p-value")
	}
	if _, ok := res.Estimates["rho"]; !ok {
		t.Error("rho estimate missing")
	}
	// The statistic of the simulation hot path equals the full run up to
	// rounding: it takes the t-ratio from cross-products (TStatFast), the
	// run from the QR fit (lags_fast_test.go).
	stat := newADFStat(len(y), &Config{Trend: TrendLinear, LagRule: LagAIC, MaxLags: 6})
	v, err := stat(y)
	if err != nil || math.Abs(v-*res.Statistic) > 1e-10*math.Abs(*res.Statistic) {
		t.Errorf("NewStat %g (%v), Run %g", v, err, *res.Statistic)
	}
	// Simulated p-values are attached when asked for.
	res, err = runADF(context.Background(), y, &Config{Trend: TrendConstant, LagRule: LagFixed, Lags: 1, Sims: 200, Seed: 3})
	if err != nil || res.PValueSim == nil || res.CriticalValuesSim == nil {
		t.Errorf("simulated p-value missing: %v", err)
	}
}

// TestADFErrors: user data never panics and errors carry the test id.
func TestADFErrors(t *testing.T) {
	lin := make([]float64, 50)
	for i := range lin {
		lin[i] = 2 + 0.5*float64(i)
	}
	nan := dfRW(50, 0, 1)
	nan[7] = math.NaN()
	cases := []struct {
		name string
		y    []float64
		cfg  Config
		want error
	}{
		{"short", []float64{1, 2, 3}, Config{}, ErrTooShort},
		{"constant", []float64{5, 5, 5, 5, 5, 5, 5, 5, 5, 5}, Config{}, ErrConstant},
		{"NaN", nan, Config{}, ErrNonFinite},
		{"collinear", lin, Config{Trend: TrendLinear, LagRule: LagFixed}, ErrSingular},
		{"lags too many", dfRW(20, 0, 1), Config{LagRule: LagFixed, Lags: 15}, ErrTooShort},
		{"negative lags", dfRW(20, 0, 1), Config{LagRule: LagFixed, Lags: -1}, ErrSettings},
	}
	for _, id := range []string{"adf", "pp", "kpss"} {
		info, _ := Lookup(id)
		for _, c := range cases {
			if id != "adf" && (c.name == "lags too many" || c.name == "negative lags") {
				continue
			}
			if id == "kpss" && c.name == "collinear" {
				continue
			}
			_, err := info.Run(context.Background(), c.y, &c.cfg)
			var e *Error
			if !errors.As(err, &e) || e.Test != id {
				t.Errorf("%s %s: error %v is not a *core.Error of %s", id, c.name, err, id)
			}
			if id == "pp" && c.name == "collinear" {
				// PP's regression has no lags: a straight line is an exact fit.
				if !errors.Is(err, ErrSingular) && !errors.Is(err, ErrNoEstimate) {
					t.Errorf("pp collinear: %v", err)
				}
				continue
			}
			if !errors.Is(err, c.want) {
				t.Errorf("%s %s: %v, want %v", id, c.name, err, c.want)
			}
		}
	}
}

// dfFuzzSeries decodes bytes into a float series (8 bytes per value).
func dfFuzzSeries(b []byte) []float64 {
	y := make([]float64, 0, len(b)/8)
	for len(b) >= 8 {
		y = append(y, math.Float64frombits(binary.LittleEndian.Uint64(b)))
		b = b[8:]
	}
	return y
}

func dfFuzzSeed(f *testing.F) {
	enc := func(y []float64) []byte {
		b := make([]byte, 8*len(y))
		for i, v := range y {
			binary.LittleEndian.PutUint64(b[8*i:], math.Float64bits(v))
		}
		return b
	}
	f.Add(enc(dfRW(40, 0, 1)), uint8(0), uint8(2))
	f.Add(enc(dfRW(12, 0, 2)), uint8(2), uint8(0))
	f.Add(enc([]float64{1, 1, 1, 1, 1, 1, 1, 1, 1}), uint8(1), uint8(1))
	f.Add(enc([]float64{1e300, -1e300, 1e300, 0, 1, 2, 3, 4, 5, 6}), uint8(0), uint8(3))
	f.Add(enc([]float64{0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10}), uint8(2), uint8(1))
}

// dfFuzzCheck runs test id and checks: an *Error, or a finite statistic and
// a p-value in [0, 1].
func dfFuzzCheck(t *testing.T, id string, y []float64, cfg *Config) {
	info, _ := Lookup(id)
	res, err := info.Run(context.Background(), y, cfg)
	if err != nil {
		var e *Error
		if !errors.As(err, &e) {
			t.Fatalf("%s: error %v is not a *core.Error", id, err)
		}
		return
	}
	if res.Statistic == nil || math.IsNaN(*res.Statistic) || math.IsInf(*res.Statistic, 0) {
		t.Fatalf("%s: invalid statistic %v", id, res.Statistic)
	}
	if res.PValue != nil && !(*res.PValue >= 0 && *res.PValue <= 1) {
		t.Fatalf("%s: p-value %v", id, *res.PValue)
	}
	if _, err := dfSchemaJSON(res); err != nil {
		t.Fatalf("%s: result does not marshal: %v", id, err)
	}
}

func FuzzADF(f *testing.F) {
	dfFuzzSeed(f)
	f.Fuzz(func(t *testing.T, b []byte, trend, lags uint8) {
		cfg := &Config{Trend: Trend(trend % 3), LagRule: LagRule(lags % 6), Lags: int(lags % 5), MaxLags: int(lags % 7), RightTail: lags%2 == 1}
		dfFuzzCheck(t, "adf", dfFuzzSeries(b), cfg)
	})
}

func FuzzPP(f *testing.F) {
	dfFuzzSeed(f)
	f.Fuzz(func(t *testing.T, b []byte, trend, bw uint8) {
		cfg := &Config{Trend: Trend(trend % 3), Kernel: Kernel(bw % 2), BandwidthRule: BandwidthRule(bw % 3), Bandwidth: float64(bw % 9)}
		dfFuzzCheck(t, "pp", dfFuzzSeries(b), cfg)
	})
}

func FuzzKPSS(f *testing.F) {
	dfFuzzSeed(f)
	f.Fuzz(func(t *testing.T, b []byte, trend, bw uint8) {
		cfg := &Config{Trend: Trend(trend % 3), Kernel: Kernel(bw % 2), BandwidthRule: BandwidthRule(bw % 3), Bandwidth: float64(bw % 9)}
		dfFuzzCheck(t, "kpss", dfFuzzSeries(b), cfg)
	})
}

// dfBenchRun benchmarks test id's full Run at T = 100, 1000, 10000.
func dfBenchRun(b *testing.B, id string, cfg *Config) {
	info, _ := Lookup(id)
	for _, n := range []int{100, 1000, 10000} {
		y := dfRW(n, 0, 1)
		b.Run("n="+strconv.Itoa(n), func(b *testing.B) {
			for b.Loop() {
				if _, err := info.Run(context.Background(), y, cfg); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func BenchmarkADF(b *testing.B) { dfBenchRun(b, "adf", &Config{}) }

// BenchmarkADFStat is the simulation hot path (fixed lags) and its
// brute-force twin (a fresh design and core.Leastsq per call).
func BenchmarkADFStat(b *testing.B) {
	for _, n := range []int{100, 1000, 10000} {
		y := dfRW(n, 0, 1)
		cfg := &Config{LagRule: LagFixed, Lags: 2}
		stat := newADFStat(n, cfg)
		b.Run("n="+strconv.Itoa(n), func(b *testing.B) {
			for b.Loop() {
				_, _ = stat(y)
			}
		})
		b.Run("brute/n="+strconv.Itoa(n), func(b *testing.B) {
			for b.Loop() {
				X, dep := dfBruteDesign(y, TrendConstant, 2, 4)
				_, _ = Leastsq(X, dep)
			}
		})
	}
}

// dfSchemaJSON marshals a result (every field must be JSON-representable:
// no NaN may reach a float field).
func dfSchemaJSON(r *schema.Result) ([]byte, error) { return json.Marshal(r) }
