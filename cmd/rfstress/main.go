// Command rfstress checks whether the parts of a transmit filter survive
// the power put through them. Run `rfstress help` for the commands.
package main

import (
	"errors"
	"fmt"
	"io"
	"os"
	"sort"
	"strings"

	"github.com/spf13/pflag"
)

// Version is the tool version printed in reports.
var Version = "0.4.0"

// Exit codes: 0 all within limits, 1 a part over its limit, 2 usage or input.
const (
	exitOK    = 0
	exitOver  = 1
	exitUsage = 2
)

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
	os.Exit(run(os.Args[1:], os.Stdout, os.Stderr))
}

func run(args []string, stdout, stderr io.Writer) int {
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
		fmt.Fprintf(stderr, "rfstress: unknown command %q (expected one of %s)\n", args[0], commandNames())
		return exitUsage
	}
	code, err := c.run(args[1:], stdout, stderr)
	if err != nil {
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
