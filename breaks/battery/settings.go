package battery

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"

	"github.com/rootshift/rootshift/core"
	"github.com/rootshift/rootshift/core/dataset"
	"github.com/rootshift/rootshift/core/schema"
)

// Version is the engine version written in every document.
const Version = "0.1.0"

// UsageError is a problem with the settings themselves (exit status 2 in the CLI).
type UsageError struct {
	Field string
	Err   error
}

func (e *UsageError) Error() string { return fmt.Sprintf("settings: %s: %v", e.Field, e.Err) }
func (e *UsageError) Unwrap() error { return e.Err }

func usage(field, format string, args ...any) error {
	return &UsageError{Field: field, Err: fmt.Errorf(format, args...)}
}

// Transforms lists the accepted values of Settings.Transform.
var Transforms = []string{"", "log", "diff", "diff2", "logdiff"}

// Validate reports the first usage error in s: unknown test ids, values
// outside their documented sets or ranges.
func Validate(s schema.Settings) error {
	ids := core.IDs()
	for _, id := range s.Tests {
		if !slices.Contains(ids, id) {
			return usage("tests", "unknown test id %q (known: %s)", id, strings.Join(ids, ", "))
		}
	}
	switch s.Trend {
	case "", "auto", "none", "constant", "linear":
	default:
		return usage("trend", "%q: want auto, none, constant or linear", s.Trend)
	}
	if _, err := core.ParseLagRule(s.LagRule); err != nil || s.LagRule == "fixed" {
		return usage("lag_rule", "%q: want aic, bic, maic or tsig (fix the lags with lags instead)", s.LagRule)
	}
	if s.Lags != nil && (*s.Lags < 0 || *s.Lags > 1000) {
		return usage("lags", "%d: want 0..1000", *s.Lags)
	}
	if s.MaxLags != nil && (*s.MaxLags < 0 || *s.MaxLags > 1000) {
		return usage("max_lags", "%d: want 0..1000", *s.MaxLags)
	}
	if s.Bandwidth != nil && (*s.Bandwidth < 0 || math.IsNaN(*s.Bandwidth) || *s.Bandwidth > 1e6) {
		return usage("bandwidth", "%g: want a bandwidth from 0 to 1e6 (0: no autocovariances; leave it out for the automatic choice)", *s.Bandwidth)
	}
	if _, err := core.ParseKernel(s.Kernel); err != nil {
		return usage("kernel", "%q: want bartlett or qs", s.Kernel)
	}
	if _, err := core.ParseBandwidthRule(s.BandwidthRule); err != nil || s.BandwidthRule == "fixed" {
		return usage("bandwidth_rule", "%q: want newey-west or andrews", s.BandwidthRule)
	}
	if s.Level != 0 && !(s.Level > 0 && s.Level < 0.5) {
		return usage("level", "%g: want a significance level between 0 and 0.5 (e.g. 0.05)", s.Level)
	}
	if _, err := core.ParseShift(s.Shift); err != nil {
		return usage("shift", "%q: want level, slope or level+slope", s.Shift)
	}
	if _, err := core.ParseOutlier(s.Outlier); err != nil {
		return usage("outlier", "%q: want innovational or additive", s.Outlier)
	}
	if s.Shifts != 0 && s.Shifts != 1 && s.Shifts != 2 {
		return usage("shifts", "%d: want 1 or 2", s.Shifts)
	}
	if s.Trim != 0 && !(s.Trim >= 0.01 && s.Trim < 0.5) {
		return usage("trim", "%g: want a fraction between 0.01 and 0.5", s.Trim)
	}
	if s.RateDraws < 0 || s.RateDraws > 100_000 {
		return usage("rate_draws", "%d: want 0..100000", s.RateDraws)
	}
	if s.Sims < 0 || s.Sims > 10_000_000 {
		return usage("sims", "%d: want 0..10000000", s.Sims)
	}
	if s.MinWindow != 0 && !(s.MinWindow > 0 && s.MinWindow < 1) {
		return usage("min_window", "%g: want a fraction between 0 and 1", s.MinWindow)
	}
	if s.MaxBreaks < 0 || s.MaxBreaks > 10 {
		return usage("max_breaks", "%d: want 0..10", s.MaxBreaks)
	}
	if !slices.Contains(Transforms, s.Transform) {
		return usage("transform", "%q: want log, diff, diff2 or logdiff", s.Transform)
	}
	if !slices.Contains(dataset.DateFormats, strings.ToLower(s.DateFormat)) {
		return usage("date_format", "%q: want dmy (31/01/2005), mdy (01/31/2005), yyyymm (200501), yyyyq (20051) or yyyymmdd (20050131)", s.DateFormat)
	}
	if !slices.Contains(dataset.GapRules, s.Gaps) {
		return usage("gaps", "%q: want stop, keep or split", s.Gaps)
	}
	if s.Window != "" {
		if _, _, ok := strings.Cut(s.Window, ":"); !ok {
			return usage("window", "%q: want FROM:TO", s.Window)
		}
	}
	return nil
}

// baseConfig converts settings to the core configuration shared by every
// test on one series; trend is filled per test by the caller.
func baseConfig(s schema.Settings, dates []string) *core.Config {
	c := &core.Config{
		Level:     s.Level,
		Trim:      s.Trim,
		Sims:      s.Sims,
		Seed:      s.Seed,
		RightTail: s.RightTail,
		MinWindow: s.MinWindow,
		MaxBreaks: s.MaxBreaks,
		Dates:     dates,
	}
	c.LagRule, _ = core.ParseLagRule(s.LagRule)
	if s.Lags != nil {
		c.LagRule, c.Lags = core.LagFixed, *s.Lags
	}
	if s.MaxLags != nil {
		c.MaxLags = *s.MaxLags
		if c.MaxLags == 0 && c.LagRule != core.LagFixed {
			// A maximum of zero lags leaves nothing to choose.
			c.LagRule, c.Lags = core.LagFixed, 0
		}
	}
	c.Kernel, _ = core.ParseKernel(s.Kernel)
	c.BandwidthRule, _ = core.ParseBandwidthRule(s.BandwidthRule)
	if s.Bandwidth != nil {
		c.BandwidthRule, c.Bandwidth = core.BandwidthFixed, *s.Bandwidth
	}
	c.Shift, _ = core.ParseShift(s.Shift)
	c.Outlier, _ = core.ParseOutlier(s.Outlier)
	c.Shifts = s.Shifts
	return c
}

// Config returns the core configuration that test id runs with under s on a
// series with the given date labels: the trend resolved (auto gives each
// test its own), lags, kernel, shift, trimming and simulation settings.
// A numeric BreakDate becomes BreakIndex.
func Config(s schema.Settings, id string, dates []string) *core.Config {
	c := baseConfig(s, dates)
	if s.Trend == "" || s.Trend == "auto" {
		c.Trend = defaultTrend(id)
	} else {
		c.Trend, _ = core.ParseTrend(s.Trend)
	}
	if s.BreakDate != "" {
		if i, err := strconv.Atoi(strings.TrimSpace(s.BreakDate)); err == nil {
			c.BreakIndex = i
		}
	}
	return c
}
