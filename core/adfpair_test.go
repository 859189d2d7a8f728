// Tests of the paired ADF statistics (adfpair.go): the augmented
// Dickey-Fuller t-ratios with a constant and with a trend (Said & Dickey
// 1984, eq. 1.3), lags by AIC or BIC on the common sample (Ng & Perron
// 2001), computed from one set of cross-products, must equal the adf
// statistic function of each configuration (newADFStat, their twins) bit
// for bit, for series of several kinds and lengths, for every rule
// (MAIC and t-sig go to the twins), with a maximum order given or not;
// errors are the twins' errors; the pair does not allocate. A benchmark
// times the pair beside the two statistic functions.
package core

import (
	"fmt"
	"math"
	"testing"
)

func TestADFPairEqualsSeparate(t *testing.T) {
	for _, kind := range []string{"walk", "ar", "drift", "far", "ma"} {
		for _, T := range []int{25, 60, 300, 1000} {
			for _, rule := range []LagRule{0, LagBIC, LagAIC, LagMAIC, LagTSig} {
				for _, maxLags := range []int{0, 4} {
					cfg := &Config{LagRule: rule, MaxLags: maxLags}
					p := NewADFPair(T, cfg)
					c, ct := *cfg, *cfg
					c.Trend, ct.Trend = TrendConstant, TrendLinear
					fc, fct := newADFStat(T, &c), newADFStat(T, &ct)
					for rep := range 2 {
						y := fastSeries(kind, T, uint64(T+rep*7+maxLags))
						a, b, err := p.Stats(y)
						wa, erra := fc(y)
						wb, errb := fct(y)
						if err != nil || erra != nil || errb != nil {
							t.Fatalf("%s T=%d %v: pair %v, separate %v %v", kind, T, rule, err, erra, errb)
						}
						if math.Float64bits(a) != math.Float64bits(wa) || math.Float64bits(b) != math.Float64bits(wb) {
							t.Errorf("%s T=%d %v max %d: pair (%.17g, %.17g), separate (%.17g, %.17g)", kind, T, rule, maxLags, a, b, wa, wb)
						}
					}
				}
			}
		}
	}
}

func TestADFPairErrors(t *testing.T) {
	p := NewADFPair(50, nil)
	y := fastSeries("walk", 50, 1)
	y[7] = math.Inf(1)
	_, _, err := p.Stats(y)
	_, err2 := newADFStat(50, &Config{Trend: TrendConstant})(y)
	if err == nil || err2 == nil || err.Error() != err2.Error() {
		t.Errorf("infinite value: pair %v, separate %v", err, err2)
	}
	if _, _, err := NewADFPair(50, &Config{MaxLags: -1}).Stats(fastSeries("walk", 50, 1)); err == nil {
		t.Error("negative maximum lag: no error")
	}
}

func TestADFPairNoAlloc(t *testing.T) {
	p := NewADFPair(300, nil)
	y := fastSeries("ar", 300, 2)
	p.Stats(y)
	if a := testing.AllocsPerRun(10, func() { p.Stats(y) }); a != 0 {
		t.Errorf("ADFPair.Stats allocates %v times per call", a)
	}
}

func BenchmarkADFPair(b *testing.B) {
	for _, T := range []int{300, 1000} {
		y := fastSeries("ar", T, 3)
		p := NewADFPair(T, nil)
		fc, fct := newADFStat(T, &Config{Trend: TrendConstant}), newADFStat(T, &Config{Trend: TrendLinear})
		b.Run(fmt.Sprintf("pair/T=%d", T), func(b *testing.B) {
			for range b.N {
				p.Stats(y)
			}
		})
		b.Run(fmt.Sprintf("separate/T=%d", T), func(b *testing.B) {
			for range b.N {
				fc(y)
				fct(y)
			}
		})
	}
}

// FuzzADFPair feeds arbitrary series and settings to the pair: it must
// not panic, and it must give the two statistic functions' values and
// errors (the same error text, or both values equal bit for bit).
func FuzzADFPair(f *testing.F) {
	dfFuzzSeed(f)
	f.Fuzz(func(t *testing.T, b []byte, rule, maxLags uint8) {
		y := dfFuzzSeries(b)
		cfg := &Config{LagRule: LagRule(rule % 6), Lags: int(rule % 4), MaxLags: int(maxLags%9) - 1}
		p := NewADFPair(len(y), cfg)
		c, ct := *cfg, *cfg
		c.Trend, ct.Trend = TrendConstant, TrendLinear
		a, bb, err := p.Stats(y)
		wa, erra := newADFStat(len(y), &c)(y)
		wb, errb := newADFStat(len(y), &ct)(y)
		want := erra
		if want == nil {
			want = errb
		}
		if (err == nil) != (want == nil) || (err != nil && err.Error() != want.Error()) {
			t.Fatalf("pair error %v, separate %v / %v", err, erra, errb)
		}
		if err == nil && (math.Float64bits(a) != math.Float64bits(wa) || math.Float64bits(bb) != math.Float64bits(wb)) {
			t.Fatalf("pair (%v, %v), separate (%v, %v)", a, bb, wa, wb)
		}
	})
}
