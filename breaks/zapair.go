package breaks

import (
	"math"

	"github.com/rootshift/rootshift/core"
)

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
	// fused: both models' candidate loops run as one (fusedStats); set
	// when both specs are valid and share their candidates.
	fused bool
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
	p.fused = p.errA == nil && p.errC == nil && p.a.Lo == p.c.Lo && p.a.Hi == p.c.Hi &&
		p.a.LagRule == core.LagFixed && p.c.LagRule == core.LagFixed && p.a.Lags == p.c.Lags &&
		p.c.Terms.Level && p.c.Terms.Slope && !p.c.Terms.Dummy && p.a.Terms.Level && !p.a.Terms.Slope && !p.a.Terms.Dummy
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
	if p.fused {
		return p.fusedStats(y)
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

// zaTrack is the state of one model's candidate loop in fusedStats: the
// selection rule of Searcher.search for MinTAlpha.
type zaTrack struct {
	best  float64 // +Inf before the first candidate, as in search
	found bool
	exact exactSet
}

func (z *zaTrack) add(tb int, t2, sign float64, st fitStatus) {
	switch st {
	case fitExact:
		z.exact.add([]int{tb})
	case fitOK:
		if t := sign * math.Sqrt(t2); t < z.best {
			z.best, z.found = t, true
		}
	}
}

// err is the error Searcher.search returns for this model, or nil.
func (z *zaTrack) err() error {
	if err := z.exact.err(); err != nil {
		return err
	}
	if !z.found {
		return core.Errorf("", core.ErrSingular, "the regression is singular at every break candidate")
	}
	return nil
}

// fusedStats runs the candidate loops of models A and C as one loop (set
// up by prepare in Stats' caller): model C's break columns are [DU, DT],
// and the residualisation of DU on the columns without breaks, the first
// column of finalResid2, is the whole of model A's (finalResid1 does the
// same operations in the same order), so each candidate residualises once
// and reads both t-ratios (Searcher.tLast) from it. The statistics and
// errors are those of two searches bit for bit (TestZAPairEqualsSearches,
// FuzzZAPair).
func (p *ZAPair) fusedStats(y []float64) (tA, tC float64, err error) {
	const id = "za"
	w := &p.w
	w.prepare(y, p.a.kmax())
	T, kk := w.T, w.kk
	lo, hi := max(p.a.Lo, kk+2, MinHead), min(p.a.Hi, T-MinTail)
	if lo > hi {
		return 0, 0, WrapError(id, core.Errorf("", core.ErrTooShort, "no break candidate with T=%d and %d lags (first %d, last %d)", T, kk, lo, hi))
	}
	w.factors(&p.c)
	f := &w.fin[kk]
	K := len(f.codes)
	n := T - kk - 1
	a, c := zaTrack{best: math.Inf(1)}, zaTrack{best: math.Inf(1)}
	if f.rank >= K {
		for tb := lo; tb <= hi; tb++ {
			w.breakVectors(&p.c, tb)
			w.finalResid2(f)
			t2, sign, _, st := w.tLast(1, f.xxRes, f.xyRes, f.yyRes, f.yy, n-(K+2))
			a.add(tb, t2, sign, st)
			t2, sign, _, st = w.tLast(2, f.xxRes, f.xyRes, f.yyRes, f.yy, n-(K+3))
			c.add(tb, t2, sign, st)
		}
	}
	if err := a.err(); err != nil {
		return 0, 0, WrapError(id, err)
	}
	if p.errC != nil {
		return 0, 0, p.errC
	}
	if err := c.err(); err != nil {
		return 0, 0, WrapError(id, err)
	}
	return a.best, c.best, nil
}
