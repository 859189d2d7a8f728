package core

// Tests of the seasonality diagnosis (seasonality.go), which combines the
// seasonal unit-root test of Hylleberg, Engle, Granger & Yoo (1990, J.
// Econometrics 44, section 3) and Beaulieu & Miron (1993, J. Econometrics
// 55) with an F test on seasonal dummies.

import (
	"context"
	"encoding/csv"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"strconv"
	"testing"
	"time"
)

// co2Stretch reads testdata/co2-concentration.csv (Mauna Loa monthly CO2,
// vega-datasets 3.2.1; see testdata/README.md) and returns the CO2 column
// over its longest stretch of consecutive months, with the first month.
func co2Stretch(t testing.TB) ([]float64, string, int) {
	t.Helper()
	f, err := os.Open("testdata/co2-concentration.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	type obs struct {
		m int
		v float64
		d string
	}
	var all []obs
	for i, rec := range recs[1:] {
		d, err := time.Parse("2006-01-02", rec[0])
		if err != nil {
			t.Fatalf("row %d: %v", i+2, err)
		}
		v, err := strconv.ParseFloat(rec[1], 64)
		if err != nil {
			t.Fatalf("row %d: %v", i+2, err)
		}
		all = append(all, obs{d.Year()*12 + int(d.Month()) - 1, v, rec[0]})
	}
	bestLo, bestHi, lo, gaps := 0, 0, 0, 0
	for i := 1; i <= len(all); i++ {
		if i == len(all) || all[i].m != all[i-1].m+1 {
			if i < len(all) {
				gaps++
			}
			if i-lo > bestHi-bestLo {
				bestLo, bestHi = lo, i
			}
			lo = i
		}
	}
	y := make([]float64, 0, bestHi-bestLo)
	for _, o := range all[bestLo:bestHi] {
		y = append(y, o.v)
	}
	return y, all[bestLo].d, gaps
}

// TestSeasonalityCO2: the Mauna Loa CO2 record has a strong annual cycle
// (common practice, no source: the file's own description says a 4-harmonic
// seasonal fit is subtracted for its adjusted column). On its longest
// gap-free stretch the diagnosis must find the seasonality: the seasonal
// dummies are significant and a seasonal transform is recommended.
func TestSeasonalityCO2(t *testing.T) {
	y, start, gaps := co2Stretch(t)
	if gaps != 3 {
		t.Errorf("the file has %d gaps, the issue reports 3", gaps)
	}
	if len(y) < 240 {
		t.Fatalf("longest stretch %d months", len(y))
	}
	rep, err := Seasonality(context.Background(), y, 12, nil)
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("CO2 from %s, %d months: transform %q (%s); roots at %v; zero-frequency root %v; dummies F %.1f p %.3g share %.2f on %s, %d lags",
		start, len(y), rep.Transform, rep.Reason, rep.RootsAt, rep.ZeroFrequencyRoot, rep.DummyF, rep.DummyP, rep.DummyShare, rep.DummyOn, rep.DummyLags)
	if rep.Transform == SeasonalTransformNone || !rep.Deterministic || rep.DummyP > 1e-6 {
		t.Errorf("seasonality not found in CO2: %+v", rep)
	}
}

// TestSeasonalityDecisions measures how often each transform is
// recommended on three kinds of simulated series (default settings, 5%).
// Measured (seeds fixed in the test; quarterly T = 100, 200 series each;
// monthly T = 240, 100 series each):
//
//   - seasonal random walk y_t = y_{t-S} + e_t: "seasonal difference"
//     quarterly 0.910, monthly 0.950 (bound 0.85);
//   - seasonal means + AR(1) (phi 0.5, amplitude 1): "seasonal dummies"
//     quarterly 1.000, monthly 1.000 (bound 0.85);
//   - white noise: "none" quarterly 0.965, monthly 1.000 (bound 0.85; the
//     dummy F test has size 5%).
func TestSeasonalityDecisions(t *testing.T) {
	if testing.Short() {
		t.Skip("simulation")
	}
	for _, tc := range []struct{ S, T, n int }{{4, 100, 200}, {12, 240, 100}} {
		r := rand.New(rand.NewPCG(uint64(tc.T), 11))
		y := make([]float64, tc.T)
		counts := map[string]map[string]int{"srw": {}, "dummies": {}, "noise": {}}
		for i := 0; i < tc.n; i++ {
			for _, kind := range []string{"srw", "dummies", "noise"} {
				switch kind {
				case "srw":
					SeasonalRandomWalk(y, tc.S, r)
				case "dummies":
					seasonalDummyAR1(y, tc.S, 0.5, 1, r)
				case "noise":
					for j := range y {
						y[j] = r.NormFloat64()
					}
				}
				rep, err := Seasonality(context.Background(), y, tc.S, nil)
				if err != nil {
					t.Fatal(err)
				}
				counts[kind][rep.Transform]++
			}
		}
		n := float64(tc.n)
		rate := func(kind, tr string) float64 { return float64(counts[kind][tr]) / n }
		t.Logf("S=%d T=%d, %d series each: seasonal RW -> difference %.3f; dummies+AR(1) -> dummies %.3f; white noise -> none %.3f (%v)",
			tc.S, tc.T, tc.n, rate("srw", SeasonalTransformDifference), rate("dummies", SeasonalTransformDummies), rate("noise", SeasonalTransformNone), counts)
		for _, c := range []struct{ kind, tr string }{{"srw", SeasonalTransformDifference}, {"dummies", SeasonalTransformDummies}, {"noise", SeasonalTransformNone}} {
			if v := rate(c.kind, c.tr); v < 0.85 {
				t.Errorf("S=%d %s -> %s: rate %.3f < 0.85", tc.S, c.kind, c.tr, v)
			}
		}
	}
}

// TestSeasonalityPeriodConflict: a configured period that differs from the
// one asked for is an error, not silently replaced.
func TestSeasonalityPeriodConflict(t *testing.T) {
	y := make([]float64, 100)
	SeasonalRandomWalk(y, 4, rand.New(rand.NewPCG(1, 1)))
	if _, err := Seasonality(context.Background(), y, 4, &Config{Period: 12}); err == nil {
		t.Fatal("no error for conflicting periods")
	}
}

// ExampleSeasonality diagnoses an invented quarterly series: a random walk
// with fixed quarterly means (+3, -1, -4, +2), which the diagnosis should
// treat with seasonal dummies on the first difference.
func ExampleSeasonality() {
	r := rand.New(rand.NewPCG(2024, 1))
	means := []float64{3, -1, -4, 2}
	y := make([]float64, 120)
	level := 0.0
	for i := range y {
		level += r.NormFloat64()
		y[i] = level + means[i%4]
	}
	rep, err := Seasonality(context.Background(), y, 4, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("seasonal unit roots:", rep.UnitRoots)
	fmt.Println("seasonal means significant:", rep.Deterministic, "in", rep.DummyOn)
	fmt.Println("transform:", rep.Transform)
	// Output:
	// seasonal unit roots: false
	// seasonal means significant: true in first differences
	// transform: seasonal dummies
}

// TestFUpper checks the F tail against closed forms: for d1 = 2,
// P(F ≥ f) = (1 + 2f/d2)^{-d2/2}; for d2 → large d1 F → χ²(d1) with d1 = 2:
// exp(-f); and I_x(a, 1) = x^a (Abramowitz & Stegun 1964, 26.5 and 26.6).
func TestFUpper(t *testing.T) {
	for _, tc := range []struct{ f, d2 float64 }{{0.5, 10}, {3, 10}, {6.6, 40}, {20, 7}} {
		want := math.Pow(1+2*tc.f/tc.d2, -tc.d2/2)
		if got := FUpper(tc.f, 2, tc.d2); math.Abs(got-want) > 1e-12 {
			t.Errorf("F(2,%g) at %g: %g, closed form %g", tc.d2, tc.f, got, want)
		}
	}
	if got := FUpper(3, 2, 1e9); math.Abs(got-math.Exp(-3)) > 1e-7 {
		t.Errorf("F(2, inf) at 3: %g, exp(-3) %g", got, math.Exp(-3))
	}
	for _, x := range []float64{0.1, 0.5, 0.93} {
		if got, want := regIncBeta(x, 3.5, 1), math.Pow(x, 3.5); math.Abs(got-want) > 1e-12 {
			t.Errorf("I_%g(3.5,1) = %g, want %g", x, got, want)
		}
	}
	// 5% points of F(3, 60) = 2.76 and F(3, 120) = 2.68, two decimals
	// (Abramowitz & Stegun 1964, Table 26.9).
	for _, tc := range []struct{ f, d2 float64 }{{2.76, 60}, {2.68, 120}} {
		if p := FUpper(tc.f, 3, tc.d2); math.Abs(p-0.05) > 2e-3 {
			t.Errorf("F(3,%g) at %g: %g, want 0.05", tc.d2, tc.f, p)
		}
	}
	if !math.IsNaN(FUpper(1, 0, 3)) || FUpper(-1, 2, 3) != 1 || FUpper(math.Inf(1), 2, 3) != 0 {
		t.Error("edge cases")
	}
}

// BenchmarkSeasonality is the verdict's call at T = 100 (quarterly) and
// T = 1000 (monthly).
func BenchmarkSeasonality(b *testing.B) {
	for _, tc := range []struct{ S, T int }{{4, 100}, {12, 1000}} {
		b.Run(fmt.Sprintf("S%d_T%d", tc.S, tc.T), func(b *testing.B) {
			y := make([]float64, tc.T)
			seasonalDummyAR1(y, tc.S, 0.5, 1, rand.New(rand.NewPCG(1, 2)))
			b.ReportAllocs()
			for b.Loop() {
				if _, err := Seasonality(context.Background(), y, tc.S, nil); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
