package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"os/signal"
	"runtime/pprof"
	"strings"
	"syscall"

	"github.com/rootshift/rootshift/breaks/battery"
)

func main() {
	stop := cpuProfile(os.Getenv("ROOTSHIFT_CPUPROFILE"), os.Stderr)
	code := run(signalContext(), os.Args[1:], os.Stdin, os.Stdout, os.Stderr)
	stop()
	os.Exit(code)
}

// cpuProfile starts a CPU profile into path (for developers: the
// environment variable ROOTSHIFT_CPUPROFILE, see DEVELOPERS.md) and
// returns the function that ends it; with an empty path it does nothing.
func cpuProfile(path string, stderr io.Writer) func() {
	if path == "" {
		return func() {}
	}
	f, err := os.Create(path)
	if err == nil {
		err = pprof.StartCPUProfile(f)
	}
	if err != nil {
		fmt.Fprintf(stderr, "rootshift: ROOTSHIFT_CPUPROFILE: %v\n", err)
		return func() {}
	}
	return func() {
		pprof.StopCPUProfile()
		f.Close()
	}
}

// signalContext is cancelled by SIGINT or SIGTERM, with the signal as its
// cause (see cancelStatus); a second signal exits at once.
func signalContext() context.Context {
	ctx, cancel := context.WithCancelCause(context.Background())
	sig := make(chan os.Signal, 1)
	signal.Notify(sig, os.Interrupt, syscall.SIGTERM)
	go func() {
		s := <-sig
		if s == syscall.SIGTERM {
			cancel(errSIGTERM)
		} else {
			cancel(errSIGINT)
		}
		// A second signal ends the process at once.
		<-sig
		os.Exit(exitCancel)
	}()
	return ctx
}

// Causes of the cancellation of the command's context.
var (
	errSIGINT  = errors.New("interrupted (SIGINT)")
	errSIGTERM = errors.New("terminated (SIGTERM)")
)

// cancelStatus is the exit status after cancellation: 143 for SIGTERM,
// 130 otherwise.
func (e *env) cancelStatus() int {
	if errors.Is(context.Cause(e.ctx), errSIGTERM) {
		return exitTerm
	}
	return exitCancel
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
	exitOutput  = 3 // an output could not be written in full
	exitNothing = 4 // nothing to process: no series in the input
	exitCancel  = 130
	exitTerm    = 143
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
