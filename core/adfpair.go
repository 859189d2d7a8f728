package core

import "math"

// ADFPair computes the augmented Dickey-Fuller t-ratios of one series with
// a constant and with a linear trend (Said & Dickey 1984; Dickey & Fuller
// 1979), each with its own lag order chosen by AIC or BIC on the common
// sample t = kmax+2..T (Ng & Perron 2001), as the adf statistic function
// of each configuration would. With a constant in both designs the series
// is centred and scaled the same way, and the cross-products of the design
// with the trend contain those of the design without it, computed by the
// same operations: one pass gives both lag searches, whose orders and
// statistics are those of the two statistic functions bit for bit
// (TestADFPairEqualsSeparate). Other rules, or series the cross-product
// path cannot vouch for, go to the two statistic functions. An ADFPair is
// not safe for concurrent use; after the first series of a length it does
// not allocate.
type ADFPair struct {
	T        int
	rule     LagRule
	cfg      Config // the constant's configuration; the trend's differs only in Trend
	kmax     int
	shared   bool
	fc, fct  StatFunc
	w        DFWork
	settings error
}

// NewADFPair prepares the pair for series of length T with the lag rule
// and the maximum order of cfg (cfg.Trend is ignored; a zero rule means
// BIC, as for adf).
func NewADFPair(T int, cfg *Config) *ADFPair {
	p := &ADFPair{T: T}
	if cfg != nil {
		p.cfg = *cfg
	}
	p.cfg.NoPath = true
	p.rule = p.cfg.LagRule.Or(LagBIC)
	c, ct := p.cfg, p.cfg
	c.Trend, ct.Trend = TrendConstant, TrendLinear
	p.cfg = c
	p.fc, p.fct = newADFStat(T, &c), newADFStat(T, &ct)
	p.kmax = c.MaxLagsFor(T, TrendConstant.NumDet())
	p.shared = (p.rule == LagAIC || p.rule == LagBIC) && c.MaxLags >= 0 &&
		p.kmax == ct.MaxLagsFor(T, TrendLinear.NumDet())
	return p
}

// Stats returns the t-ratio with a constant and the t-ratio with a trend.
func (p *ADFPair) Stats(y []float64) (tc, tct float64, err error) {
	if p.shared && len(y) == p.T {
		if kc, kct, ok := p.orders(y); ok {
			// w.z holds the centred, scaled series of both designs: the
			// t-ratios at their orders from cross-products, both from one
			// pass when the orders agree, else by QR with its errors.
			w := &p.w
			T := len(y)
			okc, okct := false, false
			if kc == kct {
				if yy, n, ok := w.crossAt(T, kc, 2); ok {
					tct, okct = w.tSolve(1+kc+2, kc, 2, yy, n)
					tc, okc = w.tSolve(1+kc+2, kc, 1, yy, n)
				}
			} else {
				if yy, n, ok := w.crossAt(T, kc, 1); ok {
					tc, okc = w.tSolve(1+kc+1, kc, 1, yy, n)
				}
				if yy, n, ok := w.crossAt(T, kct, 2); ok {
					tct, okct = w.tSolve(1+kct+2, kct, 2, yy, n)
				}
			}
			if !okc {
				f, err := w.Regress(y, TrendConstant, kc, 0)
				if err != nil {
					return 0, 0, err
				}
				tc = f.TStat
			}
			if !okct {
				f, err := w.Regress(y, TrendLinear, kct, 0)
				if err != nil {
					return 0, 0, err
				}
				tct = f.TStat
			}
			return tc, tct, nil
		}
	}
	if tc, err = p.fc(y); err != nil {
		return 0, 0, err
	}
	if tct, err = p.fct(y); err != nil {
		return 0, 0, err
	}
	return tc, tct, nil
}

// orders returns the two lag orders from one set of cross-products, the
// steps of SelectLags and selectLagsFast for a sample that needs no QR
// validation; ok is false where SelectLags would validate or fall back.
func (p *ADFPair) orders(y []float64) (kc, kct int, ok bool) {
	w := &p.w
	kmax, T := p.kmax, len(y)
	if !w.plainSample(y, TrendLinear, kmax) {
		return 0, 0, false
	}
	scale, ok := w.scaleInto(y, 1)
	if !ok {
		return 0, 0, false
	}
	start := kmax + 2
	n := T - start + 1
	tbar := float64(start+T) / 2
	tsd := math.Sqrt((float64(n)*float64(n) - 1) / 12)
	if tsd == 0 {
		tsd = 1
	}
	m := 1 + kmax + 2
	w.xx = grow(w.xx, m*m)
	w.xy = grow(w.xy, m)
	yy := w.crossLagged(w.z, T, kmax, 2, start, tbar, tsd)
	w.crit = grow(w.crit, kmax+1)
	logScale := 2 * math.Log(scale)
	w.nearExact = false
	if kct, ok = w.selectNestedIn(w.xx, w.xy, yy, m, m, kmax, 2, n, p.rule, logScale); !ok || w.nearExact {
		return 0, 0, false
	}
	if kc, ok = w.selectNestedIn(w.xx, w.xy, yy, m, m-1, kmax, 1, n, p.rule, logScale); !ok || w.nearExact {
		return 0, 0, false
	}
	return kc, kct, true
}
