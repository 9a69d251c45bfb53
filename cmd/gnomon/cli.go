package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
)

// Exit statuses shared by every subcommand.
const (
	exitOK      = 0 // the command did its job
	exitFailure = 1 // a runtime failure (unreadable input, unwritable output)
	exitUsage   = 2 // bad flags or values: a one-line reason and where the help is
)

// newFlagSet returns a flag set that reports errors instead of exiting, so
// that every command answers bad usage the same way (see parseFlags). Its
// Usage prints the full help, for -h; a value name in a flag's help is the
// word in backquotes (flag.UnquoteUsage), so each flag shows what it takes.
func newFlagSet(e env, name, synopsis, about string) *flag.FlagSet {
	fs := flag.NewFlagSet(name, flag.ContinueOnError)
	fs.SetOutput(e.stderr)
	fs.Usage = func() {
		w := fs.Output()
		fmt.Fprintf(w, "usage: %s\n\n%s\n\noptions:\n", synopsis, about)
		fs.PrintDefaults()
	}
	return fs
}

// parseFlags parses args. When it returns done, the caller returns code:
// 0 after -h (the help printed), exitUsage after a bad flag (its reason
// and the pointer to the help printed, not the whole help: a page of
// options would push the reason off the screen).
func parseFlags(fs *flag.FlagSet, args []string) (code int, done bool) {
	out := fs.Output()
	fs.SetOutput(io.Discard) // the flag package would print the reason and the whole help
	err := fs.Parse(args)
	fs.SetOutput(out)
	switch {
	case err == nil:
		return 0, false
	case errors.Is(err, flag.ErrHelp):
		fs.Usage()
		return exitOK, true
	default:
		return usageErr(fs, "%v", err), true
	}
}

// parseNoArgs parses the flags of a command that takes no positional
// argument and needs every flag named in required. It returns the set of
// flags given; done is true when the command must stop with code (help, a
// bad flag, a stray argument or a missing flag, each already reported).
func parseNoArgs(fs *flag.FlagSet, args []string, required ...string) (set map[string]bool, code int, done bool) {
	if code, done := parseFlags(fs, args); done {
		return nil, code, true
	}
	if fs.NArg() > 0 {
		return nil, usageErr(fs, "unexpected argument %q", fs.Arg(0)), true
	}
	set = flagsSet(fs)
	if missing := firstMissing(set, required...); missing != "" {
		return nil, usageErr(fs, "--%s is required", missing), true
	}
	return set, 0, false
}

// usageErr prints a one-line reason and one line pointing at the command's
// help, and returns exitUsage. Commands call it for values that parse but
// make no sense (a latitude beyond ±90°, --from after --to).
func usageErr(fs *flag.FlagSet, format string, a ...any) int {
	w := fs.Output()
	fmt.Fprintf(w, "gnomon %s: %s\n", fs.Name(), fmt.Sprintf(format, a...))
	fmt.Fprintf(w, "run 'gnomon %s -h' for its options\n", fs.Name())
	return exitUsage
}

// fail prints a one-line runtime error and returns exitFailure.
func fail(w io.Writer, cmd string, err error) int {
	fmt.Fprintf(w, "gnomon %s: %v\n", cmd, err)
	return exitFailure
}

// flagsSet returns the names of the flags given on the command line, so a
// command can tell "--lat 0" from no --lat at all.
func flagsSet(fs *flag.FlagSet) map[string]bool {
	set := map[string]bool{}
	fs.Visit(func(fl *flag.Flag) { set[fl.Name] = true })
	return set
}

// firstMissing returns the first of names that is not in set, or "".
func firstMissing(set map[string]bool, names ...string) string {
	for _, n := range names {
		if !set[n] {
			return n
		}
	}
	return ""
}
