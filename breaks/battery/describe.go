package battery

import (
	"fmt"

	"github.com/rootshift/rootshift/breaks"
	"github.com/rootshift/rootshift/core/dataset"
)

// Choice is one accepted value of a setting with its label in words. The
// empty Value is the default.
type Choice struct {
	Value string `json:"value"`
	Label string `json:"label"`
}

// SettingInfo describes one field of schema.Settings for a user interface:
// its JSON name, a label in words, what the default (the zero value) means,
// its accepted values when they form a list, and which tests it applies to.
// The page builds its settings form from these, so that labels, defaults and
// per-test choices are written once, here, next to Validate.
type SettingInfo struct {
	Field     string   `json:"field"`
	Label     string   `json:"label"`
	Default   string   `json:"default"`
	Kind      string   `json:"kind"` // "choice", "integer", "number", "text", "flag"
	Choices   []Choice `json:"choices,omitempty"`
	Min       *float64 `json:"min,omitempty"`
	Max       *float64 `json:"max,omitempty"`
	AppliesTo string   `json:"applies_to"`
	// Numeric says that the choices' values are numbers in the settings
	// document ("level": 0.01; "shifts": 2).
	Numeric bool `json:"numeric,omitempty"`
	// Advanced settings are shown behind "Advanced settings" in the page.
	Advanced bool `json:"advanced,omitempty"`
	// Input settings change what is read from the file (the preview).
	Input bool `json:"input,omitempty"`
}

func bound(x float64) *float64 { return &x }

// SettingsDescription returns the description of every setting the page
// offers, in the order it shows them. Each list of choices is checked
// against the values Validate accepts (TestSettingsDescription).
func SettingsDescription() []SettingInfo {
	return []SettingInfo{
		{Field: "from", Input: true, Label: "Sample starts", Kind: "text", Default: "first", AppliesTo: "every series (a date or an observation number)"},
		{Field: "to", Input: true, Label: "Sample ends", Kind: "text", Default: "last", AppliesTo: "every series (a date or an observation number)"},
		{Field: "transform", Input: true, Label: "Test the series as", Kind: "choice", Default: "levels", AppliesTo: "every series, before testing",
			Choices: []Choice{{"", "levels (as in the file)"}, {"log", "logarithms"}, {"diff", "first differences (changes)"},
				{"diff2", "second differences"}, {"logdiff", "differences of logarithms (growth rates)"}}},
		{Field: "window", Label: "Suspected crisis window (FROM:TO)", Kind: "text", Default: "none",
			AppliesTo: "the verdict: whether a break falls inside the window, with a break test restricted to it (dates or observation numbers, e.g. 2008-01:2009-12)"},
		{Field: "shift", Label: "Kind of break to look for", Kind: "choice",
			Default:   "level shift; the verdict chooses its own tests and kind of break",
			AppliesTo: "break tests you pick (za, pio, pao, p89, ls1, ls2, lp, py; meanshift allows a level shift only)",
			Choices: []Choice{{"", "a jump in the level (level shift)"}, {"slope", "a change in the growth rate (trend break)"},
				{"level+slope", "both at once (level and trend)"}}},
		{Field: "trend", Label: "Deterministic terms", Kind: "choice", Default: "each test's own", AppliesTo: "every test",
			Choices: []Choice{{"", "automatic: each test takes the terms it needs"}, {"constant", "a constant (series moves around a mean)"},
				{"linear", "a constant and a linear trend"}, {"none", "none"}}},
		// The page offers three levels; Validate takes any between Min and
		// Max (exclusive), as the command line's help says.
		{Field: "level", Advanced: true, Numeric: true, Label: "Significance level", Kind: "choice", Default: "0.05", AppliesTo: "every decision",
			Min: bound(0), Max: bound(0.5),
			Choices: []Choice{{"", "0.05 (5%)"}, {"0.01", "0.01 (1%)"}, {"0.1", "0.10 (10%)"}}},
		{Field: "lag_rule", Advanced: true, Label: "How to choose the lags", Kind: "choice",
			Default:   "each method's own rule: BIC for adf and py; MAIC for dfgls, ers and mtests; t-sig for the other break tests; sadf and gsadf use 0 lags",
			AppliesTo: "adf, dfgls, ers, mtests, the break tests, sadf and gsadf (not pp and kpss, which use a kernel)",
			Choices: []Choice{{"", "each method's own rule (BIC for adf and py, MAIC for dfgls/ers/mtests, t-sig for break tests, 0 lags for sadf/gsadf)"},
				{"aic", "AIC"}, {"bic", "BIC"}, {"maic", "modified AIC (MAIC)"}, {"tsig", "general-to-specific t-sig"}}},
		{Field: "lags", Advanced: true, Label: "Fixed number of lags", Kind: "integer", Default: "chosen by the lag rule", Min: bound(0), Max: bound(1000), AppliesTo: "the tests the lag rule applies to"},
		{Field: "max_lags", Advanced: true, Label: "Maximum lags", Kind: "integer", Min: bound(0), Max: bound(1000),
			Default:   fmt.Sprintf("Schwert (1989) 12·(T/100)^¼; %d for break tests", breaks.DefaultMaxLags),
			AppliesTo: "the tests the lag rule applies to"},
		{Field: "trim", Advanced: true, Label: "Trimming for break searches", Kind: "number", Default: "0.15", Min: bound(0.01), Max: bound(0.49), AppliesTo: "break-date searches"},
		{Field: "max_breaks", Advanced: true, Label: "Most breaks for the multiple-break test", Kind: "integer", Default: "5", Min: bound(1), Max: bound(10), AppliesTo: "bp"},
		{Field: "outlier", Advanced: true, Label: "How the mean shifts enter", Kind: "choice", Default: "innovational", AppliesTo: "meanshift",
			Choices: []Choice{{"", "gradually, through the series' own dynamics (innovational outlier)"}, {"additive", "at once (additive outlier)"}}},
		{Field: "shifts", Advanced: true, Numeric: true, Label: "Number of mean shifts", Kind: "choice", Default: "1", AppliesTo: "meanshift",
			Choices: []Choice{{"", "one (Perron & Vogelsang 1992)"}, {"2", "two (Clemente, Montanes & Reyes 1998)"}}},
		{Field: "kernel", Advanced: true, Label: "Long-run variance kernel", Kind: "choice", Default: "Bartlett", AppliesTo: "pp, kpss",
			Choices: []Choice{{"", "Bartlett"}, {"qs", "quadratic spectral"}}},
		{Field: "bandwidth_rule", Advanced: true, Label: "Bandwidth rule", Kind: "choice", Default: "Newey-West (1994)", AppliesTo: "pp, kpss",
			Choices: []Choice{{"", "Newey-West (1994)"}, {"andrews", "Andrews (1991)"}}},
		{Field: "bandwidth", Advanced: true, Label: "Fixed bandwidth", Kind: "number", Default: "automatic", Min: bound(0), AppliesTo: "pp, kpss"},
		{Field: "sims", Advanced: true, Label: "Simulated p-values: replications", Kind: "integer", Default: "none (0); slow", Min: bound(0), Max: bound(10_000_000), AppliesTo: "every test you run"},
		{Field: "seed", Advanced: true, Label: "Seed", Kind: "integer", Default: "0; the same seed gives the same numbers", Min: bound(0), AppliesTo: "simulations"},
		{Field: "break_date", Advanced: true, Label: "Known break date", Kind: "text", Default: "none", AppliesTo: "p89 (the last observation before the break)"},
		{Field: "date_column", Input: true, Advanced: true, Label: "Date column", Kind: "text", Default: "detected", AppliesTo: "reading the file"},
		{Field: "date_format", Input: true, Advanced: true, Label: "Dates written as", Kind: "choice", Default: "decided from the column", AppliesTo: "reading dates such as 01/02/2005 that read either way",
			Choices: []Choice{{"", "decided from the column"}, {"dmy", "day/month/year (31/01/2005)"}, {"mdy", "month/day/year (01/31/2005)"},
				{"yyyymm", "year-month numbers (200501)"}, {"yyyyq", "year-quarter numbers (20051)"}, {"yyyymmdd", "year-month-day numbers (20050131)"}}},
		{Field: "gaps", Input: true, Advanced: true, Label: "Missing periods inside a series", Kind: "choice", Default: "stop with an error naming them", AppliesTo: "reading the series",
			Choices: []Choice{{"", "stop with an error naming them"}, {"keep", "test the observations as if consecutive"}, {"split", "test the longest stretch without gaps"}}},
		{Field: "sheet", Input: true, Advanced: true, Label: "Workbook sheet", Kind: "text", Default: "the first that reads as a table", AppliesTo: "reading an .xlsx file"},
		{Field: "right_tail", Advanced: true, Label: "Augmented Dickey-Fuller against an explosive alternative (right tail)", Kind: "flag", Default: "off (left tail)", AppliesTo: "adf"},
	}
}

// CommandOnlySettings describes the settings that the page sets by other
// means (the test picker, the series picker) or does not offer (the
// verdict's error rates recomputed, the explosive tests' minimum window).
// Together with SettingsDescription they describe every setting but long
// (the long-table reading, which has its own options); the command line's
// help is written from both, so that it and the page say the same.
func CommandOnlySettings() []SettingInfo {
	return []SettingInfo{
		{Field: "tests", Label: "Tests to run (comma-separated ids)", Kind: "list", Default: "the default battery and the verdict",
			AppliesTo: "every series; the ids are those of the test list"},
		{Field: "verdict", Label: "Also give the verdict when tests are listed", Kind: "flag",
			Default: "off (without a list of tests the verdict is always given)", AppliesTo: "the verdict"},
		{Field: "columns", Input: true, Label: "Series to test (comma-separated column names)", Kind: "list", Default: "every numeric column", AppliesTo: "reading the file"},
		{Field: "min_window", Advanced: true, Label: "Smallest window of the recursive regressions, as a fraction of the sample", Kind: "number",
			Default: "0.01 + 1.8/√T", Min: bound(0), Max: bound(1), AppliesTo: "sadf, gsadf (strictly between 0 and 1)"},
		{Field: "rate_draws", Advanced: true, Label: "Recompute the verdict's error rates with this many draws per simulated process", Kind: "integer",
			Default: "0: the committed tables", Min: bound(0), Max: bound(100_000), AppliesTo: "the verdict's reliability, at the series' length and these settings (slow)"},
	}
}

// describedValues lists, for the settings whose choices are a closed list,
// the values Validate accepts; used to check SettingsDescription.
func describedValues(field string) ([]string, bool) {
	switch field {
	case "transform":
		return Transforms, true
	case "date_format":
		return dataset.DateFormats, true
	case "gaps":
		// "stop" spells out the default, offered as "".
		var out []string
		for _, g := range dataset.GapRules {
			if g != "stop" {
				out = append(out, g)
			}
		}
		return out, true
	}
	return nil, false
}
