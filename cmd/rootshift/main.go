package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"os/signal"
	"strings"

	"github.com/rootshift/rootshift/breaks/battery"
)

func main() {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
	defer stop()
	os.Exit(run(ctx, os.Args[1:], os.Stdin, os.Stdout, os.Stderr))
}

const usageText = `rootshift: does a series have a unit root, or only look like it because of a break?

Usage:
  rootshift test [options] FILE...     test the series in CSV/TSV/.xlsx files ("-" reads standard input)
  rootshift demo [options]             run the battery on the built-in demo data (an invented region)
  rootshift batch [options] INPUT...   many series: JSON Lines out, parallel, resumable, shardable
  rootshift critical --test ID --n T   simulated finite-sample critical values of a test
  rootshift page -o FILE               write the offline page (one self-contained HTML file)
  rootshift tests                      list the test ids
  rootshift version                    print the version

Run "rootshift COMMAND -h" for the options of a command.
Results inform decisions: tests have limited power and depend on settings; the analyst decides.
`

// exit codes
const (
	exitOK      = 0
	exitFailed  = 1
	exitUsage   = 2
	exitCancel  = 130
	cmdTest     = "test"
	cmdDemo     = "demo"
	cmdBatch    = "batch"
	cmdCritical = "critical"
	cmdPage     = "page"
)

func run(ctx context.Context, args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	if len(args) == 0 {
		fmt.Fprint(stderr, usageText)
		return exitUsage
	}
	env := &env{ctx: ctx, stdin: stdin, stdout: stdout, stderr: stderr}
	switch args[0] {
	case cmdTest:
		return env.test(args[1:])
	case cmdDemo:
		return env.demo(args[1:])
	case cmdBatch:
		return env.batch(args[1:])
	case cmdCritical:
		return env.critical(args[1:])
	case cmdPage:
		return env.page(args[1:])
	case "tests":
		return env.listTests()
	case "version", "--version", "-version":
		fmt.Fprintf(stdout, "rootshift %s\n", battery.Version)
		return exitOK
	case "help", "-h", "--help", "-help":
		fmt.Fprint(stdout, usageText)
		return exitOK
	}
	fmt.Fprintf(stderr, "rootshift: unknown command %q\n\n%s", args[0], usageText)
	return exitUsage
}

type env struct {
	ctx            context.Context
	stdin          io.Reader
	stdout, stderr io.Writer
}

func (e *env) errorf(format string, args ...any) {
	fmt.Fprintf(e.stderr, "rootshift: "+format+"\n", args...)
}

// usageExit prints a usage error and returns exit status 2.
func (e *env) usageExit(err error) int {
	if errors.Is(err, errHelp) {
		return exitOK
	}
	e.errorf("%v", err)
	return exitUsage
}

var errHelp = errors.New("help requested")

func splitList(s string) []string {
	var out []string
	for _, f := range strings.FieldsFunc(s, func(r rune) bool { return r == ',' || r == ' ' }) {
		out = append(out, strings.TrimSpace(f))
	}
	return out
}
