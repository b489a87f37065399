// Command ramify keeps a taxonomy — a tree of named categories over items —
// as plain text in a git repository: it checks the files, regenerates the
// tree under every editorial decision, draws review packets, and diffs
// versions. Run `ramify help` for the commands.
package main

import (
	"fmt"
	"io"
	"os"
	"sort"
	"strings"

	"github.com/ramify-tax/ramify/format"
	"github.com/spf13/pflag"
)

// command is one subcommand: its flags are added to a fresh FlagSet and
// bound to a fresh options value per run, so tests can call run
// repeatedly in one process.
type command struct {
	name    string
	summary string
	usage   string // argument synopsis after the command name
	help    string // longer help text, plain words
	// bind adds the command's own flags to fs, bound to the fields of a
	// new options value, and returns the command's run with that value.
	bind func(fs *pflag.FlagSet) runFunc
	// run is the run of a command without flags of its own (bind nil).
	run runFunc
}

// runFunc runs a command on its arguments.
type runFunc func(e *env, args []string) error

// withOptions makes a command's bind from its options struct O: flags
// binds each flag to a field of o, and run gets o once they are parsed.
// A mistyped field name fails to compile rather than at run time.
func withOptions[O any](flags func(fs *pflag.FlagSet, o *O), run func(e *env, o *O, args []string) error) func(*pflag.FlagSet) runFunc {
	return func(fs *pflag.FlagSet) runFunc {
		o := new(O)
		flags(fs, o)
		return func(e *env, args []string) error { return run(e, o, args) }
	}
}

var commands = map[string]*command{}

func register(c *command) { commands[c.name] = c }

// options are the flags every command takes; a command's own are fields
// of its options struct (see withOptions).
type options struct {
	dir   string
	json  bool
	quiet bool
	help  bool
}

func main() {
	os.Exit(run(os.Args[1:], os.Stdout, os.Stderr))
}

// run executes one ramify invocation and returns its exit status:
// 0 success, 1 a check or gate failed, 2 bad input or usage, 3 an
// internal failure (an operating system or git error, or a bug).
func run(args []string, stdout, stderr io.Writer) int {
	if len(args) == 0 {
		printOverview(stderr)
		return exitUsage
	}
	name := args[0]
	switch name {
	case "help", "-h", "--help":
		if len(args) == 1 {
			printOverview(stdout)
			return 0
		}
		topic := strings.Join(args[1:], " ")
		if c, ok := commands[topic]; ok {
			printCommandHelp(stdout, c)
			return 0
		}
		msg := fmt.Sprintf("ramify help: no command %q", topic)
		if s := suggestCommand(args[1]); s != "" && s != args[1] {
			msg += fmt.Sprintf("; did you mean %q?", s)
		}
		printLine(stderr, msg)
		fmt.Fprintln(stderr, "run `ramify help` for the list of commands")
		return exitUsage
	case "version", "--version":
		fmt.Fprintln(stdout, "ramify", version)
		return 0
	}
	// "review draw" style two-word commands.
	if len(args) > 1 {
		if c, ok := commands[name+" "+args[1]]; ok {
			return runCommand(c, args[2:], stdout, stderr)
		}
	}
	c, ok := commands[name]
	if !ok {
		msg := fmt.Sprintf("ramify: unknown command %q", name)
		if s := suggestCommand(name); s != "" {
			msg += fmt.Sprintf("; did you mean %q?", s)
		}
		printLine(stderr, msg)
		fmt.Fprintln(stderr, "run `ramify help` for the list of commands")
		return exitUsage
	}
	return runCommand(c, args[1:], stdout, stderr)
}

func runCommand(c *command, args []string, stdout, stderr io.Writer) int {
	fs, o, run := commandFlags(c)
	if err := fs.Parse(args); err != nil {
		printLine(stderr, fmt.Sprintf("ramify %s: %v", c.name, err))
		fmt.Fprintf(stderr, "run `ramify %s --help` for its options\n", c.name)
		return exitUsage
	}
	if o.help {
		printCommandHelp(stdout, c)
		return 0
	}
	e := newEnv(o, fs, stdout, stderr)
	// git runs its drivers on temporary files, outside the repository's
	// own writes; every other command first finishes what an interrupted
	// run left behind.
	if !strings.HasPrefix(c.name, "git-") {
		if err := recoverInterrupted(e); err != nil {
			return e.finish(c, err)
		}
	}
	err := runRecovering(run, e, fs.Args())
	return e.finish(c, err)
}

// internalError is a failure inside ramify (a panic): it exits with
// exitInternal and one line, never a goroutine dump that reads like a
// verdict on the input.
type internalError struct{ msg string }

func (ie *internalError) Error() string { return "internal error: " + ie.msg + " (please report this)" }

// runRecovering runs the command, turning a panic into an internalError.
// The Go runtime's own out-of-memory stop cannot be caught; the budgets
// checked before allocating keep inputs from reaching it.
func runRecovering(run runFunc, e *env, args []string) (err error) {
	defer func() {
		if r := recover(); r != nil {
			err = &internalError{msg: fmt.Sprint(r)}
		}
	}()
	return run(e, args)
}

// commandFlags builds a command's flag set: the options every command
// takes, then its own, and the run that reads them.
func commandFlags(c *command) (*pflag.FlagSet, *options, runFunc) {
	fs := pflag.NewFlagSet("ramify "+c.name, pflag.ContinueOnError)
	fs.SetOutput(io.Discard)
	fs.SortFlags = false
	o := &options{}
	fs.StringVar(&o.dir, "dir", ".", "the taxonomy repository")
	fs.BoolVar(&o.json, "json", false, "print a machine-readable report on stdout instead of text")
	fs.BoolVarP(&o.quiet, "quiet", "q", false, "print nothing but errors")
	fs.BoolVarP(&o.help, "help", "h", false, "show this help")
	run := c.run
	if c.bind != nil {
		run = c.bind(fs)
	}
	return fs, o, run
}

func printOverview(w io.Writer) {
	fmt.Fprint(w, `ramify keeps a taxonomy as plain text in a git repository.

Usage: ramify COMMAND [options]

Commands:
`)
	// Helpers that git runs (their summary starts "for git:") are left
	// out of the overview; their own --help still explains them.
	names := make([]string, 0, len(commands))
	width := 0
	for n, c := range commands {
		if strings.HasPrefix(c.summary, "for git:") {
			continue
		}
		names = append(names, n)
		width = max(width, len(n))
	}
	sort.Strings(names)
	for _, n := range names {
		fmt.Fprintf(w, "  %-*s  %s\n", width, n, commands[n].summary)
	}
	fmt.Fprint(w, `
Every command takes --dir DIR (the repository, default "."), --json,
--quiet and --help. Exit status: 0 success, 1 a check or gate failed,
2 bad input or usage, 3 an internal failure (an operating system or git
error, or a bug; one line says which).

Run "ramify help COMMAND" for a command's details.
`)
}

func printCommandHelp(w io.Writer, c *command) {
	fs, _, _ := commandFlags(c)
	fmt.Fprintf(w, "Usage: ramify %s [options]%s\n\n%s\n", c.name, prefixSpace(c.usage), c.summary)
	if c.help != "" {
		fmt.Fprintf(w, "\n%s\n", strings.TrimSpace(c.help))
	}
	fmt.Fprintf(w, "\nOptions:\n%s", fs.FlagUsages())
}

func prefixSpace(s string) string {
	if s == "" {
		return ""
	}
	return " " + s
}

func suggestCommand(name string) string {
	names := make([]string, 0, len(commands))
	for n := range commands {
		names = append(names, strings.Fields(n)[0])
	}
	sort.Strings(names)
	return format.Suggest(name, names)
}

// version is set at build time with -ldflags "-X main.version=...".
var version = "dev"
