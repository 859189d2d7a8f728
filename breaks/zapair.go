package breaks

import "github.com/rootshift/rootshift/core"

// ZAPair computes the Zivot & Andrews (1992) statistics of model A (level
// shift, eq. (1)) and model C (level and slope shift, eq. (3)) on one
// series at one fixed lag order. Everything the single-break search
// prepares per series (the standardised series, the base columns, their
// suffix sums and Gram matrices, and the factor of the columns without
// breaks) is the same for both models at a fixed order, so it is prepared
// once and each model's candidate loop runs on it. The statistics are
// those of two separate searches bit for bit (TestZAPairEqualsSearches).
// A ZAPair is not safe for concurrent use; after the first series it does
// not allocate.
type ZAPair struct {
	T          int
	a, c       Spec
	w          Searcher
	errA, errC error // settings errors of each model's search
}

// NewZAPair prepares the pair for series of length T at k lags with the
// trimming and candidate settings of cfg (cfg.Shift and the lag settings
// are ignored: the models are A and C, the order is k).
func NewZAPair(T, k int, cfg *core.Config) *ZAPair {
	p := &ZAPair{T: T}
	var c core.Config
	if cfg != nil {
		c = *cfg
	}
	c.LagRule, c.Lags = core.LagFixed, k
	c.Shift = core.ShiftLevel
	p.a, p.errA = ioSpec("za", &c, T, false)
	c.Shift = core.ShiftBoth
	p.c, p.errC = ioSpec("za", &c, T, false)
	for _, s := range []*Spec{&p.a, &p.c} {
		s.Rule = MinTAlpha
		s.OnlyTAlpha = true
	}
	return p
}

// Stats returns the Zivot-Andrews t-ratios of model A and model C of y,
// with the error the za statistic function of model A gives, else that of
// model C (the checks in the same order).
func (p *ZAPair) Stats(y []float64) (tA, tC float64, err error) {
	const id = "za"
	if p.errA != nil {
		return 0, 0, p.errA
	}
	if len(y) != p.T {
		return 0, 0, core.Errorf(id, core.ErrSettings, "series length %d, statistic prepared for %d", len(y), p.T)
	}
	if err := CheckSeries(id, y, ioMinObs); err != nil {
		return 0, 0, err
	}
	p.w.prepare(y, p.a.kmax())
	ca, _, err := p.w.search(&p.a, false)
	if err != nil {
		return 0, 0, WrapError(id, err)
	}
	if p.errC != nil {
		return 0, 0, p.errC
	}
	cc, _, err := p.w.search(&p.c, false)
	if err != nil {
		return 0, 0, WrapError(id, err)
	}
	return ca.TAlpha, cc.TAlpha, nil
}
