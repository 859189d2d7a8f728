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
	fs.Var(listFlag{&s.Tests}, "tests", "comma-separated test ids (default: the default battery and the verdict); see `rootshift tests`")
	fs.Var(listFlag{&s.VerdictTests}, "verdict-tests", "tests the verdict may use (default: adf,kpss,za,ls1,bp,sadf)")
	fs.StringVar(&s.Trend, "trend", "", "deterministic terms: none, constant, linear (default auto: each test's own)")
	fs.Var(intPtr{&s.Lags}, "lags", "fixed augmentation lags K (default: chosen by --lag-rule)")
	fs.StringVar(&s.LagRule, "lag-rule", "", "lag selection: aic, bic, maic, tsig (default: each method's own rule)")
	fs.Var(intPtr{&s.MaxLags}, "max-lags", "largest lag considered (default: Schwert 1989, 12(T/100)^(1/4))")
	fs.Var(floatPtr{&s.Bandwidth}, "bandwidth", "kernel bandwidth for pp and kpss (default: automatic)")
	fs.StringVar(&s.Kernel, "kernel", "", "long-run variance kernel: bartlett (default) or qs")
	fs.StringVar(&s.BandwidthRule, "bandwidth-rule", "", "automatic bandwidth: newey-west (default) or andrews")
	fs.Float64Var(&s.Level, "level", 0, "significance level for decisions (default 0.05)")
	fs.StringVar(&s.Shift, "shift", "", "break tests: level (default), slope, level+slope")
	fs.Float64Var(&s.Trim, "trim", 0, "trimming fraction for break searches (default 0.15)")
	fs.StringVar(&s.BreakDate, "break-date", "", "known break for p89: a date or an observation number (last observation of the old regime)")
	fs.StringVar(&s.Window, "window", "", "suspected crisis window FROM:TO (dates or observation numbers)")
	fs.IntVar(&s.Sims, "sims", 0, "add simulated finite-sample p-values with N replications")
	fs.Uint64Var(&s.Seed, "seed", 0, "seed for simulations (same seed, same numbers)")
	fs.BoolVar(&s.RightTail, "right-tail", false, "adf against an explosive root (right-tailed)")
	fs.Float64Var(&s.MinWindow, "min-window", 0, "sadf/gsadf minimum window fraction (default 0.01+1.8/sqrt(T))")
	fs.IntVar(&s.MaxBreaks, "max-breaks", 0, "bp: largest number of breaks (default 5)")
	fs.Var(listFlag{&s.Columns}, "columns", "comma-separated series (column headers) to test (default: every numeric column)")
	fs.StringVar(&s.From, "from", "", "first observation of the sample (date or number)")
	fs.StringVar(&s.To, "to", "", "last observation of the sample (date or number)")
	fs.StringVar(&s.Transform, "transform", "", "transform before testing: log, diff, diff2, logdiff")
	fs.StringVar(&s.DateColumn, "date-column", "", "name of the date column (default: detected)")
}

// parseInterleaved parses flags that may come before or after positional
// arguments ("test FILE --json"). "--" ends flag parsing.
func parseInterleaved(fs *flag.FlagSet, args []string) ([]string, error) {
	var pos []string
	for {
		if err := fs.Parse(args); err != nil {
			if errors.Is(err, flag.ErrHelp) {
				return nil, errHelp
			}
			return nil, err
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

func newFlagSet(name string, stderr io.Writer, usage string) *flag.FlagSet {
	fs := flag.NewFlagSet(name, flag.ContinueOnError)
	fs.SetOutput(stderr)
	fs.Usage = func() {
		fmt.Fprintf(stderr, "%s\n\nOptions:\n", usage)
		fs.PrintDefaults()
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
