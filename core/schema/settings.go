package schema

// Settings is the analyst's settings: the JSON object written under
// "settings" in every Document, and the struct that the CLI, the batch mode
// and the page all fill and pass to the same entry point. The zero value
// means every documented default. Pointer fields distinguish "not set"
// (nil, use the default rule) from an explicit value such as 0 lags.
type Settings struct {
	// Tests lists test ids to run. Empty: the default battery, which also
	// fills each series' verdict.
	Tests []string `json:"tests,omitempty"`
	// Verdict asks for the verdict also when Tests lists tests (without
	// Tests the verdict is always given). The verdict's stages and their
	// tests are fixed (package decide).
	Verdict bool `json:"verdict,omitempty"`
	// Trend is "auto" (default, empty): each test in the battery uses the
	// deterministic terms the verdict needs; or "none", "constant", "linear"
	// to force one for every test.
	Trend string `json:"trend,omitempty"`
	// Lags fixes the augmentation lags; nil: chosen by LagRule.
	Lags *int `json:"lags,omitempty"`
	// LagRule is "aic", "bic", "maic", "tsig"; empty: each method's
	// prescribed rule (bic for adf, maic for dfgls, ers and mtests, tsig for break tests).
	LagRule string `json:"lag_rule,omitempty"`
	// MaxLags bounds lag selection; nil: Schwert (1989), floor(12 (T/100)^(1/4)).
	MaxLags *int `json:"max_lags,omitempty"`
	// Bandwidth fixes the kernel bandwidth for pp and kpss; nil: automatic.
	Bandwidth *float64 `json:"bandwidth,omitempty"`
	// Kernel is "bartlett" (default) or "qs" (quadratic spectral).
	Kernel string `json:"kernel,omitempty"`
	// BandwidthRule is "newey-west" (default, Newey & West 1994) or "andrews" (Andrews 1991).
	BandwidthRule string `json:"bandwidth_rule,omitempty"`
	// Level is the significance level for decisions; 0 means 0.05.
	Level float64 `json:"level,omitempty"`
	// Shift is "level" (default), "slope" or "level+slope" for break tests.
	Shift string `json:"shift,omitempty"`
	// Trim is the trimming fraction for break searches; 0 means 0.15.
	Trim float64 `json:"trim,omitempty"`
	// BreakDate is the known break for p89: a date from the date column or an
	// observation number (TB, last observation of the old regime).
	BreakDate string `json:"break_date,omitempty"`
	// Window is the suspected crisis window "FROM:TO" (dates or observation numbers).
	Window string `json:"window,omitempty"`
	// Sims adds simulated finite-sample p-values with this many replications; 0: none.
	Sims int `json:"sims,omitempty"`
	// RateDraws, when positive, recomputes the verdict's error rates at the
	// series' own length and these settings with this many draws per
	// simulated process (slow: about 20 processes); 0 uses the committed
	// tables at the nearest simulated length.
	RateDraws int `json:"rate_draws,omitempty"`
	// Seed seeds every simulation; the same seed gives the same numbers bit for bit.
	Seed uint64 `json:"seed,omitempty"`
	// RightTail makes adf a right-tailed (explosive alternative) test.
	RightTail bool `json:"right_tail,omitempty"`
	// MinWindow is the smallest window fraction for sadf/gsadf; 0: 0.01 + 1.8/sqrt(T)
	// (Phillips, Shi & Yu 2015).
	MinWindow float64 `json:"min_window,omitempty"`
	// MaxBreaks bounds the number of breaks for bp; 0 means 5.
	MaxBreaks int `json:"max_breaks,omitempty"`
	// Outlier is how the mean shifts of the meanshift test enter the series:
	// "innovational" (default, empty: gradually, through the series' own
	// dynamics) or "additive" (at once).
	Outlier string `json:"outlier,omitempty"`
	// Shifts is the number of mean shifts of the meanshift test: 1 or 2;
	// 0 means 1.
	Shifts int `json:"shifts,omitempty"`

	// Input selection, applied before testing.

	// Columns picks series by header name; empty: every numeric column.
	Columns []string `json:"columns,omitempty"`
	// From and To bound the sample (dates or observation numbers, inclusive).
	From string `json:"from,omitempty"`
	To   string `json:"to,omitempty"`
	// Transform is applied to every series: "" (levels), "log", "diff",
	// "diff2", "logdiff".
	Transform string `json:"transform,omitempty"`
	// DateColumn names the date column; empty: detected.
	DateColumn string `json:"date_column,omitempty"`
	// DateFormat fixes how ambiguous date cells are read: "dmy" or "mdy"
	// (numeric dates with the year last, 31/01/2005 or 01/31/2005),
	// "yyyymm", "yyyyq" or "yyyymmdd" (whole numbers such as 200501, 20051,
	// 20050131 read as dates in any column); empty: detected from the whole
	// column, and an ambiguous column is an error that asks for it.
	DateFormat string `json:"date_format,omitempty"`
	// Gaps says what to do with calendar gaps (missing periods) inside a
	// series of annual, quarterly, monthly or weekly data: "stop" (default,
	// empty): the series fails with an error naming the missing periods;
	// "keep": the observations are tested as they are, one after the other,
	// as if the gaps were not there (no values are inserted), with a note
	// listing the gaps; "split": the longest stretch without gaps is tested
	// (the latest when two are as long), with a note.
	Gaps string `json:"gaps,omitempty"`
	// Sheet names the .xlsx worksheet to read; empty: the first sheet
	// holding data.
	Sheet string `json:"sheet,omitempty"`
	// Long reads the input as a long table, one row per series id, date and
	// value, each id becoming one series; nil: a wide table (one column per
	// series).
	Long *LongColumns `json:"long,omitempty"`
}

// LongColumns names the columns of a long table; an empty name means "id",
// "date" or "value" (matched ignoring case). The date column may be absent
// from the file.
type LongColumns struct {
	ID    string `json:"id,omitempty"`
	Date  string `json:"date,omitempty"`
	Value string `json:"value,omitempty"`
}
