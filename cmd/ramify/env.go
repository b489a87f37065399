package main

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"maps"
	"os"
	"path/filepath"
	"reflect"

	"github.com/ramify-tax/ramify/format"
	"github.com/spf13/pflag"
	"golang.org/x/term"
)

// Exit statuses.
const (
	exitOK     = 0
	exitFailed = 1 // a check or gate failed: conflict, violation, stale file
	exitUsage  = 2 // bad input or bad usage
	// exitInternal: ramify itself could not finish — an operating system
	// error (a disk full, a permission refused), git failing, or a bug —
	// so that CI never takes it for bad input in a pull request.
	exitInternal = 3
)

// env is what a command runs with: its options, output streams, and the
// report it builds for --json.
type env struct {
	opt    *options
	flags  *pflag.FlagSet
	stdout io.Writer
	stderr io.Writer
	// result is the command's own report, a struct with json tags (or a
	// pointer to one), printed as JSON on stdout when --json is given, in
	// one object with the outcome finish adds.
	result any
	// color is true when stdout is a terminal and NO_COLOR is unset.
	color bool
	// progress is true when stderr is a terminal and neither --quiet nor
	// --json is given.
	progress bool
	// shownProgress is set once a progress line is on the terminal.
	shownProgress bool
}

func newEnv(o *options, fs *pflag.FlagSet, stdout, stderr io.Writer) *env {
	e := &env{opt: o, flags: fs, stdout: stdout, stderr: stderr}
	_, noColor := os.LookupEnv("NO_COLOR")
	e.color = !noColor && !o.json && isTerminal(stdout)
	e.progress = !o.quiet && !o.json && isTerminal(stderr)
	return e
}

func isTerminal(w io.Writer) bool {
	f, ok := w.(*os.File)
	return ok && term.IsTerminal(int(f.Fd()))
}

// dir is the repository folder as given.
func (e *env) dir() string { return filepath.Clean(e.opt.dir) }

// say prints a line of human text unless --json or --quiet.
func (e *env) say(format string, args ...any) {
	if e.opt.json || e.opt.quiet {
		return
	}
	printLine(e.stdout, fmt.Sprintf(format, args...))
}

// notice prints a line to stderr unless --quiet.
func (e *env) notice(format string, args ...any) {
	if e.opt.quiet {
		return
	}
	printLine(e.stderr, fmt.Sprintf(format, args...))
}

// printLine prints text and a line break, with what a file or a pull
// request put in it escaped (format.Printable on each line): every line
// of human text ramify prints goes through here.
func printLine(w io.Writer, text string) {
	io.WriteString(w, format.PrintableLines(text)+"\n")
}

// failure is an error that means "a check failed" (exit 1) rather than
// "bad input" (exit 2). Its lines are printed as they are.
type failure struct {
	lines []string
	// detail, when set, is a struct with json tags whose fields go into
	// the --json report: the records behind the failure.
	detail any
}

func (f *failure) Error() string {
	if len(f.lines) == 0 {
		return "check failed"
	}
	return f.lines[0]
}

func failf(format string, args ...any) error {
	return &failure{lines: []string{fmt.Sprintf(format, args...)}}
}

// usageError is bad usage of the command line (exit 2).
type usageError struct{ msg string }

func (u *usageError) Error() string { return u.msg }

func usagef(format string, args ...any) error {
	return &usageError{msg: fmt.Sprintf(format, args...)}
}

// noArguments is the usage error of a command that takes none when it is
// given some, with advice after a "; " when there is any; nil when args is
// empty.
func noArguments(command string, args []string, advice string) error {
	if len(args) == 0 {
		return nil
	}
	if advice != "" {
		advice = "; " + advice
	}
	return usagef("%s takes no arguments (got %q)%s", command, args[0], advice)
}

// adviceDiags is bad input (exit 2, like format.Diags) with lines of
// advice printed after the problems: what to run to put them right.
type adviceDiags struct {
	ds     format.Diags
	advice []string
}

func (a *adviceDiags) Error() string { return a.ds.Error() }

// outlineMembershipError is how every command reports an outline that
// names items the repository does not have, or leaves some out: each
// problem at its file:line:col, exit status 2 (a file problem, as the
// README's rule says), and what to run.
func outlineMembershipError(ms format.Diags, advice string) error {
	return &adviceDiags{ds: ms, advice: []string{advice}}
}

// problemJSON is one problem in a --json report.
type problemJSON struct {
	File    string `json:"file"`
	Line    int    `json:"line"`
	Col     int    `json:"col"`
	Message string `json:"message"`
}

func problemsJSON(ds format.Diags) []problemJSON {
	out := make([]problemJSON, 0, len(ds))
	for _, d := range ds {
		line, col := d.Line, d.Col
		if line < 1 {
			line = 1
		}
		if col < 1 {
			col = 1
		}
		msg := d.Msg
		if d.More > 0 { // a count of problems left out
			msg = d.String()
		}
		out = append(out, problemJSON{File: d.File, Line: line, Col: col, Message: msg})
	}
	return out
}

// finish prints the outcome of a command and turns it into an exit status.
func (e *env) finish(c *command, err error) int {
	code := exitOK
	var ds format.Diags
	var fl *failure
	var ue *usageError
	var ad *adviceDiags
	var detail any
	// outcome is how the command ended, for --json: "ok", "command" and
	// what failed, keys set only when they apply.
	outcome := map[string]any{}
	switch {
	case err == nil:
	case errors.As(err, &ad):
		code = exitUsage
		outcome["problems"] = problemsJSON(ad.ds)
		for _, d := range ad.ds {
			printLine(e.stderr, d.String())
		}
		for _, l := range ad.advice {
			printLine(e.stderr, l)
		}
		outcome["advice"] = ad.advice
	case errors.As(err, &ds):
		code = exitUsage
		shown := ds.Capped()
		outcome["problems"] = problemsJSON(shown)
		for _, d := range shown {
			printLine(e.stderr, d.String())
		}
		if n := ds.Count(); ds.Stopped() {
			fmt.Fprintf(e.stderr, "at least %d problems; nothing was written\n", n)
		} else if n > 1 {
			fmt.Fprintf(e.stderr, "%d problems; nothing was written\n", n)
		} else {
			fmt.Fprintln(e.stderr, "nothing was written")
		}
	case errors.As(err, &fl):
		code = exitFailed
		for _, l := range fl.lines {
			printLine(e.stderr, l)
		}
		outcome["failure"] = fl.lines
		detail = fl.detail
	case errors.As(err, &ue):
		code = exitUsage
		printLine(e.stderr, "ramify "+c.name+": "+ue.msg)
		fmt.Fprintf(e.stderr, "run `ramify %s --help` for its options\n", c.name)
		outcome["error"] = ue.msg
	default:
		code = exitInternal
		printLine(e.stderr, "ramify "+c.name+": "+firstLineOf(err.Error()))
		outcome["error"] = err.Error()
	}
	if e.opt.json {
		outcome["ok"] = code == exitOK
		outcome["command"] = c.name
		if err := writeReport(e.stdout, e.result, detail, outcome); err != nil {
			fmt.Fprintf(e.stderr, "ramify: writing the report: %v\n", err)
			return exitInternal
		}
	}
	return code
}

// writeReport prints the --json report: the fields of every part (a
// struct with json tags, or a map) in one object, indented, with the keys
// in sorted order — the order the report kept when it was one map, which
// scripts may compare byte for byte. A later part's field replaces an
// earlier one's; nil parts are skipped.
func writeReport(w io.Writer, parts ...any) error {
	fields := map[string]json.RawMessage{}
	for _, part := range parts {
		if part == nil || reflect.ValueOf(part).Kind() == reflect.Pointer && reflect.ValueOf(part).IsNil() {
			continue
		}
		b, err := marshalJSON(part)
		if err != nil {
			return err
		}
		var these map[string]json.RawMessage
		if err := json.Unmarshal(b, &these); err != nil {
			return err
		}
		maps.Copy(fields, these)
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	return enc.Encode(fields)
}

// marshalJSON is json.Marshal without HTML escaping: "&" is common in
// category names and reads better as it is.
func marshalJSON(v any) ([]byte, error) {
	var b bytes.Buffer
	enc := json.NewEncoder(&b)
	enc.SetEscapeHTML(false)
	if err := enc.Encode(v); err != nil {
		return nil, err
	}
	return b.Bytes(), nil
}
