// Command rfstress checks whether the parts of a transmit filter survive
// the power put through them. Run `rfstress help` for the commands.
package main

import (
	"errors"
	"fmt"
	"io"
	"os"
	"os/signal"
	"sort"
	"strings"
	"syscall"

	"github.com/spf13/pflag"

	"rfstress/circuits"
	"rfstress/stress"
)

// Version is the tool version printed in reports.
var Version = "0.4.0"

// Exit codes: 0 all within limits, 1 a part over its limit, 2 usage or
// input (including an output that cannot be written), 3 an internal error
// (a bug: the message asks for a report), 130 and 143 interrupted by
// SIGINT or SIGTERM (128 + the signal number, the shell's convention).
const (
	exitOK       = 0
	exitOver     = 1
	exitUsage    = 2
	exitInternal = 3
)

// internalError marks a failure that is no fault of the input.
type internalError struct{ what any }

func (e internalError) Error() string {
	return fmt.Sprintf("rfstress: internal error: %v; this is a bug in rfstress, not in your input: please report it with the command line and the input files", e.what)
}

// usageError marks errors that exit 2.
type usageError struct{ err error }

func (u usageError) Error() string { return u.err.Error() }
func (u usageError) Unwrap() error { return u.err }

func usagef(format string, args ...any) error {
	return usageError{fmt.Errorf(format, args...)}
}

type command struct {
	name    string
	summary string
	run     func(args []string, stdout, stderr io.Writer) (int, error)
}

var commands = map[string]command{}

func register(c command) { commands[c.name] = c }

func main() {
	installCleanup()
	os.Exit(runChecked(os.Args[1:], os.Stdout, os.Stderr))
}

// installCleanup removes temporary output files when SIGINT or SIGTERM
// ends the run, and exits 128 + the signal number.
func installCleanup() {
	sig := make(chan os.Signal, 1)
	signal.Notify(sig, syscall.SIGINT, syscall.SIGTERM)
	go func() {
		s := <-sig
		removeTemps() // no half-written .rfstress-* file is left behind
		fmt.Fprintln(os.Stderr, "\nrfstress: interrupted; no output was replaced")
		code := 130
		if s == syscall.SIGTERM {
			code = 143
		}
		os.Exit(code)
	}()
}

// runChecked is run with stdout checked: output lost to a full device or
// a closed pipe exits 2 with a message instead of 0 with the text gone.
func runChecked(args []string, stdout, stderr io.Writer) int {
	out := &checkedWriter{w: stdout}
	code := run(args, out, stderr)
	if out.err != nil && code != exitInternal {
		fmt.Fprintf(stderr, "rfstress: cannot write standard output: %v\n", out.err)
		code = exitUsage
	}
	return code
}

// checkedWriter keeps the first write error, so output lost to a full
// disk or a closed pipe is never reported as success.
type checkedWriter struct {
	w   io.Writer
	err error
}

func (c *checkedWriter) Write(p []byte) (int, error) {
	if c.err != nil {
		return 0, c.err
	}
	n, err := c.w.Write(p)
	if err != nil {
		c.err = err
	}
	return n, err
}

// run executes one command line. A panic anywhere below is a bug, never
// an input error: it exits 3 with a request for a report.
func run(args []string, stdout, stderr io.Writer) (code int) {
	defer func() {
		if r := recover(); r != nil {
			fmt.Fprintln(stderr, internalError{r}.Error())
			code = exitInternal
		}
	}()
	return dispatch(args, stdout, stderr)
}

func dispatch(args []string, stdout, stderr io.Writer) int {
	if len(args) == 0 || args[0] == "help" || args[0] == "-h" || args[0] == "--help" {
		if len(args) > 1 {
			if c, ok := commands[args[1]]; ok {
				code, _ := c.run([]string{"--help"}, stdout, stderr)
				return code
			}
		}
		printUsage(stdout)
		if len(args) == 0 {
			return exitUsage
		}
		return exitOK
	}
	if args[0] == "version" || args[0] == "--version" {
		fmt.Fprintln(stdout, "rfstress", Version)
		return exitOK
	}
	c, ok := commands[args[0]]
	if !ok {
		fmt.Fprintf(stderr, "rfstress: unknown command %s (expected one of %s)\n", circuits.Quote(args[0]), commandNames())
		return exitUsage
	}
	code, err := c.run(args[1:], stdout, stderr)
	if err != nil {
		var ie internalError
		var se *stress.InternalError
		if errors.As(err, &se) {
			ie = internalError{se.What}
		}
		if errors.As(err, &ie) {
			fmt.Fprintln(stderr, ie.Error())
			return exitInternal
		}
		fmt.Fprintln(stderr, errorText(err))
		var ue usageError
		if errors.As(err, &ue) {
			return exitUsage
		}
		if code == exitOK {
			return exitUsage
		}
	}
	return code
}

func errorText(err error) string {
	s := err.Error()
	if !strings.Contains(s, ":") || strings.HasPrefix(s, "rfstress") {
		return "rfstress: " + s
	}
	return s
}

func commandNames() string {
	var n []string
	for k := range commands {
		n = append(n, k)
	}
	sort.Strings(n)
	return strings.Join(n, ", ")
}

func printUsage(w io.Writer) {
	fmt.Fprintf(w, "rfstress %s: component stress audit for RF transmit filters\n\nUsage: rfstress COMMAND [options] FILE...\n\nCommands:\n", Version)
	var n []string
	for k := range commands {
		n = append(n, k)
	}
	sort.Strings(n)
	for _, k := range n {
		fmt.Fprintf(w, "  %-9s %s\n", k, commands[k].summary)
	}
	fmt.Fprintf(w, "\nRun `rfstress COMMAND --help` for a command's options. See SAFETY.md before keying up.\n")
}

// newFlags makes a flag set whose errors become usage errors and whose
// help text names the command.
func newFlags(name, synopsis, about string, stdout io.Writer) *pflag.FlagSet {
	fs := pflag.NewFlagSet(name, pflag.ContinueOnError)
	fs.SortFlags = false
	fs.SetOutput(io.Discard)
	fs.Usage = func() {
		fmt.Fprintf(stdout, "Usage: rfstress %s\n\n%s\n\nOptions:\n%s", synopsis, about, fs.FlagUsages())
	}
	return fs
}

// parseFlags handles --help (exit 0) and flag errors (exit 2).
func parseFlags(fs *pflag.FlagSet, args []string) (help bool, err error) {
	if err := fs.Parse(args); err != nil {
		if errors.Is(err, pflag.ErrHelp) {
			return true, nil // pflag has printed the usage
		}
		return false, usagef("%s: %v (see rfstress %s --help)", fs.Name(), err, fs.Name())
	}
	return false, nil
}
