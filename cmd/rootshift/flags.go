package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"strconv"
	"strings"

	"github.com/rootshift/rootshift/breaks/battery"
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
// contract shared with the schema's settings object and the page: a flag is
// the setting's JSON name with "-" for "_". Each flag's help is written from
// the engine's description of the setting (battery.SettingsDescription, which
// the page's settings form is built from, and battery.CommandOnlySettings),
// so that the command line and the page say the same.
func settingsFlags(fs *flag.FlagSet, s *schema.Settings) {
	desc := map[string]battery.SettingInfo{}
	for _, d := range describedSettings() {
		desc[d.Field] = d
	}
	bind := func(field string, v flag.Value) {
		d, ok := desc[field]
		usage := "(not described: see battery.CommandOnlySettings)"
		if ok {
			usage = settingUsage(d)
		}
		sv := settingValue{Value: v, placeholder: settingPlaceholder(d)}
		if b, isBool := v.(boolVal); isBool {
			fs.Var(settingBool{sv, b}, settingFlag(field), usage)
			return
		}
		fs.Var(sv, settingFlag(field), usage)
	}
	bind("tests", listFlag{&s.Tests})
	bind("verdict", boolVal{&s.Verdict})
	bind("trend", strVal{&s.Trend})
	bind("lags", intPtr{&s.Lags})
	bind("lag_rule", strVal{&s.LagRule})
	bind("max_lags", intPtr{&s.MaxLags})
	bind("bandwidth", floatPtr{&s.Bandwidth})
	bind("kernel", strVal{&s.Kernel})
	bind("bandwidth_rule", strVal{&s.BandwidthRule})
	bind("level", floatVal{&s.Level})
	bind("shift", strVal{&s.Shift})
	bind("trim", floatVal{&s.Trim})
	bind("break_date", strVal{&s.BreakDate})
	bind("window", strVal{&s.Window})
	bind("sims", intVal{&s.Sims})
	bind("rate_draws", intVal{&s.RateDraws})
	bind("seed", uintVal{&s.Seed})
	bind("right_tail", boolVal{&s.RightTail})
	bind("min_window", floatVal{&s.MinWindow})
	bind("max_breaks", intVal{&s.MaxBreaks})
	bind("outlier", strVal{&s.Outlier})
	bind("shifts", intVal{&s.Shifts})
	bind("columns", listFlag{&s.Columns})
	bind("from", strVal{&s.From})
	bind("to", strVal{&s.To})
	bind("transform", strVal{&s.Transform})
	bind("date_column", strVal{&s.DateColumn})
	bind("date_format", strVal{&s.DateFormat})
	bind("gaps", strVal{&s.Gaps})
	bind("sheet", strVal{&s.Sheet})
}

// describedSettings is every described setting: the page's and the
// command line's own.
func describedSettings() []battery.SettingInfo {
	return append(battery.SettingsDescription(), battery.CommandOnlySettings()...)
}

// settingFlag is the flag of a setting: its JSON name with "-" for "_".
func settingFlag(field string) string { return strings.ReplaceAll(field, "_", "-") }

// settingUsage is a setting's flag help, written from its description:
// the label, the default, the accepted values with their meaning, the
// range, and what the setting applies to.
func settingUsage(d battery.SettingInfo) string {
	var b strings.Builder
	b.WriteString(d.Label)
	b.WriteString("\ndefault: " + d.Default)
	if len(d.Choices) > 0 {
		b.WriteString("\nvalues:")
		for _, c := range d.Choices {
			if c.Value != "" { // the default is said above
				fmt.Fprintf(&b, "\n  %s  %s", c.Value, c.Label)
			}
		}
	}
	num := func(x *float64) string { return strconv.FormatFloat(*x, 'f', -1, 64) }
	switch {
	case d.Min != nil && d.Max != nil:
		fmt.Fprintf(&b, "\nrange: %s to %s", num(d.Min), num(d.Max))
	case d.Min != nil:
		fmt.Fprintf(&b, "\nrange: %s or more", num(d.Min))
	}
	b.WriteString("\napplies to: " + d.AppliesTo)
	return b.String()
}

// settingPlaceholder is the word the help shows after a setting's flag.
func settingPlaceholder(d battery.SettingInfo) string {
	switch d.Field {
	case "tests":
		return "ids"
	case "columns":
		return "names"
	case "window":
		return "FROM:TO"
	case "from", "to", "break_date":
		return "date"
	case "lags", "max_lags":
		return "K"
	case "date_column", "sheet":
		return "name"
	}
	switch d.Kind {
	case "integer":
		return "N"
	case "number":
		return "x"
	case "choice":
		return "choice"
	case "flag":
		return ""
	}
	return "text"
}

// settingValue is a setting's flag value with its help placeholder.
type settingValue struct {
	flag.Value
	placeholder string
}

func (v settingValue) Placeholder() string { return v.placeholder }

// settingBool is a setting's on/off flag (no value after it).
type settingBool struct {
	settingValue
	boolVal
}

func (v settingBool) Set(s string) error { return v.boolVal.Set(s) }
func (v settingBool) String() string     { return v.boolVal.String() }
func (settingBool) IsBoolFlag() bool     { return true }

type strVal struct{ p *string }

func (v strVal) String() string {
	if v.p == nil {
		return ""
	}
	return *v.p
}
func (v strVal) Set(s string) error { *v.p = s; return nil }

type boolVal struct{ p *bool }

func (v boolVal) String() string {
	if v.p == nil {
		return "false"
	}
	return strconv.FormatBool(*v.p)
}
func (v boolVal) Set(s string) error {
	b, err := strconv.ParseBool(s)
	if err != nil {
		return fmt.Errorf("want true or false, got %q", s)
	}
	*v.p = b
	return nil
}

type intVal struct{ p *int }

func (v intVal) String() string {
	if v.p == nil {
		return "0"
	}
	return strconv.Itoa(*v.p)
}
func (v intVal) Set(s string) error {
	x, err := strconv.Atoi(s)
	if err != nil {
		return fmt.Errorf("want a whole number, got %q", s)
	}
	*v.p = x
	return nil
}

type uintVal struct{ p *uint64 }

func (v uintVal) String() string {
	if v.p == nil {
		return "0"
	}
	return strconv.FormatUint(*v.p, 10)
}
func (v uintVal) Set(s string) error {
	x, err := strconv.ParseUint(s, 10, 64)
	if err != nil {
		return fmt.Errorf("want a whole number from 0, got %q", s)
	}
	*v.p = x
	return nil
}

type floatVal struct{ p *float64 }

func (v floatVal) String() string {
	if v.p == nil {
		return "0"
	}
	return strconv.FormatFloat(*v.p, 'g', -1, 64)
}
func (v floatVal) Set(s string) error {
	x, err := strconv.ParseFloat(s, 64)
	if err != nil {
		return fmt.Errorf("want a number, got %q", s)
	}
	*v.p = x
	return nil
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
			if p, ok := f.Value.(interface{ Placeholder() string }); ok {
				placeholder = p.Placeholder()
			}
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
