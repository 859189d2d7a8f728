package core

import (
	"context"
	"math"
	"testing"
)

// TestPPNoCorrectionAtZeroBandwidth: with l = 0 the long-run variance equals
// γ̂0, so Z(t) is the Dickey-Fuller t-ratio and Z(α) the normalized bias n·ρ̂
// (Phillips & Perron 1988: the corrections vanish when λ² = γ0).
func TestPPNoCorrectionAtZeroBandwidth(t *testing.T) {
	y := dfRW(150, 0, 4)
	var w DFWork
	for _, tr := range []Trend{TrendNone, TrendConstant, TrendLinear} {
		st, err := PhillipsPerron(&w, y, tr, KernelBartlett, BandwidthFixed, 0)
		if err != nil {
			t.Fatal(err)
		}
		f, _ := w.Regress(y, tr, 0, 0)
		if math.Abs(st.ZT-f.TStat) > 1e-12 || math.Abs(st.ZAlpha-float64(f.NObs)*f.Rho) > 1e-10 {
			t.Errorf("%v: Z(t) %g vs t %g; Z(α) %g vs nρ %g", tr, st.ZT, f.TStat, st.ZAlpha, float64(f.NObs)*f.Rho)
		}
	}
}

// TestPPBehaviour: checks on simulated data (common practice): a random walk
// is rarely rejected, its difference and an AR(1) around a constant nearly
// always; the result reports both Z(α) and Z(t).
func TestPPBehaviour(t *testing.T) {
	c := &Config{}
	if r := dfRejectRate(t, "pp", c, 100, func(i int) []float64 { return dfRW(200, 0, uint64(i)) }); r > 0.15 {
		t.Errorf("random walk rejected in %.0f%%", 100*r)
	}
	if r := dfRejectRate(t, "pp", c, 100, func(i int) []float64 { return dfDiff(dfRW(200, 0, uint64(i))) }); r < 0.95 {
		t.Errorf("difference rejected in only %.0f%%", 100*r)
	}
	if r := dfRejectRate(t, "pp", &Config{Kernel: KernelQS, BandwidthRule: BandwidthAndrews}, 100, func(i int) []float64 { return dfAR1(200, 0.5, uint64(i)) }); r < 0.95 {
		t.Errorf("AR(1) rejected in only %.0f%%", 100*r)
	}
	res, err := runPP(context.Background(), dfRW(100, 0, 3), &Config{Trend: TrendLinear})
	if err != nil {
		t.Fatal(err)
	}
	if res.Variant != "Z(t)" || len(res.Components) != 2 || res.Components[0].Name != "Z(alpha)" || res.Components[1].Name != "Z(t)" {
		t.Errorf("components %+v", res.Components)
	}
	if res.Bandwidth == nil || res.Kernel != "bartlett" || res.NObs != 99 || res.PValue == nil {
		t.Errorf("fields %+v", res)
	}
	for _, k := range []string{"0.01", "0.05", "0.10"} {
		if _, ok := res.Components[0].CriticalValues[k]; !ok {
			t.Errorf("Z(alpha) critical value %s missing", k)
		}
	}
	stat := newPPStat(100, &Config{Trend: TrendLinear})
	if v, err := stat(dfRW(100, 0, 3)); err != nil || v != *res.Statistic {
		t.Errorf("NewStat %g (%v) vs Run %g", v, err, *res.Statistic)
	}
}

func BenchmarkPP(b *testing.B) { dfBenchRun(b, "pp", &Config{}) }
