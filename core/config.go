package core

import (
	"fmt"
	"math"
)

// Trend is the deterministic part of a test regression.
type Trend int

const (
	// TrendConstant is an intercept only (the zero value).
	TrendConstant Trend = iota
	// TrendNone has no deterministic terms.
	TrendNone
	// TrendLinear is an intercept and the linear trend t = 1..T.
	TrendLinear
)

func (t Trend) String() string {
	switch t {
	case TrendNone:
		return "none"
	case TrendLinear:
		return "linear"
	}
	return "constant"
}

// ParseTrend reads "none", "constant" or "linear".
func ParseTrend(s string) (Trend, error) {
	switch s {
	case "none":
		return TrendNone, nil
	case "constant", "":
		return TrendConstant, nil
	case "linear":
		return TrendLinear, nil
	}
	return 0, fmt.Errorf("%w: trend %q (want none, constant or linear)", ErrSettings, s)
}

// NumDet is the number of deterministic regressors.
func (t Trend) NumDet() int {
	switch t {
	case TrendNone:
		return 0
	case TrendLinear:
		return 2
	}
	return 1
}

// LagRule is how the augmentation order is chosen.
type LagRule int

const (
	// LagAuto (zero value) uses the method's prescribed rule.
	LagAuto LagRule = iota
	// LagFixed uses Config.Lags.
	LagFixed
	// LagAIC minimises the Akaike criterion.
	LagAIC
	// LagBIC minimises the Schwarz criterion.
	LagBIC
	// LagMAIC minimises the modified AIC of Ng & Perron (2001), eq. (9).
	LagMAIC
	// LagTSig is the general-to-specific rule of Ng & Perron (1995): drop the
	// last lag while its |t| is below the 10% two-sided normal value 1.645.
	LagTSig
)

func (r LagRule) String() string {
	switch r {
	case LagFixed:
		return "fixed"
	case LagAIC:
		return "aic"
	case LagBIC:
		return "bic"
	case LagMAIC:
		return "maic"
	case LagTSig:
		return "tsig"
	}
	return "auto"
}

// ParseLagRule reads "aic", "bic", "maic", "tsig", "fixed" or "" (auto).
func ParseLagRule(s string) (LagRule, error) {
	switch s {
	case "", "auto":
		return LagAuto, nil
	case "fixed":
		return LagFixed, nil
	case "aic":
		return LagAIC, nil
	case "bic":
		return LagBIC, nil
	case "maic":
		return LagMAIC, nil
	case "tsig":
		return LagTSig, nil
	}
	return 0, fmt.Errorf("%w: lag rule %q (want aic, bic, maic or tsig)", ErrSettings, s)
}

// Or returns r, or def when r is LagAuto.
func (r LagRule) Or(def LagRule) LagRule {
	if r == LagAuto {
		return def
	}
	return r
}

// Kernel is the long-run variance kernel.
type Kernel int

const (
	// KernelBartlett (zero value): w(j) = 1 - j/(l+1).
	KernelBartlett Kernel = iota
	// KernelQS is the quadratic-spectral kernel (Andrews 1991, eq. 2.7).
	KernelQS
)

func (k Kernel) String() string {
	if k == KernelQS {
		return "qs"
	}
	return "bartlett"
}

// ParseKernel reads "bartlett" (or "") and "qs".
func ParseKernel(s string) (Kernel, error) {
	switch s {
	case "", "bartlett":
		return KernelBartlett, nil
	case "qs", "quadratic-spectral":
		return KernelQS, nil
	}
	return 0, fmt.Errorf("%w: kernel %q (want bartlett or qs)", ErrSettings, s)
}

// BandwidthRule is how the kernel bandwidth is chosen.
type BandwidthRule int

const (
	// BandwidthNeweyWest (zero value): Newey & West (1994) automatic selection.
	BandwidthNeweyWest BandwidthRule = iota
	// BandwidthAndrews: Andrews (1991) AR(1) plug-in.
	BandwidthAndrews
	// BandwidthFixed uses Config.Bandwidth.
	BandwidthFixed
)

func (b BandwidthRule) String() string {
	switch b {
	case BandwidthAndrews:
		return "andrews"
	case BandwidthFixed:
		return "fixed"
	}
	return "newey-west"
}

// ParseBandwidthRule reads "newey-west" (or ""), "andrews", "fixed".
func ParseBandwidthRule(s string) (BandwidthRule, error) {
	switch s {
	case "", "newey-west":
		return BandwidthNeweyWest, nil
	case "andrews":
		return BandwidthAndrews, nil
	case "fixed":
		return BandwidthFixed, nil
	}
	return 0, fmt.Errorf("%w: bandwidth rule %q (want newey-west or andrews)", ErrSettings, s)
}

// Shift is the kind of structural change a break test allows.
type Shift int

const (
	// ShiftLevel (zero value): a shift in the level (intercept), DU_t = 1(t > TB).
	ShiftLevel Shift = iota
	// ShiftSlope: a change in the trend slope, DT_t = (t - TB) 1(t > TB).
	ShiftSlope
	// ShiftBoth: both.
	ShiftBoth
)

func (s Shift) String() string {
	switch s {
	case ShiftSlope:
		return "slope"
	case ShiftBoth:
		return "level+slope"
	}
	return "level"
}

// ParseShift reads "level" (or ""), "slope", "level+slope".
func ParseShift(s string) (Shift, error) {
	switch s {
	case "", "level":
		return ShiftLevel, nil
	case "slope":
		return ShiftSlope, nil
	case "level+slope", "both":
		return ShiftBoth, nil
	}
	return 0, fmt.Errorf("%w: shift %q (want level, slope or level+slope)", ErrSettings, s)
}

// Outlier says how the mean shifts of the meanshift test enter the series
// (Perron & Vogelsang 1992, section 2).
type Outlier int

const (
	// OutlierInnovational (zero value): the shift builds up gradually
	// through the series' own dynamics (one regression).
	OutlierInnovational Outlier = iota
	// OutlierAdditive: the shift is immediate; the mean is removed first,
	// then the unit-root regression runs on the residuals (two steps).
	OutlierAdditive
)

func (o Outlier) String() string {
	if o == OutlierAdditive {
		return "additive"
	}
	return "innovational"
}

// ParseOutlier reads "innovational" (or ""), "additive".
func ParseOutlier(s string) (Outlier, error) {
	switch s {
	case "", "innovational":
		return OutlierInnovational, nil
	case "additive":
		return OutlierAdditive, nil
	}
	return 0, fmt.Errorf("%w: outlier %q (want innovational or additive)", ErrSettings, s)
}

// Config is the resolved setting of one test run. The zero value means every
// documented default: constant term, the method's own lag rule with Schwert's
// maximum, Bartlett kernel with Newey-West bandwidth, 5% level, level shift,
// 15% trimming, no simulation.
type Config struct {
	Trend Trend
	// LagRule chooses the augmentation order; LagFixed uses Lags.
	LagRule LagRule
	Lags    int
	// MaxLags bounds lag selection; 0: Schwert (1989) floor(12 (T/100)^(1/4)),
	// further capped so the regression keeps enough degrees of freedom.
	MaxLags int
	Kernel  Kernel
	// BandwidthRule chooses the bandwidth; BandwidthFixed uses Bandwidth.
	BandwidthRule BandwidthRule
	Bandwidth     float64
	// Level is the significance level of Reject; 0 means 0.05.
	Level float64
	Shift Shift
	// Trim bounds break candidates to [Trim T, (1-Trim) T]; 0 means 0.15.
	Trim float64
	// BreakIndex is a known break TB (1-based), used by tests with a given date.
	BreakIndex int
	// BreakFrom and BreakTo, when positive, restrict the candidate break
	// dates TB of the one-break searches (za, pio) to BreakFrom..BreakTo
	// (1-based, inclusive) within the trimmed range; 0 leaves that end at
	// the trimming bound.
	BreakFrom, BreakTo int
	// BreakRule picks the break date in the pio and pao searches (Perron 1997):
	// 0 (default) minimises the unit-root t-ratio, 1 maximises |t| on the
	// level-shift coefficient, 2 maximises |t| on the slope-shift coefficient.
	BreakRule int
	// Sims is the number of Monte Carlo replications for simulated p-values; 0: none.
	Sims int
	// Seed seeds the simulation.
	Seed uint64
	// Workers for simulation; 0: all cores.
	Workers int
	// RightTail makes adf test against an explosive root.
	RightTail bool
	// Period is the number of observations per year for the seasonal
	// unit-root test (id "seasonal"): 4 (quarterly, HEGY 1990) or 12
	// (monthly, Beaulieu & Miron 1993). 0 means unknown; the seasonal test
	// then fails with ErrSettings (other tests ignore it). The battery sets
	// it from the frequency of the dates.
	Period int
	// NoSeasonalDummies drops the S-1 seasonal dummies from the seasonal
	// unit-root regression (the zero value keeps them beside the constant).
	NoSeasonalDummies bool
	// MinWindow is the sadf/gsadf minimum window fraction; 0: 0.01 + 1.8/sqrt(T).
	MinWindow float64
	// MaxBreaks bounds bp; 0 means 5.
	MaxBreaks int
	// Outlier is how the shifts of the meanshift test enter: innovational
	// (zero value, default) or additive.
	Outlier Outlier
	// Shifts is the number of mean shifts of the meanshift test: 1 or 2;
	// 0 means 1 (Perron & Vogelsang 1992); 2 is Clemente, Montanes & Reyes
	// (1998).
	Shifts int
	// Dates labels observations (optional; len must equal the series length).
	Dates []string
	// NoPath drops per-candidate paths and sequences from results (used in simulation).
	NoPath bool
	// Progress, if set, is called with work done and total for long computations.
	Progress func(done, total int)
}

// LevelOr returns the significance level, 0.05 when unset.
func (c *Config) LevelOr() float64 {
	if c == nil || c.Level <= 0 {
		return 0.05
	}
	return c.Level
}

// TrimOr returns the trimming fraction, 0.15 when unset.
func (c *Config) TrimOr() float64 {
	if c == nil || c.Trim <= 0 {
		return 0.15
	}
	return c.Trim
}

// ShiftsOr returns the number of mean shifts of the meanshift test, 1 when unset.
func (c *Config) ShiftsOr() int {
	if c == nil || c.Shifts <= 0 {
		return 1
	}
	return c.Shifts
}

// SchwertMax is Schwert's (1989) rule floor(12 (T/100)^(1/4)).
func SchwertMax(T int) int {
	return int(math.Floor(12 * math.Pow(float64(T)/100, 0.25)))
}

// MaxLagsFor returns the maximum lag for a series of length T: cfg.MaxLags
// or Schwert's rule, capped so that at least 10 degrees of freedom remain in
// a regression with extra regressors besides the lags.
func (c *Config) MaxLagsFor(T, extra int) int {
	k := 0
	if c != nil && c.MaxLags > 0 {
		k = c.MaxLags
	} else {
		k = SchwertMax(T)
	}
	// The regression at kmax uses T-kmax-1 observations and kmax+extra+1 regressors.
	for k > 0 && T-k-1-(k+extra+1) < 10 {
		k--
	}
	return k
}

// DateOf returns the label of 1-based observation i, or "".
func (c *Config) DateOf(i int) string {
	if c == nil || i < 1 || i > len(c.Dates) {
		return ""
	}
	return c.Dates[i-1]
}
