package core

// Order of integration by the sequential procedure of Dickey, D.A. & Pantula,
// S.G. (1987), "Determining the order of differencing in autoregressive
// processes", JBES 5, 455-461: test the largest number of unit roots first.
//
// With at most two unit roots considered:
//  1. H0: two unit roots (Δy has a unit root) — ADF on Δy. Not rejected:
//     order 2.
//  2. Otherwise H0: one unit root — ADF on y with cfg's deterministic terms.
//     Not rejected: order 1; rejected: order 0.
//
// The test on Δy uses a constant when y's regression has a constant or a
// trend (a trend in y is a drift in Δy) and no deterministic terms when
// cfg.Trend is TrendNone. Lags follow cfg; with LagAuto the test on Δy uses
// BIC and the test on y MAIC (the ADF default). MAIC is built for processes
// near a unit root: on a series far from one (Δy of a random walk) it often
// chooses the maximum lag (our simulation, T = 200: about one draw in four),
// which takes most of the first step's power and would report I(2) for I(1)
// series. Decisions are
// at cfg.LevelOr(). A single series cannot be I(3) here: order 2 means "at
// least 2".

import (
	"context"
	"fmt"
	"strings"

	"github.com/rootshift/rootshift/core/schema"
)

// TestOrder returns the order of integration of y (0, 1 or 2) by the
// Dickey-Pantula sequence of ADF tests, and the ADF results in the order run
// (Δy first, then y when reached). Errors are *Error values of test "adf".
func TestOrder(ctx context.Context, y []float64, cfg *Config) (order int, results []*schema.Result, err error) {
	if cfg == nil {
		cfg = &Config{}
	}
	if err := dfCheck("adf", y, minDFObs+1); err != nil {
		return 0, nil, err
	}
	d := make([]float64, len(y)-1)
	for i := range d {
		d[i] = y[i+1] - y[i]
	}
	dc := *cfg
	dc.RightTail = false
	dc.Dates = nil
	if cfg.Trend != TrendNone {
		dc.Trend = TrendConstant
	}
	if dc.LagRule == LagAuto {
		dc.LagRule = LagBIC
	}
	r2, err := runADF(ctx, d, &dc)
	if err != nil {
		return 0, nil, err
	}
	r2.Variant = strings.TrimPrefix(r2.Variant+", on first difference", ", ")
	results = append(results, r2)
	if !r2.Reject {
		return 2, results, nil
	}
	lc := *cfg
	lc.RightTail = false
	r1, err := runADF(ctx, y, &lc)
	if err != nil {
		return 0, results, err
	}
	results = append(results, r1)
	if !r1.Reject {
		return 1, results, nil
	}
	return 0, results, nil
}

// OrderString describes an order of integration in words.
func OrderString(order int) string {
	switch order {
	case 0:
		return "I(0): stationary (around the deterministic terms tested)"
	case 1:
		return "I(1): one unit root"
	}
	return fmt.Sprintf("I(%d) or higher", order)
}
