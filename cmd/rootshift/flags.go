package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"strconv"
	"strings"

	"github.com/rootshift/rootshift/breaks/report"
	"github.com/rootshift/rootshift/core/schema"
)

// intPtr is a flag whose absence leaves a nil pointer (the setting's default).
type intPtr struct{ p **int }

func (f intPtr) String() string {
	if f.p == nil || *f.p == nil {
		return ""
	}
	return strconv.Itoa(**f.p)
}
func (f intPtr) Set(s string) error {
	v, err := strconv.Atoi(s)
	if err != nil {
		return fmt.Errorf("want a whole number, got %q", s)
	}
	*f.p = &v
	return nil
}

type floatPtr struct{ p **float64 }

func (f floatPtr) String() string {
	if f.p == nil || *f.p == nil {
		return ""
	}
	return strconv.FormatFloat(**f.p, 'g', -1, 64)
}
func (f floatPtr) Set(s string) error {
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		return fmt.Errorf("want a number, got %q", s)
	}
	*f.p = &v
	return nil
}

type listFlag struct{ p *[]string }

func (f listFlag) String() string {
	if f.p == nil {
		return ""
	}
	return strings.Join(*f.p, ",")
}
func (f listFlag) Set(s string) error { *f.p = append(*f.p, splitList(s)...); return nil }

// settingsFlags binds every analysis setting to fs. The names are a
// contract shared with the schema's settings object and the page.
func settingsFlags(fs *flag.FlagSet, s *schema.Settings) {
	// A word in backquotes is the placeholder PrintDefaults shows after the
	// flag name ("--tests IDS"); other flags of custom types would show "value".
	fs.Var(listFlag{&s.Tests}, "tests", "comma-separated test `ids` (default: the default battery and the verdict); \"rootshift tests\" lists them")
	fs.BoolVar(&s.Verdict, "verdict", false, "also give the verdict when --tests lists tests (without --tests the verdict is always given)")
	fs.StringVar(&s.Trend, "trend", "", "deterministic terms: none, constant, linear (default auto: each test's own)")
	fs.Var(intPtr{&s.Lags}, "lags", "fixed augmentation lags `K` (default: chosen by --lag-rule)")
	fs.StringVar(&s.LagRule, "lag-rule", "", "lag selection: aic, bic, maic, tsig (default: each method's own rule)")
	fs.Var(intPtr{&s.MaxLags}, "max-lags", "largest lag `K` considered (default: each test's own, Schwert 1989 floor(12(T/100)^(1/4)) or 8 for break tests)")
	fs.Var(floatPtr{&s.Bandwidth}, "bandwidth", "fixed kernel bandwidth (a `number`) for pp and kpss (default: automatic)")
	fs.StringVar(&s.Kernel, "kernel", "", "long-run variance kernel: bartlett (default) or qs")
	fs.StringVar(&s.BandwidthRule, "bandwidth-rule", "", "automatic bandwidth: newey-west (default) or andrews")
	fs.Float64Var(&s.Level, "level", 0, "significance level for decisions (default 0.05)")
	fs.StringVar(&s.Shift, "shift", "", "break tests: level (default), slope, level+slope")
	fs.Float64Var(&s.Trim, "trim", 0, "trimming fraction for break searches (default 0.15)")
	fs.StringVar(&s.BreakDate, "break-date", "", "known break for p89: a date or an observation number (last observation of the old regime)")
	fs.StringVar(&s.Window, "window", "", "suspected crisis window FROM:TO (dates or observation numbers)")
	fs.IntVar(&s.Sims, "sims", 0, "add simulated finite-sample p-values with N replications")
	fs.IntVar(&s.RateDraws, "rate-draws", 0, "recompute the verdict's error rates at the series' length and these settings with N draws per simulated process (slow); 0: the committed tables")
	fs.Uint64Var(&s.Seed, "seed", 0, "seed for simulations (same seed, same numbers)")
	fs.BoolVar(&s.RightTail, "right-tail", false, "adf against an explosive root (right-tailed)")
	fs.Float64Var(&s.MinWindow, "min-window", 0, "sadf/gsadf minimum window fraction (default 0.01+1.8/sqrt(T))")
	fs.IntVar(&s.MaxBreaks, "max-breaks", 0, "bp: largest number of breaks (default 5)")
	fs.StringVar(&s.Outlier, "outlier", "", "meanshift: how the mean shifts enter, innovational (default, gradually) or additive (at once)")
	fs.IntVar(&s.Shifts, "shifts", 0, "meanshift: number of mean shifts, 1 (default) or 2")
	fs.Var(listFlag{&s.Columns}, "columns", "comma-separated series (column `names`) to test (default: every numeric column)")
	fs.StringVar(&s.From, "from", "", "first observation of the sample (date or number)")
	fs.StringVar(&s.To, "to", "", "last observation of the sample (date or number)")
	fs.StringVar(&s.Transform, "transform", "", "transform before testing: log, diff, diff2, logdiff")
	fs.StringVar(&s.DateColumn, "date-column", "", "name of the date column (default: detected)")
	fs.StringVar(&s.DateFormat, "date-format", "", "read ambiguous dates as dmy (31/01/2005), mdy (01/31/2005), yyyymm, yyyyq or yyyymmdd (default: decided from the column)")
	fs.StringVar(&s.Gaps, "gaps", "", "calendar gaps inside a series: stop (default, error), keep (test as if consecutive) or split (longest stretch without gaps)")
	fs.StringVar(&s.Sheet, "sheet", "", "worksheet of an .xlsx file to read (default: the first with data)")
}

// parseInterleaved parses flags that may come before or after positional
// arguments ("test FILE --json"). "--" ends flag parsing. -h prints the
// help (fs.Usage) and returns errHelp; a bad flag returns an error that
// points to -h, without printing the whole help.
func parseInterleaved(fs *flag.FlagSet, args []string) ([]string, error) {
	var pos []string
	help := fs.Usage
	fs.Usage = func() {}
	defer func() { fs.Usage = help }()
	for {
		if err := fs.Parse(args); err != nil {
			if errors.Is(err, flag.ErrHelp) {
				help()
				return nil, errHelp
			}
			return nil, fmt.Errorf("%v (\"rootshift %s -h\" lists the options)", err, fs.Name())
		}
		rest := fs.Args()
		if len(rest) == 0 {
			return pos, nil
		}
		if len(args) > 0 && len(rest) < len(args) && args[len(args)-len(rest)-1] == "--" {
			return append(pos, rest...), nil
		}
		pos = append(pos, rest[0])
		args = rest[1:]
	}
}

// newFlagSet returns the flag set of a command. Its help (-h) goes to
// stdout, as for "rootshift help", and lists the flags with two dashes, the
// form the usage lines and messages use (one for one-letter flags: -o, -j;
// the flag package accepts both); parse errors are not printed by
// the flag package (the caller reports them once).
func newFlagSet(name string, stdout io.Writer, usage string) *flag.FlagSet {
	fs := flag.NewFlagSet(name, flag.ContinueOnError)
	fs.SetOutput(io.Discard)
	fs.Usage = func() {
		var b strings.Builder
		b.WriteString(usage + "\n\nOptions:\n")
		fs.VisitAll(func(f *flag.Flag) {
			placeholder, text := flag.UnquoteUsage(f)
			dash := "--"
			if len(f.Name) == 1 {
				dash = "-" // -o, -j
			}
			b.WriteString("  " + dash + f.Name)
			if placeholder != "" {
				b.WriteString(" " + placeholder)
			}
			b.WriteString("\n    \t" + strings.ReplaceAll(text, "\n", "\n    \t"))
			if d := f.DefValue; d != "" && d != "0" && d != "false" && !strings.Contains(text, "default") {
				fmt.Fprintf(&b, " (default %q)", d)
			}
			b.WriteString("\n")
		})
		io.WriteString(stdout, b.String())
	}
	return fs
}

func checkFormat(f string) error {
	for _, x := range report.Formats {
		if f == x {
			return nil
		}
	}
	return fmt.Errorf("--format %q: want one of %s", f, strings.Join(report.Formats, ", "))
}

// givenZeroRanges are the settings whose zero value means "the default" in
// schema.Settings: given explicitly as 0 on the command line they would
// silently run with the default, so they are refused with their valid range.
var givenZeroRanges = map[string]string{
	"trim":       "--trim 0: want a trimming fraction from 0.01 to below 0.5 (leave it out for the default 0.15)",
	"level":      "--level 0: want a significance level above 0 and below 0.5 (leave it out for the default 0.05)",
	"max-breaks": "--max-breaks 0: want 1..10 breaks (leave it out for the default 5; --tests without bp runs no break-count search)",
	"min-window": "--min-window 0: want a fraction above 0 and below 1 (leave it out for the default 0.01+1.8/sqrt(T))",
}

// checkGivenZeros refuses the flags of givenZeroRanges given as 0: the
// flag package tells "not given" (not visited) from "given as 0".
func checkGivenZeros(fs *flag.FlagSet) error {
	var err error
	fs.Visit(func(f *flag.Flag) {
		msg, ok := givenZeroRanges[f.Name]
		if !ok || err != nil {
			return
		}
		if v, perr := strconv.ParseFloat(f.Value.String(), 64); perr == nil && v == 0 {
			err = errors.New(msg)
		}
	})
	return err
}
